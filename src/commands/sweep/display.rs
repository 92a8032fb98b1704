//! What a sweep shows while it works.
//!
//! On a terminal (and without `--json`): two lines drawn by indicatif — the sweep (runs
//! done / total, elapsed, the current run) and the current run (its stage; during the orbit
//! the layer and its share done, lines, rate, store and peak memory, and an ETA when a cap
//! bounds the run). When stderr is not a terminal: one plain line per run on stderr. With
//! `--json`: nothing.

use std::io::IsTerminal;
use std::time::Duration;

use cyclorb_orbit::{Progress, ProgressObserver};

use crate::runtime::peak_memory_bytes;
use indicatif::{MultiProgress, ProgressBar, ProgressDrawTarget, ProgressStyle};

use cyclorb_pipeline::sweep::{Limits, PlannedRun, RunResult, SweepObserver};

/// The display of one sweep.
pub struct SweepDisplay {
    bars: Option<(MultiProgress, ProgressBar, ProgressBar)>,
    plain: bool,
    total: usize,
    done: usize,
}

fn mib(bytes: u64) -> f64 {
    bytes as f64 / 1_048_576.0
}

fn short_duration(seconds: f64) -> String {
    let s = seconds.max(0.0).round() as u64;
    match s {
        0..=59 => format!("{s}s"),
        60..=3599 => format!("{}m{:02}s", s / 60, s % 60),
        _ => format!("{}h{:02}m", s / 3600, (s % 3600) / 60),
    }
}

/// A one-line account of a finished run (for plain logs).
pub fn run_line(r: &RunResult) -> String {
    let orbit = match (r.orbit_size, r.saturated) {
        (Some(n), Some(true)) => format!("{n} lines"),
        (Some(n), _) => format!(
            "not closed after {n} lines ({})",
            r.stop_reason.as_deref().unwrap_or("stopped")
        ),
        _ => "no orbit".into(),
    };
    let mut line = format!("{} (dim {}): {orbit}", r.id, r.dimension);
    if let Some(l) = r.prefactor() {
        line.push_str(&format!(", λ = {l}"));
    }
    if let Some(order) = r.image.as_ref().and_then(|i| i.order.as_ref()) {
        line.push_str(&format!(", image order {order}"));
    }
    if let Some(c) = &r.commutant {
        line.push_str(&format!(", commutant dim {}", c.commutant_dimension));
    }
    if let Some(w) = r.witness.as_ref().filter(|w| w.found) {
        line.push_str(&format!(", witness {}", w.word.join(" ")));
    }
    for e in &r.errors {
        line.push_str(&format!(", ERROR {e}"));
    }
    line.push_str(&format!(" [{}]", short_duration(r.total_seconds)));
    line
}

impl SweepDisplay {
    /// Bars on a terminal, plain lines elsewhere, nothing with `--json`.
    pub fn new(total: usize, as_json: bool) -> SweepDisplay {
        let terminal = !as_json && std::io::stderr().is_terminal();
        let bars = terminal.then(|| {
            let multi = MultiProgress::with_draw_target(ProgressDrawTarget::stderr());
            let overall = multi.add(ProgressBar::new(total as u64));
            overall.set_style(
                ProgressStyle::with_template(
                    "sweep [{bar:24}] {pos}/{len} runs · {elapsed_precise} · {msg}",
                )
                .expect("static template")
                .progress_chars("=> "),
            );
            let current = multi.add(ProgressBar::new_spinner());
            current.set_style(
                ProgressStyle::with_template("{spinner} {msg}").expect("static template"),
            );
            current.enable_steady_tick(Duration::from_millis(200));
            overall.enable_steady_tick(Duration::from_millis(500));
            (multi, overall, current)
        });
        SweepDisplay {
            bars,
            plain: !as_json && !terminal,
            total,
            done: 0,
        }
    }

    fn say(&self, line: String) {
        if let Some((multi, _, _)) = &self.bars {
            // println on a MultiProgress prints above the bars
            let _ = multi.println(line);
        } else if self.plain {
            eprintln!("{line}");
        }
    }

