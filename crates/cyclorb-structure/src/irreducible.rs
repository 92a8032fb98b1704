//! Irreducibility in the monomial basis, by Schur's lemma, without solving a linear system.
//!
//! **Lemma.** Let M be a group of monomial matrices (π, φ) with diagonal part K. If K
//! separates the coordinates (for all i ≠ j some d ∈ K has d_i ≠ d_j) and the permutation
//! image P is transitive, then only scalars commute with M. *Proof.* X commuting with
//! d = diag(d_k) ∈ K gives d_i X_ij = X_ij d_j, so X_ij = 0 whenever d_i ≠ d_j: X is
//! diagonal. X commuting with g = (π, φ) then gives X_{π(i)π(i)} = X_ii, and transitivity
//! makes every X_ii equal. ∎
//!
//! The proof record is a short list of elements of K that already separate the
//! coordinates (chosen greedily among the Hermite rows of K); checking it means checking
//! that they lie in K, that the coordinates' phase signatures are pairwise distinct, and
//! that the generators' permutations act transitively.

use crate::error::{require, StructureError};
use crate::lattice::ModLattice;
use crate::monomial::Monomial;

/// Elements of K chosen greedily among its Hermite rows: each one kept splits some class
/// of coordinates that agree on the previous ones.
pub(crate) fn separating_diagonals(kernel: &ModLattice) -> Vec<Vec<u32>> {
    let d = kernel.dim();
    let mut signatures: Vec<Vec<u32>> = vec![Vec::new(); d];
    let mut classes = 1;
    let mut chosen = Vec::new();
    for g in kernel.generators() {
        let mut refined = signatures.clone();
        for (signature, &x) in refined.iter_mut().zip(&g) {
            signature.push(x);
        }
        let count = distinct(&refined);
        if count > classes {
            classes = count;
            signatures = refined;
            chosen.push(g);
        }
    }
    chosen
}

fn distinct(signatures: &[Vec<u32>]) -> usize {
    let mut sorted = signatures.to_vec();
    sorted.sort_unstable();
    sorted.dedup();
    sorted.len()
}

/// Whether the permutations of `generators` act transitively on the points.
fn transitive(generators: &[Monomial], degree: usize) -> bool {
    let mut seen = vec![false; degree];
    let mut queue = vec![0usize];
    if degree > 0 {
        seen[0] = true;
    }
    while let Some(x) = queue.pop() {
        for g in generators {
            let y = g.perm[x] as usize;
            if !std::mem::replace(&mut seen[y], true) {
                queue.push(y);
            }
        }
    }
    seen.iter().all(|&s| s)
}

/// The separating elements, when the lemma applies.
pub(crate) fn monomial_irreducibility(
    kernel: &ModLattice,
    generators: &[Monomial],
) -> Option<Vec<Vec<u32>>> {
    let separating = separating_diagonals(kernel);
    check_irreducibility(kernel, generators, &separating)
        .ok()
        .map(|()| separating)
}

/// Check the lemma's hypotheses: the given elements lie in K and separate the
/// coordinates, and the permutation action is transitive.
pub(crate) fn check_irreducibility(
    kernel: &ModLattice,
    generators: &[Monomial],
    separating: &[Vec<u32>],
) -> Result<(), StructureError> {
    let d = kernel.dim();
    for x in separating {
        require(x.len() == d && kernel.contains(x), || {
            "a separating element is not in the diagonal part of the group".into()
        })?;
    }
    let signatures: Vec<Vec<u32>> = (0..d)
        .map(|i| separating.iter().map(|x| x[i]).collect())
        .collect();
    require(distinct(&signatures) == d, || {
        "the diagonal elements do not separate the coordinates".into()
    })?;
    require(transitive(generators, d), || {
        "the permutation image is not transitive".into()
    })
}
