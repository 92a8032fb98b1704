//! Re-checking the image order of a twisted Dijkgraaf–Witten theory (`dw-monomial-image`):
//! the monomial group the twists generate, listed modulo scalars by closure (written for the
//! check; the producer uses cyclorb-structure's `MonomialChain`).
//!
//! An element is kept as the column p(x) and the exponent φ(x) of ζ_m in each row x (the
//! certificates' convention). The product A·B has row x: A puts ζ^{φ_A(x)} at column
//! p_A(x), and row p_A(x) of B puts ζ^{φ_B(p_A(x))} at column p_B(p_A(x)), so
//! p_AB(x) = p_B(p_A(x)) and φ_AB(x) = φ_A(x) + φ_B(p_A(x)). Two elements are equal modulo
//! scalars iff their columns agree and their phases differ by a constant, so each element is
//! stored with φ(0) shifted to 0.

use std::collections::HashSet;

/// One monomial matrix: columns, then phases (φ(0) = 0), as one key.
type Key = Vec<u32>;

fn normalised(p: &[u32], phases: &[u32], m: u32) -> Key {
    let shift = phases.first().copied().unwrap_or(0);
    p.iter()
        .copied()
        .chain(phases.iter().map(|&f| (f + m - shift) % m))
        .collect()
}

/// The order of the group generated modulo scalars, or `None` beyond `cap` elements.
pub fn projective_order(
    perms: &[Vec<u32>],
    phases: &[Vec<u32>],
    modulus: u32,
    cap: u64,
) -> Option<u64> {
    let d = perms.first().map_or(0, Vec::len);
    let m = modulus.max(1);
    let identity = normalised(&(0..d as u32).collect::<Vec<_>>(), &vec![0; d], m);
    let mut seen: HashSet<Key> = HashSet::new();
    seen.insert(identity.clone());
    let mut stack = vec![identity];
    while let Some(a) = stack.pop() {
        let (pa, fa) = a.split_at(d);
        for (pb, fb) in perms.iter().zip(phases) {
            let p: Vec<u32> = pa.iter().map(|&c| pb[c as usize]).collect();
            let f: Vec<u32> = (0..d)
                .map(|x| (fa[x] + fb[pa[x] as usize] % m) % m)
                .collect();
            let key = normalised(&p, &f, m);
            if !seen.contains(&key) {
                if seen.len() as u64 >= cap {
                    return None;
                }
                seen.insert(key.clone());
                stack.push(key);
            }
        }
    }
    Some(seen.len() as u64)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_pauli_group_modulo_scalars_has_four_elements() {
        // X = swap, Z = diag(1, −1) generate the dihedral group of order 8 (the real Pauli
        // group); its scalars are ±1, so modulo scalars it is Z_2 × Z_2 (standard)
        let perms = vec![vec![1, 0], vec![0, 1]];
        let phases = vec![vec![0, 0], vec![0, 1]];
        assert_eq!(projective_order(&perms, &phases, 2, 100), Some(4));
        assert_eq!(projective_order(&perms, &phases, 2, 3), None);
    }
}
