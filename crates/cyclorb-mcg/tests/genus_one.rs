//! Genus-1 relations for theories whose labels are not all self-dual.
//!
//! Positive twists A = T_α, B = T_β act on H₁(T²) by [[1, 1], [0, 1]] and [[1, 0], [−1, 1]];
//! with S = ABA, SL(2, Z) gives (SA)³ = 1 and S² = (AB)³ = −I (standard; Farb–Margalit, A
//! Primer on Mapping Class Groups, §2.2 and Prop. 6.3 for the action on homology). −I acts on
//! V_1 as charge conjugation, which is a scalar only when every label is self-dual.

use cyclorb_mcg::{check_relations, word_matrix, BlockSpace, Curve};
use cyclorb_theory::parse_spec;

fn space(spec: &str) -> BlockSpace {
    BlockSpace::new(parse_spec(spec).unwrap(), 1).unwrap()
}

#[test]
fn pointed_theories_with_non_self_dual_labels_pass() {
    // zn:3:2 and zn:5:2: labels a and −a are distinct for a ≠ 0 (standard)
    for spec in ["zn:3:2", "zn:5:2", "ising"] {
        let checks = check_relations(&space(spec)).unwrap();
        let failed: Vec<_> = checks.iter().filter(|c| !c.ok).collect();
        assert!(failed.is_empty(), "{spec}: {failed:?}");
        for name in [
            "genus 1: (SA)^3 ∝ 1",
            "genus 1: S^2 ∝ (AB)^3",
            "genus 1: S^4 ∝ 1 (S = ABA)",
            "genus 1: (AB)^6 ∝ 1",
            "braid alpha0 beta0",
        ] {
            assert!(
                checks.iter().any(|c| c.name == name),
                "{spec}: {name} not checked"
            );
        }
    }
}

#[test]
fn a_wrong_relation_is_refused() {
    // "(SA)³ ∝ S²" holds in PSL(2, Z) only: on V_1 of zn:3:2 it would say C ∝ 1 (standard)
    let sp = space("zn:3:2");
    let f = sp.theory().field();
    let a = sp.twist(Curve::Alpha(0)).unwrap();
    let b = sp.twist(Curve::Beta(0)).unwrap();
    let w = |word: &[&cyclorb_matrix::Operator]| word_matrix(f, sp.dimension(), word).unwrap();
    let sa3 = w(&[&a, &b, &a, &a, &a, &b, &a, &a, &a, &b, &a, &a]);
    let s2 = w(&[&a, &b, &a, &a, &b, &a]);
    assert!(sa3.scalar_multiple_of(f, &s2).unwrap().is_none());
    // and S² itself is not a scalar but a permutation of order 2 (charge conjugation)
    let id = w(&[]);
    assert!(s2.scalar_multiple_of(f, &id).unwrap().is_none());
    let s4 = w(&[&a, &b, &a, &a, &b, &a, &a, &b, &a, &a, &b, &a]);
    assert!(s4.scalar_multiple_of(f, &id).unwrap().is_some());
}
