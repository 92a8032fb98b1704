//! Field operations: +, −, ×, inverse, quotient, powers, ζ_n^k and rationals.
//!
//! Every kernel runs first on checked `i128` and is repeated on `BigInt` when a step
//! overflows; results are canonicalised on the way out.

use num_bigint::BigInt;
use num_integer::Integer;

use crate::context::{CyclotomicField, Reduction};
use crate::element::{Cyc, Data};
use crate::error::FieldError;
use crate::ring::{convolve, IntRing};
use crate::word_kernels::gcd_u64;

fn small_wide(c: &Cyc) -> Option<(Vec<i128>, i128)> {
    match &c.data {
        Data::Small { num, den } => Some((num.iter().map(|&x| x as i128).collect(), *den as i128)),
        Data::Big { .. } => None,
    }
}

impl CyclotomicField {
    /// Fold a coefficient vector of any length (exponents 0..len) to length φ modulo Φ_n.
    pub(crate) fn fold<R: IntRing>(&self, wide: &[R]) -> Option<Vec<R>> {
        let phi = self.degree();
        let mut low: Vec<R> = wide.iter().take(phi).cloned().collect();
        low.resize(phi, R::zero());
        match self.reduction() {
            Reduction::Negacyclic => {
                for (e, c) in wide.iter().enumerate().skip(phi) {
                    if c.is_zero() {
                        continue;
                    }
                    // x^e = (−1)^{⌊e/φ⌋} x^{e mod φ}
                    let j = e % phi;
                    low[j] = if (e / phi) % 2 == 1 {
                        low[j].sub(c)?
                    } else {
                        low[j].add(c)?
                    };
                }
            }
            Reduction::Table => {
                for (e, c) in wide.iter().enumerate().skip(phi) {
                    if c.is_zero() {
                        continue;
                    }
                    for (j, &r) in self.residue(e as i64).iter().enumerate() {
                        if r != 0 {
                            low[j] = low[j].add(&c.mul(&R::from_i64(r))?)?;
                        }
                    }
                }
            }
        }
        Some(low)
    }

    /// The element with numerators `num` (length φ) over `den`, canonicalised.
    pub fn from_parts(&self, num: &[BigInt], den: &BigInt) -> Result<Cyc, FieldError> {
        if num.len() != self.degree() {
            return Err(FieldError::BadConductor(self.conductor()));
        }
        if num_traits::Zero::is_zero(den) {
            return Err(FieldError::DivisionByZero);
        }
        Ok(Cyc::from_big(self.conductor(), num.to_vec(), den.clone()))
    }

    /// 0.
    pub fn zero(&self) -> Cyc {
        Cyc::zero_with(self.conductor(), self.degree())
    }

    /// 1.
    pub fn one(&self) -> Cyc {
        self.int(1)
    }

    /// The integer m.
    pub fn int(&self, m: i64) -> Cyc {
        let mut num = vec![0i128; self.degree()];
        num[0] = m as i128;
        Cyc::from_wide(self.conductor(), &num, 1)
    }

    /// The rational p/q (q ≠ 0).
    pub fn rational(&self, p: i64, q: i64) -> Result<Cyc, FieldError> {
        if q == 0 {
            return Err(FieldError::DivisionByZero);
        }
        let mut num = vec![0i128; self.degree()];
        num[0] = p as i128;
        Ok(Cyc::from_wide(self.conductor(), &num, q as i128))
    }

    /// The rational p/q with big parts (q ≠ 0).
    pub fn big_rational(&self, p: &BigInt, q: &BigInt) -> Result<Cyc, FieldError> {
        let mut num = vec![BigInt::from(0); self.degree()];
        num[0] = p.clone();
        self.from_parts(&num, q)
    }

    /// ζ_n^k for any integer k.
    pub fn zeta_pow(&self, k: i64) -> Cyc {
        let num: Vec<i128> = self.residue(k).iter().map(|&c| c as i128).collect();
        Cyc::from_wide(self.conductor(), &num, 1)
    }

    /// a + b.
    pub fn add(&self, a: &Cyc, b: &Cyc) -> Result<Cyc, FieldError> {
        self.lin(a, b, false)
    }

    /// a − b.
    pub fn sub(&self, a: &Cyc, b: &Cyc) -> Result<Cyc, FieldError> {
        self.lin(a, b, true)
    }

