//! Theory files: a JSON format that `describe --json` writes and every command reads.
//!
//! ```text
//! {
//!   "format": "cyclorb-theory", "version": 1,            (optional, checked when present)
//!   "name": "my-theory",                                  (optional; default: file stem)
//!   "conductor": 12,                                      n: every number lies in Q(ζ_n)
//!   "labels": ["1", "a", "b"],                            the first label is the vacuum
//!   "fusion": [["a", "a", "b"], ...],                     every (x, y, z) with N_xy^z = 1;
//!                                                         (1, x, x) and (x, 1, x) are implied
//!   "dimensions": {"1": "1", "a": "1", "b": "1"},         d_x
//!   "twists": {"1": "1", "a": "zeta(3)", ...},            θ_x
//!   "F": [["a", "a", "a", "1", "b", "b", "1"], ...],      [x y z w e f value] = [F^{xyz}_w]_{ef}
//!   "R": [["a", "a", "b", "zeta(3)^2"], ...],             [x y z value] = R^{xy}_z
//!   "vertex_weights": [["a", "a", "b", "2"], ...]         optional: |u^{xy}_z|², default 1
//! }
//! ```
//! Numbers are strings in the field syntax (integers, `z` = ζ_n, `i`, `zeta(m)`, `sqrt(r)`,
//! `+ - * / ^`, parentheses) or JSON integers. Every admissible F-symbol and R-symbol without a
//! vacuum leg must be listed; those with a vacuum leg may be listed and must equal 1.
//!
//! A file without "F" and "R" is modular data: "labels", "twists" and "S" (the normalised
//! S-matrix, one array per row in label order) are required; "fusion" is optional (derived from
//! S by the Verlinde formula when absent; a fourth entry gives a multiplicity > 1) and the
//! dimensions are S_0x/S_00.
//!
//! A theory with F and R may give "total_dimension": D = ±√(Σ_a d_a²), choosing the sign of D
//! (and so of S and c mod 8); without it D > 0. The keys `describe --json` adds besides
//! ("rank", "central_charge_mod_8", "duals", "S" and "T" of a theory with F and R,
//! "data_hash", "modular_data_only", "unitary_gauge", "spec") are informational: they are
//! recomputed and not read. Any other key is refused, and so is an object with a repeated
//! key. Errors name the file, the place (a JSON path, or line and column) and the reason.

use std::path::Path;

use cyclorb_field::{Cyc, CyclotomicField, UniqueKeys, MAX_CONDUCTOR};
use cyclorb_matrix::Matrix;
use hashbrown::HashMap;
use serde_json::{json, Map, Value};

use crate::arith::SameField;
use crate::assemble::{admissible_blocks, assemble, block_labels, RawF, RawStructure, RawTheory};
use crate::error::TheoryError;
use crate::fmatrix::FMatrix;
use crate::fusion::{FusionProblem, FusionRules};
use crate::ops::with_negated_total_dimension;
use crate::structure::{key3, key4};
use crate::theory::Theory;
use crate::verlinde::fusion_from_s;

/// The value of "format".
pub const FORMAT_NAME: &str = "cyclorb-theory";
/// The value of "version".
pub const FORMAT_VERSION: u64 = 1;

const DATA_KEYS: [&str; 12] = [
    "format",
    "version",
    "name",
    "conductor",
    "labels",
    "fusion",
    "dimensions",
    "twists",
    "F",
    "R",
    "vertex_weights",
    "S",
];

const INFORMATIONAL_KEYS: [&str; 9] = [
    "rank",
    "central_charge_mod_8",
    "total_dimension",
    "duals",
    "T",
    "data_hash",
    "modular_data_only",
    "unitary_gauge",
    "spec",
];

/// Reads one file, reporting problems with their place.
struct Reader<'a> {
    file: &'a str,
    field: CyclotomicField,
    labels: Vec<String>,
    index: HashMap<String, usize>,
}

fn refuse(file: &str, place: impl Into<String>, reason: impl Into<String>) -> TheoryError {
    TheoryError::File {
        file: file.to_string(),
        place: place.into(),
        reason: reason.into(),
    }
}

