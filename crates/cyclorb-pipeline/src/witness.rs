//! The search for a witness of infinite projective image: on the factors of a Deligne
//! product first (a witness there lifts, see [`crate::lifted`]; the product's generators
//! are then never built), then on the generators themselves. Every witness returned has
//! been re-checked.

use cyclorb_cert::{
    find_witness, ProvedGenerators, WitnessCertificate, WitnessOptions, WitnessOutcome,
};
use cyclorb_mcg::{BlockSpace, GeneratingSet};

use crate::lifted::{find_lifted, LiftedWitness};
use crate::space::cert_generators;

/// What the search found.
pub enum WitnessSearch {
    /// A witness on a factor of the product (re-checked there).
    Lifted(LiftedWitness),
    /// A witness on the generators (re-checked).
    Found(WitnessCertificate),
    /// None within the bounds (which proves nothing).
    NotFound {
        /// Words tried.
        words_tried: usize,
    },
}

/// Search on `gens`, the twists of the block space, and re-check what is found: the
/// witness, or (inner `Err`) the number of words tried without one.
pub fn search_generators(
    gens: &ProvedGenerators,
    options: &WitnessOptions,
) -> Result<Result<WitnessCertificate, usize>, String> {
    match find_witness(gens, options).map_err(|e| e.to_string())? {
        WitnessOutcome::Found(cert) => {
            cert.recheck(gens)
                .map_err(|e| format!("witness does not re-check: {e}"))?;
            Ok(Ok(cert))
        }
        WitnessOutcome::NotFound(report) => Ok(Err(report.words_tried)),
    }
}

/// Search on the factors of a product, then on the twists of `space` (built only when no
/// factor yields a witness).
pub fn search(
    space: &BlockSpace,
    set: GeneratingSet,
    options: &WitnessOptions,
) -> Result<WitnessSearch, String> {
    if let Some(lifted) = find_lifted(space.theory(), space.genus(), set, options)
        .map_err(|e| format!("witness on a factor failed: {e}"))?
    {
        return Ok(WitnessSearch::Lifted(lifted));
    }
    Ok(
        match search_generators(&cert_generators(space, set)?, options)? {
            Ok(cert) => WitnessSearch::Found(cert),
            Err(words_tried) => WitnessSearch::NotFound { words_tried },
        },
    )
}
