//! Re-checking a counted vacuum orbit of a Dijkgraaf–Witten theory
//! (`dw-vacuum-set-stabiliser`, docs/certificates.md §6, docs/dijkgraaf-witten.md "Counting
//! the vacuum orbit"). The producer lists Ω (the orbits of the parts of S) breadth first,
//! builds one Schreier–Sims chain on X_g ⊔ Ω with the parts first in the base, and counts the
//! arrangements c by a search over the transversals of the first levels. Here:
//! - Ω is listed again depth first (code of its own), orbit by orbit in the order of the
//!   parts;
//! - a second chain is built on another base, the parts in reverse order and then the states
//!   in reverse order: |P| and the order |P_(Σ)| of the pointwise stabiliser of the parts
//!   (which does not depend on the order of the base) must come out again;
//! - c is counted on that chain the other way round: for every tuple of target parts, level
//!   by level, the target is pulled back through the transversal elements chosen so far
//!   and must lie in the basic orbit (a sift of the targets, not a search over the orbit);
//! - the arithmetic |Stab| = c·|P_(Σ)| and |orbit| = |P| / |Stab| is redone, and an orbit
//!   of at most `MAX_LISTED_ORBIT` subsets is listed (cyclorb-dw's `subset_orbit`, no group
//!   theory) and must have the stated size.
//!
//! The parts themselves come from cyclorb-dw's abelianisation (the producer's derivation;
//! the claim says so).

use std::collections::HashMap;

use cyclorb_cert::StabiliserChain;
use cyclorb_dw::{subset_orbit, AbelianFibres};
use num_bigint::BigUint;
use serde::Deserialize;

use super::{Claims, Stop};
use crate::dw_space::DwSpace;

/// Largest orbit listed as subsets to confirm the count.
const MAX_LISTED_ORBIT: usize = 200_000;
/// Most nodes of the arrangement sift.
const MAX_NODES: u64 = 10_000_000;

/// A listed orbit of parts, as stated.
#[derive(Deserialize)]
pub struct StatedOrbit {
    part_size: usize,
    orbit_size: usize,
    parts_inside: usize,
}

/// The claims of the certificate (the keys `orbit --method structure --out` writes).
#[derive(Deserialize)]
pub struct SetStabiliser {
    vacuum_states: usize,
    abelianisation_order: usize,
    parts: usize,
    part_orbits: Vec<StatedOrbit>,
    degree: usize,
    image_order: String,
    basic_orbit_lengths: Vec<u64>,
    pointwise_stabiliser_order: String,
    arrangements: u64,
    stabiliser_order: String,
    orbit_size: String,
}

/// Ω listed depth first: the subsets, the generators' action on them, and per orbit
/// (part size, size, parts inside); `Err` past `cap` subsets.
struct Omega {
    action: Vec<Vec<u32>>,
    orbits: Vec<(usize, usize, usize)>,
    parts: Vec<u32>,
}

fn list_omega(parts: &[Vec<u32>], perms: &[Vec<u32>], cap: usize) -> Result<Omega, String> {
    let mut subsets: Vec<Vec<u32>> = Vec::new();
    let mut index: HashMap<Vec<u32>, u32> = HashMap::new();
    let mut orbit_of: Vec<usize> = Vec::new();
    let mut omega = Omega {
        action: Vec::new(),
        orbits: Vec::new(),
        parts: Vec::new(),
    };
    for part in parts {
        if let Some(&i) = index.get(part) {
            omega.parts.push(i);
            omega.orbits[orbit_of[i as usize]].2 += 1;
            continue;
        }
        let o = omega.orbits.len();
        let first = subsets.len();
        index.insert(part.clone(), first as u32);
        subsets.push(part.clone());
        orbit_of.push(o);
        omega.parts.push(first as u32);
        let mut stack = vec![part.clone()];
        while let Some(s) = stack.pop() {
            for p in perms {
                let mut image: Vec<u32> = s.iter().map(|&x| p[x as usize]).collect();
                image.sort_unstable();
                if !index.contains_key(&image) {
                    if subsets.len() >= cap {
                        return Err(format!("Ω has more than the stated {cap} subsets"));
                    }
                    index.insert(image.clone(), subsets.len() as u32);
                    subsets.push(image.clone());
                    orbit_of.push(o);
                    stack.push(image);
                }
            }
        }
        omega.orbits.push((part.len(), subsets.len() - first, 1));
    }
    omega.action = perms
        .iter()
        .map(|p| {
            subsets
                .iter()
                .map(|s| {
                    let mut image: Vec<u32> = s.iter().map(|&x| p[x as usize]).collect();
                    image.sort_unstable();
                    index[&image]
                })
                .collect()
        })
        .collect();
    Ok(omega)
}

