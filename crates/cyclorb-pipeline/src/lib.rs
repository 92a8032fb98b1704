//! # cyclorb-pipeline: from a theory spec to proved answers
//!
//! The layer a script (or the `cyclorb` program) calls: it reads a spec, proves the data it
//! rests on, builds the genus-g block space and its Dehn twists, and runs the routes that
//! decide the vacuum orbit and the projective image, using the libraries below
//! (`cyclorb-orbit` to list orbits, `cyclorb-structure` and `cyclorb-dw` to count them,
//! `cyclorb-cert` for certificates). It prints nothing and parses no command line.
//!
//! - [`proof`]: only proved data are used (theory files verified, cached by data hash;
//!   raw generators proved invertible), and a process-wide record of whether they were.
//! - [`space`]: spec → block space → generator sets → the vacuum orbit problem.
//! - [`answer`]: the one answer of the orbit routes ([`OrbitAnswer`]), with its JSON keys.
//! - [`method`]: the routes to the vacuum orbit ([`OrbitMethod`]).
//! - [`dw_space`]: the same for Dijkgraaf–Witten theories `dw:GROUP`, as permutations.
//! - [`dw_count`]: the counting route of untwisted `dw:` theories (|P| / |Stab_P(S)|).
//! - [`listing`]: the enumerating route (origin, checkpoints, the run, its answer).
//! - [`product`]: the orbit of a Deligne product from its factors' orbits.
//! - [`runtime`]: resident memory of the process and the default memory budget.
//! - [`counting`]: the counting route through the monomial structure, re-checked.
//! - [`image`]: the decision of the projective image's order, route by route.
//! - [`witness`]: the search for a witness of infinite image (factors first).
//! - [`lines`]: the faithful set of orbit lines the image route needs.
//! - [`lifted`]: witnesses of infinite image found on a Deligne factor.
//! - [`sweep`]: a plan of runs over theories × genera, scheduled and computed run by run.
//! - [`envelope`]: the keys every certificate file carries (kind, program, spec, files).
//! - [`check`]: the re-check of a certificate file, claim by claim (`cyclorb check`).
//!
//! ```
//! use cyclorb_orbit::{OrbitOptions, Silent};
//! use cyclorb_pipeline::listing::{Listing, Origin};
//! use cyclorb_pipeline::space::{build_space, cert_generators, parse_set};
//!
//! // the vacuum orbit of Ising at genus 2 and its Poincaré sum
//! let origin = Origin::Theory { spec: "ising".into(), genus: 2, set: "humphries".into() };
//! let listing = Listing::new(&origin).unwrap();
//! let orbit = listing.run(&OrbitOptions::default(), None, &mut Silent).unwrap();
//! let answer = listing.answer(&orbit, 1, Default::default());
//! // 3840 lines, B = 384·G⁻¹ (the all-genus follow-up of Castro et al., 2019)
//! assert_eq!(answer.orbit_size.unwrap().to_u64(), Some(3840));
//! assert_eq!(answer.poincare_sum.prefactor.as_deref(), Some("384"));
//!
//! // the commutant of the twists, certified: the representation is irreducible
//! let space = build_space("ising", 2).unwrap();
//! let gens = cert_generators(&space, parse_set("humphries").unwrap()).unwrap();
//! let commutant = cyclorb_cert::commutant(&gens, Default::default()).unwrap();
//! assert_eq!(commutant.dimension, 1);
//!
//! // the projective image, decided by the structural route with its certificate re-checked
//! use cyclorb_pipeline::image::{decide_image, ImageRequest, ImageStrategy};
//! let request = ImageRequest::with_strategy(ImageStrategy::Structure);
//! let set = parse_set("humphries").unwrap();
//! let image = decide_image(&space, set, &gens, &request).unwrap();
//! assert_eq!(image.finite, Some(true));
//! ```

#![deny(missing_docs)]

pub mod answer;
pub mod check;
pub mod counting;
pub mod dw_count;
pub mod dw_space;
pub mod envelope;
pub mod faithful_lines;
pub mod image;
pub mod lifted;
pub mod listing;
pub mod method;
pub mod product;
pub mod proof;
mod proof_cache;
pub mod runtime;
pub mod space;
pub mod sweep;
pub mod witness;

pub use answer::{Count, OrbitAnswer};
pub use method::OrbitMethod;
