//! Exact numbers across the boundary. An element of Q(ζ_n) travels as the triple
//! `(n, numerators, denominator)`: the numerators are its coefficients in the power basis
//! 1, ζ_n, …, ζ_n^{φ(n)−1} (reduced modulo the cyclotomic polynomial Φ_n), over one positive
//! denominator, in lowest terms, as Python ints. This is the field crate's canonical form,
//! so equal numbers have equal triples.

use cyclorb_field::{common_conductor, Cyc, CyclotomicField};
use num_bigint::BigInt;
use pyo3::prelude::*;

use crate::error;

/// The triple of a Python element.
pub type Triple = (u32, Vec<BigInt>, BigInt);

/// The triple of `x`.
pub fn triple(x: &Cyc) -> Triple {
    let (num, den) = x.to_big_parts();
    (x.conductor(), num, den)
}

fn field(n: u32) -> PyResult<CyclotomicField> {
    CyclotomicField::new(n).map_err(|e| error(e.to_string()))
}

/// The element a triple names, in Q(ζ_n) with n its own conductor.
fn from_triple(t: &Triple) -> PyResult<Cyc> {
    field(t.0)?
        .from_parts(&t.1, &t.2)
        .map_err(|e| error(e.to_string()))
}

/// Parse `text` (cyclorb's field syntax: `zeta16^3`, `sqrt(2)`, `1/2`, `i`, sums and
/// products) as an element of Q(ζ_n).
#[pyfunction]
pub fn element(n: u32, text: &str) -> PyResult<Triple> {
    let x = field(n)?
        .parse(text)
        .map_err(|e| error(format!("{text:?} in Q(ζ_{n}): {e}")))?;
    Ok(triple(&x))
}

/// `a op b` for `op` one of `+ - * /`, or the complex conjugate of `a` for `conj` (`b`
/// ignored), computed in Q(ζ_m) for m the least common multiple of the two conductors (the
/// result's conductor is m).
#[pyfunction]
pub fn arithmetic(op: &str, a: Triple, b: Triple) -> PyResult<Triple> {
    let m = common_conductor(a.0, b.0);
    let f = field(m)?;
    let lift = |t: &Triple| -> PyResult<Cyc> {
        f.embed(&from_triple(t)?).map_err(|e| error(e.to_string()))
    };
    let (x, y) = (lift(&a)?, lift(&b)?);
    let result = match op {
        "+" => f.add(&x, &y),
        "-" => f.sub(&x, &y),
        "*" => f.mul(&x, &y),
        "/" => f.div(&x, &y),
        "conj" => Ok(f.conj(&x)),
        other => return Err(error(format!("unknown operation {other:?}"))),
    }
    .map_err(|e| error(e.to_string()))?;
    Ok(triple(&result))
}

/// The element in cyclorb's field syntax (the program prints the same text).
#[pyfunction]
pub fn text(a: Triple) -> PyResult<String> {
    Ok(from_triple(&a)?.to_string())
}

/// The normalised trace Tr(x)/φ(n) of x ∈ Q(ζ_n), as (numerator, denominator). It does not
/// depend on the field x is written in (the trace from a larger field multiplies by the
/// degree of the extension), so equal numbers in different fields share it: the Python
/// layer hashes by it.
#[pyfunction]
pub fn normalised_trace(a: Triple) -> PyResult<(BigInt, BigInt)> {
    let f = field(a.0)?;
    let (num, den) = f
        .trace(&from_triple(&a)?)
        .map_err(|e| error(e.to_string()))?;
    Ok((num, den * BigInt::from(f.degree())))
}
