//! Exact checks of the mapping class group relations, on the free group and on X_g.
//!
//! Relations (Humphries 1979; Wajnryb 1983; Farb–Margalit, A Primer on Mapping Class
//! Groups, ch. 3–5 and 9): the braid relation T_x T_y T_x = T_y T_x T_y for curves meeting
//! once, T_x T_y = T_y T_x for disjoint curves, at genus 1 S⁴ = 1, (SA)³ = 1 and
//! S² = (AB)³ for A = T_α, B = T_β, S = ABA (SL(2, Z)), the 2-chain (T_{α_h} T_{β_h})⁶ = the twist
//! about the boundary of handle h, the 4-chain (T_{α₀} T_{β₀} T_{γ₀} T_{β₁})¹⁰ = the twist
//! about the curve around handles 0 and 1, and at genus 2 the hyperelliptic relations of the
//! chain c₁…c₅ = α₀, β₀, γ₀, β₁, α₁.
//!
//! On the free group every twist must fix the boundary word Π [a_h, b_h] exactly. On X_g
//! every relation is an equality of permutations (a permutation matrix is a multiple of
//! another only when they are equal, so the projective relations are exact equalities here).
//! The separating twists are the automorphisms of [`crate::separating_twist`]; at genus g the
//! curve around all g handles is null-homotopic in Σ_g, and its twist (conjugation of every
//! generator by the boundary word) acts trivially on X_g.

use cyclorb_mcg::{Curve, GeneratingSet};
use serde::Serialize;

use crate::error::DwError;
use crate::space::FlatBundles;
use crate::twists::{separating_twist, twist};
use crate::words::{Automorphism, Word};

/// One named relation and whether it holds.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct RelationCheck {
    /// The relation, e.g. `braid alpha0 beta0`.
    pub name: String,
    /// Whether it holds exactly.
    pub ok: bool,
}

/// The permutation of the matrix product X₁X₂⋯X_k of twist matrices with permutations
/// p₁, …, p_k (crate conventions): x ↦ p_k(⋯p₁(x)).
pub fn word_permutation(word: &[&[u32]], dim: usize) -> Vec<u32> {
    (0..dim as u32)
        .map(|x| word.iter().fold(x, |y, p| p[y as usize]))
        .collect()
}

/// The automorphism of X₁⋯X_k: τ₁ ∘ ⋯ ∘ τ_k.
fn word_automorphism(word: &[&Automorphism], genus: usize) -> Automorphism {
    word.iter()
        .fold(Automorphism::identity(genus), |acc, t| acc.compose(t))
}

fn repeat<T: Copy>(w: &[T], times: usize) -> Vec<T> {
    w.iter().copied().cycle().take(w.len() * times).collect()
}

