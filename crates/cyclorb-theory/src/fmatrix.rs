//! F-matrices: one block [F^{abc}_d] with its row and column labels, and exact inversion.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;

use crate::arith::SameField;

/// One F-matrix [F^{abc}_d]: rows are the labels e with N_ab^e N_ec^d ≠ 0, columns the labels
/// f with N_bc^f N_af^d ≠ 0, both sorted; `matrix[i][j]` = `[F^{abc}_d]_{rows[i], cols[j]}`.
/// For an inverse the roles swap: rows are indexed by f and columns by e.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct FMatrix {
    /// Row labels (sorted).
    pub rows: Vec<usize>,
    /// Column labels (sorted).
    pub cols: Vec<usize>,
    /// The entries.
    pub matrix: Matrix,
    zero: Cyc,
}

impl FMatrix {
    /// A block with the given labels and entries (`matrix` is rows.len() × cols.len()).
    pub fn new(
        rows: Vec<usize>,
        cols: Vec<usize>,
        matrix: Matrix,
        field: &CyclotomicField,
    ) -> Self {
        FMatrix {
            rows,
            cols,
            matrix,
            zero: field.zero(),
        }
    }

    /// The empty block (no admissible labels).
    pub fn empty(field: &CyclotomicField) -> Self {
        FMatrix::new(Vec::new(), Vec::new(), Matrix::zeros(field, 0, 0), field)
    }

    /// The entry at (row label, column label); 0 when either label is not in the block.
    pub fn entry(&self, row_label: usize, col_label: usize) -> Cyc {
        self.get(row_label, col_label)
            .cloned()
            .unwrap_or_else(|| self.zero.clone())
    }

    /// The entry at (row label, column label) by reference, when both labels are present.
    pub fn get(&self, row_label: usize, col_label: usize) -> Option<&Cyc> {
        let i = self.rows.binary_search(&row_label).ok()?;
        let j = self.cols.binary_search(&col_label).ok()?;
        Some(self.matrix.get(i, j))
    }

    /// Whether the block has no entries.
    pub fn is_empty(&self) -> bool {
        self.rows.is_empty()
    }

    /// The same block with every entry mapped (Galois action, embedding, scaling).
    pub(crate) fn map_entries(&self, field: &CyclotomicField, f: impl Fn(&Cyc) -> Cyc) -> FMatrix {
        self.map_indexed(field, |_, _, x| f(x))
    }

    /// The same block with entry (row label, column label, value) mapped.
    pub(crate) fn map_indexed(
        &self,
        field: &CyclotomicField,
        f: impl Fn(usize, usize, &Cyc) -> Cyc,
    ) -> FMatrix {
        let rows: Vec<Vec<Cyc>> = (0..self.matrix.rows())
            .map(|i| {
                self.matrix
                    .row(i)
                    .iter()
                    .enumerate()
                    .map(|(j, x)| f(self.rows[i], self.cols[j], x))
                    .collect()
            })
            .collect();
        let matrix = if rows.is_empty() {
            Matrix::zeros(field, 0, 0)
        } else {
            Matrix::from_rows(rows).expect("rows of one length")
        };
        FMatrix::new(self.rows.clone(), self.cols.clone(), matrix, field)
    }
}

/// The inverse of a square matrix by Gauss–Jordan elimination over the field; `None` when it
/// is singular or not square.
pub fn invert(field: &CyclotomicField, m: &Matrix) -> Option<Matrix> {
    let n = m.rows();
    if m.cols() != n {
        return None;
    }
    let mut a: Vec<Vec<Cyc>> = (0..n).map(|i| m.row(i).to_vec()).collect();
    let mut inv: Vec<Vec<Cyc>> = (0..n)
        .map(|i| {
            (0..n)
                .map(|j| if i == j { field.one() } else { field.zero() })
                .collect()
        })
        .collect();
    for col in 0..n {
        let pivot = (col..n).find(|&r| !a[r][col].is_zero())?;
        a.swap(col, pivot);
        inv.swap(col, pivot);
        let p = field.inverse(&a[col][col])?;
        for j in 0..n {
            a[col][j] = field.times(&a[col][j], &p);
            inv[col][j] = field.times(&inv[col][j], &p);
        }
        for r in 0..n {
            if r == col || a[r][col].is_zero() {
                continue;
            }
            let factor = a[r][col].clone();
            for j in 0..n {
                let x = field.times(&factor, &a[col][j]);
                a[r][j] = field.minus(&a[r][j], &x);
                let y = field.times(&factor, &inv[col][j]);
                inv[r][j] = field.minus(&inv[r][j], &y);
            }
        }
    }
    if n == 0 {
        return Some(Matrix::zeros(field, 0, 0));
    }
    Matrix::from_rows(inv).ok()
}
