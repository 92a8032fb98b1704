//! Accumulating B = Σ v v† over a saturated orbit, in machine integers where possible.
//!
//! For a line with key S = D·w, v v† = N·E·S S†/q with q = E·⟨S, S⟩_G ∈ Z[ζ_n] (G = G'/E, G'
//! integral; see [`crate::poincare`]). Lines are grouped by q in a first pass; the second pass
//! adds, group by group, the unreduced products S_i·conj(S_j) (i ≤ j, 2φ − 1 coefficients
//! each) into one `i64` accumulator per thread, and flushes it, multiplied by N·E/q, into an
//! exact `Cyc` matrix at the end of the group (or earlier, when its running bound nears
//! 2^62). Grouping keeps a single accumulator hot in cache. Lines whose numbers defeat the
//! bounds, and big keys, take the `Cyc` route directly. The grouping is done over passes of
//! at most [`lines_per_pass`] lines, so that its table of q values stays a bounded share of
//! the memory budget however many lines have distinct q. Addition is exact, so neither the
//! grouping, the passes nor the number of threads changes the result.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;
use std::collections::hash_map::DefaultHasher;
use std::hash::{Hash, Hasher};
use std::ops::Range;

use hashbrown::HashTable;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive};

use crate::error::{joined, OrbitError};
use crate::problem::OrbitProblem;
use crate::sparse_numerators::SparseNumerators;
use crate::store::{KeyArena, StoredKey};
use cyclorb_field::PolyKernel;

/// The integer form of G: G = G'/E with G' integral.
struct IntegerForm {
    scale: Cyc,
    /// How ⟨S, S⟩_G is formed in machine words.
    entries: FormEntries,
}

enum FormEntries {
    /// G = identity: q = Σ_i S_i conj(S_i).
    Identity,
    /// Multiplication matrices of G'_i (φ×φ).
    Integral(Vec<Vec<i128>>),
    /// G' does not fit machine words: every line takes the `Cyc` route.
    TooLarge,
}

fn integer_form(
    field: &CyclotomicField,
    kernel: &PolyKernel,
    g: &[Cyc],
) -> Result<IntegerForm, OrbitError> {
    if g.iter().all(Cyc::is_one) {
        return Ok(IntegerForm {
            scale: field.one(),
            entries: FormEntries::Identity,
        });
    }
    let lcd = g
        .iter()
        .fold(BigInt::one(), |acc, x| acc.lcm(&x.to_big_parts().1));
    let phi = kernel.degree();
    let scale = field.big_rational(&lcd, &BigInt::one())?;
    let mut entries = Vec::with_capacity(g.len());
    for x in g {
        let (num, den) = x.to_big_parts();
        let factor = &lcd / den;
        let scaled: Option<Vec<i64>> = num.iter().map(|c| (c * &factor).to_i64()).collect();
        let mut m = vec![0i128; phi * phi];
        match scaled.and_then(|s| kernel.mult_matrix(&s, &mut m)) {
            Some(()) => entries.push(m),
            None => {
                return Ok(IntegerForm {
                    scale,
                    entries: FormEntries::TooLarge,
                })
            }
        }
    }
    Ok(IntegerForm {
        scale,
        entries: FormEntries::Integral(entries),
    })
}

/// One non-zero block of a key: its index and its coefficient ranges.
struct BlockEntries {
    block: usize,
    s: std::ops::Range<usize>,
    c: std::ops::Range<usize>,
}

/// Reads one line at a time: its non-zero coefficients, those of its conjugate, and q.
struct LineReader<'a> {
    problem: &'a OrbitProblem,
    form: &'a IntegerForm,
    key: SparseNumerators,
    /// conj(S_i) of one block.
    conj_block: Vec<i64>,
    blocks: Vec<BlockEntries>,
    /// (position in block, value) of the non-zero coefficients of S_i and of conj(S_i).
    s_list: Vec<(usize, i64)>,
    c_list: Vec<(usize, i64)>,
    q: Vec<i128>,
    product: Vec<i128>,
    folded: Vec<i128>,
}

impl<'a> LineReader<'a> {
    fn new(problem: &'a OrbitProblem, form: &'a IntegerForm) -> Self {
        let len = problem.key_len();
        let phi = problem.kernel.degree();
        LineReader {
            problem,
            form,
            key: SparseNumerators::new(len),
            conj_block: vec![0; phi],
            blocks: Vec::new(),
            s_list: Vec::new(),
            c_list: Vec::new(),
            q: vec![0; phi],
            product: vec![0; 2 * phi - 1],
            folded: vec![0; phi],
        }
    }

