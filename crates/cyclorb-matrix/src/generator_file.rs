//! The generator-set and seed file formats (JSON, version 1), read and written.
//!
//! Generator set (`cyclorb twists --out` writes it, `cyclorb orbit --matrices` reads it):
//!
//! ```json
//! {
//!   "format": "cyclorb-generators",
//!   "version": 1,
//!   "conductor": 16,
//!   "dimension": 3,
//!   "theory": "ising",
//!   "genus": 1,
//!   "basis": ["1", "sigma", "psi"],
//!   "form": null,
//!   "generators": [
//!     {"name": "T", "kind": "diagonal", "diagonal": ["1", "z", "-1"]},
//!     {"name": "S", "kind": "dense", "rows": [
//!       ["1/2", "(z^2 - z^6)/2", "1/2"],
//!       ["(z^2 - z^6)/2", "0", "(-z^2 + z^6)/2"],
//!       ["1/2", "(-z^2 + z^6)/2", "1/2"]]},
//!     {"name": "B", "kind": "block-diagonal", "blocks": [
//!       {"indices": [0, 2], "matrix": [["0", "1"], ["1", "0"]]}]},
//!     {"name": "P", "kind": "sparse-rows", "rows": [[[1, "1"]], [[0, "1"]], [[2, "-1"]]]}
//!   ]
//! }
//! ```
//!
//! Every number is a string in cyclorb's element syntax (`z` = ζ_n, `sqrt(2)`, `zeta(8)`,
//! `i`, rationals, `+ - * / ^`, parentheses); plain JSON integers are accepted too. `theory`,
//! `genus`, `basis` and `form` are optional (`form` null or absent: G = identity; otherwise
//! the diagonal of the invariant Hermitian form). Block-diagonal generators are the identity
//! on coordinates outside their blocks; a sparse-rows generator lists, for each row, its
//! non-zero entries as `[column, value]`. Unknown keys are refused (a misspelt `form` must not
//! pass silently).
//!
//! Seed vector:
//!
//! ```json
//! {"format": "cyclorb-seed", "version": 1, "conductor": 16, "vector": ["1", "0", "0"]}
//! ```
//!
//! or sparse: `"dimension": 3, "entries": [[0, "1"]]` in place of `vector`. Its conductor may
//! divide the generators' conductor (the entries are embedded).
//!
//! Errors name the file, the JSON path of the offending value (`generators[3].rows[7]`) and
//! the reason; reading never panics.

use std::fmt::Write as _;
use std::path::Path;

use std::fmt;

use cyclorb_field::{Cyc, CyclotomicField, UniqueKeys};
use serde_json::{Map, Value};

use crate::generators::GeneratorSet;
use crate::seed::Seed;
use crate::{Block, Matrix, Operator};

/// A generator-set or seed file that cannot be read or written: which file, where in it, and
/// why.
///
/// `place` is a JSON path such as `generators[3].rows[7]`, or `line 4 column 17` for a
/// JSON syntax error, or empty when the problem concerns the whole file (it cannot be read,
/// or it is too large for the memory budget).
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct FormatError {
    /// The file (its path as given, or a description such as `<memory>`).
    pub file: String,
    /// Where in the file.
    pub place: String,
    /// What is wrong there.
    pub reason: String,
}

impl fmt::Display for FormatError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.place.is_empty() {
            write!(f, "{}: {}", self.file, self.reason)
        } else {
            write!(f, "{}: at {}: {}", self.file, self.place, self.reason)
        }
    }
}

impl std::error::Error for FormatError {}

/// The `format` value of a generator-set file.
pub const GENERATORS_FORMAT: &str = "cyclorb-generators";
/// The `format` value of a seed file.
pub const SEED_FORMAT: &str = "cyclorb-seed";
/// The format version this program reads and writes.
pub const FORMAT_VERSION: u64 = 1;

/// Bytes per coordinate that reading and using a file of a given dimension allocates at
/// least (element vectors and the engine's position tables), checked against the memory
/// budget before anything of that length is allocated.
const PER_COORDINATE_BYTES: u64 = 256;

/// Bytes of memory per byte of JSON text while it is read (the text, its parsed tree of
/// small strings, and the field elements made from them), checked against the budget from
/// the file's size before it is read.
const PER_TEXT_BYTE: u64 = 24;

