//! `cyclorb sweep PLAN --out DIR`: a batch of runs over theories × genera, resumable,
//! with per-run results, Markdown and CSV summaries and a growth plot.
//!
//! The plan format, the order of runs and what each run computes are the pipeline's
//! (`cyclorb_pipeline::sweep`); this module runs the schedule, stores the results and
//! writes the reports.
//!
//! # Runs and the output folder
//! Each (theory, genus) is a run with id `<label>-g<genus>`; runs go smallest first (by
//! dim V_g, then the field degree φ(n), then plan order). DIR holds `plan.toml` (a copy),
//! `runs/<id>/result.json` and `runs/<id>/checkpoint.bin` per run, `summary.md`,
//! `summary.csv` and `growth.svg`. A run whose `result.json` exists with the same run hash
//! (theory data, genus, set, answers, caps, bounds) is skipped; the interrupted run
//! continues from its checkpoint to the identical result. Ctrl-C or SIGTERM stops the
//! sweep cleanly between chunks (exit 3, summaries of the finished runs written).
//!
//! Exit codes: 0 every run finished (runs stopped by their caps are finished: "not closed
//! after N"); 1 invalid plan, or a run reported an error (a failed check); 3 interrupted.

mod display;
mod plot;
mod report;
mod result;

use std::path::{Path, PathBuf};
use std::sync::atomic::AtomicBool;
use std::sync::Arc;
use std::time::Duration;

use crate::runtime::install_stop_handler;
use serde_json::json;

use super::output::{shell_word, Outcome, Report};
use crate::cli::SweepArgs;
use cyclorb_pipeline::sweep::{
    execute, read_plan, schedule, Plan, RunEnd, RunResult, Schedule, SweepSettings,
};
use display::SweepDisplay;
use report::SweepHeader;
use result::{finished_result, write_atomically, write_result, Stored};

/// The command line as a user types it: `cyclorb` (not the path the program was started
/// by) and the arguments, each quoted when the shell would need it.
fn command_line() -> String {
    std::iter::once("cyclorb".to_string())
        .chain(std::env::args().skip(1).map(|a| shell_word(&a)))
        .collect::<Vec<_>>()
        .join(" ")
}

/// DIR: `--out`, else the plan's file stem + `-sweep` in the current folder.
fn output_folder(args: &SweepArgs, plan: &Plan) -> PathBuf {
    args.out.clone().unwrap_or_else(|| {
        let stem = plan
            .path
            .file_stem()
            .map_or("plan".into(), |s| s.to_string_lossy().into_owned());
        PathBuf::from(format!("{stem}-sweep"))
    })
}

/// The run order with dimensions (`--dry-run`).
fn dry_run(plan: &Plan, sched: &Schedule, as_json: bool) -> Outcome {
    let runs: Vec<_> = sched
        .runs
        .iter()
        .map(|r| {
            json!({
                "id": r.id, "theory": r.spec, "genus": r.genus, "dimension": r.dimension(),
                "conductor": r.space.conductor(),
                "answers": r.answers.iter().map(|a| a.name()).collect::<Vec<_>>(),
                "run_hash": r.run_hash,
            })
        })
        .collect();
    let mut text = format!(
        "plan {} ({} runs, plan hash {}), in order:\n",
        plan.path.display(),
        sched.runs.len(),
        sched.plan_hash
    );
    for r in &sched.runs {
        text.push_str(&format!(
            "  {:<28} dim {:>7}  {:<9} {}\n",
            r.id,
            r.dimension(),
            format!("Q(ζ_{})", r.space.conductor()),
            r.answers
                .iter()
                .map(|a| a.name())
                .collect::<Vec<_>>()
                .join(", ")
        ));
    }
    Outcome::Done(Report::new(
        json!({"plan_hash": sched.plan_hash, "runs": runs, "report_files": []}),
        text,
        as_json,
    ))
}

/// Write summary.md, summary.csv and growth.svg; returns their paths.
fn write_reports(
    out: &Path,
    header: &SweepHeader,
    rows: &[&RunResult],
) -> Result<Vec<PathBuf>, String> {
    let files = [
        (out.join("summary.md"), report::markdown(header, rows)),
        (out.join("summary.csv"), report::csv(rows)),
        (out.join("growth.svg"), plot::growth_svg(rows)),
    ];
    for (path, text) in &files {
        write_atomically(path, text)?;
    }
    Ok(files.into_iter().map(|(p, _)| p).collect())
}

