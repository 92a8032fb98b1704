//! Certified commutant dimension (irreducibility by Schur's lemma when it is 1).
//!
//! **Bound modulo p.** Reduction Q(ζ_n) → F_p (p ≡ 1 mod n, ζ_n ↦ a primitive n-th root of
//! unity r) is a ring homomorphism on the entries, so every minor of the commutant system
//! that vanishes exactly vanishes mod p: rank_p ≤ rank, hence nullity_p ≥ nullity. The
//! identity commutes with everything, so nullity ≥ 1, and nullity_p = 1 proves the exact
//! commutant is the scalars. The system is solved by [`cyclorb_matrix::solve_commutant`], whose
//! cut of the unknowns (diagonal generators, or an eigenbasis mod p) keeps 36-dimensional
//! sets at a few hundred unknowns.
//!
//! **Exact basis.** When every prime tried gives nullity_p = k > 1, the same system is
//! solved over Q(ζ_n), and its basis is checked to commute with every generator. The
//! certificate then holds k' independent commuting matrices (dimension ≥ k') and either a
//! prime with nullity_p = k' (dimension ≤ k') or, failing that, the exact nullity itself.

use cyclorb_field::{CyclotomicField, FieldError, PrimeReduction};
use cyclorb_matrix::{
    solve_commutant, CommutantCut, CommutantSystem, EigenbasisCut, Exact, Matrix, MatrixError,
    ModP, Rows, SolvedCommutant, UnknownOrder, Want,
};
use serde::{Deserialize, Serialize};

use crate::error::{require, CertError};
use crate::hermitian::{g_adjoint, independent_subset, self_adjoint_basis};
use cyclorb_matrix::ProvedGenerators;

/// Further prime indices tried when a prime divides a denominator of the generators.
const SPARE_PRIMES: usize = 8;

/// How many primes to try before solving exactly.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct CommutantOptions {
    /// Usable primes tried (at least 1); the exact solve runs only when all give nullity > 1.
    pub primes: usize,
}

impl Default for CommutantOptions {
    fn default() -> Self {
        CommutantOptions { primes: 2 }
    }
}

/// The commutant system modulo one prime.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct PrimeBound {
    /// The prime p ≡ 1 (mod n).
    pub prime: u64,
    /// The nullity over F_p: an upper bound of the commutant dimension.
    pub nullity: usize,
    /// Unknowns left after the cut (diagonal generators or an eigenbasis mod p).
    pub unknowns: usize,
}

/// Which argument fixed the dimension.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum CommutantRoute {
    /// Nullity 1 modulo a prime (irreducible).
    Modular,
    /// An exact basis over Q(ζ_n).
    Exact,
}

/// The commutant of a generator set, with its proof.
#[derive(Debug, Clone, PartialEq, Eq, Serialize, Deserialize)]
pub struct CommutantCertificate {
    /// The conductor n of Q(ζ_n).
    pub conductor: u32,
    /// The dimension of {X : X A = A X for every generator A}, exactly.
    pub dimension: usize,
    /// How it was fixed.
    pub route: CommutantRoute,
    /// Every prime tried, in order.
    pub bounds: Vec<PrimeBound>,
    /// A basis of the commutant (the identity alone when the dimension is 1).
    pub basis: Vec<Matrix>,
    /// A basis of G-self-adjoint commutant elements X (X* = G⁻¹X†G = X, so X G⁻¹ is
    /// Hermitian): as many as `dimension` when n ≥ 3. They are X_a + X_a* and
    /// c·(X_a − X_a*), c = ζ_n − ζ_n⁻¹, reduced to an independent set; the self-adjoint
    /// commutant elements are exactly their real combinations. For n ≤ 2 (the field Q) only
    /// the X_a + X_a* are available and span the self-adjoint part.
    pub hermitian_basis: Vec<Matrix>,
}

impl CommutantCertificate {
    /// True when the commutant is the scalars (irreducible, by Schur's lemma absolutely so).
    pub fn is_irreducible(&self) -> bool {
        self.dimension == 1
    }

