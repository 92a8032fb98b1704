//! A generator compiled to one integer matrix acting on numerator vectors.
//!
//! A vector of Q(ζ_n)^d with integer numerators S (d blocks of φ coefficients) is mapped by
//! X to X·S. With E the least common denominator of the entries of X, E·X has entries in
//! Z[ζ_n], and E·X acting on Z^{dφ} is an integer matrix whose row (i, t) collects, for every
//! entry x = (E·X)_{ij}, the row t of the multiplication matrix of x (see [`crate::poly`]).
//! Lines do not see the scalar E, so the orbit engine applies this integer matrix directly.

use cyclorb_field::CyclotomicField;
use cyclorb_matrix::Operator;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive};

use crate::sparse::operator_rows;
use crate::sparse_numerators::SparseNumerators;
use cyclorb_field::PolyKernel;

/// E·X acting on numerator vectors, in one of two forms (the same integers either way).
#[derive(Debug, Clone)]
pub(crate) enum CompiledOperator {
    /// The integer matrix on Z^{dφ}, by columns: fastest, φ² words per entry of X at most.
    Columns(ColumnForm),
    /// The entries of E·X as polynomials, multiplied with the source's blocks and folded
    /// modulo Φ_n row by row: φ words per entry of X, for when the matrix is too large.
    Polynomials(PolynomialForm),
}

/// E·X as a sparse integer matrix on Z^{dφ}, stored by columns (a source vector is sparse,
/// so the product walks the columns of its non-zero numerators only).
#[derive(Debug, Clone)]
pub(crate) struct ColumnForm {
    col_start: Vec<u32>,
    rows: Vec<u32>,
    vals: Vec<i64>,
    /// max over rows of Σ |entry|: |(E·X)S| ≤ row_bound · max|S| coefficientwise.
    row_bound: u128,
}

/// E·X by columns of blocks: for block column j, the rows i with (E·X)_ij ≠ 0 and the
/// non-zero coefficients (a, c) of (E·X)_ij = Σ_a c ζ^a; with the residues of ζ^e for
/// e < 2φ − 1 (the exponents of an unreduced product).
#[derive(Debug, Clone)]
pub(crate) struct PolynomialForm {
    phi: usize,
    dimension: usize,
    col_start: Vec<u32>,
    entry_row: Vec<u32>,
    term_start: Vec<u32>,
    terms: Vec<(u32, i64)>,
    residues: Vec<Vec<(usize, i64)>>,
    /// max over block rows i of Σ_j ‖(E·X)_ij‖₁, times max over t of Σ_e |[ζ^t] ζ^e|:
    /// every folded coefficient of (E·X)S is at most bound · max|S|, and so is every
    /// partial sum on the way.
    bound: u128,
}

/// The largest degree φ at which the matrix form is used. Measured on one core (user time
/// of `cyclorb orbit SPEC --genus G --limit N --threads 1`, matrix against polynomials):
/// Ising genus 3, φ = 8, 10⁶ lines: 11 s against 16 s; SU(2)_3 genus 2, φ = 16, 4·10⁵
/// lines: 5.2 s against 6.4 s; SU(2)_5 genus 2, φ = 24, 4·10⁵ lines: 25.1 s against
/// 23.7 s; M(11,5) genus 1, φ = 160, 4 320 lines: 6.7 s against 4.4 s (86 MB against 28 MB).
pub(crate) const MATRIX_FORM_MAX_DEGREE: usize = 20;

/// Bytes a compiled operator in matrix form holds per non-zero entry (a row index and a
/// value).
pub(crate) const BYTES_PER_CELL: usize = 12;

