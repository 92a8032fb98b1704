//! The two fields the generic linear algebra of this crate runs over, behind one trait:
//! F_p for a prime p (fast, for bounds) and Q(ζ_n) itself (exact, for answers).
//!
//! [`crate::elimination`] (batch Gauss–Jordan and the incremental [`crate::Echelon`]) and
//! [`crate::commutant`] are written once against [`ScalarField`]; [`crate::Matrix`] and
//! [`crate::ModpMatrix`] call them with [`Exact`] and [`ModP`].

use cyclorb_field::numtheory::pow_mod;
use cyclorb_field::{Cyc, CyclotomicField, FieldError, PrimeReduction};

use crate::error::MatrixError;

/// Field arithmetic for the generic elimination of [`crate::elimination`].
pub trait ScalarField {
    /// An element.
    type E: Clone + PartialEq + std::fmt::Debug;
    /// 0.
    fn zero(&self) -> Self::E;
    /// 1.
    fn one(&self) -> Self::E;
    /// a = 0.
    fn is_zero(&self, a: &Self::E) -> bool;
    /// a + b.
    fn add(&self, a: &Self::E, b: &Self::E) -> Result<Self::E, MatrixError>;
    /// a · b.
    fn mul(&self, a: &Self::E, b: &Self::E) -> Result<Self::E, MatrixError>;
    /// a + f·b, fused (one reduction in Q(ζ_n)).
    fn add_mul(&self, a: &Self::E, f: &Self::E, b: &Self::E) -> Result<Self::E, MatrixError>;
    /// −a.
    fn neg(&self, a: &Self::E) -> Self::E;
    /// a⁻¹; an error when a = 0.
    fn inv(&self, a: &Self::E) -> Result<Self::E, MatrixError>;
    /// Σ a_k·b_k.
    fn dot<'a>(
        &self,
        pairs: impl Iterator<Item = (&'a Self::E, &'a Self::E)>,
    ) -> Result<Self::E, MatrixError>
    where
        Self::E: 'a;
    /// The cost of `a` as a pivot: batch elimination picks the candidate of least cost in
    /// each column (the first one among equals). Every candidate costs the same unless a
    /// field says otherwise.
    fn pivot_cost(&self, _a: &Self::E) -> u64 {
        0
    }
    /// The images of the roots of unity ±ζ_n^k of Q(ζ_n) (the eigenvalue candidates of a
    /// Dehn twist up to the root-of-unity rescaling of generators), without repeats.
    fn roots_of_unity(&self) -> Vec<Self::E>;
}

/// F_p for a prime p < 2^31 (products fit u64), with r the image of ζ_n when it comes
/// from a reduction Q(ζ_n) → F_p.
#[derive(Debug, Clone, Copy)]
pub struct ModP {
    p: u64,
    root: u64,
    conductor: u64,
}

impl ModP {
    /// The residue field of a reduction Q(ζ_n) → F_p.
    pub fn new(reduction: &PrimeReduction, conductor: u32) -> ModP {
        ModP {
            p: reduction.prime(),
            root: reduction.root(),
            conductor: u64::from(conductor),
        }
    }

    /// F_p on its own (as F_p = image of Q(ζ_1)); the caller has checked that p is a prime
    /// below 2^31.
    pub(crate) fn prime(p: u64) -> ModP {
        ModP {
            p,
            root: 1,
            conductor: 1,
        }
    }
}

