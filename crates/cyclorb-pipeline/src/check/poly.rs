//! Polynomials for the witness re-check (constant term first), written out plainly: over
//! Q(ζ_n) (interpolation, products, division by x − 1, the norm to Q) and, over Z, Φ_m and
//! φ(m). Plain Z[x] arithmetic (products, trimming, primitive parts, exact division) is
//! cyclorb-field's `int_poly`; Φ_m and φ(m) are computed here by a route of their own (x^m − 1
//! divided by the Φ_d of its proper divisors, φ by trial division), because the
//! `no-cyclotomic-factor` claim is only as sound as them and the producer strips its factors
//! with `int_poly::cyclotomic` (the Möbius product).

use std::collections::HashSet;

use cyclorb_field::int_poly::{self, IntPoly};
use cyclorb_field::{Cyc, CyclotomicField};
use num_bigint::BigInt;
use num_traits::{One, Zero};

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
    Ok((int_poly::from_rationals(&rationals), seen.len()))
}

/// Φ_m (m ≥ 1): x^m − 1 divided exactly by every Φ_d, d a proper divisor of m.
pub fn cyclotomic(m: u64) -> IntPoly {
    let mut p = vec![BigInt::zero(); m as usize + 1];
    p[0] = -BigInt::one();
    p[m as usize] = BigInt::one();
    for d in (1..m).filter(|d| m % d == 0) {
        p = int_poly::div_exact_monic(&p, &cyclotomic(d)).expect("Φ_d divides x^m − 1 for d | m");
    }
    p
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
