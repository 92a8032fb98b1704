//! One step of the search: the image of a stored line under one generator, and whether
//! that line is already known.
//!
//! Fast path (machine integers): U = (E·X)·S from the integer form of the generator, its
//! fingerprint from U directly ([`crate::fingerprint`]), and for each stored candidate with
//! that fingerprint an exact test of U ∝ S': with D' the denominator of S' (its entry at the
//! first non-zero block k), the lines agree exactly when S' and U have the same first
//! non-zero block k and D'·U_i = U_k·S'_i for every i > k. No field inversion is needed
//! unless the line is new, when its key is computed ([`crate::key`]).
//!
//! Exact path (any size): the generator is applied to w = S/D in `Cyc` arithmetic, the image
//! is normalised to its key, and keys are compared number by number. It is taken whenever a
//! bound of the fast path fails, so results never depend on which path ran.
//!
//! Lines are looked up in the store and then among the new lines already found by the same
//! worker ([`Pending`]), so a worker normalises each new line once.

use std::borrow::Cow;

use cyclorb_field::Cyc;
use cyclorb_matrix::LinearMap;
use hashbrown::HashTable;
use num_bigint::BigInt;
use num_traits::One;

use crate::error::OrbitError;
use crate::fingerprint::bucket_hash;
use crate::key::{first_nonzero_block, key_of_integer_vector, KeyNumbers, Normaliser};
use crate::problem::OrbitProblem;
use crate::set::{Fetched, LineStore};
use crate::sparse_numerators::SparseNumerators;
use crate::store::{KeyArena, StoredKey};

/// What an image turned out to be.
pub(crate) enum Outcome {
    /// Already stored (with its index), or already found by this worker (`None`).
    Known(Option<u32>),
    /// New: its key and fingerprint.
    New { key: KeyNumbers, fingerprint: u64 },
}

/// A new line found while processing a chunk.
#[derive(Debug)]
pub(crate) struct Candidate {
    pub(crate) parent: u32,
    pub(crate) generator: u16,
    pub(crate) key: KeyNumbers,
    pub(crate) fingerprint: u64,
}

/// The non-zero positions and largest |numerator| of a pending machine-word key.
#[derive(Debug)]
struct Support {
    nonzero: Vec<u32>,
    max: u64,
}

impl Support {
    fn of(key: &KeyNumbers) -> Support {
        match key {
            KeyNumbers::Small(v) => Support {
                nonzero: (0..v.len() as u32)
                    .filter(|&i| v[i as usize] != 0)
                    .collect(),
                max: v.iter().map(|x| x.unsigned_abs()).max().unwrap_or(0),
            },
            KeyNumbers::Big(_) => Support {
                nonzero: Vec::new(),
                max: u64::MAX,
            },
        }
    }
}

/// The new lines one worker has found in its part of a chunk, in order, with a lookup table.
#[derive(Debug, Default)]
pub(crate) struct Pending {
    pub(crate) list: Vec<Candidate>,
    supports: Vec<Support>,
    table: HashTable<u32>,
}

impl Pending {
    /// Record a new line.
    pub(crate) fn push(&mut self, candidate: Candidate) {
        let index = self.list.len() as u32;
        let list = &self.list;
        self.table
            .insert_unique(bucket_hash(candidate.fingerprint), index, |&i| {
                bucket_hash(list[i as usize].fingerprint)
            });
        self.supports.push(Support::of(&candidate.key));
        self.list.push(candidate);
    }

    fn find(&self, fingerprint: u64, mut same: impl FnMut(&KeyNumbers, &Support) -> bool) -> bool {
        self.table
            .find(bucket_hash(fingerprint), |&i| {
                let c = &self.list[i as usize];
                c.fingerprint == fingerprint && same(&c.key, &self.supports[i as usize])
            })
            .is_some()
    }
}

/// Per-thread scratch space, reused for every image.
pub(crate) struct Workspace {
    phi: usize,
    /// Numerators of the source element's key, when it is in machine words.
    source: SparseNumerators,
    source_is_small: bool,
    /// The source key as numbers (exact path) and as field elements, made on demand.
    source_key: Option<KeyNumbers>,
    source_line: Option<Vec<Cyc>>,
    /// Zero between uses, with a bit mask of the entries a product wrote.
    wide: Vec<i128>,
    touched: Vec<u64>,
    image: SparseNumerators,
    /// Multiplication matrix of the image's first non-zero coordinate, by columns, and its
    /// largest row sum; `lead_state` 0 = not built, 1 = built, 2 = beyond `i64`.
    lead: Vec<i64>,
    lead_wide: Vec<i128>,
    lead_bound: u128,
    lead_state: u8,
    stored: SparseNumerators,
    /// Number of non-zero blocks of the image.
    image_blocks: usize,
    /// One block of U_k·S_i.
    rhs: Vec<i128>,
    rhs_small: Vec<i64>,
    normaliser: Normaliser,
}

