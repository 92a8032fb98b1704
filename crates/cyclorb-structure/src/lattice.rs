//! Subgroups of (Z/m)^d as integer lattices L with mZ^d ⊆ L ⊆ Z^d, in Hermite form.
//!
//! L is held by a triangular basis: row i has its first non-zero entry (the pivot p_i,
//! a divisor of m) in column i, and entries in [0, m) after it. It starts as m·I (the
//! trivial subgroup). Inserting v runs down the columns: at column i the pair (row_i, v)
//! is replaced through the unimodular matrix [[a, b], [v_i/g, −p_i/g]]
//! (g = gcd(p_i, v_i) = a·p_i + b·v_i), which makes g the new pivot and clears v_i, and v
//! moves on to column i + 1. Entries are reduced modulo m (adding m·e_j ∈ L changes nothing).
//!
//! Consequences used everywhere: |L/mZ^d| = Π_i m/p_i; reducing x column by column into
//! 0 ≤ x_i < p_i gives a canonical representative of x + L (two reduced vectors differing
//! by Σ c_i row_i have c_0 = 0 from the first column, then c_1 = 0, …), so membership is
//! "reduces to 0".

use num_bigint::BigUint;
use num_integer::Integer;

use crate::monomial::Monomial;
use crate::smith::invariant_factors;

/// A subgroup of (Z/m)^d.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ModLattice {
    modulus: u32,
    /// Row i: zeros before column i, the pivot p_i | m at column i, entries in [0, m) after.
    rows: Vec<Vec<i64>>,
}

impl ModLattice {
    /// The trivial subgroup of (Z/m)^d.
    pub fn new(dim: usize, modulus: u32) -> ModLattice {
        let m = i64::from(modulus);
        let rows = (0..dim)
            .map(|i| {
                let mut r = vec![0; dim];
                r[i] = m;
                r
            })
            .collect();
        ModLattice { modulus, rows }
    }

    /// d.
    pub fn dim(&self) -> usize {
        self.rows.len()
    }

    /// The canonical representative of v + L (entries of v are taken modulo m).
    pub fn reduce(&self, v: &[u32]) -> Vec<u32> {
        let m = i64::from(self.modulus);
        let mut x: Vec<i64> = v.iter().map(|&e| i64::from(e) % m).collect();
        for (i, row) in self.rows.iter().enumerate() {
            let q = x[i] / row[i];
            if q != 0 {
                for j in i..x.len() {
                    x[j] = (x[j] - q * row[j]).rem_euclid(m);
                }
            }
        }
        x.into_iter().map(|e| e as u32).collect()
    }

    /// Whether v (modulo m) lies in the subgroup.
    pub fn contains(&self, v: &[u32]) -> bool {
        self.reduce(v).iter().all(|&e| e == 0)
    }

    /// Add v to the generators; true when the subgroup grew.
    pub fn insert(&mut self, v: &[u32]) -> bool {
        let m = i64::from(self.modulus);
        let reduced = self.reduce(v);
        if reduced.iter().all(|&e| e == 0) {
            return false;
        }
        let mut x: Vec<i64> = reduced.into_iter().map(i64::from).collect();
        for i in 0..x.len() {
            if x[i] == 0 {
                continue;
            }
            let p = self.rows[i][i];
            let e = p.extended_gcd(&x[i]);
            let (g, a, b) = (e.gcd, e.x, e.y);
            let (s, t) = (x[i] / g, p / g);
            let row = &mut self.rows[i];
            for j in i..x.len() {
                let (r, v) = (row[j], x[j]);
                row[j] = (a * r + b * v).rem_euclid(m);
                x[j] = (s * r - t * v).rem_euclid(m);
            }
            row[i] = g;
        }
        true
    }

    /// |L/mZ^d| = Π m/p_i.
    pub fn order(&self) -> BigUint {
        let m = i64::from(self.modulus);
        self.rows
            .iter()
            .enumerate()
            .map(|(i, r)| BigUint::from((m / r[i]) as u64))
            .product()
    }

    /// The rows with pivot < m: together they generate the subgroup.
    pub fn generators(&self) -> Vec<Vec<u32>> {
        let m = i64::from(self.modulus);
        self.rows
            .iter()
            .enumerate()
            .filter(|(i, r)| r[*i] < m)
            .map(|(_, r)| r.iter().map(|&e| (e % m) as u32).collect())
            .collect()
    }

    /// The invariant factors of the group L/mZ^d (each divides the next; none equal 1).
    pub fn invariants(&self) -> Vec<u64> {
        let matrix: Vec<Vec<i64>> = self.rows.clone();
        invariant_factors(matrix, u64::from(self.modulus))
    }

    /// The scalar part: the order of {c ∈ Z/m : c·(1, …, 1) ∈ L} (m/c₀ for the least c₀ > 0
    /// in it).
    pub fn scalar_order(&self) -> u32 {
        let m = self.modulus;
        let d = self.dim();
        (1..=m)
            .filter(|c| m % c == 0)
            .find(|&c| self.contains(&vec![c % m; d]))
            .map_or(1, |c| m / c)
    }

    /// The smallest subgroup containing L that is stable under permuting coordinates by
    /// every `elements[k].perm` (x ↦ y with y_{π(i)} = x_i: conjugation of a diagonal
    /// matrix by a monomial one).
    pub fn close_under(&mut self, elements: &[Monomial]) {
        loop {
            let mut grew = false;
            for g in elements {
                for row in self.generators() {
                    let mut image = vec![0u32; row.len()];
                    for (i, &x) in row.iter().enumerate() {
                        image[g.perm[i] as usize] = x;
                    }
                    grew |= self.insert(&image);
                }
            }
            if !grew {
                return;
            }
        }
    }
}
