//! Re-checking a commutant certificate (docs/certificates.md §4).
//!
//! Lower bound: every basis matrix X satisfies X·A = A·X for every generator A (dense
//! products) and the basis is independent (rank of the flattened matrices modulo a stated
//! prime, which bounds the exact rank from below; exact rank when that falls short). Upper
//! bound: the system X·A − A·X = 0 in the d² unknowns X_ij, reduced modulo each stated prime
//! and brought to echelon form row by row, has the stated nullity (the producer cut the
//! unknowns first; here the whole system is used), and one of them equals the dimension;
//! when none does, the exact rank of the system over Q(ζ_n) is used. The self-adjoint basis: each element commutes and G·X = X†·G.

use cyclorb_cert::{CommutantCertificate, ProvedGenerators};
use cyclorb_field::PrimeReduction;
use cyclorb_matrix::{reduce_vector, Matrix};

use super::claims::same_conductor;
use super::linear::EchelonModP;
use super::{Claims, Stop};

fn err(e: impl ToString) -> String {
    e.to_string()
}

/// Every matrix commutes with every generator; the name of the first that does not.
fn commuting(gens: &ProvedGenerators, matrices: &[Matrix]) -> Result<(), String> {
    let field = gens.field();
    for (k, x) in matrices.iter().enumerate() {
        if x.rows() != gens.dimension() || x.cols() != gens.dimension() {
            return Err(format!("matrix {k} is not {0}×{0}", gens.dimension()));
        }
        for a in 0..gens.len() {
            let g = gens.dense(a);
            if x.mul(field, g).map_err(err)? != g.mul(field, x).map_err(err)? {
                return Err(format!(
                    "matrix {k} does not commute with {}",
                    gens.names()[a]
                ));
            }
        }
    }
    Ok(())
}

/// The rank of the matrices as vectors of length d²: modulo p first, exactly if short.
fn rank(
    gens: &ProvedGenerators,
    reduction: &PrimeReduction,
    matrices: &[Matrix],
) -> Result<usize, String> {
    let mut echelon = EchelonModP::new(reduction.prime());
    for x in matrices {
        echelon.push(reduce_vector(reduction, x.entries()).map_err(err)?);
    }
    if echelon.rank() == matrices.len() {
        return Ok(echelon.rank());
    }
    let rows = matrices.iter().map(|x| x.entries().to_vec()).collect();
    Matrix::from_rows(rows)
        .and_then(|m| m.rank(gens.field()))
        .map_err(err)
}

/// The rank modulo p of the whole system X·A − A·X = 0 in the d² unknowns X_ij.
fn rank_mod_p(gens: &ProvedGenerators, reduction: &PrimeReduction) -> Result<usize, String> {
    let d = gens.dimension();
    let p = reduction.prime();
    let mut echelon = EchelonModP::new(p);
    for a in 0..gens.len() {
        let g = gens.dense(a).reduce_mod(reduction).map_err(err)?;
        for i in 0..d {
            for j in 0..d {
                // (X·A − A·X)_ij = Σ_k X_ik A_kj − Σ_k A_ik X_kj
                let mut row = vec![0u64; d * d];
                for k in 0..d {
                    row[i * d + k] = (row[i * d + k] + g.get(k, j)) % p;
                    row[k * d + j] = (row[k * d + j] + p - g.get(i, k)) % p;
                }
                echelon.push(row);
            }
        }
    }
    Ok(echelon.rank())
}

/// The exact rank of the commutant system over Q(ζ_n).
fn exact_rank(gens: &ProvedGenerators) -> Result<usize, String> {
    let field = gens.field();
    let d = gens.dimension();
    let mut rows = Vec::new();
    for a in 0..gens.len() {
        let g = gens.dense(a);
        for i in 0..d {
            for j in 0..d {
                let mut row = vec![field.zero(); d * d];
                for k in 0..d {
                    row[i * d + k] = field.add(&row[i * d + k], g.get(k, j)).map_err(err)?;
                    row[k * d + j] = field.sub(&row[k * d + j], g.get(i, k)).map_err(err)?;
                }
                rows.push(row);
            }
        }
    }
    Matrix::from_rows(rows)
        .and_then(|m| m.rank(field))
        .map_err(err)
}

