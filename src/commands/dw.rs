//! The commands on Dijkgraaf–Witten theories `dw:GROUP` (`twists`, `image`, `commutant`,
//! `witness`, `describe`): text and JSON around the library's [`DwSpace`]
//! (`cyclorb_pipeline::dw_space`).

use cyclorb_dw::{
    centraliser_degrees, conjugacy_classes, modular_data, verlinde_dimension, ConjugacyClass,
    DwError, FiniteGroup,
};
use cyclorb_pipeline::dw_space::{theory_of, DwSpace, MATRIX_PRINT_LIMIT};
use serde_json::{json, Value};

use super::envelope::Source;
use super::output::{Outcome, Report};
use crate::cli::{CertArgs, ImageArgs, SpaceArgs, TwistsArgs, WitnessArgs};

fn header(space: &DwSpace) -> String {
    format!(
        "theory {} (group {} of order {}{}) at genus {}: dimension |X_g| = {} over {}\n",
        space.spec(),
        space.bundles().group().name(),
        space.bundles().group().order(),
        space
            .cocycle()
            .map_or(String::new(), |c| format!(", 3-cocycle ω_{}", c.level())),
        space.bundles().genus(),
        space.dimension(),
        match space.conductor() {
            1 => "Q".to_string(),
            n => format!("Q(ζ_{n})"),
        }
    )
}

fn base_json(space: &DwSpace) -> serde_json::Value {
    json!({
        "theory": space.spec(),
        "genus": space.bundles().genus(),
        "dimension": space.dimension(),
        "conductor": space.conductor(),
        "group": space.bundles().group().name(),
        "group_order": space.bundles().group().order(),
    })
}

/// `cyclorb twists dw:… --genus G [--check]`.
pub fn twists(args: &TwistsArgs, as_json: bool) -> Outcome {
    let space = match DwSpace::new(&args.space.spec, args.space.genus, &args.space.set) {
        Ok(s) => s,
        Err(e) => return Outcome::Invalid(e),
    };
    let mut text = header(&space);
    text.push_str(&format!(
        "basis: X_g = Hom(π₁Σ_g, G)/G, canonical (lexicographically least) tuples; vacuum = indicator of {} states with every A_h = 1\n",
        space.bundles().vacuum().len()
    ));
    for i in 0..space.dimension().min(40) {
        text.push_str(&format!("  {i:>5}  {}\n", space.bundles().describe(i)));
    }
    if space.dimension() > 40 {
        text.push_str(&format!("  … ({} states in all)\n", space.dimension()));
    }
    text.push_str(if space.is_twisted() {
        "generators (permutations of X_g with phases, docs/dijkgraaf-witten.md):\n"
    } else {
        "generators (permutations of X_g):\n"
    });
    for (c, p) in space.twists() {
        let moved = p
            .iter()
            .enumerate()
            .filter(|(i, &j)| *i != j as usize)
            .count();
        text.push_str(&format!("  {c:<8} moves {moved} states\n"));
    }
    let mut value = base_json(&space);
    value["set"] = json!(args.space.set);
    value["generators"] = json!(space
        .twists()
        .iter()
        .map(|(c, _)| c.to_string())
        .collect::<Vec<_>>());
    value["vacuum_states"] = json!(space.bundles().vacuum().len());
    let mut all_ok = true;
    if args.check {
        let checks = match space.relations() {
            Ok(c) => c,
            Err(e) => return Outcome::Invalid(e.to_string()),
        };
        all_ok = checks.iter().all(|c| c.ok);
        text.push_str(if space.is_twisted() {
            "relations (exact equalities of monomial matrices on X_g up to a scalar, and of free-group automorphisms):\n"
        } else {
            "relations (exact equalities of permutations of X_g and of free-group automorphisms):\n"
        });
        for c in &checks {
            text.push_str(&format!(
                "  [{}] {}\n",
                if c.ok { "ok" } else { "FAILED" },
                c.name
            ));
        }
        value["relations_ok"] = json!(all_ok);
        value["relations"] = json!(checks);
    }
    if let Some(path) = &args.out {
        let written = space
            .generator_set()
            .and_then(|set| set.write(path).map_err(|e| e.to_string()));
        if let Err(e) = written {
            return Outcome::Invalid(e);
        }
        text.push_str(&format!("generators written to {}\n", path.display()));
        value["out"] = json!(path.display().to_string());
    }
    let report = Report::new(value, text, as_json);
    if all_ok {
        Outcome::Done(report)
    } else {
        Outcome::CheckFailed(report)
    }
}

