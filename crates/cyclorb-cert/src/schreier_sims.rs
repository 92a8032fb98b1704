//! A deterministic Schreier–Sims algorithm over a *known base*, with group elements handled
//! through their base images: the exact order of a permutation group of large degree
//! (millions of points) in memory linear in the degree.
//!
//! **Base images.** A base is a sequence B = (b_0, …, b_{m−1}) of points whose pointwise
//! stabiliser in G is trivial. Then g ↦ (b_0^g, …, b_{m−1}^g) is injective on G (if g and h
//! agree on B, g·h⁻¹ fixes B pointwise, so g = h), and the identity is the only element of
//! G fixing every base point. The caller supplies B with its proof: all points (any
//! group), or, for the action on lines, the lines of the faithfulness lemma
//! ([`crate::FaithfulnessProof`]), whose pointwise stabiliser is the scalars, trivial in the
//! projective image.
//!
//! **The chain.** Level k has the point b_k, a list S_k of strong generators fixing
//! b_0, …, b_{k−1}, the basic orbit Δ_k = b_k^⟨S_k⟩ and its Schreier tree
//! ([`crate::schreier_tree`]), which gives the transversal elements u_β (b_k^{u_β} = β) as
//! words. Strong generators are the only stored permutations (with their inverses).
//!
//! **Sifting** an element g from level k: if β = b_k^g lies in Δ_k, replace g by g·u_β⁻¹
//! (which fixes b_k) and go on to level k + 1; otherwise it fails at level k. Sifting needs
//! only the images of the remaining base points: (b_j^{g·u_β⁻¹}) = ((b_j^g)^{u_β⁻¹}), one
//! walk up the tree per point. An element of G that passes every level fixes the whole
//! base, so it *is* the identity. A Schreier generator h = u_β·s·u_{β^s}⁻¹ (β ∈ Δ_k,
//! s ∈ S_k) fixes b_0, …, b_k, and its base images come from three walks; it is sifted from
//! level k + 1 without ever being written out. Only when it fails, at level j, is it
//! composed as a permutation (once per new strong generator): the residue joins
//! S_{k+1}, …, S_j.
//!
//! **Construction.** Each input generator joins S_0, …, S_j, j the first base point it
//! moves (all at once, so that the trees are built breadth first). Every pair (β ∈ Δ_k, s ∈ S_k) is tested exactly once — pairs that
//! are tree edges give h = 1 and are skipped — the deepest level with pending pairs first.
//! Transversal elements never change once their point is reached, so a sift that passed
//! stays valid.
//!
//! **Why the order is exact** (Schreier's lemma and Sims' criterion). At the end every
//! Schreier generator of level k lies in ⟨S_{k+1}⟩ (it passed, or it is a residue in
//! S_{k+1} times transversal elements of deeper levels). By induction from the last level,
//! the set P_k of products u^{(m−1)}⋯u^{(k)} of transversal elements is ⟨S_k⟩: for
//! p = q·u_β with q ∈ P_{k+1} and s ∈ S_k, p·s = q·h·u_{β^s} with h ∈ ⟨S_{k+1}⟩ = P_{k+1}, so
//! P_k is closed under right multiplication by S_k, contains 1 and is finite, hence
//! contains ⟨S_k⟩ (and lies in it). The factorisation is unique (b_k^p = b_k^{u^{(k)}}), so
//! |G| = Π_k |Δ_k| and |stabiliser of b_0| = Π_{k≥1} |Δ_k|.
//!
//! **Cost.** A test costs about m·(|u_β| + |u_{β^s}| + 1) look-ups for the base images plus
//! Σ_j (m − j)·|u^{(j)}| for the sift; the pairs at the top level are |Δ_0|·|S_0|. Memory:
//! 8 bytes per point per strong generator, plus a tree per level (4 bytes per point when
//! its orbit is large, about 16 bytes per orbit point otherwise). Pending pairs are tested
//! in batches, split over threads; the first failure in batch order is handled and the rest
//! of the batch is tested again, so the result is that of the sequential algorithm,
//! whatever the number of threads.

use std::collections::VecDeque;
use std::ops::Range;

use num_bigint::BigUint;

use crate::error::CertError;
use crate::parallel::first_match;
use crate::perm::{check_perm, identity, is_identity, Perm};
use crate::schreier_tree::{Edge, SchreierTree, TwoWay};

/// Pairs tested between two looks at the queue: starts small, doubles while batches pass,
/// and falls back after a failure (the answer does not depend on it).
const FIRST_BATCH: usize = 64;
const LARGEST_BATCH: usize = 1 << 14;
/// Batches smaller than this are tested on one thread.
const PARALLEL_BATCH: usize = 512;

