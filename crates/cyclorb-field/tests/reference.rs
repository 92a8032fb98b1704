//! Differential test against a general-purpose reference library: every case of
//! fixtures/reference/field.json was computed by python-flint 0.9.0 (fmpq_poly modulo
//! fmpz_poly.cyclotomic(n); products and inverses cross-checked with sympy 1.14.0) by
//! scripts/make_reference.py, which records the versions in the file. Each case is recomputed
//! here and must agree exactly, and cyclorb must print the reference's canonical text.

use std::collections::BTreeMap;
use std::str::FromStr;

use cyclorb_field::{Cyc, CyclotomicField, Rational};
use serde_json::Value;

fn fixture() -> Value {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/../../fixtures/reference/field.json"
    );
    let text = std::fs::read_to_string(path).expect("fixtures/reference/field.json");
    serde_json::from_str(&text).expect("valid JSON")
}

fn text<'a>(case: &'a Value, key: &str) -> &'a str {
    case[key]
        .as_str()
        .unwrap_or_else(|| panic!("{key} in {case}"))
}

fn check_element(case: &Value, field: &CyclotomicField, got: Cyc) {
    let expected = text(case, "result");
    assert_eq!(got, field.parse(expected).unwrap(), "{case}");
    assert_eq!(got.to_string(), expected, "printed form, {case}");
}

fn check_rational(case: &Value, got: (num_bigint::BigInt, num_bigint::BigInt)) {
    let expected = Rational::from_str(text(case, "result")).unwrap();
    assert_eq!(Rational::new(got.0, got.1).unwrap(), expected, "{case}");
}

#[test]
fn field_operations_agree_with_python_flint() {
    let document = fixture();
    let versions = &document["reference"];
    assert!(versions["python-flint"].is_string() && versions["sympy"].is_string());
    let cases = document["cases"].as_array().expect("cases");
    let mut fields: BTreeMap<u64, CyclotomicField> = BTreeMap::new();
    let mut seen: BTreeMap<String, usize> = BTreeMap::new();
    for case in cases {
        let n = case["conductor"].as_u64().expect("conductor");
        let field = fields
            .entry(n)
            .or_insert_with(|| CyclotomicField::new(n as u32).unwrap());
        let a = field.parse(text(case, "a")).unwrap();
        // the inputs themselves are printed canonically by the reference
        assert_eq!(a.to_string(), text(case, "a"));
        let op = text(case, "op");
        match op {
            "mul" => {
                let b = field.parse(text(case, "b")).unwrap();
                check_element(case, field, field.mul(&a, &b).unwrap());
            }
            "inv" => check_element(case, field, field.inv(&a).unwrap()),
            "galois" => {
                let k = case["k"].as_i64().expect("k");
                check_element(case, field, field.galois(&a, k).unwrap());
            }
            "norm" => check_rational(case, field.norm(&a).unwrap()),
            "trace" => check_rational(case, field.trace(&a).unwrap()),
            other => panic!("unknown op {other}"),
        }
        *seen.entry(op.to_string()).or_default() += 1;
    }
    // every operation is exercised, over many conductors
    for op in ["mul", "inv", "galois", "norm", "trace"] {
        assert!(seen.get(op).copied().unwrap_or(0) >= 40, "{op}: {seen:?}");
    }
    assert!(fields.len() >= 20);
}
