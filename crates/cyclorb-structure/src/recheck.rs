//! Re-checking a certificate of the structural route from the block space it describes.

use cyclorb_cert::permutation_group_summary;
use cyclorb_mcg::BlockSpace;

use crate::analyse::{chain_certificate, derive, kernel_certificate};
use crate::commutant::check_commutant;
use crate::error::{require, StructureError};
use crate::imprimitive_check::sparse_parse;
use crate::monomial::MonomialForm;
use crate::report::StructureCertificate;
use crate::search::generators_named;
use crate::vacuum::check_expansion;
use cyclorb_field::RootsOfUnity;

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
    let generators = generators_named(space, &certificate.generating_set)?;
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
