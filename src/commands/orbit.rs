//! `cyclorb orbit`: the orbit of the vacuum line (or any seed) and its exact Poincaré sum,
//! with limits, checkpoints, resume, and a progress display on terminals.

use std::path::{Path, PathBuf};
use std::sync::atomic::AtomicBool;
use std::sync::Arc;
use std::time::{Duration, Instant};

use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_orbit::{
    checkpoint_origin, install_stop_handler, CheckpointPlan, GeneratorSet, LabelledEntry, Orbit,
    OrbitOptions, OrbitProblem, OrbitReport, PoincareReport, Seed,
};
use serde_json::json;

use super::common::{build_space, parse_set, vacuum_problem};
use super::dw::{is_dw, DwSpace};
use super::envelope::{self, Source};
use super::output::{shell_word, Outcome, Report};
use super::product::run_product;
use super::progress::OrbitProgress;
use super::proof;
use super::structure::{
    counted, counted_imprimitive, imprimitive_orbit_json, imprimitive_orbit_text, orbit_json,
    orbit_text, scalar_sum_entries,
};
use crate::cli::OrbitArgs;

/// The generator set and seed from either a theory or raw files.
fn load_problem(args: &OrbitArgs) -> Result<OrbitProblem, String> {
    match (&args.matrices, &args.seed, &args.spec) {
        (Some(m), Some(s), _) => {
            let gens = GeneratorSet::read(m).map_err(|e| e.to_string())?;
            let seed = Seed::read(s).map_err(|e| e.to_string())?;
            gens.validate()
                .map_err(|e| format!("{}: {e}", m.display()))?;
            proof::generators(&gens, &m.display().to_string())?;
            OrbitProblem::new(gens, &seed).map_err(|e| e.to_string())
        }
        (_, _, Some(spec)) => {
            let genus = args.genus.ok_or("--genus is required with a theory")?;
            vacuum_problem(spec, genus, &args.set)
        }
        _ => Err("give a theory SPEC with --genus, or --matrices FILE --seed FILE".into()),
    }
}

/// How the problem of `args` is built, as JSON recorded in its checkpoints, so that
/// `--resume FILE` alone can rebuild it (raw files by absolute path).
fn origin_of(args: &OrbitArgs) -> String {
    let absolute = |p: &Path| {
        std::path::absolute(p)
            .unwrap_or_else(|_| p.to_path_buf())
            .display()
            .to_string()
    };
    match (&args.matrices, &args.seed) {
        (Some(m), Some(s)) => json!({"matrices": absolute(m), "seed": absolute(s)}),
        _ => json!({"theory": args.spec, "genus": args.genus, "set": args.set}),
    }
    .to_string()
}

/// `--resume FILE` without a theory or raw files: the arguments completed with what the
/// checkpoint records (theory, genus and generating set, or the raw files).
fn recorded_arguments(args: &OrbitArgs, path: &Path) -> Result<OrbitArgs, String> {
    let place = path.display();
    let origin = checkpoint_origin(path)
        .map_err(|e| e.to_string())?
        .ok_or_else(|| {
            format!(
                "{place}: this checkpoint records no theory (an older format); give SPEC --genus G \
                 (and --set) as when it was written"
            )
        })?;
    let v: serde_json::Value = serde_json::from_str(&origin)
        .map_err(|e| format!("{place}: the recorded origin is not JSON: {e}"))?;
    let mut out = args.clone();
    match (
        v["matrices"].as_str(),
        v["seed"].as_str(),
        v["theory"].as_str(),
        v["genus"].as_u64(),
        v["set"].as_str(),
    ) {
        (Some(m), Some(s), ..) => {
            out.matrices = Some(m.into());
            out.seed = Some(s.into());
        }
        (_, _, Some(theory), Some(genus), Some(set)) => {
            out.spec = Some(theory.to_string());
            out.genus = Some(genus as usize);
            out.set = set.to_string();
        }
        _ => {
            return Err(format!(
                "{place}: the recorded origin {origin} names no problem"
            ))
        }
    }
    Ok(out)
}

/// Where a run without `--checkpoint` keeps its checkpoint: `cyclorb-orbit-HASH.ckpt` (HASH
/// from the generators and seed) in `$XDG_CACHE_HOME/cyclorb`, `~/.cache/cyclorb` or the
/// temporary folder, created when missing; `None` when none can be written.
fn default_checkpoint(problem: &OrbitProblem) -> Option<PathBuf> {
    let base = std::env::var_os("XDG_CACHE_HOME")
        .map(PathBuf::from)
        .or_else(|| std::env::var_os("HOME").map(|h| PathBuf::from(h).join(".cache")))
        .unwrap_or_else(std::env::temp_dir)
        .join("cyclorb");
    std::fs::create_dir_all(&base).ok()?;
    let path = base.join(format!(
        "cyclorb-orbit-{:016x}.ckpt",
        problem.content_hash() as u64
    ));
    check_writable(&path).ok().map(|_| path)
}

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
        ..OrbitOptions::default()
    }
}

