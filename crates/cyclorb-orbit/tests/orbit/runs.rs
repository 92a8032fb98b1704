//! Long-run machinery: limits, memory ceiling, stop flag, checkpoints, resumption, threads.
//! The reference for every comparison is an uninterrupted single-thread run; the sizes are
//! those of the stabilizer states (Aaronson–Gottesman 2004, see groups.rs).

use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use std::time::Duration;

use cyclorb_matrix::Operator;
use cyclorb_orbit::{
    CheckpointPlan, OrbitError, OrbitOptions, OrbitProblem, Progress, Silent, StopReason,
};

use crate::sample_sets::*;

fn three_qubits() -> OrbitProblem {
    let g = clifford(3);
    OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap()
}

#[test]
fn results_do_not_depend_on_threads_or_chunks() {
    let problem = three_qubits();
    let reference = fingerprint_of_run(&problem, &run(&problem, 1, 1_000_000));
    assert_eq!(reference.0.len(), 1080);
    for (threads, chunk) in [(2, 1), (2, 16), (3, 5), (1, 7)] {
        let other = fingerprint_of_run(&problem, &run(&problem, threads, chunk));
        assert!(other == reference, "threads {threads}, chunk {chunk}");
    }
}

#[test]
fn line_limit_stops_unsaturated_then_continues_to_the_same_answer() {
    let problem = three_qubits();
    let full = run(&problem, 1, 64);
    let limited = OrbitOptions {
        limit: Some(500),
        ..options(2, 64)
    };
    let partial = problem.enumerate(&limited, &mut Silent).unwrap();
    assert_eq!(partial.len(), 500);
    assert!(!partial.is_saturated());
    assert_eq!(partial.stop_reason(), Some(StopReason::Limit));
    let (sizes, full_sizes) = (partial.layer_sizes(), full.layer_sizes());
    assert_eq!(sizes.iter().sum::<usize>(), 500);
    let last = sizes.len() - 1;
    assert_eq!(sizes[..last], full_sizes[..last]);
    assert!(sizes[last] <= full_sizes[last]);
    assert!(problem.poincare_sum(&partial, 1).is_err());
    // a limit equal to the orbit size does not stop a run that closes
    let exact = OrbitOptions {
        limit: Some(1080),
        ..options(1, 64)
    };
    assert!(problem
        .enumerate(&exact, &mut Silent)
        .unwrap()
        .is_saturated());
    let continued = problem
        .extend(partial, &options(2, 9), &mut Silent)
        .unwrap();
    assert!(continued.is_saturated());
    assert!(fingerprint_of_run(&problem, &continued) == fingerprint_of_run(&problem, &full));
}

#[test]
fn memory_ceiling_stops_the_run() {
    let problem = three_qubits();
    let options = OrbitOptions {
        memory_ceiling: Some(30_000),
        ..options(1, 16)
    };
    let orbit = problem.enumerate(&options, &mut Silent).unwrap();
    assert_eq!(orbit.stop_reason(), Some(StopReason::Memory));
    assert!(orbit.len() < 1080);
    // it stopped because the store and the next chunk's candidates would pass the ceiling
    let chunk = problem.chunk_bytes(16);
    assert!(orbit.store_bytes() + chunk > 30_000);
    assert!(orbit.store_bytes() <= 30_000);
}

#[test]
fn the_hosts_resident_memory_probe_counts_against_the_ceiling() {
    let problem = three_qubits();
    let probed = |probe: fn() -> Option<u64>| OrbitOptions {
        memory_ceiling: Some(1 << 30),
        resident: Some(probe),
        ..options(1, 16)
    };
    // a process already past the ceiling stops before the first chunk
    let orbit = problem
        .enumerate(&probed(|| Some(2 << 30)), &mut Silent)
        .unwrap();
    assert_eq!(orbit.stop_reason(), Some(StopReason::Memory));
    assert_eq!(orbit.processed(), 0);
    // a probe with nothing to say leaves the store's own count
    let orbit = problem.enumerate(&probed(|| None), &mut Silent).unwrap();
    assert!(orbit.is_saturated());
    assert_eq!(orbit.len(), 1080);
}

#[test]
fn a_chunk_is_shortened_to_an_eighth_of_the_ceiling() {
    let problem = three_qubits();
    let with = |ceiling| OrbitOptions {
        memory_ceiling: ceiling,
        ..options(2, 64)
    };
    assert_eq!(problem.chunk_len(&with(None)), 64);
    assert_eq!(problem.chunk_len(&with(Some(usize::MAX))), 64);
    assert_eq!(
        problem.chunk_len(&with(Some(8 * problem.chunk_bytes(5)))),
        5
    );
    assert_eq!(problem.chunk_len(&with(Some(1))), 1);
}

