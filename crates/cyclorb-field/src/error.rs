//! Errors of field arithmetic: values, never panics.

use std::fmt;

/// What can go wrong in exact cyclotomic arithmetic.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum FieldError {
    /// An inverse or quotient by zero was asked for.
    DivisionByZero,
    /// Two operands live in different fields Q(ζ_m), Q(ζ_n) with m ≠ n.
    FieldMismatch {
        /// Conductor of the left operand or the context.
        left: u32,
        /// Conductor of the right operand.
        right: u32,
    },
    /// The conductor is not allowed (zero, or too large for the tables).
    BadConductor(u32),
    /// σ_k was asked for with gcd(k, n) ≠ 1.
    NotAnAutomorphism {
        /// The exponent k.
        k: i64,
        /// The conductor n.
        n: u32,
    },
    /// Embedding Q(ζ_m) into Q(ζ_n) needs m | n.
    NotASubfield {
        /// Conductor of the source.
        from: u32,
        /// Conductor of the target.
        to: u32,
    },
    /// Text could not be read as an element.
    Parse {
        /// The text that was read.
        text: String,
        /// Byte offset of the problem.
        at: usize,
        /// What is wrong there.
        reason: String,
    },
    /// An estimated size is past the process's memory budget (see `set_memory_budget`).
    OverBudget {
        /// What would be allocated.
        what: String,
        /// Its estimated size in bytes.
        bytes: u64,
        /// The budget in bytes.
        budget: u64,
    },
    /// A reduction modulo a prime was asked for where it is undefined.
    BadPrime {
        /// The prime.
        p: u64,
        /// Why it cannot be used.
        reason: String,
    },
}

impl fmt::Display for FieldError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            FieldError::DivisionByZero => write!(f, "division by zero"),
            FieldError::FieldMismatch { left, right } => {
                write!(f, "field mismatch: Q(ζ_{left}) against Q(ζ_{right})")
            }
            FieldError::BadConductor(n) => write!(f, "conductor {n} is not supported"),
            FieldError::NotAnAutomorphism { k, n } => {
                write!(
                    f,
                    "σ_{k} is not an automorphism of Q(ζ_{n}): gcd({k}, {n}) ≠ 1"
                )
            }
            FieldError::NotASubfield { from, to } => {
                write!(
                    f,
                    "Q(ζ_{from}) is not a subfield of Q(ζ_{to}): {from} does not divide {to}"
                )
            }
            FieldError::Parse { text, at, reason } => {
                write!(f, "cannot read {text:?} at byte {at}: {reason}")
            }
            FieldError::OverBudget {
                what,
                bytes,
                budget,
            } => write!(
                f,
                "{what} needs about {} MiB by estimate, more than the memory budget of {} MiB \
                 (cyclorb: --memory-limit MIB raises it)",
                bytes.div_ceil(1 << 20),
                budget >> 20
            ),
            FieldError::BadPrime { p, reason } => write!(f, "prime {p} unusable: {reason}"),
        }
    }
}

impl std::error::Error for FieldError {}
