//! The orbit of a Deligne product's vacuum line found from its factors
//! (`--method product`).
//!
//! The genus-g block space of A ⊠ B is V_A ⊗ V_B, its vacuum is v_A ⊗ v_B, and each Dehn
//! twist acts as T_A ⊗ T_B up to a scalar. A line ⟨v ⊗ w⟩ determines ⟨v⟩ and ⟨w⟩ and is
//! determined by them, so the product's orbit is the orbit of the pair of vacuum lines under
//! the diagonal action of the permutations the twists induce on the two factor orbits
//! (`cyclorb_orbit::pair_orbit`). Each factor's orbit is enumerated and proved closed as
//! usual; only the factors ever meet field arithmetic, so the product's dimension
//! dim V_A · dim V_B never matters. The Poincaré sum follows from the factors' when the
//! orbit is all of O_A × O_B (B = B_A ⊗ B_B); otherwise this route does not form it.

use std::time::Instant;

use cyclorb_field::Rational;
use cyclorb_orbit::{pair_orbit, OrbitOptions, PoincareReport, Silent};

use crate::answer::{Count, FactorAnswer, FactorSum, OrbitAnswer, ProductFigures};
use crate::method::OrbitMethod;
use crate::{proof, space};

/// The two factors of a spec `A*B` split at its first `*` outside parentheses, or of a
/// built-in theory defined as a product (`tricritical-ising`).
pub fn product_factors(spec: &str) -> Option<(&str, &str)> {
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

/// One factor's orbit and, when it closed, the permutations the twists induce on it and
/// its Poincaré sum.
struct Factor {
    answer: FactorAnswer,
    generator_names: Vec<String>,
    permutations: Vec<Vec<u32>>,
    /// λ when B_A = λ·G_A⁻¹.
    prefactor: Option<Rational>,
}

fn factor(spec: &str, genus: usize, set: &str, options: &OrbitOptions) -> Result<Factor, String> {
    let problem =
        space::vacuum_problem(spec, genus, set).map_err(|e| format!("factor {spec}: {e}"))?;
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
        answer: FactorAnswer {
            spec: spec.to_string(),
            dimension: problem.dimension(),
            conductor: problem.field().conductor(),
            orbit_size: orbit.len(),
            saturated: orbit.is_saturated(),
            poincare_sum: FactorSum {
                is_scalar,
                prefactor: prefactor.as_ref().map(Rational::to_string),
            },
        },
        generator_names: problem.generators().names().to_vec(),
        permutations,
        prefactor,
    })
}

/// The product's Poincaré sum when it follows from the factors'. If the orbit is all of
/// O_A × O_B, then B = Σ_{i,j} (v_i ⊗ w_j)(v_i ⊗ w_j)† = B_A ⊗ B_B, and with
/// G = G_A ⊗ G_B it is scalar exactly when both factors' sums are, with λ = λ_A·λ_B.
/// Otherwise the orbit correlates the factors and this route does not form B.
fn product_sum(a: &Factor, b: &Factor, closed_size: Option<usize>) -> PoincareReport {
    let (na, nb) = (a.answer.orbit_size as u128, b.answer.orbit_size as u128);
    if !closed_size.is_some_and(|n| n as u128 == na * nb) {
        return PoincareReport::missing(
            "the orbit correlates the factors' lines; the product route does not form B (use --method enumerate)",
        );
    }
    let is_scalar = a
        .answer
        .poincare_sum
        .is_scalar
        .zip(b.answer.poincare_sum.is_scalar)
        .map(|(x, y)| x && y);
    let prefactor = match (&a.prefactor, &b.prefactor) {
        (Some(x), Some(y)) => Some(x.mul(y).to_string()),
        _ => None,
    };
    PoincareReport {
        is_scalar,
        prefactor,
        invariants: (is_scalar == Some(true)).then(Vec::new),
        note: Some(
            "the orbit is O_A × O_B, so B = B_A ⊗ B_B (each factor's sum is under factors[])"
                .into(),
        ),
        ..PoincareReport::default()
    }
}

/// The vacuum orbit of the Deligne product `spec` = A*B at genus g, from its factors'
/// orbits (each enumerated under `options`); `limit` caps the pairs. An orbit that does
/// not close is reported with `saturated: false` and the lines found so far (a lower bound).
pub fn product_orbit(
    spec: &str,
    genus: usize,
    set: &str,
    options: &OrbitOptions,
    limit: Option<usize>,
) -> Result<OrbitAnswer, String> {
    let started = Instant::now();
    let (left, right) = product_factors(spec).ok_or_else(|| {
        format!("--method product needs a Deligne product A*B; {spec} is not one")
    })?;
    let conductor = proof::theory(spec)?.field().conductor();
    let first = factor(left, genus, set, options)?;
    // A*A: the second factor is the first (the diagonal action keeps the diagonal)
    let second = if right == left {
        None
    } else {
        Some(factor(right, genus, set, options)?)
    };
    let (a, b) = (&first, second.as_ref().unwrap_or(&first));
    if a.generator_names != b.generator_names {
        return Err(format!(
            "the factors' generators differ ({:?} and {:?})",
            a.generator_names, b.generator_names
        ));
    }
    let (orbit_size, saturated, layer_sizes, note) = if !(a.answer.saturated && b.answer.saturated)
    {
        // the product's orbit maps onto each factor's orbit, so it is at least as large
        let found = a.answer.orbit_size.max(b.answer.orbit_size);
        let note = format!(
                "a factor's orbit stopped before closing; the product's orbit has at least {found} lines"
            );
        (found, false, None, note)
    } else {
        let pairs = pair_orbit(&a.permutations, &b.permutations, limit);
        let note = "pairs of factor lines under the diagonal action of the induced permutations";
        (
            pairs.pairs.len(),
            pairs.saturated,
            Some(pairs.layer_sizes),
            note.to_string(),
        )
    };
    Ok(OrbitAnswer {
        theory: Some(spec.to_string()),
        genus: Some(genus as u32),
        dimension: a.answer.dimension * b.answer.dimension,
        conductor,
        generators: a.generator_names.len(),
        generator_names: a.generator_names.clone(),
        method: OrbitMethod::Product,
        orbit_size: Some(Count::from(orbit_size)),
        saturated,
        stop_reason: None,
        layer_sizes,
        poincare_sum: product_sum(a, b, saturated.then_some(orbit_size)),
        elapsed_seconds: started.elapsed().as_secs_f64(),
        peak_memory_bytes: None,
        store: None,
        count: None,
        product: Some(ProductFigures {
            factors: vec![a.answer.clone(), b.answer.clone()],
            note,
        }),
        words: None,
    })
}
