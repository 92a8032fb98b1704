//! # cyclorb-matrix: vectors and matrices over Q(ζ_n)
//!
//! Dense matrices ([`Matrix`]) and the sparse forms that Dehn-twist generators take
//! ([`Operator`]: diagonal, block-diagonal, sparse rows), all applied through the
//! [`LinearMap`] trait. Entries are [`cyclorb_field::Cyc`]; every operation takes the field
//! context. Products use one reduction modulo Φ_n per output entry.

#![deny(missing_docs)]

mod dense;
mod error;
mod operator;

pub use dense::Matrix;
pub use error::MatrixError;
pub use operator::{Block, LinearMap, Operator};
