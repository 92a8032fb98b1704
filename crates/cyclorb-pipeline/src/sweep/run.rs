//! One run of a sweep: generators, orbit under caps, Poincaré sum, certificates, result.
//!
//! Order of work: the Dehn twists of the block space; the orbit of the vacuum line when the
//! orbit or the image is asked for (continued from `checkpoint.bin` in the run's folder when
//! a usable one exists); the Poincaré sum of a saturated orbit; the image order; the
//! commutant; a witness when the image is not proven finite (on the factors of a Deligne
//! product first; a run asking for the witness alone on a product tries its factors before
//! the product's generators are built). The settings' stop flag (Ctrl-C or SIGTERM in the
//! program, KeyboardInterrupt in Python) is honoured between these stages (and between
//! chunks of the orbit): the run then ends without a result, to continue from the
//! checkpoint next time.

use std::path::Path;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use std::time::{Duration, Instant};

use cyclorb_mcg::BlockSpace;
use cyclorb_orbit::{PoincareReport, ProgressObserver};

use super::answers::{
    certificate_generators, commutant_answer, image_answer, lifted_witness_answer, witness_answer,
    witness_failed, witness_not_needed,
};
use super::orbit_stage::{run_orbit, starting_orbit, EngineSettings, OrbitStop};
use super::plan::{Answer, ImageBounds, WitnessBounds};
use super::result::CommutantAnswer;
use super::result::{Citation, ImageAnswer, RunResult};
use super::schedule::{PlannedRun, RunSpace};
use crate::dw_count::{certificate, count, counted_poincare};
use crate::dw_space::DwSpace;
use crate::image::ImageRoute;
use crate::method::OrbitMethod;
use cyclorb_dw::VacuumOrbit;

/// Settings shared by every run of a sweep.
pub struct SweepSettings<'a> {
    /// Worker threads of the orbit engine and the Poincaré sum.
    pub threads: usize,
    /// Time between periodic checkpoints.
    pub checkpoint_every: Duration,
    /// The flag the signal handler sets.
    pub signal: &'a Arc<AtomicBool>,
    /// Image certificate bounds.
    pub image: ImageBounds,
    /// Witness search bounds.
    pub witness: WitnessBounds,
    /// The plan hash recorded in results.
    pub plan_hash: &'a str,
    /// The command line recorded in results.
    pub command: &'a str,
}

/// What a host shows of a running sweep (the program's bars and lines, a notebook's
/// callback, or nothing). It only reports; stopping goes through the settings' `signal`.
pub trait SweepObserver {
    /// A run starts.
    fn start(&self, run: &PlannedRun);
    /// The run enters a stage (`orbit`, `Poincaré sum`, `commutant`, …).
    fn stage(&self, run: &PlannedRun, stage: &str);
    /// A message for the user (the caller of [`execute`] also keeps it in its notes).
    fn note(&self, text: String);
    /// The engine's observer while the run's orbit is listed; `spent_before` is the
    /// enumeration time of earlier attempts (kept in the checkpoint).
    fn orbit<'a>(
        &'a self,
        run: &'a PlannedRun,
        spent_before: f64,
    ) -> Box<dyn ProgressObserver + 'a>;
}

/// How a run ended.
pub enum RunEnd {
    /// With a result (written by the caller).
    Finished(Box<RunResult>),
    /// Stopped by Ctrl-C or SIGTERM; its checkpoint is on disk.
    Interrupted,
}

/// The result skeleton: inputs, citation, costs filled later.
fn blank_result(
    run: &PlannedRun,
    conductor: u32,
    generator_names: Vec<String>,
    settings: &SweepSettings,
) -> RunResult {
    let version = env!("CARGO_PKG_VERSION");
    RunResult {
        id: run.id.clone(),
        theory: run.spec.clone(),
        label: run.label.clone(),
        genus: run.genus,
        dimension: run.dimension(),
        conductor,
        generators: generator_names.len(),
        generator_names,
        answers: run.answers.iter().map(|a| a.name().to_string()).collect(),
        orbit_size: None,
        saturated: None,
        stop_reason: None,
        layer_sizes: None,
        counted: None,
        poincare_sum: None,
        commutant: None,
        image: None,
        witness: None,
        errors: Vec::new(),
        elapsed_seconds: 0.0,
        total_seconds: 0.0,
        peak_memory_bytes: None,
        store_bytes: None,
        resumed: false,
        citation: Citation {
            theory_data_hash: run.theory_hash.clone(),
            generator_set: run.set.name().to_string(),
            field: format!("Q(ζ_{conductor})"),
            conductor,
            program: format!("cyclorb {version}"),
            program_version: version.to_string(),
            command: settings.command.to_string(),
        },
        run_hash: run.run_hash.clone(),
        plan_hash: settings.plan_hash.to_string(),
    }
}

