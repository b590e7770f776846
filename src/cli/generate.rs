//! `spreadplan generate MODEL [params] -o FILE`: build a network from one of
//! the generators in `network::generate` and write it as an edge list.

use std::io::Write;
use std::path::{Path, PathBuf};

use anyhow::{bail, ensure, Context};
use clap::{Args as ClapArgs, Subcommand};
use spreadplan::degree::DegreeDistribution;
use spreadplan::network::generate::{self as g, TownConfig};
use spreadplan::network::load::write_edge_list;
use spreadplan::network::{BuildReport, Network, NodeTable};

use super::common::DEFAULT_SEED;

const AFTER_HELP: &str = "\
Writes `source,target` CSV (gzip when FILE ends in .gz) and prints a one-line
summary (nodes, edges, erased self-loops and multi-edges) to stderr. The same
model, parameters and seed always give the same file. `spreadplan generate
MODEL --help` lists a model's parameters.

Examples:
  spreadplan generate gnp --n 1000000 --mean-degree 5 -o er.csv.gz
  spreadplan generate regular --n 10000 --k 4 -o reg.csv --seed 7
  spreadplan generate sbm --sizes 500,500 --probs '0.02,0.001;0.001,0.02' -o sbm.csv --nodes-out sbm-nodes.csv
  spreadplan generate town --people 20000 -o town.csv --nodes-out town-nodes.csv";

/// Arguments of `spreadplan generate`.
#[derive(Debug, ClapArgs)]
#[command(after_help = AFTER_HELP)]
pub(crate) struct Args {
    #[command(subcommand)]
    model: Model,
    /// Edge-list file to write (`.gz` for gzip)
    #[arg(short = 'o', long = "output", global = true, value_name = "FILE")]
    output: Option<PathBuf>,
    /// Master seed
    #[arg(long, global = true, default_value_t = DEFAULT_SEED)]
    seed: u64,
    /// Also write the node table `id,group` (town and sbm)
    #[arg(long, global = true, value_name = "FILE")]
    nodes_out: Option<PathBuf>,
}

#[derive(Debug, Subcommand)]
enum Model {
    /// Erdős–Rényi G(n, p): each pair joined independently with probability p
    Gnp {
        /// Number of nodes
        #[arg(long)]
        n: u32,
        /// Edge probability
        #[arg(long, conflicts_with = "mean_degree", required_unless_present = "mean_degree")]
        p: Option<f64>,
        /// Mean degree c, i.e. p = c / (n − 1)
        #[arg(long)]
        mean_degree: Option<f64>,
    },
    /// Erdős–Rényi G(n, m): exactly m edges, uniformly at random
    Gnm {
        /// Number of nodes
        #[arg(long)]
        n: u32,
        /// Number of edges
        #[arg(long)]
        m: u64,
    },
    /// Configuration model (stub pairing, self-loops and multi-edges erased)
    Configuration {
        /// Degree file: one degree per line (node order), or `degree,count` rows
        #[arg(long, value_name = "FILE", required_unless_present = "degree_model")]
        degrees_file: Option<PathBuf>,
        /// Degree model spec (`poisson:mean=6`, `powerlaw:exponent=2.5,min=2,max=300`, …)
        /// or a `degree,probability` file, sampled i.i.d. for --n nodes
        #[arg(long, value_name = "SPEC", conflicts_with = "degrees_file", requires = "n")]
        degree_model: Option<String>,
        /// Number of nodes (with --degree-model)
        #[arg(long)]
        n: Option<u32>,
    },
    /// Chung–Lu: pair {u, v} joined with probability min(1, w_u w_v / Σw)
    ChungLu {
        /// Expected degrees: one number per line (node order)
        #[arg(long, value_name = "FILE", required_unless_present = "degree_model")]
        weights_file: Option<PathBuf>,
        /// Degree model spec or `degree,probability` file whose samples are the
        /// expected degrees of --n nodes
        #[arg(long, value_name = "SPEC", conflicts_with = "weights_file", requires = "n")]
        degree_model: Option<String>,
        /// Number of nodes (with --degree-model)
        #[arg(long)]
        n: Option<u32>,
    },
    /// Random k-regular graph: every node has degree exactly k
    Regular {
        /// Number of nodes
        #[arg(long)]
        n: u32,
        /// Degree of every node
        #[arg(long)]
        k: u32,
    },
    /// Square lattice side × side (4 neighbours)
    Square {
        /// Nodes per side
        #[arg(long)]
        side: u32,
        /// Wrap into a torus
        #[arg(long)]
        periodic: bool,
    },
    /// Triangular lattice side × side (6 neighbours)
    Triangular {
        /// Nodes per side
        #[arg(long)]
        side: u32,
        /// Wrap into a torus
        #[arg(long)]
        periodic: bool,
    },
    /// Stochastic block model; groups are block0, block1, …
    Sbm {
        /// Block sizes, e.g. `100,200`
        #[arg(long, value_delimiter = ',', required = true)]
        sizes: Vec<u32>,
        /// Symmetric probability matrix, rows split by `;`, e.g. `0.1,0.01;0.01,0.2`
        #[arg(long)]
        probs: String,
    },
    /// Barabási–Albert preferential attachment, m edges per new node
    Ba {
        /// Number of nodes
        #[arg(long)]
        n: u32,
        /// Edges brought by each new node
        #[arg(long)]
        m: u32,
    },
    /// Watts–Strogatz small world: ring of k neighbours, rewiring probability beta
    Ws {
        /// Number of nodes
        #[arg(long)]
        n: u32,
        /// Neighbours per node on the ring (even)
        #[arg(long)]
        k: u32,
        /// Rewiring probability
        #[arg(long)]
        beta: f64,
    },
    /// Invented household–classroom–workplace–care-home town with groups
    /// child, adult, elder, care-home resident, care worker
    Town {
        /// Number of people (overrides the config file)
        #[arg(long)]
        people: Option<u32>,
        /// TOML file with any fields of the town config (sizes, contact probabilities)
        #[arg(long, value_name = "FILE")]
        config: Option<PathBuf>,
    },
}

