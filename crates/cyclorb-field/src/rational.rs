//! Exact rationals for results that leave the field (prefactors, central charges, norms).

use std::cmp::Ordering;
use std::fmt;
use std::str::FromStr;

use num_bigint::BigInt;
use num_integer::Integer;
use num_traits::{One, Signed, Zero};
use serde::{Deserialize, Serialize};

/// A rational number p/q, q > 0, gcd(p, q) = 1.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct Rational {
    num: BigInt,
    den: BigInt,
}

impl Rational {
    /// p/q in lowest terms; `None` when q = 0.
    pub fn new(p: BigInt, q: BigInt) -> Option<Rational> {
        if q.is_zero() {
            return None;
        }
        let g = p.gcd(&q);
        let (mut p, mut q) = if g.is_zero() {
            (p, q)
        } else {
            (p / &g, q / &g)
        };
        if q.is_negative() {
            p = -p;
            q = -q;
        }
        if p.is_zero() {
            q = BigInt::one();
        }
        Some(Rational { num: p, den: q })
    }

    /// The integer m.
    pub fn from_int(m: i64) -> Rational {
        Rational {
            num: BigInt::from(m),
            den: BigInt::one(),
        }
    }

    /// Numerator.
    pub fn numer(&self) -> &BigInt {
        &self.num
    }

    /// Denominator (positive).
    pub fn denom(&self) -> &BigInt {
        &self.den
    }

    /// Whether the value is an integer.
    pub fn is_integer(&self) -> bool {
        self.den.is_one()
    }

    /// Sum.
    pub fn add(&self, o: &Rational) -> Rational {
        Rational::new(&self.num * &o.den + &o.num * &self.den, &self.den * &o.den)
            .expect("non-zero")
    }

    /// Difference.
    pub fn sub(&self, o: &Rational) -> Rational {
        Rational::new(&self.num * &o.den - &o.num * &self.den, &self.den * &o.den)
            .expect("non-zero")
    }

    /// Product.
    pub fn mul(&self, o: &Rational) -> Rational {
        Rational::new(&self.num * &o.num, &self.den * &o.den).expect("non-zero")
    }

    /// Quotient; `None` when o = 0.
    pub fn div(&self, o: &Rational) -> Option<Rational> {
        Rational::new(&self.num * &o.den, &self.den * &o.num)
    }

    /// The value reduced into [0, m) (for phases such as c mod 8).
    pub fn rem_euclid(&self, m: i64) -> Rational {
        let md = &self.den * BigInt::from(m);
        let r = ((&self.num % &md) + &md) % &md;
        Rational::new(r, self.den.clone()).expect("non-zero")
    }

    /// Approximate value, for display only.
    pub fn to_f64(&self) -> f64 {
        use num_traits::ToPrimitive;
        self.num.to_f64().unwrap_or(f64::NAN) / self.den.to_f64().unwrap_or(f64::NAN)
    }
}

impl Ord for Rational {
    fn cmp(&self, o: &Self) -> Ordering {
        (&self.num * &o.den).cmp(&(&o.num * &self.den))
    }
}

impl PartialOrd for Rational {
    fn partial_cmp(&self, o: &Self) -> Option<Ordering> {
        Some(self.cmp(o))
    }
}

impl fmt::Display for Rational {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.den.is_one() {
            write!(f, "{}", self.num)
        } else {
            write!(f, "{}/{}", self.num, self.den)
        }
    }
}

impl FromStr for Rational {
    type Err = String;
    fn from_str(s: &str) -> Result<Self, String> {
        let s = s.trim();
        let (p, q) = match s.split_once('/') {
            Some((p, q)) => (p.trim(), q.trim()),
            None => (s, "1"),
        };
        let p: BigInt = p.parse().map_err(|_| format!("not a rational: {s:?}"))?;
        let q: BigInt = q.parse().map_err(|_| format!("not a rational: {s:?}"))?;
        Rational::new(p, q).ok_or_else(|| format!("zero denominator in {s:?}"))
    }
}

impl Serialize for Rational {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(&self.to_string())
    }
}

impl<'de> Deserialize<'de> for Rational {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let s = String::deserialize(d)?;
        s.parse().map_err(serde::de::Error::custom)
    }
}