#[test]
fn stop_flag_checkpoint_and_resume_give_the_identical_answer() {
    let problem = three_qubits();
    let reference = fingerprint_of_run(&problem, &run(&problem, 1, 64));
    let path = temp_path("stop.ckpt");
    let flag = Arc::new(AtomicBool::new(false));
    let stoppable = OrbitOptions {
        checkpoint: Some(CheckpointPlan {
            path: path.clone(),
            every: Duration::from_secs(3600),
        }),
        stop: Some(flag.clone()),
        ..options(2, 32)
    };
    let mut seen = Vec::new();
    let mut observer = |p: &Progress| {
        seen.push(p.lines);
        if p.lines >= 300 {
            flag.store(true, Ordering::SeqCst);
        }
    };
    let stopped = problem.enumerate(&stoppable, &mut observer).unwrap();
    assert_eq!(stopped.stop_reason(), Some(StopReason::Interrupted));
    assert!(stopped.len() >= 300 && stopped.len() < 1080);
    assert!(seen.windows(2).all(|w| w[0] <= w[1]));
    // resume in a "new process": only the file and the problem
    let resumed = problem.resume(&path, &options(1, 5), &mut Silent).unwrap();
    assert!(resumed.is_saturated());
    assert!(fingerprint_of_run(&problem, &resumed) == reference);
    std::fs::remove_file(&path).unwrap();
}

#[test]
fn periodic_checkpoints_hold_a_resumable_state() {
    let problem = three_qubits();
    let path = temp_path("periodic.ckpt");
    let options = OrbitOptions {
        checkpoint: Some(CheckpointPlan {
            path: path.clone(),
            every: Duration::ZERO,
        }),
        ..options(1, 100)
    };
    let orbit = problem.enumerate(&options, &mut Silent).unwrap();
    let saved = problem.read_checkpoint(&path).unwrap();
    // the last periodic checkpoint is written after the last chunk: the complete orbit
    assert_eq!(saved.len(), orbit.len());
    assert!(saved.is_saturated());
    assert!(fingerprint_of_run(&problem, &saved) == fingerprint_of_run(&problem, &orbit));
    std::fs::remove_file(&path).unwrap();
}

fn stopped_checkpoint(problem: &OrbitProblem, name: &str) -> std::path::PathBuf {
    let path = temp_path(name);
    let options = OrbitOptions {
        limit: Some(200),
        checkpoint: Some(CheckpointPlan {
            path: path.clone(),
            every: Duration::from_secs(3600),
        }),
        ..options(1, 32)
    };
    problem.enumerate(&options, &mut Silent).unwrap();
    path
}

fn checkpoint_error(problem: &OrbitProblem, path: &std::path::Path) -> String {
    match problem.read_checkpoint(path) {
        Err(e @ OrbitError::Checkpoint { .. }) => e.to_string(),
        other => panic!("expected a checkpoint error, got {other:?}"),
    }
}

#[test]
fn checkpoints_for_other_problems_or_damaged_files_are_refused() {
    let problem = three_qubits();
    let path = stopped_checkpoint(&problem, "refuse.ckpt");
    assert_eq!(problem.read_checkpoint(&path).unwrap().len(), 200);
    // same shapes, one generator changed: S0 = diag(1, −i) instead of diag(1, i)
    let g = clifford(3);
    let f = g.field().clone();
    let mut named: Vec<(String, Operator)> = g
        .names()
        .iter()
        .cloned()
        .zip(g.operators().iter().cloned())
        .collect();
    named[1].1 = Operator::Diagonal(
        (0..8)
            .map(|i| if i & 1 == 1 { parse(&f, "-i") } else { f.one() })
            .collect(),
    );
    let g = cyclorb_orbit::GeneratorSet::new(f.clone(), named).unwrap();
    let other = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    assert!(checkpoint_error(&other, &path).contains("content hash differs"));
    // same generators, another seed
    let other_seed = OrbitProblem::new(
        clifford(3),
        &seed(&f, &["0", "1", "0", "0", "0", "0", "0", "0"]),
    )
    .unwrap();
    assert!(checkpoint_error(&other_seed, &path).contains("content hash differs"));
    // another dimension
    let two = OrbitProblem::new(clifford(2), &vacuum(&clifford(2))).unwrap();
    assert!(checkpoint_error(&two, &path).contains("dimension 8, this problem has 4"));
    // one flipped byte in the packed keys
    let mut bytes = std::fs::read(&path).unwrap();
    let middle = bytes.len() / 2;
    bytes[middle] ^= 0x10;
    let damaged = temp_path("damaged.ckpt");
    std::fs::write(&damaged, &bytes).unwrap();
    assert!(checkpoint_error(&problem, &damaged).contains("checksum mismatch"));
    bytes[middle] ^= 0x10;
    std::fs::write(&damaged, &bytes[..bytes.len() - 40]).unwrap();
    assert!(checkpoint_error(&problem, &damaged).contains("truncated"));
    std::fs::write(&damaged, b"not a checkpoint at all, clearly").unwrap();
    assert!(checkpoint_error(&problem, &damaged).contains("not a cyclorb orbit checkpoint"));
    for p in [&path, &damaged] {
        std::fs::remove_file(p).unwrap();
    }
}

#[test]
fn words_print_generator_names() {
    let problem = three_qubits();
    let orbit = run(&problem, 1, 64);
    let last = orbit.len() - 1;
    let names = problem.word_names(&orbit, last);
    assert_eq!(names.len(), orbit.layer_sizes().len() - 1);
    assert!(names
        .iter()
        .all(|n| problem.generators().names().contains(n)));
    assert!(problem.word_names(&orbit, 0).is_empty());
}