impl CompiledOperator {
    /// Compile X; `None` when E or a numerator of E·X does not fit an `i64` (the engine
    /// then applies this generator in exact `Cyc` arithmetic). The matrix form is chosen
    /// for φ ≤ [`MATRIX_FORM_MAX_DEGREE`] when its size bound (φ² entries for each non-zero
    /// entry of X) is at most `max_cells`, the polynomial form otherwise.
    pub(crate) fn compile(
        field: &CyclotomicField,
        kernel: &PolyKernel,
        op: &Operator,
        max_cells: usize,
    ) -> Option<CompiledOperator> {
        let phi = kernel.degree();
        let rows = operator_rows(field, op);
        let mut lcd = BigInt::one();
        for (_, x) in rows.iter().flatten() {
            let (_, den) = x.to_big_parts();
            lcd = lcd.lcm(&den);
        }
        // the numerators of (E·X)_ij
        let scaled_of = |x: &cyclorb_field::Cyc| -> Option<Vec<i64>> {
            let (num, den) = x.to_big_parts();
            let scale = &lcd / den;
            num.iter().map(|c| (c * &scale).to_i64()).collect()
        };
        let entries: usize = rows.iter().map(Vec::len).sum();
        if phi <= MATRIX_FORM_MAX_DEGREE && entries.saturating_mul(phi * phi) <= max_cells {
            ColumnForm::compile(kernel, &rows, scaled_of).map(CompiledOperator::Columns)
        } else {
            PolynomialForm::compile(kernel, &rows, scaled_of).map(CompiledOperator::Polynomials)
        }
    }

    /// out += (E·X)·s (out starts at zero), setting bit r of `touched` for every row r
    /// written; or `false` (nothing written) when the form's bound times max|s| does not
    /// guarantee that every `i128` sum is exact.
    pub(crate) fn apply(
        &self,
        s: &SparseNumerators,
        out: &mut [i128],
        touched: &mut [u64],
    ) -> bool {
        match self {
            CompiledOperator::Columns(form) => form.apply(s, out, touched),
            CompiledOperator::Polynomials(form) => form.apply(s, out, touched),
        }
    }
}

type Rows = [Vec<(usize, cyclorb_field::Cyc)>];

/// The non-zero coefficients (a, c) of a polynomial Σ_a c ζ^a.
type Terms = Vec<(u32, i64)>;

impl ColumnForm {
    /// Two passes over the entries of X, the first counting the entries of each column,
    /// the second writing them in place, so that nothing beyond the result is held.
    fn compile(
        kernel: &PolyKernel,
        rows: &Rows,
        scaled_of: impl Fn(&cyclorb_field::Cyc) -> Option<Vec<i64>>,
    ) -> Option<ColumnForm> {
        let phi = kernel.degree();
        let size = rows.len() * phi;
        let entries_of = |x| kernel.mult_entries(&scaled_of(x)?);
        let mut col_start = vec![0u32; size + 1];
        let mut cells = 0usize;
        for row in rows {
            for (j, x) in row {
                for (_, s, _) in entries_of(x)? {
                    col_start[j * phi + s + 1] += 1;
                    cells += 1;
                }
            }
        }
        u32::try_from(cells).ok()?;
        u32::try_from(size).ok()?;
        for col in 0..size {
            col_start[col + 1] += col_start[col];
        }
        let mut fill: Vec<u32> = col_start[..size].to_vec();
        let mut row_index = vec![0u32; cells];
        let mut vals = vec![0i64; cells];
        let mut row_sums = vec![0u128; size];
        for (i, row) in rows.iter().enumerate() {
            for (j, x) in row {
                for (t, s, c) in entries_of(x)? {
                    let (r, col) = (i * phi + t, j * phi + s);
                    let at = fill[col] as usize;
                    row_index[at] = r as u32;
                    vals[at] = c;
                    fill[col] += 1;
                    row_sums[r] += c.unsigned_abs() as u128;
                }
            }
        }
        Some(ColumnForm {
            col_start,
            rows: row_index,
            vals,
            row_bound: row_sums.into_iter().max().unwrap_or(0),
        })
    }