impl Workspace {
    pub(crate) fn new(problem: &OrbitProblem) -> Workspace {
        let phi = problem.kernel.degree();
        let len = problem.key_len();
        Workspace {
            phi,
            source: SparseNumerators::new(len),
            source_is_small: true,
            source_key: None,
            source_line: None,
            wide: vec![0; len],
            touched: vec![0; len.div_ceil(64)],
            image: SparseNumerators::new(len),
            lead: vec![0; phi * phi],
            lead_wide: vec![0; phi * phi],
            lead_bound: 0,
            lead_state: 0,
            stored: SparseNumerators::new(len),
            image_blocks: 0,
            rhs: vec![0; phi],
            rhs_small: vec![0; phi],
            normaliser: Normaliser::default(),
        }
    }

    /// Make element `index` of `set` the source of the next images.
    pub(crate) fn load(
        &mut self,
        problem: &OrbitProblem,
        set: &LineStore,
        index: usize,
    ) -> Result<(), OrbitError> {
        let fetched = problem.fetch(set, index, &mut self.source)?;
        if matches!(fetched, Fetched::NotHeld) {
            return Err(OrbitError::Invalid(format!(
                "element {index} is to be expanded but its key is not held (past the window)"
            )));
        }
        self.take_source(fetched);
        Ok(())
    }

    /// Make key j of `keys` (in memory or spilled) the source of the next images.
    pub(crate) fn load_stored(&mut self, keys: &KeyArena, j: usize) -> Result<(), String> {
        let fetched = match keys.get_spilled(j, &mut self.source)? {
            StoredKey::Small => Fetched::Small,
            StoredKey::Big(b) => Fetched::Big(Cow::Borrowed(b)),
        };
        self.take_source(fetched);
        Ok(())
    }

    /// The source is now the key just read: in `source` when small, else these numbers.
    fn take_source(&mut self, fetched: Fetched<'_>) {
        self.source_line = None;
        self.source_is_small = matches!(fetched, Fetched::Small);
        self.source_key = match fetched {
            // (never `NotHeld`: `load` refuses it)
            Fetched::Small | Fetched::NotHeld => None,
            Fetched::Big(b) => Some(KeyNumbers::Big(b.into_owned())),
        };
    }

    /// Make a key the source of the next images.
    pub(crate) fn load_key(&mut self, key: &KeyNumbers) {
        self.source_line = None;
        match key {
            KeyNumbers::Small(v) => {
                self.source.clear();
                for (at, &x) in v.iter().enumerate() {
                    if x != 0 {
                        self.source.push(at, x);
                    }
                }
                self.source_is_small = true;
                self.source_key = None;
            }
            KeyNumbers::Big(_) => {
                self.source_is_small = false;
                self.source_key = Some(key.clone());
            }
        }
    }

    /// The source as field elements w = S / D.
    fn source_line(&mut self, problem: &OrbitProblem) -> Result<&[Cyc], OrbitError> {
        if self.source_line.is_none() {
            let key = match &self.source_key {
                Some(k) => k.clone(),
                None => KeyNumbers::Small(self.source.dense.clone()),
            };
            self.source_line = Some(key.to_line(&problem.field, self.phi)?);
        }
        Ok(self.source_line.as_deref().unwrap_or(&[]))
    }

    /// The multiplication matrix of the image's block k, by columns, when it fits `i64`.
    fn build_lead(&mut self, problem: &OrbitProblem, k: usize) {
        let phi = self.phi;
        let lead = &self.image.dense[k * phi..(k + 1) * phi];
        self.lead_state = 2;
        if problem
            .kernel
            .mult_matrix(lead, &mut self.lead_wide)
            .is_none()
        {
            return;
        }
        let mut bound = 0u128;
        for t in 0..phi {
            let row = &self.lead_wide[t * phi..(t + 1) * phi];
            bound = bound.max(row.iter().map(|x| x.unsigned_abs()).sum());
            for (s, &x) in row.iter().enumerate() {
                match i64::try_from(x) {
                    Ok(v) => self.lead[s * phi + t] = v,
                    Err(_) => return,
                }
            }
        }
        self.lead_bound = bound;
        self.lead_state = 1;
    }

