//! The twisted theories D^{ω_p}(Z_N): the Dehn twists of the untwisted Z_N model with
//! root-of-unity phases (monomial matrices over Q(ζ_{N²})).
//!
//! The 3-cocycle is the standard one (Dijkgraaf–Witten 1990; de Wild Propitius, PhD thesis,
//! Amsterdam 1995): ω_p(a, b, c) = exp(2πi p a (b + c − [b + c]_N) / N²) for a, b, c in
//! {0, …, N − 1}, [x]_N the residue. Z_N is abelian and H²(Z_N, U(1)) = 0, so every flat
//! connection carries a state: the basis is X_g = Z_N^{2g}, the same set and the same
//! permutations as the untwisted model ([`crate::FlatBundles`] of `ZN`), and each twist
//! multiplies by a phase. With Ã, B̃ the representatives in {0, …, N − 1} of the source
//! state ψ = p(x) of row x (the matrix has ζ^{phase} in row x, column p(x), as in the
//! permutation convention of the crate):
//!
//! - T_{α_h}: ζ_{N²}^{p Ã_h²};
//! - T_{β_h}: ζ_{N²}^{−p B̃_h² + 2pN ε B̃_h}, ε = 1 when Ã_h + B̃_h ≥ N, else 0;
//! - T_{γ_h}: ζ_{N²}^{p (Ã_{h+1} − Ã_h)²}, the difference taken in the integers;
//! - a separating twist: no phase (its curve has trivial holonomy and carries no charge).
//!
//! The derivation (docs/dijkgraaf-witten.md, "Twisted cyclic theories") passes through the
//! pointed modular category of D^{ω_p}(Z_N), whose anyons (a, n) have twist
//! exp(2πi (a n / N + p a² / N²)): the basis vector |A, B⟩ is Σ_n ζ_N^{−Bn} |(Ã, n)⟩ with
//! the section a ↦ (ã, 0), so the phases depend on the representatives exactly as above.
//! They are validated by the relations of [`crate::check_twisted_relations`]: the naive
//! phases ζ^{−pB̃²} for β, or ζ^{p [Ã_{h+1} − Ã_h]_N²} for γ, break the braid relations
//! for N = 3 (a test shows it).

use std::ops::Range;

use cyclorb_mcg::{Curve, GeneratingSet};

use crate::error::DwError;
use crate::group::Element;
use crate::relations::{free_group_checks, relation_checks, RelationCheck, TwistAction};
use crate::space::FlatBundles;

/// Largest N: the field Q(ζ_{N²}) of the phases has conductor N² ≤ 1024.
pub const MAX_TWISTED_ORDER: u32 = 32;

/// The cocycle ω_p of Z_N.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CyclicCocycle {
    n: u32,
    p: u32,
}

impl CyclicCocycle {
    /// ω_p on Z_N (1 ≤ N ≤ [`MAX_TWISTED_ORDER`], 0 ≤ p < N); p = 0 is the untwisted theory
    /// written with the same (trivial) phases.
    pub fn new(n: u32, p: u32) -> Result<CyclicCocycle, DwError> {
        if n == 0 || n > MAX_TWISTED_ORDER {
            return Err(DwError::UnknownGroup(format!(
                "Z{n} with a twist (need 1 ≤ N ≤ {MAX_TWISTED_ORDER}: the phases lie in Q(ζ_N²))"
            )));
        }
        if p >= n {
            return Err(DwError::UnknownGroup(format!(
                "Z{n} with twist {p} (the cocycles ω_p of Z_{n} have 0 ≤ p < {n})"
            )));
        }
        Ok(CyclicCocycle { n, p })
    }

    /// N.
    pub fn order(&self) -> u32 {
        self.n
    }

    /// p.
    pub fn level(&self) -> u32 {
        self.p
    }

    /// N², the order of the roots of unity in the phases (the conductor of their field).
    pub fn modulus(&self) -> u32 {
        self.n * self.n
    }

    /// Check that the space's group is Z_N with element k = g^k for g = element 1 (as the
    /// built-in `ZN` numbers it: its elements are the powers of the N-cycle, sorted), so
    /// that an element's index is its residue.
    fn check_numbering(&self, space: &FlatBundles) -> Result<(), DwError> {
        let g = space.group();
        let n = self.n as usize;
        let cyclic = g.order() == n
            && (n == 1 || g.element_order(1) == n)
            && g.elements()
                .all(|k| n == 1 || g.mul(k, 1) as usize == (k as usize + 1) % n);
        if cyclic {
            Ok(())
        } else {
            Err(DwError::Inconsistent(format!(
                "{} is not Z_{n} numbered by the powers of element 1",
                g.name()
            )))
        }
    }

