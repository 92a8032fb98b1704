//! Removing every cyclotomic factor from a polynomial over Z.
//!
//! A root of unity of order m has minimal polynomial Φ_m over Q, of degree φ(m). Since
//! Φ_m is irreducible, gcd(P, Φ_m) is 1 or Φ_m, so "repeated gcd with Φ_m" is repeated
//! exact division by Φ_m while it divides. Only m with φ(m) ≤ deg P can matter, and
//! φ(m) ≥ √(m/2) for every m ≥ 1 (φ(2^k) = 2^{k−1} and φ(p^k) ≥ p^{k/2} for odd p, and φ is
//! multiplicative), so every m > 2·deg² is ruled out and the search is finite. The degree
//! only falls as factors are removed, so at the end no Φ_m with φ(m) ≤ deg(rest) divides
//! the rest: **a non-constant rest has a root that is not a root of unity.**
//!
//! Cheap filter (never decides alone): with q ≡ 1 (mod m) prime and r of order m in F_q*,
//! r is a root of Φ_m mod q, so Φ_m | P forces P(r) ≡ 0 (mod q); only when it vanishes is
//! the exact division tried.

use num_bigint::BigInt;
use serde::{Deserialize, Serialize};

use cyclorb_field::numtheory::{factorize, is_prime, pow_mod};

use cyclorb_field::int_poly::{cyclotomic, degree, div_exact_monic, eval_mod, IntPoly};

/// Φ_m divides the polynomial exactly `multiplicity` times.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub struct CyclotomicFactor {
    /// The order m of the roots of unity (the factor is Φ_m).
    pub order: u64,
    /// How many times Φ_m divides.
    pub multiplicity: u32,
}

/// P = Π Φ_m^{e_m} · rest, with no cyclotomic factor left in rest.
pub(crate) struct Stripped {
    pub(crate) factors: Vec<CyclotomicFactor>,
    pub(crate) rest: IntPoly,
}

/// Euler's φ for 0..=limit by a sieve.
fn phi_table(limit: usize) -> Vec<u64> {
    let mut phi: Vec<u64> = (0..=limit as u64).collect();
    for p in 2..=limit {
        if phi[p] == p as u64 {
            for multiple in (p..=limit).step_by(p) {
                phi[multiple] -= phi[multiple] / p as u64;
            }
        }
    }
    phi
}

/// A prime q ≡ 1 (mod m) above 2^40 and an element of order exactly m modulo q.
fn prime_with_root(m: u64) -> (u64, u64) {
    let mut q = (1u64 << 40) / m * m + 1;
    while !is_prime(q) {
        q += m;
    }
    let primes: Vec<u64> = factorize(m).into_iter().map(|(l, _)| l).collect();
    let root = (2..q)
        .map(|g| pow_mod(g, (q - 1) / m, q))
        .find(|&r| primes.iter().all(|&l| pow_mod(r, m / l, q) != 1))
        .expect("F_q* is cyclic of order divisible by m");
    (q, root)
}

/// Whether Φ_m may divide p: the modular filter of the module documentation.
fn may_divide(p: &[BigInt], m: u64) -> bool {
    let (q, root) = prime_with_root(m);
    eval_mod(p, root, q) == 0
}

/// Divide out every cyclotomic factor of a non-zero polynomial.
pub(crate) fn strip(p: &[BigInt]) -> Stripped {
    let mut rest: IntPoly = p.to_vec();
    let mut factors = Vec::new();
    let limit = 2 * degree(p) * degree(p);
    let phi = phi_table(limit.max(2));
    for m in 1..=limit as u64 {
        if phi[m as usize] as usize > degree(&rest) {
            continue;
        }
        if !may_divide(&rest, m) {
            continue;
        }
        let divisor = cyclotomic(m);
        let mut multiplicity = 0;
        while let Some(q) = div_exact_monic(&rest, &divisor) {
            rest = q;
            multiplicity += 1;
        }
        if multiplicity > 0 {
            factors.push(CyclotomicFactor {
                order: m,
                multiplicity,
            });
        }
    }
    Stripped { factors, rest }
}

/// True when no Φ_m divides p (p non-zero): the check behind a remaining factor.
pub(crate) fn has_no_cyclotomic_factor(p: &[BigInt]) -> bool {
    strip(p).factors.is_empty()
}

#[cfg(test)]
mod tests {
    use super::*;
    use cyclorb_field::int_poly::mul;

    fn ints(cs: &[i64]) -> IntPoly {
        cs.iter().map(|&c| BigInt::from(c)).collect()
    }

    #[test]
    fn every_cyclotomic_factor_is_removed() {
        // (x − 1)² · Φ_3 · Φ_105 · (x² − 34x + 1)
        let mut p = mul(&ints(&[-1, 1]), &ints(&[-1, 1]));
        p = mul(&p, &ints(&[1, 1, 1]));
        p = mul(&p, &cyclotomic(105));
        p = mul(&p, &ints(&[1, -34, 1]));
        let stripped = strip(&p);
        let orders: Vec<(u64, u32)> = stripped
            .factors
            .iter()
            .map(|f| (f.order, f.multiplicity))
            .collect();
        assert_eq!(orders, vec![(1, 2), (3, 1), (105, 1)]);
        assert_eq!(stripped.rest, ints(&[1, -34, 1]));
        assert!(has_no_cyclotomic_factor(&stripped.rest));
        // x^12 − 1 is the product of Φ_d over d | 12: nothing remains
        let stripped = strip(&ints(&[-1, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 0, 1]));
        assert_eq!(stripped.rest, ints(&[1]));
        assert_eq!(stripped.factors.len(), 6);
    }

    #[test]
    fn the_sieve_matches_euler_phi() {
        let table = phi_table(200);
        for m in 1..=200u64 {
            assert_eq!(table[m as usize], cyclorb_field::numtheory::euler_phi(m));
        }
    }
}