impl Reader<'_> {
    fn err(&self, place: impl Into<String>, reason: impl Into<String>) -> TheoryError {
        refuse(self.file, place, reason)
    }

    fn number(&self, v: &Value, place: &str) -> Result<Cyc, TheoryError> {
        match v {
            Value::String(text) => self.field.parse(text).map_err(|e| {
                self.err(
                    place,
                    format!(
                        "bad number {text:?} for Q(ζ_{}): {e}",
                        self.field.conductor()
                    ),
                )
            }),
            Value::Number(n) => match n.as_i64() {
                Some(m) => Ok(self.field.int(m)),
                None => Err(self.err(place, format!("bad number {n}: only integers may be bare JSON numbers; write other numbers as strings"))),
            },
            other => Err(self.err(place, format!("expected a number, found {other}"))),
        }
    }

    fn label(&self, v: &Value, place: &str) -> Result<usize, TheoryError> {
        let name = v
            .as_str()
            .ok_or_else(|| self.err(place, format!("expected a label name, found {v}")))?;
        self.index
            .get(name)
            .copied()
            .ok_or_else(|| self.err(place, format!("unknown label {name:?}")))
    }

    fn array<'v>(&self, v: &'v Value, place: &str) -> Result<&'v Vec<Value>, TheoryError> {
        v.as_array()
            .ok_or_else(|| self.err(place, "expected an array"))
    }

    /// A list of [label…, value] rows with `arity` labels.
    fn tuples(
        &self,
        v: &Value,
        key: &str,
        arity: usize,
    ) -> Result<Vec<(Vec<usize>, Cyc, String)>, TheoryError> {
        let mut out = Vec::new();
        for (i, row) in self.array(v, key)?.iter().enumerate() {
            let place = format!("{key}[{i}]");
            let items = self.array(row, &place)?;
            if items.len() != arity + 1 {
                return Err(self.err(
                    &place,
                    format!(
                        "expected {arity} labels and a value, found {} items",
                        items.len()
                    ),
                ));
            }
            let labels = items[..arity]
                .iter()
                .enumerate()
                .map(|(j, x)| self.label(x, &format!("{place}[{j}]")))
                .collect::<Result<Vec<_>, _>>()?;
            let value = self.number(&items[arity], &format!("{place}[{arity}]"))?;
            out.push((labels, value, place));
        }
        Ok(out)
    }

    /// An object with one number per label.
    fn per_label(&self, v: &Value, key: &str) -> Result<Vec<Cyc>, TheoryError> {
        let obj = v
            .as_object()
            .ok_or_else(|| self.err(key, "expected an object with one entry per label"))?;
        let mut out: Vec<Option<Cyc>> = vec![None; self.labels.len()];
        for (name, x) in obj {
            let place = format!("{key}[{name:?}]");
            let a = self
                .index
                .get(name)
                .copied()
                .ok_or_else(|| self.err(&place, format!("unknown label {name:?}")))?;
            out[a] = Some(self.number(x, &place)?);
        }
        out.into_iter()
            .enumerate()
            .map(|(a, x)| {
                x.ok_or_else(|| {
                    self.err(key, format!("missing entry for label {:?}", self.labels[a]))
                })
            })
            .collect()
    }

    fn fusion(&self, v: &Value, allow_multiplicity: bool) -> Result<FusionRules, TheoryError> {
        let mut triples = Vec::new();
        for (i, row) in self.array(v, "fusion")?.iter().enumerate() {
            let place = format!("fusion[{i}]");
            let items = self.array(row, &place)?;
            let m = match (items.len(), allow_multiplicity) {
                (3, _) => 1,
                (4, true) => items[3]
                    .as_u64()
                    .and_then(|m| u32::try_from(m).ok())
                    .filter(|&m| m > 0)
                    .ok_or_else(|| {
                        self.err(
                            format!("{place}[3]"),
                            "expected a positive integer multiplicity",
                        )
                    })?,
                (4, false) => return Err(self.err(
                    &place,
                    "multiplicities are only allowed in modular-data files (F and R need N ≤ 1)",
                )),
                (n, _) => {
                    return Err(self.err(&place, format!("expected three labels, found {n} items")))
                }
            };
            let abc = items[..3]
                .iter()
                .enumerate()
                .map(|(j, x)| self.label(x, &format!("{place}[{j}]")))
                .collect::<Result<Vec<_>, _>>()?;
            triples.push((abc[0], abc[1], abc[2], m));
        }
        FusionRules::from_triples(self.labels.len(), triples).map_err(|e| match e {
            FusionProblem::NoDual(a) => self.err(
                "fusion",
                format!(
                    "label {:?} has no dual (no triple [{:?}, x, {:?}])",
                    self.labels[a], self.labels[a], self.labels[0]
                ),
            ),
            FusionProblem::LabelOutOfRange(a) => {
                self.err("fusion", format!("label index {a} out of range"))
            }
        })
    }

    fn symbol_name(&self, labels: &[usize]) -> String {
        let names: Vec<&str> = labels.iter().map(|&x| self.labels[x].as_str()).collect();
        match names.as_slice() {
            [a, b, c, d, e, f] => format!("[F^{{{a} {b} {c}}}_{{{d}}}]_{{{e} {f}}}"),
            [a, b, c] => format!("R^{{{a} {b}}}_{{{c}}}"),
            other => other.join(" "),
        }
    }

    fn f_symbols(
        &self,
        v: &Value,
        fusion: &FusionRules,
    ) -> Result<HashMap<u64, FMatrix>, TheoryError> {
        let f = &self.field;
        let r = self.labels.len();
        let mut given: HashMap<[usize; 6], Cyc> = HashMap::new();
        for (l, value, place) in self.tuples(v, "F", 6)? {
            let (a, b, c, d, e, g) = (l[0], l[1], l[2], l[3], l[4], l[5]);
            let admissible = fusion.fuses(a, b, e)
                && fusion.fuses(e, c, d)
                && fusion.fuses(b, c, g)
                && fusion.fuses(a, g, d);
            if !admissible {
                return Err(self.err(
                    &place,
                    format!(
                        "{} is not admissible under the fusion rules",
                        self.symbol_name(&l)
                    ),
                ));
            }
            if (a == 0 || b == 0 || c == 0) && !value.is_one() {
                return Err(self.err(
                    &place,
                    format!(
                        "{} has a vacuum leg and must be 1, found {value}",
                        self.symbol_name(&l)
                    ),
                ));
            }
            if given.insert([a, b, c, d, e, g], value).is_some() {
                return Err(self.err(&place, format!("{} is given twice", self.symbol_name(&l))));
            }
        }
        let mut blocks = HashMap::new();
        for (a, b, c, d) in admissible_blocks(fusion) {
            let (rows, cols) = block_labels(fusion, a, b, c, d);
            let mut entries = Vec::with_capacity(rows.len());
            for &e in &rows {
                let mut row = Vec::with_capacity(cols.len());
                for &g in &cols {
                    let value = match given.get(&[a, b, c, d, e, g]) {
                        Some(x) => x.clone(),
                        None if a == 0 || b == 0 || c == 0 => f.one(),
                        None => {
                            return Err(self.err(
                                "F",
                                format!("missing symbol {}", self.symbol_name(&[a, b, c, d, e, g])),
                            ))
                        }
                    };
                    row.push(value);
                }
                entries.push(row);
            }
            let matrix = Matrix::from_rows(entries).expect("rows of one length");
            blocks.insert(key4(r, a, b, c, d), FMatrix::new(rows, cols, matrix, f));
        }
        Ok(blocks)
    }

    fn r_symbols(&self, v: &Value, fusion: &FusionRules) -> Result<HashMap<u64, Cyc>, TheoryError> {
        let r = self.labels.len();
        let mut given = HashMap::new();
        for (l, value, place) in self.tuples(v, "R", 3)? {
            if !fusion.fuses(l[0], l[1], l[2]) {
                return Err(self.err(
                    &place,
                    format!("{} is not admissible: N = 0", self.symbol_name(&l)),
                ));
            }
            if (l[0] == 0 || l[1] == 0) && !value.is_one() {
                return Err(self.err(
                    &place,
                    format!(
                        "{} has a vacuum leg and must be 1, found {value}",
                        self.symbol_name(&l)
                    ),
                ));
            }
            if given.insert(key3(r, l[0], l[1], l[2]), value).is_some() {
                return Err(self.err(&place, format!("{} is given twice", self.symbol_name(&l))));
            }
        }
        for (a, b, c, _) in fusion.triples() {
            let key = key3(r, a, b, c);
            if !given.contains_key(&key) {
                if a == 0 || b == 0 {
                    given.insert(key, self.field.one());
                } else {
                    return Err(self.err(
                        "R",
                        format!("missing symbol {}", self.symbol_name(&[a, b, c])),
                    ));
                }
            }
        }
        Ok(given)
    }

    fn weights(
        &self,
        v: Option<&Value>,
        fusion: &FusionRules,
    ) -> Result<HashMap<u64, Cyc>, TheoryError> {
        let mut out = HashMap::new();
        let Some(v) = v else { return Ok(out) };
        for (l, value, place) in self.tuples(v, "vertex_weights", 3)? {
            if !fusion.fuses(l[0], l[1], l[2]) {
                return Err(self.err(&place, "the vertex is not admissible: N = 0"));
            }
            if value.is_zero() {
                return Err(self.err(&place, "a vertex weight must be non-zero"));
            }
            let key = key3(self.labels.len(), l[0], l[1], l[2]);
            if out.insert(key, value).is_some() {
                return Err(self.err(&place, "the vertex is given twice"));
            }
        }
        Ok(out)
    }

    fn s_matrix(&self, v: &Value) -> Result<Matrix, TheoryError> {
        let r = self.labels.len();
        let rows = self.array(v, "S")?;
        if rows.len() != r {
            return Err(self.err("S", format!("expected {r} rows, found {}", rows.len())));
        }
        let mut m = Matrix::zeros(&self.field, r, r);
        for (i, row) in rows.iter().enumerate() {
            let items = self.array(row, &format!("S[{i}]"))?;
            if items.len() != r {
                return Err(self.err(
                    format!("S[{i}]"),
                    format!("expected {r} entries, found {}", items.len()),
                ));
            }
            for (j, x) in items.iter().enumerate() {
                m.set(i, j, self.number(x, &format!("S[{i}][{j}]"))?);
            }
        }
        Ok(m)
    }
}

