//! Re-checking a structure certificate (docs/certificates.md §5).
//!
//! Independent of the producer: the monomial form entry by entry (each Dehn-twist matrix
//! applied to each stated basis vector gives the stated root of unity times the stated image
//! vector), the basis's full rank modulo a prime, the vacuum's expansion, |P| as the product
//! of the stated basic orbit lengths and again by Schreier–Sims with every point a base
//! point, |K| as the product of its invariant factors, |image| = |P|·|K|/|K ∩ scalars|, the
//! number of supports by a plain search over sets of coordinates, and |orbit| = supports ×
//! patterns. The kernel lattice, the phase patterns per support and the commutant proof are
//! re-derived by the producer's own steps (`cyclorb_structure::recheck`), and that claim
//! says so.

use std::collections::HashSet;

use cyclorb_cert::{permutation_group_summary, ProvedGenerators};
use cyclorb_field::{Cyc, PrimeReduction};
use cyclorb_matrix::reduce_vector;
use cyclorb_mcg::BlockSpace;
use cyclorb_structure::{recheck, RootsOfUnity, StructureCertificate};
use num_bigint::BigUint;
use num_traits::Zero;

use super::linear::EchelonModP;
use super::{Claims, Stop};

fn err(e: impl ToString) -> String {
    e.to_string()
}

fn decimal(text: &str, what: &str) -> Result<BigUint, String> {
    text.parse()
        .map_err(|_| format!("{what} {text:?} is not a decimal number"))
}

/// Supports counted by search beyond which the claim defers to the producer's count.
const MAX_SUPPORTS: usize = 1_000_000;

/// A sparse (index, value) list as a dense vector of length d.
fn dense(space: &BlockSpace, entries: &[(u32, String)]) -> Result<Vec<Cyc>, String> {
    let field = space.theory().field();
    let mut v = vec![field.zero(); space.dimension()];
    for (i, text) in entries {
        let slot = v
            .get_mut(*i as usize)
            .ok_or_else(|| format!("index {i} out of range"))?;
        *slot = field.parse(text).map_err(err)?;
    }
    Ok(v)
}

/// The orbit of the set `start` under the permutations, up to `cap` sets.
fn support_orbit(perms: &[Vec<u32>], start: Vec<u32>, cap: usize) -> Option<usize> {
    let mut seen: HashSet<Vec<u32>> = HashSet::new();
    seen.insert(start.clone());
    let mut stack = vec![start];
    while let Some(s) = stack.pop() {
        for p in perms {
            let mut image: Vec<u32> = s.iter().map(|&j| p[j as usize]).collect();
            image.sort_unstable();
            if seen.insert(image.clone()) {
                if seen.len() > cap {
                    return None;
                }
                stack.push(image);
            }
        }
    }
    Some(seen.len())
}

