//! Re-checking the certificates of Dijkgraaf–Witten theories (docs/certificates.md §6): X_g
//! and the twists (with their phases when twisted) are rebuilt from the group and compared
//! with the stated ones; the image order is the product of the stated basic orbit lengths
//! and is found again by listing the permutation (or monomial) group (up to `MAX_LISTED`
//! elements; beyond, by the producer's Schreier–Sims, said so); the commutant dimension is
//! the number of orbits on pairs of states that carry an invariant, counted here by a
//! union–find of its own (`dw_pairs`); a counted vacuum orbit is re-derived in `dw_count`.

use std::collections::HashSet;

use cyclorb_cert::StabiliserChain;
use num_bigint::BigUint;
use serde_json::Value;

use super::dw_count::{self, SetStabiliser};
use super::dw_monomial::projective_order;
use super::dw_pairs::commutant_dimension;
use super::{body_as, Claims, Envelope, Stop};
use crate::dw_space::DwSpace;

/// Largest group listed element by element.
const MAX_LISTED: u64 = 200_000;

fn err(e: impl ToString) -> String {
    e.to_string()
}

/// The stated generators (name, images) against the rebuilt twists.
fn same_generators(space: &DwSpace, body: &Value) -> Result<String, String> {
    let stated = body["generators"]
        .as_array()
        .ok_or("key `generators`: expected a list")?;
    let twists = space.twists();
    if stated.len() != twists.len() {
        return Err(format!(
            "{} generators stated, the set has {}",
            stated.len(),
            twists.len()
        ));
    }
    let numbers = |v: &Value| -> Option<Vec<u32>> {
        v.as_array().and_then(|a| {
            a.iter()
                .map(|x| x.as_u64().and_then(|x| u32::try_from(x).ok()))
                .collect()
        })
    };
    for (k, ((curve, perm), s)) in twists.iter().zip(stated).enumerate() {
        if s["name"].as_str() != Some(&curve.to_string())
            || numbers(&s["images"]).as_ref() != Some(perm)
        {
            return Err(format!(
                "the twist {curve} differs from the stated permutation"
            ));
        }
        let phases = space.phases().map(|p| &p[k]);
        if numbers(&s["phases"]).as_ref() != phases {
            return Err(format!(
                "the phases of the twist {curve} differ from the stated ones"
            ));
        }
    }
    Ok(format!(
        "{} twists rebuilt on |X_g| = {} states equal the stated permutations{}",
        twists.len(),
        space.dimension(),
        if space.is_twisted() {
            " and phases"
        } else {
            ""
        }
    ))
}

/// The group the permutations generate, listed; `None` past `cap` elements.
fn listed(perms: &[Vec<u32>], cap: u64) -> Option<Vec<Vec<u32>>> {
    let degree = perms.first().map_or(0, Vec::len);
    let identity: Vec<u32> = (0..degree as u32).collect();
    let mut seen: HashSet<Vec<u32>> = HashSet::new();
    seen.insert(identity.clone());
    let mut stack = vec![identity];
    while let Some(x) = stack.pop() {
        for p in perms {
            let y: Vec<u32> = x.iter().map(|&i| p[i as usize]).collect();
            if seen.insert(y.clone()) {
                if seen.len() as u64 > cap {
                    return None;
                }
                stack.push(y);
            }
        }
    }
    Some(seen.into_iter().collect())
}

/// The basic orbit lengths of `base` read off the listed group: |Δ_i| is the number of
/// images of b_i under the elements fixing b_0, …, b_{i−1}; after the last base point only
/// the identity may remain.
fn basic_orbits(elements: &[Vec<u32>], base: &[u32]) -> Result<Vec<u64>, String> {
    let mut remaining: Vec<&Vec<u32>> = elements.iter().collect();
    let mut lengths = Vec::with_capacity(base.len());
    for &b in base {
        let point = b as usize;
        if remaining.first().map_or(true, |g| point >= g.len()) {
            return Err(format!("base point {b} out of range"));
        }
        let images: HashSet<u32> = remaining.iter().map(|g| g[point]).collect();
        lengths.push(images.len() as u64);
        remaining.retain(|g| g[point] == b);
    }
    if remaining.len() != 1 {
        return Err(format!(
            "{} elements fix every base point: it is not a base",
            remaining.len()
        ));
    }
    Ok(lengths)
}