    /// Re-derive the certificate from the generators: the basis commutes and is
    /// independent (dimension ≥ k), a recorded prime again gives nullity k, or the exact
    /// nullity is k (dimension ≤ k), and the self-adjoint basis is sound.
    pub fn verify(&self, gens: &ProvedGenerators) -> Result<(), CertError> {
        let field = gens.field();
        crate::error::require_conductor(gens, self.conductor)?;
        require(
            self.basis.len() == self.dimension && self.dimension >= 1,
            || {
                format!(
                    "{} basis matrices for dimension {}",
                    self.basis.len(),
                    self.dimension
                )
            },
        )?;
        check_commuting_independent(gens, &self.basis, "basis")?;
        let witness_prime = self.bounds.iter().find(|b| b.nullity == self.dimension);
        let upper = match witness_prime {
            Some(bound) => {
                let reduction = PrimeReduction::with_prime(field, bound.prime)?;
                modular_bound(gens, &reduction)?.nullity
            }
            None => exact_solve(gens, None, Want::Dimension)?.nullity,
        };
        require(upper == self.dimension, || {
            format!(
                "the system has nullity {upper}, the certificate says {}",
                self.dimension
            )
        })?;
        check_commuting_independent(gens, &self.hermitian_basis, "self-adjoint basis")?;
        let complete = field.conductor() < 3 || self.hermitian_basis.len() == self.dimension;
        require(
            complete && self.hermitian_basis.len() <= self.dimension,
            || {
                format!(
                    "{} self-adjoint basis matrices for dimension {}",
                    self.hermitian_basis.len(),
                    self.dimension
                )
            },
        )?;
        for x in &self.hermitian_basis {
            require(g_adjoint(field, gens.form(), x)? == *x, || {
                "a matrix of the self-adjoint basis is not G-self-adjoint".into()
            })?;
        }
        Ok(())
    }
}

/// Every matrix commutes with every generator, and they are linearly independent.
fn check_commuting_independent(
    gens: &ProvedGenerators,
    matrices: &[Matrix],
    what: &str,
) -> Result<(), CertError> {
    let field = gens.field();
    for (k, x) in matrices.iter().enumerate() {
        for (a, name) in (0..gens.len()).map(|a| (gens.dense(a), &gens.names()[a])) {
            require(x.commutes_with(field, a)?, || {
                format!("{what} matrix {k} does not commute with {name}")
            })?;
        }
    }
    let independent = independent_subset(field, matrices.to_vec(), matrices.len())?;
    require(independent.len() == matrices.len(), || {
        format!("the {what} is linearly dependent")
    })
}

fn rows_of(m: &Matrix) -> Rows<cyclorb_field::Cyc> {
    (0..m.rows()).map(|i| m.row(i).to_vec()).collect()
}

/// The generators mod p; `None` when p divides a denominator.
fn reduced_generators(
    gens: &ProvedGenerators,
    reduction: &PrimeReduction,
) -> Result<Option<Vec<Rows<u64>>>, CertError> {
    let mut out = Vec::with_capacity(gens.len());
    for a in 0..gens.len() {
        match gens.dense(a).reduce_mod(reduction) {
            Ok(mp) => out.push((0..mp.rows()).map(|i| mp.row(i).to_vec()).collect()),
            Err(MatrixError::Field(FieldError::BadPrime { .. })) => return Ok(None),
            Err(e) => return Err(e.into()),
        }
    }
    Ok(Some(out))
}

/// The nullity mod p of the commutant system (stopping at 1), with the cut used.
fn modular_bound(
    gens: &ProvedGenerators,
    reduction: &PrimeReduction,
) -> Result<SolvedCommutant<u64>, CertError> {
    let rows = reduced_generators(gens, reduction)?.ok_or_else(|| {
        CertError::Rejected(format!(
            "the prime {} divides a denominator of the generators",
            reduction.prime()
        ))
    })?;
    let s = ModP::new(reduction, gens.field().conductor());
    solve(&s, &rows, None, Want::Dimension)
}

