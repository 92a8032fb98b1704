//! `cyclorb orbit` end to end against published values.

mod outside;
mod run_cli;

use run_cli::{cyclorb_json, fixture, temp_path};

/// Orbit size and prefactor of a saturated run with a scalar Poincaré sum.
fn scalar_orbit(args: &[&str]) -> (u64, String) {
    let (code, v) = cyclorb_json(args);
    assert_eq!(code, 0, "{args:?}: {v}");
    assert_eq!(v["saturated"], true, "{args:?}");
    assert_eq!(v["poincare_sum"]["is_scalar"], true, "{args:?}: {v}");
    assert_eq!(v["poincare_sum"]["trace_check"], true);
    let layers: u64 = v["layer_sizes"]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_u64().unwrap())
        .sum();
    assert_eq!(
        layers,
        v["orbit_size"].as_u64().unwrap(),
        "layer sizes add up to the orbit"
    );
    (
        v["orbit_size"].as_u64().unwrap(),
        v["poincare_sum"]["prefactor"].as_str().unwrap().to_string(),
    )
}

#[test]
fn ising_genus_one_and_two_match_the_published_sums() {
    // fixtures/outside.toml: Castro, Gaberdiel, Hartman, Maloney, Volpato, "The gravity dual
    // of the Ising model", Phys. Rev. D 85 (2012) 024032: 24 handlebody terms at genus 1,
    // B = 8·I; their all-genus follow-up (2019): genus 2, 3840 terms, B = 384·I.
    for genus in [1u32, 2] {
        let published = outside::orbit("ising", genus);
        let g = genus.to_string();
        let (lines, prefactor) = scalar_orbit(&["orbit", "ising", "--genus", &g]);
        assert_eq!(lines, published.lines, "genus {genus}");
        assert_eq!(prefactor, published.prefactor, "genus {genus}");
    }
}

#[test]
fn both_generating_sets_give_the_same_orbit() {
    // Humphries (1979) and Lickorish (1964) twists generate the same mapping class group.
    for g in ["1", "2"] {
        let h = scalar_orbit(&["orbit", "ising", "--genus", g, "--set", "humphries"]);
        let l = scalar_orbit(&["orbit", "ising", "--genus", g, "--set", "lickorish"]);
        assert_eq!(h, l, "genus {g}");
    }
}

#[test]
fn tricritical_ising_genus_one() {
    // Castro et al. 2012: tricritical Ising (c = 7/10) at genus 1 gives B = 48·I.
    let (_, lambda) = scalar_orbit(&["orbit", "tricritical-ising", "--genus", "1"]);
    assert_eq!(lambda, "48");
}

#[test]
fn minimal_model_from_modular_data_alone() {
    // M(4,3) is the Ising model: the same 24 lines and B = 8·I (Castro et al. 2012), from
    // Kac's modular data and from the braided construction alike.
    for spec in ["kac:4:3", "minimal:4:3"] {
        assert_eq!(
            scalar_orbit(&["orbit", spec, "--genus", "1"]),
            (24, "8".into()),
            "{spec}"
        );
    }
}

#[test]
fn braided_minimal_models_reach_genus_two() {
    // M(4,3) = Ising at genus 2: 3840 lines, B = 384·G⁻¹ (the all-genus follow-up of Castro
    // et al., 2019).
    assert_eq!(
        scalar_orbit(&["orbit", "minimal:4:3", "--genus", "2"]),
        (3840, "384".into())
    );
}

/// The braided route (`minimal:P:Q`) and the S,T-only route (`kac:P:Q`, S and T from Kac's
/// formulas, Di Francesco–Mathieu–Sénéchal ch. 10) must agree at genus 1 for every coprime pair
/// 2 ≤ P < Q ≤ 13 (issue 13). The pairs, written as the specs take them, are split by the
/// release time of the two runs together (docs/minimal-models.md, "Genus-1 cross-check of the
/// two routes", has every pair's figures). These run in every build.
const ROUTE_PAIRS_FAST: [&str; 8] = ["5:4", "6:5", "5:2", "7:2", "5:3", "7:3", "7:4", "8:3"];

/// Both runs together under about 3 s in release (M(12,5), 3.5 s, for its E6 invariant):
/// release builds only.
const ROUTE_PAIRS_RELEASE: [&str; 17] = [
    "3:2", "4:3", "7:5", "7:6", "8:5", "8:7", "9:2", "9:4", "9:5", "10:3", "11:2", "11:3", "11:4",
    "12:5", "13:2", "13:3", "13:4",
];

