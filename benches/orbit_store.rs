//! What a line costs in each orbit store, and how fast each enumerates.
//!
//! Run: `cargo bench --bench orbit_store [SPEC GENUS [THREADS]]` (plain harness; default
//! `ising 2` on every core; THREADS may be a comma-separated list such as `1,2`, each count
//! run in turn). For each store (`memory`, `compact`, and `compact` spilling finished layers
//! to a temporary directory) and thread count it enumerates the vacuum orbit once and prints
//! one line: the store, the threads, the orbit size, the enumeration's wall time and the
//! process's CPU time during it (from /proc/self/stat where there is one), lines per second,
//! the store's bytes per line at the end and at its peak (the peak includes the compact
//! store's window of recent layers), and the time of the Poincaré sum (which the compact
//! store computes by regenerating the lines layer by layer). Figures for the README come
//! from `cargo bench --bench orbit_store ising 3`. `CYCLORB_BENCH_STORES` (a comma-separated
//! list of `memory`, `compact`, `compact+spill`) runs only those.

mod support;

use std::time::Instant;

use cyclorb_orbit::{OrbitOptions, Progress, StoreKind};
use cyclorb_pipeline::space::vacuum_problem;

fn main() {
    let args: Vec<String> = std::env::args()
        .skip(1)
        .filter(|a| !a.starts_with("--"))
        .collect();
    let spec = args.first().map_or("ising", String::as_str);
    let genus: usize = args.get(1).and_then(|g| g.parse().ok()).unwrap_or(2);
    let every_core = std::thread::available_parallelism().map_or(1, |n| n.get());
    let thread_counts: Vec<usize> = match args.get(2) {
        Some(list) => match list.split(',').map(str::parse).collect() {
            Ok(counts) => counts,
            Err(e) => {
                eprintln!("orbit_store: THREADS {list:?}: {e}");
                std::process::exit(1);
            }
        },
        None => vec![every_core],
    };
    let problem = match vacuum_problem(spec, genus, "humphries") {
        Ok(p) => p,
        Err(e) => {
            eprintln!("orbit_store: {e}");
            std::process::exit(1);
        }
    };
    let spill_dir =
        std::env::temp_dir().join(format!("cyclorb-bench-spill-{}", std::process::id()));
    println!("{spec} genus {genus}");
    println!(
        "store\tthreads\tlines\tenumerate_s\tcpu_s\tlines_per_s\tbytes_per_line\tpeak_bytes_per_line\tsum_s"
    );
    let stores = [
        ("memory", StoreKind::Memory, false),
        ("compact", StoreKind::Compact, false),
        ("compact+spill", StoreKind::Compact, true),
    ];
    for (name, store, spill) in stores {
        let chosen = std::env::var("CYCLORB_BENCH_STORES")
            .map_or(true, |list| list.split(',').any(|s| s.trim() == name));
        if !chosen {
            continue;
        }
        for &threads in &thread_counts {
            run(&problem, name, store, spill.then_some(&spill_dir), threads);
        }
    }
}

/// One enumeration and sum, and its line of figures.
fn run(
    problem: &cyclorb_orbit::OrbitProblem,
    name: &str,
    store: StoreKind,
    spill_dir: Option<&std::path::PathBuf>,
    threads: usize,
) {
    if let Some(dir) = spill_dir {
        std::fs::create_dir_all(dir).expect("a temporary directory");
    }
    let options = OrbitOptions {
        threads,
        store,
        spill: spill_dir.cloned(),
        ..OrbitOptions::default()
    };
    let mut peak = 0usize;
    let mut observer = |p: &Progress| peak = peak.max(p.store_bytes);
    let cpu_before = support::cpu_seconds(false);
    let started = Instant::now();
    let orbit = problem
        .enumerate(&options, &mut observer)
        .expect("the orbit enumerates");
    let enumerate = started.elapsed().as_secs_f64();
    let cpu = match (cpu_before, support::cpu_seconds(false)) {
        (Some(a), Some(b)) => format!("{:.1}", b - a),
        _ => "-".into(),
    };
    let started = Instant::now();
    let sum = problem.poincare_sum(&orbit, threads).expect("the sum");
    let summed = started.elapsed().as_secs_f64();
    assert!(sum.trace_check, "tr(B·G) = |orbit|·N must hold");
    let lines = orbit.len() as f64;
    println!(
        "{name}\t{threads}\t{}\t{enumerate:.2}\t{cpu}\t{:.0}\t{:.1}\t{:.1}\t{summed:.2}",
        orbit.len(),
        lines / enumerate,
        orbit.bytes_per_element(),
        peak.max(orbit.store_bytes()) as f64 / lines,
    );
    drop(orbit);
    if let Some(dir) = spill_dir {
        std::fs::remove_dir_all(dir).ok();
    }
}
