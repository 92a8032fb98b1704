//! `cyclorb orbit A*B --genus G --method product`: the orbit of a Deligne product's vacuum
//! line found from its factors.
//!
//! The genus-g block space of A ⊠ B is V_A ⊗ V_B, its vacuum is v_A ⊗ v_B, and each Dehn
//! twist acts as T_A ⊗ T_B up to a scalar. A line ⟨v ⊗ w⟩ determines ⟨v⟩ and ⟨w⟩ and is
//! determined by them, so the product's orbit is the orbit of the pair of vacuum lines under
//! the diagonal action of the permutations the twists induce on the two factor orbits
//! (`cyclorb_orbit::pair_orbit`). Each factor's orbit is enumerated and proved closed as
//! usual; only the factors ever meet field arithmetic, so the product's dimension
//! dim V_A · dim V_B never matters. The Poincaré sum follows from the factors' when the
//! orbit is all of O_A × O_B (B = B_A ⊗ B_B); otherwise this route does not form it.

use std::sync::atomic::AtomicBool;
use std::sync::Arc;
use std::time::Instant;

use cyclorb_field::Rational;
use cyclorb_orbit::{pair_orbit, OrbitOptions, Silent};
use serde_json::{json, Value};

use super::orbit::options;
use super::output::{Outcome, Report};
use crate::cli::OrbitArgs;
use crate::runtime::install_stop_handler;
use cyclorb_pipeline::space::vacuum_problem;

/// The two factors of a spec `A*B` split at its first `*` outside parentheses, or of a
/// built-in theory defined as a product (`tricritical-ising`).
fn product_factors(spec: &str) -> Option<(&str, &str)> {
    if let Some(factors) = cyclorb_theory::defining_product(spec.trim()) {
        return Some(factors);
    }
    let mut depth = 0i32;
    for (i, ch) in spec.char_indices() {
        match ch {
            '(' => depth += 1,
            ')' => depth -= 1,
            '*' if depth == 0 => return Some((&spec[..i], &spec[i + 1..])),
            _ => {}
        }
    }
    None
}

/// One factor's saturated orbit and the permutations the twists induce on it.
struct Factor {
    spec: String,
    dimension: usize,
    conductor: u32,
    generator_names: Vec<String>,
    orbit_size: usize,
    saturated: bool,
    permutations: Vec<Vec<u32>>,
    /// Whether B_A = λ·G_A⁻¹ (`None` when the orbit did not close).
    is_scalar: Option<bool>,
    /// λ when B_A is scalar.
    prefactor: Option<Rational>,
}

fn factor(spec: &str, args: &OrbitArgs, options: &OrbitOptions) -> Result<Factor, String> {
    let genus = args.genus.ok_or("--method product needs --genus")?;
    let problem =
        vacuum_problem(spec, genus, &args.set).map_err(|e| format!("factor {spec}: {e}"))?;
    let orbit = problem
        .enumerate(options, &mut Silent)
        .map_err(|e| format!("factor {spec}: {e}"))?;
    let (permutations, is_scalar, prefactor) = if orbit.is_saturated() {
        let permutations = problem
            .induced_permutations(&orbit, options.threads)
            .map_err(|e| format!("factor {spec}: {e}"))?;
        let sum = problem
            .poincare_sum(&orbit, options.threads)
            .map_err(|e| format!("factor {spec}: {e}"))?;
        if !sum.trace_check {
            return Err(format!(
                "factor {spec}: the check tr(B·G) = |orbit|·⟨v₀,v₀⟩_G fails"
            ));
        }
        (permutations, Some(sum.scalar.is_some()), sum.prefactor())
    } else {
        (Vec::new(), None, None)
    };
    Ok(Factor {
        spec: spec.to_string(),
        dimension: problem.dimension(),
        conductor: problem.field().conductor(),
        generator_names: problem.generators().names.clone(),
        orbit_size: orbit.len(),
        saturated: orbit.is_saturated(),
        permutations,
        is_scalar,
        prefactor,
    })
}

fn factor_json(f: &Factor) -> Value {
    json!({
        "spec": f.spec,
        "dimension": f.dimension,
        "conductor": f.conductor,
        "orbit_size": f.orbit_size,
        "saturated": f.saturated,
        "poincare_sum": {
            "is_scalar": f.is_scalar,
            "prefactor": f.prefactor.as_ref().map(|r| r.to_string()),
        },
    })
}

/// The product's Poincaré sum when it follows from the factors'. If the orbit is all of
/// O_A × O_B, then B = Σ_{i,j} (v_i ⊗ w_j)(v_i ⊗ w_j)† = B_A ⊗ B_B, and with
/// G = G_A ⊗ G_B it is scalar exactly when both factors' sums are, with λ = λ_A·λ_B.
/// Otherwise the orbit correlates the factors and this route does not form B.
fn product_sum(a: &Factor, b: &Factor, closed_size: Option<usize>) -> Value {
    let independent =
        closed_size.is_some_and(|n| n as u128 == a.orbit_size as u128 * b.orbit_size as u128);
    if !independent {
        return json!({
            "is_scalar": null,
            "prefactor": null,
            "invariants": null,
            "note": "the orbit correlates the factors' lines; the product route does not form B (use --method enumerate)",
        });
    }
    let is_scalar = a.is_scalar.zip(b.is_scalar).map(|(x, y)| x && y);
    let prefactor = match (&a.prefactor, &b.prefactor) {
        (Some(x), Some(y)) => Some(x.mul(y).to_string()),
        _ => None,
    };
    json!({
        "is_scalar": is_scalar,
        "prefactor": prefactor,
        "invariants": if is_scalar == Some(true) { json!([]) } else { Value::Null },
        "note": "the orbit is O_A × O_B, so B = B_A ⊗ B_B (each factor's sum is under factors[])",
    })
}

