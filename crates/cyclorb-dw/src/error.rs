//! Errors of group construction, group files and flat-bundle spaces.

use std::fmt;

/// What can go wrong; every variant says where and why.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum DwError {
    /// A group name that is not a built-in (`Z3`, `D4`, `S3`, `Z2xZ2`, …) or a bad parameter.
    UnknownGroup(String),
    /// The generators or the table do not define a group; the text names the place and the
    /// reason (the file, when the group came from one).
    NotAGroup(String),
    /// A group file cannot be read or parsed: the file and the reason.
    File {
        /// The path as given.
        path: String,
        /// What is wrong and where.
        reason: String,
    },
    /// The group is larger than this crate handles.
    TooLarge(String),
    /// Genus 0 or too large for the representation of tuples.
    Genus(usize),
    /// The space would exceed a size bound; nothing was built.
    SpaceTooLarge {
        /// The exact number of states |X_g|.
        states: String,
        /// The bound in force.
        bound: usize,
    },
    /// An internal consistency check failed (a twist image missing from X_g, …).
    Inconsistent(String),
}

impl fmt::Display for DwError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            DwError::UnknownGroup(s) => write!(f, "unknown group {s}"),
            DwError::NotAGroup(s) => write!(f, "not a group: {s}"),
            DwError::File { path, reason } => write!(f, "{path}: {reason}"),
            DwError::TooLarge(s) => write!(f, "group too large: {s}"),
            DwError::Genus(g) => write!(f, "genus {g} is not supported (need 1 ≤ g ≤ 8)"),
            DwError::SpaceTooLarge { states, bound } => write!(
                f,
                "the space has {states} states, more than the bound of {bound}; nothing was built"
            ),
            DwError::Inconsistent(s) => write!(f, "internal check failed: {s}"),
        }
    }
}

impl std::error::Error for DwError {}
