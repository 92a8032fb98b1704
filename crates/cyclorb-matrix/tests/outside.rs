//! Checks against values known from outside this code: the discrete Fourier matrix, the
//! Vandermonde determinant, companion matrices, and the Ising modular data.

mod random_matrices;

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;
use num_bigint::BigInt;
use random_matrices::*;

/// F_m with entries ζ_m^{jk}, in Q(ζ_m).
fn fourier(f: &CyclotomicField, m: usize) -> Matrix {
    let step = f.conductor() as i64 / m as i64;
    let rows = (0..m)
        .map(|j| (0..m).map(|k| f.zeta_pow(step * (j * k) as i64)).collect())
        .collect();
    Matrix::from_rows(rows).unwrap()
}

/// The index reversal P: P[j, k] = 1 when j + k ≡ 0 (mod m).
fn index_reversal(f: &CyclotomicField, m: usize) -> Matrix {
    let mut p = Matrix::zeros(f, m, m);
    for j in 0..m {
        p.set(j, (m - j) % m, f.one());
    }
    p
}

#[test]
fn fourier_matrix_squares_to_the_index_reversal() {
    for m in [1usize, 2, 3, 4, 5, 6, 8, 12] {
        let f = CyclotomicField::new(m as u32).unwrap();
        let fm = fourier(&f, m);
        let m_int = f.int(m as i64);
        // F² = m·P and F⁴ = m²·I (common practice: the DFT matrix; e.g. Strang,
        // Introduction to Linear Algebra, "the Fourier matrix" — from memory)
        let f2 = fm.mul(&f, &fm).unwrap();
        assert_eq!(
            f2,
            index_reversal(&f, m).scale(&f, &m_int).unwrap(),
            "m={m}"
        );
        let f4 = fm.pow(&f, 4).unwrap();
        assert_eq!(f4.is_scalar(&f), Some(f.int((m * m) as i64)), "m={m}");
        // so F is of projective order 4 for m ≥ 3 (P is not scalar), 2 for m = 2, 1 for m = 1
        let expected = match m {
            1 => 1,
            2 => 2,
            _ => 4,
        };
        assert_eq!(
            fm.projective_order(&f, 100).unwrap(),
            Some(expected),
            "m={m}"
        );
        // |det F_m|² = m^m, since F/√m is unitary (same source)
        let det = fm.determinant(&f).unwrap();
        let modulus = f.mul(&det, &f.conj(&det)).unwrap();
        let m_pow = BigInt::from(m).pow(m as u32);
        assert_eq!(
            modulus,
            f.big_rational(&m_pow, &BigInt::from(1)).unwrap(),
            "m={m}"
        );
        // F F† = m I: F/√m preserves the standard form up to the factor m
        assert!(fm
            .preserves_form(&f, &Matrix::identity(&f, m))
            .map(|ok| ok == (m == 1))
            .unwrap());
        let scaled_identity = Matrix::identity(&f, m).scale(&f, &m_int).unwrap();
        assert_eq!(fm.mul(&f, &fm.adjoint(&f)).unwrap(), scaled_identity);
    }
}

/// det [x_i^j] = Π_{i<j} (x_j − x_i) (Vandermonde; e.g. Horn & Johnson, Matrix Analysis,
/// §0.9.11 — from memory).
fn vandermonde_product(f: &CyclotomicField, nodes: &[Cyc]) -> Cyc {
    let mut acc = f.one();
    for j in 0..nodes.len() {
        for i in 0..j {
            acc = f.mul(&acc, &f.sub(&nodes[j], &nodes[i]).unwrap()).unwrap();
        }
    }
    acc
}

fn vandermonde(f: &CyclotomicField, nodes: &[Cyc]) -> Matrix {
    let rows = nodes
        .iter()
        .map(|x| {
            (0..nodes.len())
                .map(|j| f.pow(x, j as i64).unwrap())
                .collect()
        })
        .collect();
    Matrix::from_rows(rows).unwrap()
}

#[test]
fn vandermonde_determinant() {
    let mut rng = XorShift::new(21);
    for n in CONDUCTORS {
        let f = CyclotomicField::new(n).unwrap();
        for _ in 0..iterations(4) {
            let size = 1 + rng.below(5) as usize;
            let nodes = random_vector(&f, &mut rng, size);
            let v = vandermonde(&f, &nodes);
            assert_eq!(
                v.determinant(&f).unwrap(),
                vandermonde_product(&f, &nodes),
                "n={n}"
            );
            // distinct nodes ⇔ invertible (same source)
            let distinct = (0..size).all(|j| (0..j).all(|i| nodes[i] != nodes[j]));
            assert_eq!(v.inverse(&f).is_ok(), distinct);
            assert_eq!(v.rank(&f).unwrap() == size, distinct);
        }
    }
    // the Fourier matrix is the Vandermonde matrix of the m-th roots of unity
    let f = CyclotomicField::new(12).unwrap();
    let nodes: Vec<Cyc> = (0..12).map(|k| f.zeta_pow(k)).collect();
    assert_eq!(
        fourier(&f, 12).determinant(&f).unwrap(),
        vandermonde_product(&f, &nodes)
    );
}

