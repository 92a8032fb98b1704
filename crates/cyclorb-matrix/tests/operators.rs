//! The sparse operator forms agree with their dense forms (apply, adjoint, inverse, form
//! invariance), over Q(ζ_n) for n = 1, 5, 16, 60 on seeded random data.

mod random_matrices;

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::{Block, LinearMap, Matrix, MatrixError, Operator};
use random_matrices::*;

/// A random operator of each form on Q(ζ_n)^dim.
fn random_operators(f: &CyclotomicField, rng: &mut XorShift, dim: usize) -> Vec<Operator> {
    let dense = Operator::Dense(random_matrix(f, rng, dim, dim));
    let diagonal = Operator::Diagonal(random_vector(f, rng, dim));
    // shuffle the coordinates, then cut them into blocks of sizes 1..=3, leaving some out
    let mut order: Vec<usize> = (0..dim).collect();
    for i in (1..dim).rev() {
        order.swap(i, rng.below(i as u64 + 1) as usize);
    }
    let mut blocks = Vec::new();
    let mut rest = &order[..];
    while !rest.is_empty() {
        let size = (1 + rng.below(3) as usize).min(rest.len());
        let (indices, tail) = rest.split_at(size);
        if rng.below(4) != 0 {
            blocks.push(Block {
                indices: indices.to_vec(),
                matrix: random_matrix(f, rng, size, size),
            });
        }
        rest = tail;
    }
    let block_diagonal = Operator::BlockDiagonal { dim, blocks };
    let mut rows = vec![Vec::new(); dim];
    for row in &mut rows {
        for j in 0..dim {
            if rng.below(3) == 0 {
                row.push((j, random_cyc(f, rng)));
            }
        }
    }
    let sparse = Operator::SparseRows { dim, rows };
    vec![dense, diagonal, block_diagonal, sparse]
}

#[test]
fn sparse_forms_agree_with_dense_forms() {
    let mut rng = XorShift::new(11);
    for n in CONDUCTORS {
        let f = CyclotomicField::new(n).unwrap();
        for _ in 0..iterations(3) {
            let dim = 1 + rng.below(6) as usize;
            for op in random_operators(&f, &mut rng, dim) {
                op.validate().unwrap();
                let dense = op.to_dense(&f);
                let v = random_vector(&f, &mut rng, dim);
                // applying the stored form = multiplying by its dense matrix
                assert_eq!(op.apply(&f, &v).unwrap(), dense.mul_vec(&f, &v).unwrap());
                assert_eq!(op.nonzeros(), dense.nonzeros());
                let sparse_rows = op.to_sparse_rows(&f);
                assert_eq!(sparse_rows.to_dense(&f), dense);
                // adjoint in the same form = dense adjoint
                assert_eq!(op.adjoint(&f).unwrap().to_dense(&f), dense.adjoint(&f));
                // inverse in the same form = dense inverse (both singular or both not)
                match (op.inverse(&f), dense.inverse(&f)) {
                    (Ok(inv), Ok(dense_inv)) => assert_eq!(inv.to_dense(&f), dense_inv),
                    (Err(a), Err(b)) => {
                        assert_eq!((a, b), (MatrixError::Singular, MatrixError::Singular))
                    }
                    (a, b) => panic!("forms disagree on invertibility: {a:?} vs {b:?}"),
                }
                // the sparse form-invariance test agrees with the dense one
                for g in [
                    random_matrix(&f, &mut rng, dim, dim),
                    Matrix::identity(&f, dim),
                ] {
                    assert_eq!(
                        op.preserves_form(&f, &g).unwrap(),
                        dense.preserves_form(&f, &g).unwrap()
                    );
                }
            }
        }
    }
}

/// A monomial matrix X[σ(i), i] = ζ^{e_i} (permutation times roots of unity) restricted to
/// `indices`: unitary, so it preserves G = I (common practice).
fn monomial_unitary(f: &CyclotomicField, rng: &mut XorShift, size: usize) -> Matrix {
    let mut sigma: Vec<usize> = (0..size).collect();
    for i in (1..size).rev() {
        sigma.swap(i, rng.below(i as u64 + 1) as usize);
    }
    let mut m = Matrix::zeros(f, size, size);
    for (i, &s) in sigma.iter().enumerate() {
        m.set(s, i, f.zeta_pow(rng.below(f.conductor() as u64) as i64));
    }
    m
}

