//! The Kronecker (tensor) product of matrices.

use cyclorb_field::CyclotomicField;

use crate::dense::Matrix;
use crate::error::MatrixError;

impl Matrix {
    /// The Kronecker product A ⊗ B of A = `self` (r × c) and B = `other` (p × q): the
    /// (r·p) × (c·q) matrix with (A ⊗ B)[i·p + k, j·q + l] = A[i, j] · B[k, l].
    ///
    /// It represents the tensor product of the linear maps in the basis e_i ⊗ f_k ordered
    /// with the index of A outermost, so (A ⊗ B)(C ⊗ D) = AC ⊗ BD.
    pub fn kronecker(
        &self,
        field: &CyclotomicField,
        other: &Matrix,
    ) -> Result<Matrix, MatrixError> {
        let (p, q) = (other.rows(), other.cols());
        let mut data = Vec::with_capacity(self.rows() * p * self.cols() * q);
        for i in 0..self.rows() {
            for k in 0..p {
                for j in 0..self.cols() {
                    let a = self.get(i, j);
                    for l in 0..q {
                        data.push(field.mul(a, other.get(k, l))?);
                    }
                }
            }
        }
        Ok(Matrix::from_parts(self.rows() * p, self.cols() * q, data))
    }
}
