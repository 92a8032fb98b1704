//! Machine-word kernels: the fast path for elements whose numbers fit in `i64`.
//!
//! Each kernel either proves from a bound that no step can overflow and then runs unchecked
//! (so the compiler can pipeline it), or runs with overflow flags; it returns `None` when a
//! result would not fit, and the caller repeats the operation on a wider tier. Preconditions
//! (lengths, positive denominators) are stated beside each kernel.

use crate::context::{CyclotomicField, Reduction};
use crate::convolution::{convolve_add, convolve_add_plain, kernel_terms};
use crate::element::{Cyc, Data};
use crate::packed::{packed_sum, PACKED_LIMIT};

/// Scratch of `len` zero words, on the stack up to 128 words.
pub(crate) fn with_scratch<T>(len: usize, f: impl FnOnce(&mut [i64]) -> T) -> T {
    if len <= 32 {
        f(&mut [0i64; 32][..len])
    } else if len <= 128 {
        f(&mut [0i64; 128][..len])
    } else {
        f(&mut vec![0i64; len])
    }
}

/// A bound m ≥ max |x_i| with m ≤ 2·max |x_i| + 1, from one OR over x_i ⊕ (x_i >> 63)
/// (= |x_i| − [x_i < 0]): cheap and vectorisable, for deciding which kernel is safe.
#[inline]
pub(crate) fn magnitude_bound(xs: &[i64]) -> u64 {
    xs.iter().fold(0u64, |acc, &x| acc | (x ^ (x >> 63)) as u64) + 1
}

/// max |x_i| (0 for an empty slice).
#[inline]
pub(crate) fn max_abs(xs: &[i64]) -> u64 {
    xs.iter().map(|x| x.unsigned_abs()).max().unwrap_or(0)
}

/// Whether `terms` products of numbers bounded by `a` and `b`, plus `already`, stay in i64.
#[inline]
pub(crate) fn sum_fits(already: u64, terms: usize, a: u64, b: u64) -> bool {
    (a as u128 * b as u128)
        .checked_mul(terms as u128)
        .and_then(|t| t.checked_add(already as u128))
        .is_some_and(|total| total <= i64::MAX as u128)
}

/// gcd of two unsigned words (binary algorithm).
#[inline]
pub(crate) fn gcd_u64(mut a: u64, mut b: u64) -> u64 {
    if a == 0 {
        return b;
    }
    if b == 0 {
        return a;
    }
    let shift = (a | b).trailing_zeros();
    a >>= a.trailing_zeros();
    loop {
        b >>= b.trailing_zeros();
        if a > b {
            std::mem::swap(&mut a, &mut b);
        }
        b -= a;
        if b == 0 {
            return a << shift;
        }
    }
}

/// x⁻¹ mod 2^64 for odd x (Newton iteration: each step doubles the correct low bits).
fn inverse_mod_word(x: u64) -> u64 {
    let mut inv = x; // correct to 3 bits for odd x
    for _ in 0..5 {
        inv = inv.wrapping_mul(2u64.wrapping_sub(x.wrapping_mul(inv)));
    }
    inv
}

/// c / g for every c, where g divides every c exactly: a shift by the power of two in g and
/// a multiplication by the inverse of its odd part modulo 2^64 (exact division, no divide).
fn divide_exactly(num: &mut [i64], g: u64) {
    let shift = g.trailing_zeros();
    let odd = g >> shift;
    if odd == 1 {
        for c in num.iter_mut() {
            *c >>= shift;
        }
    } else {
        let inv = inverse_mod_word(odd);
        for c in num.iter_mut() {
            *c = ((*c >> shift) as u64).wrapping_mul(inv) as i64;
        }
    }
}

impl Cyc {
    /// The canonical element num/den. Preconditions: den > 0 and no numerator is i64::MIN.
    pub(crate) fn from_words(n: u32, mut num: Box<[i64]>, mut den: i64) -> Cyc {
        debug_assert!(den > 0 && num.iter().all(|&c| c != i64::MIN));
        if den & (den - 1) == 0 {
            // den = 2^t (t ≥ 0): the gcd is 2^min(t, trailing zeros of every numerator)
            let bits = num.iter().fold(0u64, |acc, &c| acc | c as u64);
            if bits == 0 {
                den = 1;
            } else {
                let shift = bits.trailing_zeros().min(den.trailing_zeros());
                if shift > 0 {
                    for c in num.iter_mut() {
                        *c >>= shift;
                    }
                    den >>= shift;
                }
            }
        } else {
            let mut g = den as u64;
            let mut zero = true;
            for &c in num.iter() {
                if c != 0 {
                    zero = false;
                    g = gcd_u64(g, c.unsigned_abs());
                    if g == 1 {
                        break;
                    }
                }
            }
            if zero {
                den = 1;
            } else if g > 1 {
                divide_exactly(&mut num, g);
                den /= g as i64;
            }
        }
        Cyc {
            n,
            data: Data::Small { num, den },
        }
    }
}

