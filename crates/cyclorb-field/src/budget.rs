//! The process's memory budget: sizes are estimated from the input before they are
//! allocated, and an estimate past the budget is refused as [`FieldError::OverBudget`]
//! instead of exhausting the machine.
//!
//! The budget is one process-wide number because every stage (field tables here, block
//! spaces, F-symbols and products downstream) draws on the same memory. Libraries read it
//! with [`memory_budget`] and check with [`check_budget`]; the program sets it once
//! ([`set_memory_budget`]). Unset, it is unlimited.

use std::sync::atomic::{AtomicU64, Ordering};

use crate::context::CyclotomicField;
use crate::error::FieldError;
use crate::numtheory::euler_phi;

static BUDGET: AtomicU64 = AtomicU64::new(u64::MAX);

/// Set the memory budget in bytes (`u64::MAX`: unlimited).
pub fn set_memory_budget(bytes: u64) {
    BUDGET.store(bytes, Ordering::SeqCst);
}

/// The memory budget in bytes (`u64::MAX` when unlimited).
pub fn memory_budget() -> u64 {
    BUDGET.load(Ordering::SeqCst)
}

/// Refuse `what` when its estimated size `bytes` is past the budget.
pub fn check_budget(what: impl FnOnce() -> String, bytes: u64) -> Result<(), FieldError> {
    let budget = memory_budget();
    if bytes > budget {
        Err(FieldError::OverBudget {
            what: what(),
            bytes,
            budget,
        })
    } else {
        Ok(())
    }
}

impl CyclotomicField {
    /// The bytes the context of Q(ζ_n) allocates, estimated from n alone: the residue table
    /// (n rows of φ(n) words) and the fold table of the same order.
    pub fn table_bytes(n: u32) -> u64 {
        let phi = euler_phi(u64::from(n.max(1)));
        16u64.saturating_mul(u64::from(n)).saturating_mul(phi)
    }
}
