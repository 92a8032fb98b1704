//! Run the imprimitive structural route on a theory at one genus and print the report as
//! JSON (without the certificate unless `--certificate` is given).
//!
//! `cargo run --release -p cyclorb-structure --example imprimitive -- su2:4 2`

use std::time::Instant;

use cyclorb_mcg::BlockSpace;
use cyclorb_structure::{analyse_imprimitive, ImprimitiveOptions};
use cyclorb_theory::parse_spec;

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let spec = args.first().map_or("su2:4", String::as_str);
    let genus: usize = args.get(1).and_then(|g| g.parse().ok()).unwrap_or(2);
    let with_certificate = args.iter().any(|a| a == "--certificate");
    let start = Instant::now();
    let space = match parse_spec(spec)
        .map_err(|e| e.to_string())
        .and_then(|t| BlockSpace::new(t, genus).map_err(|e| e.to_string()))
    {
        Ok(s) => s,
        Err(e) => {
            eprintln!("{e}");
            std::process::exit(1);
        }
    };
    eprintln!("generators built in {:.2}s", start.elapsed().as_secs_f64());
    match analyse_imprimitive(&space, &ImprimitiveOptions::default()) {
        Ok(report) => {
            let mut value = serde_json::to_value(&report).expect("reports serialise");
            if !with_certificate {
                value["certificate"] = serde_json::Value::Null;
            }
            println!(
                "{}",
                serde_json::to_string_pretty(&value).expect("values serialise")
            );
        }
        Err(e) => {
            eprintln!("{e}");
            std::process::exit(1);
        }
    }
}
