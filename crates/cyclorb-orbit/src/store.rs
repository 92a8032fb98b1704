//! The orbit's storage: packed keys in one flat arena, Schreier records, and the hash
//! table from fingerprints to element indices.
//!
//! Keys are stored in the order they were found. Every key of a store uses one width
//! (1, 2, 4 or 8 bytes per numerator, little-endian two's complement); the width grows, and
//! the arena is re-encoded, the first time a key needs more. A key with a numerator beyond
//! `i64` is kept as big integers beside the arena (its arena slot stays zero). The table holds
//! only element indices; the full 64-bit fingerprints sit in a parallel vector, so a probe
//! compares fingerprints before it compares keys exactly.

use hashbrown::{HashMap, HashTable};
use num_bigint::BigInt;

use crate::fingerprint::bucket_hash;
use crate::key::KeyNumbers;

/// Bytes per stored numerator.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub(crate) enum Width {
    /// i8.
    W1 = 1,
    /// i16.
    W2 = 2,
    /// i32.
    W4 = 4,
    /// i64.
    W8 = 8,
}

impl Width {
    /// The narrowest width holding every number.
    fn needed(numbers: &[i64]) -> Width {
        let m = numbers.iter().fold(0i64, |m, &x| m.max(x).max(-(x + 1)));
        if m <= i8::MAX as i64 {
            Width::W1
        } else if m <= i16::MAX as i64 {
            Width::W2
        } else if m <= i32::MAX as i64 {
            Width::W4
        } else {
            Width::W8
        }
    }

    /// From a byte count (checkpoint files).
    pub(crate) fn from_bytes(b: u8) -> Option<Width> {
        match b {
            1 => Some(Width::W1),
            2 => Some(Width::W2),
            4 => Some(Width::W4),
            8 => Some(Width::W8),
            _ => None,
        }
    }
}

/// Append numbers at a width (each fits it: the caller chose the width).
fn encode_into(bytes: &mut Vec<u8>, width: Width, numbers: &[i64]) {
    for &x in numbers {
        match width {
            Width::W1 => bytes.push(x as i8 as u8),
            Width::W2 => bytes.extend_from_slice(&(x as i16).to_le_bytes()),
            Width::W4 => bytes.extend_from_slice(&(x as i32).to_le_bytes()),
            Width::W8 => bytes.extend_from_slice(&x.to_le_bytes()),
        }
    }
}

/// A stored key, as read back.
pub(crate) enum StoredKey<'a> {
    /// Machine-word numerators (in the caller's buffer) and their largest absolute value.
    Small(u64),
    /// Big numerators.
    Big(&'a [BigInt]),
}

/// Packed keys of fixed length `len_numbers` each.
#[derive(Debug, Clone)]
pub(crate) struct KeyArena {
    len_numbers: usize,
    width: Width,
    bytes: Vec<u8>,
    big: HashMap<u32, Box<[BigInt]>>,
    count: usize,
}

impl KeyArena {
    pub(crate) fn new(len_numbers: usize) -> KeyArena {
        KeyArena {
            len_numbers,
            width: Width::W1,
            bytes: Vec::new(),
            big: HashMap::new(),
            count: 0,
        }
    }

    /// The current width.
    pub(crate) fn width(&self) -> Width {
        self.width
    }

    /// The raw arena (checkpoint files).
    pub(crate) fn raw_bytes(&self) -> &[u8] {
        &self.bytes
    }

    /// The big keys by index (checkpoint files).
    pub(crate) fn big_keys(&self) -> impl Iterator<Item = (u32, &[BigInt])> {
        let mut keys: Vec<(u32, &[BigInt])> =
            self.big.iter().map(|(i, k)| (*i, k.as_ref())).collect();
        keys.sort_by_key(|(i, _)| *i);
        keys.into_iter()
    }

    /// Rebuild from checkpoint parts; `None` when the sizes do not fit.
    pub(crate) fn from_parts(
        len_numbers: usize,
        width: Width,
        bytes: Vec<u8>,
        big: Vec<(u32, Box<[BigInt]>)>,
    ) -> Option<KeyArena> {
        let stride = len_numbers * width as usize;
        if stride == 0 || bytes.len() % stride != 0 {
            return None;
        }
        let count = bytes.len() / stride;
        if big
            .iter()
            .any(|(i, k)| *i as usize >= count || k.len() != len_numbers)
        {
            return None;
        }
        Some(KeyArena {
            len_numbers,
            width,
            bytes,
            big: big.into_iter().collect(),
            count,
        })
    }

    /// Bytes held (arena, big keys at an estimate of their heap size).
    pub(crate) fn bytes_used(&self) -> usize {
        let big: usize = self
            .big
            .values()
            .map(|k| k.iter().map(|x| 32 + x.bits() as usize / 8).sum::<usize>())
            .sum();
        self.bytes.capacity() + big
    }

    /// Append a key.
    pub(crate) fn push(&mut self, key: &KeyNumbers) {
        let index = self.count as u32;
        match key {
            KeyNumbers::Small(numbers) => {
                let needed = Width::needed(numbers);
                if needed > self.width {
                    self.widen(needed);
                }
                self.encode(numbers);
            }
            KeyNumbers::Big(numbers) => {
                self.encode(&vec![0; self.len_numbers]);
                self.big.insert(index, numbers.clone().into_boxed_slice());
            }
        }
        self.count += 1;
    }

