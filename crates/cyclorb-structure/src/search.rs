//! The search for a monomial form: for each candidate power k, refine the space into the
//! joint eigenlines of the normal closure of the k-th powers and read the generators off
//! in that basis; the first k that succeeds wins, and the reasons of the failures are
//! kept for the report of an absent structure.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_theory::Theory;

use crate::error::StructureError;
use crate::monomial::MonomialForm;
use crate::power::{candidate_powers, power_candidate, twist_order, PowerCandidate};
use crate::refine::Refinement;
use crate::sparse::{ColumnMap, SparseVec};
use cyclorb_field::RootsOfUnity;

/// The generators of a block space as column maps, with their names.
pub(crate) struct Generators {
    /// The curve names.
    pub(crate) names: Vec<String>,
    /// The twists, by columns.
    pub(crate) maps: Vec<ColumnMap>,
}

/// The twists of the generating set a certificate names (`humphries`, `lickorish`), so
/// that every re-check reads the name the same way.
pub(crate) fn generators_named(
    space: &BlockSpace,
    name: &str,
) -> Result<Generators, StructureError> {
    let set: GeneratingSet = name.parse().map_err(StructureError::Input)?;
    generators_of(space, set)
}

/// The twists of a generating set, by columns, with their curve names.
pub(crate) fn generators_of(
    space: &BlockSpace,
    set: GeneratingSet,
) -> Result<Generators, StructureError> {
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
pub(crate) fn find_monomial_form(
    theory: &Theory,
    roots: &RootsOfUnity,
    space: &BlockSpace,
    generators: &Generators,
) -> Result<(u32, MonomialForm), StructureError> {
    let field = theory.field();
    let order = twist_order(theory, roots)?;
    // every twist of the Lickorish set lies in the group: their powers generate N, and
    // they and their inverses drive the refinement
    let Generators {
        names,
        maps: twists,
    } = generators_of(space, GeneratingSet::Lickorish)?;
    let mut refiners = Vec::new();
    for (_, op) in space.generators(GeneratingSet::Lickorish)? {
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
