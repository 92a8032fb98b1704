//! The serialisable form of a Poincaré sum: B by basis labels, its decomposition over the
//! invariant matrices, and at genus 1 the modular invariant it is.

use cyclorb_field::Cyc;
use cyclorb_matrix::Matrix;
use serde::{Deserialize, Serialize};

use crate::poincare::PoincareSum;
use cyclorb_matrix::GeneratorSet;

/// One non-zero entry of a matrix over the basis, keyed by the labels of its row and
/// column (for a theory: the comb-basis label tuples `a=(…) b=(…) x=(…)`).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct LabelledEntry {
    /// Label of the row.
    pub row: String,
    /// Label of the column.
    pub column: String,
    /// The exact value (text syntax of cyclorb elements).
    pub value: String,
    /// A floating-point approximation [re, im], for plotting only.
    pub approx: [f64; 2],
}

/// At genus 1 in an orthonormal comb basis (G = I): B read as the matrix M of the modular
/// invariant Z = Σ_ab M_ab χ_a χ̄_b, rows and columns named by the theory's labels (the
/// label a of the loop of the basis vector; docs/orbits.md).
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct ModularInvariantReport {
    /// The label of each row (and column), in basis order.
    pub labels: Vec<String>,
    /// M, row by row, exact.
    pub matrix: Vec<Vec<String>>,
}

/// One term of B over the invariant matrices.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct InvariantReport {
    /// The exact coefficient (text syntax of cyclorb elements; a rational such as `3/2`).
    pub coefficient: String,
    /// The invariant matrix, row by row, entries in text syntax.
    pub matrix: Vec<Vec<String>>,
    /// Its non-zero entries keyed by basis labels.
    pub entries: Vec<LabelledEntry>,
}

/// What the Poincaré sum says. Every field is `null` when the orbit is not saturated.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize, Default)]
pub struct PoincareReport {
    /// Whether B = λ·G⁻¹.
    pub is_scalar: Option<bool>,
    /// λ: an exact rational such as `384` (the text of a cyclotomic number in the rare case
    /// of an irrational seed norm).
    pub prefactor: Option<String>,
    /// N = ⟨v₀, v₀⟩_G of the seed.
    pub seed_norm: Option<String>,
    /// Whether tr(B·G) = orbit size × N.
    pub trace_check: Option<bool>,
    /// Dimension of the space of invariant matrices (when B is not scalar and it was
    /// computed).
    pub commutant_dimension: Option<usize>,
    /// Whether `invariants` uses the physical basis.
    pub physical_basis: Option<bool>,
    /// B = Σ coefficient · matrix when B is not scalar (empty when it is scalar).
    pub invariants: Option<Vec<InvariantReport>>,
    /// B itself, when it is not scalar.
    pub matrix: Option<Vec<Vec<String>>>,
    /// The non-zero entries of B (scalar or not) keyed by basis labels.
    pub entries: Option<Vec<LabelledEntry>>,
    /// At genus 1 with G = I: B as the modular invariant matrix over the labels.
    pub modular_invariant: Option<ModularInvariantReport>,
    /// Why the sum is missing or incomplete, when it is.
    pub note: Option<String>,
    /// Counted through an imprimitive structure: one term per orbit O of sectors, with
    /// B = Σ_O β_O·P_O·G⁻¹ (the producer's records; absent for every other route).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sector_terms: Option<Vec<serde_json::Value>>,
    /// Counted through an imprimitive structure: B's non-zero entries B_{j,vac} in the
    /// vacuum's column (absent for every other route).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub vacuum_column: Option<Vec<LabelledEntry>>,
}

fn matrix_text(m: &Matrix) -> Vec<Vec<String>> {
    (0..m.rows())
        .map(|i| m.row(i).iter().map(Cyc::to_string).collect())
        .collect()
}

/// The non-zero entries of `m` keyed by the generator set's basis labels.
fn labelled_entries(m: &Matrix, gens: &GeneratorSet) -> Vec<LabelledEntry> {
    let mut out = Vec::new();
    for i in 0..m.rows() {
        for (j, x) in m.row(i).iter().enumerate() {
            if !x.is_zero() {
                let (re, im) = x.to_complex();
                out.push(LabelledEntry {
                    row: gens.label(i),
                    column: gens.label(j),
                    value: x.to_string(),
                    approx: [re, im],
                });
            }
        }
    }
    out
}

/// The label a of a genus-1 comb basis vector `a=(a) b=(…) x=()` (the only loop), or `None`
/// for labels of another shape.
fn loop_label(basis_label: &str) -> Option<String> {
    let rest = basis_label.strip_prefix("a=(")?;
    let (label, tail) = rest.split_once(") b=(")?;
    tail.ends_with(") x=()").then(|| label.to_string())
}

/// B as a modular invariant over the labels: only at genus 1, with G = I (then the comb
/// basis is orthonormal and B's entries are the multiplicities M_ab of Z = Σ M_ab χ_a χ̄_b).
fn modular_invariant(b: &Matrix, gens: &GeneratorSet) -> Option<ModularInvariantReport> {
    if gens.genus() != Some(1) || gens.form().is_some() {
        return None;
    }
    let labels = (0..gens.dimension())
        .map(|i| loop_label(&gens.label(i)))
        .collect::<Option<Vec<String>>>()?;
    Some(ModularInvariantReport {
        labels,
        matrix: matrix_text(b),
    })
}

impl PoincareReport {
    /// The report of a computed sum over the generator set `gens` (whose basis labels key
    /// the entries).
    pub fn from_sum(sum: &PoincareSum, gens: &GeneratorSet) -> PoincareReport {
        let mut r = PoincareReport {
            is_scalar: Some(sum.scalar.is_some()),
            prefactor: match (sum.prefactor(), &sum.scalar) {
                (Some(r), _) => Some(r.to_string()),
                (None, scalar) => scalar.as_ref().map(Cyc::to_string),
            },
            seed_norm: Some(sum.norm.to_string()),
            trace_check: Some(sum.trace_check),
            entries: Some(labelled_entries(&sum.matrix, gens)),
            modular_invariant: modular_invariant(&sum.matrix, gens),
            ..PoincareReport::default()
        };
        if sum.scalar.is_some() {
            r.invariants = Some(Vec::new());
            return r;
        }
        r.matrix = Some(matrix_text(&sum.matrix));
        match &sum.decomposition {
            Some(dec) => {
                r.commutant_dimension = Some(dec.commutant_dimension);
                r.physical_basis = Some(dec.physical);
                r.invariants = Some(
                    dec.terms
                        .iter()
                        .map(|t| InvariantReport {
                            coefficient: t.coefficient.to_string(),
                            matrix: matrix_text(&t.matrix),
                            entries: labelled_entries(&t.matrix, gens),
                        })
                        .collect(),
                );
            }
            None => {
                r.note = Some("the space of invariant matrices is too large to compute here".into())
            }
        }
        r
    }

    /// The report when the sum is not available, with the reason.
    pub fn missing(reason: impl Into<String>) -> PoincareReport {
        PoincareReport {
            note: Some(reason.into()),
            ..PoincareReport::default()
        }
    }
}
