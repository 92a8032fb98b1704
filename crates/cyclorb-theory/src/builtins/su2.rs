//! SU(2)_k and its integer-spin part SO(3)_k, in the square-root-free gauge of docs/conventions.md §2–3.
//!
//! Labels are doubled spins J = 2j ∈ 0..k, q = exp(iπ/(k+2)), [n] = (qⁿ − q⁻ⁿ)/(q − q⁻¹).
//! With the trivalent vertex (a, b → c) scaled by u = 1/(Δ(a,b,c)·√[2c+1]) the F-symbols are
//! rational in q:
//!   [F^{abc}_d]_{ef} = (−1)^{a+b+c+d} [2f+1] Δ(b,c,f)² Δ(a,f,d)² · Rac(a,b,e;c,d,f),
//!   Δ(a,b,c)² = [a+b−c]![a−b+c]![−a+b+c]!/[a+b+c+1]!,
//!   Rac = Σ_z (−1)^z [z+1]! / ([z−a−b−e]! [z−c−d−e]! [z−a−d−f]! [z−b−c−f]!
//!                              [a+b+c+d−z]! [a+c+e+f−z]! [b+d+e+f−z]!),
//! R^{j₁j₂}_j = (−1)^{j−j₁−j₂} q^{j(j+1)−j₁(j₁+1)−j₂(j₂+1)}, θ_j = q^{2j(j+1)}, d_j = [2j+1].
//! The vertex weights are |u|² = 1/(Δ(a,b,c)²·[2c+1]) (so the handle weight of a is [2a+1]).
//! Since the unitary F is real orthogonal, the inverse in this gauge is
//!   [F⁻¹]_{fe} = [F]_{ef} · w(b,c,f) w(a,f,d) / (w(a,b,e) w(e,c,d))
//!             = (−1)^{a+b+c+d} [2e+1] Δ(a,b,e)² Δ(e,c,d)² · Rac(a,b,e;c,d,f).
//!
//! F-blocks are computed on first use. Rac depends only on the multiset of the four triad
//! sums (its lower limits) and of the three quadrilateral sums (its upper limits), so values
//! are cached under that key (12 679 distinct sums serve the 642 873 F-symbols of SU(2)₂₀);
//! sums are evaluated in Q(q) (conductor 2(k+2)) from cached q-factorials and embedded once.

use std::sync::{Mutex, OnceLock};

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;
use hashbrown::HashMap;

use crate::arith::SameField;
use crate::assemble::{assemble, conductor_for, RawF, RawStructure, RawTheory};
use crate::error::TheoryError;
use crate::fmatrix::FMatrix;
use crate::fusion::FusionRules;
use crate::structure::{key3, FBlock, FBlockSource, FSource};
use crate::theory::Theory;
use cyclorb_field::{canonical_conductor, root_of_unity};

/// Largest level accepted by `su2:K` and `so3:K`.
pub const MAX_LEVEL: u32 = 60;

/// q-integers and q-factorials of level k in Q(q).
#[derive(Debug)]
struct QNumbers {
    level: u32,
    field: CyclotomicField,
    /// [n] for 0 ≤ n ≤ k + 2.
    qint: Vec<Cyc>,
    /// [n]! for 0 ≤ n ≤ 2k + 2 (zero from n = k + 2 on).
    fact: Vec<Cyc>,
    /// 1/[n]! for 0 ≤ n ≤ k + 1.
    inv_fact: Vec<Cyc>,
}

impl QNumbers {
    fn new(level: u32) -> Result<QNumbers, TheoryError> {
        let h = 2 * (level as i64 + 2);
        let field = CyclotomicField::new(canonical_conductor(h as u64) as u32)?;
        let q = |t: i64| root_of_unity(&field, t, h).expect("q lies in Q(q)");
        let denom = field
            .inverse(&field.minus(&q(1), &q(-1)))
            .expect("q − q⁻¹ ≠ 0");
        let qint: Vec<Cyc> = (0..=level as i64 + 2)
            .map(|n| field.times(&field.minus(&q(n), &q(-n)), &denom))
            .collect();
        let mut fact = vec![field.one()];
        for n in 1..=(2 * level as usize + 2) {
            let next = match qint.get(n) {
                Some(x) => field.times(&fact[n - 1], x),
                None => field.zero(),
            };
            fact.push(next);
        }
        let mut inv_fact = vec![field.one()];
        for n in 1..=(level as usize + 1) {
            let inv = field
                .inverse(&qint[n])
                .ok_or_else(|| TheoryError::Internal(format!("[{n}] = 0 at level {level}")))?;
            inv_fact.push(field.times(&inv_fact[n - 1], &inv));
        }
        Ok(QNumbers {
            level,
            field,
            qint,
            fact,
            inv_fact,
        })
    }