    /// Move the written entries of `wide` into `image` (zeroing `wide` and `touched`);
    /// `false` when one does not fit an `i64`.
    fn take_image(&mut self) -> bool {
        self.image.clear();
        self.image_blocks = 0;
        let mut last_block = u32::MAX;
        let mut fits = true;
        for (word_index, word) in self.touched.iter_mut().enumerate() {
            let mut bits = std::mem::take(word);
            while bits != 0 {
                let i = word_index * 64 + bits.trailing_zeros() as usize;
                bits &= bits - 1;
                let w = std::mem::take(&mut self.wide[i]);
                if w != 0 {
                    match i64::try_from(w) {
                        Ok(x) if fits => {
                            self.image.push(i, x);
                            let block = (i / self.phi) as u32;
                            if block != last_block {
                                self.image_blocks += 1;
                                last_block = block;
                            }
                        }
                        _ => fits = false,
                    }
                }
            }
        }
        fits
    }
}

fn singular(problem: &OrbitProblem, generator: usize) -> OrbitError {
    OrbitError::Invalid(format!(
        "generator {} maps a line to zero: it is not invertible",
        problem.generators.names()[generator]
    ))
}

impl OrbitProblem {
    /// Classify the image of the workspace's source under `generator` against `set` and the
    /// worker's `pending` new lines.
    pub(crate) fn classify(
        &self,
        set: &LineStore,
        pending: &Pending,
        ws: &mut Workspace,
        generator: usize,
    ) -> Result<Outcome, OrbitError> {
        let applied = match (&self.compiled[generator], ws.source_is_small) {
            (Some(op), true) => op.apply(&ws.source, &mut ws.wide, &mut ws.touched),
            _ => false,
        };
        if !applied || !ws.take_image() {
            return self.classify_exact(set, pending, ws, generator);
        }
        let k = ws
            .image
            .first_block(ws.phi)
            .ok_or_else(|| singular(self, generator))?;
        ws.lead_state = 0;
        let wide = set.wide();
        let Some(fingerprint) = self.fingerprints.of_representative(&ws.image, k, wide) else {
            let key =
                key_of_integer_vector(&self.field, &self.kernel, &mut ws.normaliser, &ws.image, k)?;
            return self.lookup_key(set, pending, ws, key);
        };
        let mut failure = None;
        let mut record = |r: Result<bool, OrbitError>| {
            r.unwrap_or_else(|e| {
                failure = Some(e);
                false
            })
        };
        let stored = set.find(fingerprint, |i| record(self.same_as_stored(set, ws, i, k)));
        let known = stored.is_some()
            || pending.find(fingerprint, |key, support| {
                record(self.same_as_key(ws, key, support, k))
            });
        if let Some(e) = failure {
            return Err(e);
        }
        if known {
            return Ok(Outcome::Known(stored));
        }
        let key =
            key_of_integer_vector(&self.field, &self.kernel, &mut ws.normaliser, &ws.image, k)?;
        Ok(Outcome::New { key, fingerprint })
    }

    /// Exact path: apply in `Cyc` arithmetic, normalise, look up by key.
    fn classify_exact(
        &self,
        set: &LineStore,
        pending: &Pending,
        ws: &mut Workspace,
        generator: usize,
    ) -> Result<Outcome, OrbitError> {
        let line = ws.source_line(self)?;
        let image = self.generators.operators()[generator].apply(&self.field, line)?;
        let key =
            KeyNumbers::of_line(&self.field, &image)?.ok_or_else(|| singular(self, generator))?;
        self.lookup_key(set, pending, ws, key)
    }

    /// Look a key up in the store and among the pending lines.
    fn lookup_key(
        &self,
        set: &LineStore,
        pending: &Pending,
        ws: &mut Workspace,
        key: KeyNumbers,
    ) -> Result<Outcome, OrbitError> {
        let fingerprint = self.key_fingerprint(&key, set.wide());
        let stored = self.find_key(set, &mut ws.stored, fingerprint, &key)?;
        let known = stored.is_some() || pending.find(fingerprint, |other, _| *other == key);
        Ok(if known {
            Outcome::Known(stored)
        } else {
            Outcome::New { key, fingerprint }
        })
    }

