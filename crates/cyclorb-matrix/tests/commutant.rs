//! The one commutant solver, over Q(ζ_n) and over F_p, against standard facts.

use cyclorb_field::{CyclotomicField, PrimeReduction};
use cyclorb_matrix::{
    solve_commutant, CommutantCut, CommutantSystem, Echelon, EigenbasisCut, Exact, Matrix, ModP,
    Rows, ScalarField, UnknownOrder, Want,
};

fn system(eigenbasis: EigenbasisCut<'_>) -> CommutantSystem<'_> {
    CommutantSystem {
        want: Want::Basis,
        eigenbasis,
        order: UnknownOrder::RowMajor,
        max_unknowns: usize::MAX,
    }
}

/// The permutation matrices of a transposition and a 3-cycle, generating S_3 on 3 points.
fn s3<S: ScalarField>(s: &S) -> Vec<Rows<S::E>> {
    let perm = |p: [usize; 3]| -> Rows<S::E> {
        (0..3)
            .map(|i| {
                (0..3)
                    .map(|j| if p[j] == i { s.one() } else { s.zero() })
                    .collect()
            })
            .collect()
    };
    vec![perm([1, 0, 2]), perm([1, 2, 0])]
}

#[test]
fn permutation_module_of_s3_has_a_commutant_of_dimension_two() {
    // The commutant of a permutation representation has dimension the number of orbits of
    // the group on pairs of points (Burnside; common practice): S_3 on 3 points has two
    // (the diagonal and the rest), so the commutant is spanned by I and J − I.
    let f = CyclotomicField::new(3).unwrap();
    let exact = Exact::new(&f);
    for cut in [EigenbasisCut::Any, EigenbasisCut::Among(&[])] {
        let solved = solve_commutant(&exact, &s3(&exact), &system(cut))
            .unwrap()
            .unwrap();
        assert_eq!(solved.nullity, 2);
        for y in solved.basis.unwrap() {
            let y = Matrix::from_rows(y).unwrap();
            for g in s3(&exact) {
                assert!(y.commutes_with(&f, &Matrix::from_rows(g).unwrap()).unwrap());
            }
        }
    }
    let reduction = PrimeReduction::nth(&f, 0).unwrap();
    let modp = ModP::new(&reduction, 3);
    let bounded = CommutantSystem {
        want: Want::Dimension,
        ..system(EigenbasisCut::Any)
    };
    let solved = solve_commutant(&modp, &s3(&modp), &bounded)
        .unwrap()
        .unwrap();
    // the 3-cycle has the three cube roots of unity as eigenvalues: diagonalised mod p
    assert_eq!(solved.nullity, 2);
    assert!(matches!(solved.cut, CommutantCut::Eigenbasis(_)));
}

#[test]
fn diagonal_generators_cut_the_unknowns_and_a_limit_is_kept() {
    // diag(1, −1) and the swap generate the dihedral group of order 8 acting irreducibly
    // on C² (its two-dimensional representation; common practice): commutant = scalars.
    let f = CyclotomicField::new(4).unwrap();
    let s = Exact::new(&f);
    let gens = vec![
        vec![vec![f.one(), f.zero()], vec![f.zero(), f.int(-1)]],
        vec![vec![f.zero(), f.one()], vec![f.one(), f.zero()]],
    ];
    let solved = solve_commutant(&s, &gens, &system(EigenbasisCut::Any))
        .unwrap()
        .unwrap();
    assert_eq!(solved.cut, CommutantCut::Diagonal(1));
    assert_eq!(solved.unknowns, 2);
    assert_eq!(solved.nullity, 1);
    let limited = CommutantSystem {
        max_unknowns: 1,
        ..system(EigenbasisCut::Any)
    };
    assert!(solve_commutant(&s, &gens, &limited).unwrap().is_none());
}

#[test]
fn incremental_and_batch_elimination_give_the_same_nullspace() {
    // the reduced nullspace basis depends only on the row space and the column order
    // (uniqueness of the reduced row echelon form; common practice)
    let f = CyclotomicField::new(5).unwrap();
    let z = f.zeta_pow(1);
    let rows = vec![
        vec![f.one(), z.clone(), f.zero(), f.int(2)],
        vec![f.int(2), f.mul(&z, &f.int(2)).unwrap(), f.one(), z.clone()],
        vec![
            f.int(3),
            f.mul(&z, &f.int(3)).unwrap(),
            f.one(),
            f.add(&z, &f.int(2)).unwrap(),
        ],
    ];
    let s = Exact::new(&f);
    let mut echelon = Echelon::new(4);
    for r in &rows {
        echelon.insert(&s, r.clone()).unwrap();
    }
    let batch = Matrix::from_rows(rows).unwrap().nullspace(&f).unwrap();
    assert_eq!(echelon.rank(), 2);
    assert_eq!(echelon.nullspace(&s).unwrap(), batch);
}
