//! One step of the search: the image of a stored line under one generator, and whether
//! that line is already stored.
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

use cyclorb_field::Cyc;
use num_bigint::BigInt;
use num_traits::One;

use crate::error::OrbitError;
use crate::key::{first_nonzero_block, key_of_integer_vector, max_abs, KeyNumbers};
use crate::problem::OrbitProblem;
use crate::store::{OrbitSet, StoredKey};
use cyclorb_matrix::LinearMap;

/// What an image turned out to be.
pub(crate) enum Outcome {
    /// Already stored.
    Known,
    /// Not stored (when the lookup ran): its key and fingerprint.
    New { key: KeyNumbers, fingerprint: u64 },
}

/// Per-thread scratch space, reused for every image.
pub(crate) struct Workspace {
    phi: usize,
    /// Numerators of the source element's key, when it is in machine words.
    source: Vec<i64>,
    source_max: u64,
    source_is_small: bool,
    /// The source key as numbers (exact path) and as field elements, made on demand.
    source_key: Option<KeyNumbers>,
    source_line: Option<Vec<Cyc>>,
    wide: Vec<i128>,
    image: Vec<i64>,
    image_max: u64,
    /// Multiplication matrix of the image's first non-zero coordinate and its row bound;
    /// `lead_state` 0 = not built, 1 = built, 2 = overflow.
    lead: Vec<i128>,
    lead_bound: u128,
    lead_state: u8,
    stored: Vec<i64>,
}

impl Workspace {
    pub(crate) fn new(problem: &OrbitProblem) -> Workspace {
        let phi = problem.kernel.degree();
        let len = problem.key_len();
        Workspace {
            phi,
            source: vec![0; len],
            source_max: 0,
            source_is_small: true,
            source_key: None,
            source_line: None,
            wide: vec![0; len],
            image: vec![0; len],
            image_max: 0,
            lead: vec![0; phi * phi],
            lead_bound: 0,
            lead_state: 0,
            stored: vec![0; len],
        }
    }

    /// Make element `index` of `set` the source of the next images.
    pub(crate) fn load(&mut self, set: &OrbitSet, index: usize) {
        self.source_line = None;
        match set.keys.get(index, &mut self.source) {
            StoredKey::Small(m) => {
                self.source_max = m;
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
                None => KeyNumbers::Small(self.source.clone()),
            };
            self.source_line = Some(key.to_line(&problem.field, self.phi)?);
        }
        Ok(self.source_line.as_deref().unwrap_or(&[]))
    }
}

fn singular(problem: &OrbitProblem, generator: usize) -> OrbitError {
    OrbitError::Invalid(format!(
        "generator {} maps a line to zero: it is not invertible",
        problem.generators.names[generator]
    ))
}

impl OrbitProblem {
    /// Classify the image of the workspace's source under `generator` against `set`.
    pub(crate) fn classify(
        &self,
        set: &OrbitSet,
        ws: &mut Workspace,
        generator: usize,
    ) -> Result<Outcome, OrbitError> {
        let fast = match (&self.compiled[generator], ws.source_is_small) {
            (Some(op), true) => op.apply(&ws.source, ws.source_max, &mut ws.wide),
            _ => false,
        };
        let fits = fast && {
            let mut ok = true;
            for (o, &w) in ws.image.iter_mut().zip(&ws.wide) {
                match i64::try_from(w) {
                    Ok(x) => *o = x,
                    Err(_) => {
                        ok = false;
                        break;
                    }
                }
            }
            ok
        };
        if !fits {
            return self.classify_exact(set, ws, generator);
        }
        let k = first_nonzero_block(&ws.image, ws.phi).ok_or_else(|| singular(self, generator))?;
        ws.image_max = max_abs(&ws.image);
        ws.lead_state = 0;
        let Some(fingerprint) = self.fingerprinter.of_representative(&ws.image, k) else {
            let key = key_of_integer_vector(&self.field, &self.kernel, &ws.image, k)?;
            return Ok(self.lookup_key(set, ws, key));
        };
        let mut failure = None;
        let found = set.find(fingerprint, |i| match self.same_as_image(set, ws, i, k) {
            Ok(same) => same,
            Err(e) => {
                failure = Some(e);
                false
            }
        });
        if let Some(e) = failure {
            return Err(e);
        }
        if found.is_some() {
            return Ok(Outcome::Known);
        }
        let key = key_of_integer_vector(&self.field, &self.kernel, &ws.image, k)?;
        Ok(Outcome::New { key, fingerprint })
    }

