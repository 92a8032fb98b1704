//! Differential test of exact linear algebra over Q(ζ_n) against a general-purpose reference
//! library: every case of fixtures/reference/matrix.json was computed by sympy 1.14.0
//! (DomainMatrix over the algebraic field QQ<exp(2*pi*I/n)>: det, rank, charpoly) by
//! scripts/make_reference.py, which records the versions in the file. Singular matrices (built
//! as products B·C through a lower dimension) exercise the rank. cyclorb-matrix recomputes
//! each case with `Matrix::determinant` and `Matrix::charpoly` (Berkowitz, division-free) and
//! `Matrix::rank` (exact elimination); results must agree exactly.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;
use serde_json::Value;

fn fixture() -> Value {
    let path = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/fixtures/reference/matrix.json"
    );
    let text = std::fs::read_to_string(path).expect("fixtures/reference/matrix.json");
    serde_json::from_str(&text).expect("valid JSON")
}

fn element(field: &CyclotomicField, value: &Value) -> Cyc {
    field
        .parse(value.as_str().expect("element text"))
        .expect("element in the field")
}

#[test]
fn linear_algebra_agrees_with_sympy() {
    let document = fixture();
    assert!(document["reference"]["sympy"].is_string());
    let cases = document["cases"].as_array().expect("cases");
    let (mut dets, mut ranks, mut charpolys, mut singular) = (0, 0, 0, 0);
    for case in cases {
        let n = case["conductor"].as_u64().expect("conductor") as u32;
        let field = CyclotomicField::new(n).unwrap();
        let rows: Vec<Vec<Cyc>> = case["matrix"]
            .as_array()
            .expect("rows")
            .iter()
            .map(|row| {
                let row = row.as_array().expect("row");
                row.iter().map(|x| element(&field, x)).collect()
            })
            .collect();
        let size = rows.len();
        let matrix = Matrix::from_rows(rows).unwrap();
        match case["op"].as_str().expect("op") {
            "det" => {
                let expected = element(&field, &case["result"]);
                assert_eq!(matrix.determinant(&field).unwrap(), expected, "{case}");
                dets += 1;
            }
            "rank" => {
                let expected = case["result"].as_u64().expect("rank") as usize;
                assert_eq!(matrix.rank(&field).unwrap(), expected, "{case}");
                ranks += 1;
                singular += usize::from(expected < size);
            }
            "charpoly" => {
                let expected: Vec<Cyc> = case["result"]
                    .as_array()
                    .expect("coefficients, constant term first")
                    .iter()
                    .map(|c| element(&field, c))
                    .collect();
                assert_eq!(matrix.charpoly(&field).unwrap(), expected, "{case}");
                charpolys += 1;
            }
            other => panic!("unknown op {other}"),
        }
    }
    assert!(
        dets >= 50 && ranks >= 50 && charpolys >= 50,
        "{dets} {ranks} {charpolys}"
    );
    assert!(singular >= 30, "only {singular} singular matrices");
}
