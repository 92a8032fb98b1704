//! The re-check of a certificate through the library (`check::check`): a certificate made
//! and wrapped here holds claim by claim, a changed digit fails the claim it touches, and a
//! file that is no certificate is an error naming it.

use cyclorb_pipeline::check::{check, Certificate};
use cyclorb_pipeline::envelope::{wrap, Source};
use cyclorb_pipeline::space::{build_space_traced, cert_generators, parse_set};
use serde_json::{json, Value};

/// The commutant certificate of Z_3 at genus 1 with its envelope.
fn z3_commutant() -> Value {
    let (space, files) = build_space_traced("zn:3:2", 1).unwrap();
    let gens = cert_generators(&space, parse_set("humphries").unwrap()).unwrap();
    let cert = cyclorb_cert::commutant(&gens, Default::default()).unwrap();
    let source = Source {
        spec: "zn:3:2",
        genus: 1,
        set: "humphries",
    };
    wrap("commutant", &source, &cert, &files)
}

#[test]
fn a_wrapped_commutant_certificate_rechecks_and_a_change_is_caught() {
    let body = z3_commutant();
    // Z_3 at genus 1: charge conjugation a ↦ −a commutes with S and T (S² = C, common
    // practice), so the commutant is 2-dimensional
    assert_eq!(body["dimension"], 2);
    let report = check(&Certificate::from_value("z3.json", body.clone()).unwrap()).unwrap();
    assert!(report.ok && report.failed.is_none(), "{report:#?}");
    assert_eq!(report.kind, "commutant");
    assert_eq!(report.claims[0].name, "input");
    assert!(report.claims.iter().all(|c| c.ok));
    let mut tampered = body;
    tampered["dimension"] = json!(1);
    let report = check(&Certificate::from_value("z3.json", tampered).unwrap()).unwrap();
    assert!(!report.ok);
    assert_eq!(report.failed.as_deref(), Some("lower-bound"));
    assert_eq!(report.failed_claim().unwrap().name, "lower-bound");
    // the report's JSON is the program's `check --json` object (less `verified`)
    let json = serde_json::to_value(&report).unwrap();
    assert_eq!(json["failed"], "lower-bound");
    assert_eq!(json["genus"], 1);
}

#[test]
fn what_is_not_a_certificate_is_an_error_naming_it() {
    let no_object = Certificate::parse("x.json", "[1, 2]").unwrap_err();
    assert_eq!(no_object, "x.json: expected a JSON object (a certificate)");
    let repeated = Certificate::parse("x.json", r#"{"kind": "a", "kind": "b"}"#).unwrap_err();
    assert!(repeated.starts_with("x.json: not JSON"), "{repeated}");
    let bare = Certificate::from_value("x.json", json!({"kind": "commutant"})).unwrap();
    let missing = check(&bare).unwrap_err();
    assert!(missing.starts_with("x.json: key `"), "{missing}");
    let missing_file = Certificate::read(std::path::Path::new("no/such/file.json")).unwrap_err();
    assert!(
        missing_file.starts_with("no/such/file.json: "),
        "{missing_file}"
    );
}
