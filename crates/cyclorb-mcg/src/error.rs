//! Errors of the generator construction.

use std::fmt;

use cyclorb_field::FieldError;
use cyclorb_matrix::MatrixError;

/// What can go wrong while building blocks and twists.
#[derive(Debug, Clone)]
pub enum McgError {
    /// Genus 0 or otherwise unsupported.
    Genus(usize),
    /// The theory has modular data only (no F, R): genus ≥ 2 needs F and R.
    NoFusionData {
        /// The theory's name.
        theory: String,
        /// The genus asked for.
        genus: usize,
    },
    /// An F-move block between tree bases is not square or not invertible: the data are
    /// inconsistent (the theory does not verify).
    BadBlock(String),
    /// Arithmetic failure.
    Field(FieldError),
    /// Matrix failure.
    Matrix(MatrixError),
}

impl fmt::Display for McgError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            McgError::Genus(g) => write!(f, "genus {g} is not supported (need g ≥ 1)"),
            McgError::NoFusionData { theory, genus } => write!(
                f,
                "theory {theory} has modular data only (S, T); genus {genus} needs F- and R-symbols"
            ),
            McgError::BadBlock(s) => write!(f, "inconsistent theory data: {s}"),
            McgError::Field(e) => write!(f, "{e}"),
            McgError::Matrix(e) => write!(f, "{e}"),
        }
    }
}

impl std::error::Error for McgError {}

impl From<FieldError> for McgError {
    fn from(e: FieldError) -> Self {
        McgError::Field(e)
    }
}

impl From<MatrixError> for McgError {
    fn from(e: MatrixError) -> Self {
        McgError::Matrix(e)
    }
}
