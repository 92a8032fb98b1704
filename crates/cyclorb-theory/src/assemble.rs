//! From raw data to a [`Theory`]: enlarge the field until it holds D and exp(2πi c/8),
//! compute D, c, S̃ and S, and prepare the F-block cells.

use std::sync::OnceLock;

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;
use hashbrown::HashMap;

use crate::arith::SameField;
use crate::error::TheoryError;
use crate::fmatrix::{invert, FMatrix};
use crate::fusion::FusionRules;
use crate::gauss::{gauss_data, gauss_from_s, required_conductor};
use crate::structure::{key3, key4, Braiding, FBlock, FSource};
use crate::theory::Theory;

/// A theory before its derived data are computed.
pub(crate) struct RawTheory {
    pub name: String,
    pub field: CyclotomicField,
    pub labels: Vec<String>,
    pub fusion: FusionRules,
    /// Quantum dimensions (for modular data: S_0a/S_00).
    pub dims: Vec<Cyc>,
    pub twists: Vec<Cyc>,
    pub structure: RawStructure,
}

/// The data beyond labels, fusion, dimensions and twists.
pub(crate) enum RawStructure {
    /// F- and R-symbols with the vertex weights of their gauge (entries ≠ 1 only).
    Braided {
        f: RawF,
        r: HashMap<u64, Cyc>,
        weights: HashMap<u64, Cyc>,
    },
    /// The normalised S-matrix alone.
    ModularData { s: Matrix },
}

/// F-symbols: every block given (with or without its inverse), or a source that computes
/// blocks on first use.
pub(crate) enum RawF {
    Stored(HashMap<u64, FMatrix>),
    Blocks(HashMap<u64, FBlock>),
    Lazy(FSource),
}

/// The rows (e) and columns (f) of [F^{abc}_d].
pub(crate) fn block_labels(
    fusion: &FusionRules,
    a: usize,
    b: usize,
    c: usize,
    d: usize,
) -> (Vec<usize>, Vec<usize>) {
    let rows = fusion
        .outcomes(a, b)
        .iter()
        .copied()
        .filter(|&e| fusion.fuses(e, c, d))
        .collect();
    let cols = fusion
        .outcomes(b, c)
        .iter()
        .copied()
        .filter(|&f| fusion.fuses(a, f, d))
        .collect();
    (rows, cols)
}

/// Every (a, b, c, d) with at least one admissible row, in increasing order.
pub(crate) fn admissible_blocks(fusion: &FusionRules) -> Vec<(usize, usize, usize, usize)> {
    let r = fusion.rank();
    let mut out = Vec::new();
    for a in 0..r {
        for b in 0..r {
            for c in 0..r {
                let mut ds: Vec<usize> = fusion
                    .outcomes(a, b)
                    .iter()
                    .flat_map(|&e| fusion.outcomes(e, c).iter().copied())
                    .collect();
                ds.sort_unstable();
                ds.dedup();
                out.extend(ds.into_iter().map(|d| (a, b, c, d)));
            }
        }
    }
    out
}

/// Every block of a theory from an entry function [F^{abc}_d]_{ef}.
pub(crate) fn blocks_from_entries(
    field: &CyclotomicField,
    fusion: &FusionRules,
    entry: impl Fn(usize, usize, usize, usize, usize, usize) -> Cyc,
) -> HashMap<u64, FMatrix> {
    let r = fusion.rank();
    admissible_blocks(fusion)
        .into_iter()
        .map(|(a, b, c, d)| {
            let (rows, cols) = block_labels(fusion, a, b, c, d);
            let entries: Vec<Vec<Cyc>> = rows
                .iter()
                .map(|&e| cols.iter().map(|&f| entry(a, b, c, d, e, f)).collect())
                .collect();
            let matrix = Matrix::from_rows(entries).expect("rows of one length");
            (key4(r, a, b, c, d), FMatrix::new(rows, cols, matrix, field))
        })
        .collect()
}

