//! `cyclorb orbit dw:… --method structure`: the vacuum orbit of a Dijkgraaf–Witten theory
//! counted as |P| / |Stab_P(S)| (cyclorb-dw's `count_vacuum_orbit`), never listed, with the
//! keys of the other counted orbits. The Poincaré sum B = Σ_{S' ∈ orbit} 1_{S'} 1_{S'}ᵀ is
//! P-invariant, so constant on each orbital O of P on pairs of states, and counting the pairs
//! (image, pair in O) two ways gives its value without listing the orbit:
//! B(O)·|O| = |orbit|·#((S × S) ∩ O) (each image g(S) meets O in as many pairs as S does).

use std::path::Path;
use std::time::Instant;

use cyclorb_dw::{count_vacuum_orbit, CountLimits, Orbitals, VacuumCount, VacuumOrbit};
use cyclorb_orbit::{InvariantReport, PoincareReport};
use num_bigint::BigUint;
use serde_json::{json, Value};

use super::dw::generator_images;
use super::envelope::{self, Source};
use super::output::{Outcome, Report};
use cyclorb_pipeline::dw_space::DwSpace;

/// Largest |X_g| whose orbitals (|X_g|² pairs) are computed for B.
const ORBITAL_LIMIT: usize = 8192;

/// A decimal as a JSON number when it fits in u64, else as a string.
fn number(n: &BigUint) -> Value {
    u64::try_from(n).map_or_else(|_| json!(n.to_string()), |v| json!(v))
}

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

/// What `cyclorb orbit dw:… --method structure` reads from its command line.
pub struct CountArgs<'a> {
    /// The `dw:` spec.
    pub spec: &'a str,
    /// The genus.
    pub genus: usize,
    /// The generating set's name.
    pub set: &'a str,
    /// The cap on Ω (`--limit`).
    pub limit: Option<usize>,
    /// Where to write the certificate (`--out`).
    pub out: Option<&'a Path>,
}

/// Run the counting route; `limit` caps the listed orbits of the parts (Ω); `out` receives
/// the certificate of an exact count (kind `dw-vacuum-set-stabiliser`).
pub fn run(args: &CountArgs, as_json: bool, started: Instant) -> Outcome {
    let (spec, genus) = (args.spec, args.genus);
    let space = match DwSpace::new(spec, genus, args.set) {
        Ok(s) => s,
        Err(e) => return Outcome::Invalid(e),
    };
    let result = match count(&space, args.limit) {
        Ok(r) => r,
        Err(e) => return Outcome::Invalid(format!("{spec} at genus {genus}: {e}")),
    };
    let names: Vec<String> = space.twists().iter().map(|(c, _)| c.to_string()).collect();
    let mut value = json!({
        "theory": spec,
        "genus": genus,
        "dimension": space.dimension(),
        "conductor": 1,
        "generators": names.len(),
        "generator_names": names,
        "method": "structure",
        "layer_sizes": null,
        "supports": null,
        "patterns_per_support": null,
    });
    let mut text = format!(
        "theory {spec} at genus {genus}: dimension |X_g| = {} over Q, {} generators\n",
        space.dimension(),
        names.len()
    );
    let outcome = match result {
        VacuumOrbit::Counted(c) => {
            let poincare = counted_poincare(&space, &c);
            let cert = certificate(&c);
            if let Some(path) = args.out {
                let mut cert = cert.clone();
                cert["theory"] = json!(spec);
                cert["genus"] = json!(genus);
                cert["generators"] = json!(generator_images(&space));
                let source = Source {
                    spec,
                    genus,
                    set: args.set,
                };
                let kind = "dw-vacuum-set-stabiliser";
                if let Err(e) = envelope::write(Some(path), kind, &source, &cert) {
                    return Outcome::Invalid(e);
                }
                text.push_str(&format!(
                    "certificate written to {} (re-check: cyclorb check {})\n",
                    path.display(),
                    path.display()
                ));
            }
            text.push_str(&counted_text(&c));
            text.push_str(&format!(
                "Poincaré sum: {}\n",
                poincare.note.as_deref().unwrap_or("")
            ));
            value["orbit_size"] = number(&c.orbit_size);
            value["saturated"] = json!(true);
            value["image_order"] = json!(c.image_order.to_string());
            value["poincare_sum"] = json!(poincare);
            value["certificate_rechecked"] = json!(false);
            value["details"] = json!({ "route": "dw-set-stabiliser", "certificate": cert });
            Outcome::Done
        }
        VacuumOrbit::Bounded(b) => {
            text.push_str(&format!(
                "orbit not counted exactly: {}\nproved bounds: {} ≤ |orbit| ≤ {}\n  lower: {}\n  upper: {}\n",
                b.reason, b.lower, b.upper, b.lower_proof, b.upper_proof
            ));
            value["orbit_size"] = Value::Null;
            value["saturated"] = json!(false);
            value["image_order"] = Value::Null;
            value["poincare_sum"] = json!({"note": "not computed: the orbit was not counted"});
            value["certificate_rechecked"] = json!(false);
            value["details"] = json!({
                "route": "dw-set-stabiliser",
                "stopped": b.reason,
                "orbit_lower_bound": number(&b.lower),
                "lower_bound_proof": b.lower_proof,
                "orbit_upper_bound": number(&b.upper),
                "upper_bound_proof": b.upper_proof,
            });
            Outcome::Stopped
        }
    };
    value["elapsed_seconds"] = json!(started.elapsed().as_secs_f64());
    value["peak_memory_bytes"] = json!(crate::runtime::peak_memory_bytes());
    outcome(Report::new(value, text, as_json))
}

/// The figures that prove the count, in the order of the argument.
pub fn certificate(c: &VacuumCount) -> Value {
    json!({
        "kind": "dw-vacuum-set-stabiliser",
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

fn counted_text(c: &VacuumCount) -> String {
    let orbits: Vec<String> = c
        .part_orbits
        .iter()
        .map(|o| format!("{} (parts of {} states)", o.size, o.part_size))
        .collect();
    format!(
        "orbit (counted as |P| / |Stab_P(S)|): {} lines\n  S = {} states in {} parts over G^ab (order {}); orbits of the parts: {}\n  |P| = {} (Schreier–Sims on X_g ⊔ Ω, {} points)\n  |Stab_P(S)| = {} arrangements × |pointwise stabiliser of the parts| {} = {}\n  image order {}\n",
        c.orbit_size,
        c.vacuum_states,
        c.parts,
        c.abelian_order,
        orbits.join(", "),
        c.image_order,
        c.degree,
        c.arrangements,
        c.pointwise_stabiliser_order,
        c.stabiliser_order,
        c.image_order
    )
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
