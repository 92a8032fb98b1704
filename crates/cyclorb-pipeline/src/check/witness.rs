//! Re-checking a witness of infinite image (docs/certificates.md §3).
//!
//! The producer finds χ of the block by Berkowitz and the ratio polynomial from power sums.
//! Here: χ is checked at m + 1 points against determinants by Gaussian elimination (a
//! monic polynomial of degree m is fixed by m + 1 values), and the ratio polynomial comes
//! from a resultant: with f = χ monic of degree m and roots λ_i,
//! Res_y(f(y), f(x·y)) = Π_i f(x·λ_i) = (Π_i λ_i)^m · Π_{i,j} (x − λ_j/λ_i), a polynomial of
//! degree m² in x, interpolated from its values at x = 0, …, m² (each a Sylvester
//! determinant) and made monic; (x − 1)^m is divided out. Its norm to Q is the product of
//! its distinct Galois conjugates. The cyclotomic factors are multiplied back, and the rest
//! is tested against every Φ_k of degree φ(k) ≤ deg(rest) by division in Z[x].

use cyclorb_cert::{ProvedGenerators, WitnessCertificate};
use cyclorb_field::{Cyc, CyclotomicField};
use cyclorb_matrix::Matrix;

use super::claims::same_conductor;
use super::linear::determinant;
use super::poly::{cyclotomic, divide_by_x_minus_one, euler_phi, interpolate, norm_to_z};
use super::{Claims, Stop};
use cyclorb_field::int_poly::{degree, div_exact_monic, from_strings, mul};

fn err(e: impl ToString) -> String {
    e.to_string()
}

/// The word's matrix: the product of the letters' matrices, read left to right.
fn word_matrix(gens: &ProvedGenerators, word: &[usize]) -> Result<Matrix, String> {
    let field = gens.field();
    let mut w = Matrix::identity(field, gens.dimension());
    for &a in word {
        w = w.mul(field, gens.dense(a)).map_err(err)?;
    }
    Ok(w)
}

/// det(x·1 − B) at the integer x.
fn char_value(field: &CyclotomicField, b: &Matrix, x: i64) -> Result<Cyc, String> {
    let m = b.rows();
    let mut rows = Vec::with_capacity(m);
    for i in 0..m {
        let mut row = Vec::with_capacity(m);
        for j in 0..m {
            let diagonal = if i == j { field.int(x) } else { field.zero() };
            row.push(field.sub(&diagonal, b.get(i, j)).map_err(err)?);
        }
        rows.push(row);
    }
    determinant(field, &Matrix::from_rows(rows).map_err(err)?)
}

/// Σ c_k x^k at the integer x.
fn eval(field: &CyclotomicField, p: &[Cyc], x: i64) -> Result<Cyc, String> {
    let mut out = field.zero();
    for c in p.iter().rev() {
        out = field.add(&field.mul_int(&out, x), c).map_err(err)?;
    }
    Ok(out)
}

/// Res_y(f(y), f(x·y)) at the integer x: the Sylvester determinant of two polynomials of
/// formal degree m (f monic, so it equals Π_i f(x·λ_i) up to sign).
fn resultant_at(field: &CyclotomicField, f: &[Cyc], x: i64) -> Result<Cyc, String> {
    let m = f.len() - 1;
    let mut g = Vec::with_capacity(m + 1);
    let mut power = field.one();
    for c in f {
        g.push(field.mul(c, &power).map_err(err)?);
        power = field.mul_int(&power, x);
    }
    let mut rows = Vec::with_capacity(2 * m);
    for poly in [f, g.as_slice()] {
        for shift in 0..m {
            let mut row = vec![field.zero(); 2 * m];
            for (k, c) in poly.iter().rev().enumerate() {
                row[shift + k] = c.clone();
            }
            rows.push(row);
        }
    }
    determinant(field, &Matrix::from_rows(rows).map_err(err)?)
}

