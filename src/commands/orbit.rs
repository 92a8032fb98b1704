//! `cyclorb orbit`: the orbit of the vacuum line (or any seed) and its exact Poincaré sum,
//! with limits, checkpoints, resume, and a progress display on terminals.

use std::sync::atomic::AtomicBool;
use std::sync::Arc;
use std::time::{Duration, Instant};

use cyclorb_orbit::{CheckpointPlan, LabelledEntry, OrbitOptions, PoincareReport, StoreKind};
use cyclorb_pipeline::dw_space::is_dw;
use cyclorb_pipeline::listing::{check_writable, default_checkpoint, Listing, Origin};
use cyclorb_pipeline::space::{build_space, parse_set};
use cyclorb_pipeline::{OrbitAnswer, OrbitMethod};
use serde_json::json;

use super::envelope::{self, Source};
use super::output::{shell_word, Outcome, Report};
use super::product::run_product;
use super::progress::OrbitProgress;
use super::structure::{imprimitive_orbit_text, orbit_text};
use crate::cli::OrbitArgs;
use crate::runtime::{install_stop_handler, peak_memory_bytes};
use cyclorb_pipeline::counting::{counted_any, Counted};

/// The engine's options from the command line (limit, memory, threads, checkpoints, stop).
pub(super) fn options(args: &OrbitArgs, stop: Arc<AtomicBool>) -> OrbitOptions {
    let threads = args
        .threads
        .unwrap_or_else(|| std::thread::available_parallelism().map_or(1, |n| n.get()));
    let checkpoint_path = args.checkpoint.clone().or_else(|| args.resume.clone());
    OrbitOptions {
        limit: args.limit,
        memory_ceiling: Some(usize::try_from(cyclorb_field::memory_budget()).unwrap_or(usize::MAX)),
        threads,
        checkpoint: checkpoint_path.map(|path| CheckpointPlan {
            path,
            every: Duration::from_secs(args.checkpoint_every.max(1)),
        }),
        stop: Some(stop),
        store: match (args.store.as_deref(), &args.spill) {
            (Some("compact"), _) | (None, Some(_)) => StoreKind::Compact,
            _ => StoreKind::Memory,
        },
        spill: args.spill.clone(),
        ..OrbitOptions::default()
    }
}

/// Entries of B (or of an invariant) printed as text before pointing to the JSON.
const TEXT_ENTRY_LIMIT: usize = 200;

/// A square matrix with named rows and columns, columns aligned.
fn label_table(labels: &[String], m: &[Vec<String>]) -> String {
    let width = |j: usize| {
        m.iter()
            .map(|row| row[j].chars().count())
            .chain(std::iter::once(labels[j].chars().count()))
            .max()
            .unwrap_or(1)
    };
    let widths: Vec<usize> = (0..labels.len()).map(width).collect();
    let first = labels.iter().map(|l| l.chars().count()).max().unwrap_or(1);
    let pad = |x: &str, w: usize| format!("{}{x}", " ".repeat(w - x.chars().count()));
    let mut t = format!("    {}", " ".repeat(first));
    for (l, &w) in labels.iter().zip(&widths) {
        t.push_str(&format!("  {}", pad(l, w)));
    }
    t.push('\n');
    for (l, row) in labels.iter().zip(m) {
        t.push_str(&format!("    {}{l}", " ".repeat(first - l.chars().count())));
        for (x, &w) in row.iter().zip(&widths) {
            t.push_str(&format!("  {}", pad(x, w)));
        }
        t.push('\n');
    }
    t
}

/// Non-zero entries keyed by basis labels, one per line, up to [`TEXT_ENTRY_LIMIT`].
fn entry_lines(entries: &[LabelledEntry], json_key: &str) -> String {
    let mut t = String::new();
    for e in entries.iter().take(TEXT_ENTRY_LIMIT) {
        t.push_str(&format!("    {} | {}: {}\n", e.row, e.column, e.value));
    }
    if entries.len() > TEXT_ENTRY_LIMIT {
        t.push_str(&format!(
            "    ({} of {} non-zero entries shown; every one is under {json_key} in --json)\n",
            TEXT_ENTRY_LIMIT,
            entries.len()
        ));
    }
    t
}