/// [`solve_commutant`] in row-major order with no limit on the unknowns; `candidates`
/// lists the generators that may be diagonalised (all when `None`).
fn solve<S: cyclorb_matrix::ScalarField>(
    s: &S,
    rows: &[Rows<S::E>],
    candidates: Option<&[usize]>,
    want: Want,
) -> Result<SolvedCommutant<S::E>, CertError> {
    let system = CommutantSystem {
        want,
        eigenbasis: candidates.map_or(EigenbasisCut::Any, EigenbasisCut::Among),
        order: UnknownOrder::RowMajor,
        max_unknowns: usize::MAX,
    };
    solve_commutant(s, rows, &system)?
        .ok_or_else(|| CertError::Limit("the commutant system has too many unknowns".into()))
}

fn exact_solve(
    gens: &ProvedGenerators,
    candidates: Option<&[usize]>,
    want: Want,
) -> Result<SolvedCommutant<cyclorb_field::Cyc>, CertError> {
    let field = gens.field();
    let rows: Vec<_> = (0..gens.len()).map(|a| rows_of(gens.dense(a))).collect();
    solve(&Exact::new(field), &rows, candidates, want)
}

fn matrix_of(rows: Rows<cyclorb_field::Cyc>) -> Result<Matrix, CertError> {
    Ok(Matrix::from_rows(rows)?)
}

/// The commutant {X : X·A = A·X for every generator A}, certified.
///
/// Modulo a prime p ≡ 1 (mod n) (ζ_n ↦ a primitive n-th root of unity) every minor of the
/// system that vanishes exactly vanishes mod p, so nullity mod p ≥ exact nullity ≥ 1 (the
/// identity commutes): nullity 1 mod p proves the commutant is the scalars. The unknowns
/// are first cut down: diagonal generators keep only X_ij with equal diagonal entries;
/// otherwise one generator is diagonalised (mod p) over the roots of unity ±ζ_n^k and
/// the conjugated system solved (same dimension). When every prime tried gives nullity
/// k > 1, the system is solved exactly over Q(ζ_n): the basis returned commutes with every
/// generator (checked), and a prime of nullity equal to its size, or the exact nullity,
/// bounds the dimension from above.
pub fn commutant(
    gens: &ProvedGenerators,
    options: CommutantOptions,
) -> Result<CommutantCertificate, CertError> {
    let field: &CyclotomicField = gens.field();
    let wanted = options.primes.max(1);
    let mut bounds = Vec::new();
    let mut eigen_generator = None;
    for index in 0..wanted + SPARE_PRIMES {
        if bounds.len() == wanted {
            break;
        }
        let reduction = PrimeReduction::nth(field, index)?;
        let Some(rows) = reduced_generators(gens, &reduction)? else {
            continue;
        };
        let solved = solve(
            &ModP::new(&reduction, field.conductor()),
            &rows,
            None,
            Want::Dimension,
        )?;
        bounds.push(PrimeBound {
            prime: reduction.prime(),
            nullity: solved.nullity,
            unknowns: solved.unknowns,
        });
        if let CommutantCut::Eigenbasis(g) = solved.cut {
            eigen_generator = Some(g);
        }
        if solved.nullity == 1 {
            let identity = Matrix::identity(field, gens.dimension());
            return Ok(CommutantCertificate {
                conductor: field.conductor(),
                dimension: 1,
                route: CommutantRoute::Modular,
                bounds,
                basis: vec![identity.clone()],
                hermitian_basis: vec![identity],
            });
        }
    }
    let preferred = eigen_generator.map(|g| vec![g]);
    let solved = exact_solve(gens, preferred.as_deref(), Want::Basis)?;
    let basis: Vec<Matrix> = solved
        .basis
        .unwrap_or_default()
        .into_iter()
        .map(matrix_of)
        .collect::<Result<_, _>>()?;
    check_commuting_independent(gens, &basis, "exact basis")?;
    let hermitian_basis = self_adjoint_basis(field, gens.form(), &basis)?;
    Ok(CommutantCertificate {
        conductor: field.conductor(),
        dimension: basis.len(),
        route: CommutantRoute::Exact,
        bounds,
        basis,
        hermitian_basis,
    })
}
