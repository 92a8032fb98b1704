//! # cyclorb-theory: modular tensor categories over cyclotomic fields
//!
//! A [`Theory`] is the data of a multiplicity-free modular tensor category (an anyon theory,
//! the chiral data of a rational CFT) with every number in one cyclotomic field Q(ζ_n):
//! labels (0 the vacuum), duals, fusion rules, F- and R-symbols in a stated gauge, twists θ,
//! quantum dimensions d, S̃ and S = S̃/D, the total dimension D > 0, the central charge mod 8
//! and the vertex weights of the gauge's invariant Hermitian form. A theory may also be
//! modular data alone (S and T, no F or R), usable where only genus 1 is asked.
//!
//! Conventions are those of docs/conventions.md §2–3: F-moves on splitting trees
//! |(a b)_e c; d⟩ = Σ_f [F^{abc}_d]_{ef} |a (b c)_f; d⟩, R^{ab}_c the counterclockwise
//! exchange, θ_a = Σ_c (d_c/d_a) R^{aa}_c, S̃_ab = Σ_c N_{a*b}^c θ_c d_c/(θ_a θ_b).
//!
//! ```
//! use cyclorb_theory::{parse_spec, verify};
//! let ising = parse_spec("ising").unwrap();
//! assert_eq!(ising.rank(), 3);
//! assert_eq!(ising.central_charge_mod_8().to_string(), "1/2");
//! let both = parse_spec("ising*conj(fibonacci)").unwrap();
//! assert_eq!(both.rank(), 6);
//! assert!(verify(&ising).ok());
//! ```
//!
//! ## Where theories come from
//! - Built-ins ([`builtin_catalogue`]): `ising`, `ising:NU`, `fibonacci`,
//!   `tricritical-ising`, `su2:K`, `so3:K`, `zn:N:P`, `minimal:P:Q` (braided, from Galois
//!   conjugates of su2 and so3), `kac:P:Q` (its modular data from Kac's formulas).
//! - Products `A*B`, conjugates `conj(A)` and `galois:K(A)`, a reproducible non-unitary
//!   gauge `gauge:SEED(A)`, parentheses ([`parse_spec`]).
//! - Theory files (JSON, [`theory_from_json`] / [`read_theory_file`]; [`theory_to_json`]
//!   writes one).
//!
//! ## The field
//! Data are built in their natural field and the field is then enlarged (conductor lcm'd)
//! until it holds D and exp(2πi c/8): ζ_c² = p₊²/D² is found exactly in the data's field
//! (p₊ = Σ_a d_a² θ_a), ζ_c is one of its two square roots, and D = p₊/ζ_c. The sign of D is
//! decided by an evaluation with a proven error bound ([`real_sign`]); no floating point
//! decides anything.
//!
//! ## Gauges and the invariant form
//! Unitary built-ins (Ising-type, zn) have all vertex weights 1. `su2:K` and `so3:K` use the
//! square-root-free gauge u^{ab}_c = 1/(Δ(a,b,c)·√[2c+1]), with weights
//! |u|² = 1/(Δ(a,b,c)²·[2c+1]). Weights are meaningful up to
//! w(a,b,c) ↦ w(a,b,c)·g(a)g(b)/g(c) (g(0) = 1), which leaves G_tree = Π vertex weights ·
//! Π handle weights⁻¹ of every closed tree unchanged; Fibonacci uses this freedom to keep its
//! weights in Q(√5) (see its module). Products multiply weights, Galois conjugates apply σ_k
//! to them. The check `invariant-form` of [`verify`] proves the weights right.
//!
//! ## Performance
//! F-blocks of `su2:K`, products and conjugates are computed on first use and cached
//! (thread-safe), from cached q-factorials in Q(q) (conductor 2(K+2)); genus-1 work never
//! computes them. The data hash and `verify` compute all of them.
//!
//! ## Untrusted input
//! Theory files are checked while read: unknown labels, missing or repeated symbols,
//! inadmissible symbols, bad numbers and numbers outside the declared field are refused
//! with the file, the place (a JSON path) and the reason ([`TheoryError::File`]). Data that
//! are well-formed but wrong are reported by [`verify`], which names the first failing
//! equation and its labels.

#![deny(missing_docs)]

mod arith;
mod assemble;
mod builtins;
mod canonical;
mod composite;
mod digest;
mod error;
mod file;
mod fmatrix;
mod fusion;
mod gauss;
mod lazy;
mod ops;
mod size;
mod spec;
mod structure;
mod theory;
mod verify;
mod verlinde;

pub use builtins::{
    builtin_catalogue, defining_product, fibonacci, ising_type, minimal, minimal_modular_data, so3,
    su2, tricritical_ising, zn,
};
pub use digest::Sha256;
pub use error::TheoryError;
pub use file::{read_theory_file, theory_from_json, theory_to_json, FORMAT_NAME, FORMAT_VERSION};
pub use fmatrix::FMatrix;
pub use fusion::FusionRules;
pub use ops::{
    conjugate, galois, product, random_gauge, regauged, renamed, spherical_twist,
    with_negated_total_dimension,
};
pub use spec::{parse_spec, parse_spec_traced, FileTheory, TracedSpec, MAX_SPEC_DEPTH};
pub use theory::Theory;
pub use verify::{
    check_verification_storage, verify, verify_by, verify_selected, Check, CheckId, Route,
    Verification,
};
