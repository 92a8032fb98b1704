//! The built-in theories and their catalogue.

pub(crate) mod fibonacci;
pub(crate) mod ising;
pub(crate) mod minimal;
pub(crate) mod minimal_braided;
pub(crate) mod pointed;
pub(crate) mod su2;

use crate::error::TheoryError;
use crate::ops::{conjugate, product, renamed};
use crate::theory::Theory;

pub use fibonacci::fibonacci;
pub use ising::ising_type;
pub use minimal::minimal_modular_data;
pub use minimal_braided::minimal;
pub use pointed::zn;
pub use su2::{so3, su2};

/// Tricritical Ising (c = 7/10) = (Fibonacci conjugate) ⊠ Ising-type(ν = 7) (docs/conventions.md §2–3),
/// with labels named by their conformal weights h (θ = exp(2πi h)):
/// (1,1) = 0, (1,σ) = 7/16, (1,ψ) = 3/2, (τ,1) = 3/5, (τ,σ) = 3/80, (τ,ψ) = 1/10.
pub fn tricritical_ising() -> Result<Theory, TheoryError> {
    let fib_bar = conjugate(&fibonacci()?)?;
    let ising7 = ising_type(7)?;
    let t = product(&fib_bar, &ising7)?;
    let names = ["0", "7/16", "3/2", "3/5", "3/80", "1/10"];
    renamed(
        &t,
        "tricritical-ising",
        names.iter().map(|s| s.to_string()).collect(),
    )
}

/// The factors, as specs, of a built-in theory that is defined as a Deligne product (the
/// product of these two specs has the same data up to the names of the labels).
pub fn defining_product(name: &str) -> Option<(&'static str, &'static str)> {
    match name {
        "tricritical-ising" => Some(("conj(fibonacci)", "ising:7")),
        _ => None,
    }
}

/// The built-in spec syntax with a one-line description each, for `cyclorb theories`.
pub fn builtin_catalogue() -> Vec<(String, String)> {
    let rows: [(&str, &str); 14] = [
        ("ising", "Ising anyons 1, sigma, psi; c = 1/2 (= ising:1)"),
        (
            "ising:NU",
            "Ising-type theory, NU odd 1..15 (the 8 theories with sigma x sigma = 1 + psi); c = NU/2",
        ),
        ("fibonacci", "Fibonacci anyons 1, tau; c = 14/5 (conj(fibonacci): c = -14/5)"),
        (
            "tricritical-ising",
            "conj(fibonacci) * ising:7, labels named by conformal weights; c = 7/10",
        ),
        (
            "su2:K",
            "SU(2) at level K (1 <= K <= 60, tested to 20), spins 0..K/2, square-root-free gauge; c = 3K/(K+2)",
        ),
        (
            "so3:K",
            "integer-spin part of su2:K, K odd (so3:3 has the modular data of fibonacci)",
        ),
        (
            "zn:N:P",
            "pointed Z_N theory, theta_a = exp(i pi P a^2/N), P*N even, gcd(P,N) = 1 (zn:2:1 = semion)",
        ),
        (
            "minimal:P:Q",
            "Virasoro minimal model M(P,Q), Kac labels (r,s), full F and R (Galois conjugates of su2 x so3); c = 1 - 6(P-Q)^2/(PQ)",
        ),
        (
            "kac:P:Q",
            "M(P,Q) as modular data from Kac's formulas (S, T only; genus 1): the cross-check of minimal:P:Q",
        ),
        ("A*B", "Deligne product of two specs (labels a*b)"),
        ("conj(A)", "complex conjugate of a spec (R, theta, S conjugated; c -> -c)"),
        (
            "galois:K(A)",
            "Galois conjugate zeta_n -> zeta_n^K of a spec, gcd(K, n) = 1, n its conductor",
        ),
        (
            "gauge:SEED(A)",
            "the same theory in a reproducible non-unitary gauge (vertex weights follow)",
        ),
        ("PATH.json", "a theory file (format: README, 'Theory files')"),
    ];
    rows.iter()
        .map(|(a, b)| (a.to_string(), b.to_string()))
        .collect()
}
