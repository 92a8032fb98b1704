//! Re-checking image-order certificates (docs/certificates.md §2).
//!
//! Enumeration: nothing simpler than listing the group proves its order, so the group is
//! listed again, but by left multiplication and with matrices scaled by their last non-zero
//! entry (the producer multiplies on the right and scales by the first); one element more
//! than the stated order is a failure.
//!
//! Orbit (Schreier–Sims): the vacuum orbit (and the added orbits) are rebuilt; the
//! generators' permutations of the lines are found by the orbit engine's exact lookup (the
//! producer used keys modulo a prime) and compared with the stated digests (FNV-1a computed
//! here); the order is checked against the product of the stated basic orbit lengths and the
//! orbit–stabiliser identity, the orbit of point 0 is found by a plain search, and |G| is
//! found again by Schreier–Sims with every point a base point (cyclorb-cert's summary,
//! another base than the producer's). The faithfulness lemma's hypotheses and the base,
//! strong-generator count and basic orbits of the producer's chain can only be re-derived
//! by the producer's own steps, and the last claim says so.

use std::collections::HashSet;

use cyclorb_cert::{
    permutation_group_summary, EnumerationCertificate, ImageOptions, PermutationImageCertificate,
    ProvedGenerators,
};
use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;
use cyclorb_mcg::BlockSpace;
use cyclorb_orbit::{OrbitOptions, OrbitProblem, Seed, Silent};
use num_bigint::BigUint;
use serde_json::Value;

use super::{body_as, Claims, Envelope, Stop};
use crate::faithful_lines::faithful_lines;
use crate::space::parse_set;

fn err(e: impl ToString) -> String {
    e.to_string()
}

/// The entries of `m` divided by its last non-zero entry.
fn scaled_by_last(field: &CyclotomicField, m: &Matrix) -> Result<Vec<Cyc>, String> {
    let last = m
        .entries()
        .iter()
        .rev()
        .find(|c| !c.is_zero())
        .ok_or("a zero matrix")?;
    let inverse = field.inv(last).map_err(err)?;
    m.entries()
        .iter()
        .map(|c| field.mul(c, &inverse).map_err(err))
        .collect()
}

/// The size of the group modulo scalars, listed by left multiplication; `None` past `cap`.
fn group_size(gens: &ProvedGenerators, cap: u64) -> Result<Option<u64>, String> {
    let field = gens.field();
    let identity = Matrix::identity(field, gens.dimension());
    let mut seen: HashSet<Vec<Cyc>> = HashSet::new();
    seen.insert(scaled_by_last(field, &identity)?);
    let mut queue = vec![identity];
    while let Some(x) = queue.pop() {
        for a in 0..gens.len() {
            let y = gens.dense(a).mul(field, &x).map_err(err)?;
            if seen.insert(scaled_by_last(field, &y)?) {
                if seen.len() as u64 > cap {
                    return Ok(None);
                }
                queue.push(y);
            }
        }
    }
    Ok(Some(seen.len() as u64))
}

/// The claim of an enumeration certificate.
pub fn enumeration(
    gens: &ProvedGenerators,
    c: &EnumerationCertificate,
    claims: &mut Claims,
) -> Result<(), Stop> {
    claims.claim("generators", || {
        if c.conductor != gens.field().conductor() || c.generators != gens.names() {
            return Err("the certificate names other generators or another field".into());
        }
        Ok(format!("{} generators, as named", gens.len()))
    })?;
    claims.claim("order", || match group_size(gens, c.order)? {
        Some(n) if n == c.order => Ok(format!(
            "{n} elements modulo scalars, listed again (left products, last-entry scaling): the same method as the producer, in another order"
        )),
        Some(n) => Err(format!("the group has {n} elements modulo scalars, not {}", c.order)),
        None => Err(format!("the group has more than {} elements modulo scalars", c.order)),
    })
}

/// FNV-1a (64 bits) of the images as little-endian 32-bit words, as 16 hexadecimal digits.
fn digest(perm: &[u32]) -> String {
    let mut h = cyclorb_field::Fnv64::new();
    h.write(perm.iter().flat_map(|x| x.to_le_bytes()));
    h.hex()
}

/// The orbit of point 0 under the permutations, by a plain search.
fn orbit_of_zero(perms: &[Vec<u32>], degree: usize) -> usize {
    let mut seen = vec![false; degree];
    let mut stack = vec![0u32];
    seen[0] = true;
    let mut count = 1;
    while let Some(x) = stack.pop() {
        for p in perms {
            let y = p[x as usize];
            if !seen[y as usize] {
                seen[y as usize] = true;
                count += 1;
                stack.push(y);
            }
        }
    }
    count
}

fn decimal(text: &str, what: &str) -> Result<BigUint, String> {
    text.parse()
        .map_err(|_| format!("{what} {text:?} is not a decimal number"))
}

