//! Sparse vectors over Q(ζ_n) and linear maps stored by columns, with the invariant
//! Hermitian form ⟨w, v⟩_G = Σ_i conj(w_i)·G_i·v_i of a diagonal G.

use cyclorb_field::{Cyc, CyclotomicField, FieldError};
use cyclorb_matrix::{LinearMap, MatrixError, Operator};

/// A vector as its non-zero coordinates (index, value), indices increasing.
#[derive(Clone, Debug, PartialEq, Eq, Hash, Default)]
pub struct SparseVec(pub Vec<(u32, Cyc)>);

impl SparseVec {
    /// The unit vector e_i.
    pub fn unit(field: &CyclotomicField, i: usize) -> SparseVec {
        SparseVec(vec![(i as u32, field.one())])
    }

    /// True for the zero vector.
    pub fn is_zero(&self) -> bool {
        self.0.is_empty()
    }

    /// The first non-zero coordinate (index, value).
    pub fn leading(&self) -> Option<&(u32, Cyc)> {
        self.0.first()
    }

    /// The dense form of length `dim`.
    pub fn to_dense(&self, field: &CyclotomicField, dim: usize) -> Vec<Cyc> {
        let mut v = vec![field.zero(); dim];
        for (i, x) in &self.0 {
            v[*i as usize] = x.clone();
        }
        v
    }

    /// c·v.
    pub fn scale(&self, field: &CyclotomicField, c: &Cyc) -> Result<SparseVec, FieldError> {
        if c.is_zero() {
            return Ok(SparseVec::default());
        }
        let entries = self
            .0
            .iter()
            .map(|(i, x)| Ok((*i, field.mul(x, c)?)))
            .collect::<Result<_, FieldError>>()?;
        Ok(SparseVec(entries))
    }

    /// v − c·w.
    pub fn sub_scaled(
        &self,
        field: &CyclotomicField,
        c: &Cyc,
        w: &SparseVec,
    ) -> Result<SparseVec, FieldError> {
        let mut out = Vec::with_capacity(self.0.len() + w.0.len());
        let (mut a, mut b) = (self.0.iter().peekable(), w.0.iter().peekable());
        loop {
            let next = match (a.peek(), b.peek()) {
                (None, None) => break,
                (Some((i, x)), None) => {
                    a.next();
                    (*i, x.clone())
                }
                (None, Some((j, y))) => {
                    b.next();
                    (*j, field.neg(&field.mul(c, y)?))
                }
                (Some((i, x)), Some((j, y))) => {
                    if i < j {
                        a.next();
                        (*i, x.clone())
                    } else if j < i {
                        b.next();
                        (*j, field.neg(&field.mul(c, y)?))
                    } else {
                        a.next();
                        b.next();
                        (*i, field.sub(x, &field.mul(c, y)?)?)
                    }
                }
            };
            if !next.1.is_zero() {
                out.push(next);
            }
        }
        Ok(SparseVec(out))
    }

    /// The same line with leading coordinate 1 (zero stays zero).
    pub fn normalised(&self, field: &CyclotomicField) -> Result<SparseVec, FieldError> {
        match self.leading() {
            None => Ok(self.clone()),
            Some((_, lead)) if lead.is_one() => Ok(self.clone()),
            Some((_, lead)) => self.scale(field, &field.inv(lead)?),
        }
    }
}

/// ⟨w, v⟩_G = Σ_i conj(w_i)·G_i·v_i for the diagonal form G.
pub fn inner(
    field: &CyclotomicField,
    form: &[Cyc],
    w: &SparseVec,
    v: &SparseVec,
) -> Result<Cyc, FieldError> {
    let mut left = Vec::new();
    let mut right = Vec::new();
    let (mut a, mut b) = (w.0.iter().peekable(), v.0.iter().peekable());
    while let (Some((i, x)), Some((j, y))) = (a.peek(), b.peek()) {
        if i < j {
            a.next();
        } else if j < i {
            b.next();
        } else {
            left.push(field.mul(&field.conj(x), &form[*i as usize])?);
            right.push(y);
            a.next();
            b.next();
        }
    }
    field.dot(left.iter().zip(right))
}