/// Run `cyclorb orbit SPEC --method product`.
pub fn run_product(args: &OrbitArgs, as_json: bool, started: Instant) -> Outcome {
    let Some(spec) = &args.spec else {
        return Outcome::Invalid("--method product needs a theory SPEC of the form A*B".into());
    };
    let Some((left, right)) = product_factors(spec) else {
        return Outcome::Invalid(format!(
            "--method product needs a Deligne product A*B; {spec} is not one"
        ));
    };
    if args.checkpoint.is_some() || args.resume.is_some() {
        return Outcome::Invalid(
            "--method product keeps no checkpoints (its factors are short runs); drop --checkpoint/--resume".into(),
        );
    }
    let conductor = match cyclorb_pipeline::proof::theory(spec) {
        Ok(theory) => theory.field().conductor(),
        Err(e) => return Outcome::Invalid(e),
    };
    let stop = Arc::new(AtomicBool::new(false));
    if let Err(e) = install_stop_handler(&stop) {
        return Outcome::Invalid(format!("cannot install the interrupt handler: {e}"));
    }
    let options = options(args, stop);
    let first = match factor(left, args, &options) {
        Ok(f) => f,
        Err(e) => return Outcome::Invalid(e),
    };
    // A*A: the second factor is the first (the diagonal action keeps the diagonal)
    let second = if right == left {
        None
    } else {
        match factor(right, args, &options) {
            Ok(f) => Some(f),
            Err(e) => return Outcome::Invalid(e),
        }
    };
    let (a, b) = (&first, second.as_ref().unwrap_or(&first));
    if a.generator_names != b.generator_names {
        return Outcome::Invalid(format!(
            "the factors' generators differ ({:?} and {:?})",
            a.generator_names, b.generator_names
        ));
    }
    let genus = args.genus.unwrap_or(0);
    let base = json!({
        "theory": spec,
        "genus": genus,
        "dimension": a.dimension * b.dimension,
        "conductor": conductor,
        "generators": a.generator_names.len(),
        "generator_names": a.generator_names,
        "method": "product",
        "factors": [factor_json(a), factor_json(b)],
    });
    let mut value = base;
    let (orbit_size, saturated, layers, note) = if !(a.saturated && b.saturated) {
        // the product's orbit maps onto each factor's orbit, so it is at least as large
        let found = a.orbit_size.max(b.orbit_size);
        (
            found,
            false,
            Value::Null,
            format!(
                "a factor's orbit stopped before closing; the product's orbit has at least {found} lines"
            ),
        )
    } else {
        let pairs = pair_orbit(&a.permutations, &b.permutations, args.limit);
        (
            pairs.pairs.len(),
            pairs.saturated,
            json!(pairs.layer_sizes),
            "pairs of factor lines under the diagonal action of the induced permutations".into(),
        )
    };
    value["orbit_size"] = json!(orbit_size);
    value["saturated"] = json!(saturated);
    value["layer_sizes"] = layers;
    value["note"] = json!(note);
    let sum = product_sum(a, b, saturated.then_some(orbit_size));
    let sum_line = match (sum["is_scalar"].as_bool(), sum["prefactor"].as_str()) {
        (Some(true), Some(lambda)) => {
            format!("Poincaré sum: B = {lambda} · G⁻¹ (scalar, B = B_A ⊗ B_B)")
        }
        (Some(false), _) => "Poincaré sum: B = B_A ⊗ B_B, not scalar".to_string(),
        _ => "Poincaré sum: not formed on this route".to_string(),
    };
    value["poincare_sum"] = sum;
    value["elapsed_seconds"] = json!(started.elapsed().as_secs_f64());
    value["peak_memory_bytes"] = json!(crate::runtime::peak_memory_bytes());
    let text = format!(
        "theory {spec} at genus {genus}: dimension {} = {} × {}, {} generators (product route)\n\
         factor {}: {} lines{}; factor {}: {} lines{}\n\
         orbit of the vacuum line: {} lines, {}\n\
         {sum_line}\n\
         time {:.2} s\n",
        a.dimension * b.dimension,
        a.dimension,
        b.dimension,
        a.generator_names.len(),
        a.spec,
        a.orbit_size,
        if a.saturated { "" } else { " (not closed)" },
        b.spec,
        b.orbit_size,
        if b.saturated { "" } else { " (not closed)" },
        orbit_size,
        if saturated {
            "saturated".to_string()
        } else {
            format!("not saturated after {orbit_size}")
        },
        started.elapsed().as_secs_f64(),
    );
    let report = Report::new(value, text, as_json);
    if saturated {
        Outcome::Done(report)
    } else {
        Outcome::Stopped(report)
    }
}