/// The claims of an orbit (Schreier–Sims) certificate.
pub fn orbit(
    space: &BlockSpace,
    envelope: &Envelope,
    gens: &ProvedGenerators,
    body: &Value,
    file: &str,
    claims: &mut Claims,
) -> Result<(), Stop> {
    let c: PermutationImageCertificate = body_as(body, file, "image-orbit")?;
    let added: Vec<String> = body_as(&body["added_orbits"], file, "image-orbit (added_orbits)")?;
    let set = parse_set(&envelope.space.set).map_err(Stop::Invalid)?;
    let twists = space
        .generators(set)
        .map_err(|e| Stop::Invalid(e.to_string()))?;
    let seed = Seed::basis_vector(
        space.theory().field(),
        space.dimension(),
        space.basis().vacuum(),
    );
    let twist_set = space
        .generator_set(&twists)
        .map_err(|e| Stop::Invalid(e.to_string()))?;
    let problem = OrbitProblem::new(twist_set, &seed).map_err(|e| Stop::Invalid(e.to_string()))?;
    let threads = std::thread::available_parallelism().map_or(1, |n| n.get());
    let options = OrbitOptions {
        limit: Some(c.lines),
        threads,
        ..OrbitOptions::default()
    };
    let vacuum = problem
        .enumerate(&options, &mut Silent)
        .map_err(|e| Stop::Invalid(e.to_string()))?;
    let mut lines = None;
    claims.claim("lines", || {
        if c.conductor != gens.field().conductor() || c.generators != gens.names() {
            return Err("the certificate names other generators or another field".into());
        }
        if !vacuum.is_saturated() {
            return Err(format!("the vacuum orbit is not closed within {} lines", c.lines));
        }
        let union = faithful_lines(&problem, &vacuum, c.lines, threads)?
            .map_err(|reason| format!("no faithful set of lines within {}: {reason}", c.lines))?;
        if union.added_seeds() != added.as_slice() || cyclorb_cert::LineSet::len(&union) != c.lines {
            return Err(format!(
                "the vacuum orbit with the orbits of {:?} has {} lines; the certificate says {:?} and {}",
                union.added_seeds(),
                cyclorb_cert::LineSet::len(&union),
                added,
                c.lines
            ));
        }
        let detail = format!(
            "{} lines: the vacuum orbit ({} lines, closed) with the orbits of {:?}, enumerated again",
            c.lines,
            vacuum.len(),
            added
        );
        lines = Some(union);
        Ok(detail)
    })?;
    let lines = lines.expect("set by the claim above");
    let mut perms = Vec::new();
    claims.claim("permutations", || {
        perms = lines.exact_permutations(threads)?;
        let digests: Vec<String> = perms.iter().map(|p| digest(p)).collect();
        if digests != c.permutation_digests {
            return Err("the generators induce permutations with other digests".into());
        }
        Ok("each generator applied to every line and the image looked up exactly (the producer used keys modulo a prime); FNV-1a digests agree".into())
    })?;
    let g = &c.group;
    claims.claim("chain-arithmetic", || {
        let order = decimal(&g.order, "order")?;
        let product: BigUint = g.basic_orbit_lengths.iter().map(|&l| BigUint::from(l)).product();
        if product != order {
            return Err(format!("Π basic orbit lengths = {product}, the order is {order}"));
        }
        let first = orbit_of_zero(&perms, c.lines);
        if g.degree != c.lines || g.orbit_of_first_point != first || g.basic_orbit_lengths.first() != Some(&first) {
            return Err(format!("the orbit of point 0 has {first} points; the certificate says {}", g.orbit_of_first_point));
        }
        if BigUint::from(first) * decimal(&g.stabiliser_order, "stabiliser order")? != order {
            return Err("|orbit of 0| × |stabiliser| ≠ |G|".into());
        }
        Ok(format!(
            "|G| = Π {:?} = {order}; orbit of point 0 found by search ({first} points) × stabiliser {} = |G|",
            g.basic_orbit_lengths, g.stabiliser_order
        ))
    })?;
    claims.claim("order", || {
        let again = permutation_group_summary(c.lines, &perms).map_err(err)?;
        if again.order != g.order {
            return Err(format!("Schreier–Sims with every point a base point gives |G| = {}", again.order));
        }
        Ok(format!("|G| = {} again by Schreier–Sims with every point a base point (another base than the producer's)", again.order))
    })?;
    claims.claim("faithfulness-and-chain", || {
        c.verify(gens, &lines, &ImageOptions { threads }).map_err(err)?;
        Ok("the faithfulness lemma's hypotheses (exact coordinates of the link lines) and the producer's chain (base, strong generators) re-derived by the producer's own steps: not an independent check".into())
    })
}
