//! Errors of theory construction, specs and files: values, never panics.

use std::fmt;

use cyclorb_field::FieldError;
use cyclorb_matrix::MatrixError;

/// What can go wrong when building or reading a theory.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum TheoryError {
    /// A spec could not be understood (unknown name, bad parameters, bad syntax).
    Spec {
        /// The spec text.
        spec: String,
        /// What is wrong.
        reason: String,
    },
    /// A theory file was refused.
    File {
        /// The file path.
        file: String,
        /// Where in the file (JSON path, or line and column).
        place: String,
        /// What is wrong there.
        reason: String,
    },
    /// The data are not those of a modular category (the Gauss sum fails).
    NotModular {
        /// The theory name.
        theory: String,
        /// The failing equation.
        reason: String,
    },
    /// An arithmetic error.
    Field(FieldError),
    /// A broken internal invariant (a bug, reported instead of a panic).
    Internal(String),
}

impl fmt::Display for TheoryError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            TheoryError::Spec { spec, reason } => write!(f, "theory spec {spec:?}: {reason}"),
            TheoryError::File {
                file,
                place,
                reason,
            } => write!(f, "theory file {file}, at {place}: {reason}"),
            TheoryError::NotModular { theory, reason } => {
                write!(f, "theory {theory} is not modular: {reason}")
            }
            TheoryError::Field(e) => write!(f, "{e}"),
            TheoryError::Internal(s) => write!(f, "internal error: {s}"),
        }
    }
}

impl std::error::Error for TheoryError {}

impl From<FieldError> for TheoryError {
    fn from(e: FieldError) -> Self {
        TheoryError::Field(e)
    }
}

impl From<MatrixError> for TheoryError {
    fn from(e: MatrixError) -> Self {
        match e {
            MatrixError::Field(f) => TheoryError::Field(f),
            other => TheoryError::Internal(other.to_string()),
        }
    }
}
