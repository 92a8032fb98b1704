//! The Poincaré sum B = Σ over the orbit of v v†, exactly.
//!
//! For each line take the representative v of G-norm N = ⟨v₀, v₀⟩_G (every generator
//! preserves G, so every orbit vector has that norm; the phase of v does not matter in v v†).
//! With the key S = D·w of the line (w_k = 1) this is
//!
//!   v v† = N · S S† / ⟨S, S⟩_G,   ⟨S, S⟩_G = Σ_i G_i S_i conj(S_i),
//!
//! so D cancels. Writing G = G'/E with G' integral, ⟨S, S⟩_G = q/E with q ∈ Z[ζ_n], and
//! B = N·E·Σ_q (1/q)·A_q with A_q = Σ_{lines with this q} S S†. The sums A_q are kept as
//! unreduced integer products S_i·conj(S_j) (length 2φ − 1, `i64`, with a running bound) and
//! reduced, divided by q and added to B in `Cyc` arithmetic only when flushed; lines whose
//! numbers are too large for the bound go through `Cyc` arithmetic directly.
//!
//! Checks and reading of B: tr(B·G) = |orbit|·N always; B = λ·G⁻¹ (λ·I in an orthonormal
//! basis) is tested entry by entry, and when it fails B is decomposed over the invariant
//! matrices ([`crate::commutant`]).

use cyclorb_field::{Cyc, CyclotomicField, DotAccumulator, Rational};
use cyclorb_matrix::Matrix;
use hashbrown::HashMap;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive};

use crate::commutant::{decompose, Decomposition};
use crate::engine::Orbit;
use crate::error::OrbitError;
use crate::numerators::Numerators;
use crate::poly::PolyKernel;
use crate::problem::OrbitProblem;
use crate::store::StoredKey;

/// The Poincaré sum of a saturated orbit and what it says.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PoincareSum {
    /// B = Σ v v† (Hermitian), in the generators' basis.
    pub matrix: Matrix,
    /// N = ⟨v₀, v₀⟩_G of the seed.
    pub norm: Cyc,
    /// Number of lines summed.
    pub orbit_size: usize,
    /// Whether tr(B·G) = orbit size × N (it must hold; false reveals an error).
    pub trace_check: bool,
    /// λ when B = λ·G⁻¹.
    pub scalar: Option<Cyc>,
    /// When B is not scalar: B over a basis of the invariant matrices (`None` when the
    /// commutant was too large to compute).
    pub decomposition: Option<Decomposition>,
}

impl PoincareSum {
    /// λ as an exact rational, when B = λ·G⁻¹ and λ ∈ Q (always, for a rational seed norm:
    /// tr(B·G) = |orbit|·N forces λ = |orbit|·N/d).
    pub fn prefactor(&self) -> Option<Rational> {
        let (p, q) = self.scalar.as_ref()?.as_rational()?;
        Rational::new(p, q)
    }
}

/// Largest number of unknowns of the commutant system solved exactly.
const MAX_COMMUTANT_UNKNOWNS: usize = 400;
/// Distinct values of q kept as separate integer sums before flushing them, at most …
const MAX_OPEN_SUMS: usize = 256;
/// … and at most this many bytes of integer sums per thread.
const OPEN_SUM_BYTES: usize = 128 << 20;

/// The integer form of G: G = G'/E with G' integral.
struct IntegerForm {
    scale: Cyc,
    /// How ⟨S, S⟩_G is formed in machine words.
    entries: FormEntries,
}

enum FormEntries {
    /// G = identity: q = Σ_i S_i conj(S_i).
    Identity,
    /// Multiplication matrices of G'_i (φ×φ).
    Integral(Vec<Vec<i128>>),
    /// G' does not fit machine words: every line takes the `Cyc` route.
    TooLarge,
}

/// Unreduced sums S_i·conj(S_j) (i ≤ j, upper triangle in row order) for one value of q.
struct OpenSum {
    sums: Vec<i64>,
    bound: u128,
    /// When it was last added to (the least recently used sum is flushed first).
    last_used: u64,
}