struct Generated {
    network: Network,
    nodes: Option<NodeTable>,
    erased: BuildReport,
    note: String,
}

impl From<Network> for Generated {
    fn from(network: Network) -> Self {
        Generated { network, nodes: None, erased: BuildReport::default(), note: String::new() }
    }
}

pub(crate) fn run(args: Args) -> anyhow::Result<()> {
    let Some(output) = args.output.clone() else {
        bail!("missing -o FILE: where to write the edge list");
    };
    let seed = args.seed;
    let name = model_name(&args.model);
    let gen = build(args.model, seed)?;
    let nodes = match &gen.nodes {
        Some(t) => t.clone(),
        None => NodeTable::numbered(gen.network.node_count()),
    };
    write_file(&output, |w| write_edge_list(w, &gen.network, &nodes))
        .with_context(|| format!("writing {}", output.display()))?;
    if let Some(path) = &args.nodes_out {
        ensure!(
            gen.nodes.is_some(),
            "--nodes-out: model {name} has no node groups (use town or sbm)"
        );
        write_file(path, |w| write_nodes(w, &nodes))
            .with_context(|| format!("writing {}", path.display()))?;
    }
    eprintln!(
        "{name}: {} nodes, {} edges, {} self-loops and {} multi-edges erased{} (seed {seed}) -> {}",
        gen.network.node_count(),
        gen.network.edge_count(),
        gen.erased.self_loops_dropped,
        gen.erased.duplicates_merged,
        gen.note,
        output.display()
    );
    Ok(())
}

fn model_name(m: &Model) -> &'static str {
    match m {
        Model::Gnp { .. } => "gnp",
        Model::Gnm { .. } => "gnm",
        Model::Configuration { .. } => "configuration",
        Model::ChungLu { .. } => "chung-lu",
        Model::Regular { .. } => "regular",
        Model::Square { .. } => "square",
        Model::Triangular { .. } => "triangular",
        Model::Sbm { .. } => "sbm",
        Model::Ba { .. } => "ba",
        Model::Ws { .. } => "ws",
        Model::Town { .. } => "town",
    }
}

