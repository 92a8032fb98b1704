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

use cyclorb_cert::{
    commutant, enumerate_projective_image, find_witness, image_from_lines, CommutantOptions,
    CommutantRoute, GeneratorSet, ImageEnumeration, ImageOptions, WitnessOptions, WitnessOutcome,
};
use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_orbit::{Orbit, OrbitProblem};

use cyclorb_pipeline::lifted::find_lifted;
use cyclorb_pipeline::lines::faithful_lines;

use super::plan::{ImageBounds, WitnessBounds};
use super::result::{CommutantAnswer, ImageAnswer, WitnessAnswer};

/// The orbit problem's generators as the certificates' generator set (with the form).
pub fn certificate_generators(problem: &OrbitProblem) -> Result<GeneratorSet, String> {
    let g = problem.generators();
    let named = g.names.iter().cloned().zip(g.operators.iter().cloned());
    GeneratorSet::new(problem.field().clone(), named.collect(), g.form.clone())
        .map_err(|e| format!("generators: {e}"))
}

/// The certified commutant dimension.
pub fn commutant_answer(gens: &GeneratorSet) -> Result<CommutantAnswer, String> {
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
        route: "undecided".into(),
        note: Some(note),
    }
}

fn enumerated(
    gens: &GeneratorSet,
    cap: usize,
    passed_over: Option<String>,
) -> Result<ImageAnswer, String> {
    match enumerate_projective_image(gens, cap).map_err(|e| format!("image: {e}"))? {
        ImageEnumeration::Finite(cert) => Ok(ImageAnswer {
            finite: Some(true),
            order: Some(cert.order.to_string()),
            route: "enumeration".into(),
            note: passed_over,
        }),
        ImageEnumeration::Exceeds { cap } => {
            let exceeded =
                format!("the image has more than {cap} elements (image.enumeration_cap)");
            Ok(undecided(match passed_over {
                Some(before) => format!("{before}; {exceeded}"),
                None => exceeded,
            }))
        }
    }
}

/// The order of the projective image, when a certificate decides it within the bounds.
pub fn image_answer(
    gens: &GeneratorSet,
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
    if orbit.len() > bounds.max_lines {
        if orbit.len() > bounds.enumeration_cap {
            return Ok(undecided(format!(
                "the orbit has {} lines, above image.max_lines and image.enumeration_cap",
                orbit.len()
            )));
        }
        return enumerated(
            gens,
            bounds.enumeration_cap,
            Some(format!(
                "the orbit has more than {} lines",
                bounds.max_lines
            )),
        );
    }
    let lines = match faithful_lines(problem, orbit, bounds.max_lines, threads)? {
        Ok(lines) => lines,
        Err(reason) => return enumerated(gens, bounds.enumeration_cap, Some(reason)),
    };
    match image_from_lines(gens, &lines, &ImageOptions { threads }) {
        Ok(cert) => Ok(ImageAnswer {
            finite: Some(true),
            order: Some(cert.group.order),
            route: "orbit-permutations".into(),
            note: (!lines.added_seeds().is_empty()).then(|| {
                format!(
                    "{} lines: the vacuum orbit with the orbits of {}",
                    cert.lines,
                    lines.added_seeds().join(", ")
                )
            }),
        }),
        Err(e) => enumerated(
            gens,
            bounds.enumeration_cap,
            Some(format!("orbit route not available: {e}")),
        ),
    }
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
    gens: &GeneratorSet,
    bounds: &WitnessBounds,
) -> Result<WitnessAnswer, String> {
    match find_witness(gens, &witness_options(bounds)).map_err(|e| format!("witness: {e}"))? {
        WitnessOutcome::Found(cert) => Ok(WitnessAnswer {
            found: true,
            word: cert.word.clone(),
            certificate: Some(cert),
            words_tried: None,
            note: None,
            lifted_from_factor: None,
        }),
        WitnessOutcome::NotFound(report) => Ok(WitnessAnswer {
            found: false,
            word: Vec::new(),
            certificate: None,
            words_tried: Some(report.words_tried),
            note: Some(format!(
                "none among {} words (depth {}, {} random words); this proves nothing",
                report.words_tried, bounds.depth, bounds.tries
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
