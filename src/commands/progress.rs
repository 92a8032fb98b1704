//! Progress display for long orbit runs: an indicatif spinner on a terminal (layer, lines,
//! rate, memory, elapsed), nothing with --json or when stderr is not a terminal.

use std::time::Duration;

use cyclorb_orbit::{Progress, ProgressObserver};
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

/// Drives one spinner from the engine's progress snapshots.
pub struct OrbitProgress {
    bar: Option<ProgressBar>,
}

impl OrbitProgress {
    /// A display when allowed (terminal, not JSON), otherwise a silent observer.
    pub fn new(as_json: bool) -> OrbitProgress {
        OrbitProgress {
            bar: spinner(as_json),
        }
    }

    /// Remove the display.
    pub fn finish(&self) {
        if let Some(bar) = &self.bar {
            bar.finish_and_clear();
        }
    }
}

impl ProgressObserver for OrbitProgress {
    fn progress(&mut self, p: &Progress) {
        if let Some(bar) = &self.bar {
            let layer_total = p.layer_end.max(1);
            bar.set_message(format!(
                "layer {} ({:.0}% done) · {} lines · {:.0} lines/s · store {:.1} MiB",
                p.layer,
                100.0 * (p.processed.min(layer_total)) as f64 / layer_total as f64,
                p.lines,
                p.lines_per_second,
                p.store_bytes as f64 / 1048576.0
            ));
        }
    }
}