/// A square linear map stored by columns: column j lists (row, value) of its non-zero
/// entries, rows increasing.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct ColumnMap {
    columns: Vec<Vec<(u32, Cyc)>>,
}

impl ColumnMap {
    /// The columns of any operator.
    pub fn from_operator(field: &CyclotomicField, op: &Operator) -> Result<ColumnMap, MatrixError> {
        op.validate()?;
        let dense = op.to_dense(field);
        let dim = dense.rows();
        let columns = (0..dim)
            .map(|j| {
                (0..dim)
                    .filter(|&i| !dense.get(i, j).is_zero())
                    .map(|i| (i as u32, dense.get(i, j).clone()))
                    .collect()
            })
            .collect();
        Ok(ColumnMap { columns })
    }

    /// The map whose column j is the image of e_j under `image`.
    pub fn from_images(
        dim: usize,
        mut image: impl FnMut(usize) -> Result<SparseVec, FieldError>,
    ) -> Result<ColumnMap, FieldError> {
        let columns = (0..dim)
            .map(|j| Ok(image(j)?.0))
            .collect::<Result<_, FieldError>>()?;
        Ok(ColumnMap { columns })
    }

    /// The dimension.
    pub fn dim(&self) -> usize {
        self.columns.len()
    }

    /// Column j: the image of e_j.
    pub fn column(&self, j: usize) -> SparseVec {
        SparseVec(self.columns[j].clone())
    }

    /// A·v.
    pub fn apply(&self, field: &CyclotomicField, v: &SparseVec) -> Result<SparseVec, FieldError> {
        let mut terms: Vec<(u32, &Cyc, &Cyc)> = Vec::new();
        for (j, x) in &v.0 {
            for (i, a) in &self.columns[*j as usize] {
                terms.push((*i, a, x));
            }
        }
        terms.sort_by_key(|t| t.0);
        let mut out = Vec::new();
        let mut start = 0;
        while start < terms.len() {
            let row = terms[start].0;
            let end = start + terms[start..].iter().take_while(|t| t.0 == row).count();
            let value = field.dot(terms[start..end].iter().map(|t| (t.1, t.2)))?;
            if !value.is_zero() {
                out.push((row, value));
            }
            start = end;
        }
        Ok(SparseVec(out))
    }

    /// A^k·v (k ≥ 0).
    pub fn apply_power(
        &self,
        field: &CyclotomicField,
        k: u32,
        v: &SparseVec,
    ) -> Result<SparseVec, FieldError> {
        let mut w = v.clone();
        for _ in 0..k {
            w = self.apply(field, &w)?;
        }
        Ok(w)
    }

    /// A^k as a column map.
    pub fn power(&self, field: &CyclotomicField, k: u32) -> Result<ColumnMap, FieldError> {
        ColumnMap::from_images(self.dim(), |j| {
            self.apply_power(field, k, &SparseVec::unit(field, j))
        })
    }

    /// Whether A·B = B·A exactly.
    pub fn commutes_with(
        &self,
        field: &CyclotomicField,
        b: &ColumnMap,
    ) -> Result<bool, FieldError> {
        for j in 0..self.dim() {
            let ab = self.apply(field, &b.column(j))?;
            let ba = b.apply(field, &self.column(j))?;
            if ab != ba {
                return Ok(false);
            }
        }
        Ok(true)
    }

    /// The scalar c when A = c·1.
    pub fn scalar(&self) -> Option<Cyc> {
        let first = self.columns.first()?.first()?.1.clone();
        self.columns
            .iter()
            .enumerate()
            .all(|(j, col)| col.len() == 1 && col[0].0 as usize == j && col[0].1 == first)
            .then_some(first)
    }
}
