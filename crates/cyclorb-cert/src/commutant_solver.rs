//! The commutant {X : X·A = A·X for every generator A} as a linear system, generic over the
//! field it is solved in (F_p for a bound, Q(ζ_n) for a basis).
//!
//! The unknowns are the d² entries X_ij, the equations (X A − A X)_ij = Σ_k X_ik A_kj −
//! Σ_k A_ik X_kj = 0, one row per (i, j) and generator, built from the non-zero entries
//! of A only. Before elimination the unknowns are cut down:
//! - **diagonal generators**: X·diag(t) = diag(t)·X reads (t_j − t_i)·X_ij = 0, so only the
//!   X_ij with t_i = t_j for every diagonal generator remain, and those generators add no
//!   further equation;
//! - otherwise **an eigenbasis**: when some generator A is diagonalisable with its
//!   eigenvalues among the roots of unity ±ζ_n^k (every Dehn twist is, up to the
//!   root-of-unity rescaling of generators), the system is solved for X' = P⁻¹ X P in the
//!   eigenbasis P of A, where A' = P⁻¹ A P is diagonal; the commutant of the conjugated set
//!   {P⁻¹ A_i P} is P⁻¹ (commutant) P, of the same dimension.
//!
//! Rows enter an incremental echelon form; when only the dimension is wanted the
//! elimination stops as soon as the nullity reaches 1, its least possible value (the
//! identity always commutes).

use crate::echelon::{eigenbasis, inverse, mul, Echelon, Rows};
use crate::error::CertError;
use crate::scalars::Scalars;

/// How the unknowns were cut down.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum Reduction {
    /// By the generators that are diagonal (their number).
    Diagonal(usize),
    /// In the eigenbasis of this generator.
    Eigenbasis(usize),
    /// Not at all: all d² unknowns.
    None,
}

/// The solved (or bounded) commutant.
pub(crate) struct Solved<E> {
    /// How the unknowns were cut down.
    pub(crate) reduction: Reduction,
    /// The number of unknowns after the cut.
    pub(crate) unknowns: usize,
    /// The nullity of the system: the commutant dimension over the field solved in.
    pub(crate) nullity: usize,
    /// A basis in the original coordinates, when asked for.
    pub(crate) basis: Option<Vec<Rows<E>>>,
}

/// What to compute.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub(crate) enum Want {
    /// The nullity only, stopping as soon as it is 1.
    Dimension,
    /// The nullity and a basis.
    Basis,
}

/// The frame the system is solved in: the class of each coordinate (unknown X_ij kept
/// when class i = class j), the generators whose equations hold automatically, and the
/// change of basis (P, P⁻¹) when one was made.
struct Frame<E> {
    reduction: Reduction,
    classes: Vec<usize>,
    automatic: Vec<bool>,
    change: Option<(Rows<E>, Rows<E>)>,
}

fn is_diagonal<S: Scalars>(s: &S, a: &Rows<S::E>) -> bool {
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
fn choose_frame<S: Scalars>(
    s: &S,
    gens: &[Rows<S::E>],
    candidates: &[usize],
) -> Result<Frame<S::E>, CertError> {
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
            reduction: Reduction::Diagonal(count),
            classes,
            automatic: diagonal,
            change: None,
        });
    }
    let roots = s.roots_of_unity();
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
            reduction: Reduction::None,
            classes: vec![0; d],
            automatic: vec![false; gens.len()],
            change: None,
        });
    };
    // P has the eigenvectors as columns
    let p: Rows<S::E> = (0..d)
        .map(|i| vectors.iter().map(|v| v[i].clone()).collect())
        .collect();
    let p_inv = inverse(s, &p)?;
    let mut automatic = vec![false; gens.len()];
    automatic[g] = true;
    Ok(Frame {
        reduction: Reduction::Eigenbasis(g),
        classes,
        automatic,
        change: Some((p, p_inv)),
    })
}

/// Solve (or bound) the commutant of `gens` (square, one size d ≥ 1). `candidates` lists
/// the generators that may be diagonalised for the cut (all of them when `None`).
pub(crate) fn solve<S: Scalars>(
    s: &S,
    gens: &[Rows<S::E>],
    candidates: Option<&[usize]>,
    want: Want,
) -> Result<Solved<S::E>, CertError> {
    let d = gens.first().map_or(0, Vec::len);
    if d == 0 {
        return Err(CertError::Input("generators of size 0".into()));
    }
    let all: Vec<usize> = (0..gens.len()).collect();
    let frame = choose_frame(s, gens, candidates.unwrap_or(&all))?;
    let conjugated: Vec<Rows<S::E>> = match &frame.change {
        Some((p, p_inv)) => gens
            .iter()
            .map(|a| mul(s, &mul(s, p_inv, a)?, p))
            .collect::<Result<_, _>>()?,
        None => gens.to_vec(),
    };
    let mut index = vec![vec![None; d]; d];
    let mut unknowns = 0;
    for (row, class_i) in index.iter_mut().zip(&frame.classes) {
        for (slot, class_j) in row.iter_mut().zip(&frame.classes) {
            if class_i == class_j {
                *slot = Some(unknowns);
                unknowns += 1;
            }
        }
    }
    let mut system = Echelon::new(unknowns);
    'generators: for (a, _) in conjugated.iter().zip(&frame.automatic).filter(|(_, &x)| !x) {
        for i in 0..d {
            for j in 0..d {
                let mut row = vec![s.zero(); unknowns];
                let mut touched = false;
                for k in 0..d {
                    // + X_ik A_kj
                    if let (Some(t), false) = (index[i][k], s.is_zero(&a[k][j])) {
                        row[t] = s.add(&row[t], &a[k][j])?;
                        touched = true;
                    }
                    // − A_ik X_kj
                    if let (Some(t), false) = (index[k][j], s.is_zero(&a[i][k])) {
                        row[t] = s.mul_sub(&row[t], &s.one(), &a[i][k])?;
                        touched = true;
                    }
                }
                if touched {
                    system.insert(s, row)?;
                }
                if want == Want::Dimension && system.nullity() <= 1 {
                    break 'generators;
                }
            }
        }
    }
    let nullity = system.nullity();
    let basis = match want {
        Want::Dimension => None,
        Want::Basis => {
            let mut basis = Vec::with_capacity(nullity);
            for x in system.nullspace(s)? {
                let inner: Rows<S::E> = (0..d)
                    .map(|i| {
                        (0..d)
                            .map(|j| index[i][j].map_or_else(|| s.zero(), |t| x[t].clone()))
                            .collect()
                    })
                    .collect();
                basis.push(match &frame.change {
                    Some((p, p_inv)) => mul(s, &mul(s, p, &inner)?, p_inv)?,
                    None => inner,
                });
            }
            Some(basis)
        }
    };
    Ok(Solved {
        reduction: frame.reduction,
        unknowns,
        nullity,
        basis,
    })
}
