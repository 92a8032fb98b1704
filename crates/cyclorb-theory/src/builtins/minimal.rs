//! Virasoro minimal models M(p, p′) as modular data (S and T only), from the Kac table
//! (Di Francesco–Mathieu–Sénéchal, ch. 7 and 10). This is the spec `kac:P:Q`: the independent
//! reference against which the braided construction of `minimal:P:Q`
//! ([`super::minimal_braided`]) is proved equal. Conventions, with P = p and Q = p′:
//!   c = 1 − 6(p−p′)²/(pp′), labels (r, s), 1 ≤ r ≤ p′−1, 1 ≤ s ≤ p−1, (r,s) ~ (p′−r, p−s),
//!   h_{r,s} = ((pr − p′s)² − (p−p′)²)/(4pp′), θ = exp(2πi h),
//!   S_{(r,s),(ρ,σ)} = 2√(2/(pp′)) (−1)^{1+sρ+rσ} sin(π p r ρ/p′) sin(π p′ s σ/p),
//! fusion from the two SU(2) fusion rules with the field identification:
//!   N_{(r,s)(ρ,σ)}^{(t,u)} = N^{(p′)}_{rρ}{}^{t} N^{(p)}_{sσ}{}^{u} + N^{(p′)}_{rρ}{}^{p′−t} N^{(p)}_{sσ}{}^{p−u},
//!   N^{(m)}_{ab}{}^c = 1 when |a−b| < c < min(a+b, 2m−a−b) and a+b+c is odd.
//! The Verlinde check of `verify` recomputes these fusion rules from S.

use cyclorb_field::{numtheory, Cyc, CyclotomicField, Rational};
use cyclorb_matrix::Matrix;
use num_bigint::BigInt;
use num_integer::Integer;

use crate::arith::SameField;
use crate::assemble::{assemble, RawStructure, RawTheory};
use crate::error::TheoryError;
use crate::fusion::FusionRules;
use crate::theory::Theory;
use cyclorb_field::{root_of_unity, root_of_unity_at};

/// Largest p·p′ accepted (the field has conductor 8pp′).
pub const MAX_PRODUCT: i64 = 600;

/// The conductor holding S and T: lcm(4, 2p, 2p′, 4pp′, the conductor of √(2pp′)).
fn conductor(p: i64, pp: i64) -> u32 {
    let mut squarefree = 1;
    for (prime, e) in numtheory::factorize((2 * p * pp) as u64) {
        if e % 2 == 1 {
            squarefree *= prime as i64;
        }
    }
    let sqrt_conductor = if squarefree % 4 == 1 {
        squarefree
    } else {
        4 * squarefree
    };
    let n = [4, 2 * p, 2 * pp, 4 * p * pp, sqrt_conductor]
        .iter()
        .fold(1i64, |acc, x| acc.lcm(x));
    n as u32
}

/// SU(2)-type fusion multiplicity in 1-based labels for the series of "m".
fn su2_rule(m: i64, a: i64, b: i64, c: i64) -> bool {
    (a + b + c) % 2 == 1 && (a - b).abs() < c && c < (a + b).min(2 * m - a - b)
}

/// sin(π·x/y) in the field (4 | n and 2y | n).
fn sine(field: &CyclotomicField, x: i64, y: i64) -> Cyc {
    let e = |t: i64| root_of_unity(field, t, 2 * y).expect("2y-th roots lie in the field");
    // 1/(2i) = −i/2
    let minus_i = root_of_unity(field, -1, 4).expect("i lies in the field");
    let half_minus_i = field.times(&minus_i, &field.rational(1, 2).expect("2 ≠ 0"));
    field.times(&field.minus(&e(x), &e(-x)), &half_minus_i)
}