/// `cyclorb image dw:…`: the projective image is the permutation group on X_g (a
/// permutation matrix is a scalar only when it is the identity), so its order is that of
/// the group the twists generate, by Schreier–Sims.
pub fn image(args: &ImageArgs, as_json: bool) -> Outcome {
    let a = &args.common.space;
    let space = match DwSpace::new(&a.spec, a.genus, &a.set) {
        Ok(s) => s,
        Err(e) => return Outcome::Invalid(e),
    };
    let image = match space.image() {
        Ok(c) => c,
        Err(e) => return Outcome::Invalid(e),
    };
    let order = image.order.to_string();
    let mut value = base_json(&space);
    value["finite"] = json!(true);
    value["order"] = json!(order);
    value["route"] = json!(image.route.name());
    value["base"] = json!(image.base);
    value["basic_orbit_lengths"] = json!(image.basic_orbit_lengths);
    value["strong_generators"] = json!(image.strong_generators);
    if let Some(path) = &args.common.out {
        let certificate = json!({
            "kind": if space.is_twisted() { "dw-monomial-image" } else { "dw-permutation-image" },
            "theory": space.spec(),
            "genus": space.bundles().genus(),
            "degree": space.dimension(),
            "conductor": space.conductor(),
            "generators": generator_images(&space),
            "order": order,
            "base": image.base,
            "basic_orbit_lengths": image.basic_orbit_lengths,
        });
        if let Err(e) = write_certificate(path, a, &certificate) {
            return Outcome::Invalid(e);
        }
    }
    let mut text = header(&space);
    text.push_str(&format!(
        "projective image: finite, order {order} ({}; Schreier–Sims, basic orbits {:?})\n",
        if space.is_twisted() {
            "the monomial group on X_g modulo scalars"
        } else {
            "the permutation group on X_g"
        },
        image.basic_orbit_lengths
    ));
    Outcome::Done(Report::new(value, text, as_json))
}

/// The generators as named permutations of X_g, as certificates list them, with the
/// exponents of ζ_{N²} of each row when twisted.
pub fn generator_images(space: &DwSpace) -> Vec<Value> {
    space
        .twists()
        .iter()
        .enumerate()
        .map(|(k, (c, p))| match space.phases() {
            None => json!({"name": c.to_string(), "images": p}),
            Some(phases) => json!({"name": c.to_string(), "images": p, "phases": phases[k]}),
        })
        .collect()
}

/// Write a certificate as pretty JSON with its envelope (`envelope`); the error names the file.
fn write_certificate(
    path: &std::path::Path,
    space: &SpaceArgs,
    certificate: &Value,
) -> Result<(), String> {
    let kind = certificate["kind"].as_str().unwrap_or_default();
    let source = Source {
        spec: &space.spec,
        genus: space.genus,
        set: &space.set,
    };
    super::envelope::write(Some(path), kind, &source, certificate)
}

