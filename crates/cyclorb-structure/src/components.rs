//! The vacuum's components in the joint eigenspaces ("sectors") of commuting twist powers.
//!
//! With X_c = T_c^k for the curves c of the Lickorish set (a [`PowerCandidate`]: every
//! X_c is annihilated by Π_ν (x − ν) over the distinct ν = θ^k, and the X_c commute), V is
//! the direct sum of the joint eigenspaces W_σ = ∩_c ker(X_c − σ_c), σ a signature (one
//! eigenvalue per curve). The projection onto the μ-eigenspace of one X is
//! P_μ = Π_{ν≠μ} (X − ν)/(μ − ν) (Lagrange interpolation of the minimal polynomial), and
//! the joint projections are products of these, so every component P_σ v₀ is computed
//! exactly and Σ_σ P_σ v₀ = v₀.

use cyclorb_field::{Cyc, CyclotomicField};

use crate::error::StructureError;
use crate::power::{spectral_part, PowerCandidate};
use crate::sparse::SparseVec;

/// A joint eigenvalue signature: for every X_c, the index of its eigenvalue in the list
/// of the candidate.
pub(crate) type Signature = Vec<u8>;

/// P_μ v for one X, exactly: Q_μ v / Π_{ν≠μ}(μ − ν).
fn projection(
    field: &CyclotomicField,
    candidate: &PowerCandidate,
    x: usize,
    mu: &Cyc,
    v: &SparseVec,
) -> Result<SparseVec, StructureError> {
    let operator = &candidate.operators[x];
    let w = spectral_part(field, operator, &candidate.eigenvalues, mu, v)?;
    if w.is_zero() {
        return Ok(w);
    }
    let mut denominator = field.one();
    for nu in candidate.eigenvalues.iter().filter(|nu| *nu != mu) {
        denominator = field.mul(&denominator, &field.sub(mu, nu)?)?;
    }
    Ok(w.scale(field, &field.inv(&denominator)?)?)
}

/// The non-zero components P_σ v with their signatures, in lexicographic order of σ.
pub(crate) fn components(
    field: &CyclotomicField,
    candidate: &PowerCandidate,
    v: &SparseVec,
) -> Result<Vec<(Signature, SparseVec)>, StructureError> {
    let mut parts: Vec<(Signature, SparseVec)> = vec![(Vec::new(), v.clone())];
    for x in 0..candidate.operators.len() {
        let mut next = Vec::new();
        for (signature, part) in parts {
            for (e, mu) in candidate.eigenvalues.iter().enumerate() {
                let p = projection(field, candidate, x, mu, &part)?;
                if !p.is_zero() {
                    let mut s = signature.clone();
                    s.push(e as u8);
                    next.push((s, p));
                }
            }
        }
        parts = next;
    }
    Ok(parts)
}

/// The signature of v when it is a joint eigenvector of every X_c (X_c v = σ_c v exactly),
/// `None` otherwise.
pub(crate) fn signature(
    field: &CyclotomicField,
    candidate: &PowerCandidate,
    v: &SparseVec,
) -> Result<Option<Signature>, StructureError> {
    let Some((i, lead)) = v.leading() else {
        return Ok(None);
    };
    let mut signature = Vec::with_capacity(candidate.operators.len());
    for x in &candidate.operators {
        let w = x.apply(field, v)?;
        let value =
            w.0.iter()
                .find(|(j, _)| j == i)
                .map_or_else(|| Ok(field.zero()), |(_, y)| field.div(y, lead))?;
        let Some(e) = candidate.eigenvalues.iter().position(|nu| *nu == value) else {
            return Ok(None);
        };
        if w != v.scale(field, &value)? {
            return Ok(None);
        }
        signature.push(e as u8);
    }
    Ok(Some(signature))
}
