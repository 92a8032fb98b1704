//! Exact Gauss–Jordan elimination over any [`ScalarField`] (Q(ζ_n) or F_p), written once:
//! batch elimination to (reduced) row echelon form for rank, nullspace, solve and inverse,
//! and the incremental [`Echelon`] (rows arrive one at a time; the rank and the nullspace
//! are read at any point), with square products and eigenbases on top.
//!
//! Over Q(ζ_n) elimination runs over the field itself (every entry stays a canonical
//! element, so no expression swell hides in unreduced fractions). In each column the batch
//! pivot is the non-zero candidate of least [`ScalarField::pivot_cost`] (for Q(ζ_n): units
//! such as ±ζ^k first, whose inverse is their conjugate and whose row multiples do not
//! grow). One inversion per pivot; every other step is a fused a + f·b.
//!
//! The nullspace basis is the same whatever the schedule: for each free (non-pivot)
//! column f the solution with x_f = 1 and 0 at the other free columns. The pivot columns
//! of any echelon form of a row space are its leading columns, so batch and incremental
//! elimination agree on them.

use cyclorb_field::{Cyc, CyclotomicField};

use crate::dense::Matrix;
use crate::error::MatrixError;
use crate::scalar_field::{Exact, ScalarField};

/// A matrix as its rows.
pub type Rows<E> = Vec<Vec<E>>;

/// Rows after elimination and the pivot column of each of the first `pivots.len()` rows.
pub(crate) struct Reduced<E> {
    pub(crate) rows: Rows<E>,
    pub(crate) pivots: Vec<usize>,
}

/// How far elimination goes.
#[derive(Clone, Copy, PartialEq, Eq)]
pub(crate) enum Sweep {
    /// Clear below each pivot only (row echelon form: enough for the rank).
    Below,
    /// Clear above and below (reduced row echelon form).
    Both,
}

/// Gauss–Jordan on `rows`, choosing pivots only in the columns `0..pivot_limit`.
/// Pivot rows are normalised to a leading 1.
pub(crate) fn eliminate<S: ScalarField>(
    s: &S,
    mut rows: Rows<S::E>,
    pivot_limit: usize,
    sweep: Sweep,
) -> Result<Reduced<S::E>, MatrixError> {
    let mut pivots = Vec::new();
    for c in 0..pivot_limit {
        let r = pivots.len();
        let candidates = (r..rows.len()).filter(|&i| !s.is_zero(&rows[i][c]));
        let Some(best) = candidates.min_by_key(|&i| s.pivot_cost(&rows[i][c])) else {
            continue;
        };
        rows.swap(r, best);
        let mut pivot_row = std::mem::take(&mut rows[r]);
        let inverse = s.inv(&pivot_row[c])?;
        for x in &mut pivot_row[c + 1..] {
            if !s.is_zero(x) {
                *x = s.mul(x, &inverse)?;
            }
        }
        pivot_row[c] = s.one();
        let targets = match sweep {
            Sweep::Below => r + 1..rows.len(),
            Sweep::Both => 0..rows.len(),
        };
        for i in targets.filter(|&i| i != r) {
            let row = &mut rows[i];
            if s.is_zero(&row[c]) {
                continue;
            }
            let minus_f = s.neg(&row[c]);
            for (x, y) in row[c + 1..].iter_mut().zip(&pivot_row[c + 1..]) {
                if !s.is_zero(y) {
                    *x = s.add_mul(x, &minus_f, y)?;
                }
            }
            row[c] = s.zero();
        }
        rows[r] = pivot_row;
        pivots.push(c);
    }
    Ok(Reduced { rows, pivots })
}

