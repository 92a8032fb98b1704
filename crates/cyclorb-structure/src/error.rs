//! Errors of the structural route: values, never panics.

use std::fmt;

use cyclorb_cert::CertError;
use cyclorb_field::FieldError;
use cyclorb_matrix::MatrixError;
use cyclorb_mcg::McgError;
use cyclorb_theory::TheoryError;

/// What can go wrong on the structural route.
#[derive(Debug, Clone)]
pub enum StructureError {
    /// The representation has no monomial structure that this route can find: the text
    /// says which step failed (no power of the twists gives commuting non-scalar
    /// operators, joint eigenspaces of dimension > 1, a phase that is not a root of unity…).
    /// This is an answer about the theory, not a malfunction.
    Absent(String),
    /// A certificate or a claimed identity did not survive exact re-checking.
    Rejected(String),
    /// The input is malformed (the text says how).
    Input(String),
    /// Arithmetic failure in the field.
    Field(FieldError),
    /// Matrix failure.
    Matrix(MatrixError),
    /// The generators could not be built.
    Mcg(McgError),
    /// The theory spec could not be read.
    Theory(TheoryError),
    /// A certificate of cyclorb-cert failed.
    Cert(CertError),
}

impl StructureError {
    /// True when the error says the structure is absent (rather than a failure).
    pub fn is_absent(&self) -> bool {
        matches!(self, StructureError::Absent(_))
    }
}

impl fmt::Display for StructureError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            StructureError::Absent(s) => write!(f, "no monomial structure: {s}"),
            StructureError::Rejected(s) => write!(f, "certificate rejected: {s}"),
            StructureError::Input(s) => write!(f, "bad input: {s}"),
            StructureError::Field(e) => write!(f, "{e}"),
            StructureError::Matrix(e) => write!(f, "{e}"),
            StructureError::Mcg(e) => write!(f, "{e}"),
            StructureError::Theory(e) => write!(f, "{e}"),
            StructureError::Cert(e) => write!(f, "{e}"),
        }
    }
}

impl std::error::Error for StructureError {}

impl From<FieldError> for StructureError {
    fn from(e: FieldError) -> Self {
        StructureError::Field(e)
    }
}

impl From<MatrixError> for StructureError {
    fn from(e: MatrixError) -> Self {
        StructureError::Matrix(e)
    }
}

impl From<McgError> for StructureError {
    fn from(e: McgError) -> Self {
        StructureError::Mcg(e)
    }
}

impl From<TheoryError> for StructureError {
    fn from(e: TheoryError) -> Self {
        StructureError::Theory(e)
    }
}

impl From<CertError> for StructureError {
    fn from(e: CertError) -> Self {
        StructureError::Cert(e)
    }
}

/// `Ok(())` when `condition` holds, otherwise [`StructureError::Rejected`] with `reason`.
pub(crate) fn require(
    condition: bool,
    reason: impl FnOnce() -> String,
) -> Result<(), StructureError> {
    if condition {
        Ok(())
    } else {
        Err(StructureError::Rejected(reason()))
    }
}
