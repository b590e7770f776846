//! `spreadplan inspect`: load a network (and optionally a node table), print
//! its structural summary as a table or JSON. The numbers come from
//! `network::inspect::summarize`; this file only loads and prints.

use std::io::Write;
use std::path::PathBuf;

use anyhow::Context;
use serde::Serialize;
use spreadplan::network::inspect::{summarize, Summary};
use spreadplan::network::load::{load_node_table, EdgeListOptions, LoadReport, NodeTableReport};
use spreadplan::network::WeightMerge;

/// Arguments of `spreadplan inspect`.
#[derive(Debug, clap::Args)]
pub(crate) struct Args {
    /// Contact network edge list (CSV/TSV/whitespace, optional header, # comments, .gz)
    pub(crate) network: PathBuf,
    /// Node table: id plus optional group, cost, uptake, immune
    #[arg(long)]
    pub(crate) nodes: Option<PathBuf>,
    /// Treat the edge list as directed
    #[arg(long)]
    pub(crate) directed: bool,
    /// Weight column: header name or 1-based column number
    #[arg(long)]
    pub(crate) weight_column: Option<String>,
    /// How weights of duplicate edges combine: max, sum, first or noisy-or
    #[arg(long, default_value = "max", value_parser = parse_merge)]
    pub(crate) merge_weights: WeightMerge,
    /// Output format on stdout
    #[arg(long, value_enum, default_value_t = Format::Table)]
    pub(crate) format: Format,
}

/// Output formats of `inspect`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub(crate) enum Format {
    /// A readable table.
    Table,
    /// One JSON object.
    Json,
}

fn parse_merge(s: &str) -> Result<WeightMerge, String> {
    s.parse()
}

/// What `inspect --format json` prints: the summary keys at top level,
/// then what loading read.
#[derive(Serialize)]
struct Report<'a> {
    tool: &'static str,
    version: &'static str,
    command: &'static str,
    #[serde(flatten)]
    summary: &'a Summary,
    load: &'a LoadReport,
    #[serde(skip_serializing_if = "Option::is_none")]
    node_table: Option<&'a NodeTableReport>,
}

pub(crate) fn run(args: Args) -> anyhow::Result<()> {
    let opts = EdgeListOptions {
        directed: args.directed,
        weight_column: args.weight_column.clone(),
        merge: args.merge_weights,
    };
    let mut loaded = super::load_network(&args.network, &opts)?;
    let table = match &args.nodes {
        Some(p) => Some(
            load_node_table(p, &mut loaded)
                .with_context(|| format!("cannot load node table {}", p.display()))?,
        ),
        None => None,
    };
    let summary = summarize(&loaded.network).with_load(&loaded.report);
    let text = match args.format {
        Format::Json => {
            let r = Report {
                tool: spreadplan::TOOL,
                version: spreadplan::VERSION,
                command: "inspect",
                summary: &summary,
                load: &loaded.report,
                node_table: table.as_ref(),
            };
            serde_json::to_string_pretty(&r)? + "\n"
        }
        Format::Table => render(&summary, &loaded.report, table.as_ref()),
    };
    let mut out = std::io::stdout().lock();
    out.write_all(text.as_bytes())?;
    out.flush()?;
    Ok(())
}

fn opt(x: Option<f64>) -> String {
    x.map_or_else(|| "undefined".to_owned(), |v| format!("{v:.6}"))
}

fn render(s: &Summary, load: &LoadReport, table: Option<&NodeTableReport>) -> String {
    let mut rows: Vec<(&str, String)> = vec![
        ("file", load.path.clone()),
        ("content hash (fnv-1a)", load.content_hash.clone()),
        (
            "delimiter / header",
            format!("{} / {}", load.delimiter, if load.header { "yes" } else { "no" }),
        ),
        ("directed", s.directed.to_string()),
        ("nodes", s.nodes.to_string()),
        ("edges", s.edges.to_string()),
        ("self-loops dropped", s.self_loops_dropped.to_string()),
        ("duplicates merged", s.duplicates_merged.to_string()),
        ("mean degree <k>", format!("{:.6}", s.mean_degree)),
        ("mean squared degree <k^2>", format!("{:.6}", s.mean_sq_degree)),
        ("max degree", s.max_degree.to_string()),
        ("mean excess degree kappa", format!("{:.6}", s.mean_excess_degree)),
        (if s.directed { "weak components" } else { "components" }, s.components.to_string()),
        ("largest component", s.largest_component.to_string()),
        ("second largest component", s.second_largest_component.to_string()),
    ];
    if let (Some(c), Some(l), Some(l2)) =
        (s.strong_components, s.largest_strong_component, s.second_largest_strong_component)
    {
        rows.push(("strong components", c.to_string()));
        rows.push(("largest strong component", l.to_string()));
        rows.push(("second largest strong component", l2.to_string()));
    }
    rows.extend([
        ("triangles", s.triangles.to_string()),
        ("clustering (transitivity)", opt(s.clustering)),
        ("degree assortativity", opt(s.assortativity)),
        ("max core", s.max_core.to_string()),
        ("threshold estimate 1/kappa", opt(s.threshold_estimate)),
    ]);
    if let Some(t) = table {
        rows.push(("node table rows", t.rows.to_string()));
        rows.push(("node table columns", t.columns.join(", ")));
        rows.push(("nodes not in node table", t.unlisted.to_string()));
    }
    let w = rows.iter().map(|(k, _)| k.len()).max().unwrap_or(0);
    let mut out = String::new();
    for (k, v) in rows {
        out.push_str(&format!("{k:<w$}  {v}\n"));
    }
    out
}
