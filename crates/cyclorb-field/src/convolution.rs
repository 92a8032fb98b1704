//! Unreduced products of coefficient vectors in machine words: w += s·(a ∗ b).
//!
//! Lengths up to 10 use fully unrolled fixed-size schoolbook kernels; longer even lengths
//! split in halves by Karatsuba's identity
//! a∗b = a₀∗b₀ + x^h·((a₀+a₁)∗(b₀+b₁) − a₀∗b₀ − a₁∗b₁) + x^{2h}·a₁∗b₁,
//! which trades a quarter of the products for additions (and measured several times faster
//! than one large unrolled kernel at length 16).
//!
//! Precondition (unchecked arithmetic): the caller proves with [`kernel_terms`] that no
//! intermediate value leaves `i64` (see [`crate::word_kernels::sum_fits`]): every intermediate is
//! bounded by `kernel_terms(φ)·max|a|·max|b|`, and s times the final product by the caller's
//! own bound.

/// Lengths above this are split by Karatsuba's identity (when even).
const SCHOOLBOOK_MAX: usize = 10;

/// Number of Karatsuba levels used for length φ.
fn depth(phi: usize) -> u32 {
    if phi > SCHOOLBOOK_MAX && phi % 2 == 0 {
        1 + depth(phi / 2)
    } else {
        0
    }
}

/// The factor T with |intermediate| ≤ T·max|a|·max|b| in [`convolve_add`] for length φ:
/// φ for schoolbook; each Karatsuba level doubles the input sums, and the recombination
/// mid − lo − hi at most doubles again, so φ·2^{depth+1} covers every level.
pub(crate) fn kernel_terms(phi: usize) -> usize {
    match depth(phi) {
        0 => phi,
        d => phi << (d + 1),
    }
}

/// w[k] += s·Σ_{i+j=k} a_i·b_j for k < 2φ − 1, where φ = a.len() = b.len(), 2φ − 1 ≤ w.len().
pub(crate) fn convolve_add(a: &[i64], b: &[i64], s: i64, w: &mut [i64]) {
    debug_assert_eq!(a.len(), b.len());
    let phi = a.len();
    match phi {
        12 => return karatsuba_fixed::<6, 11, 23>(a, b, s, w),
        16 => return karatsuba_fixed::<8, 15, 31>(a, b, s, w),
        20 => return karatsuba_fixed::<10, 19, 39>(a, b, s, w),
        _ if depth(phi) == 0 => return schoolbook(a, b, s, w),
        _ => {}
    }
    let len = 2 * phi - 1;
    if len <= 127 {
        let mut product = [0i64; 127];
        karatsuba(a, b, &mut product[..len]);
        add_scaled(&mut w[..len], &product[..len], s);
    } else {
        let mut product = vec![0i64; len];
        karatsuba(a, b, &mut product);
        add_scaled(&mut w[..len], &product, s);
    }
}

/// [`convolve_add`] by schoolbook only: intermediates bounded by φ·max|a|·max|b|.
pub(crate) fn convolve_add_plain(a: &[i64], b: &[i64], s: i64, w: &mut [i64]) {
    schoolbook(a, b, s, w);
}

fn add_scaled(w: &mut [i64], product: &[i64], s: i64) {
    for (out, &p) in w.iter_mut().zip(product) {
        *out += s * p;
    }
}

/// One Karatsuba level over fixed-size schoolbook halves (φ = 2H, HW = 2H − 1, W = 2φ − 1),
/// fully unrolled: the kernel of the common degrees 12, 16 and 20.
#[inline(always)]
fn karatsuba_fixed<const H: usize, const HW: usize, const W: usize>(
    a: &[i64],
    b: &[i64],
    s: i64,
    w: &mut [i64],
) {
    let (a0, a1) = a.split_at(H);
    let (b0, b1) = b.split_at(H);
    let mut sa = [0i64; H];
    let mut sb = [0i64; H];
    for i in 0..H {
        sa[i] = a0[i] + a1[i];
        sb[i] = b0[i] + b1[i];
    }
    let (mut lo, mut hi, mut mid) = ([0i64; HW], [0i64; HW], [0i64; HW]);
    fixed::<H, HW>(a0, b0, 1, &mut lo);
    fixed::<H, HW>(a1, b1, 1, &mut hi);
    fixed::<H, HW>(&sa, &sb, 1, &mut mid);
    let w: &mut [i64; W] = (&mut w[..W]).try_into().expect("length W");
    for k in 0..HW {
        w[k] += s * lo[k];
        w[k + 2 * H] += s * hi[k];
        w[k + H] += s * (mid[k] - lo[k] - hi[k]);
    }
}

