//! Machine-integer kernels for Z[ζ_n] in the power basis 1, ζ, …, ζ^{φ−1}.
//!
//! An element with integer numerators a = Σ_u a_u ζ^u acts on Z[ζ_n] by multiplication; in
//! the power basis that is the φ×φ integer matrix M(a) with a·ζ^s = Σ_t M(a)[t][s] ζ^t,
//! M(a)[t][s] = Σ_u a_u · [ζ^t](ζ^{u+s} mod Φ_n). Complex conjugation ζ^s ↦ ζ^{−s} is the
//! integer matrix C with C[t][s] = [ζ^t](ζ^{−s} mod Φ_n). Products a·b of two coefficient
//! vectors before reduction have length 2φ − 1 and are folded with the same residues.
//!
//! Every routine here is exact: it either returns the correct integers or `None` when a
//! machine word would overflow, and the caller then uses exact `Cyc` arithmetic.
//!
//! The orbit engine compiles its generators with these maps (an entry a of a generator acts
//! on a key's coefficient vector by M(a)) and conjugates keys with C for the Poincaré sum.

use crate::context::CyclotomicField;
use num_bigint::BigInt;

/// The residues of ζ^e and the conjugation matrix, in sparse form.
#[derive(Debug, Clone)]
pub struct PolyKernel {
    n: usize,
    phi: usize,
    /// `residues[e]` = the non-zero (t, c) with ζ^e = Σ c ζ^t, for 0 ≤ e < n.
    residues: Vec<Vec<(usize, i64)>>,
    /// Column s of the conjugation matrix C: the non-zero (t, C[t][s]).
    conj_columns: Vec<Vec<(usize, i64)>>,
    /// max over t of Σ_s |C[t][s]|.
    conj_row_bound: u128,
}

impl PolyKernel {
    /// The kernel of a field context.
    pub fn new(field: &CyclotomicField) -> PolyKernel {
        let n = field.conductor() as usize;
        let phi = field.degree();
        let residues: Vec<Vec<(usize, i64)>> = (0..n.max(1))
            .map(|e| {
                field
                    .residue(e as i64)
                    .iter()
                    .enumerate()
                    .filter(|(_, c)| **c != 0)
                    .map(|(t, c)| (t, *c))
                    .collect()
            })
            .collect();
        // conj(ζ^s) = ζ^{n−s}
        let conj_columns: Vec<Vec<(usize, i64)>> = (0..phi)
            .map(|s| residues[(n - s % n.max(1)) % n.max(1)].clone())
            .collect();
        let mut row_sums = vec![0u128; phi];
        for &(t, c) in conj_columns.iter().flatten() {
            row_sums[t] += c.unsigned_abs() as u128;
        }
        let conj_row_bound = row_sums.into_iter().max().unwrap_or(0);
        PolyKernel {
            n: n.max(1),
            phi,
            residues,
            conj_columns,
            conj_row_bound,
        }
    }

    /// The degree φ(n).
    pub fn degree(&self) -> usize {
        self.phi
    }

    /// The residue of ζ^e (sparse), for any e ≥ 0.
    pub fn residue(&self, e: usize) -> &[(usize, i64)] {
        &self.residues[e % self.n]
    }

    /// The non-zero entries (t, s, M[t][s]) of the multiplication matrix of `a`, or `None`
    /// when an entry does not fit an `i64`.
    pub fn mult_entries(&self, a: &[i64]) -> Option<Vec<(usize, usize, i64)>> {
        let mut dense = vec![0i128; self.phi * self.phi];
        self.mult_matrix(a, &mut dense)?;
        let mut out = Vec::new();
        for t in 0..self.phi {
            for s in 0..self.phi {
                let c = dense[t * self.phi + s];
                if c != 0 {
                    out.push((t, s, i64::try_from(c).ok()?));
                }
            }
        }
        Some(out)
    }

    /// The dense multiplication matrix of `a` (row t, column s, row-major) into `out`
    /// (length φ²); `None` on `i128` overflow.
    pub fn mult_matrix(&self, a: &[i64], out: &mut [i128]) -> Option<()> {
        out.fill(0);
        for (u, &au) in a.iter().enumerate() {
            if au == 0 {
                continue;
            }
            for s in 0..self.phi {
                for &(t, r) in self.residue(u + s) {
                    let cell = &mut out[t * self.phi + s];
                    *cell = cell.checked_add((au as i128).checked_mul(r as i128)?)?;
                }
            }
        }
        Some(())
    }

    /// Column s of the conjugation matrix: conj(ζ^s) = Σ c·ζ^t over the returned (t, c).
    pub fn conj_column(&self, s: usize) -> &[(usize, i64)] {
        &self.conj_columns[s]
    }

    /// A bound on the coefficients of conj(a): max_t Σ_s |C[t][s]| · max|a|.
    pub fn conj_bound(&self, max_abs: u64) -> u128 {
        self.conj_row_bound.saturating_mul(max_abs as u128)
    }

    /// Fold an unreduced product (exponents 0..len) modulo Φ_n, exactly.
    pub fn fold_big(&self, wide: &[BigInt]) -> Vec<BigInt> {
        let mut low = vec![BigInt::from(0); self.phi];
        for (e, c) in wide.iter().enumerate() {
            if num_traits::Zero::is_zero(c) {
                continue;
            }
            for &(t, r) in self.residue(e) {
                low[t] += c * BigInt::from(r);
            }
        }
        low
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn multiplication_matrix_agrees_with_field_product() {
        for n in [3u32, 8, 12, 15, 16] {
            let f = CyclotomicField::new(n).unwrap();
            let k = PolyKernel::new(&f);
            let a = f.parse("3 - 2*z + z^2").unwrap();
            let b = f.parse("1 + 5*z^3 - z").unwrap();
            let (an, _) = a.small_parts().unwrap();
            let (bn, _) = b.small_parts().unwrap();
            let mut m = vec![0i128; k.degree() * k.degree()];
            k.mult_matrix(an, &mut m).unwrap();
            let prod: Vec<i128> = (0..k.degree())
                .map(|t| {
                    (0..k.degree())
                        .map(|s| m[t * k.degree() + s] * bn[s] as i128)
                        .sum()
                })
                .collect();
            let expect = f.mul(&a, &b).unwrap();
            let (en, _) = expect.small_parts().unwrap();
            let en: Vec<i128> = en.iter().map(|&c| c as i128).collect();
            assert_eq!(prod, en, "n={n}");
            let mut c = vec![0i64; k.degree()];
            for (s, &x) in an.iter().enumerate() {
                for &(t, m) in k.conj_column(s) {
                    c[t] += m * x;
                }
            }
            assert_eq!(c.as_slice(), f.conj(&a).small_parts().unwrap().0, "n={n}");
        }
    }
}
