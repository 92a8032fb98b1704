//! Untrusted specs: depth limit, negative parameters quoted as written, and the trace of
//! file theories that callers prove before use.

use cyclorb_theory::{parse_spec, parse_spec_traced, theory_to_json, MAX_SPEC_DEPTH};

#[test]
fn deep_nesting_is_refused_not_overflowed() {
    let deep = format!("{}ising{}", "conj(".repeat(1400), ")".repeat(1400));
    let err = parse_spec(&deep).unwrap_err().to_string();
    assert!(err.contains("nesting deeper than"), "{err}");
    let parens = format!("{}ising{}", "(".repeat(5000), ")".repeat(5000));
    assert!(parse_spec(&parens).is_err());
    let ok = format!(
        "{}ising{}",
        "(".repeat(MAX_SPEC_DEPTH - 1),
        ")".repeat(MAX_SPEC_DEPTH - 1)
    );
    assert_eq!(parse_spec(&ok).unwrap().rank(), 3);
}

#[test]
fn negative_gauge_seeds_and_levels_are_refused_as_written() {
    let err = parse_spec("gauge:-1(ising)").unwrap_err().to_string();
    assert!(err.contains("gauge seed -1 must be non-negative"), "{err}");
    assert!(parse_spec("gauge:1(ising)").is_ok());
    for spec in ["su2:-1", "so3:-3"] {
        let err = parse_spec(spec).unwrap_err().to_string();
        assert!(err.contains(&format!("{spec:?}")), "{err}");
        assert!(err.contains("non-negative"), "{err}");
    }
}

#[test]
fn file_theories_are_traced_and_builtins_are_not() {
    let dir = std::env::temp_dir().join(format!("cyclorb-spec-trace-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("fib.json");
    let fib = parse_spec("fibonacci").unwrap();
    std::fs::write(&path, theory_to_json(&fib).to_string()).unwrap();
    let p = path.display().to_string();

    let alone = parse_spec_traced(&p).unwrap();
    assert_eq!(alone.files.len(), 1);
    assert_eq!(alone.files[0].theory.data_hash(), fib.data_hash());

    let mixed = parse_spec_traced(&format!("ising*conj({p})*{p}")).unwrap();
    assert_eq!(mixed.files.len(), 2);
    assert_eq!(mixed.theory.rank(), 12);

    assert!(parse_spec_traced("ising*conj(fibonacci)")
        .unwrap()
        .files
        .is_empty());
    std::fs::remove_dir_all(&dir).ok();
}

#[test]
fn a_repeated_json_key_is_refused_with_file_and_key() {
    let dir = std::env::temp_dir().join(format!("cyclorb-spec-dup-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("ising-dup.json");
    let text = theory_to_json(&parse_spec("ising").unwrap()).to_string();
    // a second "conductor" key, first in the object, which a plain reader would overwrite
    let doubled = text.replacen('{', "{\"conductor\": 7, ", 1);
    std::fs::write(&path, doubled).unwrap();
    let err = parse_spec(&path.display().to_string())
        .unwrap_err()
        .to_string();
    assert!(err.contains("repeated key \"conductor\""), "{err}");
    assert!(err.contains("ising-dup.json"), "{err}");
    std::fs::remove_dir_all(&dir).ok();
}