    fn apply(&self, s: &SparseNumerators, out: &mut [i128], touched: &mut [u64]) -> bool {
        match self.row_bound.checked_mul(s.max as u128) {
            Some(b) if b < (1u128 << 126) => {}
            _ => return false,
        }
        for &c in &s.nonzero {
            let x = s.dense[c as usize] as i128;
            let (a, b) = (
                self.col_start[c as usize] as usize,
                self.col_start[c as usize + 1] as usize,
            );
            for (&r, &v) in self.rows[a..b].iter().zip(&self.vals[a..b]) {
                out[r as usize] += v as i128 * x;
                touched[r as usize / 64] |= 1 << (r % 64);
            }
        }
        true
    }
}

thread_local! {
    /// The unreduced products of the polynomial form, d blocks of 2φ − 1, zero between uses,
    /// and which blocks are in use.
    static UNREDUCED: std::cell::RefCell<(Vec<i128>, Vec<bool>)> =
        const { std::cell::RefCell::new((Vec::new(), Vec::new())) };
}

impl PolynomialForm {
    fn compile(
        kernel: &PolyKernel,
        rows: &Rows,
        scaled_of: impl Fn(&cyclorb_field::Cyc) -> Option<Vec<i64>>,
    ) -> Option<PolynomialForm> {
        let phi = kernel.degree();
        let dimension = rows.len();
        // for each block column j: (i, the terms of (E·X)_ij)
        let mut columns: Vec<Vec<(u32, Terms)>> = vec![Vec::new(); dimension];
        let mut row_norms = vec![0u128; dimension];
        for (i, row) in rows.iter().enumerate() {
            for (j, x) in row {
                let terms: Vec<(u32, i64)> = (0u32..)
                    .zip(scaled_of(x)?)
                    .filter(|&(_, c)| c != 0)
                    .collect();
                row_norms[i] += terms
                    .iter()
                    .map(|t| t.1.unsigned_abs() as u128)
                    .sum::<u128>();
                columns[*j].push((u32::try_from(i).ok()?, terms));
            }
        }
        let wide = 2 * phi - 1;
        let residues: Vec<Vec<(usize, i64)>> =
            (0..wide).map(|e| kernel.residue(e).to_vec()).collect();
        let mut fold_sums = vec![0u128; phi];
        for &(t, r) in residues.iter().flatten() {
            fold_sums[t] += r.unsigned_abs() as u128;
        }
        let fold_bound = fold_sums.into_iter().max().unwrap_or(0);
        let bound = row_norms
            .into_iter()
            .max()
            .unwrap_or(0)
            .checked_mul(fold_bound)?;
        let mut col_start = vec![0u32];
        let (mut entry_row, mut term_start, mut terms) = (Vec::new(), vec![0u32], Vec::new());
        for column in columns {
            for (i, entry_terms) in column {
                entry_row.push(i);
                terms.extend(entry_terms);
                term_start.push(u32::try_from(terms.len()).ok()?);
            }
            col_start.push(u32::try_from(entry_row.len()).ok()?);
        }
        Some(PolynomialForm {
            phi,
            dimension,
            col_start,
            entry_row,
            term_start,
            terms,
            residues,
            bound,
        })
    }

