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

use crate::poly::PolyKernel;
use crate::sparse::operator_rows;

/// E·X as a sparse integer matrix on Z^{dφ} (compressed rows).
#[derive(Debug, Clone)]
pub(crate) struct CompiledOperator {
    row_start: Vec<u32>,
    cols: Vec<u32>,
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
        let mut lcd = BigInt::one();
        for (_, x) in rows.iter().flatten() {
            let (_, den) = x.to_big_parts();
            lcd = lcd.lcm(&den);
        }
        let mut row_start = vec![0u32];
        let mut cols = Vec::new();
        let mut vals = Vec::new();
        let mut row_bound = 0u128;
        for row in &rows {
            // (t, column, value) for this block of φ integer rows
            let mut cells: Vec<(usize, u32, i64)> = Vec::new();
            for (j, x) in row {
                let (num, den) = x.to_big_parts();
                let scale = &lcd / den;
                let scaled: Option<Vec<i64>> = num.iter().map(|c| (c * &scale).to_i64()).collect();
                for (t, s, c) in kernel.mult_entries(&scaled?)? {
                    cells.push((t, u32::try_from(j * phi + s).ok()?, c));
                }
            }
            cells.sort_unstable_by_key(|&(t, col, _)| (t, col));
            let mut cursor = 0;
            for t in 0..phi {
                let mut sum = 0u128;
                while cursor < cells.len() && cells[cursor].0 == t {
                    let (_, col, c) = cells[cursor];
                    cols.push(col);
                    vals.push(c);
                    sum += c.unsigned_abs() as u128;
                    cursor += 1;
                }
                row_bound = row_bound.max(sum);
                row_start.push(u32::try_from(cols.len()).ok()?);
            }
        }
        Some(CompiledOperator {
            row_start,
            cols,
            vals,
            row_bound,
        })
    }

    /// out = (E·X)·s, or `false` (out untouched) when the bound row_bound·max|s| does not
    /// guarantee that every `i128` sum is exact.
    pub(crate) fn apply(&self, s: &[i64], s_max: u64, out: &mut [i128]) -> bool {
        match self.row_bound.checked_mul(s_max as u128) {
            Some(b) if b < (1u128 << 126) => {}
            _ => return false,
        }
        for (r, o) in out.iter_mut().enumerate() {
            let (a, b) = (self.row_start[r] as usize, self.row_start[r + 1] as usize);
            let mut acc = 0i128;
            for (&c, &v) in self.cols[a..b].iter().zip(&self.vals[a..b]) {
                acc += s[c as usize] as i128 * v as i128;
            }
            *o = acc;
        }
        true
    }
}
