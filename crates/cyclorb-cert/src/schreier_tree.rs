//! Schreier trees: a basic orbit Δ = b^⟨S⟩ with, for every point, the one edge that first
//! reached it, so that the transversal element u_γ (with b^{u_γ} = γ) is the product of the
//! edge labels on the path from the root b to γ, and is never stored as a permutation.
//!
//! Edges are labelled by a strong generator s *or its inverse* (both directions shorten the
//! paths). Permutations act on the right, as in [`crate::perm`]: if γ is reached from its
//! parent π by the label e (γ = π^e) then u_γ = u_π·e, hence
//! x^{u_γ⁻¹} = (x^{e⁻¹})^{u_π⁻¹}: applying u_γ⁻¹ is a walk from γ up to the root applying
//! each label's inverse, and the parent itself is π = γ^{e⁻¹}.
//!
//! Each point also records its parent, so a walk up the tree does not wait for one look-up
//! to finish before the next starts. Memory: a dense table of 8 bytes per point of the
//! whole domain when the orbit is large (more than 1/32 of the points), otherwise a hash
//! map of about 13 bytes per orbit point; plus 4 bytes per orbit point for their list.

use std::ops::Range;

use hashbrown::HashMap;

use crate::perm::{inverse, Perm};

/// A strong generator stored both ways: 8 bytes per point.
#[derive(Debug, Clone)]
pub(crate) struct TwoWay {
    forward: Perm,
    backward: Perm,
}

impl TwoWay {
    /// The permutation g (a checked bijection) with its inverse.
    pub(crate) fn new(forward: Perm) -> TwoWay {
        let backward = inverse(&forward);
        TwoWay { forward, backward }
    }

    /// The permutation itself (for tests).
    #[cfg(test)]
    pub(crate) fn forward(&self) -> &[u32] {
        &self.forward
    }
}

/// An edge label: a strong generator (its index) or its inverse.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) struct Edge(u32);

impl Edge {
    /// The label s_g.
    pub(crate) fn forward(generator: usize) -> Edge {
        Edge(2 * generator as u32)
    }

    /// The label s_g⁻¹.
    pub(crate) fn backward(generator: usize) -> Edge {
        Edge(2 * generator as u32 + 1)
    }

    /// The inverse label.
    fn reversed(self) -> Edge {
        Edge(self.0 ^ 1)
    }

    /// The image list of the permutation the label stands for.
    pub(crate) fn table(self, strong: &[TwoWay]) -> &[u32] {
        let g = &strong[(self.0 >> 1) as usize];
        if self.0 & 1 == 0 {
            &g.forward
        } else {
            &g.backward
        }
    }

    /// x^e.
    pub(crate) fn apply(self, strong: &[TwoWay], x: u32) -> u32 {
        self.table(strong)[x as usize]
    }

    /// Replace every x in `xs` by x^e.
    pub(crate) fn apply_all(self, strong: &[TwoWay], xs: &mut [u32]) {
        let table = self.table(strong);
        for x in xs.iter_mut() {
            *x = table[*x as usize];
        }
    }
}

/// How a point was reached: the label of the edge into it and its parent (packed as
/// label·2³² + parent), or one of two markers.
type Link = u64;
const ABSENT: Link = u64::MAX;
const ROOT: Link = u64::MAX - 1;

fn link(e: Edge, parent: u32) -> Link {
    (u64::from(e.0) << 32) | u64::from(parent)
}

/// The link of each orbit point, dense or sparse.
#[derive(Debug, Clone)]
enum LinkTable {
    Sparse(HashMap<u32, Link>),
    Dense(Vec<Link>),
}

impl LinkTable {
    fn get(&self, x: u32) -> Link {
        match self {
            LinkTable::Sparse(map) => map.get(&x).copied().unwrap_or(ABSENT),
            LinkTable::Dense(table) => table[x as usize],
        }
    }

    fn insert(&mut self, x: u32, value: Link, degree: usize) {
        match self {
            LinkTable::Sparse(map) => {
                map.insert(x, value);
                if map.len() > degree / 32 {
                    let mut table = vec![ABSENT; degree];
                    for (&y, &l) in map.iter() {
                        table[y as usize] = l;
                    }
                    *self = LinkTable::Dense(table);
                }
            }
            LinkTable::Dense(table) => table[x as usize] = value,
        }
    }

    fn bytes(&self) -> usize {
        match self {
            LinkTable::Sparse(map) => map.capacity() * 13,
            LinkTable::Dense(table) => table.len() * 8,
        }
    }
}

/// The orbit of a root point under a list of strong generators, as a tree of edges.
#[derive(Debug, Clone)]
pub(crate) struct SchreierTree {
    degree: usize,
    points: Vec<u32>,
    links: LinkTable,
}

