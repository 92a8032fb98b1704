//! The joint eigenlines of N by partition refinement, without forming N.
//!
//! The space is kept as a G-orthogonal direct sum of blocks W_1 ⊕ … ⊕ W_r, each with a
//! G-orthogonal basis (G the invariant form, diagonal and positive). If N (an abelian
//! normal subgroup of unitary matrices) has joint eigenspaces that are lines, every block
//! that is a sum of such lines can only be cut along them, and two cuts keep that true:
//! - **eigenspaces**: a generator X of N preserves every block; the spectral parts
//!   Q_μ W = Π_{ν≠μ}(X − ν) W are W ∩ ker(X − μ);
//! - **images**: a generator A of the group permutes the eigenlines of N (N is normal),
//!   so A·W_j ∩ W_k = P_k(A·W_j) (P_k the G-orthogonal projection onto W_k) is a sum of
//!   them, and W_k splits into it and its G-orthogonal complement in W_k.
//!
//! Refinement stops when every A (and A⁻¹) maps every block onto a block. Then every
//! conjugate g X g⁻¹ acts as a scalar on every block, so each block lies in one joint
//! eigenspace of N. The outcome is only a proposal: the lines found are re-checked
//! exactly when the monomial form is built ([`crate::monomial`]).

use cyclorb_field::{Cyc, CyclotomicField};
use hashbrown::HashSet;

use crate::error::StructureError;
use crate::power::{spectral_part, PowerCandidate};
use crate::sparse::{inner, ColumnMap, SparseVec};

/// A block: G-orthogonal vectors (leading coordinate 1) and their G-norms.
#[derive(Clone, Debug, Default)]
struct Block {
    vectors: Vec<SparseVec>,
    norms: Vec<Cyc>,
}

impl Block {
    fn dim(&self) -> usize {
        self.vectors.len()
    }
}

/// The refinement state.
pub(crate) struct Refinement<'a> {
    field: &'a CyclotomicField,
    form: &'a [Cyc],
    blocks: Vec<Block>,
}

