//! Checks of the modular data: twists, S from the twists, unitarity, S² = C, (ST)³ and
//! the Verlinde formula.

use cyclorb_field::{Cyc, ResidueMap};
use cyclorb_matrix::Matrix;

use crate::arith::SameField;
use crate::theory::Theory;
use crate::verify::residue::{identity_residues, EntryBounds, ResidueMatrix};
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

/// Whether `lhs` equals `rhs` (both built on the residues of one [`ResidueMap`] made for
/// the identity's degree and number of terms, see [`super::residue`]); when they differ the
/// exact comparison `exact` runs to report the first differing entry with both sides.
fn compare_on_residues(
    tally: &mut Tally,
    lhs: &ResidueMatrix,
    rhs: &ResidueMatrix,
    exact: impl FnOnce(&mut Tally),
) {
    if lhs.equals(rhs) {
        tally.record(true, String::new);
    } else {
        exact(tally);
    }
}

/// The identity matrix or a permutation matrix on residues: entry (a, target(a)) is 1.
fn permutation(map: &ResidueMap, t: &Theory, target: impl Fn(usize) -> usize) -> ResidueMatrix {
    let r = t.rank();
    ResidueMatrix::integers(map, t.field(), r, r, |a, b| i64::from(target(a) == b))
}

/// S·S† = 1 and S = Sᵀ; S·S† on residues (degree 2, r + 1 terms per entry).
pub(crate) fn s_unitary(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::SUnitary);
    let f = t.field();
    let s = s_of(t);
    compare(&mut tally, t, "S = Sᵀ", s, &s.transpose());
    let adjoint = s.adjoint(f);
    let r = t.rank();
    let entries = EntryBounds::of(f, s.entries().iter().chain(adjoint.entries()));
    let one = EntryBounds::integers(f, 1);
    let map = identity_residues(f, &[(&entries, 2), (&one, 1)], r as u128 + 1);
    let product = ResidueMatrix::of(&map, s).mul(&map, &ResidueMatrix::of(&map, &adjoint));
    compare_on_residues(
        &mut tally,
        &product,
        &permutation(&map, t, |a| a),
        |tally| {
            if let Ok(p) = s.mul(f, &adjoint) {
                compare(tally, t, "S·S† = 1", &p, &Matrix::identity(f, r));
            }
        },
    );
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

/// S² = C, on residues (degree 2, r + 1 terms per entry).
pub(crate) fn s_squared(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::SSquared);
    let f = t.field();
    let s = s_of(t);
    let entries = EntryBounds::of(f, s.entries());
    let one = EntryBounds::integers(f, 1);
    let map = identity_residues(f, &[(&entries, 2), (&one, 1)], t.rank() as u128 + 1);
    let reduced = ResidueMatrix::of(&map, s);
    let square = reduced.mul(&map, &reduced);
    compare_on_residues(
        &mut tally,
        &square,
        &permutation(&map, t, |a| t.dual(a)),
        |tally| {
            if let Ok(s2) = s.mul(f, s) {
                compare(tally, t, "S² = C", &s2, &charge_conjugation(t));
            }
        },
    );
    tally.finish()
}

/// (ST)³ = (p₊/D)·S², on residues: entry (a, b) of (ST)³ is Σ_{x,y} S_ax θ_x S_xy θ_y S_yb θ_b
/// (degree 6, r² terms) and of the right side Σ_x (p₊/D) S_ax S_xb (degree 3, r terms).
pub(crate) fn modular_relation(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::ModularRelation);
    let f = t.field();
    let s = s_of(t);
    let r = t.rank() as u128;
    let groups = [
        (EntryBounds::of(f, s.entries()), 3),
        (EntryBounds::of(f, t.twists()), 3),
        (EntryBounds::of(f, [t.gauss_phase()]), 1),
    ];
    let groups: Vec<(&EntryBounds, u32)> = groups.iter().map(|(g, k)| (g, *k)).collect();
    let map = identity_residues(f, &groups, r * r + r);
    let reduced = ResidueMatrix::of(&map, s);
    let twists = ResidueMatrix::from_fn(&map, 1, t.rank(), |_, x| t.twist(x));
    let st = reduced.scale_columns(&map, &twists);
    let lhs = st.mul(&map, &st).mul(&map, &st);
    let phase = map
        .reduce(t.gauss_phase())
        .expect("the ideals avoid every denominator of the entries");
    let rhs = reduced.mul(&map, &reduced).scale(&map, &phase);
    compare_on_residues(&mut tally, &lhs, &rhs, |tally| {
        let tm = Matrix::diagonal(f, t.twists());
        let result = (|| {
            let st = s.mul(f, &tm)?;
            let st3 = st.mul(f, &st)?.mul(f, &st)?;
            let rhs = s.mul(f, s)?.scale(f, t.gauss_phase())?;
            Ok::<_, cyclorb_matrix::MatrixError>((st3, rhs))
        })();
        if let Ok((lhs, rhs)) = result {
            compare(tally, t, "(ST)³ = (p₊/D) S²", &lhs, &rhs);
        }
    });
    tally.finish()
}

