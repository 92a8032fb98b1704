//! Generic exact linear algebra over a [`Scalars`] field: an incrementally built row
//! echelon form (rows arrive one at a time; the rank and the nullspace are read at any
//! point), square products and inverses, and eigenbases for eigenvalues from a candidate
//! list.
//!
//! Square matrices are row vectors of rows (`Vec<Vec<E>>`).

use crate::error::CertError;
use crate::scalars::Scalars;

/// A square matrix as its rows.
pub(crate) type Rows<E> = Vec<Vec<E>>;

/// The row space of the rows inserted so far, in echelon form: each stored row has a 1 at
/// its pivot column and zeros at every column before it, and no two share a pivot.
pub(crate) struct Echelon<E> {
    cols: usize,
    rows: Vec<Vec<E>>,
    /// For each column, the stored row whose pivot it is.
    pivot_row: Vec<Option<usize>>,
}

impl<E: Clone> Echelon<E> {
    /// The empty row space of vectors of length `cols`.
    pub(crate) fn new(cols: usize) -> Echelon<E> {
        Echelon {
            cols,
            rows: Vec::new(),
            pivot_row: vec![None; cols],
        }
    }

    /// The nullity of the inserted rows: cols − rank.
    pub(crate) fn nullity(&self) -> usize {
        self.cols - self.rows.len()
    }

    /// Reduce `row` against the stored rows (columns in increasing order; a stored row is
    /// zero before its pivot, so earlier columns are never disturbed) and store the rest when
    /// it is non-zero. Returns whether the rank grew.
    pub(crate) fn insert<S: Scalars<E = E>>(
        &mut self,
        s: &S,
        mut row: Vec<E>,
    ) -> Result<bool, CertError> {
        if row.len() != self.cols {
            return Err(CertError::Input(format!(
                "a row of length {} in a system of {} unknowns",
                row.len(),
                self.cols
            )));
        }
        for c in 0..self.cols {
            if s.is_zero(&row[c]) {
                continue;
            }
            match self.pivot_row[c] {
                Some(k) => {
                    let f = row[c].clone();
                    let pivot = &self.rows[k];
                    for j in c..self.cols {
                        if !s.is_zero(&pivot[j]) {
                            row[j] = s.mul_sub(&row[j], &f, &pivot[j])?;
                        }
                    }
                }
                None => {
                    let inverse = s.inv(&row[c])?;
                    for x in row[c..].iter_mut() {
                        if !s.is_zero(x) {
                            *x = s.mul(x, &inverse)?;
                        }
                    }
                    self.pivot_row[c] = Some(self.rows.len());
                    self.rows.push(row);
                    return Ok(true);
                }
            }
        }
        Ok(false)
    }

    /// A basis of {x : r·x = 0 for every inserted row r}: for each free (non-pivot) column
    /// f, the solution with x_f = 1 and 0 at the other free columns, the pivot entries found
    /// by back-substitution from the last pivot column to the first.
    pub(crate) fn nullspace<S: Scalars<E = E>>(&self, s: &S) -> Result<Vec<Vec<E>>, CertError> {
        let pivots: Vec<(usize, usize)> = (0..self.cols)
            .filter_map(|c| self.pivot_row[c].map(|k| (c, k)))
            .collect();
        let mut basis = Vec::with_capacity(self.nullity());
        for free in (0..self.cols).filter(|&c| self.pivot_row[c].is_none()) {
            let mut x = vec![s.zero(); self.cols];
            x[free] = s.one();
            for &(c, k) in pivots.iter().rev() {
                let row = &self.rows[k];
                let sum = s.dot(row[c + 1..].iter().zip(&x[c + 1..]))?;
                x[c] = s.neg(&sum);
            }
            basis.push(x);
        }
        Ok(basis)
    }
}

/// The product a·b of square matrices of one size.
pub(crate) fn mul<S: Scalars>(
    s: &S,
    a: &Rows<S::E>,
    b: &Rows<S::E>,
) -> Result<Rows<S::E>, CertError> {
    let d = a.len();
    let mut out = Vec::with_capacity(d);
    for row in a {
        let mut out_row = Vec::with_capacity(d);
        for j in 0..d {
            out_row.push(s.dot(row.iter().zip(b.iter().map(|r| &r[j])))?);
        }
        out.push(out_row);
    }
    Ok(out)
}

/// a⁻¹ by Gauss–Jordan on [a | I]; an error when a is singular.
pub(crate) fn inverse<S: Scalars>(s: &S, a: &Rows<S::E>) -> Result<Rows<S::E>, CertError> {
    let d = a.len();
    let mut work: Rows<S::E> = a
        .iter()
        .enumerate()
        .map(|(i, row)| {
            let mut r = row.clone();
            r.extend((0..d).map(|j| if i == j { s.one() } else { s.zero() }));
            r
        })
        .collect();
    for c in 0..d {
        let Some(p) = (c..d).find(|&i| !s.is_zero(&work[i][c])) else {
            return Err(CertError::Matrix(cyclorb_matrix::MatrixError::Singular));
        };
        work.swap(c, p);
        let inverse = s.inv(&work[c][c])?;
        for x in work[c].iter_mut() {
            *x = s.mul(x, &inverse)?;
        }
        let pivot = work[c].clone();
        for (i, row) in work.iter_mut().enumerate() {
            if i == c || s.is_zero(&row[c]) {
                continue;
            }
            let f = row[c].clone();
            for (x, y) in row.iter_mut().zip(&pivot) {
                if !s.is_zero(y) {
                    *x = s.mul_sub(x, &f, y)?;
                }
            }
        }
    }
    Ok(work.into_iter().map(|row| row[d..].to_vec()).collect())
}

/// A basis of eigenvectors and their eigenvalues (`values[k]` belongs to `vectors[k]`).
pub(crate) struct Eigenbasis<E> {
    pub(crate) values: Vec<E>,
    pub(crate) vectors: Rows<E>,
}

/// An eigenbasis of `a` with eigenvalues taken from `candidates`, when `a` is diagonalisable
/// with all its eigenvalues among them; `None` otherwise.
pub(crate) fn eigenbasis<S: Scalars>(
    s: &S,
    a: &Rows<S::E>,
    candidates: &[S::E],
) -> Result<Option<Eigenbasis<S::E>>, CertError> {
    let d = a.len();
    let mut values = Vec::with_capacity(d);
    let mut vectors = Vec::with_capacity(d);
    for lambda in candidates {
        let mut system = Echelon::new(d);
        for (i, row) in a.iter().enumerate() {
            let mut shifted = row.clone();
            shifted[i] = s.mul_sub(&shifted[i], &s.one(), lambda)?;
            system.insert(s, shifted)?;
        }
        for v in system.nullspace(s)? {
            values.push(lambda.clone());
            vectors.push(v);
        }
        if vectors.len() >= d {
            break;
        }
    }
    Ok((vectors.len() == d).then_some(Eigenbasis { values, vectors }))
}
