//! Checks of the F- and R-symbols: normalisation, invertibility, pentagon, hexagons, twists,
//! balancing, Frobenius–Schur consistency and the invariant Hermitian form.

use cyclorb_field::{Cyc, CyclotomicField, DotAccumulator};
use cyclorb_matrix::Matrix;
use hashbrown::HashMap;

use crate::arith::SameField;
use crate::theory::Theory;
use crate::verify::{Check, CheckId, Tally};

fn names(t: &Theory, pairs: &[(&str, usize)]) -> String {
    pairs
        .iter()
        .map(|(k, v)| format!("{k}={}", t.label(*v)))
        .collect::<Vec<_>>()
        .join(" ")
}

/// F and R with a vacuum leg are the 1×1 identity.
pub(crate) fn unit_normalisation(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::UnitNormalisation);
    for (a, b, c, d) in t.f_block_labels() {
        if a != 0 && b != 0 && c != 0 {
            continue;
        }
        let ok = t
            .f_block(a, b, c, d)
            .is_some_and(|m| m.rows.len() == 1 && m.cols.len() == 1 && m.matrix.get(0, 0).is_one());
        if !tally.record(ok, || {
            format!(
                "F^{{abc}}_d at {} is not the 1×1 identity",
                names(t, &[("a", a), ("b", b), ("c", c), ("d", d)])
            )
        }) {
            return tally.finish();
        }
    }
    for (a, b, c, _) in t.fusion().triples() {
        if a != 0 && b != 0 {
            continue;
        }
        let r = t.r_symbol(a, b, c);
        if !tally.record(r.is_one(), || {
            format!(
                "R^{{ab}}_c = {r} at {}",
                names(t, &[("a", a), ("b", b), ("c", c)])
            )
        }) {
            return tally.finish();
        }
    }
    tally.finish()
}

/// Every F-matrix is square, has an inverse, and F·F⁻¹ = 1.
pub(crate) fn f_invertible(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::FInvertible);
    let field = t.field();
    for (a, b, c, d) in t.f_block_labels() {
        let at = || names(t, &[("a", a), ("b", b), ("c", c), ("d", d)]);
        let Some(fwd) = t.f_block(a, b, c, d) else {
            continue;
        };
        let inv = t.f_inverse_block(a, b, c, d);
        let ok = match inv {
            Some(inv) if fwd.rows.len() == fwd.cols.len() => fwd
                .matrix
                .mul(field, &inv.matrix)
                .is_ok_and(|p| p == Matrix::identity(field, fwd.rows.len())),
            _ => false,
        };
        if !tally.record(ok, || {
            format!("F^{{abc}}_d at {} is not square or not invertible", at())
        }) {
            return tally.finish();
        }
    }
    tally.finish()
}

