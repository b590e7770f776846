//! Reading edge lists and node tables from files; writing edge lists.
//!
//! The only module besides `report` that touches files. Errors name the
//! file, the line and the reason, showing the bad value.
//!
//! # Edge lists
//! - One edge per line: `source<sep>target[<sep>more columns…]`. Node ids
//!   are arbitrary strings (surrounding spaces and one pair of double quotes
//!   are stripped; a delimiter inside quotes is not supported).
//! - The separator is detected once, from the first non-comment line: a tab
//!   if it holds one, else a comma, else a semicolon, else runs of spaces and
//!   tabs.
//! - Lines that are empty or whose first non-blank character is `#` are
//!   skipped. A UTF-8 byte-order mark is skipped; `\r\n` endings are fine.
//! - The first non-comment line is a header when its first two fields are
//!   both common column names (`source`/`target`, `from`/`to`, `src`/`dst`,
//!   `u`/`v`, `i`/`j`, `node1`/`node2`, `id1`/`id2`, `a`/`b` are not
//!   included), case-insensitive, or when it holds the `--weight-column`
//!   name.
//! - Gzip is detected from the `.gz` extension or the gzip magic bytes.
//! - `weight_column` is a header name or a 1-based column number; weights
//!   must be finite and ≥ 0 and are stored as `f32`. Extra columns are
//!   ignored.
//! - Self-loops are dropped and duplicate edges merged (undirected: `u,v`
//!   and `v,u` are the same edge) with [`WeightMerge`] (default: the
//!   largest weight); both are counted in the [`LoadReport`].
//!
//! # Node tables
//! See [`load_node_table`].
//!
//! Speed: the file is read in 4 MiB chunks and parsed as bytes; canonical
//! decimal ids (`0`, `17`, not `017`) are looked up through the
//! [`NodeTable`]'s dense table indexed by their value, other ids through
//! its hash.

use std::io::{self, BufRead, BufReader, Read, Write};
use std::path::{Path, PathBuf};

use serde::Serialize;

use super::nodes::canonical_u32;
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
    /// FNV-1a 64-bit hash of the file's bytes (after decompression), hex.
    pub content_hash: String,
    /// The separator detected: `"comma"`, `"tab"`, `"semicolon"` or `"whitespace"`.
    pub delimiter: String,
    /// Whether the first non-comment line was read as a header.
    pub header: bool,
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

impl std::str::FromStr for WeightMerge {
    type Err = String;

    /// Parses `max`, `sum`, `first` or `noisy-or`.
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        match s.to_ascii_lowercase().as_str() {
            "max" => Ok(WeightMerge::Max),
            "sum" => Ok(WeightMerge::Sum),
            "first" => Ok(WeightMerge::First),
            "noisy-or" | "noisy_or" | "noisyor" => Ok(WeightMerge::NoisyOr),
            _ => Err(format!("unknown weight merge {s:?}; expected max, sum, first or noisy-or")),
        }
    }
}

/// Size of the read buffer.
const CHUNK: usize = 4 << 20;
/// Longest line accepted (guards memory on files without newlines).
const MAX_LINE: usize = 16 << 20;
/// Marker for "no index" in dense caches.
const NONE: u32 = u32::MAX;
/// Most nodes a network may have (indices are `u32`, `n` must fit too).
const MAX_NODES: usize = u32::MAX as usize;

fn io_err(path: &Path) -> impl Fn(io::Error) -> LoadError + '_ {
    move |source| LoadError::Io { path: path.to_owned(), source }
}

/// Opens a file as raw bytes, decompressing gzip (by `.gz` extension or the
/// gzip magic bytes `1f 8b`).
fn open_raw(path: &Path) -> Result<Box<dyn Read>, LoadError> {
    let f = std::fs::File::open(path).map_err(io_err(path))?;
    let mut r = BufReader::with_capacity(1 << 16, f);
    let magic = r.fill_buf().map_err(io_err(path))?.starts_with(&[0x1f, 0x8b]);
    if magic || path.extension().is_some_and(|e| e == "gz") {
        Ok(Box::new(flate2::bufread::MultiGzDecoder::new(r)))
    } else {
        Ok(Box::new(r))
    }
}