/// The permutation routes of a `dw:` run: the image order by Schreier–Sims on X_g (unless
/// the count found it already), the commutant dimension as the number of orbitals, and no
/// witness (the image is finite).
fn dw_answers(
    run: &PlannedRun,
    space: &DwSpace,
    result: &mut RunResult,
    display: &dyn SweepObserver,
) {
    let known = result.image.as_ref().and_then(|i| i.order.clone());
    if let Some(order) = known.filter(|_| run.wants(Answer::Witness)) {
        result.witness = Some(witness_not_needed(&order));
    } else if result.image.is_none() && (run.wants(Answer::Image) || run.wants(Answer::Witness)) {
        display.stage(run, "image order");
        match space.image() {
            Ok(image) => {
                let order = image.order.to_string();
                if run.wants(Answer::Witness) {
                    result.witness = Some(witness_not_needed(&order));
                }
                if run.wants(Answer::Image) {
                    result.image = Some(ImageAnswer {
                        finite: Some(true),
                        order: Some(order),
                        route: image.route,
                        note: None,
                    });
                }
            }
            Err(e) => result.errors.push(format!("image: {e}")),
        }
    }
    if run.wants(Answer::Commutant) {
        display.stage(run, "commutant");
        match space.commutant_dimension() {
            Ok((dimension, route, primes)) => {
                result.commutant = Some(CommutantAnswer {
                    commutant_dimension: dimension,
                    primes,
                    route: route.into(),
                })
            }
            Err(e) => result.errors.push(format!("commutant: {e}")),
        }
    }
}

/// The counting route of an untwisted `dw:` run (`method = "structure"`): the vacuum orbit as
/// |P| / |Stab_P(S)| (`orbit --method structure`), B from the orbitals, and the image order
/// |P| of the same chain (Schreier–Sims on X_g ⊔ Ω, on which P acts faithfully). A count
/// stopped by its caps leaves the orbit open (proved bounds in `counted`, no size).
fn counted_orbit(
    run: &PlannedRun,
    space: &DwSpace,
    result: &mut RunResult,
    display: &dyn SweepObserver,
) {
    display.stage(run, "orbit counted (set stabiliser)");
    let counted = match count(space, None) {
        Ok(VacuumOrbit::Counted(c)) => c,
        Ok(VacuumOrbit::Bounded(b)) => {
            result.saturated = Some(false);
            result.stop_reason = Some("limit".into());
            result.counted = Some(serde_json::json!({
                "stopped": b.reason,
                "orbit_lower_bound": b.lower.to_string(),
                "lower_bound_proof": b.lower_proof,
                "orbit_upper_bound": b.upper.to_string(),
                "upper_bound_proof": b.upper_proof,
            }));
            return;
        }
        Err(e) => {
            result.errors.push(format!("counted orbit: {e}"));
            return;
        }
    };
    match usize::try_from(&counted.orbit_size) {
        Ok(n) => {
            result.orbit_size = Some(n);
            result.saturated = Some(true);
        }
        Err(_) => result.errors.push(format!(
            "counted orbit: {} lines exceed the results' machine-word orbit sizes",
            counted.orbit_size
        )),
    }
    if run.wants(Answer::Orbit) {
        display.stage(run, "Poincaré sum");
        let report = counted_poincare(space, &counted);
        if report.trace_check == Some(false) {
            result
                .errors
                .push("Poincaré sum: tr B ≠ |orbit|·|S| or B not invariant".into());
        }
        result.poincare_sum = Some(report);
    }
    if run.wants(Answer::Image) {
        result.image = Some(ImageAnswer {
            finite: Some(true),
            order: Some(counted.image_order.to_string()),
            route: ImageRoute::PermutationSchreierSims,
            note: Some("|P| from the counting route's chain on X_g ⊔ Ω".into()),
        });
    }
    result.counted = Some(certificate(&counted));
}

