//! Dijkgraaf–Witten theories `dw:GROUP` through the command line: orbits, image orders,
//! commutants and relations, against standard values and against the pointed theories
//! built from F- and R-symbols.

mod run_cli;

use run_cli::{cyclorb, cyclorb_json, temp_path};
use serde_json::Value;

fn orbit(spec: &str, genus: usize) -> Value {
    let (code, v) = cyclorb_json(&["orbit", spec, "--genus", &genus.to_string()]);
    assert_eq!(code, 0, "{spec} genus {genus}: {v}");
    assert_eq!(v["saturated"], true);
    v
}

fn image_order(spec: &str, genus: usize) -> String {
    let (code, v) = cyclorb_json(&["image", spec, "--genus", &genus.to_string()]);
    assert_eq!(code, 0, "{spec} genus {genus}: {v}");
    assert_eq!(v["finite"], true);
    v["order"].as_str().unwrap().to_string()
}

/// Σ coefficient × matrix over the reported invariants equals the reported B.
fn assert_invariants_rebuild_b(v: &Value) {
    let p = &v["poincare_sum"];
    assert_eq!(p["is_scalar"], false, "B of a DW theory is never scalar");
    let b = p["matrix"].as_array().unwrap();
    let d = b.len();
    let mut rebuilt = vec![vec![0i64; d]; d];
    for term in p["invariants"].as_array().unwrap() {
        let c: i64 = term["coefficient"].as_str().unwrap().parse().unwrap();
        for (i, row) in term["matrix"].as_array().unwrap().iter().enumerate() {
            for (j, x) in row.as_array().unwrap().iter().enumerate() {
                rebuilt[i][j] += c * x.as_str().unwrap().parse::<i64>().unwrap();
            }
        }
    }
    for i in 0..d {
        for j in 0..d {
            assert_eq!(
                b[i][j].as_str().unwrap(),
                rebuilt[i][j].to_string(),
                "B[{i}][{j}]"
            );
        }
    }
}

#[test]
fn toric_code_orbits_images_and_poincare_sums() {
    // orbits: Lagrangian subspaces of F₂^{2g}, Π (2^k + 1) = 3, 15, 135 (standard);
    // images: |Sp(2g, F₂)| = 6, 720, 1 451 520 (ATLAS of Finite Groups)
    for (genus, size, dim, order) in [(1, 3, 4, "6"), (2, 15, 16, "720"), (3, 135, 64, "1451520")] {
        let v = orbit("dw:Z2", genus);
        assert_eq!(v["orbit_size"], size);
        assert_eq!(v["dimension"], dim);
        assert_eq!(v["conductor"], 1);
        assert_invariants_rebuild_b(&v);
        // the trivial bundle lies in every Lagrangian subset: B[0][0] = |orbit|
        assert_eq!(v["poincare_sum"]["matrix"][0][0], size.to_string());
        assert_eq!(image_order("dw:Z2", genus), order);
    }
    // Sp(2, F₂) ≅ S₃ on F₂² has 5 orbitals (standard)
    let (code, v) = cyclorb_json(&["commutant", "dw:Z2", "--genus", "1"]);
    assert_eq!(code, 0);
    assert_eq!(v["commutant_dimension"], 5);
    assert!(v["primes"].is_array());
}

#[test]
fn z3_orbits_and_images() {
    // Π (3^k + 1) = 4, 40, 1120 (standard); |Sp(2,3)| = 24, |Sp(4,3)| = 51 840 (ATLAS)
    assert_eq!(orbit("dw:Z3", 1)["orbit_size"], 4);
    assert_eq!(orbit("dw:Z3", 2)["orbit_size"], 40);
    assert_eq!(orbit("dw:Z3", 3)["orbit_size"], 1120);
    assert_eq!(image_order("dw:Z3", 1), "24");
    assert_eq!(image_order("dw:Z3", 2), "51840");
}

