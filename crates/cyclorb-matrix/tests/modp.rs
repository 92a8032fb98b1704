//! Reduction modulo primes p ≡ 1 (mod n): a ring homomorphism, so the rank mod p is a lower
//! bound for the exact rank (common practice: a non-zero minor mod p lifts to a non-zero
//! minor; e.g. the modular rank algorithms of Cohen, A Course in Computational Algebraic
//! Number Theory, §2.4 — from memory).

mod random_matrices;

use cyclorb_field::{CyclotomicField, FieldError, PrimeReduction};
use cyclorb_matrix::{reduce_vector, Matrix, MatrixError, ModpMatrix};
use num_bigint::BigInt;
use random_matrices::*;

#[test]
fn rank_mod_p_bounds_the_exact_rank_from_below() {
    let mut rng = XorShift::new(31);
    for n in CONDUCTORS {
        let f = CyclotomicField::new(n).unwrap();
        let reduction = PrimeReduction::nth(&f, 0).unwrap();
        for _ in 0..iterations(6) {
            let (r, c) = (2 + rng.below(4) as usize, 2 + rng.below(4) as usize);
            let k = 1 + rng.below(r.min(c) as u64) as usize;
            let a = random_low_rank(&f, &mut rng, r, c, k);
            let exact = a.rank(&f).unwrap();
            let ap = a.reduce_mod(&reduction).unwrap();
            assert!(ap.rank() <= exact, "n={n}");
            // nullity mod p ≥ exact nullity, and the basis mod p is a kernel basis
            let null = ap.nullspace();
            assert_eq!(null.len() + ap.rank(), c);
            assert!(null.len() >= a.nullspace(&f).unwrap().len());
            for x in &null {
                assert!(ap.mul_vec(x).unwrap().iter().all(|&y| y == 0));
            }
            // reduction is multiplicative: (AB)_p = A_p B_p
            let b = random_matrix(&f, &mut rng, c, 2);
            let ab = a.mul(&f, &b).unwrap().reduce_mod(&reduction).unwrap();
            assert_eq!(ab, ap.mul(&b.reduce_mod(&reduction).unwrap()).unwrap());
            let v = random_vector(&f, &mut rng, c);
            assert_eq!(
                reduce_vector(&reduction, &a.mul_vec(&f, &v).unwrap()).unwrap(),
                ap.mul_vec(&reduce_vector(&reduction, &v).unwrap()).unwrap()
            );
        }
    }
}

#[test]
fn rank_mod_p_can_drop_and_denominators_divisible_by_p_are_errors() {
    let f = CyclotomicField::new(5).unwrap();
    let reduction = PrimeReduction::nth(&f, 0).unwrap();
    let p = BigInt::from(reduction.prime());
    let one = BigInt::from(1);
    let p_cyc = f.big_rational(&p, &one).unwrap();
    // diag(1, p): exact rank 2, rank 1 mod p — the bound is strict here
    let a = Matrix::diagonal(&f, &[f.one(), p_cyc.clone()]);
    assert_eq!(a.rank(&f).unwrap(), 2);
    assert_eq!(a.reduce_mod(&reduction).unwrap().rank(), 1);
    // 1/p has no image mod p
    let inv_p = f.big_rational(&one, &p).unwrap();
    let b = Matrix::diagonal(&f, &[f.one(), inv_p]);
    assert!(matches!(
        b.reduce_mod(&reduction),
        Err(MatrixError::Field(FieldError::BadPrime { .. }))
    ));
    // 1 − ζ5 divides 5 but not p: its image is 1 − r with r a primitive 5th root of unity
    let x = f.sub(&f.one(), &f.zeta_pow(1)).unwrap();
    let r = reduction.root();
    let q = reduction.prime();
    assert_eq!(
        reduce_vector(&reduction, &[x]).unwrap(),
        vec![(1 + q - r) % q]
    );
    assert_eq!(cyclorb_field::numtheory::pow_mod(r, 5, q), 1);
    assert_ne!(r, 1);
}

#[test]
fn modp_matrices_by_hand() {
    // over F_7: [[1, 2], [3, 6]] has det 0 and kernel spanned by (−2, 1) = (5, 1)
    let m = ModpMatrix::from_rows(7, vec![vec![1, 2], vec![3, 6]]).unwrap();
    assert_eq!(m.rank(), 1);
    assert_eq!(m.nullspace(), vec![vec![5, 1]]);
    assert_eq!(ModpMatrix::identity(7, 3).unwrap().is_scalar(), Some(1));
    assert_eq!(m.is_scalar(), None);
    assert!(ModpMatrix::zeros(8, 2, 2).is_err());
    assert!(ModpMatrix::from_rows(7, vec![vec![1], vec![1, 2]]).is_err());
    let sq = m.mul(&m).unwrap(); // [[7, 14], [21, 42]] = 0 mod 7
    assert_eq!(sq, ModpMatrix::zeros(7, 2, 2).unwrap());
    assert!(m.mul(&ModpMatrix::identity(11, 2).unwrap()).is_err());
}
