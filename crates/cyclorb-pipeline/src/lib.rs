//! # cyclorb-pipeline: from a theory spec to proved answers
//!
//! The layer a script (or the `cyclorb` program) calls: it reads a spec, proves the data it
//! rests on, builds the genus-g block space and its Dehn twists, and runs the routes that
//! decide the vacuum orbit and the projective image, using the libraries below
//! (`cyclorb-orbit` to list orbits, `cyclorb-structure` and `cyclorb-dw` to count them,
//! `cyclorb-cert` for certificates). It prints nothing and parses no command line.
//!
//! - [`proof`]: only proved data are used (theory files verified, cached by data hash;
//!   raw generators proved invertible), and a process-wide record of whether they were.
//! - [`space`]: spec → block space → generator sets → the vacuum orbit problem.
//! - [`answer`]: the one answer of the orbit routes ([`OrbitAnswer`]), with its JSON keys.
//! - [`method`]: the routes to the vacuum orbit ([`OrbitMethod`]).
//! - [`dw_space`]: the same for Dijkgraaf–Witten theories `dw:GROUP`, as permutations.
//! - [`listing`]: the enumerating route (origin, checkpoints, the run, its answer).
//! - [`product`]: the orbit of a Deligne product from its factors' orbits.
//! - [`runtime`]: resident memory of the process and the default memory budget.
//! - [`lines`]: the faithful set of orbit lines the image route needs.
//! - [`lifted`]: witnesses of infinite image found on a Deligne factor.

#![deny(missing_docs)]

pub mod answer;
pub mod dw_space;
pub mod lifted;
pub mod lines;
pub mod listing;
pub mod method;
pub mod product;
pub mod proof;
mod proof_cache;
pub mod runtime;
pub mod space;

pub use answer::{Count, OrbitAnswer};
pub use method::OrbitMethod;
