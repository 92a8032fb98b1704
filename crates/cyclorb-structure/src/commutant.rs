//! The commutant of the group in the monomial basis: the monomial lemma of
//! [`crate::irreducible`] when it applies, cyclorb-cert's certificate otherwise.

use cyclorb_cert::{commutant, CommutantOptions, ProvedGenerators};
use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Operator;

use crate::error::{require, StructureError};
use crate::irreducible::{check_irreducibility, monomial_irreducibility, separating_diagonals};
use crate::lattice::ModLattice;
use crate::monomial::{Monomial, MonomialForm};
use crate::report::CommutantProof;
use cyclorb_field::RootsOfUnity;

/// The monomial generators (and chosen diagonal elements of K) as a generator set over
/// Q(ζ_n), for the commutant certificate.
fn monomial_generator_set(
    field: &CyclotomicField,
    roots: &RootsOfUnity,
    names: &[String],
    monomials: &[Monomial],
    diagonals: &[Vec<u32>],
) -> Result<ProvedGenerators, StructureError> {
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
    Ok(ProvedGenerators::new(field.clone(), generators, None)?)
}

/// The commutant: the monomial lemma when K separates the coordinates and P is
/// transitive, otherwise cyclorb-cert's certificate on the monomial generators and a few
/// separating elements of K.
pub(crate) fn prove_commutant(
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

/// Check a commutant proof against the verified monomial form.
pub(crate) fn check_commutant(
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
