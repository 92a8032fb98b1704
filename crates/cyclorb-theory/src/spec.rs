//! Theory specs: built-in names, products, Galois conjugates and file paths.
//!
//! Grammar (whitespace ignored around operators):
//! ```text
//! spec   := factor ('*' factor)*
//! factor := 'conj(' spec ')' | 'galois:' INT '(' spec ')' | 'gauge:' INT '(' spec ')'
//!         | '(' spec ')' | atom
//! atom   := a built-in name (ising, ising:NU, fibonacci, tricritical-ising, su2:K, so3:K,
//!           zn:N:P, minimal:P:Q, kac:P:Q) | a path to a theory file
//! ```
//! A spec that names an existing file as a whole is read as that file first.
//! Nesting deeper than [`MAX_SPEC_DEPTH`] is refused; `gauge:SEED` takes a non-negative
//! seed; negative levels and parameters are refused quoting the spec as written.
//! [`parse_spec_traced`] also returns every theory read from a file, so that a caller can
//! prove file data before using them.

use std::path::{Path, PathBuf};

use crate::builtins::{
    fibonacci, ising_type, minimal, minimal_modular_data, so3, su2, tricritical_ising, zn,
};
use crate::error::TheoryError;
use crate::file::read_theory_file;
use crate::ops::{galois, product, random_gauge};
use crate::theory::Theory;

/// Deepest nesting of `conj(…)`, `galois:K(…)`, `gauge:SEED(…)` and parentheses accepted.
pub const MAX_SPEC_DEPTH: usize = 64;

/// A theory read from a file while a spec was parsed.
#[derive(Clone, Debug)]
pub struct FileTheory {
    /// The path as written in the spec.
    pub path: PathBuf,
    /// The theory the file holds.
    pub theory: Theory,
}

/// A parsed spec: the theory, and every file theory it was built from (in reading order).
#[derive(Clone, Debug)]
pub struct TracedSpec {
    /// The theory the spec names.
    pub theory: Theory,
    /// The theories read from files (empty for built-ins and anything derived from them).
    pub files: Vec<FileTheory>,
}

struct Parser<'a> {
    spec: &'a str,
    pos: usize,
    depth: usize,
    files: Vec<FileTheory>,
}

impl<'a> Parser<'a> {
    fn err(&self, reason: impl Into<String>) -> TheoryError {
        TheoryError::Spec {
            spec: self.spec.to_string(),
            reason: format!("{} (at byte {})", reason.into(), self.pos),
        }
    }

    fn rest(&self) -> &'a str {
        &self.spec[self.pos..]
    }

    fn skip_ws(&mut self) {
        let trimmed = self.rest().trim_start();
        self.pos = self.spec.len() - trimmed.len();
    }

    fn eat(&mut self, token: &str) -> bool {
        self.skip_ws();
        if self.rest().starts_with(token) {
            self.pos += token.len();
            true
        } else {
            false
        }
    }

    fn spec(&mut self) -> Result<Theory, TheoryError> {
        let mut acc = self.factor()?;
        while self.eat("*") {
            let next = self.factor()?;
            acc = product(&acc, &next)?;
        }
        Ok(acc)
    }

    fn factor(&mut self) -> Result<Theory, TheoryError> {
        self.depth += 1;
        if self.depth > MAX_SPEC_DEPTH {
            return Err(self.err(format!("nesting deeper than {MAX_SPEC_DEPTH} levels")));
        }
        let theory = self.nested_factor();
        self.depth -= 1;
        theory
    }

    fn nested_factor(&mut self) -> Result<Theory, TheoryError> {
        if self.eat("conj(") {
            let inner = self.spec()?;
            self.close()?;
            return galois(&inner, -1);
        }
        if self.eat("galois:") {
            let k = self.integer()?;
            if !self.eat("(") {
                return Err(self.err("expected '(' after galois:K"));
            }
            let inner = self.spec()?;
            self.close()?;
            return galois(&inner, k);
        }
        if self.eat("gauge:") {
            let seed = self.integer()?;
            let seed = u64::try_from(seed)
                .map_err(|_| self.err(format!("gauge seed {seed} must be non-negative")))?;
            if !self.eat("(") {
                return Err(self.err("expected '(' after gauge:SEED"));
            }
            let inner = self.spec()?;
            self.close()?;
            return random_gauge(&inner, seed);
        }
        if self.eat("(") {
            let inner = self.spec()?;
            self.close()?;
            return Ok(inner);
        }
        self.atom()
    }

    fn close(&mut self) -> Result<(), TheoryError> {
        if self.eat(")") {
            Ok(())
        } else {
            Err(self.err("expected ')'"))
        }
    }

    fn integer(&mut self) -> Result<i64, TheoryError> {
        self.skip_ws();
        let text: String = self
            .rest()
            .chars()
            .enumerate()
            .take_while(|&(i, c)| c.is_ascii_digit() || (i == 0 && c == '-'))
            .map(|(_, c)| c)
            .collect();
        let value = text.parse().map_err(|_| self.err("expected an integer"))?;
        self.pos += text.len();
        Ok(value)
    }

    fn atom(&mut self) -> Result<Theory, TheoryError> {
        self.skip_ws();
        let word: String = self
            .rest()
            .chars()
            .take_while(|c| !matches!(c, '*' | '(' | ')') && !c.is_whitespace())
            .collect();
        if word.is_empty() {
            return Err(self.err("expected a theory name"));
        }
        self.pos += word.len();
        builtin(&word).unwrap_or_else(|| {
            if Path::new(&word).exists() || word.ends_with(".json") || word.contains('/') {
                let theory = read_theory_file(Path::new(&word))?;
                self.files.push(FileTheory {
                    path: PathBuf::from(&word),
                    theory: theory.clone(),
                });
                Ok(theory)
            } else {
                Err(TheoryError::Spec {
                    spec: word.clone(),
                    reason: "unknown theory (see `cyclorb theories` for the built-in names)".into(),
                })
            }
        })
    }
}

