//! Witnesses of an infinite projective image lifted from a tensor factor.
//!
//! For a Deligne product A ⊠ B the genus-g block space is V_g(A) ⊗ V_g(B) and every Dehn
//! twist acts as c·(T_A ⊗ T_B) for a non-zero scalar c (docs/minimal-models.md, "Witnesses
//! lifted from a factor"; proved exactly at genus 2 for several products in
//! `crates/cyclorb-mcg/tests/product_tensor.rs`). So a word w acts as c_w·(W_A ⊗ W_B): if
//! W_A has eigenvalues λ₁, λ₂ whose ratio is not a root of unity, then λ₁μ and λ₂μ (μ any
//! eigenvalue of W_B) are eigenvalues of the product's word with the same ratio, and no
//! power of it is a scalar. The search therefore runs on the factors (smallest block space
//! first), never forming the product's generators, and the certificate names the factor;
//! its re-check rebuilds the product theory, takes the named factor again, compares its
//! exact data hash, builds the factor's block space and re-verifies the factor's
//! certificate there.

use cyclorb_cert::{
    find_witness, ProvedGenerators, WitnessCertificate, WitnessOptions, WitnessOutcome,
};
use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_theory::Theory;
use serde::{Deserialize, Serialize};

use crate::space::cert_generators;

/// Which factor of A ⊠ B a witness was found on, and how to rebuild it.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct FactorRef {
    /// `left` (A) or `right` (B) of the product the theory was built as (the
    /// [`Theory::deligne_factors`] of the theory named by the spec).
    pub factor: String,
    /// The factor's name as built (for example `spherical-twist(galois:7(su2:4))`).
    pub theory: String,
    /// SHA-256 of the factor's exact data (`cyclorb describe` prints the same for a spec).
    pub data_hash: String,
    /// dim V_g of the factor.
    pub dimension: usize,
    /// The conductor of the factor's field (the certificate's numbers lie in it).
    pub conductor: u32,
}

/// A witness on a factor, which proves the product's image infinite.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct LiftedWitness {
    /// The factor the word was certified on.
    pub lifted_from_factor: FactorRef,
    /// The factor's certificate: the word (the same curve names as the product's), a
    /// W-invariant block of the factor's basis and the exact proof on it.
    pub certificate: WitnessCertificate,
}

/// The factors of a Deligne product with their sides, or none.
fn factors(theory: &Theory) -> Vec<(&'static str, &Theory)> {
    match theory.deligne_factors() {
        Some((a, b)) => vec![("left", a), ("right", b)],
        None => Vec::new(),
    }
}

/// A factor's block space at genus g and its twists as a certificate generator set.
fn factor_generators(
    factor: &Theory,
    genus: usize,
    set: GeneratingSet,
) -> Result<(BlockSpace, ProvedGenerators), String> {
    let space = BlockSpace::new(factor.clone(), genus).map_err(|e| e.to_string())?;
    let gens = cert_generators(&space, set)?;
    Ok((space, gens))
}

/// Search the factors of `theory` (when it is a Deligne product), smallest genus-g block
/// space first, for a witness; the first one found is re-checked on its factor before it
/// is returned. `None` when the theory is no product or no factor yields a witness within
/// the bounds (which proves nothing).
pub fn find_lifted(
    theory: &Theory,
    genus: usize,
    set: GeneratingSet,
    options: &WitnessOptions,
) -> Result<Option<LiftedWitness>, String> {
    let mut sized = Vec::new();
    for (side, factor) in factors(theory) {
        if factor.rank() < 2 {
            continue;
        }
        let space = BlockSpace::new(factor.clone(), genus).map_err(|e| e.to_string())?;
        sized.push((space.dimension(), side, factor));
    }
    sized.sort_by_key(|&(dim, _, _)| dim);
    for (dimension, side, factor) in sized {
        let (_, gens) = factor_generators(factor, genus, set)?;
        if let WitnessOutcome::Found(certificate) =
            find_witness(&gens, options).map_err(|e| format!("witness on a factor: {e}"))?
        {
            let lifted = LiftedWitness {
                lifted_from_factor: FactorRef {
                    factor: side.to_string(),
                    theory: factor.name().to_string(),
                    data_hash: factor.data_hash(),
                    dimension,
                    conductor: factor.conductor(),
                },
                certificate,
            };
            recheck_lifted(theory, genus, set, &lifted)?;
            return Ok(Some(lifted));
        }
    }
    Ok(None)
}

