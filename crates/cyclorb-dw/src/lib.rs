//! # cyclorb-dw: Dijkgraaf–Witten theories of finite groups as permutation models
//!
//! For a finite group G the untwisted Dijkgraaf–Witten theory (the quantum double D(G))
//! assigns to the closed surface Σ_g the space V_g = C[X_g] of functions on
//! X_g = Hom(π₁Σ_g, G)/G, the flat G-bundles up to isomorphism (Dijkgraaf–Witten, Comm.
//! Math. Phys. 129 (1990)). The mapping class group acts through its action on π₁, so every
//! Dehn twist is a permutation of X_g.
//!
//! - [`FiniteGroup`]: a group by its multiplication table, from permutation generators, a
//!   table, a product, a built-in name ([`builtin_group`]) or a file ([`read_group_file`]).
//! - [`conjugacy_classes`], [`character_degrees`], [`verlinde_dimension`]: classes,
//!   centralisers, character degrees counted by Frobenius's formula, dim V_g of D(G).
//! - [`character_table`], [`modular_data`]: the characters of a subgroup (Dixon's method
//!   modulo a prime, lifted exactly) and S, T of D(G) from the centralisers' characters.
//! - [`Word`], [`Automorphism`], [`twist`]: the twists as automorphisms of the free group.
//! - [`FlatBundles`]: X_g enumerated by canonical representatives, the vacuum subset, every
//!   twist as a permutation; [`check_relations`] proves the mapping class group relations on
//!   those permutations (through [`TwistAction`], shared with the free group).
//! - [`CyclicCocycle`], [`TwistedBundles`]: the twisted theories D^{ω_p}(Z_N), the same
//!   permutations of X_g = Z_N^{2g} with phases in Q(ζ_{N²}) ([`PhasedPermutation`]);
//!   [`check_twisted_relations`] proves the relations up to scalars.
//! - [`subset_orbit`] and [`Orbitals`]: the orbit of the vacuum subset and the orbits of the
//!   group on pairs (the invariant matrices of a permutation representation).
//! - [`count_vacuum_orbit`]: the orbit of the vacuum counted as |P| / |Stab_P(S)|, the
//!   stabiliser from the parts of S over the abelianisation ([`AbelianFibres`]).
//!
//! ```
//! use cyclorb_dw::{builtin_group, FlatBundles, SizeBound};
//! use cyclorb_mcg::GeneratingSet;
//!
//! let g = builtin_group("Z2").unwrap();
//! let x = FlatBundles::new(&g, 2, SizeBound::default()).unwrap();
//! assert_eq!(x.len(), 16); // Hom(π₁Σ₂, Z₂) = Z₂⁴
//! let perms = x.generators(GeneratingSet::Humphries).unwrap();
//! let orbit = cyclorb_dw::subset_orbit(&x.vacuum(), &perms, usize::MAX).unwrap();
//! assert_eq!(orbit.len(), 15); // Lagrangian subspaces of F₂⁴ (standard)
//! ```
//!
//! ## Conventions
//! A twist τ acts on X_g by the permutation p_τ[φ] = [φ ∘ τ] and on functions by
//! (M_τ f)[φ] = f[φ ∘ τ], which makes τ ↦ M_τ a homomorphism; as a matrix, M_τ has its 1 in
//! row x at column p_τ(x). The permutation of a product X₁X₂⋯X_k of these matrices is
//! "p₁ first, then p₂, …": x ↦ p_k(⋯p₁(x)). The vacuum is the indicator of
//! {[φ] : φ(a_h) = 1 for all h}; the twists about α_h and γ_h fix it.
//!
//! ## Untrusted input
//! Group files are checked (bijections, closure, identity, inverses, associativity) and
//! every error names the file, the place and the reason. Sizes are bounded before anything
//! is built ([`SizeBound`]).

#![deny(missing_docs)]

mod builtins;
mod characters;
mod classes;
mod count;
mod degrees;
mod error;
mod fibres;
mod file;
mod group;
mod modular;
mod orbitals;
mod relations;
mod space;
mod subsets;
mod twisted;
mod twisted_modular;
mod twists;
mod words;

pub use builtins::{builtin_group, EXAMPLES};
pub use characters::{character_table, CharacterTable, MAX_CLASSES};
pub use classes::{centraliser_in, conjugacy_classes, ConjugacyClass};
pub use count::{
    count_vacuum_orbit, CountBounds, CountLimits, PartOrbit, VacuumCount, VacuumOrbit,
};
pub use degrees::{centraliser_degrees, character_degrees, verlinde_dimension};
pub use error::DwError;
pub use fibres::AbelianFibres;
pub use file::{parse_group_file, read_group_file, GROUP_FILE_FORMAT};
pub use group::{cycle_notation, Element, FiniteGroup, MAX_ORDER, MAX_TABLE_ORDER};
pub use modular::{modular_data, Anyon, ModularData};
pub use orbitals::Orbitals;
pub use relations::{
    check_relations, free_group_checks, relation_checks, word_permutation, FreeGroup,
    RelationCheck, TwistAction,
};
pub use space::{FlatBundles, SizeBound};
pub use subsets::subset_orbit;
pub use twisted::{
    check_twisted_relations, CyclicCocycle, PhasedPermutation, TwistedBundles, MAX_TWISTED_ORDER,
};
pub use twisted_modular::{fuse, twisted_modular_data, TwistedModularData};
pub use twists::{gamma_word, separating_twist, twist};
pub use words::{Automorphism, Word};