/// Working space of one thread: base images and a path in a tree.
#[derive(Debug, Default)]
struct Scratch {
    images: Vec<u32>,
    path: Vec<Edge>,
    /// The last (level, β) whose u_β was applied to the base points, and the result: the
    /// pairs of one point with each generator come in a row and share it (the chain does
    /// not change while a scratch lives).
    beta: Option<(usize, u32)>,
    beta_images: Vec<u32>,
}

/// One level of the chain.
#[derive(Debug, Clone)]
struct Level {
    base_point: u32,
    /// S_k, as indices into the strong generators.
    generators: Vec<usize>,
    tree: SchreierTree,
}

/// Pending pairs (point of Δ_k at a position in `points`, generator of S_k at a position in
/// `generators`), point-major, the first `done` of them already tested.
#[derive(Debug, Clone)]
struct Pending {
    points: Range<usize>,
    generators: Range<usize>,
    done: usize,
}

impl Pending {
    fn len(&self) -> usize {
        self.points.len() * self.generators.len()
    }

    /// The `index`-th pair as (orbit position, generator position).
    fn pair(&self, index: usize) -> (usize, usize) {
        let per_point = self.generators.len();
        (
            self.points.start + index / per_point,
            self.generators.start + index % per_point,
        )
    }
}

/// A base and strong generating set of a permutation group, by a deterministic
/// Schreier–Sims algorithm on base images (see the module documentation for the
/// mathematics): exact order, basic orbits, membership.
#[derive(Debug, Clone)]
pub struct StabiliserChain {
    degree: usize,
    strong: Vec<TwoWay>,
    levels: Vec<Level>,
}

impl StabiliserChain {
    /// The chain of the group generated by `generators`, permutations of
    /// {0, …, degree − 1} given as image lists (checked), with every point as a base point
    /// (0, 1, 2, … in order; always a base). Suits small degrees: a sift costs up to
    /// degree² look-ups.
    pub fn new(degree: usize, generators: &[Vec<u32>]) -> Result<StabiliserChain, CertError> {
        let all: Vec<u32> = (0..degree as u32).collect();
        StabiliserChain::with_base(degree, generators, &all, 1)
    }

    /// The chain with the given base, which the caller has proved to be one (only the
    /// identity of the group fixes every point of it), using `threads` threads. Errors:
    /// malformed permutations, base points out of range or repeated, and an input generator
    /// that fixes the whole base without being the identity (so `base` is not a base).
    pub fn with_base(
        degree: usize,
        generators: &[Vec<u32>],
        base: &[u32],
        threads: usize,
    ) -> Result<StabiliserChain, CertError> {
        for g in generators {
            check_perm(g, degree)?;
        }
        let mut seen = vec![false; degree];
        for &b in base {
            let slot = seen
                .get_mut(b as usize)
                .ok_or_else(|| CertError::Input(format!("base point {b} outside 0..{degree}")))?;
            if std::mem::replace(slot, true) {
                return Err(CertError::Input(format!("base point {b} repeated")));
            }
        }
        let mut chain = StabiliserChain {
            degree,
            strong: Vec::new(),
            levels: base
                .iter()
                .map(|&b| Level {
                    base_point: b,
                    generators: Vec::new(),
                    tree: SchreierTree::new(b, degree),
                })
                .collect(),
        };
        let mut queue: Vec<VecDeque<Pending>> = vec![VecDeque::new(); base.len()];
        // Sifted through the empty chain, an input generator fails at the first base point
        // it moves; all of them join at once, so that the trees are built breadth first.
        let mut input = Vec::new();
        for g in generators {
            let (level, residue) = chain.sift_permutation(g.clone(), 0);
            if level < chain.levels.len() {
                input.push((residue, 0..level + 1));
            } else if !is_identity(&residue) {
                return Err(CertError::Input(
                    "the base points are not a base: a generator fixes all of them".into(),
                ));
            }
        }
        chain.add_strong_generators(input, &mut queue);
        chain.run(&mut queue, threads.max(1))?;
        Ok(chain)
    }