    /// Load line `index` (and its q when `with_q`); the bound on every coefficient of one
    /// product S_i·conj(S_j), or `None` when the line must take the `Cyc` route.
    fn load(
        &mut self,
        keys: &KeyArena,
        index: usize,
        with_q: bool,
    ) -> Result<Option<u128>, OrbitError> {
        if matches!(self.form.entries, FormEntries::TooLarge) {
            return Ok(None);
        }
        if let StoredKey::Big(_) = keys.get(index, &mut self.key) {
            return Ok(None);
        }
        let kernel = &self.problem.kernel;
        let phi = kernel.degree();
        let max = self.key.max;
        let term_bound = (phi as u128)
            .checked_mul(max as u128)
            .and_then(|x| x.checked_mul(kernel.conj_bound(max)));
        let Some(term_bound) = term_bound.filter(|&b| b < 1 << 60) else {
            return Ok(None);
        };
        self.blocks.clear();
        self.s_list.clear();
        self.c_list.clear();
        let block_of = &self.problem.block_of;
        let slot_of = &self.problem.slot_of;
        let nonzero = &self.key.nonzero;
        let mut cursor = 0;
        while cursor < nonzero.len() {
            let block = block_of[nonzero[cursor] as usize] as usize;
            let s_start = self.s_list.len();
            while cursor < nonzero.len() && block_of[nonzero[cursor] as usize] as usize == block {
                let at = nonzero[cursor] as usize;
                self.s_list.push((slot_of[at] as usize, self.key.dense[at]));
                cursor += 1;
            }
            // conj(S_i) from the non-zero coefficients of S_i: each entry is at most
            // conj_bound(max) < 2^60 (checked above), so i64 is exact
            let c_start = self.c_list.len();
            self.conj_block.fill(0);
            for &(s, x) in &self.s_list[s_start..] {
                for &(t, c) in kernel.conj_column(s) {
                    self.conj_block[t] += c * x;
                }
            }
            for (t, &y) in self.conj_block.iter().enumerate() {
                if y != 0 {
                    self.c_list.push((t, y));
                }
            }
            self.blocks.push(BlockEntries {
                block,
                s: s_start..self.s_list.len(),
                c: c_start..self.c_list.len(),
            });
        }
        if with_q {
            if self.form_value().is_none() {
                return Ok(None);
            }
            if self.q.iter().all(|&x| x == 0) {
                return Err(OrbitError::Invalid(
                    "a line of the orbit is isotropic for the form (⟨w, w⟩_G = 0)".into(),
                ));
            }
        }
        Ok(Some(term_bound))
    }

    /// q = Σ_i G'_i S_i conj(S_i) reduced mod Φ_n, into `self.q` (checked; `None` on
    /// overflow).
    fn form_value(&mut self) -> Option<()> {
        let kernel = &self.problem.kernel;
        let phi = kernel.degree();
        self.q.fill(0);
        for entries in &self.blocks {
            self.product.fill(0);
            for &(a, x) in &self.s_list[entries.s.clone()] {
                for &(b, y) in &self.c_list[entries.c.clone()] {
                    let cell = &mut self.product[a + b];
                    *cell = cell.checked_add((x as i128).checked_mul(y as i128)?)?;
                }
            }
            self.folded.fill(0);
            for (e, &p) in self.product.iter().enumerate() {
                if p == 0 {
                    continue;
                }
                for &(t, r) in kernel.residue(e) {
                    self.folded[t] = self.folded[t].checked_add(p.checked_mul(r as i128)?)?;
                }
            }
            match &self.form.entries {
                FormEntries::TooLarge => return None,
                FormEntries::Identity => {
                    for (acc, x) in self.q.iter_mut().zip(&self.folded) {
                        *acc = acc.checked_add(*x)?;
                    }
                }
                FormEntries::Integral(matrices) => {
                    let m = &matrices[entries.block];
                    for (t, acc) in self.q.iter_mut().enumerate() {
                        for (u, x) in self.folded.iter().enumerate() {
                            *acc = acc.checked_add(m[t * phi + u].checked_mul(*x)?)?;
                        }
                    }
                }
            }
        }
        Some(())
    }

