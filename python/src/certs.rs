//! Certified answers about the group the twists generate, for Python: the commutant
//! dimension, a witness of infinite projective image and the image order, each re-checked
//! before it is returned (as the program does), with `certificate_file`: the certificate in
//! its envelope, as the program's `--out` writes it (what `cyclorb.check` reads).

use cyclorb_cert::{commutant as commutant_cert, CommutantOptions, WitnessOptions};
use cyclorb_pipeline::envelope::{wrap, Source};
use cyclorb_pipeline::image::{
    decide_image, ImageBounds, ImageRequest, ImageStrategy, DEFAULT_ENUMERATION_CAP,
    DEFAULT_ORBIT_LIMIT, DEFAULT_WITNESS_AFTER,
};
use cyclorb_pipeline::space::{build_space_traced, cert_generators, parse_set};
use cyclorb_pipeline::witness::{search, WitnessSearch};
use pyo3::prelude::*;

use crate::error;
use crate::values::to_python;

/// The certificate of `kind` in its envelope (spec, genus, set, program, theory files).
fn certificate_file<T: serde::Serialize>(
    kind: &str,
    (spec, genus, set): (&str, usize, &str),
    certificate: &T,
    files: &[(String, String)],
) -> serde_json::Value {
    wrap(kind, &Source { spec, genus, set }, certificate, files)
}

/// The certified dimension of the commutant of the twists of a genus-g block space:
/// `{"commutant_dimension", "irreducible", "route", "primes", "certificate",
/// "certificate_file"}`.
#[pyfunction]
#[pyo3(signature = (spec, genus, set = "humphries"))]
pub fn commutant<'py>(
    py: Python<'py>,
    spec: &str,
    genus: usize,
    set: &str,
) -> PyResult<Bound<'py, PyAny>> {
    let source = (spec, genus, set);
    let set = parse_set(set).map_err(error)?;
    let value = py
        .detach(|| {
            let (space, files) = build_space_traced(spec, genus)?;
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
                "certificate_file": certificate_file("commutant", source, &cert, &files),
                "certificate": cert,
            }))
        })
        .map_err(error)?;
    to_python(py, &value)
}

/// A certified word of infinite projective order, searched on the factors of a Deligne
/// product first (a witness there lifts), then on the generators: `{"found", "word",
/// "certificate", "certificate_file", "lifted_from_factor", "words_tried"}`.
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
    let source = (spec, genus, set);
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
            let (space, files) = build_space_traced(spec, genus)?;
            Ok::<_, String>(match search(&space, set, &options)? {
                WitnessSearch::Lifted(lifted) => serde_json::json!({
                    "found": true,
                    "word": lifted.certificate.word,
                    "certificate_file": certificate_file("witness-lifted", source, &lifted, &files),
                    "certificate": lifted.certificate,
                    "lifted_from_factor": lifted.lifted_from_factor,
                    "words_tried": null,
                }),
                WitnessSearch::Found(cert) => serde_json::json!({
                    "found": true,
                    "word": cert.word,
                    "certificate_file": certificate_file("witness", source, &cert, &files),
                    "certificate": cert,
                    "lifted_from_factor": null,
                    "words_tried": null,
                }),
                WitnessSearch::NotFound { words_tried } => serde_json::json!({
                    "found": false,
                    "word": [],
                    "certificate": null,
                    "certificate_file": null,
                    "lifted_from_factor": null,
                    "words_tried": words_tried,
                }),
            })
        })
        .map_err(error)?;
    to_python(py, &value)
}

/// The order of the projective image (`cyclorb_pipeline::image::decide_image`):
/// `{"finite", "order", "route", "steps", "reason", "certificate_kind", "certificate",
/// "certificate_file"}`; `route` is one of the program's route names, `certificate` the
/// re-checked proof (None when undecided).
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
    let source = (spec, genus, set);
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
            let (space, files) = build_space_traced(spec, genus)?;
            let gens = cert_generators(&space, set)?;
            let d = decide_image(&space, set, &gens, &request)?;
            let (kind, certificate, file) = match &d.evidence {
                Some(evidence) => {
                    let (kind, body) = evidence.certificate()?;
                    let file = certificate_file(kind, source, &body, &files);
                    (serde_json::json!(kind), body, file)
                }
                None => (
                    serde_json::Value::Null,
                    serde_json::Value::Null,
                    serde_json::Value::Null,
                ),
            };
            Ok::<_, String>(serde_json::json!({
                "finite": d.finite,
                "order": d.order,
                "route": d.route.name(),
                "steps": d.steps,
                "reason": d.reason,
                "certificate_kind": kind,
                "certificate": certificate,
                "certificate_file": file,
            }))
        })
        .map_err(error)?;
    to_python(py, &value)
}
