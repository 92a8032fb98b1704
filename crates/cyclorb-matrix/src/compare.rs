//! Comparisons that matter for projective representations: equality up to a scalar,
//! "is a scalar multiple of the identity", and commutation.

use cyclorb_field::{Cyc, CyclotomicField};

use crate::dense::Matrix;
use crate::error::MatrixError;

impl Matrix {
    /// `Some(c)` when X = c·I (X square; c may be 0), `None` otherwise.
    ///
    /// The empty 0 × 0 matrix is c·I for every c; it answers `Some(1)`.
    pub fn is_scalar(&self, field: &CyclotomicField) -> Option<Cyc> {
        if !self.is_square() {
            return None;
        }
        let dim = self.rows();
        if dim == 0 {
            return Some(field.one());
        }
        let c = self.get(0, 0);
        let fits = (0..dim).all(|i| {
            (0..dim).all(|j| {
                let x = self.get(i, j);
                if i == j {
                    x == c
                } else {
                    x.is_zero()
                }
            })
        });
        fits.then(|| c.clone())
    }

    /// `Some(c)` when `self` = c · `other` (same shape), `None` otherwise.
    ///
    /// c is read off the first non-zero entry of `other` and then checked on every entry,
    /// so the answer is exact. When `other` is zero, c is 0 and the answer is `Some(0)`
    /// exactly when `self` is zero too. Matrices of different shapes are never multiples.
    pub fn scalar_multiple_of(
        &self,
        field: &CyclotomicField,
        other: &Matrix,
    ) -> Result<Option<Cyc>, MatrixError> {
        if self.rows() != other.rows() || self.cols() != other.cols() {
            return Ok(None);
        }
        let pairs = || self.entries().iter().zip(other.entries());
        let Some((a, b)) = pairs().find(|(_, b)| !b.is_zero()) else {
            let all_zero = self.entries().iter().all(Cyc::is_zero);
            return Ok(all_zero.then(|| field.zero()));
        };
        // cheap rejection before any division: a non-zero multiple keeps the zero pattern
        if !a.is_zero() && pairs().any(|(x, y)| x.is_zero() != y.is_zero()) {
            return Ok(None);
        }
        let c = field.div(a, b)?;
        for (x, y) in pairs() {
            if *x != field.mul(&c, y)? {
                return Ok(None);
            }
        }
        Ok(Some(c))
    }

    /// The commutator [A, B] = AB − BA of two square matrices of one size.
    pub fn commutator(
        &self,
        field: &CyclotomicField,
        other: &Matrix,
    ) -> Result<Matrix, MatrixError> {
        self.mul(field, other)?.sub(field, &other.mul(field, self)?)
    }

    /// True when AB = BA.
    pub fn commutes_with(
        &self,
        field: &CyclotomicField,
        other: &Matrix,
    ) -> Result<bool, MatrixError> {
        Ok(self.mul(field, other)? == other.mul(field, self)?)
    }
}