impl CyclotomicField {
    /// Reduce an unreduced product `wide` (φ ≤ length ≤ 2φ − 1) modulo Φ_n in place:
    /// afterwards `wide[..φ]` holds the residue. With `CHECK`, overflow is detected and gives
    /// `None` (the contents are then garbage); without, the caller must have proved
    /// gain·max|wide| ≤ i64::MAX ([`crate::context::FoldTable::gain`]).
    pub(crate) fn fold_words<const CHECK: bool>(&self, wide: &mut [i64]) -> Option<()> {
        let phi = self.degree();
        debug_assert!(wide.len() >= phi && wide.len() < 2 * phi);
        let (low, high) = wide.split_at_mut(phi);
        let mut overflow = false;
        if self.reduction() == Reduction::Negacyclic {
            // x^{φ+j} = −x^j
            for (l, &h) in low.iter_mut().zip(high.iter()) {
                if CHECK {
                    let (v, o) = l.overflowing_sub(h);
                    *l = v;
                    overflow |= o;
                } else {
                    *l -= h;
                }
            }
            let bad = CHECK && (overflow || low.contains(&i64::MIN));
            return (!bad).then_some(());
        }
        for &(e, j, r) in self.fold_table().entries(high.len()) {
            let (c, target) = (high[e as usize], &mut low[j as usize]);
            if CHECK {
                let (prod, o1) = c.overflowing_mul(r);
                let (v, o2) = target.overflowing_add(prod);
                *target = v;
                overflow |= o1 | o2;
            } else {
                *target += c * r;
            }
        }
        let bad = CHECK && (overflow || low.contains(&i64::MIN));
        (!bad).then_some(())
    }

    /// Whether folding an unreduced product with coefficients bounded by `bound` is proved
    /// not to overflow.
    pub(crate) fn fold_is_safe(&self, bound: u64) -> bool {
        (bound as u128 * self.fold_table().gain() as u128) <= i64::MAX as u128
    }

    /// a·b modulo Φ_n for numerator vectors of length φ, in words. `None` when a bound does
    /// not rule out overflow of the unreduced product or the reduction overflows.
    pub(crate) fn mul_words(&self, a: &[i64], b: &[i64]) -> Option<Box<[i64]>> {
        let phi = self.degree();
        let (ma, mb) = (magnitude_bound(a), magnitude_bound(b));
        if !sum_fits(0, phi, ma, mb) {
            return None;
        }
        let fast = sum_fits(0, kernel_terms(phi), ma, mb);
        let bound = ma * mb * phi as u64;
        with_scratch(2 * phi - 1, |wide| {
            if bound < PACKED_LIMIT {
                packed_sum(phi, std::iter::once((a, b, 1)), wide);
            } else if fast {
                convolve_add(a, b, 1, wide);
            } else {
                convolve_add_plain(a, b, 1, wide);
            }
            if self.fold_is_safe(bound) {
                self.fold_words::<false>(wide)?;
            } else {
                self.fold_words::<true>(wide)?;
            }
            Some(wide[..phi].into())
        })
    }

    /// x·sa ± y·sb coefficientwise, in words; `None` on overflow.
    pub(crate) fn combine_words(
        x: &[i64],
        sa: i64,
        y: &[i64],
        sb: i64,
        minus: bool,
    ) -> Option<Box<[i64]>> {
        let mut overflow = false;
        let out = x
            .iter()
            .zip(y)
            .map(|(&u, &v)| {
                let (u, o1) = u.overflowing_mul(sa);
                let (v, o2) = v.overflowing_mul(sb);
                let (s, o3) = if minus {
                    u.overflowing_sub(v)
                } else {
                    u.overflowing_add(v)
                };
                overflow |= o1 | o2 | o3 | (s == i64::MIN);
                s
            })
            .collect();
        (!overflow).then_some(out)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn binary_gcd_agrees_with_euclid() {
        // Euclid's algorithm as the reference (common practice).
        fn euclid(a: u64, b: u64) -> u64 {
            if b == 0 {
                a
            } else {
                euclid(b, a % b)
            }
        }
        let cases = [
            0u64,
            1,
            2,
            3,
            12,
            18,
            1 << 40,
            3 << 20,
            u64::MAX,
            999_999_937,
        ];
        for &a in &cases {
            for &b in &cases {
                assert_eq!(gcd_u64(a, b), euclid(a, b), "gcd({a}, {b})");
            }
        }
    }

    #[test]
    fn word_products_refuse_what_might_overflow() {
        let f = CyclotomicField::new(16).unwrap();
        let big = vec![i64::MAX / 4; 8];
        assert!(f.mul_words(&big, &big).is_none());
        let small = vec![3i64; 8];
        assert!(f.mul_words(&small, &small).is_some());
    }
}
