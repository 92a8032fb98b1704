//! The block space of a Deligne product is the tensor product of its factors' block spaces,
//! and each Dehn twist acts as the Kronecker product of the factors' twists up to a scalar
//! (common practice: the Hom-spaces of A ⊠ B are tensor products of those of A and B, and
//! every F-, R-symbol and twist of A ⊠ B is the product of the factors'; see
//! docs/minimal-models.md, "Witnesses lifted from a factor"). Proved here exactly at genus 2
//! under the basis pairing that splits every product label (a, b) of a comb state into the
//! factors' comb states. This is what lets a witness found on a factor prove the product's
//! image infinite.

use cyclorb_field::CyclotomicField;
use cyclorb_matrix::{LinearMap, Matrix};
use cyclorb_mcg::{BlockSpace, CombState, GeneratingSet};
use cyclorb_theory::{parse_spec, Theory};

/// The comb state of one factor: every label (a, b) of the product (index a·rank(B) + b)
/// replaced by its component.
fn component(state: &CombState, split: impl Fn(usize) -> usize) -> CombState {
    let map = |v: &[usize]| v.iter().map(|&x| split(x)).collect();
    CombState {
        loops: map(&state.loops),
        sticks: map(&state.sticks),
        backbone: map(&state.backbone),
    }
}

/// For each product basis vector, the positions of its two components.
fn pairing(product: &BlockSpace, left: &BlockSpace, right: &BlockSpace) -> Vec<(usize, usize)> {
    let r2 = right.theory().rank();
    product
        .states()
        .iter()
        .map(|s| {
            let l = left.basis().position(&component(s, |x| x / r2));
            let r = right.basis().position(&component(s, |x| x % r2));
            (l.expect("left component"), r.expect("right component"))
        })
        .collect()
}

/// Every Humphries generator of the product at genus 2 equals c·(A ⊗ B) for one non-zero
/// scalar c, entry by entry, with A and B the factors' generators for the same curve.
fn tensor_identity_holds(theory: &Theory) {
    let name = theory.name().to_string();
    let (a, b) = theory.deligne_factors().expect("a Deligne product");
    let genus = 2;
    let space = BlockSpace::new(theory.clone(), genus).unwrap();
    let left = BlockSpace::new(a.clone(), genus).unwrap();
    let right = BlockSpace::new(b.clone(), genus).unwrap();
    assert_eq!(
        space.dimension(),
        left.dimension() * right.dimension(),
        "{name}: dim V_g(A⊠B) = dim V_g(A)·dim V_g(B)"
    );
    let pairs = pairing(&space, &left, &right);
    let field = CyclotomicField::new(theory.conductor()).unwrap();
    let dense = |s: &BlockSpace| -> Vec<Matrix> {
        s.generators(GeneratingSet::Humphries)
            .unwrap()
            .iter()
            .map(|(_, op)| op.to_dense(s.theory().field()))
            .collect()
    };
    let (p, l, r) = (dense(&space), dense(&left), dense(&right));
    for (k, ((pm, lm), rm)) in p.iter().zip(&l).zip(&r).enumerate() {
        let kron = |i: usize, j: usize| {
            let ((il, ir), (jl, jr)) = (pairs[i], pairs[j]);
            field
                .mul(
                    &field.embed(lm.get(il, jl)).unwrap(),
                    &field.embed(rm.get(ir, jr)).unwrap(),
                )
                .unwrap()
        };
        let own = |i: usize, j: usize| field.embed(pm.get(i, j)).unwrap();
        let n = pairs.len();
        // the scalar, read off the first diagonal entry (twists are invertible, and the
        // Kronecker product of invertible matrices has a non-zero entry in row 0)
        let j0 = (0..n)
            .find(|&j| !kron(0, j).is_zero())
            .expect("row 0 of A ⊗ B");
        let c = field.div(&own(0, j0), &kron(0, j0)).unwrap();
        assert!(!c.is_zero(), "{name} generator {k}: scalar 0");
        for i in 0..n {
            for j in 0..n {
                assert_eq!(
                    own(i, j),
                    field.mul(&c, &kron(i, j)).unwrap(),
                    "{name} generator {k}: entry ({i}, {j}) is not c·(A ⊗ B)"
                );
            }
        }
    }
}

#[test]
fn product_generators_are_kronecker_products_at_genus_two() {
    // ising*fibonacci: a plain product; minimal:5:4 (tricritical Ising), minimal:6:5 (Potts)
    // and the non-unitary minimal:7:3: renamed products of Galois conjugates of su2/so3, some
    // with a spherical twist, some with D negated (see the builtin `minimal`).
    for spec in [
        "ising*fibonacci",
        "minimal:5:4",
        "minimal:6:5",
        "minimal:7:3",
    ] {
        tensor_identity_holds(&parse_spec(spec).unwrap());
    }
    // Yang–Lee M(5,2) is conj-so3:3 alone (the other factor, su2:0, has one label): no factors.
    assert!(parse_spec("minimal:5:2")
        .unwrap()
        .deligne_factors()
        .is_none());
}
