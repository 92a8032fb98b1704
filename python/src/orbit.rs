//! `cyclorb.orbit(...)`: the vacuum orbit through the pipeline, with the interpreter
//! released while the engine runs. Between chunks the engine calls the observer, which
//! attaches to the interpreter at most every quarter second to call the progress callback
//! and to notice Ctrl-C (`KeyboardInterrupt`); either stop sets the engine's stop flag, so
//! the run ends at a consistent point with its checkpoint written, exactly as the
//! program's Ctrl-C does. The time limit is checked at every chunk.

use std::path::PathBuf;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use std::time::{Duration, Instant};

use cyclorb_orbit::{CheckpointPlan, OrbitOptions, Progress, ProgressObserver};
use cyclorb_pipeline::counting::counted_any;
use cyclorb_pipeline::dw_count::{self, counted_orbit as counted_dw};
use cyclorb_pipeline::listing::{check_writable, default_checkpoint, Listing, Origin};
use cyclorb_pipeline::product::product_orbit;
use cyclorb_pipeline::runtime::{budget_bytes, peak_memory_bytes};
use cyclorb_pipeline::space::{build_space, parse_set};
use cyclorb_pipeline::{OrbitAnswer, OrbitMethod};
use pyo3::prelude::*;
use pyo3::types::PyDict;

use crate::error;
use crate::values::to_python;

/// Seconds between two calls into the interpreter.
const CALL_INTERVAL: Duration = Duration::from_millis(250);

/// Seconds between periodic checkpoints (as the program's default).
const CHECKPOINT_EVERY: Duration = Duration::from_secs(120);

/// Why a run was stopped from the host side.
#[derive(Clone, Copy, PartialEq, Eq)]
enum HostStop {
    /// `KeyboardInterrupt`, or an exception raised by the progress callback.
    Interrupt,
    /// The time limit.
    Time,
}

struct HostObserver {
    callback: Option<Py<PyAny>>,
    stop: Arc<AtomicBool>,
    started: Instant,
    time_limit: Option<Duration>,
    last_call: Option<Instant>,
    stopped: Option<HostStop>,
    error: Option<PyErr>,
}

impl HostObserver {
    fn halt(&mut self, why: HostStop) {
        self.stopped.get_or_insert(why);
        self.stop.store(true, Ordering::SeqCst);
    }

    fn call_host(&mut self, py: Python<'_>, p: &Progress) -> PyResult<()> {
        py.check_signals()?;
        if let Some(callback) = &self.callback {
            let d = PyDict::new(py);
            d.set_item("layer", p.layer)?;
            d.set_item("lines", p.lines)?;
            d.set_item("processed", p.processed)?;
            d.set_item("layer_end", p.layer_end)?;
            d.set_item("lines_per_second", p.lines_per_second)?;
            d.set_item("store_bytes", p.store_bytes)?;
            d.set_item("elapsed", p.elapsed.as_secs_f64())?;
            callback.call1(py, (d,))?;
        }
        Ok(())
    }
}

impl ProgressObserver for HostObserver {
    fn progress(&mut self, p: &Progress) {
        if self
            .time_limit
            .is_some_and(|limit| self.started.elapsed() >= limit)
        {
            self.halt(HostStop::Time);
        }
        if self.last_call.is_some_and(|t| t.elapsed() < CALL_INTERVAL) {
            return;
        }
        self.last_call = Some(Instant::now());
        if let Err(e) = Python::attach(|py| self.call_host(py, p)) {
            self.error.get_or_insert(e);
            self.halt(HostStop::Interrupt);
        }
    }
}

/// The origin of the call's problem: the theory, or the checkpoint's record when only
/// `resume` is given.
fn origin(
    spec: Option<String>,
    genus: Option<usize>,
    set: &str,
    resume: Option<&PathBuf>,
) -> PyResult<Origin> {
    match (spec, resume) {
        (Some(spec), _) => Ok(Origin::Theory {
            spec,
            genus: genus.ok_or_else(|| error("genus is required with a theory"))?,
            set: set.to_string(),
        }),
        (None, Some(path)) => Origin::recorded(path).map_err(error),
        (None, None) => Err(error(
            "give a theory spec with a genus, or resume=CHECKPOINT",
        )),
    }
}

