//! Storage of the braided structure: F-blocks (filled at construction or on first use) and
//! R-symbols, keyed by label tuples.

use std::sync::{Arc, OnceLock};

use cyclorb_field::Cyc;
use hashbrown::HashMap;

use crate::builtins::su2::Su2Racah;
use crate::fmatrix::FMatrix;
use crate::theory::Theory;

/// One F-block and its inverse (`None` when the block is singular, which only a corrupted
/// file can produce; verification reports it).
#[derive(Clone, Debug)]
pub(crate) struct FBlock {
    pub forward: FMatrix,
    pub inverse: Option<FMatrix>,
}

/// Where F-blocks that are not stored come from. Computed blocks are cached in the theory.
#[derive(Clone, Debug)]
pub(crate) enum FSource {
    /// Every block was filled at construction.
    Stored,
    /// The q-Racah formula of SU(2)_k (also its integer-spin part).
    Su2(Arc<Su2Racah>),
    /// Deligne product: blocks are Kronecker products of the factors' blocks.
    Product {
        left: Arc<Theory>,
        right: Arc<Theory>,
    },
    /// Galois conjugate σ_k of a theory in the same field.
    Galois { base: Arc<Theory>, k: i64 },
}

/// F- and R-symbols of a multiplicity-free theory.
#[derive(Clone, Debug)]
pub(crate) struct Braiding {
    /// One cell per (a, b, c, d) with at least one admissible row.
    /// Boxed so that a cell not yet filled costs one pointer: a product of two large theories
    /// has millions of admissible quadruples, few of which a genus-g computation touches.
    pub cells: HashMap<u64, OnceLock<Box<FBlock>>>,
    /// How empty cells are filled.
    pub source: FSource,
    /// R^{ab}_c for admissible (a, b, c).
    pub r: HashMap<u64, Cyc>,
}

/// Key of a label triple in a rank-`rank` theory.
pub(crate) fn key3(rank: usize, a: usize, b: usize, c: usize) -> u64 {
    ((a * rank + b) * rank + c) as u64
}

/// Key of a label quadruple in a rank-`rank` theory.
pub(crate) fn key4(rank: usize, a: usize, b: usize, c: usize, d: usize) -> u64 {
    key3(rank, a, b, c) * rank as u64 + d as u64
}