    /// The fingerprint of a key (62 bits when `wide`, else 31).
    pub(crate) fn key_fingerprint(&self, key: &KeyNumbers, wide: bool) -> u64 {
        let k = match key {
            KeyNumbers::Small(s) => first_nonzero_block(s, self.kernel.degree()),
            KeyNumbers::Big(b) => first_nonzero_block(b, self.kernel.degree()),
        };
        self.fingerprints.of_key(key, k.unwrap_or(0), wide)
    }

    /// The stored element with exactly this key. Every stored line is read back or
    /// recomputed here, so a store whose records are global ([`LineStore::parents_are_global`])
    /// goes through [`Self::find_key_noting`] instead.
    pub(crate) fn find_key(
        &self,
        set: &LineStore,
        buf: &mut SparseNumerators,
        fingerprint: u64,
        key: &KeyNumbers,
    ) -> Result<Option<u32>, OrbitError> {
        let mut not_held = Vec::new();
        let found = self.find_key_noting(set, buf, fingerprint, key, &mut not_held)?;
        if found.is_none() && !not_held.is_empty() {
            return Err(OrbitError::Invalid(
                "a line of a distributed compact store was looked up as if held here".into(),
            ));
        }
        Ok(found)
    }

    /// The stored element with exactly this key, among those whose key the store holds or
    /// recomputes; the elements with this fingerprint whose key is not held here are added
    /// to `not_held` (they may still be the line: the caller settles them).
    pub(crate) fn find_key_noting(
        &self,
        set: &LineStore,
        buf: &mut SparseNumerators,
        fingerprint: u64,
        key: &KeyNumbers,
        not_held: &mut Vec<u32>,
    ) -> Result<Option<u32>, OrbitError> {
        let mut failure = None;
        let found = set.find(fingerprint, |i| {
            let same = match (self.fetch(set, i, buf), key) {
                (Ok(Fetched::Small), KeyNumbers::Small(k)) => Ok(buf.dense == *k),
                (Ok(Fetched::Big(b)), KeyNumbers::Big(k)) => Ok(*b == *k.as_slice()),
                (Ok(Fetched::NotHeld), _) => {
                    not_held.push(i as u32);
                    Ok(false)
                }
                // canonical keys are small exactly when every numerator fits an i64
                (Ok(_), _) => Ok(false),
                (Err(e), _) => Err(e),
            };
            same.unwrap_or_else(|e| {
                failure = Some(e);
                false
            })
        });
        match failure {
            Some(e) => Err(e),
            None => Ok(found),
        }
    }

    /// The key of the image of the workspace's source under `generator`.
    pub(crate) fn image_key(
        &self,
        ws: &mut Workspace,
        generator: usize,
    ) -> Result<KeyNumbers, OrbitError> {
        let applied = match (&self.compiled[generator], ws.source_is_small) {
            (Some(op), true) => op.apply(&ws.source, &mut ws.wide, &mut ws.touched),
            _ => false,
        };
        if applied && ws.take_image() {
            let k = ws
                .image
                .first_block(ws.phi)
                .ok_or_else(|| singular(self, generator))?;
            return Ok(key_of_integer_vector(
                &self.field,
                &self.kernel,
                &mut ws.normaliser,
                &ws.image,
                k,
            )?);
        }
        let line = ws.source_line(self)?;
        let image = self.generators.operators()[generator].apply(&self.field, line)?;
        KeyNumbers::of_line(&self.field, &image)?.ok_or_else(|| singular(self, generator))
    }

    /// Whether stored element i is the line of the workspace image (first block k).
    fn same_as_stored(
        &self,
        set: &LineStore,
        ws: &mut Workspace,
        i: usize,
        k: usize,
    ) -> Result<bool, OrbitError> {
        let mut stored = std::mem::replace(&mut ws.stored, SparseNumerators::new(0));
        let result = match self.fetch(set, i, &mut stored) {
            Err(e) => Err(e),
            Ok(Fetched::Small) => {
                match self.image_matches(ws, &stored.dense, &stored.nonzero, stored.max, k) {
                    Some(same) => Ok(same),
                    None => {
                        self.same_line_exact(&ws.image, &KeyNumbers::Small(stored.dense.clone()))
                    }
                }
            }
            Ok(Fetched::Big(b)) => {
                self.same_line_exact(&ws.image, &KeyNumbers::Big(b.into_owned()))
            }
            // not decided here: the image goes to its owner, which settles it exactly
            Ok(Fetched::NotHeld) => Ok(false),
        };
        ws.stored = stored;
        result
    }

