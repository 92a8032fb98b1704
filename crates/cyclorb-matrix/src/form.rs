//! Invariance of a Hermitian form: X† G X = G, exactly.
//!
//! The generators of cyclorb act unitarily for the invariant form G of their basis
//! (orthogonal but not orthonormal in a non-unitary gauge), i.e. ⟨Xu, Xv⟩_G = ⟨u, v⟩_G with
//! ⟨u, v⟩_G = u† G v. Both tests compare every entry exactly.

use cyclorb_field::{Cyc, CyclotomicField, DotAccumulator};

use crate::dense::Matrix;
use crate::error::MatrixError;
use crate::operator::{LinearMap, Operator};

fn check_form_shape(dim: usize, g: &Matrix) -> Result<(), MatrixError> {
    if g.rows() == dim && g.cols() == dim {
        Ok(())
    } else {
        Err(MatrixError::Shape(format!(
            "a form {}×{} for a map of size {dim}",
            g.rows(),
            g.cols()
        )))
    }
}

impl Matrix {
    /// True when X† G X = G (X square, G of the same size).
    pub fn preserves_form(&self, field: &CyclotomicField, g: &Matrix) -> Result<bool, MatrixError> {
        self.require_square("form invariance")?;
        check_form_shape(self.rows(), g)?;
        let transformed = self.adjoint(field).mul(field, &g.mul(field, self)?)?;
        Ok(transformed == *g)
    }
}

impl Operator {
    /// True when X† G X = G, computed from the sparse columns of X without densifying it:
    /// (G X)_{kj} = Σ_l G_{kl} X_{lj} and (X† G X)_{ij} = Σ_k conj(X_{ki}) (G X)_{kj},
    /// each sum over the non-zero entries of one column (O(dim² · column weight)).
    pub fn preserves_form(&self, field: &CyclotomicField, g: &Matrix) -> Result<bool, MatrixError> {
        self.validate()?;
        let dim = self.dim();
        check_form_shape(dim, g)?;
        let columns = self.sparse_columns(field);
        // gx[j][k] = (G X)_{kj}
        let mut gx: Vec<Vec<Cyc>> = Vec::with_capacity(dim);
        for column in &columns {
            let mut image = Vec::with_capacity(dim);
            for k in 0..dim {
                let mut acc = DotAccumulator::new(field);
                for (l, x) in column {
                    acc.add_product(g.get(k, *l), x)?;
                }
                image.push(acc.finish());
            }
            gx.push(image);
        }
        for (i, column) in columns.iter().enumerate() {
            let conjugated: Vec<(usize, Cyc)> =
                column.iter().map(|(k, x)| (*k, field.conj(x))).collect();
            for (j, gx_j) in gx.iter().enumerate() {
                let mut acc = DotAccumulator::new(field);
                for (k, x) in &conjugated {
                    acc.add_product(x, &gx_j[*k])?;
                }
                if acc.finish() != *g.get(i, j) {
                    return Ok(false);
                }
            }
        }
        Ok(true)
    }
}
