//! `cyclorb orbit` under `mpirun` (cargo feature `mpi`; CI runs these with
//! `cargo test --release --features mpi --test cli_mpi`): with 1 and 2 ranks the answer is
//! the one-process run's, stdout is one JSON object, and a line limit stops every rank with
//! the one-process run's partial answer and exit code, and rank checkpoints resume to the
//! one-process answer.
#![cfg(feature = "mpi")]

mod outside;
mod run_cli;

use std::process::Command;

use run_cli::{cyclorb_json, test_cache};
use serde_json::Value;

/// `mpirun -n RANKS cyclorb ARGS --json`: the exit code and the one JSON object on stdout.
fn mpirun_json(ranks: usize, args: &[&str]) -> (i32, Value) {
    let mut all = args.to_vec();
    all.push("--json");
    let out = mpirun(ranks, &all);
    let value = serde_json::from_slice(&out.stdout).unwrap_or_else(|e| {
        panic!(
            "stdout of {ranks} ranks of {args:?} is not one JSON object ({e}):\n{}\nstderr:\n{}",
            String::from_utf8_lossy(&out.stdout),
            String::from_utf8_lossy(&out.stderr)
        )
    });
    (out.status.code().unwrap_or(-1), value)
}

/// The keys that must agree between one process and any number of ranks.
const ANSWER_KEYS: &[&str] = &[
    "theory",
    "genus",
    "dimension",
    "conductor",
    "generator_names",
    "orbit_size",
    "saturated",
    "stop_reason",
    "layer_sizes",
    "poincare_sum",
    "numerator_width",
    "store_kind",
    "verified",
];

/// Every key of a distributed report, and of its `ranks`, is in docs/schema/orbit.schema.json
/// (tests/json_schema.rs checks the one-process reports in full).
fn documented(v: &Value) {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/docs/schema/orbit.schema.json");
    let schema: Value = serde_json::from_str(&std::fs::read_to_string(path).unwrap()).unwrap();
    let properties = &schema["properties"];
    for key in v.as_object().unwrap().keys() {
        assert!(
            properties.get(key).is_some(),
            "key {key} is not in the schema"
        );
    }
    for key in v["ranks"].as_object().unwrap().keys() {
        assert!(
            properties["ranks"]["properties"].get(key).is_some(),
            "key ranks.{key} is not in the schema"
        );
    }
}

/// Run ARGS in one process and on 1 and 2 ranks; every answer key agrees and the ranks'
/// lines add up to the orbit. Returns the one-process exit code and JSON.
fn same_on_ranks(args: &[&str]) -> (i32, Value) {
    let (code, single) = cyclorb_json(args);
    for ranks in [1, 2] {
        let (rank_code, v) = mpirun_json(ranks, args);
        assert_eq!(rank_code, code, "{ranks} ranks of {args:?}: {v}");
        for key in ANSWER_KEYS {
            assert_eq!(v[key], single[key], "{key} of {args:?} on {ranks} ranks");
        }
        assert_eq!(v["ranks"]["count"], ranks);
        documented(&v);
        let owned = v["ranks"]["lines"].as_array().unwrap();
        let lines: u64 = owned.iter().filter_map(Value::as_u64).sum();
        assert_eq!(Some(lines), v["orbit_size"].as_u64(), "one owner per line");
    }
    (code, single)
}

