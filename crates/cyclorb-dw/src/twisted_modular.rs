//! The modular data of the twisted theory D^{ω_p}(Z_N), a pointed theory
//! (docs/dijkgraaf-witten.md, "The anyons as a metric group"; de Wild Propitius, PhD thesis,
//! Amsterdam 1995, ch. 3; Coste–Gannon–Ruelle 2000).
//!
//! The anyons are A = Z² / Λ, Λ spanned by (N, −2p) and (0, N), labelled (a, n) with a, n in
//! {0, …, N − 1} (flux a, charge n; one label per class of A). With q(a, n) = ζ_N^{an} ζ_{N²}^{pa²}
//! on Z² (constant on the classes):
//!
//! - T_(a,n) = θ(a, n) = ζ_{N²}^{N a n + p a²};
//! - S_(a,n),(a′,n′) = b((a, n), (a′, n′))⁻¹ / N with
//!   b(x, y) = q(x + y) / (q(x) q(y)) = ζ_{N²}^{N (a n′ + a′ n) + 2p a a′}
//!   (the convention S̃_xy = Σ_z N_{x*y}^z θ_z d_z / (θ_x θ_y) of docs/conventions.md, which for
//!   a pointed theory is θ_{y−x} / (θ_x θ_y) = b(x, y)⁻¹);
//! - fusion is addition in A: (a, n) + (a′, n′) = (a + a′, n + n′) when a + a′ < N, else
//!   (a + a′ − N, n + n′ + 2p) (subtracting (N, −2p) ∈ Λ), charges mod N;
//! - every anyon has dimension 1, D = N, and the Gauss sum Σ θ / D = e^{2πi c / 8}: it is
//!   computed exactly and must be 1 (c ≡ 0 mod 8, as for every Drinfeld centre).

use cyclorb_field::{Cyc, CyclotomicField};

use crate::error::DwError;
use crate::twisted::CyclicCocycle;

/// S, T and the fusion of D^{ω_p}(Z_N), exactly, over Q(ζ_{N²}).
pub struct TwistedModularData {
    /// Q(ζ_{N²}).
    pub field: CyclotomicField,
    /// The labels (flux a, charge n), a major.
    pub labels: Vec<(u32, u32)>,
    /// The exponents of ζ_{N²} of the twists θ, in label order.
    pub twist_exponents: Vec<u32>,
    /// The normalised S, rows and columns in label order.
    pub s: Vec<Vec<Cyc>>,
    /// The diagonal of T.
    pub t: Vec<Cyc>,
    /// c mod 8, from the Gauss sum (proved 0).
    pub central_charge_mod_8: u32,
}

fn err<E: std::fmt::Display>(e: E) -> DwError {
    DwError::Inconsistent(format!("twisted modular data: {e}"))
}

/// The label of the sum of two anyons in A.
pub fn fuse(cocycle: &CyclicCocycle, x: (u32, u32), y: (u32, u32)) -> (u32, u32) {
    let (n, p) = (cocycle.order(), cocycle.level());
    let a = x.0 + y.0;
    let charge = x.1 + y.1;
    if a < n {
        (a, charge % n)
    } else {
        (a - n, (charge + 2 * p) % n)
    }
}

