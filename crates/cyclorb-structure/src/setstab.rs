//! The setwise stabiliser of the first s points, from a chain whose base starts with them.
//!
//! With base b_k = k for k < s (the points of S₀ = {0, …, s − 1}) every element of the
//! group is g = u_{L−1}⋯u_s·u_{s−1}⋯u_0 (u_k a transversal element of level k, applied
//! first for the deepest level; products read "first, then"). Writing x for the product of
//! the levels above k, the images of b_k under the coset G^{(k)}·x are x(β), β ∈ Δ_k. A
//! depth-first search over k = 0, …, s − 1 that keeps only images inside S₀ (and distinct)
//! reaches exactly one element x per permutation σ of S₀ induced by the setwise
//! stabiliser H (two elements inducing σ differ by an element of G^{(s)}, and the search
//! enumerates the cosets of G^{(s)} through their base images). So
//! |H| = (number of σ) × |G^{(s)}|, G^{(s)} = ⟨level-s generators⟩·K, and H is generated
//! by the x found together with G^{(s)}.

use crate::chain::MonomialChain;
use crate::error::StructureError;
use crate::monomial::Monomial;

/// The elements x found (one per permutation of S₀), restricted to S₀.
pub(crate) struct SetStabiliser {
    /// x restricted to S₀: perm within 0..s, phases of the images.
    pub(crate) elements: Vec<Monomial>,
}

fn restrict(x: &Monomial, s: usize) -> Monomial {
    Monomial {
        perm: x.perm[..s].to_vec(),
        phases: x.phases[..s].to_vec(),
    }
}

struct Search<'a> {
    chain: &'a MonomialChain,
    s: usize,
    modulus: u32,
    limit: usize,
    found: Vec<Monomial>,
}

impl Search<'_> {
    fn descend(&mut self, k: usize, x: &Monomial, used: &mut [bool]) -> Result<(), StructureError> {
        if k == self.s {
            if self.found.len() >= self.limit {
                return Err(StructureError::Absent(format!(
                    "the support's stabiliser permutes it in more than {} ways",
                    self.limit
                )));
            }
            self.found.push(restrict(x, self.s));
            return Ok(());
        }
        for &beta in self.chain.basic_orbit(k) {
            let image = x.perm[beta as usize] as usize;
            if image >= self.s || used[image] {
                continue;
            }
            let u = self.chain.transversal(k, beta).ok_or_else(|| {
                StructureError::Rejected("a basic orbit without transversal".into())
            })?;
            let next = u.then(x, self.modulus);
            used[image] = true;
            self.descend(k + 1, &next, used)?;
            used[image] = false;
        }
        Ok(())
    }
}

/// The setwise stabiliser of {0, …, s − 1}: one element per induced permutation (at most
/// `limit`), restricted to S₀. The chain's base must start with 0, …, s − 1.
pub(crate) fn set_stabiliser(
    chain: &MonomialChain,
    s: usize,
    modulus: u32,
    limit: usize,
) -> Result<SetStabiliser, StructureError> {
    if chain.base().iter().take(s).copied().ne(0..s as u32) || chain.base().len() < s {
        return Err(StructureError::Rejected(
            "the base does not start with the support".into(),
        ));
    }
    let mut search = Search {
        chain,
        s,
        modulus,
        limit,
        found: Vec::new(),
    };
    let identity = Monomial::identity(chain.classes().len());
    search.descend(0, &identity, &mut vec![false; s])?;
    Ok(SetStabiliser {
        elements: search.found,
    })
}
