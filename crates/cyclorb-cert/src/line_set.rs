//! A finite set of lines given by representatives, read one at a time: an orbit of millions
//! of lines need not be held as field elements all at once.

use cyclorb_field::Cyc;

use crate::error::CertError;

/// Lines ⟨v_0⟩, ⟨v_1⟩, … of Q(ζ_n)^d, indexed from 0, each read on demand as a non-zero
/// representative vector (any scalar multiple will do). Shared between threads.
pub trait LineSet: Sync {
    /// The number of lines.
    fn len(&self) -> usize;

    /// Whether there is no line.
    fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// A representative of line `index` (an error for an index out of range or a line
    /// that cannot be read).
    fn line(&self, index: usize) -> Result<Vec<Cyc>, CertError>;
}

impl LineSet for [Vec<Cyc>] {
    fn len(&self) -> usize {
        <[Vec<Cyc>]>::len(self)
    }

    fn line(&self, index: usize) -> Result<Vec<Cyc>, CertError> {
        self.get(index)
            .cloned()
            .ok_or_else(|| CertError::Input(format!("line {index} of {}", <[Vec<Cyc>]>::len(self))))
    }
}

impl LineSet for Vec<Vec<Cyc>> {
    fn len(&self) -> usize {
        self.as_slice().len()
    }

    fn line(&self, index: usize) -> Result<Vec<Cyc>, CertError> {
        self.as_slice().line(index)
    }
}
