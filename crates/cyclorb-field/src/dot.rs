//! Sums of products with one reduction: the kernel behind dot products and mat-vec.
//!
//! Products are accumulated as unreduced polynomials of length 2φ − 1 over one common
//! denominator and folded modulo Φ_n once, when the sum is finished. The sum stays in machine
//! words while a running bound on its coefficients proves that it fits, and moves to big
//! integers (once, for the rest of the sum) otherwise.

use num_bigint::BigInt;
use num_integer::Integer;

use crate::context::CyclotomicField;
use crate::convolution::{convolve_add, convolve_add_plain, kernel_terms};
use crate::element::{Cyc, Data};
use crate::error::FieldError;
use crate::packed::{packed_sum, PACKED_LIMIT};
use crate::ring::convolve;
use crate::word_kernels::{gcd_u64, magnitude_bound, max_abs, sum_fits, with_scratch};

/// The running sum: Σ = wide/den, wide of length 2φ − 1.
#[derive(Debug, Clone)]
enum Sum {
    /// Machine words with |wide_i| ≤ bound ≤ i64::MAX and den > 0.
    Words {
        wide: Vec<i64>,
        den: i64,
        bound: u64,
    },
    /// Big integers, den > 0.
    Big { wide: Vec<BigInt>, den: BigInt },
}

/// Σ a_k·b_k accumulated without reduction. Precondition: every operand lies in the
/// accumulator's field (checked, an error otherwise).
#[derive(Debug, Clone)]
pub struct DotAccumulator<'f> {
    field: &'f CyclotomicField,
    sum: Sum,
}

impl<'f> DotAccumulator<'f> {
    /// An empty sum in `field`.
    pub fn new(field: &'f CyclotomicField) -> Self {
        DotAccumulator {
            field,
            sum: Sum::Words {
                wide: vec![0; 2 * field.degree() - 1],
                den: 1,
                bound: 0,
            },
        }
    }

    /// acc += a·b.
    pub fn add_product(&mut self, a: &Cyc, b: &Cyc) -> Result<(), FieldError> {
        let n = self.field.conductor();
        for x in [a, b] {
            if x.n != n {
                return Err(FieldError::FieldMismatch {
                    left: n,
                    right: x.n,
                });
            }
        }
        if let (
            Sum::Words { wide, den, bound },
            Data::Small { num: an, den: ad },
            Data::Small { num: bn, den: bd },
        ) = (&mut self.sum, &a.data, &b.data)
        {
            if add_words(wide, den, bound, (an, *ad), (bn, *bd)).is_some() {
                return Ok(());
            }
        }
        if a.is_zero() || b.is_zero() {
            return Ok(());
        }
        let (an, ad) = a.to_big_parts();
        let (bn, bd) = b.to_big_parts();
        let prod = convolve(&an, &bn).expect("big arithmetic does not overflow");
        let pd = ad * bd;
        let (wide, den) = self.promote();
        let l = den.lcm(&pd);
        let (sa, sp) = (&l / &*den, &l / &pd);
        for (c, p) in wide.iter_mut().zip(prod) {
            *c = &*c * &sa + p * &sp;
        }
        *den = l;
        Ok(())
    }

    /// The big-integer form of the sum, converting it the first time.
    fn promote(&mut self) -> (&mut Vec<BigInt>, &mut BigInt) {
        if let Sum::Words { wide, den, .. } = &self.sum {
            self.sum = Sum::Big {
                wide: wide.iter().map(|&c| BigInt::from(c)).collect(),
                den: BigInt::from(*den),
            };
        }
        match &mut self.sum {
            Sum::Big { wide, den } => (wide, den),
            Sum::Words { .. } => unreachable!("converted above"),
        }
    }

    /// The reduced sum.
    pub fn finish(mut self) -> Cyc {
        let field = self.field;
        let n = field.conductor();
        let phi = field.degree();
        if let Sum::Words { wide, den, bound } = &mut self.sum {
            if field.fold_is_safe(*bound) {
                field.fold_words::<false>(wide);
                return Cyc::from_words(n, wide[..phi].into(), *den);
            }
            // fold a copy, so that an overflow leaves the sum intact for the big tier
            let folded = with_scratch(wide.len(), |work| {
                work.copy_from_slice(wide);
                field
                    .fold_words::<true>(work)
                    .map(|()| Box::from(&work[..phi]))
            });
            if let Some(num) = folded {
                return Cyc::from_words(n, num, *den);
            }
        }
        let (wide, den) = self.promote();
        let low = field.fold(wide).expect("big arithmetic does not overflow");
        Cyc::from_big(n, low, den.clone())
    }
}