    /// sums += S_i·conj(S_j) for the loaded line (i ≤ j, upper triangle in row order).
    fn add_products(&self, sums: &mut [i64], row_start: &[usize]) {
        let wide = 2 * self.problem.kernel.degree() - 1;
        for (a, bi) in self.blocks.iter().enumerate() {
            for bj in &self.blocks[a..] {
                let cell = row_start[bi.block] + bj.block - bi.block;
                let out = &mut sums[cell * wide..(cell + 1) * wide];
                for &(s, x) in &self.s_list[bi.s.clone()] {
                    for &(t, y) in &self.c_list[bj.c.clone()] {
                        out[s + t] += x * y;
                    }
                }
            }
        }
    }
}

/// One thread's share of B: an exact upper triangle and one integer accumulator.
struct Accumulator<'a> {
    problem: &'a OrbitProblem,
    form: &'a IntegerForm,
    /// N·E.
    factor_numerator: Cyc,
    /// Index of pair (i, i) in the upper triangle; pair (i, j) is at row_start[i] + j − i.
    row_start: Vec<usize>,
    sums: Vec<i64>,
    bound: u128,
    /// Upper triangle of the exact part of B, row-major d×d (lower entries unused).
    exact: Vec<Cyc>,
}

impl<'a> Accumulator<'a> {
    fn new(problem: &'a OrbitProblem, form: &'a IntegerForm, factor_numerator: Cyc) -> Self {
        let d = problem.dimension();
        let wide = 2 * problem.kernel.degree() - 1;
        Accumulator {
            problem,
            form,
            factor_numerator,
            row_start: (0..d)
                .map(|i| i * d - i * i.saturating_sub(1) / 2)
                .collect(),
            sums: vec![0; d * (d + 1) / 2 * wide],
            bound: 0,
            exact: vec![problem.field.zero(); d * d],
        }
    }

    /// Add (N·E/q)·sums to the exact part and clear the sums.
    fn flush(&mut self, q: &[i128]) -> Result<(), OrbitError> {
        if self.bound == 0 {
            return Ok(());
        }
        let field = &self.problem.field;
        let kernel = &self.problem.kernel;
        let one = BigInt::one();
        let q_big: Vec<BigInt> = q.iter().map(|&x| BigInt::from(x)).collect();
        let factor = field.div(&self.factor_numerator, &field.from_parts(&q_big, &one)?)?;
        let d = self.problem.dimension();
        let wide = 2 * kernel.degree() - 1;
        let mut chunks = self.sums.chunks_mut(wide);
        for i in 0..d {
            for j in i..d {
                let Some(chunk) = chunks.next() else {
                    continue;
                };
                if chunk.iter().all(|&x| x == 0) {
                    continue;
                }
                let big: Vec<BigInt> = chunk.iter().map(|&x| BigInt::from(x)).collect();
                chunk.fill(0);
                let value = field.from_parts(&kernel.fold_big(&big), &one)?;
                let acc = &mut self.exact[i * d + j];
                *acc = field.add(acc, &field.mul(&value, &factor)?)?;
            }
        }
        self.bound = 0;
        Ok(())
    }

    /// Add a loaded line (of this group's q) to the integer sums.
    fn add(&mut self, reader: &LineReader, term_bound: u128, q: &[i128]) -> Result<(), OrbitError> {
        if self.bound + term_bound >= 1 << 62 {
            self.flush(q)?;
        }
        self.bound += term_bound;
        reader.add_products(&mut self.sums, &self.row_start);
        Ok(())
    }

    /// The `Cyc` route: c = N/⟨w, w⟩_G and B += c·w w† (upper triangle).
    fn add_exact(&mut self, keys: &KeyArena, index: usize) -> Result<(), OrbitError> {
        let problem = self.problem;
        let field = &problem.field;
        let w = keys.key(index).to_line(field, problem.kernel.degree())?;
        let g = problem.generators.form_diagonal();
        let wnorm = problem.form_norm(&w, &g)?;
        if wnorm.is_zero() {
            return Err(OrbitError::Invalid(
                "a line of the orbit is isotropic for the form (⟨w, w⟩_G = 0)".into(),
            ));
        }
        let norm = field.div(&self.factor_numerator, &self.form.scale)?;
        let c = field.div(&norm, &wnorm)?;
        let d = problem.dimension();
        let conj: Vec<Cyc> = w.iter().map(|x| field.conj(x)).collect();
        for (i, wi) in w.iter().enumerate() {
            if wi.is_zero() {
                continue;
            }
            let cw = field.mul(&c, wi)?;
            for (j, cj) in conj.iter().enumerate().skip(i) {
                if !cj.is_zero() {
                    let acc = &mut self.exact[i * d + j];
                    *acc = field.add(acc, &field.mul(&cw, cj)?)?;
                }
            }
        }
        Ok(())
    }
}

