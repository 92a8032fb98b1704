//! Storage of the braided structure: F-blocks (filled at construction or on first use) and
//! R-symbols, keyed by label tuples.

use std::sync::{Arc, OnceLock};

use cyclorb_field::{Cyc, CyclotomicField};
use hashbrown::HashMap;

use crate::fmatrix::FMatrix;
use crate::theory::Theory;

/// One F-block and its inverse (`None` when the block is singular, which only a corrupted
/// file can produce; verification reports it).
#[derive(Clone, Debug)]
pub(crate) struct FBlock {
    pub forward: FMatrix,
    pub inverse: Option<FMatrix>,
}

/// A source of the F-blocks a theory does not store: a formula (the q-Racah formula of
/// SU(2)_k in `builtins::su2`) or other theories (Deligne products and Galois conjugates in
/// `composite`). The storage here and the lazy filling in `lazy` know only this trait, so
/// built-ins and operations depend on the core and never the reverse.
pub(crate) trait FBlockSource: std::fmt::Debug + Send + Sync {
    /// [F^{abc}_d] for `labels` = (a, b, c, d) and its inverse, in `field`; `rows` and
    /// `cols` are the admissible intermediate labels e and f, in increasing order.
    fn block(
        &self,
        field: &CyclotomicField,
        labels: (usize, usize, usize, usize),
        rows: Vec<usize>,
        cols: Vec<usize>,
    ) -> FBlock;

    /// The theories this source builds the F- and R-symbols from (empty for a formula).
    fn building_blocks(&self) -> Vec<&Theory> {
        Vec::new()
    }

    /// The factors (A, B) when the blocks are those of a Deligne product A ⊠ B.
    fn deligne_factors(&self) -> Option<(&Theory, &Theory)> {
        None
    }

    /// How the blocks follow from other theories, as the line of the construction hash
    /// (`F product LEFT RIGHT`, `F galois k BASE` with the building blocks' construction
    /// hashes); `None` when the blocks are the theory's own (a formula).
    fn construction_line(&self) -> Option<String> {
        None
    }
}

/// Where F-blocks come from. Computed blocks are cached in the theory.
#[derive(Clone, Debug)]
pub(crate) enum FSource {
    /// Every block was filled at construction.
    Stored,
    /// Blocks are computed on first use from this source.
    Computed(Arc<dyn FBlockSource>),
}

impl FSource {
    /// The theories the blocks are built from (empty for stored blocks and formulas).
    pub(crate) fn building_blocks(&self) -> Vec<&Theory> {
        match self {
            FSource::Stored => Vec::new(),
            FSource::Computed(source) => source.building_blocks(),
        }
    }

    /// The factors (A, B) when the blocks are those of a Deligne product A ⊠ B.
    pub(crate) fn deligne_factors(&self) -> Option<(&Theory, &Theory)> {
        match self {
            FSource::Stored => None,
            FSource::Computed(source) => source.deligne_factors(),
        }
    }

    /// The construction line of the blocks (see [`FBlockSource::construction_line`]).
    pub(crate) fn construction_line(&self) -> Option<String> {
        match self {
            FSource::Stored => None,
            FSource::Computed(source) => source.construction_line(),
        }
    }
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