/// sum += a·b in words, or `None` (sum untouched) when a bound does not prove it fits.
fn add_words(
    wide: &mut [i64],
    den: &mut i64,
    bound: &mut u64,
    (an, ad): (&[i64], i64),
    (bn, bd): (&[i64], i64),
) -> Option<()> {
    let (ma, mb) = (max_abs(an), max_abs(bn));
    if ma == 0 || mb == 0 {
        return Some(());
    }
    let pd = ad.checked_mul(bd)?;
    // common denominator l = lcm(den, pd): the sum is scaled by sa, the product by sp
    let (sa, sp) = if *bound == 0 {
        *den = pd;
        (1, 1)
    } else if *den == pd {
        (1, 1)
    } else if *den & (*den - 1) == 0 && pd & (pd - 1) == 0 {
        // both powers of two: the larger is the lcm
        let (dz, pz) = (den.trailing_zeros(), pd.trailing_zeros());
        (1 << pz.saturating_sub(dz), 1 << dz.saturating_sub(pz))
    } else {
        let g = gcd_u64(*den as u64, pd as u64) as i64;
        (pd / g, *den / g)
    };
    let l = den.checked_mul(sa)?;
    let scaled = (*bound as u128 * sa as u128).min(u64::MAX as u128) as u64;
    let mb_scaled = (mb as u128 * sp as u128).min(u64::MAX as u128) as u64;
    let terms = an.len().min(bn.len());
    if !sum_fits(scaled, terms, ma, mb_scaled) {
        return None;
    }
    // every step below is bounded by the check above
    if sa != 1 {
        for w in wide.iter_mut() {
            *w *= sa;
        }
    }
    if sum_fits(0, kernel_terms(terms), ma, mb) {
        convolve_add(an, bn, sp, wide);
    } else {
        convolve_add_plain(an, bn, sp, wide);
    }
    *den = l;
    *bound = scaled + terms as u64 * ma * mb_scaled;
    Some(())
}

/// lcm(a, b) for positive words, `None` on overflow.
fn lcm_words(a: u64, b: u64) -> Option<u64> {
    if a & (a - 1) == 0 && b & (b - 1) == 0 {
        Some(a.max(b))
    } else if a % b == 0 {
        Some(a)
    } else if b % a == 0 {
        Some(b)
    } else {
        (a / gcd_u64(a, b)).checked_mul(b)
    }
}

/// a / b for b | a, by a shift when b is a power of two.
#[inline]
fn quotient(a: u64, b: u64) -> u64 {
    if b & (b - 1) == 0 {
        a >> b.trailing_zeros()
    } else {
        a / b
    }
}

impl CyclotomicField {
    /// Σ_k a_k·b_k with one reduction at the end.
    pub fn dot<'a>(
        &self,
        pairs: impl IntoIterator<Item = (&'a Cyc, &'a Cyc)>,
    ) -> Result<Cyc, FieldError> {
        let pairs: Vec<(&Cyc, &Cyc)> = pairs.into_iter().collect();
        for (a, b) in &pairs {
            self.check(a.n)?;
            self.check(b.n)?;
        }
        if let Some(sum) = self.dot_words(&pairs) {
            return Ok(sum);
        }
        let mut acc = DotAccumulator::new(self);
        for (a, b) in pairs {
            acc.add_product(a, b)?;
        }
        Ok(acc.finish())
    }

    /// The dot product in machine words, when every operand is stored in words and a bound
    /// proves the sum safe: one pass finds the common denominator L = lcm(den a_k·den b_k)
    /// and the bound Σ_k (L/(den a_k·den b_k))·φ·max|a_k|·max|b_k|, a second accumulates.
    fn dot_words(&self, pairs: &[(&Cyc, &Cyc)]) -> Option<Cyc> {
        let phi = self.degree();
        let kernel = kernel_terms(phi);
        let mut den: u64 = 1;
        let mut terms: Vec<(&[i64], &[i64], u64, u64)> = Vec::with_capacity(pairs.len());
        for (a, b) in pairs {
            let (Data::Small { num: an, den: ad }, Data::Small { num: bn, den: bd }) =
                (&a.data, &b.data)
            else {
                return None;
            };
            if a.is_zero() || b.is_zero() {
                continue;
            }
            let (ma, mb) = (magnitude_bound(an), magnitude_bound(bn));
            if !sum_fits(0, kernel, ma, mb) {
                return None;
            }
            let pd = (*ad as u64).checked_mul(*bd as u64)?;
            den = lcm_words(den, pd)?;
            terms.push((an, bn, pd, ma.checked_mul(mb)?));
        }
        if den > i64::MAX as u64 {
            return None;
        }
        let mut total: u128 = 0;
        for (_, _, pd, size) in terms.iter_mut() {
            *pd = quotient(den, *pd);
            total += *pd as u128 * *size as u128 * phi as u128;
            if total > i64::MAX as u128 {
                return None;
            }
        }
        let n = self.conductor();
        with_scratch(2 * phi - 1, |wide| {
            if total < PACKED_LIMIT as u128 {
                let packed = terms
                    .iter()
                    .map(|&(an, bn, scale, _)| (an, bn, scale as i64));
                packed_sum(phi, packed, wide);
            } else {
                for &(an, bn, scale, _) in &terms {
                    convolve_add(an, bn, scale as i64, wide);
                }
            }
            if self.fold_is_safe(total as u64) {
                self.fold_words::<false>(wide);
            } else {
                self.fold_words::<true>(wide)?;
            }
            Some(Cyc::from_words(n, wide[..phi].into(), den as i64))
        })
    }
}
