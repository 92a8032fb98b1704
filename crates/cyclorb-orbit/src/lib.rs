//! # cyclorb-orbit: exact orbits of lines and their Poincaré sums
//!
//! Given invertible matrices X_1, …, X_m over Q(ζ_n) (a [`GeneratorSet`], for a theory the
//! Dehn twists of a genus-g block space) and a seed vector v₀ (a [`Seed`], the vacuum block),
//! this crate enumerates the orbit of the line [v₀] (v₀ up to a unit scalar) under the group
//! the X_i generate, proves it closed, and sums it: B = Σ over the orbit of v v†.
//!
//! - [`OrbitProblem`] validates the input and precomputes integer forms of the generators.
//! - [`OrbitProblem::enumerate`] saturates the orbit breadth-first into an [`Orbit`]: lines in
//!   order of discovery, layer sizes, a Schreier record (parent, generator) per line
//!   ([`Orbit::word`]). [`OrbitOptions`] sets a line limit, a memory ceiling, threads, a stop
//!   flag (the program sets it on SIGINT/SIGTERM) and periodic checkpoints;
//!   [`OrbitProblem::resume`] continues from a checkpoint to the identical answer.
//! - [`OrbitProblem::poincare_sum`] computes B exactly, checks tr(B·G) = |orbit|·⟨v₀, v₀⟩_G,
//!   tests B = λ·G⁻¹, and otherwise writes B over the invariant matrices.
//! - [`PoincareReport`] is the sum's serialisable form (B by basis labels, the invariants).
//! - [`pair_orbit`] finds the orbit of a Deligne product's vacuum line from the permutations
//!   the generators induce on the two factors' orbits (the `pairs` module).
//!
//! ```
//! use cyclorb_field::CyclotomicField;
//! use cyclorb_matrix::{Matrix, Operator};
//! use cyclorb_orbit::{GeneratorSet, OrbitOptions, OrbitProblem, Seed, Silent};
//!
//! // The single-qubit Clifford group over Q(ζ_8): H and the phase gate S = diag(1, i).
//! let q8 = CyclotomicField::new(8).unwrap();
//! let e = |t: &str| q8.parse(t).unwrap();
//! let h = Matrix::from_rows(vec![
//!     vec![e("1/sqrt(2)"), e("1/sqrt(2)")],
//!     vec![e("1/sqrt(2)"), e("-1/sqrt(2)")],
//! ])
//! .unwrap();
//! let named = vec![
//!     ("H".to_string(), Operator::Dense(h)),
//!     ("S".to_string(), Operator::Diagonal(vec![e("1"), e("i")])),
//! ];
//! let generators = GeneratorSet::new(q8.clone(), named)
//!     .and_then(|set| set.with_basis_labels(vec!["0".into(), "1".into()]))
//!     .unwrap();
//! let problem = OrbitProblem::new(generators, &Seed::basis_vector(&q8, 2, 0)).unwrap();
//! let orbit = problem.enumerate(&OrbitOptions::default(), &mut Silent).unwrap();
//! // the six stabilizer states of one qubit (common practice)
//! assert_eq!(orbit.len(), 6);
//! assert!(orbit.is_saturated());
//! let sum = problem.poincare_sum(&orbit, 1).unwrap();
//! assert_eq!(sum.scalar, Some(q8.int(3)));
//! ```
//!
//! ## Keys and equality
//! A line is keyed by w = v / v_k, k its first non-zero coordinate, stored as integer
//! numerators over one shared denominator (docs/orbits.md §1). A 31-bit fingerprint, the reduction
//! of the line modulo a prime p ≡ 1 (mod n), picks the hash bucket; equality is always
//! decided exactly, by cross-multiplication D·U_i = U_k·S_i of an image U against a stored key
//! S (see the `step` and `fingerprint` modules). No floating-point number takes part in any
//! decision.
//!
//! ## Performance
//! Generators are compiled once to sparse integer matrices acting on numerator vectors
//! (stored by columns: orbit vectors are sparse), so the search runs in machine integers
//! with explicit overflow bounds, falling back to exact `Cyc` arithmetic (big integers)
//! whenever a bound fails. A field inversion is needed only for a new line, and inverses of
//! first coordinates are remembered. Keys are packed sparsely (bit masks of non-zero blocks
//! and coefficients, then the coefficients at 1, 2, 4 or 8 bytes) in one flat arena. The
//! frontier is split over threads, and so is the insertion of new lines (sharded by
//! fingerprint, numbered on one thread in a fixed order), so results do not depend on the
//! thread count. Ising at genus 3 (8 847 360 lines of Q(ζ16)^36) stores
//! about 90 bytes per line in the memory store and about 19 in the compact store
//! ([`StoreKind`]: Schreier records, 62-bit fingerprints and the keys of the last five
//! layers, older lines recomputed from their words on a fingerprint match; finished layers'
//! keys can spill to files, [`OrbitOptions::spill`]); docs/orbits.md §6.
//!
//! ## Untrusted input
//! Generator-set and seed files are read with errors naming the file, the JSON path and the
//! reason ([`FormatError`]); checkpoints are checked (magic, version, problem hash, sizes,
//! checksum) before use. Nothing here panics on bad input.

#![deny(missing_docs)]

mod checkpoint;
mod collective;
pub use checkpoint::checkpoint_origin;
mod commutant;
mod compact;
mod compiled;
mod distributed;
mod distributed_compact;
mod engine;
mod error;
mod fingerprint;
mod insert;
mod key;
mod pairs;
mod poincare;
mod problem;
mod rank_checkpoint;
mod regenerate;
mod report;
mod set;
mod sparse;
mod sparse_numerators;
mod spill;
mod step;
mod store;
mod sum;
mod wire;

pub use collective::{gather_numbers, Collective};
pub use commutant::{Decomposition, InvariantTerm};
pub use cyclorb_matrix::{
    FormatError, GeneratorSet, Seed, FORMAT_VERSION, GENERATORS_FORMAT, MAX_DENSE_PROOF,
    SEED_FORMAT,
};
pub use distributed::DistributedOrbit;
pub use engine::{
    CheckpointPlan, Orbit, OrbitOptions, Progress, ProgressObserver, Silent, StopReason,
};
pub use error::OrbitError;
pub use pairs::{pair_orbit, PairOrbit};
pub use poincare::PoincareSum;
pub use problem::OrbitProblem;
pub use rank_checkpoint::{first_rank_checkpoint, rank_checkpoint_origin, rank_checkpoint_path};
pub use report::{InvariantReport, LabelledEntry, ModularInvariantReport, PoincareReport};
pub use set::StoreKind;