/// The block space of a run that asks for the witness alone on a Deligne product (its
/// factors are searched before anything else is built).
fn witness_alone_on_a_product(run: &PlannedRun) -> Option<&BlockSpace> {
    match &run.space {
        RunSpace::Blocks(space)
            if run.answers == [Answer::Witness] && space.theory().deligne_factors().is_some() =>
        {
            Some(space)
        }
        _ => None,
    }
}

/// A run that asks for the witness alone, on a Deligne product whose factor yields one:
/// the result, without building the product's generators (the factor's certificate is
/// re-checked on the factor; see `lifted`). `None` otherwise: the run goes the usual way.
fn witness_from_factors(
    run: &PlannedRun,
    settings: &SweepSettings,
    display: &dyn SweepObserver,
    started: Instant,
) -> Result<Option<RunResult>, String> {
    let Some(space) = witness_alone_on_a_product(run) else {
        return Ok(None);
    };
    display.stage(run, "witness search on the factors");
    let Some(witness) = lifted_witness_answer(space, run.set, &settings.witness)? else {
        return Ok(None);
    };
    let names = run
        .set
        .curves(run.genus)
        .iter()
        .map(|c| c.to_string())
        .collect();
    let mut result = blank_result(run, run.space.conductor(), names, settings);
    result.witness = Some(witness);
    let elapsed = started.elapsed().as_secs_f64();
    result.elapsed_seconds = elapsed;
    result.total_seconds = elapsed;
    result.peak_memory_bytes = crate::runtime::peak_memory_bytes();
    Ok(Some(result))
}