/// Opens a file for line reading, decompressing gzip (by `.gz` extension or
/// the gzip magic bytes).
pub fn open(path: &Path) -> Result<Box<dyn BufRead>, LoadError> {
    Ok(Box::new(BufReader::with_capacity(1 << 20, open_raw(path)?)))
}

/// Field separator of a file.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
enum Delim {
    Byte(u8),
    Whitespace,
}

impl Delim {
    fn detect(line: &[u8]) -> Delim {
        for d in [b'\t', b',', b';'] {
            if line.contains(&d) {
                return Delim::Byte(d);
            }
        }
        Delim::Whitespace
    }

    fn name(self) -> &'static str {
        match self {
            Delim::Byte(b'\t') => "tab",
            Delim::Byte(b',') => "comma",
            Delim::Byte(b';') => "semicolon",
            Delim::Byte(_) => "other",
            Delim::Whitespace => "whitespace",
        }
    }
}

/// Splits one line into trimmed fields.
struct Fields<'a> {
    rest: Option<&'a [u8]>,
    delim: Delim,
}

impl<'a> Fields<'a> {
    fn new(line: &'a [u8], delim: Delim) -> Self {
        Fields { rest: Some(line), delim }
    }
}

#[inline]
fn is_blank(b: u8) -> bool {
    b == b' ' || b == b'\t'
}

#[inline]
fn trim(mut f: &[u8]) -> &[u8] {
    while let [first, rest @ ..] = f {
        if is_blank(*first) {
            f = rest;
        } else {
            break;
        }
    }
    while let [rest @ .., last] = f {
        if is_blank(*last) {
            f = rest;
        } else {
            break;
        }
    }
    if f.len() >= 2 && f[0] == b'"' && f[f.len() - 1] == b'"' {
        f = &f[1..f.len() - 1];
    }
    f
}

impl<'a> Iterator for Fields<'a> {
    type Item = &'a [u8];

    #[inline]
    fn next(&mut self) -> Option<&'a [u8]> {
        let r = self.rest?;
        match self.delim {
            Delim::Byte(d) => match r.iter().position(|&b| b == d) {
                Some(i) => {
                    self.rest = Some(&r[i + 1..]);
                    Some(trim(&r[..i]))
                }
                None => {
                    self.rest = None;
                    Some(trim(r))
                }
            },
            Delim::Whitespace => {
                let start = r.iter().position(|&b| !is_blank(b));
                let Some(s) = start else {
                    self.rest = None;
                    return None;
                };
                let r = &r[s..];
                let end = r.iter().position(|&b| is_blank(b)).unwrap_or(r.len());
                self.rest = Some(&r[end..]);
                Some(trim(&r[..end]))
            }
        }
    }
}

/// Shows a field for an error message.
fn show(t: &[u8]) -> String {
    const MAX: usize = 60;
    let s = String::from_utf8_lossy(t);
    if s.chars().count() > MAX {
        let cut: String = s.chars().take(MAX).collect();
        format!("{cut:?}…")
    } else {
        format!("{s:?}")
    }
}

/// Interns node ids into the [`NodeTable`], with the checks and messages
/// of the loader; canonical decimal ids first try the table's dense lookup.
#[derive(Default)]
struct Interner {
    nodes: NodeTable,
}

impl Interner {
    #[inline]
    fn cached(&self, v: u32) -> Option<u32> {
        self.nodes.dense_index(v)
    }

    #[inline]
    fn get(&mut self, tok: &[u8]) -> Result<u32, String> {
        let num = canonical_u32(tok);
        if let Some(i) = num.and_then(|v| self.cached(v)) {
            return Ok(i);
        }
        self.slow(tok)
    }

    #[cold]
    fn slow(&mut self, tok: &[u8]) -> Result<u32, String> {
        if tok.is_empty() {
            return Err("empty node id".into());
        }
        let s = std::str::from_utf8(tok)
            .map_err(|_| format!("node id {} is not valid utf-8", show(tok)))?;
        if self.nodes.len() < MAX_NODES {
            Ok(self.nodes.intern(s))
        } else {
            self.nodes.index(s).ok_or_else(|| format!("too many nodes: more than {MAX_NODES}"))
        }
    }
}

