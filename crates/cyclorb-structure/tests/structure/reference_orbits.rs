//! Shared helpers: block spaces, and an independent brute-force orbit of the vacuum line
//! (breadth-first search over exact lines) to compare the counts with.

use cyclorb_cert::ProvedGenerators;
use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::LinearMap;
use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_structure::{analyse, StructureOptions, StructureReport};
use cyclorb_theory::parse_spec;
use hashbrown::HashSet;

/// V_g of a built-in theory.
pub fn space(spec: &str, genus: usize) -> BlockSpace {
    BlockSpace::new(parse_spec(spec).unwrap(), genus).unwrap()
}

/// The structural report with default options.
pub fn report(space: &BlockSpace) -> StructureReport {
    analyse(space, &StructureOptions::default()).unwrap()
}

/// The Humphries twists as a generator set with the invariant form.
pub fn generator_set(space: &BlockSpace) -> ProvedGenerators {
    let generators = space
        .generators(GeneratingSet::Humphries)
        .unwrap()
        .into_iter()
        .map(|(curve, op)| (curve.to_string(), op))
        .collect();
    ProvedGenerators::new(
        space.theory().field().clone(),
        generators,
        Some(space.form().to_vec()),
    )
    .unwrap()
}

/// v divided by its first non-zero coordinate: one representative per line.
fn normalise(field: &CyclotomicField, v: Vec<Cyc>) -> Vec<Cyc> {
    let lead = v.iter().find(|x| !x.is_zero()).unwrap().clone();
    let inverse = field.inv(&lead).unwrap();
    v.iter().map(|x| field.mul(x, &inverse).unwrap()).collect()
}

/// Every line of the orbit of the vacuum line, by breadth-first search (vacuum first).
pub fn brute_orbit(space: &BlockSpace) -> Vec<Vec<Cyc>> {
    let field = space.theory().field();
    let generators: Vec<_> = space
        .generators(GeneratingSet::Humphries)
        .unwrap()
        .into_iter()
        .map(|(_, op)| op)
        .collect();
    let mut start = vec![field.zero(); space.dimension()];
    start[space.basis().vacuum()] = field.one();
    let mut seen: HashSet<Vec<Cyc>> = HashSet::new();
    seen.insert(start.clone());
    let mut lines = vec![start];
    let mut next = 0;
    while next < lines.len() {
        for a in &generators {
            let image = normalise(field, a.apply(field, &lines[next]).unwrap());
            if seen.insert(image.clone()) {
                lines.push(image);
            }
        }
        next += 1;
    }
    lines
}

/// ⟨w, v⟩_G.
fn inner(field: &CyclotomicField, form: &[Cyc], w: &[Cyc], v: &[Cyc]) -> Cyc {
    let terms: Vec<Cyc> = w
        .iter()
        .zip(form)
        .map(|(x, g)| field.mul(&field.conj(x), g).unwrap())
        .collect();
    field.dot(terms.iter().zip(v)).unwrap()
}

/// λ with B·G = λ·1 for B = Σ v v† over the orbit (each representative rescaled to the
/// G-norm of v₀), or None when B·G is not scalar.
pub fn brute_prefactor(space: &BlockSpace, lines: &[Vec<Cyc>]) -> Option<Cyc> {
    let field = space.theory().field();
    let form = space.form();
    let d = space.dimension();
    let norm0 = inner(field, form, &lines[0], &lines[0]);
    let mut b = vec![vec![field.zero(); d]; d];
    for v in lines {
        let weight = field.div(&norm0, &inner(field, form, v, v)).unwrap();
        for (row, vi) in b.iter_mut().zip(v) {
            if vi.is_zero() {
                continue;
            }
            let vi = field.mul(vi, &weight).unwrap();
            for (entry, vj) in row.iter_mut().zip(v) {
                if !vj.is_zero() {
                    let term = field.mul(&vi, &field.conj(vj)).unwrap();
                    *entry = field.add(entry, &term).unwrap();
                }
            }
        }
    }
    // (B·G)_{ij} = B_ij G_j must be λ δ_ij
    let lambda = field.mul(&b[0][0], &form[0]).unwrap();
    for (i, row) in b.iter().enumerate() {
        for (j, (x, g)) in row.iter().zip(form).enumerate() {
            let expected = if i == j { lambda.clone() } else { field.zero() };
            if field.mul(x, g).unwrap() != expected {
                return None;
            }
        }
    }
    Some(lambda)
}

/// |Sp(2g, F₂)| = 2^{g²} Π_{i=1..g} (4^i − 1) (Grove, Classical Groups and Geometric
/// Algebra, ch. 3; also Artin, Geometric Algebra, ch. III).
pub fn symplectic_order(g: u32) -> u128 {
    (1..=g).fold(1u128 << (g * g), |acc, i| acc * ((1u128 << (2 * i)) - 1))
}

/// The number of Lagrangian subspaces of F₂^{2g}: Π_{i=1..g} (2^i + 1) (Grove, Classical
/// Groups and Geometric Algebra: maximal totally isotropic subspaces over F_q number
/// Π (q^i + 1)).
pub fn lagrangians(g: u32) -> u128 {
    (1..=g).map(|i| (1u128 << i) + 1).product()
}
