//! How the enumeration scales: 1 → 2 threads in one process and 1 → 2 → 4 MPI ranks, with
//! bytes per line and lines per second per core, in one table.
//!
//! Run: `cargo bench --features mpi --bench scaling [SPEC GENUS]` (plain harness; default
//! `ising 3`). Without the feature `mpi` only the thread runs are made. Each run is the
//! `cyclorb` binary of this build, `cyclorb orbit SPEC --genus GENUS --json --threads T`
//! (thread counts from `CYCLORB_BENCH_THREADS`, default `1,2`), then under Open MPI's
//! `mpirun -n R --oversubscribe` with one thread per rank (`CYCLORB_BENCH_RANKS`, default
//! `1,2,4`; launcher `CYCLORB_MPIRUN`, default `mpirun`), in the store `CYCLORB_BENCH_STORE`
//! names (`memory`, the default; `compact`; `compact+spill`, spilling to a temporary
//! directory). Per run one line: the workers
//! (threads × ranks) and the cores they had, the wall time of the whole command (orbit and
//! Poincaré sum), the CPU time of the processes, lines per second and per second per core,
//! the speed-up over the first run of its kind, the store's bytes per line (every rank's
//! store together over the orbit size) and the largest peak resident memory of a process.
//! The orbit size, the layer sizes and B must be the same in every run, else the bench
//! fails: a scaling figure of a wrong answer is worth nothing.

mod support;

use std::process::Command;
use std::time::Instant;

use serde_json::Value;

/// One run's command and what it measured.
struct Run {
    label: String,
    workers: usize,
    wall: f64,
    cpu: Option<f64>,
    report: Value,
}

fn main() {
    let args: Vec<String> = std::env::args()
        .skip(1)
        .filter(|a| !a.starts_with("--"))
        .collect();
    let spec = args.first().map_or("ising", String::as_str).to_string();
    let genus = args.get(1).map_or("3", String::as_str).to_string();
    let threads = counts("CYCLORB_BENCH_THREADS", "1,2");
    let ranks = counts("CYCLORB_BENCH_RANKS", "1,2,4");
    let cores = std::thread::available_parallelism().map_or(1, |n| n.get());
    let spill = std::env::temp_dir().join(format!("cyclorb-scaling-{}", std::process::id()));
    let spill_text = spill.display().to_string();
    let store = std::env::var("CYCLORB_BENCH_STORE").unwrap_or_else(|_| "memory".into());
    let store_args: Vec<&str> = match store.as_str() {
        "memory" => vec!["--store", "memory"],
        "compact" => vec!["--store", "compact"],
        "compact+spill" => vec!["--spill", spill_text.as_str()],
        other => {
            eprintln!("scaling: CYCLORB_BENCH_STORE={other:?}: memory, compact or compact+spill");
            std::process::exit(1);
        }
    };
    std::fs::create_dir_all(&spill).expect("a temporary directory");
    let mut problem = vec!["orbit", spec.as_str(), "--genus", genus.as_str(), "--json"];
    problem.extend(store_args);
    println!("{spec} genus {genus}, {cores} cores, {store} store");
    println!(
        "run\tworkers\tcores\twall_s\tcpu_s\tlines_per_s\tlines_per_s_per_core\tspeed_up\tstore_bytes_per_line\tpeak_resident_mib"
    );
    let mut runs = Vec::new();
    for &t in &threads {
        let mut command = Command::new(env!("CARGO_BIN_EXE_cyclorb"));
        command.args(&problem).args(["--threads", &t.to_string()]);
        runs.push(measure(format!("{t} thread(s)"), t, command));
        print_row(&runs, threads.len(), cores);
    }
    if cfg!(feature = "mpi") {
        let launcher = std::env::var("CYCLORB_MPIRUN").unwrap_or_else(|_| "mpirun".into());
        for &r in &ranks {
            let mut command = Command::new(&launcher);
            command
                .args(["-n", &r.to_string(), "--oversubscribe"])
                .env("OMPI_ALLOW_RUN_AS_ROOT", "1")
                .env("OMPI_ALLOW_RUN_AS_ROOT_CONFIRM", "1")
                .arg(env!("CARGO_BIN_EXE_cyclorb"))
                .args(&problem)
                .args(["--threads", "1"]);
            runs.push(measure(format!("{r} rank(s)"), r, command));
            print_row(&runs, threads.len(), cores);
        }
    } else {
        println!("(ranks not run: build with --features mpi)");
    }
    std::fs::remove_dir_all(&spill).ok();
    let first = &runs[0].report;
    for run in &runs[1..] {
        for key in ["orbit_size", "layer_sizes", "poincare_sum"] {
            if run.report[key] != first[key] {
                eprintln!(
                    "scaling: {} gave another {key} than {}",
                    run.label, runs[0].label
                );
                std::process::exit(1);
            }
        }
    }
    println!(
        "every run: {} lines, {} layers, the same B",
        first["orbit_size"],
        first["layer_sizes"].as_array().map_or(0, Vec::len)
    );
}

