//! Generator-set and seed files: round trips and refusals with place and reason.

use cyclorb_matrix::{Block, Operator};
use cyclorb_orbit::{FormatError, GeneratorSet, Seed};

use crate::sample_sets::*;

fn every_kind() -> GeneratorSet {
    let f = field(12);
    let block = matrix(&f, &[&["0", "z"], &["-z^-1", "0"]]);
    let g = generator_set(
        12,
        3,
        vec![
            (
                "D",
                Operator::Diagonal(vec![parse(&f, "z^4"), parse(&f, "1"), parse(&f, "-1")]),
            ),
            (
                "M",
                Operator::Dense(matrix(
                    &f,
                    &[&["0", "1", "0"], &["0", "0", "1"], &["1", "0", "0"]],
                )),
            ),
            (
                "B",
                Operator::BlockDiagonal {
                    dim: 3,
                    blocks: vec![Block {
                        indices: vec![2, 0],
                        matrix: block,
                    }],
                },
            ),
            (
                "R",
                Operator::SparseRows {
                    dim: 3,
                    rows: vec![
                        vec![(1, parse(&f, "(1 + z)/3"))],
                        vec![(0, f.one()), (2, parse(&f, "sqrt(3)"))],
                        vec![],
                    ],
                },
            ),
        ],
    );
    g.with_basis_labels(vec!["a".into(), "b \"quoted\"".into(), "ψ".into()])
        .unwrap()
        .with_form(Some(vec![
            parse(&f, "1"),
            parse(&f, "2/3"),
            parse(&f, "z + z^-1"),
        ]))
        .unwrap()
        .with_origin(Some("test".into()), Some(2))
}

#[test]
fn generator_sets_and_seeds_round_trip() {
    let g = every_kind();
    let text = g.to_json();
    assert_eq!(GeneratorSet::from_json(&text, "mem").unwrap(), g);
    let path = temp_path("set.json");
    g.write(&path).unwrap();
    assert_eq!(GeneratorSet::read(&path).unwrap(), g);
    std::fs::remove_file(&path).unwrap();
    let f = field(12);
    let s = seed(&f, &["1", "z/2", "0"]);
    assert_eq!(Seed::from_json(&s.to_json(), "mem").unwrap(), s);
}

/// The Ising fixture text with one substitution applied.
fn ising_with(from: &str, to: &str) -> String {
    let text = std::fs::read_to_string(fixture("ising-genus1.json")).unwrap();
    assert!(text.contains(from), "fixture lacks {from:?}");
    text.replacen(from, to, 1)
}

fn refusal(text: &str) -> FormatError {
    GeneratorSet::from_json(text, "input.json").unwrap_err()
}

#[test]
fn malformed_generator_sets_name_place_and_reason() {
    let cases: Vec<(String, &str, &str)> = vec![
        (
            ising_with("\"dense\"", "\"triangular\""),
            "generators[1].kind",
            "unknown kind \"triangular\"",
        ),
        (
            ising_with("\"version\": 1", "\"version\": 2"),
            "version",
            "unsupported version 2",
        ),
        (
            ising_with("\"form\": null", "\"from\": null"),
            "from",
            "unknown key",
        ),
        (
            ising_with("\"form\": null", "\"form\": [\"1\", \"0\", \"1\"]"),
            "form[1]",
            "zero",
        ),
        (
            ising_with(
                "[\"1/2\", \"sqrt(2)/2\", \"1/2\"]",
                "[\"1/2\", \"sqrt(2)/2\"]",
            ),
            "generators[1].rows[0]",
            "expected 3 entries, found 2",
        ),
        (
            ising_with("\"z\", \"-1\"]", "\"z\", \"-1\", \"1\"]"),
            "generators[0].diagonal",
            "expected 3 entries, found 4",
        ),
        (
            ising_with("\"name\": \"S\"", "\"name\": \"T\""),
            "generators[1].name",
            "repeated name \"T\"",
        ),
        (
            ising_with("\"z\", \"-1\"", "\"z\", \"-1 +\""),
            "generators[0].diagonal[2]",
            "unexpected end",
        ),
        (
            ising_with("\"z\", \"-1\"", "\"z\", true"),
            "generators[0].diagonal[2]",
            "found a boolean",
        ),
        (
            ising_with("\"conductor\": 16", "\"conductor\": 0"),
            "conductor",
            "not supported",
        ),
        (
            ising_with("\"dimension\": 3,", ""),
            "",
            "missing key \"dimension\"",
        ),
        (
            ising_with("\"generators\": [", "\"generators\": {"),
            "line",
            "not valid JSON",
        ),
        (
            ising_with(
                "\"format\": \"cyclorb-generators\"",
                "\"format\": \"cyclorb-seed\"",
            ),
            "format",
            "expected \"cyclorb-generators\"",
        ),
    ];
    for (text, place, reason) in cases {
        let e = refusal(&text);
        assert!(
            e.place.starts_with(place),
            "place {:?}, expected {place:?} ({e})",
            e.place
        );
        assert!(
            e.reason.contains(reason),
            "reason {:?}, expected {reason:?}",
            e.reason
        );
        assert!(e.to_string().starts_with("input.json: "), "{e}");
    }
}

