//! # cyclorb-structure: orbits and image orders through a monomial structure
//!
//! Brute-force orbit enumeration lists every line; this crate counts them. When the
//! genus-g representation of the mapping class group is *monomial* — some basis e_j in
//! which every Dehn twist maps every e_j to a root of unity times some e_k — the group is
//! an extension of a permutation group P by a group K of diagonal matrices, and both the
//! order of the projective image and the orbit of the vacuum line can be counted exactly
//! without listing anything. Ising is the model case: the basis is that of the even spin
//! structures and P is Sp(2g, F₂) acting on them.
//!
//! The route, one module per step:
//! 1. **An abelian normal subgroup** N (module `power`): the normal closure of the k-th
//!    powers of the twists, k the first proper divisor of the twist order for which the
//!    powers are non-scalar and commute exactly (k = 2 for Ising).
//! 2. **Its joint eigenlines** (module `refine`): partition refinement by the spectral
//!    projectors of the powers and by the images under the generators, exact over Q(ζ_n),
//!    G-orthogonal throughout.
//! 3. **The monomial form** ([`MonomialForm`]): the lines rescaled along a spanning tree
//!    of the permutation action, and every generator read off as a [`Monomial`]
//!    (permutation, phases as exponents of ζ_m, m = lcm(2, n)), exactly. If any step fails
//!    the theory is reported as lacking the structure ([`StructureError::Absent`], with
//!    the reason for every power tried): Fibonacci and SU(2)_3 are. Module `search` tries
//!    the powers in increasing order.
//! 4. **The image** ([`MonomialChain`]): deterministic Schreier–Sims on the permutation
//!    parts carrying monomial lifts; the diagonal residues span the kernel K, a subgroup of
//!    (Z/m)^d held in Hermite form ([`ModLattice`]) with its invariant factors by
//!    diagonalisation over Z/m. |image| = |P|·|K| / |K ∩ scalars|.
//!    This Schreier–Sims is written apart from `cyclorb-cert`'s [`cyclorb_cert::StabiliserChain`]
//!    on purpose: the two are independent checks of each other (the tests compare
//!    their orders on the same groups), so a fault in one cannot hide in both.
//! 5. **The orbit** (module `orbit`): v₀ is expanded in the monomial basis (module
//!    `vacuum`); the orbit size is the number of supports (the orbit of the vacuum's
//!    support S₀ under P) times the phase patterns per support (the orbit of 0 in
//!    (Z/m)^{S₀}/(D + Z𝟙) under the support's stabiliser, D its diagonal part).
//! 6. **The prefactor**: λ = |orbit|·⟨v₀, v₀⟩_G / dim when the commutant is 1-dimensional.
//!    Irreducibility is proved by Schur's lemma in the monomial basis when K separates
//!    the coordinates and P is transitive (module `irreducible`: X commuting with K is
//!    diagonal, commuting with a transitive P it is scalar); otherwise by cyclorb-cert's
//!    commutant certificate on the monomial generators plus a few diagonal elements of K.
//!
//! ```
//! use cyclorb_structure::{analyse_spec, recheck, StructureOptions};
//! use cyclorb_mcg::BlockSpace;
//! let report = analyse_spec("ising", 2, &StructureOptions::default()).unwrap();
//! assert_eq!(report.orbit_size, "3840");
//! assert_eq!(report.prefactor.as_deref(), Some("384"));
//! let space = BlockSpace::new(cyclorb_theory::parse_spec("ising").unwrap(), 2).unwrap();
//! recheck(&space, &report.certificate).unwrap();
//! ```
//!
//! The report ([`StructureReport`]) carries a [`StructureCertificate`]: the monomial
//! basis, every generator as a monomial, the vacuum's expansion, the base, basic orbits
//! and strong generators of P with their lifts, the Hermite rows and invariant factors of
//! K, the counts and the commutant proof. [`recheck`] verifies the monomial form against
//! the Dehn twists exactly and derives everything else again (module `recheck`).
//!
//! ## Performance
//! Vectors are sparse; the refinement costs a few sparse mat-vecs and G-inner products per
//! basis vector and generator per cut (at most d cuts). Schreier–Sims stores one monomial
//! per basic-orbit point. The orbit count stores, per support, where a transversal element
//! places S₀, and searches a quotient group of phase patterns; nothing is proportional to
//! the orbit. Ising at genus 4 (d = 136, 6·10¹¹ lines) takes under a second, genus 5
//! (d = 528, 2.7·10¹⁸ lines) about ten seconds.
//!
//! ## Untrusted input
//! Certificates read from files are parsed and re-derived by [`recheck`]; malformed data
//! and failed checks are [`StructureError`] values, never panics.

#![deny(missing_docs)]

mod analyse;
mod chain;
mod commutant;
mod components;
mod error;
mod imprimitive;
mod imprimitive_check;
mod irreducible;
mod lattice;
mod lineorbit;
mod monomial;
mod orbit;
mod power;
mod recheck;
mod refine;
mod report;
mod search;
mod sectors;
mod sectorsum;
mod setstab;
mod smith;
mod sparse;
mod vacuum;

pub use analyse::{analyse, analyse_spec, StructureOptions};
pub use chain::MonomialChain;
pub use cyclorb_field::RootsOfUnity;
pub use error::StructureError;
pub use imprimitive::{
    analyse_imprimitive, ImprimitiveCertificate, ImprimitiveOptions, ImprimitiveReport,
};
pub use imprimitive_check::{recheck_imprimitive, ImprimitiveCheck};
pub use lattice::ModLattice;
pub use monomial::{Monomial, MonomialForm};
pub use orbit::OrbitCount;
pub use recheck::recheck;
pub use report::{
    ChainCertificate, CommutantProof, ImageReport, KernelCertificate, OrbitReport,
    StructureCertificate, StructureReport,
};
pub use sectorsum::SectorOrbit;
pub use sparse::{ColumnMap, SparseVec};
