//! The structural route end to end: monomial form, image order, counted orbit, prefactor,
//! and the re-check of a certificate.

use std::time::Instant;

use cyclorb_cert::{commutant, permutation_group_summary, CommutantOptions, GeneratorSet};
use cyclorb_field::{Cyc, CyclotomicField, Rational};
use cyclorb_matrix::Operator;
use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_theory::{parse_spec, Theory};
use num_bigint::{BigInt, BigUint};
use num_traits::Zero;

use crate::chain::MonomialChain;
use crate::error::{require, StructureError};
use crate::irreducible::{check_irreducibility, monomial_irreducibility, separating_diagonals};
use crate::lattice::ModLattice;
use crate::monomial::{Monomial, MonomialForm};
use crate::orbit::{count_orbit, OrbitCount};
use crate::power::{candidate_powers, power_candidate, twist_order, PowerCandidate};
use crate::refine::Refinement;
use crate::report::{
    ChainCertificate, CommutantProof, ImageReport, KernelCertificate, OrbitReport,
    StructureCertificate, StructureReport,
};
use crate::roots::RootsOfUnity;
use crate::sparse::{inner, ColumnMap, SparseVec};

/// Choices of the structural route.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct StructureOptions {
    /// The Dehn twists used as generators.
    pub generating_set: GeneratingSet,
    /// Primes tried by the commutant bound before an exact solve.
    pub commutant_primes: usize,
}

impl Default for StructureOptions {
    fn default() -> Self {
        StructureOptions {
            generating_set: GeneratingSet::Humphries,
            commutant_primes: 2,
        }
    }
}

/// The generators of a block space as column maps, with their names.
struct Generators {
    names: Vec<String>,
    maps: Vec<ColumnMap>,
}

fn generators_of(space: &BlockSpace, set: GeneratingSet) -> Result<Generators, StructureError> {
    let field = space.theory().field();
    let mut names = Vec::new();
    let mut maps = Vec::new();
    for (curve, op) in space.generators(set)? {
        names.push(curve.to_string());
        maps.push(ColumnMap::from_operator(field, &op)?);
    }
    Ok(Generators { names, maps })
}

/// The first power k (a proper divisor of the twist order) whose twists' k-th powers
/// refine the space into lines permuted monomially by the generators, with that form.
fn find_monomial_form(
    theory: &Theory,
    roots: &RootsOfUnity,
    space: &BlockSpace,
    generators: &Generators,
) -> Result<(u32, MonomialForm), StructureError> {
    let field = theory.field();
    let order = twist_order(theory, roots)?;
    // every twist of the Lickorish set lies in the group: their powers generate N, and
    // they and their inverses drive the refinement
    let mut twists = Vec::new();
    let mut names = Vec::new();
    let mut refiners = Vec::new();
    for (curve, op) in space.generators(GeneratingSet::Lickorish)? {
        names.push(curve.to_string());
        twists.push(ColumnMap::from_operator(field, &op)?);
        refiners.push(ColumnMap::from_operator(field, &op.inverse(field)?)?);
    }
    refiners.extend(twists.iter().cloned());
    let mut reasons = Vec::new();
    for k in candidate_powers(order) {
        let candidate = match power_candidate(field, theory, &twists, &names, k)? {
            Ok(c) => c,
            Err(reason) => {
                reasons.push(reason);
                continue;
            }
        };
        match lines_of(field, space.form(), &candidate, &refiners)
            .and_then(|lines| MonomialForm::from_lines(field, roots, &generators.maps, lines))
        {
            Ok(form) => return Ok((k, form)),
            Err(StructureError::Absent(reason)) => reasons.push(format!("k = {k}: {reason}")),
            Err(e) => return Err(e),
        }
    }
    if reasons.is_empty() {
        reasons.push(format!(
            "the twists have order {order}, which has no proper divisor k > 1"
        ));
    }
    Err(StructureError::Absent(reasons.join("; ")))
}

