//! Integer powers of square matrices.

use cyclorb_field::CyclotomicField;

use crate::dense::Matrix;
use crate::error::MatrixError;

impl Matrix {
    /// X^k for any integer k: X⁰ = I, and X^{−k} = (X⁻¹)^k, an error
    /// [`MatrixError::Singular`] when X is not invertible.
    pub fn pow(&self, field: &CyclotomicField, k: i64) -> Result<Matrix, MatrixError> {
        self.require_square("a power")?;
        if k < 0 {
            self.inverse(field)?.power(field, k.unsigned_abs())
        } else {
            self.power(field, k.unsigned_abs())
        }
    }

    /// X^e for a square X, by repeated squaring: ⌊log₂ e⌋ squarings and at most as many
    /// further products.
    pub(crate) fn power(&self, field: &CyclotomicField, mut e: u64) -> Result<Matrix, MatrixError> {
        let mut base = self.clone();
        let mut acc: Option<Matrix> = None;
        while e > 0 {
            if e & 1 == 1 {
                acc = Some(match acc {
                    None => base.clone(),
                    Some(a) => a.mul(field, &base)?,
                });
            }
            e >>= 1;
            if e > 0 {
                base = base.mul(field, &base)?;
            }
        }
        Ok(acc.unwrap_or_else(|| Matrix::identity(field, self.rows())))
    }
}
