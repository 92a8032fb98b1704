//! Poincaré sums: non-orthonormal gauges, big numbers, non-scalar sums and their invariant
//! decomposition, non-unitary input.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::{Matrix, Operator};
use cyclorb_orbit::{GeneratorSet, OrbitProblem, PoincareReport};

use crate::outside;
use crate::sample_sets::*;

/// Ising's (T, S) in the basis v = D v': X' = D⁻¹ X D, invariant form G = D† D.
fn ising_in_gauge(f: &CyclotomicField, d: &[Cyc]) -> GeneratorSet {
    let dm = Matrix::diagonal(f, d);
    let dinv = Matrix::diagonal(f, &d.iter().map(|x| f.inv(x).unwrap()).collect::<Vec<_>>());
    let s = dinv.mul(f, &ising_s(f)).unwrap().mul(f, &dm).unwrap();
    let g = generator_set(
        16,
        3,
        vec![
            ("T", Operator::Diagonal(ising_t(f))),
            ("S", Operator::Dense(s)),
        ],
    );
    let form = d.iter().map(|x| f.mul(&f.conj(x), x).unwrap()).collect();
    g.with_form(Some(form)).unwrap()
}

#[test]
fn non_orthonormal_gauge_gives_lambda_times_inverse_form() {
    // B' = D⁻¹ B D⁻† = 8 (D† D)⁻¹ = 8 G⁻¹ when B = 8 I (fixtures/outside.toml: Castro et
    // al., Phys. Rev. D 85 (2012) 024032, for B; the change of basis is linear algebra).
    let published = outside::orbit("ising", 1);
    let f = field(16);
    let d = [parse(&f, "1"), parse(&f, "1 + z"), parse(&f, "3")];
    let g = ising_in_gauge(&f, &d);
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    let orbit = run(&problem, 2, 5);
    assert_eq!(orbit.len() as u64, published.lines);
    let sum = problem.poincare_sum(&orbit, 2).unwrap();
    assert_eq!(sum.scalar, Some(parse(&f, &published.prefactor)));
    assert!(sum.trace_check);
    let g_inv: Vec<Cyc> = g
        .form()
        .as_ref()
        .unwrap()
        .iter()
        .map(|x| f.inv(x).unwrap())
        .collect();
    assert_eq!(
        sum.matrix,
        Matrix::diagonal(&f, &g_inv).scale(&f, &f.int(8)).unwrap()
    );
}

#[test]
fn numbers_beyond_machine_words_take_the_exact_path() {
    // Scaling by 3^25 and 7^20 pushes the common denominator of S' past 2^63 and the key
    // numerators past i64: the exact path must give the same 24 lines and λ = 8 (Castro et
    // al. 2012).
    let f = field(16);
    let d = [parse(&f, "1"), parse(&f, "3^25"), parse(&f, "7^20")];
    let g = ising_in_gauge(&f, &d);
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    let orbit = run(&problem, 2, 3);
    assert_eq!(orbit.len(), 24);
    assert!(orbit.big_keys() > 0);
    assert_words_reproduce(&problem, &orbit);
    let sum = problem.poincare_sum(&orbit, 1).unwrap();
    assert_eq!(sum.scalar, Some(f.int(8)));
    // the same run in the orthonormal gauge, keys mapped by D⁻¹: identical order of lines
    let plain = OrbitProblem::new(ising_genus1(), &vacuum(&g)).unwrap();
    let plain_orbit = run(&plain, 1, 24);
    for i in 0..24 {
        let w = problem.line(&orbit, i).unwrap();
        let u = plain.line(&plain_orbit, i).unwrap();
        let k = u.iter().position(|x| !x.is_zero()).unwrap();
        for j in 0..3 {
            // u = D w up to the scalar that makes entry k equal 1
            let dw = f.mul(&d[j], &w[j]).unwrap();
            let dwk = f.mul(&d[k], &w[k]).unwrap();
            assert_eq!(f.mul(&u[j], &dwk).unwrap(), dw, "line {i}");
        }
    }
}

#[test]
fn permutation_sums_decompose_over_identity_and_all_ones() {
    // S_5 acting on Q^5 is 2-transitive, so the invariant matrices are spanned by I and the
    // all-ones matrix J (permutation character with ⟨χ, χ⟩ = 2: Isaacs, "Character Theory
    // of Finite Groups", (5.17) and the remark on 2-transitivity). Elementary counts:
    // seed (1,1,0,0,0): each coordinate lies in 4 of the 10 pairs, each pair of coordinates
    // in 1, so B = 4·I + (J − I) = 3·I + 1·J;
    // seed (1,2,3,4,5): B_ii = 4!·Σ a² = 24·55 = 1320, B_ij = 3!·((Σ a)² − Σ a²) =
    // 6·170 = 1020, so B = 300·I + 1020·J.
    let g = permutations5();
    let f = g.field().clone();
    let identity = Matrix::identity(&f, 5);
    let ones = Matrix::from_rows(vec![vec![f.one(); 5]; 5]).unwrap();
    for (entries, a, b) in [
        (["1", "1", "0", "0", "0"], 3, 1),
        (["1", "2", "3", "4", "5"], 300, 1020),
    ] {
        let problem = OrbitProblem::new(g.clone(), &seed(&f, &entries)).unwrap();
        let orbit = run(&problem, 2, 4);
        let sum = problem.poincare_sum(&orbit, 2).unwrap();
        assert!(sum.trace_check);
        assert_eq!(sum.scalar, None);
        let dec = sum.decomposition.as_ref().expect("small commutant");
        assert_eq!(dec.commutant_dimension, 2);
        assert!(dec.physical);
        assert_eq!(dec.terms.len(), 2);
        assert_eq!(dec.terms[0].matrix, identity);
        assert_eq!(dec.terms[0].coefficient, f.int(a));
        assert_eq!(dec.terms[1].matrix, ones);
        assert_eq!(dec.terms[1].coefficient, f.int(b));
        let json = serde_json::to_value(PoincareReport::from_sum(&sum, &g)).unwrap();
        assert_eq!(json["is_scalar"], false);
        assert_eq!(json["prefactor"], serde_json::Value::Null);
        assert_eq!(json["invariants"][1]["coefficient"], b.to_string());
        assert_eq!(json["invariants"][1]["matrix"][0][3], "1");
    }
}

#[test]
fn generators_that_do_not_preserve_the_form_get_no_sum() {
    // The gauge-changed Ising generators with the form left out: S' is not unitary for I
    // (|entries| scaled by 2), so the sum over lines is not defined.
    let f = field(16);
    let g = ising_in_gauge(&f, &[parse(&f, "1"), parse(&f, "2"), parse(&f, "1")])
        .with_form(None)
        .unwrap();
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    let orbit = run(&problem, 1, 8);
    assert_eq!(orbit.len(), 24); // lines do not care about the form (Castro et al. 2012)
    let err = problem.poincare_sum(&orbit, 1).unwrap_err().to_string();
    assert!(err.contains("generator S does not preserve"), "{err}");
}
