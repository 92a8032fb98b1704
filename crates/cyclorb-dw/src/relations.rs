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

/// The twists as elements of a group in which equality can be decided: automorphisms of the
/// free group, permutations of X_g, or monomial matrices on X_g (equal up to a scalar).
pub trait TwistAction {
    /// An element of the group.
    type Element;
    /// The genus.
    fn genus(&self) -> usize;
    /// The twist about a curve of the Lickorish set.
    fn twist(&self, curve: Curve) -> Result<Self::Element, DwError>;
    /// The twist about the separating curve around the handles `handles`.
    fn separating(&self, handles: std::ops::Range<usize>) -> Result<Self::Element, DwError>;
    /// The matrix product X₁⋯X_k (the automorphism τ₁ ∘ ⋯ ∘ τ_k on the free group).
    fn product(&self, word: &[&Self::Element]) -> Self::Element;
    /// Whether two elements are equal (for matrices: up to a scalar).
    fn same(&self, x: &Self::Element, y: &Self::Element) -> bool;
    /// Whether this is an action of the closed surface's mapping class group, where the
    /// genus-1 and hyperelliptic relations hold (they fail on the free group).
    fn closed_surface(&self) -> bool;
    /// Appended to every relation's name, e.g. ` (free group)`.
    fn suffix(&self) -> &'static str;
}

/// The free group on a₀, b₀, …: the relations that hold for the surface with one boundary
/// component, for every group G at once.
pub struct FreeGroup(pub usize);

impl TwistAction for FreeGroup {
    type Element = Automorphism;
    fn genus(&self) -> usize {
        self.0
    }
    fn twist(&self, curve: Curve) -> Result<Automorphism, DwError> {
        twist(curve, self.0)
            .ok_or_else(|| DwError::Inconsistent(format!("no curve {curve} at genus {}", self.0)))
    }
    fn separating(&self, handles: std::ops::Range<usize>) -> Result<Automorphism, DwError> {
        Ok(separating_twist(self.0, handles))
    }
    fn product(&self, word: &[&Automorphism]) -> Automorphism {
        word_automorphism(word, self.0)
    }
    fn same(&self, x: &Automorphism, y: &Automorphism) -> bool {
        x == y
    }
    fn closed_surface(&self) -> bool {
        false
    }
    fn suffix(&self) -> &'static str {
        " (free group)"
    }
}

/// The permutations of X_g: a permutation matrix is a multiple of another only when they
/// are equal, so the projective relations are equalities.
impl TwistAction for FlatBundles {
    type Element = Vec<u32>;
    fn genus(&self) -> usize {
        FlatBundles::genus(self)
    }
    fn twist(&self, curve: Curve) -> Result<Vec<u32>, DwError> {
        self.permutation(&FreeGroup(self.genus()).twist(curve)?)
    }
    fn separating(&self, handles: std::ops::Range<usize>) -> Result<Vec<u32>, DwError> {
        self.permutation(&separating_twist(self.genus(), handles))
    }
    fn product(&self, word: &[&Vec<u32>]) -> Vec<u32> {
        let slices: Vec<&[u32]> = word.iter().map(|p| p.as_slice()).collect();
        word_permutation(&slices, self.len())
    }
    fn same(&self, x: &Vec<u32>, y: &Vec<u32>) -> bool {
        x == y
    }
    fn closed_surface(&self) -> bool {
        true
    }
    fn suffix(&self) -> &'static str {
        ""
    }
}

/// Every check for the Lickorish curves of X_g (which contain the Humphries curves): the
/// boundary word and the relations on the free group, then the relations on X_g.
pub fn check_relations(space: &FlatBundles) -> Result<Vec<RelationCheck>, DwError> {
    let mut out = free_group_checks(space.genus())?;
    out.extend(relation_checks(space)?);
    Ok(out)
}

/// The checks that hold on the free group for every G: every twist fixes the boundary word,
/// and the braid, commutation and chain relations hold as automorphisms.
pub fn free_group_checks(genus: usize) -> Result<Vec<RelationCheck>, DwError> {
    let free = FreeGroup(genus);
    let boundary = Word::boundary(genus);
    let mut out = Vec::new();
    for c in GeneratingSet::Lickorish.curves(genus) {
        out.push(RelationCheck {
            name: format!("{c} fixes the boundary word (free group)"),
            ok: free.twist(c)?.apply(&boundary) == boundary,
        });
    }
    out.extend(relation_checks(&free)?);
    Ok(out)
}

/// The relations of the module doc in one action, each named with the action's suffix.
pub fn relation_checks<A: TwistAction>(action: &A) -> Result<Vec<RelationCheck>, DwError> {
    let g = action.genus();
    let curves = GeneratingSet::Lickorish.curves(g);
    let elements: Vec<(Curve, A::Element)> = curves
        .iter()
        .map(|&c| Ok((c, action.twist(c)?)))
        .collect::<Result<_, DwError>>()?;
    let t = |c: Curve| -> &A::Element {
        &elements
            .iter()
            .find(|(k, _)| *k == c)
            .expect("a Lickorish curve")
            .1
    };
    let suffix = action.suffix();
    let mut out = Vec::new();
    let mut record = |name: String, ok: bool| {
        out.push(RelationCheck {
            name: format!("{name}{suffix}"),
            ok,
        })
    };
    let same =
        |x: &[&A::Element], y: &[&A::Element]| action.same(&action.product(x), &action.product(y));
    for (i, &x) in curves.iter().enumerate() {
        for &y in &curves[i + 1..] {
            let (tx, ty) = (t(x), t(y));
            if x.meets_once(y) {
                record(format!("braid {x} {y}"), same(&[tx, ty, tx], &[ty, tx, ty]));
            } else {
                record(format!("commute {x} {y}"), same(&[tx, ty], &[ty, tx]));
            }
        }
    }
    for h in 0..g {
        let d = action.separating(h..h + 1)?;
        let lhs = repeat(&[t(Curve::Alpha(h)), t(Curve::Beta(h))], 6);
        record(
            format!("2-chain (alpha{h} beta{h})^6 = twist about the boundary of handle {h}"),
            same(&lhs, &[&d]),
        );
    }
    if g >= 2 {
        let d = action.separating(0..2)?;
        let chain = [
            Curve::Alpha(0),
            Curve::Beta(0),
            Curve::Gamma(0),
            Curve::Beta(1),
        ];
        let lhs = repeat(&chain.map(t), 10);
        record(
            "4-chain (alpha0 beta0 gamma0 beta1)^10 = twist around handles 0,1".into(),
            same(&lhs, &[&d]),
        );
    }
    if !action.closed_surface() {
        return Ok(out);
    }
    if g == 1 {
        let (a, b) = (t(Curve::Alpha(0)), t(Curve::Beta(0)));
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
    if g == 2 {
        let c = [
            Curve::Alpha(0),
            Curve::Beta(0),
            Curve::Gamma(0),
            Curve::Beta(1),
            Curve::Alpha(1),
        ]
        .map(t);
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