    /// Exact path: apply in `Cyc` arithmetic, normalise, look up by key.
    fn classify_exact(
        &self,
        set: &OrbitSet,
        ws: &mut Workspace,
        generator: usize,
    ) -> Result<Outcome, OrbitError> {
        let line = ws.source_line(self)?;
        let image = self.generators.operators[generator].apply(&self.field, line)?;
        let key =
            KeyNumbers::of_line(&self.field, &image)?.ok_or_else(|| singular(self, generator))?;
        Ok(self.lookup_key(set, ws, key))
    }

    /// Look a key up; `Known` or `New` with its fingerprint.
    pub(crate) fn lookup_key(
        &self,
        set: &OrbitSet,
        ws: &mut Workspace,
        key: KeyNumbers,
    ) -> Outcome {
        let fingerprint = self.key_fingerprint(&key);
        let stored = &mut ws.stored;
        let found = set.find(fingerprint, |i| same_key(set, stored, i, &key));
        match found {
            Some(_) => Outcome::Known,
            None => Outcome::New { key, fingerprint },
        }
    }

    /// The fingerprint of a key.
    pub(crate) fn key_fingerprint(&self, key: &KeyNumbers) -> u64 {
        let k = match key {
            KeyNumbers::Small(s) => first_nonzero_block(s, self.kernel.degree()),
            KeyNumbers::Big(b) => first_nonzero_block(b, self.kernel.degree()),
        };
        self.fingerprinter.of_key(key, k.unwrap_or(0))
    }

    /// Whether stored element i is the line of the workspace image (first block k).
    fn same_as_image(
        &self,
        set: &OrbitSet,
        ws: &mut Workspace,
        i: usize,
        k: usize,
    ) -> Result<bool, OrbitError> {
        let phi = ws.phi;
        let stored_max = match set.keys.get(i, &mut ws.stored) {
            StoredKey::Small(m) => m,
            StoredKey::Big(b) => {
                return self.same_line_exact(&ws.image, &KeyNumbers::Big(b.to_vec()))
            }
        };
        if first_nonzero_block(&ws.stored, phi) != Some(k) {
            return Ok(false);
        }
        if ws.lead_state == 0 {
            let lead = &ws.image[k * phi..(k + 1) * phi];
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
                .checked_mul(stored_max as u128)
                .is_some_and(|b| b < 1 << 126);
        if !bounded {
            let stored = KeyNumbers::Small(ws.stored.clone());
            return self.same_line_exact(&ws.image, &stored);
        }
        let den = ws.stored[k * phi] as i128;
        for (u, s) in ws.image.chunks(phi).zip(ws.stored.chunks(phi)).skip(k + 1) {
            for (row, &ut) in ws.lead.chunks(phi).zip(u) {
                let rhs: i128 = row.iter().zip(s).map(|(m, &x)| m * x as i128).sum();
                if den * ut as i128 != rhs {
                    return Ok(false);
                }
            }
        }
        Ok(true)
    }

    /// Exact test, in `Cyc` arithmetic, that the integer vector u spans the line of `key`.
    fn same_line_exact(&self, u: &[i64], key: &KeyNumbers) -> Result<bool, OrbitError> {
        let phi = self.kernel.degree();
        let w = key.to_line(&self.field, phi)?;
        let one = BigInt::one();
        let u: Vec<Cyc> = u
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
pub(crate) fn same_key(set: &OrbitSet, buf: &mut [i64], i: usize, key: &KeyNumbers) -> bool {
    match (set.keys.get(i, buf), key) {
        (StoredKey::Small(_), KeyNumbers::Small(k)) => buf == k.as_slice(),
        (StoredKey::Big(b), KeyNumbers::Big(k)) => b == k.as_slice(),
        (StoredKey::Small(_), KeyNumbers::Big(k)) => {
            buf.iter().zip(k).all(|(&x, y)| BigInt::from(x) == *y)
        }
        (StoredKey::Big(b), KeyNumbers::Small(k)) => {
            b.iter().zip(k).all(|(x, &y)| *x == BigInt::from(y))
        }
    }
}