#[test]
fn odd_cyclic_doubles_agree_with_the_hyperbolic_pointed_theory() {
    // D(Z_N) for odd N is Z_N × Z_N with the hyperbolic form, the pointed theory
    // zn:N:2 ⊠ conj(zn:N:2) (standard); two independent constructions must agree
    for (n, genus) in [(3, 1), (3, 2), (5, 1)] {
        let dw = format!("dw:Z{n}");
        let pointed = format!("zn:{n}:2*conj(zn:{n}:2)");
        let a = orbit(&dw, genus);
        let b = orbit(&pointed, genus);
        assert_eq!(a["dimension"], b["dimension"], "N = {n}, genus {genus}");
        assert_eq!(a["orbit_size"], b["orbit_size"], "N = {n}, genus {genus}");
        assert_eq!(image_order(&dw, genus), image_order(&pointed, genus));
    }
}

/// Orbit size, image order, commutant dimension and the Poincaré sum's shape of a theory.
fn answers(spec: &str, genus: usize) -> (Value, String, Value, Value, Value) {
    let v = orbit(spec, genus);
    let (code, c) = cyclorb_json(&["commutant", spec, "--genus", &genus.to_string()]);
    assert_eq!(code, 0, "{spec}: {c}");
    (
        v["orbit_size"].clone(),
        image_order(spec, genus),
        c["commutant_dimension"].clone(),
        v["poincare_sum"]["is_scalar"].clone(),
        v["poincare_sum"]["prefactor"].clone(),
    )
}

#[test]
fn double_semion_agrees_with_the_pointed_product() {
    // D^{ω_1}(Z_2) is the double semion, semion ⊠ conj(semion) (Dijkgraaf–Witten 1990;
    // Levin–Wen, Phys. Rev. B 71 (2005)): two independent constructions, the twisted
    // permutation model and F/R data, give the same orbit sizes, image orders, commutant
    // dimensions and Poincaré-sum shape (λ exists for neither: B is not scalar)
    for genus in 1..=3 {
        let a = answers("dw:Z2:1", genus);
        let b = answers("zn:2:1*conj(zn:2:1)", genus);
        assert_eq!(a, b, "genus {genus}");
    }
    // the figures themselves (this program's results, equal on both routes)
    assert_eq!(orbit("dw:Z2:1", 2)["orbit_size"], 60);
    assert_eq!(image_order("dw:Z2:1", 3), "92897280");
}

#[test]
fn describe_gives_the_double_semion_data() {
    // the double semion: the boson 1, the semion (θ = i), the anti-semion (θ = −i) and their
    // bound state (θ = 1), S = S_semion ⊗ conj(S_semion) with entries ±1/2, c ≡ 0 (mod 8)
    // (Levin–Wen, Phys. Rev. B 71 (2005); common practice)
    let (code, v) = cyclorb_json(&["describe", "dw:Z2:1"]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["conductor"], 4);
    // `z` is ζ_4 = i in Q(ζ_4)
    let twists: Vec<&str> = ["(0,0)", "(0,1)", "(1,0)", "(1,1)"]
        .iter()
        .map(|l| v["twists"][l].as_str().unwrap())
        .collect();
    assert_eq!(twists, ["1", "1", "z", "-z"]);
    assert_eq!(v["central_charge_mod_8"], "0");
    assert_eq!(v["quantum_dimensions"], serde_json::json!([1, 1, 1, 1]));
    for row in v["S"].as_array().unwrap() {
        for x in row.as_array().unwrap() {
            assert!(x == "1/2" || x == "-1/2", "{v}");
        }
    }
    // every anyon is its own dual (fusion group Z_2 × Z_2)
    assert_eq!(v["duals"]["(1,0)"], "(1,0)");
    assert_eq!(
        v["dimensions_by_genus"],
        serde_json::json!(["4", "16", "64"])
    );
    // the cocycle ω_1(1, 1, 1) = exp(2πi·1·1·2/4) = −1 (the formula of de Wild Propitius 1995)
    assert_eq!(v["cocycle"]["exponents"][1][1][1], 2);
    // D^{ω_1}(Z_3): the flux (1, 0) has θ = ζ_9 (spins ζ_9^{p k²}, de Wild Propitius 1995, from
    // memory), in Q(ζ_9) written `z`
    let (code, v) = cyclorb_json(&["describe", "dw:Z3:1"]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["twists"]["(1,0)"], "z");
}

