//! A named set of generator matrices over Q(ζ_n), the one input type of the orbit engine and
//! the certificates, checked when it is built; and its proved form, which every certificate
//! requires.
//!
//! Two levels of trust:
//! - [`GeneratorSet`]: structurally valid (checked by [`GeneratorSet::new`] and the `with_`
//!   methods): at least one generator, distinct non-empty names, valid operators of one size
//!   with every entry in Q(ζ_n), basis labels and the diagonal form G of that size, G with
//!   non-zero real entries. Nothing is claimed about invertibility or invariance.
//! - [`ProvedGenerators`]: additionally every generator is proved invertible and, when G is
//!   given, X† G X = G is proved for every generator X, exactly ([`GeneratorSet::prove`]).
//!   Only [`GeneratorSet::prove`] builds one, so holding one is the proof.
//!
//! Matrices act on columns: entry (i, j) is [new i, old j]. Words of generators are lists of
//! indices read left to right as a matrix product: `[i₀, i₁, …, i_k]` stands for
//! A_{i₀}·A_{i₁}·…·A_{i_k}.

use std::ops::Deref;

use cyclorb_field::{Cyc, CyclotomicField, PrimeReduction};

use crate::error::MatrixError;
use crate::operator::{LinearMap, Operator};
use crate::Matrix;

/// Largest dimension of a general (neither diagonal, block-diagonal nor monomial) generator
/// whose invertibility is proved by dense elimination.
pub const MAX_DENSE_PROOF: usize = 512;

/// Primes p ≡ 1 (mod n) tried by the invertibility proof before the exact rank decides.
const INVERTIBILITY_PRIMES: usize = 3;

/// Most generators in one set (words store a generator in 16 bits, one value reserved).
const MAX_GENERATORS: usize = u16::MAX as usize - 1;

fn invalid(reason: String) -> MatrixError {
    MatrixError::Invalid(reason)
}

/// Generator matrices acting on Q(ζ_n)^dimension, with names, basis labels, the diagonal of
/// an invariant Hermitian form G (⟨u, v⟩_G = Σ_i conj(u_i) G_i v_i) and where they come from.
///
/// Built by [`GeneratorSet::new`] (the generators), then [`GeneratorSet::with_form`],
/// [`GeneratorSet::with_basis_labels`] and [`GeneratorSet::with_origin`]; each step checks
/// what it adds, so a value of this type is always structurally valid. For a theory the
/// generators are Dehn twists and G is the form of the block space.
#[derive(Debug, Clone)]
pub struct GeneratorSet {
    field: CyclotomicField,
    dimension: usize,
    names: Vec<String>,
    operators: Vec<Operator>,
    basis_labels: Vec<String>,
    form: Option<Vec<Cyc>>,
    theory: Option<String>,
    genus: Option<u32>,
}

impl PartialEq for GeneratorSet {
    fn eq(&self, other: &GeneratorSet) -> bool {
        self.field.conductor() == other.field.conductor()
            && self.dimension == other.dimension
            && self.names == other.names
            && self.operators == other.operators
            && self.basis_labels == other.basis_labels
            && self.form == other.form
            && self.theory == other.theory
            && self.genus == other.genus
    }
}

impl Eq for GeneratorSet {}

