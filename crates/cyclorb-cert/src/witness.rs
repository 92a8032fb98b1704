//! Witnesses of an infinite projective image: a word whose matrix W has two eigenvalues
//! whose ratio is not a root of unity, so no power of W is a scalar.
//!
//! For each word (see [`crate::witness_words`]) the product is first formed modulo two primes and
//! screened ([`crate::period_screen`]: blocks of small projective period mod p are passed over;
//! the screen only chooses what to try). For a promising word the exact matrix W is
//! formed; its coordinates split into the connected components of the non-zero pattern of
//! W, each spanning a W-invariant subspace (and so does their union), whose eigenvalues are
//! eigenvalues of W. For each such block, smallest first, that the screen passes:
//! f = χ of the block over Q(ζ_n), the ratio polynomial and its norm N ∈ Z[x]
//! ([`crate::ratio_polynomial`]), every cyclotomic factor removed ([`crate::cyclotomic_part`]). A
//! non-constant rest proves that some ratio λ_i/λ_j is not a root of unity, so no power of
//! W is a scalar: the projective image is infinite.
//!
//! Blocks whose norm would exceed `max_degree` ((m² − m)·φ(n) for a block of size m) are
//! skipped and counted.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::{Matrix, ModpMatrix};
use serde::{Deserialize, Serialize};

use crate::cyclotomic_part::{has_no_cyclotomic_factor, strip, CyclotomicFactor};
use crate::error::{require, CertError};
use crate::period_screen::{candidate_blocks, Screen};
use crate::ratio_polynomial::{norm_to_integers, ratio_polynomial};
use crate::witness_words::{is_lyndon, next_word, Xorshift};
use cyclorb_field::int_poly::{cyclotomic, degree, from_strings, mul, to_strings, IntPoly};
use cyclorb_matrix::ProvedGenerators;

/// Bounds of the search.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct WitnessOptions {
    /// Every Lyndon word up to this length is tried, shortest first.
    pub depth: usize,
    /// Then this many pseudo-random words.
    pub tries: usize,
    /// Random words have lengths 1..=random_length.
    pub random_length: usize,
    /// Seed of the random words (the search is deterministic for a seed).
    pub seed: u64,
    /// Blocks whose projective period modulo the screening primes is at most this are
    /// passed over. If a block has projective order d, its reduction's period divides d,
    /// so finite blocks of order ≤ `order_bound` are always passed over; this choice of
    /// what to try never affects soundness.
    pub order_bound: u64,
    /// Largest degree of the norm polynomial attempted.
    pub max_degree: usize,
}

impl Default for WitnessOptions {
    fn default() -> Self {
        WitnessOptions {
            depth: 6,
            tries: 200,
            random_length: 20,
            seed: 1,
            order_bound: 1000,
            max_degree: 2000,
        }
    }
}

/// What a search without a witness did.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
pub struct WitnessSearchReport {
    /// Words whose matrices were examined.
    pub words_tried: usize,
    /// Blocks skipped because their norm polynomial would exceed `max_degree`.
    pub blocks_over_degree: usize,
}

/// The result of a search (serialised with a `"result"` tag: `found` or `not_found`).
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
#[serde(tag = "result", rename_all = "snake_case")]
pub enum WitnessOutcome {
    /// A certified element of infinite projective order.
    Found(WitnessCertificate),
    /// None within the bounds (which proves nothing).
    NotFound(WitnessSearchReport),
}

/// A word of infinite projective order, with the exact proof.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct WitnessCertificate {
    /// The conductor n of Q(ζ_n).
    pub conductor: u32,
    /// The word, as generator names (product read left to right).
    pub word: Vec<String>,
    /// Coordinates spanning a W-invariant subspace (W_ij = 0 for j in it, i outside).
    pub block: Vec<usize>,
    /// The characteristic polynomial of W on that subspace, over Q(ζ_n), constant first.
    pub charpoly: Vec<String>,
    /// The number of distinct Galois conjugates of the ratio polynomial multiplied.
    pub conjugates: usize,
    /// The norm N ∈ `Z[x]` of the ratio polynomial (primitive), constant first.
    pub ratio_norm: Vec<String>,
    /// Its cyclotomic factors.
    pub cyclotomic_factors: Vec<CyclotomicFactor>,
    /// N / Π Φ_m^{e_m}: non-constant, with no cyclotomic factor; constant first.
    pub remaining_factor: Vec<String>,
}

/// The submatrix on `block` × `block`.
fn restrict(w: &Matrix, block: &[usize]) -> Result<Matrix, CertError> {
    let rows = block
        .iter()
        .map(|&i| block.iter().map(|&j| w.get(i, j).clone()).collect())
        .collect();
    Ok(Matrix::from_rows(rows)?)
}

