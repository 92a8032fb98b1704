//! The commutant {X : X·A = A·X for every generator A} as a linear system, generic over the
//! field it is solved in (F_p for a bound, Q(ζ_n) for a basis). The one commutant solver
//! of the workspace: `cyclorb-cert` bounds and certifies with it, `cyclorb-orbit` writes
//! Poincaré sums over the invariant matrices it returns.
//!
//! The unknowns are the d² entries X_ij, the equations (X A − A X)_ij = Σ_k X_ik A_kj −
//! Σ_k A_ik X_kj = 0, one row per (i, j) and generator, built from the non-zero entries
//! of A only. Before elimination the unknowns are cut down:
//! - **diagonal generators**: X·diag(t) = diag(t)·X reads (t_j − t_i)·X_ij = 0, so only the
//!   X_ij with t_i = t_j for every diagonal generator remain, and those generators add no
//!   further equation;
//! - otherwise **an eigenbasis** (when allowed): when some generator A is diagonalisable
//!   with its eigenvalues among the roots of unity ±ζ_n^k (every Dehn twist is, up to the
//!   root-of-unity rescaling of generators), the system is solved for X' = P⁻¹ X P in the
//!   eigenbasis P of A, where A' = P⁻¹ A P is diagonal; the commutant of the conjugated set
//!   {P⁻¹ A_i P} is P⁻¹ (commutant) P, of the same dimension.
//!
//! Rows enter an incremental [`Echelon`]; when only the dimension is wanted the
//! elimination stops as soon as the nullity reaches 1, its least possible value (the
//! identity always commutes). Without a change of basis the basis returned is the
//! reduced one for the chosen order of unknowns: each basis matrix is 1 at its own free
//! position and 0 at the other free positions.

use crate::elimination::{eigenbasis, rows_inverse, rows_mul, Echelon, Rows};
use crate::error::MatrixError;
use crate::scalar_field::ScalarField;

/// How the unknowns were cut down.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CommutantCut {
    /// By the generators that are diagonal (their number).
    Diagonal(usize),
    /// In the eigenbasis of this generator.
    Eigenbasis(usize),
    /// Not at all: all d² unknowns.
    None,
}

/// What to compute.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Want {
    /// The nullity only, stopping as soon as it is 1.
    Dimension,
    /// The nullity and a basis.
    Basis,
}

/// Which generators may be diagonalised for the cut when none is diagonal.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum EigenbasisCut<'a> {
    /// Any generator (the one leaving the fewest unknowns).
    Any,
    /// Only these (none when empty: the basis then stays in the original coordinates).
    Among(&'a [usize]),
}

/// The order of the unknowns X_ij, which decides the free positions of the basis: the
/// free ones are the latest in this order.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum UnknownOrder {
    /// (0, 0), (0, 1), …: free positions as late in row-major order as possible.
    RowMajor,
    /// (d−1, d−1), (d−1, d−2), …: free positions as early in row-major order as possible.
    ReverseRowMajor,
}

/// How to set up the commutant system.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct CommutantSystem<'a> {
    /// The nullity only, or a basis too.
    pub want: Want,
    /// Which generators may be diagonalised.
    pub eigenbasis: EigenbasisCut<'a>,
    /// The order of the unknowns.
    pub order: UnknownOrder,
    /// Give up (answer `None`) when more unknowns than this are left after the cut.
    pub max_unknowns: usize,
}

/// The solved (or bounded) commutant.
#[derive(Debug, Clone)]
pub struct SolvedCommutant<E> {
    /// How the unknowns were cut down.
    pub cut: CommutantCut,
    /// The number of unknowns after the cut.
    pub unknowns: usize,
    /// The nullity of the system: the commutant dimension over the field solved in.
    pub nullity: usize,
    /// A basis in the original coordinates, when asked for.
    pub basis: Option<Vec<Rows<E>>>,
}

