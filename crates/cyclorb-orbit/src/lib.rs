//! Placeholder crate root; the orbit issue fills it.