fn get<'v>(obj: &'v Map<String, Value>, file: &str, key: &str) -> Result<&'v Value, TheoryError> {
    obj.get(key)
        .ok_or_else(|| refuse(file, key, format!("missing key {key:?}")))
}

/// A theory from parsed JSON; `file` names the source in error messages, `default_name` is
/// used when the data carry no "name".
pub fn theory_from_json(
    value: &Value,
    file: &str,
    default_name: &str,
) -> Result<Theory, TheoryError> {
    let obj = value
        .as_object()
        .ok_or_else(|| refuse(file, "top level", "expected a JSON object"))?;
    for key in obj.keys() {
        if !DATA_KEYS.contains(&key.as_str()) && !INFORMATIONAL_KEYS.contains(&key.as_str()) {
            return Err(refuse(file, key, format!("unknown key {key:?}")));
        }
    }
    if let Some(fmt) = obj.get("format") {
        if fmt.as_str() != Some(FORMAT_NAME) {
            return Err(refuse(
                file,
                "format",
                format!("expected {FORMAT_NAME:?}, found {fmt}"),
            ));
        }
    }
    if let Some(ver) = obj.get("version") {
        if ver.as_u64() != Some(FORMAT_VERSION) {
            return Err(refuse(
                file,
                "version",
                format!("expected {FORMAT_VERSION}, found {ver}"),
            ));
        }
    }
    let name = match obj.get("name") {
        Some(Value::String(s)) => s.clone(),
        Some(other) => {
            return Err(refuse(
                file,
                "name",
                format!("expected a string, found {other}"),
            ))
        }
        None => default_name.to_string(),
    };
    let conductor = get(obj, file, "conductor")?
        .as_u64()
        .and_then(|n| u32::try_from(n).ok())
        .filter(|&n| (1..=MAX_CONDUCTOR).contains(&n))
        .ok_or_else(|| {
            refuse(
                file,
                "conductor",
                format!("expected an integer between 1 and {MAX_CONDUCTOR}"),
            )
        })?;
    let field = CyclotomicField::new(conductor)?;
    let label_values = get(obj, file, "labels")?
        .as_array()
        .ok_or_else(|| refuse(file, "labels", "expected an array of names"))?;
    let mut labels = Vec::new();
    let mut index = HashMap::new();
    for (i, v) in label_values.iter().enumerate() {
        let place = format!("labels[{i}]");
        let name = v
            .as_str()
            .filter(|s| !s.is_empty())
            .ok_or_else(|| refuse(file, &place, "expected a non-empty string"))?;
        if index.insert(name.to_string(), i).is_some() {
            return Err(refuse(
                file,
                &place,
                format!("label {name:?} appears twice"),
            ));
        }
        labels.push(name.to_string());
    }
    if labels.is_empty() {
        return Err(refuse(
            file,
            "labels",
            "at least the vacuum label is needed",
        ));
    }
    let reader = Reader {
        file,
        field,
        labels,
        index,
    };
    let has_f = obj.contains_key("F");
    let has_r = obj.contains_key("R");
    let twists = reader.per_label(get(obj, file, "twists")?, "twists")?;
    let (fusion, dims, structure) = if has_f || has_r {
        let fusion = reader.fusion(get(obj, file, "fusion")?, false)?;
        let dims = reader.per_label(get(obj, file, "dimensions")?, "dimensions")?;
        let f = reader.f_symbols(get(obj, file, "F")?, &fusion)?;
        let r = reader.r_symbols(get(obj, file, "R")?, &fusion)?;
        let weights = reader.weights(obj.get("vertex_weights"), &fusion)?;
        let structure = RawStructure::Braided {
            f: RawF::Stored(f),
            r,
            weights,
        };
        (fusion, dims, structure)
    } else {
        let s = reader.s_matrix(get(obj, file, "S")?)?;
        let fusion = match obj.get("fusion") {
            Some(v) => reader.fusion(v, true)?,
            None => {
                let triples =
                    fusion_from_s(&reader.field, &s).map_err(|reason| refuse(file, "S", reason))?;
                FusionRules::from_triples(reader.labels.len(), triples).map_err(|e| {
                    refuse(
                        file,
                        "S",
                        format!("the Verlinde fusion rules are unusable: {e:?}"),
                    )
                })?
            }
        };
        let s00 = reader
            .field
            .inverse(s.get(0, 0))
            .ok_or_else(|| refuse(file, "S[0][0]", "S_00 must be non-zero"))?;
        let dims = (0..reader.labels.len())
            .map(|a| reader.field.times(s.get(0, a), &s00))
            .collect();
        (fusion, dims, RawStructure::ModularData { s })
    };
    let place = if has_f || has_r {
        "dimensions and twists"
    } else {
        "S and twists"
    };
    let declared_dim = match obj.get("total_dimension") {
        Some(v) if has_f || has_r => Some(reader.number(v, "total_dimension")?),
        _ => None,
    };
    let theory = assemble(RawTheory {
        name,
        field: reader.field,
        labels: reader.labels,
        fusion,
        dims,
        twists,
        structure,
    })
    .map_err(|e| match e {
        TheoryError::NotModular { reason, .. } => {
            refuse(file, place, format!("not modular: {reason}"))
        }
        other => other,
    })?;
    // A braided theory's D is ±√(Σ d²); the positive root unless the file asks for the other
    // (non-unitary minimal models take D = 1/S_00 of Kac's formula, which is negative).
    let declared_dim = match declared_dim {
        Some(d) => Some(theory.field().embed(&d)?),
        None => None,
    };
    match declared_dim {
        None => Ok(theory),
        Some(d) if d == theory.total_dim => Ok(theory),
        Some(d) if d == theory.field().neg(&theory.total_dim) => {
            with_negated_total_dimension(&theory)
        }
        Some(_) => Err(refuse(
            file,
            "total_dimension",
            "must be ±√(Σ_a d_a²) (the sign chooses between the two)",
        )),
    }
}