/// From about 4 s to 7 minutes for the two runs, cheapest first: ignored by default.
const ROUTE_PAIRS_COSTLY: [&str; 19] = [
    "9:8", "11:6", "10:7", "13:6", "10:9", "9:7", "12:7", "11:5", "11:8", "13:5", "13:8", "11:10",
    "12:11", "11:7", "11:9", "13:10", "13:12", "13:7", "13:9",
];

/// M(13,11) on its own: one run passed 17 GB of address space after 9 minutes and was not
/// completed (docs/minimal-models.md).
const ROUTE_PAIR_LARGEST: &str = "13:11";

#[test]
fn route_pair_lists_hold_every_coprime_pair_up_to_13_once() {
    use num_integer::Integer;
    let mut listed: Vec<(u32, u32)> = ROUTE_PAIRS_FAST
        .iter()
        .chain(&ROUTE_PAIRS_RELEASE)
        .chain(&ROUTE_PAIRS_COSTLY)
        .chain(&[ROUTE_PAIR_LARGEST])
        .map(|pq| {
            let (q, p) = pq.split_once(':').unwrap();
            (p.parse().unwrap(), q.parse().unwrap())
        })
        .collect();
    listed.sort();
    let every: Vec<(u32, u32)> = (2..=13u32)
        .flat_map(|p| (p + 1..=13).map(move |q| (p, q)))
        .filter(|(p, q)| p.gcd(q) == 1)
        .collect();
    assert_eq!(listed, every);
}

#[test]
fn genus_one_sums_agree_between_braided_and_kac_routes() {
    routes_agree_at_genus_one(&ROUTE_PAIRS_FAST);
}

/// Release builds only (the README's test command and CI build in release); far longer
/// unoptimised.
#[cfg(not(debug_assertions))]
#[test]
fn genus_one_sums_agree_between_the_routes_for_the_cheap_pairs_up_to_13() {
    routes_agree_at_genus_one(&ROUTE_PAIRS_RELEASE);
}

/// About 33 minutes in release on two shared cores, up to 13 GB of memory for one run (M(13,9));
/// run with
/// `cargo test --release --test cli_orbit -- --ignored genus_one_sums_agree_between_the_routes_for_the_costly_pairs`
#[test]
#[ignore = "about 33 minutes in release and up to 13 GB; run with --ignored"]
fn genus_one_sums_agree_between_the_routes_for_the_costly_pairs() {
    routes_agree_at_genus_one(&ROUTE_PAIRS_COSTLY);
}

/// The working memory of a listing is bounded, not proportional to the lines: M(11,5) at
/// genus 1 (conductor 440, 20 blocks, 4 320 lines) once peaked near 1 GB, a remembered
/// field inverse of 400 KB per line; the run must now stay within a 200 MiB budget and still
/// close, with the trace of B equal to (orbit size)·⟨v, v⟩ (docs/orbits.md §3).
#[test]
fn a_listing_at_conductor_440_stays_within_a_small_memory_budget() {
    let limit = 200u64;
    let (code, v) = cyclorb_json(&[
        "--memory-limit",
        &limit.to_string(),
        "orbit",
        "kac:11:5",
        "--genus",
        "1",
    ]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["saturated"], true);
    assert_eq!(v["poincare_sum"]["trace_check"], true);
    let peak = v["peak_memory_bytes"].as_u64().unwrap();
    assert!(peak <= limit << 20, "peak {peak} bytes");
}

/// Not completed so far: it once passed 17 GB; with the bounded working memory (docs/orbits.md
/// §6) `kac:13:11` stayed under 0.5 GB through 16 minutes of CPU (stopped by hand); run
/// with
/// `cargo test --release --test cli_orbit -- --ignored genus_one_sums_agree_between_the_routes_for_m_13_11`
#[test]
#[ignore = "long (not completed so far); run with --ignored"]
fn genus_one_sums_agree_between_the_routes_for_m_13_11() {
    routes_agree_at_genus_one(&[ROUTE_PAIR_LARGEST]);
}

/// Two constructions of the same modular data must give the same genus-1 orbit, the same B
/// and the same decomposition of B over the invariants. The two routes order the Kac classes
/// differently, so B and the invariants are compared by label.
fn routes_agree_at_genus_one(pairs: &[&str]) {
    for pq in pairs {
        let (code_a, a) = cyclorb_json(&["orbit", &format!("minimal:{pq}"), "--genus", "1"]);
        let (code_b, b) = cyclorb_json(&["orbit", &format!("kac:{pq}"), "--genus", "1"]);
        assert_eq!((code_a, code_b), (0, 0), "M({pq})");
        assert_eq!(a["saturated"], true, "M({pq})");
        assert_eq!(a["orbit_size"], b["orbit_size"], "M({pq})");
        for v in [&a, &b] {
            assert_eq!(v["poincare_sum"]["trace_check"], true, "M({pq})");
        }
        for key in ["is_scalar", "prefactor"] {
            assert_eq!(
                a["poincare_sum"][key], b["poincare_sum"][key],
                "M({pq}) {key}"
            );
        }
        assert_eq!(
            entries_by_label(&a["poincare_sum"]),
            entries_by_label(&b["poincare_sum"]),
            "M({pq}) B"
        );
        assert_eq!(
            invariants_by_label(&a),
            invariants_by_label(&b),
            "M({pq}) invariants"
        );
        let terms = match a["poincare_sum"]["is_scalar"].as_bool().unwrap() {
            true => 1,
            false => a["poincare_sum"]["invariants"].as_array().unwrap().len(),
        };
        assert_eq!(terms, ade_invariant_count(pq), "M({pq}) terms of B");
    }
}