/// Reading context: the file name for messages and the field once it is known.
struct Reader<'a> {
    file: &'a str,
}

type Obj = Map<String, Value>;

impl Reader<'_> {
    fn err(&self, place: &str, reason: impl Into<String>) -> FormatError {
        FormatError {
            file: self.file.to_string(),
            place: place.to_string(),
            reason: reason.into(),
        }
    }

    /// The JSON value of `text`; an object with a repeated key is refused.
    fn parse_json(&self, text: &str) -> Result<Value, FormatError> {
        let not_json = |e: serde_json::Error| {
            self.err(
                &format!("line {} column {}", e.line(), e.column()),
                format!("not valid JSON: {e}"),
            )
        };
        serde_json::from_str::<UniqueKeys>(text).map_err(not_json)?;
        serde_json::from_str(text).map_err(not_json)
    }

    fn object<'v>(&self, v: &'v Value, place: &str) -> Result<&'v Obj, FormatError> {
        v.as_object()
            .ok_or_else(|| self.err(place, format!("expected an object, found {}", kind(v))))
    }

    fn array<'v>(&self, v: &'v Value, place: &str) -> Result<&'v [Value], FormatError> {
        v.as_array()
            .map(Vec::as_slice)
            .ok_or_else(|| self.err(place, format!("expected an array, found {}", kind(v))))
    }

    fn required<'v>(&self, o: &'v Obj, key: &str, place: &str) -> Result<&'v Value, FormatError> {
        o.get(key)
            .ok_or_else(|| self.err(place, format!("missing key \"{key}\"")))
    }

    fn only_keys(&self, o: &Obj, allowed: &[&str], place: &str) -> Result<(), FormatError> {
        match o.keys().find(|k| !allowed.contains(&k.as_str())) {
            Some(k) => Err(self.err(
                &join(place, k),
                format!("unknown key (known here: {})", allowed.join(", ")),
            )),
            None => Ok(()),
        }
    }

    fn unsigned(&self, v: &Value, place: &str) -> Result<u64, FormatError> {
        v.as_u64().ok_or_else(|| {
            self.err(
                place,
                format!("expected a non-negative integer, found {}", kind(v)),
            )
        })
    }

    fn index(&self, v: &Value, dim: usize, place: &str) -> Result<usize, FormatError> {
        let i = self.unsigned(v, place)?;
        if i as usize >= dim || i > u32::MAX as u64 {
            return Err(self.err(place, format!("index {i} out of range 0..{dim}")));
        }
        Ok(i as usize)
    }

    fn string<'v>(&self, v: &'v Value, place: &str) -> Result<&'v str, FormatError> {
        v.as_str()
            .ok_or_else(|| self.err(place, format!("expected a string, found {}", kind(v))))
    }

    fn element(&self, field: &CyclotomicField, v: &Value, place: &str) -> Result<Cyc, FormatError> {
        let text = match v {
            Value::String(s) => s.clone(),
            Value::Number(n) if n.is_i64() || n.is_u64() => n.to_string(),
            other => {
                return Err(self.err(
                    place,
                    format!("expected an element as a string, found {}", kind(other)),
                ))
            }
        };
        field
            .parse(&text)
            .map_err(|e| self.err(place, e.to_string()))
    }

    fn elements(
        &self,
        field: &CyclotomicField,
        v: &Value,
        len: usize,
        place: &str,
    ) -> Result<Vec<Cyc>, FormatError> {
        let items = self.array(v, place)?;
        if items.len() != len {
            return Err(self.err(
                place,
                format!("expected {len} entries, found {}", items.len()),
            ));
        }
        items
            .iter()
            .enumerate()
            .map(|(i, x)| self.element(field, x, &format!("{place}[{i}]")))
            .collect()
    }

    fn square(
        &self,
        field: &CyclotomicField,
        v: &Value,
        size: usize,
        place: &str,
    ) -> Result<Matrix, FormatError> {
        let rows = self.array(v, place)?;
        if rows.len() != size {
            return Err(self.err(place, format!("expected {size} rows, found {}", rows.len())));
        }
        let rows = rows
            .iter()
            .enumerate()
            .map(|(i, r)| self.elements(field, r, size, &format!("{place}[{i}]")))
            .collect::<Result<Vec<_>, _>>()?;
        Matrix::from_rows(rows).map_err(|e| self.err(place, e.to_string()))
    }

    fn header(&self, o: &Obj, format: &str) -> Result<CyclotomicField, FormatError> {
        let f = self.string(self.required(o, "format", "")?, "format")?;
        if f != format {
            return Err(self.err("format", format!("expected \"{format}\", found \"{f}\"")));
        }
        let version = self.unsigned(self.required(o, "version", "")?, "version")?;
        if version != FORMAT_VERSION {
            return Err(self.err(
                "version",
                format!(
                    "unsupported version {version} (this program reads version {FORMAT_VERSION})"
                ),
            ));
        }
        let n = self.unsigned(self.required(o, "conductor", "")?, "conductor")?;
        let n = u32::try_from(n).map_err(|_| self.err("conductor", "too large"))?;
        CyclotomicField::new(n).map_err(|e| self.err("conductor", e.to_string()))
    }

    fn dimension(&self, o: &Obj) -> Result<usize, FormatError> {
        let d = self.unsigned(self.required(o, "dimension", "")?, "dimension")?;
        if d == 0 || d > u32::MAX as u64 {
            return Err(self.err("dimension", format!("dimension {d} is not usable")));
        }
        // a few vectors of this length and the engine's per-coordinate tables
        cyclorb_field::check_budget(
            || format!("dimension {d}"),
            d.saturating_mul(PER_COORDINATE_BYTES),
        )
        .map_err(|e| self.err("dimension", e.to_string()))?;
        Ok(d as usize)
    }

    fn generator_set(&self, text: &str) -> Result<GeneratorSet, FormatError> {
        let root = self.parse_json(text)?;
        let o = self.object(&root, "")?;
        self.only_keys(
            o,
            &[
                "format",
                "version",
                "conductor",
                "dimension",
                "theory",
                "genus",
                "basis",
                "form",
                "generators",
            ],
            "",
        )?;
        let field = self.header(o, GENERATORS_FORMAT)?;
        let dimension = self.dimension(o)?;
        let theory = match o.get("theory") {
            None | Some(Value::Null) => None,
            Some(v) => Some(self.string(v, "theory")?.to_string()),
        };
        let genus = match o.get("genus") {
            None | Some(Value::Null) => None,
            Some(v) => Some(
                u32::try_from(self.unsigned(v, "genus")?)
                    .map_err(|_| self.err("genus", "too large"))?,
            ),
        };
        let basis_labels = match o.get("basis") {
            None | Some(Value::Null) => Vec::new(),
            Some(v) => {
                let items = self.array(v, "basis")?;
                if items.len() != dimension {
                    return Err(self.err(
                        "basis",
                        format!("{} labels for dimension {dimension}", items.len()),
                    ));
                }
                items
                    .iter()
                    .enumerate()
                    .map(|(i, x)| Ok(self.string(x, &format!("basis[{i}]"))?.to_string()))
                    .collect::<Result<_, FormatError>>()?
            }
        };
        let form = match o.get("form") {
            None | Some(Value::Null) => None,
            Some(v) => {
                let g = self.elements(&field, v, dimension, "form")?;
                if let Some(i) = g.iter().position(Cyc::is_zero) {
                    return Err(self.err(&format!("form[{i}]"), "a form entry is zero"));
                }
                Some(g)
            }
        };
        let list = self.array(self.required(o, "generators", "")?, "generators")?;
        if list.is_empty() {
            return Err(self.err("generators", "no generators"));
        }
        let mut generators: Vec<(String, Operator)> = Vec::with_capacity(list.len());
        for (g, item) in list.iter().enumerate() {
            let place = format!("generators[{g}]");
            let (name, op) = self.operator(&field, item, dimension, &place)?;
            if generators.iter().any(|(n, _)| *n == name) {
                return Err(self.err(&join(&place, "name"), format!("repeated name \"{name}\"")));
            }
            generators.push((name, op));
        }
        let set = GeneratorSet::new(field, generators)
            .map_err(|e| self.err("generators", e.to_string()))?
            .with_form(form)
            .map_err(|e| self.err("form", e.to_string()))?
            .with_basis_labels(basis_labels)
            .map_err(|e| self.err("basis", e.to_string()))?;
        Ok(set.with_origin(theory, genus))
    }

    fn operator(
        &self,
        field: &CyclotomicField,
        v: &Value,
        dim: usize,
        place: &str,
    ) -> Result<(String, Operator), FormatError> {
        let o = self.object(v, place)?;
        let name = self.string(self.required(o, "name", place)?, &join(place, "name"))?;
        if name.is_empty() {
            return Err(self.err(&join(place, "name"), "empty name"));
        }
        let kind_place = join(place, "kind");
        let op = match self.string(self.required(o, "kind", place)?, &kind_place)? {
            "diagonal" => {
                self.only_keys(o, &["name", "kind", "diagonal"], place)?;
                let p = join(place, "diagonal");
                Operator::Diagonal(self.elements(field, self.required(o, "diagonal", place)?, dim, &p)?)
            }
            "dense" => {
                self.only_keys(o, &["name", "kind", "rows"], place)?;
                let p = join(place, "rows");
                Operator::Dense(self.square(field, self.required(o, "rows", place)?, dim, &p)?)
            }
            "block-diagonal" => {
                self.only_keys(o, &["name", "kind", "blocks"], place)?;
                self.blocks(field, o, dim, place)?
            }
            "sparse-rows" => {
                self.only_keys(o, &["name", "kind", "rows"], place)?;
                self.sparse_rows(field, o, dim, place)?
            }
            other => {
                return Err(self.err(
                    &kind_place,
                    format!(
                        "unknown kind \"{other}\" (known: diagonal, dense, block-diagonal, sparse-rows)"
                    ),
                ))
            }
        };
        Ok((name.to_string(), op))
    }

    fn blocks(
        &self,
        field: &CyclotomicField,
        o: &Obj,
        dim: usize,
        place: &str,
    ) -> Result<Operator, FormatError> {
        let p = join(place, "blocks");
        let mut seen = vec![false; dim];
        let mut blocks = Vec::new();
        for (b, item) in self
            .array(self.required(o, "blocks", place)?, &p)?
            .iter()
            .enumerate()
        {
            let bp = format!("{p}[{b}]");
            let bo = self.object(item, &bp)?;
            self.only_keys(bo, &["indices", "matrix"], &bp)?;
            let ip = join(&bp, "indices");
            let indices = self
                .array(self.required(bo, "indices", &bp)?, &ip)?
                .iter()
                .enumerate()
                .map(|(k, x)| {
                    let kp = format!("{ip}[{k}]");
                    let i = self.index(x, dim, &kp)?;
                    if std::mem::replace(&mut seen[i], true) {
                        return Err(self.err(&kp, format!("coordinate {i} is in two blocks")));
                    }
                    Ok(i)
                })
                .collect::<Result<Vec<_>, _>>()?;
            let matrix = self.square(
                field,
                self.required(bo, "matrix", &bp)?,
                indices.len(),
                &join(&bp, "matrix"),
            )?;
            blocks.push(Block { indices, matrix });
        }
        Ok(Operator::BlockDiagonal { dim, blocks })
    }

    fn sparse_rows(
        &self,
        field: &CyclotomicField,
        o: &Obj,
        dim: usize,
        place: &str,
    ) -> Result<Operator, FormatError> {
        let p = join(place, "rows");
        let rows = self.array(self.required(o, "rows", place)?, &p)?;
        if rows.len() != dim {
            return Err(self.err(&p, format!("expected {dim} rows, found {}", rows.len())));
        }
        let mut out = Vec::with_capacity(dim);
        for (r, row) in rows.iter().enumerate() {
            let rp = format!("{p}[{r}]");
            let mut entries: Vec<(usize, Cyc)> = Vec::new();
            for (e, entry) in self.array(row, &rp)?.iter().enumerate() {
                let ep = format!("{rp}[{e}]");
                let pair = self.array(entry, &ep)?;
                if pair.len() != 2 {
                    return Err(self.err(&ep, "expected [column, value]"));
                }
                let j = self.index(&pair[0], dim, &format!("{ep}[0]"))?;
                if entries.iter().any(|(c, _)| *c == j) {
                    return Err(self.err(&ep, format!("column {j} appears twice in this row")));
                }
                entries.push((j, self.element(field, &pair[1], &format!("{ep}[1]"))?));
            }
            out.push(entries);
        }
        Ok(Operator::SparseRows { dim, rows: out })
    }

    fn seed(&self, text: &str) -> Result<Seed, FormatError> {
        let root = self.parse_json(text)?;
        let o = self.object(&root, "")?;
        self.only_keys(
            o,
            &[
                "format",
                "version",
                "conductor",
                "dimension",
                "vector",
                "entries",
            ],
            "",
        )?;
        let field = self.header(o, SEED_FORMAT)?;
        let vector = match (o.get("vector"), o.get("entries")) {
            (Some(v), None) => {
                let len = self.array(v, "vector")?.len();
                if let Some(d) = o.get("dimension") {
                    if self.unsigned(d, "dimension")? != len as u64 {
                        return Err(self.err("dimension", format!("vector has {len} entries")));
                    }
                }
                self.elements(&field, v, len, "vector")?
            }
            (None, Some(v)) => {
                let dim = self.dimension(o)?;
                let mut vector = vec![field.zero(); dim];
                let mut seen = vec![false; dim];
                for (e, entry) in self.array(v, "entries")?.iter().enumerate() {
                    let ep = format!("entries[{e}]");
                    let pair = self.array(entry, &ep)?;
                    if pair.len() != 2 {
                        return Err(self.err(&ep, "expected [index, value]"));
                    }
                    let i = self.index(&pair[0], dim, &format!("{ep}[0]"))?;
                    if std::mem::replace(&mut seen[i], true) {
                        return Err(self.err(&ep, format!("index {i} appears twice")));
                    }
                    vector[i] = self.element(&field, &pair[1], &format!("{ep}[1]"))?;
                }
                vector
            }
            _ => {
                return Err(self.err("", "expected exactly one of \"vector\" and \"entries\""));
            }
        };
        if vector.is_empty() {
            return Err(self.err("vector", "empty vector"));
        }
        Ok(Seed {
            conductor: field.conductor(),
            vector,
        })
    }
}

