//! The commutant of a monomial representation counted on pairs of states, for the re-check
//! of `dw-orbitals` and `dw-monomial-commutant` (written for the check; the producer uses
//! cyclorb-dw's orbitals or cyclorb-cert's commutant certificate).
//!
//! A generator M has, in row x, ζ_m^{φ(x)} at column p(x). X commutes with M iff
//! X = M X M⁻¹, i.e. X_{x,y} = ζ_m^{φ(x) − φ(y)} X_{p(x),p(y)} for all x, y. So X is fixed by
//! its value on one pair of each orbit of the group on pairs, and an orbit carries a
//! non-zero invariant iff going round any cycle of the generators' edges multiplies by 1
//! (a cycle with a non-trivial phase forces X = 0 there). Cycles of generator edges are
//! enough: every element of the group is a word in them. The commutant dimension is the
//! number of orbits without such a cycle; with every phase 0 (a permutation
//! representation) it is the number of orbitals (Cameron, *Permutation Groups*, §2).

/// Union–find on the d² pairs with a potential: X_node = ζ_m^{pot[node]} X_{parent[node]}.
struct PhasedClasses {
    parent: Vec<u32>,
    pot: Vec<u32>,
    dead: Vec<bool>,
    modulus: u32,
}

impl PhasedClasses {
    /// The root of `x` and w with X_x = ζ^w X_root (paths compressed).
    fn find(&mut self, x: usize) -> (usize, u32) {
        let mut path = Vec::new();
        let mut r = x;
        while self.parent[r] as usize != r {
            path.push(r);
            r = self.parent[r] as usize;
        }
        // from the node nearest the root outwards, so each potential is taken to the root
        let m = self.modulus;
        for &n in path.iter().rev() {
            let p = self.parent[n] as usize;
            if p != r {
                self.pot[n] = (self.pot[n] + self.pot[p]) % m;
            }
            self.parent[n] = r as u32;
        }
        (r, if x == r { 0 } else { self.pot[x] })
    }

    /// Record X_a = ζ^w X_b.
    fn join(&mut self, a: usize, b: usize, w: u32) {
        let m = self.modulus;
        let (ra, wa) = self.find(a);
        let (rb, wb) = self.find(b);
        // X_ra = ζ^{−wa} X_a = ζ^{w + wb − wa} X_rb
        let through = (w + wb + m - wa) % m;
        if ra == rb {
            if through != 0 {
                self.dead[ra] = true;
            }
            return;
        }
        self.parent[ra] = rb as u32;
        self.pot[ra] = through;
        self.dead[rb] |= self.dead[ra];
    }
}

/// The dimension of the commutant of the monomial matrices (`perms[k][x]` the column of row
/// x, `phases[k][x]` its exponent of ζ_m; `None`: all 0) on `d` states.
pub fn commutant_dimension(
    perms: &[Vec<u32>],
    phases: Option<&[Vec<u32>]>,
    modulus: u32,
    d: usize,
) -> usize {
    let mut classes = PhasedClasses {
        parent: (0..(d * d) as u32).collect(),
        pot: vec![0; d * d],
        dead: vec![false; d * d],
        modulus: modulus.max(1),
    };
    let m = classes.modulus;
    for (k, p) in perms.iter().enumerate() {
        let phase = |x: usize| phases.map_or(0, |ph| ph[k][x] % m);
        for x in 0..d {
            for y in 0..d {
                let w = (phase(x) + m - phase(y)) % m;
                classes.join(x * d + y, p[x] as usize * d + p[y] as usize, w);
            }
        }
    }
    (0..d * d)
        .filter(|&n| classes.parent[n] as usize == n && !classes.dead[n])
        .count()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn permutations_count_orbitals_and_phases_kill_classes() {
        // the cyclic shift of 3 points: 3 orbitals (the commutant is the group algebra of
        // Z_3, dimension 3; standard)
        let shift = vec![vec![1, 2, 0]];
        assert_eq!(commutant_dimension(&shift, None, 1, 3), 3);
        // the Pauli matrices X (swap) and Z = diag(1, −1) generate an irreducible group
        // on C² (Schur: commutant dimension 1; standard)
        let perms = vec![vec![1, 0], vec![0, 1]];
        let phases = vec![vec![0, 0], vec![0, 1]];
        assert_eq!(commutant_dimension(&perms, Some(&phases), 2, 2), 1);
        // Z alone: diagonal with distinct entries, commutant the diagonal matrices (2)
        assert_eq!(
            commutant_dimension(&perms[1..], Some(&phases[1..]), 2, 2),
            2
        );
    }
}
