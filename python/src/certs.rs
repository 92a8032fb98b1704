//! Certified answers about the group the twists generate, for Python: the commutant
//! dimension and a witness of infinite projective image, each re-checked before it is
//! returned (as the program does).

use cyclorb_cert::{commutant as commutant_cert, CommutantOptions, WitnessOptions};
use cyclorb_pipeline::image::{
    decide_image, ImageBounds, ImageRequest, ImageStrategy, DEFAULT_ENUMERATION_CAP,
    DEFAULT_ORBIT_LIMIT, DEFAULT_WITNESS_AFTER,
};
use cyclorb_pipeline::space::{build_space, cert_generators, parse_set};
use cyclorb_pipeline::witness::{search, WitnessSearch};
use pyo3::prelude::*;

use crate::error;
use crate::values::to_python;

/// The certified dimension of the commutant of the twists of a genus-g block space:
/// `{"commutant_dimension", "irreducible", "route", "primes", "certificate"}`.
#[pyfunction]
#[pyo3(signature = (spec, genus, set = "humphries"))]
pub fn commutant<'py>(
    py: Python<'py>,
    spec: &str,
    genus: usize,
    set: &str,
) -> PyResult<Bound<'py, PyAny>> {
    let set = parse_set(set).map_err(error)?;
    let value = py
        .detach(|| {
            let space = build_space(spec, genus)?;
            let gens = cert_generators(&space, set)?;
            let cert =
                commutant_cert(&gens, CommutantOptions::default()).map_err(|e| e.to_string())?;
            cert.verify(&gens)
                .map_err(|e| format!("certificate does not re-check: {e}"))?;
            Ok::<_, String>(serde_json::json!({
                "commutant_dimension": cert.dimension,
                "irreducible": cert.is_irreducible(),
                "route": cert.route,
                "primes": cert.bounds.iter().map(|b| b.prime).collect::<Vec<_>>(),
                "certificate": cert,
            }))
        })
        .map_err(error)?;
    to_python(py, &value)
}

/// A certified word of infinite projective order, searched on the factors of a Deligne
/// product first (a witness there lifts), then on the generators: `{"found", "word",
/// "certificate", "lifted_from_factor", "words_tried"}`.
#[pyfunction]
#[pyo3(signature = (spec, genus, set = "humphries", depth = None, tries = None))]
pub fn witness<'py>(
    py: Python<'py>,
    spec: &str,
    genus: usize,
    set: &str,
    depth: Option<usize>,
    tries: Option<usize>,
) -> PyResult<Bound<'py, PyAny>> {
    let set = parse_set(set).map_err(error)?;
    let mut options = WitnessOptions::default();
    if let Some(d) = depth {
        options.depth = d;
    }
    if let Some(t) = tries {
        options.tries = t;
    }
    let value = py
        .detach(|| {
            let space = build_space(spec, genus)?;
            Ok::<_, String>(match search(&space, set, &options)? {
                WitnessSearch::Lifted(lifted) => serde_json::json!({
                    "found": true,
                    "word": lifted.certificate.word,
                    "certificate": lifted.certificate,
                    "lifted_from_factor": lifted.lifted_from_factor,
                    "words_tried": null,
                }),
                WitnessSearch::Found(cert) => serde_json::json!({
                    "found": true,
                    "word": cert.word,
                    "certificate": cert,
                    "lifted_from_factor": null,
                    "words_tried": null,
                }),
                WitnessSearch::NotFound { words_tried } => serde_json::json!({
                    "found": false,
                    "word": [],
                    "certificate": null,
                    "lifted_from_factor": null,
                    "words_tried": words_tried,
                }),
            })
        })
        .map_err(error)?;
    to_python(py, &value)
}

/// The order of the projective image (`cyclorb_pipeline::image::decide_image`):
/// `{"finite", "order", "route", "steps", "reason", "certificate"}`; `route` is one of
/// the program's route names, `certificate` the re-checked proof (None when undecided).
#[pyfunction]
#[pyo3(signature = (spec, genus, set = "humphries", route = "auto", orbit_limit = DEFAULT_ORBIT_LIMIT, enumeration_cap = DEFAULT_ENUMERATION_CAP, witness_after = DEFAULT_WITNESS_AFTER, threads = None))]
#[allow(clippy::too_many_arguments)]
pub fn image<'py>(
    py: Python<'py>,
    spec: &str,
    genus: usize,
    set: &str,
    route: &str,
    orbit_limit: usize,
    enumeration_cap: usize,
    witness_after: usize,
    threads: Option<usize>,
) -> PyResult<Bound<'py, PyAny>> {
    let set = parse_set(set).map_err(error)?;
    let strategy: ImageStrategy = route.parse().map_err(error)?;
    let request = ImageRequest {
        strategy,
        bounds: ImageBounds {
            orbit_limit,
            enumeration_cap,
            orbit_limit_name: "orbit_limit",
            enumeration_cap_name: "enumeration_cap",
        },
        witness_after,
        witness: WitnessOptions::default(),
        threads: threads
            .unwrap_or_else(|| std::thread::available_parallelism().map_or(1, |n| n.get()))
            .max(1),
    };
    let value = py
        .detach(|| {
            let space = build_space(spec, genus)?;
            let gens = cert_generators(&space, set)?;
            let d = decide_image(&space, set, &gens, &request)?;
            let (kind, certificate) = match &d.evidence {
                Some(evidence) => {
                    let (kind, body) = evidence.certificate()?;
                    (serde_json::json!(kind), body)
                }
                None => (serde_json::Value::Null, serde_json::Value::Null),
            };
            Ok::<_, String>(serde_json::json!({
                "finite": d.finite,
                "order": d.order,
                "route": d.route.name(),
                "steps": d.steps,
                "reason": d.reason,
                "certificate_kind": kind,
                "certificate": certificate,
            }))
        })
        .map_err(error)?;
    to_python(py, &value)
}