/// `cyclorb commutant dw:…`: the dimension of the commutant of a permutation
/// representation is its number of orbitals (orbits on pairs of states), exact by counting;
/// for a twisted theory it comes from cyclorb-cert's commutant certificate, re-checked.
pub fn commutant(args: &CertArgs, as_json: bool) -> Outcome {
    let a = &args.space;
    let space = match DwSpace::new(&a.spec, a.genus, &a.set) {
        Ok(s) => s,
        Err(e) => return Outcome::Invalid(e),
    };
    let (n, route, primes) = match space.commutant_dimension() {
        Ok(x) => x,
        Err(e) => return Outcome::Invalid(e),
    };
    let mut value = base_json(&space);
    value["commutant_dimension"] = json!(n);
    value["irreducible"] = json!(n == 1);
    value["route"] = json!(route);
    value["primes"] = json!(primes);
    if let Some(path) = &args.out {
        let certificate = json!({
            "kind": if space.is_twisted() { "dw-monomial-commutant" } else { "dw-orbitals" },
            "theory": space.spec(),
            "genus": space.bundles().genus(),
            "commutant_dimension": n,
            "generators": generator_images(&space),
        });
        if let Err(e) = write_certificate(path, a, &certificate) {
            return Outcome::Invalid(e);
        }
    }
    let mut text = header(&space);
    text.push_str(&format!(
        "commutant dimension {n} ({}): {}\n",
        if n == 1 { "irreducible" } else { "reducible" },
        if space.is_twisted() {
            "commutant certificate on the monomial generators (bounds modulo primes, re-checked)"
        } else {
            "the number of orbits of the permutation group on pairs of states (exact count; no prime needed)"
        }
    ));
    Outcome::Done(Report::new(value, text, as_json))
}

/// `cyclorb witness dw:…`: the image is a finite permutation group, so there is no word of
/// infinite order; the answer says so.
pub fn witness(args: &WitnessArgs, as_json: bool) -> Outcome {
    let a = &args.common.space;
    let space = match DwSpace::new(&a.spec, a.genus, &a.set) {
        Ok(s) => s,
        Err(e) => return Outcome::Invalid(e),
    };
    let mut value = base_json(&space);
    value["found"] = json!(false);
    value["word"] = json!(null);
    value["certificate"] = json!(null);
    let reason = if space.is_twisted() {
        "the twists permute X_g with phases that are N²-th roots of unity, so they generate a finite monomial group"
    } else {
        "the twists permute X_g, so every element has finite order"
    };
    value["reason"] = json!(reason);
    let mut text = header(&space);
    text.push_str(&format!("no witness exists: {reason}\n"));
    Outcome::Done(Report::new(value, text, as_json))
}

/// `cyclorb describe dw:…`: the group's classes and centralisers, the simple objects
/// ([x], ρ) of D(G) with their quantum dimensions |[x]|·d_ρ (ρ listed by degree only), the
/// total dimension D = |G|, dim V_g for g = 1, 2, 3, and S and T of D(G) from the
/// centralisers' characters (cyclorb-dw's `modular_data`), in Q(ζ_e), e the exponent of G.
pub fn describe(spec: &str, as_json: bool) -> Outcome {
    let group = match theory_of(spec) {
        Ok((g, None)) => g,
        Ok((g, Some(cocycle))) => {
            return super::dw_describe::describe_twisted(spec, &g, &cocycle, as_json)
        }
        Err(e) => return Outcome::Invalid(e),
    };
    let classes = conjugacy_classes(&group);
    let degrees = match centraliser_degrees(&group) {
        Ok(d) => d,
        Err(e) => return Outcome::Invalid(e.to_string()),
    };
    let mut labels = Vec::new();
    let mut dimensions = Vec::new();
    let mut class_rows = Vec::new();
    let mut text = format!(
        "theory {spec}: the quantum double D(G) of {} (order {}, {})\n",
        group.name(),
        group.order(),
        if group.is_abelian() {
            "abelian"
        } else {
            "non-abelian"
        }
    );
    text.push_str("conjugacy classes [x] (least element x), |[x]|, |C(x)|, degrees of the irreducible characters of C(x):\n");
    for (k, (class, (size, degs))) in classes.iter().zip(&degrees).enumerate() {
        text.push_str(&format!(
            "  C{k}: x = {}, |[x]| = {}, |C(x)| = {size}, degrees {degs:?}\n",
            group.label(class.representative),
            class.elements.len()
        ));
        for (r, d) in degs.iter().enumerate() {
            labels.push(format!("C{k}.{r}"));
            dimensions.push(class.elements.len() as u64 * d);
        }
        class_rows.push(json!({
            "representative": group.label(class.representative),
            "size": class.elements.len(),
            "centraliser_order": size,
            "centraliser_degrees": degs,
        }));
    }
    text.push_str(&format!(
        "simple objects ([x], ρ), labelled C<class>.<ρ>: {} of them, quantum dimensions |[x]|·d_ρ = {dimensions:?}\ntotal dimension D = |G| = {}; central charge 0 (mod 8)\n",
        labels.len(),
        group.order()
    ));
    let mut verlinde = Vec::new();
    for g in 1..=3 {
        match verlinde_dimension(&group, g) {
            Ok(v) => verlinde.push(v.to_string()),
            Err(e) => return Outcome::Invalid(e.to_string()),
        }
    }
    text.push_str(&format!(
        "dim V_g = |X_g| for g = 1, 2, 3: {}; the twists act by permutations of X_g (`cyclorb twists {spec} --genus G`)\n",
        verlinde.join(", ")
    ));
    let (s_rows, t_diag, md_conductor) = match modular_json(
        spec,
        &group,
        &classes,
        &degrees,
        &dimensions,
    ) {
        Ok(ModularStrings {
            s: s_rows,
            t: t_diag,
            conductor,
        }) => {
            text.push_str(&format!(
                "modular data in Q(ζ_{conductor}) from the centralisers' characters (Coste–Gannon–Ruelle 2000):\n"
            ));
            text.push_str(&format!("T = diag({})\n", t_diag.join(", ")));
            text.push_str(&s_text(&s_rows, MATRIX_PRINT_LIMIT / 4));
            (json!(s_rows), json!(t_diag), json!(conductor))
        }
        Err(DwError::TooLarge(reason)) => {
            text.push_str(&format!("S and T are not computed: {reason}\n"));
            (Value::Null, Value::Null, Value::Null)
        }
        Err(e) => return Outcome::Invalid(format!("{spec}: {e}")),
    };
    let value = json!({
        "theory": spec,
        "group": group.name(),
        "group_order": group.order(),
        "labels": labels,
        "quantum_dimensions": dimensions,
        "conductor": 1,
        "central_charge_mod_8": "0",
        "modular_data_only": false,
        "classes": class_rows,
        "dimensions_by_genus": verlinde,
        "modular_data_conductor": md_conductor,
        "S": s_rows,
        "T": t_diag,
    });
    Outcome::Done(Report::new(value, text, as_json))
}

