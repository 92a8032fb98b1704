//! Induced permutations of a saturated orbit, and the orbit of a tensor-product line found
//! from its factors (`pair_orbit`) against enumeration in the tensor product itself.

use cyclorb_field::CyclotomicField;
use cyclorb_matrix::{LinearMap, Matrix, Operator};
use cyclorb_orbit::{pair_orbit, GeneratorSet, OrbitOptions, OrbitProblem, Silent};

use crate::sample_sets::*;

/// x ⊗ y, rows (i, k) and columns (j, l) in lexicographic order.
fn kron(f: &CyclotomicField, x: &Matrix, y: &Matrix) -> Matrix {
    let rows = (0..x.rows() * y.rows())
        .map(|r| {
            (0..x.cols() * y.cols())
                .map(|c| {
                    let (i, k) = (r / y.rows(), r % y.rows());
                    let (j, l) = (c / y.cols(), c % y.cols());
                    f.mul(x.get(i, j), y.get(k, l)).unwrap()
                })
                .collect()
        })
        .collect();
    Matrix::from_rows(rows).unwrap()
}

fn permutations_of(g: &GeneratorSet) -> Vec<Vec<u32>> {
    let problem = OrbitProblem::new(g.clone(), &vacuum(g)).unwrap();
    let orbit = run(&problem, 2, 5);
    problem.induced_permutations(&orbit, 2).unwrap()
}

#[test]
fn induced_permutations_are_the_actions_on_the_orbit() {
    // S_5 on the lines spanned by e_i + e_j: the transposition (0 1) and the 5-cycle act on
    // the ten 2-subsets with orders 2 and 5 (common practice).
    let g = permutations5();
    let f = g.field().clone();
    let problem = OrbitProblem::new(g, &seed(&f, &["1", "1", "0", "0", "0"])).unwrap();
    let orbit = run(&problem, 1, 3);
    let perms = problem.induced_permutations(&orbit, 2).unwrap();
    assert_eq!(perms.len(), 2);
    let order = |p: &[u32]| {
        let mut x: Vec<u32> = (0..p.len() as u32).collect();
        (1..=10)
            .find(|_| {
                x = x.iter().map(|&i| p[i as usize]).collect();
                x.iter().enumerate().all(|(i, &v)| i as u32 == v)
            })
            .unwrap()
    };
    for p in &perms {
        let mut sorted = p.clone();
        sorted.sort_unstable();
        assert_eq!(sorted, (0..10).collect::<Vec<u32>>(), "a bijection");
    }
    assert_eq!((order(&perms[0]), order(&perms[1])), (2, 5));
    // an unsaturated orbit has no induced permutations
    let partial = problem
        .enumerate(&options_with_limit(4), &mut Silent)
        .unwrap();
    assert!(problem.induced_permutations(&partial, 1).is_err());
}

fn options_with_limit(limit: usize) -> OrbitOptions {
    OrbitOptions {
        limit: Some(limit),
        ..options(1, 2)
    }
}

#[test]
fn a_product_orbit_from_its_factors_matches_enumeration() {
    // One qubit's Clifford generators H and S, paired crosswise: (H ⊗ S, S ⊗ H) acting on
    // |0⟩ ⊗ |0⟩. The line ⟨v ⊗ w⟩ determines ⟨v⟩ and ⟨w⟩, so enumerating in C² ⊗ C² and
    // searching pairs of factor lines must give the same count (and the same layers).
    let one = clifford(1);
    let f = one.field().clone();
    let dense: Vec<Matrix> = one.operators().iter().map(|op| op.to_dense(&f)).collect();
    let (h, s) = (&dense[0], &dense[1]);
    let product = generator_set(
        8,
        4,
        vec![
            ("H⊗S", Operator::Dense(kron(&f, h, s))),
            ("S⊗H", Operator::Dense(kron(&f, s, h))),
        ],
    );
    let problem = OrbitProblem::new(product.clone(), &vacuum(&product)).unwrap();
    let enumerated = run(&problem, 2, 3);
    assert!(enumerated.is_saturated());
    let perms = permutations_of(&one);
    let swapped = vec![perms[1].clone(), perms[0].clone()];
    let pairs = pair_orbit(&perms, &swapped, None);
    assert!(pairs.saturated);
    assert_eq!(pairs.pairs.len(), enumerated.len());
    assert_eq!(pairs.layer_sizes, enumerated.layer_sizes());
    // the diagonal pairing (H ⊗ H, S ⊗ S) stays on the diagonal: 6 lines
    assert_eq!(pair_orbit(&perms, &perms, None).pairs.len(), 6);
}
