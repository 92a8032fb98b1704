//! Placeholder crate root; the generators issue fills it.