impl<'a> Refinement<'a> {
    /// The whole space as one block with the unit vectors (G is diagonal).
    pub(crate) fn new(field: &'a CyclotomicField, form: &'a [Cyc]) -> Refinement<'a> {
        let block = Block {
            vectors: (0..form.len()).map(|i| SparseVec::unit(field, i)).collect(),
            norms: form.to_vec(),
        };
        Refinement {
            field,
            form,
            blocks: vec![block],
        }
    }

    /// Gram–Schmidt: add to `block` the parts of `vectors` G-orthogonal to it (zeros are
    /// dropped, every kept vector is scaled to leading coordinate 1).
    fn extend_orthogonal(
        &self,
        block: &mut Block,
        vectors: impl IntoIterator<Item = SparseVec>,
    ) -> Result<(), StructureError> {
        let f = self.field;
        for v in vectors {
            let mut u = v;
            for (w, norm) in block.vectors.iter().zip(&block.norms) {
                if u.is_zero() {
                    break;
                }
                let c = inner(f, self.form, w, &u)?;
                if !c.is_zero() {
                    u = u.sub_scaled(f, &f.div(&c, norm)?, w)?;
                }
            }
            if !u.is_zero() {
                let u = u.normalised(f)?;
                let norm = inner(f, self.form, &u, &u)?;
                if norm.is_zero() {
                    return Err(StructureError::Absent(
                        "a vector of G-norm zero: the form is not definite".into(),
                    ));
                }
                block.vectors.push(u);
                block.norms.push(norm);
            }
        }
        Ok(())
    }

    /// Cut every block along the eigenspaces of every X of the candidate.
    pub(crate) fn split_by_eigenspaces(
        &mut self,
        candidate: &PowerCandidate,
    ) -> Result<(), StructureError> {
        for x in &candidate.operators {
            let mut next = Vec::new();
            for block in std::mem::take(&mut self.blocks) {
                let mut parts = Vec::new();
                for mu in &candidate.eigenvalues {
                    let images = block
                        .vectors
                        .iter()
                        .map(|w| spectral_part(self.field, x, &candidate.eigenvalues, mu, w))
                        .collect::<Result<Vec<_>, _>>()?;
                    let mut part = Block::default();
                    self.extend_orthogonal(&mut part, images)?;
                    if part.dim() > 0 {
                        parts.push(part);
                    }
                }
                let total: usize = parts.iter().map(Block::dim).sum();
                if total != block.dim() {
                    return Err(StructureError::Absent(format!(
                        "the {}-th power of a twist does not preserve a block \
                         ({total} ≠ {} dimensions)",
                        candidate.power,
                        block.dim()
                    )));
                }
                next.extend(parts);
            }
            self.blocks = next;
        }
        Ok(())
    }

    /// For each coordinate, the (block, vector) pairs with a non-zero entry there.
    fn coordinate_index(&self) -> Vec<Vec<(u32, u32)>> {
        let mut index = vec![Vec::new(); self.form.len()];
        for (k, block) in self.blocks.iter().enumerate() {
            for (c, w) in block.vectors.iter().enumerate() {
                for (i, _) in &w.0 {
                    index[*i as usize].push((k as u32, c as u32));
                }
            }
        }
        index
    }

    /// The G-orthogonal projections of u onto the blocks it meets: (block, projection).
    fn projections(
        &self,
        index: &[Vec<(u32, u32)>],
        u: &SparseVec,
    ) -> Result<Vec<(usize, SparseVec)>, StructureError> {
        let f = self.field;
        let mut pairs: Vec<(u32, u32)> =
            u.0.iter()
                .flat_map(|(i, _)| index[*i as usize].iter().copied())
                .collect::<HashSet<_>>()
                .into_iter()
                .collect();
        pairs.sort_unstable();
        let mut out: Vec<(usize, SparseVec)> = Vec::new();
        for (k, c) in pairs {
            let block = &self.blocks[k as usize];
            let w = &block.vectors[c as usize];
            let coefficient = inner(f, self.form, w, u)?;
            if coefficient.is_zero() {
                continue;
            }
            let scaled = w.scale(f, &f.div(&coefficient, &block.norms[c as usize])?)?;
            match out.last_mut() {
                Some((last, p)) if *last == k as usize => {
                    *p = p.sub_scaled(f, &f.int(-1), &scaled)?;
                }
                _ => out.push((k as usize, scaled)),
            }
        }
        Ok(out)
    }

    /// One pass of cuts by the images under `a`; true when some block was cut (the pass
    /// stops at the first cut, since the blocks changed).
    pub(crate) fn split_by_map(&mut self, a: &ColumnMap) -> Result<bool, StructureError> {
        let index = self.coordinate_index();
        for j in 0..self.blocks.len() {
            let mut parts: Vec<(usize, Vec<SparseVec>)> = Vec::new();
            for w in &self.blocks[j].vectors {
                let u = a.apply(self.field, w)?;
                for (k, p) in self.projections(&index, &u)? {
                    match parts.iter_mut().find(|(kk, _)| *kk == k) {
                        Some((_, list)) => list.push(p),
                        None => parts.push((k, vec![p])),
                    }
                }
            }
            let whole = parts.len() == 1 && self.blocks[parts[0].0].dim() == self.blocks[j].dim();
            if whole {
                continue;
            }
            let mut cut = false;
            for (k, images) in parts {
                let mut span = Block::default();
                self.extend_orthogonal(&mut span, images)?;
                let old = self.blocks[k].clone();
                let old_dim = old.dim();
                if span.dim() < old_dim {
                    let mut rest = span.clone();
                    self.extend_orthogonal(&mut rest, old.vectors)?;
                    let complement = Block {
                        vectors: rest.vectors.split_off(span.dim()),
                        norms: rest.norms.split_off(span.dim()),
                    };
                    if span.dim() + complement.dim() != old_dim {
                        return Err(StructureError::Absent(
                            "a block does not split into an image and its complement".into(),
                        ));
                    }
                    self.blocks[k] = span;
                    self.blocks.push(complement);
                    cut = true;
                }
            }
            if cut {
                return Ok(true);
            }
        }
        Ok(false)
    }

    /// Refine by the maps until no block is cut.
    pub(crate) fn stabilise(&mut self, maps: &[ColumnMap]) -> Result<(), StructureError> {
        loop {
            let mut cut = false;
            for a in maps {
                if self.split_by_map(a)? {
                    cut = true;
                    break;
                }
            }
            if !cut {
                return Ok(());
            }
        }
    }

    /// The block dimensions, in order.
    pub(crate) fn dimensions(&self) -> Vec<usize> {
        self.blocks.iter().map(Block::dim).collect()
    }

    /// The lines, when every block is one-dimensional.
    pub(crate) fn lines(self) -> Option<Vec<SparseVec>> {
        self.blocks
            .into_iter()
            .map(|b| {
                (b.dim() == 1)
                    .then(|| b.vectors.into_iter().next())
                    .flatten()
            })
            .collect()
    }
}
