//! Lines recomputed from their Schreier records, one breadth-first layer at a time.
//!
//! Every element i > 0 of layer L + 1 was found as X_g applied to its parent in layer L, so
//! the keys of layer L + 1 follow from those of layer L and the records alone: the key of i is
//! the key of the line X_g·(parent's key), computed as during enumeration (integer form of X_g
//! and normalisation, or exact `Cyc` arithmetic when a bound fails). Only two layers of keys
//! are held at a time. The compact store uses this for what needs every line after the
//! enumeration (the Poincaré sum, the induced permutations, a resume from a checkpoint that
//! holds records only); the result is the same lines, hence the same answers, as a run that
//! kept every key.

use std::ops::Range;
use std::path::Path;

use crate::compact::CompactSet;
use crate::engine::{split, Orbit};
use crate::error::{joined, OrbitError};
use crate::problem::OrbitProblem;
use crate::set::LineStore;
use crate::step::Workspace;
use crate::store::{KeyArena, OrbitSet};

/// The Schreier records of elements 0..len: parent and generator of element i > 0.
pub(crate) type Records<'a> = &'a (dyn Fn(usize) -> (usize, usize) + Sync);

/// The element ranges of the layers of an orbit with `len` elements and these layer ends
/// (the last range is the layer being built when the run stopped inside it).
pub(crate) fn layer_ranges(layer_ends: &[usize], len: usize) -> Vec<Range<usize>> {
    let mut ranges = Vec::with_capacity(layer_ends.len() + 1);
    let mut start = 0;
    for &end in layer_ends.iter().chain(std::iter::once(&len)) {
        if end > start {
            ranges.push(start..end);
            start = end;
        }
    }
    ranges
}

impl OrbitProblem {
    /// Call `visit(start, keys)` for every layer in order, in parts of consecutive elements
    /// from `start` on, with their keys recomputed from the records on `threads` threads (one
    /// part per thread). With `spill`, a visited layer's keys go to files there while the
    /// next layer is computed from them. An error when a record does not point into the
    /// previous layer (records of a breadth-first search always do).
    pub(crate) fn regenerate(
        &self,
        records: Records<'_>,
        ranges: &[Range<usize>],
        threads: usize,
        spill: Option<&Path>,
        mut visit: impl FnMut(usize, &KeyArena) -> Result<(), OrbitError>,
    ) -> Result<(), OrbitError> {
        let (blocks, phi) = (self.dimension(), self.kernel.degree());
        let mut previous: Vec<(usize, KeyArena)> = Vec::new();
        for range in ranges {
            let layer = if range.start == 0 {
                if range.end != 1 {
                    return Err(bad_record(1));
                }
                let mut keys = KeyArena::new(blocks, phi);
                keys.push(&self.seed_key);
                vec![(0, keys)]
            } else {
                let prev = &previous;
                let computed: Vec<Result<(usize, KeyArena), OrbitError>> =
                    std::thread::scope(|scope| {
                        let handles: Vec<_> = split(range.clone(), threads)
                            .into_iter()
                            .map(|part| scope.spawn(move || self.layer_part(records, part, prev)))
                            .collect();
                        handles.into_iter().map(joined).collect()
                    });
                computed.into_iter().collect::<Result<_, _>>()?
            };
            let mut layer = layer;
            for (start, keys) in &mut layer {
                visit(*start, keys)?;
                if let Some(dir) = spill {
                    keys.spill(dir).map_err(|e| OrbitError::Io {
                        path: "spilled keys".into(),
                        reason: e.to_string(),
                    })?;
                }
            }
            previous = layer;
        }
        Ok(())
    }

    /// The keys of elements `part`, whose parents are in the parts of `previous`.
    fn layer_part(
        &self,
        records: Records<'_>,
        part: Range<usize>,
        previous: &[(usize, KeyArena)],
    ) -> Result<(usize, KeyArena), OrbitError> {
        let mut ws = Workspace::new(self);
        let mut keys = KeyArena::new(self.dimension(), self.kernel.degree());
        for i in part.clone() {
            let (parent, generator) = records(i);
            let holder = previous
                .iter()
                .rev()
                .find(|(start, keys)| *start <= parent && parent < start + keys.len());
            let Some((start, parent_keys)) = holder else {
                return Err(bad_record(i));
            };
            if generator >= self.generators.operators().len() {
                return Err(bad_record(i));
            }
            ws.load_stored(parent_keys, parent - start)
                .map_err(|reason| OrbitError::Io {
                    path: "spilled keys".into(),
                    reason,
                })?;
            keys.push(&self.image_key(&mut ws, generator)?);
        }
        Ok((part.start, keys))
    }

    /// The same orbit with every key in memory (for what reads every line at random).
    pub(crate) fn materialise(&self, orbit: &Orbit, threads: usize) -> Result<Orbit, OrbitError> {
        let mut set = OrbitSet::new(self.dimension(), self.kernel.degree());
        let store = &orbit.set;
        let records = |i: usize| store.record(i);
        let ranges = layer_ranges(&orbit.layer_ends, orbit.len());
        self.regenerate(&records, &ranges, threads, None, |start, keys| {
            for j in 0..keys.len() {
                let (i, key) = (start + j, keys.key(j));
                let (parent, generator) = if i == 0 {
                    (u32::MAX, u16::MAX)
                } else {
                    let (p, g) = store.record(i);
                    (p as u32, g as u16)
                };
                set.insert(
                    &key,
                    self.key_fingerprint(&key, false) as u32,
                    parent,
                    generator,
                );
            }
            Ok(())
        })?;
        Ok(Orbit {
            set: LineStore::Memory(set),
            processed: orbit.processed,
            layer_ends: orbit.layer_ends.clone(),
            stop: orbit.stop,
            compute_seconds: orbit.compute_seconds,
        })
    }
}

impl OrbitProblem {
    /// The compact store of an orbit given by its records (a compact checkpoint): every key
    /// is recomputed once for its fingerprint, and the last layers' keys stay in the window.
    pub(crate) fn compact_from_records(
        &self,
        parents: &[u32],
        generators: &[u16],
        layer_ends: &[usize],
    ) -> Result<LineStore, OrbitError> {
        let len = parents.len();
        let mut set = CompactSet::new(self.dimension(), self.kernel.degree());
        let records = |i: usize| (parents[i] as usize, generators[i] as usize);
        let ranges = layer_ranges(layer_ends, len);
        let threads = std::thread::available_parallelism().map_or(1, |n| n.get());
        let layer_starts: Vec<usize> = ranges.iter().map(|r| r.start).collect();
        self.regenerate(&records, &ranges, threads, None, |start, keys| {
            if layer_starts.binary_search(&start).is_ok() {
                set.open_layer(start)
                    .map_err(|e| OrbitError::Invalid(e.to_string()))?;
            }
            for j in 0..keys.len() {
                let (i, key) = (start + j, keys.key(j));
                let fingerprint = self.key_fingerprint(&key, true);
                set.insert(&key, fingerprint, parents[i], generators[i] as u8);
            }
            Ok(())
        })?;
        if layer_ends.last() == Some(&len) {
            set.open_layer(len)
                .map_err(|e| OrbitError::Invalid(e.to_string()))?;
        }
        Ok(LineStore::Compact(set))
    }
}

fn bad_record(i: usize) -> OrbitError {
    OrbitError::Invalid(format!(
        "element {i}: its Schreier record does not point into the previous layer"
    ))
}