/// N_ab^c = Σ_x S_ax S_bx conj(S_cx)/S_0x for all a, b, c, on residues: S_ax/S_0x is computed
/// exactly (r² field products), then each instance is a sum of r products of three entries
/// minus an integer at most max N (degree 3, r + 1 terms), E word products per term. The
/// pairs (a, ·) are split over the available cores.
pub(crate) fn verlinde(t: &Theory) -> Check {
    let mut tally = Tally::new(CheckId::Verlinde);
    let f = t.field();
    let Some(v) = Verlinde::new(f, s_of(t)) else {
        tally.record(false, || "some S_0x vanishes".into());
        return tally.finish();
    };
    let r = t.rank();
    let largest = (0..r)
        .flat_map(|a| (0..r).flat_map(move |b| (0..r).map(move |c| (a, b, c))))
        .map(|(a, b, c)| t.fusion_coefficient(a, b, c))
        .max()
        .unwrap_or(0);
    // S_ax/S_0x once, S_bx and conj(S_cx) (one group: same denominators and bounds), N.
    let scaled_bounds = EntryBounds::of(f, v.scaled_entries());
    let s_bounds = EntryBounds::of(f, v.s_entries());
    let n_bounds = EntryBounds::integers(f, largest.into());
    let map = identity_residues(
        f,
        &[(&scaled_bounds, 1), (&s_bounds, 2), (&n_bounds, 1)],
        r as u128 + 1,
    );
    let scaled = ResidueMatrix::from_fn(&map, r, r, |a, x| v.scaled(a, x));
    let plain = ResidueMatrix::of(&map, s_of(t));
    let conj = ResidueMatrix::from_fn(&map, r, r, |c, x| v.conj(c, x));
    let integers = ResidueMatrix::integers(&map, f, 1, largest as usize + 1, |_, n| n as i64);
    let inputs = VerlindeResidues {
        theory: t,
        map: &map,
        scaled: &scaled,
        plain: &plain,
        conj: &conj,
        integers: &integers,
    };
    let threads = std::thread::available_parallelism()
        .map_or(1, |n| n.get())
        .clamp(1, r.max(1));
    let results: Vec<(usize, Option<[usize; 3]>)> = std::thread::scope(|scope| {
        let handles: Vec<_> = (0..threads)
            .map(|worker| {
                let inputs = &inputs;
                scope.spawn(move || {
                    let mut instances = 0;
                    for a in (worker..r).step_by(threads) {
                        if let Some(at) = inputs.first_failure(a, &mut instances) {
                            return (instances, Some(at));
                        }
                    }
                    (instances, None)
                })
            })
            .collect();
        handles
            .into_iter()
            .map(|h| h.join().expect("a Verlinde worker panicked"))
            .collect()
    });
    let instances: usize = results.iter().map(|(n, _)| n).sum();
    let failure = results.into_iter().filter_map(|(_, at)| at).min();
    tally.add_instances(instances.saturating_sub(1));
    tally.record(failure.is_none(), || {
        let [a, b, c] = failure.expect("a failure");
        let value: Cyc = v.coefficient_with(&v.pair(a, b), c);
        format!(
            "at a={} b={} c={}: the formula gives {value}, N_ab^c = {}",
            t.label(a),
            t.label(b),
            t.label(c),
            t.fusion_coefficient(a, b, c)
        )
    });
    tally.finish()
}