/// Run `cyclorb sweep`.
pub fn run(args: &SweepArgs, as_json: bool) -> Outcome {
    let plan = match read_plan(&args.plan) {
        Ok(p) => p,
        Err(e) => return Outcome::Invalid(e.to_string()),
    };
    let sched = match schedule(&plan) {
        Ok(s) => s,
        Err(e) => return Outcome::Invalid(e.to_string()),
    };
    if args.dry_run {
        return dry_run(&plan, &sched, as_json);
    }
    match sweep(args, &plan, &sched, as_json) {
        Ok(outcome) => outcome,
        Err(e) => Outcome::Invalid(e),
    }
}

fn sweep(
    args: &SweepArgs,
    plan: &Plan,
    sched: &Schedule,
    as_json: bool,
) -> Result<Outcome, String> {
    let out = output_folder(args, plan);
    std::fs::create_dir_all(out.join("runs")).map_err(|e| format!("{}: {e}", out.display()))?;
    write_atomically(&out.join("plan.toml"), &plan.source)?;
    let signal = Arc::new(AtomicBool::new(false));
    install_stop_handler(&signal)
        .map_err(|e| format!("cannot install the interrupt handler: {e}"))?;
    let command = command_line();
    let threads = args
        .threads
        .or(plan.threads)
        .unwrap_or_else(|| std::thread::available_parallelism().map_or(1, |n| n.get()));
    let settings = SweepSettings {
        threads,
        checkpoint_every: Duration::from_secs(plan.checkpoint_seconds),
        signal: &signal,
        image: plan.image,
        witness: plan.witness,
        plan_hash: &sched.plan_hash,
        command: &command,
    };
    let mut display = SweepDisplay::new(sched.runs.len(), as_json);
    let mut results: Vec<((usize, usize), RunResult)> = Vec::new();
    let mut interrupted = false;
    let mut notes: Vec<String> = Vec::new();
    for r in &sched.runs {
        let dir = out.join("runs").join(&r.id);
        let path = dir.join("result.json");
        match finished_result(&path, &r.run_hash) {
            Stored::Reusable(stored) => {
                display.finished(&stored, true);
                results.push((r.position, *stored));
                continue;
            }
            Stored::Untrusted(reason) => {
                let note = format!("{}: {reason}; recomputing the run", r.id);
                display.note(note.clone());
                notes.push(note);
            }
            Stored::Missing | Stored::Stale => {}
        }
        std::fs::create_dir_all(&dir).map_err(|e| format!("{}: {e}", dir.display()))?;
        match execute(r, &dir, &settings, &display, &mut notes) {
            Ok(RunEnd::Finished(result)) => {
                write_result(&path, &result)?;
                display.finished(&result, false);
                results.push((r.position, *result));
            }
            Ok(RunEnd::Interrupted) => {
                display.note(format!(
                    "interrupted during {}; its checkpoint is kept: run the same command again to continue",
                    r.id
                ));
                interrupted = true;
                break;
            }
            Err(e) => {
                display.finish();
                return Err(format!("run {}: {e}", r.id));
            }
        }
    }
    display.finish();
    results.sort_by_key(|(position, _)| *position);
    let rows: Vec<&RunResult> = results.iter().map(|(_, r)| r).collect();
    let plan_text = args.plan.display().to_string();
    let header = SweepHeader {
        name: &plan.name,
        plan: &plan_text,
        plan_hash: &sched.plan_hash,
        command: &command,
        planned: sched.runs.len(),
    };
    let files = write_reports(&out, &header, &rows)?;
    let file_names: Vec<String> = files.iter().map(|f| f.display().to_string()).collect();
    let value = json!({
        "plan": plan_text,
        "plan_hash": sched.plan_hash,
        "out": out.display().to_string(),
        "program_version": env!("CARGO_PKG_VERSION"),
        "command": command,
        "interrupted": interrupted,
        "notes": notes,
        "runs": rows,
        "report_files": file_names,
    });
    let mut text = report::markdown(&header, &rows);
    text.push_str(&format!("\nwritten: {}\n", file_names.join(", ")));
    let failed = rows.iter().any(|r| !r.errors.is_empty());
    let report = Report::new(value, text, as_json);
    Ok(if interrupted {
        Outcome::Stopped(report)
    } else if failed {
        Outcome::CheckFailed(report)
    } else {
        Outcome::Done(report)
    })
}
