//! Progress of a run on stderr, and the wall time of every stage.
//!
//! [`Progress`] hands out one [`Stage`] per pipeline step. Each stage draws
//! a bar (with a count, `pages 1200/17683`) or a spinner on stderr through
//! indicatif, only when drawing is on (stderr is a terminal and the user did
//! not ask for `--quiet`), and records its wall time whether drawn or not.
//! [`Progress::timings`] returns them as data ([`Timings`]) for `--timings`
//! and the benchmarks.
//!
//! A [`Stage`] is `Sync`: parallel workers call [`Stage::inc`] on one shared
//! stage. Stages may run side by side (the loop search beside the
//! thermodynamics): their bars stack, and the total is wall time from the
//! first start to the last end, not the sum.

use indicatif::{MultiProgress, ProgressBar, ProgressDrawTarget, ProgressStyle};
use serde::Serialize;
use std::io::IsTerminal;
use std::sync::atomic::{AtomicU64, Ordering};
use std::sync::Mutex;
use std::time::{Duration, Instant};

/// Stage names, in pipeline order.
pub const IMPORT: &str = "import";
pub const THERMODYNAMICS: &str = "thermodynamics";
/// Loop-capable set, elementary loops and energy-generating cycles (one
/// stage, beside `thermodynamics`).
pub const LOOPS: &str = "loops";
/// ΔrG'° around each loop and the re-checks of suggested constraints.
pub const LOOP_ENERGIES: &str = "loop-energies";
pub const CHECKS: &str = "checks";
pub const REPORT: &str = "report";
pub const PAGES: &str = "pages";

/// Wall time of one stage.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct StageTiming {
    pub name: &'static str,
    /// Start, in seconds after the [`Progress`] was made.
    pub started: f64,
    pub seconds: f64,
    /// Items done (pages written, …) when the stage counts them.
    pub count: Option<u64>,
}

/// Wall time of every stage run so far, in the order they started.
#[derive(Debug, Clone, Default, PartialEq, Serialize)]
pub struct Timings {
    pub stages: Vec<StageTiming>,
}

impl Timings {
    /// Seconds of the stage `name` (summed if it ran more than once).
    pub fn seconds(&self, name: &str) -> Option<f64> {
        let mut matching = self.stages.iter().filter(|s| s.name == name).peekable();
        matching.peek()?;
        Some(matching.map(|s| s.seconds).sum())
    }

    /// Wall time from the first stage's start to the last one's end (less
    /// than the sum when stages ran side by side).
    pub fn total(&self) -> f64 {
        let start = self
            .stages
            .iter()
            .map(|s| s.started)
            .fold(f64::INFINITY, f64::min);
        let end = self
            .stages
            .iter()
            .map(|s| s.started + s.seconds)
            .fold(f64::NEG_INFINITY, f64::max);
        if start.is_finite() {
            end - start
        } else {
            0.0
        }
    }

    /// A table for the terminal: one line per stage and a total.
    pub fn table(&self) -> String {
        let mut out = format!("{:<16} {:>9} {:>8}\n", "stage", "seconds", "count");
        for s in &self.stages {
            let count = s.count.map(|c| c.to_string()).unwrap_or_default();
            out.push_str(&format!("{:<16} {:>9.3} {:>8}\n", s.name, s.seconds, count));
        }
        out.push_str(&format!("{:<16} {:>9.3}\n", "total", self.total()));
        out
    }
}

/// Hands out stages and collects their timings.
pub struct Progress {
    draw: bool,
    /// Every drawn bar, stacked (stages can run side by side).
    bars: MultiProgress,
    created: Instant,
    timings: Mutex<Timings>,
}

impl Progress {
    /// Draws on stderr when `quiet` is false and stderr is a terminal.
    pub fn new(quiet: bool) -> Progress {
        Progress {
            draw: !quiet && std::io::stderr().is_terminal(),
            bars: MultiProgress::with_draw_target(ProgressDrawTarget::stderr()),
            created: Instant::now(),
            timings: Mutex::new(Timings::default()),
        }
    }