fn split_range(len: usize, parts: usize) -> Vec<std::ops::Range<usize>> {
    let parts = parts.clamp(1, len.max(1));
    (0..parts)
        .map(|p| len * p / parts..len * (p + 1) / parts)
        .collect()
}

/// Lines grouped by q: the distinct values, the lines of each (ascending), the `Cyc` lines.
struct Groups {
    values: Vec<Vec<i128>>,
    start: Vec<usize>,
    members: Vec<u32>,
    exact: Vec<u32>,
}

/// Marks a line that takes the `Cyc` route in the first pass.
const EXACT_LINE: u32 = u32::MAX;

/// Pass 1: the q of every line of `lines`, interned per thread (each distinct q held
/// once), merged in line order; line numbers in the groups are indices into `keys`.
fn group_lines(
    problem: &OrbitProblem,
    form: &IntegerForm,
    keys: &KeyArena,
    lines: Range<usize>,
    threads: usize,
) -> Result<Groups, OrbitError> {
    let parts = split_range(lines.len(), threads);
    type Local = (Vec<Vec<i128>>, Vec<u32>);
    let locals: Vec<Result<Local, OrbitError>> = std::thread::scope(|scope| {
        let handles: Vec<_> = parts
            .iter()
            .map(|range| {
                let range = lines.start + range.start..lines.start + range.end;
                scope.spawn(move || {
                    let mut reader = LineReader::new(problem, form);
                    let mut interned = Interned::default();
                    let mut line_ids = Vec::with_capacity(range.len());
                    for index in range {
                        if reader.load(keys, index, true)?.is_none() {
                            line_ids.push(EXACT_LINE);
                            continue;
                        }
                        let id = interned.find(&reader.q);
                        line_ids.push(id.unwrap_or_else(|| interned.add(reader.q.clone())));
                    }
                    Ok((interned.values, line_ids))
                })
            })
            .collect();
        handles.into_iter().map(joined).collect()
    });
    let mut global = Interned::default();
    let mut line_ids: Vec<u32> = Vec::with_capacity(lines.len());
    for local in locals {
        let (local_values, local_ids) = local?;
        let map: Vec<u32> = local_values
            .into_iter()
            .map(|q| global.find(&q).unwrap_or_else(|| global.add(q)))
            .collect();
        line_ids.extend(local_ids.into_iter().map(|id| {
            if id == EXACT_LINE {
                id
            } else {
                map[id as usize]
            }
        }));
    }
    let values = global.values;
    let mut start = vec![0usize; values.len() + 1];
    for &id in &line_ids {
        if id != EXACT_LINE {
            start[id as usize + 1] += 1;
        }
    }
    for g in 0..values.len() {
        start[g + 1] += start[g];
    }
    let mut fill = start.clone();
    let mut members = vec![0u32; start[values.len()]];
    let mut exact = Vec::new();
    for (offset, &id) in line_ids.iter().enumerate() {
        let index = (lines.start + offset) as u32;
        if id == EXACT_LINE {
            exact.push(index);
        } else {
            members[fill[id as usize]] = index;
            fill[id as usize] += 1;
        }
    }
    Ok(Groups {
        values,
        start,
        members,
        exact,
    })
}

/// Distinct values of q, each held once, with a table from a value to its number.
#[derive(Default)]
struct Interned {
    values: Vec<Vec<i128>>,
    table: HashTable<u32>,
}

impl Interned {
    /// The number of `q`, if it is there.
    fn find(&self, q: &[i128]) -> Option<u32> {
        let values = &self.values;
        self.table
            .find(hash_of(q), |&i| values[i as usize] == q)
            .copied()
    }

    /// Add a value that is not there yet; its number.
    fn add(&mut self, q: Vec<i128>) -> u32 {
        let id = self.values.len() as u32;
        let hash = hash_of(&q);
        self.values.push(q);
        let values = &self.values;
        self.table
            .insert_unique(hash, id, |&i| hash_of(&values[i as usize]));
        id
    }
}

/// A hash of a value of q (for the interning table only; equality decides).
fn hash_of(q: &[i128]) -> u64 {
    let mut h = DefaultHasher::new();
    q.hash(&mut h);
    h.finish()
}

/// Lines per grouping pass: the grouping holds up to one q (φ words of 16 bytes) and two
/// line numbers per line, so passes are sized to keep it within an eighth of the process's
/// memory budget (between 16 MiB and 1 GiB). Passes only change the order of exact
/// additions, never B.
fn lines_per_pass(problem: &OrbitProblem) -> usize {
    let share = (cyclorb_field::memory_budget() / 8).clamp(16 << 20, 1 << 30);
    let per_line = 16 * problem.kernel.degree() as u64 + 48;
    usize::try_from(share / per_line)
        .unwrap_or(usize::MAX)
        .max(1024)
}