/// The frame the system is solved in: the class of each coordinate (unknown X_ij kept
/// when class i = class j), the generators whose equations hold automatically, and the
/// change of basis (P, P⁻¹) when one was made.
struct Frame<E> {
    cut: CommutantCut,
    classes: Vec<usize>,
    automatic: Vec<bool>,
    change: Option<(Rows<E>, Rows<E>)>,
}

fn is_diagonal<S: ScalarField>(s: &S, a: &Rows<S::E>) -> bool {
    a.iter()
        .enumerate()
        .all(|(i, row)| row.iter().enumerate().all(|(j, x)| i == j || s.is_zero(x)))
}

/// Class ids of the coordinates: i and j share a class when `key(i) == key(j)`.
fn classes_by<K: PartialEq>(d: usize, key: impl Fn(usize) -> K) -> Vec<usize> {
    let mut representatives: Vec<usize> = Vec::new();
    (0..d)
        .map(|i| {
            let k = key(i);
            match representatives.iter().position(|&r| key(r) == k) {
                Some(c) => c,
                None => {
                    representatives.push(i);
                    representatives.len() - 1
                }
            }
        })
        .collect()
}

fn unknowns_of(classes: &[usize]) -> usize {
    let mut sizes: Vec<usize> = Vec::new();
    for &c in classes {
        if sizes.len() <= c {
            sizes.resize(c + 1, 0);
        }
        sizes[c] += 1;
    }
    sizes.iter().map(|s| s * s).sum()
}

/// A diagonalisable generator and the cut its eigenbasis gives.
struct Candidate<E> {
    generator: usize,
    unknowns: usize,
    classes: Vec<usize>,
    vectors: Rows<E>,
}

/// Choose the frame: the diagonal generators if any; else the diagonalisable generator
/// (among `candidates`) leaving the fewest unknowns; else no cut.
fn choose_frame<S: ScalarField>(
    s: &S,
    gens: &[Rows<S::E>],
    candidates: &[usize],
) -> Result<Frame<S::E>, MatrixError> {
    let d = gens[0].len();
    let diagonal: Vec<bool> = gens.iter().map(|a| is_diagonal(s, a)).collect();
    let count = diagonal.iter().filter(|&&b| b).count();
    if count > 0 {
        let diagonals: Vec<&Rows<S::E>> = gens
            .iter()
            .zip(&diagonal)
            .filter(|(_, &b)| b)
            .map(|(a, _)| a)
            .collect();
        let classes = classes_by(d, |i| {
            diagonals
                .iter()
                .map(|a| a[i][i].clone())
                .collect::<Vec<_>>()
        });
        return Ok(Frame {
            cut: CommutantCut::Diagonal(count),
            classes,
            automatic: diagonal,
            change: None,
        });
    }
    let roots = if candidates.is_empty() {
        Vec::new()
    } else {
        s.roots_of_unity()
    };
    let mut best: Option<Candidate<S::E>> = None;
    for &generator in candidates {
        let Some(basis) = eigenbasis(s, &gens[generator], &roots)? else {
            continue;
        };
        let classes = classes_by(d, |i| basis.values[i].clone());
        let unknowns = unknowns_of(&classes);
        let better = match &best {
            Some(b) => unknowns < b.unknowns,
            None => true,
        };
        if better {
            best = Some(Candidate {
                generator,
                unknowns,
                classes,
                vectors: basis.vectors,
            });
        }
    }
    let Some(Candidate {
        generator: g,
        classes,
        vectors,
        ..
    }) = best
    else {
        return Ok(Frame {
            cut: CommutantCut::None,
            classes: vec![0; d],
            automatic: vec![false; gens.len()],
            change: None,
        });
    };
    // P has the eigenvectors as columns
    let p: Rows<S::E> = (0..d)
        .map(|i| vectors.iter().map(|v| v[i].clone()).collect())
        .collect();
    let p_inv = rows_inverse(s, &p)?;
    let mut automatic = vec![false; gens.len()];
    automatic[g] = true;
    Ok(Frame {
        cut: CommutantCut::Eigenbasis(g),
        classes,
        automatic,
        change: Some((p, p_inv)),
    })
}