/// One thread's share of B.
struct Partial<'a> {
    problem: &'a OrbitProblem,
    form: &'a IntegerForm,
    factor_numerator: Cyc,
    open: HashMap<Vec<i128>, OpenSum>,
    max_open: usize,
    clock: u64,
    /// Index of pair (i, i) in the upper triangle; pair (i, j) is at row_start[i] + j − i.
    row_start: Vec<usize>,
    /// Upper triangle of the exact part of B, row-major d×d (lower entries unused).
    exact: Vec<Cyc>,
    key: Numerators,
    conj: Vec<i64>,
    /// The non-zero blocks of the current key, with ranges into `s_list` and `c_list`.
    blocks: Vec<BlockEntries>,
    /// (position in block, value) of the non-zero coefficients of S_i and of conj(S_i).
    s_list: Vec<(usize, i64)>,
    c_list: Vec<(usize, i64)>,
    /// ⟨S, S⟩ scaled to integers (q) and scratch for computing it.
    q: Vec<i128>,
    product: Vec<i128>,
    folded: Vec<i128>,
}

/// One non-zero block of a key: its index and its coefficient ranges.
struct BlockEntries {
    block: usize,
    s: std::ops::Range<usize>,
    c: std::ops::Range<usize>,
}

impl OrbitProblem {
    /// B for a saturated orbit, with its checks and decomposition, computed on `threads`
    /// threads (the result does not depend on it). An error when the orbit is not saturated,
    /// when a generator does not preserve G (then B is not a sum over a group orbit of
    /// vectors of one norm), or when a line is isotropic for G.
    pub fn poincare_sum(&self, orbit: &Orbit, threads: usize) -> Result<PoincareSum, OrbitError> {
        if !orbit.is_saturated() {
            return Err(OrbitError::Invalid(
                "the Poincaré sum needs a saturated orbit".into(),
            ));
        }
        if let Some(g) = self.generators.first_non_unitary(&self.field)? {
            return Err(OrbitError::Invalid(format!(
                "generator {} does not preserve the invariant form (X†GX ≠ G)",
                self.generators.names[g]
            )));
        }
        let field = &self.field;
        let g = self.generators.form_diagonal(field);
        let norm = self.form_norm(&self.seed, &g)?;
        let b = self.sum_matrix(orbit, threads, &g, &norm, None)?;
        let d = self.dimension();
        let size = orbit.len();
        let trace = field.dot((0..d).map(|i| (b.get(i, i), &g[i])))?;
        let trace_check = trace == field.mul(&field.int(size as i64), &norm)?;
        let scalar = scalar_of(field, &b, &g)?;
        let decomposition = match scalar {
            Some(_) => None,
            None => decompose(field, &self.generators, &b, MAX_COMMUTANT_UNKNOWNS)?,
        };
        Ok(PoincareSum {
            matrix: b,
            norm,
            orbit_size: size,
            trace_check,
            scalar,
            decomposition,
        })
    }

