//! Monomial matrices with root-of-unity phases, and the monomial form of a generator set.
//!
//! A [`Monomial`] (π, φ) is the matrix e_i ↦ ζ_m^{φ_i}·e_{π(i)}: a permutation π of the
//! basis with phases φ ∈ (Z/m)^d, m = lcm(2, n). Products follow the permutation
//! convention of Schreier–Sims (right action): `g.then(h)` is "g first, then h", the
//! matrix H·G.
//!
//! [`MonomialForm`] is the exact statement "in the basis e_0 … e_{d−1} every generator is
//! monomial": A_a·e_j = ζ_m^{φ_a(j)}·e_{π_a(j)} for every generator a and every j, checked
//! coordinate by coordinate over Q(ζ_n), with the e_j a basis (full rank modulo a prime
//! p ≡ 1 mod n, which bounds the exact rank from below).

use cyclorb_field::{CyclotomicField, PrimeReduction};
use cyclorb_matrix::Matrix;
use serde::{Deserialize, Serialize};

use crate::error::{require, StructureError};
use crate::sparse::{ColumnMap, SparseVec};
use cyclorb_field::RootsOfUnity;

/// The matrix e_i ↦ ζ_m^{φ_i}·e_{π(i)}, π = `perm`, φ = `phases`.
#[derive(Clone, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
pub struct Monomial {
    /// π as the list of images.
    pub perm: Vec<u32>,
    /// φ_i ∈ Z/m, the exponent of ζ_m on the image of e_i.
    pub phases: Vec<u32>,
}

impl Monomial {
    /// The identity on `degree` points.
    pub fn identity(degree: usize) -> Monomial {
        Monomial {
            perm: (0..degree as u32).collect(),
            phases: vec![0; degree],
        }
    }

    /// The diagonal matrix diag(ζ_m^{phases}).
    pub fn diagonal(phases: Vec<u32>) -> Monomial {
        Monomial {
            perm: (0..phases.len() as u32).collect(),
            phases,
        }
    }

    /// The number of points.
    pub fn degree(&self) -> usize {
        self.perm.len()
    }

    /// "self first, then next": e_i ↦ ζ^{φ_i + ψ_{π(i)}} e_{σ(π(i))}.
    pub fn then(&self, next: &Monomial, modulus: u32) -> Monomial {
        let mut perm = Vec::with_capacity(self.degree());
        let mut phases = Vec::with_capacity(self.degree());
        for (&p, &phi) in self.perm.iter().zip(&self.phases) {
            perm.push(next.perm[p as usize]);
            phases.push((phi + next.phases[p as usize]) % modulus);
        }
        Monomial { perm, phases }
    }

    /// self := "self first, then next", in place (phases reduced below m by one
    /// subtraction: both summands are already below m).
    pub fn then_in_place(&mut self, next: &Monomial, modulus: u32) {
        for (p, phi) in self.perm.iter_mut().zip(self.phases.iter_mut()) {
            let q = *p as usize;
            let x = *phi + next.phases[q];
            *phi = if x >= modulus { x - modulus } else { x };
            *p = next.perm[q];
        }
    }

    /// The inverse: e_{π(i)} ↦ ζ^{−φ_i} e_i.
    pub fn inverse(&self, modulus: u32) -> Monomial {
        let mut perm = vec![0; self.degree()];
        let mut phases = vec![0; self.degree()];
        for (i, (&p, &phi)) in self.perm.iter().zip(&self.phases).enumerate() {
            perm[p as usize] = i as u32;
            phases[p as usize] = (modulus - phi % modulus) % modulus;
        }
        Monomial { perm, phases }
    }

    /// "self first, then the inverse of next".
    pub fn then_inverse(&self, next: &Monomial, modulus: u32) -> Monomial {
        self.then(&next.inverse(modulus), modulus)
    }

    /// True when π is the identity (the matrix is diagonal).
    pub fn is_diagonal(&self) -> bool {
        self.perm.iter().enumerate().all(|(i, &p)| p == i as u32)
    }

    /// Check that π is a bijection and the phases lie in Z/m.
    pub fn check(&self, degree: usize, modulus: u32) -> Result<(), StructureError> {
        let mut seen = vec![false; degree];
        let bijective = self.perm.len() == degree
            && self.phases.len() == degree
            && self
                .perm
                .iter()
                .all(|&p| (p as usize) < degree && !std::mem::replace(&mut seen[p as usize], true));
        require(
            bijective && self.phases.iter().all(|&x| x < modulus),
            || "a monomial element is not a permutation with phases in Z/m".into(),
        )
    }
}

/// A basis in which every generator is monomial.
#[derive(Clone, Debug)]
pub struct MonomialForm {
    /// m: phases are exponents of ζ_m.
    pub modulus: u32,
    /// The basis vectors e_j (comb coordinates).
    pub basis: Vec<SparseVec>,
    /// A_a·e_j = ζ_m^{φ_a(j)}·e_{π_a(j)}.
    pub generators: Vec<Monomial>,
}

