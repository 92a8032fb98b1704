//! Exact verification of a theory, check by check.
//!
//! Each check tests one family of equations exactly over the theory's field and stops at the
//! first failing instance, which it reports with its labels and both sides. Checks that need
//! F and R are skipped (not listed) for modular data alone. Equations with a vacuum label
//! among the outer legs of the pentagon and hexagons follow from the unit normalisation
//! (checked separately) and are not repeated.

mod braided;
mod fusion;
mod modular;
mod pentagon;
mod residue;

use std::fmt;

use cyclorb_field::FieldError;
use serde::Serialize;

use crate::theory::Theory;

/// The checks, in the order they run.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum CheckId {
    /// Unit, commutativity, duality (N_ab^c = N_{a*c}^b), associativity.
    FusionRules,
    /// d_0 = 1, d_a = d_a*, d_a d_b = Σ_c N_ab^c d_c.
    Dimensions,
    /// F and R with a vacuum leg are 1.
    UnitNormalisation,
    /// Every F-matrix is square and F·F⁻¹ = 1.
    FInvertible,
    /// The pentagon equation.
    Pentagon,
    /// The first hexagon.
    Hexagon,
    /// The second hexagon (R replaced by the inverse braiding).
    HexagonInverse,
    /// θ_a = Σ_c (d_c/d_a) R^{aa}_c, θ_0 = 1, θ_a = θ_a*.
    Twist,
    /// R^{ba}_c R^{ab}_c = θ_c/(θ_a θ_b).
    Balancing,
    /// d_a d_a* [F^{a a* a}_a]_00 [F^{a* a a*}_a*]_00 = 1.
    FrobeniusSchur,
    /// The vertex weights make the gauge unitary: F⁻¹ = W⁻¹ F† W, |R^{ab}_c|² = w(a,b,c)/w(b,a,c).
    InvariantForm,
    /// θ_a are roots of unity.
    TwistOrder,
    /// S̃_ab = Σ_c N_{a*b}^c θ_c d_c/(θ_a θ_b).
    SFromTwists,
    /// S·S† = 1 and S = Sᵀ.
    SUnitary,
    /// S² = C (charge conjugation).
    SSquared,
    /// (ST)³ = (p₊/D)·S².
    ModularRelation,
    /// N_ab^c = Σ_x S_ax S_bx conj(S_cx)/S_0x.
    Verlinde,
}

impl CheckId {
    /// Every check, in order.
    pub const ALL: [CheckId; 17] = [
        CheckId::FusionRules,
        CheckId::Dimensions,
        CheckId::UnitNormalisation,
        CheckId::FInvertible,
        CheckId::Pentagon,
        CheckId::Hexagon,
        CheckId::HexagonInverse,
        CheckId::Twist,
        CheckId::Balancing,
        CheckId::FrobeniusSchur,
        CheckId::InvariantForm,
        CheckId::TwistOrder,
        CheckId::SFromTwists,
        CheckId::SUnitary,
        CheckId::SSquared,
        CheckId::ModularRelation,
        CheckId::Verlinde,
    ];

