//! SU(2)_4 at genus 1 from its modular data: a Poincaré sum that is not scalar.

use cyclorb_matrix::{Matrix, Operator};
use cyclorb_orbit::OrbitProblem;

use crate::sample_sets::*;

#[test]
fn su2_level_4_sum_is_a_combination_of_the_two_modular_invariants() {
    // Modular data of SU(2)_4 (Di Francesco, Mathieu, Sénéchal, "Conformal Field Theory",
    // ch. 17): S_ab = √(2/6) sin(π(a+1)(b+1)/6), h_a = a(a+2)/24, over Q(ζ24); T up to the
    // central-charge phase, which lines do not see.
    let f = field(24);
    let s = matrix(
        &f,
        &[
            &["sqrt(3)/6", "1/2", "sqrt(3)/3", "1/2", "sqrt(3)/6"],
            &["1/2", "1/2", "0", "-1/2", "-1/2"],
            &["sqrt(3)/3", "0", "-sqrt(3)/3", "0", "sqrt(3)/3"],
            &["1/2", "-1/2", "0", "1/2", "-1/2"],
            &["sqrt(3)/6", "-1/2", "sqrt(3)/3", "-1/2", "sqrt(3)/6"],
        ],
    );
    let t: Vec<_> = ["1", "z^3", "z^8", "z^15", "1"]
        .iter()
        .map(|x| parse(&f, x))
        .collect();
    let g = generator_set(
        24,
        5,
        vec![("T", Operator::Diagonal(t)), ("S", Operator::Dense(s))],
    );
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    let orbit = run(&problem, 2, 8);
    assert!(orbit.is_saturated());
    let sum = problem.poincare_sum(&orbit, 2).unwrap();
    assert!(sum.trace_check);
    assert_eq!(sum.scalar, None);
    // The modular invariants of SU(2)_4 are the diagonal one and the D-series one
    // |χ_0 + χ_4|² + 2|χ_2|² (Cappelli, Itzykson, Zuber, Commun. Math. Phys. 113 (1987) 1).
    let diagonal = Matrix::identity(&f, 5);
    let d_series = matrix(
        &f,
        &[
            &["1", "0", "0", "0", "1"],
            &["0", "0", "0", "0", "0"],
            &["0", "0", "2", "0", "0"],
            &["0", "0", "0", "0", "0"],
            &["1", "0", "0", "0", "1"],
        ],
    );
    let dec = sum.decomposition.expect("a small commutant");
    assert_eq!(dec.commutant_dimension, 2);
    assert!(dec.physical);
    let matrices: Vec<&Matrix> = dec.terms.iter().map(|t| &t.matrix).collect();
    assert_eq!(matrices, vec![&diagonal, &d_series]);
    // B is a sum of positive semidefinite terms and both invariants occur: positive
    // rational coefficients a, b with tr B = 5a + 4b = orbit size (N = 1).
    let (a, b) = (&dec.terms[0].coefficient, &dec.terms[1].coefficient);
    let positive = |x: &cyclorb_field::Cyc| x.as_rational().is_some_and(|(p, _)| p > 0.into());
    assert!(positive(a) && positive(b));
    let trace = f
        .add(&f.mul(&f.int(5), a).unwrap(), &f.mul(&f.int(4), b).unwrap())
        .unwrap();
    assert_eq!(trace, f.int(orbit.len() as i64));
}
