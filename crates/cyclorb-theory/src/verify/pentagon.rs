//! The pentagon equation, proved with word-sized residues instead of field arithmetic.
//!
//! For non-vacuum a, b, c, d and every admissible e, f, g, h, k the check is
//!
//! x = [F^{fcd}_e]_{gh} [F^{abh}_e]_{fk} − Σ_l [F^{abc}_g]_{fl} [F^{ald}_e]_{gk} [F^{bcd}_k]_{lh} = 0.
//!
//! Every F-entry a = A/d has d·a ∈ Z[ζ_n] and |σ(a)| ≤ ‖A‖₁/d under every embedding σ. With
//! D the lcm of the entries' denominators, L the largest ⌈‖A‖₁/d⌉ and m the largest number
//! of columns of a block (so at most m terms in the sum), every instance satisfies
//! D³·x ∈ Z[ζ_n] and |σ(D³·x)| ≤ B = D³·L²·(1 + m·L). The entries are reduced once modulo
//! enough prime ideals 𝔭_i of degree one (none dividing D) that Π N(𝔭_i) > B^[K:Q]
//! ([`cyclorb_field::ResidueMap`]), where K is the fixed field of the Galois automorphisms
//! fixing every entry (so x ∈ K; the 𝔭_i restrict to distinct primes of K); then x ≡ 0 at
//! every 𝔭_i proves x = 0 (its norm N_K(D³x) would be a non-zero integer of absolute value at
//! most B^[K:Q] divisible by Π N(𝔭_i)), and a non-zero residue proves x ≠ 0.
//! An entry outside a block's row and column labels is zero (the labels are exactly the
//! admissible ones). So the check is exact either way, and each term costs E word products instead of one
//! product in Q(ζ_n). A failing instance is then evaluated in the field, so the report shows
//! both exact sides.

use cyclorb_field::{Cyc, CyclotomicField, ResidueMap};
use num_bigint::{BigInt, BigUint};
use num_traits::One;

use crate::arith::SameField;
use crate::fmatrix::FMatrix;
use crate::theory::Theory;
use crate::verify::residue::EntryBounds;
use crate::verify::{Check, CheckId, Tally};

/// Every F-block of the theory reduced modulo the ideals of a [`ResidueMap`].
struct ResidueBlocks {
    residues: ResidueMap,
    rank: usize,
    /// For each (a, b, c, d) in mixed radix, the index into `blocks`.
    index: Vec<Option<u32>>,
    blocks: Vec<ResidueBlock>,
    /// E zeros, the residues of an inadmissible entry.
    zero: Vec<u64>,
}

/// One block: its column labels, the position of every label among its rows and columns
/// ([`ABSENT`] when not there), and its entries' residues, entry (i, j) at
/// `data[(i·cols + j)·E ..][..E]`.
struct ResidueBlock {
    cols: Vec<usize>,
    row_position: Vec<u32>,
    col_position: Vec<u32>,
    data: Vec<u64>,
}

/// The position of a label that is not a row (column) of a block.
const ABSENT: u32 = u32::MAX;

/// For each label below `rank`, its position in the sorted list `labels`, or [`ABSENT`].
fn positions(labels: &[usize], rank: usize) -> Vec<u32> {
    let mut out = vec![ABSENT; rank];
    for (i, &l) in labels.iter().enumerate() {
        out[l] = i as u32;
    }
    out
}

/// The F-entries' bounds (D, L and the fixing group, [`EntryBounds`]) and m, the most
/// columns of a block.
fn entry_bounds(t: &Theory) -> (EntryBounds, usize) {
    let blocks: Vec<&FMatrix> = t
        .f_block_labels()
        .into_iter()
        .filter_map(|(a, b, c, d)| t.f_block(a, b, c, d))
        .collect();
    let columns = blocks.iter().map(|b| b.cols.len()).max().unwrap_or(1);
    let entries = blocks
        .iter()
        .flat_map(|b| (0..b.rows.len()).flat_map(|i| b.matrix.row(i)));
    (EntryBounds::of(t.field(), entries), columns)
}

