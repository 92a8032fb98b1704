//! The linear algebra of the re-checks, written out plainly so that it shares no code with
//! the producers' solvers: row echelon form over F_p (rank) and the determinant over Q(ζ_n)
//! by Gaussian elimination. They stay apart from cyclorb-matrix's `Echelon` and elimination
//! on purpose: the commutant and structure claims are only as sound as this rank, and the
//! producers find their bases with cyclorb-matrix (only `pow_mod` is shared, from
//! cyclorb-field).
//!
//! Rank over F_p bounds the exact rank from below (a minor that vanishes exactly vanishes
//! mod p), so full rank mod p proves independence, and rank r mod p of a linear system in N
//! unknowns proves that its exact nullity is at most N − r.

use cyclorb_field::numtheory::pow_mod;
use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;

fn mul_mod(a: u64, b: u64, p: u64) -> u64 {
    ((u128::from(a) * u128::from(b)) % u128::from(p)) as u64
}

/// Rows in echelon form over F_p, added one at a time.
pub struct EchelonModP {
    p: u64,
    /// (pivot column, row scaled to pivot 1).
    rows: Vec<(usize, Vec<u64>)>,
}

impl EchelonModP {
    /// An empty echelon form over F_p.
    pub fn new(p: u64) -> EchelonModP {
        EchelonModP {
            p,
            rows: Vec::new(),
        }
    }

    /// The rank so far.
    pub fn rank(&self) -> usize {
        self.rows.len()
    }

    /// Reduce `row` by the rows held and keep it when it is independent of them.
    pub fn push(&mut self, mut row: Vec<u64>) {
        let p = self.p;
        for (pivot, r) in &self.rows {
            let c = row[*pivot];
            if c != 0 {
                for (x, y) in row.iter_mut().zip(r) {
                    *x = (*x + p - mul_mod(c, *y, p)) % p;
                }
            }
        }
        if let Some(pivot) = row.iter().position(|&x| x != 0) {
            let inverse = pow_mod(row[pivot], p - 2, p);
            for x in row.iter_mut() {
                *x = mul_mod(*x, inverse, p);
            }
            self.rows.push((pivot, row));
        }
    }
}

/// det(M) over Q(ζ_n) by Gaussian elimination (pivot: the first non-zero entry).
pub fn determinant(field: &CyclotomicField, m: &Matrix) -> Result<Cyc, String> {
    let n = m.rows();
    let mut a: Vec<Vec<Cyc>> = (0..n).map(|i| m.row(i).to_vec()).collect();
    let mut det = field.one();
    for col in 0..n {
        let Some(pivot) = (col..n).find(|&r| !a[r][col].is_zero()) else {
            return Ok(field.zero());
        };
        if pivot != col {
            a.swap(pivot, col);
            det = field.neg(&det);
        }
        det = field.mul(&det, &a[col][col]).map_err(|e| e.to_string())?;
        let inverse = field.inv(&a[col][col]).map_err(|e| e.to_string())?;
        for r in col + 1..n {
            if a[r][col].is_zero() {
                continue;
            }
            let factor = field.mul(&a[r][col], &inverse).map_err(|e| e.to_string())?;
            let (top, bottom) = a.split_at_mut(r);
            for (x, y) in bottom[0][col..].iter_mut().zip(&top[col][col..]) {
                let t = field.mul(&factor, y).map_err(|e| e.to_string())?;
                *x = field.sub(x, &t).map_err(|e| e.to_string())?;
            }
        }
    }
    Ok(det)
}
