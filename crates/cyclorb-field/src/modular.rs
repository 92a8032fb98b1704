//! Word-sized primes p ≡ 1 (mod n) for multi-modular algorithms.
//!
//! Modulo such a prime Φ_n splits into linear factors, Φ_n ≡ Π_k (x − r_k) with r_k = r^k,
//! k ∈ (Z/n)*, r a primitive n-th root of unity mod p; so Z[ζ_n]/(p) ≅ F_p^φ(n) through
//! a ↦ (a(r_k))_k (evaluation) and back through Lagrange interpolation. An algorithm that
//! knows a bound B on the integers it wants runs modulo primes whose product exceeds 2B and
//! recovers the integers exactly by the Chinese remainder theorem ([`crt_signed`]).
//!
//! All primes lie in [2^61, 2^62), so [`PRIME_BITS`] = 61 bits are gained per prime, and
//! residues are kept in Montgomery form (R = 2^64) for multiplication without division.

use std::sync::{Arc, Mutex};

use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, Zero};

use crate::numtheory::{factorize, is_prime, pow_mod};

/// Each prime exceeds 2^PRIME_BITS.
pub(crate) const PRIME_BITS: u64 = 61;

/// Multiplication modulo an odd prime p < 2^62 in Montgomery form: x is stored as xR mod p.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Montgomery {
    /// The prime.
    pub(crate) p: u64,
    /// −p⁻¹ mod 2^64.
    neg_inv: u64,
    /// R² mod p.
    r2: u64,
}

impl Montgomery {
    fn new(p: u64) -> Montgomery {
        // Newton iteration for p⁻¹ mod 2^64: each step doubles the correct low bits.
        let mut inv: u64 = 1;
        for _ in 0..6 {
            inv = inv.wrapping_mul(2u64.wrapping_sub(p.wrapping_mul(inv)));
        }
        let r = (1u128 << 64) % p as u128;
        let r2 = (r * r % p as u128) as u64;
        Montgomery {
            p,
            neg_inv: inv.wrapping_neg(),
            r2,
        }
    }

    /// t·R⁻¹ mod p for t < p·2^64.
    #[inline(always)]
    pub(crate) fn redc(&self, t: u128) -> u64 {
        let m = (t as u64).wrapping_mul(self.neg_inv);
        let u = ((t + m as u128 * self.p as u128) >> 64) as u64;
        if u >= self.p {
            u - self.p
        } else {
            u
        }
    }

    /// Product of two Montgomery residues.
    #[inline(always)]
    pub(crate) fn mul(&self, a: u64, b: u64) -> u64 {
        self.redc(a as u128 * b as u128)
    }

    /// Sum of two residues.
    #[inline(always)]
    pub(crate) fn add(&self, a: u64, b: u64) -> u64 {
        let s = a + b;
        if s >= self.p {
            s - self.p
        } else {
            s
        }
    }

    /// Difference of two residues.
    #[inline(always)]
    pub(crate) fn sub(&self, a: u64, b: u64) -> u64 {
        if a >= b {
            a - b
        } else {
            a + self.p - b
        }
    }

    /// Montgomery form of a plain residue x < p.
    #[inline(always)]
    pub(crate) fn of_u64(&self, x: u64) -> u64 {
        self.mul(x, self.r2)
    }

    /// Plain residue of a Montgomery residue.
    #[inline(always)]
    pub(crate) fn value(&self, x: u64) -> u64 {
        self.redc(x as u128)
    }

    /// x^e for a Montgomery residue x.
    pub(crate) fn pow(&self, mut x: u64, mut e: u64) -> u64 {
        let mut acc = self.of_u64(1);
        while e > 0 {
            if e & 1 == 1 {
                acc = self.mul(acc, x);
            }
            x = self.mul(x, x);
            e >>= 1;
        }
        acc
    }

    /// x⁻¹ for a non-zero Montgomery residue x (Fermat: x^{p−2}).
    pub(crate) fn inv(&self, x: u64) -> u64 {
        self.pow(x, self.p - 2)
    }

    /// Montgomery form of a signed machine integer.
    #[inline(always)]
    pub(crate) fn of_i64(&self, x: i64) -> u64 {
        self.of_u64(x.rem_euclid(self.p as i64) as u64)
    }