/// Every check for the Lickorish curves of X_g (which contain the Humphries curves).
pub fn check_relations(space: &FlatBundles) -> Result<Vec<RelationCheck>, DwError> {
    let g = space.genus();
    let dim = space.len();
    let curves = GeneratingSet::Lickorish.curves(g);
    let mut autos = Vec::new();
    for &c in &curves {
        let t = twist(c, g)
            .ok_or_else(|| DwError::Inconsistent(format!("no curve {c} at genus {g}")))?;
        autos.push((c, t));
    }
    let perms: Vec<(Curve, Vec<u32>)> = autos
        .iter()
        .map(|(c, t)| Ok((*c, space.permutation(t)?)))
        .collect::<Result<_, DwError>>()?;
    let p = |c: Curve| -> &[u32] {
        &perms
            .iter()
            .find(|(k, _)| *k == c)
            .expect("a Lickorish curve")
            .1
    };
    let auto = |c: Curve| -> &Automorphism {
        &autos
            .iter()
            .find(|(k, _)| *k == c)
            .expect("a Lickorish curve")
            .1
    };
    let mut out = Vec::new();
    let mut record = |name: String, ok: bool| out.push(RelationCheck { name, ok });
    let boundary = Word::boundary(g);
    for (c, t) in &autos {
        record(
            format!("{c} fixes the boundary word (free group)"),
            t.apply(&boundary) == boundary,
        );
    }
    let same = |x: &[&[u32]], y: &[&[u32]]| word_permutation(x, dim) == word_permutation(y, dim);
    let same_free = |x: &[&Automorphism], y: &[&Automorphism]| {
        word_automorphism(x, g) == word_automorphism(y, g)
    };
    for (i, &x) in curves.iter().enumerate() {
        for &y in &curves[i + 1..] {
            let (px, py) = (p(x), p(y));
            let (tx, ty) = (auto(x), auto(y));
            if x.meets_once(y) {
                record(format!("braid {x} {y}"), same(&[px, py, px], &[py, px, py]));
                record(
                    format!("braid {x} {y} (free group)"),
                    same_free(&[tx, ty, tx], &[ty, tx, ty]),
                );
            } else {
                record(format!("commute {x} {y}"), same(&[px, py], &[py, px]));
                record(
                    format!("commute {x} {y} (free group)"),
                    same_free(&[tx, ty], &[ty, tx]),
                );
            }
        }
    }
    for h in 0..g {
        let d = separating_twist(g, h..h + 1);
        let pd = space.permutation(&d)?;
        let lhs = repeat(&[p(Curve::Alpha(h)), p(Curve::Beta(h))], 6);
        record(
            format!("2-chain (alpha{h} beta{h})^6 = twist about the boundary of handle {h}"),
            same(&lhs, &[&pd]),
        );
        let lhs = repeat(&[auto(Curve::Alpha(h)), auto(Curve::Beta(h))], 6);
        record(
            format!("2-chain (alpha{h} beta{h})^6 = twist about the boundary of handle {h} (free group)"),
            same_free(&lhs, &[&d]),
        );
    }
    if g == 1 {
        let (a, b) = (p(Curve::Alpha(0)), p(Curve::Beta(0)));
        let s = [a, b, a];
        record(
            "genus 1: S^4 = 1 (S = ABA)".into(),
            same(&repeat(&s, 4), &[]),
        );
        // S = ABA is the matrix [[0, 1], [−1, 0]] of SL(2, Z) for A = [[1, 1], [0, 1]],
        // B = [[1, 0], [−1, 1]], so (SA)³ = 1 while S² = (AB)³ = −I acts on X_1 by inversion
        // (A, B) ↦ (A⁻¹, B⁻¹); "(SA)³ ∝ S²" holds only in PSL(2, Z).
        let sa = [a, b, a, a];
        record("genus 1: (SA)^3 = 1".into(), same(&repeat(&sa, 3), &[]));
        record(
            "genus 1: S^2 = (AB)^3".into(),
            same(&repeat(&s, 2), &repeat(&[a, b], 3)),
        );
    }
    if g >= 2 {
        let d = separating_twist(g, 0..2);
        let pd = space.permutation(&d)?;
        let chain = [
            Curve::Alpha(0),
            Curve::Beta(0),
            Curve::Gamma(0),
            Curve::Beta(1),
        ];
        let lhs = repeat(&chain.map(p), 10);
        record(
            "4-chain (alpha0 beta0 gamma0 beta1)^10 = twist around handles 0,1".into(),
            same(&lhs, &[&pd]),
        );
        let lhs = repeat(&chain.map(auto), 10);
        record(
            "4-chain (alpha0 beta0 gamma0 beta1)^10 = twist around handles 0,1 (free group)".into(),
            same_free(&lhs, &[&d]),
        );
    }
    if g == 2 {
        let c = [
            Curve::Alpha(0),
            Curve::Beta(0),
            Curve::Gamma(0),
            Curve::Beta(1),
            Curve::Alpha(1),
        ]
        .map(p);
        record(
            "hyperelliptic (c1 c2 c3 c4 c5)^6 = 1".into(),
            same(&repeat(&c, 6), &[]),
        );
        let iota = [c[0], c[1], c[2], c[3], c[4], c[4], c[3], c[2], c[1], c[0]];
        record(
            "hyperelliptic involution iota^2 = 1".into(),
            same(&repeat(&iota, 2), &[]),
        );
        for (k, ci) in c.iter().enumerate() {
            let mut left = iota.to_vec();
            left.push(ci);
            let mut right = vec![*ci];
            right.extend_from_slice(&iota);
            record(
                format!("hyperelliptic involution commutes with c{}", k + 1),
                same(&left, &right),
            );
        }
    }
    Ok(out)
}
