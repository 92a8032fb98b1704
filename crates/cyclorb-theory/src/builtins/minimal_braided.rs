//! The Virasoro minimal models M(P, Q) with full braided data (spec `minimal:P:Q`), as a
//! Deligne product of two Galois-conjugated SU(2) theories.
//!
//! ## The construction (derivation in `docs/minimal-models.md`)
//! Kac labels (r, s), 1 ≤ r ≤ Q−1, 1 ≤ s ≤ P−1, (r, s) ~ (Q−r, P−s), with
//! h_{r,s} = ((Pr − Qs)² − (P−Q)²)/(4PQ). Expanding,
//!   h_{r,s} = P(r²−1)/(4Q) + Q(s²−1)/(4P) + (1 − rs)/2.
//! Call the coordinate whose range has an odd top (s when P is odd, else r, since P and Q are
//! coprime) the *odd side*. Every class has exactly one representative with the odd-side
//! coordinate odd, and on those representatives (1 − rs)/2 ≡ (1 − x)/2 (mod 1), x the other
//! coordinate, so the twist factorises: θ_{r,s} = θ¹(r)·θ²(s). The fusion rules are those of
//! SU(2) at level (even side − 2) times the integer-spin part of SU(2) at level (odd side − 2)
//! (the Kac-table fusion rules restricted to the representatives). Hence
//!   M(P, Q) ≅ σ_{k₁}(su2 or so3 on r) ⊠ σ_{k₂}(so3 or su2 on s),
//! with Galois conjugations σ_k (ζ ↦ ζ^k) chosen so that each factor's twists are
//! θ¹(r) = θ_{r,1} and θ²(s) = θ_{1,s}. This module finds every such k by its action on the
//! twist exponents (σ_k multiplies an exponent h by k), keeps those whose unnormalised S̃
//! equals the matching block of Kac's S divided by S₀₀ (S = ±S¹ ⊗ S² forces it), builds the
//! product, and keeps the first whose normalised S-matrix equals the Kac-formula S of
//! [`super::minimal_modular_data`] entry by entry (exactly, after the label bijection). When the Kac S has S₀₀ < 0 (some
//! non-unitary models) the total dimension is taken negative, D = 1/S₀₀, which leaves F, R
//! and θ alone, negates S and adds 4 to c mod 8: then c ≡ 1 − 6(P−Q)²/(PQ) (mod 8) as for
//! the Virasoro algebra. A factor of rank 1 (level 0, or so3:1) is left out.

use cyclorb_field::{Cyc, CyclotomicField, Rational};
use num_bigint::BigInt;
use num_integer::Integer;

use super::minimal::{check_parameters, kac_labels, minimal_modular_data};
use super::su2::{so3, su2};
use crate::arith::SameField;
use crate::error::TheoryError;
use crate::ops::{galois, into_negated_total_dimension, into_renamed, product, spherical_twist};
use crate::theory::Theory;

/// One factor of the product: the theory and the Kac coordinate of each of its labels.
struct Factor {
    /// The candidates: Galois conjugates of SU(2)_k or SO(3)_k, and for SU(2)_k also their
    /// spherical twists by the grading 2j mod 2, that have the twists this factor must have.
    candidates: Vec<Theory>,
    /// Kac coordinate (1-based) of label i: doubled spin + 1.
    coordinate: Vec<i64>,
}

/// The twist exponent h (θ = exp(2πi h)) of a root of unity, as a rational mod 1.
fn exponent_of(
    field: &CyclotomicField,
    theta: &cyclorb_field::Cyc,
) -> Result<Rational, TheoryError> {
    let (order, e) = field
        .root_of_unity_exponent(theta)?
        .ok_or_else(|| TheoryError::Internal("a twist is not a root of unity".into()))?;
    Ok(Rational::new(BigInt::from(e), BigInt::from(order))
        .expect("order ≥ 1")
        .rem_euclid(1))
}

/// The factor SU(2)_{m−2} (all Kac coordinates 1..m−1) or, on the odd side, its integer-spin
/// part (odd coordinates); `None` when it has a single label.
fn factor_theory(m: i64, odd_side: bool) -> Result<Option<(Theory, Vec<i64>)>, TheoryError> {
    let level = u32::try_from(m - 2).map_err(|_| TheoryError::Internal("level < 0".into()))?;
    if level == 0 {
        return Ok(None);
    }
    Ok(Some(if odd_side {
        let t = so3(level)?;
        let coords = (0..t.rank() as i64).map(|i| 2 * i + 1).collect();
        (t, coords)
    } else {
        let t = su2(level)?;
        let coords = (0..t.rank() as i64).map(|i| i + 1).collect();
        (t, coords)
    }))
}

