//! Breadth-first saturation of an orbit of lines, with limits, stops, checkpoints, threads.
//!
//! Elements are numbered in the order found; the seed's line is element 0. Layer L+1 is the
//! set of lines first reached from layer L. The frontier is processed in chunks: the images
//! of a chunk's elements under every generator are computed and looked up in parallel (the
//! store is read-only then), and the new lines are inserted afterwards as if one by one in
//! the order (element, generator): threads sharded by fingerprint drop repetitions and
//! encode keys, one thread numbers the new lines in that order, and the threads index them
//! in their shards ([`crate::insert`]). So the element order, the layer sizes and the
//! Schreier records do not depend on the number of threads or on the chunk size, and a run
//! stopped between chunks and resumed finds exactly what an uninterrupted run finds.
//!
//! The orbit is saturated when every stored element has been processed: then every generator
//! maps every stored line to a stored line. Forward images suffice (docs/orbits.md §2): a finite
//! set closed under an invertible map is permuted by it, hence closed under its inverse.

use std::ops::Range;
use std::path::PathBuf;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use std::time::{Duration, Instant};

use cyclorb_field::Cyc;
use serde::{Deserialize, Serialize};

use crate::error::{joined, OrbitError};
use crate::insert::InsertScratch;
use crate::key::KeyNumbers;
use crate::problem::OrbitProblem;
use crate::set::{Fetched, LineStore, StoreKind};
use crate::sparse_numerators::SparseNumerators;
use crate::step::{Candidate, Outcome, Pending, Workspace};

/// Where and how often to write checkpoints.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct CheckpointPlan {
    /// The checkpoint file (written to `path` + `.tmp`, then renamed).
    pub path: PathBuf,
    /// Time between periodic checkpoints; one is also written when a run stops early.
    pub every: Duration,
}

/// How to run an enumeration.
#[derive(Debug, Clone)]
pub struct OrbitOptions {
    /// Stop (unsaturated) rather than store more than this many lines.
    pub limit: Option<usize>,
    /// Stop (unsaturated) before the run would hold more than this many bytes: the store
    /// together with the largest working set of the next chunk ([`OrbitProblem::chunk_bytes`]),
    /// or, when [`Self::resident`] is given, the whole process's resident memory. The chunk
    /// is shortened so that its working set stays within an eighth of the ceiling.
    pub memory_ceiling: Option<usize>,
    /// The process's resident memory in bytes now, supplied by the host (the library reads
    /// no operating-system figures itself); `None` from the probe when it is unavailable.
    pub resident: Option<fn() -> Option<u64>>,
    /// Worker threads (1 or more); the result does not depend on it.
    pub threads: usize,
    /// Frontier elements per chunk (between chunks the run can stop or checkpoint).
    pub chunk_size: usize,
    /// Periodic checkpoints.
    pub checkpoint: Option<CheckpointPlan>,
    /// Set (for example by a signal handler) to stop after the current chunk.
    pub stop: Option<Arc<AtomicBool>>,
    /// The store of a new enumeration ([`OrbitProblem::enumerate`]); a continued orbit keeps
    /// the store it has.
    pub store: StoreKind,
    /// With the compact store: keep the keys of finished layers in files in this directory,
    /// so that only the layer being built is held in memory (an error with the memory store).
    pub spill: Option<PathBuf>,
}

impl Default for OrbitOptions {
    fn default() -> Self {
        OrbitOptions {
            limit: None,
            memory_ceiling: None,
            resident: None,
            threads: 1,
            chunk_size: 2048,
            checkpoint: None,
            stop: None,
            store: StoreKind::Memory,
            spill: None,
        }
    }
}

/// Why a run ended before saturation.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum StopReason {
    /// The line limit was reached.
    Limit,
    /// The memory ceiling was reached.
    Memory,
    /// The stop flag was set (Ctrl-C, SIGTERM, or the caller).
    Interrupted,
}

/// A snapshot for progress displays, sent after every chunk.
#[derive(Debug, Clone, PartialEq)]
pub struct Progress {
    /// The breadth-first depth being processed (the seed is depth 0).
    pub layer: usize,
    /// Lines found so far.
    pub lines: usize,
    /// Elements processed so far (all of their images are stored).
    pub processed: usize,
    /// End of the layer being processed: `processed` reaches it when the layer is done.
    pub layer_end: usize,
    /// Lines found per second in this run.
    pub lines_per_second: f64,
    /// Bytes held by the store.
    pub store_bytes: usize,
    /// Time since this run started.
    pub elapsed: Duration,
}

