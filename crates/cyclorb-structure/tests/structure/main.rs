//! Tests of the structural route, one module per subject.

mod absent;
mod certificate;
mod groups;
mod imprimitive;
mod ising;
mod reference_orbits;