#[test]
fn unitary_operators_preserve_the_standard_form_in_every_storage() {
    let mut rng = XorShift::new(12);
    for n in CONDUCTORS {
        let f = CyclotomicField::new(n).unwrap();
        for _ in 0..iterations(3) {
            let dim = 2 + rng.below(5) as usize;
            let identity = Matrix::identity(&f, dim);
            let x = monomial_unitary(&f, &mut rng, dim);
            let half = dim / 2;
            let blocks = vec![
                Block {
                    indices: (0..half).rev().collect(),
                    matrix: monomial_unitary(&f, &mut rng, half),
                },
                Block {
                    indices: (half..dim).collect(),
                    matrix: monomial_unitary(&f, &mut rng, dim - half),
                },
            ];
            let forms = [
                Operator::Dense(x.clone()),
                Operator::Dense(x).to_sparse_rows(&f),
                Operator::Diagonal((0..dim).map(|k| f.zeta_pow(k as i64)).collect()),
                Operator::BlockDiagonal { dim, blocks },
            ];
            for op in forms {
                assert!(op.preserves_form(&f, &identity).unwrap(), "n={n} {op:?}");
                // doubling one column breaks unitarity: X† X gains a 4 on the diagonal
                let mut broken = op.to_dense(&f);
                for i in 0..dim {
                    let doubled = f.mul_int(broken.get(i, 0), 2);
                    broken.set(i, 0, doubled);
                }
                let broken = Operator::Dense(broken).to_sparse_rows(&f);
                assert!(!broken.preserves_form(&f, &identity).unwrap());
            }
        }
    }
}

/// A diagonal matrix of roots of unity is unitary for every diagonal positive form, and a
/// block rotation mixing two coordinates with different form weights is not.
#[test]
fn form_invariance_of_unitary_generators() {
    let f = CyclotomicField::new(16).unwrap();
    let weights: Vec<Cyc> = [1, 2, 3, 5].iter().map(|&w| f.int(w)).collect();
    let g = Matrix::diagonal(&f, &weights);
    let twist = Operator::Diagonal((0..4).map(|k| f.zeta_pow(3 * k)).collect());
    assert!(twist.preserves_form(&f, &g).unwrap());
    assert!(twist.to_dense(&f).preserves_form(&f, &g).unwrap());
    // swap of coordinates 0 and 1: preserves G = I, not G = diag(1, 2, 3, 5)
    let swap = Matrix::from_rows(vec![vec![f.zero(), f.one()], vec![f.one(), f.zero()]]).unwrap();
    let swap_op = Operator::BlockDiagonal {
        dim: 4,
        blocks: vec![Block {
            indices: vec![0, 1],
            matrix: swap,
        }],
    };
    assert!(swap_op
        .preserves_form(&f, &Matrix::identity(&f, 4))
        .unwrap());
    assert!(!swap_op.preserves_form(&f, &g).unwrap());
    // a diagonal entry of modulus ≠ 1 breaks invariance
    let stretched = Operator::Diagonal(vec![f.int(2), f.one(), f.one(), f.one()]);
    assert!(!stretched.preserves_form(&f, &g).unwrap());
    // wrong form size is an error
    assert!(matches!(
        twist.preserves_form(&f, &Matrix::identity(&f, 3)),
        Err(MatrixError::Shape(_))
    ));
}

#[test]
fn invalid_operators_are_rejected() {
    let f = CyclotomicField::new(5).unwrap();
    let repeated = Operator::SparseRows {
        dim: 2,
        rows: vec![vec![(0, f.one()), (0, f.one())], vec![]],
    };
    assert!(repeated.validate().is_err());
    assert!(repeated.adjoint(&f).is_err());
    let overlapping = Operator::BlockDiagonal {
        dim: 3,
        blocks: vec![
            Block {
                indices: vec![0, 1],
                matrix: Matrix::identity(&f, 2),
            },
            Block {
                indices: vec![1],
                matrix: Matrix::identity(&f, 1),
            },
        ],
    };
    assert!(overlapping.inverse(&f).is_err());
    let singular = Operator::Diagonal(vec![f.one(), f.zero()]);
    assert_eq!(singular.inverse(&f), Err(MatrixError::Singular));
}