/// Receives [`Progress`] snapshots; the library itself prints nothing.
pub trait ProgressObserver {
    /// Called after every chunk.
    fn progress(&mut self, progress: &Progress);
}

impl<F: FnMut(&Progress)> ProgressObserver for F {
    fn progress(&mut self, progress: &Progress) {
        self(progress)
    }
}

/// An observer that ignores everything.
#[derive(Debug, Clone, Copy, Default)]
pub struct Silent;

impl ProgressObserver for Silent {
    fn progress(&mut self, _: &Progress) {}
}

/// The lines found, in order, with their Schreier records and layers.
#[derive(Debug)]
pub struct Orbit {
    pub(crate) set: LineStore,
    pub(crate) processed: usize,
    /// End index of every layer whose extent is known (layer 0 = the seed).
    pub(crate) layer_ends: Vec<usize>,
    pub(crate) stop: Option<StopReason>,
    pub(crate) compute_seconds: f64,
}

impl Orbit {
    /// Number of distinct lines found.
    pub fn len(&self) -> usize {
        self.set.len()
    }

    /// Never true: the seed's line is always there.
    pub fn is_empty(&self) -> bool {
        self.set.len() == 0
    }

    /// True when every generator maps every stored line to a stored line: the orbit is
    /// complete.
    pub fn is_saturated(&self) -> bool {
        self.processed == self.set.len()
    }

    /// Why the run stopped early (`None` when saturated).
    pub fn stop_reason(&self) -> Option<StopReason> {
        if self.is_saturated() {
            None
        } else {
            self.stop
        }
    }

    /// Number of elements whose images have all been stored.
    pub fn processed(&self) -> usize {
        self.processed
    }

    /// New lines found at each breadth-first depth (the last entry may be a layer still
    /// being generated when the run stopped early).
    pub fn layer_sizes(&self) -> Vec<usize> {
        let mut sizes = Vec::with_capacity(self.layer_ends.len() + 1);
        let mut start = 0;
        for &end in &self.layer_ends {
            sizes.push(end - start);
            start = end;
        }
        if self.set.len() > start {
            sizes.push(self.set.len() - start);
        }
        sizes
    }

    /// The generators (indices) whose product maps the seed's line to element `index`, in
    /// the order they are applied: the line is X_{w[m−1]} ⋯ X_{w[0]} · seed. Empty for the seed
    /// itself and for an index out of range.
    pub fn word(&self, index: usize) -> Vec<usize> {
        let mut word = Vec::new();
        let mut at = index;
        while at < self.set.len() && at != 0 {
            let (parent, generator) = self.set.record(at);
            word.push(generator);
            at = parent;
        }
        word.reverse();
        word
    }

    /// The Schreier record of element `index`: (parent, generator), `None` for the seed.
    pub fn schreier(&self, index: usize) -> Option<(usize, usize)> {
        (index != 0 && index < self.set.len()).then(|| self.set.record(index))
    }

    /// Which store holds the lines.
    pub fn store_kind(&self) -> StoreKind {
        self.set.kind()
    }

    /// Bytes held by the store (keys, records, fingerprints, hash table).
    pub fn store_bytes(&self) -> usize {
        self.set.bytes_used()
    }

    /// Of [`Self::store_bytes`], the bytes of the keys the compact store holds for its window
    /// of recent layers (0 for the memory store): the rest is what every line costs.
    pub fn window_bytes(&self) -> usize {
        self.set.window_bytes()
    }

    /// Store bytes per line.
    pub fn bytes_per_element(&self) -> f64 {
        self.store_bytes() as f64 / self.len().max(1) as f64
    }

    /// Bytes per stored key numerator (1, 2, 4 or 8; big keys are kept apart); for the
    /// compact store, of the keys it still holds.
    pub fn numerator_width(&self) -> usize {
        self.set.numerator_width()
    }

