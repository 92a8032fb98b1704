//! `cyclorb.check`: the re-check of a certificate (`cyclorb_pipeline::check`, what
//! `cyclorb check` runs) from a file or from JSON text, returning the report as plain data:
//! `{"file", "kind", "program", "spec", "genus", "generating_set", "ok", "failed",
//! "claims": [{"name", "ok", "detail"}]}`. A certificate that cannot be read or rebuilt
//! raises `CyclorbError` with the program's message; a claim that fails is a report with
//! `ok` false, as the program's exit code 1.

use cyclorb_pipeline::check::{check, Certificate};
use pyo3::prelude::*;

use crate::error;
use crate::values::to_python;

/// Re-check the certificate file at `path`.
#[pyfunction]
pub fn check_file<'py>(py: Python<'py>, path: &str) -> PyResult<Bound<'py, PyAny>> {
    let report = py
        .detach(|| Certificate::read(std::path::Path::new(path)).and_then(|c| check(&c)))
        .map_err(error)?;
    to_python(
        py,
        &serde_json::to_value(&report).expect("a check report serialises"),
    )
}

/// Re-check a certificate given as JSON text; `name` is what the messages call it.
#[pyfunction]
pub fn check_text<'py>(py: Python<'py>, text: &str, name: &str) -> PyResult<Bound<'py, PyAny>> {
    let report = py
        .detach(|| Certificate::parse(name, text).and_then(|c| check(&c)))
        .map_err(error)?;
    to_python(
        py,
        &serde_json::to_value(&report).expect("a check report serialises"),
    )
}
