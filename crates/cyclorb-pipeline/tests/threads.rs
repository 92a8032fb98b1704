//! Insertion sharded over threads gives the orbit of the sequential insertion: the same lines
//! at the same indices, the same Schreier records, layers, words and Poincaré sum, for 1, 2
//! and 3 threads, in both stores, and every record is the first (parent, generator) in
//! breadth-first order that reaches its line.

use cyclorb_field::Cyc;
use cyclorb_orbit::{Orbit, OrbitOptions, OrbitProblem, Silent, StoreKind};
use cyclorb_pipeline::space::vacuum_problem;

/// Everything about an orbit that must not depend on the threads.
#[derive(Debug, PartialEq)]
struct Summary {
    lines: Vec<Vec<Cyc>>,
    records: Vec<Option<(usize, usize)>>,
    words: Vec<Vec<usize>>,
    layers: Vec<usize>,
}

fn summary(problem: &OrbitProblem, orbit: &Orbit) -> Summary {
    Summary {
        lines: (0..orbit.len())
            .map(|i| problem.line(orbit, i).unwrap())
            .collect(),
        records: (0..orbit.len()).map(|i| orbit.schreier(i)).collect(),
        words: (0..orbit.len()).map(|i| orbit.word(i)).collect(),
        layers: orbit.layer_sizes(),
    }
}

fn enumerate(
    problem: &OrbitProblem,
    store: StoreKind,
    threads: usize,
    limit: Option<usize>,
) -> Orbit {
    // small chunks: many chunks, each split over every thread, so that lines reached by
    // two threads' workers in one chunk are common
    let options = OrbitOptions {
        threads,
        chunk_size: 24,
        store,
        limit,
        ..OrbitOptions::default()
    };
    problem.enumerate(&options, &mut Silent).unwrap()
}

/// Each line's record is the least (parent, generator) whose image it is, and lines are
/// numbered in the order of those least records: what inserting the images one by one in
/// (element, generator) order gives.
fn assert_first_records(problem: &OrbitProblem, orbit: &Orbit) {
    let permutations = problem.induced_permutations(orbit, 1).unwrap();
    let mut first: Vec<Option<(usize, usize)>> = vec![None; orbit.len()];
    for parent in 0..orbit.len() {
        for (generator, permutation) in permutations.iter().enumerate() {
            let image = permutation[parent] as usize;
            if image != 0 && first[image].is_none() {
                first[image] = Some((parent, generator));
            }
        }
    }
    for (i, record) in first.iter().enumerate() {
        assert_eq!(orbit.schreier(i), *record, "line {i}");
    }
    assert!(first.windows(2).skip(1).all(|w| w[0] < w[1]));
}

fn check_saturated(spec: &str, genus: usize, size: usize) {
    let problem = vacuum_problem(spec, genus, "humphries").unwrap();
    for store in [StoreKind::Memory, StoreKind::Compact] {
        let one = enumerate(&problem, store, 1, None);
        assert_eq!(one.len(), size, "{spec} genus {genus}");
        assert_first_records(&problem, &one);
        let reference = summary(&problem, &one);
        let sum = problem.poincare_sum(&one, 1).unwrap();
        for threads in [2, 3] {
            let other = enumerate(&problem, store, threads, None);
            assert!(
                summary(&problem, &other) == reference,
                "{spec} genus {genus}, {} store, {threads} threads",
                store.name()
            );
            assert_eq!(problem.poincare_sum(&other, threads).unwrap(), sum);
        }
    }
}

#[test]
fn ising_genus_two_is_the_same_orbit_on_one_two_and_three_threads() {
    // 3 840 lines (the README's genus table; Ising's vacuum orbit at genus 2)
    check_saturated("ising", 2, 3840);
}

#[test]
fn a_pointed_theory_is_the_same_orbit_on_one_two_and_three_threads() {
    // Z_3 with θ_a = exp(2πi·a²/3) at genus 3: 1 120 lines (this program, memory store on
    // one thread, the reference the other runs are compared with)
    check_saturated("zn:3:2", 3, 1120);
}

#[test]
fn a_stopped_su2_run_keeps_the_same_lines_on_one_two_and_three_threads() {
    // SU(2) level 4 at genus 2 stopped by a line limit in the middle of a layer: the lines
    // kept, their records and the partial layer agree, whatever the threads
    let problem = vacuum_problem("su2:4", 2, "humphries").unwrap();
    for store in [StoreKind::Memory, StoreKind::Compact] {
        let reference = summary(&problem, &enumerate(&problem, store, 1, Some(20_000)));
        assert_eq!(reference.lines.len(), 20_000);
        for threads in [2, 3] {
            let other = enumerate(&problem, store, threads, Some(20_000));
            assert!(
                summary(&problem, &other) == reference,
                "{} store, {threads} threads",
                store.name()
            );
        }
    }
}
