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
    /// Exact division (the caller guarantees divisibility).
    fn div_exact(&self, o: &Self) -> Option<Self>;
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
    #[inline]
    fn div_exact(&self, o: &Self) -> Option<Self> {
        self.checked_div(*o)
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
    fn div_exact(&self, o: &Self) -> Option<Self> {
        Some(self / o)
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

/// Bareiss fraction-free solve of the square system M·y = D·rhs, returning (y, D) with
/// D = ±det M (the last pivot) and y integral (Cramer numerators). `None` on overflow or
/// when M is singular (distinguished by the caller: a non-zero field element has an
/// invertible multiplication matrix).
pub(crate) fn bareiss_solve<R: IntRing>(mut m: Vec<Vec<R>>, rhs: Vec<R>) -> Option<(Vec<R>, R)> {
    let size = m.len();
    for (row, r) in m.iter_mut().zip(rhs) {
        row.push(r);
    }
    let mut prev = R::from_i64(1);
    for k in 0..size {
        let pivot_row = (k..size).find(|&r| !m[r][k].is_zero())?;
        m.swap(k, pivot_row);
        for i in k + 1..size {
            for j in k + 1..=size {
                let v = m[i][j].mul(&m[k][k])?.sub(&m[i][k].mul(&m[k][j])?)?;
                m[i][j] = v.div_exact(&prev)?;
            }
            m[i][k] = R::zero();
        }
        prev = m[k][k].clone();
    }
    let det = prev;
    // back substitution: y_i = (D·b_i − Σ_{j>i} U_ij y_j) / U_ii, exact.
    let mut y = vec![R::zero(); size];
    for i in (0..size).rev() {
        let mut acc = det.mul(&m[i][size])?;
        for j in i + 1..size {
            acc = acc.sub(&m[i][j].mul(&y[j])?)?;
        }
        y[i] = acc.div_exact(&m[i][i])?;
    }
    Some((y, det))
}

/// |x| as a BigInt sign helper used when normalising.
pub(crate) fn big_is_negative(x: &BigInt) -> bool {
    x.is_negative()
}