#[test]
fn twisted_z3_agrees_with_the_pointed_z9_theories() {
    // D^{ω_p}(Z_3) is pointed with fusion group Z_9 (the flux (1, 0) has order 9) and
    // spins θ(k) = ζ_9^{p k²} (de Wild Propitius, thesis 1995, ch. 3, from memory), i.e.
    // zn:9:2p with θ_k = exp(iπ·2p·k²/9)
    // (at genus 2 the commutant, and for p = 2 the image, are left out: the F/R route
    // takes half a minute for each on this machine)
    for (p, pointed) in [(1, "zn:9:2"), (2, "zn:9:4")] {
        let spec = format!("dw:Z3:{p}");
        assert_eq!(answers(&spec, 1), answers(pointed, 1), "{spec} genus 1");
        assert_eq!(
            orbit(&spec, 2)["orbit_size"],
            orbit(pointed, 2)["orbit_size"],
            "{spec} genus 2"
        );
    }
    assert_eq!(image_order("dw:Z3:1", 2), image_order("zn:9:2", 2));
    // ω_0 is the untwisted theory: the monomial route gives the permutation route's answers
    for genus in 1..=2 {
        assert_eq!(answers("dw:Z3:0", genus), answers("dw:Z3", genus));
    }
}

#[test]
fn twisted_relations_and_verified_key() {
    let (code, v) = cyclorb_json(&[
        "twists",
        "dw:Z2:1",
        "--genus",
        "2",
        "--check",
        "--set",
        "lickorish",
    ]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["relations_ok"], true);
    assert_eq!(v["conductor"], 4);
    // every dw answer rests on generators whose relations were proved when they were built
    for command in ["orbit", "image", "commutant", "witness", "twists"] {
        for spec in ["dw:S3", "dw:Z3:1"] {
            let (code, v) = cyclorb_json(&[command, spec, "--genus", "1"]);
            assert_eq!(code, 0, "{command} {spec}: {v}");
            assert_eq!(v["verified"], true, "{command} {spec}");
        }
    }
    let (_, v) = cyclorb_json(&["witness", "dw:Z3:1", "--genus", "2"]);
    assert_eq!(v["found"], false);
}

#[test]
fn non_abelian_groups_at_genus_two() {
    // |X_2| = Verlinde dimensions 116 (S3) and 736 (Q8, D4) (standard, from the anyon
    // content of D(G)); the orbit sizes are this program's own results, checked against the
    // subset orbit of the cyclorb-dw crate (an independent enumeration without fields)
    let s3 = orbit("dw:S3", 2);
    assert_eq!(s3["dimension"], 116);
    assert_eq!(s3["orbit_size"], 38400);
    assert_eq!(s3["poincare_sum"]["commutant_dimension"], 27);
    assert_invariants_rebuild_b(&s3);
    for group in ["Q8", "D4"] {
        let v = orbit(&format!("dw:{group}"), 2);
        assert_eq!(v["dimension"], 736);
        assert_eq!(v["orbit_size"], 120);
        // B is not printed entry by entry above dimension 128, but its terms are listed
        assert!(!v["poincare_sum"]["invariants"]
            .as_array()
            .unwrap()
            .is_empty());
    }
    let order: num_bigint::BigUint = image_order("dw:S3", 2).parse().unwrap();
    let orbit_size = num_bigint::BigUint::from(38400u32);
    assert_eq!(
        order % orbit_size,
        0u32.into(),
        "the orbit size divides the group order"
    );
}