fn build(model: Model, seed: u64) -> anyhow::Result<Generated> {
    Ok(match model {
        Model::Gnp { n, p, mean_degree } => {
            let p = match (p, mean_degree) {
                (Some(p), _) => p,
                (None, Some(c)) => {
                    ensure!(
                        c.is_finite() && c >= 0.0,
                        "--mean-degree must be non-negative, got {c}"
                    );
                    ensure!(n >= 2 || c == 0.0, "--mean-degree needs --n of at least 2, got {n}");
                    if n >= 2 {
                        c / (n as f64 - 1.0)
                    } else {
                        0.0
                    }
                }
                (None, None) => bail!("gnp needs --p or --mean-degree"),
            };
            g::gnp(n, p, seed)?.into()
        }
        Model::Gnm { n, m } => g::gnm(n, m, seed)?.into(),
        Model::Configuration { degrees_file, degree_model, n } => {
            let degrees = match (degrees_file, degree_model) {
                (Some(f), _) => read_degrees(&f)?,
                (None, Some(spec)) => sample_degrees(&spec, n.unwrap_or(0), seed)?,
                (None, None) => bail!("configuration needs --degrees-file or --degree-model"),
            };
            let e = g::configuration_model(&degrees, seed)?;
            Generated { network: e.network, nodes: None, erased: e.report, note: String::new() }
        }
        Model::ChungLu { weights_file, degree_model, n } => {
            let w: Vec<f64> = match (weights_file, degree_model) {
                (Some(f), _) => read_numbers(&f)?,
                (None, Some(spec)) => sample_degrees(&spec, n.unwrap_or(0), seed)?
                    .into_iter()
                    .map(f64::from)
                    .collect(),
                (None, None) => bail!("chung-lu needs --weights-file or --degree-model"),
            };
            g::chung_lu(&w, seed)?.into()
        }
        Model::Regular { n, k } => g::random_regular(n, k, seed)?.into(),
        Model::Square { side, periodic } => g::square_lattice(side, periodic)?.into(),
        Model::Triangular { side, periodic } => g::triangular_lattice(side, periodic)?.into(),
        Model::Sbm { sizes, probs } => {
            let m = parse_matrix(&probs)?;
            let b = g::stochastic_block_model(&sizes, &m, seed)?;
            Generated {
                network: b.network,
                nodes: Some(b.nodes),
                erased: BuildReport::default(),
                note: String::new(),
            }
        }
        Model::Ba { n, m } => g::barabasi_albert(n, m, seed)?.into(),
        Model::Ws { n, k, beta } => g::watts_strogatz(n, k, beta, seed)?.into(),
        Model::Town { people, config } => {
            let mut cfg = match config {
                Some(f) => {
                    let text = std::fs::read_to_string(&f)
                        .with_context(|| format!("reading {}", f.display()))?;
                    toml::from_str::<TownConfig>(&text)
                        .with_context(|| format!("{}: bad town config", f.display()))?
                }
                None => TownConfig::default(),
            };
            if let Some(p) = people {
                cfg.people = p;
            }
            let t = g::town(&cfg, seed)?;
            // Contacts shared by two settings are one contact, not an erasure.
            let [h, c, w, ch] = t.settings;
            let note = format!(
                "; {h} households, {c} classrooms, {w} workplaces, {ch} care homes, \
                 {} contacts shared by two settings merged",
                t.report.duplicates_merged
            );
            Generated {
                network: t.network,
                nodes: Some(t.nodes),
                erased: BuildReport::default(),
                note,
            }
        }
    })
}

/// Degrees for `n` nodes drawn i.i.d. from a degree-model spec, or from a
/// `degree,count|probability` table when SPEC names an existing file.
/// Realization 1 of the generate stream, so the draws are independent of the
/// pairing (realization 0).
fn sample_degrees(spec: &str, n: u32, seed: u64) -> anyhow::Result<Vec<u32>> {
    let path = Path::new(spec);
    let dist = if path.is_file() {
        DegreeDistribution::from_csv_path(path)?
    } else {
        DegreeDistribution::from_spec(spec)?
    };
    Ok(dist.sample_degrees_in(n as usize, seed, 1))
}

