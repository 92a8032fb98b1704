//! Filling an F-block on first use, from the theory's [`FSource`] (any
//! [`crate::structure::FBlockSource`]), and filling all of them on every core.

use cyclorb_matrix::Matrix;

use crate::assemble::block_labels;
use crate::fmatrix::FMatrix;
use crate::structure::{FBlock, FSource};
use crate::theory::Theory;

impl Theory {
    /// Compute [F^{abc}_d] and its inverse from the source (called once per block).
    pub(crate) fn compute_block(&self, a: usize, b: usize, c: usize, d: usize) -> FBlock {
        let field = &self.field;
        let (rows, cols) = block_labels(&self.fusion, a, b, c, d);
        let Some(braiding) = &self.braiding else {
            return FBlock {
                forward: FMatrix::empty(field),
                inverse: None,
            };
        };
        match &braiding.source {
            FSource::Computed(source) => source.block(field, (a, b, c, d), rows, cols),
            FSource::Stored => {
                // Stored blocks are filled at construction; a missing one reads as zero.
                let matrix = Matrix::zeros(field, rows.len(), cols.len());
                FBlock {
                    forward: FMatrix::new(rows, cols, matrix, field),
                    inverse: None,
                }
            }
        }
    }
}

impl Theory {
    /// Compute every F-block not yet computed, on all available cores (blocks are cached, so
    /// this only front-loads work that later lookups would do one by one).
    pub fn compute_all_f(&self) {
        let labels = self.f_block_labels();
        if labels.is_empty() {
            return;
        }
        let threads = std::thread::available_parallelism()
            .map_or(1, |n| n.get())
            .clamp(1, labels.len());
        std::thread::scope(|scope| {
            for worker in 0..threads {
                let labels = &labels;
                scope.spawn(move || {
                    for &(a, b, c, d) in labels.iter().skip(worker).step_by(threads) {
                        let _ = self.f_block(a, b, c, d);
                    }
                });
            }
        });
    }
}
