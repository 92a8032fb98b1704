//! The counting route (`--method structure`, and the first route of the image decision):
//! the vacuum orbit and the projective image counted through the monomial structure of
//! the representation, or else through its imprimitive structure (`cyclorb-structure`),
//! with the certificate re-checked before any answer is given.

use std::time::Duration;

use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_orbit::{LabelledEntry, PoincareReport};
use cyclorb_structure::{
    analyse, analyse_imprimitive, recheck, recheck_imprimitive, ImprimitiveOptions,
    ImprimitiveReport, StructureError, StructureOptions, StructureReport,
};
use num_bigint::BigUint;

use crate::answer::{
    Count, CountFigures, ImageFactors, ImprimitiveFigures, OrbitAnswer, SectorDecomposition,
};
use crate::method::OrbitMethod;

/// An analysis re-checked. The inner `Err` carries the reason when the theory lacks the
/// structure; the outer `Err` is a failure (including a certificate that does not re-check).
fn rechecked<R>(
    analysis: Result<R, StructureError>,
    recheck: impl FnOnce(&R) -> Result<(), StructureError>,
) -> Result<Result<R, String>, String> {
    match analysis {
        Ok(report) => {
            recheck(&report)
                .map_err(|e| format!("the structure certificate does not re-check: {e}"))?;
            Ok(Ok(report))
        }
        Err(StructureError::Absent(reason)) => Ok(Err(reason)),
        Err(e) => Err(e.to_string()),
    }
}

/// Analyse through the monomial structure and re-check (see [`rechecked`]).
pub fn counted(
    space: &BlockSpace,
    set: GeneratingSet,
) -> Result<Result<StructureReport, String>, String> {
    let options = StructureOptions {
        generating_set: set,
        ..StructureOptions::default()
    };
    rechecked(analyse(space, &options), |r| recheck(space, &r.certificate))
}

/// Analyse through the imprimitive structure and re-check its exact claims (vacuum
/// components, line monomials, spanning, sectors, block permutations); the data derived
/// by the producer's own steps are left to `cyclorb check` (see [`rechecked`]). For a
/// theory without a monomial structure.
pub fn counted_imprimitive(
    space: &BlockSpace,
    set: GeneratingSet,
) -> Result<Result<ImprimitiveReport, String>, String> {
    let options = ImprimitiveOptions {
        generating_set: set,
        ..ImprimitiveOptions::default()
    };
    rechecked(analyse_imprimitive(space, &options), |r| {
        recheck_imprimitive(space, &r.certificate, None)
    })
}

/// A counted orbit through either structure.
pub enum Counted {
    /// The monomial structure.
    Monomial(Box<StructureReport>),
    /// The imprimitive structure.
    Imprimitive(Box<ImprimitiveReport>),
}

impl Counted {
    /// The orbit answer (see [`counted_answer`] and [`imprimitive_answer`]).
    pub fn answer(&self, space: &BlockSpace, elapsed: Duration) -> Result<OrbitAnswer, String> {
        match self {
            Counted::Monomial(r) => counted_answer(space, r, elapsed),
            Counted::Imprimitive(r) => imprimitive_answer(space, r, elapsed),
        }
    }
}

/// The monomial structure, else the imprimitive one; `Ok(Err(reasons))` when neither
/// exists (both reasons in one sentence).
pub fn counted_any(
    space: &BlockSpace,
    set: GeneratingSet,
) -> Result<Result<Counted, String>, String> {
    let monomial = match counted(space, set)? {
        Ok(r) => return Ok(Ok(Counted::Monomial(Box::new(r)))),
        Err(reason) => reason,
    };
    Ok(match counted_imprimitive(space, set)? {
        Ok(r) => Ok(Counted::Imprimitive(Box::new(r))),
        Err(reason) => Err(format!(
            "no monomial structure ({monomial}) and no imprimitive one ({reason})"
        )),
    })
}

