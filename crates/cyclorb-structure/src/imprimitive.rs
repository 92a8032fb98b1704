//! The structural route for imprimitive representations: the vacuum's components in the
//! sectors of commuting twist powers, the monomial action on the orbit of their lines, and
//! the counted orbit and image order (docs/orbits.md §5).
//!
//! Steps:
//! 1. For k a proper divisor of the twist order (increasing) whose k-th powers X_c of the
//!    Lickorish twists commute ([`crate::power`]), split v₀ into its joint eigencomponents
//!    v_σ = P_σ v₀ ([`crate::components`]); Σ_σ v_σ = v₀.
//! 2. The orbit L of the lines ⟨v_σ⟩ under the generators, with tree representatives
//!    ([`crate::lineorbit`]): every generator is monomial on L with root-of-unity phases,
//!    and L spans V, so M is isomorphic to the monomial group on L. Every line is a joint
//!    eigenvector; the sectors W_σ are spanned by their lines and permuted by the generators
//!    ([`crate::sectors`]).
//! 3. Schreier–Sims on the monomial group of degree |L| with the base starting at the
//!    vacuum's component lines and the diagonal kernel held per sector
//!    ([`MonomialChain`]): |M| = |P_L|·|K| and |image| = |M| / |M ∩ scalars|.
//! 4. The orbit of ⟨v₀⟩ = Σ_σ v_σ: its stabiliser lies in the setwise stabiliser H of the
//!    support S₀ (the component lines), found by a search over base images
//!    ([`crate::setstab`]); |orbit| = |M : H| × |H-orbit of ⟨v₀⟩|, the second factor counted
//!    as phase patterns on S₀ ([`crate::orbit`]'s pattern count). |M : H| is reported as
//!    sector supports (the orbit of the set of sectors under the block permutations) times
//!    the component-line tuples per sector support.
//! 5. The commutant and B sector by sector ([`crate::sectorsum`]).

use std::time::Instant;

use cyclorb_cert::permutation_group_summary;
use cyclorb_field::CyclotomicField;
use cyclorb_mcg::{BlockSpace, GeneratingSet};
use hashbrown::HashSet;
use num_bigint::BigUint;
use num_traits::Zero;
use serde::{Deserialize, Serialize};

use crate::analyse::kernel_certificate;
use crate::chain::MonomialChain;
use crate::components::{components, Signature};
use crate::error::{require, StructureError};
use crate::lineorbit::{first_outside, line_orbit, spans, LineOrbit};
use crate::monomial::Monomial;
use crate::orbit::count_patterns;
use crate::power::{candidate_powers, power_candidate, twist_order, PowerCandidate};
use crate::report::KernelCertificate;
use crate::search::{generators_of, Generators};
use crate::sectors::{sectors, Sectors};
use crate::sectorsum::{sector_orbits, vacuum_column, SectorOrbit};
use crate::sparse::SparseVec;
use cyclorb_field::RootsOfUnity;

/// Choices of the imprimitive route.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct ImprimitiveOptions {
    /// The Dehn twists used as generators.
    pub generating_set: GeneratingSet,
    /// The most component lines searched before the route gives up.
    pub line_limit: usize,
    /// The most permutations of the support searched by the set-stabiliser search.
    pub stabiliser_limit: usize,
    /// Primes tried by the sector commutant bound before an exact solve.
    pub commutant_primes: usize,
}

impl Default for ImprimitiveOptions {
    fn default() -> Self {
        ImprimitiveOptions {
            generating_set: GeneratingSet::Humphries,
            line_limit: 20_000,
            stabiliser_limit: 1_000_000,
            commutant_primes: 2,
        }
    }
}