    /// Number of held keys with a numerator beyond `i64` (kept as big integers).
    pub fn big_keys(&self) -> usize {
        self.set.big_keys()
    }

    /// Seconds spent enumerating, over every run that led here (resumed runs included).
    pub fn compute_seconds(&self) -> f64 {
        self.compute_seconds
    }
}

pub(crate) fn split(range: Range<usize>, parts: usize) -> Vec<Range<usize>> {
    let len = range.len();
    let parts = parts.clamp(1, len.max(1));
    (0..parts)
        .map(|p| range.start + len * p / parts..range.start + len * (p + 1) / parts)
        .collect()
}

impl OrbitProblem {
    /// The orbit with only the seed's line, nothing processed, in the memory store.
    pub fn start(&self) -> Orbit {
        self.start_in(StoreKind::Memory)
    }

    /// The orbit with only the seed's line, nothing processed, in the given store.
    pub fn start_in(&self, kind: StoreKind) -> Orbit {
        let mut set = LineStore::new(kind, self.dimension(), self.kernel.degree());
        let fp = self.key_fingerprint(&self.seed_key, set.wide());
        set.insert(&self.seed_key, fp, u32::MAX, u16::MAX);
        // a new layer of the memory store or of an empty window cannot fail
        let _ = set.open_layer(1);
        Orbit {
            set,
            processed: 0,
            layer_ends: vec![1],
            stop: None,
            compute_seconds: 0.0,
        }
    }

    /// Enumerate the orbit of the seed's line from the start.
    pub fn enumerate(
        &self,
        options: &OrbitOptions,
        observer: &mut dyn ProgressObserver,
    ) -> Result<Orbit, OrbitError> {
        self.extend(self.start_in(options.store), options, observer)
    }

    /// Continue a partial orbit (from a run that stopped, or from [`Self::resume`]) until it
    /// saturates or stops again.
    pub fn extend(
        &self,
        mut orbit: Orbit,
        options: &OrbitOptions,
        observer: &mut dyn ProgressObserver,
    ) -> Result<Orbit, OrbitError> {
        let started = Instant::now();
        let base_seconds = orbit.compute_seconds;
        let found_before = orbit.len();
        let mut last_checkpoint = Instant::now();
        orbit.stop = None;
        self.check_store_fits(orbit.set.kind())?;
        if let Some(dir) = &options.spill {
            orbit.set.spill_to(dir)?;
        }
        let threads = options.threads.max(1);
        let mut workspaces: Vec<Workspace> = (0..threads).map(|_| Workspace::new(self)).collect();
        let mut scratch = InsertScratch::new(threads);
        let chunk_size = self.chunk_len(options);
        loop {
            let end = *orbit.layer_ends.last().unwrap_or(&0);
            if orbit.processed == end {
                if orbit.set.len() == end {
                    break;
                }
                orbit.layer_ends.push(orbit.set.len());
                orbit.set.open_layer(orbit.set.len())?;
                continue;
            }
            let chunk = orbit.processed..end.min(orbit.processed + chunk_size);
            if let Some(reason) = self.should_stop(&orbit, options, chunk.len()) {
                orbit.stop = Some(reason);
                break;
            }
            let parts = self.expand_parts(&orbit.set, chunk.clone(), &mut workspaces)?;
            if !self.insert_parts(&mut orbit.set, parts, &mut scratch, options.limit)? {
                orbit.stop = Some(StopReason::Limit);
                break;
            }
            orbit.processed = chunk.end;
            let elapsed = started.elapsed();
            orbit.compute_seconds = base_seconds + elapsed.as_secs_f64();
            observer.progress(&Progress {
                layer: orbit.layer_ends.len() - 1,
                lines: orbit.len(),
                processed: orbit.processed,
                layer_end: end,
                lines_per_second: (orbit.len() - found_before) as f64
                    / elapsed.as_secs_f64().max(1e-9),
                store_bytes: orbit.store_bytes(),
                elapsed,
            });
            if let Some(plan) = &options.checkpoint {
                if last_checkpoint.elapsed() >= plan.every {
                    self.write_checkpoint(&orbit, &plan.path)?;
                    last_checkpoint = Instant::now();
                }
            }
        }
        orbit.compute_seconds = base_seconds + started.elapsed().as_secs_f64();
        if orbit.stop.is_some() {
            if let Some(plan) = &options.checkpoint {
                self.write_checkpoint(&orbit, &plan.path)?;
            }
        }
        Ok(orbit)
    }

