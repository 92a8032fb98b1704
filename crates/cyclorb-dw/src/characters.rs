//! The irreducible characters of a subgroup H of G, exactly, by Dixon's method (Dixon,
//! Numer. Math. 10 (1967); Burnside's class-multiplication approach reduced modulo a prime).
//!
//! With classes C_1 = {1}, …, C_k of H and class-multiplication constants
//! a_{ijl} = #{x ∈ C_i : x⁻¹ z_l ∈ C_j} (z_l a fixed element of C_l), every irreducible χ
//! gives the central character ω_i = |C_i| χ(C_i) / χ(1), and ω_i ω_j = Σ_l a_{ijl} ω_l: the
//! vector ω is a common eigenvector of the matrices B_i = (a_{ijl})_{jl}. Modulo a prime
//! p ≡ 1 (mod e) (e the exponent of H) with p > 2|H|, the common eigenspaces of the B_i are
//! split by trying every eigenvalue in F_p; each one-dimensional space gives ω mod p. The
//! first orthogonality relation Σ_i |C_i| χ(C_i) χ(C_i⁻¹) = |H| gives
//! χ(1)² = |H| / Σ_i ω_i ω_{i*} / |C_i|, which determines χ(1) ≤ √|H| < p, and
//! χ(C_i) = χ(1) ω_i / |C_i|. Finally, for x ∈ C_i, ρ(x) has eigenvalues ζ_e^m with
//! multiplicities n_m = (1/e) Σ_{j<e} χ(x^j) ζ_e^{−jm}, integers in [0, χ(1)], found exactly
//! from their residues with ζ_e ↦ an element of order e in F_p; so χ(x) = Σ_m n_m ζ_e^m.
//! Checked: every space splits to dimension one, k characters, Σ_m n_m = χ(1) at every class,
//! Σ χ(1)² = |H|.

use crate::error::DwError;
use crate::group::{Element, FiniteGroup};

/// The largest number of classes whose character table is computed: the eigenvalue search
/// costs about k³·p operations with p > 2|H|, which stays near a second for k = 48 and
/// |H| ≤ 1024; larger tables are refused before anything is built.
pub const MAX_CLASSES: usize = 48;

/// The character table of a subgroup H of G.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CharacterTable {
    /// The exponent e of H: character values lie in Z[ζ_e].
    pub exponent: usize,
    /// The class of H of every element of G (`None` outside H); class 0 is {1}.
    pub class_of: Vec<Option<usize>>,
    /// The size of every class of H.
    pub class_sizes: Vec<usize>,
    /// One representative of every class of H.
    pub representatives: Vec<Element>,
    /// `values[χ][i][m]` = the multiplicity of ζ_e^m among the eigenvalues of ρ_χ on class i,
    /// so χ(C_i) = Σ_m values[χ][i][m] ζ_e^m. Sorted: by degree, then by these vectors; the
    /// trivial character first (vectors in decreasing order).
    pub values: Vec<Vec<Vec<u32>>>,
}

impl CharacterTable {
    /// The degree χ(1) of character `chi`.
    pub fn degree(&self, chi: usize) -> u32 {
        self.values[chi][0].iter().sum()
    }
}

fn pow_mod(mut b: u64, mut k: u64, p: u64) -> u64 {
    let mut r = 1;
    b %= p;
    while k > 0 {
        if k & 1 == 1 {
            r = r * b % p;
        }
        b = b * b % p;
        k >>= 1;
    }
    r
}

fn inv_mod(a: u64, p: u64) -> u64 {
    pow_mod(a, p - 2, p)
}

fn is_prime(n: u64) -> bool {
    n >= 2 && (2..).take_while(|d| d * d <= n).all(|d| n % d != 0)
}

fn gcd(a: usize, b: usize) -> usize {
    if b == 0 {
        a
    } else {
        gcd(b, a % b)
    }
}

/// An element of multiplicative order exactly e in F_p (e | p − 1).
fn root_of_unity(e: u64, p: u64) -> Option<u64> {
    let factors: Vec<u64> = (2..=e).filter(|&q| e % q == 0 && is_prime(q)).collect();
    (2..p)
        .map(|g| pow_mod(g, (p - 1) / e, p))
        .find(|&z| factors.iter().all(|&q| pow_mod(z, e / q, p) != 1))
        .or(if e == 1 { Some(1) } else { None })
}