impl GeneratorSet {
    /// Check and hold the generators: at least one (and fewer than 65 535), distinct
    /// non-empty names, valid operators of one size with every entry in `field`.
    pub fn new(
        field: CyclotomicField,
        generators: Vec<(String, Operator)>,
    ) -> Result<GeneratorSet, MatrixError> {
        let Some(dimension) = generators.first().map(|(_, op)| op.dim()) else {
            return Err(invalid("no generators".into()));
        };
        if dimension == 0 {
            return Err(invalid("dimension 0".into()));
        }
        if generators.len() > MAX_GENERATORS {
            return Err(invalid(format!(
                "{} generators (at most {MAX_GENERATORS})",
                generators.len()
            )));
        }
        let n = field.conductor();
        let mut names: Vec<String> = Vec::with_capacity(generators.len());
        let mut operators = Vec::with_capacity(generators.len());
        for (i, (name, op)) in generators.into_iter().enumerate() {
            if name.is_empty() || names.contains(&name) {
                return Err(invalid(format!(
                    "generator {i}: empty or repeated name {name:?}"
                )));
            }
            op.validate()
                .map_err(|e| invalid(format!("generator {name}: {e}")))?;
            if op.dim() != dimension {
                return Err(invalid(format!(
                    "generator {name} has size {}, the first has size {dimension}",
                    op.dim()
                )));
            }
            if !stored_entries(&op).all(|x| x.conductor() == n) {
                return Err(invalid(format!(
                    "generator {name} has an entry outside Q(ζ_{n})"
                )));
            }
            names.push(name);
            operators.push(op);
        }
        Ok(GeneratorSet {
            field,
            dimension,
            names,
            operators,
            basis_labels: Vec::new(),
            form: None,
            theory: None,
            genus: None,
        })
    }

    /// The same set with the diagonal of its invariant form G (`None`: G = identity). The
    /// entries must be non-zero real elements of the field, one per coordinate; invariance
    /// itself is proved by [`GeneratorSet::prove`].
    pub fn with_form(mut self, form: Option<Vec<Cyc>>) -> Result<GeneratorSet, MatrixError> {
        if let Some(g) = &form {
            if g.len() != self.dimension {
                return Err(invalid(format!(
                    "the form has {} entries for generators of size {}",
                    g.len(),
                    self.dimension
                )));
            }
            let n = self.field.conductor();
            if let Some(i) = g
                .iter()
                .position(|x| x.is_zero() || x.conductor() != n || self.field.conj(x) != *x)
            {
                return Err(invalid(format!(
                    "form entry {i} is not a non-zero real element of Q(ζ_{n})"
                )));
            }
        }
        self.form = form;
        Ok(self)
    }

    /// The same set with one label per basis vector (empty: `e0`, `e1`, … are used).
    pub fn with_basis_labels(mut self, labels: Vec<String>) -> Result<GeneratorSet, MatrixError> {
        if !labels.is_empty() && labels.len() != self.dimension {
            return Err(invalid(format!(
                "{} basis labels for dimension {}",
                labels.len(),
                self.dimension
            )));
        }
        self.basis_labels = labels;
        Ok(self)
    }

    /// The same set recording where it comes from: a theory spec and the genus of the
    /// surface whose Dehn twists the generators are.
    pub fn with_origin(mut self, theory: Option<String>, genus: Option<u32>) -> GeneratorSet {
        self.theory = theory;
        self.genus = genus;
        self
    }

    /// The field Q(ζ_n) holding every entry.
    pub fn field(&self) -> &CyclotomicField {
        &self.field
    }

    /// n of the field Q(ζ_n).
    pub fn conductor(&self) -> u32 {
        self.field.conductor()
    }

    /// The dimension of the space the generators act on.
    pub fn dimension(&self) -> usize {
        self.dimension
    }

    /// The number of generators (at least one).
    pub fn len(&self) -> usize {
        self.names.len()
    }

    /// Never true (a set holds at least one generator); present for symmetry with `len`.
    pub fn is_empty(&self) -> bool {
        self.names.is_empty()
    }

    /// The generator names, in order.
    pub fn names(&self) -> &[String] {
        &self.names
    }

    /// The generators in their stored (possibly sparse) forms.
    pub fn operators(&self) -> &[Operator] {
        &self.operators
    }

    /// The basis labels as given (possibly empty; see [`GeneratorSet::label`]).
    pub fn basis_labels(&self) -> &[String] {
        &self.basis_labels
    }

    /// The diagonal of G, when one was given.
    pub fn form(&self) -> Option<&[Cyc]> {
        self.form.as_deref()
    }

    /// The theory spec the generators come from, when known.
    pub fn theory(&self) -> Option<&str> {
        self.theory.as_deref()
    }