    /// Store each permutation as a strong generator of its range of levels, close those
    /// levels' orbits (breadth first) and queue the new pairs.
    fn add_strong_generators(
        &mut self,
        new: Vec<(Perm, Range<usize>)>,
        queue: &mut [VecDeque<Pending>],
    ) {
        // (level, number of generators it had before)
        let mut touched: Vec<(usize, usize)> = Vec::new();
        for (g, levels) in new {
            let index = self.strong.len();
            self.strong.push(TwoWay::new(g));
            for k in levels {
                if !touched.iter().any(|&(t, _)| t == k) {
                    touched.push((k, self.levels[k].generators.len()));
                }
                self.levels[k].generators.push(index);
            }
        }
        for (k, first_new) in touched {
            let level = &mut self.levels[k];
            let old_points = level.tree.len();
            let mut grown = level.tree.clone();
            let new_points = grown.extend(&self.strong, &level.generators, first_new);
            let count = level.generators.len();
            let new_pairs = old_points * (count - first_new) + new_points.len() * count;
            if old_points * first_new <= new_pairs {
                // Rebuilding breadth first shortens the paths; the pairs already tested must
                // then be tested again (at most doubling the work).
                let mut fresh = SchreierTree::new(level.base_point, self.degree);
                fresh.extend(&self.strong, &level.generators, 0);
                level.tree = fresh;
                queue[k].clear();
                queue[k].push_back(Pending {
                    points: 0..level.tree.len(),
                    generators: 0..count,
                    done: 0,
                });
                continue;
            }
            level.tree = grown;
            queue[k].push_back(Pending {
                points: 0..old_points,
                generators: first_new..count,
                done: 0,
            });
            if !new_points.is_empty() {
                queue[k].push_back(Pending {
                    points: new_points,
                    generators: 0..count,
                    done: 0,
                });
            }
        }
    }

    /// Test pending pairs, deepest level first, until none is left.
    fn run(&mut self, queue: &mut [VecDeque<Pending>], threads: usize) -> Result<(), CertError> {
        let mut batch = FIRST_BATCH;
        while let Some(k) = queue.iter().rposition(|q| !q.is_empty()) {
            let pending = queue[k]
                .front()
                .expect("the level has pending pairs")
                .clone();
            let end = (pending.done + batch).min(pending.len());
            let workers = if end - pending.done < PARALLEL_BATCH {
                1
            } else {
                threads
            };
            let failure = first_match(
                pending.done..end,
                workers,
                Scratch::default,
                |scratch, index| {
                    let (position, generator) = pending.pair(index);
                    self.test_pair(k, position, generator, scratch)
                },
            )?;
            let front = queue[k].front_mut().expect("still there");
            front.done = failure.map_or(end, |(index, _)| index + 1);
            if front.done == front.len() {
                queue[k].pop_front();
            }
            match failure {
                None => batch = (batch * 2).min(LARGEST_BATCH),
                Some((index, _)) => {
                    batch = FIRST_BATCH;
                    let (position, generator) = pending.pair(index);
                    let h = self.schreier_generator(k, position, generator);
                    let (level, residue) = self.sift_permutation(h, k + 1);
                    if level == self.levels.len() {
                        return Err(CertError::Input(
                            "the base points are not a base: a Schreier generator fixes all of them"
                                .into(),
                        ));
                    }
                    self.add_strong_generators(vec![(residue, k + 1..level + 1)], queue);
                }
            }
        }
        Ok(())
    }

    /// The point β ∈ Δ_k, the strong generator s and γ = β^s of a pair; `None` when the
    /// pair is a tree edge (its Schreier generator is 1).
    fn pair_points(
        &self,
        k: usize,
        position: usize,
        generator: usize,
    ) -> Option<(u32, usize, u32)> {
        let level = &self.levels[k];
        let beta = level.tree.point(position);
        let s = level.generators[generator];
        let gamma = Edge::forward(s).apply(&self.strong, beta);
        let tree_edge = level.tree.edge_into(gamma) == Some(Edge::forward(s))
            || level.tree.edge_into(beta) == Some(Edge::backward(s));
        (!tree_edge).then_some((beta, s, gamma))
    }

    /// Sift the Schreier generator of a pair from level k + 1 through its base images; the
    /// level where it fails, `None` when it passes (it is then a product of transversal
    /// elements).
    fn test_pair(
        &self,
        k: usize,
        position: usize,
        generator: usize,
        scratch: &mut Scratch,
    ) -> Option<usize> {
        let (beta, s, gamma) = self.pair_points(k, position, generator)?;
        let tree = &self.levels[k].tree;
        if scratch.beta != Some((k, beta)) {
            let moved = &mut scratch.beta_images;
            moved.clear();
            moved.extend(self.levels[k + 1..].iter().map(|l| l.base_point));
            tree.apply(&self.strong, beta, moved, &mut scratch.path);
            scratch.beta = Some((k, beta));
        }
        let images = &mut scratch.images;
        images.clear();
        images.extend_from_slice(&scratch.beta_images);
        Edge::forward(s).apply_all(&self.strong, images);
        tree.apply_inverse(&self.strong, gamma, images);
        self.sift_images(images, k + 1)
    }

