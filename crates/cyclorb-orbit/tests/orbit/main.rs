//! Integration tests of cyclorb-orbit: orbits with known sizes and Poincaré sums, limits,
//! stops and resumption, thread independence, checkpoints and file formats. Every check
//! against an outside value names its source beside it.

mod distributed;
mod formats;
mod groups;
mod ising;
#[path = "../../../../tests/outside/mod.rs"]
mod outside;
mod poincare;
mod products;
mod runs;
mod sample_sets;
mod stores;
mod su2;