/// Read a theory file.
pub fn read_theory_file(path: &Path) -> Result<Theory, TheoryError> {
    let file = path.display().to_string();
    // the text, its parsed tree of small strings and the elements made from them
    let size = std::fs::metadata(path).map_or(0, |m| m.len());
    cyclorb_field::check_budget(|| format!("reading {file}"), size.saturating_mul(24))
        .map_err(|e| refuse(&file, "file", e.to_string()))?;
    let text = std::fs::read_to_string(path)
        .map_err(|e| refuse(&file, "file", format!("cannot read: {e}")))?;
    let not_json = |e: serde_json::Error| {
        refuse(
            &file,
            format!("line {} column {}", e.line(), e.column()),
            format!("not valid JSON: {e}"),
        )
    };
    serde_json::from_str::<UniqueKeys>(&text).map_err(not_json)?;
    let value: Value = serde_json::from_str(&text).map_err(not_json)?;
    let stem = path
        .file_stem()
        .map(|s| s.to_string_lossy().to_string())
        .unwrap_or_else(|| file.clone());
    theory_from_json(&value, &file, &stem)
}

fn text(x: &Cyc) -> Value {
    Value::String(x.to_string())
}

fn matrix_json(m: &Matrix) -> Value {
    Value::Array(
        (0..m.rows())
            .map(|i| Value::Array(m.row(i).iter().map(text).collect()))
            .collect(),
    )
}