/// A basis (as columns, each of length `rows`) of the nullspace of the `rows × cols` matrix m
/// over F_p.
fn nullspace(mut m: Vec<Vec<u64>>, cols: usize, p: u64) -> Vec<Vec<u64>> {
    let rows = m.len();
    let mut pivots = Vec::new();
    let mut r = 0;
    for c in 0..cols {
        let Some(pr) = (r..rows).find(|&i| m[i][c] != 0) else {
            continue;
        };
        m.swap(r, pr);
        let inv = inv_mod(m[r][c], p);
        for x in m[r].iter_mut() {
            *x = *x * inv % p;
        }
        let pivot_row = m[r].clone();
        for (i, row) in m.iter_mut().enumerate() {
            if i != r && row[c] != 0 {
                let f = row[c];
                for (x, y) in row.iter_mut().zip(&pivot_row) {
                    *x = (*x + (p - f) * y) % p;
                }
            }
        }
        pivots.push(c);
        r += 1;
    }
    (0..cols)
        .filter(|c| !pivots.contains(c))
        .map(|free| {
            let mut v = vec![0; cols];
            v[free] = 1;
            for (i, &pc) in pivots.iter().enumerate() {
                v[pc] = (p - m[i][free]) % p;
            }
            v
        })
        .collect()
}

/// The classes of H under conjugation by H, the identity class first.
fn classes_of(group: &FiniteGroup, subgroup: &[Element]) -> (Vec<Option<usize>>, Vec<Element>) {
    let mut class_of = vec![None; group.order()];
    let mut reps = Vec::new();
    for &x in subgroup {
        if class_of[x as usize].is_some() {
            continue;
        }
        let id = reps.len();
        reps.push(x);
        for &g in subgroup {
            class_of[group.conjugate(g, x) as usize] = Some(id);
        }
    }
    (class_of, reps)
}

