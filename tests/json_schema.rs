//! The JSON contract: every command's `--json` output is checked against its schema in
//! docs/schema/ (JSON Schema, draft 2020-12), on real runs. The schemas use a small part of
//! the standard — `type` (a name or a list), `properties`, `required`, `items`, `enum` and
//! `additionalProperties: false` — which the validator below implements; it is exercised on
//! documents that must fail, so a schema that accepts everything is caught.

mod run_cli;

use std::path::Path;

use serde_json::Value;

/// Whether `value` has the JSON Schema type `name` (`integer` is a number without fraction).
fn has_type(value: &Value, name: &str) -> bool {
    match name {
        "null" => value.is_null(),
        "boolean" => value.is_boolean(),
        "integer" => value.is_i64() || value.is_u64(),
        "number" => value.is_number(),
        "string" => value.is_string(),
        "array" => value.is_array(),
        "object" => value.is_object(),
        other => panic!("schema uses an unknown type {other}"),
    }
}

/// Every violation of `schema` by `value`, with its JSON path.
fn violations(schema: &Value, value: &Value, path: &str, out: &mut Vec<String>) {
    if let Some(ty) = schema.get("type") {
        let names: Vec<&str> = match ty {
            Value::String(s) => vec![s.as_str()],
            Value::Array(a) => a.iter().map(|t| t.as_str().unwrap()).collect(),
            _ => panic!("bad type in schema at {path}"),
        };
        if !names.iter().any(|n| has_type(value, n)) {
            out.push(format!("{path}: {value} is not of type {names:?}"));
            return;
        }
    }
    if let Some(allowed) = schema.get("enum").and_then(Value::as_array) {
        if !allowed.contains(value) {
            out.push(format!("{path}: {value} is not one of {allowed:?}"));
        }
    }
    if let Value::Object(obj) = value {
        let props = schema.get("properties").and_then(Value::as_object);
        for key in schema
            .get("required")
            .and_then(Value::as_array)
            .into_iter()
            .flatten()
        {
            let key = key.as_str().unwrap();
            if !obj.contains_key(key) {
                out.push(format!("{path}: required key {key} is missing"));
            }
        }
        for (key, v) in obj {
            match props.and_then(|p| p.get(key)) {
                Some(sub) => violations(sub, v, &format!("{path}.{key}"), out),
                None if schema.get("additionalProperties") == Some(&Value::Bool(false)) => {
                    out.push(format!("{path}: key {key} is not documented"))
                }
                None => {}
            }
        }
    }
    if let (Value::Array(items), Some(sub)) = (value, schema.get("items")) {
        for (i, v) in items.iter().enumerate() {
            violations(sub, v, &format!("{path}[{i}]"), out);
        }
    }
}

fn schema(command: &str) -> Value {
    let path = Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("docs/schema")
        .join(format!("{command}.schema.json"));
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    serde_json::from_str(&text).unwrap_or_else(|e| panic!("{}: {e}", path.display()))
}

/// Run `cyclorb ARGS --json` and check its object against the command's schema.
fn conforms(args: &[&str]) {
    let (_, value) = run_cli::cyclorb_json(args);
    let mut out = Vec::new();
    violations(&schema(args[0]), &value, "$", &mut out);
    assert!(
        out.is_empty(),
        "cyclorb {}:\n{}",
        args.join(" "),
        out.join("\n")
    );
}

#[test]
fn the_validator_rejects_what_it_must() {
    let s = serde_json::json!({
        "type": "object",
        "required": ["n"],
        "additionalProperties": false,
        "properties": {
            "n": {"type": "integer"},
            "xs": {"type": ["array", "null"], "items": {"type": "string"}},
            "m": {"enum": ["a", "b"]}
        }
    });
    let check = |v: Value| {
        let mut out = Vec::new();
        violations(&s, &v, "$", &mut out);
        out.len()
    };
    assert_eq!(check(serde_json::json!({"n": 1, "xs": ["a"], "m": "a"})), 0);
    assert_eq!(check(serde_json::json!({"n": 1, "xs": null})), 0);
    assert_eq!(check(serde_json::json!({"xs": []})), 1); // n missing
    assert_eq!(check(serde_json::json!({"n": 1.5})), 1); // not an integer
    assert_eq!(check(serde_json::json!({"n": 1, "xs": [1]})), 1); // item type
    assert_eq!(check(serde_json::json!({"n": 1, "m": "c"})), 1); // enum
    assert_eq!(check(serde_json::json!({"n": 1, "extra": 0})), 1); // undocumented
}

#[test]
fn theory_commands_follow_their_schemas() {
    conforms(&["theories"]);
    conforms(&["field", "-n", "8", "z^2 + 1", "1/3"]);
    for spec in ["ising", "su2:4", "kac:5:4", "dw:S3", "dw:Z2:1"] {
        conforms(&["describe", spec]);
    }
    conforms(&["verify", "ising"]);
    conforms(&["verify", "fixtures/theories/broken/fib-with-d0.json"]);
    conforms(&["twists", "ising", "--genus", "2", "--check"]);
    conforms(&["completions", "bash"]);
    conforms(&["manual"]);
}

#[test]
fn orbit_follows_its_schema_by_every_method() {
    conforms(&["orbit", "ising", "--genus", "1"]);
    conforms(&["orbit", "ising", "--genus", "2", "--words", "2"]);
    conforms(&["orbit", "zn:3:2", "--genus", "2"]);
    conforms(&["orbit", "ising", "--genus", "2", "--method", "structure"]);
    conforms(&["orbit", "su2:4", "--genus", "2", "--method", "structure"]);
    conforms(&[
        "orbit",
        "ising*zn:2:1",
        "--genus",
        "1",
        "--method",
        "product",
    ]);
    conforms(&["orbit", "su2:3", "--genus", "2", "--limit", "100"]);
    conforms(&["orbit", "dw:S3", "--genus", "1"]);
    conforms(&["orbit", "dw:S3", "--genus", "2", "--method", "structure"]);
}

#[test]
fn certificate_commands_follow_their_schemas() {
    conforms(&["commutant", "ising", "--genus", "1"]);
    conforms(&["commutant", "zn:3:2", "--genus", "2"]);
    conforms(&["image", "fibonacci", "--genus", "1"]);
    conforms(&["image", "su2:4", "--genus", "2"]);
    conforms(&["image", "fibonacci", "--genus", "2"]);
    conforms(&["image", "dw:Z2", "--genus", "2"]);
    conforms(&["witness", "fibonacci", "--genus", "2"]);
    conforms(&["witness", "ising", "--genus", "1"]);
}

#[test]
fn check_follows_its_schema() {
    let cert = run_cli::temp_path("schema-image.json");
    let out = run_cli::cyclorb(&[
        "image",
        "fibonacci",
        "--genus",
        "1",
        "--out",
        cert.to_str().unwrap(),
    ]);
    assert!(out.status.success());
    conforms(&["check", cert.to_str().unwrap()]);
    // a failing check reports in the same shape
    let text = std::fs::read_to_string(&cert).unwrap();
    let tampered = text.replacen("\"order\": \"60\"", "\"order\": \"61\"", 1);
    assert_ne!(
        text, tampered,
        "the certificate states the order 60 (Fibonacci at genus 1)"
    );
    std::fs::write(&cert, tampered).unwrap();
    conforms(&["check", cert.to_str().unwrap()]);
}

#[test]
fn sweep_follows_its_schema() {
    let out = run_cli::temp_path("schema-sweep");
    conforms(&[
        "sweep",
        "fixtures/sweeps/small.toml",
        "--out",
        out.to_str().unwrap(),
    ]);
}
