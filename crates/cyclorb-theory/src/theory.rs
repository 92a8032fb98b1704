//! The [`Theory`] type: a multiplicity-free modular tensor category (or modular data alone)
//! over one cyclotomic field, with the accessors every later stage uses.

use std::fmt;
use std::sync::OnceLock;

use cyclorb_field::{Cyc, CyclotomicField, Rational};
use cyclorb_matrix::Matrix;
use hashbrown::HashMap;

use crate::fmatrix::FMatrix;
use crate::fusion::FusionRules;
use crate::structure::{key3, key4, Braiding, FBlock};

/// A modular tensor category over Q(ζ_n), in the conventions of docs/conventions.md §2–3:
/// labels 0..rank (0 the vacuum) with names, duals, fusion rules, F- and R-symbols in a
/// stated gauge (absent for modular-data-only theories), twists θ_a, quantum dimensions d_a,
/// the unnormalised S̃ and normalised S = S̃/D (D > 0 when F and R are present), the central
/// charge mod 8 from Σ_a d_a² θ_a = D·exp(2πi c/8), and the vertex weights of the gauge's
/// invariant Hermitian form (docs/conventions.md §4). Every number lies in [`Theory::field`].
#[derive(Clone)]
pub struct Theory {
    pub(crate) name: String,
    pub(crate) field: CyclotomicField,
    pub(crate) labels: Vec<String>,
    pub(crate) fusion: FusionRules,
    pub(crate) dims: Vec<Cyc>,
    pub(crate) twists: Vec<Cyc>,
    pub(crate) braiding: Option<Braiding>,
    /// Vertex weights different from 1, keyed by [`key3`].
    pub(crate) weights: HashMap<u64, Cyc>,
    pub(crate) s_tilde: Matrix,
    pub(crate) s: Matrix,
    pub(crate) total_dim: Cyc,
    pub(crate) gauss_phase: Cyc,
    pub(crate) central: Rational,
    pub(crate) hash: OnceLock<String>,
    pub(crate) zero: Cyc,
    pub(crate) one: Cyc,
}

impl fmt::Debug for Theory {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.debug_struct("Theory")
            .field("name", &self.name)
            .field("conductor", &self.field.conductor())
            .field("labels", &self.labels)
            .field("has_fr", &self.has_fr())
            .field("central_charge_mod_8", &self.central.to_string())
            .finish()
    }
}

impl Theory {
    /// The name (the spec it was built from, or the name in its file).
    pub fn name(&self) -> &str {
        &self.name
    }

    /// The field Q(ζ_n) holding all data (F, R, θ, d, S, D, vertex weights).
    pub fn field(&self) -> &CyclotomicField {
        &self.field
    }

    /// The conductor n of the field.
    pub fn conductor(&self) -> u32 {
        self.field.conductor()
    }

    /// Number of labels; label 0 is the vacuum.
    pub fn rank(&self) -> usize {
        self.labels.len()
    }

    /// The name of label `a` ("" when out of range).
    pub fn label(&self, a: usize) -> &str {
        self.labels.get(a).map_or("", String::as_str)
    }

    /// All label names, in index order.
    pub fn labels(&self) -> &[String] {
        &self.labels
    }

    /// The index of the label with this name.
    pub fn label_index(&self, name: &str) -> Option<usize> {
        self.labels.iter().position(|l| l == name)
    }

    /// The dual label a*.
    pub fn dual(&self, a: usize) -> usize {
        self.fusion.dual(a)
    }

    /// The fusion rules.
    pub fn fusion(&self) -> &FusionRules {
        &self.fusion
    }

    /// N_ab^c ≠ 0.
    pub fn fuses(&self, a: usize, b: usize, c: usize) -> bool {
        self.fusion.fuses(a, b, c)
    }

    /// N_ab^c (0 or 1 in a theory with F- and R-symbols).
    pub fn fusion_coefficient(&self, a: usize, b: usize, c: usize) -> u32 {
        self.fusion.coefficient(a, b, c)
    }

    /// The sorted labels c with N_ab^c ≠ 0.
    pub fn fusion_outcomes(&self, a: usize, b: usize) -> &[usize] {
        self.fusion.outcomes(a, b)
    }

