//! Reading edge lists and node tables from files; writing edge lists.
//!
//! The only module besides `report` that touches files. Errors name the
//! file, the line and the reason.

use std::io::{self, BufRead, BufReader, Read, Write};
use std::path::{Path, PathBuf};

use serde::Serialize;

use super::{Network, NodeTable, WeightMerge};

/// Options for reading an edge list.
#[derive(Clone, Debug, Default)]
pub struct EdgeListOptions {
    /// Treat `source,target` as a directed edge.
    pub directed: bool,
    /// Header name (or 1-based column number) of the weight column.
    pub weight_column: Option<String>,
    /// How weights of duplicate edges combine.
    pub merge: WeightMerge,
}

/// What a load read, dropped and merged.
#[derive(Clone, Debug, Default, PartialEq, Serialize)]
pub struct LoadReport {
    /// The file read.
    pub path: String,
    /// Lines read, including comments and the header.
    pub lines: u64,
    /// Edge rows read.
    pub rows: u64,
    /// Self-loops dropped.
    pub self_loops_dropped: u64,
    /// Duplicate edges merged.
    pub duplicates_merged: u64,
    /// FNV-1a 64-bit hash of the file's bytes, hex.
    pub content_hash: String,
}

/// A loaded network with its ids and what loading did.
#[derive(Clone, Debug)]
pub struct Loaded {
    /// The network.
    pub network: Network,
    /// External ids (and attributes once a node table is read).
    pub nodes: NodeTable,
    /// Counts and hash of the input.
    pub report: LoadReport,
}

/// Why a file could not be read.
#[derive(Debug, thiserror::Error)]
pub enum LoadError {
    /// The file could not be opened or read.
    #[error("{path}: {source}")]
    Io {
        /// The file.
        path: PathBuf,
        /// The cause.
        source: io::Error,
    },
    /// A line is malformed.
    #[error("{path}:{line}: {msg}")]
    Parse {
        /// The file.
        path: PathBuf,
        /// 1-based line number.
        line: u64,
        /// What is wrong, showing the bad value.
        msg: String,
    },
    /// A whole-file problem (empty, too large, ids missing from the network).
    #[error("{path}: {msg}")]
    Invalid {
        /// The file.
        path: PathBuf,
        /// What is wrong.
        msg: String,
    },
}

/// Opens a file, decompressing `.gz` by extension.
pub fn open(path: &Path) -> Result<Box<dyn BufRead>, LoadError> {
    let f = std::fs::File::open(path)
        .map_err(|source| LoadError::Io { path: path.to_owned(), source })?;
    let r: Box<dyn Read> = if path.extension().is_some_and(|e| e == "gz") {
        Box::new(flate2::read::MultiGzDecoder::new(f))
    } else {
        Box::new(f)
    };
    Ok(Box::new(BufReader::with_capacity(1 << 20, r)))
}