/// The certificate of the imprimitive route: what [`crate::recheck_imprimitive`] re-derives.
#[derive(Clone, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct ImprimitiveCertificate {
    /// The theory's name.
    pub theory: String,
    /// The genus.
    pub genus: usize,
    /// "humphries" or "lickorish".
    pub generating_set: String,
    /// The generator names.
    pub generators: Vec<String>,
    /// n.
    pub conductor: u32,
    /// m = lcm(2, n): phases are exponents of ζ_m.
    pub phase_modulus: u32,
    /// The power k of the Lickorish twists whose joint eigenspaces are the sectors.
    pub power: u32,
    /// The starting lines (comb coordinates, exact): first the vacuum's components v_σ,
    /// then, where the vacuum's lines do not span V, components of coordinate vectors.
    pub components: Vec<Vec<(u32, String)>>,
    /// How many of the starting lines are the vacuum's components.
    pub vacuum_components: usize,
    /// The tree of the other lines: (parent, generator), v = A_generator·v_parent.
    pub tree: Vec<(u32, u32)>,
    /// Every generator on the lines: A v_ℓ = ζ_m^{phases[ℓ]}·v_{perm[ℓ]}.
    pub monomials: Vec<Monomial>,
    /// The sector of every line.
    pub sector_of_line: Vec<u32>,
    /// The joint eigenvalue signature of every sector (indices into the θ_c^k).
    pub sector_signatures: Vec<Signature>,
    /// dim W_σ of every sector.
    pub sector_dimensions: Vec<usize>,
    /// The chain: base, basic orbit lengths, |P_L|.
    pub base: Vec<u32>,
    /// |Δ_0|, |Δ_1|, ….
    pub basic_orbit_lengths: Vec<usize>,
    /// The diagonal part K on the sectors.
    pub kernel: KernelCertificate,
    /// The number of permutations of the support induced by its setwise stabiliser.
    pub support_permutations: usize,
    /// The projective image order (exact decimal).
    pub image_order: String,
    /// |M : H|, the number of supports (sets of component lines).
    pub supports: String,
    /// Phase patterns per support.
    pub patterns_per_support: String,
    /// The orbit size.
    pub orbit_size: String,
    /// The sector orbits with their commutant dimensions and terms of B.
    pub sector_orbits: Vec<SectorOrbit>,
}

/// The answer of the imprimitive route, with its certificate.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct ImprimitiveReport {
    /// The theory's name.
    pub theory: String,
    /// The genus g.
    pub genus: usize,
    /// dim V_g.
    pub dimension: usize,
    /// The conductor n.
    pub conductor: u32,
    /// The generator names.
    pub generators: Vec<String>,
    /// "humphries" or "lickorish".
    pub generating_set: String,
    /// The power k.
    pub power: u32,
    /// The number of lines in the orbit of the vacuum line (exact decimal).
    pub orbit_size: String,
    /// The order of the projective image (exact decimal).
    pub image_order: String,
    /// The number of sectors.
    pub sectors: usize,
    /// (dim W_σ, number of sectors of that dimension), increasing.
    pub sector_dimensions: Vec<(usize, usize)>,
    /// The number of component lines (the degree of the monomial action).
    pub component_lines: usize,
    /// The order of the block permutation group (on the sectors).
    pub block_permutation_order: String,
    /// |image| / |block permutations|: the elements fixing every sector, modulo scalars.
    pub block_kernel_order: String,
    /// |P_L|, the permutation group on the component lines.
    pub line_permutation_order: String,
    /// |K|, the elements scalar on every component line (phases per sector).
    pub kernel_order: String,
    /// |K ∩ scalars|.
    pub kernel_scalars: u32,
    /// The vacuum's sectors.
    pub support_sectors: usize,
    /// The orbit of the vacuum's set of sectors under the block permutations.
    pub sector_supports: String,
    /// Component-line tuples per sector support.
    pub line_tuples_per_sector_support: String,
    /// Phase patterns per tuple (relative phases of the components).
    pub patterns_per_support: String,
    /// dim End_M(V) = Σ over sector orbits of the sector commutants.
    pub commutant_dimension: usize,
    /// The sector orbits: commutants and terms of B = Σ_O β_O·Π_O.
    pub sector_orbits: Vec<SectorOrbit>,
    /// B's vacuum column B_{j,vac} (comb index, exact), when B is decided.
    pub vacuum_column: Vec<(u32, String)>,
    /// Wall-clock time of the analysis.
    pub elapsed_seconds: f64,
    /// The certificate.
    pub certificate: ImprimitiveCertificate,
}

/// Everything derived from the line orbit and its sectors.
pub(crate) struct Counted {
    pub(crate) chain: MonomialChain,
    pub(crate) support_permutations: usize,
    pub(crate) supports: BigUint,
    pub(crate) patterns: BigUint,
    pub(crate) orbit_size: BigUint,
    pub(crate) image_order: BigUint,
}

/// Π of the basic orbit lengths of the levels in `range`.
fn orbit_product(chain: &MonomialChain, range: std::ops::Range<usize>) -> BigUint {
    chain.basic_orbit_lengths()[range]
        .iter()
        .map(|&x| BigUint::from(x))
        .product()
}