    fn inv_fact(&self, n: u32) -> &Cyc {
        &self.inv_fact[n as usize]
    }

    /// Δ(a,b,c)² for doubled spins.
    fn delta_sq(&self, a: u32, b: u32, c: u32) -> Cyc {
        let top = self.field.product([
            &self.fact[((a + b - c) / 2) as usize],
            &self.fact[((a + c - b) / 2) as usize],
            &self.fact[((b + c - a) / 2) as usize],
        ]);
        self.field.times(&top, self.inv_fact((a + b + c) / 2 + 1))
    }

    /// The vertex weight 1/(Δ(a,b,c)²·[c+1]) (doubled spins).
    fn weight(&self, a: u32, b: u32, c: u32) -> Cyc {
        self.field.product([
            &self.fact[((a + b + c) / 2 + 1) as usize],
            self.inv_fact((a + b - c) / 2),
            self.inv_fact((a + c - b) / 2),
            self.inv_fact((b + c - a) / 2),
            &self.fact[c as usize],
            self.inv_fact(c + 1),
        ])
    }

    /// Σ_z (−1)^z [z+1]! / (Π_i [z − lower_i]! Π_j [upper_j − z]!).
    fn racah(&self, lower: [u32; 4], upper: [u32; 3]) -> Cyc {
        let fd = &self.field;
        let zmin = *lower.iter().max().expect("four bounds");
        let zmax = *upper.iter().min().expect("three bounds");
        let mut sum = fd.zero();
        for z in zmin..=zmax {
            let top = &self.fact[(z + 1) as usize];
            if top.is_zero() {
                continue;
            }
            let factors = lower
                .iter()
                .map(|&l| self.inv_fact(z - l))
                .chain(upper.iter().map(|&u| self.inv_fact(u - z)));
            let term = fd.times(top, &fd.product(factors));
            sum = if z % 2 == 0 {
                fd.plus(&sum, &term)
            } else {
                fd.minus(&sum, &term)
            };
        }
        sum
    }
}

/// The limits of a Racah sum: sorted triad sums (lower) and quadrilateral sums (upper).
type RacahKey = ([u32; 4], [u32; 3]);

/// The q-Racah machinery of SU(2)_k for one theory: q-numbers in Q(q) and caches of values
/// embedded in the theory's field.
#[derive(Debug)]
pub(crate) struct Su2Racah {
    q: QNumbers,
    /// Doubled spin of each label of the theory using it.
    spins: Vec<u32>,
    /// [n] in the theory's field, 0 ≤ n ≤ k + 2.
    qint: Vec<Cyc>,
    /// Δ(a,b,c)² in the theory's field, indexed by doubled spins (filled on first use).
    delta_sq: OnceLock<Vec<Option<Cyc>>>,
    /// Rac by sorted (lower, upper) limits, in the theory's field.
    racah: Mutex<HashMap<RacahKey, Cyc>>,
}

impl Su2Racah {
    fn new(
        q: QNumbers,
        spins: Vec<u32>,
        target: &CyclotomicField,
    ) -> Result<Su2Racah, TheoryError> {
        let qint = q
            .qint
            .iter()
            .map(|x| target.embed(x))
            .collect::<Result<_, _>>()?;
        Ok(Su2Racah {
            q,
            spins,
            qint,
            delta_sq: OnceLock::new(),
            racah: Mutex::new(HashMap::new()),
        })
    }

    fn delta_sq(&self, target: &CyclotomicField, a: u32, b: u32, c: u32) -> Cyc {
        let m = self.q.level as usize + 1;
        let table = self.delta_sq.get_or_init(|| {
            let mut t = vec![None; m * m * m];
            for x in 0..m as u32 {
                for y in 0..m as u32 {
                    for z in 0..m as u32 {
                        if admissible(self.q.level, x, y, z) {
                            let v = target
                                .embed(&self.q.delta_sq(x, y, z))
                                .expect("Q(q) is a subfield of the theory's field");
                            t[(x as usize * m + y as usize) * m + z as usize] = Some(v);
                        }
                    }
                }
            }
            t
        });
        table[(a as usize * m + b as usize) * m + c as usize]
            .clone()
            .unwrap_or_else(|| target.zero())
    }