/// Solve (or bound) the commutant of `gens` (square, one size d ≥ 1); `None` when more than
/// `system.max_unknowns` unknowns are left after the cut.
pub fn solve_commutant<S: ScalarField>(
    s: &S,
    gens: &[Rows<S::E>],
    system: &CommutantSystem<'_>,
) -> Result<Option<SolvedCommutant<S::E>>, MatrixError> {
    let d = gens.first().map_or(0, Vec::len);
    if d == 0
        || gens
            .iter()
            .any(|a| a.len() != d || a.iter().any(|r| r.len() != d))
    {
        return Err(MatrixError::Shape(
            "the commutant needs square generators of one size d ≥ 1".into(),
        ));
    }
    let all: Vec<usize> = (0..gens.len()).collect();
    let candidates = match system.eigenbasis {
        EigenbasisCut::Any => &all[..],
        EigenbasisCut::Among(c) => c,
    };
    let frame = choose_frame(s, gens, candidates)?;
    let mut kept: Vec<(usize, usize)> = (0..d)
        .flat_map(|i| (0..d).map(move |j| (i, j)))
        .filter(|&(i, j)| frame.classes[i] == frame.classes[j])
        .collect();
    if system.order == UnknownOrder::ReverseRowMajor {
        kept.reverse();
    }
    let unknowns = kept.len();
    if unknowns > system.max_unknowns {
        return Ok(None);
    }
    let mut index = vec![vec![None; d]; d];
    for (t, &(i, j)) in kept.iter().enumerate() {
        index[i][j] = Some(t);
    }
    let mut echelon = Echelon::new(unknowns);
    'generators: for (a, _) in gens.iter().zip(&frame.automatic).filter(|(_, &x)| !x) {
        let conjugated;
        let a = match &frame.change {
            Some((p, p_inv)) => {
                conjugated = rows_mul(s, &rows_mul(s, p_inv, a)?, p)?;
                &conjugated
            }
            None => a,
        };
        // the non-zero entries of A by row (k, A_ik) and by column (k, A_kj)
        let mut by_row: Vec<Vec<(usize, &S::E)>> = vec![Vec::new(); d];
        let mut by_column: Vec<Vec<(usize, &S::E)>> = vec![Vec::new(); d];
        for (i, row) in a.iter().enumerate() {
            for (j, x) in row.iter().enumerate() {
                if !s.is_zero(x) {
                    by_row[i].push((j, x));
                    by_column[j].push((i, x));
                }
            }
        }
        for i in 0..d {
            for j in 0..d {
                let mut row = vec![s.zero(); unknowns];
                let mut touched = false;
                // + X_ik A_kj
                for &(k, x) in &by_column[j] {
                    if let Some(t) = index[i][k] {
                        row[t] = s.add(&row[t], x)?;
                        touched = true;
                    }
                }
                // − A_ik X_kj
                for &(k, x) in &by_row[i] {
                    if let Some(t) = index[k][j] {
                        row[t] = s.add(&row[t], &s.neg(x))?;
                        touched = true;
                    }
                }
                if touched {
                    echelon.insert(s, row)?;
                }
                if system.want == Want::Dimension && echelon.nullity() <= 1 {
                    break 'generators;
                }
            }
        }
    }
    let nullity = echelon.nullity();
    let basis = match system.want {
        Want::Dimension => None,
        Want::Basis => {
            let mut basis = Vec::with_capacity(nullity);
            for x in echelon.nullspace(s)? {
                let inner: Rows<S::E> = (0..d)
                    .map(|i| {
                        (0..d)
                            .map(|j| index[i][j].map_or_else(|| s.zero(), |t| x[t].clone()))
                            .collect()
                    })
                    .collect();
                basis.push(match &frame.change {
                    Some((p, p_inv)) => rows_mul(s, &rows_mul(s, p, &inner)?, p_inv)?,
                    None => inner,
                });
            }
            Some(basis)
        }
    };
    Ok(Some(SolvedCommutant {
        cut: frame.cut,
        unknowns,
        nullity,
        basis,
    }))
}
