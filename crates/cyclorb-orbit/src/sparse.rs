//! The non-zero entries of a generator, row by row, whatever its stored form.

use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::{LinearMap, Operator};

/// Row i of the result lists the non-zero entries (j, X_ij) in increasing j.
/// Precondition: the operator is valid (`Operator::validate`).
pub(crate) fn operator_rows(field: &CyclotomicField, op: &Operator) -> Vec<Vec<(usize, Cyc)>> {
    let dim = op.dim();
    let mut rows: Vec<Vec<(usize, Cyc)>> = vec![Vec::new(); dim];
    match op {
        Operator::Dense(m) => {
            for (i, row) in rows.iter_mut().enumerate() {
                for (j, x) in m.row(i).iter().enumerate() {
                    if !x.is_zero() {
                        row.push((j, x.clone()));
                    }
                }
            }
        }
        Operator::Diagonal(d) => {
            for (i, x) in d.iter().enumerate() {
                if !x.is_zero() {
                    rows[i].push((i, x.clone()));
                }
            }
        }
        Operator::BlockDiagonal { blocks, .. } => {
            let mut covered = vec![false; dim];
            for b in blocks {
                for (r, &i) in b.indices.iter().enumerate() {
                    covered[i] = true;
                    for (c, &j) in b.indices.iter().enumerate() {
                        let x = b.matrix.get(r, c);
                        if !x.is_zero() {
                            rows[i].push((j, x.clone()));
                        }
                    }
                }
            }
            for i in (0..dim).filter(|&i| !covered[i]) {
                rows[i].push((i, field.one()));
            }
        }
        Operator::SparseRows { rows: given, .. } => {
            for (row, entries) in rows.iter_mut().zip(given) {
                row.extend(
                    entries
                        .iter()
                        .filter(|(_, x)| !x.is_zero())
                        .map(|(j, x)| (*j, x.clone())),
                );
            }
        }
    }
    for row in &mut rows {
        row.sort_by_key(|(j, _)| *j);
    }
    rows
}