/// The joint eigenlines proposed by refinement for one candidate power, or why not.
fn lines_of(
    field: &CyclotomicField,
    form: &[Cyc],
    candidate: &PowerCandidate,
    refiners: &[ColumnMap],
) -> Result<Vec<SparseVec>, StructureError> {
    let mut refinement = Refinement::new(field, form);
    refinement.split_by_eigenspaces(candidate)?;
    refinement.stabilise(refiners)?;
    let dimensions = refinement.dimensions();
    refinement.lines().ok_or_else(|| {
        StructureError::Absent(format!(
            "the normal closure of the k-th powers has {} joint eigenspaces, the largest \
             of dimension {}",
            dimensions.len(),
            dimensions.iter().max().copied().unwrap_or(0)
        ))
    })
}

/// v₀ = e_vac in the monomial basis: c_j = ⟨e_j, e_vac⟩_G / ⟨e_j, e_j⟩_G, then
/// Σ c_j e_j = e_vac checked exactly (the e_j being a basis, the expansion is unique).
fn vacuum_expansion(
    field: &CyclotomicField,
    form: &[Cyc],
    basis: &[SparseVec],
    vacuum: usize,
) -> Result<SparseVec, StructureError> {
    let target = SparseVec::unit(field, vacuum);
    let mut coefficients = Vec::new();
    for (j, e) in basis.iter().enumerate() {
        let c = inner(field, form, e, &target)?;
        if !c.is_zero() {
            coefficients.push((j as u32, field.div(&c, &inner(field, form, e, e)?)?));
        }
    }
    let expansion = SparseVec(coefficients);
    check_expansion(field, basis, &expansion, vacuum)?;
    Ok(expansion)
}

fn check_expansion(
    field: &CyclotomicField,
    basis: &[SparseVec],
    expansion: &SparseVec,
    vacuum: usize,
) -> Result<(), StructureError> {
    let mut sum = SparseVec::default();
    for (j, c) in &expansion.0 {
        let e = basis
            .get(*j as usize)
            .ok_or_else(|| StructureError::Rejected(format!("vacuum index {j} out of range")))?;
        sum = sum.sub_scaled(field, &field.neg(c), e)?;
    }
    require(sum == SparseVec::unit(field, vacuum), || {
        "the vacuum expansion does not sum to the vacuum vector".into()
    })
}

/// The support S₀ of the expansion and the exponents ε with c_i = c_{i₀}·ζ_m^{ε_i}.
fn support_exponents(
    field: &CyclotomicField,
    roots: &RootsOfUnity,
    expansion: &SparseVec,
) -> Result<(Vec<u32>, Vec<u32>), StructureError> {
    let (_, first) = expansion
        .leading()
        .ok_or_else(|| StructureError::Rejected("the vacuum vector is zero".into()))?;
    let mut support = Vec::new();
    let mut epsilon = Vec::new();
    for (j, c) in &expansion.0 {
        let ratio = field.div(c, first)?;
        let e = roots.exponent(&ratio).ok_or_else(|| {
            StructureError::Absent(
                "the vacuum's coefficients on its support are not related by roots of unity".into(),
            )
        })?;
        support.push(*j);
        epsilon.push(e);
    }
    Ok((support, epsilon))
}

/// The monomial generators (and chosen diagonal elements of K) as a generator set over
/// Q(ζ_n), for the commutant certificate.
fn monomial_generator_set(
    field: &CyclotomicField,
    roots: &RootsOfUnity,
    names: &[String],
    monomials: &[Monomial],
    diagonals: &[Vec<u32>],
) -> Result<GeneratorSet, StructureError> {
    let mut generators = Vec::new();
    for (name, g) in names.iter().zip(monomials) {
        let mut rows: Vec<Vec<(usize, Cyc)>> = vec![Vec::new(); g.degree()];
        for (i, (&p, &phi)) in g.perm.iter().zip(&g.phases).enumerate() {
            rows[p as usize].push((i, roots.power(phi).clone()));
        }
        let dim = g.degree();
        generators.push((name.clone(), Operator::SparseRows { dim, rows }));
    }
    for (k, x) in diagonals.iter().enumerate() {
        let entries = x.iter().map(|&e| roots.power(e).clone()).collect();
        generators.push((format!("kernel{k}"), Operator::Diagonal(entries)));
    }
    Ok(GeneratorSet::new(field.clone(), generators, None)?)
}

