//! The sweep's tables: `summary.md` (for people and the README) and `summary.csv` (for
//! programs), one row per finished run, in plan order (theory entries as listed, genera as
//! listed).
//!
//! Columns: theory, genus, dimension of V_g, orbit size or "not closed after N (cap)", λ_g
//! exactly (B = λ_g·G⁻¹) or "not scalar", image order or "infinite" (a witness), commutant
//! dimension, witness word, time, peak memory, program version. The CSV adds the raw
//! fields (orbit size, saturated, stop reason, data hash, conductor).

use cyclorb_pipeline::sweep::RunResult;

/// What the tables say about the plan as a whole.
pub struct SweepHeader<'a> {
    /// The plan's name.
    pub name: &'a str,
    /// The plan file as given.
    pub plan: &'a str,
    /// The plan hash.
    pub plan_hash: &'a str,
    /// The command line.
    pub command: &'a str,
    /// Runs planned in all.
    pub planned: usize,
}

/// The orbit cell: the size ("N (counted)" when counted, not listed), "not closed after N
/// (cap)", or for a count stopped by its caps the proved bounds.
pub fn orbit_cell(r: &RunResult) -> String {
    let bound = |key: &str| {
        r.counted
            .as_ref()
            .and_then(|c| c[key].as_str().map(str::to_string))
    };
    match (r.orbit_size, r.saturated) {
        (Some(n), Some(true)) if r.counted.is_some() => format!("{n} (counted)"),
        (Some(n), Some(true)) => n.to_string(),
        (None, Some(false)) if bound("stopped").is_some() => format!(
            "between {} and {} (count stopped: {})",
            bound("orbit_lower_bound").unwrap_or_default(),
            bound("orbit_upper_bound").unwrap_or_default(),
            bound("stopped").unwrap_or_default()
        ),
        (Some(n), _) => format!(
            "not closed after {n} ({})",
            r.stop_reason.as_deref().unwrap_or("stopped")
        ),
        _ => "—".into(),
    }
}

fn lambda_cell(r: &RunResult) -> String {
    match r.poincare_sum.as_ref() {
        Some(p) => match (p.is_scalar, &p.prefactor) {
            (Some(true), Some(l)) => l.clone(),
            (Some(false), _) => match p.commutant_dimension {
                Some(k) => format!("not scalar ({k} invariants)"),
                None => "not scalar".into(),
            },
            _ => "—".into(),
        },
        None => "—".into(),
    }
}

fn image_cell(r: &RunResult) -> String {
    match r.image.as_ref() {
        Some(i) => match (i.finite, &i.order) {
            (Some(true), Some(order)) => order.clone(),
            (Some(false), _) => "infinite".into(),
            _ => "undecided".into(),
        },
        None => "—".into(),
    }
}

fn commutant_cell(r: &RunResult) -> String {
    r.commutant
        .as_ref()
        .map_or("—".into(), |c| c.commutant_dimension.to_string())
}

fn witness_cell(r: &RunResult) -> String {
    match r.witness.as_ref() {
        Some(w) if w.found => w.word.join(" "),
        Some(w) if w.words_tried.is_some() => "none found".into(),
        Some(_) => "not needed".into(),
        None => "—".into(),
    }
}

fn seconds_cell(r: &RunResult) -> String {
    format!("{:.2}", r.total_seconds)
}

fn memory_cell(r: &RunResult) -> String {
    r.peak_memory_bytes
        .map_or("—".into(), |b| format!("{:.1}", b as f64 / 1_048_576.0))
}