/// Reads an edge list (CSV, TSV or whitespace separated; optional header;
/// `#` comments; `.gz`).
pub fn load_edge_list(path: &Path, opts: &EdgeListOptions) -> Result<Loaded, LoadError> {
    let mut reader = open(path)?;
    let perr = |line: u64, msg: String| LoadError::Parse { path: path.to_owned(), line, msg };
    let mut nodes = NodeTable::default();
    let mut edges: Vec<(u32, u32)> = Vec::new();
    let mut weights: Vec<f32> = Vec::new();
    let mut hasher = Fnv::default();
    let mut report = LoadReport { path: path.display().to_string(), ..Default::default() };
    let mut buf = String::new();
    let mut weight_idx: Option<usize> = None;
    let mut seen_first = false;
    loop {
        buf.clear();
        let got = reader
            .read_line(&mut buf)
            .map_err(|source| LoadError::Io { path: path.to_owned(), source })?;
        if got == 0 {
            break;
        }
        hasher.write(buf.as_bytes());
        report.lines += 1;
        let line = buf.trim();
        if line.is_empty() || line.starts_with('#') {
            continue;
        }
        let fields: Vec<&str> = split_fields(line);
        if !seen_first {
            seen_first = true;
            let header = looks_like_header(&fields, opts.weight_column.as_deref());
            weight_idx = match &opts.weight_column {
                None => None,
                Some(name) => {
                    Some(resolve_column(name, header.then_some(&fields[..])).ok_or_else(|| {
                        perr(report.lines, format!("no weight column named {name:?}"))
                    })?)
                }
            };
            if header {
                continue;
            }
        }
        if fields.len() < 2 {
            return Err(perr(
                report.lines,
                format!("expected at least 2 columns, found {}", fields.len()),
            ));
        }
        let u = nodes.intern(fields[0]);
        let v = nodes.intern(fields[1]);
        if let Some(wi) = weight_idx {
            let raw = fields.get(wi).ok_or_else(|| {
                perr(report.lines, format!("missing weight column {} ", wi + 1).trim().to_owned())
            })?;
            let w: f32 = raw
                .parse()
                .map_err(|_| perr(report.lines, format!("weight {raw:?} is not a number")))?;
            if !w.is_finite() || w < 0.0 {
                return Err(perr(report.lines, format!("weight {raw:?} must be finite and >= 0")));
            }
            weights.push(w);
        }
        edges.push((u, v));
        report.rows += 1;
    }
    if report.rows == 0 {
        return Err(LoadError::Invalid { path: path.to_owned(), msg: "no edges found".into() });
    }
    report.content_hash = format!("{:016x}", hasher.0);
    let n = u32::try_from(nodes.len()).map_err(|_| LoadError::Invalid {
        path: path.to_owned(),
        msg: "more than 4294967295 nodes".into(),
    })?;
    let w = weight_idx.map(|_| weights);
    let (network, built) = Network::from_edges(n, opts.directed, edges, w, opts.merge)
        .map_err(|e| LoadError::Invalid { path: path.to_owned(), msg: e.to_string() })?;
    report.self_loops_dropped = built.self_loops_dropped;
    report.duplicates_merged = built.duplicates_merged;
    Ok(Loaded { network, nodes, report })
}

/// Writes an edge list as CSV with a `source,target[,weight]` header, using
/// the external ids of `nodes`.
pub fn write_edge_list<W: Write>(out: W, net: &Network, nodes: &NodeTable) -> io::Result<()> {
    let mut w = io::BufWriter::new(out);
    match net.weights() {
        Some(_) => writeln!(w, "source,target,weight")?,
        None => writeln!(w, "source,target")?,
    }
    for (i, e) in net.edges().iter().enumerate() {
        write!(w, "{},{}", nodes.id(e[0]), nodes.id(e[1]))?;
        if let Some(ws) = net.weights() {
            write!(w, ",{}", ws[i])?;
        }
        writeln!(w)?;
    }
    w.flush()
}

fn split_fields(line: &str) -> Vec<&str> {
    if line.contains('\t') {
        line.split('\t').map(str::trim).collect()
    } else if line.contains(',') {
        line.split(',').map(str::trim).collect()
    } else if line.contains(';') {
        line.split(';').map(str::trim).collect()
    } else {
        line.split_whitespace().collect()
    }
}

fn looks_like_header(fields: &[&str], weight_column: Option<&str>) -> bool {
    const NAMES: [&str; 12] =
        ["source", "target", "from", "to", "src", "dst", "u", "v", "node1", "node2", "i", "j"];
    let named = fields.len() >= 2
        && NAMES.contains(&fields[0].to_ascii_lowercase().as_str())
        && NAMES.contains(&fields[1].to_ascii_lowercase().as_str());
    named || weight_column.is_some_and(|w| fields.iter().skip(2).any(|f| *f == w))
}

fn resolve_column(name: &str, header: Option<&[&str]>) -> Option<usize> {
    if let Some(h) = header {
        if let Some(i) = h.iter().position(|f| *f == name) {
            return Some(i);
        }
    }
    name.parse::<usize>().ok().filter(|&c| c >= 1).map(|c| c - 1)
}

/// FNV-1a, 64 bit (Fowler, Noll & Vo): a content fingerprint, not security.
#[derive(Clone, Copy, Debug)]
pub struct Fnv(pub u64);

impl Default for Fnv {
    fn default() -> Self {
        Fnv(0xcbf2_9ce4_8422_2325)
    }
}

impl Fnv {
    /// Mixes bytes into the hash.
    pub fn write(&mut self, bytes: &[u8]) {
        for &b in bytes {
            self.0 ^= b as u64;
            self.0 = self.0.wrapping_mul(0x0000_0100_0000_01b3);
        }
    }
}
