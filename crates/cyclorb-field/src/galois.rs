//! Galois action, complex conjugation, embeddings between cyclotomic fields, norm and
//! trace down to Q, and the exact root-of-unity test.

use num_bigint::BigInt;
use num_integer::Integer;

use crate::context::CyclotomicField;
use crate::element::{Cyc, Data};
use crate::error::FieldError;
use crate::ring::IntRing;

impl CyclotomicField {
    /// Substitute x^j ↦ x^{j·k} (as residues modulo Φ_n of the target), generic over the tier.
    fn substitute<R: IntRing>(&self, num: &[R], k: i64) -> Option<Vec<R>> {
        let mut out = vec![R::zero(); self.degree()];
        for (j, c) in num.iter().enumerate() {
            if c.is_zero() {
                continue;
            }
            for (t, &r) in self.residue(j as i64 * k).iter().enumerate() {
                if r != 0 {
                    out[t] = out[t].add(&c.mul(&R::from_i64(r))?)?;
                }
            }
        }
        Some(out)
    }

    fn substituted(&self, a: &Cyc, k: i64) -> Cyc {
        if let Data::Small { num, den } = &a.data {
            let wide: Vec<i128> = num.iter().map(|&c| c as i128).collect();
            if let Some(out) = self.substitute(&wide, k) {
                return Cyc::from_wide(self.conductor(), &out, *den as i128);
            }
        }
        let (num, den) = a.to_big_parts();
        let out = self
            .substitute(&num, k)
            .expect("big arithmetic does not overflow");
        Cyc::from_big(self.conductor(), out, den)
    }

    /// The Galois automorphism σ_k: ζ_n ↦ ζ_n^k, for gcd(k, n) = 1.
    pub fn galois(&self, a: &Cyc, k: i64) -> Result<Cyc, FieldError> {
        self.check(a.n)?;
        if k.gcd(&(self.conductor() as i64)) != 1 {
            return Err(FieldError::NotAnAutomorphism {
                k,
                n: self.conductor(),
            });
        }
        Ok(self.substituted(a, k))
    }

    /// Complex conjugation, σ_{−1} (ζ_n ↦ ζ_n⁻¹ under the standard embedding).
    pub fn conj(&self, a: &Cyc) -> Cyc {
        self.substituted(a, -1)
    }

    /// Embed an element of Q(ζ_m) into this field Q(ζ_n), m | n: ζ_m ↦ ζ_n^{n/m}.
    pub fn embed(&self, a: &Cyc) -> Result<Cyc, FieldError> {
        let m = a.n;
        let n = self.conductor();
        if n % m != 0 {
            return Err(FieldError::NotASubfield { from: m, to: n });
        }
        let (num, den) = a.to_big_parts();
        let mut wide = vec![BigInt::from(0); n as usize];
        for (j, c) in num.into_iter().enumerate() {
            let e = (j as u64 * (n / m) as u64 % n as u64) as usize;
            wide[e] += c;
        }
        let low = self.fold(&wide).expect("big arithmetic does not overflow");
        Ok(Cyc::from_big(n, low, den))
    }

    /// The exponents k, 1 ≤ k < n (k = 1 when n ≤ 2), with gcd(k, n) = 1: Gal(Q(ζ_n)/Q).
    pub fn galois_group(&self) -> Vec<i64> {
        let n = self.conductor() as i64;
        (1..n.max(2)).filter(|k| k.gcd(&n) == 1).collect()
    }

    /// Trace down to Q: the sum of all Galois conjugates.
    pub fn trace(&self, a: &Cyc) -> Result<(BigInt, BigInt), FieldError> {
        self.check(a.n)?;
        let mut acc = self.zero();
        for k in self.galois_group() {
            acc = self.add(&acc, &self.substituted(a, k))?;
        }
        Ok(acc.as_rational().expect("a trace is rational"))
    }

    /// When a is a root of unity, its multiplicative order; otherwise `None`.
    ///
    /// The roots of unity of Q(ζ_n) are ±ζ_n^k; the test first checks a·ā = 1 and then
    /// compares a with each of them exactly.
    pub fn root_of_unity_order(&self, a: &Cyc) -> Result<Option<u64>, FieldError> {
        self.check(a.n)?;
        if a.is_zero() || !self.mul(a, &self.conj(a))?.is_one() {
            return Ok(None);
        }
        let n = self.conductor() as i64;
        for k in 0..n {
            let z = self.zeta_pow(k);
            if &z == a {
                return Ok(Some((n / k.gcd(&n)) as u64));
            }
            if self.neg(&z) == *a {
                // −ζ_n^k = ζ_{2n}^{n + 2k}
                let e = n + 2 * k;
                return Ok(Some((2 * n / e.gcd(&(2 * n))) as u64));
            }
        }
        Ok(None)
    }

    /// When a = ζ_n^k or a = −ζ_n^k = ζ_{2n}^{n+2k}, the exponent of a as a power of ζ_N,
    /// N = lcm(n, 2) if needed: returns (N, e) with a = exp(2πi e/N).
    pub fn root_of_unity_exponent(&self, a: &Cyc) -> Result<Option<(u64, u64)>, FieldError> {
        self.check(a.n)?;
        let n = self.conductor() as i64;
        let big = if n % 2 == 0 { n } else { 2 * n };
        for k in 0..n {
            let z = self.zeta_pow(k);
            if &z == a {
                return Ok(Some((big as u64, (k * big / n) as u64)));
            }
            if self.neg(&z) == *a {
                let e = (k * big / n + big / 2).rem_euclid(big);
                return Ok(Some((big as u64, e as u64)));
            }
        }
        Ok(None)
    }
}

/// The smallest conductor whose field contains both Q(ζ_m) and Q(ζ_n): lcm(m, n).
pub fn common_conductor(m: u32, n: u32) -> u32 {
    m.lcm(&n)
}