    pub(crate) fn should_stop(
        &self,
        orbit: &Orbit,
        options: &OrbitOptions,
        chunk: usize,
    ) -> Option<StopReason> {
        if options
            .stop
            .as_ref()
            .is_some_and(|f| f.load(Ordering::SeqCst))
        {
            return Some(StopReason::Interrupted);
        }
        let ceiling = options.memory_ceiling?;
        let needed = orbit.store_bytes().saturating_add(self.chunk_bytes(chunk));
        let resident = options
            .resident
            .and_then(|probe| probe())
            .map_or(0, |b| usize::try_from(b).unwrap_or(usize::MAX));
        (needed > ceiling || resident > ceiling).then_some(StopReason::Memory)
    }

    /// An upper bound on the bytes the candidates of a chunk of `elements` frontier
    /// elements hold before they are inserted: each image under each generator may be new,
    /// and a new line is held as a dense key of d·φ words with its list of non-zero
    /// positions (the worker's lookup table and the record itself add a few words).
    pub fn chunk_bytes(&self, elements: usize) -> usize {
        let per_candidate = self.key_len() * (8 + 4) + 64;
        elements
            .saturating_mul(self.generators.operators().len())
            .saturating_mul(per_candidate)
    }

    /// Frontier elements per chunk: the options' chunk size, shortened so that a chunk's
    /// candidates ([`Self::chunk_bytes`]) stay within an eighth of the memory ceiling (and
    /// never below one element). The answer does not depend on the chunk size.
    pub fn chunk_len(&self, options: &OrbitOptions) -> usize {
        let wanted = options.chunk_size.max(1);
        let Some(ceiling) = options.memory_ceiling else {
            return wanted;
        };
        let per_element = self.chunk_bytes(1).max(1);
        wanted.min((ceiling / 8 / per_element).max(1))
    }

    /// Images of the chunk's elements that are not stored yet, in (element, generator)
    /// order, computed on as many threads as there are workspaces.
    pub(crate) fn expand_chunk(
        &self,
        set: &LineStore,
        chunk: Range<usize>,
        workspaces: &mut [Workspace],
    ) -> Result<Vec<Candidate>, OrbitError> {
        Ok(self
            .expand_parts(set, chunk, workspaces)?
            .into_iter()
            .flatten()
            .collect())
    }

    /// [`Self::expand_chunk`]'s images as each worker found them: the workers take
    /// contiguous ranges of the chunk, so the chunk order is the parts one after the other
    /// (a line found by two workers is in both).
    pub(crate) fn expand_parts(
        &self,
        set: &LineStore,
        chunk: Range<usize>,
        workspaces: &mut [Workspace],
    ) -> Result<Vec<Vec<Candidate>>, OrbitError> {
        let parts = split(chunk, workspaces.len());
        if parts.len() == 1 {
            return Ok(vec![self.expand_range(
                set,
                parts[0].clone(),
                &mut workspaces[0],
            )?]);
        }
        std::thread::scope(|scope| {
            let (first, rest) = workspaces.split_at_mut(1);
            let handles: Vec<_> = parts[1..]
                .iter()
                .zip(rest.iter_mut())
                .map(|(range, ws)| {
                    let range = range.clone();
                    scope.spawn(move || self.expand_range(set, range, ws))
                })
                .collect();
            let first = self.expand_range(set, parts[0].clone(), &mut first[0]);
            let mut all = first.map(|part| vec![part]);
            for handle in handles {
                let part = joined(handle);
                all = match (all, part) {
                    (Ok(mut a), Ok(b)) => {
                        a.push(b);
                        Ok(a)
                    }
                    (Err(e), _) | (_, Err(e)) => Err(e),
                };
            }
            all
        })
    }

    fn expand_range(
        &self,
        set: &LineStore,
        range: Range<usize>,
        ws: &mut Workspace,
    ) -> Result<Vec<Candidate>, OrbitError> {
        let mut pending = Pending::default();
        for element in range {
            ws.load(self, set, element)?;
            for generator in 0..self.generators.operators().len() {
                if let Outcome::New { key, fingerprint } =
                    self.classify(set, &pending, ws, generator)?
                {
                    pending.push(Candidate {
                        parent: element as u32,
                        generator: generator as u16,
                        key,
                        fingerprint,
                    });
                }
            }
        }
        Ok(pending.list)
    }