/// The Kac-table representatives (r, s) of M(p, p′) in label order: r = 1..p′−1 outer,
/// s = 1..p−1 inner, keeping the first of each pair (r, s) ~ (p′−r, p−s).
pub(crate) fn kac_labels(p: i64, pp: i64) -> Vec<(i64, i64)> {
    let mut kac: Vec<(i64, i64)> = Vec::new();
    for r in 1..pp {
        for s in 1..p {
            if !kac.contains(&(pp - r, p - s)) {
                kac.push((r, s));
            }
        }
    }
    kac
}

/// Refuse parameters outside the supported range: P, Q ≥ 2, coprime, P·Q ≤ [`MAX_PRODUCT`].
pub(crate) fn check_parameters(name: &str, p: i64, pp: i64) -> Result<(), TheoryError> {
    let bad = |reason: String| TheoryError::Spec {
        spec: name.to_string(),
        reason,
    };
    if p < 2 || pp < 2 || p.gcd(&pp) != 1 {
        return Err(bad("P and Q must be at least 2 and coprime".into()));
    }
    if p * pp > MAX_PRODUCT {
        return Err(bad(format!("P·Q must be at most {MAX_PRODUCT}")));
    }
    Ok(())
}

/// The modular data of M(p, p′) from Kac's formulas (spec `kac:P:Q`).
pub fn minimal_modular_data(p: i64, pp: i64) -> Result<Theory, TheoryError> {
    let name = format!("kac:{p}:{pp}");
    check_parameters(&name, p, pp)?;
    let field = CyclotomicField::new(conductor(p, pp))?;
    let kac = kac_labels(p, pp);
    let rank = kac.len();
    let sqrt = field
        .sqrt_rational(&BigInt::from(2 * p * pp), &BigInt::from(1))?
        .ok_or_else(|| TheoryError::Internal("√(2pp′) lies in Q(ζ_{8pp′})".into()))?;
    let prefactor = field.times(&sqrt, &field.rational(2, p * pp)?);
    let mut s = Matrix::zeros(&field, rank, rank);
    for (i, &(r, s_)) in kac.iter().enumerate() {
        for (j, &(rho, sigma)) in kac.iter().enumerate() {
            let sign = if (1 + s_ * rho + r * sigma) % 2 == 0 {
                1
            } else {
                -1
            };
            let value = field.product([
                &prefactor,
                &sine(&field, p * r * rho, pp),
                &sine(&field, pp * s_ * sigma, p),
            ]);
            s.set(i, j, field.mul_int(&value, sign));
        }
    }
    let mut triples = Vec::new();
    for (a, &(r, s_)) in kac.iter().enumerate() {
        for (b, &(rho, sigma)) in kac.iter().enumerate() {
            for (c, &(t, u)) in kac.iter().enumerate() {
                let first = su2_rule(pp, r, rho, t) && su2_rule(p, s_, sigma, u);
                let second = su2_rule(pp, r, rho, pp - t) && su2_rule(p, s_, sigma, p - u);
                let m = u32::from(first) + u32::from(second);
                if m > 0 {
                    triples.push((a, b, c, m));
                }
            }
        }
    }
    let fusion = FusionRules::from_triples(rank, triples)
        .map_err(|e| TheoryError::Internal(format!("minimal-model fusion: {e:?}")))?;
    let s00_inv = field
        .inverse(s.get(0, 0))
        .ok_or_else(|| TheoryError::Internal(format!("{name}: S_00 = 0")))?;
    let dims = (0..rank)
        .map(|a| field.times(s.get(0, a), &s00_inv))
        .collect();
    let mut twists = Vec::with_capacity(rank);
    for &(r, s_) in &kac {
        let num = (p * r - pp * s_).pow(2) - (p - pp).pow(2);
        let h = Rational::new(BigInt::from(num), BigInt::from(4 * p * pp)).expect("non-zero");
        twists.push(root_of_unity_at(&field, &h).expect("exp(2πi h) lies in the field"));
    }
    assemble(RawTheory {
        name,
        labels: kac.iter().map(|(r, s_)| format!("({r},{s_})")).collect(),
        fusion,
        dims,
        twists,
        structure: RawStructure::ModularData { s },
        field,
    })
}