/// The certificate data of one block: its charpoly, the norm of the ratio polynomial and
/// its cyclotomic decomposition.
struct BlockProof {
    charpoly: Vec<Cyc>,
    conjugates: usize,
    norm: IntPoly,
    factors: Vec<CyclotomicFactor>,
    rest: IntPoly,
}

fn prove_block(field: &CyclotomicField, sub: &Matrix) -> Result<BlockProof, CertError> {
    let charpoly = sub.charpoly(field)?;
    let ratios = ratio_polynomial(field, &charpoly)?;
    let (norm, conjugates) = norm_to_integers(field, &ratios)?;
    let stripped = strip(&norm);
    Ok(BlockProof {
        charpoly,
        conjugates,
        norm,
        factors: stripped.factors,
        rest: stripped.rest,
    })
}

/// The state of a search: the screen and the counts.
struct Search<'a> {
    gens: &'a ProvedGenerators,
    options: &'a WitnessOptions,
    screen: Screen,
    report: WitnessSearchReport,
}

impl Search<'_> {
    /// Examine one word given its products modulo the screening primes: when the screen
    /// finds it promising, form its exact matrix and try every exact block the screen
    /// passes, smallest first.
    fn examine(
        &mut self,
        word: &[usize],
        reduced: &[ModpMatrix],
    ) -> Result<Option<WitnessCertificate>, CertError> {
        self.report.words_tried += 1;
        if !self.screen.word_is_promising(reduced)? {
            return Ok(None);
        }
        let field = self.gens.field();
        let w = self.gens.word_matrix(word)?;
        let linked = |i: usize, j: usize| !w.get(i, j).is_zero();
        for block in candidate_blocks(w.rows(), linked) {
            let m = block.len();
            if m < 2 {
                continue;
            }
            let sub = restrict(&w, &block)?;
            if !self.screen.block_is_promising(&sub)? {
                continue;
            }
            if (m * m - m) * field.degree() > self.options.max_degree {
                self.report.blocks_over_degree += 1;
                continue;
            }
            let proof = prove_block(field, &sub)?;
            if degree(&proof.rest) >= 1 {
                return Ok(Some(WitnessCertificate {
                    conductor: field.conductor(),
                    word: self.gens.names_of(word),
                    block,
                    charpoly: proof.charpoly.iter().map(ToString::to_string).collect(),
                    conjugates: proof.conjugates,
                    ratio_norm: to_strings(&proof.norm),
                    cyclotomic_factors: proof.factors,
                    remaining_factor: to_strings(&proof.rest),
                }));
            }
        }
        Ok(None)
    }
}

/// Search for a witness of infinite projective image.
///
/// Every Lyndon word up to `depth` letters (shortest first; rotations and powers add
/// nothing), then `tries` seeded random words. Products are formed modulo two primes and
/// screened by their projective period there; promising words get their exact matrix W,
/// split into the W-invariant coordinate blocks of its non-zero pattern (and their
/// union). For a block with characteristic polynomial f = Π(x − λ_i) over Q(ζ_n):
/// R(x) = Π_{i,j}(x − λ_i/λ_j)/(x − 1)^m (from power sums), its norm N ∈ `Z[x]` (the
/// product of its distinct Galois conjugates, made primitive), and N with every Φ_m
/// divided out (only φ(m) ≤ deg N matters, and φ(m) ≥ √(m/2) bounds m). A non-constant
/// rest has a root that is not a root of unity; it is σ(λ_i/λ_j) for some Galois σ, so
/// λ_i/λ_j is not a root of unity and no power of W is a scalar.
pub fn find_witness(
    gens: &ProvedGenerators,
    options: &WitnessOptions,
) -> Result<WitnessOutcome, CertError> {
    let letters = gens.len();
    let dim = gens.dimension();
    let mut search = Search {
        gens,
        options,
        screen: Screen::new(gens, options.order_bound)?,
        report: WitnessSearchReport {
            words_tried: 0,
            blocks_over_degree: 0,
        },
    };
    for length in 1..=options.depth {
        let mut word = vec![0usize; length];
        // prefixes[k] = the product of the first k letters mod each prime
        let mut prefixes = vec![search.screen.identity(dim)?];
        loop {
            if is_lyndon(&word) {
                while prefixes.len() <= length {
                    let k = prefixes.len() - 1;
                    let next = search.screen.step(&prefixes[k], word[k])?;
                    prefixes.push(next);
                }
                if let Some(found) = search.examine(&word, &prefixes[length])? {
                    return Ok(WitnessOutcome::Found(found));
                }
            }
            let before = word.clone();
            if !next_word(&mut word, letters) {
                break;
            }
            let changed = before
                .iter()
                .zip(&word)
                .position(|(a, b)| a != b)
                .unwrap_or(0);
            prefixes.truncate(prefixes.len().min(changed + 1));
        }
    }
    let mut random = Xorshift::new(options.seed);
    for _ in 0..options.tries {
        let length = 1 + random.below(options.random_length.max(1));
        let word: Vec<usize> = (0..length).map(|_| random.below(letters)).collect();
        let reduced = search.screen.product(dim, &word)?;
        if let Some(found) = search.examine(&word, &reduced)? {
            return Ok(WitnessOutcome::Found(found));
        }
    }
    Ok(WitnessOutcome::NotFound(search.report))
}

