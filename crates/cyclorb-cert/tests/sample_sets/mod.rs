//! Hand-built generator sets shared by the tests, with their sources.
#![allow(dead_code)]

use cyclorb_cert::ProvedGenerators;
use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::{LinearMap, Matrix, Operator};
use hashbrown::HashSet;

/// Parse an element of `f` (test data only).
pub fn el(f: &CyclotomicField, text: &str) -> Cyc {
    f.parse(text).unwrap()
}

/// A dense matrix from rows of element texts.
pub fn matrix(f: &CyclotomicField, rows: &[&[&str]]) -> Matrix {
    Matrix::from_rows(
        rows.iter()
            .map(|r| r.iter().map(|x| el(f, x)).collect())
            .collect(),
    )
    .unwrap()
}

/// Modular data (T, S) of a genus-1 theory and the pair of Dehn twists T and S·T·S⁻¹,
/// which generate the image of SL(2, Z) (T = [[1,1],[0,1]] and S·T·S⁻¹ = [[1,0],[−1,1]]
/// generate SL(2, Z): common practice).
pub struct ModularData {
    pub field: CyclotomicField,
    pub t: Vec<Cyc>,
    pub s: Matrix,
}

impl ModularData {
    /// The two twists as dense matrices.
    pub fn twists(&self) -> (Matrix, Matrix) {
        let f = &self.field;
        let t = Matrix::diagonal(f, &self.t);
        let s_inv = self.s.inverse(f).unwrap();
        let b = self.s.mul(f, &t).unwrap().mul(f, &s_inv).unwrap();
        (t, b)
    }

    /// The generator set {T (diagonal), B = S T S⁻¹ (dense)}.
    pub fn generators(&self) -> ProvedGenerators {
        let (_, b) = self.twists();
        ProvedGenerators::new(
            self.field.clone(),
            vec![
                ("T".into(), Operator::Diagonal(self.t.clone())),
                ("B".into(), Operator::Dense(b)),
            ],
            Some(vec![self.field.one(); self.t.len()]),
        )
        .unwrap()
    }
}

/// Ising: T = diag(1, ζ16, −1), S = ½[[1, √2, 1], [√2, 0, −√2], [1, −√2, 1]] over Q(ζ16)
/// (labels 1, σ, ψ; h = 0, 1/16, 1/2; Di Francesco–Mathieu–Sénéchal, ch. 10 and 17).
pub fn ising() -> ModularData {
    let f = CyclotomicField::new(16).unwrap();
    let t = vec![f.one(), f.zeta_pow(1), f.int(-1)];
    let s = matrix(
        &f,
        &[
            &["1/2", "sqrt(2)/2", "1/2"],
            &["sqrt(2)/2", "0", "-sqrt(2)/2"],
            &["1/2", "-sqrt(2)/2", "1/2"],
        ],
    );
    ModularData { field: f, t, s }
}

/// Fibonacci: T = diag(1, ζ5²), S = (1/√(2+φ))[[1, φ], [φ, −1]] over Q(ζ20), with
/// √(2+φ) = 2 sin(2π/5) = −i(ζ5 − ζ5⁴) (Fibonacci anyons; from memory, checked below by
/// S² = 1 and (S T)³ ∝ S² in the tests).
pub fn fibonacci() -> ModularData {
    let f = CyclotomicField::new(20).unwrap();
    let t = vec![f.one(), el(&f, "zeta(5)^2")];
    let norm = "(-i*(zeta(5) - zeta(5)^4))";
    let phi = "((1 + sqrt(5))/2)";
    let s = matrix(
        &f,
        &[
            &[&format!("1/{norm}"), &format!("{phi}/{norm}")],
            &[&format!("{phi}/{norm}"), &format!("-1/{norm}")],
        ],
    );
    ModularData { field: f, t, s }
}

/// The orbit of the line of `start` under the generators, breadth-first, lines
/// normalised by their first non-zero coordinate (a test-side orbit search).
pub fn line_orbit(gens: &ProvedGenerators, start: Vec<Cyc>, cap: usize) -> Vec<Vec<Cyc>> {
    let f = gens.field();
    let key = |v: &[Cyc]| -> Vec<Cyc> {
        let lead = v.iter().find(|x| !x.is_zero()).unwrap();
        let inv = f.inv(lead).unwrap();
        v.iter().map(|x| f.mul(x, &inv).unwrap()).collect()
    };
    let first = key(&start);
    let mut seen: HashSet<Vec<Cyc>> = HashSet::new();
    seen.insert(first.clone());
    let mut lines = vec![first];
    let mut next = 0;
    while next < lines.len() {
        let v = lines[next].clone();
        next += 1;
        for op in gens.operators() {
            let w = key(&op.apply(f, &v).unwrap());
            if seen.insert(w.clone()) {
                lines.push(w);
                assert!(lines.len() <= cap, "orbit larger than {cap}");
            }
        }
    }
    lines
}

/// The unit vector e_0 of length d.
pub fn vacuum(f: &CyclotomicField, d: usize) -> Vec<Cyc> {
    let mut v = vec![f.zero(); d];
    v[0] = f.one();
    v
}

/// A dense matrix with entries embedded from its own field into `target`.
pub fn embed(target: &CyclotomicField, m: &Matrix) -> Matrix {
    m.map(|x| target.embed(x)).unwrap()
}

/// The block-diagonal sum A ⊕ B.
pub fn direct_sum(f: &CyclotomicField, a: &Matrix, b: &Matrix) -> Matrix {
    let (p, q) = (a.rows(), b.rows());
    let mut m = Matrix::zeros(f, p + q, p + q);
    for i in 0..p {
        for j in 0..p {
            m.set(i, j, a.get(i, j).clone());
        }
    }
    for i in 0..q {
        for j in 0..q {
            m.set(p + i, p + j, b.get(i, j).clone());
        }
    }
    m
}
