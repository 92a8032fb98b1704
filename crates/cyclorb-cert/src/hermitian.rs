//! Self-adjoint elements of the commutant, for the decomposition of Poincaré sums.
//!
//! With ⟨u, v⟩_G = u† G v (G the invariant diagonal form; G = 1 when none is given), the
//! G-adjoint of X is X* = G⁻¹ X† G. Every generator A preserves G, so A* = A⁻¹; hence
//! X·A = A·X implies X*·A⁻¹ = A⁻¹·X*, i.e. the commutant is closed under *. A
//! G-self-adjoint X (X* = X, equivalently G X = X† G) is exactly one for which B = X G⁻¹ is
//! Hermitian — the shape of an invariant matrix B = Σ v v† with ρ B ρ† = B.
//!
//! From a basis X_1, …, X_k over Q(ζ_n) the candidates X_a + X_a* and c·(X_a − X_a*), with
//! c = ζ_n − ζ_n⁻¹ (purely imaginary: c̄ = −c, and non-zero for n ≥ 3), are self-adjoint and
//! span the commutant over Q(ζ_n); a maximal independent subset is a basis made of
//! self-adjoint elements, and the self-adjoint elements are exactly its combinations with
//! real coefficients (coordinates are unique and * conjugates them). For n ≤ 2 the field is
//! Q and only the X_a + X_a* are used: they span the self-adjoint part.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::{Echelon, Exact, Matrix};

use crate::error::CertError;

/// X* = G⁻¹ X† G: entry (i, j) is conj(X_ji)·g_j/g_i.
pub(crate) fn g_adjoint(
    field: &CyclotomicField,
    form: Option<&[Cyc]>,
    x: &Matrix,
) -> Result<Matrix, CertError> {
    let d = x.rows();
    let mut out = Matrix::zeros(field, d, d);
    for i in 0..d {
        for j in 0..d {
            let mut v = field.conj(x.get(j, i));
            if let Some(g) = form {
                if !v.is_zero() {
                    v = field.div(&field.mul(&v, &g[j])?, &g[i])?;
                }
            }
            out.set(i, j, v);
        }
    }
    Ok(out)
}

/// The entries of a matrix as one vector (row-major), for independence tests.
pub(crate) fn flatten(m: &Matrix) -> Vec<Cyc> {
    m.entries().to_vec()
}

/// A maximal independent subset of `candidates`, in order, stopping at `limit` elements.
pub(crate) fn independent_subset(
    field: &CyclotomicField,
    candidates: Vec<Matrix>,
    limit: usize,
) -> Result<Vec<Matrix>, CertError> {
    let s = Exact::new(field);
    let mut kept = Vec::new();
    let Some(first) = candidates.first() else {
        return Ok(kept);
    };
    let mut span = Echelon::new(first.rows() * first.cols());
    for m in candidates {
        if kept.len() == limit {
            break;
        }
        if span.insert(&s, flatten(&m))? {
            kept.push(m);
        }
    }
    Ok(kept)
}

/// A basis of the commutant made of G-self-adjoint elements (see above), from
/// any basis of it.
pub(crate) fn self_adjoint_basis(
    field: &CyclotomicField,
    form: Option<&[Cyc]>,
    basis: &[Matrix],
) -> Result<Vec<Matrix>, CertError> {
    let n = i64::from(field.conductor());
    let imaginary = (n >= 3)
        .then(|| field.sub(&field.zeta_pow(1), &field.zeta_pow(-1)))
        .transpose()?;
    let mut candidates = Vec::with_capacity(2 * basis.len());
    for x in basis {
        let star = g_adjoint(field, form, x)?;
        candidates.push(x.add(field, &star)?);
        if let Some(c) = &imaginary {
            candidates.push(x.sub(field, &star)?.scale(field, c)?);
        }
    }
    independent_subset(field, candidates, basis.len())
}
