//! Checks of the modular data: twists, S from the twists, unitarity, S² = C, (ST)³ and
//! the Verlinde formula.

use cyclorb_field::Cyc;
use cyclorb_matrix::Matrix;

use crate::arith::SameField;
use crate::theory::Theory;
use crate::verify::{Check, CheckId, Tally};
use crate::verlinde::Verlinde;

/// Every θ_a is a root of unity.
pub(crate) fn twist_order(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::TwistOrder);
    for a in 0..t.rank() {
        let ok = matches!(t.field().root_of_unity_order(t.twist(a)), Ok(Some(_)));
        if !tally.record(ok, || {
            format!("θ_{} = {} is not a root of unity", t.label(a), t.twist(a))
        }) {
            break;
        }
    }
    tally.finish()
}

/// S̃_ab θ_a θ_b = Σ_c N_{a*b}^c θ_c d_c for the stored S̃ (from the braiding, or from the
/// given S of modular data).
pub(crate) fn s_from_twists(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::SFromTwists);
    let f = t.field();
    let st = t.s_unnormalized();
    for a in 0..t.rank() {
        let ad = t.dual(a);
        for b in 0..t.rank() {
            let lhs = f.product([st.get(a, b), t.twist(a), t.twist(b)]);
            let mut rhs = f.zero();
            for &c in t.fusion_outcomes(ad, b) {
                let m = f.int(t.fusion_coefficient(ad, b, c) as i64);
                rhs = f.plus(&rhs, &f.product([&m, t.twist(c), t.quantum_dim(c)]));
            }
            if !tally.record(lhs == rhs, || {
                format!(
                    "at a={} b={}: S̃_ab θ_a θ_b = {lhs}, Σ_c N_{{a*b}}^c θ_c d_c = {rhs}",
                    t.label(a),
                    t.label(b)
                )
            }) {
                return tally.finish();
            }
        }
    }
    tally.finish()
}

fn first_difference(x: &Matrix, y: &Matrix) -> Option<(usize, usize)> {
    for i in 0..x.rows() {
        for j in 0..x.cols() {
            if x.get(i, j) != y.get(i, j) {
                return Some((i, j));
            }
        }
    }
    None
}

fn compare(tally: &mut Tally, t: &Theory, what: &str, x: &Matrix, y: &Matrix) {
    let diff = first_difference(x, y);
    tally.record(diff.is_none(), || {
        let (i, j) = diff.expect("a difference");
        format!(
            "{what}: entry ({}, {}) is {} on the left and {} on the right",
            t.label(i),
            t.label(j),
            x.get(i, j),
            y.get(i, j)
        )
    });
}

fn s_of(t: &Theory) -> &Matrix {
    t.s_matrix().expect("S is always present")
}

/// S·S† = 1 and S = Sᵀ.
pub(crate) fn s_unitary(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::SUnitary);
    let f = t.field();
    let s = s_of(t);
    compare(&mut tally, t, "S = Sᵀ", s, &s.transpose());
    if let Ok(p) = s.mul(f, &s.adjoint(f)) {
        compare(
            &mut tally,
            t,
            "S·S† = 1",
            &p,
            &Matrix::identity(f, t.rank()),
        );
    }
    tally.finish()
}

fn charge_conjugation(t: &Theory) -> Matrix {
    let f = t.field();
    let mut c = Matrix::zeros(f, t.rank(), t.rank());
    for a in 0..t.rank() {
        c.set(a, t.dual(a), f.one());
    }
    c
}

/// S² = C.
pub(crate) fn s_squared(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::SSquared);
    let s = s_of(t);
    if let Ok(s2) = s.mul(t.field(), s) {
        compare(&mut tally, t, "S² = C", &s2, &charge_conjugation(t));
    }
    tally.finish()
}

/// (ST)³ = (p₊/D)·S².
pub(crate) fn modular_relation(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::ModularRelation);
    let f = t.field();
    let s = s_of(t);
    let tm = Matrix::diagonal(f, t.twists());
    let result = (|| {
        let st = s.mul(f, &tm)?;
        let st3 = st.mul(f, &st)?.mul(f, &st)?;
        let rhs = s.mul(f, s)?.scale(f, t.gauss_phase())?;
        Ok::<_, cyclorb_matrix::MatrixError>((st3, rhs))
    })();
    if let Ok((lhs, rhs)) = result {
        compare(&mut tally, t, "(ST)³ = (p₊/D) S²", &lhs, &rhs);
    }
    tally.finish()
}

/// N_ab^c = Σ_x S_ax S_bx conj(S_cx)/S_0x for all a, b, c.
pub(crate) fn verlinde(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::Verlinde);
    let f = t.field();
    let Some(v) = Verlinde::new(f, s_of(t)) else {
        tally.record(false, || "some S_0x vanishes".into());
        return tally.finish();
    };
    for a in 0..t.rank() {
        for b in 0..t.rank() {
            let pair = v.pair(a, b);
            for c in 0..t.rank() {
                let value: Cyc = v.coefficient_with(&pair, c);
                let expected = f.int(t.fusion_coefficient(a, b, c) as i64);
                if !tally.record(value == expected, || {
                    format!(
                        "at a={} b={} c={}: the formula gives {value}, N_ab^c = {expected}",
                        t.label(a),
                        t.label(b),
                        t.label(c)
                    )
                }) {
                    return tally.finish();
                }
            }
        }
    }
    tally.finish()
}
