//! Reduction modulo a prime p ≡ 1 (mod n) and linear algebra over F_p.
//!
//! [`PrimeReduction`] sends ζ_n to a primitive n-th root of unity r in F_p. On the ring of
//! elements of Q(ζ_n) whose denominators are prime to p this is a ring homomorphism, so it
//! maps every polynomial identity in the entries — products, minors, determinants — to the
//! same identity mod p. Hence:
//!
//! * **rank over F_p ≤ exact rank.** A non-zero r × r minor mod p is the image of a minor
//!   that is non-zero exactly. A rank found mod p is a *lower bound* for the rank over
//!   Q(ζ_n) (equal for all but finitely many p).
//! * **nullity over F_p ≥ exact nullity.** A nullspace of dimension k over F_p bounds the
//!   exact nullspace dimension above by k; k = 1 (with one exact solution in hand) proves
//!   the exact nullspace is that line. Certificates rely on this direction only.
//!
//! Reduction fails, as a [`cyclorb_field::FieldError::BadPrime`] error wrapped in
//! [`MatrixError::Field`], when p divides a denominator: the entry has no image.
//! Arithmetic is in `u64` with p < 2^31, so every product fits before reduction.

use cyclorb_field::numtheory::is_prime;
use cyclorb_field::{Cyc, FieldError, PrimeReduction};

use crate::dense::Matrix;
use crate::elimination::{eliminate, nullspace_of_reduced, Sweep};
use crate::error::MatrixError;
use crate::scalar_field::ModP;

/// The images mod p of the entries of a vector; an error when p divides a denominator.
pub fn reduce_vector(reduction: &PrimeReduction, v: &[Cyc]) -> Result<Vec<u64>, MatrixError> {
    v.iter()
        .map(|x| Ok(reduction.reduce(x)?))
        .collect::<Result<_, MatrixError>>()
}

/// A dense `rows × cols` matrix over F_p (entries in 0..p, p < 2^31 prime), row-major.
#[derive(Clone, Debug, PartialEq, Eq, Hash)]
pub struct ModpMatrix {
    p: u64,
    rows: usize,
    cols: usize,
    data: Vec<u64>,
}

impl Matrix {
    /// The entrywise image of X mod p; an error when p divides a denominator.
    pub fn reduce_mod(&self, reduction: &PrimeReduction) -> Result<ModpMatrix, MatrixError> {
        Ok(ModpMatrix {
            p: reduction.prime(),
            rows: self.rows(),
            cols: self.cols(),
            data: reduce_vector(reduction, self.entries())?,
        })
    }
}

impl ModpMatrix {
    /// The zero matrix over F_p. p must be a prime below 2^31 (an error otherwise).
    pub fn zeros(p: u64, rows: usize, cols: usize) -> Result<ModpMatrix, MatrixError> {
        if !is_prime(p) || p >= 1 << 31 {
            return Err(MatrixError::Field(FieldError::BadPrime {
                p,
                reason: "need a prime below 2^31".into(),
            }));
        }
        Ok(ModpMatrix {
            p,
            rows,
            cols,
            data: vec![0; rows * cols],
        })
    }

    /// The identity of size `dim` over F_p.
    pub fn identity(p: u64, dim: usize) -> Result<ModpMatrix, MatrixError> {
        let mut m = ModpMatrix::zeros(p, dim, dim)?;
        for i in 0..dim {
            m.data[i * dim + i] = 1;
        }
        Ok(m)
    }

    /// A matrix over F_p from rows of one length; entries are taken mod p.
    pub fn from_rows(p: u64, rows: Vec<Vec<u64>>) -> Result<ModpMatrix, MatrixError> {
        let cols = rows.first().map_or(0, Vec::len);
        if rows.iter().any(|row| row.len() != cols) {
            return Err(MatrixError::Shape("rows of different lengths".into()));
        }
        let mut m = ModpMatrix::zeros(p, rows.len(), cols)?;
        m.data = rows.into_iter().flatten().map(|x| x % p).collect();
        Ok(m)
    }