    /// Whether F- and R-symbols are present (false for modular data alone).
    pub fn has_fr(&self) -> bool {
        self.braiding.is_some()
    }

    /// The factors (A, B) when this theory is a Deligne product A ⊠ B built by
    /// [`crate::product`] (label (a, b) at index a·rank(B) + b), also after the operations that
    /// keep its F, R, θ, d and vertex weights ([`crate::renamed`] and
    /// [`crate::with_negated_total_dimension`], which only renames or scales S by −1); `None`
    /// for any other theory (a Galois conjugate or regauging of a product included). A
    /// factor is the theory as it entered the product, with its own spherical structure.
    pub fn deligne_factors(&self) -> Option<(&Theory, &Theory)> {
        self.braiding.as_ref()?.source.deligne_factors()
    }

    fn block(&self, a: usize, b: usize, c: usize, d: usize) -> Option<&FBlock> {
        let r = self.rank();
        if a >= r || b >= r || c >= r || d >= r {
            return None;
        }
        let braiding = self.braiding.as_ref()?;
        let cell = braiding.cells.get(&key4(r, a, b, c, d))?;
        Some(cell.get_or_init(|| Box::new(self.compute_block(a, b, c, d))))
    }

    /// The F-matrix [F^{abc}_d] by reference, when (a, b, c, d) has admissible rows.
    pub fn f_block(&self, a: usize, b: usize, c: usize, d: usize) -> Option<&FMatrix> {
        self.block(a, b, c, d).map(|blk| &blk.forward)
    }

    /// The inverse of [F^{abc}_d] by reference (rows f, columns e), when it exists.
    pub fn f_inverse_block(&self, a: usize, b: usize, c: usize, d: usize) -> Option<&FMatrix> {
        self.block(a, b, c, d).and_then(|blk| blk.inverse.as_ref())
    }

    /// [F^{abc}_d]_{ef} (docs/conventions.md §2–3 convention); 0 when inadmissible.
    pub fn f_symbol(&self, a: usize, b: usize, c: usize, d: usize, e: usize, f: usize) -> Cyc {
        self.f_block(a, b, c, d)
            .and_then(|m| m.get(e, f).cloned())
            .unwrap_or_else(|| self.zero.clone())
    }

    /// The F-matrix [F^{abc}_d], rows e and columns f (empty when inadmissible).
    pub fn f_matrix(&self, a: usize, b: usize, c: usize, d: usize) -> FMatrix {
        self.f_block(a, b, c, d)
            .cloned()
            .unwrap_or_else(|| FMatrix::empty(&self.field))
    }

    /// The inverse of [F^{abc}_d]: rows indexed by f, columns by e (empty when inadmissible,
    /// or singular, which only an unverified file can produce).
    pub fn f_inverse(&self, a: usize, b: usize, c: usize, d: usize) -> FMatrix {
        self.f_inverse_block(a, b, c, d)
            .cloned()
            .unwrap_or_else(|| FMatrix::empty(&self.field))
    }

    /// R^{ab}_c, the eigenvalue of the counterclockwise exchange; 0 when inadmissible.
    pub fn r_symbol(&self, a: usize, b: usize, c: usize) -> Cyc {
        self.r_ref(a, b, c)
            .cloned()
            .unwrap_or_else(|| self.zero.clone())
    }

    pub(crate) fn r_ref(&self, a: usize, b: usize, c: usize) -> Option<&Cyc> {
        let r = self.rank();
        if a >= r || b >= r || c >= r {
            return None;
        }
        self.braiding.as_ref()?.r.get(&key3(r, a, b, c))
    }

    /// The twist θ_a.
    pub fn twist(&self, a: usize) -> &Cyc {
        self.twists.get(a).unwrap_or(&self.zero)
    }

    /// All twists, in label order.
    pub fn twists(&self) -> &[Cyc] {
        &self.twists
    }

    /// The quantum dimension d_a.
    pub fn quantum_dim(&self, a: usize) -> &Cyc {
        self.dims.get(a).unwrap_or(&self.zero)
    }

