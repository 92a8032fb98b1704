//! Tests of the structural route, one module per subject.

mod absent;
mod certificate;
mod common;
mod groups;
mod imprimitive;
mod ising;
