//! Errors of matrix operations.

use std::fmt;

use cyclorb_field::FieldError;

/// What can go wrong in a matrix operation.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum MatrixError {
    /// An arithmetic error from the field (division by zero, mismatched fields).
    Field(FieldError),
    /// Shapes do not fit (the text says how).
    Shape(String),
    /// A square matrix is singular where an inverse was needed.
    Singular,
    /// A linear system A·x = b has no solution.
    Inconsistent,
    /// A generator set is malformed or fails its proof (the text says which generator and
    /// why).
    Invalid(String),
}

impl fmt::Display for MatrixError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            MatrixError::Field(e) => write!(f, "{e}"),
            MatrixError::Shape(s) => write!(f, "shape mismatch: {s}"),
            MatrixError::Singular => write!(f, "matrix is singular"),
            MatrixError::Inconsistent => write!(f, "the linear system has no solution"),
            MatrixError::Invalid(s) => write!(f, "{s}"),
        }
    }
}

impl std::error::Error for MatrixError {}

impl From<FieldError> for MatrixError {
    fn from(e: FieldError) -> Self {
        MatrixError::Field(e)
    }
}