/// The companion matrix of a monic p (ones on the subdiagonal, −c_i in the last column) has
/// characteristic polynomial p (any linear algebra text; e.g. Hoffman & Kunze, §7.1 — from
/// memory).
#[test]
fn companion_matrix_has_the_given_characteristic_polynomial() {
    let mut rng = XorShift::new(22);
    for n in CONDUCTORS {
        let f = CyclotomicField::new(n).unwrap();
        for _ in 0..iterations(4) {
            let d = 1 + rng.below(6) as usize;
            let mut coefficients = random_vector(&f, &mut rng, d);
            let mut companion = Matrix::zeros(&f, d, d);
            for i in 1..d {
                companion.set(i, i - 1, f.one());
            }
            for (i, c) in coefficients.iter().enumerate() {
                companion.set(i, d - 1, f.neg(c));
            }
            coefficients.push(f.one());
            assert_eq!(companion.charpoly(&f).unwrap(), coefficients, "n={n}");
        }
    }
    // the cyclic shift e_j ↦ e_{j+1 mod m} is the companion matrix of x^m − 1 (same source)
    let f = CyclotomicField::new(5).unwrap();
    for m in 1..=6usize {
        let mut shift = Matrix::zeros(&f, m, m);
        for j in 0..m {
            shift.set((j + 1) % m, j, f.one());
        }
        let mut expected = vec![f.zero(); m + 1];
        expected[0] = f.int(-1);
        expected[m] = f.one();
        assert_eq!(shift.charpoly(&f).unwrap(), expected, "m={m}");
        assert_eq!(shift.projective_order(&f, 10).unwrap(), Some(m as u64));
    }
}

/// The Ising modular data in Q(ζ16) (docs/conventions.md §2–3; Di Francesco–Mathieu–Sénéchal, ch. 17 for
/// SU(2)_2 ≅ Ising up to twist, and the Gauss–Milgram sum of docs/check-values.md: Fröhlich–Kerler,
/// Bakalov–Kirillov ch. 3).
#[test]
fn ising_modular_data() {
    let f = CyclotomicField::new(16).unwrap();
    let z = |k| f.zeta_pow(k);
    // √2 = ζ16² + ζ16⁻² (docs/conventions.md §2–3)
    let sqrt2 = f.add(&z(2), &z(-2)).unwrap();
    assert_eq!(f.mul(&sqrt2, &sqrt2).unwrap(), f.int(2));
    let half = f.rational(1, 2).unwrap();
    let h = |x: &Cyc| f.mul(&half, x).unwrap();
    let (one, zero) = (f.one(), f.zero());
    let minus_sqrt2 = f.neg(&sqrt2);
    let s = Matrix::from_rows(vec![
        vec![h(&one), h(&sqrt2), h(&one)],
        vec![h(&sqrt2), zero.clone(), h(&minus_sqrt2)],
        vec![h(&one), h(&minus_sqrt2), h(&one)],
    ])
    .unwrap();
    let t = Matrix::diagonal(&f, &[f.one(), z(1), f.int(-1)]);
    let identity = Matrix::identity(&f, 3);
    // S² = I (Ising is self-dual: charge conjugation is trivial)
    assert_eq!(s.mul(&f, &s).unwrap(), identity);
    // (ST)³ = Θ·S² with Θ = Σ_a d_a² θ_a / D = e^{2πi c/8} = ζ16 for c = 1/2 (Gauss–Milgram)
    let st = s.mul(&f, &t).unwrap();
    let st3 = st.pow(&f, 3).unwrap();
    let s2 = s.mul(&f, &s).unwrap();
    assert_eq!(st3.scalar_multiple_of(&f, &s2).unwrap(), Some(z(1)));
    // projective orders: T is 16 (θ_σ = ζ16 is primitive), S is 2, ST is 3
    assert_eq!(t.projective_order(&f, 100).unwrap(), Some(16));
    assert_eq!(t.projective_order(&f, 15).unwrap(), None);
    assert_eq!(s.projective_order(&f, 100).unwrap(), Some(2));
    assert_eq!(st.projective_order(&f, 100).unwrap(), Some(3));
    // S and T are unitary; S is real symmetric with trace 1, so χ_S = (x − 1)²(x + 1) = x³ − x² − x + 1
    assert!(s.preserves_form(&f, &identity).unwrap());
    assert!(t.preserves_form(&f, &identity).unwrap());
    assert_eq!(s.transpose(), s);
    assert_eq!(s.determinant(&f).unwrap(), f.int(-1));
    let chi: Vec<Cyc> = [1, -1, -1, 1].iter().map(|&c| f.int(c)).collect();
    assert_eq!(s.charpoly(&f).unwrap(), chi);
    // Verlinde: N_{σσ}^c = Σ_a S_σa S_σa conj(S_ca) / S_0a, giving σ × σ = 1 + ψ
    let s_inv = s.inverse(&f).unwrap();
    assert_eq!(s_inv, s.adjoint(&f));
    for (c, expected) in [(0, 1), (1, 0), (2, 1)] {
        let mut terms = Vec::new();
        for a in 0..3 {
            let num = f.mul(s.get(1, a), s.get(1, a)).unwrap();
            let num = f.mul(&num, &f.conj(s.get(c, a))).unwrap();
            terms.push(f.div(&num, s.get(0, a)).unwrap());
        }
        assert_eq!(f.sum(&terms).unwrap(), f.int(expected), "N_σσ^{c}");
    }
}