fn big(text: &str, key: &str) -> Result<BigUint, String> {
    text.parse()
        .map_err(|_| format!("key `{key}`: {text:?} is not a non-negative integer"))
}

/// The arrangements on `chain` (its first `k` base points are the parts): tuples of targets
/// in Σ reachable by one element of P, counted by pulling each target back through the
/// transversal elements chosen for the earlier levels.
struct Arrangements<'a> {
    chain: &'a StabiliserChain,
    sigma: &'a [u32],
    in_orbit: Vec<Vec<bool>>,
    nodes: u64,
    found: u64,
}

impl Arrangements<'_> {
    /// `v` = (u⁽ʲ⁻¹⁾⋯u⁽⁰⁾)⁻¹ as an image list; false when the node budget runs out.
    fn level(&mut self, j: usize, v: &[u32]) -> bool {
        if j == self.in_orbit.len() {
            self.found += 1;
            return true;
        }
        for &t in self.sigma {
            let gamma = v[t as usize];
            if !self.in_orbit[j][gamma as usize] {
                continue;
            }
            self.nodes += 1;
            if self.nodes > MAX_NODES {
                return false;
            }
            let u = self
                .chain
                .transversal(j, gamma)
                .expect("γ lies in the basic orbit");
            let mut inverse = vec![0u32; u.len()];
            for (x, &y) in u.iter().enumerate() {
                inverse[y as usize] = x as u32;
            }
            // v first, then u⁻¹
            let next: Vec<u32> = v.iter().map(|&y| inverse[y as usize]).collect();
            if !self.level(j + 1, &next) {
                return false;
            }
        }
        true
    }
}