    /// B = Σ v v† over the orbit, for the form diagonal `g` and seed norm `norm`;
    /// `max_open` overrides the number of integer sums kept open per thread (tests).
    fn sum_matrix(
        &self,
        orbit: &Orbit,
        threads: usize,
        g: &[Cyc],
        norm: &Cyc,
        max_open: Option<usize>,
    ) -> Result<Matrix, OrbitError> {
        let field = &self.field;
        let form = integer_form(field, &self.kernel, g)?;
        let factor_numerator = field.mul(norm, &form.scale)?;
        let d = self.dimension();
        let parts = split_range(orbit.len(), threads.max(1));
        let results: Vec<Result<Vec<Cyc>, OrbitError>> = std::thread::scope(|scope| {
            let handles: Vec<_> = parts
                .iter()
                .map(|range| {
                    let range = range.clone();
                    let form = &form;
                    let factor = factor_numerator.clone();
                    scope.spawn(move || {
                        let mut partial = Partial::new(self, form, factor);
                        if let Some(m) = max_open {
                            partial.max_open = m.max(1);
                        }
                        for index in range {
                            partial.add_line(orbit, index)?;
                        }
                        partial.finish()
                    })
                })
                .collect();
            handles
                .into_iter()
                .map(|h| {
                    h.join().unwrap_or_else(|_| {
                        Err(OrbitError::Invalid("a worker thread panicked".into()))
                    })
                })
                .collect()
        });
        let mut upper = vec![field.zero(); d * d];
        for part in results {
            for (acc, x) in upper.iter_mut().zip(part?) {
                if !x.is_zero() {
                    *acc = field.add(acc, &x)?;
                }
            }
        }
        let mut b = Matrix::zeros(field, d, d);
        for i in 0..d {
            for j in i..d {
                let x = &upper[i * d + j];
                b.set(i, j, x.clone());
                if i != j {
                    b.set(j, i, field.conj(x));
                }
            }
        }
        Ok(b)
    }

    /// ⟨v, v⟩_G = Σ_i G_i |v_i|².
    fn form_norm(&self, v: &[Cyc], g: &[Cyc]) -> Result<Cyc, OrbitError> {
        let field = &self.field;
        let mut acc = DotAccumulator::new(field);
        for (x, gi) in v.iter().zip(g) {
            if !x.is_zero() {
                acc.add_product(&field.mul(gi, x)?, &field.conj(x))?;
            }
        }
        Ok(acc.finish())
    }
}

/// λ when B = λ·G⁻¹, i.e. B is diagonal with B_ii·G_i = λ for every i.
fn scalar_of(field: &CyclotomicField, b: &Matrix, g: &[Cyc]) -> Result<Option<Cyc>, OrbitError> {
    let d = b.rows();
    for i in 0..d {
        for j in 0..d {
            if i != j && !b.get(i, j).is_zero() {
                return Ok(None);
            }
        }
    }
    let lambda = field.mul(b.get(0, 0), &g[0])?;
    for (i, gi) in g.iter().enumerate().skip(1) {
        if field.mul(b.get(i, i), gi)? != lambda {
            return Ok(None);
        }
    }
    Ok(Some(lambda))
}

fn integer_form(
    field: &CyclotomicField,
    kernel: &PolyKernel,
    g: &[Cyc],
) -> Result<IntegerForm, OrbitError> {
    if g.iter().all(Cyc::is_one) {
        return Ok(IntegerForm {
            scale: field.one(),
            entries: FormEntries::Identity,
        });
    }
    let lcd = g
        .iter()
        .fold(BigInt::one(), |acc, x| acc.lcm(&x.to_big_parts().1));
    let phi = kernel.degree();
    let scale = field.big_rational(&lcd, &BigInt::one())?;
    let mut entries = Vec::with_capacity(g.len());
    for x in g {
        let (num, den) = x.to_big_parts();
        let factor = &lcd / den;
        let scaled: Option<Vec<i64>> = num.iter().map(|c| (c * &factor).to_i64()).collect();
        let mut m = vec![0i128; phi * phi];
        match scaled.and_then(|s| kernel.mult_matrix(&s, &mut m)) {
            Some(()) => entries.push(m),
            None => {
                return Ok(IntegerForm {
                    scale,
                    entries: FormEntries::TooLarge,
                })
            }
        }
    }
    Ok(IntegerForm {
        scale,
        entries: FormEntries::Integral(entries),
    })
}

fn split_range(len: usize, parts: usize) -> Vec<std::ops::Range<usize>> {
    let parts = parts.clamp(1, len.max(1));
    (0..parts)
        .map(|p| len * p / parts..len * (p + 1) / parts)
        .collect()
}