/// The first hexagon, or with `inverse` the second one (R^{xy}_z ↦ (R^{yx}_z)⁻¹), for all
/// non-vacuum a, b, c.
pub(crate) fn hexagon(t: &Theory, inverse: bool) -> Check {
    let id = if inverse {
        CheckId::HexagonInverse
    } else {
        CheckId::Hexagon
    };
    let mut tally = Tally::new(id);
    let field = t.field();
    // the braiding used: R^{xy}_z, or (R^{yx}_z)⁻¹ (conjugation when |R| = 1)
    let mut braid_table: HashMap<(usize, usize, usize), Cyc> = HashMap::new();
    for (x, y, z, _) in t.fusion().triples() {
        let value = if inverse {
            let r = t.r_symbol(y, x, z);
            let conj = field.conj(&r);
            if field.times(&r, &conj).is_one() {
                conj
            } else {
                field.inverse(&r).unwrap_or_else(|| field.zero())
            }
        } else {
            t.r_symbol(x, y, z)
        };
        braid_table.insert((x, y, z), value);
    }
    let zero = field.zero();
    let braid = |x: usize, y: usize, z: usize| braid_table.get(&(x, y, z)).unwrap_or(&zero);
    let r = t.rank();
    for a in 1..r {
        for b in 1..r {
            for c in 1..r {
                let mut ds: Vec<usize> = t
                    .fusion_outcomes(a, b)
                    .iter()
                    .flat_map(|&f| t.fusion_outcomes(f, c).iter().copied())
                    .collect();
                ds.sort_unstable();
                ds.dedup();
                for d in ds {
                    let Some(f_acb) = t.f_block(a, c, b, d) else {
                        continue;
                    };
                    let (Some(f_cab), Some(f_abc)) = (t.f_block(c, a, b, d), t.f_block(a, b, c, d))
                    else {
                        tally.record(false, || {
                            format!(
                                "F^{{cab}}_d or F^{{abc}}_d is missing at {}",
                                names(t, &[("a", a), ("b", b), ("c", c), ("d", d)])
                            )
                        });
                        return tally.finish();
                    };
                    // M[e][f] = [F^{cab}_d]_{ef} R^{cf}_d
                    let m: Vec<Vec<Cyc>> = f_acb
                        .rows
                        .iter()
                        .map(|&e| {
                            f_cab
                                .cols
                                .iter()
                                .map(|&f| {
                                    f_cab.get(e, f).map_or_else(
                                        || field.zero(),
                                        |x| field.times(x, braid(c, f, d)),
                                    )
                                })
                                .collect()
                        })
                        .collect();
                    for (i, &e) in f_acb.rows.iter().enumerate() {
                        let left_factor = braid(c, a, e);
                        for (j, &g) in f_acb.cols.iter().enumerate() {
                            let lhs = field.product([
                                left_factor,
                                f_acb.matrix.get(i, j),
                                braid(c, b, g),
                            ]);
                            let mut acc = DotAccumulator::new(field);
                            for (mf, &f) in m[i].iter().zip(&f_cab.cols) {
                                if let Some(x) = f_abc.get(f, g) {
                                    acc.add_product(mf, x).expect("same field");
                                }
                            }
                            let rhs = acc.finish();
                            if !tally.record(lhs == rhs, || {
                                format!(
                                    "at {}: left side {lhs}, right side {rhs}",
                                    names(
                                        t,
                                        &[
                                            ("a", a),
                                            ("b", b),
                                            ("c", c),
                                            ("d", d),
                                            ("e", e),
                                            ("g", g)
                                        ]
                                    )
                                )
                            }) {
                                return tally.finish();
                            }
                        }
                    }
                }
            }
        }
    }
    tally.finish()
}

/// θ_a d_a = Σ_c d_c R^{aa}_c, θ_0 = 1, θ_a = θ_a*.
pub(crate) fn twist(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::Twist);
    let field = t.field();
    if !tally.record(t.twist(0).is_one(), || format!("θ_0 = {}", t.twist(0))) {
        return tally.finish();
    }
    for a in 0..t.rank() {
        let lhs = field.times(t.twist(a), t.quantum_dim(a));
        let rhs = field.dot_same(
            t.fusion_outcomes(a, a)
                .iter()
                .filter_map(|&c| t.r_ref(a, a, c).map(|r| (t.quantum_dim(c), r))),
        );
        if !tally.record(lhs == rhs, || {
            format!(
                "at a={}: θ_a d_a = {lhs}, Σ_c d_c R^{{aa}}_c = {rhs}",
                t.label(a)
            )
        }) {
            return tally.finish();
        }
        let ad = t.dual(a);
        if !tally.record(t.twist(a) == t.twist(ad), || {
            format!(
                "θ_{} = {} but θ_{} = {}",
                t.label(a),
                t.twist(a),
                t.label(ad),
                t.twist(ad)
            )
        }) {
            return tally.finish();
        }
    }
    tally.finish()
}

