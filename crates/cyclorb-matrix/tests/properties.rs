//! Randomised algebraic identities over Q(ζ_n) for n = 1, 5, 16, 60 (seeded; scale with
//! CYCLORB_TEST_ITERS). Each identity is a textbook theorem of linear algebra over a field
//! (e.g. Hoffman & Kunze, Linear Algebra; Lang, Algebra, ch. XIII–XV), named beside its test.

mod random_matrices;

use cyclorb_field::CyclotomicField;
use cyclorb_matrix::{Matrix, MatrixError};
use random_matrices::*;

fn fields() -> Vec<CyclotomicField> {
    CONDUCTORS
        .iter()
        .map(|&n| CyclotomicField::new(n).unwrap())
        .collect()
}

fn dim(rng: &mut XorShift) -> usize {
    1 + rng.below(4) as usize
}

#[test]
fn products_are_associative_and_adjoint_reverses_them() {
    let mut rng = XorShift::new(1);
    for f in fields() {
        for _ in 0..iterations(6) {
            let (a, b, c, d) = (dim(&mut rng), dim(&mut rng), dim(&mut rng), dim(&mut rng));
            let x = random_matrix(&f, &mut rng, a, b);
            let y = random_matrix(&f, &mut rng, b, c);
            let z = random_matrix(&f, &mut rng, c, d);
            // (XY)Z = X(YZ): associativity of matrix multiplication (common practice)
            let left = x.mul(&f, &y).unwrap().mul(&f, &z).unwrap();
            let right = x.mul(&f, &y.mul(&f, &z).unwrap()).unwrap();
            assert_eq!(left, right, "n={}", f.conductor());
            // (XY)† = Y†X† (common practice; conjugation is a field automorphism)
            let adj = x.mul(&f, &y).unwrap().adjoint(&f);
            assert_eq!(adj, y.adjoint(&f).mul(&f, &x.adjoint(&f)).unwrap());
            // X·v computed by mul_vec equals the product with a column matrix
            let v = random_vector(&f, &mut rng, b);
            let column = Matrix::from_rows(v.iter().map(|e| vec![e.clone()]).collect()).unwrap();
            let as_matrix = x.mul(&f, &column).unwrap();
            assert_eq!(x.mul_vec(&f, &v).unwrap(), as_matrix.entries().to_vec());
        }
    }
}

#[test]
fn determinant_is_multiplicative_and_charpoly_annihilates() {
    let mut rng = XorShift::new(2);
    for f in fields() {
        for _ in 0..iterations(5) {
            let d = dim(&mut rng);
            let a = random_matrix(&f, &mut rng, d, d);
            let b = random_matrix(&f, &mut rng, d, d);
            // det(AB) = det A · det B (Cauchy–Binet; any linear algebra text)
            let det_ab = a.mul(&f, &b).unwrap().determinant(&f).unwrap();
            let product = f
                .mul(&a.determinant(&f).unwrap(), &b.determinant(&f).unwrap())
                .unwrap();
            assert_eq!(det_ab, product, "n={} d={d}", f.conductor());
            // Cayley–Hamilton: χ_A(A) = 0; χ monic of degree d, with
            // χ(x) = x^d − tr(A) x^{d−1} + … + (−1)^d det A (any linear algebra text)
            let chi = a.charpoly(&f).unwrap();
            assert_eq!(chi.len(), d + 1);
            assert!(chi[d].is_one());
            assert_eq!(chi[d - 1], f.neg(&a.trace(&f).unwrap()));
            let zero = a.eval_polynomial(&f, &chi).unwrap();
            assert_eq!(zero, Matrix::zeros(&f, d, d), "n={} d={d}", f.conductor());
            // similar matrices have one characteristic polynomial (common practice)
            if let Ok(b_inv) = b.inverse(&f) {
                let similar = b.mul(&f, &a).unwrap().mul(&f, &b_inv).unwrap();
                assert_eq!(similar.charpoly(&f).unwrap(), chi);
            }
        }
    }
}

