//! The plan file: TOML read with spans, so every refusal names the line and the reason.
//!
//! The format is documented (with an example) in the doc comment of [`super`]; this
//! module turns the text into a [`Plan`] of checked values. Type errors and unknown keys
//! come from the TOML reader with their span; the checks after it (genus ≥ 1, known
//! answers and generating set, non-zero limits, exactly one of `spec` / `file`) carry the
//! span of the offending value.

use std::ops::Range;
use std::path::{Path, PathBuf};

use cyclorb_mcg::GeneratingSet;
use serde::Deserialize;
use toml::Spanned;

use crate::method::OrbitMethod;
use crate::runtime::MAX_THREADS;
use crate::space::parse_set;

/// The answers a run can compute.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash, Deserialize)]
#[serde(rename_all = "lowercase")]
pub enum Answer {
    /// The orbit of the vacuum line and its Poincaré sum.
    Orbit,
    /// The certified dimension of the commutant.
    Commutant,
    /// The order of the projective image (needs the orbit).
    Image,
    /// A word of infinite projective order, certified.
    Witness,
}

impl Answer {
    /// The name used in plans and reports.
    pub fn name(self) -> &'static str {
        match self {
            Answer::Orbit => "orbit",
            Answer::Commutant => "commutant",
            Answer::Image => "image",
            Answer::Witness => "witness",
        }
    }
}

/// Caps of one run; `None` means no cap.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct Limits {
    /// Stop the orbit after this many lines.
    pub lines: Option<usize>,
    /// Stop the orbit once its store holds this many MiB.
    pub memory_mib: Option<usize>,
    /// Stop the orbit after this many seconds of enumeration (summed over resumed attempts).
    pub seconds: Option<u64>,
}

/// Bounds of the witness search (see `cyclorb_cert::WitnessOptions`).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct WitnessBounds {
    /// Every Lyndon word up to this length.
    pub depth: usize,
    /// Then this many seeded random words.
    pub tries: usize,
}

/// Bounds of the image-order certificates.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct ImageBounds {
    /// Largest saturated orbit whose permutation action is ordered by Schreier–Sims.
    pub max_lines: usize,
    /// Largest image enumerated element by element when that route is not available.
    pub enumeration_cap: usize,
}

/// Where a theory comes from.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Source {
    /// A built-in spec (`ising`, `su2:3`, `ising*fibonacci`, …).
    Spec(String),
    /// A theory file, resolved against the plan's folder.
    File(PathBuf),
}

impl Source {
    /// The text handed to `parse_spec`.
    pub fn spec_text(&self) -> String {
        match self {
            Source::Spec(s) => s.clone(),
            Source::File(p) => p.display().to_string(),
        }
    }
}

/// One `[[theory]]` entry after the checks.
#[derive(Debug, Clone)]
pub struct Entry {
    /// Position in the plan (1-based, for messages).
    pub number: usize,
    /// The theory.
    pub source: Source,
    /// Short name for ids and reports (the `label` key, else the spec or the file stem).
    pub label: String,
    /// The genera, in the order given.
    pub genera: Vec<usize>,
    /// What to compute, sorted.
    pub answers: Vec<Answer>,
    /// The generating set of Dehn twists.
    pub set: GeneratingSet,
    /// How the orbit is found.
    pub method: OrbitMethod,
    /// Caps of each run of this entry.
    pub limits: Limits,
    /// Where the entry's theory is named (for refusals found later).
    pub location: Location,
}

/// A line and column of the plan (1-based) with the text of that line.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Location {
    /// 1-based line.
    pub line: usize,
    /// 1-based column (in characters).
    pub column: usize,
    /// The whole line, for quoting.
    pub text: String,
}

impl Location {
    /// The location of byte `offset` of `source`; an offset in trailing blank space (an
    /// error at the end of the file) moves back to the end of the last non-blank line.
    pub fn of(source: &str, offset: usize) -> Location {
        let offset = offset.min(source.trim_end().len());
        let before = &source[..offset];
        let line_start = before.rfind('\n').map_or(0, |i| i + 1);
        let line_end = source[offset..]
            .find('\n')
            .map_or(source.len(), |i| offset + i);
        Location {
            line: before.matches('\n').count() + 1,
            column: source[line_start..offset].chars().count() + 1,
            text: source[line_start..line_end]
                .trim_end_matches('\r')
                .to_string(),
        }
    }
}

/// A refusal of the plan: where and why.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct PlanError {
    /// The plan file.
    pub path: PathBuf,
    /// Where, when known.
    pub location: Option<Location>,
    /// Why.
    pub reason: String,
}

