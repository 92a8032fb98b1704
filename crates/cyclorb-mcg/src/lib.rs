//! # cyclorb-mcg: genus-g conformal blocks and Dehn-twist generators
//!
//! For a theory ([`cyclorb_theory::Theory`]) and a genus g ≥ 1, [`BlockSpace`] builds the
//! space V_g of conformal blocks in the comb basis of a handlebody spine (docs/genus-g.md §1), its
//! invariant Hermitian form G (§4.5), and the Dehn twists about the curves α_h, β_h, γ_h
//! (§4.2–4.4) as exact sparse matrices over Q(ζ_n). Every twist is T_C = Σ_c θ_c P_c(C),
//! P_c the projector onto charge c through C in a tree basis where C is an edge, so all
//! twists have the same handedness. [`check_relations`] proves the mapping class group
//! relations exactly (up to scalars: the representation is projective).
//!
//! ## Conventions
//! Matrices act on column vectors: entry [new, old]; a word X₁X₂⋯X_k ([`word_matrix`])
//! applies X_k first. Generating sets: Humphries (2g + 1 curves) and Lickorish (3g − 1
//! curves), see [`GeneratingSet`] (`"humphries".parse()` reads a name).
//!
//! ```
//! use cyclorb_mcg::{check_relations, BlockSpace, GeneratingSet};
//! use cyclorb_theory::parse_spec;
//! // Ising at genus 2: 10 blocks (Verlinde: Σ_a (D/d_a)² = 4 + 2 + 4), 5 Humphries twists
//! let space = BlockSpace::new(parse_spec("ising").unwrap(), 2).unwrap();
//! assert_eq!(space.dimension(), 10);
//! let set: GeneratingSet = "humphries".parse().unwrap();
//! let twists = space.generators(set).unwrap();
//! assert_eq!(twists.len(), 5);
//! // braid, commutation, chain relations and the invariance of the form, exactly
//! assert!(check_relations(&space).unwrap().iter().all(|c| c.ok));
//! ```
//!
//! ## Performance
//! The comb basis is enumerated from the fusion rules and its size estimated first
//! ([`SpaceEstimate`]: dim V_g and the bytes of the space and its twists, checked against
//! the process's memory budget before anything is allocated). Twists are never dense: α
//! twists are diagonal, β and γ twists block-diagonal (one block per choice of the labels
//! their F-moves do not touch), so applying one costs O(non-zeros) field operations; [`word_matrix`] forms products column by column through the sparse forms.
//! F-blocks are read from the theory, which computes each at most once.
//!
//! ## Untrusted input
//! The theory is already validated ([`cyclorb_theory`] refuses malformed data); a genus of
//! 0, a space past the memory budget or a theory without F- and R-symbols is an
//! [`McgError`], never a panic. Relation checks are exact and report each relation by name
//! with whether it holds.

#![deny(missing_docs)]

mod alpha;
mod basis;
mod beta;
mod curves;
mod error;
mod estimate;
mod form;
mod gamma;
mod modular;
mod relations;
mod space;
mod word_product;

pub use basis::{CombBasis, CombState};
pub use curves::{Curve, GeneratingSet};
pub use error::McgError;
pub use estimate::SpaceEstimate;
pub use relations::{check_relations, RelationCheck};
pub use space::BlockSpace;
pub use word_product::word_matrix;
