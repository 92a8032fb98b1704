//! The invariant matrices of a generator set and the decomposition of B over them.
//!
//! A matrix M is invariant when X M X† = M for every generator X. For X with X† G X = G this
//! is X (M G) X⁻¹ = M G: Y = M G lies in the commutant of the generators, X Y = Y X, a
//! linear system over Q(ζ_n) in the d² entries of Y. A diagonal generator diag(θ) gives
//! (θ_i − θ_j) Y_ij = 0, which removes every unknown with θ_i ≠ θ_j before any elimination;
//! the other generators give equations (X Y − Y X)_ij = 0 solved exactly
//! (`Matrix::nullspace`). The unknowns are ordered so that the earliest positions in
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
use cyclorb_matrix::Matrix;

use crate::error::OrbitError;
use crate::generators::GeneratorSet;
use crate::sparse::{diagonal_of, operator_rows};

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
pub(crate) fn invariant_basis(
    field: &CyclotomicField,
    generators: &GeneratorSet,
    max_unknowns: usize,
) -> Result<Option<InvariantBasis>, OrbitError> {
    let d = generators.dimension;
    let mut allowed = vec![true; d * d];
    let mut dense_generators = Vec::new();
    for op in &generators.operators {
        match diagonal_of(field, op) {
            Some(theta) => {
                for i in 0..d {
                    for j in 0..d {
                        if theta[i] != theta[j] {
                            allowed[i * d + j] = false;
                        }
                    }
                }
            }
            None => dense_generators.push(operator_rows(field, op)),
        }
    }
    // columns in reverse row-major order, so that early positions end up free
    let positions: Vec<usize> = (0..d * d).rev().filter(|&p| allowed[p]).collect();
    if positions.len() > max_unknowns {
        return Ok(None);
    }
    let mut column_of = vec![usize::MAX; d * d];
    for (c, &p) in positions.iter().enumerate() {
        column_of[p] = c;
    }
    let unknowns = positions.len();
    let mut equations: Vec<Vec<Cyc>> = Vec::new();
    for rows in &dense_generators {
        // (X Y − Y X)_ij = Σ_k X_ik Y_kj − Σ_k Y_ik X_kj
        let mut columns: Vec<Vec<(usize, &Cyc)>> = vec![Vec::new(); d];
        for (k, row) in rows.iter().enumerate() {
            for (j, x) in row {
                columns[*j].push((k, x));
            }
        }
        for i in 0..d {
            for j in 0..d {
                let mut eq = vec![field.zero(); unknowns];
                let mut any = false;
                for (k, x) in &rows[i] {
                    let c = column_of[k * d + j];
                    if c != usize::MAX {
                        eq[c] = field.add(&eq[c], x)?;
                        any = true;
                    }
                }
                for (k, x) in &columns[j] {
                    let c = column_of[i * d + k];
                    if c != usize::MAX {
                        eq[c] = field.sub(&eq[c], x)?;
                        any = true;
                    }
                }
                if any && eq.iter().any(|x| !x.is_zero()) {
                    equations.push(eq);
                }
            }
        }
    }
    let null = if equations.is_empty() {
        (0..unknowns)
            .map(|c| {
                let mut v = vec![field.zero(); unknowns];
                v[c] = field.one();
                v
            })
            .collect()
    } else {
        Matrix::from_rows(equations)?.nullspace(field)?
    };
    let g = generators.form_diagonal(field);
    let mut basis: Vec<(usize, Matrix)> = Vec::with_capacity(null.len());
    for y in null {
        // the free column is the one entry 1 whose column no other vector uses: take the
        // last non-zero column that holds exactly 1 (free columns are the latest ones)
        let free = free_column(field, &y).ok_or_else(|| {
            OrbitError::Arithmetic("nullspace vector without a free column".into())
        })?;
        let (fi, fj) = (positions[free] / d, positions[free] % d);
        let mut m = Matrix::zeros(field, d, d);
        for (c, value) in y.iter().enumerate() {
            if value.is_zero() {
                continue;
            }
            let (i, j) = (positions[c] / d, positions[c] % d);
            // M = Y G⁻¹, scaled so that M(f) = 1: M_ij = Y_ij · G_{fj} / G_j
            let entry = field.div(&field.mul(value, &g[fj])?, &g[j])?;
            m.set(i, j, entry);
        }
        basis.push((fi * d + fj, m));
    }
    basis.sort_by_key(|(p, _)| *p);
    let frees = basis.iter().map(|(p, _)| (p / d, p % d)).collect();
    Ok(Some((basis.into_iter().map(|(_, m)| m).collect(), frees)))
}

/// The free column of a nullspace vector from `Matrix::nullspace`: x_f = 1 at its own free
/// column f and 0 at the other free columns; pivot columns come before f in a reduced echelon
/// form, so f is the last non-zero column.
fn free_column(field: &CyclotomicField, y: &[Cyc]) -> Option<usize> {
    let last = y.iter().rposition(|x| !x.is_zero())?;
    (y[last] == field.one()).then_some(last)
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
