//! The order of the projective image of the twists: which routes decide it, in which order,
//! and within which bounds. One decision serves `cyclorb image`, the sweeps and scripts.
//!
//! Routes, in the order of [`ImageStrategy::Auto`]: the monomial structure, else the
//! imprimitive one (counted and certified, see [`crate::counting`]); the vacuum orbit, with a witness search once it passes
//! a first bound unclosed (a certified word of infinite projective order decides
//! "infinite"); Schreier–Sims on the saturated orbit, extended by further orbits until the
//! faithfulness lemma applies (see [`crate::faithful_lines`]); enumeration of the image modulo
//! scalars up to a cap. "Undecided", with the reason, when none decides within its bounds.
//! Every certificate is re-checked before the decision is returned.

use cyclorb_cert::{
    enumerate_projective_image, image_from_lines, EnumerationCertificate, ImageEnumeration,
    ImageOptions, PermutationImageCertificate, ProvedGenerators, WitnessCertificate,
    WitnessOptions,
};
use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_orbit::{Orbit, OrbitOptions, OrbitProblem, Silent};
use cyclorb_structure::{ImprimitiveReport, StructureReport};
use serde::{Deserialize, Serialize};

use crate::counting::{counted_any, Counted};
use crate::faithful_lines::faithful_lines;
use crate::lifted::LiftedWitness;
use crate::witness::{search, WitnessSearch};

/// The route that decided the image (the `route` key of every answer that reports one).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum ImageRoute {
    /// Counted through the monomial or the imprimitive structure.
    Structure,
    /// Enumerated modulo scalars.
    Enumeration,
    /// Schreier–Sims on the permutations of a saturated union of orbits of lines.
    OrbitSchreierSims,
    /// Schreier–Sims on the permutations of flat bundles (`dw:` theories).
    PermutationSchreierSims,
    /// Schreier–Sims on monomial matrices (twisted `dw:` theories).
    MonomialSchreierSims,
    /// A certified word of infinite projective order.
    Witness,
    /// No route decided within its bounds.
    Undecided,
}

impl ImageRoute {
    /// The name in JSON and text.
    pub fn name(self) -> &'static str {
        match self {
            ImageRoute::Structure => "structure",
            ImageRoute::Enumeration => "enumeration",
            ImageRoute::OrbitSchreierSims => "orbit-schreier-sims",
            ImageRoute::PermutationSchreierSims => "permutation-schreier-sims",
            ImageRoute::MonomialSchreierSims => "monomial-schreier-sims",
            ImageRoute::Witness => "witness",
            ImageRoute::Undecided => "undecided",
        }
    }
}

/// Which routes to try.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
#[cfg_attr(feature = "clap", derive(clap::ValueEnum))]
pub enum ImageStrategy {
    /// The structure, then the orbit (with a witness search), then enumeration.
    #[default]
    Auto,
    /// Only the monomial structure.
    Structure,
    /// Only enumeration modulo scalars.
    Enumeration,
    /// Only the vacuum orbit and Schreier–Sims.
    Orbit,
}

impl std::str::FromStr for ImageStrategy {
    type Err = String;

    fn from_str(s: &str) -> Result<Self, Self::Err> {
        match s {
            "auto" => Ok(ImageStrategy::Auto),
            "structure" => Ok(ImageStrategy::Structure),
            "enumeration" => Ok(ImageStrategy::Enumeration),
            "orbit" => Ok(ImageStrategy::Orbit),
            other => Err(format!(
                "unknown route {other:?} (known: auto, structure, enumeration, orbit)"
            )),
        }
    }
}

/// The bounds of the decision and the names the caller gives them in messages (a flag
/// such as `--orbit-limit`, or a plan key such as `image.max_lines`).
#[derive(Debug, Clone)]
pub struct ImageBounds {
    /// Most lines stored for the orbit route.
    pub orbit_limit: usize,
    /// Largest image enumerated element by element.
    pub enumeration_cap: usize,
    /// The name of `orbit_limit` in messages.
    pub orbit_limit_name: &'static str,
    /// The name of `enumeration_cap` in messages.
    pub enumeration_cap_name: &'static str,
}

