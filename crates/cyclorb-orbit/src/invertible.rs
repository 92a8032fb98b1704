//! Proof that every generator of a set is invertible, exactly, before any orbit is run: a
//! singular generator would make the "orbit" a set of lines that the group does not act on.
//!
//! Diagonal forms: no zero entry. Block-diagonal forms: every block has full rank (exact
//! Gauss–Jordan over Q(ζ_n)). Sparse rows and dense forms: a monomial matrix (one non-zero
//! per row, in distinct columns) is invertible; any other is densified and its exact rank
//! computed when the dimension is at most [`MAX_DENSE_PROOF`], else refused as unprovable.

use cyclorb_field::Cyc;
use cyclorb_field::CyclotomicField;
use cyclorb_matrix::{LinearMap, Matrix, Operator};

use crate::error::OrbitError;
use crate::generators::GeneratorSet;

/// Largest dimension of a general (neither diagonal, block-diagonal nor monomial)
/// generator whose invertibility is proved by dense exact elimination.
pub const MAX_DENSE_PROOF: usize = 512;

fn full_rank(field: &CyclotomicField, m: &Matrix, name: &str) -> Result<(), OrbitError> {
    let rank = m
        .rank(field)
        .map_err(|e| OrbitError::Invalid(format!("generator {name}: {e}")))?;
    if rank == m.rows() {
        Ok(())
    } else {
        Err(OrbitError::Invalid(format!(
            "generator {name} is singular: rank {rank} of {} (exact)",
            m.rows()
        )))
    }
}

fn is_monomial(rows: &[Vec<(usize, Cyc)>], dim: usize) -> bool {
    let mut used = vec![false; dim];
    rows.iter().all(|row| {
        let mut nonzero = row.iter().filter(|(_, x)| !x.is_zero());
        match (nonzero.next(), nonzero.next()) {
            (Some(&(j, _)), None) if j < dim && !used[j] => {
                used[j] = true;
                true
            }
            _ => false,
        }
    })
}

fn prove(field: &CyclotomicField, op: &Operator, name: &str) -> Result<(), OrbitError> {
    match op {
        Operator::Diagonal(d) => match d.iter().position(|x| x.is_zero()) {
            Some(i) => Err(OrbitError::Invalid(format!(
                "generator {name} is singular: diagonal entry {i} is 0"
            ))),
            None => Ok(()),
        },
        Operator::BlockDiagonal { blocks, .. } => blocks
            .iter()
            .try_for_each(|b| full_rank(field, &b.matrix, name)),
        Operator::SparseRows { dim, rows } if is_monomial(rows, *dim) => Ok(()),
        general if general.dim() > MAX_DENSE_PROOF => Err(OrbitError::Invalid(format!(
            "generator {name}: invertibility of a general generator of dimension {} is not \
             proved (limit {MAX_DENSE_PROOF}); write it block-diagonal or pass --unverified",
            general.dim()
        ))),
        general => full_rank(field, &general.to_dense(field), name),
    }
}

impl GeneratorSet {
    /// Prove every generator invertible (exactly; see the module doc). The error names the
    /// first generator that is singular or whose invertibility is beyond the proof's limit.
    /// Precondition: the set is valid ([`GeneratorSet::validate`]).
    pub fn prove_invertible(&self) -> Result<(), OrbitError> {
        let field = self.field()?;
        self.names
            .iter()
            .zip(&self.operators)
            .try_for_each(|(name, op)| prove(&field, op, name))
    }
}