/// Where `u` lies: (j, c) with u = c·e_j, c ≠ 0, found through the leading coordinate.
fn locate(
    field: &CyclotomicField,
    basis: &[SparseVec],
    by_coordinate: &[Vec<u32>],
    u: &SparseVec,
) -> Result<Option<(usize, cyclorb_field::Cyc)>, StructureError> {
    let Some((i, lead)) = u.leading() else {
        return Ok(None);
    };
    for &j in &by_coordinate[*i as usize] {
        let e = &basis[j as usize];
        if e.0.len() != u.0.len() || e.leading().map(|x| x.0) != Some(*i) {
            continue;
        }
        let c = field.div(lead, &e.0[0].1)?;
        if e.scale(field, &c)? == *u {
            return Ok(Some((j as usize, c)));
        }
    }
    Ok(None)
}

fn coordinate_lists(basis: &[SparseVec], dim: usize) -> Vec<Vec<u32>> {
    let mut lists = vec![Vec::new(); dim];
    for (j, e) in basis.iter().enumerate() {
        for (i, _) in &e.0 {
            lists[*i as usize].push(j as u32);
        }
    }
    lists
}

impl MonomialForm {
    /// From lines permuted by the generators: renumber and rescale them along a
    /// breadth-first spanning forest of the permutation action (e_new := A·e_parent, so
    /// tree edges have phase 0), then read off every (π, φ) exactly. A phase that is not
    /// a root of unity means the structure is absent (a finite monomial group normalised
    /// this way has root-of-unity phases: t_j⁻¹·A·t_i fixes the root line).
    pub(crate) fn from_lines(
        field: &CyclotomicField,
        roots: &RootsOfUnity,
        maps: &[ColumnMap],
        lines: Vec<SparseVec>,
    ) -> Result<MonomialForm, StructureError> {
        let dim = lines.len();
        let by_coordinate = coordinate_lists(&lines, dim);
        let mut new_index: Vec<Option<usize>> = vec![None; dim];
        let mut basis: Vec<SparseVec> = Vec::with_capacity(dim);
        let mut old_of_new: Vec<usize> = Vec::with_capacity(dim);
        for root in 0..dim {
            if new_index[root].is_some() {
                continue;
            }
            new_index[root] = Some(basis.len());
            basis.push(lines[root].clone());
            old_of_new.push(root);
            let mut next = basis.len() - 1;
            while next < basis.len() {
                for a in maps {
                    let u = a.apply(field, &basis[next])?;
                    let (j, _) = locate(field, &lines, &by_coordinate, &u)?.ok_or_else(|| {
                        StructureError::Absent("a generator does not map a line to a line".into())
                    })?;
                    if new_index[j].is_none() {
                        new_index[j] = Some(basis.len());
                        basis.push(u);
                        old_of_new.push(j);
                    }
                }
                next += 1;
            }
        }
        let form = MonomialForm {
            modulus: roots.modulus(),
            basis,
            generators: Vec::new(),
        };
        let generators = maps
            .iter()
            .map(|a| form.read_monomial(field, roots, a))
            .collect::<Result<Vec<_>, _>>()?;
        Ok(MonomialForm { generators, ..form })
    }

    /// The (π, φ) of one map in this basis, exactly; an error when it is not monomial
    /// with root-of-unity phases.
    pub(crate) fn read_monomial(
        &self,
        field: &CyclotomicField,
        roots: &RootsOfUnity,
        a: &ColumnMap,
    ) -> Result<Monomial, StructureError> {
        let dim = self.basis.len();
        let by_coordinate = coordinate_lists(&self.basis, dim);
        let mut perm = Vec::with_capacity(dim);
        let mut phases = Vec::with_capacity(dim);
        for e in &self.basis {
            let u = a.apply(field, e)?;
            let (j, c) = locate(field, &self.basis, &by_coordinate, &u)?.ok_or_else(|| {
                StructureError::Absent("a generator does not map a basis line to a line".into())
            })?;
            let phase = roots.exponent(&c).ok_or_else(|| {
                StructureError::Absent(format!(
                    "a phase {c} is not a root of unity (the group is not finite monomial)"
                ))
            })?;
            perm.push(j as u32);
            phases.push(phase);
        }
        let m = Monomial { perm, phases };
        m.check(dim, self.modulus)?;
        Ok(m)
    }

    /// Check that the e_j form a basis: full rank modulo a prime p ≡ 1 (mod n) (rank mod p
    /// ≤ exact rank), else the exact rank.
    pub fn check_basis(&self, field: &CyclotomicField) -> Result<(), StructureError> {
        let dim = self.basis.len();
        let rows: Vec<Vec<_>> = self.basis.iter().map(|e| e.to_dense(field, dim)).collect();
        let matrix = Matrix::from_rows(rows)?;
        for index in 0..4 {
            let reduction = PrimeReduction::nth(field, index)?;
            if let Ok(mp) = matrix.reduce_mod(&reduction) {
                if mp.rank() == dim {
                    return Ok(());
                }
            }
        }
        require(matrix.rank(field)? == dim, || {
            "the lines found are linearly dependent".into()
        })
    }
}
