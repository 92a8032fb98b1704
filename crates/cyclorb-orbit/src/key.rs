//! The canonical key of a line and its integer form.
//!
//! The line through v ≠ 0 is represented by w = v / v_k, k the first non-zero coordinate
//! (docs/orbits.md §1): w_k = 1 and w does not depend on which non-zero multiple of v is given.
//! Its integer form packs all coordinates over one shared denominator: S = D·w with D > 0
//! the least positive integer making every numerator integral, so the gcd of D and all
//! numerators is 1 and S_k = (D, 0, …, 0) (the denominator is stored for free as the
//! constant term of coordinate k). Two lines are equal exactly when their keys are equal.

use cyclorb_field::{Cyc, CyclotomicField, FieldError};
use hashbrown::HashMap;
use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, ToPrimitive, Zero};

use crate::sparse_numerators::SparseNumerators;
use cyclorb_field::PolyKernel;

/// The numerators S of a key (d blocks of φ coefficients): machine words when they fit.
#[derive(Debug, Clone, PartialEq, Eq)]
pub(crate) enum KeyNumbers {
    /// Every numerator fits an `i64`.
    Small(Vec<i64>),
    /// Some numerator does not.
    Big(Vec<BigInt>),
}

impl KeyNumbers {
    /// Machine words when every number fits, big integers otherwise.
    pub(crate) fn from_big(numbers: Vec<BigInt>) -> KeyNumbers {
        let small: Option<Vec<i64>> = numbers.iter().map(ToPrimitive::to_i64).collect();
        match small {
            Some(s) => KeyNumbers::Small(s),
            None => KeyNumbers::Big(numbers),
        }
    }

    /// All numerators as big integers.
    pub(crate) fn to_big(&self) -> Vec<BigInt> {
        match self {
            KeyNumbers::Small(s) => s.iter().map(|&x| BigInt::from(x)).collect(),
            KeyNumbers::Big(b) => b.clone(),
        }
    }

    /// The canonical key of the line through `v`; `None` when v = 0.
    pub(crate) fn of_line(
        field: &CyclotomicField,
        v: &[Cyc],
    ) -> Result<Option<KeyNumbers>, FieldError> {
        let Some(k) = v.iter().position(|x| !x.is_zero()) else {
            return Ok(None);
        };
        let inverse = field.inv(&v[k])?;
        let mut w = Vec::with_capacity(v.len());
        for (i, x) in v.iter().enumerate() {
            w.push(match i.cmp(&k) {
                std::cmp::Ordering::Less => field.zero(),
                std::cmp::Ordering::Equal => field.one(),
                std::cmp::Ordering::Greater => field.mul(x, &inverse)?,
            });
        }
        Ok(Some(KeyNumbers::over_common_denominator(&w)))
    }

    /// S = D·w with D the least common denominator of the entries of w.
    fn over_common_denominator(w: &[Cyc]) -> KeyNumbers {
        let parts: Vec<(Vec<BigInt>, BigInt)> = w.iter().map(Cyc::to_big_parts).collect();
        let lcd = parts.iter().fold(BigInt::one(), |acc, (_, d)| acc.lcm(d));
        let numbers = parts
            .into_iter()
            .flat_map(|(num, den)| {
                let scale = &lcd / den;
                num.into_iter().map(move |c| c * &scale)
            })
            .collect();
        KeyNumbers::from_big(numbers)
    }

    /// The line's key as field elements: w = S / D.
    pub(crate) fn to_line(
        &self,
        field: &CyclotomicField,
        phi: usize,
    ) -> Result<Vec<Cyc>, FieldError> {
        let big = self.to_big();
        let k = first_nonzero_block(&big, phi).unwrap_or(0);
        let den = big[k * phi].clone();
        big.chunks(phi)
            .map(|block| field.from_parts(block, &den))
            .collect()
    }
}

/// Index of the first block of φ numbers that is not all zero.
pub(crate) fn first_nonzero_block<T: Zero>(numbers: &[T], phi: usize) -> Option<usize> {
    numbers
        .chunks(phi)
        .position(|block| block.iter().any(|x| !x.is_zero()))
}

