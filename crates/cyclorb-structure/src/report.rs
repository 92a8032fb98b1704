//! The serde reports of the structural route: numbers as exact decimal strings, and the
//! certificate that [`crate::recheck`] re-derives.

use cyclorb_cert::CommutantCertificate;
use serde::{Deserialize, Serialize};

use crate::monomial::Monomial;

/// Everything the structural route found, with its certificate. The headline numbers
/// are top-level (exact decimal strings); `image` and `orbit` hold how they factor.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct StructureReport {
    /// The theory's name.
    pub theory: String,
    /// The genus g.
    pub genus: usize,
    /// dim V_g.
    pub dimension: usize,
    /// The conductor n of Q(ζ_n).
    pub conductor: u32,
    /// Always "structure".
    pub route: String,
    /// "humphries" or "lickorish".
    pub generating_set: String,
    /// The generator names (Dehn twists), in order.
    pub generators: Vec<String>,
    /// The power k of the twists whose normal closure N is diagonal in the monomial basis.
    pub power: u32,
    /// The number of lines in the orbit of the vacuum line (exact decimal).
    pub orbit_size: String,
    /// The number of supports (the orbit of the vacuum's support under P).
    pub supports: String,
    /// Phase patterns per support, up to a global phase (exact decimal).
    pub patterns_per_support: String,
    /// The commutant dimension (1: irreducible).
    pub commutant_dimension: usize,
    /// λ with Σ v v† = λ·G⁻¹ over the orbit (exact rational string), when the commutant
    /// is 1-dimensional (Schur); null otherwise (not decided by this route).
    pub prefactor: Option<String>,
    /// The order of the projective image of the mapping class group (exact decimal).
    pub image_order: String,
    /// How the image order factors.
    pub image: ImageReport,
    /// How the orbit factors.
    pub orbit: OrbitReport,
    /// Wall-clock time of the analysis.
    pub elapsed_seconds: f64,
    /// The data a referee (or [`crate::recheck`]) re-checks.
    pub certificate: StructureCertificate,
}

/// |image| = |P| · |K| / |K ∩ scalars|.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct ImageReport {
    /// |P|, the permutation image on the lines of the monomial basis (exact decimal).
    pub permutation_order: String,
    /// |K|, the diagonal matrices in the group (exact decimal).
    pub kernel_order: String,
    /// The invariant factors of K (each divides the next).
    pub kernel_invariants: Vec<u64>,
    /// |K ∩ scalars|.
    pub kernel_scalars: u32,
}

/// The orbit of the vacuum line: supports × patterns per support, in detail.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct OrbitReport {
    /// |S₀|, the size of each support.
    pub support_size: usize,
    /// Classes of patterns modulo the diagonal part D of the support's stabiliser.
    pub pattern_classes: usize,
    /// Lines per class: |D + scalars| / m (exact decimal).
    pub lines_per_class: String,
    /// The order of the permutation group the support's stabiliser induces on it.
    pub support_action_order: String,
    /// The invariant factors of D.
    pub support_diagonal_invariants: Vec<u64>,
    /// ⟨v₀, v₀⟩_G in the comb basis (exact text).
    pub vacuum_norm: String,
    /// |image| / |orbit|: the order of the stabiliser of the vacuum line in the
    /// projective image (exact decimal).
    pub line_stabiliser_order: String,
}

/// A permutation group with monomial lifts: base, basic orbit lengths, strong generators.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct ChainCertificate {
    /// The base b_0, b_1, ….
    pub base: Vec<u32>,
    /// |Δ_0|, |Δ_1|, …: their product is |P|.
    pub basic_orbit_lengths: Vec<usize>,
    /// |P| (exact decimal).
    pub order: String,
    /// The strong generators with their monomial lifts.
    pub strong_generators: Vec<Monomial>,
}

/// The diagonal part K as a subgroup of (Z/m)^d.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct KernelCertificate {
    /// The rows of its Hermite basis with pivot < m (phase exponents).
    pub generators: Vec<Vec<u32>>,
    /// The invariant factors.
    pub invariants: Vec<u64>,
    /// |K| (exact decimal).
    pub order: String,
    /// |K ∩ scalars|.
    pub scalars: u32,
}

/// The certificate of the structural route.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct StructureCertificate {
    /// The theory's name.
    pub theory: String,
    /// The genus.
    pub genus: usize,
    /// "humphries" or "lickorish".
    pub generating_set: String,
    /// The generator names.
    pub generators: Vec<String>,
    /// n.
    pub conductor: u32,
    /// m = lcm(2, n): phases are exponents of ζ_m.
    pub phase_modulus: u32,
    /// The power k whose twists generate N.
    pub power: u32,
    /// The monomial basis e_j in comb coordinates: sparse (index, exact value) lists.
    pub basis: Vec<Vec<(u32, String)>>,
    /// Every generator in that basis: A_a e_j = ζ_m^{φ_j}·e_{π(j)} with π = `perm`, φ = `phases`.
    pub monomials: Vec<Monomial>,
    /// The vacuum vector in that basis: (index j, c_j) with v₀ = Σ c_j e_j.
    pub vacuum: Vec<(u32, String)>,
    /// The permutation image P, with lifts.
    pub permutation_group: ChainCertificate,
    /// The diagonal part K.
    pub kernel: KernelCertificate,
    /// The projective image order |P|·|K|/|K ∩ scalars| (exact decimal).
    pub image_order: String,
    /// The number of supports.
    pub supports: String,
    /// Patterns per support.
    pub patterns_per_support: String,
    /// The orbit size.
    pub orbit_size: String,
    /// The commutant: irreducibility by the monomial lemma, or cyclorb-cert's certificate.
    pub commutant: CommutantProof,
}

/// How the commutant dimension is proved.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(tag = "route", rename_all = "snake_case")]
pub enum CommutantProof {
    /// Irreducible: these elements of K separate the coordinates and P is transitive
    /// (Schur's lemma in the monomial basis; see the crate documentation).
    Monomial {
        /// Elements of K (phase exponents) whose signatures separate the coordinates.
        separating: Vec<Vec<u32>>,
    },
    /// cyclorb-cert's commutant certificate for the monomial generators together with the
    /// diagonal elements `diagonals` of K, named `kernel0`, `kernel1`, … (they lie in
    /// the group, so the commutant is the same).
    Solved {
        /// The certificate.
        certificate: CommutantCertificate,
        /// The diagonal generators added (phase exponents).
        diagonals: Vec<Vec<u32>>,
    },
}

impl CommutantProof {
    /// The commutant dimension (1: irreducible).
    pub fn dimension(&self) -> usize {
        match self {
            CommutantProof::Monomial { .. } => 1,
            CommutantProof::Solved { certificate, .. } => certificate.dimension,
        }
    }
}
