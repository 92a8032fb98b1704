//! The orbit of one run under its caps, continued from the run's checkpoint when there is
//! one.
//!
//! Caps: lines and store memory go to the engine as its limit and ceiling; the time cap is
//! a watcher thread that raises the engine's stop flag once the enumeration time of every
//! attempt together (kept in the checkpoint) reaches it. The same watcher forwards Ctrl-C
//! and SIGTERM. The engine stops only between chunks, where its state is consistent, and
//! writes the checkpoint; continuing from it finds exactly what one uninterrupted run finds
//! (the engine's insertion order does not depend on where it was stopped).

use std::path::Path;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use std::time::{Duration, Instant};

use cyclorb_orbit::{
    CheckpointPlan, Orbit, OrbitOptions, OrbitProblem, ProgressObserver, StopReason,
};

use super::plan::Limits;

/// How an unsaturated orbit stopped.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum OrbitStop {
    /// The line cap.
    Limit,
    /// The store-memory cap.
    Memory,
    /// The time cap.
    Time,
    /// Ctrl-C or SIGTERM: the sweep stops, the checkpoint is on disk.
    Interrupted,
}

impl OrbitStop {
    /// The name stored in results (`stop_reason`).
    pub fn name(self) -> &'static str {
        match self {
            OrbitStop::Limit => "limit",
            OrbitStop::Memory => "memory",
            OrbitStop::Time => "time",
            OrbitStop::Interrupted => "interrupted",
        }
    }
}

/// The orbit after this attempt.
pub struct OrbitOutcome {
    /// The lines found.
    pub orbit: Orbit,
    /// Why it is not saturated (`None` when it is).
    pub stop: Option<OrbitStop>,
    /// Whether it continued from a checkpoint.
    pub resumed: bool,
}

/// How to run the engine.
pub struct EngineSettings<'a> {
    /// Worker threads.
    pub threads: usize,
    /// Time between periodic checkpoints.
    pub checkpoint_every: Duration,
    /// The flag the signal handler sets.
    pub signal: &'a Arc<AtomicBool>,
}

/// The checkpoint's orbit when it can be used for these caps, else a fresh start. A
/// checkpoint holding more lines than the line cap is not used: a fresh run stops at
/// exactly the cap, and so must this one. A checkpoint that cannot be read (corrupt,
/// truncated, made for other generators) is not used either, and the reason is returned
/// so that it is reported, never silently dropped.
pub fn starting_orbit(
    problem: &OrbitProblem,
    checkpoint: &Path,
    limits: &Limits,
) -> ((Orbit, bool), Option<String>) {
    if checkpoint.is_file() {
        match problem.read_checkpoint(checkpoint) {
            Ok(orbit) if limits.lines.map_or(true, |cap| orbit.len() <= cap) => {
                return ((orbit, true), None)
            }
            Ok(_) => {}
            Err(e) => {
                let reason = format!("checkpoint {} is unusable ({e})", checkpoint.display());
                return ((problem.start(), false), Some(reason));
            }
        }
    }
    ((problem.start(), false), None)
}

/// Raise `stop` when the signal flag is set or the deadline passes (recording which in
/// `time_up`), until `done`.
fn watch(
    signal: &AtomicBool,
    deadline: Option<Instant>,
    stop: &AtomicBool,
    time_up: &AtomicBool,
    done: &AtomicBool,
) {
    while !done.load(Ordering::SeqCst) {
        if signal.load(Ordering::SeqCst) {
            stop.store(true, Ordering::SeqCst);
            return;
        }
        if deadline.is_some_and(|d| Instant::now() >= d) {
            time_up.store(true, Ordering::SeqCst);
            stop.store(true, Ordering::SeqCst);
            return;
        }
        std::thread::sleep(Duration::from_millis(20));
    }
}

/// Enumerate the orbit from `start` (see [`starting_orbit`]) under `limits`,
/// checkpointing to `checkpoint`.
pub fn run_orbit(
    problem: &OrbitProblem,
    (start, resumed): (Orbit, bool),
    limits: &Limits,
    checkpoint: &Path,
    engine: &EngineSettings,
    observer: &mut dyn ProgressObserver,
) -> Result<OrbitOutcome, String> {
    let deadline = limits.seconds.map(|cap| {
        let spent = Duration::from_secs_f64(start.compute_seconds().max(0.0));
        Instant::now() + Duration::from_secs(cap).saturating_sub(spent)
    });
    let stop = Arc::new(AtomicBool::new(false));
    let time_up = AtomicBool::new(false);
    let done = AtomicBool::new(false);
    let options = OrbitOptions {
        limit: limits.lines,
        memory_ceiling: limits.memory_mib.map(|m| m << 20),
        resident: Some(crate::runtime::resident_memory_bytes),
        threads: engine.threads,
        checkpoint: Some(CheckpointPlan {
            path: checkpoint.to_path_buf(),
            every: engine.checkpoint_every,
        }),
        stop: Some(Arc::clone(&stop)),
        ..OrbitOptions::default()
    };
    let result = std::thread::scope(|scope| {
        scope.spawn(|| watch(engine.signal, deadline, &stop, &time_up, &done));
        let result = problem.extend(start, &options, observer);
        done.store(true, Ordering::SeqCst);
        result
    });
    let orbit = result.map_err(|e| e.to_string())?;
    let stop = match orbit.stop_reason() {
        None => None,
        Some(StopReason::Limit) => Some(OrbitStop::Limit),
        Some(StopReason::Memory) => Some(OrbitStop::Memory),
        Some(StopReason::Interrupted) if time_up.load(Ordering::SeqCst) => Some(OrbitStop::Time),
        Some(StopReason::Interrupted) => Some(OrbitStop::Interrupted),
    };
    if orbit.is_saturated() {
        // The engine checkpoints only when it stops early; keep the closed orbit too, so an
        // interruption in a later answer continues from here.
        problem
            .write_checkpoint(&orbit, checkpoint)
            .map_err(|e| e.to_string())?;
    }
    Ok(OrbitOutcome {
        orbit,
        stop,
        resumed,
    })
}
