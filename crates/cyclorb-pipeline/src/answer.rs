//! The one answer of `cyclorb orbit`, whichever route found it: [`OrbitAnswer`], with the
//! keys of the command's JSON. Each route fills the common part and its own figures
//! (store figures when the lines were listed, the counting certificate's figures when they
//! were counted, the factors when a product was split).

use std::fmt;
use std::time::Duration;

use cyclorb_orbit::{
    DistributedOrbit, Orbit, OrbitProblem, PoincareReport, PoincareSum, StopReason,
};
use num_bigint::BigUint;
use serde::{Deserialize, Deserializer, Serialize, Serializer};

use crate::method::OrbitMethod;

/// An exact count. In JSON it is an integer when it fits in 64 bits and decimal text
/// otherwise (counted orbits and image orders pass 2⁶⁴).
#[derive(Debug, Clone, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct Count(pub BigUint);

impl Count {
    /// The count as a `u64`, when it fits.
    pub fn to_u64(&self) -> Option<u64> {
        u64::try_from(&self.0).ok()
    }
}

impl From<usize> for Count {
    fn from(n: usize) -> Count {
        Count(BigUint::from(n))
    }
}

impl From<BigUint> for Count {
    fn from(n: BigUint) -> Count {
        Count(n)
    }
}

impl fmt::Display for Count {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        self.0.fmt(f)
    }
}

impl Serialize for Count {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        match self.to_u64() {
            Some(n) => s.serialize_u64(n),
            None => s.serialize_str(&self.0.to_string()),
        }
    }
}

impl<'de> Deserialize<'de> for Count {
    fn deserialize<D: Deserializer<'de>>(d: D) -> Result<Count, D::Error> {
        #[derive(Deserialize)]
        #[serde(untagged)]
        enum Form {
            Number(u64),
            Text(String),
        }
        match Form::deserialize(d)? {
            Form::Number(n) => Ok(Count(BigUint::from(n))),
            Form::Text(t) => t
                .parse::<BigUint>()
                .map(Count)
                .map_err(|_| serde::de::Error::custom(format!("not a count: {t:?}"))),
        }
    }
}

/// What listing the lines cost (the enumerating route).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct StoreFigures {
    /// Enumeration time over all runs that built this orbit (resumed runs included).
    pub compute_seconds: f64,
    /// Bytes held by the orbit store.
    pub store_bytes: usize,
    /// Store bytes per line.
    pub bytes_per_element: f64,
    /// Bytes per stored key numerator.
    pub numerator_width: usize,
    /// The store that held the lines: `memory` or `compact`.
    #[serde(default)]
    pub store_kind: String,
    /// Of `store_bytes`, the keys the compact store held for its last layers (0 for the
    /// memory store).
    #[serde(default)]
    pub window_bytes: usize,
}

/// The figures of a counted orbit (`--method structure`).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct CountFigures {
    /// Supports of the vacuum orbit's lines (monomial route), or null.
    pub supports: Option<Count>,
    /// Phase patterns on each support (monomial route), or null.
    pub patterns_per_support: Option<Count>,
    /// The order of the projective image the count used (decimal text), or null.
    pub image_order: Option<String>,
    /// Whether the certificate of the count was re-checked by an independent computation
    /// before the answer was given.
    pub certificate_rechecked: bool,
    /// The monomial route's own record (its image, orbit and power); absent for the
    /// imprimitive route, whose figures are `imprimitive`.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub details: Option<serde_json::Value>,
    /// The imprimitive route's figures.
    #[serde(flatten, default, skip_serializing_if = "Option::is_none")]
    pub imprimitive: Option<ImprimitiveFigures>,
}

/// The figures of an orbit counted through an imprimitive structure: the sectors (joint
/// eigenspaces of commuting twist powers) that the generators permute.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ImprimitiveFigures {
    /// Always `imprimitive` (the monomial route has no such key).
    pub structure: String,
    /// |orbit| = sector supports × component-line tuples × phase patterns, and the sectors.
    pub decomposition: SectorDecomposition,
    /// The image order, factored two ways.
    pub image: ImageFactors,
    /// Which claims of the certificate were re-checked before the answer was given.
    pub recheck: String,
}

