//! Dense matrices over Q(ζ_n), row-major: storage, entry access and the ring operations
//! (sum, difference, scaling, product, conjugate transpose, trace).

use cyclorb_field::{Cyc, CyclotomicField, DotAccumulator, FieldError};

use crate::error::MatrixError;

/// A dense `rows × cols` matrix over one cyclotomic field, stored row-major.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct Matrix {
    rows: usize,
    cols: usize,
    data: Vec<Cyc>,
}

impl Matrix {
    /// The zero matrix.
    pub fn zeros(field: &CyclotomicField, rows: usize, cols: usize) -> Matrix {
        Matrix {
            rows,
            cols,
            data: vec![field.zero(); rows * cols],
        }
    }

    /// The identity of size `dim`.
    pub fn identity(field: &CyclotomicField, dim: usize) -> Matrix {
        let mut m = Matrix::zeros(field, dim, dim);
        for i in 0..dim {
            m.set(i, i, field.one());
        }
        m
    }

    /// A matrix from its rows (all of one length).
    pub fn from_rows(rows: Vec<Vec<Cyc>>) -> Result<Matrix, MatrixError> {
        let r = rows.len();
        let c = rows.first().map_or(0, Vec::len);
        if rows.iter().any(|row| row.len() != c) {
            return Err(MatrixError::Shape("rows of different lengths".into()));
        }
        Ok(Matrix {
            rows: r,
            cols: c,
            data: rows.into_iter().flatten().collect(),
        })
    }

    /// Diagonal matrix with the given entries.
    pub fn diagonal(field: &CyclotomicField, entries: &[Cyc]) -> Matrix {
        let mut m = Matrix::zeros(field, entries.len(), entries.len());
        for (i, e) in entries.iter().enumerate() {
            m.set(i, i, e.clone());
        }
        m
    }

    /// Number of rows.
    pub fn rows(&self) -> usize {
        self.rows
    }

    /// Number of columns.
    pub fn cols(&self) -> usize {
        self.cols
    }

    /// Entry (i, j).
    pub fn get(&self, i: usize, j: usize) -> &Cyc {
        &self.data[i * self.cols + j]
    }

    /// Set entry (i, j).
    pub fn set(&mut self, i: usize, j: usize, v: Cyc) {
        self.data[i * self.cols + j] = v;
    }

    /// Row i as a slice.
    pub fn row(&self, i: usize) -> &[Cyc] {
        &self.data[i * self.cols..(i + 1) * self.cols]
    }

    /// All entries, row-major.
    pub fn entries(&self) -> &[Cyc] {
        &self.data
    }

    /// Number of non-zero entries.
    pub fn nonzeros(&self) -> usize {
        self.data.iter().filter(|x| !x.is_zero()).count()
    }

    /// self · v, one reduction per output entry.
    pub fn mul_vec(&self, field: &CyclotomicField, v: &[Cyc]) -> Result<Vec<Cyc>, MatrixError> {
        if v.len() != self.cols {
            return Err(MatrixError::Shape(format!(
                "{}×{} times vector of length {}",
                self.rows,
                self.cols,
                v.len()
            )));
        }
        (0..self.rows)
            .map(|i| Ok(field.dot(self.row(i).iter().zip(v))?))
            .collect()
    }

    /// self · other, one reduction per output entry.
    pub fn mul(&self, field: &CyclotomicField, other: &Matrix) -> Result<Matrix, MatrixError> {
        if self.cols != other.rows {
            return Err(MatrixError::Shape(format!(
                "{}×{} times {}×{}",
                self.rows, self.cols, other.rows, other.cols
            )));
        }
        let mut data = Vec::with_capacity(self.rows * other.cols);
        for i in 0..self.rows {
            for j in 0..other.cols {
                let mut acc = DotAccumulator::new(field);
                for k in 0..self.cols {
                    acc.add_product(self.get(i, k), other.get(k, j))?;
                }
                data.push(acc.finish());
            }
        }
        Ok(Matrix::from_parts(self.rows, other.cols, data))
    }

    /// Entrywise map (used for conjugation, Galois action, scaling).
    pub fn map(
        &self,
        f: impl FnMut(&Cyc) -> Result<Cyc, FieldError>,
    ) -> Result<Matrix, MatrixError> {
        let data = self.data.iter().map(f).collect::<Result<_, _>>()?;
        Ok(Matrix::from_parts(self.rows, self.cols, data))
    }

    /// The transpose.
    pub fn transpose(&self) -> Matrix {
        let mut data = Vec::with_capacity(self.data.len());
        for j in 0..self.cols {
            for i in 0..self.rows {
                data.push(self.get(i, j).clone());
            }
        }
        Matrix::from_parts(self.cols, self.rows, data)
    }

    /// The conjugate transpose X† (complex conjugation is ζ_n ↦ ζ_n⁻¹).
    pub fn adjoint(&self, field: &CyclotomicField) -> Matrix {
        let mut data = Vec::with_capacity(self.data.len());
        for j in 0..self.cols {
            for i in 0..self.rows {
                data.push(field.conj(self.get(i, j)));
            }
        }
        Matrix::from_parts(self.cols, self.rows, data)
    }

    /// Entrywise sum.
    pub fn add(&self, field: &CyclotomicField, other: &Matrix) -> Result<Matrix, MatrixError> {
        self.same_shape(other)?;
        let data = self
            .data
            .iter()
            .zip(&other.data)
            .map(|(a, b)| field.add(a, b))
            .collect::<Result<_, _>>()?;
        Ok(Matrix { data, ..*self })
    }

    /// Entrywise difference.
    pub fn sub(&self, field: &CyclotomicField, other: &Matrix) -> Result<Matrix, MatrixError> {
        self.same_shape(other)?;
        let data = self
            .data
            .iter()
            .zip(&other.data)
            .map(|(a, b)| field.sub(a, b))
            .collect::<Result<_, _>>()?;
        Ok(Matrix { data, ..*self })
    }

    /// c · self.
    pub fn scale(&self, field: &CyclotomicField, c: &Cyc) -> Result<Matrix, MatrixError> {
        self.map(|x| field.mul(x, c))
    }

    fn same_shape(&self, other: &Matrix) -> Result<(), MatrixError> {
        if self.rows == other.rows && self.cols == other.cols {
            Ok(())
        } else {
            Err(MatrixError::Shape(format!(
                "{}×{} against {}×{}",
                self.rows, self.cols, other.rows, other.cols
            )))
        }
    }

    /// True when rows = cols.
    pub fn is_square(&self) -> bool {
        self.rows == self.cols
    }

    /// The trace Σ_i X_ii of a square matrix.
    pub fn trace(&self, field: &CyclotomicField) -> Result<Cyc, MatrixError> {
        self.require_square("trace")?;
        Ok(field.sum((0..self.rows).map(|i| self.get(i, i)))?)
    }

    /// An error naming `operation` unless the matrix is square.
    pub(crate) fn require_square(&self, operation: &str) -> Result<(), MatrixError> {
        if self.is_square() {
            Ok(())
        } else {
            Err(MatrixError::Shape(format!(
                "{operation} needs a square matrix, not {}×{}",
                self.rows, self.cols
            )))
        }
    }

    /// A matrix from its shape and row-major entries; the caller guarantees
    /// `data.len() == rows * cols` (crate-internal constructors only).
    pub(crate) fn from_parts(rows: usize, cols: usize, data: Vec<Cyc>) -> Matrix {
        debug_assert_eq!(data.len(), rows * cols);
        Matrix { rows, cols, data }
    }
}