/// The modular data of D^{ω_p}(Z_N); an error if the Gauss sum is not D (it always is).
pub fn twisted_modular_data(cocycle: &CyclicCocycle) -> Result<TwistedModularData, DwError> {
    let (n, p) = (cocycle.order() as u64, cocycle.level() as u64);
    let m = n * n;
    let field = CyclotomicField::new(m as u32).map_err(err)?;
    let labels: Vec<(u32, u32)> = (0..n as u32)
        .flat_map(|a| (0..n as u32).map(move |c| (a, c)))
        .collect();
    let twist_exponents: Vec<u32> = labels
        .iter()
        .map(|&(a, c)| ((n * a as u64 * c as u64 + p * (a as u64).pow(2)) % m) as u32)
        .collect();
    let t: Vec<Cyc> = twist_exponents
        .iter()
        .map(|&e| field.zeta_pow(i64::from(e)))
        .collect();
    let inverse_n = field.rational(1, n as i64).map_err(err)?;
    let mut s = Vec::with_capacity(labels.len());
    for &(a, c) in &labels {
        let mut row = Vec::with_capacity(labels.len());
        for &(a2, c2) in &labels {
            let (a, c, a2, c2) = (a as u64, c as u64, a2 as u64, c2 as u64);
            let e = (n * (a * c2 + a2 * c) + 2 * p * a * a2) % m;
            let b_inverse = field.zeta_pow(-(e as i64));
            row.push(field.mul(&b_inverse, &inverse_n).map_err(err)?);
        }
        s.push(row);
    }
    let mut gauss = field.zero();
    for x in &t {
        gauss = field.add(&gauss, x).map_err(err)?;
    }
    if gauss != field.rational(n as i64, 1).map_err(err)? {
        return Err(DwError::Inconsistent(format!(
            "the Gauss sum Σθ of D^ω_{p}(Z_{n}) is {gauss}, not D = {n}"
        )));
    }
    Ok(TwistedModularData {
        field,
        labels,
        twist_exponents,
        s,
        t,
        central_charge_mod_8: 0,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn product(f: &CyclotomicField, x: &[Vec<Cyc>], y: &[Vec<Cyc>]) -> Vec<Vec<Cyc>> {
        let k = x.len();
        (0..k)
            .map(|i| {
                (0..k)
                    .map(|j| {
                        let mut acc = f.zero();
                        for (l, row) in y.iter().enumerate() {
                            acc = f.add(&acc, &f.mul(&x[i][l], &row[j]).unwrap()).unwrap();
                        }
                        acc
                    })
                    .collect()
            })
            .collect()
    }

    #[test]
    fn double_semion_twists() {
        // the double semion: twists 1, 1, i, −i for (flux, charge) = (0,0), (0,1), (1,0),
        // (1,1) — the trivial boson, the charge, the semion and the anti-semion (Levin–Wen,
        // Phys. Rev. B 71 (2005); common practice)
        let md = twisted_modular_data(&CyclicCocycle::new(2, 1).unwrap()).unwrap();
        assert_eq!(md.twist_exponents, vec![0, 0, 1, 3]);
    }

    #[test]
    fn s_and_t_satisfy_the_modular_relations() {
        // S² = C (a permutation matrix, the charge conjugation) and (ST)³ = S² for c ≡ 0
        // (Bakalov–Kirillov, Lectures on Tensor Categories and Modular Functors, §3.1)
        for (n, p) in [(2, 1), (3, 1), (3, 2), (4, 1), (4, 3), (5, 2)] {
            let md = twisted_modular_data(&CyclicCocycle::new(n, p).unwrap()).unwrap();
            let f = &md.field;
            let k = md.labels.len();
            let s2 = product(f, &md.s, &md.s);
            for (i, row) in s2.iter().enumerate() {
                let dual = md
                    .labels
                    .iter()
                    .position(|&y| {
                        fuse(&CyclicCocycle::new(n, p).unwrap(), md.labels[i], y) == (0, 0)
                    })
                    .unwrap();
                for (j, x) in row.iter().enumerate() {
                    let expected = if j == dual { f.one() } else { f.zero() };
                    assert_eq!(*x, expected, "N = {n}, p = {p}: S² at ({i}, {j})");
                }
            }
            let st: Vec<Vec<Cyc>> = (0..k)
                .map(|i| {
                    (0..k)
                        .map(|j| f.mul(&md.s[i][j], &md.t[j]).unwrap())
                        .collect()
                })
                .collect();
            let st3 = product(f, &product(f, &st, &st), &st);
            assert_eq!(st3, s2, "N = {n}, p = {p}: (ST)³ = S²");
        }
    }
}