/// The data keys of the file format (without "name" and the informational keys).
pub(crate) fn data_json(t: &Theory) -> Map<String, Value> {
    let name = |a: usize| Value::String(t.label(a).to_string());
    let mut obj = Map::new();
    obj.insert("conductor".into(), json!(t.conductor()));
    obj.insert("labels".into(), json!(t.labels()));
    let fusion: Vec<Value> = t
        .fusion()
        .triples()
        .filter(|&(a, b, _, _)| a != 0 && b != 0)
        .map(|(a, b, c, m)| {
            let mut row = vec![name(a), name(b), name(c)];
            if m > 1 {
                row.push(json!(m));
            }
            Value::Array(row)
        })
        .collect();
    obj.insert("fusion".into(), Value::Array(fusion));
    let per_label = |xs: &[Cyc]| -> Value {
        Value::Object(
            xs.iter()
                .enumerate()
                .map(|(a, x)| (t.label(a).to_string(), text(x)))
                .collect(),
        )
    };
    obj.insert("dimensions".into(), per_label(t.quantum_dims()));
    obj.insert("twists".into(), per_label(t.twists()));
    if t.has_fr() {
        let mut f = Vec::new();
        for (a, b, c, d) in t.f_block_labels() {
            if a == 0 || b == 0 || c == 0 {
                continue;
            }
            let Some(blk) = t.f_block(a, b, c, d) else {
                continue;
            };
            for (i, &e) in blk.rows.iter().enumerate() {
                for (j, &g) in blk.cols.iter().enumerate() {
                    f.push(json!([
                        name(a),
                        name(b),
                        name(c),
                        name(d),
                        name(e),
                        name(g),
                        text(blk.matrix.get(i, j))
                    ]));
                }
            }
        }
        obj.insert("F".into(), Value::Array(f));
        let mut r = Vec::new();
        let mut weights = Vec::new();
        for (a, b, c, _) in t.fusion().triples() {
            if a != 0 && b != 0 {
                r.push(json!([
                    name(a),
                    name(b),
                    name(c),
                    text(&t.r_symbol(a, b, c))
                ]));
            }
            let w = t.vertex_weight(a, b, c);
            if !w.is_one() {
                weights.push(json!([name(a), name(b), name(c), text(&w)]));
            }
        }
        obj.insert("R".into(), Value::Array(r));
        if !weights.is_empty() {
            obj.insert("vertex_weights".into(), Value::Array(weights));
        }
    } else {
        obj.insert("S".into(), matrix_json(t.s_matrix_ref()));
    }
    obj
}

