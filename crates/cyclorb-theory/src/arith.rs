//! Arithmetic on elements that all live in one theory's field.
//!
//! Every element a theory stores lies in its field Q(ζ_n), so sums and products of them
//! cannot fail; these helpers state that invariant once instead of at every call.

use cyclorb_field::{Cyc, CyclotomicField, DotAccumulator};

/// Operations on elements of one field whose operands are known to lie in it.
pub(crate) trait SameField {
    /// a + b.
    fn plus(&self, a: &Cyc, b: &Cyc) -> Cyc;
    /// a − b.
    fn minus(&self, a: &Cyc, b: &Cyc) -> Cyc;
    /// a · b.
    fn times(&self, a: &Cyc, b: &Cyc) -> Cyc;
    /// The product of all factors (1 for none).
    fn product<'a>(&self, factors: impl IntoIterator<Item = &'a Cyc>) -> Cyc;
    /// a⁻¹, `None` for a = 0.
    fn inverse(&self, a: &Cyc) -> Option<Cyc>;
    /// Σ a_k b_k with one reduction.
    fn dot_same<'a>(&self, pairs: impl IntoIterator<Item = (&'a Cyc, &'a Cyc)>) -> Cyc;
}

const SAME: &str = "operands lie in the theory's field";

impl SameField for CyclotomicField {
    fn plus(&self, a: &Cyc, b: &Cyc) -> Cyc {
        self.add(a, b).expect(SAME)
    }

    fn minus(&self, a: &Cyc, b: &Cyc) -> Cyc {
        self.sub(a, b).expect(SAME)
    }

    fn times(&self, a: &Cyc, b: &Cyc) -> Cyc {
        self.mul(a, b).expect(SAME)
    }

    fn product<'a>(&self, factors: impl IntoIterator<Item = &'a Cyc>) -> Cyc {
        let mut acc = self.one();
        for f in factors {
            acc = self.times(&acc, f);
        }
        acc
    }

    fn inverse(&self, a: &Cyc) -> Option<Cyc> {
        if a.is_zero() || a.conductor() != self.conductor() {
            None
        } else {
            self.inv(a).ok()
        }
    }

    fn dot_same<'a>(&self, pairs: impl IntoIterator<Item = (&'a Cyc, &'a Cyc)>) -> Cyc {
        let mut acc = DotAccumulator::new(self);
        for (a, b) in pairs {
            acc.add_product(a, b).expect(SAME);
        }
        acc.finish()
    }
}