/// The default of [`ImageBounds::orbit_limit`]: about 370 bytes per line at the peak
/// (SU(2)_4 at genus 2: 1 228 800 lines, 450 MB).
pub const DEFAULT_ORBIT_LIMIT: usize = 2_000_000;
/// The default of [`ImageBounds::enumeration_cap`].
pub const DEFAULT_ENUMERATION_CAP: usize = 20_000;
/// The default of [`ImageRequest::witness_after`].
pub const DEFAULT_WITNESS_AFTER: usize = 100_000;

/// How the decision runs.
#[derive(Debug, Clone)]
pub struct ImageRequest {
    /// Which routes.
    pub strategy: ImageStrategy,
    /// Their bounds.
    pub bounds: ImageBounds,
    /// Under [`ImageStrategy::Auto`]: lines listed before a witness is searched for (the
    /// orbit then goes on up to the orbit limit when none is found).
    pub witness_after: usize,
    /// The witness search's bounds.
    pub witness: WitnessOptions,
    /// Worker threads.
    pub threads: usize,
}

impl ImageRequest {
    /// The request of `strategy` with the default bounds (named `orbit_limit` and
    /// `enumeration_cap` in messages), the default witness search and one thread per core.
    pub fn with_strategy(strategy: ImageStrategy) -> ImageRequest {
        ImageRequest {
            strategy,
            bounds: ImageBounds {
                orbit_limit: DEFAULT_ORBIT_LIMIT,
                enumeration_cap: DEFAULT_ENUMERATION_CAP,
                orbit_limit_name: "orbit_limit",
                enumeration_cap_name: "enumeration_cap",
            },
            witness_after: DEFAULT_WITNESS_AFTER,
            witness: WitnessOptions::default(),
            threads: std::thread::available_parallelism().map_or(1, |n| n.get()),
        }
    }
}

/// The proof behind a decision.
pub enum ImageEvidence {
    /// The structure's report (its certificate re-checked).
    Structure(Box<StructureReport>),
    /// The imprimitive structure's report (its exact claims re-checked).
    Imprimitive(Box<ImprimitiveReport>),
    /// The enumeration certificate (verified).
    Enumeration(EnumerationCertificate),
    /// Schreier–Sims on the lines: the certificate, the seeds whose orbits were added to
    /// the vacuum orbit, and the vacuum orbit's size.
    Orbit {
        /// The certificate.
        certificate: PermutationImageCertificate,
        /// Seeds of the added orbits (`e_3`, `ones`, …).
        added_seeds: Vec<String>,
        /// Lines of the vacuum orbit.
        vacuum_orbit: usize,
    },
    /// A witness on the generators (re-checked).
    Witness(WitnessCertificate),
    /// A witness on a factor of a product (re-checked there).
    LiftedWitness(LiftedWitness),
}

impl ImageEvidence {
    /// The certificate's kind (the `kind` of a `--out` file, which `cyclorb check` reads)
    /// and its body. The orbit route's body also names its line set: the vacuum orbit,
    /// then the orbits of `added_orbits`.
    pub fn certificate(&self) -> Result<(&'static str, serde_json::Value), String> {
        let body = |v: Result<serde_json::Value, serde_json::Error>| v.map_err(|e| e.to_string());
        Ok(match self {
            ImageEvidence::Structure(r) => {
                ("structure", body(serde_json::to_value(&r.certificate))?)
            }
            ImageEvidence::Imprimitive(r) => (
                "structure-imprimitive",
                body(serde_json::to_value(&r.certificate))?,
            ),
            ImageEvidence::Enumeration(c) => ("image-enumeration", body(serde_json::to_value(c))?),
            ImageEvidence::Orbit {
                certificate,
                added_seeds,
                ..
            } => {
                let mut file = body(serde_json::to_value(certificate))?;
                file["added_orbits"] = serde_json::json!(added_seeds);
                ("image-orbit", file)
            }
            ImageEvidence::Witness(w) => ("witness", body(serde_json::to_value(w))?),
            ImageEvidence::LiftedWitness(l) => ("witness-lifted", body(serde_json::to_value(l))?),
        })
    }
}

