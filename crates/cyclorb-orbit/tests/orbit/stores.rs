//! The compact store against the memory store: the same lines in the same order, the same
//! Schreier records, layers, Poincaré sum and induced permutations, through stops,
//! checkpoints and resumption. The sizes are those of the stabilizer states (Aaronson–
//! Gottesman 2004, see groups.rs): 1080 lines for three qubits.

use std::time::Duration;

use cyclorb_orbit::{CheckpointPlan, OrbitOptions, OrbitProblem, Silent, StopReason, StoreKind};

use crate::sample_sets::*;

fn three_qubits() -> OrbitProblem {
    let g = clifford(3);
    OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap()
}

fn compact(threads: usize, chunk: usize) -> OrbitOptions {
    OrbitOptions {
        store: StoreKind::Compact,
        ..options(threads, chunk)
    }
}

#[test]
fn the_compact_store_finds_the_same_orbit_as_the_memory_store() {
    let problem = three_qubits();
    let memory = run(&problem, 1, 64);
    let reference = fingerprint_of_run(&problem, &memory);
    // Aaronson–Gottesman 2004: 2^3·(2+1)(4+1)(8+1) = 1080 stabilizer states of three qubits
    assert_eq!(reference.0.len(), 1080);
    assert!(reference.2.len() > 6, "enough layers to leave the window");
    for (threads, chunk) in [(1, 64), (2, 1), (3, 7)] {
        let orbit = problem
            .enumerate(&compact(threads, chunk), &mut Silent)
            .unwrap();
        assert_eq!(orbit.store_kind(), StoreKind::Compact);
        assert!(orbit.is_saturated());
        // every line, the old ones recomputed from their words
        assert!(fingerprint_of_run(&problem, &orbit) == reference);
        assert_eq!(
            problem.poincare_sum(&orbit, threads).unwrap(),
            problem.poincare_sum(&memory, 1).unwrap()
        );
        assert_eq!(
            problem.induced_permutations(&orbit, threads).unwrap(),
            problem.induced_permutations(&memory, 1).unwrap()
        );
    }
    let orbit = problem.enumerate(&compact(1, 64), &mut Silent).unwrap();
    assert_words_reproduce(&problem, &orbit);
    assert!(orbit.store_bytes() < memory.store_bytes());
}

#[test]
fn a_compact_checkpoint_resumes_to_the_identical_answer() {
    let problem = three_qubits();
    let reference = fingerprint_of_run(&problem, &run(&problem, 1, 64));
    for limit in [1, 200, 700] {
        let path = temp_path(&format!("compact-{limit}.ckpt"));
        let stopping = OrbitOptions {
            limit: Some(limit),
            checkpoint: Some(CheckpointPlan {
                path: path.clone(),
                every: Duration::from_secs(3600),
            }),
            ..compact(2, 16)
        };
        let stopped = problem.enumerate(&stopping, &mut Silent).unwrap();
        assert_eq!(stopped.stop_reason(), Some(StopReason::Limit));
        let read = problem.read_checkpoint(&path).unwrap();
        assert_eq!(read.store_kind(), StoreKind::Compact);
        assert!(fingerprint_of_run(&problem, &read) == fingerprint_of_run(&problem, &stopped));
        let resumed = problem.resume(&path, &options(1, 5), &mut Silent).unwrap();
        assert!(resumed.is_saturated());
        assert_eq!(resumed.store_kind(), StoreKind::Compact);
        assert!(fingerprint_of_run(&problem, &resumed) == reference);
        std::fs::remove_file(&path).unwrap();
    }
}

#[test]
fn a_compact_checkpoint_holds_records_only_and_is_checked() {
    let problem = three_qubits();
    let (memory_path, compact_path) = (temp_path("mem-size.ckpt"), temp_path("cmp-size.ckpt"));
    let saturated = problem.enumerate(&compact(1, 64), &mut Silent).unwrap();
    problem.write_checkpoint(&saturated, &compact_path).unwrap();
    problem
        .write_checkpoint(&run(&problem, 1, 64), &memory_path)
        .unwrap();
    let size = |p: &std::path::Path| std::fs::metadata(p).unwrap().len();
    // 6 bytes of records per line and the header
    assert!(size(&compact_path) < 1080 * 6 + 400);
    assert!(size(&compact_path) < size(&memory_path) / 2);
    let mut bytes = std::fs::read(&compact_path).unwrap();
    let middle = bytes.len() / 2;
    bytes[middle] ^= 0x01;
    std::fs::write(&compact_path, &bytes).unwrap();
    assert!(problem
        .read_checkpoint(&compact_path)
        .unwrap_err()
        .to_string()
        .contains("checksum mismatch"));
    for p in [&memory_path, &compact_path] {
        std::fs::remove_file(p).unwrap();
    }
}

#[test]
fn a_spilling_compact_store_completes_under_a_ceiling_that_stops_the_memory_store() {
    // four qubits: 2^4·3·5·9·17 = 36 720 stabilizer states (Aaronson–Gottesman 2004)
    let g = clifford(4);
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    let memory = run(&problem, 2, 256);
    assert_eq!(memory.len(), 36_720);
    let reference = fingerprint_of_run(&problem, &memory);
    // the ceiling also holds the next chunk's candidates (OrbitProblem::chunk_bytes)
    let ceiling = memory.store_bytes() * 3 / 5;
    let capped = |store, spill: Option<std::path::PathBuf>| OrbitOptions {
        memory_ceiling: Some(ceiling),
        store,
        spill,
        ..options(2, 256)
    };
    let stopped = problem
        .enumerate(&capped(StoreKind::Memory, None), &mut Silent)
        .unwrap();
    assert_eq!(stopped.stop_reason(), Some(StopReason::Memory));
    let dir = temp_path("spill");
    std::fs::create_dir_all(&dir).unwrap();
    let mut peak = 0;
    let mut observer = |p: &cyclorb_orbit::Progress| peak = peak.max(p.store_bytes);
    let spilled = problem
        .enumerate(
            &capped(StoreKind::Compact, Some(dir.clone())),
            &mut observer,
        )
        .unwrap();
    assert!(
        spilled.is_saturated(),
        "peak {peak} bytes, ceiling {ceiling}"
    );
    assert!(fingerprint_of_run(&problem, &spilled) == reference);
    assert_eq!(
        problem.poincare_sum(&spilled, 2).unwrap(),
        problem.poincare_sum(&memory, 1).unwrap()
    );
    drop(spilled);
    // the files of the layers go with the store
    assert_eq!(std::fs::read_dir(&dir).unwrap().count(), 0);
    // the memory store keeps every key by design: it does not spill
    let refused = problem.enumerate(&capped(StoreKind::Memory, Some(dir.clone())), &mut Silent);
    assert!(refused
        .unwrap_err()
        .to_string()
        .contains("only the compact store"));
    // a directory that does not exist is named in the error
    let missing = dir.join("absent");
    let error = problem
        .enumerate(&capped(StoreKind::Compact, Some(missing)), &mut Silent)
        .unwrap_err()
        .to_string();
    assert!(error.contains("absent"), "{error}");
    std::fs::remove_dir(&dir).unwrap();
}
