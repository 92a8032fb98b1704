//! Shared helpers of the integration tests: a seeded xorshift generator, random field
//! elements and matrices, and the iteration scale.
#![allow(dead_code)] // each test binary uses a different subset

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;

/// The conductors every property test runs over.
pub const CONDUCTORS: [u32; 4] = [1, 5, 16, 60];

/// Iteration count: `base` times the integer in `CYCLORB_TEST_ITERS` (default 1).
pub fn iterations(base: usize) -> usize {
    let scale = std::env::var("CYCLORB_TEST_ITERS")
        .ok()
        .and_then(|s| s.parse::<usize>().ok())
        .unwrap_or(1);
    base * scale.max(1)
}

/// Marsaglia's xorshift64 (13, 7, 17): a tiny deterministic generator.
pub struct XorShift(u64);

impl XorShift {
    /// A generator from a non-zero seed (zero is replaced).
    pub fn new(seed: u64) -> XorShift {
        XorShift(if seed == 0 {
            0x2545_f491_4f6c_dd1d
        } else {
            seed
        })
    }

    /// The next 64 random bits.
    pub fn next_u64(&mut self) -> u64 {
        self.0 ^= self.0 << 13;
        self.0 ^= self.0 >> 7;
        self.0 ^= self.0 << 17;
        self.0
    }

    /// Uniform-ish in 0..bound (bound ≥ 1).
    pub fn below(&mut self, bound: u64) -> u64 {
        self.next_u64() % bound
    }

    /// Uniform-ish in lo..=hi.
    pub fn range(&mut self, lo: i64, hi: i64) -> i64 {
        lo + self.below((hi - lo + 1) as u64) as i64
    }
}

/// A random element: a few power-basis terms ζ^e with coefficients m/2^k, |m| ≤ 8, k ≤ 4
/// (the benchmark distribution), zero about one time in six.
pub fn random_cyc(field: &CyclotomicField, rng: &mut XorShift) -> Cyc {
    if rng.below(6) == 0 {
        return field.zero();
    }
    let terms = 1 + rng.below(3);
    let mut acc = field.zero();
    for _ in 0..terms {
        let m = rng.range(-8, 8);
        let k = rng.below(5) as u32;
        let c = field.rational(m, 1 << k).unwrap();
        let z = field.zeta_pow(rng.below(field.conductor() as u64) as i64);
        acc = field.add(&acc, &field.mul(&c, &z).unwrap()).unwrap();
    }
    acc
}

/// A random rows × cols matrix of [`random_cyc`] entries.
pub fn random_matrix(
    field: &CyclotomicField,
    rng: &mut XorShift,
    rows: usize,
    cols: usize,
) -> Matrix {
    let data = (0..rows)
        .map(|_| (0..cols).map(|_| random_cyc(field, rng)).collect())
        .collect();
    Matrix::from_rows(data).unwrap()
}

/// A random vector of length `len`.
pub fn random_vector(field: &CyclotomicField, rng: &mut XorShift, len: usize) -> Vec<Cyc> {
    (0..len).map(|_| random_cyc(field, rng)).collect()
}

/// A random matrix of rank at most `rank`: a product (rows × rank)(rank × cols).
pub fn random_low_rank(
    field: &CyclotomicField,
    rng: &mut XorShift,
    rows: usize,
    cols: usize,
    rank: usize,
) -> Matrix {
    let left = random_matrix(field, rng, rows, rank);
    let right = random_matrix(field, rng, rank, cols);
    left.mul(field, &right).unwrap()
}

/// Is every entry of the vector zero?
pub fn is_zero_vector(v: &[Cyc]) -> bool {
    v.iter().all(Cyc::is_zero)
}
