//! The serde form of a dense matrix: its conductor and its rows of entries in the text
//! syntax of `cyclorb-field`, e.g. `{"conductor": 16, "rows": [["1", "z"], ["-z^3", "(1 + z)/2"]]}`.
//!
//! Reading checks that the rows have one length and that every entry parses in Q(ζ_n);
//! errors are reported through serde, never as panics.

use cyclorb_field::CyclotomicField;
use serde::{Deserialize, Serialize};

use crate::dense::Matrix;

/// What is written and read.
#[derive(Serialize, Deserialize)]
struct MatrixText {
    conductor: u32,
    rows: Vec<Vec<String>>,
}

impl Serialize for Matrix {
    /// The conductor is that of the entries (1 for a matrix without entries).
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        let conductor = self.entries().first().map_or(1, |x| x.conductor());
        let rows = (0..self.rows())
            .map(|i| self.row(i).iter().map(ToString::to_string).collect())
            .collect();
        MatrixText { conductor, rows }.serialize(s)
    }
}

impl<'de> Deserialize<'de> for Matrix {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let text = MatrixText::deserialize(d)?;
        let field = CyclotomicField::new(text.conductor).map_err(serde::de::Error::custom)?;
        let rows = text
            .rows
            .iter()
            .map(|row| row.iter().map(|x| field.parse(x)).collect())
            .collect::<Result<Vec<Vec<_>>, _>>()
            .map_err(serde::de::Error::custom)?;
        Matrix::from_rows(rows).map_err(serde::de::Error::custom)
    }
}