/// B = λ·G⁻¹ entry by entry over the comb basis: the diagonal entries (x, x, λ/G_x),
/// keyed by the basis label tuples (the keys of `orbit --json`'s `poincare_sum.entries`).
pub fn scalar_sum_entries(
    space: &BlockSpace,
    prefactor: &str,
) -> Result<Vec<LabelledEntry>, String> {
    let theory = space.theory();
    let field = theory.field();
    let lambda = field.parse(prefactor).map_err(|e| e.to_string())?;
    space
        .states()
        .iter()
        .zip(space.form())
        .map(|(state, g)| {
            let value = field.div(&lambda, g).map_err(|e| e.to_string())?;
            let (re, im) = value.to_complex();
            let label = state.describe(theory);
            Ok(LabelledEntry {
                row: label.clone(),
                column: label,
                value: value.to_string(),
                approx: [re, im],
            })
        })
        .collect()
}

/// A decimal count of the structure's report as a [`Count`].
fn count(decimal: &str) -> Result<Count, String> {
    decimal
        .parse::<BigUint>()
        .map(Count)
        .map_err(|_| format!("the structure reported {decimal:?} as a count"))
}

/// The orbit answer of a counted orbit (its certificate already re-checked by
/// [`counted`]): the count, and B = λ·G⁻¹ by Schur's lemma when the commutant is
/// 1-dimensional (with its entries by basis labels). `elapsed` is the caller's wall time.
pub fn counted_answer(
    space: &BlockSpace,
    r: &StructureReport,
    elapsed: Duration,
) -> Result<OrbitAnswer, String> {
    let entries = match &r.prefactor {
        Some(lambda) => Some(
            scalar_sum_entries(space, lambda).map_err(|e| format!("B = λ·G⁻¹ by entries: {e}"))?,
        ),
        None => None,
    };
    let scalar = r.prefactor.is_some();
    Ok(OrbitAnswer {
        theory: Some(r.theory.clone()),
        genus: Some(r.genus as u32),
        dimension: r.dimension,
        conductor: r.conductor,
        generators: r.generators.len(),
        generator_names: r.generators.clone(),
        method: OrbitMethod::Structure,
        orbit_size: Some(count(&r.orbit_size)?),
        saturated: true,
        stop_reason: None,
        layer_sizes: None,
        poincare_sum: PoincareReport {
            is_scalar: scalar.then_some(true),
            prefactor: r.prefactor.clone(),
            invariants: scalar.then(Vec::new),
            commutant_dimension: Some(r.commutant_dimension),
            entries,
            note: Some(
                "by Schur's lemma: the commutant is certified 1-dimensional and tr(B·G) = |orbit|·⟨v₀,v₀⟩_G"
                    .into(),
            ),
            ..PoincareReport::default()
        },
        elapsed_seconds: elapsed.as_secs_f64(),
        peak_memory_bytes: None,
        store: None,
        count: Some(CountFigures {
            supports: Some(count(&r.supports)?),
            patterns_per_support: Some(count(&r.patterns_per_support)?),
            image_order: Some(r.image_order.clone()),
            certificate_rechecked: true,
            details: Some(serde_json::json!({ "image": r.image, "orbit": r.orbit, "power": r.power })),
            imprimitive: None,
        }),
        product: None,
        words: None,
    })
}

/// B's vacuum column B_{j,vac} by comb-basis labels.
fn vacuum_column(space: &BlockSpace, r: &ImprimitiveReport) -> Result<Vec<LabelledEntry>, String> {
    let theory = space.theory();
    let field = theory.field();
    let vacuum = space.states()[space.basis().vacuum()].describe(theory);
    r.vacuum_column
        .iter()
        .map(|(j, text)| {
            let value = field.parse(text).map_err(|e| e.to_string())?;
            let (re, im) = value.to_complex();
            Ok(LabelledEntry {
                row: space.states()[*j as usize].describe(theory),
                column: vacuum.clone(),
                value: text.clone(),
                approx: [re, im],
            })
        })
        .collect()
}

