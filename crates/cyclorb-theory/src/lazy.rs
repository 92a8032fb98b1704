//! Filling an F-block on first use, from the theory's [`FSource`].

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;

use crate::assemble::block_labels;
use crate::fmatrix::FMatrix;
use crate::structure::{FBlock, FSource};
use crate::theory::Theory;

/// The Kronecker product of two blocks, entries embedded into `field`; row (col) labels are
/// the pair labels x·r₂ + y in lexicographic order, which is the order of the product's labels.
fn kron(field: &CyclotomicField, x: &FMatrix, y: &FMatrix, r2: usize) -> FMatrix {
    let emb = |v: &Cyc| {
        field
            .embed(v)
            .expect("factor fields are subfields of the product's")
    };
    let pair = |p: &[usize], q: &[usize]| -> Vec<usize> {
        p.iter()
            .flat_map(|&i| q.iter().map(move |&j| i * r2 + j))
            .collect()
    };
    let rows = pair(&x.rows, &y.rows);
    let cols = pair(&x.cols, &y.cols);
    let mut entries = Vec::with_capacity(rows.len());
    for i in 0..x.rows.len() {
        for k in 0..y.rows.len() {
            let mut row = Vec::with_capacity(cols.len());
            for j in 0..x.cols.len() {
                let xv = emb(x.matrix.get(i, j));
                for l in 0..y.cols.len() {
                    let yv = emb(y.matrix.get(k, l));
                    row.push(field.mul(&xv, &yv).expect("same field"));
                }
            }
            entries.push(row);
        }
    }
    let matrix = if entries.is_empty() {
        Matrix::zeros(field, 0, 0)
    } else {
        Matrix::from_rows(entries).expect("rows of one length")
    };
    FMatrix::new(rows, cols, matrix, field)
}

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
            FSource::Su2(racah) => racah.block(field, (a, b, c, d), rows, cols),
            FSource::Product { left, right } => {
                let r2 = right.rank();
                let split = |x: usize| (x / r2, x % r2);
                let ((a1, a2), (b1, b2), (c1, c2), (d1, d2)) =
                    (split(a), split(b), split(c), split(d));
                let empty = FMatrix::empty(field);
                let lf = left.f_block(a1, b1, c1, d1).unwrap_or(&empty);
                let rf = right.f_block(a2, b2, c2, d2).unwrap_or(&empty);
                let forward = kron(field, lf, rf, r2);
                let inverse = match (
                    left.f_inverse_block(a1, b1, c1, d1),
                    right.f_inverse_block(a2, b2, c2, d2),
                ) {
                    (Some(li), Some(ri)) => Some(kron(field, li, ri, r2)),
                    _ => None,
                };
                FBlock { forward, inverse }
            }
            FSource::Galois { base, k } => {
                let sigma = |v: &Cyc| field.galois(v, *k).expect("k is a unit mod n");
                let empty = FMatrix::empty(field);
                let forward = base
                    .f_block(a, b, c, d)
                    .unwrap_or(&empty)
                    .map_entries(field, sigma);
                let inverse = base
                    .f_inverse_block(a, b, c, d)
                    .map(|m| m.map_entries(field, sigma));
                FBlock { forward, inverse }
            }
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
