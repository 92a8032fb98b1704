//! Distributed saturation against the one-process engine: ranks are threads here (the
//! program runs the same code over MPI, tests/cli_mpi.rs). For every number of ranks and
//! chunk size the orbit size, the layer sizes, every Schreier record and B are the ones the
//! one-process run finds, and a line limit or a stop ends every rank at the same place.

use std::sync::atomic::AtomicBool;
use std::sync::{Arc, Barrier, Mutex};

use cyclorb_orbit::{
    Collective, DistributedOrbit, OrbitOptions, OrbitProblem, PoincareSum, Silent, StopReason,
};

use crate::common::*;

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

/// Run the distributed enumeration (and the sum when it closes) on `ranks` threads.
fn distributed(problem: &OrbitProblem, ranks: usize, options: &OrbitOptions) -> Vec<RankResult> {
    let barrier = Arc::new(Barrier::new(ranks));
    let mail = Arc::new(Mutex::new(vec![vec![Vec::new(); ranks]; ranks]));
    std::thread::scope(|scope| {
        let handles: Vec<_> = (0..ranks)
            .map(|rank| {
                let comm = ThreadRank {
                    rank,
                    size: ranks,
                    barrier: barrier.clone(),
                    mail: mail.clone(),
                };
                scope.spawn(move || {
                    let orbit = problem
                        .enumerate_distributed(&comm, options, &mut Silent)
                        .unwrap();
                    let sum = if orbit.is_saturated() {
                        problem.poincare_sum_distributed(&orbit, &comm, 1).unwrap()
                    } else {
                        None
                    };
                    (orbit, sum)
                })
            })
            .collect();
        handles.into_iter().map(|h| h.join().unwrap()).collect()
    })
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
    let single = run(problem, 1, 64);
    let results = distributed(problem, ranks, &options(2, chunk));
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
        "{ranks} ranks, chunk {chunk}"
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
    let comm = ThreadRank {
        rank: 0,
        size: 1,
        barrier: Arc::new(Barrier::new(1)),
        mail: Arc::new(Mutex::new(vec![vec![Vec::new()]])),
    };
    let e = problem
        .enumerate_distributed(&comm, &refused, &mut Silent)
        .unwrap_err()
        .to_string();
    assert!(e.contains("memory store"), "{e}");
}
