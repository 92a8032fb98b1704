//! The sectors of an imprimitive representation: the joint eigenspaces W_σ of the twist
//! powers, spanned by the component lines that lie in them, and permuted by the generators.
//!
//! Every line of the orbit is tested exactly to be a joint eigenvector (its signature σ).
//! The lines of one signature span a subspace of W_σ; joint eigenspaces of distinct
//! signatures are independent, so when the ranks of the classes add up to dim V each class
//! spans its whole W_σ and V = ⊕ W_σ. A generator maps a line of class σ to a line; when
//! all lines of every class go to lines of one class, the generator maps W_σ onto W_τ:
//! the representation is block-monomial with blocks the sectors, and the generators act on
//! the sectors by the induced permutations ("block permutations").

use cyclorb_field::{CyclotomicField, PrimeReduction};
use hashbrown::HashMap;

use crate::chain::induced_permutation;
use crate::components::{signature, Signature};
use crate::error::StructureError;
use crate::lineorbit::{reduce_vector, LineOrbit, ModpEchelon};
use crate::power::PowerCandidate;
use crate::sparse::SparseVec;

/// The sectors met by the line orbit.
#[derive(Clone, Debug)]
pub(crate) struct Sectors {
    /// The class (sector) of every line.
    pub(crate) class_of: Vec<u32>,
    /// The signature of every sector.
    pub(crate) signatures: Vec<Signature>,
    /// The lines of every sector.
    pub(crate) lines: Vec<Vec<u32>>,
    /// dim W_σ (the rank of its lines).
    pub(crate) dimensions: Vec<usize>,
    /// The block permutation of every generator.
    pub(crate) permutations: Vec<Vec<u32>>,
}

/// The rank of some vectors modulo the first usable prime with an independent subset
/// (indices) and the pivot columns of the echelon form.
pub(crate) fn independent_subset(
    field: &CyclotomicField,
    vectors: &[&SparseVec],
    dim: usize,
) -> Result<(Vec<usize>, Vec<usize>), StructureError> {
    let reduction = PrimeReduction::nth(field, 0)?;
    let mut echelon = ModpEchelon::new(&reduction);
    let mut chosen = Vec::new();
    for (k, v) in vectors.iter().enumerate() {
        if echelon.insert(reduce_vector(&reduction, v, dim)?) {
            chosen.push(k);
        }
    }
    Ok((chosen, echelon.pivots()))
}

/// Classify the lines by signature, prove V = ⊕ W_σ and the block-monomial form.
pub(crate) fn sectors(
    field: &CyclotomicField,
    candidate: &PowerCandidate,
    orbit: &LineOrbit,
    dim: usize,
) -> Result<Sectors, StructureError> {
    let mut index: HashMap<Signature, u32> = HashMap::new();
    let mut signatures = Vec::new();
    let mut lines: Vec<Vec<u32>> = Vec::new();
    let mut class_of = Vec::with_capacity(orbit.vectors.len());
    for (l, v) in orbit.vectors.iter().enumerate() {
        let s = signature(field, candidate, v)?.ok_or_else(|| {
            StructureError::Absent(format!(
                "line {l} of the component orbit is not a joint eigenvector of the {}-th powers",
                candidate.power
            ))
        })?;
        let class = *index.entry(s.clone()).or_insert_with(|| {
            signatures.push(s);
            lines.push(Vec::new());
            (lines.len() - 1) as u32
        });
        lines[class as usize].push(l as u32);
        class_of.push(class);
    }
    let mut dimensions = Vec::with_capacity(lines.len());
    for members in &lines {
        let vectors: Vec<&SparseVec> = members
            .iter()
            .map(|&l| &orbit.vectors[l as usize])
            .collect();
        dimensions.push(independent_subset(field, &vectors, dim)?.0.len());
    }
    let total: usize = dimensions.iter().sum();
    if total != dim {
        return Err(StructureError::Absent(format!(
            "the sectors met by the component lines span {total} of {dim} dimensions"
        )));
    }
    let permutations = orbit
        .monomials
        .iter()
        .map(|g| {
            induced_permutation(&g.perm, &class_of, lines.len()).ok_or_else(|| {
                StructureError::Absent("a generator does not map sectors onto sectors".into())
            })
        })
        .collect::<Result<Vec<_>, _>>()?;
    Ok(Sectors {
        class_of,
        signatures,
        lines,
        dimensions,
        permutations,
    })
}

impl Sectors {
    /// The number of sectors.
    pub(crate) fn count(&self) -> usize {
        self.lines.len()
    }

    /// The orbits of the block permutation group on the sectors, each with a transversal:
    /// for every sector τ of the orbit, a word (generator indices) mapping the first sector
    /// of the orbit to τ.
    pub(crate) fn orbits(&self) -> Vec<Vec<(u32, Vec<u32>)>> {
        let n = self.count();
        let mut seen = vec![false; n];
        let mut orbits = Vec::new();
        for start in 0..n {
            if seen[start] {
                continue;
            }
            seen[start] = true;
            let mut orbit = vec![(start as u32, Vec::new())];
            let mut next = 0;
            while next < orbit.len() {
                let (sector, word) = orbit[next].clone();
                for (a, perm) in self.permutations.iter().enumerate() {
                    let image = perm[sector as usize];
                    if !std::mem::replace(&mut seen[image as usize], true) {
                        let mut w = word.clone();
                        w.push(a as u32);
                        orbit.push((image, w));
                    }
                }
                next += 1;
            }
            orbits.push(orbit);
        }
        orbits
    }
}
