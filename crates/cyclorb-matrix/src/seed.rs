//! A seed vector: the vector whose line an orbit starts from, written over Q(ζ_m) and used
//! in any field Q(ζ_n) with m | n.

use cyclorb_field::{Cyc, CyclotomicField};

use crate::error::MatrixError;

/// A seed vector over Q(ζ_m); used in a field Q(ζ_n) with m | n.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Seed {
    /// m of the field Q(ζ_m) the entries were written in.
    pub conductor: u32,
    /// The coordinates.
    pub vector: Vec<Cyc>,
}

impl Seed {
    /// The basis vector e_index of Q(ζ_n)^dimension (e_0 is the vacuum of a comb basis).
    pub fn basis_vector(field: &CyclotomicField, dimension: usize, index: usize) -> Seed {
        let mut vector = vec![field.zero(); dimension];
        if let Some(x) = vector.get_mut(index) {
            *x = field.one();
        }
        Seed {
            conductor: field.conductor(),
            vector,
        }
    }

    /// The coordinates embedded in `field` (Q(ζ_m) ⊂ Q(ζ_n) needs m | n).
    pub fn in_field(&self, field: &CyclotomicField) -> Result<Vec<Cyc>, MatrixError> {
        self.vector
            .iter()
            .map(|x| {
                if x.conductor() == field.conductor() {
                    Ok(x.clone())
                } else {
                    field
                        .embed(x)
                        .map_err(|e| MatrixError::Invalid(format!("seed: {e}")))
                }
            })
            .collect()
    }
}
