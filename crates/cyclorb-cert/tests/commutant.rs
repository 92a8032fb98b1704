//! Commutant certificates on hand-built generator sets.

mod sample_sets;

use std::time::Instant;

use cyclorb_cert::{commutant, CertError, CommutantOptions, CommutantRoute, ProvedGenerators};
use cyclorb_field::CyclotomicField;
use cyclorb_matrix::{Matrix, Operator};
use sample_sets::*;

#[test]
fn the_modular_data_used_here_is_right() {
    // S² = C = 1 for the self-dual Ising and Fibonacci theories, and (S T)³ ∝ S²
    // (the SL(2, Z) relations; Di Francesco–Mathieu–Sénéchal, ch. 10).
    for data in [ising(), fibonacci()] {
        let f = &data.field;
        let t = Matrix::diagonal(f, &data.t);
        let d = data.t.len();
        assert_eq!(data.s.mul(f, &data.s).unwrap(), Matrix::identity(f, d));
        let st = data.s.mul(f, &t).unwrap();
        let cube = st.mul(f, &st).unwrap().mul(f, &st).unwrap();
        assert!(cube.is_scalar(f).is_some_and(|c| !c.is_zero()));
    }
}

#[test]
fn ising_and_fibonacci_at_genus_one_are_irreducible() {
    // Genus-1 representations of modular categories with a simple S, here the
    // irreducible level-16 and level-5 congruence representations (from memory).
    for data in [ising(), fibonacci()] {
        let gens = data.generators();
        let cert = commutant(&gens, CommutantOptions::default()).unwrap();
        assert_eq!(cert.dimension, 1);
        assert_eq!(cert.route, CommutantRoute::Modular);
        assert_eq!(cert.bounds.len(), 1);
        assert_eq!(cert.bounds[0].nullity, 1);
        assert_eq!(
            (cert.bounds[0].prime - 1) % u64::from(data.field.conductor()),
            0
        );
        cert.verify(&gens).unwrap();
        let text = serde_json::to_string(&cert).unwrap();
        let back: cyclorb_cert::CommutantCertificate = serde_json::from_str(&text).unwrap();
        assert_eq!(back, cert);
        back.verify(&gens).unwrap();
    }
}

/// Ising ⊕ Fibonacci over Q(ζ80), the generators acting blockwise, conjugated by a
/// diagonal D so that the invariant form is G = D² ≠ 1.
fn ising_plus_fibonacci() -> ProvedGenerators {
    let f = CyclotomicField::new(80).unwrap();
    let (ti, bi) = ising().twists();
    let (tf, bf) = fibonacci().twists();
    let scale = [1, 2, 1, 3, 1].map(|k| f.int(k));
    let d = Matrix::diagonal(&f, &scale);
    let d_inv = d.inverse(&f).unwrap();
    let conjugate = |m: Matrix| d_inv.mul(&f, &m).unwrap().mul(&f, &d).unwrap();
    let t = conjugate(direct_sum(&f, &embed(&f, &ti), &embed(&f, &tf)));
    let b = conjugate(direct_sum(&f, &embed(&f, &bi), &embed(&f, &bf)));
    let form = scale.iter().map(|x| f.mul(x, x).unwrap()).collect();
    ProvedGenerators::new(
        f,
        vec![
            ("T".into(), Operator::Dense(t)),
            ("B".into(), Operator::Dense(b)),
        ],
        Some(form),
    )
    .unwrap()
}

#[test]
fn a_direct_sum_of_two_irreducibles_has_commutant_dimension_two() {
    // Schur's lemma: two non-isomorphic irreducible summands (dimensions 3 and 2) give a
    // commutant C ⊕ C (common practice; Serre, Linear Representations, §2.2).
    let gens = ising_plus_fibonacci();
    let cert = commutant(&gens, CommutantOptions::default()).unwrap();
    assert_eq!(cert.dimension, 2);
    assert_eq!(cert.route, CommutantRoute::Exact);
    assert!(cert.bounds.iter().all(|b| b.nullity >= 2));
    assert_eq!(cert.basis.len(), 2);
    assert_eq!(cert.hermitian_basis.len(), 2);
    let f = gens.field();
    // every basis element is a·1₃ ⊕ b·1₂ (conjugation by the diagonal D keeps it so)
    for x in &cert.basis {
        for i in 0..5 {
            for j in 0..5 {
                if i == j {
                    let first = if i < 3 { x.get(0, 0) } else { x.get(3, 3) };
                    assert_eq!(x.get(i, j), first);
                } else {
                    assert!(x.get(i, j).is_zero(), "entry ({i}, {j})");
                }
            }
        }
    }
    // self-adjoint for G: G X = X† G
    let g = Matrix::diagonal(f, gens.form().unwrap());
    for x in &cert.hermitian_basis {
        assert_eq!(g.mul(f, x).unwrap(), x.adjoint(f).mul(f, &g).unwrap());
    }
    cert.verify(&gens).unwrap();
    let text = serde_json::to_string(&cert).unwrap();
    let back: cyclorb_cert::CommutantCertificate = serde_json::from_str(&text).unwrap();
    back.verify(&gens).unwrap();
}

