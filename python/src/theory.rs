//! Theories and their block spaces for Python: the data of a spec (labels, quantum
//! dimensions, twists, S, c mod 8), its full verification, and the genus-g block space with
//! its Dehn twists as sparse matrices.

use cyclorb_field::Cyc;
use cyclorb_matrix::Operator;
use cyclorb_pipeline::space::{build_space, parse_set};
use cyclorb_theory::{check_verification_storage, verify_by, CheckId, Route};
use num_bigint::BigInt;
use pyo3::prelude::*;
use pyo3::types::{PyDict, PyList};

use crate::error;
use crate::numbers::{triple, Triple};

fn triples(xs: &[Cyc]) -> Vec<Triple> {
    xs.iter().map(triple).collect()
}

/// The data of a theory spec (built-in or file; a file is proved first unless the process
/// runs unverified, as every command does): `name`, `labels`, `duals`, `conductor`,
/// `quantum_dimensions`, `twists`, `S` (rows of elements, or None with modular data only
/// from F/R), `central_charge_mod_8` as (numerator, denominator), `modular_data_only`,
/// `data_hash`.
#[pyfunction]
pub fn theory<'py>(py: Python<'py>, spec: &str) -> PyResult<Bound<'py, PyDict>> {
    let t = cyclorb_pipeline::proof::theory(spec).map_err(error)?;
    let d = PyDict::new(py);
    d.set_item("spec", spec)?;
    d.set_item("name", t.name())?;
    d.set_item("labels", t.labels().to_vec())?;
    d.set_item(
        "duals",
        (0..t.rank()).map(|a| t.dual(a)).collect::<Vec<usize>>(),
    )?;
    d.set_item("conductor", t.conductor())?;
    d.set_item("quantum_dimensions", triples(t.quantum_dims()))?;
    d.set_item("twists", triples(t.twists()))?;
    match t.s_matrix() {
        Some(s) => {
            let rows: Vec<Vec<Triple>> = (0..s.rows()).map(|i| triples(s.row(i))).collect();
            d.set_item("S", rows)?;
        }
        None => d.set_item("S", py.None())?,
    }
    let c = t.central_charge_mod_8();
    let (num, den): (BigInt, BigInt) = (c.numer().clone(), c.denom().clone());
    d.set_item("central_charge_mod_8", (num, den))?;
    d.set_item("modular_data_only", !t.has_fr())?;
    d.set_item("data_hash", t.data_hash())?;
    Ok(d)
}

/// The theory of a spec in the theory-file format (JSON text, as `cyclorb describe --json`
/// writes it); reading the text back gives the same data hash.
#[pyfunction]
pub fn theory_file(spec: &str) -> PyResult<String> {
    let t = cyclorb_pipeline::proof::theory(spec).map_err(error)?;
    serde_json::to_string_pretty(&cyclorb_theory::theory_to_json(&t))
        .map_err(|e| error(e.to_string()))
}

/// Every check of `cyclorb verify` on a spec (the structural route: products and
/// conjugates on their building blocks), as `{"ok": bool, "checks": [{name, equation, ok,
/// instances, failure}]}`. The interpreter is released while the checks run.
#[pyfunction]
pub fn verify<'py>(py: Python<'py>, spec: &str) -> PyResult<Bound<'py, PyDict>> {
    let traced = cyclorb_theory::parse_spec_traced(spec).map_err(|e| error(e.to_string()))?;
    let theory = traced.theory;
    check_verification_storage(&theory, Route::Structural).map_err(|e| error(e.to_string()))?;
    let verification =
        py.detach(|| verify_by(&theory, &CheckId::ALL, Route::Structural, &mut |_| {}));
    let checks = PyList::empty(py);
    for c in &verification.checks {
        let item = PyDict::new(py);
        item.set_item("name", &c.name)?;
        item.set_item("equation", &c.equation)?;
        item.set_item("ok", c.ok)?;
        item.set_item("instances", c.instances)?;
        item.set_item("failure", c.failure.as_deref())?;
        checks.append(item)?;
    }
    let d = PyDict::new(py);
    d.set_item("theory", theory.name())?;
    d.set_item("ok", verification.ok())?;
    d.set_item("checks", checks)?;
    Ok(d)
}

/// The non-zero entries (row, column, value) of a generator.
fn sparse_entries(
    op: &Operator,
    field: &cyclorb_field::CyclotomicField,
) -> PyResult<Vec<(usize, usize, Triple)>> {
    match op.to_sparse_rows(field) {
        Operator::SparseRows { rows, .. } => Ok(rows
            .iter()
            .enumerate()
            .flat_map(|(i, row)| row.iter().map(move |(j, x)| (i, *j, triple(x))))
            .collect()),
        _ => Err(error("a generator did not convert to sparse rows")),
    }
}

/// The genus-g block space of a spec: `dimension`, `conductor`, `basis` (comb-basis label
/// tuples), `vacuum` (index of the vacuum basis vector), `form` (the diagonal invariant
/// form G), `generators` (list of (curve name, sparse entries (row, column, value)), the
/// matrices acting on columns).
#[pyfunction]
#[pyo3(signature = (spec, genus, set = "humphries"))]
pub fn block_space<'py>(
    py: Python<'py>,
    spec: &str,
    genus: usize,
    set: &str,
) -> PyResult<Bound<'py, PyDict>> {
    let set = parse_set(set).map_err(error)?;
    let space = build_space(spec, genus).map_err(error)?;
    let gens = space.generators(set).map_err(|e| error(e.to_string()))?;
    let theory = space.theory();
    let field = theory.field();
    let d = PyDict::new(py);
    d.set_item("theory", theory.name())?;
    d.set_item("genus", genus)?;
    d.set_item("dimension", space.dimension())?;
    d.set_item("conductor", field.conductor())?;
    d.set_item(
        "basis",
        space
            .states()
            .iter()
            .map(|s| s.describe(theory))
            .collect::<Vec<String>>(),
    )?;
    d.set_item("vacuum", space.basis().vacuum())?;
    d.set_item("form", triples(space.form()))?;
    let named = gens
        .iter()
        .map(|(c, op)| Ok((c.to_string(), sparse_entries(op, field)?)))
        .collect::<PyResult<Vec<(String, Vec<(usize, usize, Triple)>)>>>()?;
    d.set_item("generators", named)?;
    Ok(d)
}