    fn lin(&self, a: &Cyc, b: &Cyc, minus: bool) -> Result<Cyc, FieldError> {
        self.check(a.n)?;
        self.check(b.n)?;
        if let (Data::Small { num: an, den: ad }, Data::Small { num: bn, den: bd }) =
            (&a.data, &b.data)
        {
            // common denominator l = lcm(ad, bd) = ad·(bd/g)
            let g = gcd_u64(*ad as u64, *bd as u64) as i64;
            let (sa, sb) = (bd / g, ad / g);
            if let Some(l) = ad.checked_mul(sa) {
                if let Some(num) = Self::combine_words(an, sa, bn, sb, minus) {
                    return Ok(Cyc::from_words(self.conductor(), num, l));
                }
            }
        }
        if let (Some((an, ad)), Some((bn, bd))) = (small_wide(a), small_wide(b)) {
            let l = ad.lcm(&bd);
            let (sa, sb) = (l / ad, l / bd);
            let out: Option<Vec<i128>> = an
                .iter()
                .zip(&bn)
                .map(|(x, y)| {
                    let y = y.checked_mul(sb)?;
                    let x = x.checked_mul(sa)?;
                    if minus {
                        x.checked_sub(y)
                    } else {
                        x.checked_add(y)
                    }
                })
                .collect();
            if let Some(out) = out {
                return Ok(Cyc::from_wide(self.conductor(), &out, l));
            }
        }
        let (an, ad) = a.to_big_parts();
        let (bn, bd) = b.to_big_parts();
        let l = ad.lcm(&bd);
        let (sa, sb) = (&l / &ad, &l / &bd);
        let out = an
            .iter()
            .zip(&bn)
            .map(|(x, y)| {
                if minus {
                    x * &sa - y * &sb
                } else {
                    x * &sa + y * &sb
                }
            })
            .collect();
        Ok(Cyc::from_big(self.conductor(), out, l))
    }

    /// −a.
    pub fn neg(&self, a: &Cyc) -> Cyc {
        match &a.data {
            Data::Small { num, den } => Cyc {
                n: a.n,
                data: Data::Small {
                    num: num.iter().map(|&c| -c).collect(),
                    den: *den,
                },
            },
            Data::Big { num, den } => Cyc {
                n: a.n,
                data: Data::Big {
                    num: num.iter().map(|c| -c).collect(),
                    den: den.clone(),
                },
            },
        }
    }

    /// a · b.
    pub fn mul(&self, a: &Cyc, b: &Cyc) -> Result<Cyc, FieldError> {
        self.check(a.n)?;
        self.check(b.n)?;
        if let (Data::Small { num: an, den: ad }, Data::Small { num: bn, den: bd }) =
            (&a.data, &b.data)
        {
            if let (Some(den), Some(num)) = (ad.checked_mul(*bd), self.mul_words(an, bn)) {
                return Ok(Cyc::from_words(self.conductor(), num, den));
            }
        }
        if a.is_zero() || b.is_zero() {
            return Ok(self.zero());
        }
        if let (Some((an, ad)), Some((bn, bd))) = (small_wide(a), small_wide(b)) {
            let res = convolve(&an, &bn)
                .and_then(|w| self.fold(&w))
                .zip(ad.checked_mul(bd));
            if let Some((num, den)) = res {
                return Ok(Cyc::from_wide(self.conductor(), &num, den));
            }
        }
        let (an, ad) = a.to_big_parts();
        let (bn, bd) = b.to_big_parts();
        let w = convolve(&an, &bn).expect("big arithmetic does not overflow");
        let num = self.fold(&w).expect("big arithmetic does not overflow");
        Ok(Cyc::from_big(self.conductor(), num, ad * bd))
    }

    /// Multiply by an integer.
    pub fn mul_int(&self, a: &Cyc, m: i64) -> Cyc {
        self.mul(a, &self.int(m)).expect("same field")
    }

    /// a / b.
    pub fn div(&self, a: &Cyc, b: &Cyc) -> Result<Cyc, FieldError> {
        let inv = self.inv(b)?;
        self.mul(a, &inv)
    }

    /// a^k for any integer k (k < 0 needs a ≠ 0), by repeated squaring.
    pub fn pow(&self, a: &Cyc, k: i64) -> Result<Cyc, FieldError> {
        let mut base = if k < 0 { self.inv(a)? } else { a.clone() };
        let mut e = k.unsigned_abs();
        let mut acc = self.one();
        while e > 0 {
            if e & 1 == 1 {
                acc = self.mul(&acc, &base)?;
            }
            e >>= 1;
            if e > 0 {
                base = self.mul(&base, &base)?;
            }
        }
        Ok(acc)
    }

    /// Sum of a slice of elements.
    pub fn sum<'a>(&self, items: impl IntoIterator<Item = &'a Cyc>) -> Result<Cyc, FieldError> {
        let mut acc = self.zero();
        for x in items {
            acc = self.add(&acc, x)?;
        }
        Ok(acc)
    }
}
