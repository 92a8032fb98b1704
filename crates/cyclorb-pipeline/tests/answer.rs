//! The orbit answer of each route, end to end from a spec, against published values.

use cyclorb_orbit::{OrbitOptions, Silent};
use cyclorb_pipeline::product::product_orbit;
use cyclorb_pipeline::space::vacuum_problem;
use cyclorb_pipeline::{OrbitAnswer, OrbitMethod};

#[test]
fn the_enumerated_ising_answer_has_the_contract_keys() {
    let problem = vacuum_problem("ising", 1, "humphries").unwrap();
    let orbit = problem
        .enumerate(&OrbitOptions::default(), &mut Silent)
        .unwrap();
    let sum = problem.poincare_sum(&orbit, 1).unwrap();
    let answer = OrbitAnswer::enumerated(&problem, &orbit, Ok(&sum), Default::default());
    let json = serde_json::to_value(&answer).unwrap();
    // Ising at genus 1: 24 lines and B = 8·I (Castro et al. 2012, as in the CLI tests)
    assert_eq!(json["orbit_size"], 24);
    assert_eq!(json["poincare_sum"]["prefactor"], "8");
    assert_eq!(json["saturated"], true);
    assert_eq!(json["method"], "enumerate");
    assert_eq!(json["dimension"], 3);
    assert_eq!(json["conductor"], 16);
    assert_eq!(json["stop_reason"], serde_json::Value::Null);
    assert!(json["store_bytes"].as_u64().unwrap() > 0);
    assert!(json.get("factors").is_none() && json.get("supports").is_none());
    let back: OrbitAnswer = serde_json::from_value(json).unwrap();
    assert_eq!(back, answer);
}

#[test]
fn a_stopped_listing_says_why_and_has_no_sum() {
    let problem = vacuum_problem("ising", 2, "humphries").unwrap();
    let options = OrbitOptions {
        limit: Some(100),
        ..OrbitOptions::default()
    };
    let orbit = problem.enumerate(&options, &mut Silent).unwrap();
    let answer =
        OrbitAnswer::enumerated(&problem, &orbit, Err("unused".into()), Default::default());
    let json = serde_json::to_value(&answer).unwrap();
    assert_eq!(json["saturated"], false);
    assert_eq!(json["stop_reason"], "limit");
    assert_eq!(json["orbit_size"], 100);
    assert_eq!(json["poincare_sum"]["is_scalar"], serde_json::Value::Null);
}

#[test]
fn the_product_route_keeps_a_square_on_its_diagonal() {
    // Ising ⊠ Ising at genus 1: each factor has 24 lines and λ = 8 (Castro et al. 2012).
    // The twists act on both factors by the same permutation, so the pair (v, v) of vacuum
    // lines stays on the diagonal {(w, w)}: the orbit has 24 lines, not 24², and since it
    // is not O × O this route forms no B (derivation; `product` module doc).
    let answer = product_orbit(
        "ising*ising",
        1,
        "humphries",
        &OrbitOptions::default(),
        None,
    )
    .unwrap();
    assert_eq!(answer.method, OrbitMethod::Product);
    assert_eq!(
        answer.orbit_size.as_ref().and_then(|c| c.to_u64()),
        Some(24)
    );
    assert!(answer.saturated);
    assert_eq!(answer.dimension, 9);
    assert_eq!(answer.poincare_sum.is_scalar, None);
    let figures = answer.product.as_ref().unwrap();
    assert_eq!(figures.factors.len(), 2);
    assert_eq!(figures.factors[0].orbit_size, 24);
    assert_eq!(
        figures.factors[0].poincare_sum.prefactor.as_deref(),
        Some("8")
    );
}
