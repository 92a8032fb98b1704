//! Group files: a group given by permutation generators or by a multiplication table.
//!
//! A group file is one JSON object with a `name` and exactly one of:
//!
//! ```json
//! {"name": "S3", "degree": 3, "generators": [[1, 2, 0], [1, 0, 2]]}
//! {"name": "Z3", "table": [[0, 1, 2], [1, 2, 0], [2, 0, 1]], "labels": ["e", "r", "rr"]}
//! ```
//!
//! - `generators`: permutations of the points 0, …, degree − 1 as image lists (generator k
//!   sends point i to `generators[k][i]`); `degree` may be left out when there is at least
//!   one generator. The group is their closure under composition.
//! - `table`: `table[a][b]` is the index of a·b; `labels` (optional) names the elements.
//!   It is checked: a two-sided identity, every row and column a permutation (inverses),
//!   associativity (all |G|³ triples, so at most order 256).
//!
//! Errors name the file, the key and the reason (e.g. `row 2 contains element 1 twice`).

use std::path::Path;

use serde_json::Value;

use crate::error::DwError;
use crate::group::FiniteGroup;

/// The name of the format, for documentation and `cyclorb theories`.
pub const GROUP_FILE_FORMAT: &str =
    "{\"name\": …, \"generators\": [[images of 0..n−1], …]} or {\"name\": …, \"table\": [[a·b, …], …]}";

/// Read a group file (see the module documentation).
pub fn read_group_file(path: &Path) -> Result<FiniteGroup, DwError> {
    let shown = path.display().to_string();
    let text = std::fs::read_to_string(path).map_err(|e| DwError::File {
        path: shown.clone(),
        reason: e.to_string(),
    })?;
    parse_group_file(&shown, &text)
}

fn index_list(path: &str, key: &str, v: &Value) -> Result<Vec<usize>, DwError> {
    let bad = |reason: String| DwError::File {
        path: path.to_string(),
        reason,
    };
    let list = v
        .as_array()
        .ok_or_else(|| bad(format!("{key} is not a list")))?;
    list.iter()
        .enumerate()
        .map(|(i, x)| {
            x.as_u64()
                .map(|x| x as usize)
                .ok_or_else(|| bad(format!("{key}[{i}] is not a non-negative integer")))
        })
        .collect()
}

fn lists(path: &str, key: &str, v: &Value) -> Result<Vec<Vec<usize>>, DwError> {
    let list = v.as_array().ok_or_else(|| DwError::File {
        path: path.to_string(),
        reason: format!("{key} is not a list of lists"),
    })?;
    list.iter()
        .enumerate()
        .map(|(k, x)| index_list(path, &format!("{key}[{k}]"), x))
        .collect()
}

/// Parse the text of a group file; `path` names it in errors.
pub fn parse_group_file(path: &str, text: &str) -> Result<FiniteGroup, DwError> {
    let bad = |reason: String| DwError::File {
        path: path.to_string(),
        reason,
    };
    let value: Value = serde_json::from_str(text).map_err(|e| bad(format!("not JSON: {e}")))?;
    let object = value
        .as_object()
        .ok_or_else(|| bad("the file is not a JSON object".into()))?;
    for key in object.keys() {
        if !["name", "degree", "generators", "table", "labels"].contains(&key.as_str()) {
            return Err(bad(format!(
                "unknown key {key:?} (known: name, degree, generators, table, labels)"
            )));
        }
    }
    let name = object
        .get("name")
        .and_then(Value::as_str)
        .ok_or_else(|| bad("name: missing or not a string".into()))?;
    let located = |e: DwError| match e {
        DwError::NotAGroup(reason) | DwError::TooLarge(reason) => {
            bad(format!("not a group: {reason}"))
        }
        other => other,
    };
    match (object.get("generators"), object.get("table")) {
        (Some(g), None) => {
            let generators = lists(path, "generators", g)?;
            let degree = match object.get("degree") {
                Some(d) => d
                    .as_u64()
                    .map(|d| d as usize)
                    .ok_or_else(|| bad("degree is not a non-negative integer".into()))?,
                None => generators
                    .first()
                    .map(Vec::len)
                    .ok_or_else(|| bad("no generators and no degree".into()))?,
            };
            FiniteGroup::from_permutations(name, degree, &generators).map_err(|e| match e {
                DwError::NotAGroup(reason) => bad(format!("generators: {reason}")),
                DwError::TooLarge(reason) => bad(reason),
                other => other,
            })
        }
        (None, Some(t)) => {
            let table = lists(path, "table", t)?;
            let labels: Vec<String> = match object.get("labels") {
                None => Vec::new(),
                Some(l) => l
                    .as_array()
                    .ok_or_else(|| bad("labels is not a list".into()))?
                    .iter()
                    .enumerate()
                    .map(|(i, x)| {
                        x.as_str()
                            .map(str::to_string)
                            .ok_or_else(|| bad(format!("labels[{i}] is not a string")))
                    })
                    .collect::<Result<_, _>>()?,
            };
            FiniteGroup::from_table(name, &table, &labels).map_err(|e| match e {
                DwError::NotAGroup(reason) => bad(format!("table: not a group: {reason}")),
                other => located(other),
            })
        }
        (Some(_), Some(_)) => Err(bad("give either generators or table, not both".into())),
        (None, None) => Err(bad("neither generators nor table".into())),
    }
}
