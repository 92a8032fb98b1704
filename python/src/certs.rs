//! Certified answers about the group the twists generate, for Python: the commutant
//! dimension and a witness of infinite projective image, each re-checked before it is
//! returned (as the program does).

use cyclorb_cert::{
    commutant as commutant_cert, find_witness, CommutantOptions, WitnessOptions, WitnessOutcome,
};
use cyclorb_pipeline::lifted::find_lifted;
use cyclorb_pipeline::space::{build_space, cert_generators, parse_set};
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
            if let Some(lifted) = find_lifted(space.theory(), genus, set, &options)? {
                return Ok::<_, String>(serde_json::json!({
                    "found": true,
                    "word": lifted.certificate.word,
                    "certificate": lifted.certificate,
                    "lifted_from_factor": lifted.lifted_from_factor,
                    "words_tried": null,
                }));
            }
            let gens = cert_generators(&space, set)?;
            match find_witness(&gens, &options).map_err(|e| e.to_string())? {
                WitnessOutcome::Found(cert) => {
                    cert.recheck(&gens).map_err(|e| e.to_string())?;
                    Ok(serde_json::json!({
                        "found": true,
                        "word": cert.word,
                        "certificate": cert,
                        "lifted_from_factor": null,
                        "words_tried": null,
                    }))
                }
                WitnessOutcome::NotFound(report) => Ok(serde_json::json!({
                    "found": false,
                    "word": [],
                    "certificate": null,
                    "lifted_from_factor": null,
                    "words_tried": report.words_tried,
                })),
            }
        })
        .map_err(error)?;
    to_python(py, &value)
}