/// Every k (a unit mod the theory's conductor) with k·h_i + shift_i ≡ target_i (mod 1) for all
/// labels i, where θ_i = exp(2πi h_i) and shift_i ∈ {0, 1/2}.
fn matching_exponents(
    theory: &Theory,
    shift: &[bool],
    targets: &[Rational],
) -> Result<Vec<i64>, TheoryError> {
    let field = theory.field();
    let own = theory
        .twists()
        .iter()
        .map(|t| exponent_of(field, t))
        .collect::<Result<Vec<_>, _>>()?;
    let half = Rational::new(BigInt::from(1), BigInt::from(2)).expect("2 ≠ 0");
    let n = theory.conductor() as i64;
    Ok((1..n.max(2))
        .filter(|k| k.gcd(&n) == 1)
        .filter(|&k| {
            own.iter().zip(shift).zip(targets).all(|((h, &s), t)| {
                let mut scaled = h.mul(&Rational::from_int(k));
                if s {
                    scaled = scaled.add(&half);
                }
                scaled.rem_euclid(1) == *t
            })
        })
        .collect())
}

/// The candidate theories of one factor: σ_k(base) and, when the base has odd labels,
/// spherical_twist(σ_k(base)), for every k that gives the target twists and the target
/// unnormalised S̃ (`s_target[i][j]` in the reference's field).
fn candidates(
    base: &Theory,
    odd: &[bool],
    targets: &[Rational],
    s_target: &[Vec<Cyc>],
    reference_field: &CyclotomicField,
) -> Result<Vec<Theory>, TheoryError> {
    let mut out = Vec::new();
    let plain = vec![false; odd.len()];
    for k in matching_exponents(base, &plain, targets)? {
        out.push(galois(base, k)?);
    }
    if odd.iter().any(|&o| o) {
        for k in matching_exponents(base, odd, targets)? {
            out.push(spherical_twist(&galois(base, k)?, odd)?);
        }
    }
    let mut kept = Vec::new();
    for candidate in out {
        if same_s_tilde(&candidate, s_target, reference_field)? {
            kept.push(candidate);
        }
    }
    Ok(kept)
}

/// Whether the candidate's S̃ equals the target entry by entry (in the compositum).
fn same_s_tilde(
    candidate: &Theory,
    s_target: &[Vec<Cyc>],
    reference_field: &CyclotomicField,
) -> Result<bool, TheoryError> {
    let field = CyclotomicField::new(candidate.conductor().lcm(&reference_field.conductor()))?;
    let own = candidate.s_unnormalized();
    for (i, row) in s_target.iter().enumerate() {
        for (j, x) in row.iter().enumerate() {
            if field.embed(own.get(i, j))? != field.embed(x)? {
                return Ok(false);
            }
        }
    }
    Ok(true)
}