fn join(place: &str, key: &str) -> String {
    if place.is_empty() {
        key.to_string()
    } else {
        format!("{place}.{key}")
    }
}

fn kind(v: &Value) -> &'static str {
    match v {
        Value::Null => "null",
        Value::Bool(_) => "a boolean",
        Value::Number(_) => "a number",
        Value::String(_) => "a string",
        Value::Array(_) => "an array",
        Value::Object(_) => "an object",
    }
}

/// Read a file and parse it with `parse(text, file name)`.
fn read_file<T>(
    path: &Path,
    parse: fn(&str, &str) -> Result<T, FormatError>,
) -> Result<T, FormatError> {
    let whole_file = |reason: String| FormatError {
        file: path.display().to_string(),
        place: String::new(),
        reason,
    };
    let size = std::fs::metadata(path).map_or(0, |m| m.len());
    cyclorb_field::check_budget(
        || format!("reading {}", path.display()),
        size.saturating_mul(PER_TEXT_BYTE),
    )
    .map_err(|e| whole_file(e.to_string()))?;
    let text = std::fs::read_to_string(path).map_err(|e| whole_file(e.to_string()))?;
    parse(&text, &path.display().to_string())
}

fn write_text(path: &Path, text: &str) -> Result<(), FormatError> {
    std::fs::write(path, text).map_err(|e| FormatError {
        file: path.display().to_string(),
        place: String::new(),
        reason: e.to_string(),
    })
}