impl ScalarField for ModP {
    type E = u64;
    fn zero(&self) -> u64 {
        0
    }
    fn one(&self) -> u64 {
        1
    }
    fn is_zero(&self, a: &u64) -> bool {
        *a == 0
    }
    fn add(&self, a: &u64, b: &u64) -> Result<u64, MatrixError> {
        Ok((a + b) % self.p)
    }
    fn mul(&self, a: &u64, b: &u64) -> Result<u64, MatrixError> {
        Ok(a * b % self.p)
    }
    fn add_mul(&self, a: &u64, f: &u64, b: &u64) -> Result<u64, MatrixError> {
        Ok((a + f * b % self.p) % self.p)
    }
    fn neg(&self, a: &u64) -> u64 {
        (self.p - a) % self.p
    }
    fn inv(&self, a: &u64) -> Result<u64, MatrixError> {
        if *a == 0 {
            return Err(MatrixError::Field(FieldError::DivisionByZero));
        }
        Ok(pow_mod(*a, self.p - 2, self.p))
    }
    fn dot<'a>(&self, pairs: impl Iterator<Item = (&'a u64, &'a u64)>) -> Result<u64, MatrixError> {
        Ok(pairs.fold(0, |acc, (a, b)| (acc + a * b) % self.p))
    }
    fn roots_of_unity(&self) -> Vec<u64> {
        let mut out = Vec::new();
        for k in 0..self.conductor.max(1) {
            let r = pow_mod(self.root, k, self.p);
            for x in [r, self.neg(&r)] {
                if !out.contains(&x) {
                    out.push(x);
                }
            }
        }
        out
    }
}

/// Q(ζ_n) itself.
#[derive(Debug, Clone, Copy)]
pub struct Exact<'f> {
    field: &'f CyclotomicField,
}

impl<'f> Exact<'f> {
    /// Exact arithmetic in `field`.
    pub fn new(field: &'f CyclotomicField) -> Exact<'f> {
        Exact { field }
    }
}

impl ScalarField for Exact<'_> {
    type E = Cyc;
    fn zero(&self) -> Cyc {
        self.field.zero()
    }
    fn one(&self) -> Cyc {
        self.field.one()
    }
    fn is_zero(&self, a: &Cyc) -> bool {
        a.is_zero()
    }
    fn add(&self, a: &Cyc, b: &Cyc) -> Result<Cyc, MatrixError> {
        Ok(self.field.add(a, b)?)
    }
    fn mul(&self, a: &Cyc, b: &Cyc) -> Result<Cyc, MatrixError> {
        Ok(self.field.mul(a, b)?)
    }
    fn add_mul(&self, a: &Cyc, f: &Cyc, b: &Cyc) -> Result<Cyc, MatrixError> {
        let one = self.field.one();
        Ok(self.field.dot([(a, &one), (f, b)])?)
    }
    fn neg(&self, a: &Cyc) -> Cyc {
        self.field.neg(a)
    }
    /// x⁻¹, by conjugation when x = ±ζ^k is a single unit monomial, by field inversion
    /// otherwise.
    fn inv(&self, a: &Cyc) -> Result<Cyc, MatrixError> {
        if let Some((num, 1)) = a.small_parts() {
            let mut nonzero = num.iter().filter(|c| **c != 0);
            if let (Some(c), None) = (nonzero.next(), nonzero.next()) {
                if c.abs() == 1 {
                    return Ok(self.field.conj(a));
                }
            }
        }
        Ok(self.field.inv(a)?)
    }
    fn dot<'a>(&self, pairs: impl Iterator<Item = (&'a Cyc, &'a Cyc)>) -> Result<Cyc, MatrixError> {
        Ok(self.field.dot(pairs)?)
    }
    /// 4 per non-zero coefficient plus the bits of every numerator and of the denominator:
    /// units such as ±ζ^k (k < φ(n)) score the minimum, 6, so their rows are used first
    /// (their inverse is their conjugate and their row multiples do not grow).
    fn pivot_cost(&self, x: &Cyc) -> u64 {
        let bits = |v: u64| u64::from(64 - v.leading_zeros());
        match x.small_parts() {
            Some((num, den)) => {
                let nonzero = num.iter().filter(|c| **c != 0);
                nonzero.map(|c| 4 + bits(c.unsigned_abs())).sum::<u64>() + bits(den.unsigned_abs())
            }
            None => {
                let (num, den) = x.to_big_parts();
                let nonzero = num.iter().filter(|c| !num_traits::Zero::is_zero(*c));
                nonzero.map(|c| 4 + c.bits()).sum::<u64>() + den.bits()
            }
        }
    }
    fn roots_of_unity(&self) -> Vec<Cyc> {
        let mut out = Vec::new();
        for k in 0..i64::from(self.field.conductor()) {
            let z = self.field.zeta_pow(k);
            for x in [self.field.neg(&z), z] {
                if !out.contains(&x) {
                    out.push(x);
                }
            }
        }
        out
    }
}
