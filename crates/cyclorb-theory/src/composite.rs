//! The F-blocks of theories built from other theories: the Deligne product (Kronecker
//! products of the factors' blocks) and the Galois conjugate (σ_k applied to the base's
//! blocks). Both are [`FBlockSource`]s, filled on first use by `lazy`.

use std::sync::Arc;

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;

use crate::fmatrix::FMatrix;
use crate::structure::{FBlock, FBlockSource};
use crate::theory::Theory;

/// Deligne product A ⊠ B: label (a₁, a₂) at index a₁·rank(B) + a₂, and
/// [F^{abc}_d] = [F^{a₁b₁c₁}_{d₁}] ⊗ [F^{a₂b₂c₂}_{d₂}].
#[derive(Debug)]
pub(crate) struct ProductBlocks {
    pub(crate) left: Arc<Theory>,
    pub(crate) right: Arc<Theory>,
}

impl FBlockSource for ProductBlocks {
    fn block(
        &self,
        field: &CyclotomicField,
        (a, b, c, d): (usize, usize, usize, usize),
        _rows: Vec<usize>,
        _cols: Vec<usize>,
    ) -> FBlock {
        let (left, right) = (&self.left, &self.right);
        let r2 = right.rank();
        let split = |x: usize| (x / r2, x % r2);
        let ((a1, a2), (b1, b2), (c1, c2), (d1, d2)) = (split(a), split(b), split(c), split(d));
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

    fn building_blocks(&self) -> Vec<&Theory> {
        vec![self.left.as_ref(), self.right.as_ref()]
    }

    fn deligne_factors(&self) -> Option<(&Theory, &Theory)> {
        Some((self.left.as_ref(), self.right.as_ref()))
    }

    fn construction_line(&self) -> Option<String> {
        Some(format!(
            "F product {} {}",
            self.left.construction_hash(),
            self.right.construction_hash()
        ))
    }
}

/// Galois conjugate σ_k of a theory in the same field: [F^{abc}_d] ↦ σ_k([F^{abc}_d]).
#[derive(Debug)]
pub(crate) struct GaloisBlocks {
    pub(crate) base: Arc<Theory>,
    pub(crate) k: i64,
}

impl FBlockSource for GaloisBlocks {
    fn block(
        &self,
        field: &CyclotomicField,
        (a, b, c, d): (usize, usize, usize, usize),
        _rows: Vec<usize>,
        _cols: Vec<usize>,
    ) -> FBlock {
        let sigma = |v: &Cyc| field.galois(v, self.k).expect("k is a unit mod n");
        let empty = FMatrix::empty(field);
        let forward = self
            .base
            .f_block(a, b, c, d)
            .unwrap_or(&empty)
            .map_entries(field, sigma);
        let inverse = self
            .base
            .f_inverse_block(a, b, c, d)
            .map(|m| m.map_entries(field, sigma));
        FBlock { forward, inverse }
    }

    fn building_blocks(&self) -> Vec<&Theory> {
        vec![self.base.as_ref()]
    }

    fn construction_line(&self) -> Option<String> {
        Some(format!(
            "F galois {} {}",
            self.k,
            self.base.construction_hash()
        ))
    }
}

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