/// The nullspace basis read off a reduced row echelon form of `cols` columns.
pub(crate) fn nullspace_of_reduced<S: ScalarField>(
    s: &S,
    reduced: &Reduced<S::E>,
    cols: usize,
) -> Vec<Vec<S::E>> {
    let mut is_pivot = vec![false; cols];
    for &p in &reduced.pivots {
        is_pivot[p] = true;
    }
    (0..cols)
        .filter(|&f| !is_pivot[f])
        .map(|f| {
            let mut x = vec![s.zero(); cols];
            x[f] = s.one();
            for (row, &p) in reduced.rows.iter().zip(&reduced.pivots) {
                x[p] = s.neg(&row[f]);
            }
            x
        })
        .collect()
}

/// The row space of the rows inserted so far, in echelon form: each stored row has a 1 at
/// its pivot column and zeros at every column before it, and no two share a pivot. Used
/// where rows come one at a time and the work may stop early (a commutant bound stops at
/// nullity 1; a span stops when full).
pub struct Echelon<E> {
    cols: usize,
    rows: Vec<Vec<E>>,
    /// For each column, the stored row whose pivot it is.
    pivot_row: Vec<Option<usize>>,
}

impl<E: Clone> Echelon<E> {
    /// The empty row space of vectors of length `cols`.
    pub fn new(cols: usize) -> Echelon<E> {
        Echelon {
            cols,
            rows: Vec::new(),
            pivot_row: vec![None; cols],
        }
    }

    /// The rank of the inserted rows.
    pub fn rank(&self) -> usize {
        self.rows.len()
    }

    /// The nullity of the inserted rows: cols − rank.
    pub fn nullity(&self) -> usize {
        self.cols - self.rows.len()
    }