    /// The genus of the surface, when the generators are its Dehn twists.
    pub fn genus(&self) -> Option<u32> {
        self.genus
    }

    /// The label of basis vector i.
    pub fn label(&self, i: usize) -> String {
        self.basis_labels
            .get(i)
            .cloned()
            .unwrap_or_else(|| format!("e{i}"))
    }

    /// The diagonal of G (all ones when no form is given).
    pub fn form_diagonal(&self) -> Vec<Cyc> {
        match &self.form {
            Some(g) => g.clone(),
            None => vec![self.field.one(); self.dimension],
        }
    }

    /// G as a dense diagonal matrix.
    pub fn form_matrix(&self) -> Matrix {
        Matrix::diagonal(&self.field, &self.form_diagonal())
    }

    /// The index of the first generator with X† G X ≠ G, or `None` when every generator
    /// preserves the form (checked exactly, column by column).
    pub fn first_non_unitary(&self) -> Result<Option<usize>, MatrixError> {
        let g = self.form_matrix();
        for (i, op) in self.operators.iter().enumerate() {
            if !op.preserves_form(&self.field, &g)? {
                return Ok(Some(i));
            }
        }
        Ok(None)
    }

    /// The index of the generator called `name`.
    pub fn index_of(&self, name: &str) -> Option<usize> {
        self.names.iter().position(|n| n == name)
    }

    /// The indices of the named generators; an error naming the first unknown name.
    pub fn indices_of(&self, word: &[String]) -> Result<Vec<usize>, MatrixError> {
        word.iter()
            .map(|name| {
                self.index_of(name)
                    .ok_or_else(|| invalid(format!("no generator called {name:?}")))
            })
            .collect()
    }

    /// The names of the generators in a word of indices.
    pub fn names_of(&self, word: &[usize]) -> Vec<String> {
        word.iter().map(|&i| self.names[i].clone()).collect()
    }

    /// Prove every generator invertible, exactly. Diagonal forms: no zero entry;
    /// block-diagonal forms: every block of full rank; sparse rows: a monomial matrix (one
    /// non-zero per row, in distinct columns) is invertible; any other form is densified
    /// (up to [`MAX_DENSE_PROOF`]) and shown of full rank modulo a prime p ≡ 1 (mod n)
    /// (a rank over F_p is a lower bound for the exact rank), or by its exact rank. The
    /// error names the first generator that is singular or beyond the proof's limit.
    pub fn prove_invertible(&self) -> Result<(), MatrixError> {
        self.names
            .iter()
            .zip(&self.operators)
            .try_for_each(|(name, op)| prove_operator_invertible(&self.field, op, name))
    }

    /// Prove the set: every generator invertible ([`GeneratorSet::prove_invertible`]) and,
    /// when a form G is given, X† G X = G for every generator X, exactly.
    pub fn prove(self) -> Result<ProvedGenerators, MatrixError> {
        self.prove_invertible()?;
        if self.form.is_some() {
            if let Some(i) = self.first_non_unitary()? {
                return Err(invalid(format!(
                    "generator {} does not preserve the form: X† G X ≠ G",
                    self.names[i]
                )));
            }
        }
        let dense = self
            .operators
            .iter()
            .map(|op| op.to_dense(&self.field))
            .collect();
        Ok(ProvedGenerators { set: self, dense })
    }
}

/// A [`GeneratorSet`] whose generators are proved invertible and, when it has a form,
/// form-preserving; with each generator also as a dense matrix. Built only by
/// [`GeneratorSet::prove`]; reads as the set it holds.
#[derive(Debug, Clone)]
pub struct ProvedGenerators {
    set: GeneratorSet,
    dense: Vec<Matrix>,
}

impl Deref for ProvedGenerators {
    type Target = GeneratorSet;
    fn deref(&self) -> &GeneratorSet {
        &self.set
    }
}

