//! The modular data of the quantum double D(G) from the characters of the centralisers
//! (Coste–Gannon–Ruelle, Phys. Lett. B 477 (2000); Bakalov–Kirillov, Lectures on Tensor
//! Categories and Modular Functors, §3.2).
//!
//! The simple objects are pairs (a, α): a class [a] of G with representative r_a and an
//! irreducible character α of C(r_a). For g ∈ [a] fix x_g with g = x_g r_a x_g⁻¹. Then
//!
//! - T_(a,α) = α(r_a) / α(1);
//! - S_(a,α),(b,β) = (1/|G|) Σ_{g ∈ [a], h ∈ [b], gh = hg} conj α(x_g⁻¹ h x_g) · conj β(x_h⁻¹ g x_h)
//!
//! (x_g⁻¹ h x_g commutes with r_a, so it lies in C(r_a)). S_(1,1),(1,1) = 1/|G| = 1/D and
//! c = 0. Values lie in Q(ζ_e), e the exponent of G. The sum is made once per pair of classes
//! as a count over pairs of centraliser classes, then contracted with the characters.

use cyclorb_field::{Cyc, CyclotomicField};

use crate::characters::{character_table, CharacterTable};
use crate::classes::conjugacy_classes;
use crate::error::DwError;
use crate::group::FiniteGroup;

/// One simple object (a, α) of D(G).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Anyon {
    /// The index of the class [a] in [`conjugacy_classes`] order.
    pub class: usize,
    /// The index of α in the centraliser's [`CharacterTable`].
    pub character: usize,
}

/// S and T of D(G), exactly.
pub struct ModularData {
    /// Q(ζ_e), e the exponent of G.
    pub field: CyclotomicField,
    /// The simple objects, by class and then by character.
    pub anyons: Vec<Anyon>,
    /// The normalised S, rows and columns in `anyons` order.
    pub s: Vec<Vec<Cyc>>,
    /// The diagonal of T.
    pub t: Vec<Cyc>,
}

fn err<E: std::fmt::Display>(e: E) -> DwError {
    DwError::Inconsistent(format!("modular data: {e}"))
}

/// The value α(C_i) of a character in Q(ζ_n), n a multiple of the table's exponent.
fn value(
    field: &CyclotomicField,
    table: &CharacterTable,
    chi: usize,
    class: usize,
) -> Result<Cyc, DwError> {
    let n = field.conductor() as usize;
    let step = (n / table.exponent) as i64;
    let mut acc = field.zero();
    for (m, &k) in table.values[chi][class].iter().enumerate() {
        if k > 0 {
            let z = field.mul_int(&field.zeta_pow(step * m as i64), i64::from(k));
            acc = field.add(&acc, &z).map_err(err)?;
        }
    }
    Ok(acc)
}

/// The modular data of D(G).
pub fn modular_data(group: &FiniteGroup) -> Result<ModularData, DwError> {
    let classes = conjugacy_classes(group);
    let n = group.order();
    let tables: Vec<CharacterTable> = classes
        .iter()
        .map(|c| character_table(group, &c.centraliser))
        .collect::<Result<_, _>>()?;
    let exponent = tables.iter().map(|t| t.exponent).max().unwrap_or(1);
    if tables.iter().any(|t| exponent % t.exponent != 0) {
        return Err(err("centraliser exponents do not divide the largest one"));
    }
    let field = CyclotomicField::new(exponent as u32).map_err(err)?;
    // x_g with g = x_g r_a x_g⁻¹, and the class of every element
    let mut conjugator = vec![None; n];
    for c in &classes {
        for x in group.elements() {
            let g = group.conjugate(x, c.representative) as usize;
            conjugator[g].get_or_insert(x);
        }
    }
    let conj = |g: usize| conjugator[g].ok_or_else(|| err("an element outside every class"));
    let mut anyons = Vec::new();
    let mut values = Vec::new();
    for (ci, table) in tables.iter().enumerate() {
        for chi in 0..table.values.len() {
            anyons.push(Anyon {
                class: ci,
                character: chi,
            });
            let row: Vec<Cyc> = (0..table.class_sizes.len())
                .map(|i| value(&field, table, chi, i))
                .collect::<Result<_, _>>()?;
            values.push(row);
        }
    }
    let mut t = Vec::with_capacity(anyons.len());
    for (an, row) in anyons.iter().zip(&values) {
        let table = &tables[an.class];
        let r = classes[an.class].representative as usize;
        let at_r = table.class_of[r].ok_or_else(|| err("r_a outside C(r_a)"))?;
        let degree = field.int(i64::from(table.degree(an.character)));
        t.push(field.div(&row[at_r], &degree).map_err(err)?);
    }
    let k = anyons.len();
    let mut s = vec![vec![field.zero(); k]; k];
    let inv_order = field.rational(1, n as i64).map_err(err)?;
    for (ca, a) in classes.iter().enumerate() {
        for (cb, b) in classes.iter().enumerate() {
            let (ta, tb) = (&tables[ca], &tables[cb]);
            // counts[u][v]: pairs (g, h) with x_g⁻¹ h x_g in class u of C(r_a), x_h⁻¹ g x_h in
            // class v of C(r_b)
            let mut counts = vec![vec![0i64; tb.class_sizes.len()]; ta.class_sizes.len()];
            for &g in &a.elements {
                for &h in &b.elements {
                    if group.mul(g, h) != group.mul(h, g) {
                        continue;
                    }
                    let xg = group.inv(conj(g as usize)?);
                    let xh = group.inv(conj(h as usize)?);
                    let u = ta.class_of[group.conjugate(xg, h) as usize]
                        .ok_or_else(|| err("outside the centraliser"))?;
                    let v = tb.class_of[group.conjugate(xh, g) as usize]
                        .ok_or_else(|| err("outside the centraliser"))?;
                    counts[u][v] += 1;
                }
            }
            for (i, _) in anyons.iter().enumerate().filter(|(_, x)| x.class == ca) {
                for (j, _) in anyons.iter().enumerate().filter(|(_, x)| x.class == cb) {
                    let mut acc = field.zero();
                    for (u, row) in counts.iter().enumerate() {
                        for (v, &c) in row.iter().enumerate() {
                            if c == 0 {
                                continue;
                            }
                            let term = field
                                .mul(&field.conj(&values[i][u]), &field.conj(&values[j][v]))
                                .map_err(err)?;
                            acc = field.add(&acc, &field.mul_int(&term, c)).map_err(err)?;
                        }
                    }
                    s[i][j] = field.mul(&acc, &inv_order).map_err(err)?;
                }
            }
        }
    }
    Ok(ModularData {
        field,
        anyons,
        s,
        t,
    })
}
