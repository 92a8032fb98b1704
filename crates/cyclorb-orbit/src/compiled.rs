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

impl CompiledOperator {
    /// Compile X; `None` when E or a numerator of E·X does not fit an `i64` (the engine
    /// then applies this generator in exact `Cyc` arithmetic).
    pub(crate) fn compile(
        field: &CyclotomicField,
        kernel: &PolyKernel,
        op: &Operator,
    ) -> Option<CompiledOperator> {
        let phi = kernel.degree();
        let rows = operator_rows(field, op);
        let size = rows.len() * phi;
        let mut lcd = BigInt::one();
        for (_, x) in rows.iter().flatten() {
            let (_, den) = x.to_big_parts();
            lcd = lcd.lcm(&den);
        }
        // (column, row, value) of every non-zero integer entry
        let mut cells: Vec<(u32, u32, i64)> = Vec::new();
        let mut row_sums = vec![0u128; size];
        for (i, row) in rows.iter().enumerate() {
            for (j, x) in row {
                let (num, den) = x.to_big_parts();
                let scale = &lcd / den;
                let scaled: Option<Vec<i64>> = num.iter().map(|c| (c * &scale).to_i64()).collect();
                for (t, s, c) in kernel.mult_entries(&scaled?)? {
                    let (r, col) = (i * phi + t, j * phi + s);
                    cells.push((u32::try_from(col).ok()?, u32::try_from(r).ok()?, c));
                    row_sums[r] += c.unsigned_abs() as u128;
                }
            }
        }
        cells.sort_unstable_by_key(|&(col, r, _)| (col, r));
        let mut col_start = Vec::with_capacity(size + 1);
        col_start.push(0u32);
        let mut cursor = 0;
        for col in 0..size {
            while cursor < cells.len() && cells[cursor].0 as usize == col {
                cursor += 1;
            }
            col_start.push(u32::try_from(cursor).ok()?);
        }
        Some(CompiledOperator {
            col_start,
            rows: cells.iter().map(|c| c.1).collect(),
            vals: cells.iter().map(|c| c.2).collect(),
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