/// S̃_ab = Σ_c N_{a*b}^c d_c R^{b a*}_c R^{a* b}_c (the Hopf link through the braiding); it
/// equals Σ_c N_{a*b}^c d_c θ_c/(θ_a θ_b) when the braiding is balanced.
fn hopf_link(
    field: &CyclotomicField,
    fusion: &FusionRules,
    dims: &[Cyc],
    r: &HashMap<u64, Cyc>,
) -> Matrix {
    let rank = fusion.rank();
    let zero = field.zero();
    let mut m = Matrix::zeros(field, rank, rank);
    for a in 0..rank {
        let ad = fusion.dual(a);
        for b in 0..rank {
            let mut acc = field.zero();
            for &c in fusion.outcomes(ad, b) {
                let r1 = r.get(&key3(rank, b, ad, c)).unwrap_or(&zero);
                let r2 = r.get(&key3(rank, ad, b, c)).unwrap_or(&zero);
                let term = field.product([&dims[c], r1, r2]);
                acc = field.plus(&acc, &term);
            }
            m.set(a, b, acc);
        }
    }
    m
}

fn embed_all(field: &CyclotomicField, xs: &[Cyc]) -> Result<Vec<Cyc>, TheoryError> {
    xs.iter()
        .map(|x| field.embed(x).map_err(TheoryError::from))
        .collect()
}

fn embed_map(
    field: &CyclotomicField,
    m: &HashMap<u64, Cyc>,
) -> Result<HashMap<u64, Cyc>, TheoryError> {
    m.iter().map(|(k, x)| Ok((*k, field.embed(x)?))).collect()
}

fn embed_matrix(field: &CyclotomicField, m: &Matrix) -> Result<Matrix, TheoryError> {
    Ok(m.map(|x| field.embed(x))?)
}

impl RawTheory {
    /// The same data in Q(ζ_n), n a multiple of the current conductor.
    fn embedded(self, n: u32) -> Result<RawTheory, TheoryError> {
        let field = CyclotomicField::new(n)?;
        let dims = embed_all(&field, &self.dims)?;
        let twists = embed_all(&field, &self.twists)?;
        let structure = match self.structure {
            RawStructure::Braided { f, r, weights } => {
                let f = match f {
                    RawF::Stored(blocks) => {
                        let mut out = HashMap::new();
                        for (k, blk) in blocks {
                            let m = embed_matrix(&field, &blk.matrix)?;
                            out.insert(k, FMatrix::new(blk.rows, blk.cols, m, &field));
                        }
                        RawF::Stored(out)
                    }
                    RawF::Blocks(_) | RawF::Lazy(_) => {
                        return Err(TheoryError::Internal(format!(
                            "{}: F-symbols were prepared in a field without D",
                            self.name
                        )))
                    }
                };
                RawStructure::Braided {
                    f,
                    r: embed_map(&field, &r)?,
                    weights: embed_map(&field, &weights)?,
                }
            }
            RawStructure::ModularData { s } => RawStructure::ModularData {
                s: embed_matrix(&field, &s)?,
            },
        };
        Ok(RawTheory {
            field,
            dims,
            twists,
            structure,
            ..self
        })
    }
}

/// The conductor a theory with these dimensions and twists needs (a multiple of the field's).
pub(crate) fn conductor_for(
    name: &str,
    field: &CyclotomicField,
    dims: &[Cyc],
    twists: &[Cyc],
) -> Result<u32, TheoryError> {
    required_conductor(field, dims, twists).map_err(|reason| TheoryError::NotModular {
        theory: name.to_string(),
        reason,
    })
}