/// The reduced inputs of the Verlinde check: S_ax/S_0x, S_bx, conj(S_cx) and the integers
/// 0, 1, …, max N (one row).
struct VerlindeResidues<'a> {
    theory: &'a Theory,
    map: &'a ResidueMap,
    scaled: &'a ResidueMatrix,
    plain: &'a ResidueMatrix,
    conj: &'a ResidueMatrix,
    integers: &'a ResidueMatrix,
}

impl VerlindeResidues<'_> {
    /// Every instance (a, b, c) for one a, in the order of b, then c; adds to `instances`
    /// and returns the first failing one.
    fn first_failure(&self, a: usize, instances: &mut usize) -> Option<[usize; 3]> {
        let map = self.map;
        let ideals = map.len();
        let r = self.theory.rank();
        let mut pair = vec![0u64; ideals * r];
        for b in 0..r {
            for e in 0..ideals {
                let out = &mut pair[e * r..][..r];
                let (x, y) = (self.scaled.row(e, a), self.plain.row(e, b));
                for ((o, &p), &q) in out.iter_mut().zip(x).zip(y) {
                    *o = map.mul_at(e, p, q);
                }
            }
            for c in 0..r {
                *instances += 1;
                let n = self.theory.fusion_coefficient(a, b, c) as usize;
                let holds = (0..ideals).all(|e| {
                    map.dot_at(e, &pair[e * r..][..r], self.conj.row(e, c))
                        == self.integers.row(e, 0)[n]
                });
                if !holds {
                    return Some([a, b, c]);
                }
            }
        }
        None
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::spec::parse_spec;

    /// SU(2)_3 with S changed by `delta` at (1, 2) and (2, 1) (so S stays symmetric).
    fn with_changed_s(delta: &str) -> Theory {
        let mut t = parse_spec("su2:3").unwrap();
        let f = t.field().clone();
        let d = f.parse(delta).unwrap();
        for (i, j) in [(1, 2), (2, 1)] {
            let x = f.plus(t.s.get(i, j), &d);
            t.s.set(i, j, x);
        }
        t
    }

    /// The residue checks hold on correct data (SU(2)_3 satisfies every modular identity:
    /// Di Francesco–Mathieu–Sénéchal ch. 10 and 16) and fail, with both exact sides in the
    /// report, when one pair of entries of S is off by 1/1000 or by 2^100 (a change far above
    /// the unperturbed bound: the bound is taken from the data checked, so it grows too).
    #[test]
    fn residue_checks_accept_true_and_reject_changed_modular_data() {
        let t = parse_spec("su2:3").unwrap();
        for check in [s_unitary, s_squared, modular_relation, verlinde] {
            let c = check(&t);
            assert!(c.ok, "{:?}", c.failure);
        }
        for delta in ["1/1000", "1267650600228229401496703205376"] {
            let bad = with_changed_s(delta);
            for check in [s_unitary, s_squared, modular_relation, verlinde] {
                let c = check(&bad);
                assert!(!c.ok, "{} accepted S changed by {delta}", c.name);
                let failure = c.failure.unwrap();
                let both_sides = failure.contains("on the right") || failure.contains("N_ab^c =");
                assert!(both_sides, "{failure}");
            }
        }
    }

    /// The other sign of p₊/D breaks only (ST)³ = (p₊/D)·S² among these checks.
    #[test]
    fn a_wrong_gauss_phase_fails_only_the_modular_relation() {
        let mut t = parse_spec("su2:3").unwrap();
        t.gauss_phase = t.field().neg(&t.gauss_phase);
        assert!(!modular_relation(&t).ok);
        for check in [s_unitary, s_squared, verlinde] {
            assert!(check(&t).ok);
        }
    }

    /// A Verlinde failure names the instance and both sides: the fusion coefficient against
    /// the exact value of the formula.
    #[test]
    fn a_verlinde_failure_reports_the_exact_value() {
        let c = verlinde(&with_changed_s("1/1000"));
        let failure = c.failure.unwrap();
        assert!(failure.contains("the formula gives"), "{failure}");
        assert!(failure.contains("N_ab^c ="), "{failure}");
    }
}
