//! The structural route for `cyclorb orbit --method structure` and `cyclorb image`: count the
//! vacuum orbit and the projective image through the monomial structure of the
//! representation, or else through its imprimitive structure (cyclorb-structure), re-check
//! the certificate, and report with the keys of the enumerating route.

use std::time::Instant;

use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_orbit::LabelledEntry;
use cyclorb_structure::{
    analyse, analyse_imprimitive, recheck, recheck_imprimitive, ImprimitiveOptions,
    ImprimitiveReport, StructureError, StructureOptions, StructureReport,
};
use serde_json::{json, Value};

/// An analysis re-checked: the inner `Err` carries the reason when the theory lacks the
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
        "peak_memory_bytes": cyclorb_orbit::peak_memory_bytes(),
        "details": { "image": r.image, "orbit": r.orbit, "power": r.power },
    })
}

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

/// The imprimitive route (cyclorb-structure's `analyse_imprimitive`) and the re-check of
/// its exact claims (the derived data, re-derived by the producer's own steps, are left to
/// `cyclorb check`), for a theory without a monomial structure (see [`rechecked`]).
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

/// B's vacuum column B_{j,vac} by comb-basis labels (B = Σ_O β_O·Π_O), when the commutant
/// is spanned by the sector projectors.
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

/// The orbit report (interface keys) of an orbit counted through the imprimitive structure.
pub fn imprimitive_orbit_json(
    space: &BlockSpace,
    r: &ImprimitiveReport,
    started: Instant,
) -> Result<Value, String> {
    let decided = r.sector_orbits.iter().all(|o| o.coefficient.is_some());
    let prefactor = (decided && r.sector_orbits.len() == 1)
        .then(|| r.sector_orbits[0].coefficient.clone())
        .flatten();
    Ok(json!({
        "theory": r.theory,
        "genus": r.genus,
        "dimension": r.dimension,
        "conductor": r.conductor,
        "generators": r.generators.len(),
        "generator_names": r.generators,
        "method": "structure",
        "structure": "imprimitive",
        "orbit_size": count_value(&r.orbit_size),
        "saturated": true,
        "layer_sizes": null,
        "supports": count_value(&(
            r.sector_supports.parse::<num_bigint::BigUint>().map_err(|e| e.to_string())?
                * r.line_tuples_per_sector_support.parse::<num_bigint::BigUint>().map_err(|e| e.to_string())?
        ).to_string()),
        "patterns_per_support": count_value(&r.patterns_per_support),
        "decomposition": {
            "sector_supports": count_value(&r.sector_supports),
            "line_tuples_per_sector_support": count_value(&r.line_tuples_per_sector_support),
            "patterns_per_support": count_value(&r.patterns_per_support),
            "support_sectors": r.support_sectors,
            "sectors": r.sectors,
            "sector_dimensions": r.sector_dimensions,
            "component_lines": r.component_lines,
            "power": r.power,
        },
        "poincare_sum": {
            "is_scalar": if decided { json!(r.sector_orbits.len() == 1) } else { Value::Null },
            "prefactor": prefactor,
            "invariants": if prefactor.is_some() { json!([]) } else { Value::Null },
            "commutant_dimension": r.commutant_dimension,
            "sector_terms": r.sector_orbits,
            "vacuum_column": vacuum_column(space, r)?,
            "note": "B = Σ_O β_O·P_O·G⁻¹ over the orbits O of sectors (P_O the G-orthogonal projector onto them), β_O = |orbit|·‖P_O v₀‖²_G / dim, when every sector's commutant is 1-dimensional (certified); vacuum_column lists B_{j,vac}; `invariants` is null (the terms are `sector_terms`) unless B is scalar",
        },
        "image_order": r.image_order,
        "image": {
            "block_permutation_order": r.block_permutation_order,
            "block_kernel_order": r.block_kernel_order,
            "line_permutation_order": r.line_permutation_order,
            "kernel_order": r.kernel_order,
            "kernel_scalars": r.kernel_scalars,
        },
        "certificate_rechecked": true,
        "recheck": "the exact claims (vacuum components, line monomials, spanning, sectors, block permutations); `cyclorb check` re-derives the rest",
        "elapsed_seconds": started.elapsed().as_secs_f64(),
        "peak_memory_bytes": cyclorb_orbit::peak_memory_bytes(),
    }))
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