#[test]
fn inverse_and_determinant_agree() {
    let mut rng = XorShift::new(3);
    for f in fields() {
        for _ in 0..iterations(6) {
            let d = dim(&mut rng);
            let a = random_matrix(&f, &mut rng, d, d);
            let id = Matrix::identity(&f, d);
            // A is invertible iff det A ≠ 0, and then A·A⁻¹ = A⁻¹·A = I (common practice)
            match a.inverse(&f) {
                Ok(inv) => {
                    assert!(!a.determinant(&f).unwrap().is_zero());
                    assert_eq!(a.mul(&f, &inv).unwrap(), id);
                    assert_eq!(inv.mul(&f, &a).unwrap(), id);
                    // A^{-2}·A^3 = A, powers through the inverse
                    let back = a
                        .pow(&f, -2)
                        .unwrap()
                        .mul(&f, &a.pow(&f, 3).unwrap())
                        .unwrap();
                    assert_eq!(back, a);
                }
                Err(e) => {
                    assert_eq!(e, MatrixError::Singular);
                    assert!(a.determinant(&f).unwrap().is_zero());
                }
            }
            // a singular matrix (a repeated row) is reported as such
            if d >= 2 {
                let mut rows: Vec<Vec<_>> = (0..d).map(|i| a.row(i).to_vec()).collect();
                rows[d - 1] = rows[0].clone();
                let singular = Matrix::from_rows(rows).unwrap();
                assert_eq!(singular.inverse(&f), Err(MatrixError::Singular));
                assert!(singular.determinant(&f).unwrap().is_zero());
            }
        }
    }
}

#[test]
fn rank_nullity_and_nullspace() {
    let mut rng = XorShift::new(4);
    for f in fields() {
        for _ in 0..iterations(6) {
            let (r, c) = (dim(&mut rng) + 1, dim(&mut rng) + 1);
            let k = rng.below(r.min(c) as u64 + 1) as usize;
            let a = if k == 0 {
                Matrix::zeros(&f, r, c)
            } else {
                random_low_rank(&f, &mut rng, r, c, k)
            };
            let rank = a.rank(&f).unwrap();
            let null = a.nullspace(&f).unwrap();
            // rank–nullity: rank A + dim ker A = number of columns (any linear algebra text)
            assert_eq!(rank + null.len(), c, "n={}", f.conductor());
            assert!(rank <= k);
            // rank A = rank A^T = rank A† (row rank = column rank; common practice)
            assert_eq!(a.transpose().rank(&f).unwrap(), rank);
            assert_eq!(a.adjoint(&f).rank(&f).unwrap(), rank);
            for x in &null {
                assert!(is_zero_vector(&a.mul_vec(&f, x).unwrap()));
            }
            // the basis vectors are independent
            if !null.is_empty() {
                let basis = Matrix::from_rows(null.clone()).unwrap();
                assert_eq!(basis.rank(&f).unwrap(), null.len());
            }
            // the reduced echelon form has the same rank and its pivots are 1
            let (echelon, pivots) = a.reduced_row_echelon(&f).unwrap();
            assert_eq!(pivots.len(), rank);
            for (row, &p) in pivots.iter().enumerate() {
                assert!(echelon.get(row, p).is_one());
            }
        }
    }
}

#[test]
fn solve_finds_solutions_and_rejects_inconsistent_systems() {
    let mut rng = XorShift::new(5);
    for f in fields() {
        for _ in 0..iterations(6) {
            let (r, c) = (dim(&mut rng), dim(&mut rng));
            let a = random_matrix(&f, &mut rng, r, c);
            let x0 = random_vector(&f, &mut rng, c);
            let b = a.mul_vec(&f, &x0).unwrap();
            let x = a.solve(&f, &b).unwrap();
            assert_eq!(a.mul_vec(&f, &x).unwrap(), b);
            // a zero row with a non-zero right-hand side has no solution
            let mut rows: Vec<Vec<_>> = (0..r).map(|i| a.row(i).to_vec()).collect();
            rows.push(vec![f.zero(); c]);
            let padded = Matrix::from_rows(rows).unwrap();
            let mut rhs = b.clone();
            rhs.push(f.one());
            assert_eq!(padded.solve(&f, &rhs), Err(MatrixError::Inconsistent));
        }
    }
}