impl ProvedGenerators {
    /// Check, hold and prove in one step: [`GeneratorSet::new`], then the form, then
    /// [`GeneratorSet::prove`].
    pub fn new(
        field: CyclotomicField,
        generators: Vec<(String, Operator)>,
        form: Option<Vec<Cyc>>,
    ) -> Result<ProvedGenerators, MatrixError> {
        GeneratorSet::new(field, generators)?
            .with_form(form)?
            .prove()
    }

    /// The set that was proved.
    pub fn set(&self) -> &GeneratorSet {
        &self.set
    }

    /// Generator i as a dense matrix.
    pub fn dense(&self, i: usize) -> &Matrix {
        &self.dense[i]
    }

    /// The matrix A_{i₀}·A_{i₁}·…·A_{i_k} of a word of indices (the identity for the empty
    /// word); an error for an index that names no generator.
    pub fn word_matrix(&self, word: &[usize]) -> Result<Matrix, MatrixError> {
        let field = &self.set.field;
        let mut acc = Matrix::identity(field, self.set.dimension);
        for &i in word {
            let generator = self
                .dense
                .get(i)
                .ok_or_else(|| invalid(format!("no generator with index {i}")))?;
            acc = acc.mul(field, generator)?;
        }
        Ok(acc)
    }
}

/// Every stored entry of an operator (zeros included for dense forms).
fn stored_entries(op: &Operator) -> Box<dyn Iterator<Item = &Cyc> + '_> {
    match op {
        Operator::Dense(m) => Box::new(m.entries().iter()),
        Operator::Diagonal(d) => Box::new(d.iter()),
        Operator::BlockDiagonal { blocks, .. } => {
            Box::new(blocks.iter().flat_map(|b| b.matrix.entries().iter()))
        }
        Operator::SparseRows { rows, .. } => Box::new(rows.iter().flatten().map(|(_, x)| x)),
    }
}

fn is_monomial(rows: &[Vec<(usize, Cyc)>], dim: usize) -> bool {
    let mut used = vec![false; dim];
    rows.iter().all(|row| {
        let mut nonzero = row.iter().filter(|(_, x)| !x.is_zero());
        match (nonzero.next(), nonzero.next()) {
            (Some(&(j, _)), None) if j < dim && !used[j] => {
                used[j] = true;
                true
            }
            _ => false,
        }
    })
}

fn prove_operator_invertible(
    field: &CyclotomicField,
    op: &Operator,
    name: &str,
) -> Result<(), MatrixError> {
    match op {
        Operator::Diagonal(d) => match d.iter().position(Cyc::is_zero) {
            Some(i) => Err(invalid(format!(
                "generator {name} is singular: diagonal entry {i} is 0"
            ))),
            None => Ok(()),
        },
        Operator::BlockDiagonal { blocks, .. } => blocks
            .iter()
            .try_for_each(|b| prove_full_rank(field, &b.matrix, name)),
        Operator::SparseRows { dim, rows } if is_monomial(rows, *dim) => Ok(()),
        general if general.dim() > MAX_DENSE_PROOF => Err(invalid(format!(
            "generator {name}: invertibility of a general generator of dimension {} is not \
             proved (limit {MAX_DENSE_PROOF}); write it block-diagonal",
            general.dim()
        ))),
        general => prove_full_rank(field, &general.to_dense(field), name),
    }
}