    /// Sift from level `from` an element of G given by the images of b_from, b_from+1, …
    /// (it fixes the earlier base points): the level where it fails, or `None`.
    fn sift_images(&self, images: &mut [u32], from: usize) -> Option<usize> {
        for (offset, level) in self.levels[from..].iter().enumerate() {
            let x = images[offset];
            if x == level.base_point {
                continue;
            }
            if !level.tree.contains(x) {
                return Some(from + offset);
            }
            level
                .tree
                .apply_inverse(&self.strong, x, &mut images[offset..]);
        }
        None
    }

    /// The Schreier generator u_β·s·u_{β^s}⁻¹ of a failing pair, as a permutation.
    fn schreier_generator(&self, k: usize, position: usize, generator: usize) -> Perm {
        let mut h = identity(self.degree);
        if let Some((beta, s, gamma)) = self.pair_points(k, position, generator) {
            let tree = &self.levels[k].tree;
            tree.apply(&self.strong, beta, &mut h, &mut Vec::new());
            Edge::forward(s).apply_all(&self.strong, &mut h);
            tree.apply_inverse(&self.strong, gamma, &mut h);
        }
        h
    }

    /// Sift a whole permutation from level `from`: the level where it fails (the number of
    /// levels when it passes every one) and the residue.
    fn sift_permutation(&self, mut g: Perm, from: usize) -> (usize, Perm) {
        for (k, level) in self.levels.iter().enumerate().skip(from) {
            let x = g[level.base_point as usize];
            if x == level.base_point {
                continue;
            }
            if !level.tree.contains(x) {
                return (k, g);
            }
            level.tree.apply_inverse(&self.strong, x, &mut g);
        }
        (self.levels.len(), g)
    }

    /// Whether g (any permutation of the same degree) lies in the group: it sifts through
    /// every level to the identity.
    pub fn contains(&self, g: &[u32]) -> bool {
        if check_perm(g, self.degree).is_err() {
            return false;
        }
        let (level, residue) = self.sift_permutation(g.to_vec(), 0);
        level == self.levels.len() && is_identity(&residue)
    }

    /// The number of levels: one per base point given, redundant ones included.
    pub fn level_count(&self) -> usize {
        self.levels.len()
    }

    /// The base point b_k of level k (every level, as given).
    pub fn base_point(&self, k: usize) -> u32 {
        self.levels[k].base_point
    }

    /// The basic orbit Δ_k = b_k^{G^{(k)}} of level k, G^{(k)} the pointwise stabiliser of
    /// b_0, …, b_{k−1}, in the order its points were reached.
    pub fn basic_orbit(&self, k: usize) -> Vec<u32> {
        let tree = &self.levels[k].tree;
        (0..tree.len()).map(|i| tree.point(i)).collect()
    }

    /// The transversal element u_β of level k (b_k^{u_β} = β) as an image list, `None` when
    /// β ∉ Δ_k. Every element of G is uniquely u^{(m−1)}⋯u^{(1)}·u^{(0)} (left factor applied
    /// first), one transversal element per level.
    pub fn transversal(&self, k: usize, beta: u32) -> Option<Vec<u32>> {
        let tree = &self.levels[k].tree;
        if !tree.contains(beta) {
            return None;
        }
        let mut u = identity(self.degree);
        tree.apply(&self.strong, beta, &mut u, &mut Vec::new());
        Some(u)
    }

    /// The number of points acted on.
    pub fn degree(&self) -> usize {
        self.degree
    }

    /// The group order Π_k |Δ_k|.
    pub fn order(&self) -> BigUint {
        self.levels
            .iter()
            .map(|l| BigUint::from(l.tree.len()))
            .product()
    }

    /// The levels that move something: the first one (b_0, for the orbit–stabiliser
    /// check) and every later one with |Δ_k| > 1. Leaving out a level with |Δ_k| = 1 keeps a
    /// base (its point is fixed by the stabiliser of the earlier ones).
    fn essential_levels(&self) -> impl Iterator<Item = &Level> {
        self.levels
            .iter()
            .enumerate()
            .filter(|(k, l)| *k == 0 || l.tree.len() > 1)
            .map(|(_, l)| l)
    }

    /// The base without its redundant points: b_0, then the points with |Δ_k| > 1.
    pub fn base(&self) -> Vec<u32> {
        self.essential_levels().map(|l| l.base_point).collect()
    }

    /// The basic orbit lengths |Δ_k| of [`Self::base`]'s points.
    pub fn basic_orbit_lengths(&self) -> Vec<usize> {
        self.essential_levels().map(|l| l.tree.len()).collect()
    }