#[test]
fn malformed_fixture_files_are_refused_with_their_name() {
    let path = fixture("malformed-entry.json");
    match GeneratorSet::read(&path) {
        Err(e) => {
            assert_eq!(e.place, "generators[1].rows[2][1]");
            assert!(e.reason.contains("sqrt(3"), "{}", e.reason);
            assert!(e.file.ends_with("malformed-entry.json"));
        }
        other => panic!("expected a format error, got {other:?}"),
    }
    match GeneratorSet::read(&fixture("malformed-sparse.json")) {
        Err(e) => {
            assert_eq!(e.place, "generators[0].rows[1][0][0]");
            assert!(
                e.reason.contains("index 2 out of range 0..2"),
                "{}",
                e.reason
            );
        }
        other => panic!("expected a format error, got {other:?}"),
    }
    match GeneratorSet::read(&fixture("no-such-file.json")) {
        Err(e) => {
            assert!(e.file.ends_with("no-such-file.json"), "{e}");
            assert!(
                e.place.is_empty() && e.reason.contains("No such file"),
                "{e}"
            );
        }
        other => panic!("expected an I/O error, got {other:?}"),
    }
}

#[test]
fn malformed_seeds_are_refused() {
    let cases = [
        (
            r#"{"format": "cyclorb-seed", "version": 1, "conductor": 8}"#,
            "",
            "exactly one of",
        ),
        (
            r#"{"format": "cyclorb-seed", "version": 1, "conductor": 8, "vector": []}"#,
            "vector",
            "empty",
        ),
        (
            r#"{"format": "cyclorb-seed", "version": 1, "conductor": 8, "dimension": 2, "entries": [[0, "1"], [0, "2"]]}"#,
            "entries[1]",
            "appears twice",
        ),
        (
            r#"{"format": "cyclorb-seed", "version": 1, "conductor": 8, "dimension": 2, "entries": [[5, "1"]]}"#,
            "entries[0][0]",
            "out of range",
        ),
        (
            r#"{"format": "cyclorb-seed", "version": 1, "conductor": 8, "vector": ["zeta(5)"]}"#,
            "vector[0]",
            "not a root of unity",
        ),
    ];
    for (text, place, reason) in cases {
        let e = Seed::from_json(text, "seed.json").unwrap_err();
        assert_eq!(e.place, place, "{e}");
        assert!(e.reason.contains(reason), "{e}");
    }
    // a seed over Q(ζ5) cannot be used with generators over Q(ζ16)
    let f5 = field(5);
    let s = seed(&f5, &["1", "0", "0"]);
    let err = cyclorb_orbit::OrbitProblem::new(ising_genus1(), &s).unwrap_err();
    assert!(err.to_string().contains("not a subfield"), "{err}");
}