#[test]
fn ranks_give_the_one_process_answer() {
    // fixtures/outside.toml: Castro, Gaberdiel, Hartman, Maloney, Volpato (2012) and their
    // all-genus follow-up (2019): Ising at genus 2 has 3840 terms and B = 384·I.
    let published = outside::orbit("ising", 2);
    let (code, v) = same_on_ranks(&["orbit", "ising", "--genus", "2"]);
    assert_eq!(code, 0);
    assert_eq!(v["orbit_size"].as_u64(), Some(published.lines));
    assert_eq!(v["poincare_sum"]["prefactor"], published.prefactor.as_str());
    // SU(2)_4 at genus 1: B is not scalar; the commutant has dimension 2, the two physical
    // invariants A_5 and D_4 of the ADE classification (Cappelli, Itzykson, Zuber, Commun.
    // Math. Phys. 113 (1987) 1)
    let (code, v) = same_on_ranks(&["orbit", "su2:4", "--genus", "1"]);
    assert_eq!(code, 0);
    assert_eq!(v["poincare_sum"]["is_scalar"], false);
    assert_eq!(v["poincare_sum"]["commutant_dimension"], 2);
    // D(S3) at genus 1: B read over the orbitals of the permutation action; its 8 labels
    // (Dijkgraaf, Pasquier, Roche 1990: the simple objects of D(S3)) give a 8-dimensional
    // block space at genus 1
    let (code, v) = same_on_ranks(&["orbit", "dw:S3", "--genus", "1"]);
    assert_eq!(code, 0);
    assert_eq!(v["dimension"], 8);
}

#[test]
fn a_line_limit_stops_every_rank_with_the_one_process_answer() {
    let (code, v) = same_on_ranks(&["orbit", "ising", "--genus", "2", "--limit", "1000"]);
    assert_eq!(code, 3, "a stopped run exits 3 (README, Commands)");
    assert_eq!(v["orbit_size"], 1000);
    assert_eq!(v["saturated"], false);
    assert_eq!(v["stop_reason"], "limit");
}

#[test]
fn a_memory_limit_stops_every_rank_by_its_resident_memory() {
    // each rank's budget holds its whole process (README, "Running on a cluster"): 48 MiB
    // is passed within the first layers of Ising at genus 3 on any rank
    let (code, v) = mpirun_json(
        2,
        &["--memory-limit", "48", "orbit", "ising", "--genus", "3"],
    );
    assert_eq!(code, 3, "{v}");
    assert_eq!(v["stop_reason"], "memory");
    assert_eq!(v["saturated"], false);
    // 8 847 360: the whole orbit, as the structural route counts it without listing it
    // (this project's count, re-checked by its certificate; tests/cli_orbit.rs)
    assert!(v["orbit_size"].as_u64().unwrap() < 8_847_360, "{v}");
    // the resident memory, not the store, stopped them: the stores (about 20 MB each when
    // this was written) were far from the 48 MiB that the store and the layer being built
    // must pass before the store's own rule stops a rank
    for store in v["ranks"]["store_bytes"].as_array().unwrap() {
        assert!(store.as_u64().unwrap() < 32 << 20, "{v}");
    }
}

/// `mpirun -n RANKS cyclorb ARGS` (text), for exit codes and messages.
fn mpirun(ranks: usize, args: &[&str]) -> std::process::Output {
    Command::new("mpirun")
        .args(["-n", &ranks.to_string(), "--oversubscribe"])
        .arg(env!("CARGO_BIN_EXE_cyclorb"))
        .args(args)
        .env("XDG_CACHE_HOME", test_cache())
        // Open MPI refuses root without these (CI runs as root)
        .env("OMPI_ALLOW_RUN_AS_ROOT", "1")
        .env("OMPI_ALLOW_RUN_AS_ROOT_CONFIRM", "1")
        .output()
        .expect("mpirun runs (Debian: openmpi-bin)")
}

#[test]
fn rank_checkpoints_resume_to_the_one_process_answer() {
    let base = run_cli::temp_path("mpi-ckpt");
    let base_text = base.display().to_string();
    let (_, single) = cyclorb_json(&["orbit", "ising", "--genus", "2"]);
    let mut args: Vec<&str> = "orbit ising --genus 2 --limit 1000 --checkpoint"
        .split(' ')
        .collect();
    args.push(&base_text);
    let (code, stopped) = mpirun_json(2, &args);
    assert_eq!(code, 3, "{stopped}");
    assert_eq!(stopped["checkpoint"], base_text.as_str());
    let command = stopped["resume_command"].as_str().unwrap();
    assert!(command.starts_with("mpirun -n 2 "), "{command}");
    // `--resume BASE` alone: the problem is the one the checkpoints record
    let (code, resumed) = mpirun_json(2, &["orbit", "--resume", &base_text]);
    assert_eq!(code, 0, "{resumed}");
    for key in ANSWER_KEYS {
        assert_eq!(resumed[key], single[key], "{key} after resuming");
    }
    for rank in 0..2 {
        std::fs::remove_file(format!("{base_text}.rank{rank}")).ok();
    }
}