#[test]
fn relations_through_the_command_line() {
    for (spec, genus) in [("dw:Z3", 1), ("dw:S3", 2), ("dw:Q8", 1), ("dw:Z2xZ2", 2)] {
        let (code, v) = cyclorb_json(&[
            "twists",
            spec,
            "--genus",
            &genus.to_string(),
            "--check",
            "--set",
            "lickorish",
        ]);
        assert_eq!(code, 0, "{spec}: {v}");
        assert_eq!(v["relations_ok"], true, "{spec}");
        assert_eq!(v["generators"].as_array().unwrap().len(), 3 * genus - 1);
    }
}

#[test]
fn group_files_and_refusals() {
    let path = temp_path("s3-group.json");
    std::fs::write(
        &path,
        r#"{"name": "S3 by transpositions", "generators": [[1, 0, 2], [0, 2, 1]]}"#,
    )
    .unwrap();
    let spec = format!("dw:{}", path.display());
    assert_eq!(
        orbit(&spec, 1)["orbit_size"],
        orbit("dw:S3", 1)["orbit_size"]
    );
    std::fs::write(&path, r#"{"name": "loop", "table": [[0, 1], [1, 1]]}"#).unwrap();
    let out = cyclorb(&["orbit", &spec, "--genus", "1"]);
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(
        err.contains(&path.display().to_string()) && err.contains("row 1"),
        "{err}"
    );
    std::fs::remove_file(&path).ok();
    // sizes are refused before anything is built, with the exact dimension
    let out = cyclorb(&["orbit", "dw:S5", "--genus", "3"]);
    assert_eq!(out.status.code(), Some(1));
    assert!(String::from_utf8_lossy(&out.stderr).contains("more than the bound"));
    for bad in ["dw:G7", "dw:D2", "dw:S3:1", "dw:Z3:3", "dw:Z2:x"] {
        let out = cyclorb(&["image", bad, "--genus", "1"]);
        assert_eq!(out.status.code(), Some(1), "{bad}");
        assert!(String::from_utf8_lossy(&out.stderr).contains(bad), "{bad}");
    }
    // the image is a finite permutation group: no witness
    let (code, v) = cyclorb_json(&["witness", "dw:S3", "--genus", "2"]);
    assert_eq!(code, 0);
    assert_eq!(v["found"], false);
}

#[test]
fn sweeps_read_dw_specs() {
    let dir = temp_path("dw-sweep");
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    let plan = dir.join("plan.toml");
    std::fs::write(
        &plan,
        "name = \"dw-small\"\nthreads = 1\nanswers = [\"orbit\", \"image\", \"commutant\", \"witness\"]\n\n[[theory]]\nspec = \"dw:Z2\"\ngenera = [1, 2]\n\n[[theory]]\nspec = \"dw:S3\"\ngenera = [1]\n\n[[theory]]\nspec = \"dw:Z2:1\"\ngenera = [1]\n\n[[theory]]\nspec = \"dw:S3\"\nlabel = \"S3 counted\"\ngenera = [1, 2]\nmethod = \"structure\"\n",
    )
    .unwrap();
    let out = dir.join("out");
    let (code, v) = cyclorb_json(&[
        "sweep",
        plan.to_str().unwrap(),
        "--out",
        out.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{v}");
    let runs = v["runs"].as_array().unwrap();
    assert_eq!(runs.len(), 6);
    let find = |theory: &str, genus: u64| {
        runs.iter()
            .find(|r| r["theory"] == theory && r["genus"] == genus)
            .unwrap()
    };
    // toric code at genus 2: 15 Lagrangians, |Sp(4, F₂)| = 720 (ATLAS), 6 orbitals (the same
    // as `cyclorb commutant`), no witness
    let z2 = find("dw:Z2", 2);
    assert_eq!(z2["orbit_size"], 15);
    assert_eq!(z2["image"]["order"], "720");
    assert_eq!(z2["commutant"]["commutant_dimension"], 6);
    assert_eq!(z2["witness"]["found"], false);
    assert_eq!(z2["poincare_sum"]["is_scalar"], false);
    assert_eq!(
        find("dw:S3", 1)["orbit_size"],
        orbit("dw:S3", 1)["orbit_size"]
    );
    // the double semion in a sweep: the same answers as `orbit`, `image`, `commutant`
    // (6 lines, order 24, dimension 2, as semion ⊠ conj(semion) above) and no errors
    let ds = find("dw:Z2:1", 1);
    assert_eq!(ds["orbit_size"], 6);
    assert_eq!(ds["image"]["order"], "24");
    assert_eq!(ds["commutant"]["commutant_dimension"], 2);
    assert_eq!(ds["poincare_sum"]["trace_check"], true, "{ds}");
    assert!(ds["errors"].as_array().is_none_or(|e| e.is_empty()), "{ds}");
    // method = "structure": the orbit counted as |P| / |Stab_P(S)| equals the listed one
    // (38 400 at genus 2, as `orbit` lists it), with the image order of `image` and B from
    // the orbitals (the same 27 orbitals as the listing route)
    for genus in [1, 2] {
        let counted = runs
            .iter()
            .find(|r| r["id"] == format!("s3-counted-g{genus}"))
            .unwrap();
        assert_eq!(
            counted["orbit_size"],
            orbit("dw:S3", genus)["orbit_size"],
            "{counted}"
        );
        assert_eq!(counted["counted"]["kind"], "dw-vacuum-set-stabiliser");
        assert_eq!(counted["image"]["order"], image_order("dw:S3", genus));
        assert_eq!(counted["poincare_sum"]["trace_check"], true, "{counted}");
    }
    let counted = runs.iter().find(|r| r["id"] == "s3-counted-g2").unwrap();
    assert_eq!(counted["commutant"]["commutant_dimension"], 27);
    assert_eq!(counted["poincare_sum"]["commutant_dimension"], 27);
    let summary = std::fs::read_to_string(out.join("summary.md")).unwrap();
    assert!(summary.contains("38400 (counted)"), "{summary}");
    // the counting route in a sweep is for untwisted dw: theories; a plan asking it of
    // another theory is refused before anything runs, naming the entry
    std::fs::write(
        &plan,
        "[[theory]]\nspec = \"dw:Z2:1\"\ngenera = [1]\nmethod = \"structure\"\n",
    )
    .unwrap();
    let run = cyclorb(&[
        "sweep",
        plan.to_str().unwrap(),
        "--out",
        out.to_str().unwrap(),
    ]);
    assert_eq!(run.status.code(), Some(1));
    let stderr = String::from_utf8_lossy(&run.stderr);
    assert!(
        stderr.contains("plan.toml:2") && stderr.contains("untwisted"),
        "{stderr}"
    );
    std::fs::remove_dir_all(&dir).ok();
}

/// A JSON list of strings.
fn texts(list: &Value) -> Vec<&str> {
    list.as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_str().unwrap())
        .collect()
}

#[test]
fn describe_prints_modular_data_from_characters() {
    // D(Z2) (toric code): T = diag(1, 1, 1, −1), S_00 = 1/|G| (standard). D(S3): eight anyons,
    // twists 1, 1, 1 (pure charges), 1, −1 (transposition fluxes), 1, ω, ω² (3-cycle fluxes)
    // (standard; e.g. Propitius, PhD thesis 1995, for D(S3))
    let (code, v) = cyclorb_json(&["describe", "dw:Z2"]);
    assert_eq!(code, 0, "{v}");
    let t = texts(&v["T"]);
    assert_eq!(t, ["1", "1", "1", "-1"]);
    assert_eq!(v["S"][0][0], "1/2");
    let (code, v) = cyclorb_json(&["describe", "dw:S3"]);
    assert_eq!(code, 0, "{v}");
    let t = texts(&v["T"]);
    assert_eq!(t.len(), 8);
    assert_eq!(t.iter().filter(|x| **x == "1").count(), 5, "{t:?}");
    assert_eq!(t.iter().filter(|x| **x == "-1").count(), 1, "{t:?}");
    assert_eq!(v["S"][0][0], "1/6");
    assert_eq!(v["S"].as_array().unwrap().len(), 8);
}
