//! Sizes of a genus-g block space known before it is built: the dimension by the comb count
//! (the Verlinde number, from the fusion rules alone) and the bytes the basis, its index,
//! the invariant form and one generating set of twists take, so that a space past the memory
//! budget is refused at once (`cyclorb_field::check_budget`) instead of exhausting memory.

use cyclorb_theory::Theory;

/// The sizes of V_g, estimated from the fusion rules and the field degree alone.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct SpaceEstimate {
    /// dim V_g exactly (saturating at `u128::MAX`): the number of comb trees with total
    /// charge 0.
    pub dimension: u128,
    /// Comb trees built before the total charge is imposed (the basis construction's peak).
    pub partial_trees: u128,
    /// Estimated bytes of the block space and one generating set of Dehn twists
    /// (saturating).
    pub bytes: u128,
}

/// Bytes of one field element of degree φ (coefficient words and their header).
fn element_bytes(phi: u128) -> u128 {
    8 * phi + 48
}

impl SpaceEstimate {
    /// The estimate for `theory` at genus g ≥ 1 (genus 0 counts as 1).
    pub fn new(theory: &Theory, genus: usize) -> SpaceEstimate {
        let r = theory.rank();
        let handles: Vec<usize> = (0..r)
            .flat_map(|a| theory.fusion_outcomes(a, theory.dual(a)).to_vec())
            .collect();
        // count[x]: comb trees of the first h handles whose backbone charge is x
        let mut count = vec![0u128; r];
        for &b in &handles {
            count[b] = count[b].saturating_add(1);
        }
        for _ in 1..genus.max(1) {
            let mut next = vec![0u128; r];
            for (x, &c) in count.iter().enumerate().filter(|(_, &c)| c > 0) {
                for &b in &handles {
                    for &y in theory.fusion_outcomes(x, b) {
                        next[y] = next[y].saturating_add(c);
                    }
                }
            }
            // a fixed point (every count saturated, or a theory whose counts stop growing)
            // repeats for every further handle: stop, so that a huge genus costs nothing
            if next == count {
                break;
            }
            count = next;
        }
        let dimension = count[0];
        let partial_trees = count.iter().fold(0u128, |s, &c| s.saturating_add(c));
        let g = genus.max(1) as u128;
        let phi = theory.field().degree() as u128;
        let partial_bytes = partial_trees.saturating_mul(32 * g + 32);
        // the state, its copy in the index, the index slot, the form entry
        let state_bytes = 2 * (72 + 24 * g) + 24 + element_bytes(phi);
        // 2g + 1 twists (Humphries), each entry of a block of at most rank r
        let twist_bytes = (2 * g + 1) * element_bytes(phi) * (r as u128).clamp(1, 4);
        // × 3: allocator slack and the twists' intermediate forms, calibrated on measured
        // peaks (su2:4 at genus 5: 663 MiB; ising at genus 9: 2 363 MiB)
        let bytes = partial_bytes
            .saturating_add(dimension.saturating_mul(state_bytes))
            .saturating_add(dimension.saturating_mul(twist_bytes))
            .saturating_mul(3);
        SpaceEstimate {
            dimension,
            partial_trees,
            bytes,
        }
    }
}
