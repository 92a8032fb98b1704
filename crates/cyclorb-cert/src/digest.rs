//! A short fingerprint of a permutation, so a certificate can name the permutations it was
//! computed from without holding them (millions of entries): FNV-1a (64 bits,
//! [`cyclorb_field::Fnv64`]) over the images as little-endian 32-bit words, in
//! hexadecimal. Re-checking recomputes the permutations and compares; the fingerprint only
//! pins them down.

use cyclorb_field::Fnv64;

/// The FNV-1a 64-bit digest of the image list, as 16 hexadecimal digits.
pub(crate) fn permutation_digest(perm: &[u32]) -> String {
    let mut h = Fnv64::new();
    h.write(perm.iter().flat_map(|x| x.to_le_bytes()));
    h.hex()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn images_are_read_as_little_endian_words() {
        // FNV-1a 64 of the bytes 61 00 00 00 (the FNV definition, common practice: xor
        // then multiply by 2^40 + 2^8 + 0xb3 for each byte, from the offset basis)
        let mut h: u64 = 0xcbf2_9ce4_8422_2325;
        for b in [0x61u8, 0, 0, 0] {
            h = (h ^ u64::from(b)).wrapping_mul(0x0000_0100_0000_01b3);
        }
        assert_eq!(permutation_digest(&[0x61]), format!("{h:016x}"));
        assert_ne!(permutation_digest(&[0, 1]), permutation_digest(&[1, 0]));
    }
}