/// How many modular invariants M(P,Q) has, P, Q ≤ 13: the minimal-model invariants pair the
/// su(2) invariants at levels P − 2 and Q − 2, and an odd level has the diagonal one (A)
/// alone, so the count is that of the even one of P, Q at level k = even − 2: A for k < 4,
/// A and D for even k ≥ 4, and E6 besides at k = 10 (E7 and E8 come at k = 16, 28)
/// (Cappelli–Itzykson–Zuber, Commun. Math. Phys. 113 (1987) 1, from memory). B has a non-zero
/// term on each (measured for every pair; docs/minimal-models.md).
fn ade_invariant_count(pq: &str) -> usize {
    let even = pq
        .split(':')
        .map(|x| x.parse::<u32>().unwrap())
        .find(|x| x % 2 == 0);
    match even.map(|e| e - 2) {
        Some(10) => 3,
        Some(k) if k >= 4 => 2,
        _ => 1,
    }
}

/// A non-zero entry keyed by labels: (row, column, value).
type Entry = (String, String, String);

fn text(x: &serde_json::Value) -> String {
    x.as_str().unwrap().to_string()
}

/// The sorted label-keyed non-zero entries (`entries`) of B or of one of its invariants.
fn entries_by_label(v: &serde_json::Value) -> Vec<Entry> {
    let mut entries: Vec<_> = v["entries"]
        .as_array()
        .unwrap_or_else(|| panic!("entries are printed: {v}"))
        .iter()
        .map(|e| (text(&e["row"]), text(&e["column"]), text(&e["value"])))
        .collect();
    entries.sort();
    entries
}

/// The invariants of an orbit's B as (coefficient, sorted label-keyed non-zero entries).
fn invariants_by_label(v: &serde_json::Value) -> Vec<(String, Vec<Entry>)> {
    let mut terms: Vec<_> = v["poincare_sum"]["invariants"]
        .as_array()
        .unwrap()
        .iter()
        .map(|t| (text(&t["coefficient"]), entries_by_label(t)))
        .collect();
    terms.sort();
    terms
}

#[test]
fn three_state_potts_mix_at_c_four_fifths() {
    // Castro et al. 2012: for M(6,5) the genus-1 sum is a positive combination of the
    // diagonal invariant and the non-diagonal (three-state Potts) invariant.
    let (code, v) = cyclorb_json(&["orbit", "minimal:6:5", "--genus", "1"]);
    assert_eq!(code, 0);
    let p = &v["poincare_sum"];
    assert_eq!(p["is_scalar"], false);
    let terms = p["invariants"].as_array().unwrap();
    assert_eq!(terms.len(), 2, "{p}");
    let mut saw_diagonal = false;
    let mut saw_potts = false;
    for t in terms {
        let c: i64 = t["coefficient"].as_str().unwrap().parse().unwrap();
        assert!(c > 0, "coefficients are positive: {t}");
        let m: Vec<Vec<String>> = serde_json::from_value(t["matrix"].clone()).unwrap();
        assert_eq!(m[0][0], "1", "physical invariants have vacuum entry 1");
        let off_diagonal = (0..m.len()).any(|i| (0..m.len()).any(|j| i != j && m[i][j] != "0"));
        if off_diagonal {
            saw_potts = true;
        } else {
            saw_diagonal = m.iter().enumerate().all(|(i, r)| r[i] == "1");
        }
    }
    assert!(saw_diagonal && saw_potts, "{p}");
}

#[test]
fn fibonacci_genus_two_does_not_close() {
    // Larsen–Wang (2005): the Fibonacci (SO(3) level 3) genus-2 image is dense, so the orbit is
    // infinite; the run stops at the limit, unsaturated, with exit 3 and growing layers.
    let (code, v) = cyclorb_json(&["orbit", "fibonacci", "--genus", "2", "--limit", "200000"]);
    assert_eq!(code, 3);
    assert_eq!(v["saturated"], false);
    assert_eq!(v["orbit_size"].as_u64().unwrap(), 200000);
    assert!(v["poincare_sum"]["prefactor"].is_null());
    let layers: Vec<u64> = v["layer_sizes"]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_u64().unwrap())
        .collect();
    let complete = &layers[..layers.len() - 1];
    assert!(
        complete.windows(2).rev().take(4).all(|w| w[1] > w[0]),
        "still growing: {layers:?}"
    );
}

