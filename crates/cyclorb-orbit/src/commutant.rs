//! The invariant matrices of a generator set and the decomposition of B over them.
//!
//! A matrix M is invariant when X M X† = M for every generator X. For X with X† G X = G this
//! is X (M G) X⁻¹ = M G: Y = M G lies in the commutant of the generators, X Y = Y X, a
//! linear system over Q(ζ_n) in the d² entries of Y. A diagonal generator diag(θ) gives
//! (θ_i − θ_j) Y_ij = 0, which removes every unknown with θ_i ≠ θ_j before any elimination;
//! the other generators give equations (X Y − Y X)_ij = 0 solved exactly
//! ([`cyclorb_matrix::solve_commutant`], the commutant solver `cyclorb-cert` uses too). The unknowns are ordered so that the earliest positions in
//! row-major order are the free ones; (0, 0) is always free because G⁻¹ is invariant. Each
//! basis matrix P_a is 1 at its free position f_a and 0 at the others, so any invariant M
//! equals Σ_a M(f_a) P_a.
//!
//! Physical basis: invariants with non-negative integer entries and vacuum–vacuum entry 1
//! are M = P_1 + Σ_{a≥2} t_a P_a with t_a = M(f_a) ∈ {0, 1, 2, …}. The search tries
//! t_a ∈ {0, …, 3} (when there are at most 7 basis matrices) in lexicographic order and keeps
//! the first candidates that are linearly independent; when they span, B is written over
//! them, otherwise over P_1, …, P_m.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::{
    solve_commutant, CommutantSystem, EigenbasisCut, Exact, Matrix, Rows, UnknownOrder, Want,
};

use crate::error::OrbitError;
use crate::sparse::operator_rows;
use cyclorb_matrix::GeneratorSet;

/// One term c·M of a decomposition of B.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct InvariantTerm {
    /// The coefficient c.
    pub coefficient: Cyc,
    /// The invariant matrix M.
    pub matrix: Matrix,
}

/// B written over a basis of the invariant matrices.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Decomposition {
    /// Dimension of the space of invariant matrices.
    pub commutant_dimension: usize,
    /// Whether the basis is physical (non-negative integer entries, vacuum–vacuum entry 1).
    pub physical: bool,
    /// B = Σ coefficient · matrix.
    pub terms: Vec<InvariantTerm>,
}

/// Largest t_a tried in the physical search, and largest basis searched.
const PHYSICAL_ENTRY_LIMIT: i64 = 3;
const PHYSICAL_BASIS_LIMIT: usize = 7;

/// Basis matrices P_a and the free position (i, j) of each.
type InvariantBasis = (Vec<Matrix>, Vec<(usize, usize)>);

/// A basis P_1, …, P_m of the invariant matrices with its free positions, or `None` when
/// the linear system has more than `max_unknowns` unknowns.
///
/// The commutant of the generators is solved by [`solve_commutant`] over Q(ζ_n), cut by the
/// diagonal generators only (no eigenbasis, so the basis stays in the comb coordinates)
/// and with the unknowns in reverse row-major order, so that each basis vector Y is 1 at
/// its free position (its first non-zero entry in row-major order) and 0 at the others.
pub(crate) fn invariant_basis(
    field: &CyclotomicField,
    generators: &GeneratorSet,
    max_unknowns: usize,
) -> Result<Option<InvariantBasis>, OrbitError> {
    let d = generators.dimension();
    let dense: Vec<Rows<Cyc>> = generators
        .operators()
        .iter()
        .map(|op| {
            let mut rows = vec![vec![field.zero(); d]; d];
            for (row, entries) in rows.iter_mut().zip(operator_rows(field, op)) {
                for (j, x) in entries {
                    row[j] = x;
                }
            }
            rows
        })
        .collect();
    let system = CommutantSystem {
        want: Want::Basis,
        eigenbasis: EigenbasisCut::Among(&[]),
        order: UnknownOrder::ReverseRowMajor,
        max_unknowns,
    };
    let Some(solved) = solve_commutant(&Exact::new(field), &dense, &system)? else {
        return Ok(None);
    };
    let g = generators.form_diagonal();
    let mut basis: Vec<(usize, Matrix)> = Vec::with_capacity(solved.nullity);
    for y in solved.basis.unwrap_or_default() {
        let (fi, fj) = free_position(field, &y).ok_or_else(|| {
            OrbitError::Arithmetic("nullspace vector without a free position".into())
        })?;
        let mut m = Matrix::zeros(field, d, d);
        for (i, row) in y.iter().enumerate() {
            for (j, value) in row.iter().enumerate() {
                if value.is_zero() {
                    continue;
                }
                // M = Y G⁻¹, scaled so that M(f) = 1: M_ij = Y_ij · G_{fj} / G_j
                let entry = field.div(&field.mul(value, &g[fj])?, &g[j])?;
                m.set(i, j, entry);
            }
        }
        basis.push((fi * d + fj, m));
    }
    basis.sort_by_key(|(p, _)| *p);
    let frees = basis.iter().map(|(p, _)| (p / d, p % d)).collect();
    Ok(Some((basis.into_iter().map(|(_, m)| m).collect(), frees)))
}