/// The factors of an imprimitive count.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct SectorDecomposition {
    /// Images of the vacuum's set of sectors under the block permutations.
    pub sector_supports: Count,
    /// Tuples of component lines per sector support.
    pub line_tuples_per_sector_support: Count,
    /// Relative phase patterns per tuple.
    pub patterns_per_support: Count,
    /// Sectors the vacuum has a component in.
    pub support_sectors: usize,
    /// Sectors in all.
    pub sectors: usize,
    /// (dimension, number of sectors of that dimension), increasing.
    pub sector_dimensions: Vec<(usize, usize)>,
    /// Component lines in all (the degree of the monomial action on them).
    pub component_lines: usize,
    /// The power k of the twists whose joint eigenspaces are the sectors.
    pub power: u32,
}

/// |image| = |block permutations| × |block kernel| = |P_L| × |K| / |K ∩ scalars|.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct ImageFactors {
    /// The group induced on the sectors (decimal).
    pub block_permutation_order: String,
    /// The elements fixing every sector, modulo scalars (decimal).
    pub block_kernel_order: String,
    /// The permutation group on the component lines (decimal).
    pub line_permutation_order: String,
    /// The elements scalar on every component line (decimal).
    pub kernel_order: String,
    /// Those among them that are scalar.
    pub kernel_scalars: u32,
}

/// One factor of a Deligne product (`--method product`).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct FactorAnswer {
    /// The factor's spec.
    pub spec: String,
    /// dim V_g of the factor.
    pub dimension: usize,
    /// n of the factor's field Q(ζ_n).
    pub conductor: u32,
    /// Lines of the factor's vacuum orbit.
    pub orbit_size: usize,
    /// Whether that orbit closed.
    pub saturated: bool,
    /// The factor's Poincaré sum: `is_scalar` and `prefactor` (null when not closed).
    pub poincare_sum: FactorSum,
}

/// The part of a factor's Poincaré sum the product needs.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct FactorSum {
    /// Whether B_A = λ_A·G_A⁻¹.
    pub is_scalar: Option<bool>,
    /// λ_A when it is.
    pub prefactor: Option<String>,
}

/// The figures of the product route.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct ProductFigures {
    /// The two factors (A, then B).
    pub factors: Vec<FactorAnswer>,
    /// How the orbit was found (or why it is only bounded).
    pub note: String,
}

/// The answer of `cyclorb orbit`, with the keys of its JSON.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub struct OrbitAnswer {
    /// The theory spec (null for raw generator files).
    pub theory: Option<String>,
    /// The genus (null for raw generator files without one).
    pub genus: Option<u32>,
    /// Dimension of the block space.
    pub dimension: usize,
    /// n of Q(ζ_n).
    pub conductor: u32,
    /// Number of generators.
    pub generators: usize,
    /// Their names.
    pub generator_names: Vec<String>,
    /// The route that found the orbit.
    pub method: OrbitMethod,
    /// Distinct lines (all of them when saturated); null when not even counted.
    pub orbit_size: Option<Count>,
    /// Whether the orbit is proved closed under every generator.
    pub saturated: bool,
    /// Why a listing stopped early (`limit`, `memory`, `interrupted`), or null.
    pub stop_reason: Option<StopReason>,
    /// New lines at each breadth-first depth (null when the lines were counted).
    pub layer_sizes: Option<Vec<usize>>,
    /// The Poincaré sum B = Σ v v† over the orbit, or why it is missing.
    pub poincare_sum: PoincareReport,
    /// Wall time of this run.
    pub elapsed_seconds: f64,
    /// Peak resident memory of the process (filled by the program, which can measure it).
    pub peak_memory_bytes: Option<u64>,
    /// The enumerating route's store figures.
    #[serde(flatten, default, skip_serializing_if = "Option::is_none")]
    pub store: Option<StoreFigures>,
    /// The counting route's figures.
    #[serde(flatten, default, skip_serializing_if = "Option::is_none")]
    pub count: Option<CountFigures>,
    /// The product route's factors.
    #[serde(flatten, default, skip_serializing_if = "Option::is_none")]
    pub product: Option<ProductFigures>,
    /// Words of listed lines in generator names, when asked for.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub words: Option<Vec<LineWord>>,
}