    /// Rac(a,b,e;c,d,f) in the theory's field, `spins` = [a, b, e, c, d, f] doubled, through
    /// the cache.
    fn racah(&self, target: &CyclotomicField, spins: [u32; 6]) -> Cyc {
        let [a, b, e, c, d, f] = spins;
        let mut lower = [
            (a + b + e) / 2,
            (c + d + e) / 2,
            (a + d + f) / 2,
            (b + c + f) / 2,
        ];
        let mut upper = [
            (a + b + c + d) / 2,
            (a + c + e + f) / 2,
            (b + d + e + f) / 2,
        ];
        lower.sort_unstable();
        upper.sort_unstable();
        let key = (lower, upper);
        if let Some(v) = self.racah.lock().ok().and_then(|m| m.get(&key).cloned()) {
            return v;
        }
        let v = target
            .embed(&self.q.racah(lower, upper))
            .expect("Q(q) is a subfield of the theory's field");
        if let Ok(mut m) = self.racah.lock() {
            m.insert(key, v.clone());
        }
        v
    }

    /// The block [F^{abc}_d] (label indices) and its inverse, in `target`.
    fn racah_block(
        &self,
        target: &CyclotomicField,
        labels: (usize, usize, usize, usize),
        rows: Vec<usize>,
        cols: Vec<usize>,
    ) -> FBlock {
        let s = &self.spins;
        let (a, b, c, d) = (s[labels.0], s[labels.1], s[labels.2], s[labels.3]);
        let negative = ((a + b + c + d) / 2) % 2 == 1;
        let signed = |x: Cyc| if negative { target.neg(&x) } else { x };
        // [2f+1] Δ(b,c,f)² Δ(a,f,d)² per column, [2e+1] Δ(a,b,e)² Δ(e,c,d)² per row
        let col_factor: Vec<Cyc> = cols
            .iter()
            .map(|&f| {
                let f = s[f];
                target.product([
                    &self.qint[f as usize + 1],
                    &self.delta_sq(target, b, c, f),
                    &self.delta_sq(target, a, f, d),
                ])
            })
            .collect();
        let row_factor: Vec<Cyc> = rows
            .iter()
            .map(|&e| {
                let e = s[e];
                target.product([
                    &self.qint[e as usize + 1],
                    &self.delta_sq(target, a, b, e),
                    &self.delta_sq(target, e, c, d),
                ])
            })
            .collect();
        let mut forward = vec![Vec::with_capacity(cols.len()); rows.len()];
        let mut inverse = vec![Vec::with_capacity(rows.len()); cols.len()];
        for (i, &e) in rows.iter().enumerate() {
            for (j, &f) in cols.iter().enumerate() {
                let rac = signed(self.racah(target, [a, b, s[e], c, d, s[f]]));
                forward[i].push(target.times(&rac, &col_factor[j]));
                inverse[j].push(target.times(&rac, &row_factor[i]));
            }
        }
        let forward = Matrix::from_rows(forward).expect("rows of one length");
        let inverse = Matrix::from_rows(inverse).expect("rows of one length");
        FBlock {
            forward: FMatrix::new(rows.clone(), cols.clone(), forward, target),
            inverse: Some(FMatrix::new(cols, rows, inverse, target)),
        }
    }
}

/// The name of doubled spin J: "0", "1/2", "1", "3/2", …
fn spin_name(j: u32) -> String {
    if j % 2 == 0 {
        (j / 2).to_string()
    } else {
        format!("{j}/2")
    }
}

/// Whether (j1, j2 → j) is admissible at level k (doubled spins).
fn admissible(k: u32, j1: u32, j2: u32, j: u32) -> bool {
    (j1 + j2 + j) % 2 == 0 && j1.abs_diff(j2) <= j && j <= j1 + j2 && j1 + j2 + j <= 2 * k
}

/// The fusion rules on the given doubled spins (a set closed under fusion).
fn fusion_on(k: u32, spins: &[u32]) -> Result<FusionRules, TheoryError> {
    let mut triples = Vec::new();
    for (a, &ja) in spins.iter().enumerate() {
        for (b, &jb) in spins.iter().enumerate() {
            for (c, &jc) in spins.iter().enumerate() {
                if admissible(k, ja, jb, jc) {
                    triples.push((a, b, c, 1));
                }
            }
        }
    }
    FusionRules::from_triples(spins.len(), triples)
        .map_err(|e| TheoryError::Internal(format!("SU(2)_{k} fusion: {e:?}")))
}

