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
//! Matrices act on column vectors: entry [new, old]. Generating sets: Humphries (2g + 1
//! curves) and Lickorish (3g − 1 curves), see [`GeneratingSet`].

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