/// The Poincaré sum as text: λ or the decomposition over the invariants, the commutant
/// dimension, and B by labels (a modular invariant table at genus 1 when G = I; non-zero
/// entries by comb-basis label tuples otherwise).
fn poincare_text(p: &PoincareReport) -> String {
    let mut t = String::new();
    let commutant = p
        .commutant_dimension
        .map_or(String::new(), |c| format!("; commutant dimension {c}"));
    match (p.is_scalar, &p.prefactor) {
        (Some(true), Some(l)) => t.push_str(&format!(
            "Poincaré sum: B = {l} · G⁻¹ (scalar){commutant}\n"
        )),
        (Some(false), _) => {
            t.push_str(&format!(
                "Poincaré sum: B is not a multiple of G⁻¹{commutant}\n"
            ));
        }
        _ => {
            return format!(
                "Poincaré sum: not computed ({})\n",
                p.note.clone().unwrap_or_default()
            )
        }
    }
    if let Some(mi) = &p.modular_invariant {
        t.push_str("  modular invariant Z = Σ M_ab χ_a χ̄_b with M = B (rows a, columns b):\n");
        t.push_str(&label_table(&mi.labels, &mi.matrix));
    } else if let Some(entries) = &p.entries {
        t.push_str("  B by comb-basis labels (row | column: value, non-zero entries):\n");
        t.push_str(&entry_lines(entries, "poincare_sum.entries"));
    }
    if let Some(terms) = p.invariants.as_ref().filter(|v| !v.is_empty()) {
        let basis = if p.physical_basis == Some(true) {
            "physical invariants: entries ≥ 0, vacuum entry 1"
        } else {
            "a basis of the invariant matrices"
        };
        let sum: Vec<String> = (1..=terms.len())
            .zip(terms)
            .map(|(k, term)| format!("{}·M{k}", term.coefficient))
            .collect();
        t.push_str(&format!("  B = {} over {basis}:\n", sum.join(" + ")));
        for (k, term) in (1..=terms.len()).zip(terms) {
            match &p.modular_invariant {
                Some(mi) => {
                    t.push_str(&format!("  M{k}:\n"));
                    t.push_str(&label_table(&mi.labels, &term.matrix));
                }
                None => {
                    t.push_str(&format!("  M{k} (row | column: value):\n"));
                    t.push_str(&entry_lines(
                        &term.entries,
                        "poincare_sum.invariants[].entries",
                    ));
                }
            }
        }
    }
    t
}

pub(super) fn text_report(report: &OrbitAnswer) -> String {
    let mut t = String::new();
    if let Some(theory) = &report.theory {
        t.push_str(&format!("theory {theory}"));
        if let Some(g) = report.genus {
            t.push_str(&format!(" at genus {g}"));
        }
        t.push('\n');
    }
    t.push_str(&format!(
        "dimension {} over Q(ζ_{}), {} generators ({})\n",
        report.dimension,
        report.conductor,
        report.generators,
        report.generator_names.join(", ")
    ));
    if report.saturated {
        t.push_str(&format!(
            "orbit: {} lines, saturated (closed under every generator)\n",
            report.size_text()
        ));
    } else {
        t.push_str(&format!(
            "orbit: not saturated after {} lines (stopped: {})\n",
            report.size_text(),
            report
                .stop_reason
                .map_or("unknown".to_string(), |r| format!("{r:?}").to_lowercase())
        ));
    }
    if let Some(layers) = &report.layer_sizes {
        t.push_str(&format!("layer sizes: {layers:?}\n"));
    }
    let p = &report.poincare_sum;
    t.push_str(&poincare_text(p));
    if let Some(ok) = p.trace_check {
        t.push_str(&format!(
            "check tr(B·G) = |orbit|·⟨v₀,v₀⟩_G: {}\n",
            if ok { "holds" } else { "FAILS" }
        ));
    }
    for w in report.words.iter().flatten() {
        t.push_str(&format!(
            "word of line {}: {}\n",
            w.line,
            if w.word.is_empty() {
                "(seed)".into()
            } else {
                w.word.join(" ")
            }
        ));
    }
    t.push_str(&format!("time {:.2} s", report.elapsed_seconds));
    if let Some(store) = &report.store {
        t.push_str(&format!(
            ", store {} bytes ({:.1} bytes per line, {} store)",
            store.store_bytes, store.bytes_per_element, store.store_kind
        ));
    }
    if let Some(m) = report.peak_memory_bytes {
        t.push_str(&format!(", peak memory {:.1} MiB", m as f64 / 1048576.0));
    }
    t.push('\n');
    t
}