impl PlanError {
    /// A refusal at a span of the plan's text.
    pub fn at(path: &Path, source: &str, span: Range<usize>, reason: impl Into<String>) -> Self {
        PlanError {
            path: path.to_path_buf(),
            location: Some(Location::of(source, span.start)),
            reason: reason.into(),
        }
    }

    /// A refusal at a known location.
    pub fn located(path: &Path, location: &Location, reason: impl Into<String>) -> Self {
        PlanError {
            path: path.to_path_buf(),
            location: Some(location.clone()),
            reason: reason.into(),
        }
    }
}

impl std::fmt::Display for PlanError {
    /// `PLAN:LINE:COLUMN: reason`, then the line quoted.
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match &self.location {
            Some(l) => write!(
                f,
                "{}:{}:{}: {}\n{:>5} | {}",
                self.path.display(),
                l.line,
                l.column,
                self.reason,
                l.line,
                l.text
            ),
            None => write!(f, "{}: {}", self.path.display(), self.reason),
        }
    }
}

/// The whole plan after the checks.
#[derive(Debug, Clone)]
pub struct Plan {
    /// The plan file.
    pub path: PathBuf,
    /// Its text (hashed into the plan hash, quoted in refusals).
    pub source: String,
    /// The `name` key, else the file stem.
    pub name: String,
    /// Worker threads (`None`: every core).
    pub threads: Option<usize>,
    /// Seconds between periodic checkpoints of a running orbit.
    pub checkpoint_seconds: u64,
    /// Witness search bounds.
    pub witness: WitnessBounds,
    /// Image certificate bounds.
    pub image: ImageBounds,
    /// The theory entries, in plan order.
    pub entries: Vec<Entry>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawLimits {
    lines: Option<Spanned<usize>>,
    memory_mib: Option<Spanned<usize>>,
    seconds: Option<Spanned<u64>>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawWitness {
    depth: Option<usize>,
    tries: Option<usize>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawImage {
    max_lines: Option<usize>,
    enumeration_cap: Option<usize>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawEntry {
    spec: Option<Spanned<String>>,
    file: Option<Spanned<String>>,
    label: Option<Spanned<String>>,
    genera: Spanned<Vec<Spanned<usize>>>,
    answers: Option<Spanned<Vec<Answer>>>,
    set: Option<Spanned<String>>,
    method: Option<OrbitMethod>,
    limits: Option<RawLimits>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
struct RawPlan {
    name: Option<String>,
    threads: Option<Spanned<usize>>,
    checkpoint_seconds: Option<Spanned<u64>>,
    answers: Option<Spanned<Vec<Answer>>>,
    set: Option<Spanned<String>>,
    method: Option<OrbitMethod>,
    limits: Option<RawLimits>,
    witness: Option<RawWitness>,
    image: Option<RawImage>,
    #[serde(default)]
    theory: Vec<Spanned<RawEntry>>,
}

/// Default answers: everything.
const ALL_ANSWERS: [Answer; 4] = [
    Answer::Orbit,
    Answer::Commutant,
    Answer::Image,
    Answer::Witness,
];

/// Checks of one plan text, carrying the path and text for spans.
struct Checker<'a> {
    path: &'a Path,
    source: &'a str,
}

impl Checker<'_> {
    fn err(&self, span: Range<usize>, reason: impl Into<String>) -> PlanError {
        PlanError::at(self.path, self.source, span, reason)
    }

    fn positive<T: Copy + PartialEq + Default>(
        &self,
        value: &Option<Spanned<T>>,
        what: &str,
    ) -> Result<Option<T>, PlanError> {
        match value {
            Some(v) if *v.get_ref() == T::default() => {
                Err(self.err(v.span(), format!("{what} must be at least 1")))
            }
            Some(v) => Ok(Some(*v.get_ref())),
            None => Ok(None),
        }
    }

    fn limits(&self, raw: &Option<RawLimits>, base: Limits) -> Result<Limits, PlanError> {
        let Some(raw) = raw else { return Ok(base) };
        Ok(Limits {
            lines: self.positive(&raw.lines, "limits.lines")?.or(base.lines),
            memory_mib: self
                .positive(&raw.memory_mib, "limits.memory_mib")?
                .or(base.memory_mib),
            seconds: self
                .positive(&raw.seconds, "limits.seconds")?
                .or(base.seconds),
        })
    }

    fn answers(
        &self,
        raw: &Option<Spanned<Vec<Answer>>>,
        base: &[Answer],
    ) -> Result<Vec<Answer>, PlanError> {
        let Some(raw) = raw else {
            return Ok(base.to_vec());
        };
        let mut answers = raw.get_ref().clone();
        if answers.is_empty() {
            return Err(self.err(raw.span(), "answers must name at least one answer"));
        }
        answers.sort();
        answers.dedup();
        Ok(answers)
    }

    fn set(
        &self,
        raw: &Option<Spanned<String>>,
        base: GeneratingSet,
    ) -> Result<GeneratingSet, PlanError> {
        match raw {
            Some(s) => parse_set(s.get_ref()).map_err(|e| self.err(s.span(), e)),
            None => Ok(base),
        }
    }

    fn entry(
        &self,
        number: usize,
        raw: &Spanned<RawEntry>,
        defaults: (&[Answer], GeneratingSet, OrbitMethod, Limits),
    ) -> Result<Entry, PlanError> {
        let e = raw.get_ref();
        let (source, at) = match (&e.spec, &e.file) {
            (Some(spec), None) => (Source::Spec(spec.get_ref().trim().to_string()), spec),
            (None, Some(file)) => {
                let folder = self.path.parent().unwrap_or(Path::new("."));
                (Source::File(folder.join(file.get_ref())), file)
            }
            (Some(_), Some(file)) => {
                return Err(self.err(
                    file.span(),
                    format!("theory entry {number} gives both spec and file; keep one"),
                ))
            }
            (None, None) => {
                return Err(self.err(
                    raw.span(),
                    format!("theory entry {number} needs a spec or a file"),
                ))
            }
        };
        if source.spec_text().is_empty() {
            return Err(self.err(at.span(), format!("theory entry {number}: empty spec")));
        }
        let label = match (&e.label, &source) {
            (Some(l), _) if l.get_ref().trim().is_empty() => {
                return Err(self.err(l.span(), "label must not be empty"))
            }
            (Some(l), _) => l.get_ref().trim().to_string(),
            (None, Source::Spec(s)) => s.clone(),
            (None, Source::File(p)) => p
                .file_stem()
                .map_or_else(|| p.display().to_string(), |s| s.to_string_lossy().into()),
        };
        if e.genera.get_ref().is_empty() {
            return Err(self.err(e.genera.span(), "genera must list at least one genus"));
        }
        let mut genera: Vec<usize> = Vec::new();
        for g in e.genera.get_ref() {
            let genus = *g.get_ref();
            if genus == 0 {
                return Err(self.err(g.span(), "genus must be at least 1"));
            }
            if genera.contains(&genus) {
                return Err(self.err(g.span(), format!("genus {genus} is listed twice")));
            }
            genera.push(genus);
        }
        let (answers, set, method, limits) = defaults;
        Ok(Entry {
            number,
            location: Location::of(self.source, at.span().start),
            source,
            label,
            genera,
            answers: self.answers(&e.answers, answers)?,
            set: self.set(&e.set, set)?,
            method: e.method.unwrap_or(method),
            limits: self.limits(&e.limits, limits)?,
        })
    }
}

/// Read and check a plan. Every refusal names the file, the line and the reason.
pub fn read_plan(path: &Path) -> Result<Plan, PlanError> {
    let source = std::fs::read_to_string(path).map_err(|e| PlanError {
        path: path.to_path_buf(),
        location: None,
        reason: format!("cannot read the plan: {e}"),
    })?;
    parse_plan(path, source)
}

/// Check a plan's text (`path` names it in messages and anchors theory files).
pub fn parse_plan(path: &Path, source: String) -> Result<Plan, PlanError> {
    let raw: RawPlan = toml::from_str(&source).map_err(|e| PlanError {
        path: path.to_path_buf(),
        location: e.span().map(|s| Location::of(&source, s.start)),
        reason: e.message().trim().to_string(),
    })?;
    let c = Checker {
        path,
        source: &source,
    };
    if raw.theory.is_empty() {
        return Err(PlanError {
            path: path.to_path_buf(),
            location: None,
            reason: "the plan has no [[theory]] entry".into(),
        });
    }
    let answers = c.answers(&raw.answers, &ALL_ANSWERS)?;
    let set = c.set(&raw.set, GeneratingSet::Humphries)?;
    let limits = c.limits(&raw.limits, Limits::default())?;
    let threads = c.positive(&raw.threads, "threads")?;
    if let (Some(n), Some(raw_threads)) = (threads, &raw.threads) {
        if n > MAX_THREADS {
            return Err(c.err(
                raw_threads.span(),
                format!("threads must be at most {}", MAX_THREADS),
            ));
        }
    }
    let checkpoint_seconds = c
        .positive(&raw.checkpoint_seconds, "checkpoint_seconds")?
        .unwrap_or(30);
    let entries = raw
        .theory
        .iter()
        .enumerate()
        .map(|(i, e)| {
            let method = raw.method.unwrap_or_default();
            c.entry(i + 1, e, (&answers, set, method, limits))
        })
        .collect::<Result<Vec<_>, _>>()?;
    let witness = raw.witness.as_ref();
    let image = raw.image.as_ref();
    let name = raw.name.clone().unwrap_or_else(|| {
        path.file_stem()
            .map_or("sweep".into(), |s| s.to_string_lossy().into())
    });
    Ok(Plan {
        path: path.to_path_buf(),
        name,
        threads,
        checkpoint_seconds,
        witness: WitnessBounds {
            depth: witness.and_then(|w| w.depth).unwrap_or(4),
            tries: witness.and_then(|w| w.tries).unwrap_or(100),
        },
        image: ImageBounds {
            max_lines: image.and_then(|i| i.max_lines).unwrap_or(20_000),
            enumeration_cap: image.and_then(|i| i.enumeration_cap).unwrap_or(50_000),
        },
        entries,
        source,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn parse(text: &str) -> Result<Plan, PlanError> {
        parse_plan(Path::new("p.toml"), text.to_string())
    }

    #[test]
    fn defaults_and_overrides() {
        let plan = parse(
            "answers = [\"orbit\"]\n[limits]\nlines = 10\n\n[[theory]]\nspec = \"ising\"\n\
             genera = [2, 1]\nlimits = { seconds = 5 }\n",
        )
        .unwrap();
        let e = &plan.entries[0];
        assert_eq!(e.genera, vec![2, 1]);
        assert_eq!(e.answers, vec![Answer::Orbit]);
        assert_eq!(e.limits.lines, Some(10));
        assert_eq!(e.limits.seconds, Some(5));
        assert_eq!(e.set, GeneratingSet::Humphries);
        assert_eq!(e.method, OrbitMethod::Enumerate);
        assert_eq!(plan.name, "p");
        let text = "method = \"structure\"\n[[theory]]\nspec = \"dw:S3\"\ngenera = [1]\n\
                    [[theory]]\nspec = \"dw:S3\"\nlabel = \"listed\"\ngenera = [2]\n\
                    method = \"enumerate\"\n";
        let plan = parse(text).unwrap();
        assert_eq!(plan.entries[0].method, OrbitMethod::Structure);
        assert_eq!(plan.entries[1].method, OrbitMethod::Enumerate);
    }

    #[test]
    fn files_are_read_relative_to_the_plan() {
        let text = "[[theory]]\nfile = \"../t/z.json\"\ngenera = [1]\n";
        let plan = parse_plan(Path::new("plans/p.toml"), text.to_string()).unwrap();
        let e = &plan.entries[0];
        assert_eq!(e.source, Source::File(PathBuf::from("plans/../t/z.json")));
        assert_eq!(e.label, "z");
        assert_eq!(e.location.line, 2);
    }

    #[test]
    fn refusals_name_the_line() {
        let cases = [
            (
                "[[theory]]\nspec = \"ising\"\ngenera = [0]\n",
                3,
                "genus must be at least 1",
            ),
            (
                "[[theory]]\nspec = \"ising\"\ngenera = [1]\nanswers = [\"size\"]\n",
                4,
                "unknown variant",
            ),
            (
                "[[theory]]\nspec = \"ising\"\ngenera = [1]\nset = \"other\"\n",
                4,
                "unknown generating set",
            ),
            (
                "[[theory]]\nspec = \"ising\"\ngenera = [1]\ncolour = 1\n",
                4,
                "unknown field",
            ),
            (
                "[[theory]]\nspec = \"ising\"\ngenera = [1]\nmethod = \"count\"\n",
                4,
                "unknown variant",
            ),
            (
                "[[theory]]\nspec = \"ising\"\ngenera = [1, 1]\n",
                3,
                "listed twice",
            ),
            (
                "[limits]\nlines = 0\n[[theory]]\nspec = \"ising\"\ngenera = [1]\n",
                2,
                "at least 1",
            ),
            ("[[theory]]\nspec = \"ising\"\ngenera = [1\n", 3, ""),
        ];
        for (text, line, reason) in cases {
            let e = parse(text).unwrap_err();
            assert_eq!(
                e.location.as_ref().map(|l| l.line),
                Some(line),
                "{text}: {e}"
            );
            assert!(e.reason.contains(reason), "{text}: {e}");
        }
    }
}
