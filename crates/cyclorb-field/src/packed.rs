//! Products of small coefficient vectors by Kronecker substitution: two coefficients per
//! 64-bit digit, so one 64×64→128-bit multiplication does the work of four coefficient
//! products.
//!
//! A coefficient vector a (|a_i| < 2^31) is the integer A = Σ_i a_i·2^{32i}, written in base
//! 2^64 with signed digits d_m = a_{2m} + a_{2m+1}·2^32 (|d_m| < 2^63). For vectors a, b the
//! integer A·B = Σ_k c_k·2^{32k} carries the convolution c = a ∗ b, and is computed as
//! Σ_t D_t·2^{64t} with D_t = Σ_{m+m'=t} d_m·d'_{m'} in i128. Sums of several such products
//! add digitwise. When every coefficient of the result satisfies |c_k| < 2^31
//! ([`PACKED_LIMIT`]), the c_k are the balanced base-2^32 digits of the sum, which
//! [`unpack`] reads off exactly.
//!
//! Bounds: with |c_k| ≤ T < 2^31 for the whole sum (T = Σ over products of φ·max|a|·max|b|),
//! each digit product is below 2^{63+32} and each D_t below (φ/2)·T·2^64 < 2^127: nothing
//! overflows.

/// Exclusive bound on the absolute value of every coefficient of a packed sum.
pub(crate) const PACKED_LIMIT: u64 = 1 << 31;

/// Σ s·(a ∗ b) over `terms` (a, b, s) into `wide` (length ≥ 2φ − 1, overwritten), where
/// φ = a.len() = b.len() for every term. Precondition: every coefficient of the sum is below
/// 2^31 in absolute value (so also every |s·a_i| and |b_j|).
pub(crate) fn packed_sum<'t>(
    phi: usize,
    terms: impl Iterator<Item = (&'t [i64], &'t [i64], i64)>,
    wide: &mut [i64],
) {
    let wide = &mut wide[..2 * phi - 1];
    match phi {
        4 => fixed::<2, 3>(terms, wide),
        6 => fixed::<3, 5>(terms, wide),
        8 => fixed::<4, 7>(terms, wide),
        10 => fixed::<5, 9>(terms, wide),
        12 => fixed::<6, 11>(terms, wide),
        16 => fixed::<8, 15>(terms, wide),
        20 => fixed::<10, 19>(terms, wide),
        24 => fixed::<12, 23>(terms, wide),
        _ => dynamic(phi, terms, wide),
    }
}

/// Digit m of s·a: s·a_{2m} + s·a_{2m+1}·2^32 (a_{2m+1} = 0 past the end).
#[inline(always)]
fn digit(a: &[i64], s: i64, m: usize) -> i64 {
    let high = a.get(2 * m + 1).map_or(0, |&x| x * s);
    a[2 * m] * s + (high << 32)
}

/// The kernel for D digits per operand (φ = 2D) and E = 2D − 1 digit sums, fully unrolled.
#[inline(always)]
fn fixed<'t, const D: usize, const E: usize>(
    terms: impl Iterator<Item = (&'t [i64], &'t [i64], i64)>,
    wide: &mut [i64],
) {
    let mut acc = [0i128; E];
    for (a, b, s) in terms {
        let a: &[i64] = &a[..2 * D];
        let b: &[i64] = &b[..2 * D];
        let mut x = [0i64; D];
        let mut y = [0i64; D];
        for m in 0..D {
            x[m] = digit(a, s, m);
            y[m] = digit(b, 1, m);
        }
        for m in 0..D {
            for l in 0..D {
                acc[m + l] += x[m] as i128 * y[l] as i128;
            }
        }
    }
    unpack(&acc, wide);
}

/// The kernel for any φ.
fn dynamic<'t>(
    phi: usize,
    terms: impl Iterator<Item = (&'t [i64], &'t [i64], i64)>,
    wide: &mut [i64],
) {
    let count = phi.div_ceil(2);
    let mut acc = vec![0i128; 2 * count - 1];
    let mut x = vec![0i64; count];
    let mut y = vec![0i64; count];
    for (a, b, s) in terms {
        for m in 0..count {
            x[m] = digit(a, s, m);
            y[m] = digit(b, 1, m);
        }
        for (m, &u) in x.iter().enumerate() {
            for (sum, &v) in acc[m..].iter_mut().zip(&y) {
                *sum += u as i128 * v as i128;
            }
        }
    }
    unpack(&acc, wide);
}

/// The coefficients c_k (k < out.len()) of Σ_t acc_t·2^{64t} = Σ_k c_k·2^{32k}, given that
/// every |c_k| < 2^31 (balanced digits: each is the residue of the running value mod 2^32
/// in [−2^31, 2^31), and the rest carries on exactly).
#[inline(always)]
fn unpack(acc: &[i128], out: &mut [i64]) {
    // balanced low 32 bits, and the exact quotient by 2^32 carried on
    #[inline(always)]
    fn split(v: i128) -> (i64, i128) {
        let digit = v as u32 as i32 as i64;
        (digit, (v - digit as i128) >> 32)
    }
    let mut running: i128 = 0;
    if out.len() == 2 * acc.len() + 1 {
        // even φ: digit t fills slots 2t and 2t + 1, the last slot is the final carry
        let (pairs, last) = out.split_at_mut(2 * acc.len());
        for (&d, slots) in acc.iter().zip(pairs.chunks_exact_mut(2)) {
            let (c0, rest) = split(running + d);
            let (c1, carry) = split(rest);
            slots[0] = c0;
            slots[1] = c1;
            running = carry;
        }
        let (c, carry) = split(running);
        last[0] = c;
        running = carry;
    } else {
        let mut digits = acc.iter();
        for (k, c) in out.iter_mut().enumerate() {
            if k % 2 == 0 {
                running += digits.next().copied().unwrap_or(0);
            }
            let (digit, carry) = split(running);
            *c = digit;
            running = carry;
        }
    }
    debug_assert_eq!(running, 0, "a packed coefficient exceeded 2^31");
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Kronecker substitution against the convolution by definition (common practice),
    /// including negative coefficients near 2^21 and odd lengths.
    #[test]
    fn packed_products_match_the_definition() {
        for phi in (1usize..=26).chain([32, 48]) {
            let a: Vec<i64> = (0..phi as i64)
                .map(|i| (i * 7919 % 61 - 30) << 14)
                .collect();
            let b: Vec<i64> = (0..phi as i64).map(|i| (i * 104_729 % 19) - 9).collect();
            let c: Vec<i64> = (0..phi as i64).map(|i| -(i % 5)).collect();
            let mut expected = vec![0i64; 2 * phi - 1];
            for i in 0..phi {
                for j in 0..phi {
                    expected[i + j] += 2 * a[i] * b[j] + 3 * b[i] * c[j];
                }
            }
            let mut out = vec![7i64; 2 * phi - 1];
            let terms = [(&a[..], &b[..], 2), (&b[..], &c[..], 3)];
            packed_sum(phi, terms.into_iter(), &mut out);
            assert_eq!(out, expected, "φ = {phi}");
        }
    }
}
