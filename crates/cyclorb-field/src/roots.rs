//! Roots of unity exp(2πi·p/q) inside a field Q(ζ_n), and conductor bookkeeping.

use crate::{Cyc, CyclotomicField, Rational};
use num_integer::Integer;
use num_traits::ToPrimitive;

/// exp(2πi·num/den) as an element of `field`, when it lies there.
///
/// With num/den in lowest terms, the root lies in Q(ζ_n) when den | n, or when n is odd and
/// den | 2n (then ζ_{2n}^t = −ζ_n^{(t+n)/2} for odd t).
pub fn root_of_unity(field: &CyclotomicField, num: i64, den: i64) -> Option<Cyc> {
    if den == 0 {
        return None;
    }
    let g = num.gcd(&den);
    let (mut p, mut q) = (num / g, den / g);
    if q < 0 {
        p = -p;
        q = -q;
    }
    let n = field.conductor() as i64;
    if n % q == 0 {
        return Some(field.zeta_pow(p.rem_euclid(q) * (n / q)));
    }
    if n % 2 == 1 && (2 * n) % q == 0 {
        let t = p.rem_euclid(q) * (2 * n / q);
        return Some(if t % 2 == 0 {
            field.zeta_pow(t / 2)
        } else {
            field.neg(&field.zeta_pow((t + n) / 2))
        });
    }
    None
}

/// exp(2πi·r) for a rational r, when it lies in `field`.
pub fn root_of_unity_at(field: &CyclotomicField, r: &Rational) -> Option<Cyc> {
    let den = r.denom().to_i64()?;
    let num = (r.numer() % r.denom()).to_i64()?;
    root_of_unity(field, num, den)
}

/// The conventional conductor of a field: Q(ζ_n) = Q(ζ_{2n}) for odd n, so n ≡ 2 (mod 4)
/// is replaced by n/2 (and 2 by 1).
pub fn canonical_conductor(n: u64) -> u64 {
    if n % 4 == 2 {
        n / 2
    } else {
        n
    }
}

/// The smallest canonical conductor of a field holding exp(2πi·p/q) (p/q in lowest terms).
pub fn conductor_of_root(num: i64, den: i64) -> u64 {
    let g = num.gcd(&den).max(1);
    canonical_conductor((den / g).unsigned_abs())
}
