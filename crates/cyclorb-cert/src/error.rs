//! Errors of certificate computations: values, never panics.

use std::fmt;

use cyclorb_field::FieldError;
use cyclorb_matrix::MatrixError;

/// What can go wrong while computing or re-checking a certificate.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum CertError {
    /// An arithmetic error from the field.
    Field(FieldError),
    /// An error from matrix arithmetic.
    Matrix(MatrixError),
    /// The input is malformed (the text says how).
    Input(String),
    /// A size limit was reached before an answer (the text says which).
    Limit(String),
    /// A certificate did not survive re-checking (the text says which step failed).
    Rejected(String),
}

impl fmt::Display for CertError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            CertError::Field(e) => write!(f, "{e}"),
            CertError::Matrix(e) => write!(f, "{e}"),
            CertError::Input(s) => write!(f, "bad input: {s}"),
            CertError::Limit(s) => write!(f, "limit reached: {s}"),
            CertError::Rejected(s) => write!(f, "certificate rejected: {s}"),
        }
    }
}

impl std::error::Error for CertError {}

impl From<FieldError> for CertError {
    fn from(e: FieldError) -> Self {
        CertError::Field(e)
    }
}

impl From<MatrixError> for CertError {
    fn from(e: MatrixError) -> Self {
        match e {
            MatrixError::Invalid(reason) => CertError::Input(reason),
            other => CertError::Matrix(other),
        }
    }
}

/// Refuse a certificate made over another field Q(ζ_n) than the generators'.
pub(crate) fn require_conductor(
    gens: &cyclorb_matrix::ProvedGenerators,
    conductor: u32,
) -> Result<(), CertError> {
    let own = gens.conductor();
    require(conductor == own, || {
        format!("conductor {conductor} for generators over Q(ζ_{own})")
    })
}

/// `Ok(())` when `condition` holds, otherwise [`CertError::Rejected`] with `reason`.
pub(crate) fn require(condition: bool, reason: impl FnOnce() -> String) -> Result<(), CertError> {
    if condition {
        Ok(())
    } else {
        Err(CertError::Rejected(reason()))
    }
}