impl ResidueBlocks {
    fn new(t: &Theory) -> ResidueBlocks {
        let (
            EntryBounds {
                lcm,
                largest,
                fixing,
            },
            columns,
        ) = entry_bounds(t);
        let lcm_cubed = lcm.pow(3);
        let bound = &lcm_cubed * &largest * &largest * (BigUint::one() + columns * &largest);
        let residues = t.field().residue_map(&bound, &BigInt::from(lcm), &fixing);
        let e = residues.len();
        let r = t.rank();
        let mut index = vec![None; r * r * r * r];
        let mut blocks = Vec::new();
        for (a, b, c, d) in t.f_block_labels() {
            let Some(block) = t.f_block(a, b, c, d) else {
                continue;
            };
            let mut data = vec![0; block.rows.len() * block.cols.len() * e];
            for i in 0..block.rows.len() {
                for (j, x) in block.matrix.row(i).iter().enumerate() {
                    let at = (i * block.cols.len() + j) * e;
                    residues
                        .reduce_into(x, &mut data[at..at + e])
                        .expect("the ideals avoid every denominator of the theory's field");
                }
            }
            index[((a * r + b) * r + c) * r + d] = Some(blocks.len() as u32);
            blocks.push(ResidueBlock {
                cols: block.cols.clone(),
                row_position: positions(&block.rows, r),
                col_position: positions(&block.cols, r),
                data,
            });
        }
        ResidueBlocks {
            zero: vec![0; e],
            residues,
            rank: r,
            index,
            blocks,
        }
    }

    fn block(&self, a: usize, b: usize, c: usize, d: usize) -> Option<&ResidueBlock> {
        let r = self.rank;
        self.index[((a * r + b) * r + c) * r + d].map(|i| &self.blocks[i as usize])
    }

    /// The residues of entry (row label, column label) of `block`; zeros when absent.
    fn entry<'s>(&'s self, block: Option<&'s ResidueBlock>, row: usize, col: usize) -> &'s [u64] {
        let e = self.residues.len();
        block
            .and_then(|blk| {
                let (i, j) = (blk.row_position[row], blk.col_position[col]);
                if i == ABSENT || j == ABSENT {
                    return None;
                }
                let at = (i as usize * blk.cols.len() + j as usize) * e;
                Some(&blk.data[at..at + e])
            })
            .unwrap_or(&self.zero)
    }
}

/// The labels (a, b, c, d, e, f, g, h, k) of one pentagon instance.
type Instance = [usize; 9];

/// The pentagon for all non-vacuum a, b, c, d, split over the available cores by a.
pub(crate) fn pentagon(t: &Theory) -> Check {
    let r = t.rank();
    let blocks = ResidueBlocks::new(t);
    let threads = std::thread::available_parallelism()
        .map_or(1, |n| n.get())
        .clamp(1, r.max(1));
    let results: Vec<(usize, Option<Instance>)> = std::thread::scope(|scope| {
        let handles: Vec<_> = (0..threads)
            .map(|worker| {
                let blocks = &blocks;
                scope.spawn(move || {
                    let mut instances = 0;
                    for a in (1 + worker..r).step_by(threads) {
                        let failure = pentagon_at(t, blocks, a, &mut instances);
                        if failure.is_some() {
                            return (instances, failure);
                        }
                    }
                    (instances, None)
                })
            })
            .collect();
        handles
            .into_iter()
            .map(|h| h.join().expect("a pentagon worker panicked"))
            .collect()
    });
    let mut tally = Tally::new(CheckId::Pentagon);
    let instances: usize = results.iter().map(|(n, _)| n).sum();
    let failure = results.into_iter().filter_map(|(_, f)| f).min();
    tally.add_instances(instances.saturating_sub(1));
    tally.record(failure.is_none(), || {
        failure
            .map(|at| describe_failure(t, at))
            .unwrap_or_default()
    });
    tally.finish()
}

/// Paths of a fusion tree with three internal labels, as (outer, middle, inner) triples
/// sorted by (outer, middle): for the left side ((ab)_f c)_g d → e these are (e, g, f), for
/// the right side a(b(cd)_h)_k → e they are (e, k, h).
fn paths(t: &Theory, x: usize, y: usize, z: usize, w: usize, left: bool) -> Vec<[usize; 3]> {
    let out = |p: usize, q: usize| t.fusion_outcomes(p, q);
    let mut triples = Vec::new();
    if left {
        for &f in out(x, y) {
            for &g in out(f, z) {
                for &e in out(g, w) {
                    triples.push([e, g, f]);
                }
            }
        }
    } else {
        for &h in out(z, w) {
            for &k in out(y, h) {
                for &e in out(x, k) {
                    triples.push([e, k, h]);
                }
            }
        }
    }
    triples.sort_unstable();
    triples
}

/// Groups of consecutive triples with equal (outer, middle): ((outer, middle), inner labels).
fn groups(triples: &[[usize; 3]]) -> Vec<((usize, usize), Vec<usize>)> {
    let mut out: Vec<((usize, usize), Vec<usize>)> = Vec::new();
    for &[o, m, i] in triples {
        match out.last_mut() {
            Some((key, inner)) if *key == (o, m) => inner.push(i),
            _ => out.push(((o, m), vec![i])),
        }
    }
    out
}