/// Π_{i,j}(x − λ_i/λ_j) / (x − 1)^m from the resultant, interpolated.
fn ratio_polynomial(field: &CyclotomicField, f: &[Cyc]) -> Result<Vec<Cyc>, String> {
    let m = f.len() - 1;
    let values = (0..=(m * m) as i64)
        .map(|x| resultant_at(field, f, x))
        .collect::<Result<Vec<_>, _>>()?;
    let p = interpolate(field, &values)?;
    let lead = p
        .last()
        .filter(|c| !c.is_zero())
        .ok_or("the resultant has degree below m²")?;
    let inverse = field.inv(lead).map_err(err)?;
    let mut r: Vec<Cyc> = p
        .iter()
        .map(|c| field.mul(c, &inverse))
        .collect::<Result<_, _>>()
        .map_err(err)?;
    for _ in 0..m {
        r = divide_by_x_minus_one(field, &r)?.ok_or("(x − 1)^m does not divide Π(x − λ_i/λ_j)")?;
    }
    Ok(r)
}

/// Every claim of a witness certificate.
pub fn check(
    gens: &ProvedGenerators,
    w: &WitnessCertificate,
    claims: &mut Claims,
) -> Result<(), Stop> {
    let field = gens.field();
    let mut word = Vec::new();
    claims.claim("word", || {
        same_conductor(w.conductor, field.conductor())?;
        word = gens.indices_of(&w.word).map_err(err)?;
        if word.is_empty() {
            return Err("the word is empty".into());
        }
        Ok(format!(
            "{} letters, each a generator of the set",
            word.len()
        ))
    })?;
    let mut matrix = None;
    claims.claim("block-invariant", || {
        let x = word_matrix(gens, &word)?;
        let d = x.rows();
        let sorted = w.block.windows(2).all(|p| p[0] < p[1]);
        if !(sorted && w.block.len() >= 2 && w.block.iter().all(|&i| i < d)) {
            return Err("the block must list at least two distinct coordinates in order".into());
        }
        for &j in &w.block {
            if let Some(i) = (0..d).find(|i| !w.block.contains(i) && !x.get(*i, j).is_zero()) {
                return Err(format!("W[{i}, {j}] ≠ 0 leaves the block"));
            }
        }
        matrix = Some(x);
        Ok(format!(
            "W = product of the letters' matrices; W maps the span of coordinates {:?} into itself",
            w.block
        ))
    })?;
    let x = matrix.expect("set by the claim above");
    let block = Matrix::from_rows(
        w.block
            .iter()
            .map(|&i| w.block.iter().map(|&j| x.get(i, j).clone()).collect())
            .collect(),
    )
    .map_err(|e| Stop::Invalid(e.to_string()))?;
    let m = block.rows();
    let mut f = Vec::new();
    claims.claim("charpoly", || {
        f = w
            .charpoly
            .iter()
            .map(|t| field.parse(t))
            .collect::<Result<_, _>>()
            .map_err(|e| format!("a coefficient does not parse: {e}"))?;
        if f.len() != m + 1 || !f[m].is_one() {
            return Err(format!("χ must be monic of degree {m}"));
        }
        for x in 0..=m as i64 {
            if eval(field, &f, x)? != char_value(field, &block, x)? {
                return Err(format!("χ({x}) differs from det({x}·1 − B)"));
            }
        }
        Ok(format!(
            "monic of degree {m}, equal to det(x·1 − B) at x = 0…{m} (Gaussian elimination; the producer used Berkowitz)"
        ))
    })?;
    let norm = from_strings(&w.ratio_norm);
    claims.claim("ratio-norm", || {
        let stated = norm.clone().ok_or("a coefficient is not an integer")?;
        let r = ratio_polynomial(field, &f)?;
        let (found, conjugates) = norm_to_z(field, &r)?;
        if found != stated {
            return Err("the norm of Π_{i≠j}(x − λ_i/λ_j) differs from the stated one".into());
        }
        if conjugates != w.conjugates {
            return Err(format!("{conjugates} distinct conjugates, the certificate says {}", w.conjugates));
        }
        Ok(format!(
            "degree {}: the ratio polynomial from Res_y(χ(y), χ(xy)) at {} points (the producer used power sums), times its {conjugates} Galois conjugates",
            degree(&found),
            m * m + 1
        ))
    })?;
    let norm = norm.expect("checked above");
    let rest = from_strings(&w.remaining_factor);
    claims.claim("cyclotomic-factors", || {
        let rest = rest
            .clone()
            .ok_or("a coefficient of the remaining factor is not an integer")?;
        let mut product = rest;
        for factor in &w.cyclotomic_factors {
            if factor.order == 0 || euler_phi(factor.order) as usize > degree(&norm) {
                return Err(format!("Φ_{} cannot divide the norm", factor.order));
            }
            if factor.multiplicity as usize > degree(&norm) {
                return Err(format!(
                    "Φ_{} to the power {}",
                    factor.order, factor.multiplicity
                ));
            }
            for _ in 0..factor.multiplicity {
                product = mul(&product, &cyclotomic(factor.order));
            }
        }
        if product != norm {
            return Err("N ≠ Π Φ_k^e · rest".into());
        }
        Ok(format!(
            "N = Π Φ_k^e · rest with {} cyclotomic factor(s)",
            w.cyclotomic_factors.len()
        ))
    })?;
    let rest = rest.expect("checked above");
    claims.claim("no-cyclotomic-factor", || {
        let d = degree(&rest);
        if d == 0 {
            return Err("the remaining factor is constant".into());
        }
        // φ(k) ≥ √(k/2), so φ(k) ≤ d needs k ≤ 2d²
        let bound = 2 * (d as u64) * (d as u64);
        let mut tested = 0;
        for k in (1..=bound).filter(|&k| euler_phi(k) as usize <= d) {
            tested += 1;
            if div_exact_monic(&rest, &cyclotomic(k)).is_some() {
                return Err(format!("Φ_{k} divides the remaining factor"));
            }
        }
        Ok(format!(
            "the rest (degree {d}) leaves a non-zero remainder by each of the {tested} Φ_k with φ(k) ≤ {d}: some λ_i/λ_j is not a root of unity, so no power of W is scalar"
        ))
    })
}