    /// Reduce `row` against the stored rows (columns in increasing order; a stored row is
    /// zero before its pivot, so earlier columns are never disturbed) and store the rest when
    /// it is non-zero. Returns whether the rank grew.
    pub fn insert<S: ScalarField<E = E>>(
        &mut self,
        s: &S,
        mut row: Vec<E>,
    ) -> Result<bool, MatrixError> {
        if row.len() != self.cols {
            return Err(MatrixError::Shape(format!(
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
                    let minus_f = s.neg(&row[c]);
                    let pivot = &self.rows[k];
                    for j in c..self.cols {
                        if !s.is_zero(&pivot[j]) {
                            row[j] = s.add_mul(&row[j], &minus_f, &pivot[j])?;
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
    pub fn nullspace<S: ScalarField<E = E>>(&self, s: &S) -> Result<Vec<Vec<E>>, MatrixError> {
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

/// The product a·b of square matrices of one size, as rows.
pub fn rows_mul<S: ScalarField>(
    s: &S,
    a: &Rows<S::E>,
    b: &Rows<S::E>,
) -> Result<Rows<S::E>, MatrixError> {
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

/// a⁻¹ of a square matrix given as rows, by Gauss–Jordan on [a | I];
/// [`MatrixError::Singular`] when a is singular.
pub fn rows_inverse<S: ScalarField>(s: &S, a: &Rows<S::E>) -> Result<Rows<S::E>, MatrixError> {
    let n = a.len();
    let augmented = a
        .iter()
        .enumerate()
        .map(|(i, row)| {
            let mut r = row.clone();
            r.extend((0..n).map(|j| if i == j { s.one() } else { s.zero() }));
            r
        })
        .collect();
    let reduced = eliminate(s, augmented, n, Sweep::Both)?;
    if reduced.pivots.len() < n {
        return Err(MatrixError::Singular);
    }
    Ok(reduced
        .rows
        .into_iter()
        .map(|row| row[n..].to_vec())
        .collect())
}

/// A basis of eigenvectors and their eigenvalues (`values[k]` belongs to `vectors[k]`).
pub struct Eigenbasis<E> {
    /// The eigenvalues.
    pub values: Vec<E>,
    /// The eigenvectors.
    pub vectors: Rows<E>,
}

/// An eigenbasis of `a` with eigenvalues taken from `candidates`, when `a` is diagonalisable
/// with all its eigenvalues among them; `None` otherwise.
pub fn eigenbasis<S: ScalarField>(
    s: &S,
    a: &Rows<S::E>,
    candidates: &[S::E],
) -> Result<Option<Eigenbasis<S::E>>, MatrixError> {
    let d = a.len();
    let mut values = Vec::with_capacity(d);
    let mut vectors = Vec::with_capacity(d);
    for lambda in candidates {
        let mut system = Echelon::new(d);
        let minus_lambda = s.neg(lambda);
        for (i, row) in a.iter().enumerate() {
            let mut shifted = row.clone();
            shifted[i] = s.add(&shifted[i], &minus_lambda)?;
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

fn rows_of(m: &Matrix) -> Vec<Vec<Cyc>> {
    (0..m.rows()).map(|i| m.row(i).to_vec()).collect()
}

impl Matrix {
    /// The reduced row echelon form R of X and its pivot columns (in increasing order):
    /// R = E·X for an invertible E, each pivot is 1 and the only non-zero entry of its column.
    pub fn reduced_row_echelon(
        &self,
        field: &CyclotomicField,
    ) -> Result<(Matrix, Vec<usize>), MatrixError> {
        let reduced = eliminate(&Exact::new(field), rows_of(self), self.cols(), Sweep::Both)?;
        let echelon = Matrix::from_parts(
            self.rows(),
            self.cols(),
            reduced.rows.into_iter().flatten().collect(),
        );
        Ok((echelon, reduced.pivots))
    }

    /// The rank of X over Q(ζ_n), exactly.
    pub fn rank(&self, field: &CyclotomicField) -> Result<usize, MatrixError> {
        let reduced = eliminate(&Exact::new(field), rows_of(self), self.cols(), Sweep::Below)?;
        Ok(reduced.pivots.len())
    }

    /// A basis of the nullspace {x : X·x = 0}: one vector per non-pivot column f of the
    /// reduced row echelon form, with x_f = 1, x_g = 0 at the other free columns g and
    /// x_{p_r} = −R[r, f] at the pivot column p_r of row r. Its length is cols − rank.
    pub fn nullspace(&self, field: &CyclotomicField) -> Result<Vec<Vec<Cyc>>, MatrixError> {
        let s = Exact::new(field);
        let reduced = eliminate(&s, rows_of(self), self.cols(), Sweep::Both)?;
        Ok(nullspace_of_reduced(&s, &reduced, self.cols()))
    }

    /// One solution x of X·x = b (free variables set to 0); [`MatrixError::Inconsistent`]
    /// when there is none.
    pub fn solve(&self, field: &CyclotomicField, b: &[Cyc]) -> Result<Vec<Cyc>, MatrixError> {
        if b.len() != self.rows() {
            return Err(MatrixError::Shape(format!(
                "{}×{} system with a right-hand side of length {}",
                self.rows(),
                self.cols(),
                b.len()
            )));
        }
        let n = self.cols();
        let augmented = rows_of(self)
            .into_iter()
            .zip(b)
            .map(|(mut row, x)| {
                row.push(x.clone());
                row
            })
            .collect();
        let reduced = eliminate(&Exact::new(field), augmented, n, Sweep::Both)?;
        let rank = reduced.pivots.len();
        if reduced.rows[rank..].iter().any(|row| !row[n].is_zero()) {
            return Err(MatrixError::Inconsistent);
        }
        let mut x = vec![field.zero(); n];
        for (row, &p) in reduced.rows.iter().zip(&reduced.pivots) {
            x[p] = row[n].clone();
        }
        Ok(x)
    }

    /// X⁻¹ by Gauss–Jordan on [X | I]; [`MatrixError::Singular`] when rank X < dim.
    pub fn inverse(&self, field: &CyclotomicField) -> Result<Matrix, MatrixError> {
        self.require_square("an inverse")?;
        let n = self.rows();
        let inverse = rows_inverse(&Exact::new(field), &rows_of(self))?;
        Ok(Matrix::from_parts(
            n,
            n,
            inverse.into_iter().flatten().collect(),
        ))
    }
}
