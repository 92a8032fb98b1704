//! Sparse forms of linear maps behind one trait, so the orbit engine does not care which.

use cyclorb_field::{Cyc, CyclotomicField, DotAccumulator};

use crate::dense::Matrix;
use crate::error::MatrixError;

/// A square linear map on Q(ζ_n)^dim that can be applied to vectors.
pub trait LinearMap {
    /// The dimension it acts on.
    fn dim(&self) -> usize;
    /// self · v.
    fn apply(&self, field: &CyclotomicField, v: &[Cyc]) -> Result<Vec<Cyc>, MatrixError>;
    /// The same map as a dense matrix.
    fn to_dense(&self, field: &CyclotomicField) -> Matrix;
    /// Number of stored non-zero entries.
    fn nonzeros(&self) -> usize;
}

/// A block of a block-diagonal map: it acts on the coordinates `indices` by `matrix`
/// (`matrix` is `indices.len()` square; row/column k refers to coordinate `indices[k]`).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Block {
    /// The coordinates the block acts on, distinct.
    pub indices: Vec<usize>,
    /// The block itself.
    pub matrix: Matrix,
}

/// The stored forms of a generator.
#[derive(Clone, Debug, PartialEq, Eq)]
pub enum Operator {
    /// Any matrix, dense.
    Dense(Matrix),
    /// diag(d_0, …, d_{dim−1}).
    Diagonal(Vec<Cyc>),
    /// Disjoint blocks; coordinates in no block are fixed (identity).
    BlockDiagonal {
        /// Dimension of the space.
        dim: usize,
        /// The blocks, on pairwise disjoint coordinate sets.
        blocks: Vec<Block>,
    },
    /// Row i holds its non-zero entries (column, value).
    SparseRows {
        /// Dimension of the space.
        dim: usize,
        /// Non-zero entries of each row.
        rows: Vec<Vec<(usize, Cyc)>>,
    },
}

impl Operator {
    /// Check the shape invariants (square dense matrix; block sizes and pairwise disjoint
    /// indices in range; sparse columns in range and distinct within a row).
    pub fn validate(&self) -> Result<(), MatrixError> {
        match self {
            Operator::Dense(m) if m.rows() != m.cols() => {
                Err(MatrixError::Shape("dense operator is not square".into()))
            }
            Operator::BlockDiagonal { dim, blocks } => {
                let mut seen = vec![false; *dim];
                for b in blocks {
                    if b.matrix.rows() != b.indices.len() || b.matrix.cols() != b.indices.len() {
                        return Err(MatrixError::Shape(
                            "block size differs from its index list".into(),
                        ));
                    }
                    for &i in &b.indices {
                        if i >= *dim || std::mem::replace(&mut seen[i], true) {
                            return Err(MatrixError::Shape(format!(
                                "block index {i} out of range or repeated"
                            )));
                        }
                    }
                }
                Ok(())
            }
            Operator::SparseRows { dim, rows } => {
                if rows.len() != *dim || rows.iter().flatten().any(|(j, _)| j >= dim) {
                    return Err(MatrixError::Shape(
                        "sparse rows do not fit the dimension".into(),
                    ));
                }
                let mut seen = vec![usize::MAX; *dim];
                for (i, row) in rows.iter().enumerate() {
                    for &(j, _) in row {
                        if std::mem::replace(&mut seen[j], i) == i {
                            return Err(MatrixError::Shape(format!(
                                "row {i} lists column {j} twice"
                            )));
                        }
                    }
                }
                Ok(())
            }
            _ => Ok(()),
        }
    }

    /// The sparse-rows form of any operator.
    pub fn to_sparse_rows(&self, field: &CyclotomicField) -> Operator {
        let dense = self.to_dense(field);
        let dim = dense.rows();
        let rows = (0..dim)
            .map(|i| {
                dense
                    .row(i)
                    .iter()
                    .enumerate()
                    .filter(|(_, x)| !x.is_zero())
                    .map(|(j, x)| (j, x.clone()))
                    .collect()
            })
            .collect();
        Operator::SparseRows { dim, rows }
    }
}

impl LinearMap for Operator {
    fn dim(&self) -> usize {
        match self {
            Operator::Dense(m) => m.rows(),
            Operator::Diagonal(d) => d.len(),
            Operator::BlockDiagonal { dim, .. } | Operator::SparseRows { dim, .. } => *dim,
        }
    }

    fn apply(&self, field: &CyclotomicField, v: &[Cyc]) -> Result<Vec<Cyc>, MatrixError> {
        if v.len() != self.dim() {
            return Err(MatrixError::Shape(format!(
                "operator of size {} on a vector of length {}",
                self.dim(),
                v.len()
            )));
        }
        match self {
            Operator::Dense(m) => m.mul_vec(field, v),
            Operator::Diagonal(d) => d.iter().zip(v).map(|(a, b)| Ok(field.mul(a, b)?)).collect(),
            Operator::BlockDiagonal { blocks, .. } => {
                let mut out = v.to_vec();
                for b in blocks {
                    for (r, &i) in b.indices.iter().enumerate() {
                        let mut acc = DotAccumulator::new(field);
                        for (c, &j) in b.indices.iter().enumerate() {
                            acc.add_product(b.matrix.get(r, c), &v[j])?;
                        }
                        out[i] = acc.finish();
                    }
                }
                Ok(out)
            }
            Operator::SparseRows { rows, .. } => rows
                .iter()
                .map(|row| Ok(field.dot(row.iter().map(|(j, x)| (x, &v[*j])))?))
                .collect(),
        }
    }

    fn to_dense(&self, field: &CyclotomicField) -> Matrix {
        match self {
            Operator::Dense(m) => m.clone(),
            Operator::Diagonal(d) => Matrix::diagonal(field, d),
            Operator::BlockDiagonal { dim, blocks } => {
                let mut m = Matrix::identity(field, *dim);
                for b in blocks {
                    for (r, &i) in b.indices.iter().enumerate() {
                        for (c, &j) in b.indices.iter().enumerate() {
                            m.set(i, j, b.matrix.get(r, c).clone());
                        }
                    }
                }
                m
            }
            Operator::SparseRows { dim, rows } => {
                let mut m = Matrix::zeros(field, *dim, *dim);
                for (i, row) in rows.iter().enumerate() {
                    for (j, x) in row {
                        m.set(i, *j, x.clone());
                    }
                }
                m
            }
        }
    }

    fn nonzeros(&self) -> usize {
        match self {
            Operator::Dense(m) => m.nonzeros(),
            Operator::Diagonal(d) => d.iter().filter(|x| !x.is_zero()).count(),
            Operator::BlockDiagonal { dim, blocks } => {
                let covered: usize = blocks.iter().map(|b| b.indices.len()).sum();
                dim - covered + blocks.iter().map(|b| b.matrix.nonzeros()).sum::<usize>()
            }
            Operator::SparseRows { rows, .. } => {
                rows.iter().flatten().filter(|(_, x)| !x.is_zero()).count()
            }
        }
    }
}
