//! The counting route of untwisted Dijkgraaf–Witten theories (`dw:GROUP`, `--method
//! structure`): the vacuum orbit counted as |P| / |Stab_P(S)| (cyclorb-dw's
//! `count_vacuum_orbit`), never listed, as an [`OrbitAnswer`] like the other counted orbits.
//!
//! The Poincaré sum B = Σ_{S' ∈ orbit} 1_{S'} 1_{S'}ᵀ is P-invariant, so constant on each
//! orbital O of P on pairs of states, and counting the pairs (image, pair in O) two ways
//! gives its value without listing the orbit: B(O)·|O| = |orbit|·#((S × S) ∩ O) (each image
//! g(S) meets O in as many pairs as S does; docs/dijkgraaf-witten.md).

use std::time::Duration;

use cyclorb_dw::{count_vacuum_orbit, CountLimits, Orbitals, VacuumCount, VacuumOrbit};
use cyclorb_orbit::{InvariantReport, PoincareReport, StopReason};
use num_bigint::BigUint;
use serde_json::{json, Value};

use crate::answer::{Count, CountFigures, OrbitAnswer};
use crate::dw_space::DwSpace;
use crate::method::OrbitMethod;

/// Largest |X_g| whose orbitals (|X_g|² pairs) are computed for B.
const ORBITAL_LIMIT: usize = 8192;

/// The route's name in `details.route` and the certificate's kind.
pub const ROUTE: &str = "dw-set-stabiliser";

/// The kind of the certificate of an exact count (`--out`).
pub const CERTIFICATE_KIND: &str = "dw-vacuum-set-stabiliser";

/// The note of a Poincaré sum not computed because the count stopped at its caps.
pub const NOT_COUNTED: &str = "not computed: the orbit was not counted";

/// The count of an untwisted `dw:` space under `limit` subsets of Ω (the default cap when
/// `None`); a twisted theory is refused (its generators are not permutations).
pub fn count(space: &DwSpace, limit: Option<usize>) -> Result<VacuumOrbit, String> {
    if space.is_twisted() {
        return Err(
            "the counting route covers untwisted dw: theories (the twisted generators carry phases); use --method enumerate"
                .into(),
        );
    }
    let mut limits = CountLimits::default();
    if let Some(l) = limit {
        limits.max_part_subsets = l;
    }
    count_vacuum_orbit(space.bundles(), space.twists(), limits).map_err(|e| e.to_string())
}

/// Build X_g of `spec` with the twists of the set named `set` and count the vacuum orbit
/// under `limit` (see [`count`]); errors name the theory and the genus.
pub fn counted_orbit(
    spec: &str,
    genus: usize,
    set: &str,
    limit: Option<usize>,
) -> Result<(DwSpace, VacuumOrbit), String> {
    let space = DwSpace::new(spec, genus, set)?;
    let orbit = count(&space, limit).map_err(|e| format!("{spec} at genus {genus}: {e}"))?;
    Ok((space, orbit))
}

/// The orbit answer of a count: the size, B over orbitals and |P| with the certificate's
/// figures (`details`: the route and the certificate) when counted; when the caps stopped
/// it, no size, `stop_reason` `limit` and the proved bounds in `details`. `elapsed` is the
/// caller's wall time.
pub fn answer(space: &DwSpace, orbit: &VacuumOrbit, elapsed: Duration) -> OrbitAnswer {
    let names: Vec<String> = space.twists().iter().map(|(c, _)| c.to_string()).collect();
    let (orbit_size, poincare_sum, image_order, details) = match orbit {
        VacuumOrbit::Counted(c) => (
            Some(Count(c.orbit_size.clone())),
            counted_poincare(space, c),
            Some(c.image_order.to_string()),
            json!({ "route": ROUTE, "certificate": certificate(c) }),
        ),
        VacuumOrbit::Bounded(b) => (
            None,
            PoincareReport::missing(NOT_COUNTED),
            None,
            json!({
                "route": ROUTE,
                "stopped": b.reason,
                "orbit_lower_bound": Count(b.lower.clone()),
                "lower_bound_proof": b.lower_proof,
                "orbit_upper_bound": Count(b.upper.clone()),
                "upper_bound_proof": b.upper_proof,
            }),
        ),
    };
    let saturated = orbit_size.is_some();
    OrbitAnswer {
        theory: Some(space.spec().to_string()),
        genus: u32::try_from(space.bundles().genus()).ok(),
        dimension: space.dimension(),
        conductor: 1,
        generators: names.len(),
        generator_names: names,
        method: OrbitMethod::Structure,
        orbit_size,
        saturated,
        stop_reason: (!saturated).then_some(StopReason::Limit),
        layer_sizes: None,
        poincare_sum,
        elapsed_seconds: elapsed.as_secs_f64(),
        peak_memory_bytes: None,
        store: None,
        count: Some(CountFigures {
            supports: None,
            patterns_per_support: None,
            image_order,
            certificate_rechecked: false,
            details: Some(details),
            imprimitive: None,
        }),
        product: None,
        words: None,
    }
}

