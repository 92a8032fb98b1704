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

use cyclorb_field::Cyc;
use cyclorb_matrix::LinearMap;
use hashbrown::HashTable;
use num_bigint::BigInt;
use num_traits::One;

use crate::error::OrbitError;
use crate::fingerprint::bucket_hash;
use crate::key::{first_nonzero_block, key_of_integer_vector, InverseCache, KeyNumbers};
use crate::numerators::Numerators;
use crate::problem::OrbitProblem;
use crate::store::{OrbitSet, StoredKey};

/// What an image turned out to be.
pub(crate) enum Outcome {
    /// Already stored, or already found by this worker.
    Known,
    /// New: its key and fingerprint.
    New { key: KeyNumbers, fingerprint: u32 },
}

/// A new line found while processing a chunk.
#[derive(Debug)]
pub(crate) struct Candidate {
    pub(crate) parent: u32,
    pub(crate) generator: u16,
    pub(crate) key: KeyNumbers,
    pub(crate) fingerprint: u32,
}

/// The new lines one worker has found in its part of a chunk, in order, with a lookup table.
#[derive(Debug, Default)]
pub(crate) struct Pending {
    pub(crate) list: Vec<Candidate>,
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
        self.list.push(candidate);
    }

    fn find(&self, fingerprint: u32, mut same: impl FnMut(&KeyNumbers) -> bool) -> bool {
        self.table
            .find(bucket_hash(fingerprint), |&i| {
                let c = &self.list[i as usize];
                c.fingerprint == fingerprint && same(&c.key)
            })
            .is_some()
    }
}

/// Per-thread scratch space, reused for every image.
pub(crate) struct Workspace {
    phi: usize,
    /// Numerators of the source element's key, when it is in machine words.
    source: Numerators,
    source_is_small: bool,
    /// The source key as numbers (exact path) and as field elements, made on demand.
    source_key: Option<KeyNumbers>,
    source_line: Option<Vec<Cyc>>,
    /// Zero between uses.
    wide: Vec<i128>,
    image: Numerators,
    /// Multiplication matrix of the image's first non-zero coordinate and its row bound;
    /// `lead_state` 0 = not built, 1 = built, 2 = overflow.
    lead: Vec<i128>,
    lead_bound: u128,
    lead_state: u8,
    stored: Numerators,
    scratch: Numerators,
    /// One block of U_k·S_i.
    rhs: Vec<i128>,
    inverses: InverseCache,
}

impl Workspace {
    pub(crate) fn new(problem: &OrbitProblem) -> Workspace {
        let phi = problem.kernel.degree();
        let len = problem.key_len();
        Workspace {
            phi,
            source: Numerators::new(len),
            source_is_small: true,
            source_key: None,
            source_line: None,
            wide: vec![0; len],
            image: Numerators::new(len),
            lead: vec![0; phi * phi],
            lead_bound: 0,
            lead_state: 0,
            stored: Numerators::new(len),
            scratch: Numerators::new(len),
            rhs: vec![0; phi],
            inverses: InverseCache::default(),
        }
    }

