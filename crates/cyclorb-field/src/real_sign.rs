//! The sign of a real cyclotomic number, decided with a proven error bound.
//!
//! A real x ∈ Q(ζ_n) (x = x̄) written as x = (1/den)·Σ_j c_j ζ_n^j equals
//! (1/den)·Σ_j c_j cos(2πj/n) exactly. The cosines are evaluated in fixed point with
//! P fractional bits (big integers), every operation carrying an explicit bound on its error
//! in units of 2^−P ("ulps"):
//! - π from Machin's formula π = 16·atan(1/5) − 4·atan(1/239), each arctangent an
//!   alternating series whose tail is bounded by its first omitted term;
//! - cos t by its Taylor series for 0 ≤ t ≤ π, again alternating and, once the terms decrease,
//!   with the tail bounded by the first omitted term;
//! - truncating divisions add at most one ulp; a product of intervals adds the usual
//!   |v₁|e₂ + |v₂|e₁ + e₁e₂ (rescaled) plus one ulp.
//!
//! The result is an interval [v − e, v + e] that provably contains 2^P·x. When it excludes 0
//! the sign is decided; otherwise P is doubled. Since x ≠ 0 is checked exactly first, the loop
//! ends. No floating-point number takes part.

use std::cmp::Ordering;

use crate::{Cyc, CyclotomicField};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{Signed, Zero};

/// A fixed-point value v·2^−P with |true − v·2^−P| ≤ e·2^−P.
#[derive(Clone, Debug)]
struct Interval {
    v: BigInt,
    e: BigInt,
}

impl Interval {
    fn exact(v: BigInt) -> Interval {
        Interval {
            v,
            e: BigInt::zero(),
        }
    }

    fn add(&self, o: &Interval) -> Interval {
        Interval {
            v: &self.v + &o.v,
            e: &self.e + &o.e,
        }
    }

    fn sub(&self, o: &Interval) -> Interval {
        Interval {
            v: &self.v - &o.v,
            e: &self.e + &o.e,
        }
    }

    fn mul_int(&self, m: &BigInt) -> Interval {
        Interval {
            v: &self.v * m,
            e: &self.e * m.abs(),
        }
    }

    /// Division by a positive integer: floor division adds at most one ulp.
    fn div_int(&self, m: &BigInt) -> Interval {
        Interval {
            v: self.v.div_floor(m),
            e: self.e.div_ceil(m) + 1,
        }
    }

    /// Product of two fixed-point values at precision `bits`.
    fn mul(&self, o: &Interval, bits: u64) -> Interval {
        let scale = BigInt::from(1) << bits;
        let v = (&self.v * &o.v).div_floor(&scale);
        let spread = self.v.abs() * &o.e + o.v.abs() * &self.e + &self.e * &o.e;
        Interval {
            v,
            e: spread.div_ceil(&scale) + 1,
        }
    }

    fn upper_magnitude(&self) -> BigInt {
        self.v.abs() + &self.e
    }
}

/// atan(1/m) at precision `bits` (m ≥ 2), by its alternating series.
fn arctan_inverse(m: u64, bits: u64) -> Interval {
    let m = BigInt::from(m);
    let m2 = &m * &m;
    let one = Interval::exact(BigInt::from(1) << bits);
    let mut power = one.div_int(&m); // 1/m^{2k+1}
    let mut sum = Interval::exact(BigInt::zero());
    let mut k: u64 = 0;
    loop {
        let term = power.div_int(&BigInt::from(2 * k + 1));
        sum = if k % 2 == 0 {
            sum.add(&term)
        } else {
            sum.sub(&term)
        };
        power = power.div_int(&m2);
        k += 1;
        if power.v.is_zero() {
            // the omitted tail is bounded by its first term, at most the bound on `power`
            sum.e += power.upper_magnitude() + 1;
            return sum;
        }
    }
}

/// π at precision `bits`.
fn pi(bits: u64) -> Interval {
    let a = arctan_inverse(5, bits).mul_int(&BigInt::from(16));
    let b = arctan_inverse(239, bits).mul_int(&BigInt::from(4));
    a.sub(&b)
}

/// cos t for an interval t ⊂ [0, 4] (covers [0, π]) at precision `bits`.
fn cosine(t: &Interval, bits: u64) -> Interval {
    let t2 = t.mul(t, bits);
    let mut term = Interval::exact(BigInt::from(1) << bits);
    let mut sum = term.clone();
    let mut k: u64 = 1;
    loop {
        // term_k = term_{k−1} · t² / ((2k−1)(2k)), with alternating signs
        term = term
            .mul(&t2, bits)
            .div_int(&BigInt::from((2 * k - 1) * (2 * k)));
        sum = if k % 2 == 1 {
            sum.sub(&term)
        } else {
            sum.add(&term)
        };
        k += 1;
        // once (2k−1)(2k) > 16 ≥ t², the terms decrease, so the omitted tail is at most the
        // next term, which is below the bound on the current one
        if (2 * k - 1) * (2 * k) > 16 && term.v <= BigInt::from(2) {
            sum.e += term.upper_magnitude();
            return sum;
        }
    }
}

/// An interval containing 2^bits · x for a real x given by its power-basis parts.
fn evaluate(num: &[BigInt], den: &BigInt, n: u64, bits: u64) -> Interval {
    let pi = pi(bits);
    let mut acc = Interval::exact(BigInt::zero());
    for (j, c) in num.iter().enumerate() {
        if c.is_zero() {
            continue;
        }
        // cos(2πj/n) = cos(2π·j'/n) with j' = min(j, n − j), angle in [0, π]
        let j = j as u64 % n;
        let jr = j.min(n - j);
        let angle = pi.mul_int(&BigInt::from(2 * jr)).div_int(&BigInt::from(n));
        acc = acc.add(&cosine(&angle, bits).mul_int(c));
    }
    acc.div_int(den)
}

/// The sign of a real element x of `field` (x = x̄ is required): `Some(Less)`, `Some(Equal)`
/// or `Some(Greater)`; `None` when x is not real.
pub fn real_sign(field: &CyclotomicField, x: &Cyc) -> Option<Ordering> {
    if field.conj(x) != *x {
        return None;
    }
    if x.is_zero() {
        return Some(Ordering::Equal);
    }
    let (num, den) = x.to_big_parts();
    let n = field.conductor() as u64;
    let size = num.iter().map(|c| c.bits()).max().unwrap_or(0);
    let mut bits = 64 + size + 2 * (num.len() as u64).max(1).ilog2() as u64;
    loop {
        let iv = evaluate(&num, &den, n.max(1), bits);
        if iv.v > iv.e {
            return Some(Ordering::Greater);
        }
        if -&iv.v > iv.e {
            return Some(Ordering::Less);
        }
        bits *= 2;
    }
}
