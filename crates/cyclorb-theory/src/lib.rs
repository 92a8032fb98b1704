//! Placeholder crate root; the theory issue fills it.