/// The Markdown summary.
pub fn markdown(header: &SweepHeader, rows: &[&RunResult]) -> String {
    let mut t = format!("# Sweep `{}`\n\n", header.name);
    t.push_str(&format!(
        "Plan `{}` (plan hash `{}`), {} of {} runs finished, cyclorb {}.\n\
         Command: `{}`\n\n",
        header.plan,
        header.plan_hash,
        rows.len(),
        header.planned,
        env!("CARGO_PKG_VERSION"),
        header.command
    ));
    t.push_str(
        "| theory | g | dim V_g | orbit (lines) | λ_g | image order | commutant dim | witness word | time (s) | memory (MiB) | version |\n\
         | --- | ---: | ---: | ---: | ---: | ---: | ---: | --- | ---: | ---: | --- |\n",
    );
    for r in rows {
        let witness = witness_cell(r);
        let witness = if r.witness.as_ref().is_some_and(|w| w.found) {
            format!("`{witness}`")
        } else {
            witness
        };
        t.push_str(&format!(
            "| {} | {} | {} | {} | {} | {} | {} | {} | {} | {} | {} |\n",
            r.label.replace('|', "\\|"),
            r.genus,
            r.dimension,
            orbit_cell(r),
            lambda_cell(r),
            image_cell(r),
            commutant_cell(r),
            witness,
            seconds_cell(r),
            memory_cell(r),
            r.citation.program_version,
        ));
    }
    t.push_str(
        "\nOrbit: lines of the vacuum block under the Dehn twists; \"not closed after N\" \
         means the run stopped at its cap (limit, memory or time) with N lines found; \
         \"(counted)\": counted as |P| / |Stab_P(S)| without listing (plan key method). \
         λ_g: B = Σ v v† over the orbit equals λ_g·G⁻¹. Image order: of the projective \
         image, certified; \"infinite\" when the witness word has infinite projective order.\n\n",
    );
    t.push_str("## Citation data\n\n| run | theory | field | generators | theory hash (SHA-256; construction hash of a product or conjugate) | run hash |\n| --- | --- | --- | --- | --- | --- |\n");
    for r in rows {
        t.push_str(&format!(
            "| {} | `{}` | {} | {} ({}) | `{}` | `{}` |\n",
            r.id,
            r.theory.replace('|', "\\|"),
            r.citation.field,
            r.citation.generator_set,
            r.generator_names.join(", "),
            r.citation.theory_data_hash,
            r.run_hash
        ));
    }
    t.push_str("\n![growth of orbit sizes and prefactors](growth.svg)\n");
    t
}

/// A CSV field, quoted when it holds a comma, a quote or a line break (RFC 4180).
fn csv_field(text: &str) -> String {
    if text.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", text.replace('"', "\"\""))
    } else {
        text.to_string()
    }
}

/// The CSV columns.
pub const CSV_COLUMNS: [&str; 17] = [
    "id",
    "theory",
    "genus",
    "dimension",
    "orbit",
    "orbit_size",
    "saturated",
    "stop_reason",
    "lambda",
    "image_order",
    "commutant_dimension",
    "witness_word",
    "seconds",
    "peak_memory_mib",
    "program_version",
    "theory_data_hash",
    "conductor",
];

/// The CSV summary (header line first).
pub fn csv(rows: &[&RunResult]) -> String {
    let mut t = CSV_COLUMNS.join(",");
    t.push('\n');
    for r in rows {
        let fields = [
            r.id.clone(),
            r.label.clone(),
            r.genus.to_string(),
            r.dimension.to_string(),
            orbit_cell(r),
            r.orbit_size.map_or(String::new(), |n| n.to_string()),
            r.saturated.map_or(String::new(), |s| s.to_string()),
            r.stop_reason.clone().unwrap_or_default(),
            lambda_cell(r),
            image_cell(r),
            commutant_cell(r),
            witness_cell(r),
            seconds_cell(r),
            memory_cell(r),
            r.citation.program_version.clone(),
            r.citation.theory_data_hash.clone(),
            r.conductor.to_string(),
        ];
        let line: Vec<String> = fields.iter().map(|f| csv_field(f)).collect();
        t.push_str(&line.join(","));
        t.push('\n');
    }
    t
}

#[cfg(test)]
mod tests {
    use super::csv_field;

    #[test]
    fn csv_quoting() {
        // RFC 4180: fields with commas or quotes are quoted, quotes doubled.
        assert_eq!(csv_field("plain"), "plain");
        assert_eq!(csv_field("a,b"), "\"a,b\"");
        assert_eq!(csv_field("say \"x\""), "\"say \"\"x\"\"\"");
    }
}