    /// Records timings, draws nothing.
    pub fn hidden() -> Progress {
        Progress::new(true)
    }

    /// Starts the stage `name`; with `total`, a bar counting to it, else a
    /// spinner. The stage ends (and its time is recorded) when dropped or
    /// [`Stage::finish`]ed.
    pub fn stage(&self, name: &'static str, total: Option<u64>) -> Stage<'_> {
        let bar = if self.draw {
            let bar = match total {
                Some(n) => ProgressBar::new(n).with_style(
                    ProgressStyle::with_template("{prefix:>16} [{bar:30}] {pos}/{len} {elapsed}")
                        .unwrap_or_else(|_| ProgressStyle::default_bar())
                        .progress_chars("=> "),
                ),
                None => ProgressBar::new_spinner().with_style(
                    ProgressStyle::with_template("{prefix:>16} {spinner} {elapsed}")
                        .unwrap_or_else(|_| ProgressStyle::default_spinner()),
                ),
            };
            let bar = self.bars.add(bar);
            bar.set_prefix(name);
            bar.enable_steady_tick(Duration::from_millis(120));
            bar
        } else {
            ProgressBar::hidden()
        };
        Stage {
            progress: self,
            name,
            bar,
            start: Instant::now(),
            counted: total.is_some(),
            done: AtomicU64::new(0),
            finished: false,
        }
    }

    /// The timings of every finished stage, in the order they started.
    pub fn timings(&self) -> Timings {
        let mut timings = self
            .timings
            .lock()
            .unwrap_or_else(|e| e.into_inner())
            .clone();
        timings
            .stages
            .sort_by(|a, b| a.started.total_cmp(&b.started));
        timings
    }

    fn record(&self, timing: StageTiming) {
        self.timings
            .lock()
            .unwrap_or_else(|e| e.into_inner())
            .stages
            .push(timing);
    }
}

/// One running stage.
pub struct Stage<'a> {
    progress: &'a Progress,
    name: &'static str,
    bar: ProgressBar,
    start: Instant,
    counted: bool,
    done: AtomicU64,
    finished: bool,
}

impl Stage<'_> {
    /// `n` more items done.
    pub fn inc(&self, n: u64) {
        self.done.fetch_add(n, Ordering::Relaxed);
        self.bar.inc(n);
    }

    /// Sets or changes the number of items (turns a spinner into a count).
    pub fn set_length(&mut self, total: u64) {
        self.counted = true;
        self.bar.set_length(total);
    }

    /// Ends the stage now.
    pub fn finish(mut self) {
        self.end();
    }

    fn end(&mut self) {
        if self.finished {
            return;
        }
        self.finished = true;
        self.bar.finish_and_clear();
        self.progress.record(StageTiming {
            name: self.name,
            started: self
                .start
                .duration_since(self.progress.created)
                .as_secs_f64(),
            seconds: self.start.elapsed().as_secs_f64(),
            count: self.counted.then(|| self.done.load(Ordering::Relaxed)),
        });
    }
}

impl Drop for Stage<'_> {
    fn drop(&mut self) {
        self.end();
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn stages_record_their_counts_in_order() {
        let progress = Progress::hidden();
        progress.stage(IMPORT, None).finish();
        {
            let pages = progress.stage(PAGES, Some(3));
            std::thread::scope(|s| {
                for _ in 0..3 {
                    s.spawn(|| pages.inc(1));
                }
            });
        }
        let t = progress.timings();
        let names: Vec<&str> = t.stages.iter().map(|s| s.name).collect();
        assert_eq!(names, [IMPORT, PAGES]);
        assert_eq!(t.stages[0].count, None);
        assert_eq!(t.stages[1].count, Some(3));
        assert!(t.stages.iter().all(|s| s.seconds >= 0.0));
        assert_eq!(t.seconds(PAGES), Some(t.stages[1].seconds));
        assert_eq!(t.seconds(LOOPS), None);
        let table = t.table();
        assert!(table
            .lines()
            .any(|l| l.starts_with("pages") && l.ends_with('3')));
        assert!(table.lines().last().unwrap().starts_with("total"));
    }
}
