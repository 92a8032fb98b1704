//! Element values of Q(ζ_n): φ(n) integer numerators over one positive common denominator.

use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, ToPrimitive, Zero};

use crate::numtheory::gcd_u128;
use crate::ring::big_is_negative;

/// An element of Q(ζ_n) in the power basis modulo Φ_n.
///
/// Always canonical: the denominator is positive, the gcd of the numerators and the
/// denominator is 1, zero has denominator 1, and the machine-word form is used exactly when
/// every number fits in an `i64` (with `i64::MIN` excluded). So derived `Eq` and `Hash` are
/// equality and hashing of the mathematical value (within one conductor).
#[derive(Clone, PartialEq, Eq, Hash, Debug)]
pub struct Cyc {
    pub(crate) n: u32,
    pub(crate) data: Data,
}

#[derive(Clone, PartialEq, Eq, Hash, Debug)]
pub(crate) enum Data {
    Small { num: Box<[i64]>, den: i64 },
    Big { num: Box<[BigInt]>, den: BigInt },
}

fn fits(x: i128) -> bool {
    x > i64::MIN as i128 && x <= i64::MAX as i128
}

fn big_fits(x: &BigInt) -> Option<i64> {
    x.to_i64().filter(|&v| v != i64::MIN)
}

impl Cyc {
    /// The conductor n of the field this element lives in.
    pub fn conductor(&self) -> u32 {
        self.n
    }

    /// Zero of Q(ζ_n) with φ(n) = `degree`.
    pub(crate) fn zero_with(n: u32, degree: usize) -> Cyc {
        Cyc {
            n,
            data: Data::Small {
                num: vec![0; degree].into_boxed_slice(),
                den: 1,
            },
        }
    }

    /// Build a canonical element from `i128` numerators and denominator (den ≠ 0).
    pub(crate) fn from_wide(n: u32, num: &[i128], den: i128) -> Cyc {
        debug_assert!(den != 0);
        let mut g = den.unsigned_abs();
        for &c in num {
            if g == 1 {
                break;
            }
            g = gcd_u128(g, c.unsigned_abs());
        }
        if num.iter().all(|&c| c == 0) {
            return Cyc::zero_with(n, num.len());
        }
        let sign: i128 = if den < 0 { -1 } else { 1 };
        let g = g as i128;
        let den = den / g * sign;
        let scaled = num.iter().map(|&c| c / g * sign);
        if fits(den) && num.iter().all(|&c| fits(c / g)) {
            Cyc {
                n,
                data: Data::Small {
                    num: scaled.map(|c| c as i64).collect(),
                    den: den as i64,
                },
            }
        } else {
            Cyc {
                n,
                data: Data::Big {
                    num: scaled.map(BigInt::from).collect(),
                    den: BigInt::from(den),
                },
            }
        }
    }

    /// Build a canonical element from big numerators and denominator (den ≠ 0).
    pub(crate) fn from_big(n: u32, num: Vec<BigInt>, den: BigInt) -> Cyc {
        debug_assert!(!den.is_zero());
        if num.iter().all(|c| c.is_zero()) {
            return Cyc::zero_with(n, num.len());
        }
        let mut g = den.abs();
        for c in &num {
            if g.is_one() {
                break;
            }
            g = g.gcd(c);
        }
        let neg = big_is_negative(&den);
        let fix = |c: BigInt| {
            let q = if g.is_one() { c } else { c / &g };
            if neg {
                -q
            } else {
                q
            }
        };
        let den = fix(den);
        let num: Vec<BigInt> = num.into_iter().map(fix).collect();
        if let Some(d) = big_fits(&den) {
            let small: Option<Vec<i64>> = num.iter().map(big_fits).collect();
            if let Some(s) = small {
                return Cyc {
                    n,
                    data: Data::Small {
                        num: s.into_boxed_slice(),
                        den: d,
                    },
                };
            }
        }
        Cyc {
            n,
            data: Data::Big {
                num: num.into_boxed_slice(),
                den,
            },
        }
    }

    /// Numerators and denominator as big integers (always possible).
    pub fn to_big_parts(&self) -> (Vec<BigInt>, BigInt) {
        match &self.data {
            Data::Small { num, den } => (
                num.iter().map(|&c| BigInt::from(c)).collect(),
                BigInt::from(*den),
            ),
            Data::Big { num, den } => (num.to_vec(), den.clone()),
        }
    }

    /// Numerators and denominator in machine words, when the element is in the small form.
    pub fn small_parts(&self) -> Option<(&[i64], i64)> {
        match &self.data {
            Data::Small { num, den } => Some((num, *den)),
            Data::Big { .. } => None,
        }
    }

    /// True for the additive identity.
    pub fn is_zero(&self) -> bool {
        match &self.data {
            Data::Small { num, .. } => num.iter().all(|&c| c == 0),
            Data::Big { .. } => false,
        }
    }

    /// True for the multiplicative identity.
    pub fn is_one(&self) -> bool {
        match &self.data {
            Data::Small { num, den } => {
                *den == 1 && num[0] == 1 && num[1..].iter().all(|&c| c == 0)
            }
            Data::Big { .. } => false,
        }
    }

    /// The rational value when the element lies in Q, as (numerator, positive denominator).
    pub fn as_rational(&self) -> Option<(BigInt, BigInt)> {
        let (num, den) = self.to_big_parts();
        if num[1..].iter().all(|c| c.is_zero()) {
            Some((num[0].clone(), den))
        } else {
            None
        }
    }

    /// Number of coefficients (φ(n)).
    pub fn len(&self) -> usize {
        match &self.data {
            Data::Small { num, .. } => num.len(),
            Data::Big { num, .. } => num.len(),
        }
    }

    /// Never true: every element has φ(n) ≥ 1 coefficients. Present for API symmetry with `len`.
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// Heap bytes used by the coefficients (for memory reports).
    pub fn heap_bytes(&self) -> usize {
        match &self.data {
            Data::Small { num, .. } => num.len() * 8,
            Data::Big { num, den } => {
                num.iter()
                    .map(|c| c.bits() as usize / 8 + 24)
                    .sum::<usize>()
                    + den.bits() as usize / 8
                    + 24
            }
        }
    }
}
