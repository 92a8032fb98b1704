//! The text of a counted orbit (`cyclorb orbit --method structure`), through the monomial
//! or the imprimitive structure; the count itself, its re-check and its answer are
//! `cyclorb_pipeline::counting`.

use cyclorb_structure::{ImprimitiveReport, StructureReport};

/// The first line of a counted orbit's text.
fn header(
    theory: &str,
    genus: usize,
    dimension: usize,
    conductor: u32,
    generators: usize,
) -> String {
    format!(
        "theory {theory} at genus {genus}: dimension {dimension} over Q(ζ_{conductor}), {generators} generators\n"
    )
}

/// The text form of a counted orbit; `sum_entries` (B by labels, already as text) follows
/// the line of the Poincaré sum.
pub fn orbit_text(r: &StructureReport, sum_entries: &str) -> String {
    let mut t = header(
        &r.theory,
        r.genus,
        r.dimension,
        r.conductor,
        r.generators.len(),
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

/// The text form of an orbit counted through the imprimitive structure.
pub fn imprimitive_orbit_text(r: &ImprimitiveReport) -> String {
    let dims: Vec<String> = r
        .sector_dimensions
        .iter()
        .map(|(d, n)| format!("{n} of dimension {d}"))
        .collect();
    let mut t = header(
        &r.theory,
        r.genus,
        r.dimension,
        r.conductor,
        r.generators.len(),
    );
    t.push_str(&format!(
        "sectors (joint eigenspaces of the {}-th twist powers): {} ({}); {} component lines\n",
        r.power,
        r.sectors,
        dims.join(", "),
        r.component_lines
    ));
    t.push_str(&format!(
        "orbit (counted through the imprimitive structure): {} lines = {} sector supports × {} component-line tuples × {} phase patterns\n",
        r.orbit_size, r.sector_supports, r.line_tuples_per_sector_support, r.patterns_per_support
    ));
    let decided = r.sector_orbits.iter().all(|o| o.coefficient.is_some());
    if decided {
        t.push_str(&format!(
            "Poincaré sum: B = Σ_O β_O·P_O·G⁻¹ over {} orbits of sectors (commutant of dimension {}):\n",
            r.sector_orbits.len(),
            r.commutant_dimension
        ));
        for o in &r.sector_orbits {
            t.push_str(&format!(
                "  β = {} on {} sector(s) of dimension {} (first sector {}; ‖P_O v₀‖² = {})\n",
                o.coefficient.as_deref().unwrap_or("?"),
                o.sectors.len(),
                o.sector_dimension,
                o.sectors[0],
                o.vacuum_weight
            ));
        }
    } else {
        t.push_str(&format!(
            "Poincaré sum: not decided by this route (a sector's commutant is larger than the scalars; commutant of dimension {})\n",
            r.commutant_dimension
        ));
    }
    t.push_str(&format!(
        "projective image order {} = |block permutations| {} × |block kernel| {} (= |P_L| {} × |K| {} / |K ∩ scalars| {})\ncertificate re-checked (exact claims; `cyclorb check` re-derives the rest)\n",
        r.image_order,
        r.block_permutation_order,
        r.block_kernel_order,
        r.line_permutation_order,
        r.kernel_order,
        r.kernel_scalars
    ));
    t
}