/// The free position of a commutant basis vector solved in reverse row-major order: the
/// free unknowns are the latest in that order, so the free position is the first non-zero
/// entry in row-major order, and it holds 1.
fn free_position(field: &CyclotomicField, y: &Rows<Cyc>) -> Option<(usize, usize)> {
    let (i, j) = y
        .iter()
        .enumerate()
        .find_map(|(i, row)| row.iter().position(|x| !x.is_zero()).map(|j| (i, j)))?;
    (y[i][j] == field.one()).then_some((i, j))
}

/// B over a basis of the invariant matrices (physical when one is found); `None` when the
/// system is too large. An error when B is not invariant.
pub(crate) fn decompose(
    field: &CyclotomicField,
    generators: &GeneratorSet,
    b: &Matrix,
    max_unknowns: usize,
) -> Result<Option<Decomposition>, OrbitError> {
    let Some((basis, frees)) = invariant_basis(field, generators, max_unknowns)? else {
        return Ok(None);
    };
    let coords: Vec<Cyc> = frees.iter().map(|&(i, j)| b.get(i, j).clone()).collect();
    let mut rebuilt = Matrix::zeros(field, b.rows(), b.cols());
    for (c, p) in coords.iter().zip(&basis) {
        rebuilt = rebuilt.add(field, &p.scale(field, c)?)?;
    }
    if rebuilt != *b {
        return Err(OrbitError::Arithmetic(
            "the Poincaré sum is not an invariant matrix".into(),
        ));
    }
    let m = basis.len();
    if frees.first() == Some(&(0, 0)) && m <= PHYSICAL_BASIS_LIMIT {
        if let Some(terms) = physical_terms(field, &basis, &coords)? {
            return Ok(Some(Decomposition {
                commutant_dimension: m,
                physical: true,
                terms,
            }));
        }
    }
    let terms = coords
        .into_iter()
        .zip(basis)
        .filter(|(c, _)| !c.is_zero())
        .map(|(coefficient, matrix)| InvariantTerm {
            coefficient,
            matrix,
        })
        .collect();
    Ok(Some(Decomposition {
        commutant_dimension: m,
        physical: false,
        terms,
    }))
}

/// Whether every entry is a non-negative integer.
fn is_physical(m: &Matrix) -> bool {
    m.entries().iter().all(|x| match x.as_rational() {
        Some((p, q)) => q == 1.into() && p >= 0.into(),
        None => false,
    })
}

/// B over the first independent physical candidates, when they span.
fn physical_terms(
    field: &CyclotomicField,
    basis: &[Matrix],
    coords: &[Cyc],
) -> Result<Option<Vec<InvariantTerm>>, OrbitError> {
    let m = basis.len();
    let mut chosen: Vec<(Vec<i64>, Matrix)> = Vec::new();
    let mut t = vec![0i64; m - 1];
    loop {
        let mut candidate = basis[0].clone();
        for (ta, p) in t.iter().zip(&basis[1..]) {
            if *ta != 0 {
                candidate = candidate.add(field, &p.scale(field, &field.int(*ta))?)?;
            }
        }
        if is_physical(&candidate) {
            let mut coordinates = vec![1i64];
            coordinates.extend(&t);
            let mut rows: Vec<Vec<Cyc>> = chosen
                .iter()
                .map(|(c, _)| c.iter().map(|&x| field.int(x)).collect())
                .collect();
            rows.push(coordinates.iter().map(|&x| field.int(x)).collect());
            if Matrix::from_rows(rows)?.rank(field)? == chosen.len() + 1 {
                chosen.push((coordinates, candidate));
                if chosen.len() == m {
                    break;
                }
            }
        }
        // next t in lexicographic order (last index fastest)
        let Some(pos) = t.iter().rposition(|&x| x < PHYSICAL_ENTRY_LIMIT) else {
            return Ok(None);
        };
        t[pos] += 1;
        for x in &mut t[pos + 1..] {
            *x = 0;
        }
    }
    // coords = Σ_b c_b · coordinates_b: solve the m×m system (columns = candidates)
    let system: Vec<Vec<Cyc>> = (0..m)
        .map(|a| chosen.iter().map(|(c, _)| field.int(c[a])).collect())
        .collect();
    let c = Matrix::from_rows(system)?.solve(field, coords)?;
    Ok(Some(
        c.into_iter()
            .zip(chosen)
            .filter(|(x, _)| !x.is_zero())
            .map(|(coefficient, (_, matrix))| InvariantTerm {
                coefficient,
                matrix,
            })
            .collect(),
    ))
}
