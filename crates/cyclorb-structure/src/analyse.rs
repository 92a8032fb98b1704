//! The structural route end to end: monomial form, image order, counted orbit, prefactor,
//! assembled into a report with its certificate.

use std::time::Instant;

use cyclorb_field::{Cyc, CyclotomicField, Rational};
use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_theory::parse_spec;
use num_bigint::{BigInt, BigUint};
use num_traits::Zero;

use crate::chain::MonomialChain;
use crate::commutant::prove_commutant;
use crate::error::{require, StructureError};
use crate::lattice::ModLattice;
use crate::monomial::MonomialForm;
use crate::orbit::{count_orbit, OrbitCount};
use crate::report::{
    ChainCertificate, CommutantProof, ImageReport, KernelCertificate, OrbitReport,
    StructureCertificate, StructureReport,
};
use crate::search::{find_monomial_form, generators_of};
use crate::sparse::SparseVec;
use crate::vacuum::{support_exponents, vacuum_expansion};
use cyclorb_field::RootsOfUnity;

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

/// What is derived from a verified monomial form and vacuum expansion.
pub(crate) struct Derived {
    /// The chain of the whole group.
    pub(crate) chain: MonomialChain,
    /// The counted orbit.
    pub(crate) orbit: OrbitCount,
    /// |P|·|K| / |K ∩ scalars|.
    pub(crate) image_order: BigUint,
}

pub(crate) fn derive(
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

pub(crate) fn chain_certificate(chain: &MonomialChain) -> ChainCertificate {
    ChainCertificate {
        base: chain.base(),
        basic_orbit_lengths: chain.basic_orbit_lengths(),
        order: chain.permutation_order().to_string(),
        strong_generators: chain.strong_generators().to_vec(),
    }
}

pub(crate) fn kernel_certificate(kernel: &ModLattice) -> KernelCertificate {
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