/// Every claim of a `dw-…` certificate.
pub fn check(
    envelope: &Envelope,
    body: &Value,
    file: &str,
    claims: &mut Claims,
) -> Result<(), Stop> {
    let a = &envelope.space;
    let space = DwSpace::new(&a.spec, a.genus, &a.set)
        .map_err(|e| Stop::Invalid(format!("{file}: rebuilding the input: {e}")))?;
    claims.claim("generators", || {
        if body["theory"].as_str() != Some(a.spec.as_str()) {
            return Err(format!(
                "the certificate's theory {} is not the spec {:?}",
                body["theory"], a.spec
            ));
        }
        if (body["kind"] == "dw-permutation-image" || body["kind"] == "dw-monomial-image")
            && body["degree"].as_u64() != Some(space.dimension() as u64)
        {
            return Err(format!(
                "degree {} stated, |X_g| = {}",
                body["degree"],
                space.dimension()
            ));
        }
        same_generators(&space, body)
    })?;
    let perms: Vec<Vec<u32>> = space.twists().iter().map(|(_, p)| p.clone()).collect();
    match envelope.kind.as_str() {
        "dw-permutation-image" => {
            let order = body["order"].as_str().unwrap_or_default().to_string();
            claims.claim("chain-arithmetic", || {
                let lengths: Vec<u64> = body["basic_orbit_lengths"]
                    .as_array()
                    .and_then(|l| l.iter().map(Value::as_u64).collect())
                    .ok_or("key `basic_orbit_lengths`: expected a list of numbers")?;
                let product: BigUint = lengths.iter().map(|&l| BigUint::from(l)).product();
                if product.to_string() != order {
                    return Err(format!("Π basic orbit lengths = {product}, the order is stated {order:?}"));
                }
                Ok(format!("|G| = Π {lengths:?} = {order}"))
            })?;
            claims.claim("order", || {
                let stated: u64 = order.parse().unwrap_or(u64::MAX);
                let base: Vec<u32> = body["base"]
                    .as_array()
                    .and_then(|l| l.iter().map(|x| x.as_u64().and_then(|x| u32::try_from(x).ok())).collect())
                    .ok_or("key `base`: expected a list of points")?;
                match listed(&perms, MAX_LISTED.min(stated)) {
                    Some(elements) if elements.len().to_string() == order => {
                        let lengths = basic_orbits(&elements, &base)?;
                        if Some(&lengths) != body["basic_orbit_lengths"].as_array().map(|l| l.iter().filter_map(Value::as_u64).collect::<Vec<_>>()).as_ref() {
                            return Err(format!("the base {base:?} has basic orbits {lengths:?} in the listed group"));
                        }
                        Ok(format!("{order} permutations listed by closure; the base {base:?} has basic orbits {lengths:?} among them"))
                    }
                    Some(elements) => Err(format!("the twists generate {} permutations, not {order}", elements.len())),
                    None if stated <= MAX_LISTED => Err(format!("the twists generate more than {order} permutations")),
                    None => {
                        let chain = StabiliserChain::new(space.dimension(), &perms).map_err(err)?;
                        if chain.order().to_string() != order || chain.base() != base {
                            return Err(format!("Schreier–Sims gives order {} on base {:?}", chain.order(), chain.base()));
                        }
                        Ok(format!("more than {MAX_LISTED} elements: Schreier–Sims with every point a base point, the producer's method, not an independent check"))
                    }
                }
            })
        }
        "dw-orbitals" | "dw-monomial-commutant" => claims.claim("commutant-dimension", || {
            let n = commutant_dimension(&perms, space.phases(), space.conductor(), space.dimension());
            if body["commutant_dimension"].as_u64() != Some(n as u64) {
                return Err(format!("{n} orbits on pairs of states carry an invariant, the certificate says {}", body["commutant_dimension"]));
            }
            Ok(if space.is_twisted() {
                format!("{n} orbits on pairs of states without a phase round a cycle (a union–find with phases, written for the check; the producer used the commutant certificate): the commutant of the monomial representation has this dimension")
            } else {
                format!("{n} orbits on pairs of states (union–find here): the commutant of a permutation representation has this dimension")
            })
        }),
        "dw-monomial-image" => {
            let order = body["order"].as_str().unwrap_or_default().to_string();
            claims.claim("order", || {
                let phases = space.phases().ok_or("the theory is not twisted")?;
                let stated: u64 = order.parse().unwrap_or(u64::MAX);
                match projective_order(&perms, phases, space.conductor(), MAX_LISTED.min(stated)) {
                    Some(n) if n.to_string() == order => Ok(format!("{order} monomial matrices modulo scalars listed by closure (code of the check; the producer used the monomial Schreier–Sims)")),
                    Some(n) => Err(format!("the twists generate {n} monomial matrices modulo scalars, not {order}")),
                    None if stated <= MAX_LISTED => Err(format!("the twists generate more than {order} monomial matrices modulo scalars")),
                    None => {
                        // |P| of the permutation parts divides the order (P is a quotient of the image)
                        let p = StabiliserChain::new(space.dimension(), &perms).map_err(err)?.order();
                        let image = space.image()?;
                        if image.order.to_string() != order || &image.order % &p != BigUint::default() {
                            return Err(format!("the monomial Schreier–Sims gives {}, the permutation parts {p}; stated {order}", image.order));
                        }
                        Ok(format!("more than {MAX_LISTED} elements: the monomial Schreier–Sims again (the producer's method, not an independent check); the permutation parts alone generate {p} (Schreier–Sims), which divides it"))
                    }
                }
            })
        }
        "dw-vacuum-set-stabiliser" => {
            let c: SetStabiliser = body_as(body, file, "dw-vacuum-set-stabiliser")?;
            dw_count::check(&space, &c, file, claims)
        }
        other => Err(Stop::Invalid(format!("{file}: key `kind`: unknown kind {other:?}"))),
    }
}