impl<'a> Partial<'a> {
    fn new(problem: &'a OrbitProblem, form: &'a IntegerForm, factor_numerator: Cyc) -> Self {
        let d = problem.dimension();
        let len = problem.key_len();
        let pairs = d * (d + 1) / 2;
        let sum_bytes = pairs * (2 * problem.kernel.degree() - 1) * 8;
        let row_start = (0..d)
            .map(|i| i * d - i * i.saturating_sub(1) / 2)
            .collect();
        Partial {
            problem,
            form,
            factor_numerator,
            open: HashMap::new(),
            max_open: (OPEN_SUM_BYTES / sum_bytes.max(1)).clamp(1, MAX_OPEN_SUMS),
            clock: 0,
            row_start,
            exact: vec![problem.field.zero(); d * d],
            key: Numerators::new(len),
            conj: vec![0; len],
            blocks: Vec::new(),
            s_list: Vec::new(),
            c_list: Vec::new(),
            q: Vec::new(),
            product: Vec::new(),
            folded: Vec::new(),
        }
    }

    fn add_line(&mut self, orbit: &Orbit, index: usize) -> Result<(), OrbitError> {
        if let StoredKey::Big(_) = orbit.set.keys.get(index, &mut self.key) {
            return self.add_line_exact(orbit, index);
        }
        if !self.add_line_small(self.key.max)? {
            return self.add_line_exact(orbit, index);
        }
        Ok(())
    }

    /// The machine-word route; `false` when a bound fails (nothing was added then).
    fn add_line_small(&mut self, max: u64) -> Result<bool, OrbitError> {
        if matches!(self.form.entries, FormEntries::TooLarge) {
            return Ok(false);
        }
        let kernel = &self.problem.kernel;
        let phi = kernel.degree();
        let d = self.problem.dimension();
        let conj_max = kernel.conj_bound(max);
        let Some(term_bound) = (phi as u128)
            .checked_mul(max as u128)
            .and_then(|x| x.checked_mul(conj_max))
        else {
            return Ok(false);
        };
        if term_bound >= 1 << 60 {
            return Ok(false);
        }
        // non-zero blocks of S, and the non-zero coefficients of S_i and conj(S_i) by block
        self.blocks.clear();
        self.s_list.clear();
        self.c_list.clear();
        let mut cursor = 0;
        let nonzero = &self.key.nonzero;
        while cursor < nonzero.len() {
            let block = nonzero[cursor] as usize / phi;
            let s_start = self.s_list.len();
            while cursor < nonzero.len() && nonzero[cursor] as usize / phi == block {
                let at = nonzero[cursor] as usize;
                self.s_list.push((at % phi, self.key.dense[at]));
                cursor += 1;
            }
            let range = block * phi..(block + 1) * phi;
            if kernel
                .conj_into(
                    &self.key.dense[range.clone()],
                    &mut self.conj[range.clone()],
                )
                .is_none()
            {
                return Ok(false);
            }
            let c_start = self.c_list.len();
            for (t, &y) in self.conj[range].iter().enumerate() {
                if y != 0 {
                    self.c_list.push((t, y));
                }
            }
            self.blocks.push(BlockEntries {
                block,
                s: s_start..self.s_list.len(),
                c: c_start..self.c_list.len(),
            });
        }
        if self.form_value().is_none() {
            return Ok(false);
        }
        if self.q.iter().all(|&x| x == 0) {
            return Err(OrbitError::Invalid(
                "a line of the orbit is isotropic for the form (⟨w, w⟩_G = 0)".into(),
            ));
        }
        if !self.open.contains_key(self.q.as_slice()) && self.open.len() >= self.max_open {
            let oldest = self
                .open
                .iter()
                .min_by_key(|(_, sum)| sum.last_used)
                .map(|(key, _)| key.clone());
            if let Some(oldest) = oldest {
                self.flush(&oldest)?;
            }
        }
        self.clock += 1;
        let wide = 2 * phi - 1;
        let needs_flush = self
            .open
            .get(self.q.as_slice())
            .is_some_and(|s| s.bound.saturating_add(term_bound) >= 1 << 62);
        if needs_flush {
            let q = self.q.clone();
            self.flush(&q)?;
        }
        if !self.open.contains_key(self.q.as_slice()) {
            let pairs = d * (d + 1) / 2;
            let fresh = OpenSum {
                sums: vec![0; pairs * wide],
                bound: 0,
                last_used: 0,
            };
            self.open.insert(self.q.clone(), fresh);
        }
        let Some(entry) = self.open.get_mut(self.q.as_slice()) else {
            return Ok(false);
        };
        entry.bound += term_bound;
        entry.last_used = self.clock;
        for (a, bi) in self.blocks.iter().enumerate() {
            for bj in &self.blocks[a..] {
                let cell = self.row_start[bi.block] + bj.block - bi.block;
                let out = &mut entry.sums[cell * wide..(cell + 1) * wide];
                for &(s, x) in &self.s_list[bi.s.clone()] {
                    for &(t, y) in &self.c_list[bj.c.clone()] {
                        out[s + t] += x * y;
                    }
                }
            }
        }
        Ok(true)
    }

