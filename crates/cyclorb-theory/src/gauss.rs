//! The Gauss sum p₊ = Σ_a d_a² θ_a, the total dimension D and the central charge mod 8.
//!
//! For modular data |p₊|² = D² = Σ_a d_a², so ζ_c = p₊/D is a root of unity with
//! ζ_c = exp(2πi c/8). Its square p₊²/D² lies in the field of the data and is found exactly;
//! ζ_c itself is one of its two square roots ±exp(πi e/N), so D = p₊/ζ_c is cyclotomic and
//! lies in the field once exp(πi e/N) does. The sign of D (taken positive) is decided by
//! [`cyclorb_field::real_sign`], whose error bound is proven (no floating point).

use std::cmp::Ordering;

use cyclorb_field::{Cyc, CyclotomicField, Rational};
use num_bigint::BigInt;
use num_integer::Integer;

use crate::arith::SameField;
use cyclorb_field::real_sign;
use cyclorb_field::{canonical_conductor, conductor_of_root, root_of_unity};

/// D, exp(2πi c/8) and c mod 8 of a modular theory.
#[derive(Clone, Debug)]
pub(crate) struct GaussData {
    pub total_dim: Cyc,
    pub phase: Cyc,
    pub central: Rational,
}

struct Square {
    plus: Cyc,
    dim_sq: Cyc,
    /// p₊²/D² = exp(2πi e/N).
    order: u64,
    exponent: u64,
}

fn square_of_phase(
    field: &CyclotomicField,
    dims: &[Cyc],
    twists: &[Cyc],
) -> Result<Square, String> {
    let squares: Vec<Cyc> = dims.iter().map(|d| field.times(d, d)).collect();
    let plus = field.dot_same(squares.iter().zip(twists));
    let dim_sq = field.sum(&squares).map_err(|e| e.to_string())?;
    if plus.is_zero() {
        return Err("the Gauss sum Σ_a d_a² θ_a vanishes: the data are not modular".into());
    }
    if field.times(&plus, &field.conj(&plus)) != dim_sq {
        return Err(format!(
            "Gauss–Milgram fails: |Σ_a d_a² θ_a|² = {} differs from D² = Σ_a d_a² = {}",
            field.times(&plus, &field.conj(&plus)),
            dim_sq
        ));
    }
    let ratio = field
        .div(&field.times(&plus, &plus), &dim_sq)
        .map_err(|e| e.to_string())?;
    let (order, exponent) = field
        .root_of_unity_exponent(&ratio)
        .map_err(|e| e.to_string())?
        .ok_or_else(|| {
            "(Σ_a d_a² θ_a)²/D² is not a root of unity: the data are not modular".to_string()
        })?;
    Ok(Square {
        plus,
        dim_sq,
        order,
        exponent,
    })
}

/// The smallest conductor (a multiple of the field's) whose field holds D and exp(2πi c/8).
pub(crate) fn required_conductor(
    field: &CyclotomicField,
    dims: &[Cyc],
    twists: &[Cyc],
) -> Result<u32, String> {
    let sq = square_of_phase(field, dims, twists)?;
    let root = conductor_of_root(sq.exponent as i64, 2 * sq.order as i64);
    let n = (field.conductor() as u64).lcm(&root);
    u32::try_from(canonical_conductor(n)).map_err(|_| "conductor too large".to_string())
}

/// D > 0, exp(2πi c/8) and c mod 8, in a field that holds them (see [`required_conductor`]).
pub(crate) fn gauss_data(
    field: &CyclotomicField,
    dims: &[Cyc],
    twists: &[Cyc],
) -> Result<GaussData, String> {
    let sq = square_of_phase(field, dims, twists)?;
    let (e, two_n) = (sq.exponent as i64, 2 * sq.order as i64);
    let zeta = root_of_unity(field, e, two_n)
        .ok_or_else(|| format!("exp(2πi·{e}/{two_n}) is not in Q(ζ_{})", field.conductor()))?;
    let candidate = field.div(&sq.plus, &zeta).map_err(|e| e.to_string())?;
    if field.times(&candidate, &candidate) != sq.dim_sq {
        return Err("Σ_a d_a² θ_a is not D times a root of unity".into());
    }
    let (total_dim, phase, numerator) = match real_sign(field, &candidate) {
        Some(Ordering::Greater) => (candidate, zeta, e),
        Some(Ordering::Less) => (field.neg(&candidate), field.neg(&zeta), e + two_n / 2),
        _ => return Err("D = (Σ_a d_a² θ_a)/exp(2πi c/8) is not a non-zero real number".into()),
    };
    // c/8 ≡ numerator/two_n (mod 1)
    let central = Rational::new(BigInt::from(8 * numerator), BigInt::from(two_n))
        .expect("non-zero denominator")
        .rem_euclid(8);
    Ok(GaussData {
        total_dim,
        phase,
        central,
    })
}

/// For modular data given by a normalised S: D = 1/S_00 (the sign of the given S is kept, so D
/// is negative for some non-unitary theories, e.g. minimal models whose S_00 < 0) and
/// exp(2πi c/8) = p₊·S_00, which must be a root of unity.
pub(crate) fn gauss_from_s(
    field: &CyclotomicField,
    s00: &Cyc,
    dims: &[Cyc],
    twists: &[Cyc],
) -> Result<GaussData, String> {
    let total_dim = field.inverse(s00).ok_or("S_00 = 0")?;
    let squares: Vec<Cyc> = dims.iter().map(|d| field.times(d, d)).collect();
    let dim_sq = field.sum(&squares).map_err(|e| e.to_string())?;
    if field.times(&total_dim, &total_dim) != dim_sq {
        return Err(format!(
            "S is not normalised: 1/S_00² = {} differs from Σ_a d_a² = {dim_sq}",
            field.times(&total_dim, &total_dim)
        ));
    }
    let plus = field.dot_same(squares.iter().zip(twists));
    let phase = field.times(&plus, s00);
    let (order, exponent) = field
        .root_of_unity_exponent(&phase)
        .map_err(|e| e.to_string())?
        .ok_or_else(|| {
            format!("Gauss–Milgram fails: S_00·Σ_a d_a² θ_a = {phase} is not a root of unity")
        })?;
    let central = Rational::new(BigInt::from(8 * exponent), BigInt::from(order))
        .expect("non-zero denominator")
        .rem_euclid(8);
    Ok(GaussData {
        total_dim,
        phase,
        central,
    })
}
