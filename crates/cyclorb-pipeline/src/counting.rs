//! The counting route (`--method structure`, and the first route of the image decision):
//! the vacuum orbit and the projective image counted through the monomial structure of
//! the representation (`cyclorb-structure`), with the certificate re-checked before any
//! answer is given.

use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_orbit::LabelledEntry;
use cyclorb_structure::{analyse, recheck, StructureOptions, StructureReport};

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
