//! The text of a counted orbit (`cyclorb orbit --method structure`); the count itself, its
//! re-check and its answer are `cyclorb_pipeline::counting`.

use cyclorb_structure::StructureReport;

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