/// Common column names that mark a header line.
const HEADER_NAMES: [&str; 14] = [
    "source", "target", "from", "to", "src", "dst", "u", "v", "node1", "node2", "i", "j", "id1",
    "id2",
];

fn looks_like_header(fields: &[&[u8]], weight_column: Option<&str>) -> bool {
    let is_name = |f: &[u8]| {
        let s = String::from_utf8_lossy(f).to_ascii_lowercase();
        HEADER_NAMES.contains(&s.as_str())
    };
    let named = fields.len() >= 2 && is_name(fields[0]) && is_name(fields[1]);
    named || weight_column.is_some_and(|w| fields.contains(&w.as_bytes()))
}

/// Parses one weight field.
fn parse_weight(t: &[u8], col: usize) -> Result<f32, String> {
    if t.is_empty() {
        return Err(format!("weight in column {col} is empty"));
    }
    let s = std::str::from_utf8(t).map_err(|_| format!("weight {} is not a number", show(t)))?;
    let w: f64 = s.parse().map_err(|_| format!("weight {} is not a number", show(t)))?;
    if w.is_nan() {
        return Err(format!("weight {} is not a number (NaN)", show(t)));
    }
    if w.is_infinite() {
        return Err(format!("weight {} is infinite", show(t)));
    }
    if w < 0.0 {
        return Err(format!("weight {} is negative", show(t)));
    }
    let w32 = w as f32;
    if !w32.is_finite() {
        return Err(format!("weight {} is too large for 32-bit storage", show(t)));
    }
    Ok(w32)
}

