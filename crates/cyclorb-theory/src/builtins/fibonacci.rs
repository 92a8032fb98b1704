//! Fibonacci (docs/conventions.md §2–3), labels 1, τ, c = 14/5.
//!
//! From the unitary F^{τττ}_τ = [[φ⁻¹, φ^{−1/2}], [φ^{−1/2}, −φ⁻¹]] the vertex rescaling
//! u^{ττ}_τ = φ^{−1/4} gives F^{τττ}_τ = [[φ⁻¹, 1], [φ⁻¹, −φ⁻¹]] ∈ Q(√5); F^{τττ}_1 = 1 and every
//! other admissible F-symbol is 1; R^{ττ}_1 = e^{−4πi/5}, R^{ττ}_τ = e^{3πi/5}, θ_τ = e^{4πi/5},
//! d_τ = φ.
//!
//! Vertex weights: |u^{ττ}_τ|² = φ^{−1/2} is not cyclotomic. The weights are only defined up to
//! w(a,b,c) ↦ w(a,b,c)·g(a)g(b)/g(c), h(a) ↦ h(a)·g(a)g(a*) (g(0) = 1), which leaves the form
//! of every closed tree unchanged (each inner edge is the output of one vertex and an input of
//! another; the leaves pair up in handles). With g(τ) = φ^{1/2} the weights become
//! w(τ,τ,τ) = 1, w(τ,τ,1) = φ, all others 1, so the handle weight of τ is φ: every closed
//! tree gets G = φ^{−n/2}, n its number of (τ,τ→τ) vertices, as in docs/conventions.md §4.

use cyclorb_field::CyclotomicField;
use hashbrown::HashMap;

use crate::arith::SameField;
use crate::assemble::{assemble, blocks_from_entries, RawF, RawStructure, RawTheory};
use crate::error::TheoryError;
use crate::fusion::FusionRules;
use crate::structure::key3;
use crate::theory::Theory;
use cyclorb_field::root_of_unity;

const ONE: usize = 0;
const TAU: usize = 1;

/// The Fibonacci theory.
pub fn fibonacci() -> Result<Theory, TheoryError> {
    let field = CyclotomicField::new(5)?;
    let z = |num: i64, den: i64| root_of_unity(&field, num, den).expect("10th roots");
    let sqrt5 = field
        .sqrt_rational(&num_bigint::BigInt::from(5), &num_bigint::BigInt::from(1))?
        .ok_or_else(|| TheoryError::Internal("√5 ∉ Q(ζ₅)".into()))?;
    let phi = field.times(&field.plus(&field.one(), &sqrt5), &field.rational(1, 2)?);
    let inv_phi = field.minus(&phi, &field.one());
    let fusion = FusionRules::from_triples(2, [(TAU, TAU, ONE, 1), (TAU, TAU, TAU, 1)])
        .map_err(|e| TheoryError::Internal(format!("Fibonacci fusion: {e:?}")))?;
    let blocks = blocks_from_entries(&field, &fusion, |a, b, c, d, e, f| {
        if (a, b, c, d) == (TAU, TAU, TAU, TAU) {
            match (e, f) {
                (ONE, TAU) => field.one(),
                (TAU, TAU) => field.neg(&inv_phi),
                _ => inv_phi.clone(),
            }
        } else {
            field.one()
        }
    });
    let mut r = HashMap::new();
    r.insert(key3(2, TAU, TAU, ONE), z(-2, 5));
    r.insert(key3(2, TAU, TAU, TAU), z(3, 10));
    for a in 0..2 {
        r.insert(key3(2, ONE, a, a), field.one());
        r.insert(key3(2, a, ONE, a), field.one());
    }
    let mut weights = HashMap::new();
    weights.insert(key3(2, TAU, TAU, ONE), phi.clone());
    assemble(RawTheory {
        name: "fibonacci".into(),
        labels: vec!["1".into(), "tau".into()],
        fusion,
        dims: vec![field.one(), phi],
        twists: vec![field.one(), z(2, 5)],
        structure: RawStructure::Braided {
            f: RawF::Stored(blocks),
            r,
            weights,
        },
        field,
    })
}
