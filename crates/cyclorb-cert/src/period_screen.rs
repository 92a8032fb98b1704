//! A cheap screen modulo primes deciding which words and blocks deserve an exact witness
//! certificate. It is never part of a proof: it only chooses what to try.
//!
//! Word products are formed mod p (p ≡ 1 mod n, two primes), in machine words. A block
//! whose reduction W_p has small *projective period* — the least k ≤ `max` with
//! W_p^k v ∈ F_p·v for two fixed test vectors v — is skipped: if W has projective order d,
//! then W_p^d is scalar too, so the period divides d; a block of finite projective order
//! (all eigenvalue ratios roots of unity, no certificate possible) of order ≤ `max`
//! always shows a period ≤ `max`. A block of infinite order shows a period > `max` for
//! all but rare primes. Only blocks with a period beyond `max` for some prime go on to
//! the exact computation, which alone decides.

use cyclorb_field::{FieldError, PrimeReduction};
use cyclorb_matrix::{Matrix, MatrixError, ModpMatrix};

use crate::error::CertError;
use crate::witness_words::Xorshift;
use cyclorb_matrix::ProvedGenerators;

/// Primes used by the screen.
const SCREEN_PRIMES: usize = 2;
/// Prime indices tried to find them (a prime dividing a denominator is passed over).
const PRIME_ATTEMPTS: usize = 12;

/// The generators reduced modulo the screening primes.
pub(crate) struct Screen {
    /// For each prime, the generators mod p.
    generators: Vec<Vec<ModpMatrix>>,
    reductions: Vec<PrimeReduction>,
    max: u64,
}

/// The connected components of the pattern `linked` on 0..d (i ~ j when linked(i, j) or
/// linked(j, i)), smallest first, followed by all coordinates when there are several.
pub(crate) fn candidate_blocks(d: usize, linked: impl Fn(usize, usize) -> bool) -> Vec<Vec<usize>> {
    let mut component = vec![usize::MAX; d];
    let mut blocks = Vec::new();
    for start in 0..d {
        if component[start] != usize::MAX {
            continue;
        }
        let id = blocks.len();
        component[start] = id;
        let mut members = vec![start];
        let mut next = 0;
        while let Some(&i) = members.get(next) {
            next += 1;
            for (j, slot) in component.iter_mut().enumerate() {
                if *slot == usize::MAX && (linked(i, j) || linked(j, i)) {
                    *slot = id;
                    members.push(j);
                }
            }
        }
        members.sort_unstable();
        blocks.push(members);
    }
    blocks.sort_by_key(|b| (b.len(), b[0]));
    if blocks.len() > 1 {
        blocks.push((0..d).collect());
    }
    blocks
}

/// w ∈ F_p·v for v with v₀ ≠ 0.
fn proportional(w: &[u64], v: &[u64], p: u64) -> bool {
    w.iter().zip(v).all(|(a, b)| a * v[0] % p == w[0] * b % p)
}

/// The projective period of a square matrix mod p (module documentation), when ≤ `max`.
fn period(m: &ModpMatrix, max: u64) -> Option<u64> {
    let p = m.prime();
    let mut random = Xorshift::new(0x5eed);
    let starts: Vec<Vec<u64>> = (0..2)
        .map(|_| {
            (0..m.rows())
                .map(|_| 1 + random.below(p as usize - 1) as u64)
                .collect()
        })
        .collect();
    let mut images = starts.clone();
    for k in 1..=max {
        for w in images.iter_mut() {
            *w = m.mul_vec(w).ok()?;
        }
        if images
            .iter()
            .zip(&starts)
            .all(|(w, v)| proportional(w, v, p))
        {
            return Some(k);
        }
    }
    None
}

/// The submatrix on `block` × `block`.
fn restrict_modp(m: &ModpMatrix, block: &[usize]) -> Result<ModpMatrix, CertError> {
    let rows = block
        .iter()
        .map(|&i| block.iter().map(|&j| m.get(i, j)).collect())
        .collect();
    Ok(ModpMatrix::from_rows(m.prime(), rows)?)
}

impl Screen {
    /// Reduce the generators modulo the first primes p ≡ 1 (mod n) dividing none of
    /// their denominators. With no such prime the screen lets everything through.
    pub(crate) fn new(gens: &ProvedGenerators, max: u64) -> Result<Screen, CertError> {
        let mut generators = Vec::new();
        let mut reductions = Vec::new();
        for index in 0..PRIME_ATTEMPTS {
            if reductions.len() == SCREEN_PRIMES {
                break;
            }
            let reduction = PrimeReduction::nth(gens.field(), index)?;
            let reduced: Result<Vec<ModpMatrix>, MatrixError> = (0..gens.len())
                .map(|a| gens.dense(a).reduce_mod(&reduction))
                .collect();
            match reduced {
                Ok(mats) => {
                    generators.push(mats);
                    reductions.push(reduction);
                }
                Err(MatrixError::Field(FieldError::BadPrime { .. })) => continue,
                Err(e) => return Err(e.into()),
            }
        }
        Ok(Screen {
            generators,
            reductions,
            max,
        })
    }

    /// The identity, once per prime.
    pub(crate) fn identity(&self, dim: usize) -> Result<Vec<ModpMatrix>, CertError> {
        self.reductions
            .iter()
            .map(|r| Ok(ModpMatrix::identity(r.prime(), dim)?))
            .collect()
    }

    /// products · A_letter, once per prime.
    pub(crate) fn step(
        &self,
        products: &[ModpMatrix],
        letter: usize,
    ) -> Result<Vec<ModpMatrix>, CertError> {
        products
            .iter()
            .zip(&self.generators)
            .map(|(w, gens)| Ok(w.mul(&gens[letter])?))
            .collect()
    }

    /// The word's product, once per prime.
    pub(crate) fn product(&self, dim: usize, word: &[usize]) -> Result<Vec<ModpMatrix>, CertError> {
        let mut acc = self.identity(dim)?;
        for &letter in word {
            acc = self.step(&acc, letter)?;
        }
        Ok(acc)
    }

    /// Whether some block of the reduced word (components of the joint non-zero pattern,
    /// then all coordinates) has a period beyond `max` for some prime.
    pub(crate) fn word_is_promising(&self, products: &[ModpMatrix]) -> Result<bool, CertError> {
        let Some(first) = products.first() else {
            return Ok(true);
        };
        let d = first.rows();
        let linked = |i: usize, j: usize| products.iter().any(|m| m.get(i, j) != 0);
        for block in candidate_blocks(d, linked) {
            if block.len() < 2 {
                continue;
            }
            for m in products {
                if period(&restrict_modp(m, &block)?, self.max).is_none() {
                    return Ok(true);
                }
            }
        }
        Ok(false)
    }

    /// Whether an exact block has a period beyond `max` for some prime (always true with
    /// no usable prime).
    pub(crate) fn block_is_promising(&self, block: &Matrix) -> Result<bool, CertError> {
        if self.reductions.is_empty() {
            return Ok(true);
        }
        for reduction in &self.reductions {
            if period(&block.reduce_mod(reduction)?, self.max).is_none() {
                return Ok(true);
            }
        }
        Ok(false)
    }
}