#[test]
fn rank_checkpoints_resume_on_another_number_of_ranks() {
    let base = run_cli::temp_path("mpi-regroup");
    let base = base.display().to_string();
    let again = format!("{base}-again");
    let (_, single) = cyclorb_json(&["orbit", "ising", "--genus", "2"]);
    let same_as_single = |v: &Value, what: &str| {
        for key in ANSWER_KEYS {
            assert_eq!(v[key], single[key], "{key} {what}");
        }
    };
    let stop_on_two = || {
        let (code, v) = mpirun_json(
            2,
            &[
                "orbit",
                "ising",
                "--genus",
                "2",
                "--limit",
                "1000",
                "--checkpoint",
                &base,
            ],
        );
        assert_eq!(code, 3, "{v}");
    };
    // two ranks' files, cut inside a layer by the limit, continued by one rank
    stop_on_two();
    let (code, v) = mpirun_json(1, &["orbit", "--resume", &base]);
    assert_eq!(code, 0, "{v}");
    same_as_single(&v, "resuming 2 ranks' files on 1");
    // ... and by one process without mpirun: stopped by a second limit (its one rank file
    // continues without mpirun too), then to the end
    stop_on_two();
    let (code, v) = cyclorb_json(&["orbit", "--resume", &base, "--limit", "2000"]);
    assert_eq!(code, 3, "{v}");
    assert_eq!(v["orbit_size"], 2000);
    assert_eq!(v["ranks"]["count"], 1);
    let command = v["resume_command"].as_str().unwrap();
    assert!(command.starts_with("cyclorb orbit --resume "), "{command}");
    let (code, v) = cyclorb_json(&["orbit", "--resume", &base]);
    assert_eq!(code, 0, "{v}");
    same_as_single(&v, "resuming 2 ranks' files in one process");
    // ... and by three, stopped again by a second limit, their files continued by two
    stop_on_two();
    let (code, v) = mpirun_json(
        3,
        &[
            "orbit",
            "--resume",
            &base,
            "--limit",
            "2500",
            "--checkpoint",
            &again,
        ],
    );
    assert_eq!(code, 3, "{v}");
    assert_eq!(v["orbit_size"], 2500);
    let (code, v) = mpirun_json(2, &["orbit", "--resume", &again]);
    assert_eq!(code, 0, "{v}");
    same_as_single(&v, "resuming 2 → 3 → 2 ranks");
    assert_eq!(v["ranks"]["count"], 2);
    // another problem's files are refused
    let out = mpirun(3, &["orbit", "ising", "--genus", "1", "--resume", &base]);
    assert_eq!(out.status.code(), Some(1));
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(stderr.contains("another problem"), "{stderr}");
    // a missing rank file is named
    std::fs::remove_file(format!("{base}.rank1")).unwrap();
    let out = mpirun(3, &["orbit", "--resume", &base]);
    assert_eq!(out.status.code(), Some(1));
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(stderr.contains(".rank1"), "{stderr}");
    for name in [&base, &again] {
        for rank in 0..3 {
            std::fs::remove_file(format!("{name}.rank{rank}")).ok();
        }
    }
    // a one-process checkpoint (memory store), cut inside a layer, continued by two ranks
    let single_file = format!("{base}-single");
    let (code, v) = cyclorb_json(&[
        "orbit",
        "ising",
        "--genus",
        "2",
        "--limit",
        "1000",
        "--checkpoint",
        &single_file,
    ]);
    assert_eq!(code, 3, "{v}");
    let (code, v) = mpirun_json(2, &["orbit", "--resume", &single_file]);
    assert_eq!(code, 0, "{v}");
    same_as_single(&v, "resuming a one-process checkpoint on 2 ranks");
    // ... but not one of the compact store
    let (code, v) = cyclorb_json(&[
        "orbit",
        "ising",
        "--genus",
        "2",
        "--limit",
        "1000",
        "--store",
        "compact",
        "--checkpoint",
        &single_file,
    ]);
    assert_eq!(code, 3, "{v}");
    let out = mpirun(2, &["orbit", "--resume", &single_file]);
    assert_eq!(out.status.code(), Some(1));
    let stderr = String::from_utf8_lossy(&out.stderr);
    assert!(stderr.contains("compact store"), "{stderr}");
    std::fs::remove_file(&single_file).ok();
}