    /// The phase exponents (of ζ_{N²}) of the twist about `curve`, row by row: row x gets
    /// the phase of its source state p(x). `perm` is the twist's permutation of X_g.
    pub fn phases(
        &self,
        space: &FlatBundles,
        curve: Curve,
        perm: &[u32],
    ) -> Result<Vec<u32>, DwError> {
        self.check_numbering(space)?;
        let (n, p, m) = (
            i64::from(self.n),
            i64::from(self.p),
            i64::from(self.modulus()),
        );
        let exponent = |s: &[Element]| -> i64 {
            let r = |k: usize| i64::from(s[k]);
            match curve {
                Curve::Alpha(h) => p * r(2 * h) * r(2 * h),
                Curve::Beta(h) => {
                    let (a, b) = (r(2 * h), r(2 * h + 1));
                    let carry = i64::from(a + b >= n);
                    -p * b * b + 2 * p * n * carry * b
                }
                Curve::Gamma(h) => {
                    let d = r(2 * h + 2) - r(2 * h);
                    p * d * d
                }
            }
        };
        Ok(perm
            .iter()
            .map(|&j| exponent(space.state(j as usize)).rem_euclid(m) as u32)
            .collect())
    }
}

/// A monomial matrix in the crate's row convention: row x holds ζ^{phases[x]} in column
/// perm[x], ζ = ζ_modulus.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct PhasedPermutation {
    /// Column of the entry of each row.
    pub perm: Vec<u32>,
    /// Exponent of ζ of each row's entry.
    pub phases: Vec<u32>,
}

impl PhasedPermutation {
    /// The permutation matrix of `perm` (no phases).
    pub fn plain(perm: Vec<u32>) -> PhasedPermutation {
        let phases = vec![0; perm.len()];
        PhasedPermutation { perm, phases }
    }

    /// The matrix product X₁X₂⋯X_k (on `dim` points, phases modulo `modulus`): row x of X₁
    /// goes to column p₁(x), whose row in X₂ goes to p₂(p₁(x)), the phases adding up.
    pub fn product(word: &[&PhasedPermutation], dim: usize, modulus: u32) -> PhasedPermutation {
        let mut out = PhasedPermutation::plain((0..dim as u32).collect());
        for x in word {
            for (col, phase) in out.perm.iter_mut().zip(out.phases.iter_mut()) {
                *phase = (*phase + x.phases[*col as usize]) % modulus;
                *col = x.perm[*col as usize];
            }
        }
        out
    }

    /// Whether the two are equal up to a scalar: the same permutation and phases differing
    /// by one constant modulo `modulus`.
    pub fn projectively_equal(&self, other: &PhasedPermutation, modulus: u32) -> bool {
        if self.perm != other.perm {
            return false;
        }
        let shift = |k: usize| (self.phases[k] + modulus - other.phases[k]) % modulus;
        (0..self.perm.len()).all(|k| shift(k) == shift(0))
    }
}

/// X_g of Z_N with the twists of D^{ω_p}(Z_N) as monomial matrices (phases of ζ_{N²}).
pub struct TwistedBundles<'a> {
    space: &'a FlatBundles,
    cocycle: &'a CyclicCocycle,
}

impl<'a> TwistedBundles<'a> {
    /// The twisted action on X_g of Z_N; an error when the space's group is not Z_N as
    /// the built-in numbers it.
    pub fn new(
        space: &'a FlatBundles,
        cocycle: &'a CyclicCocycle,
    ) -> Result<TwistedBundles<'a>, DwError> {
        cocycle.check_numbering(space)?;
        Ok(TwistedBundles { space, cocycle })
    }

    /// The twists of a generating set as monomial matrices, named by their curves.
    pub fn generators(
        &self,
        set: GeneratingSet,
    ) -> Result<Vec<(Curve, PhasedPermutation)>, DwError> {
        set.curves(self.space.genus())
            .into_iter()
            .map(|c| Ok((c, TwistAction::twist(self, c)?)))
            .collect()
    }
}

impl TwistAction for TwistedBundles<'_> {
    type Element = PhasedPermutation;
    fn genus(&self) -> usize {
        self.space.genus()
    }
    fn twist(&self, curve: Curve) -> Result<PhasedPermutation, DwError> {
        let perm = TwistAction::twist(self.space, curve)?;
        let phases = self.cocycle.phases(self.space, curve, &perm)?;
        Ok(PhasedPermutation { perm, phases })
    }
    fn separating(&self, handles: Range<usize>) -> Result<PhasedPermutation, DwError> {
        Ok(PhasedPermutation::plain(self.space.separating(handles)?))
    }
    fn product(&self, word: &[&PhasedPermutation]) -> PhasedPermutation {
        PhasedPermutation::product(word, self.space.len(), self.cocycle.modulus())
    }
    fn same(&self, x: &PhasedPermutation, y: &PhasedPermutation) -> bool {
        x.projectively_equal(y, self.cocycle.modulus())
    }
    fn closed_surface(&self) -> bool {
        true
    }
    fn suffix(&self) -> &'static str {
        ""
    }
}

/// Every check of [`crate::check_relations`] for D^{ω_p}(Z_N): the free-group checks, then
/// the relations on X_g as equalities of monomial matrices up to a scalar.
pub fn check_twisted_relations(
    space: &FlatBundles,
    cocycle: &CyclicCocycle,
) -> Result<Vec<RelationCheck>, DwError> {
    let action = TwistedBundles::new(space, cocycle)?;
    let mut out = free_group_checks(space.genus())?;
    out.extend(relation_checks(&action)?);
    Ok(out)
}