/// Every pentagon instance with first label a; adds to `instances` and returns the first
/// failing instance (in the order of b, c, d, e, g, k, f, h).
///
/// For fixed (e, g, k) the sums run over the columns l of F^{abc}_g; the factors are copied
/// ideal-major (all l for ideal 0, then ideal 1, …) so that each ideal's sum is one
/// contiguous dot product: m[i][l] = [F^{ald}_e]_{gk}, column[h][i][l] = [F^{bcd}_k]_{lh},
/// and for each f, row[i][l] = [F^{abc}_g]_{fl}·m[i][l].
fn pentagon_at(
    t: &Theory,
    blocks: &ResidueBlocks,
    a: usize,
    instances: &mut usize,
) -> Option<Instance> {
    let res = &blocks.residues;
    let ideals = res.len();
    let r = t.rank();
    let mut m = Vec::new();
    let mut row = Vec::new();
    let mut columns = Vec::new();
    for b in 1..r {
        for c in 1..r {
            for d in 1..r {
                let left = groups(&paths(t, a, b, c, d, true));
                let right = groups(&paths(t, a, b, c, d, false));
                for ((e, g), fs) in &left {
                    let (e, g) = (*e, *g);
                    let Some(f_abc_g) = blocks.block(a, b, c, g) else {
                        continue;
                    };
                    let cols = &f_abc_g.cols;
                    let width = cols.len();
                    for ((_, k), hs) in right.iter().filter(|((e2, _), _)| *e2 == e) {
                        let k = *k;
                        let f_bcd_k = blocks.block(b, c, d, k);
                        m.clear();
                        m.resize(ideals * width, 0);
                        for (li, &l) in cols.iter().enumerate() {
                            let x = blocks.entry(blocks.block(a, l, d, e), g, k);
                            for (i, &v) in x.iter().enumerate() {
                                m[i * width + li] = v;
                            }
                        }
                        columns.clear();
                        columns.resize(hs.len() * ideals * width, 0);
                        for (hi, &h) in hs.iter().enumerate() {
                            for (li, &l) in cols.iter().enumerate() {
                                let x = blocks.entry(f_bcd_k, l, h);
                                for (i, &v) in x.iter().enumerate() {
                                    columns[(hi * ideals + i) * width + li] = v;
                                }
                            }
                        }
                        for &f in fs {
                            row.clear();
                            row.resize(ideals * width, 0);
                            for (li, &l) in cols.iter().enumerate() {
                                let x = blocks.entry(Some(f_abc_g), f, l);
                                for (i, &v) in x.iter().enumerate() {
                                    row[i * width + li] = res.mul_at(i, v, m[i * width + li]);
                                }
                            }
                            let f_fcd_e = blocks.block(f, c, d, e);
                            for (hi, &h) in hs.iter().enumerate() {
                                let x = blocks.entry(f_fcd_e, g, h);
                                let y = blocks.entry(blocks.block(a, b, h, e), f, k);
                                *instances += 1;
                                let holds = (0..ideals).all(|i| {
                                    let column = &columns[(hi * ideals + i) * width..][..width];
                                    let rhs = res.dot_at(i, &row[i * width..][..width], column);
                                    res.mul_at(i, x[i], y[i]) == rhs
                                });
                                if !holds {
                                    return Some([a, b, c, d, e, f, g, h, k]);
                                }
                            }
                        }
                    }
                }
            }
        }
    }
    None
}

/// Both sides of one instance in the field, with its labels, for the report.
fn describe_failure(t: &Theory, at: Instance) -> String {
    let [a, b, c, d, e, f, g, h, k] = at;
    let field: &CyclotomicField = t.field();
    let entry = |p, q, s, u, row, col| t.f_symbol(p, q, s, u, row, col);
    let lhs = field.times(&entry(f, c, d, e, g, h), &entry(a, b, h, e, f, k));
    let columns = t
        .f_block(a, b, c, g)
        .map(|m| m.cols.clone())
        .unwrap_or_default();
    let terms: Vec<Cyc> = columns
        .iter()
        .map(|&l| {
            field.product([
                &entry(a, b, c, g, f, l),
                &entry(a, l, d, e, g, k),
                &entry(b, c, d, k, l, h),
            ])
        })
        .collect();
    let rhs = terms
        .iter()
        .fold(field.zero(), |acc, x| field.plus(&acc, x));
    let names = ["a", "b", "c", "d", "e", "f", "g", "h", "k"]
        .iter()
        .zip(at)
        .map(|(name, x)| format!("{name}={}", t.label(x)))
        .collect::<Vec<_>>()
        .join(" ");
    format!("at {names}: left side {lhs}, right side {rhs}")
}