/// Prove before any work that a checkpoint can be written at `path`: a file beside it is
/// created and removed (checkpoints are written through a temporary file and a rename, so
/// the folder must take new files). An unwritable path found only at the first periodic
/// write would lose the work done until then.
fn check_writable(path: &Path) -> Result<(), String> {
    let mut probe = path.as_os_str().to_owned();
    probe.push(format!(".probe{}", std::process::id()));
    let probe = PathBuf::from(probe);
    std::fs::OpenOptions::new()
        .write(true)
        .create_new(true)
        .open(&probe)
        .map_err(|e| {
            format!(
                "checkpoint {} cannot be written ({e}); choose another --checkpoint path",
                path.display()
            )
        })?;
    std::fs::remove_file(&probe).ok();
    Ok(())
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

fn text_report(report: &OrbitReport, words: &[(usize, Vec<String>)]) -> String {
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
            report.orbit_size
        ));
    } else {
        t.push_str(&format!(
            "orbit: not saturated after {} lines (stopped: {})\n",
            report.orbit_size,
            report
                .stop_reason
                .map_or("unknown".to_string(), |r| format!("{r:?}").to_lowercase())
        ));
    }
    t.push_str(&format!("layer sizes: {:?}\n", report.layer_sizes));
    let p = &report.poincare_sum;
    t.push_str(&poincare_text(p));
    if let Some(ok) = p.trace_check {
        t.push_str(&format!(
            "check tr(B·G) = |orbit|·⟨v₀,v₀⟩_G: {}\n",
            if ok { "holds" } else { "FAILS" }
        ));
    }
    for (i, w) in words {
        t.push_str(&format!(
            "word of line {i}: {}\n",
            if w.is_empty() {
                "(seed)".into()
            } else {
                w.join(" ")
            }
        ));
    }
    t.push_str(&format!(
        "time {:.2} s, store {} bytes ({:.1} bytes per line)",
        report.elapsed_seconds, report.store_bytes, report.bytes_per_element
    ));
    if let Some(m) = report.peak_memory_bytes {
        t.push_str(&format!(", peak memory {:.1} MiB", m as f64 / 1048576.0));
    }
    t.push('\n');
    t
}