/// Steps 3 and 4: the chain, the set stabiliser of the support, the patterns.
pub(crate) fn count(
    m: u32,
    lines: &LineOrbit,
    sectors: &Sectors,
    stabiliser_limit: usize,
) -> Result<Counted, StructureError> {
    let s = lines.support;
    let degree = lines.vectors.len();
    let base: Vec<u32> = (0..s as u32).collect();
    let chain = MonomialChain::with_classes(
        degree,
        m,
        &lines.monomials,
        &base,
        sectors.class_of.clone(),
        sectors.count(),
    )?;
    let stabiliser = crate::setstab::set_stabiliser(&chain, s, m, stabiliser_limit)?;
    let mut local = stabiliser.elements.clone();
    // the pointwise stabiliser of S₀ is K times the products of transversal elements of
    // the levels ≥ s, each a product of strong generators fixing S₀ pointwise
    let fixing = chain
        .strong_generators()
        .iter()
        .filter(|g| g.perm[..s].iter().enumerate().all(|(i, &p)| p == i as u32));
    for g in fixing {
        local.push(Monomial {
            perm: g.perm[..s].to_vec(),
            phases: g.phases[..s].to_vec(),
        });
    }
    for k in chain.kernel().generators() {
        let phases = (0..s).map(|i| k[sectors.class_of[i] as usize]).collect();
        local.push(Monomial::diagonal(phases));
    }
    let patterns = count_patterns(s, m, local);
    let levels = chain.basic_orbit_lengths().len();
    let above = orbit_product(&chain, 0..s.min(levels));
    let found = BigUint::from(stabiliser.elements.len());
    require(!found.is_zero() && (&above % &found).is_zero(), || {
        "the support's stabiliser does not divide the group".into()
    })?;
    let supports = above / found;
    let orbit_size = &supports * &patterns.patterns_per_support;
    let image_order = chain.projective_order();
    require((&image_order % &orbit_size).is_zero(), || {
        format!("the orbit size {orbit_size} does not divide the image order {image_order}")
    })?;
    Ok(Counted {
        support_permutations: stabiliser.elements.len(),
        supports,
        patterns: patterns.patterns_per_support,
        orbit_size,
        image_order,
        chain,
    })
}

/// The orbit of the set of the vacuum's sectors under the block permutations.
pub(crate) fn sector_supports(sectors: &Sectors, starts: usize) -> usize {
    let mut first: Vec<u32> = sectors.class_of[..starts].to_vec();
    first.sort_unstable();
    let mut seen: HashSet<Vec<u32>> = HashSet::new();
    seen.insert(first.clone());
    let mut queue = vec![first];
    while let Some(set) = queue.pop() {
        for perm in &sectors.permutations {
            let mut image: Vec<u32> = set.iter().map(|&x| perm[x as usize]).collect();
            image.sort_unstable();
            if seen.insert(image.clone()) {
                queue.push(image);
            }
        }
    }
    seen.len()
}

/// The line orbit and sectors for one candidate power, or why not.
fn try_power(
    field: &CyclotomicField,
    roots: &RootsOfUnity,
    space: &BlockSpace,
    generators: &Generators,
    candidate: &PowerCandidate,
    limit: usize,
) -> Result<(LineOrbit, Sectors), StructureError> {
    let dim = space.dimension();
    let vacuum = SparseVec::unit(field, space.basis().vacuum());
    let mut starts: Vec<SparseVec> = components(field, candidate, &vacuum)?
        .into_iter()
        .map(|(_, v)| v)
        .collect();
    let support = starts.len();
    loop {
        let lines = line_orbit(
            field,
            roots,
            &generators.maps,
            starts.clone(),
            support,
            limit,
        )?;
        if spans(field, &lines.vectors, dim)? {
            let sectors = sectors(field, candidate, &lines, dim)?;
            return Ok((lines, sectors));
        }
        // the vacuum's lines leave a proper invariant subspace: add the components of a
        // coordinate vector outside their span, whose lines are new
        let absent = || {
            StructureError::Absent("the component lines are not proved to span the space".into())
        };
        let missing = first_outside(field, &lines.vectors, dim)?.ok_or_else(absent)?;
        let known = lines
            .vectors
            .iter()
            .map(|v| v.normalised(field))
            .collect::<Result<HashSet<_>, _>>()?;
        let before = starts.len();
        for (_, v) in components(field, candidate, &SparseVec::unit(field, missing))? {
            if !known.contains(&v.normalised(field)?) {
                starts.push(v);
            }
        }
        if starts.len() == before {
            return Err(absent());
        }
    }
}

fn sparse_text(v: &SparseVec) -> Vec<(u32, String)> {
    v.0.iter().map(|(i, x)| (*i, x.to_string())).collect()
}

/// The twist powers of the Lickorish set for the power k, or why not a candidate.
pub(crate) fn lickorish_candidate(
    space: &BlockSpace,
    k: u32,
) -> Result<Result<PowerCandidate, String>, StructureError> {
    let theory = space.theory();
    let twists = generators_of(space, GeneratingSet::Lickorish)?;
    power_candidate(theory.field(), theory, &twists.maps, &twists.names, k)
}

