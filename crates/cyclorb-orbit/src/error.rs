//! Errors of the orbit crate: values, never panics.

use std::fmt;

use cyclorb_field::FieldError;
use cyclorb_matrix::{FormatError, MatrixError};

/// What can go wrong when setting up or running an orbit computation.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum OrbitError {
    /// A generator-set or seed file is malformed.
    Format(FormatError),
    /// The problem does not make sense (shapes, fields, a zero seed, a singular generator).
    Invalid(String),
    /// Exact arithmetic failed (a field or matrix error).
    Arithmetic(String),
    /// A checkpoint cannot be written, read or used for this problem.
    Checkpoint {
        /// The checkpoint file.
        path: String,
        /// Why.
        reason: String,
    },
    /// A file could not be read or written.
    Io {
        /// The file.
        path: String,
        /// The operating system's message.
        reason: String,
    },
}

impl fmt::Display for OrbitError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            OrbitError::Format(e) => write!(f, "{e}"),
            OrbitError::Invalid(s) => write!(f, "invalid orbit problem: {s}"),
            OrbitError::Arithmetic(s) => write!(f, "arithmetic error: {s}"),
            OrbitError::Checkpoint { path, reason } => write!(f, "checkpoint {path}: {reason}"),
            OrbitError::Io { path, reason } => write!(f, "{path}: {reason}"),
        }
    }
}

impl std::error::Error for OrbitError {}

impl From<FormatError> for OrbitError {
    fn from(e: FormatError) -> Self {
        OrbitError::Format(e)
    }
}

impl From<FieldError> for OrbitError {
    fn from(e: FieldError) -> Self {
        OrbitError::Arithmetic(e.to_string())
    }
}

impl From<MatrixError> for OrbitError {
    fn from(e: MatrixError) -> Self {
        match e {
            MatrixError::Invalid(reason) => OrbitError::Invalid(reason),
            other => OrbitError::Arithmetic(other.to_string()),
        }
    }
}

/// The result of a scoped worker thread; a panicked worker becomes an error value.
pub(crate) fn joined<T>(
    handle: std::thread::ScopedJoinHandle<'_, Result<T, OrbitError>>,
) -> Result<T, OrbitError> {
    handle
        .join()
        .unwrap_or_else(|_| Err(OrbitError::Invalid("a worker thread panicked".into())))
}