    /// The prime p.
    pub fn prime(&self) -> u64 {
        self.p
    }

    /// Number of rows.
    pub fn rows(&self) -> usize {
        self.rows
    }

    /// Number of columns.
    pub fn cols(&self) -> usize {
        self.cols
    }

    /// Entry (i, j), in 0..p.
    pub fn get(&self, i: usize, j: usize) -> u64 {
        self.data[i * self.cols + j]
    }

    /// Set entry (i, j) to v mod p.
    pub fn set(&mut self, i: usize, j: usize, v: u64) {
        self.data[i * self.cols + j] = v % self.p;
    }

    /// Row i as a slice.
    pub fn row(&self, i: usize) -> &[u64] {
        &self.data[i * self.cols..(i + 1) * self.cols]
    }

    /// self · v over F_p.
    pub fn mul_vec(&self, v: &[u64]) -> Result<Vec<u64>, MatrixError> {
        if v.len() != self.cols {
            return Err(MatrixError::Shape(format!(
                "{}×{} times vector of length {}",
                self.rows,
                self.cols,
                v.len()
            )));
        }
        Ok((0..self.rows)
            .map(|i| {
                self.row(i)
                    .iter()
                    .zip(v)
                    .fold(0, |acc, (a, b)| (acc + a * (b % self.p)) % self.p)
            })
            .collect())
    }

    /// self · other over F_p (same prime).
    pub fn mul(&self, other: &ModpMatrix) -> Result<ModpMatrix, MatrixError> {
        if self.cols != other.rows || self.p != other.p {
            return Err(MatrixError::Shape(format!(
                "{}×{} mod {} times {}×{} mod {}",
                self.rows, self.cols, self.p, other.rows, other.cols, other.p
            )));
        }
        let p = self.p;
        let mut data = vec![0u64; self.rows * other.cols];
        for i in 0..self.rows {
            let out = &mut data[i * other.cols..(i + 1) * other.cols];
            for (k, &a) in self.row(i).iter().enumerate() {
                if a == 0 {
                    continue;
                }
                for (o, &b) in out.iter_mut().zip(other.row(k)) {
                    *o = (*o + a * b) % p;
                }
            }
        }
        Ok(ModpMatrix {
            p,
            rows: self.rows,
            cols: other.cols,
            data,
        })
    }

    /// `Some(c)` when the matrix is c·I over F_p (square; c may be 0).
    pub fn is_scalar(&self) -> Option<u64> {
        if self.rows != self.cols {
            return None;
        }
        let c = if self.rows == 0 { 1 } else { self.data[0] };
        let fits = (0..self.rows)
            .all(|i| (0..self.cols).all(|j| self.get(i, j) == if i == j { c } else { 0 }));
        fits.then_some(c)
    }

    fn row_vectors(&self) -> Vec<Vec<u64>> {
        (0..self.rows).map(|i| self.row(i).to_vec()).collect()
    }

    /// The rank over F_p. When this matrix is the reduction of an exact matrix X, it is a
    /// lower bound: rank_p ≤ rank X (see the module documentation).
    pub fn rank(&self) -> usize {
        // entries are in 0..p and p is prime: F_p arithmetic cannot fail
        eliminate(
            &ModP::prime(self.p),
            self.row_vectors(),
            self.cols,
            Sweep::Below,
        )
        .map_or(0, |reduced| reduced.pivots.len())
    }

    /// A basis of the nullspace over F_p (one vector per non-pivot column, 1 there). When
    /// this matrix reduces an exact X, its length (cols − rank_p) is an upper bound for the
    /// exact nullspace dimension.
    pub fn nullspace(&self) -> Vec<Vec<u64>> {
        let s = ModP::prime(self.p);
        match eliminate(&s, self.row_vectors(), self.cols, Sweep::Both) {
            Ok(reduced) => nullspace_of_reduced(&s, &reduced, self.cols),
            Err(_) => Vec::new(),
        }
    }
}