/// A polynomial with coefficients given as text (constant first) in the usual notation,
/// e.g. `x^2 - 34*x + 1`; coefficients that are sums, such as `z^2 - z^6`, are parenthesised.
pub fn polynomial_text(coefficients: &[String]) -> String {
    let mut out = String::new();
    for (k, c) in coefficients.iter().enumerate().rev() {
        // a coefficient that is itself a sum (an element of Q(ζ_n)) is parenthesised
        let compound = c.trim_start_matches('-').contains([' ', '+', '-']);
        let (negative, magnitude) = match c.strip_prefix('-') {
            Some(rest) if !compound => (true, rest.to_string()),
            _ if compound => (false, format!("({c})")),
            _ => (false, c.clone()),
        };
        let magnitude = magnitude.as_str();
        if magnitude == "0" {
            continue;
        }
        let sign = match (out.is_empty(), negative) {
            (true, true) => "-",
            (true, false) => "",
            (false, true) => " - ",
            (false, false) => " + ",
        };
        let power = match k {
            0 => String::new(),
            1 => "x".to_string(),
            _ => format!("x^{k}"),
        };
        let body = match (magnitude, k) {
            (m, 0) => m.to_string(),
            ("1", _) => power,
            (m, _) => format!("{m}*{power}"),
        };
        out.push_str(sign);
        out.push_str(&body);
    }
    if out.is_empty() {
        out.push('0');
    }
    out
}

impl WitnessCertificate {
    /// The remaining (non-cyclotomic) factor in the usual notation.
    pub fn remaining_factor_text(&self) -> String {
        polynomial_text(&self.remaining_factor)
    }

    /// Re-verify from scratch: the word's matrix, the invariance of the block, its
    /// characteristic polynomial, the norm of the ratio polynomial, the factorisation
    /// N = Π Φ_m^{e_m} · rest, and that the rest is non-constant with no cyclotomic factor.
    pub fn recheck(&self, gens: &ProvedGenerators) -> Result<(), CertError> {
        let field = gens.field();
        crate::error::require_conductor(gens, self.conductor)?;
        let word = gens.indices_of(&self.word)?;
        require(!word.is_empty(), || "the word is empty".into())?;
        let w = gens.word_matrix(&word)?;
        let d = w.rows();
        let sorted = self.block.windows(2).all(|p| p[0] < p[1]);
        require(
            sorted && self.block.len() >= 2 && self.block.iter().all(|&i| i < d),
            || "the block must list at least two distinct coordinates in order".into(),
        )?;
        let mut inside = vec![false; d];
        for &i in &self.block {
            inside[i] = true;
        }
        for &j in &self.block {
            for i in (0..d).filter(|&i| !inside[i]) {
                require(w.get(i, j).is_zero(), || {
                    format!("the block is not invariant: entry ({i}, {j}) is non-zero")
                })?;
            }
        }
        let proof = prove_block(field, &restrict(&w, &self.block)?)?;
        let stored: Vec<Cyc> = self
            .charpoly
            .iter()
            .map(|t| field.parse(t))
            .collect::<Result<_, _>>()?;
        require(stored == proof.charpoly, || {
            "the characteristic polynomial differs".into()
        })?;
        let parse = |texts: &[String], what: &str| {
            from_strings(texts)
                .ok_or_else(|| CertError::Rejected(format!("malformed {what} coefficients")))
        };
        let norm = parse(&self.ratio_norm, "norm")?;
        require(norm == proof.norm, || "the norm polynomial differs".into())?;
        let rest = parse(&self.remaining_factor, "remaining factor")?;
        require(degree(&rest) >= 1, || {
            "the remaining factor is constant".into()
        })?;
        let mut product: IntPoly = rest.clone();
        let limit = 2 * degree(&norm) * degree(&norm);
        for factor in &self.cyclotomic_factors {
            require(
                (1..=limit as u64).contains(&factor.order)
                    && factor.multiplicity as usize <= degree(&norm),
                || format!("cyclotomic factor Φ_{} out of range", factor.order),
            )?;
            let phi = cyclotomic(factor.order);
            for _ in 0..factor.multiplicity {
                product = mul(&product, &phi);
            }
        }
        require(product == norm, || {
            "the norm is not the product of its stated factors".into()
        })?;
        require(has_no_cyclotomic_factor(&rest), || {
            "the remaining factor has a cyclotomic factor".into()
        })
    }
}