/// The factor a lifted witness names, rebuilt from the product theory: it must exist and
/// have the recorded name, data hash and genus-g dimension; its twists as a generator set.
pub fn named_factor(
    theory: &Theory,
    genus: usize,
    set: GeneratingSet,
    named: &FactorRef,
) -> Result<ProvedGenerators, String> {
    let (_, factor) = factors(theory)
        .into_iter()
        .find(|(side, _)| *side == named.factor)
        .ok_or_else(|| {
            format!(
                "{} has no factor {:?} (a Deligne product has `left` and `right`)",
                theory.name(),
                named.factor
            )
        })?;
    if factor.name() != named.theory || factor.data_hash() != named.data_hash {
        return Err(format!(
            "the {} factor of {} is {} with data hash {}, not {} with {}",
            named.factor,
            theory.name(),
            factor.name(),
            factor.data_hash(),
            named.theory,
            named.data_hash
        ));
    }
    let (space, gens) = factor_generators(factor, genus, set)?;
    if space.dimension() != named.dimension {
        return Err(format!(
            "the factor's genus-{genus} space has dimension {}, not {}",
            space.dimension(),
            named.dimension
        ));
    }
    Ok(gens)
}

/// Re-verify a lifted witness from the product theory: the named factor (`named_factor`),
/// and the certificate must re-check on the factor's own generators (its word, block,
/// characteristic polynomial, norm and non-cyclotomic factor, as for any witness).
pub fn recheck_lifted(
    theory: &Theory,
    genus: usize,
    set: GeneratingSet,
    lifted: &LiftedWitness,
) -> Result<(), String> {
    let gens = named_factor(theory, genus, set, &lifted.lifted_from_factor)?;
    lifted
        .certificate
        .recheck(&gens)
        .map_err(|e| format!("the factor's witness does not re-check: {e}"))
}

#[cfg(test)]
mod tests {
    use super::*;
    use cyclorb_theory::parse_spec;

    fn options() -> WitnessOptions {
        WitnessOptions {
            depth: 4,
            tries: 100,
            ..WitnessOptions::default()
        }
    }

    #[test]
    fn a_tampered_lifted_witness_is_refused() {
        // Tricritical Ising M(5,4) = conj-so3:3 ⊠ (an Ising-type su2:2 conjugate): the
        // so3:3 (Fibonacci-type) factor has a dense genus-2 image (Freedman–Larsen–Wang
        // 2002), the su2:2 factor a finite one, so the witness must come from the so3 factor.
        let theory = parse_spec("minimal:5:4").unwrap();
        let set = GeneratingSet::Humphries;
        let lifted = find_lifted(&theory, 2, set, &options())
            .unwrap()
            .expect("a witness on a factor");
        assert!(lifted.lifted_from_factor.theory.contains("so3:3"));
        recheck_lifted(&theory, 2, set, &lifted).unwrap();
        // the same word with one letter changed to a different generator
        let mut word = lifted.clone();
        let first = &mut word.certificate.word[0];
        *first = if first == "alpha0" { "beta0" } else { "alpha0" }.to_string();
        assert!(recheck_lifted(&theory, 2, set, &word).is_err());
        // the other factor
        let mut side = lifted.clone();
        side.lifted_from_factor.factor = match side.lifted_from_factor.factor.as_str() {
            "left" => "right".into(),
            _ => "left".into(),
        };
        assert!(recheck_lifted(&theory, 2, set, &side).is_err());
        // a theory that is no product
        let ising = parse_spec("minimal:4:3").unwrap();
        assert!(recheck_lifted(&ising, 2, set, &lifted).is_err());
    }
}