/// u_k⁻¹ = P/q with P in machine words (its non-zero coefficients (a, P_a)) and q > 0.
#[derive(Debug, Clone)]
struct SmallInverse {
    p_terms: Box<[(u32, i64)]>,
    q: i64,
}

/// Turns integer vectors into keys, remembering the inverses of the first coordinates it
/// has met (orbits of finite groups meet few distinct values), with scratch space.
#[derive(Debug, Default)]
pub(crate) struct Normaliser {
    inverses: HashMap<Box<[i64]>, Option<SmallInverse>>,
    product: Vec<i128>,
    values: Vec<i128>,
    blocks: Vec<usize>,
}

/// Bytes of remembered inverses per worker before the memory is emptied (it only saves
/// time): an entry holds the first coordinate and the terms of P, at most 24·φ bytes and
/// some bookkeeping, so about 4 000 entries at φ = 160.
const INVERSE_CACHE_BYTES: usize = 16 << 20;

/// Entries the inverse memory keeps at degree φ (at least 16).
fn inverse_cache_entries(phi: usize) -> usize {
    let entry = 24 * phi + 128;
    (INVERSE_CACHE_BYTES / entry).max(16)
}

fn small_inverse(
    field: &CyclotomicField,
    lead: &[i64],
) -> Result<Option<SmallInverse>, FieldError> {
    let num: Vec<BigInt> = lead.iter().map(|&c| BigInt::from(c)).collect();
    let inverse = field.inv(&field.from_parts(&num, &BigInt::one())?)?;
    let Some((p, q)) = inverse.small_parts() else {
        return Ok(None);
    };
    let p_terms = (0u32..)
        .zip(p)
        .filter(|(_, &c)| c != 0)
        .map(|(a, &c)| (a, c))
        .collect();
    Ok(Some(SmallInverse { p_terms, q }))
}

/// The key of the line through the integer vector `u` (first non-zero block k), computed in
/// machine words when possible: with (u_k)⁻¹ = P/q, w_i = u_i·P/q, then divided by the gcd
/// of q and all numerators.
pub(crate) fn key_of_integer_vector(
    field: &CyclotomicField,
    kernel: &PolyKernel,
    normaliser: &mut Normaliser,
    u: &SparseNumerators,
    k: usize,
) -> Result<KeyNumbers, FieldError> {
    let phi = kernel.degree();
    let lead = &u.dense[k * phi..(k + 1) * phi];
    if !normaliser.inverses.contains_key(lead) {
        let entry = small_inverse(field, lead)?;
        if normaliser.inverses.len() >= inverse_cache_entries(phi) {
            normaliser.inverses.clear();
        }
        normaliser.inverses.insert(lead.into(), entry);
    }
    let Normaliser {
        inverses,
        product,
        values,
        blocks,
    } = normaliser;
    if let Some(Some(inverse)) = inverses.get(lead) {
        if let Some(key) = small_key(kernel, u, inverse, product, values, blocks) {
            return Ok(key);
        }
    }
    let line: Vec<Cyc> = u
        .dense
        .chunks(phi)
        .map(|block| {
            let num: Vec<BigInt> = block.iter().map(|&c| BigInt::from(c)).collect();
            field.from_parts(&num, &BigInt::one())
        })
        .collect::<Result<_, _>>()?;
    Ok(KeyNumbers::of_line(field, &line)?.expect("u_k is not zero"))
}

/// gcd(a, b) for a > 0, returning a at once when a | b (the common case here).
fn gcd_with(a: u128, b: u128) -> u128 {
    if let (Ok(a64), Ok(b64)) = (u64::try_from(a), u64::try_from(b)) {
        if b64 % a64 == 0 {
            return a;
        }
        return a64.gcd(&b64) as u128;
    }
    if b % a == 0 {
        a
    } else {
        a.gcd(&b)
    }
}

