//! Orbits of pairs under a diagonal action: the orbit of a product line from its factors.
//!
//! For theories A and B the genus-g block space of the Deligne product A ⊠ B is V_A ⊗ V_B,
//! and every Dehn twist acts as T_A ⊗ T_B (up to a scalar). A line ⟨v ⊗ w⟩ determines ⟨v⟩
//! and ⟨w⟩ and is determined by them, so the orbit of ⟨v₀ ⊗ w₀⟩ is in bijection with the
//! orbit of the pair (⟨v₀⟩, ⟨w₀⟩) under the diagonal action (π_A(x), π_B(y)) of the
//! generators, where π_A and π_B are the permutations the twists induce on the two factor
//! orbits. So only the factors' orbits ever meet field arithmetic; the product's orbit is
//! a breadth-first search over pairs of indices, 8 bytes per pair in the table plus 8 in the
//! queue.

use hashbrown::HashSet;

/// The orbit of the pair (0, 0) under generators acting diagonally on
/// {0, …, m−1} × {0, …, n−1}.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PairOrbit {
    /// Every pair of the orbit, in breadth-first order ((0, 0) first, generators in order).
    pub pairs: Vec<(u32, u32)>,
    /// New pairs found at each breadth-first depth.
    pub layer_sizes: Vec<usize>,
    /// Whether the orbit was completed (false when the pair limit stopped it).
    pub saturated: bool,
}

/// The orbit of (0, 0) under the permutations `first[k] × second[k]` (image lists, one pair
/// per generator k), stopping after `limit` pairs when given. Every generator's two image
/// lists must cover the two factor orbits (checked by the caller's construction of them).
pub fn pair_orbit(first: &[Vec<u32>], second: &[Vec<u32>], limit: Option<usize>) -> PairOrbit {
    let key = |x: u32, y: u32| (u64::from(x) << 32) | u64::from(y);
    let mut seen: HashSet<u64> = HashSet::new();
    seen.insert(key(0, 0));
    let mut pairs = vec![(0u32, 0u32)];
    let mut layer_sizes = vec![1];
    let mut layer_start = 0;
    while layer_start < pairs.len() {
        let layer_end = pairs.len();
        for index in layer_start..layer_end {
            let (x, y) = pairs[index];
            for (pa, pb) in first.iter().zip(second) {
                let image = (pa[x as usize], pb[y as usize]);
                if seen.insert(key(image.0, image.1)) {
                    if limit.is_some_and(|l| pairs.len() >= l) {
                        layer_sizes.push(pairs.len() - layer_end);
                        return PairOrbit {
                            pairs,
                            layer_sizes,
                            saturated: false,
                        };
                    }
                    pairs.push(image);
                }
            }
        }
        if pairs.len() > layer_end {
            layer_sizes.push(pairs.len() - layer_end);
        }
        layer_start = layer_end;
    }
    PairOrbit {
        pairs,
        layer_sizes,
        saturated: true,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The transposition (0 1) and the n-cycle, generators of S_n (common practice).
    fn symmetric_group(n: u32) -> Vec<Vec<u32>> {
        let mut swap: Vec<u32> = (0..n).collect();
        swap.swap(0, 1);
        let cycle: Vec<u32> = (0..n).map(|i| (i + 1) % n).collect();
        vec![swap, cycle]
    }

    /// S_n acting on both coordinates alike keeps the diagonal: the orbit of (0, 0) is
    /// {(i, i)}, n pairs, not n² (common practice).
    #[test]
    fn the_diagonal_action_keeps_the_diagonal() {
        let s5 = symmetric_group(5);
        let orbit = pair_orbit(&s5, &s5, None);
        assert!(orbit.saturated);
        assert_eq!(orbit.pairs.len(), 5);
        assert!(orbit.pairs.iter().all(|(x, y)| x == y));
        assert_eq!(orbit.layer_sizes.iter().sum::<usize>(), 5);
    }

    /// Independent actions fill the product: generators moving only the first coordinate
    /// (S_4) and one moving only the second (a 3-cycle) generate S_4 × Z_3, whose orbit of
    /// (0, 0) is all 4·3 pairs (common practice).
    #[test]
    fn independent_actions_fill_the_product() {
        let identity4: Vec<u32> = (0..4).collect();
        let identity3: Vec<u32> = (0..3).collect();
        let s4 = symmetric_group(4);
        let z3 = vec![1u32, 2, 0];
        let first = vec![s4[0].clone(), s4[1].clone(), identity4];
        let second = vec![identity3.clone(), identity3, z3];
        let orbit = pair_orbit(&first, &second, None);
        assert!(orbit.saturated);
        assert_eq!(orbit.pairs.len(), 12);
    }

    /// A limit stops the search with an honest partial answer.
    #[test]
    fn a_limit_leaves_an_unsaturated_orbit() {
        let s6 = symmetric_group(6);
        let shifted: Vec<Vec<u32>> = vec![s6[1].clone(), s6[0].clone()];
        let full = pair_orbit(&s6, &shifted, None);
        let partial = pair_orbit(&s6, &shifted, Some(10));
        assert!(full.saturated && !partial.saturated);
        assert_eq!(partial.pairs.len(), 10);
        assert_eq!(&full.pairs[..10], &partial.pairs[..]);
    }
}
