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

use crate::numerators::Numerators;
use crate::poly::PolyKernel;
use crate::sparse::operator_rows;

/// E·X as a sparse integer matrix on Z^{dφ}, stored by columns (a source vector is sparse,
/// so the product walks the columns of its non-zero numerators only).
#[derive(Debug, Clone)]
pub(crate) struct CompiledOperator {
    col_start: Vec<u32>,
    rows: Vec<u32>,
    vals: Vec<i64>,
    /// max over rows of Σ |entry|: |(E·X)S| ≤ row_bound · max|S| coefficientwise.
    row_bound: u128,
}

/// Bytes a compiled operator holds per non-zero entry (a row index and a value).
pub(crate) const BYTES_PER_CELL: usize = 12;

impl CompiledOperator {
    /// Compile X; `None` when E or a numerator of E·X does not fit an `i64`, or when E·X has
    /// more than `max_cells` non-zero entries (the engine then applies this generator in
    /// exact `Cyc` arithmetic). Two passes over the entries of X, the first counting the
    /// entries of each column, the second writing them in place, so that nothing beyond
    /// the result (12 bytes an entry) is held.
    pub(crate) fn compile(
        field: &CyclotomicField,
        kernel: &PolyKernel,
        op: &Operator,
        max_cells: usize,
    ) -> Option<CompiledOperator> {
        let phi = kernel.degree();
        let rows = operator_rows(field, op);
        let size = rows.len() * phi;
        let mut lcd = BigInt::one();
        for (_, x) in rows.iter().flatten() {
            let (_, den) = x.to_big_parts();
            lcd = lcd.lcm(&den);
        }
        // the non-zero (t, s, value) of the multiplication matrix of (E·X)_ij
        let entries_of = |x: &cyclorb_field::Cyc| {
            let (num, den) = x.to_big_parts();
            let scale = &lcd / den;
            let scaled: Option<Vec<i64>> = num.iter().map(|c| (c * &scale).to_i64()).collect();
            kernel.mult_entries(&scaled?)
        };
        let mut col_start = vec![0u32; size + 1];
        let mut cells = 0usize;
        for row in &rows {
            for (j, x) in row {
                for (_, s, _) in entries_of(x)? {
                    col_start[j * phi + s + 1] += 1;
                    cells += 1;
                }
                if cells > max_cells {
                    return None;
                }
            }
        }
        u32::try_from(cells).ok()?;
        u32::try_from(size).ok()?;
        for col in 0..size {
            col_start[col + 1] += col_start[col];
        }
        // rows ascend within a column: i ascends, and t ascends within one entry
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
        Some(CompiledOperator {
            col_start,
            rows: row_index,
            vals,
            row_bound: row_sums.into_iter().max().unwrap_or(0),
        })
    }

    /// out += (E·X)·s (out starts at zero), setting bit r of `touched` for every row r
    /// written; or `false` (nothing written) when the bound row_bound·max|s| does not
    /// guarantee that every `i128` sum is exact.
    pub(crate) fn apply(&self, s: &Numerators, out: &mut [i128], touched: &mut [u64]) -> bool {
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

    #[test]
    fn the_compiled_form_is_e_times_x_and_a_cap_on_its_size_refuses_it() {
        let f = CyclotomicField::new(16).unwrap();
        let kernel = PolyKernel::new(&f);
        let phi = kernel.degree();
        let op = ising_s(&f);
        assert!(CompiledOperator::compile(&f, &kernel, &op, 0).is_none());
        let compiled = CompiledOperator::compile(&f, &kernel, &op, usize::MAX).unwrap();
        // v = (1 + ζ, 2, −ζ³) in numerators; E = 2 (the least common denominator of S)
        let mut s = Numerators::new(3 * phi);
        for (at, x) in [(0, 1), (1, 1), (phi, 2), (2 * phi + 3, -1)] {
            s.push(at, x);
        }
        let mut out = vec![0i128; 3 * phi];
        let mut touched = vec![0u64; (3 * phi).div_ceil(64)];
        assert!(compiled.apply(&s, &mut out, &mut touched));
        let v: Vec<Cyc> = ["1 + z", "2", "-z^3"]
            .iter()
            .map(|t| f.parse(t).unwrap())
            .collect();
        let exact = op.apply(&f, &v).unwrap();
        for (i, x) in exact.iter().enumerate() {
            let num: Vec<BigInt> = out[i * phi..(i + 1) * phi]
                .iter()
                .map(|&c| BigInt::from(c))
                .collect();
            let got = f.from_parts(&num, &BigInt::one()).unwrap();
            assert_eq!(got, f.mul(&f.int(2), x).unwrap(), "entry {i}");
        }
    }
}
