//! The vacuum vector in the monomial basis and the phases of its coefficients.

use cyclorb_field::{Cyc, CyclotomicField};

use crate::error::{require, StructureError};
use crate::sparse::{inner, SparseVec};
use cyclorb_field::RootsOfUnity;

/// v₀ = e_vac in the monomial basis: c_j = ⟨e_j, e_vac⟩_G / ⟨e_j, e_j⟩_G, then
/// Σ c_j e_j = e_vac checked exactly (the e_j being a basis, the expansion is unique).
pub(crate) fn vacuum_expansion(
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

/// Σ c_j e_j = e_vac, exactly.
pub(crate) fn check_expansion(
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
pub(crate) fn support_exponents(
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
