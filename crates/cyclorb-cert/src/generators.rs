//! The input of every certificate: a field, named invertible generators and optionally the
//! diagonal Hermitian form they preserve.
//!
//! Words are lists of generator indices read left to right as a matrix product:
//! the word `[i₀, i₁, …, i_k]` stands for A_{i₀}·A_{i₁}·…·A_{i_k}.

use cyclorb_field::{Cyc, CyclotomicField, PrimeReduction};
use cyclorb_matrix::{LinearMap, Matrix, MatrixError, Operator};

use crate::error::CertError;

/// Primes tried by the modular invertibility test before falling back to exact rank.
const INVERTIBILITY_PRIMES: usize = 3;

/// Named invertible square generators over one cyclotomic field Q(ζ_n), all of one size,
/// with an optional diagonal invariant Hermitian form G (every generator X satisfies
/// X† G X = G; checked at construction).
#[derive(Debug, Clone)]
pub struct GeneratorSet {
    field: CyclotomicField,
    names: Vec<String>,
    operators: Vec<Operator>,
    dense: Vec<Matrix>,
    form: Option<Vec<Cyc>>,
}

impl GeneratorSet {
    /// Refuse a certificate made over another field Q(ζ_n).
    pub(crate) fn require_conductor(&self, conductor: u32) -> Result<(), CertError> {
        let own = self.field().conductor();
        crate::error::require(conductor == own, || {
            format!("conductor {conductor} for generators over Q(ζ_{own})")
        })
    }

    /// Check and store the generators: at least one, distinct non-empty names, valid
    /// operators of one size with entries in `field`, each invertible (full rank modulo a
    /// prime p ≡ 1 mod n, or exactly); and, when given, a form of non-zero real diagonal
    /// entries preserved by every generator.
    pub fn new(
        field: CyclotomicField,
        generators: Vec<(String, Operator)>,
        form: Option<Vec<Cyc>>,
    ) -> Result<GeneratorSet, CertError> {
        let Some(dim) = generators.first().map(|(_, op)| op.dim()) else {
            return Err(CertError::Input("no generators".into()));
        };
        let mut names: Vec<String> = Vec::with_capacity(generators.len());
        let mut operators = Vec::with_capacity(generators.len());
        let mut dense = Vec::with_capacity(generators.len());
        for (name, op) in generators {
            if name.is_empty() || names.contains(&name) {
                return Err(CertError::Input(format!(
                    "generator names must be non-empty and distinct: {name:?}"
                )));
            }
            op.validate()?;
            if op.dim() != dim {
                return Err(CertError::Input(format!(
                    "generator {name} has size {}, the first has size {dim}",
                    op.dim()
                )));
            }
            let matrix = op.to_dense(&field);
            if let Some(x) = matrix
                .entries()
                .iter()
                .find(|x| x.conductor() != field.conductor())
            {
                return Err(CertError::Input(format!(
                    "generator {name} has an entry of Q(ζ_{}) in Q(ζ_{})",
                    x.conductor(),
                    field.conductor()
                )));
            }
            if !is_invertible(&field, &matrix)? {
                return Err(CertError::Input(format!("generator {name} is singular")));
            }
            names.push(name);
            operators.push(op);
            dense.push(matrix);
        }
        if let Some(g) = &form {
            check_form(&field, &names, &operators, g)?;
        }
        Ok(GeneratorSet {
            field,
            names,
            operators,
            dense,
            form,
        })
    }

    /// The field Q(ζ_n).
    pub fn field(&self) -> &CyclotomicField {
        &self.field
    }

    /// The size d of the matrices.
    pub fn dim(&self) -> usize {
        self.dense[0].rows()
    }

    /// The number of generators.
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

    /// Generator i as a dense matrix.
    pub fn dense(&self, i: usize) -> &Matrix {
        &self.dense[i]
    }

    /// The diagonal of the invariant form G, when one was given.
    pub fn form(&self) -> Option<&[Cyc]> {
        self.form.as_deref()
    }

    /// The index of the generator called `name`.
    pub fn index_of(&self, name: &str) -> Option<usize> {
        self.names.iter().position(|n| n == name)
    }

    /// The indices of the named generators; an error naming the first unknown name.
    pub fn indices_of(&self, word: &[String]) -> Result<Vec<usize>, CertError> {
        word.iter()
            .map(|name| {
                self.index_of(name)
                    .ok_or_else(|| CertError::Input(format!("no generator called {name:?}")))
            })
            .collect()
    }

    /// The names of the generators in a word of indices.
    pub fn names_of(&self, word: &[usize]) -> Vec<String> {
        word.iter().map(|&i| self.names[i].clone()).collect()
    }

    /// The matrix A_{i₀}·A_{i₁}·…·A_{i_k} of a word of indices (the identity for the empty word).
    pub fn word_matrix(&self, word: &[usize]) -> Result<Matrix, CertError> {
        let mut acc = Matrix::identity(&self.field, self.dim());
        for &i in word {
            let generator = self
                .dense
                .get(i)
                .ok_or_else(|| CertError::Input(format!("no generator with index {i}")))?;
            acc = acc.mul(&self.field, generator)?;
        }
        Ok(acc)
    }
}

/// Full rank modulo a prime proves invertibility (rank mod p ≤ exact rank); the exact rank
/// decides when no prime shows it.
fn is_invertible(field: &CyclotomicField, m: &Matrix) -> Result<bool, CertError> {
    for index in 0..INVERTIBILITY_PRIMES {
        let reduction = PrimeReduction::nth(field, index)?;
        match m.reduce_mod(&reduction) {
            Ok(mp) if mp.rank() == m.rows() => return Ok(true),
            Ok(_) | Err(MatrixError::Field(_)) => continue,
            Err(e) => return Err(e.into()),
        }
    }
    Ok(m.rank(field)? == m.rows())
}

fn check_form(
    field: &CyclotomicField,
    names: &[String],
    operators: &[Operator],
    g: &[Cyc],
) -> Result<(), CertError> {
    let dim = operators[0].dim();
    if g.len() != dim {
        return Err(CertError::Input(format!(
            "the form has {} entries for generators of size {dim}",
            g.len()
        )));
    }
    if g.iter()
        .any(|x| x.is_zero() || x.conductor() != field.conductor() || field.conj(x) != *x)
    {
        return Err(CertError::Input(
            "the form needs non-zero real entries of the field".into(),
        ));
    }
    let form = Matrix::diagonal(field, g);
    for (name, op) in names.iter().zip(operators) {
        if !op.preserves_form(field, &form)? {
            return Err(CertError::Input(format!(
                "generator {name} does not preserve the form: X† G X ≠ G"
            )));
        }
    }
    Ok(())
}
