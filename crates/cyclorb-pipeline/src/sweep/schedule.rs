//! From a checked plan to the list of runs, smallest first.
//!
//! Every theory is read once and every (theory, genus) block space built before anything
//! runs, so an unknown theory or a genus the data cannot reach refuses the whole plan,
//! naming the entry. Runs are ordered by the dimension of the block space, then by the
//! degree φ(n) of the field (the two factors of the size of one stored line), then in plan
//! order. Each run gets an id (its folder under `runs/`) and a run hash of everything its
//! answer depends on; a finished result is reused only when its run hash matches.

use cyclorb_mcg::{BlockSpace, GeneratingSet};
use cyclorb_orbit::{Orbit, OrbitProblem, PoincareReport, Seed};

use super::hash::Fnv64;
use super::plan::{Answer, Entry, Limits, Plan, PlanError};
use crate::dw_space::{is_dw, DwSpace};
use crate::method::OrbitMethod;
use crate::proof;

/// One run of the sweep: a theory at a genus with its answers and caps.
pub struct PlannedRun {
    /// Place in plan order (entry, then genus as listed), for the summary tables.
    pub position: (usize, usize),
    /// Folder name under `runs/`: the entry's label and the genus, e.g. `su2-3-g2`.
    pub id: String,
    /// The entry's label.
    pub label: String,
    /// The spec (or theory file path) as given.
    pub spec: String,
    /// The genus.
    pub genus: usize,
    /// The space the run works on.
    pub space: RunSpace,
    /// The generating set.
    pub set: GeneratingSet,
    /// How the orbit is found.
    pub method: OrbitMethod,
    /// What to compute.
    pub answers: Vec<Answer>,
    /// Caps.
    pub limits: Limits,
    /// SHA-256 of the theory's exact data (`Theory::data_hash`).
    pub theory_hash: String,
    /// Hash of everything the run's answer depends on (hex).
    pub run_hash: String,
}

impl PlannedRun {
    /// dim V_g.
    pub fn dimension(&self) -> usize {
        self.space.dimension()
    }

    /// Whether the run computes `answer`.
    pub fn wants(&self, answer: Answer) -> bool {
        self.answers.contains(&answer)
    }
}

/// What a run works on: the block space of a theory with F- and R-symbols (theory, comb
/// basis, invariant form), or the flat bundles of a Dijkgraaf–Witten theory `dw:GROUP`.
pub enum RunSpace {
    /// A block space (both variants boxed: their sizes differ widely).
    Blocks(Box<BlockSpace>),
    /// X_g of a finite group with the twists of the entry's set.
    Dw(Box<DwSpace>),
}

impl RunSpace {
    /// The dimension of the space.
    pub fn dimension(&self) -> usize {
        match self {
            RunSpace::Blocks(s) => s.dimension(),
            RunSpace::Dw(s) => s.dimension(),
        }
    }

    /// n of the field Q(ζ_n) of the generators.
    pub fn conductor(&self) -> u32 {
        match self {
            RunSpace::Blocks(s) => s.theory().conductor(),
            RunSpace::Dw(_) => 1,
        }
    }

    /// φ(n), the degree of that field.
    fn field_degree(&self) -> usize {
        match self {
            RunSpace::Blocks(s) => s.theory().field().degree(),
            RunSpace::Dw(_) => 1,
        }
    }

    /// The orbit problem of the vacuum under the twists of `set`.
    pub fn problem(&self, set: GeneratingSet) -> Result<OrbitProblem, String> {
        match self {
            RunSpace::Blocks(space) => {
                let twists = space.generators(set).map_err(|e| e.to_string())?;
                let field = space.theory().field();
                let seed = Seed::basis_vector(field, space.dimension(), space.basis().vacuum());
                OrbitProblem::new(
                    space.generator_set(&twists).map_err(|e| e.to_string())?,
                    &seed,
                )
                .map_err(|e| e.to_string())
            }
            RunSpace::Dw(space) => space.problem(),
        }
    }

    /// The Poincaré sum of a saturated orbit (over orbitals, from subsets, for untwisted
    /// `dw:` theories), or the error that stopped it; `trace_check` false reveals an error.
    pub fn poincare(
        &self,
        problem: &OrbitProblem,
        orbit: &Orbit,
        threads: usize,
    ) -> Result<PoincareReport, String> {
        match self {
            RunSpace::Dw(space) if !space.is_twisted() => Ok(space.poincare_report(orbit.len())),
            _ => {
                let sum = problem
                    .poincare_sum(orbit, threads)
                    .map_err(|e| e.to_string())?;
                Ok(PoincareReport::from_sum(&sum, problem.generators()))
            }
        }
    }
}

/// The runs of a plan, smallest first, and the plan hash.
pub struct Schedule {
    /// The runs in the order they execute.
    pub runs: Vec<PlannedRun>,
    /// Hash of the plan's runs (ids and run hashes, in order).
    pub plan_hash: String,
}

/// `label` reduced to lowercase letters, digits and single dashes.
fn slug(label: &str) -> String {
    let mut out = String::new();
    for ch in label.chars() {
        if ch.is_ascii_alphanumeric() {
            out.push(ch.to_ascii_lowercase());
        } else if !out.ends_with('-') {
            out.push('-');
        }
    }
    let trimmed = out.trim_matches('-');
    if trimmed.is_empty() {
        "theory".into()
    } else {
        trimmed.into()
    }
}

