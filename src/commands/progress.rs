//! Progress display for long orbit runs: an indicatif spinner on a terminal (layer, lines,
//! rate, memory, elapsed), nothing with --json or when stderr is not a terminal.

use std::time::Duration;

use cyclorb_orbit::{Progress, ProgressObserver};

use crate::runtime::resident_memory_bytes;
use indicatif::{ProgressBar, ProgressStyle};

use super::output::progress_allowed;

/// A ticking spinner with elapsed time and a message, when progress may be shown
/// (a terminal, not JSON).
pub fn spinner(as_json: bool) -> Option<ProgressBar> {
    progress_allowed(as_json).then(|| {
        let bar = ProgressBar::new_spinner();
        bar.set_style(
            ProgressStyle::with_template("{spinner} [{elapsed_precise}] {msg}")
                .expect("static template"),
        );
        bar.enable_steady_tick(Duration::from_millis(200));
        bar
    })
}

/// Drives one spinner from the engine's progress snapshots, keeping what the estimates
/// need: the sizes of the finished layers and the rate at which the current layer is
/// expanded.
pub struct OrbitProgress {
    bar: Option<ProgressBar>,
    /// The layer being expanded and the number of lines when it started.
    layer: Option<(usize, usize)>,
    /// Sizes of the layers found so far (each complete when the next one starts).
    layer_sizes: Vec<usize>,
    /// The previous snapshot's (processed, elapsed seconds).
    last: Option<(usize, f64)>,
    /// Frontier elements expanded per second (smoothed).
    expand_rate: Option<f64>,
}

impl OrbitProgress {
    /// A display when allowed (terminal, not JSON), otherwise a silent observer.
    pub fn new(as_json: bool) -> OrbitProgress {
        OrbitProgress {
            bar: spinner(as_json),
            layer: None,
            layer_sizes: Vec::new(),
            last: None,
            expand_rate: None,
        }
    }

    /// Remove the display.
    pub fn finish(&self) {
        if let Some(bar) = &self.bar {
            bar.finish_and_clear();
        }
    }

    /// Record a snapshot: a new layer closes the previous one; the expansion rate is an
    /// exponential average of the snapshot-to-snapshot rates.
    fn record(&mut self, p: &Progress) {
        match self.layer {
            Some((layer, start)) if layer != p.layer => {
                self.layer_sizes.push(p.lines.saturating_sub(start));
                self.layer = Some((p.layer, p.lines));
            }
            None => self.layer = Some((p.layer, p.lines)),
            _ => {}
        }
        let now = p.elapsed.as_secs_f64();
        if let Some((processed, then)) = self.last {
            if now > then && p.processed >= processed {
                let rate = (p.processed - processed) as f64 / (now - then);
                self.expand_rate = Some(self.expand_rate.map_or(rate, |r| 0.7 * r + 0.3 * rate));
            }
        }
        self.last = Some((p.processed, now));
    }

    /// The progress line.
    fn message(&self, p: &Progress) -> String {
        let layer_total = p.layer_end.max(1);
        let left = p.layer_end.saturating_sub(p.processed);
        let layer_eta = match self.expand_rate {
            Some(r) if r > 0.0 => format!(", ~{} left in it", duration_text(left as f64 / r)),
            _ => String::new(),
        };
        let memory = resident_memory_bytes().map_or("memory unknown".into(), |b| {
            format!("RSS {:.0} MiB", b as f64 / 1048576.0)
        });
        format!(
            "layer {} ({:.0}% expanded{layer_eta}) · {} lines · {} · {:.0} lines/s · {memory}",
            p.layer,
            100.0 * (p.processed.min(layer_total)) as f64 / layer_total as f64,
            p.lines,
            remaining_estimate(&self.layer_sizes),
            p.lines_per_second,
        )
    }
}

/// Seconds as `1h02m`, `3m05s` or `12s`.
fn duration_text(seconds: f64) -> String {
    let s = seconds.max(0.0).round() as u64;
    match (s / 3600, (s / 60) % 60, s % 60) {
        (0, 0, sec) => format!("{sec}s"),
        (0, min, sec) => format!("{min}m{sec:02}s"),
        (h, min, _) => format!("{h}h{min:02}m"),
    }
}

/// What the growth of the finished layers says about the rest: the last two growth
/// factors, and, only when both are below 1, the lines still to come if the layers kept
/// shrinking by the last factor r (a geometric tail: last·r/(1 − r)). It is a guess from the
/// trend, said as such; while layers grow nothing can be said ("unknown").
fn remaining_estimate(layer_sizes: &[usize]) -> String {
    let ratios: Vec<f64> = layer_sizes
        .windows(2)
        .rev()
        .take(2)
        .filter(|w| w[0] > 0)
        .map(|w| w[1] as f64 / w[0] as f64)
        .collect();
    let growth: Vec<String> = ratios.iter().rev().map(|r| format!("×{r:.2}")).collect();
    match ratios.as_slice() {
        [] => "total unknown".into(),
        [r, older] if *r < 1.0 && *older < 1.0 => {
            let last = *layer_sizes.last().expect("two ratios need layers") as f64;
            format!(
                "layers {} · ~{:.0} lines to come if they keep shrinking",
                growth.join(" "),
                last * r / (1.0 - r)
            )
        }
        _ => format!("layers {} · total unknown", growth.join(" ")),
    }
}

impl ProgressObserver for OrbitProgress {
    fn progress(&mut self, p: &Progress) {
        if self.bar.is_none() {
            return;
        }
        self.record(p);
        if let Some(bar) = &self.bar {
            bar.set_message(self.message(p));
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn estimates_only_from_shrinking_layers() {
        assert_eq!(remaining_estimate(&[]), "total unknown");
        assert_eq!(remaining_estimate(&[1]), "total unknown");
        assert_eq!(
            remaining_estimate(&[1, 2, 5]),
            "layers ×2.00 ×2.50 · total unknown"
        );
        // one shrinking step is not a trend
        assert_eq!(
            remaining_estimate(&[4, 8, 4]),
            "layers ×2.00 ×0.50 · total unknown"
        );
        // 100 → 50 → 25: r = 1/2, 25·(1/2)/(1/2) = 25 more lines
        assert_eq!(
            remaining_estimate(&[100, 50, 25]),
            "layers ×0.50 ×0.50 · ~25 lines to come if they keep shrinking"
        );
    }

    #[test]
    fn durations_read_naturally() {
        assert_eq!(duration_text(12.4), "12s");
        assert_eq!(duration_text(185.0), "3m05s");
        assert_eq!(duration_text(3720.0), "1h02m");
    }
}
