//! The structural route for `cyclorb orbit --method structure` and `cyclorb image`: count the
//! vacuum orbit and the projective image through the monomial structure of the
//! representation (cyclorb-structure), re-check the certificate, and report with the keys of
//! the enumerating route.

use std::time::Instant;

use cyclorb_structure::StructureReport;
use serde_json::{json, Value};

/// An exact decimal as a JSON number when it fits in u64, else as a string.
fn count_value(decimal: &str) -> Value {
    decimal
        .parse::<u64>()
        .map_or_else(|_| json!(decimal), |n| json!(n))
}

/// The orbit report (interface keys) of a counted orbit.
pub fn orbit_json(r: &StructureReport, started: Instant) -> Value {
    json!({
        "theory": r.theory,
        "genus": r.genus,
        "dimension": r.dimension,
        "conductor": r.conductor,
        "generators": r.generators.len(),
        "generator_names": r.generators,
        "method": "structure",
        "orbit_size": count_value(&r.orbit_size),
        "saturated": true,
        "layer_sizes": null,
        "supports": count_value(&r.supports),
        "patterns_per_support": count_value(&r.patterns_per_support),
        "poincare_sum": {
            "is_scalar": if r.prefactor.is_some() { json!(true) } else { Value::Null },
            "prefactor": r.prefactor,
            "invariants": if r.prefactor.is_some() { json!([]) } else { Value::Null },
            "commutant_dimension": r.commutant_dimension,
            "note": "by Schur's lemma: the commutant is certified 1-dimensional and tr(B·G) = |orbit|·⟨v₀,v₀⟩_G",
        },
        "image_order": r.image_order,
        "certificate_rechecked": true,
        "elapsed_seconds": started.elapsed().as_secs_f64(),
        "peak_memory_bytes": crate::runtime::peak_memory_bytes(),
        "details": { "image": r.image, "orbit": r.orbit, "power": r.power },
    })
}

/// The text form of a counted orbit; `sum_entries` (B by labels, already as text) follows
/// the line of the Poincaré sum.
pub fn orbit_text(r: &StructureReport, sum_entries: &str) -> String {
    let mut t = format!(
        "theory {} at genus {}: dimension {} over Q(ζ_{}), {} generators\n",
        r.theory,
        r.genus,
        r.dimension,
        r.conductor,
        r.generators.len()
    );
    t.push_str(&format!(
        "orbit (counted through the monomial structure): {} lines = {} supports × {} phase patterns\n",
        r.orbit_size, r.supports, r.patterns_per_support
    ));
    match &r.prefactor {
        Some(l) => t.push_str(&format!(
            "Poincaré sum: B = {l} · G⁻¹ (Schur: commutant of dimension 1)\n"
        )),
        None => t.push_str(&format!(
            "Poincaré sum: not decided by this route (commutant of dimension {})\n",
            r.commutant_dimension
        )),
    }
    t.push_str(sum_entries);
    t.push_str(&format!(
        "projective image order {} = |P| {} × |K| {} / |K ∩ scalars| {}\ncertificate re-checked\n",
        r.image_order, r.image.permutation_order, r.image.kernel_order, r.image.kernel_scalars
    ));
    t
}
