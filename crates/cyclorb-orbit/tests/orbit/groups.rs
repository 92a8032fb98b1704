//! Finite groups with known orbits: Clifford groups on stabilizer states, S_5 on Q^5.

use cyclorb_orbit::{OrbitProblem, Seed};

use crate::sample_sets::*;

#[test]
fn stabilizer_states_of_one_two_three_qubits() {
    // Number of n-qubit stabilizer states 2^n Π_{k=1}^{n} (2^k + 1): 6, 60, 1080
    // (Aaronson and Gottesman, "Improved simulation of stabilizer circuits", Phys. Rev. A 70
    // (2004) 052328, Proposition 2). The Clifford group acts irreducibly on C^{2^n}, so
    // Σ |ψ⟩⟨ψ| over them is (count / 2^n)·I by Schur's lemma: 3, 15, 135.
    for (qubits, count, lambda) in [(1usize, 6usize, 3i64), (2, 60, 15), (3, 1080, 135)] {
        let g = clifford(qubits);
        let problem = OrbitProblem::new(g.clone(), &vacuum(&g)).unwrap();
        let orbit = run(&problem, 2, 37);
        assert_eq!(orbit.len(), count, "{qubits} qubits");
        assert!(orbit.is_saturated());
        let sum = problem.poincare_sum(&orbit, 2).unwrap();
        assert_eq!(
            sum.scalar,
            Some(problem.field().int(lambda)),
            "{qubits} qubits"
        );
        assert!(sum.trace_check);
        if qubits == 2 {
            assert_words_reproduce(&problem, &orbit);
        }
    }
}

#[test]
fn permutations_of_five_coordinates() {
    let g = permutations5();
    let f = g.field().clone();
    // A transposition and a 5-cycle generate S_5 (order 120); the seed (1,2,3,4,5) has
    // distinct positive entries, so no two permutations of it span the same line.
    let problem = OrbitProblem::new(g.clone(), &seed(&f, &["1", "2", "3", "4", "5"])).unwrap();
    let orbit = run(&problem, 2, 7);
    assert_eq!(orbit.len(), 120);
    // Pairs {i, j} ⊂ {0..4}: C(5, 2) = 10 lines.
    let problem = OrbitProblem::new(g, &seed(&f, &["1", "1", "0", "0", "0"])).unwrap();
    let orbit = run(&problem, 1, 3);
    assert_eq!(orbit.len(), 10);
    assert_words_reproduce(&problem, &orbit);
}

#[test]
fn a_zero_seed_and_a_wrong_length_are_refused() {
    let g = permutations5();
    let f = g.field().clone();
    let zero = Seed::basis_vector(&f, 5, 7); // index out of range: the zero vector
    assert!(OrbitProblem::new(g.clone(), &zero)
        .unwrap_err()
        .to_string()
        .contains("zero"));
    let short = seed(&f, &["1", "2"]);
    assert!(OrbitProblem::new(g, &short)
        .unwrap_err()
        .to_string()
        .contains("length 2"));
}
