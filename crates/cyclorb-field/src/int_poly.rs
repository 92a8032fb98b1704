//! Exact univariate polynomials with integer coefficients (`BigInt`, no size limit), constant term first, kept
//! trimmed (no zero leading coefficient; the zero polynomial is empty): products, exact
//! division by monic polynomials, primitive parts, cyclotomic polynomials and evaluation
//! modulo a prime. Rational polynomials enter through [`from_rationals`], which clears
//! denominators (a polynomial over Q and its primitive integer multiple have the same
//! roots and the same factors up to constants).

use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, ToPrimitive, Zero};

use crate::numtheory::moebius;

/// A polynomial over Z, constant term first, trimmed.
pub type IntPoly = Vec<BigInt>;

/// Drop zero leading coefficients.
pub fn trim(mut p: IntPoly) -> IntPoly {
    while p.last().is_some_and(Zero::is_zero) {
        p.pop();
    }
    p
}

/// The degree (0 for constants, and for the zero polynomial by convention).
pub fn degree(p: &[BigInt]) -> usize {
    p.len().saturating_sub(1)
}

/// a·b.
pub fn mul(a: &[BigInt], b: &[BigInt]) -> IntPoly {
    if a.is_empty() || b.is_empty() {
        return Vec::new();
    }
    let mut out = vec![BigInt::zero(); a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        if x.is_zero() {
            continue;
        }
        for (j, y) in b.iter().enumerate() {
            out[i + j] += x * y;
        }
    }
    trim(out)
}

/// p / m when the monic polynomial m divides p exactly, `None` otherwise.
pub fn div_exact_monic(p: &[BigInt], m: &[BigInt]) -> Option<IntPoly> {
    let dm = m.len().checked_sub(1)?;
    if !m[dm].is_one() {
        return None;
    }
    if p.len() < m.len() {
        return p.iter().all(Zero::is_zero).then(Vec::new);
    }
    let mut rem = p.to_vec();
    let mut quot = vec![BigInt::zero(); p.len() - dm];
    for i in (0..quot.len()).rev() {
        let c = rem[i + dm].clone();
        if c.is_zero() {
            continue;
        }
        for (j, mj) in m.iter().enumerate() {
            rem[i + j] -= &c * mj;
        }
        quot[i] = c;
    }
    rem.iter().all(Zero::is_zero).then(|| trim(quot))
}

/// The primitive part: divided by the gcd of the coefficients, leading coefficient positive.
pub fn primitive_part(p: IntPoly) -> IntPoly {
    let p = trim(p);
    let Some(lead) = p.last() else {
        return p;
    };
    let content = p.iter().fold(BigInt::zero(), |g, c| g.gcd(c));
    let sign = if lead.is_negative() {
        -BigInt::one()
    } else {
        BigInt::one()
    };
    let divisor = content * sign;
    p.into_iter().map(|c| c / &divisor).collect()
}

/// The primitive integer polynomial proportional to Σ (num_k/den_k) x^k (denominators
/// positive); empty for the zero polynomial.
pub fn from_rationals(coefficients: &[(BigInt, BigInt)]) -> IntPoly {
    let common = coefficients
        .iter()
        .fold(BigInt::one(), |l, (_, d)| l.lcm(d));
    let scaled = coefficients
        .iter()
        .map(|(n, d)| n * (&common / d))
        .collect();
    primitive_part(scaled)
}

