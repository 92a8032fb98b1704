//! `cyclorb completions` and `cyclorb manual`: shell completions and manual pages generated
//! from the command-line definition itself (clap's completion and roff generators), so they
//! never drift from the options the program accepts.

use std::path::Path;

use clap::CommandFactory;
use serde_json::json;

use super::output::{Outcome, Report};
use crate::cli::{Cli, CompletionsArgs, ManualArgs};

/// The completion script of `args.shell` (install it where the shell reads completions; the
/// README says where).
pub fn completions(args: &CompletionsArgs, as_json: bool) -> Outcome {
    let mut command = Cli::command();
    let mut script = Vec::new();
    clap_complete::generate(args.shell, &mut command, "cyclorb", &mut script);
    let script = String::from_utf8_lossy(&script).into_owned();
    Outcome::Done(Report::new(
        json!({"shell": args.shell.to_string(), "script": script}),
        script,
        as_json,
    ))
}

/// One manual page in roff.
fn render(command: clap::Command) -> Result<String, String> {
    let mut page = Vec::new();
    clap_mangen::Man::new(command)
        .render(&mut page)
        .map_err(|e| format!("the manual page cannot be rendered: {e}"))?;
    Ok(String::from_utf8_lossy(&page).into_owned())
}

/// Write `cyclorb.1` and `cyclorb-COMMAND.1` for every command into `dir`.
fn write_pages(dir: &Path) -> Result<Vec<String>, String> {
    std::fs::create_dir_all(dir).map_err(|e| format!("{}: {e}", dir.display()))?;
    let top = Cli::command();
    let mut pages = vec![("cyclorb.1".to_string(), render(top.clone())?)];
    for sub in top.get_subcommands() {
        let name = format!("cyclorb-{}", sub.get_name());
        let page = render(
            sub.clone()
                .display_name(name.clone())
                .bin_name(name.clone()),
        )?;
        pages.push((format!("{name}.1"), page));
    }
    let mut written = Vec::new();
    for (file, page) in pages {
        let path = dir.join(&file);
        std::fs::write(&path, page).map_err(|e| format!("{}: {e}", path.display()))?;
        written.push(path.display().to_string());
    }
    Ok(written)
}

/// The manual page on stdout, or every page into `--out DIR`.
pub fn manual(args: &ManualArgs, as_json: bool) -> Outcome {
    match &args.out {
        None => match render(Cli::command()) {
            Ok(page) => Outcome::Done(Report::new(json!({"page": page}), page, as_json)),
            Err(e) => Outcome::Invalid(e),
        },
        Some(dir) => match write_pages(dir) {
            Ok(files) => {
                let text = format!(
                    "{} manual pages written:\n{}\n",
                    files.len(),
                    files.join("\n")
                );
                Outcome::Done(Report::new(json!({"files": files}), text, as_json))
            }
            Err(e) => Outcome::Invalid(e),
        },
    }
}
