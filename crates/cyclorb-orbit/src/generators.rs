//! The input of an orbit computation: a named generator set over Q(ζ_n) with its invariant
//! form, and a seed vector.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::{LinearMap, Matrix, Operator};

use crate::error::OrbitError;

/// Generator matrices acting on Q(ζ_n)^dimension, with names, basis labels and the diagonal
/// invariant Hermitian form G (⟨u, v⟩_G = Σ_i conj(u_i) G_i v_i).
///
/// For a theory the generators are Dehn twists and every X satisfies X† G X = G; the orbit
/// engine itself accepts any invertible matrices (the Poincaré sum then reports that the form
/// is not invariant). Matrices act on columns: entry (i, j) is [new i, old j].
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct GeneratorSet {
    /// n of the field Q(ζ_n) holding every entry.
    pub conductor: u32,
    /// Dimension of the space the generators act on.
    pub dimension: usize,
    /// One name per generator (printed in words of elements).
    pub names: Vec<String>,
    /// The generators, in their sparse forms.
    pub operators: Vec<Operator>,
    /// One label per basis vector (may be empty: then `e0`, `e1`, … are used).
    pub basis_labels: Vec<String>,
    /// The diagonal of G; `None` means G = identity (an orthonormal basis).
    pub form: Option<Vec<Cyc>>,
    /// Where the generators come from (a theory spec), when known.
    pub theory: Option<String>,
    /// The genus of the surface, when the generators are Dehn twists.
    pub genus: Option<u32>,
}

impl GeneratorSet {
    /// The field context Q(ζ_n).
    pub fn field(&self) -> Result<CyclotomicField, OrbitError> {
        CyclotomicField::new(self.conductor).map_err(|e| OrbitError::Invalid(e.to_string()))
    }

    /// Check shapes, names and fields: every operator valid and of size `dimension`, one
    /// unique non-empty name per operator, labels and form of the right length, every entry in
    /// Q(ζ_n), the form without zero entries.
    pub fn validate(&self) -> Result<(), OrbitError> {
        let bad = |s: String| Err(OrbitError::Invalid(s));
        if self.dimension == 0 {
            return bad("dimension 0".into());
        }
        if self.names.len() != self.operators.len() {
            return bad(format!(
                "{} names for {} generators",
                self.names.len(),
                self.operators.len()
            ));
        }
        if self.operators.is_empty() {
            return bad("no generators".into());
        }
        if self.operators.len() >= u16::MAX as usize {
            return bad(format!(
                "{} generators (at most 65534)",
                self.operators.len()
            ));
        }
        for (i, name) in self.names.iter().enumerate() {
            if name.is_empty() || self.names[..i].contains(name) {
                return bad(format!("generator {i}: empty or repeated name {name:?}"));
            }
        }
        if !self.basis_labels.is_empty() && self.basis_labels.len() != self.dimension {
            return bad(format!(
                "{} basis labels for dimension {}",
                self.basis_labels.len(),
                self.dimension
            ));
        }
        let n = self.conductor;
        let in_field = |x: &Cyc| x.conductor() == n;
        if let Some(form) = &self.form {
            if form.len() != self.dimension {
                return bad(format!(
                    "form of length {} for dimension {}",
                    form.len(),
                    self.dimension
                ));
            }
            if let Some(i) = form.iter().position(|x| x.is_zero() || !in_field(x)) {
                return bad(format!("form entry {i} is zero or not in Q(ζ_{n})"));
            }
        }
        for (name, op) in self.names.iter().zip(&self.operators) {
            op.validate()
                .map_err(|e| OrbitError::Invalid(format!("generator {name}: {e}")))?;
            if op.dim() != self.dimension {
                return bad(format!(
                    "generator {name} has size {} for dimension {}",
                    op.dim(),
                    self.dimension
                ));
            }
            if !operator_entries(op).all(in_field) {
                return bad(format!("generator {name} has an entry outside Q(ζ_{n})"));
            }
        }
        Ok(())
    }

    /// The diagonal of G (all ones when no form is given).
    pub fn form_diagonal(&self, field: &CyclotomicField) -> Vec<Cyc> {
        match &self.form {
            Some(g) => g.clone(),
            None => vec![field.one(); self.dimension],
        }
    }

    /// G as a dense diagonal matrix.
    pub fn form_matrix(&self, field: &CyclotomicField) -> Matrix {
        Matrix::diagonal(field, &self.form_diagonal(field))
    }

    /// The index of the first generator with X† G X ≠ G, or `None` when every generator
    /// preserves the form (checked exactly, column by column).
    pub fn first_non_unitary(&self, field: &CyclotomicField) -> Result<Option<usize>, OrbitError> {
        let g = self.form_matrix(field);
        for (i, op) in self.operators.iter().enumerate() {
            if !op.preserves_form(field, &g)? {
                return Ok(Some(i));
            }
        }
        Ok(None)
    }

    /// The label of basis vector i.
    pub fn label(&self, i: usize) -> String {
        self.basis_labels
            .get(i)
            .cloned()
            .unwrap_or_else(|| format!("e{i}"))
    }
}

/// Every stored entry of an operator (zeros included for dense forms).
fn operator_entries(op: &Operator) -> Box<dyn Iterator<Item = &Cyc> + '_> {
    match op {
        Operator::Dense(m) => Box::new(m.entries().iter()),
        Operator::Diagonal(d) => Box::new(d.iter()),
        Operator::BlockDiagonal { blocks, .. } => {
            Box::new(blocks.iter().flat_map(|b| b.matrix.entries().iter()))
        }
        Operator::SparseRows { rows, .. } => Box::new(rows.iter().flatten().map(|(_, x)| x)),
    }
}

/// A seed vector over Q(ζ_m); used in a field Q(ζ_n) with m | n.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Seed {
    /// m of the field Q(ζ_m) the entries were written in.
    pub conductor: u32,
    /// The coordinates.
    pub vector: Vec<Cyc>,
}

impl Seed {
    /// The basis vector e_index of Q(ζ_n)^dimension (e_0 is the vacuum of a comb basis).
    pub fn basis_vector(field: &CyclotomicField, dimension: usize, index: usize) -> Seed {
        let mut vector = vec![field.zero(); dimension];
        if let Some(x) = vector.get_mut(index) {
            *x = field.one();
        }
        Seed {
            conductor: field.conductor(),
            vector,
        }
    }

    /// The coordinates embedded in `field` (Q(ζ_m) ⊂ Q(ζ_n) needs m | n).
    pub fn in_field(&self, field: &CyclotomicField) -> Result<Vec<Cyc>, OrbitError> {
        self.vector
            .iter()
            .map(|x| {
                if x.conductor() == field.conductor() {
                    Ok(x.clone())
                } else {
                    field
                        .embed(x)
                        .map_err(|e| OrbitError::Invalid(format!("seed: {e}")))
                }
            })
            .collect()
    }
}
