//! A short fingerprint of a permutation, so a certificate can name the permutations it was
//! computed from without holding them (millions of entries): FNV-1a (64 bits) over the
//! images as little-endian 32-bit words, in hexadecimal. Re-checking recomputes the
//! permutations and compares; the fingerprint only pins them down.

/// FNV-1a, 64 bits (offset basis cbf29ce484222325, prime 100000001b3).
fn fnv1a(bytes: impl IntoIterator<Item = u8>) -> u64 {
    bytes.into_iter().fold(0xcbf2_9ce4_8422_2325u64, |h, byte| {
        (h ^ u64::from(byte)).wrapping_mul(0x0000_0100_0000_01b3)
    })
}

/// The FNV-1a 64-bit digest of the image list, as 16 hexadecimal digits.
pub(crate) fn permutation_digest(perm: &[u32]) -> String {
    format!("{:016x}", fnv1a(perm.iter().flat_map(|x| x.to_le_bytes())))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn published_test_vectors() {
        // the FNV-1a 64-bit test vectors of Fowler, Noll and Vo (from memory):
        // "" → cbf29ce484222325, "a" → af63dc4c8601ec8c, "foobar" → 85944171f73967e8
        assert_eq!(fnv1a(*b""), 0xcbf2_9ce4_8422_2325);
        assert_eq!(fnv1a(*b"a"), 0xaf63_dc4c_8601_ec8c);
        assert_eq!(fnv1a(*b"foobar"), 0x8594_4171_f739_67e8);
        // a permutation is read as little-endian words: [0x61] is the bytes 61 00 00 00
        assert_eq!(
            permutation_digest(&[0x61]),
            format!("{:016x}", fnv1a([0x61, 0, 0, 0]))
        );
        assert_ne!(permutation_digest(&[0, 1]), permutation_digest(&[1, 0]));
    }
}
