//! Sizes known before they are spent: the number of F-symbol entries from the fusion rules
//! alone, the bytes they take once all are computed, and the bytes a Deligne product takes
//! to assemble. Callers compare these with the memory budget (`cyclorb_field::check_budget`)
//! before computing. The per-entry figures are estimates calibrated on the built-ins (an
//! element of degree φ holds φ words plus headers, and a stored F-block carries its row and
//! column labels and cache cell); they are meant to be within a small factor, not exact.

use cyclorb_field::{check_budget, FieldError};

use crate::theory::Theory;

/// Bytes of one F-symbol entry of degree φ once computed and cached (calibrated: SU(2)_k
/// keeps its q-Racah caches alongside).
fn f_entry_bytes(phi: u128) -> u128 {
    4 * (8 * phi + 64)
}

/// Bytes of one F-block cell of an assembled theory before it is filled: a hash-map entry
/// (key, `OnceLock<Box<_>>`) with the table's spare capacity and its growth. Calibrated as
/// peak RSS / cells of bare products (everything else included): su2:9*su2:9 89 B
/// (11 560 000 cells, 1.03 GB), su2:6*su2:6*su2:2 91 B, su2:4*su2:4*su2:4 88 B,
/// ising*ising*ising*ising 108 B, fibonacci^7 109 B (35 831 808 cells, 3.9 GB),
/// su2:10*so3:11 124 B (4 345 836 cells at degree 192, 0.54 GB); 160 B keeps a margin of
/// about 1.3 over the largest.
const CELL_BYTES: u128 = 160;

/// Bytes of one fusion triple of a product: its R-symbol and vertex weight (degree φ, with
/// their hash-map entries) and its place in the fusion table.
fn triple_bytes(phi: u128) -> u128 {
    2 * (8 * phi + 64) + 64
}

/// Bytes per pair of labels of a product: d, θ, S̃, S (degree φ) and the fusion table's
/// row headers.
fn pair_bytes(phi: u128) -> u128 {
    4 * (8 * phi + 64) + 64
}

impl Theory {
    /// Σ over (a, b, c, d) of |{e : N_ab^e N_ec^d ≠ 0}| · |{f : N_bc^f N_af^d ≠ 0}|: the
    /// number of F-symbol entries, from the fusion rules alone (saturating).
    pub fn f_symbol_count(&self) -> u128 {
        if !self.has_fr() {
            return 0;
        }
        let r = self.rank();
        let mut left = vec![0u128; r];
        let mut right = vec![0u128; r];
        let mut total = 0u128;
        for a in 0..r {
            for b in 0..r {
                for c in 0..r {
                    left.iter_mut().for_each(|x| *x = 0);
                    right.iter_mut().for_each(|x| *x = 0);
                    for &e in self.fusion_outcomes(a, b) {
                        for &d in self.fusion_outcomes(e, c) {
                            left[d] += 1;
                        }
                    }
                    for &f in self.fusion_outcomes(b, c) {
                        for &d in self.fusion_outcomes(a, f) {
                            right[d] += 1;
                        }
                    }
                    let block: u128 = left.iter().zip(&right).map(|(x, y)| x * y).sum();
                    total = total.saturating_add(block);
                }
            }
        }
        total
    }

    /// Estimated bytes of every F-symbol once computed (what `describe`, the data hash and
    /// `verify` need).
    pub fn f_storage_bytes(&self) -> u128 {
        self.f_symbol_count()
            .saturating_mul(f_entry_bytes(self.field().degree() as u128))
    }

    /// Refuse, before computing them, F-symbols whose estimated storage is past the budget.
    pub fn check_f_storage(&self) -> Result<(), FieldError> {
        check_budget(
            || format!("every F-symbol of {}", self.name()),
            u64::try_from(self.f_storage_bytes()).unwrap_or(u64::MAX),
        )
    }
}

/// Estimated bytes of assembling the product of `left` and `right` over a field of degree
/// φ, from what the product stores: one cell per admissible (a, b, c, d) (the product's
/// are the pairs of the factors' cells), one R-symbol and weight per fusion triple (pairs
/// of the factors' triples), and d, θ, S̃, S per pair of labels. An upper bound by the
/// calibration of [`CELL_BYTES`]; the minimal models, where the field is large, measure
/// below it too: minimal:13:12 (4 345 836 cells, 26 026 triples, rank 66, degree 192) peaks
/// at 0.93 GB for the whole construction (the Kac-formula reference included) against an
/// estimate of 0.81 GB for the product alone plus its factors' and reference's own checks;
/// minimal:13:11 (degree 480) at 0.91 GB.
pub(crate) fn product_bytes(left: &Theory, right: &Theory, phi: usize) -> u128 {
    let phi = phi as u128;
    let rank = (left.rank() as u128).saturating_mul(right.rank() as u128);
    let cells = left.f_cell_count().saturating_mul(right.f_cell_count());
    let triples = left
        .fusion_triple_count()
        .saturating_mul(right.fusion_triple_count());
    cells
        .saturating_mul(CELL_BYTES)
        .saturating_add(triples.saturating_mul(triple_bytes(phi)))
        .saturating_add(rank.saturating_mul(rank).saturating_mul(pair_bytes(phi)))
}

impl Theory {
    /// The number of F-block cells (admissible (a, b, c, d)); 0 for modular data alone.
    fn f_cell_count(&self) -> u128 {
        self.braiding.as_ref().map_or(0, |b| b.cells.len() as u128)
    }

    /// The number of (a, b, c) with N_ab^c ≠ 0.
    fn fusion_triple_count(&self) -> u128 {
        self.fusion().triples().count() as u128
    }
}
