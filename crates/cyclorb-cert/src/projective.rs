//! Canonical representatives modulo scalars: a non-zero vector or matrix divided by its
//! first non-zero entry (row-major for matrices). Two are proportional exactly when their
//! representatives are equal, so representatives can be hashed.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;

use crate::error::CertError;

/// x / x_k for the first k with x_k ≠ 0; an error for the zero vector.
pub(crate) fn normalise(field: &CyclotomicField, x: &[Cyc]) -> Result<Vec<Cyc>, CertError> {
    let Some(lead) = x.iter().find(|c| !c.is_zero()) else {
        return Err(CertError::Input("the zero vector spans no line".into()));
    };
    if lead.is_one() {
        return Ok(x.to_vec());
    }
    let inverse = field.inv(lead)?;
    x.iter()
        .map(|c| Ok(field.mul(c, &inverse)?))
        .collect::<Result<_, CertError>>()
}

/// The representative of the line of a non-zero matrix modulo scalars.
pub(crate) fn projective_matrix(field: &CyclotomicField, m: &Matrix) -> Result<Matrix, CertError> {
    let entries = normalise(field, m.entries())?;
    let rows = entries.chunks(m.cols()).map(<[Cyc]>::to_vec).collect();
    Ok(Matrix::from_rows(rows)?)
}
