//! Machine-word kernels: the fast path for elements whose numbers fit in `i64`.
//!
//! Each kernel either proves from a bound that no step can overflow and then runs unchecked
//! (so the compiler can pipeline it), or runs with overflow flags; it returns `None` when a
//! result would not fit, and the caller repeats the operation on a wider tier. Preconditions
//! (lengths, positive denominators) are stated beside each kernel.

use crate::context::{CyclotomicField, Reduction};
use crate::element::{Cyc, Data};

/// Scratch of `len` zero words, on the stack up to 128 words.
pub(crate) fn with_scratch<T>(len: usize, f: impl FnOnce(&mut [i64]) -> T) -> T {
    if len <= 128 {
        let mut buf = [0i64; 128];
        f(&mut buf[..len])
    } else {
        f(&mut vec![0i64; len])
    }
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

impl Cyc {
    /// The canonical element num/den. Preconditions: den > 0 and no numerator is i64::MIN.
    pub(crate) fn from_words(n: u32, mut num: Box<[i64]>, mut den: i64) -> Cyc {
        debug_assert!(den > 0 && num.iter().all(|&c| c != i64::MIN));
        if den != 1 {
            let mut g = den as u64;
            let mut all_zero = true;
            for &c in num.iter() {
                if c != 0 {
                    all_zero = false;
                    g = gcd_u64(g, c.unsigned_abs());
                    if g == 1 {
                        break;
                    }
                }
            }
            if all_zero {
                den = 1;
            } else if g > 1 {
                let g = g as i64;
                for c in num.iter_mut() {
                    *c /= g;
                }
                den /= g;
            }
        }
        Cyc {
            n,
            data: Data::Small { num, den },
        }
    }
}

impl CyclotomicField {
    /// Reduce `wide` (any length ≥ φ, exponents 0..len) modulo Φ_n in place: afterwards
    /// `wide[..φ]` holds the residue. `None` on overflow (the contents are then garbage).
    pub(crate) fn fold_words(&self, wide: &mut [i64]) -> Option<()> {
        let phi = self.degree();
        let mut overflow = false;
        match self.reduction() {
            Reduction::Negacyclic => {
                // x^e = (−1)^{⌊e/φ⌋} x^{e mod φ}
                for e in (phi..wide.len()).rev() {
                    let c = wide[e];
                    let j = e - phi;
                    let (v, o) = wide[j].overflowing_sub(c);
                    wide[j] = v;
                    overflow |= o;
                }
            }
            Reduction::Table => {
                // long division by the monic Φ_n, top coefficient first
                let terms = self.lower_terms();
                for e in (phi..wide.len()).rev() {
                    let c = wide[e];
                    if c == 0 {
                        continue;
                    }
                    let base = e - phi;
                    for &(t, coeff) in terms {
                        let (prod, o1) = c.overflowing_mul(coeff);
                        let (v, o2) = wide[base + t].overflowing_sub(prod);
                        wide[base + t] = v;
                        overflow |= o1 | o2;
                    }
                }
            }
        }
        let bad = overflow || wide[..phi].contains(&i64::MIN);
        (!bad).then_some(())
    }

    /// a·b modulo Φ_n for numerator vectors of length φ, in words. `None` when a bound does
    /// not rule out overflow of the unreduced product or the reduction overflows.
    pub(crate) fn mul_words(&self, a: &[i64], b: &[i64]) -> Option<Box<[i64]>> {
        let phi = self.degree();
        let (ma, mb) = (max_abs(a), max_abs(b));
        if !sum_fits(0, phi, ma, mb) {
            return None;
        }
        match self.reduction() {
            Reduction::Negacyclic => {
                // every output is a signed sum of exactly φ products: bounded above
                let mut out = vec![0i64; phi].into_boxed_slice();
                for (i, &x) in a.iter().enumerate() {
                    if x == 0 {
                        continue;
                    }
                    let (low, high) = b.split_at(phi - i);
                    for (o, &y) in out[i..].iter_mut().zip(low) {
                        *o += x * y;
                    }
                    for (o, &y) in out[..i].iter_mut().zip(high) {
                        *o -= x * y;
                    }
                }
                Some(out)
            }
            Reduction::Table => with_scratch(2 * phi - 1, |wide| {
                for (i, &x) in a.iter().enumerate() {
                    if x == 0 {
                        continue;
                    }
                    for (w, &y) in wide[i..].iter_mut().zip(b) {
                        *w += x * y;
                    }
                }
                self.fold_words(wide)?;
                Some(wide[..phi].into())
            }),
        }
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