/// What [`for_each_line`] hands its callback.
enum Event<'a> {
    /// A line, with its 1-based number.
    Line(u64, &'a [u8]),
    /// A chunk was parsed; bytes consumed so far.
    Chunk(u64),
    /// Complete lines the callback may parse on a fast path: it sets
    /// `used` to the bytes of the whole lines it took and `lines` to their
    /// count (both 0 to decline).
    Fast { block: &'a [u8], used: &'a mut usize, lines: &'a mut u64 },
}

/// Streams a file's lines (chunked, hashed, `\r` and BOM stripped) to `f`
/// with 1-based line numbers. Returns the number of lines and the hash.
fn for_each_line(
    path: &Path,
    mut f: impl FnMut(Event<'_>) -> Result<(), LoadError>,
) -> Result<(u64, u64), LoadError> {
    let mut reader = open_raw(path)?;
    let mut buf: Vec<u8> = vec![0; CHUNK];
    let (mut start, mut end) = (0usize, 0usize);
    let mut hasher = Fnv::default();
    let mut line_no = 0u64;
    let mut consumed = 0u64;
    let mut first = true;
    loop {
        if start > 0 {
            buf.copy_within(start..end, 0);
            end -= start;
            start = 0;
        }
        if end == buf.len() {
            if buf.len() >= MAX_LINE {
                return Err(LoadError::Parse {
                    path: path.to_owned(),
                    line: line_no + 1,
                    msg: format!("line longer than {MAX_LINE} bytes"),
                });
            }
            buf.resize(buf.len() * 2, 0);
        }
        let got = loop {
            match reader.read(&mut buf[end..]) {
                Ok(g) => break g,
                Err(e) if e.kind() == io::ErrorKind::Interrupted => continue,
                Err(e) => return Err(io_err(path)(e)),
            }
        };
        hasher.write(&buf[end..end + got]);
        end += got;
        let eof = got == 0;
        let mut pos = start;
        loop {
            if !first {
                let (mut used, mut lines) = (0usize, 0u64);
                f(Event::Fast { block: &buf[pos..end], used: &mut used, lines: &mut lines })?;
                pos += used;
                line_no += lines;
            }
            let Some(i) = buf[pos..end].iter().position(|&b| b == b'\n') else { break };
            line_no += 1;
            let mut line = &buf[pos..pos + i];
            if first {
                line = line.strip_prefix(b"\xef\xbb\xbf").unwrap_or(line);
                first = false;
            }
            f(Event::Line(line_no, line.strip_suffix(b"\r").unwrap_or(line)))?;
            pos += i + 1;
        }
        consumed += (pos - start) as u64;
        start = pos;
        if eof {
            if start < end {
                line_no += 1;
                let mut line = &buf[start..end];
                if first {
                    line = line.strip_prefix(b"\xef\xbb\xbf").unwrap_or(line);
                }
                f(Event::Line(line_no, line.strip_suffix(b"\r").unwrap_or(line)))?;
            }
            break;
        }
        f(Event::Chunk(consumed))?;
    }
    Ok((line_no, hasher.0))
}

/// Reads an edge list (CSV, TSV or whitespace separated; optional header;
/// `#` comments; gzip). See the module docs for the format rules.
///
/// Node indices follow the order of first appearance in the file.
///
/// ```
/// use spreadplan::network::load::{load_edge_list, EdgeListOptions};
/// let dir = std::env::temp_dir().join(format!("spreadplan-doc-load-{}", std::process::id()));
/// std::fs::create_dir_all(&dir).unwrap();
/// let f = dir.join("e.csv");
/// std::fs::write(&f, "source,target\n# a comment\na,b\nb,a\nb,c\nc,c\n").unwrap();
/// let l = load_edge_list(&f, &EdgeListOptions::default()).unwrap();
/// assert_eq!((l.network.node_count(), l.network.edge_count()), (3, 2));
/// assert_eq!((l.report.duplicates_merged, l.report.self_loops_dropped), (1, 1));
/// assert_eq!(l.nodes.id(2), "c");
/// ```
pub fn load_edge_list(path: &Path, opts: &EdgeListOptions) -> Result<Loaded, LoadError> {
    let perr = |line: u64, msg: String| LoadError::Parse { path: path.to_owned(), line, msg };
    let file_len = if path.extension().is_some_and(|e| e == "gz") {
        None
    } else {
        std::fs::metadata(path).ok().map(|m| m.len())
    };
    let mut ids = Interner::default();
    // Until the first chunk gives a row estimate, let the dense id table
    // reach a sixteenth of the file's bytes (≤ 4 bytes of table per 16 bytes).
    ids.nodes.allow_dense(file_len.map_or(0, |l| (l / 16) as usize).min(1 << 28));
    let mut edges: Vec<(u32, u32)> = Vec::new();
    let mut weights: Vec<f32> = Vec::new();
    let mut delim: Option<Delim> = None;
    let mut header = false;
    let mut weight_idx: Option<usize> = None;
    let mut rows = 0u64;
    let mut reserved = false;
    let (lines, hash) = for_each_line(path, |ev| {
        let (line_no, line) = match ev {
            Event::Line(no, l) => (no, l),
            Event::Fast { block, used, lines } => {
                if let (Some(d), None) = (delim, weight_idx) {
                    (*used, *lines) = fast_edges(block, d, &mut ids, &mut edges);
                    rows += *lines;
                }
                return Ok(());
            }
            Event::Chunk(consumed) => {
                // After the first chunk, reserve for the whole file from the
                // bytes per row seen so far (keeps Vec growth slack small).
                if !reserved && rows > 0 && consumed > 0 {
                    reserved = true;
                    if let Some(len) = file_len {
                        let est = (len as f64 / consumed as f64 * rows as f64 * 1.02) as usize;
                        ids.nodes.allow_dense(est.min(1 << 28));
                        edges.reserve(est.saturating_sub(edges.len()));
                        if weight_idx.is_some() {
                            weights.reserve(est.saturating_sub(weights.len()));
                        }
                    }
                }
                return Ok(());
            }
        };
        {
            let lead = line.iter().position(|&b| !is_blank(b));
            let Some(lead) = lead else { return Ok(()) };
            if line[lead] == b'#' {
                return Ok(());
            }
            let d = match delim {
                Some(d) => d,
                None => {
                    let d = Delim::detect(line);
                    delim = Some(d);
                    let fields: Vec<&[u8]> = Fields::new(line, d).collect();
                    header = looks_like_header(&fields, opts.weight_column.as_deref());
                    if let Some(name) = &opts.weight_column {
                        weight_idx = Some(
                            resolve_column(name, header.then_some(&fields[..]))
                                .map_err(|m| perr(line_no, m))?,
                        );
                    }
                    if header {
                        return Ok(());
                    }
                    d
                }
            };
            let mut it = Fields::new(line, d);
            let (Some(a), Some(b)) = (it.next(), it.next()) else {
                let found = Fields::new(line, d).count();
                return Err(perr(
                    line_no,
                    format!("expected at least 2 columns, found {found}: {}", show(&line[lead..])),
                ));
            };
            let u = ids.get(a).map_err(|m| perr(line_no, m))?;
            let v = ids.get(b).map_err(|m| perr(line_no, m))?;
            if let Some(wi) = weight_idx {
                let Some(t) = it.nth(wi - 2) else {
                    let found = Fields::new(line, d).count();
                    return Err(perr(
                        line_no,
                        format!("missing weight column {} (line has {found} columns)", wi + 1),
                    ));
                };
                weights.push(parse_weight(t, wi + 1).map_err(|m| perr(line_no, m))?);
            }
            edges.push((u, v));
            rows += 1;
            Ok(())
        }
    })?;
    if rows == 0 {
        let what = if lines == 0 { "file is empty" } else { "no edges found" };
        return Err(LoadError::Invalid { path: path.to_owned(), msg: what.into() });
    }
    let nodes = ids.nodes;
    let n = u32::try_from(nodes.len()).map_err(|_| LoadError::Invalid {
        path: path.to_owned(),
        msg: format!("too many nodes: {}", nodes.len()),
    })?;
    let w = weight_idx.map(|_| weights);
    let (network, built) = Network::from_edges(n, opts.directed, edges, w, opts.merge)
        .map_err(|e| LoadError::Invalid { path: path.to_owned(), msg: e.to_string() })?;
    let report = LoadReport {
        path: path.display().to_string(),
        lines,
        rows,
        self_loops_dropped: built.self_loops_dropped,
        duplicates_merged: built.duplicates_merged,
        content_hash: format!("{hash:016x}"),
        delimiter: delim.map_or("none", Delim::name).to_owned(),
        header,
    };
    Ok(Loaded { network, nodes, report })
}

/// A canonical decimal id starting at `block[i]`: `(value, end)`.
#[inline]
fn fast_id(block: &[u8], i: usize) -> Option<(u32, usize)> {
    let first = block.get(i)?.wrapping_sub(b'0');
    if first > 9 {
        return None;
    }
    let mut v = first as u32;
    let mut j = i + 1;
    if first != 0 {
        while let Some(&b) = block.get(j) {
            let d = b.wrapping_sub(b'0');
            if d > 9 {
                break;
            }
            v = v * 10 + d as u32;
            j += 1;
            if j - i > 9 {
                return None;
            }
        }
    } else if block.get(j).is_some_and(|b| b.is_ascii_digit()) {
        return None;
    }
    Some((v, j))
}

/// The fast path for plain `id<sep>id` lines with canonical decimal ids and
/// no weight: parses whole lines from the start of `block` until one does
/// not fit (left to the general parser, which also reports errors).
/// Returns the bytes and lines taken.
fn fast_edges(
    block: &[u8],
    delim: Delim,
    ids: &mut Interner,
    edges: &mut Vec<(u32, u32)>,
) -> (usize, u64) {
    let ws = delim == Delim::Whitespace;
    let sep = match delim {
        Delim::Byte(b) => b,
        Delim::Whitespace => b' ',
    };
    let is_sep = |b: u8| b == sep || (ws && b == b'\t');
    let skip_blanks = |mut i: usize| {
        if ws {
            while block.get(i).is_some_and(|&b| is_blank(b)) {
                i += 1;
            }
        }
        i
    };
    // One line from `i`: both ids, where the second starts, the next line.
    let line = |i: usize| -> Option<(u32, u32, usize, usize)> {
        let i = skip_blanks(i);
        let (a, ea) = fast_id(block, i)?;
        if !is_sep(*block.get(ea)?) {
            return None;
        }
        let sb = skip_blanks(ea + 1);
        let (b, eb) = fast_id(block, sb)?;
        let mut j = skip_blanks(eb);
        if block.get(j) == Some(&b'\r') {
            j += 1;
        }
        if block.get(j) != Some(&b'\n') {
            return None;
        }
        Some((a, b, sb, j + 1))
    };
    // Parse a batch of lines first, then look the ids up in a tight loop:
    // the lookups are independent, so their cache misses overlap.
    const BATCH: usize = 256;
    let mut vals = [[0u32; 2]; BATCH];
    let mut at = [(0usize, 0usize, 0usize); BATCH];
    let mut looked = [(0u32, 0u32); BATCH];
    let mut i = 0usize;
    let mut n = 0u64;
    loop {
        let mut k = 0;
        let mut j = i;
        while k < BATCH {
            let Some((a, b, sb, next)) = line(j) else { break };
            vals[k] = [a, b];
            at[k] = (j, sb, next);
            k += 1;
            j = next;
        }
        let dense = ids.nodes.dense_table();
        let get = |v: u32| dense.get(v as usize).copied().unwrap_or(NONE);
        let mut all = true;
        for (l, &[a, b]) in looked[..k].iter_mut().zip(&vals[..k]) {
            *l = (get(a), get(b));
            all &= l.0 != NONE && l.1 != NONE;
        }
        if all {
            edges.extend_from_slice(&looked[..k]);
            n += k as u64;
            if k > 0 {
                i = at[k - 1].2;
            }
        } else {
            for (&(cu, cv), &(start, sb, next)) in looked[..k].iter().zip(&at[..k]) {
                let tok = |at: usize| {
                    let at = skip_blanks(at);
                    let end = fast_id(block, at).map_or(at, |(_, e)| e);
                    &block[at..end]
                };
                // An id first seen earlier in this batch is found now.
                let u = match cu {
                    NONE => match ids.slow(tok(start)) {
                        Ok(u) => u,
                        Err(_) => return (i, n),
                    },
                    u => u,
                };
                let v = match cv {
                    NONE => match ids.slow(tok(sb)) {
                        Ok(v) => v,
                        Err(_) => return (i, n),
                    },
                    v => v,
                };
                edges.push((u, v));
                n += 1;
                i = next;
            }
        }
        if k < BATCH {
            return (i, n);
        }
    }
}

/// Resolves `--weight-column`: a header name, else a 1-based number ≥ 3.
fn resolve_column(name: &str, header: Option<&[&[u8]]>) -> Result<usize, String> {
    if let Some(h) = header {
        if let Some(i) = h.iter().position(|f| *f == name.as_bytes()) {
            if i < 2 {
                return Err(format!("weight column {name:?} is a node column"));
            }
            return Ok(i);
        }
    }
    match name.parse::<usize>() {
        Ok(c) if c >= 3 => Ok(c - 1),
        Ok(c) => Err(format!("weight column {c} must be 3 or more (columns 1 and 2 are nodes)")),
        Err(_) => match header {
            Some(h) => Err(format!(
                "no weight column named {name:?}; header has {}",
                h.iter().map(|f| show(f)).collect::<Vec<_>>().join(", ")
            )),
            None => Err(format!(
                "no weight column named {name:?}: the file has no header line \
                 (give a 1-based column number instead)"
            )),
        },
    }
}

/// What reading a node table did.
#[derive(Clone, Debug, Default, PartialEq, Serialize)]
pub struct NodeTableReport {
    /// The file read.
    pub path: String,
    /// Rows read (people listed).
    pub rows: u64,
    /// Attribute columns found (`group`, `cost`, `uptake`, `immune`).
    pub columns: Vec<String>,
    /// Network nodes the table does not list (they got the defaults).
    pub unlisted: u64,
}

/// Reads a node table into `loaded.nodes`.
///
/// The first non-comment line is a header naming the columns; `id` is
/// required, `group`, `cost`, `uptake` and `immune` are optional (names are
/// case-insensitive; other columns are ignored). The separator is detected
/// as for edge lists. Values:
/// - `id`: a node of the network, listed at most once;
/// - `group`: any label;
/// - `cost`: finite and > 0 (budget units per dose);
/// - `uptake`: in `[0, 1]`;
/// - `immune`: `0`/`1`/`true`/`false`/`yes`/`no`.
///
/// Nodes the table does not list, and empty cells, get the defaults: group
/// `"unlisted"`, cost 1, uptake 1, not immune. An attribute absent as a
/// column stays `None` in the [`NodeTable`].
///
/// ```
/// use spreadplan::network::load::{load_edge_list, load_node_table, EdgeListOptions};
/// let dir = std::env::temp_dir().join(format!("spreadplan-doc-nodes-{}", std::process::id()));
/// std::fs::create_dir_all(&dir).unwrap();
/// std::fs::write(dir.join("e.csv"), "a,b\nb,c\n").unwrap();
/// std::fs::write(dir.join("n.csv"), "id,group,uptake\na,kids,0.5\nc,adults,\n").unwrap();
/// let mut l = load_edge_list(&dir.join("e.csv"), &EdgeListOptions::default()).unwrap();
/// let r = load_node_table(&dir.join("n.csv"), &mut l).unwrap();
/// assert_eq!((r.rows, r.unlisted), (2, 1));
/// assert_eq!(l.nodes.group_of(1), Some("unlisted"));
/// assert_eq!((l.nodes.uptake_of(0), l.nodes.uptake_of(2)), (0.5, 1.0));
/// ```
pub fn load_node_table(path: &Path, loaded: &mut Loaded) -> Result<NodeTableReport, LoadError> {
    let perr = |line: u64, msg: String| LoadError::Parse { path: path.to_owned(), line, msg };
    let n = loaded.network.node_count();
    let nodes = &loaded.nodes;
    // Column positions: id, group, cost, uptake, immune.
    let mut cols: Option<[Option<usize>; 5]> = None;
    let mut ncols = 0usize;
    let mut delim = Delim::Whitespace;
    let mut seen_on = vec![0u64; n];
    let mut group_names: indexmap::IndexSet<String, rustc_hash::FxBuildHasher> =
        indexmap::IndexSet::default();
    let mut group_of = vec![NONE; n];
    let mut cost = vec![1.0f64; n];
    let mut uptake = vec![1.0f64; n];
    let mut immune = vec![false; n];
    let mut rows = 0u64;
    let mut header_names: Vec<String> = Vec::new();
    for_each_line(path, |ev| {
        let Event::Line(line_no, line) = ev else { return Ok(()) };
        {
            let lead = line.iter().position(|&b| !is_blank(b));
            let Some(lead) = lead else { return Ok(()) };
            if line[lead] == b'#' {
                return Ok(());
            }
            let Some(c) = cols else {
                delim = Delim::detect(line);
                let names: Vec<String> = Fields::new(line, delim)
                    .map(|f| String::from_utf8_lossy(f).to_ascii_lowercase())
                    .collect();
                let find = |k: &str| names.iter().position(|x| x == k);
                let Some(id) = find("id") else {
                    return Err(perr(
                        line_no,
                        format!("the header needs an id column, found {}", show(&line[lead..])),
                    ));
                };
                ncols = names.len();
                cols =
                    Some([Some(id), find("group"), find("cost"), find("uptake"), find("immune")]);
                header_names = names;
                return Ok(());
            };
            let fields: Vec<&[u8]> = Fields::new(line, delim).collect();
            if fields.len() != ncols {
                return Err(perr(
                    line_no,
                    format!("expected {ncols} columns as in the header, found {}", fields.len()),
                ));
            }
            let id_tok = fields[c[0].unwrap_or(0)];
            let id =
                std::str::from_utf8(id_tok).ok().and_then(|s| nodes.index(s)).ok_or_else(|| {
                    perr(line_no, format!("node id {} is not in the network", show(id_tok)))
                })?;
            let v = id as usize;
            if seen_on[v] != 0 {
                return Err(perr(
                    line_no,
                    format!("duplicate node id {} (first on line {})", show(id_tok), seen_on[v]),
                ));
            }
            seen_on[v] = line_no;
            rows += 1;
            if let Some(g) = c[1] {
                let t = fields[g];
                if !t.is_empty() {
                    let s = std::str::from_utf8(t).map_err(|_| {
                        perr(line_no, format!("group {} is not valid utf-8", show(t)))
                    })?;
                    group_of[v] = group_names.insert_full(s.to_owned()).0 as u32;
                }
            }
            let num = |t: &[u8]| std::str::from_utf8(t).ok().and_then(|s| s.parse::<f64>().ok());
            if let Some(k) = c[2] {
                let t = fields[k];
                if !t.is_empty() {
                    match num(t) {
                        Some(x) if x.is_finite() && x > 0.0 => cost[v] = x,
                        _ => {
                            return Err(perr(
                                line_no,
                                format!("cost {} must be a finite number > 0", show(t)),
                            ))
                        }
                    }
                }
            }
            if let Some(k) = c[3] {
                let t = fields[k];
                if !t.is_empty() {
                    match num(t) {
                        Some(x) if (0.0..=1.0).contains(&x) => uptake[v] = x,
                        _ => {
                            return Err(perr(
                                line_no,
                                format!("uptake {} must be a number in [0, 1]", show(t)),
                            ))
                        }
                    }
                }
            }
            if let Some(k) = c[4] {
                let t = fields[k];
                if !t.is_empty() {
                    immune[v] = match String::from_utf8_lossy(t).to_ascii_lowercase().as_str() {
                        "1" | "true" | "yes" => true,
                        "0" | "false" | "no" => false,
                        _ => {
                            return Err(perr(
                                line_no,
                                format!("immune {} must be 0/1/true/false/yes/no", show(t)),
                            ))
                        }
                    };
                }
            }
            Ok(())
        }
    })?;
    let Some(c) = cols else {
        return Err(LoadError::Invalid {
            path: path.to_owned(),
            msg: "node table is empty (expected a header with an id column)".into(),
        });
    };
    let unlisted = seen_on.iter().filter(|&&l| l == 0).count() as u64;
    let nodes = &mut loaded.nodes;
    let mut columns = Vec::new();
    if c[1].is_some() {
        columns.push("group".to_owned());
        let mut names: Vec<String> = group_names.into_iter().collect();
        if group_of.contains(&NONE) {
            let un = match names.iter().position(|g| g == "unlisted") {
                Some(i) => i as u32,
                None => {
                    names.push("unlisted".into());
                    (names.len() - 1) as u32
                }
            };
            for g in group_of.iter_mut().filter(|g| **g == NONE) {
                *g = un;
            }
        }
        nodes.groups = Some(super::Groups { names, of: group_of });
    }
    if c[2].is_some() {
        columns.push("cost".to_owned());
        nodes.cost = Some(cost);
    }
    if c[3].is_some() {
        columns.push("uptake".to_owned());
        nodes.uptake = Some(uptake);
    }
    if c[4].is_some() {
        columns.push("immune".to_owned());
        nodes.immune = Some(immune);
    }
    let _ = header_names;
    Ok(NodeTableReport { path: path.display().to_string(), rows, columns, unlisted })
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fields_split() {
        let f: Vec<&[u8]> = Fields::new(b" a , \"b\" ,3", Delim::Byte(b',')).collect();
        assert_eq!(f, vec![&b"a"[..], b"b", b"3"]);
        let f: Vec<&[u8]> = Fields::new(b"  a \t b  ", Delim::Whitespace).collect();
        assert_eq!(f, vec![&b"a"[..], b"b"]);
        let f: Vec<&[u8]> = Fields::new(b"a,", Delim::Byte(b',')).collect();
        assert_eq!(f, vec![&b"a"[..], b""]);
    }

    #[test]
    fn interner_cache_agrees_with_table() {
        let mut i = Interner::default();
        let a = i.get(b"5").unwrap();
        let b = i.get(b"x").unwrap();
        let c = i.get(b"99999999").unwrap(); // beyond the cache: hash path
        assert_eq!((a, b, c), (0, 1, 2));
        assert_eq!(i.get(b"5").unwrap(), 0);
        assert_eq!(i.get(b"99999999").unwrap(), 2);
        assert_eq!(i.get(b"05").unwrap(), 3); // "05" is a different id
        assert!(i.get(b"").is_err());
    }

    #[test]
    fn weights_checked() {
        assert_eq!(parse_weight(b"0.25", 3), Ok(0.25));
        for bad in [&b"x"[..], b"nan", b"inf", b"-1", b"1e300", b""] {
            assert!(parse_weight(bad, 3).is_err(), "{bad:?}");
        }
    }

    #[test]
    fn merge_parses() {
        assert_eq!("noisy-or".parse::<WeightMerge>(), Ok(WeightMerge::NoisyOr));
        assert!("mean".parse::<WeightMerge>().is_err());
    }
}
