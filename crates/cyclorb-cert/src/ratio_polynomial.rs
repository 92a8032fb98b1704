//! The polynomial of eigenvalue ratios and its norm down to Q.
//!
//! For f = Π_i (x − λ_i) monic of degree m over K = Q(ζ_n) with f(0) ≠ 0,
//! R(x) = Π_{i,j} (x − λ_i/λ_j) (equal to Res_y(f(y), f(x·y)) / f(0)^m up to sign) is
//! computed from power sums: the ratios have power sums
//! P_k = Σ_{i,j} (λ_i/λ_j)^k = p_k(λ)·p_k(1/λ), where p_k(λ) comes from the coefficients of
//! f and p_k(1/λ) from those of the reversed polynomial by Newton's identities; Newton's
//! identities again turn P_1, …, P_{m²} into the coefficients of R. The m diagonal ratios
//! λ_i/λ_i = 1 are removed exactly: R is divided by (x − 1)^m.
//!
//! The norm: the Galois group of K permutes the distinct conjugates σ(R), so their
//! product N(x) lies in Q[x]; its roots are the σ(λ_i)/σ(λ_j). If λ_i/λ_j is a root of
//! unity, so is each conjugate; so if every root of N is a root of unity (N is a product of
//! cyclotomic polynomials), every ratio λ_i/λ_j is one, and conversely a root of N that is
//! not a root of unity is σ(λ_i/λ_j) for some σ, i ≠ j, so λ_i/λ_j is not a root of unity.

use cyclorb_field::{Cyc, CyclotomicField};
use hashbrown::HashSet;
use num_bigint::BigInt;

use crate::error::CertError;
use cyclorb_field::int_poly::{from_rationals, IntPoly};

/// Power sums p_1, …, p_count of the roots of the monic f = x^m + c_1 x^{m−1} + … + c_m
/// (given constant term first), by Newton's identities:
/// p_k = −(c_1 p_{k−1} + … + c_{k−1} p_1 + k·c_k) for k ≤ m, and
/// p_k = −(c_1 p_{k−1} + … + c_m p_{k−m}) for k > m.
fn power_sums(field: &CyclotomicField, f: &[Cyc], count: usize) -> Result<Vec<Cyc>, CertError> {
    let m = f.len() - 1;
    let c = |i: usize| &f[m - i];
    let mut p: Vec<Cyc> = Vec::with_capacity(count + 1);
    p.push(field.int(m as i64)); // p_0 = m, unused by the recursion
    for k in 1..=count {
        let top = (k - 1).min(m);
        let mut terms: Vec<(&Cyc, &Cyc)> = (1..=top).map(|i| (c(i), &p[k - i])).collect();
        let k_term = field.int(k as i64);
        if k <= m {
            terms.push((&k_term, c(k)));
        }
        let sum = field.dot(terms)?;
        p.push(field.neg(&sum));
    }
    p.remove(0);
    Ok(p)
}

/// The monic polynomial (constant term first) of degree `sums.len()` whose roots have the
/// power sums `sums`: k·e_k = Σ_{i=1}^{k} (−1)^{i−1} e_{k−i} P_i, then
/// R = Σ_k (−1)^k e_k x^{N−k}.
fn from_power_sums(field: &CyclotomicField, sums: &[Cyc]) -> Result<Vec<Cyc>, CertError> {
    let n = sums.len();
    let mut e: Vec<Cyc> = vec![field.one()];
    for k in 1..=n {
        let negated: Vec<Cyc> = (1..=k)
            .map(|i| {
                if i % 2 == 0 {
                    field.neg(&sums[i - 1])
                } else {
                    sums[i - 1].clone()
                }
            })
            .collect();
        let sum = field.dot((1..=k).map(|i| (&e[k - i], &negated[i - 1])))?;
        e.push(field.mul(&sum, &field.rational(1, k as i64)?)?);
    }
    let mut r = vec![field.zero(); n + 1];
    for (k, ek) in e.into_iter().enumerate() {
        r[n - k] = if k % 2 == 1 { field.neg(&ek) } else { ek };
    }
    Ok(r)
}