/// The imprimitive route on a block space (see the module documentation). A theory whose
/// vacuum components do not give a finite spanning monomial action within the limits is
/// [`StructureError::Absent`], with the reason for every power tried.
pub fn analyse_imprimitive(
    space: &BlockSpace,
    options: &ImprimitiveOptions,
) -> Result<ImprimitiveReport, StructureError> {
    let start = Instant::now();
    let theory = space.theory();
    let field = theory.field();
    let roots = RootsOfUnity::new(field)?;
    let m = roots.modulus();
    let generators = generators_of(space, options.generating_set)?;
    let order = twist_order(theory, &roots)?;
    let mut reasons = Vec::new();
    let mut found = None;
    for k in candidate_powers(order) {
        let candidate = match lickorish_candidate(space, k)? {
            Ok(c) => c,
            Err(reason) => {
                reasons.push(reason);
                continue;
            }
        };
        match try_power(
            field,
            &roots,
            space,
            &generators,
            &candidate,
            options.line_limit,
        ) {
            Ok(x) => {
                found = Some((k, x));
                break;
            }
            Err(StructureError::Absent(reason)) => reasons.push(format!("k = {k}: {reason}")),
            Err(e) => return Err(e),
        }
    }
    let Some((power, (lines, sectors))) = found else {
        if reasons.is_empty() {
            reasons.push(format!(
                "the twists have order {order}, with no proper divisor k > 1"
            ));
        }
        return Err(StructureError::Absent(reasons.join("; ")));
    };
    let counted = count(m, &lines, &sectors, options.stabiliser_limit)?;
    let vacuum = space.basis().vacuum();
    let orbits = sector_orbits(
        space,
        &roots,
        &lines,
        &sectors,
        &counted.orbit_size,
        options.commutant_primes,
    )?;
    let column = vacuum_column(field, space.form(), vacuum, &lines, &sectors, &orbits)?;
    let blocks = permutation_group_summary(sectors.count(), &sectors.permutations)?;
    let block_order: BigUint = blocks
        .order
        .parse()
        .map_err(|_| StructureError::Rejected("a block permutation order".into()))?;
    let sector_supports = BigUint::from(sector_supports(&sectors, lines.support));
    require(
        (&counted.supports % &sector_supports).is_zero()
            && (&counted.image_order % &block_order).is_zero(),
        || "the supports or the image do not factor over the sectors".into(),
    )?;
    let mut dims: Vec<(usize, usize)> = Vec::new();
    for &d in &sectors.dimensions {
        match dims.iter_mut().find(|(x, _)| *x == d) {
            Some((_, c)) => *c += 1,
            None => dims.push((d, 1)),
        }
    }
    dims.sort_unstable();
    let kernel = counted.chain.kernel();
    let certificate = ImprimitiveCertificate {
        theory: theory.name().to_string(),
        genus: space.genus(),
        generating_set: options.generating_set.name().to_string(),
        generators: generators.names.clone(),
        conductor: field.conductor(),
        phase_modulus: m,
        power,
        components: lines.vectors[..lines.starts]
            .iter()
            .map(sparse_text)
            .collect(),
        vacuum_components: lines.support,
        tree: lines.tree.clone(),
        monomials: lines.monomials.clone(),
        sector_of_line: sectors.class_of.clone(),
        sector_signatures: sectors.signatures.clone(),
        sector_dimensions: sectors.dimensions.clone(),
        base: counted.chain.base(),
        basic_orbit_lengths: counted.chain.basic_orbit_lengths(),
        kernel: kernel_certificate(kernel),
        support_permutations: counted.support_permutations,
        image_order: counted.image_order.to_string(),
        supports: counted.supports.to_string(),
        patterns_per_support: counted.patterns.to_string(),
        orbit_size: counted.orbit_size.to_string(),
        sector_orbits: orbits.clone(),
    };
    Ok(ImprimitiveReport {
        theory: theory.name().to_string(),
        genus: space.genus(),
        dimension: space.dimension(),
        conductor: field.conductor(),
        generators: generators.names,
        generating_set: options.generating_set.name().to_string(),
        power,
        orbit_size: counted.orbit_size.to_string(),
        image_order: counted.image_order.to_string(),
        sectors: sectors.count(),
        sector_dimensions: dims,
        component_lines: lines.vectors.len(),
        block_permutation_order: block_order.to_string(),
        block_kernel_order: (&counted.image_order / &block_order).to_string(),
        line_permutation_order: counted.chain.permutation_order().to_string(),
        kernel_order: kernel.order().to_string(),
        kernel_scalars: kernel.scalar_order(),
        support_sectors: lines.support,
        line_tuples_per_sector_support: (&counted.supports / &sector_supports).to_string(),
        sector_supports: sector_supports.to_string(),
        patterns_per_support: counted.patterns.to_string(),
        commutant_dimension: orbits.iter().map(|o| o.commutant_dimension).sum(),
        sector_orbits: orbits,
        vacuum_column: column,
        elapsed_seconds: start.elapsed().as_secs_f64(),
        certificate,
    })
}
