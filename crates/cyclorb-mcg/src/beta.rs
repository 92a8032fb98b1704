//! T_{β_h}: the twist about the longitude of handle h (docs/genus-g.md §4).
//!
//! With stick label b = b_h, in the trace basis φ^a of the one-holed torus the Wilson loop of
//! charge x along β is W_x[c, a] = [(F^{b a x}_c)⁻¹]_{c a}; with
//! ω_x = Σ_c θ_c S_0c conj(S_xc) = Σ_c θ_c S̃_0c conj(S̃_xc) / D² and
//! μ(b, a) = [(F^{b a a*}_b)⁻¹]_{0 a} (trace basis → planar stick vertex),
//!
//!   T_β(b) = diag(μ) · (Σ_x ω_x W_x) · diag(μ)⁻¹.
//!
//! T_{β_h} changes a_h only; every other label is fixed, so it is block-diagonal with one
//! block per choice of the other labels.

use hashbrown::HashMap;

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::{Block, Matrix, Operator};
use cyclorb_theory::Theory;

use crate::basis::{CombBasis, CombState};
use crate::error::McgError;

/// The coefficients ω_x = Σ_c θ_c S_0c conj(S_xc), computed with S̃ and D² = Σ_a d_a².
fn omegas(theory: &Theory) -> Result<Vec<Cyc>, McgError> {
    let f = theory.field();
    let s = theory.s_unnormalized();
    let r = theory.rank();
    let d2 = f.sum(
        &(0..r)
            .map(|a| f.mul(theory.quantum_dim(a), theory.quantum_dim(a)))
            .collect::<Result<Vec<_>, _>>()?,
    )?;
    (0..r)
        .map(|x| {
            let mut acc = f.zero();
            for c in 0..r {
                let term = f.mul(theory.twist(c), &f.mul(s.get(0, c), &f.conj(s.get(x, c)))?)?;
                acc = f.add(&acc, &term)?;
            }
            Ok(f.div(&acc, &d2)?)
        })
        .collect()
}

/// The matrix T_β(b) on the loop labels a with b ∈ a ⊗ a*, rows and columns in `labels` order.
pub fn longitude_block(
    theory: &Theory,
    b: usize,
    omega: &[Cyc],
) -> Result<(Vec<usize>, Matrix), McgError> {
    let f: &CyclotomicField = theory.field();
    let r = theory.rank();
    let labels: Vec<usize> = (0..r)
        .filter(|&a| theory.fuses(a, theory.dual(a), b))
        .collect();
    let k = labels.len();
    let mu: Vec<Cyc> = labels
        .iter()
        .map(|&a| theory.f_inverse(b, a, theory.dual(a), b).entry(0, a))
        .collect();
    let mut m = Matrix::zeros(f, k, k);
    for (ci, &c) in labels.iter().enumerate() {
        for (ai, &a) in labels.iter().enumerate() {
            let mut acc = f.zero();
            for (x, w) in omega.iter().enumerate() {
                if w.is_zero() || !theory.fuses(a, x, c) {
                    continue;
                }
                let wilson = theory.f_inverse(b, a, x, c).entry(c, a);
                acc = f.add(&acc, &f.mul(w, &wilson)?)?;
            }
            // conjugate by diag(μ): entry (c, a) gains μ_c / μ_a
            let scaled = f.mul(&acc, &f.div(&mu[ci], &mu[ai])?)?;
            m.set(ci, ai, scaled);
        }
    }
    Ok((labels, m))
}

/// T_{β_h} over the comb basis, as a block-diagonal operator.
pub fn beta_twist(theory: &Theory, basis: &CombBasis, h: usize) -> Result<Operator, McgError> {
    let omega = omegas(theory)?;
    let mut cache: HashMap<usize, (Vec<usize>, Matrix)> = HashMap::new();
    // group states by everything except a_h
    let mut groups: HashMap<CombState, Vec<usize>> = HashMap::new();
    for (i, s) in basis.states().iter().enumerate() {
        let mut key = s.clone();
        key.loops[h] = usize::MAX;
        groups.entry(key).or_default().push(i);
    }
    let mut keys: Vec<&CombState> = groups.keys().collect();
    keys.sort();
    let mut blocks = Vec::new();
    for key in keys {
        let b = key.sticks[h];
        if !cache.contains_key(&b) {
            cache.insert(b, longitude_block(theory, b, &omega)?);
        }
        let (labels, m) = &cache[&b];
        let indices: Vec<usize> = labels
            .iter()
            .map(|&a| {
                let mut s = key.clone();
                s.loops[h] = a;
                basis.position(&s).ok_or_else(|| {
                    McgError::BadBlock(format!(
                        "handle {h}: loop label {a} with stick {b} is not a basis tree"
                    ))
                })
            })
            .collect::<Result<_, _>>()?;
        blocks.push(Block {
            indices,
            matrix: m.clone(),
        });
    }
    Ok(Operator::BlockDiagonal {
        dim: basis.dimension(),
        blocks,
    })
}