/// Run `cyclorb orbit`.
pub fn run(args: &OrbitArgs, as_json: bool) -> Outcome {
    let started = Instant::now();
    if args.out.is_some() && args.method != OrbitMethod::Structure {
        return Outcome::Invalid(
            "--out writes the certificate of --method structure; for an image certificate use \
             `cyclorb image --out`"
                .into(),
        );
    }
    #[cfg(feature = "mpi")]
    if super::orbit_mpi::launched() {
        return super::orbit_mpi::run(args, as_json, started);
    }
    #[cfg(not(feature = "mpi"))]
    if let Some(ranks) = super::orbit_ranks::launcher_size().filter(|&r| r > 1) {
        return Outcome::Invalid(format!(
            "started by an MPI launcher as one of {ranks} processes, but this cyclorb was \
             built without the feature `mpi`: each process would list the whole orbit alone \
             and write the same files; build it with `cargo install --path . --features mpi` \
             (README, \"Running on a cluster\"), or run one process"
        ));
    }
    if super::orbit_ranks::names_rank_files(args) {
        return super::orbit_ranks::resume_alone(args, as_json, started);
    }
    let completed;
    let args = match &args.resume {
        Some(path) if args.spec.is_none() && args.matrices.is_none() => {
            completed = match Origin::recorded(path) {
                Ok(origin) => with_origin(args, origin),
                Err(e) => return Outcome::Invalid(e),
            };
            &completed
        }
        _ => args,
    };
    if args.method == OrbitMethod::Structure {
        return run_structure(args, as_json, started);
    }
    if args.method == OrbitMethod::Product {
        return run_product(args, as_json);
    }
    let listing = match origin_of(args).and_then(|origin| Listing::new(&origin)) {
        Ok(l) => l,
        Err(e) => return Outcome::Invalid(e),
    };
    let stop = Arc::new(AtomicBool::new(false));
    if let Err(e) = install_stop_handler(&stop) {
        return Outcome::Invalid(format!("cannot install the interrupt handler: {e}"));
    }
    let mut opts = options(args, stop);
    match &opts.checkpoint {
        Some(plan) => {
            if let Err(e) = check_writable(&plan.path) {
                return Outcome::Invalid(e);
            }
        }
        None => {
            opts.checkpoint = default_checkpoint(listing.problem()).map(|path| CheckpointPlan {
                path,
                every: Duration::from_secs(args.checkpoint_every.max(1)),
            });
        }
    }
    let chosen_checkpoint = args.checkpoint.is_none() && args.resume.is_none();
    let mut progress = OrbitProgress::new(as_json);
    let result = listing.run(&opts, args.resume.as_deref(), &mut progress);
    progress.finish();
    let orbit = match result {
        Ok(o) => o,
        Err(e) => return Outcome::Invalid(e),
    };
    let mut report = listing.answer(&orbit, opts.threads, started.elapsed());
    report.peak_memory_bytes = peak_memory_bytes();
    report.words = listing.farthest_words(&orbit, args.words);
    let mut value = serde_json::to_value(&report).expect("reports serialise");
    let mut text = text_report(&report);
    if let Some(plan) = &opts.checkpoint {
        if orbit.is_saturated() {
            if chosen_checkpoint {
                std::fs::remove_file(&plan.path).ok();
            }
        } else if plan.path.exists() {
            let mut command = format!(
                "cyclorb orbit --resume {}",
                shell_word(&plan.path.display().to_string())
            );
            if let Some(dir) = &args.spill {
                command.push_str(&format!(
                    " --spill {}",
                    shell_word(&dir.display().to_string())
                ));
            }
            text.push_str(&format!(
                "checkpoint written to {}\ncontinue with: {command}\n",
                plan.path.display()
            ));
            value["checkpoint"] = json!(plan.path.display().to_string());
            value["resume_command"] = json!(command);
        }
    }
    let trace_failed = report.poincare_sum.trace_check == Some(false);
    let out = Report::new(value, text, as_json);
    if trace_failed {
        Outcome::CheckFailed(out)
    } else if !orbit.is_saturated() {
        Outcome::Stopped(out)
    } else {
        Outcome::Done(out)
    }
}