    /// All quantum dimensions, in label order.
    pub fn quantum_dims(&self) -> &[Cyc] {
        &self.dims
    }

    /// The normalised S = S̃/D. Always present: the field is enlarged at construction until
    /// it holds D. S_00 = 1/D.
    pub fn s_matrix(&self) -> Option<&Matrix> {
        Some(&self.s)
    }

    /// The unnormalised S̃_ab = Σ_c N_{a*b}^c θ_c d_c/(θ_a θ_b) (S̃_0a = d_a).
    pub fn s_unnormalized(&self) -> &Matrix {
        &self.s_tilde
    }

    /// The total dimension D, D² = Σ_a d_a²: D > 0 for theories with F and R; for modular data
    /// alone D = 1/S_00 of the given S (negative for some non-unitary minimal models, which
    /// keeps c mod 8 equal to the CFT's c). Always present (see [`Theory::s_matrix`]).
    pub fn total_dim(&self) -> Option<&Cyc> {
        Some(&self.total_dim)
    }

    /// p₊/D = exp(2πi c/8), with p₊ = Σ_a d_a² θ_a.
    pub fn gauss_phase(&self) -> &Cyc {
        &self.gauss_phase
    }

    /// |u^{ab}_c|² for the gauge in use relative to a unitary one (1 in a unitary gauge),
    /// defined up to the equivalence described in the crate documentation; meaningful for
    /// admissible (a, b, c). The invariant form of a closed tree is
    /// G_tree = Π_vertices vertex_weight · Π_handles handle_weight⁻¹ (docs/conventions.md §4).
    pub fn vertex_weight(&self, a: usize, b: usize, c: usize) -> Cyc {
        let r = self.rank();
        if a >= r || b >= r || c >= r {
            return self.one.clone();
        }
        self.weights
            .get(&key3(r, a, b, c))
            .cloned()
            .unwrap_or_else(|| self.one.clone())
    }

    /// |u^{a a*}_0|² = vertex_weight(a, a*, 0): the handle factor of docs/conventions.md §4.
    pub fn handle_weight(&self, a: usize) -> Cyc {
        if a >= self.rank() {
            return self.one.clone();
        }
        self.vertex_weight(a, self.dual(a), 0)
    }

    /// Whether every vertex weight is 1 (the gauge is unitary, G = 1).
    pub fn is_unitary_gauge(&self) -> bool {
        self.weights.is_empty()
    }

    /// The central charge c mod 8, from Σ_a d_a² θ_a = D·exp(2πi c/8); in [0, 8).
    pub fn central_charge_mod_8(&self) -> Rational {
        self.central.clone()
    }

    /// A stable SHA-256 hash (hex) of the exact data: conductor, labels, fusion rules,
    /// dimensions, twists, S̃ of modular-data theories, F- and R-symbols and vertex weights.
    /// The name is not part of it. Computing it fills every F-block.
    pub fn data_hash(&self) -> String {
        self.hash
            .get_or_init(|| crate::canonical::data_hash(self))
            .clone()
    }

    /// SHA-256 (hex) of how the theory is built: [`Theory::data_hash`] for a theory whose
    /// F-symbols are its own; for a Deligne product or a Galois conjugate its own data other
    /// than F (labels, fusion, d, θ, R, weights, D) and the construction hashes of its
    /// building blocks, so that the product's F-blocks are never filled. Equal construction
    /// hashes mean equal data (the canonical text is in the `canonical` module).
    pub fn construction_hash(&self) -> String {
        crate::canonical::construction_hash(self)
    }

    /// Every (a, b, c, d) that has an F-block, in increasing order.
    pub fn f_block_labels(&self) -> Vec<(usize, usize, usize, usize)> {
        let Some(braiding) = &self.braiding else {
            return Vec::new();
        };
        let r = self.rank() as u64;
        let mut keys: Vec<u64> = braiding.cells.keys().copied().collect();
        keys.sort_unstable();
        keys.into_iter()
            .map(|k| {
                let d = k % r;
                let c = (k / r) % r;
                let b = (k / r / r) % r;
                let a = k / r / r / r;
                (a as usize, b as usize, c as usize, d as usize)
            })
            .collect()
    }
}
