//! Re-checking a certificate of the imprimitive structural route (docs/certificates.md §5).
//!
//! Exact and independent of the producer's search: the components' sum, the line
//! representatives rebuilt along the stated tree with every generator applied to every one
//! (the stated root of unity times the stated line), their rank, every line's joint
//! eigenvalues, the block permutations, and the order of the permutation group on the lines
//! by cyclorb-cert's Schreier–Sims with every point a base point (a different base from the
//! producer's). The kernel, the support's stabiliser, the patterns and the sector commutants
//! are re-derived by the producer's own steps (`ImprimitiveCheck::derived`), and that claim
//! says so.

use cyclorb_cert::permutation_group_summary;
use cyclorb_mcg::BlockSpace;
use cyclorb_structure::{ImprimitiveCertificate, ImprimitiveCheck, ImprimitiveOptions};
use num_bigint::BigUint;

use super::{Claims, Stop};

/// The most lines on which the independent Schreier–Sims (every point a base point, a
/// sift costing up to degree² look-ups) is run.
const INDEPENDENT_DEGREE: usize = 1000;

fn decimal(text: &str, what: &str) -> Result<BigUint, String> {
    text.parse()
        .map_err(|_| format!("{what} {text:?} is not a decimal number"))
}

/// Every claim of an imprimitive structure certificate.
pub fn check(
    space: &BlockSpace,
    c: &ImprimitiveCertificate,
    claims: &mut Claims,
) -> Result<(), Stop> {
    let mut state = None;
    claims.claim("identity", || {
        let (check, detail) = ImprimitiveCheck::new(space, c).map_err(|e| e.to_string())?;
        state = Some(check);
        Ok(detail)
    })?;
    let Some(mut check) = state else {
        return Err(Stop::Invalid("the identity claim kept no state".into()));
    };
    claims.claim("vacuum-components", || {
        check.components().map_err(|e| e.to_string())
    })?;
    claims.claim("line-monomials", || {
        check.lines().map_err(|e| e.to_string())
    })?;
    claims.claim("spanning", || check.spanning().map_err(|e| e.to_string()))?;
    claims.claim("sectors", || check.sectors().map_err(|e| e.to_string()))?;
    claims.claim("block-permutations", || {
        check.block_permutations().map_err(|e| e.to_string())
    })?;
    claims.claim("line-permutation-order", || {
        let degree = c.sector_of_line.len();
        let perms: Vec<Vec<u32>> = c.monomials.iter().map(|g| g.perm.clone()).collect();
        let stated: BigUint = c
            .basic_orbit_lengths
            .iter()
            .map(|&x| BigUint::from(x))
            .product();
        if degree > INDEPENDENT_DEGREE {
            return Ok(format!(
                "|P_L| = {stated} on {degree} lines: the product of the stated basic orbit lengths (the independent Schreier–Sims with every point a base point is not run beyond {INDEPENDENT_DEGREE} lines; the chain is re-derived under derived-data)"
            ));
        }
        let summary = permutation_group_summary(degree, &perms).map_err(|e| e.to_string())?;
        if summary.order != stated.to_string() {
            return Err(format!(
                "Schreier–Sims with every point a base point gives {}, the stated chain {stated}",
                summary.order
            ));
        }
        Ok(format!(
            "|P_L| = {stated} on {degree} lines: the product of the stated basic orbit lengths, and again by cyclorb-cert's Schreier–Sims with every point a base point"
        ))
    })?;
    claims.claim("orbit-arithmetic", || {
        let supports = decimal(&c.supports, "supports")?;
        let patterns = decimal(&c.patterns_per_support, "patterns per support")?;
        let orbit = decimal(&c.orbit_size, "orbit size")?;
        let image = decimal(&c.image_order, "image order")?;
        let kernel = decimal(&c.kernel.order, "kernel order")?;
        let lines: BigUint = c
            .basic_orbit_lengths
            .iter()
            .map(|&x| BigUint::from(x))
            .product();
        let scalars = BigUint::from(c.kernel.scalars);
        if &supports * &patterns != orbit || &lines * &kernel != &image * &scalars {
            return Err(
                "|orbit| ≠ supports × patterns or |image| ≠ |P_L|·|K| / |K ∩ scalars|".into(),
            );
        }
        Ok(format!(
            "|orbit| = {} = {} supports × {} patterns; |image| = |P_L|·|K| / |K ∩ scalars| = {}",
            c.orbit_size, c.supports, c.patterns_per_support, c.image_order
        ))
    })?;
    let limit = ImprimitiveOptions::default().stabiliser_limit;
    claims.claim("derived-data", || {
        check
            .derived(limit, ImprimitiveOptions::default().commutant_primes)
            .map_err(|e| e.to_string())
    })
}