/// The origin of the problem the arguments name (a theory with its genus, or raw files).
pub(super) fn origin_of(args: &OrbitArgs) -> Result<Origin, String> {
    match (&args.matrices, &args.seed, &args.spec) {
        (Some(m), Some(s), _) => Ok(Origin::Files {
            matrices: m.clone(),
            seed: s.clone(),
        }),
        (_, _, Some(spec)) => Ok(Origin::Theory {
            spec: spec.clone(),
            genus: args.genus.ok_or("--genus is required with a theory")?,
            set: args.set.clone(),
        }),
        _ => Err("give a theory SPEC with --genus, or --matrices FILE --seed FILE".into()),
    }
}

/// `--resume FILE` alone: the arguments completed with the origin the checkpoint records.
pub(super) fn with_origin(args: &OrbitArgs, origin: Origin) -> OrbitArgs {
    let mut out = args.clone();
    match origin {
        Origin::Files { matrices, seed } => {
            out.matrices = Some(matrices);
            out.seed = Some(seed);
        }
        Origin::Theory { spec, genus, set } => {
            out.spec = Some(spec);
            out.genus = Some(genus);
            out.set = set;
        }
    }
    out
}

/// `--method structure`: count the orbit instead of listing it.
fn run_structure(args: &OrbitArgs, as_json: bool, started: Instant) -> Outcome {
    let (Some(spec), Some(genus)) = (&args.spec, args.genus) else {
        return Outcome::Invalid("--method structure needs a theory SPEC and --genus".into());
    };
    if args.checkpoint.is_some() || args.resume.is_some() {
        return Outcome::Invalid(
            "--method structure keeps no checkpoints (it counts the orbit without listing it); \
             drop --checkpoint/--resume"
                .into(),
        );
    }
    if is_dw(spec) {
        let count = super::dw_count::CountArgs {
            spec,
            genus,
            set: &args.set,
            limit: args.limit,
            out: args.out.as_deref(),
        };
        return super::dw_count::run(&count, as_json, started);
    }
    let space = match parse_set(&args.set).and_then(|set| Ok((set, build_space(spec, genus)?))) {
        Ok(x) => x,
        Err(e) => return Outcome::Invalid(e),
    };
    let (set, space) = space;
    let counted = match counted_any(&space, set) {
        Ok(Ok(c)) => c,
        Ok(Err(absent)) => {
            return Outcome::Invalid(format!(
                "{spec} at genus {genus} has {absent}; use --method enumerate"
            ))
        }
        Err(e) => return Outcome::Invalid(e),
    };
    let written = match &counted {
        Counted::Monomial(r) => write_structure(args, "structure", &r.certificate),
        Counted::Imprimitive(r) => write_structure(args, "structure-imprimitive", &r.certificate),
    };
    if let Err(e) = written {
        return Outcome::Invalid(e);
    }
    let mut answer = match counted.answer(&space, started.elapsed()) {
        Ok(a) => a,
        Err(e) => return Outcome::Invalid(e),
    };
    answer.peak_memory_bytes = peak_memory_bytes();
    let text = match &counted {
        Counted::Monomial(r) => {
            let entries_text = match &answer.poincare_sum.entries {
                Some(entries) => format!(
                    "  B by comb-basis labels (row | column: value, non-zero entries):\n{}",
                    entry_lines(entries, "poincare_sum.entries")
                ),
                None => String::new(),
            };
            orbit_text(r, &entries_text)
        }
        Counted::Imprimitive(r) => imprimitive_orbit_text(r),
    };
    let value = serde_json::to_value(&answer).expect("answers serialise");
    Outcome::Done(Report::new(value, text, as_json))
}

/// Write a certificate of the structural route with its envelope (`--out`, when given).
fn write_structure<T: serde::Serialize>(
    args: &OrbitArgs,
    kind: &str,
    certificate: &T,
) -> Result<(), String> {
    let source = Source {
        spec: args.spec.as_deref().unwrap_or_default(),
        genus: args.genus.unwrap_or_default(),
        set: &args.set,
    };
    envelope::write(args.out.as_deref(), kind, &source, certificate)
}
