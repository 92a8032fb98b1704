//! Adjoint and inverse of the stored operator forms, keeping each form where it can.

use cyclorb_field::{Cyc, CyclotomicField};

use crate::dense::Matrix;
use crate::error::MatrixError;
use crate::operator::{Block, LinearMap, Operator};

impl Operator {
    /// The non-zero entries of each column j as (row, value) pairs, without densifying.
    /// Precondition: the operator is valid ([`Operator::validate`]).
    pub(crate) fn sparse_columns(&self, field: &CyclotomicField) -> Vec<Vec<(usize, Cyc)>> {
        let dim = self.dim();
        let mut columns: Vec<Vec<(usize, Cyc)>> = vec![Vec::new(); dim];
        let mut put = |i: usize, j: usize, x: &Cyc| {
            if !x.is_zero() {
                columns[j].push((i, x.clone()));
            }
        };
        match self {
            Operator::Dense(m) => {
                for i in 0..dim {
                    for (j, x) in m.row(i).iter().enumerate() {
                        put(i, j, x);
                    }
                }
            }
            Operator::Diagonal(d) => {
                for (i, x) in d.iter().enumerate() {
                    put(i, i, x);
                }
            }
            Operator::BlockDiagonal { blocks, .. } => {
                let mut covered = vec![false; dim];
                for b in blocks {
                    for (c, &j) in b.indices.iter().enumerate() {
                        covered[j] = true;
                        for (r, &i) in b.indices.iter().enumerate() {
                            put(i, j, b.matrix.get(r, c));
                        }
                    }
                }
                let one = field.one();
                for j in (0..dim).filter(|&j| !covered[j]) {
                    put(j, j, &one);
                }
            }
            Operator::SparseRows { rows, .. } => {
                for (i, row) in rows.iter().enumerate() {
                    for (j, x) in row {
                        put(i, *j, x);
                    }
                }
            }
        }
        columns
    }

    /// The conjugate transpose X†, in the same form (block-diagonal stays block-diagonal
    /// on the same coordinate sets; sparse rows are transposed).
    pub fn adjoint(&self, field: &CyclotomicField) -> Result<Operator, MatrixError> {
        self.validate()?;
        Ok(match self {
            Operator::Dense(m) => Operator::Dense(m.adjoint(field)),
            Operator::Diagonal(d) => Operator::Diagonal(d.iter().map(|x| field.conj(x)).collect()),
            Operator::BlockDiagonal { dim, blocks } => Operator::BlockDiagonal {
                dim: *dim,
                blocks: blocks
                    .iter()
                    .map(|b| Block {
                        indices: b.indices.clone(),
                        matrix: b.matrix.adjoint(field),
                    })
                    .collect(),
            },
            Operator::SparseRows { dim, .. } => Operator::SparseRows {
                dim: *dim,
                rows: self
                    .sparse_columns(field)
                    .into_iter()
                    .map(|column| {
                        column
                            .into_iter()
                            .map(|(i, x)| (i, field.conj(&x)))
                            .collect()
                    })
                    .collect(),
            },
        })
    }

    /// X⁻¹ in the same form: diagonal entrywise, block-diagonal blockwise, dense and sparse
    /// rows through dense Gauss–Jordan (the sparse-rows result keeps its non-zero entries).
    /// [`MatrixError::Singular`] when X is not invertible.
    pub fn inverse(&self, field: &CyclotomicField) -> Result<Operator, MatrixError> {
        self.validate()?;
        match self {
            Operator::Dense(m) => Ok(Operator::Dense(m.inverse(field)?)),
            Operator::Diagonal(d) => {
                let inverted = d.iter().map(|x| {
                    if x.is_zero() {
                        Err(MatrixError::Singular)
                    } else {
                        Ok(field.inv(x)?)
                    }
                });
                Ok(Operator::Diagonal(inverted.collect::<Result<_, _>>()?))
            }
            Operator::BlockDiagonal { dim, blocks } => {
                let inverted = blocks.iter().map(|b| {
                    Ok(Block {
                        indices: b.indices.clone(),
                        matrix: b.matrix.inverse(field)?,
                    })
                });
                Ok(Operator::BlockDiagonal {
                    dim: *dim,
                    blocks: inverted.collect::<Result<_, MatrixError>>()?,
                })
            }
            Operator::SparseRows { .. } => {
                let inverse: Matrix = self.to_dense(field).inverse(field)?;
                Ok(Operator::Dense(inverse).to_sparse_rows(field))
            }
        }
    }
}
