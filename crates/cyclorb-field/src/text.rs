//! Text form of elements: printing, parsing (round trip), serde, and a display-only
//! complex value.
//!
//! Syntax (printed): a polynomial in `z` = ζ_n with integer coefficients over one
//! denominator, e.g. `0`, `-3/4`, `z^3`, `(1 + 2*z - z^5)/2`.
//! Syntax (read): any expression built from integers, `z` (ζ_n), `i` (needs 4 | n),
//! `zeta(m)` (ζ_m = ζ_n^{n/m}, needs m | n), `sqrt(r)` (r a rational expression whose root
//! lies in the field), `+ - * / ^` (integer exponents, negative allowed) and parentheses.

use std::fmt;

use num_bigint::BigInt;
use num_traits::{Signed, ToPrimitive, Zero};
use serde::{Deserialize, Serialize};

use crate::context::CyclotomicField;
use crate::element::Cyc;
use crate::error::FieldError;

impl fmt::Display for Cyc {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let (num, den) = self.to_big_parts();
        let mut terms = Vec::new();
        for (j, c) in num.iter().enumerate() {
            if c.is_zero() {
                continue;
            }
            let mag = c.abs();
            let body = match (j, mag == BigInt::from(1)) {
                (0, _) => mag.to_string(),
                (1, true) => "z".to_string(),
                (1, false) => format!("{mag}*z"),
                (_, true) => format!("z^{j}"),
                (_, false) => format!("{mag}*z^{j}"),
            };
            terms.push((c.is_negative(), body));
        }
        if terms.is_empty() {
            return write!(f, "0");
        }
        let mut poly = String::new();
        for (k, (neg, body)) in terms.iter().enumerate() {
            match (k, neg) {
                (0, true) => poly.push('-'),
                (0, false) => {}
                (_, true) => poly.push_str(" - "),
                (_, false) => poly.push_str(" + "),
            }
            poly.push_str(body);
        }
        if den == BigInt::from(1) {
            write!(f, "{poly}")
        } else if terms.len() == 1 {
            write!(f, "{poly}/{den}")
        } else {
            write!(f, "({poly})/{den}")
        }
    }
}

impl Cyc {
    /// The complex value under ζ_n = exp(2πi/n). For display only: never used to decide.
    pub fn to_complex(&self) -> (f64, f64) {
        let (num, den) = self.to_big_parts();
        let d = den.to_f64().unwrap_or(f64::INFINITY);
        let mut re = 0.0;
        let mut im = 0.0;
        for (j, c) in num.iter().enumerate() {
            let c = c.to_f64().unwrap_or(f64::NAN) / d;
            let angle = 2.0 * std::f64::consts::PI * j as f64 / self.n as f64;
            re += c * angle.cos();
            im += c * angle.sin();
        }
        (re, im)
    }
}

/// Deepest nesting of parentheses, `zeta(…)` and `sqrt(…)` the parser accepts.
pub const MAX_PARSE_DEPTH: usize = 200;

/// Largest size, in bits per coefficient, that a power `x^e` may reach by the bound
/// bits(x^e) ≤ |e|·(bits of x's largest numerator and its denominator + ⌈log₂ φ(n)⌉ + 1).
pub const MAX_POWER_BITS: u64 = 1 << 20;

struct Parser<'a> {
    field: &'a CyclotomicField,
    text: &'a str,
    pos: usize,
    depth: usize,
}

impl<'a> Parser<'a> {
    fn err(&self, reason: impl Into<String>) -> FieldError {
        FieldError::Parse {
            text: self.text.to_string(),
            at: self.pos,
            reason: reason.into(),
        }
    }

    fn skip_ws(&mut self) {
        while self.text[self.pos..].starts_with(char::is_whitespace) {
            self.pos += self.text[self.pos..]
                .chars()
                .next()
                .map_or(1, char::len_utf8);
        }
    }