/// The character table of the subgroup H (its elements; the identity first is not required).
pub fn character_table(
    group: &FiniteGroup,
    subgroup: &[Element],
) -> Result<CharacterTable, DwError> {
    let bad = |s: &str| DwError::Inconsistent(format!("character table: {s}"));
    let h = subgroup.len();
    if !subgroup.contains(&0) {
        return Err(bad("a subgroup without the identity"));
    }
    let mut sorted = subgroup.to_vec();
    sorted.sort_unstable();
    let (class_of, reps) = classes_of(group, &sorted);
    let k = reps.len();
    if k > MAX_CLASSES {
        return Err(DwError::TooLarge(format!(
            "a character table with {k} classes (at most {MAX_CLASSES})"
        )));
    }
    if class_of[0] != Some(0) {
        return Err(bad("the identity is not in the first class"));
    }
    let mut sizes = vec![0usize; k];
    for &x in &sorted {
        sizes[class_of[x as usize].ok_or_else(|| bad("class"))?] += 1;
    }
    let exponent = sorted
        .iter()
        .map(|&x| group.element_order(x))
        .fold(1, |a, o| a / gcd(a, o) * o);
    let e = exponent as u64;
    let p = (1..)
        .map(|t| t * e + 1)
        .find(|&q| q > 2 * h as u64 && is_prime(q))
        .ok_or_else(|| bad("no prime"))?;
    // B_i[j][l] = a_{ijl}
    let mut b = vec![vec![vec![0u64; k]; k]; k];
    for (l, &z) in reps.iter().enumerate() {
        for &x in &sorted {
            let i = class_of[x as usize].ok_or_else(|| bad("class"))?;
            let y = group.mul(group.inv(x), z);
            let j = class_of[y as usize].ok_or_else(|| bad("a subgroup not closed"))?;
            b[i][j][l] += 1;
        }
    }
    let mut spaces: Vec<Vec<Vec<u64>>> = vec![(0..k)
        .map(|c| (0..k).map(|r| u64::from(r == c)).collect())
        .collect()];
    for bi in &b {
        let mut next = Vec::new();
        for v in spaces {
            if v.len() == 1 {
                next.push(v);
                continue;
            }
            let mut found = 0;
            for lambda in 0..p {
                // W = (B_i − λ) V, rows = k, cols = dim V
                let w: Vec<Vec<u64>> = (0..k)
                    .map(|r| {
                        v.iter()
                            .map(|col| {
                                let s: u64 = (0..k).map(|l| bi[r][l] * col[l] % p).sum::<u64>();
                                (s % p + (p - lambda) * col[r]) % p
                            })
                            .collect()
                    })
                    .collect();
                let null = nullspace(w, v.len(), p);
                if null.is_empty() {
                    continue;
                }
                found += null.len();
                next.push(
                    null.iter()
                        .map(|n| {
                            (0..k)
                                .map(|r| {
                                    v.iter().zip(n).map(|(c, x)| c[r] * x % p).sum::<u64>() % p
                                })
                                .collect()
                        })
                        .collect(),
                );
                if found == v.len() {
                    break;
                }
            }
            if found != v.len() {
                return Err(bad("a class matrix is not diagonalisable modulo p"));
            }
        }
        spaces = next;
    }
    if spaces.len() != k || spaces.iter().any(|v| v.len() != 1) {
        return Err(bad("the common eigenspaces did not split into k lines"));
    }
    let inverse_class: Vec<usize> = reps
        .iter()
        .map(|&x| class_of[group.inv(x) as usize].ok_or_else(|| bad("class")))
        .collect::<Result<_, _>>()?;
    let zeta = root_of_unity(e, p).ok_or_else(|| bad("no root of unity"))?;
    let mut values = Vec::new();
    for v in &spaces {
        let w = &v[0];
        if w[0] == 0 {
            return Err(bad("a central character vanishes at 1"));
        }
        let w0 = inv_mod(w[0], p);
        let omega: Vec<u64> = w.iter().map(|x| x * w0 % p).collect();
        let s = (0..k).fold(0, |acc, i| {
            (acc + omega[i] * omega[inverse_class[i]] % p * inv_mod(sizes[i] as u64, p)) % p
        });
        if s == 0 {
            return Err(bad("a zero norm"));
        }
        let d2 = h as u64 % p * inv_mod(s, p) % p;
        let d = (1..=h as u64)
            .take_while(|d| d * d <= h as u64)
            .find(|d| d * d % p == d2)
            .ok_or_else(|| bad("no degree"))?;
        let chi: Vec<u64> = (0..k)
            .map(|i| d * omega[i] % p * inv_mod(sizes[i] as u64, p) % p)
            .collect();
        let inv_e = inv_mod(e, p);
        let mut rows = Vec::with_capacity(k);
        for &x in &reps {
            let mut powers = Vec::with_capacity(exponent);
            let mut y = 0;
            for _ in 0..exponent {
                powers.push(chi[class_of[y as usize].ok_or_else(|| bad("class"))?]);
                y = group.mul(y, x);
            }
            let mut row = Vec::with_capacity(exponent);
            for m in 0..e {
                let zinv = pow_mod(zeta, (e - m) % e, p);
                let mut acc = 0;
                let mut z = 1;
                for &c in &powers {
                    acc = (acc + c * z) % p;
                    z = z * zinv % p;
                }
                let n = acc * inv_e % p;
                if n > d {
                    return Err(bad("an eigenvalue multiplicity out of range"));
                }
                row.push(n as u32);
            }
            if row.iter().map(|&n| u64::from(n)).sum::<u64>() != d {
                return Err(bad("multiplicities do not add up to the degree"));
            }
            rows.push(row);
        }
        values.push(rows);
    }
    values.sort_by(|x, y| {
        x[0].iter()
            .sum::<u32>()
            .cmp(&y[0].iter().sum())
            .then(y.cmp(x))
    });
    let total: u64 = values
        .iter()
        .map(|c| u64::from(c[0].iter().sum::<u32>()).pow(2))
        .sum();
    if total != h as u64 {
        return Err(bad("the squares of the degrees do not add up to |H|"));
    }
    Ok(CharacterTable {
        exponent,
        class_of,
        class_sizes: sizes,
        representatives: reps,
        values,
    })
}
