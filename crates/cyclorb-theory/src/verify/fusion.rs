//! Checks of the fusion rules and the quantum dimensions.

use crate::arith::SameField;
use crate::theory::Theory;
use crate::verify::{Check, CheckId, Tally};

/// Unit, commutativity, Frobenius reciprocity N_ab^c = N_{a*c}^b, involutive duals,
/// associativity, and multiplicity-freeness when F and R are present.
pub(crate) fn fusion_rules(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::FusionRules);
    let r = t.rank();
    let n = |a: usize, b: usize, c: usize| t.fusion_coefficient(a, b, c);
    let l = |a: usize| t.label(a);
    if t.has_fr() && !t.fusion().is_multiplicity_free() {
        tally.record(false, || {
            "a fusion coefficient exceeds 1 in a theory with F and R".into()
        });
        return tally.finish();
    }
    for a in 0..r {
        let d = t.dual(a);
        let ok =
            t.dual(d) == a && n(a, d, 0) == 1 && (0..r).filter(|&b| n(a, b, 0) != 0).count() == 1;
        if !tally.record(ok, || {
            format!("the dual of {} is not unique and involutive", l(a))
        }) {
            return tally.finish();
        }
        for b in 0..r {
            let unit = n(0, a, b) == u32::from(a == b);
            if !tally.record(unit, || format!("N_{{1 {}}}^{{{}}} ≠ δ", l(a), l(b))) {
                return tally.finish();
            }
            for c in 0..r {
                let x = n(a, b, c);
                let ok = x == n(b, a, c) && x == n(t.dual(a), c, b);
                if !tally.record(ok, || {
                    format!(
                        "at a={} b={} c={}: N_ab^c = {x}, N_ba^c = {}, N_{{a*c}}^b = {}",
                        l(a),
                        l(b),
                        l(c),
                        n(b, a, c),
                        n(t.dual(a), c, b)
                    )
                }) {
                    return tally.finish();
                }
            }
        }
    }
    // Associativity: for each (a, b, c), both sides for every d at once, accumulated over
    // the non-zero coefficients only.
    let mut left = vec![0u32; r];
    let mut right = vec![0u32; r];
    for a in 0..r {
        for b in 0..r {
            for c in 0..r {
                left.iter_mut().for_each(|x| *x = 0);
                right.iter_mut().for_each(|x| *x = 0);
                for &e in t.fusion_outcomes(a, b) {
                    for &d in t.fusion_outcomes(e, c) {
                        left[d] += n(a, b, e) * n(e, c, d);
                    }
                }
                for &f in t.fusion_outcomes(b, c) {
                    for &d in t.fusion_outcomes(a, f) {
                        right[d] += n(b, c, f) * n(a, f, d);
                    }
                }
                for d in 0..r {
                    let (left, right) = (left[d], right[d]);
                    if !tally.record(left == right, || {
                        format!(
                            "associativity at a={} b={} c={} d={}: Σ_e N_ab^e N_ec^d = {left}, Σ_f N_bc^f N_af^d = {right}",
                            l(a), l(b), l(c), l(d)
                        )
                    }) {
                        return tally.finish();
                    }
                }
            }
        }
    }
    tally.finish()
}

/// d_0 = 1, d_a = d_a*, d_a d_b = Σ_c N_ab^c d_c.
pub(crate) fn dimensions(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::Dimensions);
    let f = t.field();
    let d = |a: usize| t.quantum_dim(a);
    if !tally.record(d(0).is_one(), || format!("d_0 = {}", d(0))) {
        return tally.finish();
    }
    for a in 0..t.rank() {
        if !tally.record(d(a) == d(t.dual(a)), || {
            format!(
                "d_{} = {} but d_{} = {}",
                t.label(a),
                d(a),
                t.label(t.dual(a)),
                d(t.dual(a))
            )
        }) {
            return tally.finish();
        }
        for b in 0..t.rank() {
            let left = f.times(d(a), d(b));
            let mut right = f.zero();
            for &c in t.fusion_outcomes(a, b) {
                let m = f.int(t.fusion_coefficient(a, b, c) as i64);
                right = f.plus(&right, &f.times(&m, d(c)));
            }
            if !tally.record(left == right, || {
                format!(
                    "at a={} b={}: d_a d_b = {left}, Σ_c N_ab^c d_c = {right}",
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