/// What is derived from a verified monomial form and vacuum expansion.
struct Derived {
    chain: MonomialChain,
    orbit: OrbitCount,
    image_order: BigUint,
}

fn derive(
    field: &CyclotomicField,
    roots: &RootsOfUnity,
    form: &MonomialForm,
    expansion: &SparseVec,
) -> Result<Derived, StructureError> {
    let m = form.modulus;
    let chain = MonomialChain::new(form.basis.len(), m, &form.generators);
    let (support, epsilon) = support_exponents(field, roots, expansion)?;
    let orbit = count_orbit(m, &form.generators, &support, &epsilon)?;
    let image_order = chain.projective_order();
    require((&image_order % &orbit.orbit_size).is_zero(), || {
        format!(
            "the orbit size {} does not divide the image order {image_order}",
            orbit.orbit_size
        )
    })?;
    Ok(Derived {
        chain,
        orbit,
        image_order,
    })
}

fn chain_certificate(chain: &MonomialChain) -> ChainCertificate {
    ChainCertificate {
        base: chain.base(),
        basic_orbit_lengths: chain.basic_orbit_lengths(),
        order: chain.permutation_order().to_string(),
        strong_generators: chain.strong_generators().to_vec(),
    }
}

fn kernel_certificate(kernel: &ModLattice) -> KernelCertificate {
    KernelCertificate {
        generators: kernel.generators(),
        invariants: kernel.invariants(),
        order: kernel.order().to_string(),
        scalars: kernel.scalar_order(),
    }
}

fn sparse_text(v: &SparseVec) -> Vec<(u32, String)> {
    v.0.iter().map(|(i, x)| (*i, x.to_string())).collect()
}

fn sparse_parse(
    field: &CyclotomicField,
    entries: &[(u32, String)],
    dim: usize,
) -> Result<SparseVec, StructureError> {
    let mut out: Vec<(u32, Cyc)> = Vec::with_capacity(entries.len());
    for (i, text) in entries {
        let x = field.parse(text)?;
        let increasing = out.last().map_or(true, |(j, _)| j < i);
        if (*i as usize) >= dim || !increasing || x.is_zero() {
            return Err(StructureError::Input(
                "a sparse vector needs increasing in-range indices and non-zero values".into(),
            ));
        }
        out.push((*i, x));
    }
    Ok(SparseVec(out))
}

/// The commutant: the monomial lemma when K separates the coordinates and P is
/// transitive, otherwise cyclorb-cert's certificate on the monomial generators and a few
/// separating elements of K.
fn prove_commutant(
    field: &CyclotomicField,
    roots: &RootsOfUnity,
    names: &[String],
    form: &MonomialForm,
    kernel: &ModLattice,
    primes: usize,
) -> Result<CommutantProof, StructureError> {
    if let Some(separating) = monomial_irreducibility(kernel, &form.generators) {
        return Ok(CommutantProof::Monomial { separating });
    }
    let diagonals = separating_diagonals(kernel);
    let gens = monomial_generator_set(field, roots, names, &form.generators, &diagonals)?;
    let certificate = commutant(&gens, CommutantOptions { primes })?;
    Ok(CommutantProof::Solved {
        certificate,
        diagonals,
    })
}

fn check_commutant(
    proof: &CommutantProof,
    field: &CyclotomicField,
    roots: &RootsOfUnity,
    names: &[String],
    form: &MonomialForm,
    kernel: &ModLattice,
) -> Result<(), StructureError> {
    match proof {
        CommutantProof::Monomial { separating } => {
            check_irreducibility(kernel, &form.generators, separating)
        }
        CommutantProof::Solved {
            certificate,
            diagonals,
        } => {
            for x in diagonals {
                require(x.len() == kernel.dim() && kernel.contains(x), || {
                    "a diagonal generator of the commutant system is not in the kernel".into()
                })?;
            }
            let gens = monomial_generator_set(field, roots, names, &form.generators, diagonals)?;
            Ok(certificate.verify(&gens)?)
        }
    }
}