#[test]
fn what_a_distributed_run_cannot_do_is_refused_once() {
    let spill = std::env::temp_dir().display().to_string();
    for (args, reason) in [
        (
            vec!["--store", "memory", "--spill", spill.as_str()],
            "only the compact store spills",
        ),
        (vec!["--words", "3"], "drop --words"),
        (vec!["--method", "structure"], "drop --method"),
    ] {
        let mut all = vec!["orbit", "ising", "--genus", "1"];
        all.extend(args);
        let out = mpirun(2, &all);
        assert_eq!(out.status.code(), Some(1));
        assert!(out.stdout.is_empty());
        let stderr = String::from_utf8_lossy(&out.stderr);
        assert_eq!(stderr.matches(reason).count(), 1, "{stderr}");
    }
}

#[test]
fn ranks_in_the_compact_store_give_the_one_process_answer() {
    // fixtures/outside.toml: Ising at genus 2 has 3840 terms and B = 384·I (as above)
    let published = outside::orbit("ising", 2);
    let (code, v) = same_on_ranks(&["orbit", "ising", "--genus", "2", "--store", "compact"]);
    assert_eq!(code, 0);
    assert_eq!(v["store_kind"], "compact");
    assert_eq!(v["orbit_size"].as_u64(), Some(published.lines));
    assert_eq!(v["poincare_sum"]["prefactor"], published.prefactor.as_str());
    // ... and spilling their windows to a directory of their own each
    let dir = run_cli::temp_path("mpi-spill");
    std::fs::create_dir_all(&dir).unwrap();
    let dir_text = dir.display().to_string();
    let (code, spilled) = mpirun_json(2, &["orbit", "ising", "--genus", "2", "--spill", &dir_text]);
    assert_eq!(code, 0, "{spilled}");
    for key in ANSWER_KEYS {
        assert_eq!(spilled[key], v[key], "{key} with --spill on 2 ranks");
    }
    assert!(dir.join("rank1").is_dir());
    std::fs::remove_dir_all(&dir).ok();
    // stopped by a limit with rank checkpoints, continued on 2 and 3 ranks and in one
    // process (the files keep the compact store)
    let base = run_cli::temp_path("mpi-compact").display().to_string();
    let stop = |ranks| {
        let (code, stopped) = mpirun_json(
            ranks,
            &[
                "orbit",
                "ising",
                "--genus",
                "2",
                "--store",
                "compact",
                "--limit",
                "1000",
                "--checkpoint",
                &base,
            ],
        );
        assert_eq!(code, 3, "{stopped}");
    };
    for ranks in [2, 3] {
        stop(2);
        let (code, resumed) = mpirun_json(ranks, &["orbit", "--resume", &base]);
        assert_eq!(code, 0, "{resumed}");
        for key in ANSWER_KEYS {
            assert_eq!(resumed[key], v[key], "{key} resumed on {ranks} ranks");
        }
    }
    stop(2);
    let (code, resumed) = cyclorb_json(&["orbit", "--resume", &base]);
    assert_eq!(code, 0, "{resumed}");
    for key in ANSWER_KEYS {
        assert_eq!(resumed[key], v[key], "{key} resumed in one process");
    }
    for rank in 0..3 {
        std::fs::remove_file(format!("{base}.rank{rank}")).ok();
    }
}
