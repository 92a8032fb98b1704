//! `cyclorb.sweep(...)`: a sweep plan run through the pipeline (`cyclorb_pipeline::sweep`:
//! the plan's checks, the schedule smallest first, each run's stages), with the interpreter
//! released while the runs compute. The results come back as the dicts of
//! `runs/<id>/result.json`; storing them, the summaries and the plot stay the program's.
//!
//! Each run's orbit checkpoints into `out/runs/<id>/checkpoint.bin` (a temporary folder,
//! removed at the end, when `out` is not given), so a sweep stopped by Ctrl-C continues
//! from there when it is run again with the same `out`. Ctrl-C is noticed at every stage
//! and every quarter second of an orbit: the sweep then stops between chunks, as the
//! program's does, and returns the runs finished so far with the `KeyboardInterrupt`.

use std::path::{Path, PathBuf};
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::{Arc, Mutex};
use std::time::{Duration, Instant};

use cyclorb_orbit::{Progress, ProgressObserver};
use cyclorb_pipeline::runtime::MAX_THREADS;
use cyclorb_pipeline::sweep::{
    execute, parse_plan, read_plan, schedule, Limits, Plan, PlannedRun, RunEnd, RunResult,
    SweepObserver, SweepSettings,
};
use pyo3::prelude::*;
use pyo3::types::PyDict;

use crate::error;
use crate::values::to_python;

/// Seconds between two calls into the interpreter during an orbit.
const CALL_INTERVAL: Duration = Duration::from_millis(250);

/// The name a plan given as text has in messages; its `file` entries are read relative to
/// the current folder.
const TEXT_PLAN: &str = "<plan>";

/// What the host sees of a running sweep: the progress callback (with the run's id and
/// stage) and Ctrl-C, which raises the sweep's stop flag.
struct HostObserver {
    callback: Option<Py<PyAny>>,
    signal: Arc<AtomicBool>,
    error: Mutex<Option<PyErr>>,
}

impl HostObserver {
    /// Call the interpreter: check for Ctrl-C and report `fill`'s snapshot. An exception
    /// (KeyboardInterrupt, or the callback's) is kept and stops the sweep.
    fn call(
        &self,
        run: &PlannedRun,
        stage: &str,
        fill: impl FnOnce(&Bound<'_, PyDict>) -> PyResult<()>,
    ) {
        let outcome = Python::attach(|py| -> PyResult<()> {
            py.check_signals()?;
            if let Some(callback) = &self.callback {
                let d = PyDict::new(py);
                d.set_item("run", &run.id)?;
                d.set_item("stage", stage)?;
                fill(&d)?;
                callback.call1(py, (d,))?;
            }
            Ok(())
        });
        if let Err(e) = outcome {
            self.error.lock().expect("one writer").get_or_insert(e);
            self.signal.store(true, Ordering::SeqCst);
        }
    }
}

impl SweepObserver for HostObserver {
    fn start(&self, run: &PlannedRun) {
        self.call(run, "start", |_| Ok(()));
    }

    fn stage(&self, run: &PlannedRun, stage: &str) {
        self.call(run, stage, |_| Ok(()));
    }

    fn note(&self, _text: String) {
        // notes come back in the answer's `notes`
    }

    fn orbit<'a>(
        &'a self,
        run: &'a PlannedRun,
        _spent_before: f64,
    ) -> Box<dyn ProgressObserver + 'a> {
        Box::new(OrbitCalls {
            host: self,
            run,
            last_call: None,
        })
    }
}

/// The engine's snapshots of one run's orbit, passed on at most every [`CALL_INTERVAL`].
struct OrbitCalls<'a> {
    host: &'a HostObserver,
    run: &'a PlannedRun,
    last_call: Option<Instant>,
}

impl ProgressObserver for OrbitCalls<'_> {
    fn progress(&mut self, p: &Progress) {
        if self.last_call.is_some_and(|t| t.elapsed() < CALL_INTERVAL) {
            return;
        }
        self.last_call = Some(Instant::now());
        self.host.call(self.run, "orbit", |d| {
            d.set_item("layer", p.layer)?;
            d.set_item("lines", p.lines)?;
            d.set_item("lines_per_second", p.lines_per_second)?;
            d.set_item("elapsed", p.elapsed.as_secs_f64())
        });
    }
}

/// The plan from a path or from TOML text (exactly one).
fn plan_of(path: Option<PathBuf>, text: Option<String>) -> Result<Plan, String> {
    let plan = match (path, text) {
        (Some(path), None) => read_plan(&path),
        (None, Some(text)) => parse_plan(Path::new(TEXT_PLAN), text),
        _ => return Err("give a plan file or the plan's TOML text".into()),
    };
    plan.map_err(|e| e.to_string())
}

