//! `cyclorb completions` and `cyclorb manual`: generated from the command-line definition,
//! so every command appears in them.

mod run_cli;

use run_cli::{cyclorb, temp_path};

const COMMANDS: &[&str] = &[
    "field",
    "twists",
    "orbit",
    "theories",
    "describe",
    "verify",
    "commutant",
    "image",
    "witness",
    "sweep",
    "check",
];

#[test]
fn completions_name_every_command_and_parse_in_their_shell() {
    for shell in ["bash", "zsh", "fish"] {
        let out = cyclorb(&["completions", shell]);
        assert!(out.status.success(), "{shell}");
        let script = String::from_utf8_lossy(&out.stdout);
        for command in COMMANDS {
            assert!(
                script.contains(command),
                "{shell} completion lacks {command}"
            );
        }
        // fish writes options as `-l genus`, the others as `--genus`
        assert!(
            script.contains("genus") && script.contains("resume"),
            "{shell}"
        );
    }
    // the bash script is valid bash (bash -n parses without running)
    let script = temp_path("cyclorb.bash");
    std::fs::write(&script, cyclorb(&["completions", "bash"]).stdout).unwrap();
    let status = std::process::Command::new("bash")
        .arg("-n")
        .arg(&script)
        .status()
        .unwrap();
    assert!(status.success());
    // an unknown shell is a usage error (exit 2)
    assert_eq!(cyclorb(&["completions", "tcsh"]).status.code(), Some(2));
}

#[test]
fn manual_pages_cover_every_command() {
    let out = cyclorb(&["manual"]);
    assert!(out.status.success());
    let page = String::from_utf8_lossy(&out.stdout);
    assert!(page.contains(".TH cyclorb 1"), "{page}");
    let dir = temp_path("man");
    let out = cyclorb(&["manual", "--out", dir.to_str().unwrap()]);
    assert!(out.status.success());
    for command in COMMANDS {
        let path = dir.join(format!("cyclorb-{command}.1"));
        let page =
            std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
        assert!(
            page.contains(&format!(".TH cyclorb-{command} 1")),
            "{command}"
        );
    }
    let orbit = std::fs::read_to_string(dir.join("cyclorb-orbit.1")).unwrap();
    assert!(orbit.contains("resume"), "{orbit}");
}
