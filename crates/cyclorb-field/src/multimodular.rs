//! Inversion and norm by evaluation at the roots of Φ_n modulo several primes and exact
//! Chinese remaindering.
//!
//! Write a = A/d with A ∈ Z[ζ_n] (the numerator vector) and d > 0. Let M be the matrix of
//! multiplication by A in the power basis. Then det M = N(A), the norm, and
//! Y = N(A)·A⁻¹ = Π_{σ ≠ 1} σ(A) is an algebraic integer whose power-basis coefficients are
//! the cofactors adj(M)·e₀. Hadamard's inequality bounds |N(A)| and every coefficient of Y by
//! H = Π_j ‖M e_j‖₂ (column j of M is A·x^j mod Φ_n). So a⁻¹ = d·Y / N(A) follows exactly
//! from Y and N(A) modulo primes whose product exceeds 2H.
//!
//! Modulo a prime p ≡ 1 (mod n) with roots r_k of Φ_n: v_k = A(r_k), N(A) ≡ Π_k v_k and
//! Y(r_k) ≡ Π_{l ≠ k} v_l (prefix and suffix products, no division, so primes dividing N(A)
//! are harmless); Y is recovered by Lagrange interpolation
//! Y = Σ_k Y(r_k) Φ_n(x) / ((x − r_k) Φ_n'(r_k)). The cost is 3φ² modular products per prime
//! and O(φ·primes²) for the reconstruction: no big-rational elimination, whatever the size of
//! the coefficients. The norm N(a) = N(A)/d^φ(n) needs only the product of the v_k.

use std::sync::Arc;

use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, ToPrimitive, Zero};

use crate::context::{CyclotomicField, Reduction};
use crate::element::{Cyc, Data};
use crate::error::FieldError;
use crate::modular::{
    crt_signed, crt_signed_small, crt_value, modulus, rational_reconstruction, symmetric, ModPrime,
    PRIME_BITS,
};
use crate::ring::IntRing;

