//! `cyclorb._native`: the Rust side of the Python module. It calls the library crates
//! (the pipeline for orbits, the certificate crate for commutants and witnesses) and
//! hands plain Python data (dicts, lists, ints, strings) to the Python package
//! `cyclorb`, which wraps them in objects (exact numbers as `fractions.Fraction` and
//! `cyclorb.Cyclotomic`). Errors are raised as `cyclorb.CyclorbError` with the messages of
//! the command-line program (file, place, reason).

use pyo3::prelude::*;

mod certs;
mod check;
mod numbers;
mod orbit;
mod sweep;
mod theory;
mod values;

pyo3::create_exception!(
    _native,
    CyclorbError,
    pyo3::exceptions::PyException,
    "An error of cyclorb: bad input (naming the file, the place and the reason) or a check that failed."
);

/// A cyclorb error from a library message.
pub(crate) fn error(message: impl Into<String>) -> PyErr {
    CyclorbError::new_err(message.into())
}

#[pymodule]
fn _native(m: &Bound<'_, PyModule>) -> PyResult<()> {
    m.add("CyclorbError", m.py().get_type::<CyclorbError>())?;
    m.add("__version__", env!("CARGO_PKG_VERSION"))?;
    m.add_function(wrap_pyfunction!(numbers::element, m)?)?;
    m.add_function(wrap_pyfunction!(numbers::arithmetic, m)?)?;
    m.add_function(wrap_pyfunction!(numbers::text, m)?)?;
    m.add_function(wrap_pyfunction!(numbers::normalised_trace, m)?)?;
    m.add_function(wrap_pyfunction!(theory::theory_file, m)?)?;
    m.add_function(wrap_pyfunction!(theory::theory, m)?)?;
    m.add_function(wrap_pyfunction!(theory::verify, m)?)?;
    m.add_function(wrap_pyfunction!(theory::block_space, m)?)?;
    m.add_function(wrap_pyfunction!(orbit::orbit, m)?)?;
    m.add_function(wrap_pyfunction!(sweep::sweep, m)?)?;
    m.add_function(wrap_pyfunction!(certs::commutant, m)?)?;
    m.add_function(wrap_pyfunction!(certs::witness, m)?)?;
    m.add_function(wrap_pyfunction!(certs::image, m)?)?;
    m.add_function(wrap_pyfunction!(check::check_file, m)?)?;
    m.add_function(wrap_pyfunction!(check::check_text, m)?)?;
    Ok(())
}
