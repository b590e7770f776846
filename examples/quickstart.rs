//! Quickstart: load a small edge list, rank immunization rules with 10
//! doses, and write the ranking, curves and report.
//!
//! `cargo run --example quickstart [EDGES.csv] [OUT_DIR]` (defaults: the
//! karate-club fixture in `tests/data/` and `quickstart-out/`).

use std::path::PathBuf;

use spreadplan::immunize::{rank_network, Budget, ImmunizeConfig};
use spreadplan::network::load::{load_edge_list, EdgeListOptions};
use spreadplan::progress::Silent;
use spreadplan::report;

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let mut args = std::env::args().skip(1);
    let edges = args
        .next()
        .map(PathBuf::from)
        .unwrap_or_else(|| PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/data/karate.csv"));
    let out = args.next().map(PathBuf::from).unwrap_or_else(|| "quickstart-out".into());

    let loaded = load_edge_list(&edges, &EdgeListOptions::default())?;
    let mut cfg = ImmunizeConfig::new(Budget::Amount(10.0), 0.4);
    cfg.rules = vec!["random".into(), "degree".into(), "corehd".into()];
    cfg.runs = 200;
    let study = rank_network(&loaded, &cfg, &Silent)?;

    #[allow(clippy::print_stdout)]
    {
        print!("{}", report::table::render(&study));
        for p in report::write_outputs(&out, &study)? {
            println!("wrote {}", p.display());
        }
    }
    Ok(())
}