/// out = a∗b (out zeroed by the caller, length 2φ − 1).
fn karatsuba(a: &[i64], b: &[i64], out: &mut [i64]) {
    let phi = a.len();
    if depth(phi) == 0 {
        return schoolbook(a, b, 1, out);
    }
    let h = phi / 2;
    let part = 2 * h - 1;
    let (a0, a1) = a.split_at(h);
    let (b0, b1) = b.split_at(h);
    // scratch: sa, sb (h each) and mid (2h − 1)
    let mut run = |scratch: &mut [i64]| {
        let (sa, rest) = scratch.split_at_mut(h);
        let (sb, mid) = rest.split_at_mut(h);
        for (x, (u, v)) in sa.iter_mut().zip(a0.iter().zip(a1)) {
            *x = u + v;
        }
        for (y, (u, v)) in sb.iter_mut().zip(b0.iter().zip(b1)) {
            *y = u + v;
        }
        let mid = &mut mid[..part];
        karatsuba(sa, sb, mid);
        let (low, high) = out.split_at_mut(2 * h);
        karatsuba(a0, b0, &mut low[..part]);
        karatsuba(a1, b1, &mut high[..part]);
        // middle term mid − lo − hi, from the untouched halves, then added at x^h
        for (k, m) in mid.iter_mut().enumerate() {
            *m -= out[k] + out[2 * h + k];
        }
        for (o, m) in out[h..].iter_mut().zip(mid.iter()) {
            *o += m;
        }
    };
    let need = 4 * h - 1;
    if need <= 128 {
        run(&mut [0i64; 128][..need]);
    } else {
        run(&mut vec![0i64; need]);
    }
}

/// w[k] += s·Σ_{i+j=k} a_i·b_j by the definition; fixed sizes are fully unrolled.
fn schoolbook(a: &[i64], b: &[i64], s: i64, w: &mut [i64]) {
    match a.len() {
        1 => fixed::<1, 1>(a, b, s, w),
        2 => fixed::<2, 3>(a, b, s, w),
        3 => fixed::<3, 5>(a, b, s, w),
        4 => fixed::<4, 7>(a, b, s, w),
        5 => fixed::<5, 9>(a, b, s, w),
        6 => fixed::<6, 11>(a, b, s, w),
        7 => fixed::<7, 13>(a, b, s, w),
        8 => fixed::<8, 15>(a, b, s, w),
        9 => fixed::<9, 17>(a, b, s, w),
        10 => fixed::<10, 19>(a, b, s, w),
        _ => dynamic(a, b, s, w),
    }
}

/// The kernel for φ = P (W = 2P − 1), fully unrolled by the compiler.
#[inline(always)]
fn fixed<const P: usize, const W: usize>(a: &[i64], b: &[i64], s: i64, w: &mut [i64]) {
    let a: &[i64; P] = a.try_into().expect("length P");
    let b: &[i64; P] = b.try_into().expect("length P");
    let w: &mut [i64; W] = (&mut w[..W]).try_into().expect("length W");
    let mut acc = [0i64; W];
    for i in 0..P {
        for j in 0..P {
            acc[i + j] += a[i] * b[j];
        }
    }
    for (out, sum) in w.iter_mut().zip(acc) {
        *out += s * sum;
    }
}

/// The schoolbook kernel for any φ, one output coefficient at a time.
fn dynamic(a: &[i64], b: &[i64], s: i64, w: &mut [i64]) {
    let phi = a.len();
    for (k, out) in w[..2 * phi - 1].iter_mut().enumerate() {
        let lo = (k + 1).saturating_sub(phi);
        let hi = k.min(phi - 1);
        let mut sum = 0i64;
        for (x, y) in a[lo..=hi].iter().zip(b[k - hi..=k - lo].iter().rev()) {
            sum += x * y;
        }
        *out += s * sum;
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Schoolbook product by definition (common practice) against every kernel size.
    #[test]
    fn kernels_match_the_definition() {
        for phi in (1..=40usize).chain([48, 64, 72, 96, 128]) {
            let a: Vec<i64> = (0..phi as i64).map(|i| (i * 7 + 3) % 11 - 5).collect();
            let b: Vec<i64> = (0..phi as i64).map(|i| (i * 5 + 1) % 13 - 6).collect();
            let mut expected = vec![1i64; 2 * phi - 1];
            for i in 0..phi {
                for j in 0..phi {
                    expected[i + j] += 3 * a[i] * b[j];
                }
            }
            let mut w = vec![1i64; 2 * phi - 1];
            convolve_add(&a, &b, 3, &mut w);
            assert_eq!(w, expected, "φ = {phi}");
        }
    }

    #[test]
    fn headroom_grows_with_the_karatsuba_depth() {
        assert_eq!(kernel_terms(8), 8);
        assert_eq!(kernel_terms(16), 16 * 4);
        assert_eq!(kernel_terms(64), 64 * 16);
    }
}