    /// The number of strong generators (input residues kept plus Schreier residues).
    pub fn strong_generator_count(&self) -> usize {
        self.strong.len()
    }

    /// The order of the stabiliser of b_0: Π_{k≥1} |Δ_k|.
    pub fn stabiliser_order(&self) -> BigUint {
        self.levels
            .iter()
            .skip(1)
            .map(|l| BigUint::from(l.tree.len()))
            .product()
    }

    /// Bytes held by the strong generators and the trees.
    pub fn memory_bytes(&self) -> usize {
        let generators = self.strong.len() * self.degree * 8;
        let trees: usize = self.levels.iter().map(|l| l.tree.bytes()).sum();
        generators + trees
    }

    /// The strong generators (for tests).
    #[cfg(test)]
    fn strong_generators(&self) -> impl Iterator<Item = &[u32]> {
        self.strong.iter().map(TwoWay::forward)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn cycle(n: u32) -> Perm {
        (0..n).map(|x| (x + 1) % n).collect()
    }

    fn transposition(n: u32) -> Perm {
        let mut p: Perm = (0..n).collect();
        p.swap(0, 1);
        p
    }

    #[test]
    fn symmetric_groups_have_order_n_factorial() {
        // |S_n| = n! (common practice)
        let mut factorial = 1u64;
        for n in 2..=8u32 {
            factorial *= u64::from(n);
            let chain = StabiliserChain::new(n as usize, &[cycle(n), transposition(n)]).unwrap();
            assert_eq!(chain.order(), BigUint::from(factorial), "S_{n}");
        }
    }

    #[test]
    fn the_answer_does_not_depend_on_threads_or_on_the_base_order() {
        // S_7 again: base in reverse order, and two threads
        let gens = [cycle(7), transposition(7)];
        let reversed: Vec<u32> = (0..7).rev().collect();
        let chain = StabiliserChain::with_base(7, &gens, &reversed, 2).unwrap();
        assert_eq!(chain.order(), BigUint::from(5040u32));
        let one = StabiliserChain::with_base(7, &gens, &reversed, 1).unwrap();
        assert_eq!(chain.basic_orbit_lengths(), one.basic_orbit_lengths());
        assert_eq!(
            chain.strong_generators().collect::<Vec<_>>(),
            one.strong_generators().collect::<Vec<_>>()
        );
    }

    #[test]
    fn membership_is_exact() {
        // A_5 on 5 points: 3-cycles (0 1 2) and (2 3 4); even permutations only
        let a: Perm = vec![1, 2, 0, 3, 4];
        let b: Perm = vec![0, 1, 3, 4, 2];
        let chain = StabiliserChain::new(5, &[a, b]).unwrap();
        assert_eq!(chain.order(), BigUint::from(60u32));
        assert!(chain.contains(&[1, 0, 3, 2, 4]));
        assert!(!chain.contains(&[1, 0, 2, 3, 4]));
        assert!(!chain.contains(&[0, 1, 2]));
    }

    #[test]
    fn a_million_points_with_a_base_of_two() {
        // {x ↦ a·x + b : a ∈ ⟨2⟩} on F_p, p = 1 000 003 (prime), generated by x ↦ x + 1 and
        // x ↦ 2x: order p·|⟨2⟩|, and {0, 1} is a base (an affine map fixing 0 and 1 is the
        // identity) (common practice).
        let p: u64 = 1_000_003;
        let mut order_of_2 = 1;
        let mut power = 2;
        while power != 1 {
            power = power * 2 % p;
            order_of_2 += 1;
        }
        let shift: Perm = (0..p).map(|x| ((x + 1) % p) as u32).collect();
        let double: Perm = (0..p).map(|x| (2 * x % p) as u32).collect();
        let chain = StabiliserChain::with_base(p as usize, &[shift, double], &[0, 1], 2).unwrap();
        assert_eq!(chain.order(), BigUint::from(p * order_of_2));
        assert_eq!(
            chain.basic_orbit_lengths(),
            vec![p as usize, order_of_2 as usize]
        );
        // 12 bytes per point per strong generator and tree: well under 64 per point
        assert!(chain.memory_bytes() < 64 * p as usize);
    }

    #[test]
    fn a_false_base_is_reported() {
        // the transposition (0 1) fixes point 2, so {2} is no base of ⟨(0 1)⟩ on 3 points
        let err = StabiliserChain::with_base(3, &[transposition(3)], &[2], 1).unwrap_err();
        assert!(err.to_string().contains("not a base"), "{err}");
    }
}
