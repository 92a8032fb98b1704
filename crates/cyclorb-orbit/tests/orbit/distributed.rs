//! Distributed saturation against the one-process engine: ranks are threads here (the
//! program runs the same code over MPI, tests/cli_mpi.rs). For every number of ranks and
//! chunk size the orbit size, the layer sizes, every Schreier record and B are the ones the
//! one-process run finds, and a line limit or a stop ends every rank at the same place.

use std::path::Path;
use std::sync::atomic::AtomicBool;
use std::sync::{Arc, Barrier, Mutex};
use std::time::Duration;

use cyclorb_matrix::Operator;
use cyclorb_orbit::{
    rank_checkpoint_path, CheckpointPlan, Collective, DistributedOrbit, OrbitOptions, OrbitProblem,
    PoincareSum, Silent, StopReason, StoreKind,
};

use crate::sample_sets::*;

/// One rank of a group of threads meeting at a barrier.
struct ThreadRank {
    rank: usize,
    size: usize,
    barrier: Arc<Barrier>,
    /// `mail[to][from]`: the buffers of the current call.
    mail: Arc<Mutex<Vec<Vec<Vec<u8>>>>>,
}

impl Collective for ThreadRank {
    fn rank(&self) -> usize {
        self.rank
    }

    fn size(&self) -> usize {
        self.size
    }

    fn exchange(&self, outgoing: Vec<Vec<u8>>) -> Vec<Vec<u8>> {
        {
            let mut mail = self.mail.lock().unwrap();
            for (to, buffer) in outgoing.into_iter().enumerate() {
                mail[to][self.rank] = buffer;
            }
        }
        self.barrier.wait();
        let fresh = vec![Vec::new(); self.size];
        let mine = std::mem::replace(&mut self.mail.lock().unwrap()[self.rank], fresh);
        // nobody writes the next call's mail before everyone has taken this call's
        self.barrier.wait();
        mine
    }

    fn all_gather(&self, mine: Vec<u8>) -> Vec<Vec<u8>> {
        self.exchange(vec![mine; self.size])
    }
}

/// What every rank returns: its share of the orbit and (rank 0) the sum.
type RankResult = (DistributedOrbit, Option<PoincareSum>);

/// Run `work` on `ranks` threads, each with its rank; the results by rank.
fn on_ranks<T: Send>(ranks: usize, work: impl Fn(&ThreadRank) -> T + Sync) -> Vec<T> {
    let barrier = Arc::new(Barrier::new(ranks));
    let mail = Arc::new(Mutex::new(vec![vec![Vec::new(); ranks]; ranks]));
    let work = &work;
    std::thread::scope(|scope| {
        let handles: Vec<_> = (0..ranks)
            .map(|rank| {
                let comm = ThreadRank {
                    rank,
                    size: ranks,
                    barrier: barrier.clone(),
                    mail: mail.clone(),
                };
                scope.spawn(move || work(&comm))
            })
            .collect();
        handles.into_iter().map(|h| h.join().unwrap()).collect()
    })
}

/// Run the distributed enumeration (and the sum when it closes) on `ranks` threads.
fn distributed(problem: &OrbitProblem, ranks: usize, options: &OrbitOptions) -> Vec<RankResult> {
    on_ranks(ranks, |comm| {
        let orbit = problem
            .enumerate_distributed(comm, options, &mut Silent)
            .unwrap();
        with_sum(problem, orbit, comm)
    })
}

/// The rank's orbit and, when it closed, the sum (rank 0 only).
fn with_sum(problem: &OrbitProblem, orbit: DistributedOrbit, comm: &ThreadRank) -> RankResult {
    let sum = orbit
        .is_saturated()
        .then(|| problem.poincare_sum_distributed(&orbit, comm, 1).unwrap())
        .flatten();
    (orbit, sum)
}

/// Every rank's records put together by global index.
fn records(results: &[RankResult]) -> Vec<Option<(usize, usize)>> {
    let total = results[0].0.len();
    let mut all = vec![None; total];
    let mut owned = 0;
    for (orbit, _) in results {
        owned += orbit.local_len();
        for (index, parent, generator) in orbit.local_records() {
            all[index as usize] =
                (parent != u32::MAX).then_some((parent as usize, generator as usize));
        }
    }
    assert_eq!(owned, total, "every line has exactly one owner");
    all
}

fn assert_same_as_one_process(problem: &OrbitProblem, ranks: usize, chunk: usize) {
    assert_same_in_store(problem, ranks, chunk, StoreKind::Memory);
}

