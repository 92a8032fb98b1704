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

/// Bytes per rank³ of assembling a product (fusion table, R-symbols, weights, S̃ in the
/// enlarged field; calibrated on products of Ising theories).
fn assembly_bytes(phi: u128) -> u128 {
    16 * (8 * phi + 64)
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

/// Estimated bytes of assembling the product of theories of ranks r₁, r₂ over a field of
/// degree φ.
pub(crate) fn product_bytes(r1: usize, r2: usize, phi: usize) -> u128 {
    let rank = (r1 as u128).saturating_mul(r2 as u128);
    rank.saturating_mul(rank)
        .saturating_mul(rank)
        .saturating_mul(assembly_bytes(phi as u128))
}
