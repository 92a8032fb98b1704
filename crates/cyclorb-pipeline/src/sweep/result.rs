//! The result of one run (the program stores it as `runs/<id>/result.json`): the orbit keys
//! of the command-line contract, the certified answers, costs, and what a paper needs to
//! cite the numbers.

use cyclorb_cert::WitnessCertificate;
use cyclorb_orbit::PoincareReport;
use serde::{Deserialize, Serialize};

use crate::image::ImageRoute;
use crate::lifted::FactorRef;

/// The commutant answer (keys as in `cyclorb commutant --json`).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CommutantAnswer {
    /// dim {X : X A = A X for every generator A}; 1 means irreducible.
    pub commutant_dimension: usize,
    /// The primes p ≡ 1 (mod n) whose nullities bound it.
    pub primes: Vec<u64>,
    /// `modular` (nullity 1 mod p) or `exact` (a basis over Q(ζ_n)).
    pub route: String,
}

/// The image answer (keys as in `cyclorb image --json`).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ImageAnswer {
    /// Whether the projective image is finite; null when undecided.
    pub finite: Option<bool>,
    /// Its order (exact integer string) when finite.
    pub order: Option<String>,
    /// Which route decided it (as in `cyclorb image --json`): `orbit-schreier-sims`,
    /// `enumeration`, `witness`, `permutation-schreier-sims` or `monomial-schreier-sims`
    /// (`dw:`), or `undecided`.
    pub route: ImageRoute,
    /// Why it is undecided, or why a route was passed over.
    pub note: Option<String>,
}

/// The witness answer (keys as in `cyclorb witness --json`).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct WitnessAnswer {
    /// Whether a word of infinite projective order was found.
    pub found: bool,
    /// The word (generator names, product read left to right); empty when not found.
    pub word: Vec<String>,
    /// The exact certificate (characteristic polynomial, norm of the ratio polynomial,
    /// its cyclotomic factors and the non-cyclotomic rest).
    pub certificate: Option<WitnessCertificate>,
    /// Words examined (when not found; finding none proves nothing).
    pub words_tried: Option<usize>,
    /// Why the search did not run, when it did not.
    pub note: Option<String>,
    /// The factor of a Deligne product the certificate was found on (the certificate is
    /// then the factor's; see `cyclorb witness`); absent for a direct witness.
    #[serde(default)]
    pub lifted_from_factor: Option<FactorRef>,
}

/// What a paper needs to cite a result.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct Citation {
    /// SHA-256 of the theory's exact data (`cyclorb describe` prints the same).
    pub theory_data_hash: String,
    /// The generating set of Dehn twists (`humphries` or `lickorish`).
    pub generator_set: String,
    /// The field, `Q(ζ_n)`.
    pub field: String,
    /// The conductor n.
    pub conductor: u32,
    /// `cyclorb` and its version.
    pub program: String,
    /// The program version alone.
    pub program_version: String,
    /// The command line of the attempt that finished the run.
    pub command: String,
}

/// One finished run.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct RunResult {
    /// The run's folder name under `runs/`.
    pub id: String,
    /// The theory spec (or file) as given in the plan.
    pub theory: String,
    /// The entry's label.
    pub label: String,
    /// The genus.
    pub genus: usize,
    /// dim V_g.
    pub dimension: usize,
    /// n of Q(ζ_n).
    pub conductor: u32,
    /// Number of generators.
    pub generators: usize,
    /// Their names.
    pub generator_names: Vec<String>,
    /// The answers the plan asked for.
    pub answers: Vec<String>,
    /// Distinct lines found (null when no orbit was asked for).
    pub orbit_size: Option<usize>,
    /// Whether the orbit is proven closed (null when no orbit was asked for).
    pub saturated: Option<bool>,
    /// Why an unsaturated orbit stopped: `limit`, `memory` or `time`.
    pub stop_reason: Option<String>,
    /// New lines at each breadth-first depth.
    pub layer_sizes: Option<Vec<usize>>,
    /// When the orbit was counted, not listed (plan key `method = "structure"`): the figures
    /// that prove the count (|P|, the parts, the arrangements, |Stab_P(S)|), as the
    /// certificate of `orbit --method structure` states them.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub counted: Option<serde_json::Value>,
    /// The Poincaré sum (all null inside when the orbit is not saturated).
    pub poincare_sum: Option<PoincareReport>,
    /// The commutant, when asked for.
    pub commutant: Option<CommutantAnswer>,
    /// The image order, when asked for.
    pub image: Option<ImageAnswer>,
    /// The witness, when asked for.
    pub witness: Option<WitnessAnswer>,
    /// Answers that failed, with the reason (a failed check makes the sweep exit 1).
    pub errors: Vec<String>,
    /// Wall time of the attempt that finished the run.
    pub elapsed_seconds: f64,
    /// Orbit enumeration over every attempt plus the rest of the final attempt.
    pub total_seconds: f64,
    /// Peak resident memory during the final attempt (the peak is reset per run on Linux).
    pub peak_memory_bytes: Option<u64>,
    /// Bytes held by the orbit store.
    pub store_bytes: Option<usize>,
    /// Whether the orbit continued from a checkpoint.
    pub resumed: bool,
    /// Citation data.
    pub citation: Citation,
    /// Hash of the run's description; a stored result is reused only when it matches.
    pub run_hash: String,
    /// Hash of the whole plan the result was made under.
    pub plan_hash: String,
}

impl RunResult {
    /// λ when the Poincaré sum is a multiple of G⁻¹.
    pub fn prefactor(&self) -> Option<&str> {
        self.poincare_sum.as_ref()?.prefactor.as_deref()
    }
}