    /// Make element `index` of `set` the source of the next images.
    pub(crate) fn load(&mut self, set: &OrbitSet, index: usize) {
        self.source_line = None;
        match set.keys.get(index, &mut self.source) {
            StoredKey::Small => {
                self.source_is_small = true;
                self.source_key = None;
            }
            StoredKey::Big(b) => {
                self.source_is_small = false;
                self.source_key = Some(KeyNumbers::Big(b.to_vec()));
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

    /// Move the nonzero entries of `wide` into `image` (zeroing `wide`); `false` when one
    /// does not fit an `i64`.
    fn take_image(&mut self) -> bool {
        self.image.clear();
        let mut fits = true;
        for (i, w) in self.wide.iter_mut().enumerate() {
            if *w != 0 {
                match i64::try_from(*w) {
                    Ok(x) if fits => self.image.push(i, x),
                    _ => fits = false,
                }
                *w = 0;
            }
        }
        fits
    }
}

fn singular(problem: &OrbitProblem, generator: usize) -> OrbitError {
    OrbitError::Invalid(format!(
        "generator {} maps a line to zero: it is not invertible",
        problem.generators.names[generator]
    ))
}

impl OrbitProblem {
    /// Classify the image of the workspace's source under `generator` against `set` and the
    /// worker's `pending` new lines.
    pub(crate) fn classify(
        &self,
        set: &OrbitSet,
        pending: &Pending,
        ws: &mut Workspace,
        generator: usize,
    ) -> Result<Outcome, OrbitError> {
        let applied = match (&self.compiled[generator], ws.source_is_small) {
            (Some(op), true) => op.apply(&ws.source, &mut ws.wide),
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
        let Some(fingerprint) = self.fingerprinter.of_representative(&ws.image, k) else {
            let key =
                key_of_integer_vector(&self.field, &self.kernel, &mut ws.inverses, &ws.image, k)?;
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
            || pending.find(fingerprint, |key| record(self.same_as_key(ws, key, k)));
        if let Some(e) = failure {
            return Err(e);
        }
        if known {
            return Ok(Outcome::Known);
        }
        let key = key_of_integer_vector(&self.field, &self.kernel, &mut ws.inverses, &ws.image, k)?;
        Ok(Outcome::New { key, fingerprint })
    }

    /// Exact path: apply in `Cyc` arithmetic, normalise, look up by key.
    fn classify_exact(
        &self,
        set: &OrbitSet,
        pending: &Pending,
        ws: &mut Workspace,
        generator: usize,
    ) -> Result<Outcome, OrbitError> {
        let line = ws.source_line(self)?;
        let image = self.generators.operators[generator].apply(&self.field, line)?;
        let key =
            KeyNumbers::of_line(&self.field, &image)?.ok_or_else(|| singular(self, generator))?;
        self.lookup_key(set, pending, ws, key)
    }

    /// Look a key up in the store and among the pending lines.
    fn lookup_key(
        &self,
        set: &OrbitSet,
        pending: &Pending,
        ws: &mut Workspace,
        key: KeyNumbers,
    ) -> Result<Outcome, OrbitError> {
        let fingerprint = self.key_fingerprint(&key);
        let buf = &mut ws.stored;
        let known = set
            .find(fingerprint, |i| same_key(set, buf, i, &key))
            .is_some()
            || pending.find(fingerprint, |other| *other == key);
        Ok(if known {
            Outcome::Known
        } else {
            Outcome::New { key, fingerprint }
        })
    }

    /// The fingerprint of a key.
    pub(crate) fn key_fingerprint(&self, key: &KeyNumbers) -> u32 {
        let k = match key {
            KeyNumbers::Small(s) => first_nonzero_block(s, self.kernel.degree()),
            KeyNumbers::Big(b) => first_nonzero_block(b, self.kernel.degree()),
        };
        self.fingerprinter.of_key(key, k.unwrap_or(0))
    }

    /// Whether stored element i is the line of the workspace image (first block k).
    fn same_as_stored(
        &self,
        set: &OrbitSet,
        ws: &mut Workspace,
        i: usize,
        k: usize,
    ) -> Result<bool, OrbitError> {
        let mut stored = std::mem::replace(&mut ws.stored, Numerators::new(0));
        let result = match set.keys.get(i, &mut stored) {
            StoredKey::Small => match self.image_matches(ws, &stored, k) {
                Some(same) => Ok(same),
                None => self.same_line_exact(&ws.image, &KeyNumbers::Small(stored.dense.clone())),
            },
            StoredKey::Big(b) => self.same_line_exact(&ws.image, &KeyNumbers::Big(b.to_vec())),
        };
        ws.stored = stored;
        result
    }

    /// Whether a pending key is the line of the workspace image (first block k).
    fn same_as_key(
        &self,
        ws: &mut Workspace,
        key: &KeyNumbers,
        k: usize,
    ) -> Result<bool, OrbitError> {
        if let KeyNumbers::Small(s) = key {
            let mut numbers = std::mem::replace(&mut ws.scratch, Numerators::new(0));
            numbers.set_dense(s);
            let same = self.image_matches(ws, &numbers, k);
            ws.scratch = numbers;
            if let Some(same) = same {
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
    fn image_matches(&self, ws: &mut Workspace, s: &Numerators, k: usize) -> Option<bool> {
        let phi = ws.phi;
        if s.first_block(phi) != Some(k) {
            return Some(false);
        }
        if ws.lead_state == 0 {
            let lead = &ws.image.dense[k * phi..(k + 1) * phi];
            ws.lead_state = match self.kernel.mult_matrix(lead, &mut ws.lead) {
                Some(()) => {
                    ws.lead_bound = ws
                        .lead
                        .chunks(phi)
                        .map(|row| row.iter().map(|x| x.unsigned_abs()).sum::<u128>())
                        .max()
                        .unwrap_or(0);
                    1
                }
                None => 2,
            };
        }
        let bounded = ws.lead_state == 1
            && ws
                .lead_bound
                .checked_mul(s.max as u128)
                .is_some_and(|b| b < 1 << 126);
        if !bounded {
            return None;
        }
        let den = s.dense[k * phi] as i128;
        let rhs = &mut ws.rhs;
        let mut s_blocks = 0usize;
        let mut cursor = 0;
        let nonzero = &s.nonzero;
        while cursor < nonzero.len() {
            let block = nonzero[cursor] as usize / phi;
            s_blocks += 1;
            rhs.fill(0);
            while cursor < nonzero.len() && nonzero[cursor] as usize / phi == block {
                let at = nonzero[cursor] as usize;
                let x = s.dense[at] as i128;
                let column = at % phi;
                for (t, r) in rhs.iter_mut().enumerate() {
                    *r += ws.lead[t * phi + column] * x;
                }
                cursor += 1;
            }
            if block == k {
                continue;
            }
            let u = &ws.image.dense[block * phi..(block + 1) * phi];
            if u.iter()
                .zip(rhs.iter())
                .any(|(&ut, &r)| den * ut as i128 != r)
            {
                return Some(false);
            }
        }
        let mut u_blocks = 0usize;
        let mut last = usize::MAX;
        for &i in &ws.image.nonzero {
            let block = i as usize / phi;
            if block != last {
                u_blocks += 1;
                last = block;
            }
        }
        Some(u_blocks == s_blocks)
    }

    /// Exact test, in `Cyc` arithmetic, that the integer vector u spans the line of `key`.
    fn same_line_exact(&self, u: &Numerators, key: &KeyNumbers) -> Result<bool, OrbitError> {
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

/// Whether stored element i has exactly these key numbers.
pub(crate) fn same_key(set: &OrbitSet, buf: &mut Numerators, i: usize, key: &KeyNumbers) -> bool {
    match (set.keys.get(i, buf), key) {
        (StoredKey::Small, KeyNumbers::Small(k)) => buf.dense == *k,
        (StoredKey::Big(b), KeyNumbers::Big(k)) => b == k.as_slice(),
        // canonical keys are small exactly when every numerator fits an i64
        _ => false,
    }
}
