//! # cyclorb-field: exact arithmetic in cyclotomic fields Q(ζ_n)
//!
//! The foundation of cyclorb. A [`CyclotomicField`] is the context for Q(ζ_n),
//! ζ_n = exp(2πi/n) under the standard embedding: conductor n, degree φ(n), the cyclotomic
//! polynomial Φ_n, the residues of x^e modulo Φ_n and the reduction fast path (negacyclic
//! fold when n is a power of two). A [`Cyc`] is a value: φ(n) integer numerators in the
//! power basis 1, ζ, …, ζ^{φ−1} over one positive denominator, always canonical, so `Eq`
//! and `Hash` compare stored words. Operations are methods of the context.
//!
//! ```
//! use cyclorb_field::CyclotomicField;
//! let q16 = CyclotomicField::new(16).unwrap();
//! let sqrt2 = q16.parse("sqrt(2)").unwrap();
//! let two = q16.mul(&sqrt2, &sqrt2).unwrap();
//! assert_eq!(two, q16.int(2));
//! let theta_sigma = q16.zeta_pow(1); // Ising's twist exp(2πi/16)
//! assert_eq!(q16.root_of_unity_order(&theta_sigma).unwrap(), Some(16));
//! assert_eq!(q16.parse(&sqrt2.to_string()).unwrap(), sqrt2);
//! ```
//!
//! ## Performance
//! Numerators live in `i64`. Products and dot products run in machine words whenever a bound
//! on the coefficients proves that no step can overflow: small ones by Kronecker
//! substitution (two coefficients per 64-bit digit, so one 64×64→128-bit product does four
//! coefficient products), larger ones by Karatsuba over unrolled schoolbook kernels;
//! otherwise in checked `i128`, then on `BigInt`. An overflow costs time, never a wrong
//! answer. Reduction modulo Φ_n is one pass over a sparse table of the residues of
//! x^φ, …, x^{2φ−2}. Sums of products ([`CyclotomicField::dot`], [`DotAccumulator`]) reduce
//! once per sum, not once per product. Inversion and the norm are multi-modular: they
//! evaluate at the roots of Φ_n modulo word-sized primes p ≡ 1 (mod n) and recover the
//! integers by the Chinese remainder theorem under Hadamard's bound; inversion stops early by
//! rational reconstruction (checked exactly) when the inverse is small. `benches/arith.rs` at
//! the workspace root measures all of this against python-flint.
//!
//! ## Modules
//! `context` (the field and its tables), `element` (values, canonical form), `arith`
//! (the safe operations and their tiers), `word_kernels`, `convolution` and `packed` (machine-word
//! kernels), `dot` (sums of products), `modular` and `multimodular` (primes p ≡ 1 mod n,
//! inverse and norm), `galois` (automorphisms, embeddings, trace, roots of unity), `sqrt`,
//! `text` (syntax and serde), `modp` ([`PrimeReduction`]), `residues` ([`ResidueMap`]: residues
//! at many prime ideals and the zero test they give), [`numtheory`], `rational`,
//! `poly_kernel` ([`PolyKernel`]: the integer matrices of multiplication by an element and
//! of conjugation in the power basis of Z[ζ_n], for callers that work on raw numerators).
//!
//! ## Untrusted input
//! [`CyclotomicField::parse`] reports the byte offset and reason of any error; division by
//! zero and operands from different fields are [`FieldError`] values, never panics.

#![deny(missing_docs)]

mod arith;
mod budget;
mod context;
mod convolution;
mod dot;
mod element;
mod error;
mod fnv;
mod galois;
pub mod int_poly;
mod modp;
mod modular;
mod multimodular;
pub mod numtheory;
mod packed;
mod poly_kernel;
mod rational;
mod real_sign;
mod residues;
mod ring;
mod roots;
mod sqrt;
mod text;
mod unique_keys;
mod word_kernels;

pub use budget::{check_budget, memory_budget, set_memory_budget};
pub use context::{CyclotomicField, Reduction, MAX_CONDUCTOR};
pub use dot::DotAccumulator;
pub use element::Cyc;
pub use error::FieldError;
pub use fnv::{Fnv128, Fnv64};
pub use galois::common_conductor;
pub use modp::PrimeReduction;
pub use poly_kernel::PolyKernel;
pub use rational::Rational;
pub use real_sign::real_sign;
pub use residues::ResidueMap;
pub use roots::{
    canonical_conductor, conductor_of_root, root_of_unity, root_of_unity_at, RootsOfUnity,
};
pub use text::{CycText, MAX_PARSE_DEPTH, MAX_POWER_BITS};
pub use unique_keys::UniqueKeys;
