//! The certified answers of a run, from the library of certificates (`cyclorb-cert`):
//! commutant dimension, image order, witness of infinite image.
//!
//! The image order comes from the permutation action on a saturated orbit (Schreier–Sims
//! after the faithfulness lemma, the orbit extended by further orbits when it alone does not
//! prove faithfulness, as in `cyclorb image`) when the lines fit in `image.max_lines`, else
//! from enumerating the image modulo scalars up to a cap. An unsaturated orbit of N lines
//! shows the image has at least N elements, so enumeration is not tried when N exceeds the
//! cap. A witness is searched for only when the image is not already proven finite, on the
//! factors of a Deligne product first (a witness there lifts, see `lifted`).

use cyclorb_cert::{commutant, CommutantOptions, CommutantRoute, ProvedGenerators, WitnessOptions};
use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_orbit::{Orbit, OrbitProblem};

use crate::image::{
    enumerate_image, image_of_orbit, ImageBounds as DecisionBounds, ImageDecision, ImageEvidence,
    ImageRoute,
};
use crate::lifted::find_lifted;
use crate::witness::search_generators;

use super::plan::{ImageBounds, WitnessBounds};
use super::result::{CommutantAnswer, ImageAnswer, WitnessAnswer};

/// The orbit problem's generators as the certificates' generator set (with the form).
pub fn certificate_generators(problem: &OrbitProblem) -> Result<ProvedGenerators, String> {
    problem
        .generators()
        .clone()
        .prove()
        .map_err(|e| format!("generators: {e}"))
}

/// The certified commutant dimension.
pub fn commutant_answer(gens: &ProvedGenerators) -> Result<CommutantAnswer, String> {
    let cert =
        commutant(gens, CommutantOptions::default()).map_err(|e| format!("commutant: {e}"))?;
    Ok(CommutantAnswer {
        commutant_dimension: cert.dimension,
        primes: cert.bounds.iter().map(|b| b.prime).collect(),
        route: match cert.route {
            CommutantRoute::Modular => "modular".into(),
            CommutantRoute::Exact => "exact".into(),
        },
    })
}

fn undecided(note: String) -> ImageAnswer {
    ImageAnswer {
        finite: None,
        order: None,
        route: ImageRoute::Undecided,
        note: Some(note),
    }
}

/// The sweep's answer of a decision; the note joins what was passed over (`before`, then
/// the decision's steps) with the reason it is undecided, or names the added orbits.
fn answer_of(decision: ImageDecision, before: Option<String>) -> ImageAnswer {
    let mut parts: Vec<String> = before.into_iter().chain(decision.steps).collect();
    parts.extend(decision.reason);
    if let Some(ImageEvidence::Orbit {
        certificate,
        added_seeds,
        ..
    }) = &decision.evidence
    {
        if !added_seeds.is_empty() {
            parts.push(format!(
                "{} lines: the vacuum orbit with the orbits of {}",
                certificate.lines,
                added_seeds.join(", ")
            ));
        }
    }
    ImageAnswer {
        finite: decision.finite,
        order: decision.order,
        route: decision.route,
        note: (!parts.is_empty()).then(|| parts.join("; ")),
    }
}

/// The order of the projective image, when a certificate decides it within the bounds:
/// Schreier–Sims on the saturated orbit (`crate::image`), else enumeration.
pub fn image_answer(
    gens: &ProvedGenerators,
    problem: &OrbitProblem,
    orbit: &Orbit,
    bounds: &ImageBounds,
    threads: usize,
) -> Result<ImageAnswer, String> {
    if !orbit.is_saturated() {
        return Ok(undecided(format!(
            "the orbit is not closed after {} lines",
            orbit.len()
        )));
    }
    let decision_bounds = DecisionBounds {
        orbit_limit: bounds.max_lines,
        enumeration_cap: bounds.enumeration_cap,
        orbit_limit_name: "image.max_lines",
        enumeration_cap_name: "image.enumeration_cap",
    };
    if orbit.len() > bounds.max_lines {
        if orbit.len() > bounds.enumeration_cap {
            return Ok(undecided(format!(
                "the orbit has {} lines, above image.max_lines and image.enumeration_cap",
                orbit.len()
            )));
        }
        let passed = format!("the orbit has more than {} lines", bounds.max_lines);
        return Ok(answer_of(
            enumerate_image(gens, &decision_bounds)?,
            Some(passed),
        ));
    }
    Ok(answer_of(
        image_of_orbit(gens, problem, orbit, &decision_bounds, threads, true)?,
        None,
    ))
}

/// The search options of the plan's witness bounds.
fn witness_options(bounds: &WitnessBounds) -> WitnessOptions {
    WitnessOptions {
        depth: bounds.depth,
        tries: bounds.tries,
        ..WitnessOptions::default()
    }
}

/// A witness certified on a factor of a Deligne product (re-checked there; see `lifted`),
/// or `None` when the theory is no product or no factor yields one within the bounds.
pub fn lifted_witness_answer(
    space: &BlockSpace,
    set: GeneratingSet,
    bounds: &WitnessBounds,
) -> Result<Option<WitnessAnswer>, String> {
    let found = find_lifted(space.theory(), space.genus(), set, &witness_options(bounds))?;
    Ok(found.map(|lifted| WitnessAnswer {
        found: true,
        word: lifted.certificate.word.clone(),
        certificate: Some(lifted.certificate),
        words_tried: None,
        note: Some(format!(
            "certified on the {} factor {}; it lifts to the product",
            lifted.lifted_from_factor.factor, lifted.lifted_from_factor.theory
        )),
        lifted_from_factor: Some(lifted.lifted_from_factor),
    }))
}

/// A certified word of infinite projective order, searched within the bounds on the
/// generators themselves.
pub fn witness_answer(
    gens: &ProvedGenerators,
    bounds: &WitnessBounds,
) -> Result<WitnessAnswer, String> {
    match search_generators(gens, &witness_options(bounds)).map_err(|e| format!("witness: {e}"))? {
        Ok(cert) => Ok(WitnessAnswer {
            found: true,
            word: cert.word.clone(),
            certificate: Some(cert),
            words_tried: None,
            note: None,
            lifted_from_factor: None,
        }),
        Err(words_tried) => Ok(WitnessAnswer {
            found: false,
            word: Vec::new(),
            certificate: None,
            words_tried: Some(words_tried),
            note: Some(format!(
                "none among {words_tried} words (depth {}, {} random words); this proves nothing",
                bounds.depth, bounds.tries
            )),
            lifted_from_factor: None,
        }),
    }
}

/// The witness answer when the image is already proven finite.
pub fn witness_not_needed(order: &str) -> WitnessAnswer {
    WitnessAnswer {
        found: false,
        word: Vec::new(),
        certificate: None,
        words_tried: None,
        note: Some(format!(
            "not searched: the image is finite, of order {order}"
        )),
        lifted_from_factor: None,
    }
}

/// The witness answer when the search ended with an error (also listed in the run's errors).
pub fn witness_failed(error: String) -> WitnessAnswer {
    WitnessAnswer {
        found: false,
        word: Vec::new(),
        certificate: None,
        words_tried: None,
        note: Some(error),
        lifted_from_factor: None,
    }
}