/// Full rank modulo a prime proves invertibility (rank mod p ≤ exact rank); the exact rank
/// decides when no prime shows it.
fn prove_full_rank(field: &CyclotomicField, m: &Matrix, name: &str) -> Result<(), MatrixError> {
    for index in 0..INVERTIBILITY_PRIMES {
        let reduction = PrimeReduction::nth(field, index)?;
        match m.reduce_mod(&reduction) {
            Ok(mp) if mp.rank() == m.rows() => return Ok(()),
            Ok(_) | Err(MatrixError::Field(_)) => continue,
            Err(e) => return Err(e),
        }
    }
    let rank = m
        .rank(field)
        .map_err(|e| invalid(format!("generator {name}: {e}")))?;
    if rank == m.rows() {
        Ok(())
    } else {
        Err(invalid(format!(
            "generator {name} is singular: rank {rank} of {} (exact)",
            m.rows()
        )))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn q8() -> CyclotomicField {
        CyclotomicField::new(8).unwrap()
    }

    fn named(ops: Vec<Operator>) -> Vec<(String, Operator)> {
        ops.into_iter()
            .enumerate()
            .map(|(i, op)| (format!("X{i}"), op))
            .collect()
    }

    #[test]
    fn structural_errors_are_refused_with_the_reason() {
        let f = q8();
        let diag = |v: Vec<i64>| Operator::Diagonal(v.into_iter().map(|x| f.int(x)).collect());
        let err = |r: Result<GeneratorSet, MatrixError>| r.unwrap_err().to_string();
        assert!(err(GeneratorSet::new(f.clone(), vec![])).contains("no generators"));
        assert!(err(GeneratorSet::new(
            f.clone(),
            named(vec![diag(vec![1, 1]), diag(vec![1, 1, 1])])
        ))
        .contains("size 3"));
        let twice = vec![
            ("T".to_string(), diag(vec![1])),
            ("T".into(), diag(vec![2])),
        ];
        assert!(err(GeneratorSet::new(f.clone(), twice)).contains("repeated"));
        let q3 = CyclotomicField::new(3).unwrap();
        let foreign = Operator::Diagonal(vec![q3.zeta_pow(1)]);
        assert!(err(GeneratorSet::new(f.clone(), named(vec![foreign]))).contains("outside"));
        let set = GeneratorSet::new(f.clone(), named(vec![diag(vec![1, -1])])).unwrap();
        let i = f.zeta_pow(2);
        assert!(err(set.clone().with_form(Some(vec![f.one(), i]))).contains("form entry 1"));
        assert!(err(set.clone().with_form(Some(vec![f.one()]))).contains("1 entries"));
        assert!(err(set.with_basis_labels(vec!["a".into()])).contains("1 basis labels"));
    }

    #[test]
    fn proof_refuses_a_singular_generator_and_a_broken_form() {
        let f = q8();
        let singular =
            Matrix::from_rows(vec![vec![f.one(), f.int(2)], vec![f.int(2), f.int(4)]]).unwrap();
        let set = GeneratorSet::new(f.clone(), named(vec![Operator::Dense(singular)])).unwrap();
        assert!(set.prove().unwrap_err().to_string().contains("singular"));
        // diag(1, 2) is invertible but does not preserve the identity form
        let stretch = Operator::Diagonal(vec![f.one(), f.int(2)]);
        let set = GeneratorSet::new(f.clone(), named(vec![stretch])).unwrap();
        assert!(set.clone().prove().is_ok());
        let with_form = set.with_form(Some(vec![f.one(), f.one()])).unwrap();
        assert!(with_form
            .prove()
            .unwrap_err()
            .to_string()
            .contains("X† G X"));
    }

    #[test]
    fn words_multiply_left_to_right() {
        let f = q8();
        let swap =
            Matrix::from_rows(vec![vec![f.zero(), f.one()], vec![f.one(), f.zero()]]).unwrap();
        let twist = Matrix::diagonal(&f, &[f.one(), f.zeta_pow(1)]);
        let proved = ProvedGenerators::new(
            f.clone(),
            named(vec![
                Operator::Dense(swap.clone()),
                Operator::Dense(twist.clone()),
            ]),
            Some(vec![f.one(), f.one()]),
        )
        .unwrap();
        let product = proved.word_matrix(&[0, 1]).unwrap();
        assert_eq!(product, swap.mul(&f, &twist).unwrap());
        assert_ne!(product, twist.mul(&f, &swap).unwrap());
        assert_eq!(proved.names_of(&[1, 0]), vec!["X1", "X0"]);
        assert!(proved.word_matrix(&[2]).is_err());
    }
}