struct Skeleton {
    dims: Vec<Cyc>,
    twists: Vec<Cyc>,
}

fn skeleton(field: &CyclotomicField, q: &QNumbers, spins: &[u32]) -> Result<Skeleton, TheoryError> {
    let h = 4 * (q.level as i64 + 2);
    let mut dims = Vec::new();
    let mut twists = Vec::new();
    for &j in spins {
        dims.push(field.embed(&q.qint[j as usize + 1])?);
        // θ_j = q^{2j(j+1)} = exp(2πi · J(J+2)/(4(k+2)))
        let t = (j * (j + 2)) as i64;
        twists.push(root_of_unity(field, t, h).expect("θ lies in Q(ζ_{4(k+2)})"));
    }
    Ok(Skeleton { dims, twists })
}

fn build(name: String, level: u32, spins: Vec<u32>) -> Result<Theory, TheoryError> {
    let q = QNumbers::new(level)?;
    let fusion = fusion_on(level, &spins)?;
    let base = CyclotomicField::new(4 * (level + 2))?;
    let sk = skeleton(&base, &q, &spins)?;
    let n = conductor_for(&name, &base, &sk.dims, &sk.twists)?;
    let field = CyclotomicField::new(n)?;
    let sk = skeleton(&field, &q, &spins)?;
    let rank = spins.len();
    let eight = 8 * (level as i64 + 2);
    let mut r = HashMap::new();
    let mut weights = HashMap::new();
    for (a, b, c, _) in fusion.triples() {
        let (ja, jb, jc) = (spins[a] as i64, spins[b] as i64, spins[c] as i64);
        // q^{j(j+1) − j1(j1+1) − j2(j2+1)} = exp(2πi·x/(8(k+2))), x in doubled spins
        let x = jc * (jc + 2) - ja * (ja + 2) - jb * (jb + 2);
        let phase = root_of_unity(&field, x, eight).expect("R lies in Q(ζ_{4(k+2)})");
        let sign_odd = ((jc - ja - jb) / 2).rem_euclid(2) == 1;
        r.insert(
            key3(rank, a, b, c),
            if sign_odd { field.neg(&phase) } else { phase },
        );
        let w = field.embed(&q.weight(spins[a], spins[b], spins[c]))?;
        if !w.is_one() {
            weights.insert(key3(rank, a, b, c), w);
        }
    }
    let labels = spins.iter().map(|&j| spin_name(j)).collect();
    let racah = Su2Racah::new(q, spins, &field)?;
    assemble(RawTheory {
        name,
        field,
        labels,
        fusion,
        dims: sk.dims,
        twists: sk.twists,
        structure: RawStructure::Braided {
            f: RawF::Lazy(FSource::Computed(std::sync::Arc::new(racah))),
            r,
            weights,
        },
    })
}

fn check_level(spec: &str, level: u32) -> Result<(), TheoryError> {
    if level == 0 || level > MAX_LEVEL {
        return Err(TheoryError::Spec {
            spec: spec.to_string(),
            reason: format!("the level must be between 1 and {MAX_LEVEL}"),
        });
    }
    Ok(())
}

/// SU(2) at level k: labels j = 0, 1/2, …, k/2.
pub fn su2(level: u32) -> Result<Theory, TheoryError> {
    let name = format!("su2:{level}");
    check_level(&name, level)?;
    build(name, level, (0..=level).collect())
}

/// SO(3)_k for odd k: the integer spins j = 0, 1, …, (k−1)/2 of SU(2)_k.
pub fn so3(level: u32) -> Result<Theory, TheoryError> {
    let name = format!("so3:{level}");
    check_level(&name, level)?;
    if level % 2 == 0 {
        return Err(TheoryError::Spec {
            spec: name,
            reason: "the level must be odd (for even k the integer spins are not modular)".into(),
        });
    }
    build(name, level, (0..level).step_by(2).collect())
}

/// The q-Racah formula as the theory's source of F-blocks (also for the integer-spin part).
impl FBlockSource for Su2Racah {
    fn block(
        &self,
        field: &CyclotomicField,
        labels: (usize, usize, usize, usize),
        rows: Vec<usize>,
        cols: Vec<usize>,
    ) -> FBlock {
        self.racah_block(field, labels, rows, cols)
    }
}