    /// The stable name (used in JSON).
    pub fn name(self) -> &'static str {
        match self {
            CheckId::FusionRules => "fusion-rules",
            CheckId::Dimensions => "dimensions",
            CheckId::UnitNormalisation => "unit-normalisation",
            CheckId::FInvertible => "f-invertible",
            CheckId::Pentagon => "pentagon",
            CheckId::Hexagon => "hexagon",
            CheckId::HexagonInverse => "hexagon-inverse",
            CheckId::Twist => "twist",
            CheckId::Balancing => "balancing",
            CheckId::FrobeniusSchur => "frobenius-schur",
            CheckId::InvariantForm => "invariant-form",
            CheckId::TwistOrder => "twist-order",
            CheckId::SFromTwists => "s-from-twists",
            CheckId::SUnitary => "s-unitary",
            CheckId::SSquared => "s-squared",
            CheckId::ModularRelation => "modular-relation",
            CheckId::Verlinde => "verlinde",
        }
    }

    /// The equation, in words and symbols.
    pub fn equation(self) -> &'static str {
        match self {
            CheckId::FusionRules => "N_0a^b = δ_ab, N_ab^c = N_ba^c, N_ab^c = N_{a*c}^b, Σ_e N_ab^e N_ec^d = Σ_f N_bc^f N_af^d",
            CheckId::Dimensions => "d_0 = 1, d_a = d_a*, d_a d_b = Σ_c N_ab^c d_c",
            CheckId::UnitNormalisation => "F^{abc}_d = 1 and R^{ab}_c = 1 when a, b or c is the vacuum",
            CheckId::FInvertible => "F^{abc}_d square and F·F⁻¹ = 1",
            CheckId::Pentagon => "[F^{fcd}_e]_{gh} [F^{abh}_e]_{fk} = Σ_l [F^{abc}_g]_{fl} [F^{ald}_e]_{gk} [F^{bcd}_k]_{lh}",
            CheckId::Hexagon => "R^{ca}_e [F^{acb}_d]_{eg} R^{cb}_g = Σ_f [F^{cab}_d]_{ef} R^{cf}_d [F^{abc}_d]_{fg}",
            CheckId::HexagonInverse => "(R^{ac}_e)⁻¹ [F^{acb}_d]_{eg} (R^{bc}_g)⁻¹ = Σ_f [F^{cab}_d]_{ef} (R^{fc}_d)⁻¹ [F^{abc}_d]_{fg}",
            CheckId::Twist => "θ_a = Σ_c (d_c/d_a) R^{aa}_c, θ_0 = 1, θ_a = θ_a*",
            CheckId::Balancing => "R^{ba}_c R^{ab}_c = θ_c/(θ_a θ_b)",
            CheckId::FrobeniusSchur => "d_a d_a* [F^{a a* a}_a]_{00} [F^{a* a a*}_a*]_{00} = 1",
            CheckId::InvariantForm => "[F⁻¹]_{fe} = conj([F^{abc}_d]_{ef}) w(b,c,f) w(a,f,d)/(w(a,b,e) w(e,c,d)), |R^{ab}_c|² = w(a,b,c)/w(b,a,c)",
            CheckId::TwistOrder => "θ_a is a root of unity",
            CheckId::SFromTwists => "S̃_ab = Σ_c N_{a*b}^c θ_c d_c/(θ_a θ_b)",
            CheckId::SUnitary => "S·S† = 1, S = Sᵀ",
            CheckId::SSquared => "S² = C, C_ab = δ_{a b*}",
            CheckId::ModularRelation => "(S T)³ = (p₊/D)·S², T = diag(θ), p₊ = Σ_a d_a² θ_a",
            CheckId::Verlinde => "N_ab^c = Σ_x S_ax S_bx conj(S_cx)/S_0x",
        }
    }

    /// Whether the check needs F- and R-symbols.
    pub fn needs_fr(self) -> bool {
        matches!(
            self,
            CheckId::UnitNormalisation
                | CheckId::FInvertible
                | CheckId::Pentagon
                | CheckId::Hexagon
                | CheckId::HexagonInverse
                | CheckId::Twist
                | CheckId::Balancing
                | CheckId::FrobeniusSchur
                | CheckId::InvariantForm
        )
    }
}

impl fmt::Display for CheckId {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(self.name())
    }
}

/// The outcome of one check.
#[derive(Clone, Debug, Serialize)]
pub struct Check {
    /// Which check.
    pub id: CheckId,
    /// Its stable name.
    pub name: String,
    /// The equation checked.
    pub equation: String,
    /// Whether every instance holds.
    pub ok: bool,
    /// Number of instances checked (up to and including the first failure).
    pub instances: usize,
    /// The first failing instance, with labels and both sides.
    pub failure: Option<String>,
    /// When the check was proved on the theories this one is built from (see [`Route`]):
    /// their names. `None` when it was checked on this theory's own data.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub proved_on: Option<Vec<String>>,
}

/// The outcome of all checks run on a theory.
#[derive(Clone, Debug, Serialize)]
pub struct Verification {
    /// The theory's name.
    pub theory: String,
    /// The checks, in order.
    pub checks: Vec<Check>,
}

impl Verification {
    /// Whether every check holds.
    pub fn ok(&self) -> bool {
        self.checks.iter().all(|c| c.ok)
    }

    /// The first failing check.
    pub fn first_failure(&self) -> Option<&Check> {
        self.checks.iter().find(|c| !c.ok)
    }
}

/// Counts instances of one check and records the first failure.
pub(crate) struct Tally {
    id: CheckId,
    instances: usize,
    failure: Option<String>,
}

impl Tally {
    pub fn new(id: CheckId) -> Tally {
        Tally {
            id,
            instances: 0,
            failure: None,
        }
    }

    /// Record one instance; returns false (stop) on the first failure.
    pub fn record(&mut self, ok: bool, describe: impl FnOnce() -> String) -> bool {
        self.instances += 1;
        if !ok && self.failure.is_none() {
            self.failure = Some(describe());
        }
        ok
    }

    /// Count instances checked elsewhere (in parallel workers).
    pub fn add_instances(&mut self, n: usize) {
        self.instances += n;
    }

    pub fn finish(self) -> Check {
        Check {
            id: self.id,
            name: self.id.name().to_string(),
            equation: self.id.equation().to_string(),
            ok: self.failure.is_none(),
            instances: self.instances,
            failure: self.failure,
            proved_on: None,
        }
    }
}

/// How the equations that involve only F, R and the vertex weights (unit normalisation,
/// F-invertibility, pentagon, both hexagons, invariant form) are proved for a theory built
/// from others.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Route {
    /// On the theory's own data, every instance.
    Direct,
    /// For a Deligne product on both factors, for a Galois conjugate (and a change of
    /// spherical structure, which keeps F and R) on its base, recursively; directly otherwise.
    /// Sound because these equations are polynomial identities in F, R and the weights:
    /// the product's data are Kronecker products of the factors' (every equation of A ⊠ B is
    /// the product of an equation of A and one of B, sums over intermediate labels
    /// factorising), and σ_k is a field automorphism commuting with complex conjugation. The
    /// other checks (fusion, dimensions, twists, Frobenius–Schur, S and T) always run on the
    /// theory's own data.
    Structural,
}

