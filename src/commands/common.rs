//! Pieces shared by the theory-driven commands: reading a spec, building the block space,
//! naming generating sets, and exporting generators in the orbit engine's file format.

use cyclorb_matrix::Operator;
use cyclorb_mcg::{BlockSpace, Curve, GeneratingSet};
use cyclorb_orbit::{GeneratorSet, OrbitProblem, Seed};

use super::proof;

/// The generating set named on the command line.
pub fn parse_set(name: &str) -> Result<GeneratingSet, String> {
    name.parse()
}

/// Read a theory (built-in spec or file; files proved first, see `proof`) and build its
/// genus-g block space.
pub fn build_space(spec: &str, genus: usize) -> Result<BlockSpace, String> {
    let theory = proof::theory(spec)?;
    BlockSpace::new(theory, genus).map_err(|e| e.to_string())
}

/// The generators of a block space as the orbit engine's generator set (with basis labels,
/// invariant form, theory and genus recorded).
pub fn generator_set_file(space: &BlockSpace, gens: &[(Curve, Operator)]) -> GeneratorSet {
    let theory = space.theory();
    let unit_form = space.form().iter().all(|g| g.is_one());
    GeneratorSet {
        conductor: theory.field().conductor(),
        dimension: space.dimension(),
        names: gens.iter().map(|(c, _)| c.to_string()).collect(),
        operators: gens.iter().map(|(_, op)| op.clone()).collect(),
        basis_labels: space.states().iter().map(|s| s.describe(theory)).collect(),
        form: (!unit_form).then(|| space.form().to_vec()),
        theory: Some(theory.name().to_string()),
        genus: Some(space.genus() as u32),
    }
}

/// The orbit problem of a theory's vacuum line at genus g under the named generating set:
/// the twists as a generator set, the vacuum basis vector as the seed.
pub fn vacuum_problem(spec: &str, genus: usize, set: &str) -> Result<OrbitProblem, String> {
    if super::dw::is_dw(spec) {
        return super::dw::DwSpace::new(spec, genus, set)?.problem();
    }
    let set = parse_set(set)?;
    let space = build_space(spec, genus)?;
    let twists = space.generators(set).map_err(|e| e.to_string())?;
    let gens = generator_set_file(&space, &twists);
    let seed = Seed::basis_vector(
        space.theory().field(),
        space.dimension(),
        space.basis().vacuum(),
    );
    OrbitProblem::new(gens, &seed).map_err(|e| e.to_string())
}