/// Compute the derived data and build the theory.
pub(crate) fn assemble(raw: RawTheory) -> Result<Theory, TheoryError> {
    let rank = raw.labels.len();
    if raw.dims.len() != rank || raw.twists.len() != rank || raw.fusion.rank() != rank {
        return Err(TheoryError::Internal(format!(
            "{}: label, dimension and twist counts differ",
            raw.name
        )));
    }
    let modular_s00 = match &raw.structure {
        RawStructure::ModularData { s } => Some(s.get(0, 0).clone()),
        RawStructure::Braided { .. } => None,
    };
    let raw = match modular_s00 {
        Some(_) => raw,
        None => {
            let needed = conductor_for(&raw.name, &raw.field, &raw.dims, &raw.twists)?;
            if needed != raw.field.conductor() {
                raw.embedded(needed)?
            } else {
                raw
            }
        }
    };
    let field = raw.field;
    let gauss = match &modular_s00 {
        Some(s00) => gauss_from_s(&field, s00, &raw.dims, &raw.twists),
        None => gauss_data(&field, &raw.dims, &raw.twists),
    }
    .map_err(|reason| TheoryError::NotModular {
        theory: raw.name.clone(),
        reason,
    })?;
    let (braiding, weights, s_tilde) = match raw.structure {
        RawStructure::Braided { f, r, weights } => {
            let s_tilde = hopf_link(&field, &raw.fusion, &raw.dims, &r);
            let mut cells = HashMap::new();
            let source = match f {
                RawF::Stored(mut blocks) => {
                    for (a, b, c, d) in admissible_blocks(&raw.fusion) {
                        let key = key4(rank, a, b, c, d);
                        let forward = blocks.remove(&key).ok_or_else(|| {
                            TheoryError::Internal(format!(
                                "{}: no F-block for ({a}, {b}, {c}, {d})",
                                raw.name
                            ))
                        })?;
                        let inverse = invert(&field, &forward.matrix).map(|m| {
                            FMatrix::new(forward.cols.clone(), forward.rows.clone(), m, &field)
                        });
                        let cell = OnceLock::new();
                        cell.set(Box::new(FBlock { forward, inverse }))
                            .expect("fresh cell");
                        cells.insert(key, cell);
                    }
                    FSource::Stored
                }
                RawF::Blocks(mut blocks) => {
                    for (a, b, c, d) in admissible_blocks(&raw.fusion) {
                        let key = key4(rank, a, b, c, d);
                        let block = blocks.remove(&key).ok_or_else(|| {
                            TheoryError::Internal(format!(
                                "{}: no F-block for ({a}, {b}, {c}, {d})",
                                raw.name
                            ))
                        })?;
                        let cell = OnceLock::new();
                        cell.set(Box::new(block)).expect("fresh cell");
                        cells.insert(key, cell);
                    }
                    FSource::Stored
                }
                RawF::Lazy(source) => {
                    for (a, b, c, d) in admissible_blocks(&raw.fusion) {
                        cells.insert(key4(rank, a, b, c, d), OnceLock::new());
                    }
                    source
                }
            };
            let weights = weights.into_iter().filter(|(_, w)| !w.is_one()).collect();
            (Some(Braiding { cells, source, r }), weights, s_tilde)
        }
        RawStructure::ModularData { s } => {
            let s00 = field
                .inverse(s.get(0, 0))
                .ok_or_else(|| TheoryError::NotModular {
                    theory: raw.name.clone(),
                    reason: "S_00 = 0".into(),
                })?;
            let s_tilde = s.scale(&field, &s00)?;
            (None, HashMap::new(), s_tilde)
        }
    };
    let inv_d = field
        .inverse(&gauss.total_dim)
        .expect("D² = Σ d_a² ≠ 0 was checked");
    let s = s_tilde.scale(&field, &inv_d)?;
    Ok(Theory {
        name: raw.name,
        zero: field.zero(),
        one: field.one(),
        field,
        labels: raw.labels,
        fusion: raw.fusion,
        dims: raw.dims,
        twists: raw.twists,
        braiding,
        weights,
        s_tilde,
        s,
        total_dim: gauss.total_dim,
        gauss_phase: gauss.phase,
        central: gauss.central,
        hash: OnceLock::new(),
    })
}
