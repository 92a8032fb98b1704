//! Words in the generators to try as witnesses: all words up to a length, shortest
//! first, one per conjugacy class of cyclic rotation; then seeded pseudo-random words.
//!
//! A cyclic rotation of a word is a conjugate element (same eigenvalues), and a proper
//! power u^k has the eigenvalue ratios of u raised to the k-th power (roots of unity
//! exactly when those of u are), so only aperiodic words that are least among their
//! rotations (Lyndon words) need testing.

/// Whether `word` is a Lyndon word: strictly less than each of its proper rotations.
pub(crate) fn is_lyndon(word: &[usize]) -> bool {
    let n = word.len();
    (1..n).all(|r| {
        let rotated = word[r..].iter().chain(&word[..r]);
        word.iter().lt(rotated)
    })
}

/// The next word of the same length in lexicographic order over `letters` letters, or
/// `None` after the last.
pub(crate) fn next_word(word: &mut [usize], letters: usize) -> bool {
    for position in (0..word.len()).rev() {
        word[position] += 1;
        if word[position] < letters {
            return true;
        }
        word[position] = 0;
    }
    false
}

/// A xorshift64* generator: deterministic for a seed, for reproducible searches.
pub(crate) struct Xorshift(u64);

impl Xorshift {
    /// A generator from a seed (0 is replaced by a fixed non-zero state).
    pub(crate) fn new(seed: u64) -> Xorshift {
        Xorshift(if seed == 0 {
            0x9e37_79b9_7f4a_7c15
        } else {
            seed
        })
    }

    /// The next value in 0..bound (bound ≥ 1).
    pub(crate) fn below(&mut self, bound: usize) -> usize {
        let mut x = self.0;
        x ^= x >> 12;
        x ^= x << 25;
        x ^= x >> 27;
        self.0 = x;
        (x.wrapping_mul(0x2545_f491_4f6c_dd1d) >> 33) as usize % bound
    }
}