/// A JSON string literal.
fn quoted(s: &str) -> String {
    serde_json::to_string(s).expect("a string serialises")
}

fn element_list(items: &[Cyc]) -> String {
    let parts: Vec<String> = items.iter().map(|x| quoted(&x.to_string())).collect();
    format!("[{}]", parts.join(", "))
}

fn matrix_rows(m: &Matrix, indent: &str) -> String {
    let rows: Vec<String> = (0..m.rows())
        .map(|i| format!("{indent}{}", element_list(m.row(i))))
        .collect();
    format!("[\n{}]", rows.join(",\n"))
}

/// The JSON text of one named generator, as the generator-set file writes it (also what
/// content hashes of a set are taken over).
pub fn operator_json(name: &str, op: &Operator) -> String {
    let head = format!("{{\"name\": {}, ", quoted(name));
    match op {
        Operator::Diagonal(d) => format!(
            "{head}\"kind\": \"diagonal\", \"diagonal\": {}}}",
            element_list(d)
        ),
        Operator::Dense(m) => format!(
            "{head}\"kind\": \"dense\", \"rows\": {}}}",
            matrix_rows(m, "      ")
        ),
        Operator::BlockDiagonal { blocks, .. } => {
            let parts: Vec<String> = blocks
                .iter()
                .map(|b| {
                    let idx: Vec<String> = b.indices.iter().map(usize::to_string).collect();
                    format!(
                        "      {{\"indices\": [{}], \"matrix\": {}}}",
                        idx.join(", "),
                        matrix_rows(&b.matrix, "        ")
                    )
                })
                .collect();
            format!(
                "{head}\"kind\": \"block-diagonal\", \"blocks\": [\n{}]}}",
                parts.join(",\n")
            )
        }
        Operator::SparseRows { rows, .. } => {
            let parts: Vec<String> = rows
                .iter()
                .map(|row| {
                    let entries: Vec<String> = row
                        .iter()
                        .map(|(j, x)| format!("[{j}, {}]", quoted(&x.to_string())))
                        .collect();
                    format!("      [{}]", entries.join(", "))
                })
                .collect();
            format!(
                "{head}\"kind\": \"sparse-rows\", \"rows\": [\n{}]}}",
                parts.join(",\n")
            )
        }
    }
}