/// Every claim of a commutant certificate.
pub fn check(
    gens: &ProvedGenerators,
    c: &CommutantCertificate,
    claims: &mut Claims,
) -> Result<(), Stop> {
    let field = gens.field();
    let d = gens.dimension();
    let reduction = PrimeReduction::nth(field, 0).map_err(|e| Stop::Invalid(e.to_string()))?;
    claims.claim("basis-commutes", || {
        same_conductor(c.conductor, field.conductor())?;
        commuting(gens, &c.basis)?;
        Ok(format!(
            "each of the {} basis matrices commutes with all {} generators (dense products)",
            c.basis.len(),
            gens.len()
        ))
    })?;
    claims.claim("lower-bound", || {
        let r = rank(gens, &reduction, &c.basis)?;
        if r != c.basis.len() || r != c.dimension {
            return Err(format!(
                "{} basis matrices of rank {r}, dimension stated {}",
                c.basis.len(),
                c.dimension
            ));
        }
        Ok(format!(
            "the basis is independent (rank {r}): dimension ≥ {r}"
        ))
    })?;
    claims.claim("bounds", || {
        let unknowns = d * d;
        for bound in &c.bounds {
            let reduction = PrimeReduction::with_prime(field, bound.prime)
                .map_err(|e| format!("prime {}: {e}", bound.prime))?;
            let nullity = unknowns - rank_mod_p(gens, &reduction)?;
            if nullity != bound.nullity {
                return Err(format!(
                    "modulo {} the system X·A = A·X has nullity {nullity}, the certificate says {}",
                    bound.prime, bound.nullity
                ));
            }
        }
        Ok(format!(
            "the whole system in {unknowns} unknowns has the stated nullity modulo each of the {} primes (the producer cut the unknowns first; its `unknowns` counts record that cut and are not claims)",
            c.bounds.len()
        ))
    })?;
    claims.claim("upper-bound", || {
        if let Some(bound) = c.bounds.iter().find(|b| b.nullity == c.dimension) {
            return Ok(format!(
                "nullity {} modulo p = {} bounds the exact dimension from above",
                c.dimension, bound.prime
            ));
        }
        let r = exact_rank(gens)?;
        if d * d - r != c.dimension {
            return Err(format!(
                "the exact nullity is {}, not {}",
                d * d - r,
                c.dimension
            ));
        }
        Ok(format!(
            "exact rank {r} of the system over Q(ζ_n): dimension ≤ {}",
            c.dimension
        ))
    })?;
    claims.claim("self-adjoint-basis", || {
        commuting(gens, &c.hermitian_basis)?;
        let complete = field.conductor() < 3 || c.hermitian_basis.len() == c.dimension;
        if !complete || c.hermitian_basis.len() > c.dimension {
            return Err(format!(
                "{} self-adjoint matrices for dimension {}",
                c.hermitian_basis.len(),
                c.dimension
            ));
        }
        if rank(gens, &reduction, &c.hermitian_basis)? != c.hermitian_basis.len() {
            return Err("the self-adjoint basis is dependent".into());
        }
        let form = gens.form();
        let g = |i: usize| form.map_or_else(|| field.one(), |f| f[i].clone());
        for (k, x) in c.hermitian_basis.iter().enumerate() {
            for i in 0..d {
                for j in 0..d {
                    // (G·X)_ij = g_i X_ij must equal (X†·G)_ij = conj(X_ji) g_j
                    let left = field.mul(&g(i), x.get(i, j)).map_err(err)?;
                    let right = field.mul(&field.conj(x.get(j, i)), &g(j)).map_err(err)?;
                    if left != right {
                        return Err(format!("self-adjoint matrix {k}: G·X ≠ X†·G at ({i}, {j})"));
                    }
                }
            }
        }
        Ok(format!(
            "{} independent commuting matrices with G·X = X†·G",
            c.hermitian_basis.len()
        ))
    })
}