/// Run `cyclorb orbit`.
pub fn run(args: &OrbitArgs, as_json: bool) -> Outcome {
    let started = Instant::now();
    if args.out.is_some() && args.method != "structure" {
        return Outcome::Invalid(
            "--out writes the certificate of --method structure; for an image certificate use \
             `cyclorb image --out`"
                .into(),
        );
    }
    let completed;
    let args = match &args.resume {
        Some(path) if args.spec.is_none() && args.matrices.is_none() => {
            completed = match recorded_arguments(args, path) {
                Ok(a) => a,
                Err(e) => return Outcome::Invalid(e),
            };
            &completed
        }
        _ => args,
    };
    if args.method == "structure" {
        return run_structure(args, as_json, started);
    }
    if args.method == "product" {
        return run_product(args, as_json, started);
    }
    // dw:GROUP keeps its space: the Poincaré sum is read over its orbitals
    let dw_space = match (&args.spec, args.genus) {
        (Some(spec), Some(genus)) if is_dw(spec) => match DwSpace::new(spec, genus, &args.set) {
            Ok(s) => Some(s),
            Err(e) => return Outcome::Invalid(e),
        },
        _ => None,
    };
    let problem = match dw_space
        .as_ref()
        .map_or_else(|| load_problem(args), DwSpace::problem)
    {
        Ok(p) => p.with_origin(origin_of(args)),
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
            opts.checkpoint = default_checkpoint(&problem).map(|path| CheckpointPlan {
                path,
                every: Duration::from_secs(args.checkpoint_every.max(1)),
            });
        }
    }
    let chosen_checkpoint = args.checkpoint.is_none() && args.resume.is_none();
    let mut progress = OrbitProgress::new(as_json);
    let result: Result<Orbit, _> = match &args.resume {
        Some(path) => problem.resume(path, &opts, &mut progress),
        None => problem.enumerate(&opts, &mut progress),
    };
    progress.finish();
    let orbit = match result {
        Ok(o) => o,
        Err(e) => return Outcome::Invalid(e.to_string()),
    };
    // dw: B comes from the subsets and orbitals (no dense d×d matrix over the field)
    // (a twisted dw: theory has phases: its B is summed like any other theory's)
    let dense_sum = dw_space.as_ref().map_or(true, DwSpace::is_twisted);
    let sum = if orbit.is_saturated() && dense_sum {
        Some(
            problem
                .poincare_sum(&orbit, opts.threads)
                .map_err(|e| e.to_string()),
        )
    } else {
        None
    };
    let poincare = match &sum {
        Some(Ok(s)) => Ok(s),
        Some(Err(e)) => Err(e.clone()),
        None => Err("the orbit is not saturated".to_string()),
    };
    let mut report = OrbitReport::new(&problem, &orbit, poincare, started.elapsed());
    if let (Some(space), true, false) = (&dw_space, orbit.is_saturated(), dense_sum) {
        report.poincare_sum = space.poincare_report(orbit.len());
    }
    let words: Vec<(usize, Vec<String>)> = (0..args.words.min(orbit.len()))
        .map(|k| orbit.len() - 1 - k)
        .map(|i| (i, problem.word_names(&orbit, i)))
        .collect();
    let mut value = serde_json::to_value(&report).expect("reports serialise");
    if !words.is_empty() {
        value["words"] = json!(words
            .iter()
            .map(|(i, w)| json!({"line": i, "word": w}))
            .collect::<Vec<_>>());
    }
    let mut text = text_report(&report, &words);
    if let Some(plan) = &opts.checkpoint {
        if orbit.is_saturated() {
            if chosen_checkpoint {
                std::fs::remove_file(&plan.path).ok();
            }
        } else if plan.path.exists() {
            let command = format!(
                "cyclorb orbit --resume {}",
                shell_word(&plan.path.display().to_string())
            );
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
        return super::dw_count::run(spec, genus, &args.set, args.limit, as_json, started);
    }
    let space = match parse_set(&args.set).and_then(|set| Ok((set, build_space(spec, genus)?))) {
        Ok(x) => x,
        Err(e) => return Outcome::Invalid(e),
    };
    match counted(&space.1, space.0) {
        Ok(Ok(report)) => {
            if let Err(e) = write_structure(args, "structure", &report.certificate) {
                return Outcome::Invalid(e);
            }
            let mut value = orbit_json(&report, started);
            let mut entries_text = String::new();
            if let Some(lambda) = &report.prefactor {
                match scalar_sum_entries(&space.1, lambda) {
                    Ok(entries) => {
                        entries_text = format!(
                            "  B by comb-basis labels (row | column: value, non-zero entries):\n{}",
                            entry_lines(&entries, "poincare_sum.entries")
                        );
                        value["poincare_sum"]["entries"] = json!(entries);
                    }
                    Err(e) => return Outcome::Invalid(format!("B = λ·G⁻¹ by entries: {e}")),
                }
            }
            let text = orbit_text(&report, &entries_text);
            Outcome::Done(Report::new(value, text, as_json))
        }
        Ok(Err(absent)) => imprimitive(&space.1, space.0, args, &absent, as_json, started),
        Err(e) => Outcome::Invalid(e),
    }
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

/// `--method structure` through the imprimitive structure, for a theory without a
/// monomial one (`monomial`: why not).
fn imprimitive(
    space: &BlockSpace,
    set: GeneratingSet,
    args: &OrbitArgs,
    monomial: &str,
    as_json: bool,
    started: Instant,
) -> Outcome {
    let (Some(spec), Some(genus)) = (&args.spec, args.genus) else {
        return Outcome::Invalid("--method structure needs a theory SPEC and --genus".into());
    };
    match counted_imprimitive(space, set) {
        Ok(Ok(report)) => {
            if let Err(e) = write_structure(args, "structure-imprimitive", &report.certificate) {
                return Outcome::Invalid(e);
            }
            match imprimitive_orbit_json(space, &report, started) {
                Ok(value) => {
                    Outcome::Done(Report::new(value, imprimitive_orbit_text(&report), as_json))
                }
                Err(e) => Outcome::Invalid(e),
            }
        }
        Ok(Err(absent)) => Outcome::Invalid(format!(
            "{spec} at genus {genus} has no monomial structure ({monomial}) and no imprimitive one ({absent}); use --method enumerate"
        )),
        Err(e) => Outcome::Invalid(e),
    }
}