    fn peek(&mut self) -> Option<char> {
        self.skip_ws();
        self.text[self.pos..].chars().next()
    }

    fn eat(&mut self, c: char) -> bool {
        if self.peek() == Some(c) {
            self.pos += c.len_utf8();
            true
        } else {
            false
        }
    }

    fn lift(&self, r: Result<Cyc, FieldError>) -> Result<Cyc, FieldError> {
        r.map_err(|e| match e {
            FieldError::Parse { .. } => e,
            other => self.err(other.to_string()),
        })
    }

    fn expr(&mut self) -> Result<Cyc, FieldError> {
        let mut acc = if self.eat('-') {
            let t = self.term()?;
            self.field.neg(&t)
        } else {
            self.eat('+');
            self.term()?
        };
        loop {
            if self.eat('+') {
                let t = self.term()?;
                acc = self.lift(self.field.add(&acc, &t))?;
            } else if self.eat('-') {
                let t = self.term()?;
                acc = self.lift(self.field.sub(&acc, &t))?;
            } else {
                return Ok(acc);
            }
        }
    }

    fn term(&mut self) -> Result<Cyc, FieldError> {
        let mut acc = self.power()?;
        loop {
            if self.eat('*') {
                let t = self.power()?;
                acc = self.lift(self.field.mul(&acc, &t))?;
            } else if self.eat('/') {
                let t = self.power()?;
                acc = self.lift(self.field.div(&acc, &t))?;
            } else {
                return Ok(acc);
            }
        }
    }

    fn power(&mut self) -> Result<Cyc, FieldError> {
        let base = self.atom()?;
        if self.eat('^') {
            let neg = self.eat('-');
            let e = self.integer()?;
            let e = e
                .to_i64()
                .ok_or_else(|| self.err("exponent does not fit in 64 bits"))?;
            let e = if neg { -e } else { e };
            let e = self.bounded_exponent(&base, e)?;
            self.lift(self.field.pow(&base, e))
        } else {
            Ok(base)
        }
    }

    /// The exponent to use for `base^e`: reduced modulo the order when `base` is a root of
    /// unity, refused when the result would exceed [`MAX_POWER_BITS`] bits per coefficient.
    fn bounded_exponent(&self, base: &Cyc, e: i64) -> Result<i64, FieldError> {
        if e.unsigned_abs() <= 2 || base.is_zero() {
            return Ok(e);
        }
        if let Some(order) = self.lift_order(self.field.root_of_unity_order(base))? {
            return Ok(e.rem_euclid(order as i64));
        }
        let (num, den) = base.to_big_parts();
        let height = num.iter().map(|c| c.bits()).max().unwrap_or(0);
        let phi = num.len().max(1) as u64;
        let spread = if base.as_rational().is_some() {
            0
        } else {
            64 - (phi - 1).leading_zeros() as u64 + 1
        };
        let per_step = height + den.bits() + spread;
        let bound = e.unsigned_abs().saturating_mul(per_step);
        if bound > MAX_POWER_BITS {
            return Err(self.err(format!(
                "power too large: the result may need {bound} bits per coefficient \
                 (limit {MAX_POWER_BITS})"
            )));
        }
        Ok(e)
    }

    fn lift_order(&self, r: Result<Option<u64>, FieldError>) -> Result<Option<u64>, FieldError> {
        r.map_err(|e| self.err(e.to_string()))
    }

    fn enter(&mut self) -> Result<(), FieldError> {
        self.depth += 1;
        if self.depth > MAX_PARSE_DEPTH {
            return Err(self.err(format!(
                "nesting deeper than {MAX_PARSE_DEPTH} levels of parentheses"
            )));
        }
        Ok(())
    }

    fn integer(&mut self) -> Result<BigInt, FieldError> {
        self.skip_ws();
        let digits: String = self.text[self.pos..]
            .chars()
            .take_while(char::is_ascii_digit)
            .collect();
        if digits.is_empty() {
            return Err(self.err("expected a number"));
        }
        self.pos += digits.len();
        Ok(digits.parse().expect("ascii digits"))
    }