#[test]
fn two_copies_of_one_irreducible_have_commutant_dimension_four() {
    // V ⊕ V with V absolutely irreducible: End = M₂(C), dimension 4 (Schur; common practice).
    let data = ising();
    let f = &data.field;
    let (t, b) = data.twists();
    let gens = ProvedGenerators::new(
        f.clone(),
        vec![
            ("T".into(), Operator::Dense(direct_sum(f, &t, &t))),
            ("B".into(), Operator::Dense(direct_sum(f, &b, &b))),
        ],
        None,
    )
    .unwrap();
    let cert = commutant(&gens, CommutantOptions::default()).unwrap();
    assert_eq!(cert.dimension, 4);
    assert_eq!(cert.hermitian_basis.len(), 4);
    cert.verify(&gens).unwrap();
}

#[test]
fn a_wrong_certificate_is_rejected() {
    let gens = ising_plus_fibonacci();
    let mut cert = commutant(&gens, CommutantOptions::default()).unwrap();
    // claim dimension 1: the basis no longer matches, and no prime gives nullity 1
    let mut claimed = cert.clone();
    claimed.dimension = 1;
    claimed.basis.truncate(1);
    claimed.hermitian_basis.truncate(1);
    assert!(matches!(claimed.verify(&gens), Err(CertError::Rejected(_))));
    // a basis matrix that does not commute
    let f = gens.field();
    let mut bad = Matrix::identity(f, 5);
    bad.set(0, 1, f.one());
    cert.basis[1] = bad;
    assert!(matches!(cert.verify(&gens), Err(CertError::Rejected(_))));
}

/// The outer tensor product of the genus-1 Ising and Fibonacci representations,
/// V_I ⊗ V_I ⊗ V_F ⊗ V_F (dimension 3·3·2·2 = 36) over Q(ζ80), one pair of twists per factor
/// (8 generators, 4 of them diagonal). Irreducible: an outer tensor product of absolutely
/// irreducible representations is irreducible for the product group (Serre, Linear
/// Representations of Finite Groups, §3.2; common practice).
fn tensor_36() -> (CyclotomicField, Vec<(String, Matrix)>) {
    let f = CyclotomicField::new(80).unwrap();
    let factors = [ising(), ising(), fibonacci(), fibonacci()];
    let sizes: Vec<usize> = factors.iter().map(|d| d.t.len()).collect();
    let mut out = Vec::new();
    for (k, data) in factors.iter().enumerate() {
        let (t, b) = data.twists();
        for (name, m) in [("T", t), ("B", b)] {
            let mut acc = Matrix::identity(&f, 1);
            for (j, &size) in sizes.iter().enumerate() {
                let piece = if j == k {
                    embed(&f, &m)
                } else {
                    Matrix::identity(&f, size)
                };
                acc = acc.kronecker(&f, &piece).unwrap();
            }
            out.push((format!("{name}{k}"), acc));
        }
    }
    (f, out)
}

#[test]
fn a_36_dimensional_irreducible_set_is_certified_in_seconds() {
    let (f, mats) = tensor_36();
    let generators = mats
        .into_iter()
        .map(|(name, m)| {
            let op = if name.starts_with('T') {
                Operator::Diagonal((0..36).map(|i| m.get(i, i).clone()).collect())
            } else {
                Operator::Dense(m).to_sparse_rows(&f)
            };
            (name, op)
        })
        .collect();
    let gens = ProvedGenerators::new(f, generators, None).unwrap();
    let start = Instant::now();
    let cert = commutant(&gens, CommutantOptions::default()).unwrap();
    let elapsed = start.elapsed();
    assert_eq!(cert.dimension, 1);
    assert!(cert.bounds[0].unknowns < 36 * 36);
    eprintln!(
        "36-dim commutant (diagonal cut): {} unknowns, {:?}",
        cert.bounds[0].unknowns, elapsed
    );
    cert.verify(&gens).unwrap();
}