/// Every claim of a structure certificate.
pub fn check(
    space: &BlockSpace,
    gens: &ProvedGenerators,
    c: &StructureCertificate,
    claims: &mut Claims,
) -> Result<(), Stop> {
    let field = space.theory().field();
    let d = space.dimension();
    let roots = RootsOfUnity::new(field).map_err(|e| Stop::Invalid(e.to_string()))?;
    claims.claim("identity", || {
        if c.theory != space.theory().name()
            || c.genus != space.genus()
            || c.conductor != field.conductor()
            || c.phase_modulus != roots.modulus()
            || c.generators != gens.names()
            || c.basis.len() != d
            || c.monomials.len() != gens.len()
        {
            return Err(
                "the certificate is for another theory, genus, field or generator set".into(),
            );
        }
        Ok(format!(
            "{} at genus {}, {d} basis vectors, {} monomial generators",
            c.theory,
            c.genus,
            c.monomials.len()
        ))
    })?;
    let mut basis = Vec::new();
    claims.claim("basis-rank", || {
        basis = c
            .basis
            .iter()
            .map(|e| dense(space, e))
            .collect::<Result<Vec<_>, _>>()?;
        let reduction = PrimeReduction::nth(field, 0).map_err(err)?;
        let mut echelon = EchelonModP::new(reduction.prime());
        for v in &basis {
            echelon.push(reduce_vector(&reduction, v).map_err(err)?);
        }
        if echelon.rank() != d {
            return Err(format!(
                "rank {} modulo {} (a basis needs {d})",
                echelon.rank(),
                reduction.prime()
            ));
        }
        Ok(format!(
            "rank {d} modulo p = {}: the e_j are a basis",
            reduction.prime()
        ))
    })?;
    claims.claim("monomial-form", || {
        for (a, mono) in c.monomials.iter().enumerate() {
            let name = &gens.names()[a];
            if mono.perm.len() != d || mono.phases.len() != d {
                return Err(format!("{name}: the monomial has the wrong size"));
            }
            for j in 0..d {
                let image = gens.dense(a).mul_vec(field, &basis[j]).map_err(err)?;
                let target = basis
                    .get(mono.perm[j] as usize)
                    .ok_or_else(|| format!("{name}: π({j}) out of range"))?;
                let phase = mono.phases[j];
                if phase >= roots.modulus() {
                    return Err(format!("{name}: phase {phase} out of range"));
                }
                let zeta = roots.power(phase);
                for (i, (x, t)) in image.iter().zip(target).enumerate() {
                    if *x != field.mul(zeta, t).map_err(err)? {
                        return Err(format!(
                            "{name}·e_{j} ≠ ζ_{}^{phase}·e_{} (coordinate {i})",
                            roots.modulus(),
                            mono.perm[j]
                        ));
                    }
                }
            }
        }
        Ok(format!(
            "A·e_j = ζ_{}^φ(j)·e_π(j) checked coordinate by coordinate for all {} generators and {d} basis vectors, with the Dehn-twist matrices rebuilt from the theory",
            roots.modulus(),
            gens.len()
        ))
    })?;
    claims.claim("power", || {
        let k = c.power;
        for (a, mono) in c.monomials.iter().enumerate() {
            // π^k fixes j exactly when k is a multiple of the length of j's cycle
            let moved = (0..d).find(|&j| {
                let mut x = mono.perm[j] as usize;
                let mut length = 1;
                while x != j && length <= d {
                    x = mono.perm[x] as usize;
                    length += 1;
                }
                x != j || k as usize % length != 0
            });
            if k == 0 || moved.is_some() {
                return Err(format!(
                    "the {k}-th power of {} is not diagonal in the monomial basis",
                    gens.names()[a]
                ));
            }
        }
        Ok(format!("k = {k}: the k-th power of every generator is diagonal in the monomial basis (π^k = 1)"))
    })?;
    let mut support = Vec::new();
    claims.claim("vacuum-expansion", || {
        let coefficients = dense(space, &c.vacuum)?;
        let mut sum = vec![field.zero(); d];
        for (cj, e) in coefficients.iter().zip(&basis) {
            for (s, x) in sum.iter_mut().zip(e) {
                *s = field.add(s, &field.mul(cj, x).map_err(err)?).map_err(err)?;
            }
        }
        let vacuum = space.basis().vacuum();
        let expected: Vec<Cyc> = (0..d)
            .map(|i| {
                if i == vacuum {
                    field.one()
                } else {
                    field.zero()
                }
            })
            .collect();
        if sum != expected {
            return Err("Σ c_j e_j is not the vacuum basis vector".into());
        }
        support = c.vacuum.iter().map(|(j, _)| *j).collect();
        Ok(format!(
            "Σ c_j e_j = v₀ over the {} stated coefficients",
            c.vacuum.len()
        ))
    })?;
    let perms: Vec<Vec<u32>> = c.monomials.iter().map(|m| m.perm.clone()).collect();
    let p_group = &c.permutation_group;
    claims.claim("permutation-order", || {
        let order = decimal(&p_group.order, "|P|")?;
        let product: BigUint = p_group
            .basic_orbit_lengths
            .iter()
            .map(|&l| BigUint::from(l))
            .product();
        if product != order {
            return Err(format!(
                "Π basic orbit lengths = {product}, |P| is stated {order}"
            ));
        }
        let again = permutation_group_summary(d, &perms).map_err(err)?;
        if again.order != p_group.order {
            return Err(format!(
                "Schreier–Sims with every point a base point gives |P| = {}",
                again.order
            ));
        }
        Ok(format!(
            "|P| = Π {:?} = {order}, and again by Schreier–Sims with every point a base point",
            p_group.basic_orbit_lengths
        ))
    })?;
    claims.claim("image-order", || {
        let k = &c.kernel;
        let k_order = decimal(&k.order, "|K|")?;
        let invariants: BigUint = k.invariants.iter().map(|&m| BigUint::from(m)).product();
        if invariants != k_order {
            return Err(format!(
                "Π invariant factors = {invariants}, |K| is stated {k_order}"
            ));
        }
        let scalars = BigUint::from(k.scalars);
        let whole = decimal(&p_group.order, "|P|")? * &k_order;
        if scalars.is_zero()
            || (&whole % &scalars) != BigUint::zero()
            || whole / &scalars != decimal(&c.image_order, "|image|")?
        {
            return Err(format!("|P|·|K|/|K ∩ scalars| ≠ {}", c.image_order));
        }
        Ok(format!(
            "|image| = {} · {k_order} / {} = {}",
            p_group.order, k.scalars, c.image_order
        ))
    })?;
    claims.claim("orbit-size", || {
        let supports = decimal(&c.supports, "supports")?;
        let searched = support_orbit(&perms, support.clone(), MAX_SUPPORTS);
        let how = match searched {
            Some(n) if BigUint::from(n) == supports => {
                format!("{n} supports found by a search over sets of coordinates")
            }
            Some(n) => {
                return Err(format!(
                    "the vacuum's support has {n} images under P, not {supports}"
                ))
            }
            None => format!(
                "more than {MAX_SUPPORTS} supports: their count is re-derived in the last claim"
            ),
        };
        let size = supports * decimal(&c.patterns_per_support, "patterns per support")?;
        if size != decimal(&c.orbit_size, "orbit size")? {
            return Err(format!(
                "supports × patterns = {size}, not {}",
                c.orbit_size
            ));
        }
        Ok(format!("{how}; |orbit| = supports × patterns = {size}"))
    })?;
    claims.claim("derived-data", || {
        recheck(space, c).map_err(err)?;
        Ok("the kernel lattice, the phase patterns per support and the commutant proof re-derived by the producer's own steps (cyclorb-structure's recheck): not an independent check".into())
    })
}