impl GeneratorSet {
    /// Read a generator set from JSON text; `file` names the source in error messages.
    pub fn from_json(text: &str, file: &str) -> Result<GeneratorSet, FormatError> {
        Reader { file }.generator_set(text)
    }

    /// Read a generator-set file.
    pub fn read(path: &Path) -> Result<GeneratorSet, FormatError> {
        read_file(path, GeneratorSet::from_json)
    }

    /// The JSON text of the set (format version 1, deterministic).
    pub fn to_json(&self) -> String {
        let mut s = String::new();
        let _ = writeln!(s, "{{");
        let _ = writeln!(s, "  \"format\": {},", quoted(GENERATORS_FORMAT));
        let _ = writeln!(s, "  \"version\": {FORMAT_VERSION},");
        let _ = writeln!(s, "  \"conductor\": {},", self.conductor());
        let _ = writeln!(s, "  \"dimension\": {},", self.dimension());
        if let Some(t) = self.theory() {
            let _ = writeln!(s, "  \"theory\": {},", quoted(t));
        }
        if let Some(g) = self.genus() {
            let _ = writeln!(s, "  \"genus\": {g},");
        }
        if !self.basis_labels().is_empty() {
            let labels: Vec<String> = self.basis_labels().iter().map(|l| quoted(l)).collect();
            let _ = writeln!(s, "  \"basis\": [{}],", labels.join(", "));
        }
        match self.form() {
            Some(g) => {
                let _ = writeln!(s, "  \"form\": {},", element_list(g));
            }
            None => {
                let _ = writeln!(s, "  \"form\": null,");
            }
        }
        let ops: Vec<String> = self
            .names()
            .iter()
            .zip(self.operators())
            .map(|(n, op)| format!("    {}", operator_json(n, op)))
            .collect();
        let _ = writeln!(s, "  \"generators\": [\n{}\n  ]", ops.join(",\n"));
        s.push_str("}\n");
        s
    }

    /// Write the set to a file.
    pub fn write(&self, path: &Path) -> Result<(), FormatError> {
        write_text(path, &self.to_json())
    }
}

impl Seed {
    /// Read a seed from JSON text; `file` names the source in error messages.
    pub fn from_json(text: &str, file: &str) -> Result<Seed, FormatError> {
        Reader { file }.seed(text)
    }

    /// Read a seed file.
    pub fn read(path: &Path) -> Result<Seed, FormatError> {
        read_file(path, Seed::from_json)
    }

    /// The JSON text of the seed (dense `vector`).
    pub fn to_json(&self) -> String {
        format!(
            "{{\"format\": {}, \"version\": {FORMAT_VERSION}, \"conductor\": {}, \"vector\": {}}}\n",
            quoted(SEED_FORMAT),
            self.conductor,
            element_list(&self.vector)
        )
    }

    /// Write the seed to a file.
    pub fn write(&self, path: &Path) -> Result<(), FormatError> {
        write_text(path, &self.to_json())
    }
}
