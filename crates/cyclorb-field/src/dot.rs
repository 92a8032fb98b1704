//! Sums of products with one reduction: the kernel behind dot products and mat-vec.
//!
//! Products are accumulated as unreduced polynomials of length 2φ − 1 over one common
//! denominator and folded modulo Φ_n once, when the sum is finished.

use num_bigint::BigInt;
use num_integer::Integer;

use crate::context::CyclotomicField;
use crate::element::{Cyc, Data};
use crate::error::FieldError;
use crate::ring::convolve;

/// Σ a_k·b_k accumulated without reduction. Precondition: every operand lies in the
/// accumulator's field (checked, an error otherwise).
#[derive(Debug, Clone)]
pub struct DotAccumulator<'f> {
    field: &'f CyclotomicField,
    wide: Vec<i128>,
    den: i128,
    big: Option<(Vec<BigInt>, BigInt)>,
}

impl<'f> DotAccumulator<'f> {
    /// An empty sum in `field`.
    pub fn new(field: &'f CyclotomicField) -> Self {
        DotAccumulator {
            field,
            wide: vec![0; 2 * field.degree() - 1],
            den: 1,
            big: None,
        }
    }

    fn try_small(&mut self, a: &Cyc, b: &Cyc) -> Option<()> {
        let (Data::Small { num: an, den: ad }, Data::Small { num: bn, den: bd }) =
            (&a.data, &b.data)
        else {
            return None;
        };
        let pd = (*ad as i128).checked_mul(*bd as i128)?;
        let l = self.den.lcm(&pd);
        let (sa, sp) = (l / self.den, l / pd);
        let mut next = self.wide.clone();
        if sa != 1 {
            for c in next.iter_mut() {
                *c = c.checked_mul(sa)?;
            }
        }
        for (i, &x) in an.iter().enumerate() {
            if x == 0 {
                continue;
            }
            let x = (x as i128).checked_mul(sp)?;
            for (j, &y) in bn.iter().enumerate() {
                if y != 0 {
                    next[i + j] = next[i + j].checked_add(x.checked_mul(y as i128)?)?;
                }
            }
        }
        self.wide = next;
        self.den = l;
        Some(())
    }

    fn promote(&mut self) -> &mut (Vec<BigInt>, BigInt) {
        let wide = &self.wide;
        let den = self.den;
        self.big.get_or_insert_with(|| {
            (
                wide.iter().map(|&c| BigInt::from(c)).collect(),
                BigInt::from(den),
            )
        })
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
        if a.is_zero() || b.is_zero() {
            return Ok(());
        }
        if self.big.is_none() && self.try_small(a, b).is_some() {
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

    /// The reduced sum.
    pub fn finish(self) -> Cyc {
        let n = self.field.conductor();
        match self.big {
            None => match self.field.fold(&self.wide) {
                Some(low) => Cyc::from_wide(n, &low, self.den),
                None => {
                    let wide: Vec<BigInt> = self.wide.iter().map(|&c| BigInt::from(c)).collect();
                    let low = self
                        .field
                        .fold(&wide)
                        .expect("big arithmetic does not overflow");
                    Cyc::from_big(n, low, BigInt::from(self.den))
                }
            },
            Some((wide, den)) => {
                let low = self
                    .field
                    .fold(&wide)
                    .expect("big arithmetic does not overflow");
                Cyc::from_big(n, low, den)
            }
        }
    }
}

impl CyclotomicField {
    /// Σ_k a_k·b_k with one reduction at the end.
    pub fn dot<'a>(
        &self,
        pairs: impl IntoIterator<Item = (&'a Cyc, &'a Cyc)>,
    ) -> Result<Cyc, FieldError> {
        let mut acc = DotAccumulator::new(self);
        for (a, b) in pairs {
            acc.add_product(a, b)?;
        }
        Ok(acc.finish())
    }
}