/// The checks proved on the building blocks under [`Route::Structural`].
fn inherited(id: CheckId) -> bool {
    matches!(
        id,
        CheckId::UnitNormalisation
            | CheckId::FInvertible
            | CheckId::Pentagon
            | CheckId::Hexagon
            | CheckId::HexagonInverse
            | CheckId::InvariantForm
    )
}

/// The theories a composite theory's F- and R-symbols are built from (empty for a theory
/// whose data are its own).
fn building_blocks(theory: &Theory) -> Vec<&Theory> {
    theory
        .braiding
        .as_ref()
        .map_or_else(Vec::new, |b| b.source.building_blocks())
}

/// Refuse, before any F-symbol is computed, a verification whose F-symbols would pass the
/// memory budget: by the structural route only the building blocks' F-symbols are computed
/// in full (recursively down to theories whose data are their own), so only theirs are
/// counted; by the direct route the theory's own.
pub fn check_verification_storage(theory: &Theory, route: Route) -> Result<(), FieldError> {
    let blocks = building_blocks(theory);
    if route == Route::Direct || blocks.is_empty() {
        return theory.check_f_storage();
    }
    blocks
        .into_iter()
        .try_for_each(|block| check_verification_storage(block, route))
}

/// One check by the structural route: on the building blocks when inherited, else direct.
fn run_structural(theory: &Theory, id: CheckId) -> Check {
    let blocks = building_blocks(theory);
    if !inherited(id) || blocks.is_empty() {
        if inherited(id) {
            theory.compute_all_f();
        }
        return run(theory, id);
    }
    let mut instances = 0;
    let mut names = Vec::new();
    for block in blocks {
        let part = run_structural(block, id);
        instances += part.instances;
        names.push(block.name().to_string());
        if !part.ok {
            return Check {
                failure: part
                    .failure
                    .map(|f| format!("in {} (a building block): {f}", block.name())),
                instances,
                proved_on: Some(names),
                ..part
            };
        }
    }
    Check {
        id,
        name: id.name().to_string(),
        equation: id.equation().to_string(),
        ok: true,
        instances,
        failure: None,
        proved_on: Some(names),
    }
}

fn run(theory: &Theory, id: CheckId) -> Check {
    match id {
        CheckId::FusionRules => fusion::fusion_rules(theory),
        CheckId::Dimensions => fusion::dimensions(theory),
        CheckId::UnitNormalisation => braided::unit_normalisation(theory),
        CheckId::FInvertible => braided::f_invertible(theory),
        CheckId::Pentagon => pentagon::pentagon(theory),
        CheckId::Hexagon => braided::hexagon(theory, false),
        CheckId::HexagonInverse => braided::hexagon(theory, true),
        CheckId::Twist => braided::twist(theory),
        CheckId::Balancing => braided::balancing(theory),
        CheckId::FrobeniusSchur => braided::frobenius_schur(theory),
        CheckId::InvariantForm => braided::invariant_form(theory),
        CheckId::TwistOrder => modular::twist_order(theory),
        CheckId::SFromTwists => modular::s_from_twists(theory),
        CheckId::SUnitary => modular::s_unitary(theory),
        CheckId::SSquared => modular::s_squared(theory),
        CheckId::ModularRelation => modular::modular_relation(theory),
        CheckId::Verlinde => modular::verlinde(theory),
    }
}

/// Run the chosen checks by the structural route (those that need F and R are skipped for
/// modular data alone), calling `progress` before each one.
pub fn verify_selected(
    theory: &Theory,
    ids: &[CheckId],
    progress: &mut dyn FnMut(CheckId),
) -> Verification {
    verify_by(theory, ids, Route::Structural, progress)
}

/// Run the chosen checks by the given route, calling `progress` before each one.
pub fn verify_by(
    theory: &Theory,
    ids: &[CheckId],
    route: Route,
    progress: &mut dyn FnMut(CheckId),
) -> Verification {
    let structural = route == Route::Structural && !building_blocks(theory).is_empty();
    let heavy = [
        CheckId::FInvertible,
        CheckId::Pentagon,
        CheckId::Hexagon,
        CheckId::HexagonInverse,
        CheckId::InvariantForm,
    ];
    if !structural && theory.has_fr() && ids.iter().any(|id| heavy.contains(id)) {
        theory.compute_all_f();
    }
    let checks = ids
        .iter()
        .filter(|id| theory.has_fr() || !id.needs_fr())
        .map(|&id| {
            progress(id);
            if structural {
                run_structural(theory, id)
            } else {
                run(theory, id)
            }
        })
        .collect();
    Verification {
        theory: theory.name().to_string(),
        checks,
    }
}

/// Run every applicable check.
pub fn verify(theory: &Theory) -> Verification {
    verify_selected(theory, &CheckId::ALL, &mut |_| {})
}