/// The orbit answer of an orbit counted through the imprimitive structure (its exact
/// claims already re-checked by [`counted_imprimitive`]). B = Σ_O β_O·P_O·G⁻¹ over the
/// orbits O of sectors when every sector's commutant is 1-dimensional (certified), with
/// β_O = |orbit|·‖P_O v₀‖²_G / dim ⊕_{σ∈O} W_σ; scalar exactly when there is one orbit.
pub fn imprimitive_answer(
    space: &BlockSpace,
    r: &ImprimitiveReport,
    elapsed: Duration,
) -> Result<OrbitAnswer, String> {
    let decided = r.sector_orbits.iter().all(|o| o.coefficient.is_some());
    let prefactor = (decided && r.sector_orbits.len() == 1)
        .then(|| r.sector_orbits[0].coefficient.clone())
        .flatten();
    let sector_supports = count(&r.sector_supports)?;
    let tuples = count(&r.line_tuples_per_sector_support)?;
    let patterns = count(&r.patterns_per_support)?;
    let sector_terms = r
        .sector_orbits
        .iter()
        .map(|o| serde_json::to_value(o).map_err(|e| e.to_string()))
        .collect::<Result<Vec<_>, String>>()?;
    Ok(OrbitAnswer {
        theory: Some(r.theory.clone()),
        genus: Some(r.genus as u32),
        dimension: r.dimension,
        conductor: r.conductor,
        generators: r.generators.len(),
        generator_names: r.generators.clone(),
        method: OrbitMethod::Structure,
        orbit_size: Some(count(&r.orbit_size)?),
        saturated: true,
        stop_reason: None,
        layer_sizes: None,
        poincare_sum: PoincareReport {
            is_scalar: decided.then_some(r.sector_orbits.len() == 1),
            invariants: prefactor.as_ref().map(|_| Vec::new()),
            prefactor,
            commutant_dimension: Some(r.commutant_dimension),
            sector_terms: Some(sector_terms),
            vacuum_column: Some(vacuum_column(space, r)?),
            note: Some(
                "B = Σ_O β_O·P_O·G⁻¹ over the orbits O of sectors (P_O the G-orthogonal projector onto them), β_O = |orbit|·‖P_O v₀‖²_G / dim, when every sector's commutant is 1-dimensional (certified); vacuum_column lists B_{j,vac}; `invariants` is null (the terms are `sector_terms`) unless B is scalar"
                    .into(),
            ),
            ..PoincareReport::default()
        },
        elapsed_seconds: elapsed.as_secs_f64(),
        peak_memory_bytes: None,
        store: None,
        count: Some(CountFigures {
            supports: Some(Count(&sector_supports.0 * &tuples.0)),
            patterns_per_support: Some(patterns.clone()),
            image_order: Some(r.image_order.clone()),
            certificate_rechecked: true,
            details: None,
            imprimitive: Some(ImprimitiveFigures {
                structure: "imprimitive".into(),
                decomposition: SectorDecomposition {
                    sector_supports,
                    line_tuples_per_sector_support: tuples,
                    patterns_per_support: patterns,
                    support_sectors: r.support_sectors,
                    sectors: r.sectors,
                    sector_dimensions: r.sector_dimensions.clone(),
                    component_lines: r.component_lines,
                    power: r.power,
                },
                image: ImageFactors {
                    block_permutation_order: r.block_permutation_order.clone(),
                    block_kernel_order: r.block_kernel_order.clone(),
                    line_permutation_order: r.line_permutation_order.clone(),
                    kernel_order: r.kernel_order.clone(),
                    kernel_scalars: r.kernel_scalars,
                },
                recheck: "the exact claims (vacuum components, line monomials, spanning, sectors, block permutations); `cyclorb check` re-derives the rest".into(),
            }),
        }),
        product: None,
        words: None,
    })
}