/// Reads non-empty, non-`#` lines of `path`, skipping a non-numeric first line (a header).
fn data_lines(path: &Path) -> anyhow::Result<Vec<(usize, Vec<String>)>> {
    let text =
        std::fs::read_to_string(path).with_context(|| format!("reading {}", path.display()))?;
    let mut out = Vec::new();
    for (i, line) in text.lines().enumerate() {
        let line = line.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        let fields: Vec<String> = line
            .split(|c: char| c == ',' || c == '\t' || c == ';' || c.is_whitespace())
            .filter(|f| !f.is_empty())
            .map(str::to_owned)
            .collect();
        if out.is_empty() && fields[0].parse::<f64>().is_err() {
            continue; // header
        }
        out.push((i + 1, fields));
    }
    ensure!(!out.is_empty(), "{}: no data lines", path.display());
    Ok(out)
}

/// A degree sequence: one degree per line, or `degree,count` rows expanded.
fn read_degrees(path: &Path) -> anyhow::Result<Vec<u32>> {
    let mut out = Vec::new();
    let lines = data_lines(path)?;
    let two = lines[0].1.len() >= 2;
    for (line, f) in lines {
        let num = |s: &str, what: &str| -> anyhow::Result<u32> {
            s.parse::<u32>().map_err(|_| {
                anyhow::anyhow!(
                    "{}:{line}: {what} {s:?} is not a non-negative integer",
                    path.display()
                )
            })
        };
        ensure!(
            f.len() == if two { 2 } else { 1 },
            "{}:{line}: expected {} column(s), found {}",
            path.display(),
            if two { 2 } else { 1 },
            f.len()
        );
        let d = num(&f[0], "degree")?;
        let c = if two { num(&f[1], "count")? } else { 1 };
        ensure!(
            out.len() as u64 + c as u64 <= u32::MAX as u64,
            "{}:{line}: more than 4294967295 nodes",
            path.display()
        );
        out.extend(std::iter::repeat_n(d, c as usize));
    }
    Ok(out)
}

/// One non-negative number per line.
fn read_numbers(path: &Path) -> anyhow::Result<Vec<f64>> {
    data_lines(path)?
        .into_iter()
        .map(|(line, f)| {
            ensure!(
                f.len() == 1,
                "{}:{line}: expected 1 column, found {}",
                path.display(),
                f.len()
            );
            match f[0].parse::<f64>() {
                Ok(x) if x.is_finite() && x >= 0.0 => Ok(x),
                _ => bail!("{}:{line}: {:?} is not a non-negative number", path.display(), f[0]),
            }
        })
        .collect()
}

/// `a,b;c,d` → rows.
fn parse_matrix(s: &str) -> anyhow::Result<Vec<Vec<f64>>> {
    s.split(';')
        .map(|row| {
            row.split(',')
                .map(|x| {
                    x.trim()
                        .parse::<f64>()
                        .map_err(|_| anyhow::anyhow!("--probs: {x:?} is not a number"))
                })
                .collect()
        })
        .collect()
}

fn write_nodes<W: Write>(out: W, nodes: &NodeTable) -> std::io::Result<()> {
    let mut w = std::io::BufWriter::new(out);
    writeln!(w, "id,group")?;
    for v in 0..nodes.len() as u32 {
        writeln!(w, "{},{}", nodes.id(v), nodes.group_of(v).unwrap_or(""))?;
    }
    w.flush()
}

/// Writes through a temporary file renamed into place; gzip for `.gz`.
fn write_file(
    path: &Path,
    body: impl FnOnce(&mut dyn Write) -> std::io::Result<()>,
) -> anyhow::Result<()> {
    let mut tmp = path.as_os_str().to_owned();
    tmp.push(".part");
    let tmp = PathBuf::from(tmp);
    let f = std::fs::File::create(&tmp)?;
    if path.extension().is_some_and(|e| e == "gz") {
        let mut gz = flate2::write::GzEncoder::new(f, flate2::Compression::fast());
        body(&mut gz)?;
        gz.finish()?.sync_all()?;
    } else {
        let mut f = f;
        body(&mut f)?;
        f.sync_all()?;
    }
    std::fs::rename(&tmp, path)?;
    Ok(())
}