#[test]
fn kronecker_mixed_product() {
    let mut rng = XorShift::new(6);
    for f in fields() {
        for _ in 0..iterations(4) {
            let (p, q, r, s, t, u) = (
                dim(&mut rng),
                dim(&mut rng),
                dim(&mut rng),
                dim(&mut rng),
                dim(&mut rng),
                dim(&mut rng),
            );
            let a = random_matrix(&f, &mut rng, p, q);
            let b = random_matrix(&f, &mut rng, r, s);
            let c = random_matrix(&f, &mut rng, q, t);
            let d = random_matrix(&f, &mut rng, s, u);
            // (A ⊗ B)(C ⊗ D) = AC ⊗ BD (mixed-product property; Horn & Johnson, Topics in
            // Matrix Analysis, ch. 4 — from memory)
            let left = a
                .kronecker(&f, &b)
                .unwrap()
                .mul(&f, &c.kronecker(&f, &d).unwrap())
                .unwrap();
            let right = a
                .mul(&f, &c)
                .unwrap()
                .kronecker(&f, &b.mul(&f, &d).unwrap())
                .unwrap();
            assert_eq!(left, right);
            // tr(A ⊗ B) = tr A · tr B for square factors (same source)
            let sa = random_matrix(&f, &mut rng, p, p);
            let sb = random_matrix(&f, &mut rng, r, r);
            let tr = sa.kronecker(&f, &sb).unwrap().trace(&f).unwrap();
            let product = f
                .mul(&sa.trace(&f).unwrap(), &sb.trace(&f).unwrap())
                .unwrap();
            assert_eq!(tr, product);
        }
    }
}

#[test]
fn scalar_tests_and_commutation() {
    let mut rng = XorShift::new(7);
    for f in fields() {
        for _ in 0..iterations(6) {
            let d = dim(&mut rng);
            let a = random_matrix(&f, &mut rng, d, d);
            let c = random_cyc(&f, &mut rng);
            let ca = a.scale(&f, &c).unwrap();
            let found = ca.scalar_multiple_of(&f, &a).unwrap();
            if a.entries().iter().all(|x| x.is_zero()) {
                assert_eq!(found, Some(f.zero()));
            } else {
                assert_eq!(found, Some(c.clone()));
            }
            let ci = Matrix::identity(&f, d).scale(&f, &c).unwrap();
            assert_eq!(ci.is_scalar(&f), Some(c.clone()));
            // scalars commute with everything; [A, A²] = 0
            assert!(ci.commutes_with(&f, &a).unwrap());
            let a2 = a.mul(&f, &a).unwrap();
            assert_eq!(a.commutator(&f, &a2).unwrap(), Matrix::zeros(&f, d, d));
            // a change in one entry breaks proportionality
            if d >= 2 {
                let mut off = ca.clone();
                let bumped = f.add(off.get(0, 1), &f.one()).unwrap();
                off.set(0, 1, bumped);
                assert_ne!(off.scalar_multiple_of(&f, &a).unwrap(), Some(c.clone()));
                let mut e01 = Matrix::zeros(&f, d, d);
                e01.set(0, 1, f.one());
                let mut e10 = Matrix::zeros(&f, d, d);
                e10.set(1, 0, f.one());
                assert!(!e01.commutes_with(&f, &e10).unwrap());
                assert_eq!(e01.is_scalar(&f), None);
            }
        }
    }
}

#[test]
fn serde_round_trip() {
    let mut rng = XorShift::new(8);
    for f in fields() {
        let a = random_matrix(&f, &mut rng, 3, 2);
        let json = serde_json::to_string(&a).unwrap();
        assert!(
            json.contains(&format!("\"conductor\":{}", f.conductor())),
            "{json}"
        );
        let back: Matrix = serde_json::from_str(&json).unwrap();
        assert_eq!(back, a);
    }
    let ragged = r#"{"conductor": 4, "rows": [["1", "z"], ["2"]]}"#;
    assert!(serde_json::from_str::<Matrix>(ragged).is_err());
    let bad_entry = r#"{"conductor": 4, "rows": [["1 +"]]}"#;
    assert!(serde_json::from_str::<Matrix>(bad_entry).is_err());
    let f = CyclotomicField::new(16).unwrap();
    let read: Matrix =
        serde_json::from_str(r#"{"conductor": 16, "rows": [["z^8", "sqrt(2)"]]}"#).unwrap();
    assert_eq!(read.get(0, 0), &f.int(-1)); // ζ16^8 = −1
}
