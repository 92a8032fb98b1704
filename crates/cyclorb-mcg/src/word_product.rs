//! Products of sparse generators (words in the Dehn twists), computed column by column
//! through their sparse forms (cheaper than dense products). Comparison up to a scalar is
//! `cyclorb_matrix::Matrix::scalar_multiple_of` / `is_scalar`.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::{LinearMap, Matrix, Operator};

use crate::error::McgError;

/// The matrix of the word X₁ X₂ ⋯ X_k (X_k acts first), built by applying each sparse
/// generator to the columns of the running product.
pub fn word_matrix(
    field: &CyclotomicField,
    dim: usize,
    word: &[&Operator],
) -> Result<Matrix, McgError> {
    let mut columns: Vec<Vec<Cyc>> = (0..dim)
        .map(|j| {
            (0..dim)
                .map(|i| if i == j { field.one() } else { field.zero() })
                .collect()
        })
        .collect();
    for op in word.iter().rev() {
        for col in columns.iter_mut() {
            *col = op.apply(field, col)?;
        }
    }
    let rows: Vec<Vec<Cyc>> = (0..dim)
        .map(|i| columns.iter().map(|c| c[i].clone()).collect())
        .collect();
    Ok(Matrix::from_rows(rows)?)
}
