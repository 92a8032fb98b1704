//! The counting route (`--method structure`, and the first route of the image decision):
//! the vacuum orbit and the projective image counted through the monomial structure of
//! the representation (`cyclorb-structure`), with the certificate re-checked before any
//! answer is given.

use std::time::Duration;

use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_orbit::{LabelledEntry, PoincareReport};
use cyclorb_structure::{analyse, recheck, StructureOptions, StructureReport};
use num_bigint::BigUint;

use crate::answer::{Count, CountFigures, OrbitAnswer};
use crate::method::OrbitMethod;

/// Analyse and re-check. The inner `Err` carries the reason when the theory lacks the
/// structure; the outer `Err` is a failure (including a certificate that does not re-check).
pub fn counted(
    space: &BlockSpace,
    set: GeneratingSet,
) -> Result<Result<StructureReport, String>, String> {
    let options = StructureOptions {
        generating_set: set,
        ..StructureOptions::default()
    };
    match analyse(space, &options) {
        Ok(report) => {
            recheck(space, &report.certificate)
                .map_err(|e| format!("the structure certificate does not re-check: {e}"))?;
            Ok(Ok(report))
        }
        Err(e) if e.is_absent() => Ok(Err(e.to_string())),
        Err(e) => Err(e.to_string()),
    }
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
            details: serde_json::json!({ "image": r.image, "orbit": r.orbit, "power": r.power }),
        }),
        product: None,
        words: None,
    })
}