/// What an answer reads from a listed orbit (one process or many ranks): size, saturation,
/// stop reason, layer sizes.
type Listed = (usize, bool, Option<StopReason>, Vec<usize>);

/// A listed line and the word of generators that reaches it from the seed (the first
/// generator applied first: the line is X_k ⋯ X_1 · v₀ for the word X_1 … X_k).
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct LineWord {
    /// The line's index in the order of discovery (0 is the seed).
    pub line: usize,
    /// The generator names.
    pub word: Vec<String>,
}

impl OrbitAnswer {
    /// The answer of the enumerating route. `poincare` is the sum (when computed) or the
    /// reason it is missing; `elapsed` is the caller's wall time. Theory and genus come
    /// from the generator set.
    pub fn enumerated(
        problem: &OrbitProblem,
        orbit: &Orbit,
        poincare: Result<&PoincareSum, String>,
        elapsed: Duration,
    ) -> OrbitAnswer {
        let store = StoreFigures {
            compute_seconds: orbit.compute_seconds(),
            store_bytes: orbit.store_bytes(),
            bytes_per_element: orbit.bytes_per_element(),
            numerator_width: orbit.numerator_width(),
            store_kind: orbit.store_kind().name().into(),
            window_bytes: orbit.window_bytes(),
        };
        let listed = (
            orbit.len(),
            orbit.is_saturated(),
            orbit.stop_reason(),
            orbit.layer_sizes(),
        );
        Self::listed(problem, listed, poincare, store, elapsed)
    }

    /// The answer of the enumerating route run over ranks: the figures every rank agrees
    /// on, B reduced to this rank (rank 0), and the store figures of all ranks together.
    pub fn distributed(
        problem: &OrbitProblem,
        orbit: &DistributedOrbit,
        poincare: Result<&PoincareSum, String>,
        store: StoreFigures,
        elapsed: Duration,
    ) -> OrbitAnswer {
        let listed = (
            orbit.len(),
            orbit.is_saturated(),
            orbit.stop_reason(),
            orbit.layer_sizes(),
        );
        Self::listed(problem, listed, poincare, store, elapsed)
    }

    /// The answer from a listing's size, saturation, stop reason and layer sizes.
    fn listed(
        problem: &OrbitProblem,
        (size, saturated, stop_reason, layer_sizes): Listed,
        poincare: Result<&PoincareSum, String>,
        store: StoreFigures,
        elapsed: Duration,
    ) -> OrbitAnswer {
        let g = problem.generators();
        let poincare_sum = if !saturated {
            PoincareReport::missing("the orbit is not saturated")
        } else {
            match poincare {
                Ok(sum) => PoincareReport::from_sum(sum, g),
                Err(reason) => PoincareReport::missing(reason),
            }
        };
        OrbitAnswer {
            theory: g.theory().map(str::to_string),
            genus: g.genus(),
            dimension: g.dimension(),
            conductor: g.conductor(),
            generators: g.operators().len(),
            generator_names: g.names().to_vec(),
            method: OrbitMethod::Enumerate,
            orbit_size: Some(Count::from(size)),
            saturated,
            stop_reason,
            layer_sizes: Some(layer_sizes),
            poincare_sum,
            elapsed_seconds: elapsed.as_secs_f64(),
            peak_memory_bytes: None,
            store: Some(store),
            count: None,
            product: None,
            words: None,
        }
    }

    /// The orbit size as text (`unknown` when not even counted).
    pub fn size_text(&self) -> String {
        self.orbit_size
            .as_ref()
            .map_or_else(|| "unknown".to_string(), Count::to_string)
    }
}