    /// Montgomery form of a big integer: Horner's rule over its base-2^64 digits, top first,
    /// with 2^64 ≡ R (so multiplying a Montgomery residue by R's residue is one product).
    pub(crate) fn of_big(&self, x: &BigInt) -> u64 {
        let radix = self.of_u64(((1u128 << 64) % self.p as u128) as u64);
        let digits: Vec<u64> = x.magnitude().iter_u64_digits().collect();
        let magnitude = digits.iter().rev().fold(0, |acc, &d| {
            self.add(self.mul(acc, radix), self.of_u64(d % self.p))
        });
        if x.is_negative() {
            self.sub(0, magnitude)
        } else {
            magnitude
        }
    }
}

/// One prime p ≡ 1 (mod n) with the data to evaluate at the roots of Φ_n and interpolate back.
#[derive(Debug)]
pub(crate) struct ModPrime {
    /// Arithmetic modulo p.
    pub(crate) mont: Montgomery,
    /// The roots r_k of Φ_n mod p (Montgomery form), one per k ∈ (Z/n)*.
    pub(crate) roots: Vec<u64>,
    /// Φ_n mod p (Montgomery form), constant term first, length φ + 1.
    pub(crate) cyclotomic: Vec<u64>,
    /// 1/Φ_n'(r_k) (Montgomery form), aligned with `roots`.
    pub(crate) inv_derivative: Vec<u64>,
    /// p_j mod p (Montgomery form) for every earlier prime p_j of the cache.
    earlier: Vec<u64>,
    /// (p_0 ⋯ p_{i−1})⁻¹ mod p (Montgomery form), p = p_i.
    garner_inv: u64,
}

impl ModPrime {
    fn new(p: u64, n: u64, cyclotomic: &[i64], earlier_primes: &[u64]) -> ModPrime {
        let mont = Montgomery::new(p);
        let prime_factors: Vec<u64> = factorize(n).into_iter().map(|(q, _)| q).collect();
        let root = (2..p)
            .map(|g| pow_mod(g, (p - 1) / n, p))
            .find(|&r| prime_factors.iter().all(|&q| pow_mod(r, n / q, p) != 1))
            .expect("F_p* is cyclic of order divisible by n");
        let roots: Vec<u64> = (1..n.max(2))
            .filter(|k| k.gcd(&n) == 1)
            .map(|k| mont.of_u64(pow_mod(root, k, p)))
            .collect();
        let cyclotomic: Vec<u64> = cyclotomic.iter().map(|&c| mont.of_i64(c)).collect();
        let inv_derivative = roots
            .iter()
            .map(|&r| {
                // Φ'(r) by Horner on the derivative's coefficients j·Φ_j.
                let mut acc = 0;
                for j in (1..cyclotomic.len()).rev() {
                    let coeff = mont.mul(cyclotomic[j], mont.of_u64(j as u64 % p));
                    acc = mont.add(mont.mul(acc, r), coeff);
                }
                mont.inv(acc)
            })
            .collect();
        let earlier: Vec<u64> = earlier_primes.iter().map(|&q| mont.of_u64(q % p)).collect();
        let product = earlier
            .iter()
            .fold(mont.of_u64(1), |acc, &q| mont.mul(acc, q));
        let garner_inv = mont.inv(product);
        ModPrime {
            mont,
            roots,
            cyclotomic,
            inv_derivative,
            earlier,
            garner_inv,
        }
    }
}

/// The primes of one field, found on demand (downwards from 2^62) and kept for reuse.
#[derive(Debug, Default)]
pub(crate) struct PrimeCache {
    primes: Mutex<Vec<Arc<ModPrime>>>,
}

impl Clone for PrimeCache {
    fn clone(&self) -> Self {
        PrimeCache {
            primes: Mutex::new(self.lock().clone()),
        }
    }
}

impl PrimeCache {
    fn lock(&self) -> std::sync::MutexGuard<'_, Vec<Arc<ModPrime>>> {
        // A panic while extending leaves a consistent prefix of valid primes.
        self.primes.lock().unwrap_or_else(|e| e.into_inner())
    }

    /// The first `count` primes for conductor `n` with cyclotomic polynomial `cyclotomic`.
    pub(crate) fn first(&self, n: u32, cyclotomic: &[i64], count: usize) -> Vec<Arc<ModPrime>> {
        let mut primes = self.lock();
        let step = (n as u64).lcm(&2);
        let mut candidate = primes.last().map_or_else(
            || ((1u64 << 62) - 1) / step * step + 1,
            |last| last.mont.p - step,
        );
        while primes.len() < count {
            if is_prime(candidate) {
                let earlier: Vec<u64> = primes.iter().map(|q| q.mont.p).collect();
                let prime = ModPrime::new(candidate, n as u64, cyclotomic, &earlier);
                primes.push(Arc::new(prime));
            }
            candidate -= step;
            assert!(candidate > 1 << PRIME_BITS, "ran out of primes above 2^61");
        }
        primes[..count].to_vec()
    }
}