/// The theory as a file (data keys plus the informational keys), readable by
/// [`theory_from_json`].
pub fn theory_to_json(t: &Theory) -> Value {
    let mut obj = data_json(t);
    obj.insert("format".into(), json!(FORMAT_NAME));
    obj.insert("version".into(), json!(FORMAT_VERSION));
    obj.insert("name".into(), json!(t.name()));
    obj.insert("rank".into(), json!(t.rank()));
    obj.insert(
        "central_charge_mod_8".into(),
        json!(t.central_charge_mod_8().to_string()),
    );
    obj.insert("total_dimension".into(), text(&t.total_dim));
    obj.insert(
        "duals".into(),
        Value::Object(
            (0..t.rank())
                .map(|a| (t.label(a).to_string(), json!(t.label(t.dual(a)))))
                .collect(),
        ),
    );
    if t.has_fr() {
        obj.insert("S".into(), matrix_json(t.s_matrix_ref()));
    }
    obj.insert(
        "T".into(),
        Value::Array(t.twists().iter().map(text).collect()),
    );
    obj.insert("modular_data_only".into(), json!(!t.has_fr()));
    obj.insert("unitary_gauge".into(), json!(t.is_unitary_gauge()));
    obj.insert("data_hash".into(), json!(t.data_hash()));
    Value::Object(obj)
}
