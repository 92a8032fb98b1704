//! The candidate abelian normal subgroup N: the normal closure of the k-th powers of the
//! Dehn twists, for a proper divisor k of their order.
//!
//! Every twist is T_C = Σ_c θ_c P_c(C) (docs/genus-g.md §2), so T_C^k has its eigenvalues among
//! the θ_c^k and is diagonalisable. A power k is a candidate when some T_C^k is not
//! scalar, every T_C^k is annihilated by Π_ν (x − ν) over the distinct ν = θ_c^k (checked
//! on every basis vector, so the spectral projectors below are exact), and the powers
//! commute pairwise, exactly. For Ising (θ = 1, ζ₁₆, −1) the first candidate is k = 2:
//! the squares of the twists lie in the level-2 subgroup, which acts diagonally on the
//! even spin structures.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_theory::Theory;

use crate::error::StructureError;
use crate::sparse::{ColumnMap, SparseVec};
use cyclorb_field::RootsOfUnity;

/// The k-th powers of the generators and the possible eigenvalues of each.
#[derive(Debug, Clone)]
pub(crate) struct PowerCandidate {
    /// The power k.
    pub(crate) power: u32,
    /// X_i = A_i^k.
    pub(crate) operators: Vec<ColumnMap>,
    /// The distinct θ_c^k.
    pub(crate) eigenvalues: Vec<Cyc>,
}

/// The lcm of the orders of the twists θ_a (the order of every Dehn twist).
pub(crate) fn twist_order(theory: &Theory, roots: &RootsOfUnity) -> Result<u32, StructureError> {
    let mut order = 1u32;
    for (a, theta) in theory.twists().iter().enumerate() {
        let e = roots.exponent(theta).ok_or_else(|| {
            StructureError::Input(format!(
                "the twist of label {} is not a root of unity",
                theory.label(a)
            ))
        })?;
        order = num_integer::lcm(order, roots.order(e));
    }
    Ok(order)
}

/// The proper divisors k of `order` with 1 < k < order, increasing.
pub(crate) fn candidate_powers(order: u32) -> Vec<u32> {
    (2..order).filter(|k| order % k == 0).collect()
}

/// The k-th powers of `maps`, when they form a candidate; otherwise why not.
pub(crate) fn power_candidate(
    field: &CyclotomicField,
    theory: &Theory,
    maps: &[ColumnMap],
    names: &[String],
    k: u32,
) -> Result<Result<PowerCandidate, String>, StructureError> {
    let mut eigenvalues: Vec<Cyc> = Vec::new();
    for theta in theory.twists() {
        let power = field.pow(theta, i64::from(k))?;
        if !eigenvalues.contains(&power) {
            eigenvalues.push(power);
        }
    }
    let operators = maps
        .iter()
        .map(|a| a.power(field, k))
        .collect::<Result<Vec<_>, _>>()?;
    if operators.iter().all(|x| x.scalar().is_some()) {
        return Ok(Err(format!(
            "k = {k}: every k-th power of a twist is scalar"
        )));
    }
    for (i, x) in operators.iter().enumerate() {
        if !annihilated(field, x, &eigenvalues)? {
            return Ok(Err(format!(
                "k = {k}: the k-th power of T_{} has an eigenvalue outside the θ^k",
                names[i]
            )));
        }
    }
    for i in 0..operators.len() {
        for j in i + 1..operators.len() {
            if !operators[i].commutes_with(field, &operators[j])? {
                return Ok(Err(format!(
                    "k = {k}: the k-th powers of T_{} and T_{} do not commute",
                    names[i], names[j]
                )));
            }
        }
    }
    Ok(Ok(PowerCandidate {
        power: k,
        operators,
        eigenvalues,
    }))
}

/// Whether Π_ν (X − ν) vanishes on every basis vector.
fn annihilated(
    field: &CyclotomicField,
    x: &ColumnMap,
    eigenvalues: &[Cyc],
) -> Result<bool, StructureError> {
    for j in 0..x.dim() {
        let mut v = SparseVec::unit(field, j);
        for nu in eigenvalues {
            v = x.apply(field, &v)?.sub_scaled(field, nu, &v)?;
            if v.is_zero() {
                break;
            }
        }
        if !v.is_zero() {
            return Ok(false);
        }
    }
    Ok(true)
}

/// Q_μ v = Π_{ν ≠ μ} (X − ν) v: a non-zero multiple of the spectral projection of v onto
/// the μ-eigenspace of X (when X is annihilated by Π_ν (x − ν)).
pub(crate) fn spectral_part(
    field: &CyclotomicField,
    x: &ColumnMap,
    eigenvalues: &[Cyc],
    mu: &Cyc,
    v: &SparseVec,
) -> Result<SparseVec, StructureError> {
    let mut w = v.clone();
    for nu in eigenvalues.iter().filter(|nu| *nu != mu) {
        if w.is_zero() {
            break;
        }
        w = x.apply(field, &w)?.sub_scaled(field, nu, &w)?;
    }
    Ok(w)
}