/// Caps given as keyword arguments replace the plan's in every entry (each at least 1, as
/// in a plan).
fn override_limits(plan: &mut Plan, caps: Limits) -> Result<(), String> {
    let zero = [
        ("lines", caps.lines == Some(0)),
        ("memory_mib", caps.memory_mib == Some(0)),
        ("seconds", caps.seconds == Some(0)),
    ];
    if let Some((name, _)) = zero.iter().find(|(_, z)| *z) {
        return Err(format!("{name} must be at least 1"));
    }
    for entry in &mut plan.entries {
        let l = &mut entry.limits;
        l.lines = caps.lines.or(l.lines);
        l.memory_mib = caps.memory_mib.or(l.memory_mib);
        l.seconds = caps.seconds.or(l.seconds);
    }
    Ok(())
}

/// A folder of its own under the system's temporary folder.
fn temporary_folder() -> PathBuf {
    let nanos = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map_or(0, |d| d.as_nanos());
    std::env::temp_dir().join(format!("cyclorb-sweep-{}-{nanos}", std::process::id()))
}

/// Every run of the schedule, until the end or a stop; returns the finished results in
/// plan order, the notes and whether it stopped early.
fn run_all(
    plan: &Plan,
    threads: usize,
    out: &Path,
    host: &HostObserver,
) -> Result<(Vec<RunResult>, Vec<String>, bool, String), String> {
    let sched = schedule(plan).map_err(|e| e.to_string())?;
    let settings = SweepSettings {
        threads,
        checkpoint_every: Duration::from_secs(plan.checkpoint_seconds),
        signal: &host.signal,
        image: plan.image,
        witness: plan.witness,
        plan_hash: &sched.plan_hash,
        command: "cyclorb.sweep (Python)",
    };
    let mut results = Vec::new();
    let mut notes = Vec::new();
    let mut interrupted = false;
    for run in &sched.runs {
        let dir = out.join("runs").join(&run.id);
        std::fs::create_dir_all(&dir).map_err(|e| format!("{}: {e}", dir.display()))?;
        match execute(run, &dir, &settings, host, &mut notes)
            .map_err(|e| format!("run {}: {e}", run.id))?
        {
            RunEnd::Finished(result) => results.push((run.position, *result)),
            RunEnd::Interrupted => {
                interrupted = true;
                break;
            }
        }
    }
    results.sort_by_key(|(position, _)| *position);
    let results = results.into_iter().map(|(_, r)| r).collect();
    Ok((results, notes, interrupted, sched.plan_hash))
}

/// Run a sweep plan. Returns `(answer, error)`: the answer as a dict (`plan_hash`, `runs`:
/// the results in plan order with the keys of `result.json`, `notes`, `interrupted`) and
/// the exception raised meanwhile (KeyboardInterrupt, or the callback's), which the Python
/// layer re-raises with the partial answer attached.
#[pyfunction]
#[pyo3(signature = (
    path = None, text = None, *, lines = None, memory_mib = None, seconds = None,
    threads = None, out = None, progress = None
))]
#[allow(clippy::too_many_arguments)]
pub fn sweep<'py>(
    py: Python<'py>,
    path: Option<PathBuf>,
    text: Option<String>,
    lines: Option<usize>,
    memory_mib: Option<usize>,
    seconds: Option<u64>,
    threads: Option<usize>,
    out: Option<PathBuf>,
    progress: Option<Py<PyAny>>,
) -> PyResult<(Bound<'py, PyAny>, Option<PyErr>)> {
    let mut plan = plan_of(path, text).map_err(error)?;
    let caps = Limits {
        lines,
        memory_mib,
        seconds,
    };
    override_limits(&mut plan, caps).map_err(error)?;
    let threads = threads
        .or(plan.threads)
        .unwrap_or_else(|| std::thread::available_parallelism().map_or(1, |n| n.get()));
    if !(1..=MAX_THREADS).contains(&threads) {
        return Err(error(format!("threads must be from 1 to {MAX_THREADS}")));
    }
    let (folder, temporary) = match out {
        Some(dir) => (dir, false),
        None => (temporary_folder(), true),
    };
    let host = HostObserver {
        callback: progress,
        signal: Arc::new(AtomicBool::new(false)),
        error: Mutex::new(None),
    };
    let outcome = py.detach(|| run_all(&plan, threads, &folder, &host));
    if temporary {
        std::fs::remove_dir_all(&folder).ok();
    }
    let (results, notes, interrupted, plan_hash) = outcome.map_err(error)?;
    let value = serde_json::json!({
        "plan": plan.path.display().to_string(),
        "name": plan.name,
        "plan_hash": plan_hash,
        "interrupted": interrupted,
        "notes": notes,
        "runs": results,
    });
    let error = host.error.into_inner().expect("one writer");
    Ok((to_python(py, &value)?, error))
}