/// How the sum is split up; the default is the automatic choice. Tests force tiny values
/// to show that the split never changes B.
#[derive(Debug, Clone, Copy, Default)]
pub(crate) struct Tuning {
    /// Flush the integer sums after this many lines of a group.
    pub(crate) flush_every: Option<usize>,
    /// Lines per grouping pass (default [`lines_per_pass`]).
    pub(crate) lines_per_pass: Option<usize>,
}

/// B = Σ v v† over the lines of `keys`, for the form diagonal `g` and seed norm `norm`, on
/// `threads` threads.
pub(crate) fn sum_matrix(
    problem: &OrbitProblem,
    keys: &KeyArena,
    threads: usize,
    g: &[Cyc],
    norm: &Cyc,
    tuning: Tuning,
) -> Result<Matrix, OrbitError> {
    let field = &problem.field;
    let form = integer_form(field, &problem.kernel, g)?;
    let factor_numerator = field.mul(norm, &form.scale)?;
    let threads = threads.max(1);
    let d = problem.dimension();
    let mut upper = vec![field.zero(); d * d];
    let pass = tuning
        .lines_per_pass
        .unwrap_or_else(|| lines_per_pass(problem))
        .max(1);
    for start in (0..keys.len()).step_by(pass) {
        let lines = start..keys.len().min(start + pass);
        let groups = group_lines(problem, &form, keys, lines, threads)?;
        let part = sum_groups(
            problem,
            &form,
            keys,
            &groups,
            threads,
            &factor_numerator,
            tuning.flush_every,
        )?;
        for (acc, x) in upper.iter_mut().zip(part) {
            if !x.is_zero() {
                *acc = field.add(acc, &x)?;
            }
        }
    }
    let mut b = Matrix::zeros(field, d, d);
    for i in 0..d {
        for j in i..d {
            let x = &upper[i * d + j];
            b.set(i, j, x.clone());
            if i != j {
                b.set(j, i, field.conj(x));
            }
        }
    }
    Ok(b)
}

/// Pass 2 over one grouping: the upper triangle of Σ v v† over its lines, on `threads`
/// threads, each adding its share of every group.
fn sum_groups(
    problem: &OrbitProblem,
    form: &IntegerForm,
    keys: &KeyArena,
    groups: &Groups,
    threads: usize,
    factor_numerator: &Cyc,
    flush_every: Option<usize>,
) -> Result<Vec<Cyc>, OrbitError> {
    let field = &problem.field;
    let d = problem.dimension();
    let results: Vec<Result<Vec<Cyc>, OrbitError>> = std::thread::scope(|scope| {
        let handles: Vec<_> = (0..threads)
            .map(|t| {
                let factor = factor_numerator.clone();
                scope.spawn(move || {
                    let mut reader = LineReader::new(problem, form);
                    let mut acc = Accumulator::new(problem, form, factor);
                    for (q, bounds) in groups.values.iter().zip(groups.start.windows(2)) {
                        let lines = &groups.members[bounds[0]..bounds[1]];
                        let part = &split_range(lines.len(), threads)
                            .get(t)
                            .map_or(&lines[..0], |r| &lines[r.clone()]);
                        for (count, &index) in part.iter().enumerate() {
                            let term_bound =
                                reader.load(keys, index as usize, false)?.ok_or_else(|| {
                                    OrbitError::Arithmetic(
                                        "a line changed route between passes".into(),
                                    )
                                })?;
                            acc.add(&reader, term_bound, q)?;
                            if flush_every.is_some_and(|k| (count + 1) % k.max(1) == 0) {
                                acc.flush(q)?;
                            }
                        }
                        acc.flush(q)?;
                    }
                    if let Some(r) = split_range(groups.exact.len(), threads).get(t) {
                        for &index in &groups.exact[r.clone()] {
                            acc.add_exact(keys, index as usize)?;
                        }
                    }
                    Ok(acc.exact)
                })
            })
            .collect();
        handles.into_iter().map(joined).collect()
    });
    let mut upper = vec![field.zero(); d * d];
    for part in results {
        for (acc, x) in upper.iter_mut().zip(part?) {
            if !x.is_zero() {
                *acc = field.add(acc, &x)?;
            }
        }
    }
    Ok(upper)
}