fn run_hash(
    entry: &Entry,
    genus: usize,
    theory_hash: &str,
    plan: &Plan,
    answers: &[Answer],
) -> String {
    let mut h = Fnv64::new();
    h.line("cyclorb sweep run, version 1");
    h.line(&format!("spec {}", entry.source.spec_text()));
    h.line(&format!("theory data {theory_hash}"));
    h.line(&format!("genus {genus}"));
    h.line(&format!("set {}", entry.set.name()));
    // only the counting route changes the hash, so listed runs keep their stored results
    if entry.method != OrbitMethod::Enumerate {
        h.line(&format!("method {}", entry.method.name()));
    }
    for a in answers {
        h.line(&format!("answer {}", a.name()));
    }
    let l = entry.limits;
    h.line(&format!(
        "limits {:?} {:?} {:?}",
        l.lines, l.memory_mib, l.seconds
    ));
    if answers.contains(&Answer::Witness) {
        h.line(&format!(
            "witness {} {}",
            plan.witness.depth, plan.witness.tries
        ));
    }
    if answers.contains(&Answer::Image) {
        h.line(&format!(
            "image {} {}",
            plan.image.max_lines, plan.image.enumeration_cap
        ));
    }
    h.hex()
}

/// Read every theory, build every block space, order the runs.
pub fn schedule(plan: &Plan) -> Result<Schedule, PlanError> {
    let mut runs: Vec<(usize, PlannedRun)> = Vec::new();
    for entry in &plan.entries {
        let refuse = |reason: String| {
            PlanError::located(
                &plan.path,
                &entry.location,
                format!(
                    "theory entry {} ({}): {reason}",
                    entry.number,
                    entry.source.spec_text()
                ),
            )
        };
        let spec = entry.source.spec_text();
        let theory = if is_dw(&spec) {
            None
        } else {
            Some(proof::theory(&spec).map_err(refuse)?)
        };
        if entry.method == OrbitMethod::Product {
            return Err(refuse(
                "method \"product\" is not a sweep route (a sweep lists or counts each theory \
                 itself); use `cyclorb orbit SPEC --method product`"
                    .into(),
            ));
        }
        if theory.is_some() && entry.method == OrbitMethod::Structure {
            return Err(refuse(
                "method \"structure\" in a sweep counts the orbits of untwisted dw: theories; \
                 use `cyclorb orbit SPEC --method structure` for the others"
                    .into(),
            ));
        }
        // The construction hash: a product's own F-blocks are never filled (for M(11,10)
        // they would take GBs); it is the data hash for a theory whose data are its own.
        let mut theory_hash = theory.as_ref().map(|t| t.construction_hash());
        for (k, &genus) in entry.genera.iter().enumerate() {
            let space = match &theory {
                Some(t) => RunSpace::Blocks(Box::new(
                    BlockSpace::new(t.clone(), genus)
                        .map_err(|e| refuse(format!("genus {genus}: {e}")))?,
                )),
                None => {
                    let space = DwSpace::with_set(&spec, genus, entry.set)
                        .map_err(|e| refuse(format!("genus {genus}: {e}")))?;
                    if entry.method == OrbitMethod::Structure && space.is_twisted() {
                        return Err(refuse(
                            "method \"structure\" counts the orbits of untwisted dw: theories; \
                             a twisted theory's twists carry phases (use \"enumerate\")"
                                .into(),
                        ));
                    }
                    let mut h = Fnv64::new();
                    for line in space.group_data() {
                        h.line(&line);
                    }
                    theory_hash = Some(h.hex());
                    RunSpace::Dw(Box::new(space))
                }
            };
            let theory_hash = theory_hash.clone().unwrap_or_default();
            let id = format!("{}-g{genus}", slug(&entry.label));
            if let Some((_, other)) = runs.iter().find(|(_, r)| r.id == id) {
                return Err(refuse(format!(
                    "run {id} is already planned (for {}); give this entry another label",
                    other.spec
                )));
            }
            let run = PlannedRun {
                position: (entry.number, k),
                run_hash: run_hash(entry, genus, &theory_hash, plan, &entry.answers),
                id,
                label: entry.label.clone(),
                spec: entry.source.spec_text(),
                genus,
                space,
                set: entry.set,
                method: entry.method,
                answers: entry.answers.clone(),
                limits: entry.limits,
                theory_hash,
            };
            runs.push((entry.number, run));
        }
    }
    runs.sort_by_key(|(number, r)| (r.dimension(), r.space.field_degree(), *number, r.genus));
    let mut h = Fnv64::new();
    h.line("cyclorb sweep plan, version 1");
    for (_, r) in &runs {
        h.line(&format!("{} {}", r.id, r.run_hash));
    }
    Ok(Schedule {
        runs: runs.into_iter().map(|(_, r)| r).collect(),
        plan_hash: h.hex(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn slugs_are_folder_names() {
        assert_eq!(slug("su2:3"), "su2-3");
        assert_eq!(slug("ising*conj(fibonacci)"), "ising-conj-fibonacci");
        assert_eq!(slug("Tricritical-Ising"), "tricritical-ising");
        assert_eq!(slug("::"), "theory");
    }

    #[test]
    fn a_product_method_is_refused_naming_the_entry() {
        let text = "[[theory]]\nspec = \"ising\"\ngenera = [1]\nmethod = \"product\"\n";
        let plan = super::super::parse_plan(std::path::Path::new("p.toml"), text.into()).unwrap();
        let e = schedule(&plan).err().expect("refused");
        assert_eq!(e.location.as_ref().map(|l| l.line), Some(2), "{e}");
        assert!(e.reason.contains("not a sweep route"), "{e}");
    }
}
