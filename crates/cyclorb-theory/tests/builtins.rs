//! Every built-in theory (and products, conjugates and gauge changes of them) verifies exactly.
//!
//! Full verification (pentagon included) runs here for su2:K with K ≤ 8 and so3:K with
//! K ≤ 9; the larger levels (su2:9–20, so3:11–19) are verified in full through the command
//! line by the workspace's `tests/verify_large.rs`, so they are not repeated here.

use cyclorb_theory::{parse_spec, verify, CheckId, Theory};

fn load(spec: &str) -> Theory {
    parse_spec(spec).unwrap_or_else(|e| panic!("{spec}: {e}"))
}

fn assert_verifies(spec: &str) {
    let t = load(spec);
    let v = verify(&t);
    if let Some(c) = v.first_failure() {
        panic!("{spec}: check {} fails: {:?}", c.name, c.failure);
    }
    let expected = if t.has_fr() { CheckId::ALL.len() } else { 8 };
    assert_eq!(
        v.checks.len(),
        expected,
        "{spec}: every applicable check ran"
    );
    if t.rank() > 1 {
        assert!(
            v.checks.iter().all(|c| c.instances > 0),
            "{spec}: a check saw nothing"
        );
    }
}

#[test]
fn ising_type_theories() {
    for nu in (1..16).step_by(2) {
        assert_verifies(&format!("ising:{nu}"));
    }
    assert_verifies("ising");
}

#[test]
fn fibonacci_and_conjugate() {
    assert_verifies("fibonacci");
    assert_verifies("conj(fibonacci)");
}

#[test]
fn su2_small_levels_fully() {
    for k in 1..=8 {
        assert_verifies(&format!("su2:{k}"));
    }
}

#[test]
fn so3_odd_levels() {
    for k in [1, 3, 5, 7, 9] {
        assert_verifies(&format!("so3:{k}"));
    }
}

#[test]
fn pointed_theories() {
    for (n, p) in [
        (1, 0),
        (2, 1),
        (2, -1),
        (2, 3),
        (3, 2),
        (3, 4),
        (4, 1),
        (4, 3),
        (5, 2),
        (6, 1),
        (7, 2),
        (8, 3),
    ] {
        assert_verifies(&format!("zn:{n}:{p}"));
    }
}

#[test]
fn tricritical_ising() {
    assert_verifies("tricritical-ising");
}

#[test]
fn tricritical_ising_is_its_defining_product() {
    // The catalogue defines tricritical Ising as conj(fibonacci) * ising:7; the product
    // route of `orbit` relies on it, so the data must agree label by label.
    let (a, b) = cyclorb_theory::defining_product("tricritical-ising").unwrap();
    let named = load("tricritical-ising");
    let product = load(&format!("{a}*{b}"));
    assert_eq!(named.rank(), product.rank());
    assert_eq!(named.field().conductor(), product.field().conductor());
    for i in 0..named.rank() {
        assert_eq!(named.twist(i), product.twist(i), "twist of label {i}");
        for j in 0..named.rank() {
            assert_eq!(
                named.s_unnormalized().get(i, j),
                product.s_unnormalized().get(i, j),
                "S entry ({i}, {j})"
            );
        }
    }
    assert_eq!(cyclorb_theory::defining_product("ising"), None);
}

#[test]
fn minimal_models() {
    for (p, q) in [
        (3, 2),
        (4, 3),
        (5, 4),
        (6, 5),
        (5, 2),
        (5, 3),
        (7, 2),
        (7, 4),
    ] {
        assert_verifies(&format!("minimal:{p}:{q}"));
    }
}

#[test]
fn products_conjugates_and_gauges() {
    for spec in [
        "ising*fibonacci",
        "su2:2*zn:3:2",
        "minimal:5:4*ising",
        "galois:3(su2:3)",
        "conj(su2:4)",
        "galois:3(fibonacci)",
        "gauge:5(su2:4)",
        "gauge:1(fibonacci)",
        "gauge:2(ising*fibonacci)",
        "galois:7(gauge:3(su2:3))",
    ] {
        assert_verifies(spec);
    }
}