/// The key of the line through `u` from u_k⁻¹ = P/q: each non-zero block u_i is multiplied
/// by P as polynomials (2φ − 1 coefficients) and folded modulo Φ_n, in checked `i128`;
/// then everything is divided by the gcd of q and the numerators. `None` on overflow (the
/// caller then takes the exact route).
fn small_key(
    kernel: &PolyKernel,
    u: &SparseNumerators,
    inverse: &SmallInverse,
    product: &mut Vec<i128>,
    values: &mut Vec<i128>,
    blocks: &mut Vec<usize>,
) -> Option<KeyNumbers> {
    let phi = kernel.degree();
    product.resize(2 * phi - 1, 0);
    values.clear();
    blocks.clear();
    let mut cursor = 0;
    while cursor < u.nonzero.len() {
        let block = u.nonzero[cursor] as usize / phi;
        product.fill(0);
        while cursor < u.nonzero.len() && u.nonzero[cursor] as usize / phi == block {
            let i = u.nonzero[cursor] as usize;
            let (s, x) = (i % phi, u.dense[i] as i128);
            for &(a, pa) in inverse.p_terms.iter() {
                let cell = &mut product[a as usize + s];
                *cell = cell.checked_add((pa as i128).checked_mul(x)?)?;
            }
            cursor += 1;
        }
        let at = values.len();
        values.resize(at + phi, 0);
        for (e, &c) in product.iter().enumerate() {
            if c == 0 {
                continue;
            }
            for &(t, r) in kernel.residue(e) {
                let cell = &mut values[at + t];
                *cell = cell.checked_add(c.checked_mul(r as i128)?)?;
            }
        }
        blocks.push(block);
    }
    let mut g = inverse.q.unsigned_abs() as u128;
    for &x in values.iter() {
        if g == 1 {
            break;
        }
        if x != 0 {
            g = gcd_with(g, x.unsigned_abs());
        }
    }
    let g = g as i128;
    let mut key = vec![0i64; u.dense.len()];
    for (&block, chunk) in blocks.iter().zip(values.chunks(phi)) {
        for (t, &x) in chunk.iter().enumerate() {
            if x != 0 {
                key[block * phi + t] = i64::try_from(x / g).ok()?;
            }
        }
    }
    Some(KeyNumbers::Small(key))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn key_is_scalar_invariant_and_matches_fast_path() {
        let f = CyclotomicField::new(16).unwrap();
        let kernel = PolyKernel::new(&f);
        let v: Vec<Cyc> = ["0", "(1 + z)/3", "z^3 - 2", "5/7"]
            .iter()
            .map(|t| f.parse(t).unwrap())
            .collect();
        let key = KeyNumbers::of_line(&f, &v).unwrap().unwrap();
        let c = f.parse("(2 - z^5)/11").unwrap();
        let scaled: Vec<Cyc> = v.iter().map(|x| f.mul(x, &c).unwrap()).collect();
        assert_eq!(KeyNumbers::of_line(&f, &scaled).unwrap().unwrap(), key);
        // integer multiple of v, through the machine-word path
        let u: Vec<i64> = [
            "0",
            "(1 + z)*7*(1 - z^2)",
            "(z^3 - 2)*21*(1 - z^2)",
            "15*(1 - z^2)",
        ]
        .iter()
        .flat_map(|t| f.parse(t).unwrap().small_parts().unwrap().0.to_vec())
        .collect();
        let mut numbers = SparseNumerators::new(u.len());
        numbers.set_dense(&u);
        let mut cache = Normaliser::default();
        let fast = key_of_integer_vector(&f, &kernel, &mut cache, &numbers, 1).unwrap();
        assert_eq!(fast, key);
        let again = key_of_integer_vector(&f, &kernel, &mut cache, &numbers, 1).unwrap();
        assert_eq!(again, key);
        let back = key.to_line(&f, 8).unwrap();
        assert_eq!(back[1], f.one());
        assert_eq!(back[3], f.div(&v[3], &v[1]).unwrap());
    }
}