fn parameters(word: &str, prefix: &str, count: usize) -> Option<Result<Vec<i64>, TheoryError>> {
    let rest = word.strip_prefix(prefix)?;
    let parts: Vec<&str> = rest.split(':').collect();
    let parsed: Option<Vec<i64>> = parts.iter().map(|p| p.parse().ok()).collect();
    Some(match parsed {
        Some(v) if v.len() == count => Ok(v),
        _ => Err(TheoryError::Spec {
            spec: word.to_string(),
            reason: format!("expected {count} integer parameter(s) after '{prefix}'"),
        }),
    })
}

/// A built-in theory by name, `None` when the word names no built-in.
fn builtin(word: &str) -> Option<Result<Theory, TheoryError>> {
    match word {
        "ising" => return Some(ising_type(1)),
        "fibonacci" => return Some(fibonacci()),
        "tricritical-ising" => return Some(tricritical_ising()),
        _ => {}
    }
    let level = |v: i64| {
        u32::try_from(v).map_err(|_| TheoryError::Spec {
            spec: word.to_string(),
            reason: format!("the level {v} must be a non-negative integer"),
        })
    };
    if let Some(p) = parameters(word, "ising:", 1) {
        return Some(p.and_then(|v| ising_type(v[0])));
    }
    if let Some(p) = parameters(word, "su2:", 1) {
        return Some(p.and_then(|v| su2(level(v[0])?)));
    }
    if let Some(p) = parameters(word, "so3:", 1) {
        return Some(p.and_then(|v| so3(level(v[0])?)));
    }
    if let Some(p) = parameters(word, "zn:", 2) {
        return Some(p.and_then(|v| zn(v[0], v[1])));
    }
    if let Some(p) = parameters(word, "minimal:", 2) {
        return Some(p.and_then(|v| minimal(v[0], v[1])));
    }
    if let Some(p) = parameters(word, "kac:", 2) {
        return Some(p.and_then(|v| minimal_modular_data(v[0], v[1])));
    }
    None
}

/// A theory from a spec: a built-in, a product `A*B`, a conjugate `conj(A)` or
/// `galois:K(A)`, or a path to a theory file.
pub fn parse_spec(spec: &str) -> Result<Theory, TheoryError> {
    parse_spec_traced(spec).map(|t| t.theory)
}

/// [`parse_spec`], also returning every theory read from a file on the way.
pub fn parse_spec_traced(spec: &str) -> Result<TracedSpec, TheoryError> {
    let trimmed = spec.trim();
    if Path::new(trimmed).is_file() {
        let theory = read_theory_file(Path::new(trimmed))?;
        return Ok(TracedSpec {
            files: vec![FileTheory {
                path: PathBuf::from(trimmed),
                theory: theory.clone(),
            }],
            theory,
        });
    }
    let mut p = Parser {
        spec: trimmed,
        pos: 0,
        depth: 0,
        files: Vec::new(),
    };
    let theory = p.spec()?;
    p.skip_ws();
    if p.pos != trimmed.len() {
        return Err(p.err("unexpected text after the spec"));
    }
    Ok(TracedSpec {
        theory,
        files: p.files,
    })
}
