//! Products of sparse generators, computed column by column through their sparse forms
//! (cheaper than dense products), and comparison up to a scalar.

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

/// The scalar λ with X = λ·Y, when there is one (Y ≠ 0).
pub fn proportionality(
    field: &CyclotomicField,
    x: &Matrix,
    y: &Matrix,
) -> Result<Option<Cyc>, McgError> {
    let Some(k) = y.entries().iter().position(|e| !e.is_zero()) else {
        return Ok(None);
    };
    let lambda = field.div(&x.entries()[k], &y.entries()[k])?;
    for (a, b) in x.entries().iter().zip(y.entries()) {
        if *a != field.mul(&lambda, b)? {
            return Ok(None);
        }
    }
    Ok(Some(lambda))
}

/// Whether X is a scalar multiple of the identity.
pub fn is_scalar(field: &CyclotomicField, x: &Matrix) -> Result<bool, McgError> {
    let id = Matrix::identity(field, x.rows());
    Ok(proportionality(field, x, &id)?.is_some())
}
