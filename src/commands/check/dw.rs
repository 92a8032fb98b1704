//! Re-checking the certificates of Dijkgraaf–Witten theories (docs/certificates.md §6): X_g
//! and the twists are rebuilt from the group and compared with the stated permutations; the
//! image order is the product of the stated basic orbit lengths and is found again by
//! listing the permutation group (up to `MAX_LISTED` elements; beyond, by Schreier–Sims with
//! every point a base point, the producer's method); the commutant dimension is the number
//! of orbits on pairs of states, counted here by a union–find of its own.

use std::collections::HashSet;

use cyclorb_cert::StabiliserChain;
use num_bigint::BigUint;
use serde_json::Value;

use super::{Claims, Envelope, Stop};
use cyclorb_pipeline::dw_space::DwSpace;

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
    for ((curve, perm), s) in twists.iter().zip(stated) {
        let images: Option<Vec<u32>> = s["images"].as_array().and_then(|a| {
            a.iter()
                .map(|x| x.as_u64().and_then(|x| u32::try_from(x).ok()))
                .collect()
        });
        if s["name"].as_str() != Some(&curve.to_string()) || images.as_ref() != Some(perm) {
            return Err(format!(
                "the twist {curve} differs from the stated permutation"
            ));
        }
    }
    Ok(format!(
        "{} twists rebuilt on |X_g| = {} states equal the stated permutations",
        twists.len(),
        space.dimension()
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

/// The number of orbits of the group on pairs (i, j), by union–find.
fn orbital_count(perms: &[Vec<u32>], d: usize) -> usize {
    let mut parent: Vec<usize> = (0..d * d).collect();
    fn root(parent: &mut [usize], mut x: usize) -> usize {
        while parent[x] != x {
            parent[x] = parent[parent[x]];
            x = parent[x];
        }
        x
    }
    let mut classes = d * d;
    for p in perms {
        for i in 0..d {
            for j in 0..d {
                let (a, b) = (
                    root(&mut parent, i * d + j),
                    root(&mut parent, p[i] as usize * d + p[j] as usize),
                );
                if a != b {
                    parent[b] = a;
                    classes -= 1;
                }
            }
        }
    }
    classes
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
        if body["kind"] == "dw-permutation-image"
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
        "dw-orbitals" => claims.claim("commutant-dimension", || {
            let n = orbital_count(&perms, space.dimension());
            if body["commutant_dimension"].as_u64() != Some(n as u64) {
                return Err(format!("{n} orbits on pairs of states, the certificate says {}", body["commutant_dimension"]));
            }
            Ok(format!("{n} orbits on pairs of states (union–find here): the commutant of a permutation representation has this dimension"))
        }),
        other => Err(Stop::Invalid(format!("{file}: key `kind`: unknown kind {other:?}"))),
    }
}
