//! T_{α_h}: the twist about the meridian of handle h is diagonal in the comb basis,
//! θ_{a_h} on every tree (the charge through α_h is the loop label a_h).

use cyclorb_field::Cyc;
use cyclorb_matrix::Operator;
use cyclorb_theory::Theory;

use crate::basis::CombBasis;

/// diag(θ_{a_h}) over the comb basis.
pub fn alpha_twist(theory: &Theory, basis: &CombBasis, h: usize) -> Operator {
    let entries: Vec<Cyc> = basis
        .states()
        .iter()
        .map(|s| theory.twist(s.loops[h]).clone())
        .collect();
    Operator::Diagonal(entries)
}