/// λ = |orbit|·⟨v₀, v₀⟩_G / dim when the commutant is the scalars (Schur: Σ v v† = λ G⁻¹,
/// and the trace of Σ v v† G is |orbit|·⟨v₀, v₀⟩_G).
fn prefactor(
    orbit_size: &BigUint,
    vacuum_norm: &Cyc,
    dim: usize,
    commutant: &CommutantProof,
) -> Option<String> {
    if commutant.dimension() != 1 {
        return None;
    }
    let (p, q) = vacuum_norm.as_rational()?;
    let size = BigInt::from(orbit_size.clone());
    Rational::new(size * p, q * BigInt::from(dim)).map(|r| r.to_string())
}

/// Analyse a theory spec at genus g.
pub fn analyse_spec(
    spec: &str,
    genus: usize,
    options: &StructureOptions,
) -> Result<StructureReport, StructureError> {
    let theory = parse_spec(spec)?;
    let space = BlockSpace::new(theory, genus)?;
    analyse(&space, options)
}

/// The structural route on a block space: find the monomial form, order the image, count
/// the orbit of the vacuum line and its prefactor, and certify. A theory without the
/// structure gives [`StructureError::Absent`].
pub fn analyse(
    space: &BlockSpace,
    options: &StructureOptions,
) -> Result<StructureReport, StructureError> {
    let start = Instant::now();
    let theory = space.theory();
    let field = theory.field();
    let roots = RootsOfUnity::new(field)?;
    let generators = generators_of(space, options.generating_set)?;
    let (power, form) = find_monomial_form(theory, &roots, space, &generators)?;
    form.check_basis(field)?;
    let vacuum = space.basis().vacuum();
    let expansion = vacuum_expansion(field, space.form(), &form.basis, vacuum)?;
    let derived = derive(field, &roots, &form, &expansion)?;
    let commutant = prove_commutant(
        field,
        &roots,
        &generators.names,
        &form,
        derived.chain.kernel(),
        options.commutant_primes,
    )?;
    let vacuum_norm = space.form()[vacuum].clone();
    let kernel = derived.chain.kernel();
    let orbit = &derived.orbit;
    let image = ImageReport {
        permutation_order: derived.chain.permutation_order().to_string(),
        kernel_order: kernel.order().to_string(),
        kernel_invariants: kernel.invariants(),
        kernel_scalars: kernel.scalar_order(),
    };
    let orbit_report = OrbitReport {
        support_size: orbit.support.len(),
        pattern_classes: orbit.pattern_classes,
        lines_per_class: orbit.lines_per_class.to_string(),
        support_action_order: orbit.support_action_order.to_string(),
        support_diagonal_invariants: orbit.support_diagonal_invariants.clone(),
        vacuum_norm: vacuum_norm.to_string(),
        line_stabiliser_order: (&derived.image_order / &orbit.orbit_size).to_string(),
    };
    let prefactor = prefactor(
        &orbit.orbit_size,
        &vacuum_norm,
        space.dimension(),
        &commutant,
    );
    let commutant_dimension = commutant.dimension();
    let certificate = StructureCertificate {
        theory: theory.name().to_string(),
        genus: space.genus(),
        generating_set: options.generating_set.name().to_string(),
        generators: generators.names.clone(),
        conductor: field.conductor(),
        phase_modulus: form.modulus,
        power,
        basis: form.basis.iter().map(sparse_text).collect(),
        monomials: form.generators.clone(),
        vacuum: sparse_text(&expansion),
        permutation_group: chain_certificate(&derived.chain),
        kernel: kernel_certificate(kernel),
        image_order: derived.image_order.to_string(),
        supports: orbit.supports.to_string(),
        patterns_per_support: orbit.patterns_per_support.to_string(),
        orbit_size: orbit.orbit_size.to_string(),
        commutant,
    };
    Ok(StructureReport {
        theory: theory.name().to_string(),
        genus: space.genus(),
        dimension: space.dimension(),
        conductor: field.conductor(),
        route: "structure".into(),
        generating_set: options.generating_set.name().to_string(),
        generators: generators.names,
        power,
        orbit_size: orbit.orbit_size.to_string(),
        supports: orbit.supports.to_string(),
        patterns_per_support: orbit.patterns_per_support.to_string(),
        commutant_dimension,
        prefactor,
        image_order: derived.image_order.to_string(),
        image,
        orbit: orbit_report,
        elapsed_seconds: start.elapsed().as_secs_f64(),
        certificate,
    })
}