/// Numerator vector of an element, in whichever tier it is stored.
enum Numerators<'a> {
    Words(&'a [i64]),
    Big(&'a [BigInt]),
}

/// Bit length of x (0 for 0).
fn bits_i128(x: i128) -> u64 {
    128 - x.unsigned_abs().leading_zeros() as u64
}

impl CyclotomicField {
    /// a⁻¹ (an error for a = 0). Multi-modular: see the module documentation.
    pub fn inv(&self, a: &Cyc) -> Result<Cyc, FieldError> {
        self.check(a.n)?;
        if a.is_zero() {
            return Err(FieldError::DivisionByZero);
        }
        let rational = match &a.data {
            Data::Small { num, .. } => num[1..].iter().all(|&c| c == 0),
            Data::Big { num, .. } => num[1..].iter().all(Zero::is_zero),
        };
        if rational {
            let (p, q) = a.as_rational().expect("checked rational");
            return self.big_rational(&q, &p);
        }
        let n = self.conductor();
        let (numerators, den) = match &a.data {
            Data::Small { num, den } => (Numerators::Words(num), BigInt::from(*den)),
            Data::Big { num, den } => (Numerators::Big(num), den.clone()),
        };
        let bound_bits = self.hadamard_bits(&numerators);
        // Π p_i > 2^{61·count} ≥ 2^{bound_bits + 2} > 2H
        let count = (bound_bits + 2).div_ceil(PRIME_BITS) as usize;
        let mut primes: Vec<Arc<ModPrime>> = Vec::new();
        let mut residues: Vec<Vec<u64>> = Vec::with_capacity(count);
        let mut attempt = 2;
        while residues.len() < count {
            if primes.len() == residues.len() {
                primes = self.primes((2 * primes.len()).max(2).min(count));
            }
            residues.push(self.cofactors_mod(&primes[residues.len()], &numerators));
            let k = residues.len();
            if k == attempt && 2 * k <= count {
                attempt *= 2;
                if let Some(inverse) = self.early_inverse(a, &den, &primes[..k], &residues) {
                    return Ok(inverse);
                }
            }
        }
        let primes = &primes[..count];
        let phi = self.degree();
        if count <= 2 {
            let values = crt_signed_small(primes, &residues);
            let scaled: Option<Vec<i128>> = den
                .to_i128()
                .and_then(|d| values[..phi].iter().map(|y| y.checked_mul(d)).collect());
            if let Some(scaled) = scaled {
                return Ok(Cyc::from_wide(n, &scaled, values[phi]));
            }
            let num = values[..phi]
                .iter()
                .map(|&y| BigInt::from(y) * &den)
                .collect();
            return Ok(Cyc::from_big(n, num, BigInt::from(values[phi])));
        }
        let mut values = crt_signed(primes, &residues);
        let norm = values.pop().expect("φ + 1 values");
        let num = values.into_iter().map(|y| y * &den).collect();
        Ok(Cyc::from_big(n, num, norm))
    }

    /// Norm down to Q, the product of all Galois conjugates, as (numerator, positive
    /// denominator) in lowest terms: N(a) = N(A)/d^φ with N(A) = Π_k A(r_k) recovered modulo
    /// primes beyond Hadamard's bound (see the module documentation).
    pub fn norm(&self, a: &Cyc) -> Result<(BigInt, BigInt), FieldError> {
        self.check(a.n)?;
        let (numerators, den) = match &a.data {
            Data::Small { num, den } => (Numerators::Words(num), BigInt::from(*den)),
            Data::Big { num, den } => (Numerators::Big(num), den.clone()),
        };
        if a.is_zero() {
            return Ok((BigInt::from(0), BigInt::from(1)));
        }
        let count = (self.hadamard_bits(&numerators) + 2).div_ceil(PRIME_BITS) as usize;
        let primes = self.primes(count);
        let residues: Vec<Vec<u64>> = primes
            .iter()
            .map(|prime| {
                let m = &prime.mont;
                let values = self.evaluations_mod(prime, &numerators);
                vec![values.iter().fold(m.of_u64(1), |acc, &v| m.mul(acc, v))]
            })
            .collect();
        let norm = crt_signed(&primes, &residues).pop().expect("one value");
        let den = den.pow(self.degree() as u32);
        let g = norm.gcd(&den);
        Ok((norm / &g, den / g))
    }

    /// Output-sensitive shortcut, tried after 2, 4, 8, … primes while they are at most half
    /// of the Hadamard count: when A⁻¹ = Y/N(A) has much smaller numbers in lowest terms than
    /// the bound (large cancellation, as in inverting an inverse), rational reconstruction
    /// of A⁻¹ ≡ Y·N(A)⁻¹ modulo P = Π p_i recovers it early. The candidate is accepted only
    /// after an exact check a·candidate = 1, so the result never depends on the shortcut.
    fn early_inverse(
        &self,
        a: &Cyc,
        den: &BigInt,
        primes: &[Arc<ModPrime>],
        residues: &[Vec<u64>],
    ) -> Option<Cyc> {
        let phi = self.degree();
        let inverse_residues: Vec<Vec<u64>> = primes
            .iter()
            .zip(residues)
            .map(|(prime, r)| {
                let m = &prime.mont;
                // a prime dividing N(A) carries no information about A⁻¹: give up this round
                let norm_inv = (r[phi] != 0).then(|| m.inv(r[phi]))?;
                Some(r[..phi].iter().map(|&y| m.mul(y, norm_inv)).collect())
            })
            .collect::<Option<_>>()?;
        let modulus = modulus(primes);
        let half: BigInt = &modulus >> 1;
        let bound = half.sqrt();
        // common denominator built coefficient by coefficient
        let mut common = BigInt::one();
        let mut numerators: Vec<BigInt> = Vec::with_capacity(phi);
        for x in (0..phi).map(|j| crt_value(primes, |i| inverse_residues[i][j])) {
            let t = symmetric((x * &common).mod_floor(&modulus), &modulus);
            if t.abs() <= bound {
                numerators.push(t);
                continue;
            }
            let (r, s) = rational_reconstruction(&t, &modulus, &bound)?;
            for v in numerators.iter_mut() {
                *v *= &s;
            }
            common *= s;
            if common > bound {
                return None;
            }
            numerators.push(r);
        }
        let num = numerators.into_iter().map(|v| v * den).collect();
        let candidate = Cyc::from_big(self.conductor(), num, common);
        self.mul(a, &candidate).ok()?.is_one().then_some(candidate)
    }

    /// An upper bound on log2 of H = Π_j ‖A·x^j mod Φ_n‖₂ (rounded up).
    fn hadamard_bits(&self, a: &Numerators) -> u64 {
        let big = match a {
            Numerators::Words(w) => {
                if let Some(bits) = self.column_bits(w.iter().map(|&c| c as i128).collect()) {
                    return bits;
                }
                w.iter().map(|&c| BigInt::from(c)).collect()
            }
            Numerators::Big(b) => b.to_vec(),
        };
        self.column_bits(big)
            .expect("big arithmetic does not overflow")
    }

    /// ⌈½ Σ_j bitlen(‖A·x^j mod Φ_n‖₂²)⌉ over the φ columns, in one integer tier.
    fn column_bits<R: IntRing + SquareBits>(&self, mut col: Vec<R>) -> Option<u64> {
        let phi = self.degree() as u64;
        if self.reduction() == Reduction::Negacyclic {
            // multiplication by x permutes coefficients up to sign: every column has norm ‖A‖₂
            return Some((phi * R::norm_squared_bits(&col)?).div_ceil(2));
        }
        let mut total = 0u64;
        for j in 0..phi {
            total += R::norm_squared_bits(&col)?;
            if j + 1 < phi {
                // col ← x·col mod Φ_n: shift up, then subtract top·Φ_n
                let top = col.pop().expect("φ ≥ 1");
                col.insert(0, R::zero());
                for &(t, c) in self.lower_terms() {
                    col[t] = col[t].sub(&top.mul(&R::from_i64(c))?)?;
                }
            }
        }
        Some(total.div_ceil(2))
    }

    /// v_k = A(r_k) mod p at every root r_k of Φ_n (Montgomery residues), all k in parallel
    /// by Horner's rule.
    fn evaluations_mod(&self, prime: &ModPrime, a: &Numerators) -> Vec<u64> {
        let m = &prime.mont;
        let phi = self.degree();
        let coeffs: Vec<u64> = match a {
            Numerators::Words(w) => w.iter().map(|&c| m.of_i64(c)).collect(),
            Numerators::Big(b) => b.iter().map(|c| m.of_big(c)).collect(),
        };
        let mut values = vec![coeffs[phi - 1]; phi];
        for &c in coeffs[..phi - 1].iter().rev() {
            for (v, &r) in values.iter_mut().zip(&prime.roots) {
                *v = m.add(m.mul(*v, r), c);
            }
        }
        values
    }

    /// N(A) mod p and the coefficients of Y = N(A)·A⁻¹ mod p (Montgomery residues), as
    /// φ + 1 values: Y's coefficients, then N(A).
    fn cofactors_mod(&self, prime: &Arc<ModPrime>, a: &Numerators) -> Vec<u64> {
        let m = &prime.mont;
        let phi = self.degree();
        let values = self.evaluations_mod(prime, a);
        // Y(r_k) = Π_{l≠k} v_l by prefix and suffix products; N(A) = Π v_l
        let one = m.of_u64(1);
        let mut cofactor = vec![one; phi];
        let mut prefix = one;
        for (c, &v) in cofactor.iter_mut().zip(&values) {
            *c = prefix;
            prefix = m.mul(prefix, v);
        }
        let norm = prefix;
        let mut suffix = one;
        for (c, &v) in cofactor.iter_mut().zip(&values).rev() {
            *c = m.mul(*c, suffix);
            suffix = m.mul(suffix, v);
        }
        // weights w_k = Y(r_k)/Φ'(r_k); then Y = Σ_k w_k·q_k with q_k = Φ/(x − r_k), whose
        // coefficients come top-down by synthetic division: q_{φ−1} = 1,
        // q_{i−1} = Φ_i + r_k·q_i; all k advance together.
        for (c, &d) in cofactor.iter_mut().zip(&prime.inv_derivative) {
            *c = m.mul(*c, d);
        }
        let weights = cofactor;
        let mut q = vec![one; phi];
        let mut out = vec![0u64; phi + 1];
        out[phi - 1] = weights.iter().fold(0, |s, &w| m.add(s, w));
        for i in (1..phi).rev() {
            let phi_i = prime.cyclotomic[i];
            let mut acc = 0;
            for ((qk, &r), &w) in q.iter_mut().zip(&prime.roots).zip(&weights) {
                *qk = m.add(phi_i, m.mul(r, *qk));
                acc = m.add(acc, m.mul(w, *qk));
            }
            out[i - 1] = acc;
        }
        out[phi] = norm;
        out
    }
}

/// Squared 2-norms in one integer tier.
trait SquareBits: Sized {
    /// Bit length of Σ v_i² (`None` on overflow).
    fn norm_squared_bits(v: &[Self]) -> Option<u64>;
}

impl SquareBits for i128 {
    fn norm_squared_bits(v: &[i128]) -> Option<u64> {
        let mut s: i128 = 0;
        for &c in v {
            s = s.checked_add(c.checked_mul(c)?)?;
        }
        Some(bits_i128(s))
    }
}

impl SquareBits for BigInt {
    /// From bit lengths only (squaring big numbers costs more than the bound saves):
    /// Σ c_i² < φ·2^{2b} with b the largest bit length, so bitlen ≤ 2b + bitlen(φ).
    fn norm_squared_bits(v: &[BigInt]) -> Option<u64> {
        let b = v.iter().map(|c| c.bits()).max().unwrap_or(0);
        Some(2 * b + (64 - (v.len() as u64).leading_zeros() as u64))
    }
}