/// The orbit of a theory's vacuum line. Returns `(answer, stopped_by, error)`: the answer
/// as a dict with the keys of `cyclorb orbit --json` (plus `basis` labels and, for a
/// stopped listing, `checkpoint`), `stopped_by` `"interrupt"` or `"time"` when the host
/// stopped it, and the exception raised meanwhile (KeyboardInterrupt, or the callback's),
/// which the Python layer re-raises with the partial answer attached.
#[pyfunction]
#[pyo3(signature = (
    spec = None, genus = None, *, set = "humphries", method = "enumerate", limit = None,
    memory_limit = None, time_limit = None, threads = None, checkpoint = None, resume = None,
    words = 0, progress = None
))]
#[allow(clippy::too_many_arguments)]
pub fn orbit<'py>(
    py: Python<'py>,
    spec: Option<String>,
    genus: Option<usize>,
    set: &str,
    method: &str,
    limit: Option<usize>,
    memory_limit: Option<u64>,
    time_limit: Option<f64>,
    threads: Option<usize>,
    checkpoint: Option<PathBuf>,
    resume: Option<PathBuf>,
    words: usize,
    progress: Option<Py<PyAny>>,
) -> PyResult<(Bound<'py, PyAny>, Option<&'static str>, Option<PyErr>)> {
    let method: OrbitMethod = method.parse().map_err(error)?;
    let budget = budget_bytes(memory_limit);
    cyclorb_field::set_memory_budget(budget);
    let origin = origin(spec, genus, set, resume.as_ref())?;
    let stop = Arc::new(AtomicBool::new(false));
    let mut options = OrbitOptions {
        limit,
        memory_ceiling: Some(usize::try_from(budget).unwrap_or(usize::MAX)),
        threads: threads
            .unwrap_or_else(|| std::thread::available_parallelism().map_or(1, |n| n.get()))
            .max(1),
        stop: Some(Arc::clone(&stop)),
        ..OrbitOptions::default()
    };
    let Origin::Theory { spec, genus, set } = &origin else {
        return Err(error(
            "resume: the checkpoint records raw files; use the program",
        ));
    };
    match method {
        OrbitMethod::Enumerate => {}
        OrbitMethod::Product => {
            let mut answer = py
                .detach(|| product_orbit(spec, *genus, set, &options, limit))
                .map_err(error)?;
            answer.peak_memory_bytes = peak_memory_bytes();
            return Ok((answer_value(py, &answer)?, None, None));
        }
        OrbitMethod::Structure => {
            let started = Instant::now();
            let mut answer = py.detach(|| counted_orbit(spec, *genus, set, limit, started))?;
            answer.peak_memory_bytes = peak_memory_bytes();
            return Ok((answer_value(py, &answer)?, None, None));
        }
    }
    let started = Instant::now();
    let listing = py.detach(|| Listing::new(&origin)).map_err(error)?;
    let named = checkpoint.clone().or_else(|| resume.clone());
    let path = match &named {
        Some(p) => {
            check_writable(p).map_err(error)?;
            Some(p.clone())
        }
        None => default_checkpoint(listing.problem()),
    };
    options.checkpoint = path.clone().map(|path| CheckpointPlan {
        path,
        every: CHECKPOINT_EVERY,
    });
    let mut observer = HostObserver {
        callback: progress,
        stop,
        started,
        time_limit: time_limit.map(Duration::from_secs_f64),
        last_call: None,
        stopped: None,
        error: None,
    };
    let threads = options.threads;
    let (orbit, mut answer) = py
        .detach(|| {
            let orbit = listing.run(&options, resume.as_deref(), &mut observer)?;
            let answer = listing.answer(&orbit, threads, started.elapsed());
            Ok::<_, String>((orbit, answer))
        })
        .map_err(error)?;
    answer.peak_memory_bytes = peak_memory_bytes();
    answer.words = listing.farthest_words(&orbit, words);
    let value = answer_value(py, &answer)?;
    let dict = value.cast::<PyDict>()?;
    dict.set_item(
        "basis",
        listing.problem().generators().basis_labels().to_vec(),
    )?;
    if let Some(p) = &path {
        if orbit.is_saturated() {
            if named.is_none() {
                std::fs::remove_file(p).ok();
            }
        } else if p.exists() {
            dict.set_item("checkpoint", p.display().to_string())?;
        }
    }
    let stopped_by = observer.stopped.map(|s| match s {
        HostStop::Interrupt => "interrupt",
        HostStop::Time => "time",
    });
    Ok((value, stopped_by, observer.error))
}

/// The counting route: for a `dw:` theory |P| / |Stab_P(S)| with `limit` capping the
/// listed orbits of the parts (`cyclorb_pipeline::dw_count`); otherwise the orbit counted
/// through the monomial structure, else the imprimitive one, its certificate re-checked
/// (`cyclorb_pipeline::counting`).
fn counted_orbit(
    spec: &str,
    genus: usize,
    set: &str,
    limit: Option<usize>,
    started: Instant,
) -> PyResult<OrbitAnswer> {
    if cyclorb_pipeline::dw_space::is_dw(spec) {
        let (space, orbit) = counted_dw(spec, genus, set, limit).map_err(error)?;
        return Ok(dw_count::answer(&space, &orbit, started.elapsed()));
    }
    let set = parse_set(set).map_err(error)?;
    let space = build_space(spec, genus).map_err(error)?;
    match counted_any(&space, set).map_err(error)? {
        Ok(counted) => counted.answer(&space, started.elapsed()).map_err(error),
        Err(absent) => Err(error(format!(
            "{spec} at genus {genus} has {absent}; use method='enumerate'"
        ))),
    }
}

/// An answer as a Python dict with the JSON keys.
fn answer_value<'py>(py: Python<'py>, answer: &OrbitAnswer) -> PyResult<Bound<'py, PyAny>> {
    let value = serde_json::to_value(answer).map_err(|e| error(e.to_string()))?;
    to_python(py, &value)
}