/// A comma-separated list of counts from the environment, or the default list.
fn counts(variable: &str, default: &str) -> Vec<usize> {
    let list = std::env::var(variable).unwrap_or_else(|_| default.into());
    list.split(',')
        .map(|c| c.trim().parse().ok().filter(|&n| n > 0))
        .collect::<Option<Vec<usize>>>()
        .unwrap_or_else(|| {
            eprintln!("scaling: {variable}={list:?} is not a list of positive counts");
            std::process::exit(1);
        })
}

/// Run `command` to its end and read its one JSON report; a failed run ends the bench.
fn measure(label: String, workers: usize, mut command: Command) -> Run {
    let cpu_before = support::cpu_seconds(true);
    let started = Instant::now();
    let out = command.output().unwrap_or_else(|e| {
        eprintln!("scaling: {label}: cannot start {command:?}: {e}");
        std::process::exit(1);
    });
    let wall = started.elapsed().as_secs_f64();
    let cpu = support::cpu_seconds(true)
        .zip(cpu_before)
        .map(|(b, a)| b - a);
    let report: Value = match serde_json::from_slice(&out.stdout) {
        Ok(v) if out.status.success() => v,
        _ => {
            eprintln!(
                "scaling: {label} failed ({}):\n{}",
                out.status,
                String::from_utf8_lossy(&out.stderr)
            );
            std::process::exit(1);
        }
    };
    Run {
        label,
        workers,
        wall,
        cpu,
        report,
    }
}

/// Print the figures of the last run; its speed-up is over the first thread run or the
/// first rank run.
fn print_row(runs: &[Run], thread_runs: usize, cores: usize) {
    let last = runs.last().expect("a run");
    let baseline = if runs.len() > thread_runs {
        &runs[thread_runs]
    } else {
        &runs[0]
    };
    let lines = last.report["orbit_size"].as_f64().unwrap_or(0.0);
    let used = last.workers.min(cores);
    let v = &last.report;
    // a distributed report lists every rank's store and peak under `ranks`
    let (store, peak) = match v["ranks"]["store_bytes"].as_array() {
        Some(stores) => (
            stores.iter().filter_map(Value::as_f64).sum::<f64>(),
            v["ranks"]["peak_memory_bytes"].as_array().map_or(0.0, |p| {
                p.iter().filter_map(Value::as_f64).fold(0.0, f64::max)
            }),
        ),
        None => (
            v["store_bytes"].as_f64().unwrap_or(0.0),
            v["peak_memory_bytes"].as_f64().unwrap_or(0.0),
        ),
    };
    println!(
        "{}\t{}\t{used}\t{:.1}\t{}\t{:.0}\t{:.0}\t{:.2}\t{:.1}\t{:.0}",
        last.label,
        last.workers,
        last.wall,
        last.cpu.map_or("-".into(), |c| format!("{c:.1}")),
        lines / last.wall,
        lines / last.wall / used as f64,
        baseline.wall / last.wall,
        store / lines,
        peak / 1048576.0,
    );
}