/// S as text: row by row up to `limit` labels, else a pointer to `--json`.
pub fn s_text(s_rows: &[Vec<String>], limit: usize) -> String {
    if s_rows.len() > limit {
        return format!("S has {0}×{0} entries: --json prints them\n", s_rows.len());
    }
    let mut text = String::from("S (normalised, rows and columns in label order):\n");
    for row in s_rows {
        text.push_str(&format!("  [{}]\n", row.join(", ")));
    }
    text
}

/// S and T of D(G) as printed: exact values in Q(ζ_conductor).
struct ModularStrings {
    s: Vec<Vec<String>>,
    t: Vec<String>,
    conductor: u32,
}

/// S (rows) and T of D(G) as strings, and the conductor of their field; the characters must
/// give the quantum dimensions already listed from the counted degrees.
fn modular_json(
    spec: &str,
    group: &FiniteGroup,
    classes: &[ConjugacyClass],
    degrees: &[(usize, Vec<u64>)],
    dimensions: &[u64],
) -> Result<ModularStrings, DwError> {
    let md = modular_data(group)?;
    // the characters are ordered by degree, as the labels are
    let by_label: Vec<Option<u64>> = md
        .anyons
        .iter()
        .map(|a| {
            let d = degrees.get(a.class)?.1.get(a.character)?;
            Some(classes.get(a.class)?.elements.len() as u64 * d)
        })
        .collect();
    if by_label != dimensions.iter().map(|&d| Some(d)).collect::<Vec<_>>() {
        return Err(DwError::Inconsistent(format!(
            "{spec}: the character tables disagree with the counted degrees"
        )));
    }
    let s_rows =
        md.s.iter()
            .map(|row| row.iter().map(|x| x.to_string()).collect())
            .collect();
    let t_diag = md.t.iter().map(|x| x.to_string()).collect();
    Ok(ModularStrings {
        s: s_rows,
        t: t_diag,
        conductor: md.field.conductor(),
    })
}