#[test]
fn without_diagonal_generators_an_eigenbasis_cuts_the_system() {
    // The 36-dim set conjugated by a fixed unipotent P = 1 + N (N strictly upper
    // triangular with a few entries): no generator is diagonal any more, but every one is
    // diagonalisable over the roots of unity, so an eigenbasis mod p is found.
    let (f, mats) = tensor_36();
    let mut p = Matrix::identity(&f, 36);
    for i in 0..35 {
        p.set(i, i + 1, f.int(1 + (i as i64 % 3)));
    }
    p.set(0, 35, f.int(2));
    let p_inv = p.inverse(&f).unwrap();
    let generators = mats
        .into_iter()
        .map(|(name, m)| {
            let c = p_inv.mul(&f, &m).unwrap().mul(&f, &p).unwrap();
            (name, Operator::Dense(c))
        })
        .collect();
    let gens = ProvedGenerators::new(f, generators, None).unwrap();
    let start = Instant::now();
    let cert = commutant(&gens, CommutantOptions::default()).unwrap();
    let elapsed = start.elapsed();
    assert_eq!(cert.dimension, 1);
    assert!(cert.bounds[0].unknowns < 36 * 36);
    eprintln!(
        "36-dim commutant (eigenbasis cut): {} unknowns, {:?}",
        cert.bounds[0].unknowns, elapsed
    );
    cert.verify(&gens).unwrap();
}

#[test]
fn bad_generator_sets_are_errors() {
    let f = CyclotomicField::new(4).unwrap();
    let singular = Operator::Dense(Matrix::zeros(&f, 2, 2));
    assert!(matches!(
        ProvedGenerators::new(f.clone(), vec![("a".into(), singular)], None)
            .map_err(CertError::from),
        Err(CertError::Input(_))
    ));
    let a = Operator::Diagonal(vec![f.one(), f.int(2)]);
    // diag(1, 2) does not preserve G = 1
    assert!(matches!(
        ProvedGenerators::new(
            f.clone(),
            vec![("a".into(), a.clone())],
            Some(vec![f.one(); 2])
        )
        .map_err(CertError::from),
        Err(CertError::Input(_))
    ));
    assert!(matches!(
        ProvedGenerators::new(
            f.clone(),
            vec![("a".into(), a.clone()), ("a".into(), a)],
            None
        )
        .map_err(CertError::from),
        Err(CertError::Input(_))
    ));
    assert!(matches!(
        ProvedGenerators::new(f, vec![], None).map_err(CertError::from),
        Err(CertError::Input(_))
    ));
}

#[test]
fn over_q_without_a_diagonalisable_generator_all_unknowns_are_kept() {
    // a ⊕ 1 and b ⊕ 1 with the free pair a = [[1,2],[0,1]], b = [[1,0],[2,1]] (irreducible
    // on Q², as a and b share no eigenvector; hand check): commutant C·1₂ ⊕ C, dimension 2.
    // Neither generator is diagonalisable (unipotent), so no cut is possible: 9 unknowns.
    let f = CyclotomicField::new(1).unwrap();
    let one = Matrix::identity(&f, 1);
    let a = Matrix::from_rows(vec![vec![f.one(), f.int(2)], vec![f.zero(), f.one()]]).unwrap();
    let b = Matrix::from_rows(vec![vec![f.one(), f.zero()], vec![f.int(2), f.one()]]).unwrap();
    let gens = ProvedGenerators::new(
        f.clone(),
        vec![
            ("a".into(), Operator::Dense(direct_sum(&f, &a, &one))),
            ("b".into(), Operator::Dense(direct_sum(&f, &b, &one))),
        ],
        None,
    )
    .unwrap();
    let cert = commutant(&gens, CommutantOptions { primes: 3 }).unwrap();
    assert_eq!(cert.dimension, 2);
    assert!(cert
        .bounds
        .iter()
        .all(|b| b.unknowns == 9 && b.nullity == 2));
    assert_eq!(cert.bounds.len(), 3);
    // over Q only X + Xᵀ is available; here both basis elements are symmetric already
    assert_eq!(cert.hermitian_basis.len(), 2);
    for x in &cert.hermitian_basis {
        assert_eq!(x.transpose(), *x);
    }
    cert.verify(&gens).unwrap();
}
