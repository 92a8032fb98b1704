//! Candidate lines as bytes, for the all-to-all of a distributed enumeration.
//!
//! A candidate is the exact key of an image (docs/orbits.md §1) with its fingerprint and
//! its Schreier data: the order key (global index of the parent) · 2¹⁶ + generator. Keys go
//! sparse: the count of non-zero numerators, then for each the gap to the previous position
//! and the value (zigzag), all as LEB128 varints; a key with a numerator beyond `i64` goes as
//! its numerators' two's-complement bytes. Nothing is rounded: decoding gives back the key.

use num_bigint::BigInt;

use crate::error::OrbitError;
use crate::key::KeyNumbers;

/// A candidate line as it travels: exact key, fingerprint, order key.
#[derive(Debug, Clone, PartialEq, Eq)]
pub(crate) struct WireCandidate {
    pub(crate) order: u64,
    pub(crate) fingerprint: u64,
    pub(crate) key: KeyNumbers,
}

const SMALL: u8 = 0;
const BIG: u8 = 1;

/// Append a number as a LEB128 varint.
pub(crate) fn put_varint(out: &mut Vec<u8>, mut x: u64) {
    while x >= 0x80 {
        out.push((x as u8) | 0x80);
        x >>= 7;
    }
    out.push(x as u8);
}

/// Append one candidate to `out`.
pub(crate) fn encode(out: &mut Vec<u8>, order: u64, fingerprint: u64, key: &KeyNumbers) {
    put_varint(out, order);
    put_varint(out, fingerprint);
    match key {
        KeyNumbers::Small(v) => {
            out.push(SMALL);
            put_varint(out, v.iter().filter(|&&x| x != 0).count() as u64);
            let mut last = 0usize;
            for (at, &x) in v.iter().enumerate().filter(|(_, &x)| x != 0) {
                put_varint(out, (at - last) as u64);
                put_varint(out, ((x << 1) ^ (x >> 63)) as u64);
                last = at;
            }
        }
        KeyNumbers::Big(b) => {
            out.push(BIG);
            put_varint(out, b.len() as u64);
            for x in b {
                let bytes = x.to_signed_bytes_le();
                put_varint(out, bytes.len() as u64);
                out.extend_from_slice(&bytes);
            }
        }
    }
}

/// Reads candidates back from one rank's buffer (or a rank's checkpoint).
pub(crate) struct Reader<'a> {
    bytes: &'a [u8],
    at: usize,
    key_len: usize,
    from: String,
}

impl<'a> Reader<'a> {
    /// The candidates in `bytes`, keys of `key_len` numerators; `from` names the sender
    /// (a rank, a file) in errors.
    pub(crate) fn new(bytes: &'a [u8], key_len: usize, from: String) -> Reader<'a> {
        Reader {
            bytes,
            at: 0,
            key_len,
            from,
        }
    }

    fn malformed(&self, what: &str) -> OrbitError {
        OrbitError::Invalid(format!(
            "malformed candidate from {} at byte {}: {what}",
            self.from, self.at
        ))
    }

    /// The next LEB128 number.
    pub(crate) fn varint(&mut self) -> Result<u64, OrbitError> {
        let mut x = 0u64;
        for shift in (0..64).step_by(7) {
            let &b = self
                .bytes
                .get(self.at)
                .ok_or_else(|| self.malformed("truncated number"))?;
            self.at += 1;
            x |= u64::from(b & 0x7f) << shift;
            if b & 0x80 == 0 {
                return Ok(x);
            }
        }
        Err(self.malformed("number longer than 64 bits"))
    }

    fn index(&mut self, bound: usize) -> Result<usize, OrbitError> {
        let x = self.varint()?;
        usize::try_from(x)
            .ok()
            .filter(|&i| i < bound)
            .ok_or_else(|| self.malformed("index out of range"))
    }

    /// Whether every byte has been read.
    pub(crate) fn at_end(&self) -> bool {
        self.at == self.bytes.len()
    }

    /// The next candidate, `None` at the end of the buffer.
    pub(crate) fn next_candidate(&mut self) -> Result<Option<WireCandidate>, OrbitError> {
        if self.at_end() {
            return Ok(None);
        }
        let order = self.varint()?;
        let fingerprint = self.varint()?;
        let tag = self.index(2)? as u8;
        let key = if tag == SMALL {
            let mut v = vec![0i64; self.key_len];
            let count = self.index(self.key_len + 1)?;
            let mut at = 0usize;
            for k in 0..count {
                let gap = self.index(self.key_len)?;
                at += gap;
                if at >= self.key_len || (k > 0 && gap == 0) {
                    return Err(self.malformed("position out of order"));
                }
                let z = self.varint()?;
                v[at] = ((z >> 1) as i64) ^ -((z & 1) as i64);
            }
            KeyNumbers::Small(v)
        } else {
            let len = self.index(self.key_len + 1)?;
            if len != self.key_len {
                return Err(self.malformed("key of the wrong length"));
            }
            let mut b = Vec::with_capacity(len);
            for _ in 0..len {
                let n = self.index(self.bytes.len() + 1)?;
                let end = self.at + n;
                let chunk = self
                    .bytes
                    .get(self.at..end)
                    .ok_or_else(|| self.malformed("truncated big number"))?;
                b.push(BigInt::from_signed_bytes_le(chunk));
                self.at = end;
            }
            KeyNumbers::Big(b)
        };
        Ok(Some(WireCandidate {
            order,
            fingerprint,
            key,
        }))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn candidates_survive_the_wire() {
        let small = KeyNumbers::Small(vec![0, 5, -1, 0, i64::MAX, i64::MIN, 0, 7]);
        let big = KeyNumbers::Big(
            [
                "0",
                "-340282366920938463463374607431768211457",
                "12",
                "0",
                "1",
                "0",
                "0",
                "-3",
            ]
            .iter()
            .map(|t| t.parse().unwrap())
            .collect(),
        );
        let mut bytes = Vec::new();
        encode(&mut bytes, 3 << 16 | 2, 0x7fff_ffff, &small);
        encode(&mut bytes, u64::MAX, 0, &big);
        let mut reader = Reader::new(&bytes, 8, "rank 1".into());
        let a = reader.next_candidate().unwrap().unwrap();
        assert_eq!(
            (a.order, a.fingerprint, &a.key),
            (3 << 16 | 2, 0x7fff_ffff, &small)
        );
        let b = reader.next_candidate().unwrap().unwrap();
        assert_eq!((b.order, b.key), (u64::MAX, big));
        assert!(reader.next_candidate().unwrap().is_none());
    }

    #[test]
    fn a_truncated_buffer_is_an_error_not_a_panic() {
        let mut bytes = Vec::new();
        encode(&mut bytes, 9, 4, &KeyNumbers::Small(vec![1, 2, 3]));
        for cut in 0..bytes.len() {
            let mut reader = Reader::new(&bytes[..cut], 3, "rank 0".into());
            assert!(matches!(reader.next_candidate(), Err(_) | Ok(None)));
        }
        let mut reader = Reader::new(&bytes[..bytes.len() - 1], 3, "rank 2".into());
        let e = reader.next_candidate().unwrap_err().to_string();
        assert!(e.contains("rank 2"), "{e}");
    }
}