/// Every claim after `generators`.
pub fn check(
    space: &DwSpace,
    c: &SetStabiliser,
    file: &str,
    claims: &mut Claims,
) -> Result<(), Stop> {
    let number =
        |text: &str, key: &str| big(text, key).map_err(|e| Stop::Invalid(format!("{file}: {e}")));
    let order = number(&c.image_order, "image_order")?;
    let pointwise = number(&c.pointwise_stabiliser_order, "pointwise_stabiliser_order")?;
    let stabiliser = number(&c.stabiliser_order, "stabiliser_order")?;
    let orbit = number(&c.orbit_size, "orbit_size")?;
    let perms: Vec<Vec<u32>> = space.twists().iter().map(|(_, p)| p.clone()).collect();
    let bundles = space.bundles();
    let d = bundles.len();
    let vacuum = bundles.vacuum();
    let fibres = AbelianFibres::new(bundles.group());
    let parts = fibres.parts(bundles, &vacuum);
    claims.claim("parts", || {
        let total: usize = parts.iter().map(Vec::len).sum();
        let found = (vacuum.len(), fibres.abelian_order(), parts.len());
        if found != (c.vacuum_states, c.abelianisation_order, c.parts) || total != vacuum.len() {
            return Err(format!(
                "|S| = {}, |G^ab| = {}, {} parts of {total} states; the certificate says {}, {}, {}",
                found.0, found.1, found.2, c.vacuum_states, c.abelianisation_order, c.parts
            ));
        }
        Ok(format!(
            "S = {} states in {} parts over G^ab of order {} (the parts by cyclorb-dw's abelianisation, the producer's derivation; their sizes add up to |S|)",
            found.0, found.2, found.1
        ))
    })?;
    let cap = c.degree.saturating_sub(d);
    let mut omega = None;
    claims.claim("part-orbits", || {
        let o = list_omega(&parts, &perms, cap)?;
        let stated: Vec<(usize, usize, usize)> = c
            .part_orbits
            .iter()
            .map(|s| (s.part_size, s.orbit_size, s.parts_inside))
            .collect();
        let size: usize = o.orbits.iter().map(|x| x.1).sum();
        if o.orbits != stated || d + size != c.degree {
            return Err(format!(
                "Ω listed depth first: orbits (part size, size, parts inside) {:?} and degree {}; the certificate says {stated:?} and {}",
                o.orbits,
                d + size,
                c.degree
            ));
        }
        omega = Some(o);
        Ok(format!(
            "Ω listed again depth first: {size} subsets in {} orbits of parts {:?} (part size, size, parts inside); degree |X_g| + |Ω| = {}",
            stated.len(),
            stated,
            c.degree
        ))
    })?;
    let omega = omega.expect("listed by the claim above");
    let k = c.parts;
    claims.claim("chain-arithmetic", || {
        let lengths: Vec<BigUint> = c.basic_orbit_lengths.iter().map(|&l| BigUint::from(l)).collect();
        let product: BigUint = lengths.iter().product();
        let tail: BigUint = lengths.iter().skip(k).product();
        if product != order || tail != pointwise || lengths.len() < k {
            return Err(format!(
                "Π basic orbit lengths = {product}, Π after the {k} parts = {tail}; stated |P| = {order}, |P_(Σ)| = {pointwise}"
            ));
        }
        if &pointwise * BigUint::from(c.arrangements) != stabiliser || &stabiliser * &orbit != order {
            return Err(format!(
                "c·|P_(Σ)| = {} and |Stab|·|orbit| = {}, stated |Stab| = {stabiliser} and |P| = {order}",
                &pointwise * BigUint::from(c.arrangements),
                &stabiliser * &orbit
            ));
        }
        Ok(format!(
            "|P| = Π of {} basic orbit lengths, |Stab_P(S)| = c·|P_(Σ)| = {} × {pointwise}, |P| = |Stab_P(S)|·|orbit| (orbit–stabiliser)",
            lengths.len(),
            c.arrangements
        ))
    })?;
    let extended: Vec<Vec<u32>> = perms
        .iter()
        .zip(&omega.action)
        .map(|(p, a)| {
            p.iter()
                .copied()
                .chain(a.iter().map(|&j| j + d as u32))
                .collect()
        })
        .collect();
    let sigma: Vec<u32> = omega.parts.iter().map(|&i| i + d as u32).collect();
    let base: Vec<u32> = sigma
        .iter()
        .rev()
        .copied()
        .chain((0..d as u32).rev())
        .collect();
    let degree = d + omega.orbits.iter().map(|o| o.1).sum::<usize>();
    let mut second = None;
    claims.claim("image-order", || {
        let chain = StabiliserChain::with_base(degree, &extended, &base, 1)
            .map_err(|e| format!("the second Schreier–Sims on X_g ⊔ Ω: {e}"))?;
        let tail: BigUint = (k..chain.level_count())
            .map(|j| BigUint::from(chain.basic_orbit(j).len()))
            .product();
        if chain.order() != order || tail != pointwise {
            return Err(format!(
                "Schreier–Sims on the reversed base gives |P| = {} and |P_(Σ)| = {tail}; stated {order} and {pointwise}",
                chain.order()
            ));
        }
        let first: Vec<usize> = (0..k).map(|j| chain.basic_orbit(j).len()).collect();
        second = Some(chain);
        Ok(format!(
            "a second Schreier–Sims on X_g ⊔ Ω with another base (the parts, then the states, in reverse order; basic orbits of the parts {first:?}) gives |P| = {order} and the same |P_(Σ)|"
        ))
    })?;
    let chain = second.expect("built by the claim above");
    claims.claim("stabiliser-order", || {
        let in_orbit: Vec<Vec<bool>> = (0..k)
            .map(|j| {
                let mut on = vec![false; degree];
                chain.basic_orbit(j).into_iter().for_each(|x| on[x as usize] = true);
                on
            })
            .collect();
        let mut search = Arrangements {
            chain: &chain,
            sigma: &sigma,
            in_orbit,
            nodes: 0,
            found: 0,
        };
        if !search.level(0, &(0..degree as u32).collect::<Vec<_>>()) {
            return Err(format!(
                "not re-checked: the sift of target tuples exceeds {MAX_NODES} nodes"
            ));
        }
        if search.found != c.arrangements {
            return Err(format!(
                "{} tuples of parts are reached by P on the second chain, the certificate says {} arrangements",
                search.found, c.arrangements
            ));
        }
        Ok(format!(
            "{} tuples of target parts pass the sift through the second chain ({} nodes): |Stab_P(S)| = {} × |P_(Σ)|",
            search.found, search.nodes, search.found
        ))
    })?;
    claims.claim("orbit-size", || {
        let small = usize::try_from(&orbit).ok().filter(|&n| n <= MAX_LISTED_ORBIT);
        let Some(n) = small else {
            return Ok(format!(
                "|orbit| = |P| / |Stab_P(S)| = {orbit} from the figures re-derived above; more than {MAX_LISTED_ORBIT} subsets, so not listed"
            ));
        };
        let listed = subset_orbit(&vacuum, space.twists(), n + 1).map_err(|e| e.to_string())?;
        if listed.len() != n {
            return Err(format!(
                "the orbit of S listed as subsets has {} elements, the certificate says {n}",
                listed.len()
            ));
        }
        Ok(format!(
            "the orbit of S listed as subsets (no group theory) has {n} elements, as counted"
        ))
    })
}
