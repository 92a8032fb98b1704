//! The characteristic polynomial and the determinant without division (Berkowitz), and
//! polynomials evaluated at a matrix.
//!
//! Berkowitz's algorithm: write X = [[a, R], [C, M]] with a = X₀₀, R the rest of row 0,
//! C the rest of column 0 and M the trailing (m × m) block. Then
//! χ_X = T · χ_M (coefficient vectors, highest degree first), where T is the lower
//! triangular Toeplitz (m + 2) × (m + 1) matrix whose first column is
//! (1, −a, −R C, −R M C, …, −R M^{m−1} C). Starting from the 1 × 1 trailing block and
//! growing one row and column at a time costs O(d⁴) ring operations for d × d and uses
//! only additions and multiplications, so no pivot can vanish and no fraction appears
//! that the entries did not already carry.

use cyclorb_field::{Cyc, CyclotomicField};

use crate::dense::Matrix;
use crate::error::MatrixError;

impl Matrix {
    /// The characteristic polynomial χ(x) = det(x·I − X) of a square matrix, as its
    /// coefficients with the constant term first; it is monic of degree d = dim
    /// (the last coefficient is 1; the 0 × 0 matrix gives `[1]`).
    pub fn charpoly(&self, field: &CyclotomicField) -> Result<Vec<Cyc>, MatrixError> {
        self.require_square("a characteristic polynomial")?;
        let d = self.rows();
        // χ of the trailing block, highest degree first; starts with the 0 × 0 block.
        let mut chi = vec![field.one()];
        for k in (0..d).rev() {
            let toeplitz = self.berkowitz_column(field, k)?;
            let m = chi.len() - 1; // size of the trailing block below k
            let mut next = Vec::with_capacity(m + 2);
            for i in 0..m + 2 {
                let terms = (0..=i.min(m)).map(|j| (&toeplitz[i - j], &chi[j]));
                next.push(field.dot(terms)?);
            }
            chi = next;
        }
        chi.reverse();
        Ok(chi)
    }

    /// The Toeplitz column (1, −a, −R C, −R M C, …, −R M^{m−1} C) for the trailing block
    /// starting at row and column k, with m = d − k − 1.
    fn berkowitz_column(&self, field: &CyclotomicField, k: usize) -> Result<Vec<Cyc>, MatrixError> {
        let d = self.rows();
        let trailing = k + 1..d;
        let mut column = vec![field.one(), field.neg(self.get(k, k))];
        // v = M^j C, as a vector indexed by the trailing coordinates
        let mut v: Vec<Cyc> = trailing.clone().map(|i| self.get(i, k).clone()).collect();
        for j in 0..d - k - 1 {
            let r_v = field.dot(self.row(k)[k + 1..].iter().zip(&v))?;
            column.push(field.neg(&r_v));
            if j + 2 < d - k {
                v = trailing
                    .clone()
                    .map(|i| field.dot(self.row(i)[k + 1..].iter().zip(&v)))
                    .collect::<Result<_, _>>()?;
            }
        }
        Ok(column)
    }

    /// det X, division-free: (−1)^d · χ(0).
    pub fn determinant(&self, field: &CyclotomicField) -> Result<Cyc, MatrixError> {
        let chi = self.charpoly(field)?;
        let constant = &chi[0];
        Ok(if self.rows() % 2 == 0 {
            constant.clone()
        } else {
            field.neg(constant)
        })
    }

    /// p(X) = Σ_i c_i X^i for coefficients c (constant term first), by Horner's rule
    /// (deg p matrix products). The zero polynomial (empty slice) gives the zero matrix.
    pub fn eval_polynomial(
        &self,
        field: &CyclotomicField,
        coefficients: &[Cyc],
    ) -> Result<Matrix, MatrixError> {
        self.require_square("a polynomial in a matrix")?;
        let d = self.rows();
        let mut acc = Matrix::zeros(field, d, d);
        for (step, c) in coefficients.iter().rev().enumerate() {
            if step > 0 {
                acc = acc.mul(field, self)?;
            }
            for i in 0..d {
                let shifted = field.add(acc.get(i, i), c)?;
                acc.set(i, i, shifted);
            }
        }
        Ok(acc)
    }
}