#[test]
fn tricritical_ising_genus_two_does_not_close() {
    // Larsen–Wang (2005) density for the Fibonacci factor: infinite image at genus 2.
    let (code, v) = cyclorb_json(&[
        "orbit",
        "tricritical-ising",
        "--genus",
        "2",
        "--limit",
        "20000",
    ]);
    assert_eq!(code, 3);
    assert_eq!(v["saturated"], false);
}

#[test]
fn a_stopped_run_names_its_checkpoint_and_resumes_from_it_alone() {
    // No --checkpoint: the run keeps one in the cache folder and says how to continue; the
    // checkpoint alone (no theory, no genus) is enough to finish it. Ising at genus 2
    // closes with 3840 lines, λ = 384 (as above).
    let (code, partial) = cyclorb_json(&["orbit", "ising", "--genus", "2", "--limit", "1000"]);
    assert_eq!(code, 3, "{partial}");
    let ckpt = partial["checkpoint"].as_str().unwrap().to_string();
    assert!(std::path::Path::new(&ckpt).exists(), "{partial}");
    let command = partial["resume_command"].as_str().unwrap();
    assert_eq!(command, format!("cyclorb orbit --resume {ckpt}"));
    let (code, resumed) = cyclorb_json(&["orbit", "--resume", &ckpt]);
    assert_eq!(code, 0, "{resumed}");
    let (_, fresh) = cyclorb_json(&["orbit", "ising", "--genus", "2"]);
    for key in ["theory", "genus", "orbit_size", "layer_sizes", "saturated"] {
        assert_eq!(resumed[key], fresh[key], "{key}");
    }
    assert_eq!(resumed["poincare_sum"]["prefactor"], "384");
    let _ = std::fs::remove_file(&ckpt);
    // a finished run leaves nothing behind
    assert!(fresh.get("checkpoint").is_none(), "{fresh}");

    // raw files: the checkpoint records their paths
    let gens = ising_genus_one_generators("resume-alone-gens.json");
    let seed = fixture("orbit/vacuum-seed-ising.json");
    let ckpt = temp_path("resume-alone.ckpt");
    let (code, _) = cyclorb_json(&[
        "orbit",
        "--matrices",
        gens.to_str().unwrap(),
        "--seed",
        seed.to_str().unwrap(),
        "--limit",
        "10",
        "--checkpoint",
        ckpt.to_str().unwrap(),
    ]);
    assert_eq!(code, 3);
    // the origin is only a hint: a damaged file is still refused by its checksum
    let mut bytes = std::fs::read(&ckpt).unwrap();
    let damaged = temp_path("resume-alone-damaged.ckpt");
    let last = bytes.len() - 20;
    bytes[last] ^= 1;
    std::fs::write(&damaged, bytes).unwrap();
    let out = run_cli::cyclorb(&["orbit", "--resume", damaged.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("checksum mismatch"), "{err}");
    let (code, v) = cyclorb_json(&["orbit", "--resume", ckpt.to_str().unwrap()]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["orbit_size"], 24);
    let _ = std::fs::remove_file(ckpt);
}

#[test]
fn an_interrupted_run_says_how_to_continue() {
    // SU(2)_3's genus-2 orbit never closes (its image is infinite: Freedman, Larsen and
    // Wang 2002), so the run is still going when SIGINT arrives.
    let child = run_cli::command()
        .args(["orbit", "su2:3", "--genus", "2", "--threads", "1"])
        .stdout(std::process::Stdio::piped())
        .spawn()
        .unwrap();
    std::thread::sleep(std::time::Duration::from_millis(1500));
    let status = std::process::Command::new("kill")
        .args(["-INT", &child.id().to_string()])
        .status()
        .unwrap();
    assert!(status.success());
    let out = child.wait_with_output().unwrap();
    assert_eq!(out.status.code(), Some(3));
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(text.contains("stopped: interrupted"), "{text}");
    let line = text
        .lines()
        .find(|l| l.starts_with("continue with: cyclorb orbit --resume "))
        .unwrap_or_else(|| panic!("{text}"));
    let path = line.trim_start_matches("continue with: cyclorb orbit --resume ");
    assert!(std::path::Path::new(path).exists(), "{text}");
    let _ = std::fs::remove_file(path);
}

#[test]
fn a_stopped_run_resumes_to_the_same_answer() {
    let ckpt = temp_path("ising2.ckpt");
    let (code, partial) = cyclorb_json(&[
        "orbit",
        "ising",
        "--genus",
        "2",
        "--limit",
        "1000",
        "--checkpoint",
        ckpt.to_str().unwrap(),
    ]);
    assert_eq!(code, 3, "{partial}");
    assert!(ckpt.exists(), "a stopped run leaves a checkpoint");
    let (code, resumed) = cyclorb_json(&[
        "orbit",
        "ising",
        "--genus",
        "2",
        "--resume",
        ckpt.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{resumed}");
    let (_, fresh) = cyclorb_json(&["orbit", "ising", "--genus", "2"]);
    for key in ["orbit_size", "layer_sizes", "saturated"] {
        assert_eq!(resumed[key], fresh[key], "{key}");
    }
    assert_eq!(resumed["poincare_sum"]["prefactor"], "384");
    let _ = std::fs::remove_file(ckpt);
}

#[test]
fn thread_count_does_not_change_the_answer() {
    let (_, one) = cyclorb_json(&["orbit", "ising", "--genus", "2", "--threads", "1"]);
    for threads in ["2", "3"] {
        let (_, other) = cyclorb_json(&["orbit", "ising", "--genus", "2", "--threads", threads]);
        assert_eq!(
            one["layer_sizes"], other["layer_sizes"],
            "{threads} threads"
        );
        assert_eq!(
            one["poincare_sum"], other["poincare_sum"],
            "{threads} threads"
        );
        assert_eq!(one["orbit_size"], other["orbit_size"], "{threads} threads");
    }
}

/// Ising's genus-1 twists written by `cyclorb twists --out` to a scratch file `name`.
fn ising_genus_one_generators(name: &str) -> std::path::PathBuf {
    let gens = temp_path(name);
    let (code, _) = cyclorb_json(&[
        "twists",
        "ising",
        "--genus",
        "1",
        "--out",
        gens.to_str().unwrap(),
    ]);
    assert_eq!(code, 0);
    gens
}

#[test]
fn raw_mode_reads_the_files_twists_writes() {
    let gens = ising_genus_one_generators("ising1-gens.json");
    let seed = fixture("orbit/vacuum-seed-ising.json");
    let (code, v) = cyclorb_json(&[
        "orbit",
        "--matrices",
        gens.to_str().unwrap(),
        "--seed",
        seed.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["orbit_size"], 24);
    assert_eq!(v["poincare_sum"]["prefactor"], "8");
    let _ = std::fs::remove_file(gens);
}

#[test]
fn genus_two_needs_fusion_data() {
    let out = run_cli::cyclorb(&["orbit", "kac:6:5", "--genus", "2"]);
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("modular data only"), "{err}");
}

/// Orbit size of a run that must saturate.
fn closed_orbit_size(spec: &str, genus: &str) -> u64 {
    let (code, v) = cyclorb_json(&["orbit", spec, "--genus", genus]);
    assert_eq!(code, 0, "{spec} genus {genus}: {v}");
    assert_eq!(v["saturated"], true);
    v["orbit_size"].as_u64().unwrap()
}

#[test]
fn galois_conjugates_have_the_same_orbit_sizes() {
    // A Galois automorphism σ of Q(ζ_n) maps the twists of a theory to those of its conjugate
    // and the orbit of the vacuum line bijectively onto the conjugate's orbit (a fact of the
    // construction: every step is a polynomial identity over Q), so finite orbits match.
    for (spec, conjugate, genera) in [
        ("su2:2", "galois:5(su2:2)", &["1", "2"][..]),
        ("su2:4", "galois:5(su2:4)", &["1"][..]),
        ("zn:3:2", "conj(zn:3:2)", &["1", "2"][..]),
        ("zn:5:2", "galois:2(zn:5:2)", &["1", "2"][..]),
        ("ising*zn:3:2", "conj(ising*zn:3:2)", &["1"][..]),
    ] {
        for g in genera {
            assert_eq!(
                closed_orbit_size(spec, g),
                closed_orbit_size(conjugate, g),
                "{spec} vs {conjugate}, genus {g}"
            );
        }
    }
}

#[test]
fn semion_orbits_count_the_stabiliser_states() {
    // The number of stabiliser states of g qubits is 2^g Π_{k=1}^{g} (2^k + 1) (Aaronson and
    // Gottesman, "Improved simulation of stabilizer circuits", Phys. Rev. A 70 (2004) 052328;
    // from memory): 6, 60, 1080. The semion's genus-g blocks are g qubits and its Dehn twists
    // act by Clifford gates, so the vacuum line's orbit is the set of stabiliser states.
    for (genus, count) in [(1u32, 6u64), (2, 60), (3, 1080)] {
        let formula = 2u64.pow(genus) * (1..=genus).map(|k| 2u64.pow(k) + 1).product::<u64>();
        assert_eq!(formula, count);
        assert_eq!(closed_orbit_size("zn:2:1", &genus.to_string()), count);
    }
}

#[test]
fn odd_pointed_orbits_count_the_lagrangian_subspaces() {
    // For an odd prime N the genus-g blocks of zn:N:P carry the Weil representation of
    // Sp(2g, F_N), and the vacuum line is fixed exactly by the stabiliser of a Lagrangian
    // subspace, so the orbit is the Lagrangian Grassmannian of F_N^{2g}, which has
    // Π_{k=1}^{g} (N^k + 1) points (common practice; Gérardin 1977 for the Weil
    // representation, from memory).
    for (spec, n, genera) in [
        ("zn:3:2", 3u64, &[1u32, 2, 3][..]),
        ("zn:5:2", 5, &[1, 2, 3][..]),
        ("zn:7:2", 7, &[1, 2][..]),
    ] {
        for &genus in genera {
            let lagrangians: u64 = (1..=genus).map(|k| n.pow(k) + 1).product();
            assert_eq!(
                closed_orbit_size(spec, &genus.to_string()),
                lagrangians,
                "{spec} genus {genus}"
            );
        }
    }
}

/// Orbit size, layer sizes and Poincaré sum of a saturated run with the given method.
fn orbit_by(spec: &str, genus: &str, method: &str) -> (u64, serde_json::Value, serde_json::Value) {
    let (code, v) = cyclorb_json(&["orbit", spec, "--genus", genus, "--method", method]);
    assert_eq!(code, 0, "{spec} genus {genus} by {method}: {v}");
    assert_eq!(v["saturated"], true);
    (
        v["orbit_size"].as_u64().unwrap(),
        v["layer_sizes"].clone(),
        v["poincare_sum"].clone(),
    )
}

#[test]
fn the_product_route_agrees_with_enumeration() {
    // The block space of A⊠B is V_A ⊗ V_B with every twist acting as T_A ⊗ T_B, and a line
    // ⟨v ⊗ w⟩ determines ⟨v⟩ and ⟨w⟩ (common practice: the Segre embedding is injective), so
    // the orbit found from the factors must be the enumerated one, layer by layer. When the
    // orbit is all of O_A × O_B, B = B_A ⊗ B_B: scalar exactly when both are, λ = λ_A·λ_B.
    for (spec, genus, independent) in [
        ("ising*fibonacci", "1", true),
        ("ising*zn:3:2", "1", true),
        ("ising*ising:3", "2", false),
        ("ising*zn:2:1", "2", false),
        ("ising*ising", "2", false),
    ] {
        let (size, layers, sum) = orbit_by(spec, genus, "product");
        let (size_e, layers_e, sum_e) = orbit_by(spec, genus, "enumerate");
        assert_eq!((size, layers), (size_e, layers_e), "{spec} genus {genus}");
        if independent {
            assert_eq!(sum["is_scalar"], sum_e["is_scalar"], "{spec} genus {genus}");
            assert_eq!(sum["prefactor"], sum_e["prefactor"], "{spec} genus {genus}");
        } else {
            assert!(sum["is_scalar"].is_null(), "{spec} genus {genus}: {sum}");
        }
    }
    // Castro et al. 2012 (as in tricritical_ising_genus_one): tricritical Ising, built as
    // conj(fibonacci)*ising:7, has B = 48·I at genus 1; from the factors, 6 · 8.
    assert_eq!(
        orbit_by("conj(fibonacci)*ising:7", "1", "product").2["prefactor"],
        "48"
    );
    // The built-in name is that product too: the product route takes it, with the same
    // orbit as enumeration.
    let (size, layers, sum) = orbit_by("tricritical-ising", "1", "product");
    let (size_e, layers_e, sum_e) = orbit_by("tricritical-ising", "1", "enumerate");
    assert_eq!((size, layers), (size_e, layers_e));
    assert_eq!(sum["prefactor"], "48");
    assert_eq!(sum_e["prefactor"], "48");
}

#[test]
fn the_product_route_refuses_a_theory_that_is_not_a_product() {
    let out = run_cli::cyclorb(&["orbit", "ising", "--genus", "1", "--method", "product"]);
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("not one"), "{err}");
    // a factor whose orbit does not close leaves the product unsaturated, with a lower bound
    let (code, v) = cyclorb_json(&[
        "orbit",
        "ising*fibonacci",
        "--genus",
        "2",
        "--method",
        "product",
        "--limit",
        "500",
    ]);
    assert_eq!(code, 3, "{v}");
    assert_eq!(v["saturated"], false);
    assert!(v["orbit_size"].as_u64().unwrap() >= 500);
}

#[test]
fn genus_one_sum_is_printed_as_a_modular_invariant_over_labels() {
    // Castro et al. 2012: Ising at genus 1 gives B = 8·I, i.e. Z = 8(|χ_1|² + |χ_σ|² + |χ_ψ|²).
    let (code, v) = cyclorb_json(&["orbit", "ising", "--genus", "1"]);
    assert_eq!(code, 0, "{v}");
    let mi = &v["poincare_sum"]["modular_invariant"];
    assert_eq!(mi["labels"], serde_json::json!(["1", "sigma", "psi"]));
    for (i, row) in mi["matrix"].as_array().unwrap().iter().enumerate() {
        for (j, x) in row.as_array().unwrap().iter().enumerate() {
            assert_eq!(x, if i == j { "8" } else { "0" }, "M[{i}][{j}]");
        }
    }
    let out = run_cli::cyclorb(&["orbit", "ising", "--genus", "1"]);
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        text.contains("modular invariant Z = Σ M_ab χ_a χ̄_b"),
        "{text}"
    );
    assert!(text.contains("    sigma  0      8    0"), "{text}");

    // SU(2)_4 at genus 1: B is 8 times the diagonal invariant plus 2 times the D-series
    // invariant |χ_0 + χ_2|² + 2|χ_1|² (spins 0, 1/2, 1, 3/2, 2; Cappelli, Itzykson and
    // Zuber 1987, the D_4 entry of the ADE list).
    let (code, v) = cyclorb_json(&["orbit", "su2:4", "--genus", "1"]);
    assert_eq!(code, 0, "{v}");
    let sum = &v["poincare_sum"];
    assert_eq!(sum["commutant_dimension"], 2);
    let labels = ["0", "1/2", "1", "3/2", "2"];
    assert_eq!(
        sum["modular_invariant"]["labels"],
        serde_json::json!(labels)
    );
    let terms = sum["invariants"].as_array().unwrap();
    assert_eq!(terms.len(), 2);
    let d_series = terms.iter().find(|t| t["coefficient"] == "2").unwrap();
    let mut entries: Vec<(String, String, String)> = d_series["entries"]
        .as_array()
        .unwrap()
        .iter()
        .map(|e| {
            let name = |k: &str| e[k].as_str().unwrap().to_string();
            (name("row"), name("column"), name("value"))
        })
        .collect();
    entries.sort();
    let label = |a: &str| format!("a=({a}) b=(0) x=()");
    let mut expected = vec![
        (label("0"), label("0"), "1".to_string()),
        (label("0"), label("2"), "1".to_string()),
        (label("2"), label("0"), "1".to_string()),
        (label("2"), label("2"), "1".to_string()),
        (label("1"), label("1"), "2".to_string()),
    ];
    expected.sort();
    assert_eq!(entries, expected);
}

#[test]
fn higher_genus_sums_are_keyed_by_label_tuples() {
    // Ising at genus 2: B = 384·G⁻¹ with G = I (unitary gauge), so ten diagonal entries 384
    // (the published genus-2 prefactor, as in the test above), one per comb label tuple.
    for method in ["enumerate", "structure"] {
        let (code, v) = cyclorb_json(&["orbit", "ising", "--genus", "2", "--method", method]);
        assert_eq!(code, 0, "{v}");
        let entries = v["poincare_sum"]["entries"].as_array().unwrap();
        assert_eq!(entries.len(), 10, "{method}");
        assert!(entries
            .iter()
            .all(|e| e["row"] == e["column"] && e["value"] == "384" && e["approx"][0] == 384.0));
        assert!(entries
            .iter()
            .any(|e| e["row"] == "a=(sigma,sigma) b=(psi,psi) x=()"));
    }
}

#[test]
fn the_compact_store_and_its_spill_give_the_same_answer() {
    // Ising genus 2: 3840 lines, B = 384·I (Castro et al., as above), in each store; a
    // compact run stopped by its limit resumes from its checkpoint (records only) to the
    // same answer, and a spilling run removes its files.
    let (_, memory) = cyclorb_json(&["orbit", "ising", "--genus", "2", "--store", "memory"]);
    assert_eq!(memory["store_kind"], "memory");
    assert_eq!(memory["window_bytes"], 0);
    let spill = temp_path("spill-dir");
    std::fs::create_dir_all(&spill).unwrap();
    let spill_arg = spill.to_str().unwrap();
    for extra in [&["--store", "compact"][..], &["--spill", spill_arg][..]] {
        let mut args = vec!["orbit", "ising", "--genus", "2"];
        args.extend_from_slice(extra);
        let (code, v) = cyclorb_json(&args);
        assert_eq!(code, 0, "{v}");
        assert_eq!(v["store_kind"], "compact", "{extra:?}");
        for key in ["orbit_size", "layer_sizes", "saturated", "poincare_sum"] {
            assert_eq!(v[key], memory[key], "{extra:?}: {key}");
        }
        assert_eq!(v["orbit_size"], 3840);
        assert_eq!(v["poincare_sum"]["prefactor"], "384");
        assert!(v["store_bytes"].as_u64() < memory["store_bytes"].as_u64());
    }
    assert_eq!(std::fs::read_dir(&spill).unwrap().count(), 0);
    let ckpt = temp_path("compact-ising2.ckpt");
    let (code, partial) = cyclorb_json(&[
        "orbit",
        "ising",
        "--genus",
        "2",
        "--spill",
        spill_arg,
        "--limit",
        "1000",
        "--checkpoint",
        ckpt.to_str().unwrap(),
    ]);
    assert_eq!(code, 3, "{partial}");
    assert_eq!(
        partial["resume_command"],
        format!(
            "cyclorb orbit --resume {} --spill {spill_arg}",
            ckpt.display()
        )
    );
    let (code, resumed) = cyclorb_json(&["orbit", "--resume", ckpt.to_str().unwrap()]);
    assert_eq!(code, 0, "{resumed}");
    assert_eq!(resumed["store_kind"], "compact");
    for key in ["orbit_size", "layer_sizes", "poincare_sum"] {
        assert_eq!(resumed[key], memory[key], "{key}");
    }
    let _ = std::fs::remove_file(ckpt);
    // the memory store does not spill: a clear refusal
    let out = run_cli::cyclorb(&[
        "orbit", "ising", "--genus", "2", "--store", "memory", "--spill", spill_arg,
    ]);
    assert_eq!(out.status.code(), Some(1));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("only the compact store spills"), "{err}");
    let _ = std::fs::remove_dir_all(&spill);
}

