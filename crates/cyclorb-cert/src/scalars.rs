//! The two fields the linear algebra of this crate runs over, behind one trait: F_p (fast,
//! for bounds) and Q(ζ_n) (exact, for answers).

use cyclorb_field::numtheory::pow_mod;
use cyclorb_field::{Cyc, CyclotomicField, PrimeReduction};

use crate::error::CertError;

/// Field arithmetic for the generic elimination of [`crate::echelon`].
pub(crate) trait Scalars {
    /// An element.
    type E: Clone + PartialEq + std::fmt::Debug;
    /// 0.
    fn zero(&self) -> Self::E;
    /// 1.
    fn one(&self) -> Self::E;
    /// a = 0.
    fn is_zero(&self, a: &Self::E) -> bool;
    /// a + b.
    fn add(&self, a: &Self::E, b: &Self::E) -> Result<Self::E, CertError>;
    /// a · b.
    fn mul(&self, a: &Self::E, b: &Self::E) -> Result<Self::E, CertError>;
    /// a − f·b, fused.
    fn mul_sub(&self, a: &Self::E, f: &Self::E, b: &Self::E) -> Result<Self::E, CertError>;
    /// −a.
    fn neg(&self, a: &Self::E) -> Self::E;
    /// a⁻¹ (a ≠ 0).
    fn inv(&self, a: &Self::E) -> Result<Self::E, CertError>;
    /// Σ a_k·b_k.
    fn dot<'a>(
        &self,
        pairs: impl Iterator<Item = (&'a Self::E, &'a Self::E)>,
    ) -> Result<Self::E, CertError>
    where
        Self::E: 'a;
    /// The images of the roots of unity ±ζ_n^k of Q(ζ_n) (the eigenvalue candidates of a
    /// Dehn twist up to the root-of-unity rescaling of generators), without repeats.
    fn roots_of_unity(&self) -> Vec<Self::E>;
}

/// F_p for a prime p ≡ 1 (mod n), with r the image of ζ_n; p < 2^31, so products fit u64.
pub(crate) struct ModP {
    p: u64,
    root: u64,
    conductor: u64,
}

impl ModP {
    /// The residue field of a reduction Q(ζ_n) → F_p.
    pub(crate) fn new(reduction: &PrimeReduction, conductor: u32) -> ModP {
        ModP {
            p: reduction.prime(),
            root: reduction.root(),
            conductor: u64::from(conductor),
        }
    }
}

impl Scalars for ModP {
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
    fn add(&self, a: &u64, b: &u64) -> Result<u64, CertError> {
        Ok((a + b) % self.p)
    }
    fn mul(&self, a: &u64, b: &u64) -> Result<u64, CertError> {
        Ok(a * b % self.p)
    }
    fn mul_sub(&self, a: &u64, f: &u64, b: &u64) -> Result<u64, CertError> {
        Ok((a + self.p - f * b % self.p) % self.p)
    }
    fn neg(&self, a: &u64) -> u64 {
        (self.p - a) % self.p
    }
    fn inv(&self, a: &u64) -> Result<u64, CertError> {
        if *a == 0 {
            return Err(CertError::Field(cyclorb_field::FieldError::DivisionByZero));
        }
        Ok(pow_mod(*a, self.p - 2, self.p))
    }
    fn dot<'a>(&self, pairs: impl Iterator<Item = (&'a u64, &'a u64)>) -> Result<u64, CertError> {
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
pub(crate) struct Exact<'f> {
    field: &'f CyclotomicField,
}

impl<'f> Exact<'f> {
    /// Exact arithmetic in `field`.
    pub(crate) fn new(field: &'f CyclotomicField) -> Exact<'f> {
        Exact { field }
    }
}

impl Scalars for Exact<'_> {
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
    fn add(&self, a: &Cyc, b: &Cyc) -> Result<Cyc, CertError> {
        Ok(self.field.add(a, b)?)
    }
    fn mul(&self, a: &Cyc, b: &Cyc) -> Result<Cyc, CertError> {
        Ok(self.field.mul(a, b)?)
    }
    fn mul_sub(&self, a: &Cyc, f: &Cyc, b: &Cyc) -> Result<Cyc, CertError> {
        let minus_f = self.field.neg(f);
        let one = self.field.one();
        Ok(self.field.dot([(a, &one), (&minus_f, b)])?)
    }
    fn neg(&self, a: &Cyc) -> Cyc {
        self.field.neg(a)
    }
    fn inv(&self, a: &Cyc) -> Result<Cyc, CertError> {
        Ok(self.field.inv(a)?)
    }
    fn dot<'a>(&self, pairs: impl Iterator<Item = (&'a Cyc, &'a Cyc)>) -> Result<Cyc, CertError> {
        Ok(self.field.dot(pairs)?)
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