/// The product P of the primes.
pub(crate) fn modulus(primes: &[Arc<ModPrime>]) -> BigInt {
    primes
        .iter()
        .fold(BigInt::from(1), |acc, q| acc * BigInt::from(q.mont.p))
}

/// The x ∈ [0, P) with x ≡ residue(i) (mod p_i) for every i, where residue(i) is a
/// Montgomery residue modulo the i-th prime. Garner's mixed-radix algorithm; the primes must
/// be the cache's first `primes.len()`, in order.
pub(crate) fn crt_value(primes: &[Arc<ModPrime>], residue: impl Fn(usize) -> u64) -> BigInt {
    let mut digits: Vec<u64> = Vec::with_capacity(primes.len());
    for (i, prime) in primes.iter().enumerate() {
        let m = &prime.mont;
        // t = c_0 + c_1 p_0 + … + c_{i−1} p_0⋯p_{i−2} mod p_i, by Horner from the top
        let mut t = 0;
        for l in (0..i).rev() {
            t = m.add(m.mul(t, prime.earlier[l]), m.of_u64(digits[l] % m.p));
        }
        let c = m.mul(m.sub(residue(i), t), prime.garner_inv);
        digits.push(m.value(c));
    }
    let mut x = BigInt::from(0);
    for (digit, prime) in digits.iter().zip(primes).rev() {
        x = x * BigInt::from(prime.mont.p) + BigInt::from(*digit);
    }
    x
}

/// The representative of x mod P in (−P/2, P/2].
pub(crate) fn symmetric(x: BigInt, modulus: &BigInt) -> BigInt {
    if x > (modulus >> 1) {
        x - modulus
    } else {
        x
    }
}

/// The integers x with |x| < P/2 (P = Π p_i) and x ≡ residues[i][j] (mod p_i), one per
/// column j (Montgomery residues; the primes are the cache's first, in order).
pub(crate) fn crt_signed(primes: &[Arc<ModPrime>], residues: &[Vec<u64>]) -> Vec<BigInt> {
    let modulus = modulus(primes);
    (0..residues[0].len())
        .map(|j| symmetric(crt_value(primes, |i| residues[i][j]), &modulus))
        .collect()
}

/// Wang's rational reconstruction: the r/s with |r| ≤ bound, 0 < s ≤ bound and
/// r ≡ s·u (mod m), found by the extended Euclidean algorithm on (m, u); unique when
/// 2·bound² < m. `None` when no such fraction exists.
pub(crate) fn rational_reconstruction(
    u: &BigInt,
    m: &BigInt,
    bound: &BigInt,
) -> Option<(BigInt, BigInt)> {
    let (mut r0, mut r1) = (m.clone(), u.mod_floor(m));
    let (mut s0, mut s1) = (BigInt::from(0), BigInt::from(1));
    while &r1 > bound {
        let (q, r) = r0.div_rem(&r1);
        r0 = std::mem::replace(&mut r1, r);
        let s = &s0 - &q * &s1;
        s0 = std::mem::replace(&mut s1, s);
    }
    if s1.is_zero() || s1.abs() > *bound || !r1.gcd(&s1).is_one() {
        return None;
    }
    Some(if s1.is_negative() {
        (-r1, -s1)
    } else {
        (r1, s1)
    })
}

/// [`crt_signed`] for one or two primes, in 128-bit words.
pub(crate) fn crt_signed_small(primes: &[Arc<ModPrime>], residues: &[Vec<u64>]) -> Vec<i128> {
    let first = &primes[0].mont;
    match primes.get(1) {
        None => residues[0]
            .iter()
            .map(|&r| {
                let x = first.value(r);
                if x > first.p / 2 {
                    x as i128 - first.p as i128
                } else {
                    x as i128
                }
            })
            .collect(),
        Some(second) => {
            let m = &second.mont;
            let p0 = first.p as u128;
            let modulus = p0 * m.p as u128;
            residues[0]
                .iter()
                .zip(&residues[1])
                .map(|(&r0, &r1)| {
                    let c0 = first.value(r0);
                    let t = m.of_u64(c0 % m.p);
                    let c1 = m.value(m.mul(m.sub(r1, t), second.garner_inv));
                    let x = c0 as u128 + c1 as u128 * p0;
                    if x > modulus / 2 {
                        -((modulus - x) as i128)
                    } else {
                        x as i128
                    }
                })
                .collect()
        }
    }
}