/// The decision.
pub struct ImageDecision {
    /// The route that decided, or `Undecided`.
    pub route: ImageRoute,
    /// Whether the image is finite (`None` when undecided).
    pub finite: Option<bool>,
    /// Its order in decimal, when finite.
    pub order: Option<String>,
    /// What was tried before and passed over, in order, one line each.
    pub steps: Vec<String>,
    /// Why it is undecided.
    pub reason: Option<String>,
    /// The proof.
    pub evidence: Option<ImageEvidence>,
}

impl ImageDecision {
    fn decided(
        route: ImageRoute,
        finite: bool,
        order: Option<String>,
        evidence: ImageEvidence,
    ) -> Self {
        ImageDecision {
            route,
            finite: Some(finite),
            order,
            steps: Vec::new(),
            reason: None,
            evidence: Some(evidence),
        }
    }

    fn undecided(reason: String) -> Self {
        ImageDecision {
            route: ImageRoute::Undecided,
            finite: None,
            order: None,
            steps: Vec::new(),
            reason: Some(reason),
            evidence: None,
        }
    }

    fn after(mut self, mut steps: Vec<String>) -> Self {
        steps.append(&mut self.steps);
        self.steps = steps;
        self
    }
}

/// Enumerate the image modulo scalars up to the cap; the certificate is verified.
pub fn enumerate_image(
    gens: &ProvedGenerators,
    bounds: &ImageBounds,
) -> Result<ImageDecision, String> {
    match enumerate_projective_image(gens, bounds.enumeration_cap).map_err(|e| e.to_string())? {
        ImageEnumeration::Finite(cert) => {
            cert.verify(gens).map_err(|e| e.to_string())?;
            let order = cert.order.to_string();
            Ok(ImageDecision::decided(
                ImageRoute::Enumeration,
                true,
                Some(order),
                ImageEvidence::Enumeration(cert),
            ))
        }
        ImageEnumeration::Exceeds { .. } => {
            let reason = format!(
                "the image has more than {} elements ({})",
                bounds.enumeration_cap, bounds.enumeration_cap_name
            );
            Ok(ImageDecision::undecided(reason.clone())
                .after(vec![format!("enumeration: {reason}")]))
        }
    }
}

/// The image from a saturated vacuum orbit: Schreier–Sims on the orbit (extended until
/// faithful), else — under `fallback` — enumeration; undecided when neither fits.
pub fn image_of_orbit(
    gens: &ProvedGenerators,
    problem: &OrbitProblem,
    orbit: &Orbit,
    bounds: &ImageBounds,
    threads: usize,
    fallback: bool,
) -> Result<ImageDecision, String> {
    let passed_over = |reason: String| -> Result<ImageDecision, String> {
        if fallback {
            Ok(enumerate_image(gens, bounds)?
                .after(vec![format!("orbit route: {reason}; trying enumeration")]))
        } else {
            Ok(ImageDecision::undecided(reason))
        }
    };
    let lines = match faithful_lines(problem, orbit, bounds.orbit_limit, threads)? {
        Ok(lines) => lines,
        Err(reason) => return passed_over(reason),
    };
    // the certificate's own checks ran while it was made (the faithfulness lemma exactly,
    // the orbit–stabiliser identity); `verify` would repeat the same deterministic
    // computation, so it is left to whoever re-reads the certificate file
    match image_from_lines(gens, &lines, &ImageOptions { threads }) {
        Ok(certificate) => {
            let order = certificate.group.order.clone();
            Ok(ImageDecision::decided(
                ImageRoute::OrbitSchreierSims,
                true,
                Some(order),
                ImageEvidence::Orbit {
                    certificate,
                    added_seeds: lines.added_seeds().to_vec(),
                    vacuum_orbit: lines.vacuum_orbit_len(),
                },
            ))
        }
        Err(e) => passed_over(format!("orbit route not available: {e}")),
    }
}

