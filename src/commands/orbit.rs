//! `cyclorb orbit`: the orbit of the vacuum line (or any seed) and its exact Poincaré sum,
//! with limits, checkpoints, resume, and a progress display on terminals.

use std::path::{Path, PathBuf};
use std::sync::atomic::AtomicBool;
use std::sync::Arc;
use std::time::{Duration, Instant};

use cyclorb_orbit::{
    install_stop_handler, CheckpointPlan, GeneratorSet, Orbit, OrbitOptions, OrbitProblem,
    OrbitReport, Seed,
};
use serde_json::json;

use super::common::{build_space, parse_set, vacuum_problem};
use super::dw::{is_dw, DwSpace};
use super::output::{Outcome, Report};
use super::product::run_product;
use super::progress::OrbitProgress;
use super::proof;
use super::structure::{counted, orbit_json, orbit_text};
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

/// The non-zero entries of a matrix given as text, `(i,j)=v` separated by spaces, shortened
/// after 24 entries.
fn nonzero_entries(m: &[Vec<String>]) -> String {
    let entries: Vec<String> = m
        .iter()
        .enumerate()
        .flat_map(|(i, row)| {
            row.iter()
                .enumerate()
                .filter(|(_, v)| v.as_str() != "0")
                .map(move |(j, v)| format!("({i},{j})={v}"))
        })
        .collect();
    let shown = entries
        .iter()
        .take(24)
        .cloned()
        .collect::<Vec<_>>()
        .join(" ");
    if entries.len() > 24 {
        format!("{shown} … ({} non-zero entries in all)", entries.len())
    } else {
        shown
    }
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
    match (p.is_scalar, &p.prefactor) {
        (Some(true), Some(l)) => t.push_str(&format!("Poincaré sum: B = {l} · G⁻¹ (scalar)\n")),
        (Some(false), _) => {
            t.push_str("Poincaré sum: B is not a multiple of G⁻¹\n");
            if let Some(inv) = &p.invariants {
                t.push_str("  B = Σ coefficient × invariant; non-zero entries (row,column)=value in basis order:\n");
                for term in inv {
                    t.push_str(&format!(
                        "  {} × {}\n",
                        term.coefficient,
                        nonzero_entries(&term.matrix)
                    ));
                }
            }
        }
        _ => t.push_str(&format!(
            "Poincaré sum: not computed ({})\n",
            p.note.clone().unwrap_or_default()
        )),
    }
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
        Ok(p) => p,
        Err(e) => return Outcome::Invalid(e),
    };
    let stop = Arc::new(AtomicBool::new(false));
    if let Err(e) = install_stop_handler(&stop) {
        return Outcome::Invalid(format!("cannot install the interrupt handler: {e}"));
    }
    let opts = options(args, stop);
    if let Some(plan) = &opts.checkpoint {
        if let Err(e) = check_writable(&plan.path) {
            return Outcome::Invalid(e);
        }
    }
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
    let text = text_report(&report, &words);
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
        return Outcome::Invalid(format!(
            "{spec}: the counting route is not available for Dijkgraaf–Witten theories yet; use --method enumerate"
        ));
    }
    let space = match parse_set(&args.set).and_then(|set| Ok((set, build_space(spec, genus)?))) {
        Ok(x) => x,
        Err(e) => return Outcome::Invalid(e),
    };
    match counted(&space.1, space.0) {
        Ok(Ok(report)) => Outcome::Done(Report::new(
            orbit_json(&report, started),
            orbit_text(&report),
            as_json,
        )),
        Ok(Err(absent)) => Outcome::Invalid(format!(
            "{spec} at genus {genus} has no monomial structure ({absent}); use --method enumerate"
        )),
        Err(e) => Outcome::Invalid(e),
    }
}
