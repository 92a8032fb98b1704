//! From a spec to the objects every route works on: the proved theory, its genus-g block
//! space, the twists of a generating set as the orbit engine's generator set or as the
//! certificates' generator set, and the orbit problem of the vacuum line.

use cyclorb_cert::ProvedGenerators;
use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_orbit::{OrbitProblem, Seed};

use crate::{dw_space, proof};

/// The generating set named on the command line.
pub fn parse_set(name: &str) -> Result<GeneratingSet, String> {
    name.parse()
}

/// Read a theory (built-in spec or file; files proved first, see `proof`) and build its
/// genus-g block space.
pub fn build_space(spec: &str, genus: usize) -> Result<BlockSpace, String> {
    build_space_traced(spec, genus).map(|(space, _)| space)
}

/// [`build_space`], with the theory files the spec read (path, data hash; what a
/// certificate's envelope records, see `envelope::wrap`).
pub fn build_space_traced(
    spec: &str,
    genus: usize,
) -> Result<(BlockSpace, Vec<(String, String)>), String> {
    let (theory, files) = proof::theory_traced(spec)?;
    let space = BlockSpace::new(theory, genus).map_err(|e| e.to_string())?;
    Ok((space, files))
}

/// The orbit problem of a theory's vacuum line at genus g under the named generating set:
/// the twists as a generator set, the vacuum basis vector as the seed.
pub fn vacuum_problem(spec: &str, genus: usize, set: &str) -> Result<OrbitProblem, String> {
    if dw_space::is_dw(spec) {
        return dw_space::DwSpace::new(spec, genus, set)?.problem();
    }
    vacuum_problem_of(&build_space(spec, genus)?, parse_set(set)?)
}

/// The orbit problem of the vacuum line of a block space under a generating set.
pub fn vacuum_problem_of(space: &BlockSpace, set: GeneratingSet) -> Result<OrbitProblem, String> {
    let twists = space.generators(set).map_err(|e| e.to_string())?;
    let gens = space.generator_set(&twists).map_err(|e| e.to_string())?;
    let seed = Seed::basis_vector(
        space.theory().field(),
        space.dimension(),
        space.basis().vacuum(),
    );
    OrbitProblem::new(gens, &seed).map_err(|e| e.to_string())
}

/// The twists of a generating set on a block space, as a certificate input (with the form).
pub fn cert_generators(space: &BlockSpace, set: GeneratingSet) -> Result<ProvedGenerators, String> {
    let gens = space.generators(set).map_err(|e| e.to_string())?;
    // the certificate routes hold every generator as a dense d × d matrix: the Cyc values
    // alone (a zero holds no heap, so this is a lower bound) are checked against the budget
    let d = space.dimension() as u64;
    let bytes = (d * d)
        .saturating_mul(gens.len() as u64)
        .saturating_mul(std::mem::size_of::<cyclorb_field::Cyc>() as u64);
    cyclorb_field::check_budget(
        || format!("{} dense generator matrices of size {d} × {d}", gens.len()),
        bytes,
    )
    .map_err(|e| e.to_string())?;
    let named = gens
        .into_iter()
        .map(|(c, op)| (c.to_string(), op))
        .collect();
    let form = Some(space.form().to_vec());
    ProvedGenerators::new(space.theory().field().clone(), named, form).map_err(|e| e.to_string())
}