/// A witness certified on a factor of a Deligne product (`witness-lifted`): the product is
/// read from the spec (proved as by every command) without building its generators; the
/// named factor must have the recorded name, data hash, genus-g dimension and field (claim
/// `factor`), and the word is then re-checked on the factor's own twists with every claim
/// above. A word whose eigenvalue ratio on a factor is not a root of unity has the same
/// ratio on the product (docs/minimal-models.md, "Witnesses lifted from a factor").
pub fn lifted(
    envelope: &super::Envelope,
    w: &crate::lifted::LiftedWitness,
    file: &str,
    claims: &mut Claims,
) -> Result<(), Stop> {
    let space = &envelope.space;
    let invalid = |e: String| Stop::Invalid(format!("{file}: rebuilding the input: {e}"));
    let set = crate::space::parse_set(&space.set).map_err(invalid)?;
    let (theory, files) = crate::proof::theory_traced(&space.spec).map_err(invalid)?;
    super::check_theory_files(envelope, &files, claims)?;
    let named = &w.lifted_from_factor;
    let mut built = None;
    claims.claim("factor", || {
        let gens = crate::lifted::named_factor(&theory, space.genus, set, named)?;
        if gens.field().conductor() != named.conductor {
            return Err(format!(
                "the factor's field is Q(ζ_{}), not Q(ζ_{})",
                gens.field().conductor(),
                named.conductor
            ));
        }
        built = Some(gens);
        Ok(format!(
            "the {} factor of {} is {} (data hash as recorded), genus-{} dimension {}: the word is checked there",
            named.factor,
            theory.name(),
            named.theory,
            space.genus,
            named.dimension
        ))
    })?;
    check(
        &built.expect("set by the claim above"),
        &w.certificate,
        claims,
    )
}