    fn word(&mut self) -> String {
        self.skip_ws();
        let w: String = self.text[self.pos..]
            .chars()
            .take_while(char::is_ascii_alphabetic)
            .collect();
        self.pos += w.len();
        w
    }

    fn atom(&mut self) -> Result<Cyc, FieldError> {
        match self.peek() {
            Some('(') => {
                self.pos += 1;
                self.enter()?;
                let e = self.expr()?;
                if !self.eat(')') {
                    return Err(self.err("expected ')'"));
                }
                self.depth -= 1;
                Ok(e)
            }
            Some(c) if c.is_ascii_digit() => {
                let m = self.integer()?;
                self.field.big_rational(&m, &BigInt::from(1))
            }
            Some(c) if c.is_ascii_alphabetic() => {
                let start = self.pos;
                let w = self.word();
                let n = self.field.conductor() as i64;
                match w.as_str() {
                    "z" => Ok(self.field.zeta_pow(1)),
                    "i" if n % 4 == 0 => Ok(self.field.zeta_pow(n / 4)),
                    "i" => {
                        self.pos = start;
                        Err(self.err(format!("i is not in Q(ζ_{n}): 4 does not divide {n}")))
                    }
                    "zeta" | "sqrt" => {
                        if !self.eat('(') {
                            return Err(self.err("expected '('"));
                        }
                        self.enter()?;
                        let arg = self.expr()?;
                        if !self.eat(')') {
                            return Err(self.err("expected ')'"));
                        }
                        self.depth -= 1;
                        let Some((p, q)) = arg.as_rational() else {
                            return Err(self.err(format!("{w}(…) needs a rational argument")));
                        };
                        if w == "zeta" {
                            let m = (q == BigInt::from(1)).then(|| p.to_i64()).flatten();
                            match m {
                                Some(m) if m > 0 && n % m == 0 => Ok(self.field.zeta_pow(n / m)),
                                _ => Err(self.err(format!(
                                    "zeta({p}/{q}) is not a root of unity of Q(ζ_{n})"
                                ))),
                            }
                        } else {
                            self.field
                                .sqrt_rational(&p, &q)
                                .map_err(|e| self.err(e.to_string()))?
                                .ok_or_else(|| {
                                    self.err(format!("sqrt({p}/{q}) is not in Q(ζ_{n})"))
                                })
                        }
                    }
                    other => {
                        self.pos = start;
                        Err(self.err(format!(
                            "unknown name '{other}' (known: z, i, zeta(m), sqrt(r))"
                        )))
                    }
                }
            }
            Some(c) => Err(self.err(format!("unexpected '{c}'"))),
            None => Err(self.err("unexpected end of text")),
        }
    }
}

impl CyclotomicField {
    /// Read an element from text (syntax in the module documentation).
    pub fn parse(&self, text: &str) -> Result<Cyc, FieldError> {
        let mut p = Parser {
            field: self,
            text,
            pos: 0,
            depth: 0,
        };
        let value = p.expr()?;
        if p.peek().is_some() {
            return Err(p.err("unexpected text after the expression"));
        }
        Ok(value)
    }
}

/// Serde form of a standalone element: its conductor and its printed text.
#[derive(Serialize, Deserialize, Debug, Clone, PartialEq, Eq)]
pub struct CycText {
    /// Conductor n of Q(ζ_n).
    pub conductor: u32,
    /// The element printed in the text syntax.
    pub value: String,
}

impl Serialize for Cyc {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        CycText {
            conductor: self.n,
            value: self.to_string(),
        }
        .serialize(s)
    }
}

impl<'de> Deserialize<'de> for Cyc {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let t = CycText::deserialize(d)?;
        let field = CyclotomicField::new(t.conductor).map_err(serde::de::Error::custom)?;
        field.parse(&t.value).map_err(serde::de::Error::custom)
    }
}
