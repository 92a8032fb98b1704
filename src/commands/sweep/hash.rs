//! FNV-1a (64-bit) over lines of text: the run and plan hashes of a sweep.
//!
//! Not a cryptographic hash: it only tells whether a stored result was made for the same
//! run description (the theory's exact data enter through their SHA-256 construction hash,
//! `Theory::construction_hash`: the data hash, or for a product or Galois conjugate the
//! hashes of its building blocks, so a large product's F-blocks are never filled).

/// FNV-1a 64 offset basis (Fowler–Noll–Vo, common practice).
const OFFSET: u64 = 0xcbf2_9ce4_8422_2325;
/// FNV-1a 64 prime (Fowler–Noll–Vo, common practice).
const PRIME: u64 = 0x0000_0100_0000_01b3;

/// A running FNV-1a 64 hash.
pub struct Fnv64(u64);

impl Default for Fnv64 {
    fn default() -> Self {
        Fnv64(OFFSET)
    }
}

impl Fnv64 {
    /// The empty hash.
    pub fn new() -> Fnv64 {
        Fnv64::default()
    }

    /// Hash one line (a newline is appended, so lines cannot run together).
    pub fn line(&mut self, text: &str) {
        for &b in text.as_bytes().iter().chain(b"\n") {
            self.0 ^= u64::from(b);
            self.0 = self.0.wrapping_mul(PRIME);
        }
    }

    /// The hash as 16 hex digits.
    pub fn hex(&self) -> String {
        format!("{:016x}", self.0)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn known_values() {
        // FNV-1a 64("a") = af63dc4c8601ec8c: the Fowler–Noll–Vo test vectors (from memory).
        let mut h = Fnv64(OFFSET);
        h.0 ^= u64::from(b'a');
        h.0 = h.0.wrapping_mul(PRIME);
        assert_eq!(format!("{:016x}", h.0), "af63dc4c8601ec8c");
        let mut a = Fnv64::new();
        a.line("x");
        let mut b = Fnv64::new();
        b.line("y");
        assert_ne!(a.hex(), b.hex());
    }
}