    /// q = Σ_i G'_i S_i conj(S_i) reduced mod Φ_n (checked; `None` on overflow).
    /// (into `self.q`).
    fn form_value(&mut self) -> Option<()> {
        let phi = self.problem.kernel.degree();
        let mut q = std::mem::take(&mut self.q);
        let mut product = std::mem::take(&mut self.product);
        let mut folded = std::mem::take(&mut self.folded);
        q.clear();
        q.resize(phi, 0);
        product.resize(2 * phi - 1, 0);
        folded.resize(phi, 0);
        let result = self.form_value_into(&mut q, &mut product, &mut folded);
        self.q = q;
        self.product = product;
        self.folded = folded;
        result
    }

    fn form_value_into(
        &self,
        q: &mut [i128],
        product: &mut [i128],
        folded: &mut [i128],
    ) -> Option<()> {
        let kernel = &self.problem.kernel;
        let phi = kernel.degree();
        for entries in &self.blocks {
            let i = entries.block;
            product.fill(0);
            for &(a, x) in &self.s_list[entries.s.clone()] {
                for &(b, y) in &self.c_list[entries.c.clone()] {
                    product[a + b] =
                        product[a + b].checked_add((x as i128).checked_mul(y as i128)?)?;
                }
            }
            folded.fill(0);
            for (e, &p) in product.iter().enumerate() {
                if p == 0 {
                    continue;
                }
                for &(t, r) in kernel.residue(e) {
                    folded[t] = folded[t].checked_add(p.checked_mul(r as i128)?)?;
                }
            }
            match &self.form.entries {
                FormEntries::TooLarge => return None,
                FormEntries::Identity => {
                    for (acc, x) in q.iter_mut().zip(folded.iter()) {
                        *acc = acc.checked_add(*x)?;
                    }
                }
                FormEntries::Integral(entries) => {
                    let m = &entries[i];
                    for (t, acc) in q.iter_mut().enumerate() {
                        for (u, x) in folded.iter().enumerate() {
                            *acc = acc.checked_add(m[t * phi + u].checked_mul(*x)?)?;
                        }
                    }
                }
            }
        }
        Some(())
    }

    /// Add (N·E/q)·A_q to the exact part and drop the integer sum.
    fn flush(&mut self, q: &[i128]) -> Result<(), OrbitError> {
        let Some(sum) = self.open.remove(q) else {
            return Ok(());
        };
        let field = &self.problem.field;
        let kernel = &self.problem.kernel;
        let one = BigInt::one();
        let q_big: Vec<BigInt> = q.iter().map(|&x| BigInt::from(x)).collect();
        let factor = field.div(&self.factor_numerator, &field.from_parts(&q_big, &one)?)?;
        let d = self.problem.dimension();
        let wide = 2 * kernel.degree() - 1;
        let mut chunks = sum.sums.chunks(wide);
        for i in 0..d {
            for j in i..d {
                let chunk = chunks.next().unwrap_or(&[]);
                if chunk.iter().all(|&x| x == 0) {
                    continue;
                }
                let big: Vec<BigInt> = chunk.iter().map(|&x| BigInt::from(x)).collect();
                let value = field.from_parts(&kernel.fold_big(&big), &one)?;
                let term = field.mul(&value, &factor)?;
                let acc = &mut self.exact[i * d + j];
                *acc = field.add(acc, &term)?;
            }
        }
        Ok(())
    }