/// Decide the image of the twists of `space` under `set` (`gens` are those twists as the
/// certificates' generator set) by the request's strategy.
pub fn decide_image(
    space: &BlockSpace,
    set: GeneratingSet,
    gens: &ProvedGenerators,
    request: &ImageRequest,
) -> Result<ImageDecision, String> {
    let bounds = &request.bounds;
    let auto = request.strategy == ImageStrategy::Auto;
    let mut steps = Vec::new();
    match request.strategy {
        ImageStrategy::Enumeration => return enumerate_image(gens, bounds),
        ImageStrategy::Structure | ImageStrategy::Auto => match counted_any(space, set)? {
            Ok(Counted::Monomial(report)) => {
                let order = report.image_order.to_string();
                return Ok(ImageDecision::decided(
                    ImageRoute::Structure,
                    true,
                    Some(order),
                    ImageEvidence::Structure(report),
                ));
            }
            Ok(Counted::Imprimitive(report)) => {
                let order = report.image_order.clone();
                return Ok(ImageDecision::decided(
                    ImageRoute::Structure,
                    true,
                    Some(order),
                    ImageEvidence::Imprimitive(report),
                ));
            }
            Err(absent) => {
                steps.push(absent);
                if !auto {
                    return Ok(ImageDecision::undecided(
                        "the representation has neither a monomial nor an imprimitive structure"
                            .into(),
                    )
                    .after(steps));
                }
            }
        },
        ImageStrategy::Orbit => {}
    }
    let problem = crate::space::vacuum_problem_of(space, set)?;
    let options = |limit: usize| OrbitOptions {
        limit: Some(limit),
        threads: request.threads,
        ..OrbitOptions::default()
    };
    let first = if auto {
        request.witness_after.min(bounds.orbit_limit)
    } else {
        bounds.orbit_limit
    };
    let mut orbit = problem
        .enumerate(&options(first), &mut Silent)
        .map_err(|e| e.to_string())?;
    let mut words_tried = None;
    if !orbit.is_saturated() && auto {
        steps.push(format!(
            "orbit: not closed after {} lines; searching for a witness of infinite image",
            orbit.len()
        ));
        match search(space, set, &request.witness)? {
            WitnessSearch::Lifted(lifted) => {
                return Ok(ImageDecision::decided(
                    ImageRoute::Witness,
                    false,
                    None,
                    ImageEvidence::LiftedWitness(lifted),
                )
                .after(steps))
            }
            WitnessSearch::Found(cert) => {
                return Ok(ImageDecision::decided(
                    ImageRoute::Witness,
                    false,
                    None,
                    ImageEvidence::Witness(cert),
                )
                .after(steps))
            }
            WitnessSearch::NotFound { words_tried: tried } => words_tried = Some(tried),
        }
        if first < bounds.orbit_limit {
            steps.push(format!(
                "no witness among {} words; the orbit goes on up to {} lines",
                words_tried.unwrap_or(0),
                bounds.orbit_limit
            ));
            orbit = problem
                .extend(orbit, &options(bounds.orbit_limit), &mut Silent)
                .map_err(|e| e.to_string())?;
        }
    }
    if !orbit.is_saturated() {
        let mut reason = format!(
            "the vacuum orbit is not closed within {} lines ({})",
            bounds.orbit_limit, bounds.orbit_limit_name
        );
        if let Some(tried) = words_tried {
            reason.push_str(&format!(" and no witness among {tried} words"));
        }
        return Ok(ImageDecision::undecided(reason).after(steps));
    }
    Ok(image_of_orbit(gens, &problem, &orbit, bounds, request.threads, auto)?.after(steps))
}