/// p / (x − 1) when it divides exactly (synthetic division), `None` otherwise.
fn divide_by_x_minus_one(
    field: &CyclotomicField,
    p: &[Cyc],
) -> Result<Option<Vec<Cyc>>, CertError> {
    let d = p.len() - 1;
    let mut quotient = vec![field.zero(); d];
    let mut carry = field.zero();
    for k in (1..=d).rev() {
        carry = field.add(&p[k], &carry)?;
        quotient[k - 1] = carry.clone();
    }
    let remainder = field.add(&p[0], &carry)?;
    Ok(remainder.is_zero().then_some(quotient))
}

/// R(x) / (x − 1)^m for monic f of degree m ≥ 1 with f(0) ≠ 0 (module documentation).
pub(crate) fn ratio_polynomial(field: &CyclotomicField, f: &[Cyc]) -> Result<Vec<Cyc>, CertError> {
    let m = f.len().saturating_sub(1);
    if m == 0 || !f[m].is_one() || f[0].is_zero() {
        return Err(CertError::Input(
            "the ratio polynomial needs a monic polynomial of degree ≥ 1 with f(0) ≠ 0".into(),
        ));
    }
    let count = m * m;
    let direct = power_sums(field, f, count)?;
    let c_m = &f[0];
    let inverse = field.inv(c_m)?;
    // reversed: x^m f(1/x) / f(0), constant first: coefficient k is f[m − k] / f(0)
    let reversed: Vec<Cyc> = (0..=m)
        .map(|k| field.mul(&f[m - k], &inverse))
        .collect::<Result<_, _>>()?;
    let inverse_sums = power_sums(field, &reversed, count)?;
    let sums: Vec<Cyc> = direct
        .iter()
        .zip(&inverse_sums)
        .map(|(a, b)| field.mul(a, b))
        .collect::<Result<_, _>>()?;
    let mut r = from_power_sums(field, &sums)?;
    for _ in 0..m {
        r = divide_by_x_minus_one(field, &r)?.ok_or_else(|| {
            CertError::Rejected("the ratio polynomial lacks its factor (x − 1)^m".into())
        })?;
    }
    Ok(r)
}

/// Product of two polynomials over K (constant term first), one reduction per coefficient.
fn mul_over(field: &CyclotomicField, a: &[Cyc], b: &[Cyc]) -> Result<Vec<Cyc>, CertError> {
    let mut out = Vec::with_capacity(a.len() + b.len() - 1);
    for k in 0..a.len() + b.len() - 1 {
        let low = k.saturating_sub(b.len() - 1);
        let high = k.min(a.len() - 1);
        out.push(field.dot((low..=high).map(|i| (&a[i], &b[k - i])))?);
    }
    Ok(out)
}

/// The norm of a polynomial over K down to Q: the product of its distinct Galois
/// conjugates, as a primitive integer polynomial; also the number of conjugates.
pub(crate) fn norm_to_integers(
    field: &CyclotomicField,
    r: &[Cyc],
) -> Result<(IntPoly, usize), CertError> {
    let mut conjugates: HashSet<Vec<Cyc>> = HashSet::new();
    for k in field.galois_group() {
        let sigma: Vec<Cyc> = r
            .iter()
            .map(|c| field.galois(c, k))
            .collect::<Result<_, _>>()?;
        conjugates.insert(sigma);
    }
    let count = conjugates.len();
    let mut product = vec![field.one()];
    for conjugate in conjugates {
        product = mul_over(field, &product, &conjugate)?;
    }
    let rational: Vec<(BigInt, BigInt)> = product
        .iter()
        .map(|c| {
            c.as_rational().ok_or_else(|| {
                CertError::Rejected("the product of the conjugates is not rational".into())
            })
        })
        .collect::<Result<_, _>>()?;
    Ok((from_rationals(&rational), count))
}