    /// Whether a pending key is the line of the workspace image (first block k).
    fn same_as_key(
        &self,
        ws: &mut Workspace,
        key: &KeyNumbers,
        support: &Support,
        k: usize,
    ) -> Result<bool, OrbitError> {
        if let KeyNumbers::Small(s) = key {
            if let Some(same) = self.image_matches(ws, s, &support.nonzero, support.max, k) {
                return Ok(same);
            }
        }
        self.same_line_exact(&ws.image, key)
    }

    /// The cross-multiplication test D·U_i = U_k·S_i in `i128`, walking the non-zero
    /// numerators of S only; `None` when a bound fails.
    ///
    /// Every non-zero block i of S is checked; then U has no other non-zero block when both
    /// have the same number of them (U_k ≠ 0, so S_i ≠ 0 forces U_i ≠ 0).
    fn image_matches(
        &self,
        ws: &mut Workspace,
        dense: &[i64],
        nonzero: &[u32],
        max: u64,
        k: usize,
    ) -> Option<bool> {
        let phi = ws.phi;
        let block_of = &self.block_of;
        if nonzero.first().map(|&i| block_of[i as usize] as usize) != Some(k) {
            return Some(false);
        }
        if ws.lead_state == 0 {
            ws.build_lead(self, k);
        }
        if ws.lead_state != 1 {
            return None;
        }
        let bound = ws.lead_bound.checked_mul(max as u128)?;
        let den = dense[k * phi];
        let small =
            bound < 1 << 62 && (den.unsigned_abs() as u128) * (ws.image.max as u128) < 1 << 62;
        if !small && bound >= 1 << 126 {
            return None;
        }
        let mut s_blocks = 0usize;
        let mut cursor = 0;
        while cursor < nonzero.len() {
            let block = block_of[nonzero[cursor] as usize];
            s_blocks += 1;
            let start = cursor;
            while cursor < nonzero.len() && block_of[nonzero[cursor] as usize] == block {
                cursor += 1;
            }
            if block as usize == k {
                continue;
            }
            let u = &ws.image.dense[block as usize * phi..(block as usize + 1) * phi];
            let entries = &nonzero[start..cursor];
            let same = if small {
                block_matches(
                    &ws.lead,
                    &self.slot_of,
                    dense,
                    entries,
                    den,
                    u,
                    &mut ws.rhs_small,
                )
            } else {
                block_matches(&ws.lead, &self.slot_of, dense, entries, den, u, &mut ws.rhs)
            };
            if !same {
                return Some(false);
            }
        }
        Some(ws.image_blocks == s_blocks)
    }

    /// Exact test, in `Cyc` arithmetic, that the integer vector u spans the line of `key`.
    fn same_line_exact(&self, u: &SparseNumerators, key: &KeyNumbers) -> Result<bool, OrbitError> {
        let phi = self.kernel.degree();
        let w = key.to_line(&self.field, phi)?;
        let one = BigInt::one();
        let u: Vec<Cyc> = u
            .dense
            .chunks(phi)
            .map(|b| {
                let num: Vec<BigInt> = b.iter().map(|&x| BigInt::from(x)).collect();
                self.field.from_parts(&num, &one)
            })
            .collect::<Result<_, _>>()?;
        let Some(k) = u.iter().position(|x| !x.is_zero()) else {
            return Ok(false);
        };
        for (ui, wi) in u.iter().zip(&w) {
            if *ui != self.field.mul(&u[k], wi)? {
                return Ok(false);
            }
        }
        Ok(true)
    }
}

/// D·u = U_k·S_i for one block, in the integer type `T` (`i64` when the caller checked the
/// bounds, else `i128`): `lead` holds the multiplication matrix of U_k by columns,
/// `entries` the non-zero positions of S_i.
fn block_matches<T>(
    lead: &[i64],
    slot_of: &[u32],
    dense: &[i64],
    entries: &[u32],
    den: i64,
    u: &[i64],
    rhs: &mut [T],
) -> bool
where
    T: Copy + Default + PartialEq + From<i64> + std::ops::Mul<Output = T> + std::ops::AddAssign,
{
    let phi = u.len();
    rhs.fill(T::default());
    for &at in entries {
        let x = T::from(dense[at as usize]);
        let column = &lead[slot_of[at as usize] as usize * phi..][..phi];
        for (r, &m) in rhs.iter_mut().zip(column) {
            *r += T::from(m) * x;
        }
    }
    u.iter()
        .zip(rhs.iter())
        .all(|(&ut, &r)| T::from(den) * T::from(ut) == r)
}
