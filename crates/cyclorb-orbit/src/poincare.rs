//! The Poincaré sum B = Σ over the orbit of v v†, exactly.
//!
//! For each line take the representative v of G-norm N = ⟨v₀, v₀⟩_G (every generator
//! preserves G, so every orbit vector has that norm; the phase of v does not matter in v v†).
//! With the key S = D·w of the line (w_k = 1) this is
//!
//!   v v† = N · S S† / ⟨S, S⟩_G,   ⟨S, S⟩_G = Σ_i G_i S_i conj(S_i),
//!
//! so D cancels. Writing G = G'/E with G' integral, ⟨S, S⟩_G = q/E with q ∈ Z[ζ_n], and
//! B = N·E·Σ_q (1/q)·A_q with A_q = Σ_{lines with this q} S S†, accumulated in machine
//! integers group by group (the `sum` module).
//!
//! Checks and reading of B: tr(B·G) = |orbit|·N always; B = λ·G⁻¹ (λ·I in an orthonormal
//! basis) is tested entry by entry, and when it fails B is decomposed over the invariant
//! matrices ([`crate::commutant`]).

use cyclorb_field::{Cyc, CyclotomicField, DotAccumulator, Rational};
use cyclorb_matrix::Matrix;

use crate::commutant::{decompose, Decomposition};
use crate::engine::Orbit;
use crate::error::OrbitError;
use crate::problem::OrbitProblem;
use crate::regenerate::layer_ranges;
use crate::set::LineStore;
use crate::sum::{sum_matrix, Tuning};

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
        self.check_unitary()?;
        let field = &self.field;
        let g = self.generators.form_diagonal();
        let norm = self.form_norm(&self.seed, &g)?;
        let b = match &orbit.set {
            LineStore::Memory(set) => {
                sum_matrix(self, &set.keys, threads, &g, &norm, Tuning::default())?
            }
            LineStore::Compact(_) => {
                // the lines again, layer by layer, each layer's part of B added exactly
                let mut b = Matrix::zeros(field, self.dimension(), self.dimension());
                let store = &orbit.set;
                let records = |i: usize| store.record(i);
                let ranges = layer_ranges(&orbit.layer_ends, orbit.len());
                let spill = match store {
                    LineStore::Compact(set) => set.spill_dir(),
                    LineStore::Memory(_) => None,
                };
                self.regenerate(&records, &ranges, threads, spill, |_, keys| {
                    let part = sum_matrix(self, keys, threads, &g, &norm, Tuning::default())?;
                    b = b.add(field, &part)?;
                    Ok(())
                })?;
                b
            }
        };
        self.conclude_sum(b, &g, norm, orbit.len())
    }

    /// An error naming the first generator that does not preserve G: then B is not a sum
    /// over a group orbit of vectors of one norm.
    pub(crate) fn check_unitary(&self) -> Result<(), OrbitError> {
        match self.generators.first_non_unitary()? {
            Some(g) => Err(OrbitError::Invalid(format!(
                "generator {} does not preserve the invariant form (X†GX ≠ G)",
                self.generators.names()[g]
            ))),
            None => Ok(()),
        }
    }

    /// The checks and the reading of B summed over `size` lines of G-norm `norm`: the
    /// trace check, λ when B = λ·G⁻¹, else the decomposition over the invariants.
    pub(crate) fn conclude_sum(
        &self,
        b: Matrix,
        g: &[Cyc],
        norm: Cyc,
        size: usize,
    ) -> Result<PoincareSum, OrbitError> {
        let field = &self.field;
        let d = self.dimension();
        let trace = field.dot((0..d).map(|i| (b.get(i, i), &g[i])))?;
        let trace_check = trace == field.mul(&field.int(size as i64), &norm)?;
        let scalar = scalar_of(field, &b, g)?;
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

    /// ⟨v, v⟩_G = Σ_i G_i |v_i|².
    pub(crate) fn form_norm(&self, v: &[Cyc], g: &[Cyc]) -> Result<Cyc, OrbitError> {
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

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::{OrbitOptions, Silent};
    use cyclorb_matrix::Operator;
    use cyclorb_matrix::{GeneratorSet, Seed};

    #[test]
    fn flushing_integer_sums_early_does_not_change_b() {
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
        let generators = GeneratorSet::new(
            f.clone(),
            vec![
                (
                    "T".into(),
                    Operator::Diagonal(vec![e("1"), e("z"), e("-1")]),
                ),
                ("S".into(), Operator::Dense(s)),
            ],
        )
        .unwrap();
        let problem = OrbitProblem::new(generators, &Seed::basis_vector(&f, 3, 0)).unwrap();
        let orbit = problem
            .enumerate(&OrbitOptions::default(), &mut Silent)
            .unwrap();
        let g = vec![f.one(); 3];
        let norm = f.one();
        let LineStore::Memory(set) = &orbit.set else {
            panic!("a memory orbit")
        };
        let roomy = sum_matrix(&problem, &set.keys, 1, &g, &norm, Tuning::default()).unwrap();
        let tight = Tuning {
            flush_every: Some(1),
            lines_per_pass: None,
        };
        let tight = sum_matrix(&problem, &set.keys, 2, &g, &norm, tight).unwrap();
        assert_eq!(tight, roomy);
        // the grouping redone in passes of 5 lines
        let passes = Tuning {
            flush_every: None,
            lines_per_pass: Some(5),
        };
        let passes = sum_matrix(&problem, &set.keys, 2, &g, &norm, passes).unwrap();
        assert_eq!(passes, roomy);
        assert_eq!(roomy, Matrix::identity(&f, 3).scale(&f, &f.int(8)).unwrap());
    }
}
