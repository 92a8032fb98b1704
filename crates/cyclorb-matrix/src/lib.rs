//! # cyclorb-matrix: vectors and matrices over Q(ζ_n)
//!
//! Dense matrices ([`Matrix`]) and the sparse forms that Dehn-twist generators take
//! ([`Operator`]: diagonal, block-diagonal, sparse rows), all applied through the
//! [`LinearMap`] trait. Entries are [`cyclorb_field::Cyc`]; every operation takes the field
//! context. Products use one reduction modulo Φ_n per output entry.
//!
//! What is here, one module per job:
//! - ring operations, transpose, conjugate transpose, trace ([`Matrix`]); Kronecker product;
//!   integer powers (negative ones through the inverse);
//! - comparisons for projective work: [`Matrix::is_scalar`], [`Matrix::scalar_multiple_of`],
//!   [`Matrix::commutes_with`], invariance of a Hermitian form
//!   ([`Matrix::preserves_form`], X† G X = G);
//! - the characteristic polynomial and determinant without division (Berkowitz);
//! - exact Gauss–Jordan elimination, written once over any [`ScalarField`] (Q(ζ_n) as
//!   [`Exact`], F_p as [`ModP`]): rank, nullspace, solve, inverse, the incremental
//!   [`Echelon`] and eigenbases over a list of candidate eigenvalues;
//! - the commutant {X : XA = AX for every generator A} ([`solve_commutant`]), its unknowns
//!   cut by diagonal generators or an eigenbasis, over either field;
//! - the projective order (order modulo scalars), exactly;
//! - named generator sets ([`GeneratorSet`], checked when built), their proof
//!   ([`ProvedGenerators`]: every generator invertible, the diagonal form G preserved) and
//!   their JSON file format with the seed vector's ([`Seed`], [`FormatError`]): the one
//!   input type of the orbit engine and the certificates;
//! - reduction modulo a prime p ≡ 1 (mod n) to [`ModpMatrix`], with rank and nullspace
//!   over F_p. **A rank over F_p is a lower bound for the exact rank** (a nullity over F_p
//!   an upper bound for the exact nullity): certificates rely on that direction only.
//!
//! ```
//! use cyclorb_field::CyclotomicField;
//! use cyclorb_matrix::Matrix;
//! let q4 = CyclotomicField::new(4).unwrap();
//! let i = q4.zeta_pow(1);
//! // [[0, 1], [−1, 0]] has order 4, and order 2 modulo scalars
//! let s = Matrix::from_rows(vec![vec![q4.zero(), q4.one()], vec![q4.int(-1), q4.zero()]])
//!     .unwrap();
//! assert_eq!(s.projective_order(&q4, 100).unwrap(), Some(2));
//! assert_eq!(s.determinant(&q4).unwrap(), q4.one());
//! let chi = s.charpoly(&q4).unwrap(); // x² + 1
//! assert_eq!(chi, vec![q4.one(), q4.zero(), q4.one()]);
//! let d = Matrix::diagonal(&q4, &[i.clone(), q4.neg(&i)]);
//! assert_eq!(d.is_scalar(&q4), None);
//! assert_eq!(d.pow(&q4, 2).unwrap().is_scalar(&q4), Some(q4.int(-1)));
//! ```
//!
//! Matrices serialise (serde) as their conductor and rows of entries in the text syntax of
//! `cyclorb-field`.
//!
//! ## Performance
//! Entries are canonical field elements; sums of products go through
//! [`cyclorb_field::DotAccumulator`] (one reduction per output entry). Elimination costs one
//! field inversion per pivot and prefers small pivots (units first). Berkowitz costs O(d⁴)
//! products; work mod p is in machine words.
//!
//! ## Untrusted input
//! Shape mismatches, singular matrices, inconsistent systems and primes dividing a
//! denominator are [`MatrixError`] values; [`Operator::validate`] checks the sparse forms.
//! Generator-set and seed files are read with a memory budget checked against the file's
//! size and dimension first, and a malformed file is a [`FormatError`] naming the file, the
//! JSON path of the offending value and the reason; reading never panics.

#![deny(missing_docs)]

mod charpoly;
mod commutant;
mod compare;
mod dense;
mod elimination;
mod error;
mod form;
mod generator_file;
mod generators;
mod kronecker;
mod modp;
mod operator;
mod operator_algebra;
mod order;
mod power;
mod scalar_field;
mod seed;
mod serial;

pub use commutant::{
    solve_commutant, CommutantCut, CommutantSystem, EigenbasisCut, SolvedCommutant, UnknownOrder,
    Want,
};
pub use dense::Matrix;
pub use elimination::{eigenbasis, rows_inverse, rows_mul, Echelon, Eigenbasis, Rows};
pub use error::MatrixError;
pub use generator_file::{
    operator_json, FormatError, FORMAT_VERSION, GENERATORS_FORMAT, SEED_FORMAT,
};
pub use generators::{GeneratorSet, ProvedGenerators, MAX_DENSE_PROOF};
pub use modp::{reduce_vector, ModpMatrix};
pub use operator::{Block, LinearMap, Operator};
pub use scalar_field::{Exact, ModP, ScalarField};
pub use seed::Seed;