/// Re-check a certificate against the block space it claims to describe.
///
/// Exact steps: the generators named are rebuilt from the theory; the basis has full rank;
/// every generator maps every basis vector to the stated phase times the stated basis
/// vector; the vacuum expansion sums to the vacuum. From these verified monomial
/// generators the chain, the kernel, the image order and the orbit count are derived
/// again and compared field by field; the order of the permutation image is recomputed by
/// cyclorb-cert's independent Schreier–Sims; the commutant proof is checked (the monomial
/// lemma's hypotheses, or cyclorb-cert's certificate after checking that its extra
/// diagonal generators lie in the kernel).
pub fn recheck(
    space: &BlockSpace,
    certificate: &StructureCertificate,
) -> Result<(), StructureError> {
    let theory = space.theory();
    let field = theory.field();
    let roots = RootsOfUnity::new(field)?;
    let set = match certificate.generating_set.as_str() {
        "humphries" => GeneratingSet::Humphries,
        "lickorish" => GeneratingSet::Lickorish,
        other => {
            return Err(StructureError::Input(format!(
                "unknown generating set {other:?}"
            )))
        }
    };
    let generators = generators_of(space, set)?;
    let dim = space.dimension();
    require(
        certificate.theory == theory.name()
            && certificate.genus == space.genus()
            && certificate.conductor == field.conductor()
            && certificate.phase_modulus == roots.modulus()
            && certificate.generators == generators.names
            && certificate.basis.len() == dim
            && certificate.monomials.len() == generators.maps.len(),
        || "the certificate is for another theory, genus or generator set".into(),
    )?;
    let basis = certificate
        .basis
        .iter()
        .map(|e| sparse_parse(field, e, dim))
        .collect::<Result<Vec<_>, _>>()?;
    let form = MonomialForm {
        modulus: roots.modulus(),
        basis,
        generators: certificate.monomials.clone(),
    };
    form.check_basis(field)?;
    for (a, (map, stated)) in generators
        .maps
        .iter()
        .zip(&certificate.monomials)
        .enumerate()
    {
        stated.check(dim, form.modulus)?;
        let found = form.read_monomial(field, &roots, map)?;
        require(found == *stated, || {
            format!(
                "generator {} is not the stated monomial",
                generators.names[a]
            )
        })?;
    }
    let expansion = sparse_parse(field, &certificate.vacuum, dim)?;
    check_expansion(field, &form.basis, &expansion, space.basis().vacuum())?;
    let derived = derive(field, &roots, &form, &expansion)?;
    require(
        chain_certificate(&derived.chain) == certificate.permutation_group,
        || "the permutation group data differ".into(),
    )?;
    require(
        kernel_certificate(derived.chain.kernel()) == certificate.kernel,
        || "the kernel data differ".into(),
    )?;
    let perms: Vec<Vec<u32>> = form.generators.iter().map(|g| g.perm.clone()).collect();
    let independent = permutation_group_summary(dim, &perms)?;
    require(
        independent.order == certificate.permutation_group.order,
        || {
            format!(
                "an independent Schreier–Sims gives |P| = {}, the certificate {}",
                independent.order, certificate.permutation_group.order
            )
        },
    )?;
    require(
        derived.image_order.to_string() == certificate.image_order
            && derived.orbit.supports.to_string() == certificate.supports
            && derived.orbit.patterns_per_support.to_string() == certificate.patterns_per_support
            && derived.orbit.orbit_size.to_string() == certificate.orbit_size,
        || "the image order or the orbit count differ".into(),
    )?;
    check_commutant(
        &certificate.commutant,
        field,
        &roots,
        &generators.names,
        &form,
        derived.chain.kernel(),
    )?;
    Ok(())
}
