//! T_{γ_h}: the twist about the curve around p_{2h+1}, p_{2h+2} (docs/genus-g.md §3).
//!
//! Three F-moves make leaves 2h+1 and 2h+2 (a_h* and a_{h+1}) siblings; then
//! T = U⁻¹ diag(θ_c) U, where c is the charge of the new node (a_h* a_{h+1})_c and
//! U[new, old] is, for old labels (x_{h+1}, b_h, b_{h+1}) and new labels (y, z, c),
//!
//!   U = [F^{x_h b_h b_{h+1}}_{x_{h+2}}]_{x_{h+1}, y} · [(F^{b_h a_{h+1} a_{h+1}*}_y)⁻¹]_{b_{h+1}, z}
//!       · [F^{a_h a_h* a_{h+1}}_z]_{b_h, c}
//!
//! (for h = 0 the first move is absent: x₁ = b₀ is replaced and y = x₂ stays). U is
//! block-diagonal: a block fixes the loops and every label the moves do not touch.

use hashbrown::HashMap;

use cyclorb_field::Cyc;
use cyclorb_matrix::{Block, Matrix, Operator};
use cyclorb_theory::Theory;

use crate::basis::{CombBasis, CombState};
use crate::error::McgError;

/// New-tree labels (y, z, c) of a block.
type NewLabels = (usize, usize, usize);

/// The old labels a block varies: (x_{h+1}, b_h, b_{h+1}) for h ≥ 1, (b₀, b₁) for h = 0.
fn blank_varied(s: &CombState, h: usize) -> CombState {
    let mut key = s.clone();
    key.sticks[h] = usize::MAX;
    key.sticks[h + 1] = usize::MAX;
    key.backbone[h] = usize::MAX; // x_{h+1} (x₁ = b₀ when h = 0)
    key
}

/// Every new tree (y, z, c) compatible with the fixed labels of a block.
fn new_trees(theory: &Theory, key: &CombState, h: usize) -> Vec<NewLabels> {
    let (ah, ah1) = (key.loops[h], key.loops[h + 1]);
    let top = key.x(h + 2); // x_{h+2}
    let mut out = Vec::new();
    for &c in theory.fusion_outcomes(theory.dual(ah), ah1) {
        for &z in theory.fusion_outcomes(ah, c) {
            for &y in theory.fusion_outcomes(z, theory.dual(ah1)) {
                let ok = if h == 0 {
                    y == top
                } else {
                    theory.fuses(key.x(h), y, top)
                };
                if ok {
                    out.push((y, z, c));
                }
            }
        }
    }
    out.sort();
    out.dedup();
    out
}

/// U[(y, z, c), old state] for one old state.
fn transition(
    theory: &Theory,
    s: &CombState,
    h: usize,
    (y, z, c): NewLabels,
) -> Result<Cyc, McgError> {
    let f = theory.field();
    let (ah, ah1) = (s.loops[h], s.loops[h + 1]);
    let (bh, bh1) = (s.sticks[h], s.sticks[h + 1]);
    let first = if h == 0 {
        if y == s.x(2) {
            f.one()
        } else {
            f.zero()
        }
    } else {
        theory
            .f_matrix(s.x(h), bh, bh1, s.x(h + 2))
            .entry(s.x(h + 1), y)
    };
    if first.is_zero() {
        return Ok(first);
    }
    let second = theory.f_inverse(bh, ah1, theory.dual(ah1), y).entry(bh1, z);
    if second.is_zero() {
        return Ok(second);
    }
    let third = theory.f_matrix(ah, theory.dual(ah), ah1, z).entry(bh, c);
    Ok(f.mul(&first, &f.mul(&second, &third)?)?)
}

/// T_{γ_h} over the comb basis (0 ≤ h < g − 1), as a block-diagonal operator.
pub fn gamma_twist(theory: &Theory, basis: &CombBasis, h: usize) -> Result<Operator, McgError> {
    let f = theory.field();
    let mut groups: HashMap<CombState, Vec<usize>> = HashMap::new();
    for (i, s) in basis.states().iter().enumerate() {
        groups.entry(blank_varied(s, h)).or_default().push(i);
    }
    let mut keys: Vec<&CombState> = groups.keys().collect();
    keys.sort();
    let mut blocks = Vec::new();
    for key in keys {
        let old = &groups[key];
        let new = new_trees(theory, key, h);
        if new.len() != old.len() {
            return Err(McgError::BadBlock(format!(
                "gamma{h}: {} old trees but {} new trees in block {key:?}",
                old.len(),
                new.len()
            )));
        }
        let k = old.len();
        let mut u = Matrix::zeros(f, k, k);
        for (j, &i) in old.iter().enumerate() {
            let s = &basis.states()[i];
            for (r, &labels) in new.iter().enumerate() {
                u.set(r, j, transition(theory, s, h, labels)?);
            }
        }
        let u_inv = u.inverse(f).map_err(|e| {
            McgError::BadBlock(format!(
                "gamma{h}: F-move block not invertible ({e}) in block {key:?}"
            ))
        })?;
        let thetas: Vec<Cyc> = new
            .iter()
            .map(|&(_, _, c)| theory.twist(c).clone())
            .collect();
        let t = u_inv.mul(f, &Matrix::diagonal(f, &thetas))?.mul(f, &u)?;
        blocks.push(Block {
            indices: old.clone(),
            matrix: t,
        });
    }
    Ok(Operator::BlockDiagonal {
        dim: basis.dimension(),
        blocks,
    })
}
