//! FNV-1a (64-bit) over lines of text: the run and plan hashes of a sweep.
//!
//! Not a cryptographic hash: it only tells whether a stored result was made for the same
//! run description (the theory's exact data enter through their SHA-256 construction hash,
//! `Theory::construction_hash`: the data hash, or for a product or Galois conjugate the
//! hashes of its building blocks, so a large product's F-blocks are never filled).

/// A running FNV-1a 64 hash of lines ([`cyclorb_field::Fnv64`]).
#[derive(Default)]
pub struct Fnv64(cyclorb_field::Fnv64);

impl Fnv64 {
    /// The empty hash.
    pub fn new() -> Fnv64 {
        Fnv64::default()
    }

    /// Hash one line (a newline is appended, so lines cannot run together).
    pub fn line(&mut self, text: &str) {
        self.0.write(text.bytes().chain(*b"\n"));
    }

    /// The hash as 16 hex digits.
    pub fn hex(&self) -> String {
        self.0.hex()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn known_values() {
        // a line is hashed with its newline (the published vectors are tested in
        // cyclorb-field's `fnv`)
        let mut line = Fnv64::new();
        line.line("a");
        let mut bytes = cyclorb_field::Fnv64::new();
        bytes.write(*b"a\n");
        assert_eq!(line.hex(), bytes.hex());
        let mut a = Fnv64::new();
        a.line("x");
        let mut b = Fnv64::new();
        b.line("y");
        assert_ne!(a.hex(), b.hex());
    }
}
