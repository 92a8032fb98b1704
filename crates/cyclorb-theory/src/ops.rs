//! Operations on theories: Deligne products, Galois conjugates, renaming labels.

use std::sync::Arc;

use cyclorb_field::{check_budget, Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;
use hashbrown::HashMap;
use num_integer::Integer;

use crate::arith::SameField;
use crate::assemble::{assemble, RawF, RawStructure, RawTheory};
use crate::composite::{GaloisBlocks, ProductBlocks};
use crate::error::TheoryError;
use crate::fusion::FusionRules;
use crate::size::product_bytes;
use crate::structure::{key3, key4, FBlock, FSource};
use crate::theory::Theory;
use cyclorb_field::canonical_conductor;

/// The Deligne product A ⊠ B: labels are pairs (a, b) with index a·rank(B) + b and name
/// "a*b"; N, F, R, θ, d and vertex weights multiply, S = S_A ⊗ S_B, c adds. The field is
/// Q(ζ_lcm(n_A, n_B)). F-blocks are Kronecker products, computed on first use. When either
/// factor is modular data alone, so is the product.
pub fn product(left: &Theory, right: &Theory) -> Result<Theory, TheoryError> {
    let n = canonical_conductor((left.conductor() as u64).lcm(&(right.conductor() as u64)));
    let field = CyclotomicField::new(n as u32)?;
    let (r1, r2) = (left.rank(), right.rank());
    check_budget(
        || format!("the product {}*{}", left.name(), right.name()),
        u64::try_from(product_bytes(left, right, field.degree())).unwrap_or(u64::MAX),
    )?;
    let rank = r1 * r2;
    let emb = |x: &Cyc| field.embed(x);
    let both =
        |x: &Cyc, y: &Cyc| -> Result<Cyc, TheoryError> { Ok(field.times(&emb(x)?, &emb(y)?)) };
    let mut labels = Vec::with_capacity(rank);
    let mut dims = Vec::with_capacity(rank);
    let mut twists = Vec::with_capacity(rank);
    for a in 0..r1 {
        for b in 0..r2 {
            labels.push(format!("{}*{}", left.label(a), right.label(b)));
            dims.push(both(left.quantum_dim(a), right.quantum_dim(b))?);
            twists.push(both(left.twist(a), right.twist(b))?);
        }
    }
    let mut triples = Vec::new();
    for (a1, b1, c1, m1) in left.fusion().triples() {
        for (a2, b2, c2, m2) in right.fusion().triples() {
            triples.push((a1 * r2 + a2, b1 * r2 + b2, c1 * r2 + c2, m1 * m2));
        }
    }
    let fusion = FusionRules::from_triples(rank, triples)
        .map_err(|e| TheoryError::Internal(format!("product fusion: {e:?}")))?;
    let structure = if left.has_fr() && right.has_fr() {
        let mut r = HashMap::new();
        let mut weights = HashMap::new();
        for (a1, b1, c1, _) in left.fusion().triples() {
            for (a2, b2, c2, _) in right.fusion().triples() {
                let key = key3(rank, a1 * r2 + a2, b1 * r2 + b2, c1 * r2 + c2);
                r.insert(
                    key,
                    both(&left.r_symbol(a1, b1, c1), &right.r_symbol(a2, b2, c2))?,
                );
                let w = both(
                    &left.vertex_weight(a1, b1, c1),
                    &right.vertex_weight(a2, b2, c2),
                )?;
                if !w.is_one() {
                    weights.insert(key, w);
                }
            }
        }
        RawStructure::Braided {
            f: RawF::Lazy(FSource::Computed(Arc::new(ProductBlocks {
                left: Arc::new(left.clone()),
                right: Arc::new(right.clone()),
            }))),
            r,
            weights,
        }
    } else {
        let (sa, sb) = (left.s_matrix_ref(), right.s_matrix_ref());
        let mut s = Matrix::zeros(&field, rank, rank);
        for a in 0..rank {
            for b in 0..rank {
                let x = both(sa.get(a / r2, b / r2), sb.get(a % r2, b % r2))?;
                s.set(a, b, x);
            }
        }
        RawStructure::ModularData { s }
    };
    assemble(RawTheory {
        name: format!("{}*{}", left.name(), right.name()),
        field,
        labels,
        fusion,
        dims,
        twists,
        structure,
    })
}

/// The Galois conjugate σ_k (ζ_n ↦ ζ_n^k, gcd(k, n) = 1) of every number of the theory:
/// F, R, θ, d, vertex weights (and S for modular data). D is recomputed (positive), c with it.
/// Since σ_k commutes with complex conjugation, σ_k of an invariant Hermitian form is one for
/// the conjugate theory, so the weights stay meaningful (the form may become indefinite).
/// σ_1 (k ≡ 1 mod n) is the identity and returns the theory unchanged, name included.
pub fn galois(theory: &Theory, k: i64) -> Result<Theory, TheoryError> {
    let field = theory.field().clone();
    let n = field.conductor() as i64;
    let name = if k.rem_euclid(n.max(2)) == (n - 1).rem_euclid(n.max(2)) {
        format!("conj({})", theory.name())
    } else {
        format!("galois:{k}({})", theory.name())
    };
    if k.gcd(&n) != 1 {
        return Err(TheoryError::Spec {
            spec: name,
            reason: format!("σ_{k} needs gcd({k}, {n}) = 1 (the conductor is {n})"),
        });
    }
    if k.rem_euclid(n.max(1)) == 1 % n.max(1) {
        // σ_1 is the identity.
        return Ok(theory.clone());
    }
    let sigma = |x: &Cyc| -> Result<Cyc, TheoryError> { Ok(field.galois(x, k)?) };
    let dims = theory
        .quantum_dims()
        .iter()
        .map(sigma)
        .collect::<Result<Vec<_>, _>>()?;
    let twists = theory
        .twists()
        .iter()
        .map(sigma)
        .collect::<Result<Vec<_>, _>>()?;
    let structure = match &theory.braiding {
        Some(braiding) => RawStructure::Braided {
            f: RawF::Lazy(FSource::Computed(Arc::new(GaloisBlocks {
                base: Arc::new(theory.clone()),
                k,
            }))),
            r: braiding
                .r
                .iter()
                .map(|(key, x)| Ok((*key, sigma(x)?)))
                .collect::<Result<_, TheoryError>>()?,
            weights: theory
                .weights
                .iter()
                .map(|(key, x)| Ok((*key, sigma(x)?)))
                .collect::<Result<_, TheoryError>>()?,
        },
        None => RawStructure::ModularData {
            s: theory.s_matrix_ref().map(|x| field.galois(x, k))?,
        },
    };
    assemble(RawTheory {
        name,
        field: field.clone(),
        labels: theory.labels().to_vec(),
        fusion: theory.fusion().clone(),
        dims,
        twists,
        structure,
    })
}

/// Complex conjugation σ_{−1}: R, θ and S conjugated (c ↦ −c); F conjugated too.
pub fn conjugate(theory: &Theory) -> Result<Theory, TheoryError> {
    galois(theory, -1)
}

/// The same theory under a new name and new label names (one per label, distinct).
pub fn renamed(theory: &Theory, name: &str, labels: Vec<String>) -> Result<Theory, TheoryError> {
    into_renamed(theory.clone(), name, labels)
}

/// [`renamed`], consuming the theory (no copy of its data).
pub(crate) fn into_renamed(
    theory: Theory,
    name: &str,
    labels: Vec<String>,
) -> Result<Theory, TheoryError> {
    let mut sorted = labels.clone();
    sorted.sort();
    sorted.dedup();
    if labels.len() != theory.rank() || sorted.len() != labels.len() {
        return Err(TheoryError::Spec {
            spec: name.to_string(),
            reason: "label names must be distinct, one per label".into(),
        });
    }
    let mut t = theory;
    t.name = name.to_string();
    t.labels = labels;
    t.hash = Default::default();
    Ok(t)
}

/// The same braided category with the spherical structure changed by the Z₂-grading `odd`
/// (N_ab^c ≠ 0 ⇒ odd(c) = odd(a) xor odd(b)): d_a ↦ χ(a) d_a and θ_a ↦ χ(a) θ_a with
/// χ(a) = −1 on odd labels; F, R and the vertex weights are unchanged. The twist identity
/// θ_a = Σ_c (d_c/d_a) R^{aa}_c holds again because every c in a ⊗ a is even, balancing
/// because χ is a character of the grading, and S̃ becomes χ(a)χ(b) S̃_ab, still invertible,
/// so the result is modular with c recomputed from the Gauss sum. On SU(2)_k graded by 2j
/// mod 2 this gives d_j = (−1)^{2j} [2j+1]_q, the sign that Kac's formula needs for the
/// minimal models (see the builtin `minimal`).
pub fn spherical_twist(theory: &Theory, odd: &[bool]) -> Result<Theory, TheoryError> {
    let name = format!("spherical-twist({})", theory.name());
    let Some(braiding) = &theory.braiding else {
        return Err(TheoryError::Spec {
            spec: name,
            reason: "a change of spherical structure needs F- and R-symbols".into(),
        });
    };
    if odd.len() != theory.rank() || odd.first() == Some(&true) {
        return Err(TheoryError::Spec {
            spec: name,
            reason: "the grading needs one entry per label, even on the vacuum".into(),
        });
    }
    if let Some((a, b, c, _)) = theory
        .fusion()
        .triples()
        .into_iter()
        .find(|&(a, b, c, _)| odd[c] != (odd[a] ^ odd[b]))
    {
        return Err(TheoryError::Spec {
            spec: name,
            reason: format!("not a Z₂-grading: N_{{{a} {b}}}^{c} ≠ 0 breaks it"),
        });
    }
    let field = theory.field().clone();
    let signed = |values: &[Cyc]| -> Vec<Cyc> {
        values
            .iter()
            .zip(odd)
            .map(|(x, &o)| if o { field.neg(x) } else { x.clone() })
            .collect()
    };
    assemble(RawTheory {
        name,
        field: field.clone(),
        labels: theory.labels().to_vec(),
        fusion: theory.fusion().clone(),
        dims: signed(theory.quantum_dims()),
        twists: signed(theory.twists()),
        structure: RawStructure::Braided {
            // σ_1 is the identity: the blocks are the base's.
            f: RawF::Lazy(FSource::Computed(Arc::new(GaloisBlocks {
                base: Arc::new(theory.clone()),
                k: 1,
            }))),
            r: braiding.r.clone(),
            weights: theory.weights.clone(),
        },
    })
}

/// The same category with the total dimension of the other sign, D ↦ −D: F, R, θ, d, S̃ and
/// the vertex weights are unchanged, S = S̃/D and exp(2πi c/8) = p₊/D change sign and c mod 8
/// gains 4. Both signs satisfy every modular relation ((ST)³ = (p₊/D)·S² is covariant);
/// non-unitary minimal models use the sign with D = 1/S₀₀ of Kac's formula.
pub fn with_negated_total_dimension(theory: &Theory) -> Result<Theory, TheoryError> {
    into_negated_total_dimension(theory.clone())
}

/// [`with_negated_total_dimension`], consuming the theory (no copy of its F-cells).
pub(crate) fn into_negated_total_dimension(theory: Theory) -> Result<Theory, TheoryError> {
    let field = theory.field().clone();
    let mut t = theory;
    t.total_dim = field.neg(&t.total_dim);
    t.gauss_phase = field.neg(&t.gauss_phase);
    t.s = t.s.map(|x| Ok(field.neg(x)))?;
    t.central = t
        .central
        .add(&cyclorb_field::Rational::from_int(4))
        .rem_euclid(8);
    t.hash = Default::default();
    Ok(t)
}

impl Theory {
    pub(crate) fn s_matrix_ref(&self) -> &Matrix {
        &self.s
    }
}

/// The theory in another gauge: the splitting vertex (a, b → c) is rescaled by u(a, b, c)
/// (taken as 1 when a or b is the vacuum, so the unit normalisation survives). Following
/// docs/conventions.md §2–3, [F^{abc}_d]_{ef} gains u^{ab}_e u^{ec}_d/(u^{bc}_f u^{af}_d), R^{ab}_c gains
/// u^{ab}_c/u^{ba}_c and the vertex weight w(a,b,c) gains |u^{ab}_c|². Every block is computed
/// (the result stores them). Fails for modular data alone or a vanishing factor.
pub fn regauged(
    theory: &Theory,
    name: &str,
    u: impl Fn(usize, usize, usize) -> Cyc,
) -> Result<Theory, TheoryError> {
    let Some(braiding) = &theory.braiding else {
        return Err(TheoryError::Spec {
            spec: name.to_string(),
            reason: "a gauge change needs F- and R-symbols".into(),
        });
    };
    let field = theory.field().clone();
    let rank = theory.rank();
    let mut factor = HashMap::new();
    let mut inverse = HashMap::new();
    for (a, b, c, _) in theory.fusion().triples() {
        let x = if a == 0 || b == 0 {
            field.one()
        } else {
            u(a, b, c)
        };
        let inv = field.inverse(&x).ok_or_else(|| TheoryError::Spec {
            spec: name.to_string(),
            reason: format!("the gauge factor at ({a}, {b}, {c}) vanishes"),
        })?;
        factor.insert((a, b, c), x);
        inverse.insert((a, b, c), inv);
    }
    let one = field.one();
    let fac = |a: usize, b: usize, c: usize| factor.get(&(a, b, c)).unwrap_or(&one);
    let inv = |a: usize, b: usize, c: usize| inverse.get(&(a, b, c)).unwrap_or(&one);
    let mut blocks = HashMap::new();
    for (a, b, c, d) in theory.f_block_labels() {
        let Some(fwd) = theory.f_block(a, b, c, d) else {
            continue;
        };
        let scale = |e: usize, f: usize| {
            field.product([fac(a, b, e), fac(e, c, d), inv(b, c, f), inv(a, f, d)])
        };
        let forward = fwd.map_indexed(&field, |e, f, x| field.times(x, &scale(e, f)));
        let backward = theory.f_inverse_block(a, b, c, d).map(|m| {
            m.map_indexed(&field, |f, e, x| {
                field.times(x, &field.inverse(&scale(e, f)).expect("non-zero"))
            })
        });
        blocks.insert(
            key4(rank, a, b, c, d),
            FBlock {
                forward,
                inverse: backward,
            },
        );
    }
    let mut r = HashMap::new();
    let mut weights = HashMap::new();
    for (a, b, c, _) in theory.fusion().triples() {
        let key = key3(rank, a, b, c);
        if let Some(x) = braiding.r.get(&key) {
            r.insert(key, field.product([x, fac(a, b, c), inv(b, a, c)]));
        }
        let size = field.times(fac(a, b, c), &field.conj(fac(a, b, c)));
        let w = field.times(&theory.vertex_weight(a, b, c), &size);
        if !w.is_one() {
            weights.insert(key, w);
        }
    }
    assemble(RawTheory {
        name: name.to_string(),
        field: field.clone(),
        labels: theory.labels().to_vec(),
        fusion: theory.fusion().clone(),
        dims: theory.quantum_dims().to_vec(),
        twists: theory.twists().to_vec(),
        structure: RawStructure::Braided {
            f: RawF::Blocks(blocks),
            r,
            weights,
        },
    })
}

/// A reproducible non-unitary gauge: u(a, b, c) = m + ζ_n^j with m ∈ {2, 3} and j drawn from
/// a generator seeded by `seed` (|ζ^j| = 1 < m, so u ≠ 0). Spec syntax `gauge:SEED(A)`.
pub fn random_gauge(theory: &Theory, seed: u64) -> Result<Theory, TheoryError> {
    let n = theory.conductor() as u64;
    let field = theory.field().clone();
    let rank = theory.rank() as u64;
    let draw = |a: usize, b: usize, c: usize| {
        // splitmix64 of (seed, a, b, c)
        let mut x = seed.wrapping_add(0x9e37_79b9_7f4a_7c15).wrapping_add(
            ((a as u64 * rank + b as u64) * rank + c as u64).wrapping_mul(0xbf58_476d_1ce4_e5b9),
        );
        x = (x ^ (x >> 30)).wrapping_mul(0xbf58_476d_1ce4_e5b9);
        x = (x ^ (x >> 27)).wrapping_mul(0x94d0_49bb_1331_11eb);
        x ^= x >> 31;
        let m = 2 + (x % 2) as i64;
        let j = ((x >> 8) % n.max(1)) as i64;
        field.plus(&field.int(m), &field.zeta_pow(j))
    };
    regauged(theory, &format!("gauge:{seed}({})", theory.name()), draw)
}
