//! Run the structural route on a theory at one genus and print the report as JSON
//! (without the certificate unless `--certificate` is given), then re-check it;
//! `--imprimitive` runs the imprimitive route instead of the monomial one.
//!
//! `cargo run --release -p cyclorb-structure --example structure -- ising 4`
//! `cargo run --release -p cyclorb-structure --example structure -- su2:4 2 --imprimitive`

use std::time::Instant;

use cyclorb_mcg::BlockSpace;
use cyclorb_structure::{
    analyse, analyse_imprimitive, recheck, recheck_imprimitive, ImprimitiveOptions,
    StructureOptions,
};
use cyclorb_theory::parse_spec;

fn main() {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let spec = args.first().map_or("ising", String::as_str);
    let genus: usize = args.get(1).and_then(|g| g.parse().ok()).unwrap_or(2);
    let with_certificate = args.iter().any(|a| a == "--certificate");
    let theory = match parse_spec(spec) {
        Ok(t) => t,
        Err(e) => {
            eprintln!("{e}");
            std::process::exit(1);
        }
    };
    let start = Instant::now();
    let space = match BlockSpace::new(theory, genus) {
        Ok(s) => s,
        Err(e) => {
            eprintln!("{e}");
            std::process::exit(1);
        }
    };
    eprintln!("generators built in {:.2}s", start.elapsed().as_secs_f64());
    let outcome = if args.iter().any(|a| a == "--imprimitive") {
        let options = ImprimitiveOptions::default();
        analyse_imprimitive(&space, &options).and_then(|report| {
            print(&report, with_certificate);
            let again = Instant::now();
            recheck_imprimitive(&space, &report.certificate, Some(options.stabiliser_limit))
                .map(|()| again)
        })
    } else {
        analyse(&space, &StructureOptions::default()).and_then(|report| {
            print(&report, with_certificate);
            let again = Instant::now();
            recheck(&space, &report.certificate).map(|()| again)
        })
    };
    match outcome {
        Ok(again) => eprintln!("recheck ok in {:.2}s", again.elapsed().as_secs_f64()),
        Err(e) => {
            eprintln!("{e}");
            std::process::exit(1);
        }
    }
}

/// The report as JSON on stdout, its certificate left out unless asked for.
fn print<T: serde::Serialize>(report: &T, with_certificate: bool) {
    let mut value = serde_json::to_value(report).expect("reports serialise");
    if !with_certificate {
        value["certificate"] = serde_json::Value::Null;
    }
    println!(
        "{}",
        serde_json::to_string_pretty(&value).expect("values serialise")
    );
}
