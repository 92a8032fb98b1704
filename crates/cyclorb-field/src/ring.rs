//! The two integer tiers behind every element: checked `i128` (the fast path) and
//! `BigInt` (the fallback). Kernels are written once, generic over [`IntRing`]; the
//! `i128` instance returns `None` on overflow and the caller retries with `BigInt`,
//! so an overflow never produces a wrong answer.

use num_bigint::BigInt;
use num_traits::{Signed, Zero};

/// An integer ring with fallible (overflow-checked) operations.
pub(crate) trait IntRing: Clone + PartialEq {
    fn zero() -> Self;
    fn from_i64(x: i64) -> Self;
    fn is_zero(&self) -> bool;
    fn add(&self, o: &Self) -> Option<Self>;
    fn sub(&self, o: &Self) -> Option<Self>;
    fn mul(&self, o: &Self) -> Option<Self>;
}

impl IntRing for i128 {
    #[inline]
    fn zero() -> Self {
        0
    }
    #[inline]
    fn from_i64(x: i64) -> Self {
        x as i128
    }
    #[inline]
    fn is_zero(&self) -> bool {
        *self == 0
    }
    #[inline]
    fn add(&self, o: &Self) -> Option<Self> {
        self.checked_add(*o)
    }
    #[inline]
    fn sub(&self, o: &Self) -> Option<Self> {
        self.checked_sub(*o)
    }
    #[inline]
    fn mul(&self, o: &Self) -> Option<Self> {
        self.checked_mul(*o)
    }
}

impl IntRing for BigInt {
    fn zero() -> Self {
        Zero::zero()
    }
    fn from_i64(x: i64) -> Self {
        BigInt::from(x)
    }
    fn is_zero(&self) -> bool {
        Zero::is_zero(self)
    }
    fn add(&self, o: &Self) -> Option<Self> {
        Some(self + o)
    }
    fn sub(&self, o: &Self) -> Option<Self> {
        Some(self - o)
    }
    fn mul(&self, o: &Self) -> Option<Self> {
        Some(self * o)
    }
}

/// Product of two coefficient vectors of length φ, without reduction: length 2φ − 1.
pub(crate) fn convolve<R: IntRing>(a: &[R], b: &[R]) -> Option<Vec<R>> {
    let mut out = vec![R::zero(); a.len() + b.len() - 1];
    for (i, x) in a.iter().enumerate() {
        if x.is_zero() {
            continue;
        }
        for (j, y) in b.iter().enumerate() {
            if y.is_zero() {
                continue;
            }
            out[i + j] = out[i + j].add(&x.mul(y)?)?;
        }
    }
    Some(out)
}

/// |x| as a BigInt sign helper used when normalising.
pub(crate) fn big_is_negative(x: &BigInt) -> bool {
    x.is_negative()
}