    fn encode(&mut self, numbers: &[i64]) {
        encode_into(&mut self.bytes, self.width, numbers);
    }

    fn widen(&mut self, to: Width) {
        let mut buf = vec![0i64; self.len_numbers];
        let mut bytes = Vec::with_capacity(self.count * self.len_numbers * to as usize);
        for i in 0..self.count {
            self.decode_small(i, &mut buf);
            encode_into(&mut bytes, to, &buf);
        }
        self.bytes = bytes;
        self.width = to;
    }

    /// The machine-word numerators of key i into `buf` (zeros for a big key).
    fn decode_small(&self, i: usize, buf: &mut [i64]) {
        let w = self.width as usize;
        let at = i * self.len_numbers * w;
        let src = &self.bytes[at..at + self.len_numbers * w];
        match self.width {
            Width::W1 => {
                for (o, &b) in buf.iter_mut().zip(src) {
                    *o = b as i8 as i64;
                }
            }
            Width::W2 => {
                for (o, c) in buf.iter_mut().zip(src.chunks_exact(2)) {
                    *o = i16::from_le_bytes([c[0], c[1]]) as i64;
                }
            }
            Width::W4 => {
                for (o, c) in buf.iter_mut().zip(src.chunks_exact(4)) {
                    *o = i32::from_le_bytes([c[0], c[1], c[2], c[3]]) as i64;
                }
            }
            Width::W8 => {
                for (o, c) in buf.iter_mut().zip(src.chunks_exact(8)) {
                    *o = i64::from_le_bytes(c.try_into().expect("8 bytes"));
                }
            }
        }
    }

    /// Key i: machine words into `buf` (returning their largest absolute value), or big.
    pub(crate) fn get<'a>(&'a self, i: usize, buf: &mut [i64]) -> StoredKey<'a> {
        if !self.big.is_empty() {
            if let Some(k) = self.big.get(&(i as u32)) {
                return StoredKey::Big(k);
            }
        }
        self.decode_small(i, buf);
        StoredKey::Small(crate::key::max_abs(buf))
    }

    /// Key i as owned numbers.
    pub(crate) fn key(&self, i: usize) -> KeyNumbers {
        let mut buf = vec![0i64; self.len_numbers];
        match self.get(i, &mut buf) {
            StoredKey::Small(_) => KeyNumbers::Small(buf),
            StoredKey::Big(b) => KeyNumbers::Big(b.to_vec()),
        }
    }
}

/// The elements found so far: keys, Schreier records, fingerprints and the lookup table.
#[derive(Debug, Clone)]
pub(crate) struct OrbitSet {
    pub(crate) keys: KeyArena,
    /// Parent element of each element (u32::MAX for the seed).
    pub(crate) parents: Vec<u32>,
    /// Generator that maps the parent to the element (u16::MAX for the seed).
    pub(crate) generators: Vec<u16>,
    fingerprints: Vec<u64>,
    table: HashTable<u32>,
}

impl OrbitSet {
    pub(crate) fn new(len_numbers: usize) -> OrbitSet {
        OrbitSet {
            keys: KeyArena::new(len_numbers),
            parents: Vec::new(),
            generators: Vec::new(),
            fingerprints: Vec::new(),
            table: HashTable::new(),
        }
    }

    /// Rebuild from stored keys and records, with the fingerprint of every key.
    pub(crate) fn from_parts(
        keys: KeyArena,
        parents: Vec<u32>,
        generators: Vec<u16>,
        fingerprints: Vec<u64>,
    ) -> OrbitSet {
        let mut table = HashTable::with_capacity(fingerprints.len());
        for (i, &fp) in fingerprints.iter().enumerate() {
            table.insert_unique(bucket_hash(fp), i as u32, |&j| {
                bucket_hash(fingerprints[j as usize])
            });
        }
        OrbitSet {
            keys,
            parents,
            generators,
            fingerprints,
            table,
        }
    }

    /// Number of elements.
    pub(crate) fn len(&self) -> usize {
        self.parents.len()
    }

    /// The element with this fingerprint for which `same(index)` holds.
    pub(crate) fn find(
        &self,
        fingerprint: u64,
        mut same: impl FnMut(usize) -> bool,
    ) -> Option<u32> {
        let fps = &self.fingerprints;
        self.table
            .find(bucket_hash(fingerprint), |&i| {
                fps[i as usize] == fingerprint && same(i as usize)
            })
            .copied()
    }

    /// Append a new element (the caller has checked it is new).
    pub(crate) fn insert(
        &mut self,
        key: &KeyNumbers,
        fingerprint: u64,
        parent: u32,
        generator: u16,
    ) {
        let index = self.len() as u32;
        self.keys.push(key);
        self.parents.push(parent);
        self.generators.push(generator);
        self.fingerprints.push(fingerprint);
        let fps = &self.fingerprints;
        self.table
            .insert_unique(bucket_hash(fingerprint), index, |&i| {
                bucket_hash(fps[i as usize])
            });
    }

    /// Bytes held by the whole store.
    pub(crate) fn bytes_used(&self) -> usize {
        self.keys.bytes_used()
            + self.parents.capacity() * 4
            + self.generators.capacity() * 2
            + self.fingerprints.capacity() * 8
            + self.table.allocation_size()
    }
}
