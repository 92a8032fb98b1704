//! Ising at genus 1 from modular data: the orbit of the vacuum line under SL(2, Z).

use cyclorb_matrix::{Matrix, Operator};
use cyclorb_orbit::{GeneratorSet, OrbitProblem, PoincareReport, Seed};

use crate::sample_sets::*;

#[test]
fn ising_vacuum_orbit_has_24_lines_and_b_is_8() {
    let g = ising_genus1();
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    let orbit = run(&problem, 1, 4);
    // Castro, Gaberdiel, Hartman, Maloney, Volpato, "The gravity dual of the Ising model",
    // Phys. Rev. D 85 (2012) 024032: 24 distinct vacuum images, Poincaré sum 8·(|χ_0|² +
    // |χ_{1/16}|² + |χ_{1/2}|²).
    assert_eq!(orbit.len(), 24);
    assert!(orbit.is_saturated());
    assert_eq!(orbit.layer_sizes()[0], 1);
    assert_eq!(orbit.layer_sizes().iter().sum::<usize>(), 24);
    let sum = problem.poincare_sum(&orbit, 1).unwrap();
    let f = problem.field();
    assert_eq!(sum.scalar, Some(f.int(8)));
    assert_eq!(sum.prefactor(), Some(cyclorb_field::Rational::from_int(8)));
    assert!(sum.trace_check);
    assert_eq!(
        sum.matrix,
        Matrix::identity(f, 3).scale(f, &f.int(8)).unwrap()
    );
    assert_words_reproduce(&problem, &orbit);
}

#[test]
fn conjugated_generating_set_gives_the_same_orbit() {
    // In SL(2, Z), S = T⁻¹ (S T S⁻¹)⁻¹ T⁻¹ (multiply the 2×2 matrices), so T and S T S⁻¹
    // generate the same projective group as T and S; for Ising S⁻¹ = S. The two orbits
    // must coincide as sets, and so must B.
    let f = field(16);
    let s = ising_s(&f);
    let t = Matrix::diagonal(&f, &ising_t(&f));
    let sts = s.mul(&f, &t).unwrap().mul(&f, &s).unwrap();
    let g2 = generator_set(
        16,
        3,
        vec![
            ("T", Operator::Diagonal(ising_t(&f))),
            ("STS", Operator::Dense(sts)),
        ],
    );
    let p1 = OrbitProblem::new(ising_genus1(), &vacuum(&g2)).unwrap();
    let p2 = OrbitProblem::new(g2.clone(), &vacuum(&g2)).unwrap();
    let o1 = run(&p1, 1, 8);
    let o2 = run(&p2, 1, 8);
    assert_eq!(o2.len(), 24);
    let mut a: Vec<String> = (0..24)
        .map(|i| format!("{:?}", p1.line(&o1, i).unwrap()))
        .collect();
    let mut b: Vec<String> = (0..24)
        .map(|i| format!("{:?}", p2.line(&o2, i).unwrap()))
        .collect();
    a.sort();
    b.sort();
    assert_eq!(a, b);
    assert_eq!(p2.poincare_sum(&o2, 2).unwrap().scalar, Some(f.int(8)));
}

#[test]
fn fixture_file_and_sparse_seed_from_a_subfield() {
    let g = GeneratorSet::read(&fixture("ising-genus1.json")).unwrap();
    assert_eq!(
        g,
        ising_genus1().with_origin(Some("ising (modular data by hand)".into()), Some(1))
    );
    // the seed file is written over Q(ζ8) ⊂ Q(ζ16)
    let seed = Seed::read(&fixture("sparse-seed.json")).unwrap();
    assert_eq!(seed.conductor, 8);
    let problem = OrbitProblem::new(g, &seed).unwrap();
    let orbit = run(&problem, 2, 3);
    assert_eq!(orbit.len(), 24); // Castro et al. 2012, as above
}

#[test]
fn the_sum_reports_lambda_and_no_invariants() {
    let g = ising_genus1();
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    let orbit = run(&problem, 1, 64);
    let sum = problem.poincare_sum(&orbit, 1).unwrap();
    let json = serde_json::to_value(PoincareReport::from_sum(&sum, &g)).unwrap();
    assert_eq!(json["is_scalar"], true);
    assert_eq!(json["prefactor"], "8"); // Castro et al. 2012
    assert_eq!(json["invariants"], serde_json::json!([]));
    assert_eq!(json["trace_check"], true);
    let back: PoincareReport = serde_json::from_value(json).unwrap();
    assert_eq!(back, PoincareReport::from_sum(&sum, &g));
}