/// The distributed run in `store` gives the one-process run's (memory store) lines,
/// layers, records and B.
fn assert_same_in_store(problem: &OrbitProblem, ranks: usize, chunk: usize, store: StoreKind) {
    let single = run(problem, 1, 64);
    let in_store = OrbitOptions {
        store,
        ..options(2, chunk)
    };
    let results = distributed(problem, ranks, &in_store);
    for (orbit, sum) in &results {
        assert!(orbit.is_saturated());
        assert_eq!(orbit.len(), single.len());
        assert_eq!(orbit.layer_sizes(), single.layer_sizes());
        assert_eq!(orbit.ranks(), ranks);
        assert_eq!(sum.is_some(), std::ptr::eq(orbit, &results[0].0));
    }
    let expected: Vec<_> = (0..single.len()).map(|i| single.schreier(i)).collect();
    assert!(
        records(&results) == expected,
        "{ranks} ranks, chunk {chunk}, {store:?} store"
    );
    assert_eq!(
        results[0].1.as_ref().unwrap(),
        &problem.poincare_sum(&single, 1).unwrap()
    );
}

#[test]
fn ranks_find_the_one_process_orbit_records_and_sum() {
    let g = clifford(3);
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    // Aaronson–Gottesman 2004: 2^3·(2+1)(4+1)(8+1) = 1080 stabilizer states of three qubits
    assert_eq!(run(&problem, 1, 64).len(), 1080);
    for (ranks, chunk) in [(1, 64), (2, 5), (3, 1), (4, 33)] {
        assert_same_as_one_process(&problem, ranks, chunk);
    }
    let g = ising_genus1();
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    // Castro et al., Phys. Rev. D 85 (2012) 024032: 24 vacuum images, B = 8·I (ising.rs)
    let results = distributed(&problem, 3, &options(1, 2));
    assert_eq!(results[0].0.len(), 24);
    assert_eq!(
        results[0].1.as_ref().unwrap().scalar,
        Some(problem.field().int(8))
    );
    assert_same_as_one_process(&problem, 3, 2);
}

/// One generator X = diag(1, ζ₁₆) on the line of (1, 1): the orbit is the 16 lines
/// (1, ζ₁₆^k), one per layer, and X maps the last back to the seed, 15 layers before:
/// every rank's compact store must settle that image through the records of other ranks.
fn cycle_of_sixteen() -> OrbitProblem {
    let f = field(16);
    let g = generator_set(
        16,
        2,
        vec![(
            "X",
            Operator::Diagonal(vec![parse(&f, "1"), parse(&f, "z")]),
        )],
    );
    OrbitProblem::new(g, &seed(&f, &["1", "1"])).unwrap()
}

#[test]
fn ranks_in_the_compact_store_find_the_one_process_orbit_records_and_sum() {
    let cycle = cycle_of_sixteen();
    // common practice: ζ₁₆ has order 16, so the lines (1, ζ₁₆^k) are 16 distinct lines
    let single = run(&cycle, 1, 64);
    assert_eq!(single.layer_sizes(), vec![1; 16]);
    for ranks in [1, 2, 3] {
        assert_same_in_store(&cycle, ranks, 1, StoreKind::Compact);
    }
    let g = clifford(3);
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    for (ranks, chunk) in [(1, 64), (2, 5), (3, 1)] {
        assert_same_in_store(&problem, ranks, chunk, StoreKind::Compact);
    }
}

