//! Genus 1 from modular data alone (theories without F and R): T_α = T = diag(θ) and
//! T_β = S T S⁻¹, in the label basis.

use cyclorb_matrix::{Matrix, Operator};
use cyclorb_theory::Theory;

use crate::error::McgError;

/// S T S⁻¹ for a theory given by S and T.
pub fn beta_from_modular_data(theory: &Theory) -> Result<Operator, McgError> {
    let f = theory.field();
    let s = theory.s_unnormalized();
    let r = theory.rank();
    let t = Matrix::diagonal(
        f,
        &(0..r).map(|a| theory.twist(a).clone()).collect::<Vec<_>>(),
    );
    let sts = s.mul(f, &t)?.mul(f, &s.inverse(f)?)?;
    Ok(Operator::Dense(sts))
}