/// A diagonal of roots of unity conjugated by a random invertible matrix: its projective
/// order is lcm over i of the orders of ζ^{e_i − e_0} (common practice: conjugation and
/// scalars do not change the order in PGL).
#[test]
fn projective_order_of_conjugated_diagonals() {
    let mut rng = XorShift::new(23);
    let f = CyclotomicField::new(60).unwrap();
    for _ in 0..iterations(4) {
        let d = 2 + rng.below(3) as usize;
        let exponents: Vec<i64> = (0..d).map(|_| rng.below(60) as i64).collect();
        let diag = Matrix::diagonal(
            &f,
            &exponents.iter().map(|&e| f.zeta_pow(e)).collect::<Vec<_>>(),
        );
        let expected = exponents
            .iter()
            .map(|e| 60 / num_integer::gcd(60, (e - exponents[0]).rem_euclid(60)).max(1))
            .fold(1, num_integer::lcm);
        let expected = if exponents.iter().all(|&e| e == exponents[0]) {
            1
        } else {
            expected
        };
        let a = loop {
            let a = random_matrix(&f, &mut rng, d, d);
            if a.inverse(&f).is_ok() {
                break a;
            }
        };
        let scalar = f.mul_int(&f.zeta_pow(7), 3);
        let x = a
            .mul(&f, &diag)
            .unwrap()
            .mul(&f, &a.inverse(&f).unwrap())
            .unwrap()
            .scale(&f, &scalar)
            .unwrap();
        assert_eq!(
            x.projective_order(&f, 60).unwrap(),
            Some(expected as u64),
            "{exponents:?}"
        );
        if expected > 1 {
            assert_eq!(x.projective_order(&f, expected as u64 - 1).unwrap(), None);
        }
    }
}

/// When p divides a denominator for both filter primes, or the matrix is singular mod p, the
/// order is still found, exactly (the fallback path).
#[test]
fn projective_order_without_a_usable_prime() {
    let f = CyclotomicField::new(16).unwrap();
    let p0 = cyclorb_field::PrimeReduction::nth(&f, 0).unwrap().prime() as i64;
    let p1 = cyclorb_field::PrimeReduction::nth(&f, 1).unwrap().prime() as i64;
    let small = f
        .big_rational(&BigInt::from(1), &(BigInt::from(p0) * BigInt::from(p1)))
        .unwrap();
    let large = f
        .big_rational(&(BigInt::from(p0) * BigInt::from(p1)), &BigInt::from(1))
        .unwrap();
    for c in [small, large] {
        let x = Matrix::diagonal(&f, &[c.clone(), f.mul(&c, &f.zeta_pow(2)).unwrap()]);
        assert_eq!(x.projective_order(&f, 100).unwrap(), Some(8));
        assert_eq!(x.projective_order(&f, 7).unwrap(), None);
    }
    // singular matrices have no projective order; 0 × 0 has order 1
    let singular = Matrix::diagonal(&f, &[f.one(), f.zero()]);
    assert_eq!(singular.projective_order(&f, 100).unwrap(), None);
    assert_eq!(
        Matrix::identity(&f, 0).projective_order(&f, 5).unwrap(),
        Some(1)
    );
}