#[test]
fn the_compact_store_over_ranks_spills_to_a_directory_per_rank() {
    let g = clifford(3);
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    let dir = temp_path("compact-ranks-spill");
    std::fs::create_dir_all(&dir).unwrap();
    let spilled = OrbitOptions {
        store: StoreKind::Compact,
        spill: Some(dir.clone()),
        ..options(1, 16)
    };
    let single = run(&problem, 1, 64);
    let results = distributed(&problem, 2, &spilled);
    let expected: Vec<_> = (0..single.len()).map(|i| single.schreier(i)).collect();
    assert!(records(&results) == expected);
    assert_eq!(
        results[0].1.as_ref().unwrap(),
        &problem.poincare_sum(&single, 1).unwrap()
    );
    for rank in 0..2 {
        assert!(dir.join(format!("rank{rank}")).is_dir());
    }
    drop(results);
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_line_limit_keeps_the_lines_the_one_process_run_keeps() {
    let g = clifford(3);
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    for limit in [1, 200, 701] {
        let limited = OrbitOptions {
            limit: Some(limit),
            ..options(1, 16)
        };
        let single = problem.enumerate(&limited, &mut Silent).unwrap();
        let results = distributed(&problem, 3, &limited);
        for (orbit, sum) in &results {
            assert!(!orbit.is_saturated());
            assert_eq!(orbit.stop_reason(), Some(StopReason::Limit));
            assert_eq!(orbit.len(), limit);
            assert_eq!(orbit.layer_sizes(), single.layer_sizes());
            assert!(sum.is_none());
        }
        let expected: Vec<_> = (0..single.len()).map(|i| single.schreier(i)).collect();
        assert!(records(&results) == expected, "limit {limit}");
    }
}

#[test]
fn a_stop_or_a_memory_ceiling_ends_every_rank_together() {
    let g = clifford(3);
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    let stopped = OrbitOptions {
        stop: Some(Arc::new(AtomicBool::new(true))),
        ..options(1, 16)
    };
    for (orbit, _) in distributed(&problem, 2, &stopped) {
        assert_eq!(orbit.stop_reason(), Some(StopReason::Interrupted));
        assert_eq!(orbit.len(), 1);
    }
    let tight = OrbitOptions {
        memory_ceiling: Some(4096),
        ..options(1, 16)
    };
    let results = distributed(&problem, 2, &tight);
    for (orbit, _) in &results {
        assert_eq!(orbit.stop_reason(), Some(StopReason::Memory));
        assert_eq!(orbit.len(), results[0].0.len());
        assert!(orbit.len() < 1080);
    }
    let refused = OrbitOptions {
        spill: Some(temp_path("distributed-spill")),
        ..options(1, 16)
    };
    let e = on_ranks(1, |comm| {
        problem
            .enumerate_distributed(comm, &refused, &mut Silent)
            .unwrap_err()
            .to_string()
    })
    .remove(0);
    assert!(e.contains("only the compact store spills"), "{e}");
}

/// Resume on `ranks` threads from the rank checkpoints at `base`.
fn resumed(
    problem: &OrbitProblem,
    base: &Path,
    ranks: usize,
    options: &OrbitOptions,
) -> Vec<RankResult> {
    on_ranks(ranks, |comm| {
        let orbit = problem
            .resume_distributed(base, comm, options, &mut Silent)
            .unwrap();
        with_sum(problem, orbit, comm)
    })
}

#[test]
fn rank_checkpoints_resume_to_the_identical_answer() {
    checkpoints_resume_in(StoreKind::Memory, "distributed-ckpt");
}

#[test]
fn compact_rank_checkpoints_resume_to_the_identical_answer() {
    checkpoints_resume_in(StoreKind::Compact, "distributed-compact-ckpt");
    // the 16-cycle stopped after 10 lines: the seed, which the last image meets, is past
    // the files' window and is settled through its word after the resume
    let cycle = cycle_of_sixteen();
    let base = temp_path("distributed-cycle-ckpt");
    let stopping = OrbitOptions {
        store: StoreKind::Compact,
        limit: Some(10),
        checkpoint: Some(CheckpointPlan {
            path: base.clone(),
            every: Duration::from_secs(3600),
        }),
        ..options(1, 4)
    };
    assert_eq!(distributed(&cycle, 2, &stopping)[0].0.len(), 10);
    let single = run(&cycle, 1, 64);
    for ranks in [2, 3] {
        let done = resumed(&cycle, &base, ranks, &options(1, 4));
        assert!(done[0].0.is_saturated());
        assert_eq!(done[0].0.layer_sizes(), vec![1; 16]);
        assert_eq!(done[0].0.store_kind(), StoreKind::Compact);
        assert_eq!(
            done[0].1.as_ref().unwrap(),
            &cycle.poincare_sum(&single, 1).unwrap()
        );
    }
    for r in 0..2 {
        std::fs::remove_file(rank_checkpoint_path(&base, r)).ok();
    }
}

#[test]
fn a_job_stopped_while_replacing_its_files_resumes_from_a_whole_set() {
    let g = clifford(3);
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    let single = run(&problem, 1, 64);
    let expected: Vec<_> = (0..single.len()).map(|i| single.schreier(i)).collect();
    let base = temp_path("distributed-replace");
    let file = |r: usize, suffix: &str| {
        let mut name = rank_checkpoint_path(&base, r).into_os_string();
        name.push(suffix);
        std::path::PathBuf::from(name)
    };
    let stop_at = |limit: usize| OrbitOptions {
        limit: Some(limit),
        checkpoint: Some(CheckpointPlan {
            path: base.clone(),
            every: Duration::from_secs(3600),
        }),
        ..options(1, 16)
    };
    // state A (200 lines), then state B (500 lines) written over it
    distributed(&problem, 2, &stop_at(200));
    for r in 0..2 {
        std::fs::copy(file(r, ""), file(r, ".a")).unwrap();
        assert!(
            !file(r, ".next").exists(),
            "a finished write leaves no .next file"
        );
    }
    resumed(&problem, &base, 2, &stop_at(500));
    for r in 0..2 {
        std::fs::copy(file(r, ""), file(r, ".b")).unwrap();
    }
    let finish = |what: &str| {
        for ranks in [2, 3] {
            let done = resumed(&problem, &base, ranks, &options(1, 16));
            assert!(done[0].0.is_saturated(), "{what}, {ranks} ranks");
            assert!(records(&done) == expected, "{what}, {ranks} ranks");
        }
    };
    let set = |files: &[(&str, usize, &str)]| {
        for r in 0..2 {
            std::fs::remove_file(file(r, "")).ok();
            std::fs::remove_file(file(r, ".next")).ok();
        }
        for &(from, r, to) in files {
            std::fs::copy(file(r, from), file(r, to)).unwrap();
        }
    };
    // stopped while renaming: rank 0 holds B, rank 1 still A with B as .next
    set(&[(".b", 0, ""), (".a", 1, ""), (".b", 1, ".next")]);
    finish("B partly renamed");
    // stopped before rank 1 had written B: both A, rank 0's B only as .next
    set(&[(".a", 0, ""), (".a", 1, ""), (".b", 0, ".next")]);
    finish("B partly written");
    // two old files of different states and no .next are refused
    set(&[(".b", 0, ""), (".a", 1, "")]);
    let errors = on_ranks(2, |comm| {
        problem
            .resume_distributed(&base, comm, &options(1, 16), &mut Silent)
            .unwrap_err()
            .to_string()
    });
    assert!(errors[0].contains("different layers"), "{errors:?}");
    for r in 0..2 {
        for suffix in ["", ".a", ".b", ".next"] {
            std::fs::remove_file(file(r, suffix)).ok();
        }
    }
}

/// Stops by a line limit and by the stop flag on three ranks in `store`, each resumed from
/// the rank checkpoints, reach the one-process records and B; so do three ranks' files
/// resumed on one and on two; a damaged file is named.
fn checkpoints_resume_in(store: StoreKind, name: &str) {
    let g = clifford(3);
    let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
    let single = run(&problem, 1, 64);
    let expected: Vec<_> = (0..single.len()).map(|i| single.schreier(i)).collect();
    let reference = problem.poincare_sum(&single, 1).unwrap();
    let base = temp_path(name);
    let with_checkpoints = |limit, stop: bool| OrbitOptions {
        limit,
        store,
        stop: stop.then(|| Arc::new(AtomicBool::new(true))),
        checkpoint: Some(CheckpointPlan {
            path: base.clone(),
            every: Duration::from_secs(3600),
        }),
        ..options(1, 16)
    };
    // cut by a limit inside a layer, then by a stop, then to the end
    for limit in [200, 701] {
        let first = distributed(&problem, 3, &with_checkpoints(Some(limit), false));
        assert_eq!(first[0].0.len(), limit);
        let again = resumed(&problem, &base, 3, &with_checkpoints(None, true));
        assert_eq!(again[0].0.stop_reason(), Some(StopReason::Interrupted));
        assert_eq!(again[0].0.len(), limit, "a stop at once keeps the state");
        let done = resumed(&problem, &base, 3, &options(2, 5));
        for (orbit, _) in &done {
            assert!(orbit.is_saturated());
            assert_eq!(orbit.layer_sizes(), single.layer_sizes());
            assert_eq!(
                orbit.store_kind(),
                store,
                "a resumed run keeps its files' store"
            );
        }
        assert!(records(&done) == expected, "resumed after {limit} lines");
        assert_eq!(done[0].1.as_ref().unwrap(), &reference);
    }
    // three ranks' files (cut at 701 lines) continue on one and on two ranks: every rank
    // reads all the files and keeps the lines it now owns
    for ranks in [1, 2] {
        let done = resumed(&problem, &base, ranks, &options(1, 16));
        for (orbit, _) in &done {
            assert!(orbit.is_saturated());
            assert_eq!(orbit.layer_sizes(), single.layer_sizes());
        }
        assert!(
            records(&done) == expected,
            "3 ranks' files resumed on {ranks}"
        );
        assert_eq!(done[0].1.as_ref().unwrap(), &reference);
    }
    // a damaged file is refused with the file named
    let file = rank_checkpoint_path(&base, 1);
    let mut bytes = std::fs::read(&file).unwrap();
    let middle = bytes.len() / 2;
    bytes[middle] ^= 1;
    std::fs::write(&file, bytes).unwrap();
    let errors = on_ranks(3, |comm| {
        problem
            .resume_distributed(&base, comm, &options(1, 16), &mut Silent)
            .unwrap_err()
            .to_string()
    });
    assert!(errors[1].contains("checksum"), "{errors:?}");
    let named = file.display().to_string();
    assert!(
        errors[0].contains(&named) && errors[2].contains(&named),
        "{errors:?}"
    );
    for r in 0..3 {
        std::fs::remove_file(rank_checkpoint_path(&base, r)).ok();
    }
}