/// The figures that prove the count, in the order of the argument.
pub fn certificate(c: &VacuumCount) -> Value {
    json!({
        "kind": CERTIFICATE_KIND,
        "vacuum_states": c.vacuum_states,
        "abelianisation_order": c.abelian_order,
        "parts": c.parts,
        "part_orbits": c.part_orbits.iter().map(|o| json!({
            "part_size": o.part_size,
            "orbit_size": o.size,
            "parts_inside": o.parts_inside,
        })).collect::<Vec<_>>(),
        "degree": c.degree,
        "image_order": c.image_order.to_string(),
        "basic_orbit_lengths": c.basic_orbit_lengths,
        "pointwise_stabiliser_order": c.pointwise_stabiliser_order.to_string(),
        "arrangements": c.arrangements,
        "search_nodes": c.search_nodes,
        "stabiliser_order": c.stabiliser_order.to_string(),
        "orbit_size": c.orbit_size.to_string(),
    })
}

/// B on the orbitals of P on X_g, from B(O)·|O| = |orbit|·#((S × S) ∩ O) (checked to divide).
pub fn counted_poincare(space: &DwSpace, c: &VacuumCount) -> PoincareReport {
    let d = space.dimension();
    let norm = c.vacuum_states;
    let mut report = PoincareReport {
        seed_norm: Some(norm.to_string()),
        ..PoincareReport::default()
    };
    if d > ORBITAL_LIMIT {
        report.note = Some(format!(
            "not computed: the orbitals of {d} states exceed {ORBITAL_LIMIT}"
        ));
        return report;
    }
    let perms: Vec<&[u32]> = space.twists().iter().map(|(_, p)| p.as_slice()).collect();
    let orbitals = match Orbitals::new(d, &perms) {
        Ok(o) => o,
        Err(e) => {
            report.note = Some(format!("not computed: {e}"));
            return report;
        }
    };
    let mut size = vec![0u64; orbitals.count()];
    for i in 0..d {
        for j in 0..d {
            size[orbitals.of(i, j)] += 1;
        }
    }
    let vacuum = space.bundles().vacuum();
    let mut meets = vec![0u64; orbitals.count()];
    for &i in &vacuum {
        for &j in &vacuum {
            meets[orbitals.of(i as usize, j as usize)] += 1;
        }
    }
    let mut coefficient = Vec::with_capacity(orbitals.count());
    for (o, (&n, &m)) in size.iter().zip(&meets).enumerate() {
        let total = &c.orbit_size * m;
        let (q, r) = (&total / n, &total % n);
        if r != BigUint::default() {
            report.trace_check = Some(false);
            report.note = Some(format!(
                "|orbit|·#(S×S ∩ O) is not divisible by |O| on orbital {o}: not invariant"
            ));
            return report;
        }
        coefficient.push(q);
    }
    let trace: BigUint = (0..d).map(|i| &coefficient[orbitals.of(i, i)]).sum();
    // B is a scalar iff it vanishes off the diagonal and is constant on it
    let diagonal: Vec<bool> = {
        let mut on = vec![false; orbitals.count()];
        (0..d).for_each(|i| on[orbitals.of(i, i)] = true);
        on
    };
    let zero = BigUint::default();
    let first = &coefficient[orbitals.of(0, 0)];
    let scalar = coefficient
        .iter()
        .zip(&diagonal)
        .all(|(v, &on)| if on { v == first } else { *v == zero });
    let mut values: Vec<BigUint> = coefficient
        .iter()
        .filter(|v| **v != zero)
        .cloned()
        .collect();
    values.sort_unstable_by(|a, b| b.cmp(a));
    values.dedup();
    report.is_scalar = Some(scalar);
    report.prefactor = scalar.then(|| first.to_string());
    report.trace_check = Some(trace == &c.orbit_size * BigUint::from(norm));
    report.commutant_dimension = Some(orbitals.count());
    report.physical_basis = Some(true);
    report.invariants = Some(
        values
            .iter()
            .map(|v| InvariantReport {
                coefficient: v.to_string(),
                matrix: Vec::new(),
                entries: Vec::new(),
            })
            .collect(),
    );
    report.note = Some(format!(
        "B = Σ coefficient × (indicator of the pairs of states where B takes that value), {} distinct non-zero values over the {} orbitals of P on pairs of states (the commutant dimension), from B(O)·|O| = |orbit|·#((S×S) ∩ O); matrices not printed by the counting route; {}",
        values.len(),
        orbitals.count(),
        if scalar {
            format!("B = {first}·1 (scalar)")
        } else {
            "no λ: B is not a multiple of the identity".to_string()
        }
    ));
    report
}
