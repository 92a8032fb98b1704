//! The invariant Hermitian form of the comb basis (docs/conventions.md §4).
//!
//! In a unitary gauge the comb basis is orthonormal. In a gauge u relative to a unitary one
//! it is orthogonal with G_tree = Π_vertices |u^{ab}_c|² · Π_handles |u^{a_h a_h*}_0|⁻²;
//! the theory supplies both weights. Every Dehn twist X satisfies X† G X = G.

use cyclorb_field::Cyc;
use cyclorb_theory::Theory;

use crate::basis::CombBasis;
use crate::error::McgError;

/// The diagonal of G over the comb basis.
pub fn invariant_form(theory: &Theory, basis: &CombBasis) -> Result<Vec<Cyc>, McgError> {
    let f = theory.field();
    basis
        .states()
        .iter()
        .map(|s| {
            let mut w = f.one();
            for (a, b, c) in s.vertices(theory) {
                w = f.mul(&w, &theory.vertex_weight(a, b, c))?;
            }
            for &a in &s.loops {
                w = f.div(&w, &theory.handle_weight(a))?;
            }
            Ok(w)
        })
        .collect()
}
