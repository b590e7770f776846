//! `spreadplan threshold`: the percolation curve of a network over the
//! transmissibility and its critical value by three methods side by side
//! (Newman–Ziff sweep, message passing, configuration model). The study is
//! built by `spreadplan::percolation::threshold_study`; this file owns the
//! flags and the terminal table.

use std::path::PathBuf;

use anyhow::Context;
use serde_json::Value;
use spreadplan::network::load::EdgeListOptions;
use spreadplan::outcome::{Metric, Study};
use spreadplan::percolation::{threshold_study, ThresholdConfig};
use spreadplan::stats::Estimate;

use super::common::{Format, OutputOpts, RunOpts};

/// Arguments of `spreadplan threshold`.
#[derive(Debug, clap::Args)]
pub(crate) struct Args {
    /// Contact network edge list (CSV/TSV/whitespace, optional header, .gz)
    pub(crate) network: PathBuf,
    /// Site percolation: sweep the share of people susceptible (every contact transmits)
    #[arg(long)]
    pub(crate) site: bool,
    /// Treat the edge list as directed (who can infect whom)
    #[arg(long)]
    pub(crate) directed: bool,
    /// Points of the curve, evenly spaced over [0, 1] (at least 2)
    #[arg(long, default_value_t = 21)]
    pub(crate) points: usize,
    /// Relative tolerance of the message-passing eigenvalue
    #[arg(long, default_value_t = 1e-6)]
    pub(crate) tolerance: f64,
    /// Introduced cases followed per realization on directed networks
    #[arg(long, default_value_t = 16)]
    pub(crate) cases: u32,
    #[command(flatten)]
    pub(crate) run: RunOpts,
    #[command(flatten)]
    pub(crate) output: OutputOpts,
}

pub(crate) fn run(args: Args) -> anyhow::Result<()> {
    super::common::init_threads(args.run.threads)?;
    anyhow::ensure!(args.run.runs >= 1, "--runs must be at least 1, got {}", args.run.runs);
    anyhow::ensure!(args.points >= 2, "--points must be at least 2, got {}", args.points);
    anyhow::ensure!(
        args.tolerance > 0.0 && args.tolerance < 1.0,
        "--tolerance must be in (0, 1), got {}",
        args.tolerance
    );
    anyhow::ensure!(
        !(args.site && args.directed),
        "--site is not available with --directed; drop one of them"
    );
    let opts = EdgeListOptions { directed: args.directed, ..Default::default() };
    let loaded = super::common::load_network(&args.network, &opts)?;
    anyhow::ensure!(
        loaded.network.node_count() > 0,
        "{}: the network has no nodes",
        args.network.display()
    );
    let cfg = ThresholdConfig {
        site: args.site,
        runs: args.run.runs,
        seed: args.run.seed,
        points: args.points,
        tolerance: args.tolerance,
        cases: args.cases,
    };
    let progress = super::progress::for_cli(args.output.quiet);
    let study = threshold_study(&loaded, &cfg, progress.as_ref())
        .context("cannot compute the threshold study")?;
    drop(progress);

    if args.output.format == Format::Table {
        let rule = if loaded.network.is_directed() {
            "directed"
        } else if args.site {
            "site"
        } else {
            "bond"
        };
        let quantity = if args.site { "occupation" } else { "transmissibility" };
        print!("{}", table(&study, rule, quantity));
        if let Some(dir) = &args.output.out {
            let written = spreadplan::report::write_outputs(dir, &study)
                .with_context(|| format!("cannot write outputs to {}", dir.display()))?;
            if !args.output.quiet {
                eprintln!("wrote {} files to {}", written.len(), dir.display());
            }
        }
        Ok(())
    } else {
        super::common::emit(&study, &args.output)
    }
}

/// The terminal view: critical values by method, then the curve.
fn table(study: &Study, rule: &str, quantity: &str) -> String {
    use spreadplan::report::table::{align, cell};
    let mut out = String::new();
    let i = &study.input;
    out.push_str(&format!(
        "network {} ({} nodes, {} edges{}), {} percolation\n",
        i["network"].as_str().unwrap_or(""),
        i["nodes"],
        i["edges"],
        if rule == "directed" { ", directed" } else { "" },
        if rule == "site" { "site" } else { "bond" }
    ));
    let c = &study.extra["critical_transmissibility"];
    let num = |v: &Value| v.as_f64().map_or("–".to_owned(), |x| cell(&Metric::Number(x)));
    let mut rows = vec![vec![format!("critical {quantity}"), "value".into(), "method".into()]];
    if let Some(nz) = c.get("newman_ziff").filter(|v| !v.is_null()) {
        let e = Estimate {
            mean: nz["mean"].as_f64().unwrap_or(f64::NAN),
            ci_low: nz["ci_low"].as_f64().unwrap_or(f64::NAN),
            ci_high: nz["ci_high"].as_f64().unwrap_or(f64::NAN),
        };
        rows.push(vec![
            "newman_ziff".into(),
            cell(&Metric::Estimate(e)),
            "peak of the non-giant cluster size (Monte Carlo)".into(),
        ]);
    }
    if let Some(mp) = c.get("message_passing").filter(|v| !v.is_null()) {
        rows.push(vec![
            "message_passing".into(),
            format!("{} [{}, {}]", num(&mp["estimate"]), num(&mp["lower"]), num(&mp["upper"])),
            "1/λ non-backtracking (certified bounds)".into(),
        ]);
    }
    rows.push(vec![
        "configuration_model".into(),
        num(&c["configuration_model"]),
        "degree sequence only".into(),
    ]);
    out.push_str(&align(&rows));
    out.push('\n');
    let metrics = ["giant_fraction", "mean_outbreak_fraction", "outbreak_probability"];
    let mut rows = vec![{
        let mut h = vec![quantity.to_owned()];
        h.extend(metrics.iter().map(|s| s.to_string()));
        h
    }];
    if let Some(Value::Array(pts)) = study.extra.get("curve") {
        for p in pts {
            let mut row = vec![num(&p[quantity])];
            for m in metrics {
                let v = &p[m];
                let e = Estimate {
                    mean: v["mean"].as_f64().unwrap_or(f64::NAN),
                    ci_low: v["ci_low"].as_f64().unwrap_or(f64::NAN),
                    ci_high: v["ci_high"].as_f64().unwrap_or(f64::NAN),
                };
                row.push(cell(&Metric::Estimate(e)));
            }
            rows.push(row);
        }
    }
    out.push_str(&align(&rows));
    for n in &study.notes {
        out.push_str(&format!("note: {n}\n"));
    }
    out
}