/// R^{ba}_c R^{ab}_c θ_a θ_b = θ_c.
pub(crate) fn balancing(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::Balancing);
    let field = t.field();
    for (a, b, c, _) in t.fusion().triples() {
        let lhs = field.product([
            &t.r_symbol(b, a, c),
            &t.r_symbol(a, b, c),
            t.twist(a),
            t.twist(b),
        ]);
        if !tally.record(&lhs == t.twist(c), || {
            format!(
                "at a={} b={} c={}: R^{{ba}}_c R^{{ab}}_c θ_a θ_b = {lhs}, θ_c = {}",
                t.label(a),
                t.label(b),
                t.label(c),
                t.twist(c)
            )
        }) {
            return tally.finish();
        }
    }
    tally.finish()
}

/// d_a d_a* [F^{a a* a}_a]_00 [F^{a* a a*}_a*]_00 = 1.
pub(crate) fn frobenius_schur(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::FrobeniusSchur);
    let field = t.field();
    for a in 1..t.rank() {
        let ad = t.dual(a);
        let x = t.f_symbol(a, ad, a, a, 0, 0);
        let y = t.f_symbol(ad, a, ad, ad, 0, 0);
        let value = field.product([t.quantum_dim(a), t.quantum_dim(ad), &x, &y]);
        if !tally.record(value.is_one(), || {
            format!("at a={}: the product is {value}", t.label(a))
        }) {
            return tally.finish();
        }
    }
    tally.finish()
}

/// [F⁻¹]_{fe} w(a,b,e) w(e,c,d) = conj([F]_{ef}) w(b,c,f) w(a,f,d) and
/// R^{ab}_c conj(R^{ab}_c) w(b,a,c) = w(a,b,c): the gauge is unitary relative to the weights,
/// so every generator built from it preserves the form G of docs/conventions.md §4.
pub(crate) fn invariant_form(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::InvariantForm);
    let field: &CyclotomicField = t.field();
    let mut weights: HashMap<(usize, usize, usize), Cyc> = HashMap::new();
    for (a, b, c, _) in t.fusion().triples() {
        weights.insert((a, b, c), t.vertex_weight(a, b, c));
    }
    let one = field.one();
    let weight = |a: usize, b: usize, c: usize| weights.get(&(a, b, c)).unwrap_or(&one);
    for (a, b, c, d) in t.f_block_labels() {
        let Some(fwd) = t.f_block(a, b, c, d) else {
            continue;
        };
        let inv = t.f_inverse_block(a, b, c, d);
        for (i, &e) in fwd.rows.iter().enumerate() {
            let row_w = field.times(weight(a, b, e), weight(e, c, d));
            for (j, &f) in fwd.cols.iter().enumerate() {
                let col_w = field.times(weight(b, c, f), weight(a, f, d));
                let inv_entry = inv
                    .and_then(|m| m.get(f, e))
                    .cloned()
                    .unwrap_or_else(|| field.zero());
                let lhs = field.times(&inv_entry, &row_w);
                let rhs = field.times(&field.conj(fwd.matrix.get(i, j)), &col_w);
                if !tally.record(lhs == rhs, || {
                    format!(
                        "at {}: [F⁻¹]_fe w w = {lhs}, conj(F_ef) w w = {rhs}",
                        names(
                            t,
                            &[("a", a), ("b", b), ("c", c), ("d", d), ("e", e), ("f", f)]
                        )
                    )
                }) {
                    return tally.finish();
                }
            }
        }
    }
    for (a, b, c, _) in t.fusion().triples() {
        let rr = t.r_symbol(a, b, c);
        let lhs = field.product([&rr, &field.conj(&rr), weight(b, a, c)]);
        let rhs = weight(a, b, c).clone();
        if !tally.record(lhs == rhs, || {
            format!(
                "at a={} b={} c={}: |R^{{ab}}_c|² w(b,a,c) = {lhs}, w(a,b,c) = {rhs}",
                t.label(a),
                t.label(b),
                t.label(c)
            )
        }) {
            return tally.finish();
        }
    }
    tally.finish()
}
