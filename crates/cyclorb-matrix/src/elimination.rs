//! Exact Gauss–Jordan elimination over Q(ζ_n): reduced row echelon form, rank, nullspace,
//! linear solve and inverse.
//!
//! Elimination runs over the field itself (every entry stays a canonical element of
//! Q(ζ_n), so no expression swell hides in unreduced fractions). In each column the pivot is
//! the non-zero candidate of least *size* (non-zero coefficients, then bits of numerators
//! and denominator): units such as ±ζ^k are preferred, whose inverse is their conjugate
//! and whose row multiples do not grow. One field inversion per pivot; every other step is
//! a fused a − f·b with one reduction modulo Φ_n.

use cyclorb_field::{Cyc, CyclotomicField};

use crate::dense::Matrix;
use crate::error::MatrixError;

/// Rows after elimination and the pivot column of each of the first `pivots.len()` rows.
struct Reduced {
    rows: Vec<Vec<Cyc>>,
    pivots: Vec<usize>,
}

/// How far elimination goes.
#[derive(Clone, Copy, PartialEq, Eq)]
enum Sweep {
    /// Clear below each pivot only (row echelon form: enough for the rank).
    Below,
    /// Clear above and below (reduced row echelon form).
    Both,
}

/// A size measure of a candidate pivot: 4 per non-zero coefficient plus the bits of every
/// numerator and of the denominator. ±ζ^k (k < φ(n)) scores the minimum, 6.
fn pivot_cost(x: &Cyc) -> u64 {
    let bits = |v: u64| u64::from(64 - v.leading_zeros());
    match x.small_parts() {
        Some((num, den)) => {
            let nonzero = num.iter().filter(|c| **c != 0);
            nonzero.map(|c| 4 + bits(c.unsigned_abs())).sum::<u64>() + bits(den.unsigned_abs())
        }
        None => {
            let (num, den) = x.to_big_parts();
            let nonzero = num.iter().filter(|c| !num_traits::Zero::is_zero(*c));
            nonzero.map(|c| 4 + c.bits()).sum::<u64>() + den.bits()
        }
    }
}

/// x⁻¹, by conjugation when x = ±ζ^k is a single unit monomial, by field inversion otherwise.
fn pivot_inverse(field: &CyclotomicField, x: &Cyc) -> Result<Cyc, MatrixError> {
    if let Some((num, 1)) = x.small_parts() {
        let mut nonzero = num.iter().filter(|c| **c != 0);
        if let (Some(c), None) = (nonzero.next(), nonzero.next()) {
            if c.abs() == 1 {
                return Ok(field.conj(x));
            }
        }
    }
    Ok(field.inv(x)?)
}

/// Gauss–Jordan on `rows`, choosing pivots only in the columns `0..pivot_limit`.
/// Pivot rows are normalised to a leading 1.
fn eliminate(
    field: &CyclotomicField,
    mut rows: Vec<Vec<Cyc>>,
    pivot_limit: usize,
    sweep: Sweep,
) -> Result<Reduced, MatrixError> {
    let one = field.one();
    let mut pivots = Vec::new();
    for c in 0..pivot_limit {
        let r = pivots.len();
        let candidates = (r..rows.len()).filter(|&i| !rows[i][c].is_zero());
        let Some(best) = candidates.min_by_key(|&i| pivot_cost(&rows[i][c])) else {
            continue;
        };
        rows.swap(r, best);
        let mut pivot_row = std::mem::take(&mut rows[r]);
        let inverse = pivot_inverse(field, &pivot_row[c])?;
        for x in &mut pivot_row[c + 1..] {
            if !x.is_zero() {
                *x = field.mul(x, &inverse)?;
            }
        }
        pivot_row[c] = one.clone();
        let targets = match sweep {
            Sweep::Below => r + 1..rows.len(),
            Sweep::Both => 0..rows.len(),
        };
        for i in targets.filter(|&i| i != r) {
            let row = &mut rows[i];
            if row[c].is_zero() {
                continue;
            }
            let minus_f = field.neg(&row[c]);
            for (x, y) in row[c + 1..].iter_mut().zip(&pivot_row[c + 1..]) {
                if !y.is_zero() {
                    *x = field.dot([(&*x, &one), (&minus_f, y)])?;
                }
            }
            row[c] = field.zero();
        }
        rows[r] = pivot_row;
        pivots.push(c);
    }
    Ok(Reduced { rows, pivots })
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
        let reduced = eliminate(field, rows_of(self), self.cols(), Sweep::Both)?;
        let echelon = Matrix::from_parts(
            self.rows(),
            self.cols(),
            reduced.rows.into_iter().flatten().collect(),
        );
        Ok((echelon, reduced.pivots))
    }

    /// The rank of X over Q(ζ_n), exactly.
    pub fn rank(&self, field: &CyclotomicField) -> Result<usize, MatrixError> {
        let reduced = eliminate(field, rows_of(self), self.cols(), Sweep::Below)?;
        Ok(reduced.pivots.len())
    }

    /// A basis of the nullspace {x : X·x = 0}: one vector per non-pivot column f of the
    /// reduced row echelon form, with x_f = 1, x_g = 0 at the other free columns g and
    /// x_{p_r} = −R[r, f] at the pivot column p_r of row r. Its length is cols − rank.
    pub fn nullspace(&self, field: &CyclotomicField) -> Result<Vec<Vec<Cyc>>, MatrixError> {
        let (echelon, pivots) = self.reduced_row_echelon(field)?;
        let mut is_pivot = vec![false; self.cols()];
        for &p in &pivots {
            is_pivot[p] = true;
        }
        let free = (0..self.cols()).filter(|&f| !is_pivot[f]);
        Ok(free
            .map(|f| {
                let mut x = vec![field.zero(); self.cols()];
                x[f] = field.one();
                for (r, &p) in pivots.iter().enumerate() {
                    x[p] = field.neg(echelon.get(r, f));
                }
                x
            })
            .collect())
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
        let reduced = eliminate(field, augmented, n, Sweep::Both)?;
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
        let augmented = rows_of(self)
            .into_iter()
            .enumerate()
            .map(|(i, mut row)| {
                row.extend((0..n).map(|j| if i == j { field.one() } else { field.zero() }));
                row
            })
            .collect();
        let reduced = eliminate(field, augmented, n, Sweep::Both)?;
        if reduced.pivots.len() < n {
            return Err(MatrixError::Singular);
        }
        let data = reduced
            .rows
            .into_iter()
            .flat_map(|row| row.into_iter().skip(n));
        Ok(Matrix::from_parts(n, n, data.collect()))
    }
}