impl SchreierTree {
    /// The orbit {root} of the trivial group.
    pub(crate) fn new(root: u32, degree: usize) -> SchreierTree {
        let mut links = LinkTable::Sparse(HashMap::new());
        links.insert(root, ROOT, degree);
        SchreierTree {
            degree,
            points: vec![root],
            links,
        }
    }

    /// |Δ|.
    pub(crate) fn len(&self) -> usize {
        self.points.len()
    }

    /// The point reached `position`-th.
    pub(crate) fn point(&self, position: usize) -> u32 {
        self.points[position]
    }

    /// Whether x ∈ Δ.
    pub(crate) fn contains(&self, x: u32) -> bool {
        self.links.get(x) != ABSENT
    }

    /// The edge into x and the parent it comes from (`None` for the root and for points
    /// outside Δ).
    fn step_up(&self, x: u32) -> Option<(Edge, u32)> {
        match self.links.get(x) {
            ABSENT | ROOT => None,
            l => Some((Edge((l >> 32) as u32), l as u32)),
        }
    }

    /// The label of the edge into x (`None` for the root and for points outside Δ).
    pub(crate) fn edge_into(&self, x: u32) -> Option<Edge> {
        self.step_up(x).map(|(e, _)| e)
    }

    /// Bytes held.
    pub(crate) fn bytes(&self) -> usize {
        self.links.bytes() + self.points.capacity() * 4
    }

    fn reach(&mut self, x: u32, e: Edge, parent: u32) {
        if !self.contains(x) {
            self.links.insert(x, link(e, parent), self.degree);
            self.points.push(x);
        }
    }

    /// Close Δ after `generators[first_new..]` joined the list: every old point is moved by
    /// the new generators and their inverses, every new point by all of them, breadth
    /// first. Returns the positions of the new points.
    pub(crate) fn extend(
        &mut self,
        strong: &[TwoWay],
        generators: &[usize],
        first_new: usize,
    ) -> Range<usize> {
        let old = self.points.len();
        for position in 0..old {
            let x = self.points[position];
            for &g in &generators[first_new..] {
                for e in [Edge::forward(g), Edge::backward(g)] {
                    self.reach(e.apply(strong, x), e, x);
                }
            }
        }
        let mut next = old;
        while let Some(&x) = self.points.get(next) {
            next += 1;
            for &g in generators {
                for e in [Edge::forward(g), Edge::backward(g)] {
                    self.reach(e.apply(strong, x), e, x);
                }
            }
        }
        old..self.points.len()
    }

    /// Replace every x in `xs` by x^{u_γ⁻¹} (γ ∈ Δ): the walk from γ to the root.
    pub(crate) fn apply_inverse(&self, strong: &[TwoWay], gamma: u32, xs: &mut [u32]) {
        let mut at = gamma;
        while let Some((e, parent)) = self.step_up(at) {
            e.reversed().apply_all(strong, xs);
            at = parent;
        }
    }

    /// Replace every x in `xs` by x^{u_γ} (γ ∈ Δ): the labels from the root down to γ;
    /// `path` is scratch space.
    pub(crate) fn apply(
        &self,
        strong: &[TwoWay],
        gamma: u32,
        xs: &mut [u32],
        path: &mut Vec<Edge>,
    ) {
        path.clear();
        let mut at = gamma;
        while let Some((e, parent)) = self.step_up(at) {
            path.push(e);
            at = parent;
        }
        for &e in path.iter().rev() {
            e.apply_all(strong, xs);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn transversal_elements_map_the_root_to_their_point() {
        // the cyclic group of order 7 and the inversion x ↦ −x mod 7 (dihedral, order 14)
        let rotate: Perm = (0..7).map(|x| (x + 1) % 7).collect();
        let reflect: Perm = (0..7).map(|x| (7 - x) % 7).collect();
        let strong = vec![TwoWay::new(rotate), TwoWay::new(reflect)];
        let mut tree = SchreierTree::new(0, 7);
        assert_eq!(tree.extend(&strong, &[0], 0), 1..7);
        assert_eq!(tree.extend(&strong, &[0, 1], 1), 7..7);
        let mut path = Vec::new();
        for gamma in 0..7 {
            let mut xs = [0u32];
            tree.apply(&strong, gamma, &mut xs, &mut path);
            assert_eq!(xs, [gamma]);
            tree.apply_inverse(&strong, gamma, &mut xs);
            assert_eq!(xs, [0]);
        }
        // both directions: no path is longer than 3 steps around the 7-cycle
        for gamma in 1..7 {
            let mut xs = [0u32];
            tree.apply(&strong, gamma, &mut xs, &mut path);
            assert!(path.len() <= 3);
        }
    }
}
