//! A vector of integer numerators (d blocks of φ) with the list of its non-zero positions.
//!
//! Orbit vectors are sparse (for Ising at genus 2 about a quarter of the coordinates vanish
//! and a non-zero coordinate has one or two of its φ = 8 coefficients), so the kernels walk
//! the non-zero positions only. The dense array is kept zero outside `nonzero`.

/// Numerators in a dense array plus their non-zero positions (ascending) and largest |x|.
#[derive(Debug, Clone)]
pub(crate) struct SparseNumerators {
    pub(crate) dense: Vec<i64>,
    pub(crate) nonzero: Vec<u32>,
    pub(crate) max: u64,
}

impl SparseNumerators {
    /// The zero vector of `len` numerators.
    pub(crate) fn new(len: usize) -> SparseNumerators {
        SparseNumerators {
            dense: vec![0; len],
            nonzero: Vec::new(),
            max: 0,
        }
    }

    /// Back to the zero vector (touching only the non-zero positions).
    pub(crate) fn clear(&mut self) {
        for &i in &self.nonzero {
            self.dense[i as usize] = 0;
        }
        self.nonzero.clear();
        self.max = 0;
    }

    /// Append a non-zero value at a position after every current one.
    pub(crate) fn push(&mut self, position: usize, value: i64) {
        self.dense[position] = value;
        self.nonzero.push(position as u32);
        self.max = self.max.max(value.unsigned_abs());
    }

    /// Copy from a dense slice of the same length.
    #[cfg(test)]
    pub(crate) fn set_dense(&mut self, values: &[i64]) {
        self.clear();
        for (i, &x) in values.iter().enumerate() {
            if x != 0 {
                self.push(i, x);
            }
        }
    }

    /// The first block of φ numerators that is not zero.
    pub(crate) fn first_block(&self, phi: usize) -> Option<usize> {
        self.nonzero.first().map(|&i| i as usize / phi)
    }
}