/// The cyclotomic polynomial Φ_m = Π_{d | m} (x^d − 1)^{μ(m/d)} (m ≥ 1), constant term
/// first, of degree φ(m): the factors with μ = +1 multiplied, then those with μ = −1
/// divided out exactly. Both steps are sparse (x^d − 1 has two terms), so the cost is
/// O(τ(m)·m) big-integer additions. The one computation of Φ_m in the workspace (the field
/// context reads its reduction tables off it, certificates strip cyclotomic factors).
pub fn cyclotomic(m: u64) -> IntPoly {
    let divisors: Vec<usize> = (1..=m).filter(|d| m % d == 0).map(|d| d as usize).collect();
    let mut acc: IntPoly = vec![BigInt::one()];
    for &d in &divisors {
        if moebius(m / d as u64) == 1 {
            // acc·(x^d − 1): coefficient k is acc_{k−d} − acc_k
            let mut next = vec![BigInt::zero(); acc.len() + d];
            for (k, c) in acc.iter().enumerate() {
                next[k + d] += c;
                next[k] -= c;
            }
            acc = next;
        }
    }
    for &d in &divisors {
        if moebius(m / d as u64) == -1 {
            // q·(x^d − 1) = acc reads q_{k−d} = acc_k + q_k from the top down
            let len = acc.len() - d;
            let mut q = vec![BigInt::zero(); len];
            for k in (d..acc.len()).rev() {
                let above = if k < len {
                    q[k].clone()
                } else {
                    BigInt::zero()
                };
                q[k - d] = &acc[k] + above;
            }
            acc = q;
        }
    }
    trim(acc)
}

/// p(x) mod q for a prime q < 2^63 and x < q.
pub fn eval_mod(p: &[BigInt], x: u64, q: u64) -> u64 {
    let modulus = BigInt::from(q);
    p.iter().rev().fold(0u64, |acc, c| {
        let c = c.mod_floor(&modulus).to_u64().expect("reduced below q");
        ((acc as u128 * x as u128 + c as u128) % q as u128) as u64
    })
}

/// Integer coefficients as decimal strings.
pub fn to_strings(p: &[BigInt]) -> Vec<String> {
    p.iter().map(ToString::to_string).collect()
}

/// Decimal strings back to a trimmed polynomial; `None` on a malformed number.
pub fn from_strings(texts: &[String]) -> Option<IntPoly> {
    texts
        .iter()
        .map(|t| t.parse::<BigInt>().ok())
        .collect::<Option<Vec<_>>>()
        .map(trim)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn ints(cs: &[i64]) -> IntPoly {
        cs.iter().map(|&c| BigInt::from(c)).collect()
    }

    #[test]
    fn cyclotomic_polynomials() {
        // Φ_1 = x − 1, Φ_4 = x² + 1, Φ_6 = x² − x + 1, Φ_12 = x⁴ − x² + 1 (textbook values;
        // common practice)
        assert_eq!(cyclotomic(1), ints(&[-1, 1]));
        assert_eq!(cyclotomic(4), ints(&[1, 0, 1]));
        assert_eq!(cyclotomic(6), ints(&[1, -1, 1]));
        assert_eq!(cyclotomic(12), ints(&[1, 0, -1, 0, 1]));
        // Φ_105 is the first with a coefficient outside {0, ±1}: −2 at x⁷ and x⁴¹
        // (Migotti 1883; common practice), of degree φ(105) = 48
        let phi105 = cyclotomic(105);
        assert_eq!(degree(&phi105), 48);
        assert_eq!(phi105[7], BigInt::from(-2));
        assert_eq!(phi105[41], BigInt::from(-2));
        assert!(phi105
            .iter()
            .enumerate()
            .all(|(k, c)| k == 7 || k == 41 || c.magnitude() <= &1u32.into()));
    }

    #[test]
    fn exact_division_and_primitive_parts() {
        let p = mul(&ints(&[-1, 1]), &ints(&[1, 1, 1])); // x³ − 1
        assert_eq!(p, ints(&[-1, 0, 0, 1]));
        assert_eq!(div_exact_monic(&p, &ints(&[-1, 1])), Some(ints(&[1, 1, 1])));
        assert_eq!(div_exact_monic(&p, &ints(&[1, 1])), None);
        assert_eq!(primitive_part(ints(&[-4, 6, -2])), ints(&[2, -3, 1]));
        let halves = [
            (BigInt::from(1), BigInt::from(2)),
            (BigInt::from(-3), BigInt::from(4)),
        ];
        assert_eq!(from_rationals(&halves), ints(&[-2, 3]));
        assert_eq!(eval_mod(&ints(&[1, 0, 1]), 3, 7), 3);
    }
}
