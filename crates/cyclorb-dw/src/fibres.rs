//! The abelianisation of G and the fibres of X_g over Hom(π₁Σ_g, G^ab).
//!
//! Let D = [G, G] be the derived subgroup and q: G → G^ab = G/D the quotient. For a flat
//! bundle [φ] ∈ X_g, ψ = q∘φ ∈ Hom(π₁Σ_g, G^ab) = (G^ab)^{2g} does not depend on the
//! representative (conjugation does not change cosets of D: g x g⁻¹ x⁻¹ ∈ D). A twist τ acts
//! by [φ] ↦ [φ∘τ], and q∘(φ∘τ) = (q∘φ)∘τ, so the map [φ] ↦ q∘φ is equivariant: every
//! mapping class sends the fibre F_ψ onto the fibre F_{ψ∘τ}. The fibres form a partition
//! of X_g that every element of the image group permutes.
//!
//! Here ψ is written as the tuple of the cosets (each named by its least element) of the
//! entries (A₀, B₀, …) of a representative.

use hashbrown::HashMap;

use crate::error::DwError;
use crate::group::{Element, FiniteGroup};
use crate::space::FlatBundles;

/// The cosets of the derived subgroup: element ↦ the least element of its coset.
#[derive(Clone, Debug)]
pub struct AbelianFibres {
    coset: Vec<Element>,
    index: usize,
}

impl AbelianFibres {
    /// D = [G, G] as the set of products of commutators, then the coset of every element.
    pub fn new(group: &FiniteGroup) -> AbelianFibres {
        let n = group.order();
        let mut inside = vec![false; n];
        let mut members: Vec<Element> = Vec::new();
        for a in group.elements() {
            for b in group.elements() {
                let c = group.commutator(a, b);
                if !std::mem::replace(&mut inside[c as usize], true) {
                    members.push(c);
                }
            }
        }
        // the commutators are closed under inverses ([a, b]⁻¹ = [b, a]), so D is the set of
        // their products: close under right multiplication by them
        let commutators = members.clone();
        let mut next = 0;
        while next < members.len() {
            let x = members[next];
            next += 1;
            for &c in &commutators {
                let y = group.mul(x, c);
                if !std::mem::replace(&mut inside[y as usize], true) {
                    members.push(y);
                }
            }
        }
        // the coset x D, named by its least element (elements in increasing order: the
        // first element of a coset not yet named is its least)
        let mut coset = vec![Element::MAX; n];
        let mut index = 0;
        for x in group.elements() {
            if coset[x as usize] != Element::MAX {
                continue;
            }
            index += 1;
            for &d in &members {
                coset[group.mul(x, d) as usize] = x;
            }
        }
        AbelianFibres { coset, index }
    }

    /// |G^ab| = [G : D].
    pub fn abelian_order(&self) -> usize {
        self.index
    }

    /// ψ = q∘φ of a tuple (A₀, B₀, …), as the cosets' least elements.
    pub fn key(&self, tuple: &[Element]) -> Vec<Element> {
        tuple.iter().map(|&x| self.coset[x as usize]).collect()
    }

    /// The parts S ∩ F_ψ of a subset of X_g, one per fibre it meets, each increasing, in
    /// the order of their least states.
    pub fn parts(&self, bundles: &FlatBundles, subset: &[u32]) -> Vec<Vec<u32>> {
        let mut sorted = subset.to_vec();
        sorted.sort_unstable();
        let mut slot: HashMap<Vec<Element>, usize> = HashMap::new();
        let mut parts: Vec<Vec<u32>> = Vec::new();
        for x in sorted {
            let key = self.key(bundles.state(x as usize));
            let k = *slot.entry(key).or_insert_with(|| {
                parts.push(Vec::new());
                parts.len() - 1
            });
            parts[k].push(x);
        }
        parts
    }

    /// Check, on the permutations themselves, that each one maps fibres onto fibres (the
    /// equivariance proved above): the fibre of p(x) depends only on the fibre of x.
    pub fn check_equivariant(
        &self,
        bundles: &FlatBundles,
        permutations: &[&[u32]],
    ) -> Result<(), DwError> {
        for (g, p) in permutations.iter().enumerate() {
            let mut image: HashMap<Vec<Element>, Vec<Element>> = HashMap::new();
            for (x, &y) in p.iter().enumerate() {
                let from = self.key(bundles.state(x));
                let to = self.key(bundles.state(y as usize));
                if *image.entry(from).or_insert_with(|| to.clone()) != to {
                    return Err(DwError::Inconsistent(format!(
                        "generator {g} splits the fibre of state {x} over G^ab"
                    )));
                }
            }
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::builtins::builtin_group;

    #[test]
    fn abelianisations_of_small_groups() {
        // S3^ab = Z2, Q8^ab = D4^ab = Z2×Z2, A4^ab = Z3, abelian groups are their own
        // (standard: the derived subgroups A3, {±1}, the centre, V4, trivial)
        for (name, order) in [("S3", 2), ("Q8", 4), ("D4", 4), ("A4", 3), ("Z2xZ2", 4)] {
            let g = builtin_group(name).unwrap();
            assert_eq!(AbelianFibres::new(&g).abelian_order(), order, "{name}");
        }
    }
}