#[test]
#[ignore = "Ising genus 3: several minutes; run with --ignored in release mode"]
fn ising_genus_three_completes_on_disk_under_a_third_of_its_memory_size() {
    // What is checked is that the store does not change the answer: the spilling run must
    // give the orbit size and λ that the structural route counts without listing a line
    // (`--method structure`, whose certificate is re-checked before it answers).
    let (code, counted) =
        cyclorb_json(&["orbit", "ising", "--genus", "3", "--method", "structure"]);
    assert_eq!(code, 0, "{counted}");
    // The memory store needs about 0.8 GB for the 8 847 360 lines; under 450 MiB of resident
    // memory it stops (exit 3) while the compact store spilling to disk completes with the
    // same answer.
    let spill = temp_path("spill-g3");
    std::fs::create_dir_all(&spill).unwrap();
    let limited = ["--memory-limit", "450", "orbit", "ising", "--genus", "3"];
    let mut args = limited.to_vec();
    args.extend(["--spill", spill.to_str().unwrap()]);
    let (code, v) = cyclorb_json(&args);
    assert_eq!(code, 0, "{v}");
    assert_eq!(v["orbit_size"], counted["orbit_size"]);
    assert_eq!(
        v["poincare_sum"]["prefactor"],
        counted["poincare_sum"]["prefactor"]
    );
    assert_eq!(v["poincare_sum"]["trace_check"], true);
    assert_eq!(std::fs::read_dir(&spill).unwrap().count(), 0);
    let mut args = limited.to_vec();
    args.extend(["--store", "memory"]);
    let (code, v) = cyclorb_json(&args);
    assert_eq!(code, 3, "{v}");
    assert_eq!(v["stop_reason"], "memory");
    let _ = std::fs::remove_dir_all(&spill);
    if let Some(ckpt) = v["checkpoint"].as_str() {
        let _ = std::fs::remove_file(ckpt);
    }
}

/// A build without the feature `mpi` started by a launcher as one of several processes
/// refuses, naming the feature (each copy would list the whole orbit and write the same
/// files); as the only process it runs.
#[cfg(not(feature = "mpi"))]
#[test]
fn a_build_without_mpi_refuses_to_be_one_of_several_ranks() {
    let out = run_cli::command()
        .args(["orbit", "ising", "--genus", "1"])
        .env("OMPI_COMM_WORLD_SIZE", "2")
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(1));
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(stderr.contains("--features mpi"), "{stderr}");
    let out = run_cli::command()
        .args(["orbit", "ising", "--genus", "1"])
        .env("PMI_SIZE", "1")
        .output()
        .unwrap();
    assert_eq!(out.status.code(), Some(0));
}
