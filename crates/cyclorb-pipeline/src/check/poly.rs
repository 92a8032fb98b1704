//! Polynomials for the witness re-check (constant term first), written out plainly: over
//! Q(ζ_n) (interpolation, products, division by x − 1, the norm to Q) and over Z (products,
//! remainders by monic polynomials, Φ_m).

use std::collections::HashSet;

use cyclorb_field::{Cyc, CyclotomicField};
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, Zero};

fn err(e: impl ToString) -> String {
    e.to_string()
}

/// The polynomial of degree ≤ N through (k, values[k]) for k = 0, …, N, by Newton's divided
/// differences (consecutive integer nodes: the k-th differences divide by k).
pub fn interpolate(field: &CyclotomicField, values: &[Cyc]) -> Result<Vec<Cyc>, String> {
    let n = values.len();
    let mut d = values.to_vec();
    for level in 1..n {
        let scale = field.rational(1, level as i64).map_err(err)?;
        for i in (level..n).rev() {
            let diff = field.sub(&d[i], &d[i - 1]).map_err(err)?;
            d[i] = field.mul(&diff, &scale).map_err(err)?;
        }
    }
    // Horner on the Newton form: p = d[n−1]; p ← p·(x − i) + d[i]
    let mut p = vec![d[n - 1].clone()];
    for i in (0..n - 1).rev() {
        let mut next = vec![field.zero(); p.len() + 1];
        for (k, c) in p.iter().enumerate() {
            next[k + 1] = field.add(&next[k + 1], c).map_err(err)?;
            let shifted = field.mul_int(c, i as i64);
            next[k] = field.sub(&next[k], &shifted).map_err(err)?;
        }
        next[0] = field.add(&next[0], &d[i]).map_err(err)?;
        p = next;
    }
    Ok(p)
}

/// a·b over Q(ζ_n).
pub fn mul(field: &CyclotomicField, a: &[Cyc], b: &[Cyc]) -> Result<Vec<Cyc>, String> {
    let mut out = vec![field.zero(); a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        for (j, y) in b.iter().enumerate() {
            let t = field.mul(x, y).map_err(err)?;
            out[i + j] = field.add(&out[i + j], &t).map_err(err)?;
        }
    }
    Ok(out)
}

/// p / (x − 1) when the division is exact (synthetic division), else `None`.
pub fn divide_by_x_minus_one(
    field: &CyclotomicField,
    p: &[Cyc],
) -> Result<Option<Vec<Cyc>>, String> {
    let n = p.len();
    if n < 2 {
        return Ok(None);
    }
    // p = (x − 1)·q: q_{k−1} = p_k + q_k, from the top
    let mut q = vec![field.zero(); n - 1];
    let mut carry = field.zero();
    for k in (1..n).rev() {
        carry = field.add(&p[k], &carry).map_err(err)?;
        q[k - 1] = carry.clone();
    }
    let remainder = field.add(&p[0], &carry).map_err(err)?;
    Ok(remainder.is_zero().then_some(q))
}

/// The product of the distinct Galois conjugates σ_k(r), k ∈ (Z/n)*, as a primitive integer
/// polynomial with positive leading coefficient, and the number of conjugates.
pub fn norm_to_z(field: &CyclotomicField, r: &[Cyc]) -> Result<(Vec<BigInt>, usize), String> {
    let mut seen: HashSet<Vec<Cyc>> = HashSet::new();
    let mut product = vec![field.one()];
    for k in field.galois_group() {
        let sigma: Vec<Cyc> = r
            .iter()
            .map(|c| field.galois(c, k))
            .collect::<Result<_, _>>()
            .map_err(err)?;
        if seen.insert(sigma.clone()) {
            product = mul(field, &product, &sigma)?;
        }
    }
    let mut rationals = Vec::with_capacity(product.len());
    for c in &product {
        rationals.push(
            c.as_rational()
                .ok_or("the product of the conjugates is not rational")?,
        );
    }
    let denominator = rationals.iter().fold(BigInt::one(), |l, (_, d)| l.lcm(d));
    let integers: Vec<BigInt> = rationals
        .iter()
        .map(|(n, d)| n * (&denominator / d))
        .collect();
    Ok((primitive(integers), seen.len()))
}

/// Divided by the gcd of the coefficients, leading coefficient positive.
fn primitive(p: Vec<BigInt>) -> Vec<BigInt> {
    let content = p.iter().fold(BigInt::zero(), |g, c| g.gcd(c));
    if content.is_zero() {
        return p;
    }
    let lead_negative = p
        .iter()
        .rev()
        .find(|c| !c.is_zero())
        .is_some_and(Signed::is_negative);
    let divisor = if lead_negative { -content } else { content };
    p.into_iter().map(|c| c / &divisor).collect()
}

/// Coefficients given as decimal text; `None` when one is not an integer.
pub fn integers(texts: &[String]) -> Option<Vec<BigInt>> {
    texts.iter().map(|t| t.parse().ok()).collect()
}

/// The degree (−1 for zero is reported as 0 with all coefficients zero).
pub fn degree(p: &[BigInt]) -> usize {
    p.iter().rposition(|c| !c.is_zero()).unwrap_or(0)
}

/// a·b over Z.
pub fn mul_z(a: &[BigInt], b: &[BigInt]) -> Vec<BigInt> {
    let mut out = vec![BigInt::zero(); a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        for (j, y) in b.iter().enumerate() {
            out[i + j] += x * y;
        }
    }
    out
}

/// The same polynomial without leading zeros.
pub fn trimmed(p: &[BigInt]) -> Vec<BigInt> {
    p[..=degree(p)].to_vec()
}

/// The remainder of a by a monic b over Z (exact: b is monic).
pub fn rem_monic(a: &[BigInt], b: &[BigInt]) -> Vec<BigInt> {
    let b = trimmed(b);
    let m = b.len() - 1;
    let mut r = trimmed(a);
    while r.len() > m && !(r.len() == 1 && r[0].is_zero()) {
        let top = r.len() - 1;
        let c = r[top].clone();
        for (k, bk) in b.iter().enumerate() {
            r[top - m + k] -= &c * bk;
        }
        r.pop();
    }
    r
}

/// Φ_m: x^m − 1 divided by every Φ_d, d a proper divisor of m.
pub fn cyclotomic(m: u64) -> Vec<BigInt> {
    let mut p = vec![BigInt::zero(); m as usize + 1];
    p[0] = -BigInt::one();
    p[m as usize] = BigInt::one();
    for d in (1..m).filter(|d| m % d == 0) {
        p = exact_quotient(&p, &cyclotomic(d));
    }
    p
}

/// a / b for a monic b dividing a.
fn exact_quotient(a: &[BigInt], b: &[BigInt]) -> Vec<BigInt> {
    let b = trimmed(b);
    let m = b.len() - 1;
    let mut r = trimmed(a);
    let mut q = vec![BigInt::zero(); r.len() - m];
    while r.len() > m {
        let top = r.len() - 1;
        let c = r[top].clone();
        for (k, bk) in b.iter().enumerate() {
            r[top - m + k] -= &c * bk;
        }
        q[top - m] = c;
        r.pop();
    }
    q
}

/// Euler's φ(m) by trial division.
pub fn euler_phi(m: u64) -> u64 {
    let (mut n, mut out, mut p) = (m, m, 2);
    while p * p <= n {
        if n % p == 0 {
            while n % p == 0 {
                n /= p;
            }
            out -= out / p;
        }
        p += 1;
    }
    if n > 1 {
        out -= out / n;
    }
    out
}