/// The braided minimal model M(p, p′) (P = p, Q = p′), labelled by Kac indices as
/// [`super::minimal_modular_data`] and proved to have the same S and T.
pub fn minimal(p: i64, pp: i64) -> Result<Theory, TheoryError> {
    let name = format!("minimal:{p}:{pp}");
    check_parameters(&name, p, pp)?;
    let reference = minimal_modular_data(p, pp)?;
    let kac = kac_labels(p, pp);
    let class_of = |r: i64, s: i64| -> Option<usize> {
        kac.iter()
            .position(|&x| x == (r, s) || x == (pp - r, p - s))
    };
    let odd_is_s = p % 2 == 1;
    let ref_field = reference.field();
    let ref_exponent = |r: i64, s: i64| -> Result<Rational, TheoryError> {
        let i = class_of(r, s).ok_or_else(|| TheoryError::Internal(format!("({r},{s})")))?;
        exponent_of(ref_field, reference.twist(i))
    };
    let mut factors = Vec::new();
    let mut trivial = Vec::new();
    for (side_is_r, m) in [(true, pp), (false, p)] {
        let odd_side = side_is_r != odd_is_s;
        let Some((theory, coordinate)) = factor_theory(m, odd_side)? else {
            continue;
        };
        if theory.rank() == 1 {
            trivial.push((side_is_r, theory, coordinate));
            continue;
        }
        let at = |x: i64| if side_is_r { (x, 1) } else { (1, x) };
        let targets = coordinate
            .iter()
            .map(|&x| ref_exponent(at(x).0, at(x).1))
            .collect::<Result<Vec<_>, _>>()?;
        // S_prod = ±S¹ ⊗ S², so S_{(x,1),(y,1)}/S_{00} = S̃¹_{xy} (and likewise for S²).
        let s_ref = reference
            .s_matrix()
            .ok_or_else(|| TheoryError::Internal("Kac data have S".into()))?;
        let s00_inv = ref_field
            .inverse(s_ref.get(0, 0))
            .ok_or_else(|| TheoryError::Internal("S_00 = 0".into()))?;
        let class = |x: i64| {
            let (r, s) = at(x);
            class_of(r, s).ok_or_else(|| TheoryError::Internal(format!("({r},{s})")))
        };
        let mut s_target = Vec::new();
        for &x in &coordinate {
            let mut row = Vec::new();
            for &y in &coordinate {
                row.push(ref_field.times(s_ref.get(class(x)?, class(y)?), &s00_inv));
            }
            s_target.push(row);
        }
        // SU(2) labels with a half-integer spin (even Kac coordinate) are the odd grade.
        let odd: Vec<bool> = coordinate.iter().map(|x| x % 2 == 0).collect();
        let candidates = candidates(&theory, &odd, &targets, &s_target, ref_field)?;
        factors.push((
            side_is_r,
            Factor {
                candidates,
                coordinate,
            },
        ));
    }
    if factors.is_empty() {
        // M(3,2) (c = 0): only the trivial so3:1 is left.
        if let Some((side_is_r, theory, coordinate)) = trivial.pop() {
            factors.push((
                side_is_r,
                Factor {
                    candidates: vec![theory],
                    coordinate,
                },
            ));
        }
    }
    // Labels of the product in index order, as Kac coordinates (r, s).
    let coords_of = |chosen: &[(bool, &Factor)]| -> Vec<(i64, i64)> {
        let mut out = vec![(1i64, 1i64)];
        for (side_is_r, f) in chosen {
            out = out
                .iter()
                .flat_map(|&(r, s)| {
                    f.coordinate
                        .iter()
                        .map(move |&x| if *side_is_r { (x, s) } else { (r, x) })
                })
                .collect();
        }
        out
    };
    let chosen: Vec<(bool, &Factor)> = factors.iter().map(|(s, f)| (*s, f)).collect();
    let coords = coords_of(&chosen);
    let bijection = coords
        .iter()
        .map(|&(r, s)| class_of(r, s))
        .collect::<Option<Vec<usize>>>()
        .ok_or_else(|| {
            TheoryError::Internal(format!("{name}: a product label has no Kac class"))
        })?;
    let names: Vec<String> = bijection
        .iter()
        .map(|&i| reference.label(i).to_string())
        .collect();
    for combination in combinations(&factors) {
        let mut built: Option<Theory> = None;
        for ((_, f), &i) in factors.iter().zip(&combination) {
            let factor = &f.candidates[i];
            built = Some(match built {
                None => factor.clone(),
                Some(acc) => product(&acc, factor)?,
            });
        }
        let built = built.ok_or_else(|| TheoryError::Internal(format!("{name}: no factor")))?;
        if let Some(theory) = matched(built, &reference, &bijection)? {
            return into_renamed(theory, &name, names);
        }
    }
    Err(TheoryError::Internal(format!(
        "{name}: no Galois conjugation of the factors reproduces Kac's S and T"
    )))
}

/// Every choice of one candidate per factor (as indices), in lexicographic order.
fn combinations(factors: &[(bool, Factor)]) -> Vec<Vec<usize>> {
    let mut out = vec![Vec::new()];
    for (_, f) in factors {
        out = out
            .iter()
            .flat_map(|prefix| {
                (0..f.candidates.len()).map(move |k| {
                    let mut v = prefix.clone();
                    v.push(k);
                    v
                })
            })
            .collect();
    }
    out
}

/// The candidate (with D negated when the reference's S₀₀ has the other sign) when its S and
/// T equal the reference's under the label bijection, exactly.
fn matched(
    candidate: Theory,
    reference: &Theory,
    bijection: &[usize],
) -> Result<Option<Theory>, TheoryError> {
    let n = candidate.conductor().lcm(&reference.conductor());
    let field = CyclotomicField::new(n)?;
    let s_of = |t: &Theory, a: usize, b: usize| -> Result<_, TheoryError> {
        let s = t
            .s_matrix()
            .ok_or_else(|| TheoryError::Internal("no S".into()))?;
        Ok(field.embed(s.get(a, b))?)
    };
    let theory = if s_of(&candidate, 0, 0)? == field.neg(&s_of(reference, 0, 0)?) {
        into_negated_total_dimension(candidate)?
    } else {
        candidate
    };
    for (a, &ra) in bijection.iter().enumerate() {
        if field.embed(theory.twist(a))? != field.embed(reference.twist(ra))? {
            return Ok(None);
        }
        for (b, &rb) in bijection.iter().enumerate() {
            if s_of(&theory, a, b)? != s_of(reference, ra, rb)? {
                return Ok(None);
            }
        }
    }
    Ok(Some(theory))
}