    /// The permutations the generators induce on a saturated orbit: `result[k][i]` is the
    /// index of the line that generator k maps line i to. Every image is computed and
    /// looked up exactly as during enumeration (on `threads` threads, each a contiguous
    /// range of lines); an error when the orbit is not saturated or an image is missing.
    pub fn induced_permutations(
        &self,
        orbit: &Orbit,
        threads: usize,
    ) -> Result<Vec<Vec<u32>>, OrbitError> {
        if !orbit.is_saturated() {
            return Err(OrbitError::Invalid(
                "induced permutations need a saturated orbit".into(),
            ));
        }
        let materialised;
        let orbit = match orbit.set.kind() {
            StoreKind::Memory => orbit,
            StoreKind::Compact => {
                materialised = self.materialise(orbit, threads)?;
                &materialised
            }
        };
        let generators = self.generators.operators().len();
        let parts = split(0..orbit.len(), threads.max(1));
        let images_of = |range: Range<usize>| -> Result<Vec<u32>, OrbitError> {
            let mut ws = Workspace::new(self);
            let pending = Pending::default();
            let mut images = Vec::with_capacity(range.len() * generators);
            for element in range {
                ws.load(self, &orbit.set, element)?;
                for generator in 0..generators {
                    match self.classify(&orbit.set, &pending, &mut ws, generator)? {
                        Outcome::Known(Some(index)) => images.push(index),
                        _ => {
                            return Err(OrbitError::Invalid(format!(
                                "generator {} maps line {element} outside the orbit",
                                self.generators.names()[generator]
                            )))
                        }
                    }
                }
            }
            Ok(images)
        };
        let images_of = &images_of;
        let rows: Vec<Result<Vec<u32>, OrbitError>> = std::thread::scope(|scope| {
            let handles: Vec<_> = parts
                .iter()
                .map(|range| {
                    let range = range.clone();
                    scope.spawn(move || images_of(range))
                })
                .collect();
            handles.into_iter().map(joined).collect()
        });
        let mut permutations = vec![Vec::with_capacity(orbit.len()); generators];
        for part in rows {
            for images in part?.chunks_exact(generators.max(1)) {
                for (perm, &image) in permutations.iter_mut().zip(images) {
                    perm.push(image);
                }
            }
        }
        Ok(permutations)
    }

    /// The compact store records a generator in one byte: more than 255 generators need the
    /// memory store.
    pub(crate) fn check_store_fits(&self, store: StoreKind) -> Result<(), OrbitError> {
        let generators = self.generators.operators().len();
        if store == StoreKind::Compact && generators > 255 {
            return Err(OrbitError::Invalid(format!(
                "the compact store records a generator in one byte; {generators} generators \
                 need the memory store"
            )));
        }
        Ok(())
    }

    /// The key of element `index` as a vector of field elements (first non-zero entry 1).
    pub fn line(&self, orbit: &Orbit, index: usize) -> Result<Vec<Cyc>, OrbitError> {
        if index >= orbit.len() {
            return Err(OrbitError::Invalid(format!(
                "element {index} of an orbit with {} lines",
                orbit.len()
            )));
        }
        let mut buf = SparseNumerators::new(self.key_len());
        let key = match self.fetch(&orbit.set, index, &mut buf)? {
            Fetched::Small => KeyNumbers::Small(buf.dense),
            Fetched::Big(b) => KeyNumbers::Big(b.into_owned()),
            Fetched::NotHeld => {
                return Err(OrbitError::Invalid(format!(
                    "line {index} is held by its rank only as a record"
                )))
            }
        };
        Ok(key.to_line(&self.field, self.kernel.degree())?)
    }

    /// The word of element `index` as generator names, in the order they are applied.
    pub fn word_names(&self, orbit: &Orbit, index: usize) -> Vec<String> {
        orbit
            .word(index)
            .into_iter()
            .map(|g| self.generators.names()[g].clone())
            .collect()
    }
}