    fn apply(&self, s: &SparseNumerators, out: &mut [i128], touched: &mut [u64]) -> bool {
        match self.bound.checked_mul(s.max as u128) {
            Some(b) if b < (1u128 << 126) => {}
            _ => return false,
        }
        let (phi, wide) = (self.phi, 2 * self.phi - 1);
        UNREDUCED.with(|cell| {
            let (unreduced, in_use) = &mut *cell.borrow_mut();
            unreduced.resize(self.dimension * wide, 0);
            in_use.resize(self.dimension, false);
            for &p in &s.nonzero {
                let (j, b) = (p as usize / phi, p as usize % phi);
                let x = s.dense[p as usize] as i128;
                let entries = self.col_start[j] as usize..self.col_start[j + 1] as usize;
                for k in entries {
                    let i = self.entry_row[k] as usize;
                    in_use[i] = true;
                    let product = &mut unreduced[i * wide + b..(i + 1) * wide];
                    let terms = self.term_start[k] as usize..self.term_start[k + 1] as usize;
                    for &(a, c) in &self.terms[terms] {
                        product[a as usize] += c as i128 * x;
                    }
                }
            }
            for i in 0..self.dimension {
                if !std::mem::take(&mut in_use[i]) {
                    continue;
                }
                for (e, u) in unreduced[i * wide..(i + 1) * wide].iter_mut().enumerate() {
                    let u = std::mem::take(u);
                    if u == 0 {
                        continue;
                    }
                    for &(t, r) in &self.residues[e] {
                        let at = i * phi + t;
                        out[at] += u * r as i128;
                        touched[at / 64] |= 1 << (at % 64);
                    }
                }
            }
        });
        true
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use cyclorb_field::Cyc;
    use cyclorb_matrix::{LinearMap, Matrix};

    /// The S-matrix of Ising in the basis 1, σ, ψ (common practice).
    fn ising_s(f: &CyclotomicField) -> Operator {
        let e = |t: &str| f.parse(t).unwrap();
        Operator::Dense(
            Matrix::from_rows(vec![
                vec![e("1/2"), e("sqrt(2)/2"), e("1/2")],
                vec![e("sqrt(2)/2"), e("0"), e("-sqrt(2)/2")],
                vec![e("1/2"), e("-sqrt(2)/2"), e("1/2")],
            ])
            .unwrap(),
        )
    }

    /// Both compiled forms of `op` (over `f`, dimension 3) applied to the vector with
    /// numerators (1 + ζ, 2, −ζ³) must give E·X·v, checked against exact arithmetic.
    fn both_forms_give_e_times_x(f: &CyclotomicField, op: &Operator, e: i64) {
        let kernel = PolyKernel::new(f);
        let phi = kernel.degree();
        // the matrix form without a cap, the polynomial form under a cap of no entries
        let matrix = CompiledOperator::compile(f, &kernel, op, usize::MAX).unwrap();
        let polynomial = CompiledOperator::compile(f, &kernel, op, 0).unwrap();
        assert!(matches!(matrix, CompiledOperator::Columns(_)));
        assert!(matches!(polynomial, CompiledOperator::Polynomials(_)));
        let mut s = SparseNumerators::new(3 * phi);
        for (at, x) in [(0, 1), (1, 1), (phi, 2), (2 * phi + 3, -1)] {
            s.push(at, x);
        }
        let v: Vec<Cyc> = ["1 + z", "2", "-z^3"]
            .iter()
            .map(|t| f.parse(t).unwrap())
            .collect();
        let exact = op.apply(f, &v).unwrap();
        for compiled in [matrix, polynomial] {
            let mut out = vec![0i128; 3 * phi];
            let mut touched = vec![0u64; (3 * phi).div_ceil(64)];
            assert!(compiled.apply(&s, &mut out, &mut touched));
            for (i, x) in exact.iter().enumerate() {
                let num: Vec<BigInt> = out[i * phi..(i + 1) * phi]
                    .iter()
                    .map(|&c| BigInt::from(c))
                    .collect();
                let got = f.from_parts(&num, &BigInt::one()).unwrap();
                assert_eq!(got, f.mul(&f.int(e), x).unwrap(), "entry {i}");
            }
        }
    }

    #[test]
    fn both_compiled_forms_are_e_times_x() {
        // Ising's S: E = 2, and Φ_16 = x⁸ + 1 folds ζ^e, e ≥ 8, with a sign
        let f = CyclotomicField::new(16).unwrap();
        both_forms_give_e_times_x(&f, &ising_s(&f), 2);
        // a matrix over Q(ζ_15), whose Φ_15 folds ζ^e into several powers: E = 6
        let f = CyclotomicField::new(15).unwrap();
        let e = |t: &str| f.parse(t).unwrap();
        let m = Matrix::from_rows(vec![
            vec![e("z + z^7"), e("1/3 - z^4"), e("0")],
            vec![e("0"), e("z^5/2"), e("2 - z^3 + z^6")],
            vec![e("-1"), e("z^2"), e("z^7 - z")],
        ])
        .unwrap();
        both_forms_give_e_times_x(&f, &Operator::Dense(m), 6);
    }
}