/// Run one planned run, checkpointing under `dir`.
pub fn execute(
    run: &PlannedRun,
    dir: &Path,
    settings: &SweepSettings,
    display: &dyn SweepObserver,
    notes: &mut Vec<String>,
) -> Result<RunEnd, String> {
    let started = Instant::now();
    crate::runtime::reset_peak_memory();
    display.start(run);
    let interrupted = || settings.signal.load(Ordering::SeqCst);
    if let Some(result) = witness_from_factors(run, settings, display, started)? {
        return Ok(RunEnd::Finished(Box::new(result)));
    }
    let problem = run.space.problem(run.set)?;
    let g = problem.generators();
    let mut result = blank_result(run, g.conductor(), g.names().to_vec(), settings);
    let mut earlier_seconds = 0.0;
    let mut orbit_found = None;
    let counting = match &run.space {
        RunSpace::Dw(space) if run.method == OrbitMethod::Structure => Some(space),
        _ => None,
    };
    if let Some(space) = counting {
        if run.wants(Answer::Orbit) || run.wants(Answer::Image) {
            counted_orbit(run, space, &mut result, display);
        }
    } else if run.wants(Answer::Orbit) || run.wants(Answer::Image) {
        display.stage(run, "orbit");
        let (start, unusable) = starting_orbit(&problem, &dir.join("checkpoint.bin"), &run.limits);
        if let Some(reason) = unusable {
            let note = format!("{}: {reason}; the orbit starts afresh", run.id);
            display.note(note.clone());
            notes.push(note);
        }
        let mut observer = display.orbit(run, start.0.compute_seconds());
        let engine = EngineSettings {
            threads: settings.threads,
            checkpoint_every: settings.checkpoint_every,
            signal: settings.signal,
        };
        let attempt = Instant::now();
        let outcome = run_orbit(
            &problem,
            start,
            &run.limits,
            &dir.join("checkpoint.bin"),
            &engine,
            &mut *observer,
        )?;
        if outcome.stop == Some(OrbitStop::Interrupted) {
            return Ok(RunEnd::Interrupted);
        }
        let orbit = outcome.orbit;
        // enumeration time of earlier attempts (the checkpoint keeps it)
        earlier_seconds = orbit.compute_seconds() - attempt.elapsed().as_secs_f64();
        result.resumed = outcome.resumed;
        result.orbit_size = Some(orbit.len());
        result.saturated = Some(orbit.is_saturated());
        result.stop_reason = outcome.stop.map(|s| s.name().to_string());
        result.layer_sizes = Some(orbit.layer_sizes());
        result.store_bytes = Some(orbit.store_bytes());
        result.poincare_sum = Some(if orbit.is_saturated() {
            display.stage(run, "Poincaré sum");
            match run.space.poincare(&problem, &orbit, settings.threads) {
                Ok(report) => {
                    if report.trace_check == Some(false) {
                        result
                            .errors
                            .push("Poincaré sum: tr(B·G) ≠ |orbit|·⟨v₀, v₀⟩_G".into());
                    }
                    report
                }
                Err(e) => {
                    result.errors.push(format!("Poincaré sum: {e}"));
                    PoincareReport::missing(e.to_string())
                }
            }
        } else {
            PoincareReport::missing("the orbit is not saturated")
        });
        orbit_found = Some(orbit);
    }
    if interrupted() {
        return Ok(RunEnd::Interrupted);
    }
    let dw = match &run.space {
        RunSpace::Dw(space) => Some(space),
        RunSpace::Blocks(_) => None,
    };
    if let Some(space) = dw {
        dw_answers(run, space, &mut result, display);
    }
    let needs_certificates = dw.is_none()
        && [Answer::Image, Answer::Commutant, Answer::Witness]
            .iter()
            .any(|&a| run.wants(a));
    let gens = if needs_certificates {
        match certificate_generators(&problem) {
            Ok(g) => Some(g),
            Err(e) => {
                result.errors.push(e);
                None
            }
        }
    } else {
        None
    };
    if let (Some(gens), Some(orbit)) = (&gens, &orbit_found) {
        if run.wants(Answer::Image) {
            display.stage(run, "image order");
            match image_answer(gens, &problem, orbit, &settings.image, settings.threads) {
                Ok(a) => result.image = Some(a),
                Err(e) => result.errors.push(e),
            }
        }
    }
    drop(orbit_found);
    if interrupted() {
        return Ok(RunEnd::Interrupted);
    }
    if let (Some(gens), true) = (&gens, run.wants(Answer::Commutant)) {
        display.stage(run, "commutant");
        match commutant_answer(gens) {
            Ok(a) => result.commutant = Some(a),
            Err(e) => result.errors.push(e),
        }
    }
    if interrupted() {
        return Ok(RunEnd::Interrupted);
    }
    if let (Some(gens), true) = (&gens, run.wants(Answer::Witness)) {
        let finite_order = result
            .image
            .as_ref()
            .filter(|i| i.finite == Some(true))
            .and_then(|i| i.order.clone());
        result.witness = Some(match finite_order {
            Some(order) => witness_not_needed(&order),
            None => {
                display.stage(run, "witness search");
                // the factors, unless `witness_from_factors` searched them already
                let lifted = match &run.space {
                    RunSpace::Blocks(space) if witness_alone_on_a_product(run).is_none() => {
                        lifted_witness_answer(space, run.set, &settings.witness)
                    }
                    _ => Ok(None),
                };
                match lifted.and_then(|found| match found {
                    Some(w) => Ok(w),
                    None => witness_answer(gens, &settings.witness),
                }) {
                    Ok(w) => w,
                    Err(e) => {
                        result.errors.push(e.clone());
                        witness_failed(e)
                    }
                }
            }
        });
    }
    if interrupted() {
        return Ok(RunEnd::Interrupted);
    }
    if let (Some(image), Some(true)) = (
        result.image.as_mut(),
        result.witness.as_ref().map(|w| w.found),
    ) {
        if image.finite.is_none() {
            *image = ImageAnswer {
                finite: Some(false),
                order: None,
                route: ImageRoute::Witness,
                note: Some("a word of infinite projective order (see witness)".into()),
            };
        }
    }
    let elapsed = started.elapsed().as_secs_f64();
    result.elapsed_seconds = elapsed;
    result.total_seconds = elapsed + earlier_seconds.max(0.0);
    result.peak_memory_bytes = crate::runtime::peak_memory_bytes();
    Ok(RunEnd::Finished(Box::new(result)))
}