    /// A run starts.
    pub fn start(&self, run: &PlannedRun) {
        if let Some((_, overall, current)) = &self.bars {
            overall.set_message(format!("running {}", run.id));
            current.set_message(format!(
                "{} (dim {}): building the generators",
                run.id,
                run.dimension()
            ));
        }
    }

    /// The current run enters a stage (`Poincaré sum`, `commutant`, …).
    pub fn stage(&self, run: &PlannedRun, stage: &str) {
        if let Some((_, _, current)) = &self.bars {
            current.set_message(format!("{} (dim {}): {stage}", run.id, run.dimension()));
        }
    }

    /// A run is done (`reused`: its stored result was kept).
    pub fn finished(&mut self, result: &RunResult, reused: bool) {
        self.done += 1;
        if let Some((_, overall, _)) = &self.bars {
            overall.inc(1);
        }
        let how = if reused {
            " (stored result reused)"
        } else {
            ""
        };
        self.say(format!(
            "[{}/{}] {}{how}",
            self.done,
            self.total,
            run_line(result)
        ));
    }

    /// A plain message above the bars.
    pub fn note(&self, text: String) {
        self.say(text);
    }

    /// Remove the bars.
    pub fn finish(&self) {
        if let Some((_, overall, current)) = &self.bars {
            current.finish_and_clear();
            overall.finish_and_clear();
        }
    }

    /// An observer of the engine for the current run.
    pub fn observer<'a>(
        &'a self,
        run: &'a PlannedRun,
        limits: Limits,
        spent_before: f64,
    ) -> OrbitObserver<'a> {
        OrbitObserver {
            display: self,
            run,
            limits,
            spent_before,
        }
    }
}

/// Turns engine snapshots into the current run's line.
pub struct OrbitObserver<'a> {
    display: &'a SweepDisplay,
    run: &'a PlannedRun,
    limits: Limits,
    /// Enumeration seconds of earlier attempts (from the checkpoint).
    spent_before: f64,
}

impl OrbitObserver<'_> {
    /// Seconds left before a cap stops the run, when a cap bounds it: the line cap at the
    /// current rate, the time cap from the enumeration time of every attempt.
    fn eta(&self, p: &Progress) -> Option<f64> {
        let by_lines = self.limits.lines.and_then(|cap| {
            (p.lines_per_second > 0.0)
                .then(|| cap.saturating_sub(p.lines) as f64 / p.lines_per_second)
        });
        let by_time = self
            .limits
            .seconds
            .map(|cap| cap as f64 - self.spent_before - p.elapsed.as_secs_f64());
        match (by_lines, by_time) {
            (Some(a), Some(b)) => Some(a.min(b)),
            (a, b) => a.or(b),
        }
    }
}

impl ProgressObserver for OrbitObserver<'_> {
    fn progress(&mut self, p: &Progress) {
        let Some((_, _, current)) = &self.display.bars else {
            return;
        };
        let layer_share = 100.0 * p.processed.min(p.layer_end) as f64 / p.layer_end.max(1) as f64;
        let eta = self.eta(p).map_or(
            "ETA: none (no cap; ends when the orbit closes)".into(),
            |s| format!("ETA ≤ {} (cap)", short_duration(s)),
        );
        current.set_message(format!(
            "{} (dim {}): layer {} ({layer_share:.0}%) · {} lines · {:.0} lines/s · store {:.1} MiB · peak {:.1} MiB · {eta}",
            self.run.id,
            self.run.dimension(),
            p.layer,
            p.lines,
            p.lines_per_second,
            mib(p.store_bytes as u64),
            mib(peak_memory_bytes().unwrap_or(0)),
        ));
    }
}

impl SweepObserver for SweepDisplay {
    fn start(&self, run: &PlannedRun) {
        SweepDisplay::start(self, run);
    }

    fn stage(&self, run: &PlannedRun, stage: &str) {
        SweepDisplay::stage(self, run, stage);
    }

    fn note(&self, text: String) {
        SweepDisplay::note(self, text);
    }

    fn orbit<'a>(
        &'a self,
        run: &'a PlannedRun,
        spent_before: f64,
    ) -> Box<dyn ProgressObserver + 'a> {
        Box::new(self.observer(run, run.limits, spent_before))
    }
}