    fn flush_all(&mut self) -> Result<(), OrbitError> {
        let keys: Vec<Vec<i128>> = self.open.keys().cloned().collect();
        for q in keys {
            self.flush(&q)?;
        }
        Ok(())
    }

    /// The `Cyc` route: c = N/⟨w, w⟩_G and B += c·w w† (upper triangle).
    fn add_line_exact(&mut self, orbit: &Orbit, index: usize) -> Result<(), OrbitError> {
        let problem = self.problem;
        let field = &problem.field;
        let w = problem.line(orbit, index)?;
        let g = problem.generators.form_diagonal(field);
        let wnorm = problem.form_norm(&w, &g)?;
        if wnorm.is_zero() {
            return Err(OrbitError::Invalid(
                "a line of the orbit is isotropic for the form (⟨w, w⟩_G = 0)".into(),
            ));
        }
        let norm = field.div(&self.factor_numerator, &self.form.scale)?;
        let c = field.div(&norm, &wnorm)?;
        let d = problem.dimension();
        let conj: Vec<Cyc> = w.iter().map(|x| field.conj(x)).collect();
        for (i, wi) in w.iter().enumerate() {
            if wi.is_zero() {
                continue;
            }
            let cw = field.mul(&c, wi)?;
            for (j, cj) in conj.iter().enumerate().skip(i) {
                if !cj.is_zero() {
                    let acc = &mut self.exact[i * d + j];
                    *acc = field.add(acc, &field.mul(&cw, cj)?)?;
                }
            }
        }
        Ok(())
    }

    fn finish(mut self) -> Result<Vec<Cyc>, OrbitError> {
        self.flush_all()?;
        Ok(self.exact)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::{OrbitOptions, Silent};
    use crate::generators::{GeneratorSet, Seed};
    use cyclorb_matrix::Operator;

    #[test]
    fn evicting_open_sums_does_not_change_b() {
        // Ising at genus 1 (Castro, Gaberdiel, Hartman, Maloney, Volpato, Phys. Rev. D 85
        // (2012) 024032: B = 8·I), with one open integer sum per thread so that every new
        // value of ⟨S, S⟩ evicts the previous one.
        let f = CyclotomicField::new(16).unwrap();
        let e = |t: &str| f.parse(t).unwrap();
        let s = Matrix::from_rows(vec![
            vec![e("1/2"), e("sqrt(2)/2"), e("1/2")],
            vec![e("sqrt(2)/2"), e("0"), e("-sqrt(2)/2")],
            vec![e("1/2"), e("-sqrt(2)/2"), e("1/2")],
        ])
        .unwrap();
        let generators = GeneratorSet {
            conductor: 16,
            dimension: 3,
            names: vec!["T".into(), "S".into()],
            operators: vec![
                Operator::Diagonal(vec![e("1"), e("z"), e("-1")]),
                Operator::Dense(s),
            ],
            basis_labels: Vec::new(),
            form: None,
            theory: None,
            genus: None,
        };
        let problem = OrbitProblem::new(generators, &Seed::basis_vector(&f, 3, 0)).unwrap();
        let orbit = problem
            .enumerate(&OrbitOptions::default(), &mut Silent)
            .unwrap();
        let g = vec![f.one(); 3];
        let norm = f.one();
        let roomy = problem.sum_matrix(&orbit, 1, &g, &norm, None).unwrap();
        let tight = problem.sum_matrix(&orbit, 2, &g, &norm, Some(1)).unwrap();
        assert_eq!(tight, roomy);
        assert_eq!(roomy, Matrix::identity(&f, 3).scale(&f, &f.int(8)).unwrap());
    }
}
