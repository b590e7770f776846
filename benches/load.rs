//! Benchmarks: loading a 10⁷-edge CSV edge list with `load_edge_list`,
//! against two baselines measured in the same run on the same file:
//! - `read_count_lines`: read the file in 4 MiB chunks and count newlines
//!   (the I/O floor);
//! - `bare_split_parse`: `BufRead::lines`, split at the comma, parse two
//!   `u32` and push them (a plain line-split loop with no id table, no
//!   network build).
//!
//! Before the timed runs, one load is measured for peak memory: VmHWM from
//! /proc/self/status after resetting it through /proc/self/clear_refs
//! (Linux), printed as bytes per edge.
//!
//! The file (integer ids, `N = M/10` nodes, endpoints uniform from a fixed
//! ChaCha8 seed) is written once under the cargo target tmp dir.
//! `SPREADPLAN_BENCH_EDGES` overrides `M` (default 10⁷). See
//! benches/README.md for logged runs.
#![allow(clippy::print_stderr)]

use std::io::{BufRead, BufWriter, Read, Write};
use std::path::{Path, PathBuf};
use std::time::Instant;

use criterion::{criterion_group, criterion_main, Criterion, Throughput};
use rand::{Rng, SeedableRng};
use spreadplan::network::load::{load_edge_list, EdgeListOptions};

fn edges_wanted() -> u64 {
    std::env::var("SPREADPLAN_BENCH_EDGES").ok().and_then(|s| s.parse().ok()).unwrap_or(10_000_000)
}

/// Writes (once) the benchmark file and returns its path.
fn bench_file(m: u64) -> PathBuf {
    let path = PathBuf::from(env!("CARGO_TARGET_TMPDIR")).join(format!("load-bench-{m}.csv"));
    let done = path.with_extension("done");
    if done.exists() && path.exists() {
        return path;
    }
    let n = (m / 10).max(2) as u32;
    let mut rng = rand_chacha::ChaCha8Rng::seed_from_u64(20_261_202);
    let mut w = BufWriter::with_capacity(1 << 20, std::fs::File::create(&path).unwrap());
    writeln!(w, "source,target").unwrap();
    for _ in 0..m {
        let (u, v) = (rng.random_range(0..n), rng.random_range(0..n));
        writeln!(w, "{u},{v}").unwrap();
    }
    w.flush().unwrap();
    std::fs::write(done, "").unwrap();
    path
}

fn read_count_lines(path: &Path) -> u64 {
    let mut f = std::fs::File::open(path).unwrap();
    let mut buf = vec![0u8; 4 << 20];
    let mut lines = 0u64;
    loop {
        let got = f.read(&mut buf).unwrap();
        if got == 0 {
            return lines;
        }
        lines += buf[..got].iter().filter(|&&b| b == b'\n').count() as u64;
    }
}

fn bare_split_parse(path: &Path) -> Vec<(u32, u32)> {
    let r = std::io::BufReader::with_capacity(1 << 20, std::fs::File::open(path).unwrap());
    let mut out = Vec::new();
    for line in r.lines().skip(1) {
        let line = line.unwrap();
        let (a, b) = line.split_once(',').unwrap();
        out.push((a.parse().unwrap(), b.parse().unwrap()));
    }
    out
}

fn status_kb(key: &str) -> Option<u64> {
    let s = std::fs::read_to_string("/proc/self/status").ok()?;
    let line = s.lines().find(|l| l.starts_with(key))?;
    line.split_whitespace().nth(1)?.parse().ok()
}

/// One load with its peak resident memory, printed per edge.
fn peak_memory(path: &Path, m: u64) {
    let before = status_kb("VmRSS:").unwrap_or(0);
    let reset = std::fs::write("/proc/self/clear_refs", "5").is_ok();
    let t = Instant::now();
    let l = load_edge_list(path, &EdgeListOptions::default()).unwrap();
    let secs = t.elapsed().as_secs_f64();
    assert_eq!(l.report.rows, m, "checksum: rows read");
    match status_kb("VmHWM:") {
        Some(hwm) if reset => eprintln!(
            "load_edge_list {m} edges: {secs:.2} s once; peak RSS {} MiB = {:.1} bytes/edge \
             ({:.1} above the {} MiB before the load); {} nodes, {} edges kept",
            hwm / 1024,
            (hwm * 1024) as f64 / m as f64,
            (hwm.saturating_sub(before) * 1024) as f64 / m as f64,
            before / 1024,
            l.network.node_count(),
            l.network.edge_count()
        ),
        _ => eprintln!("peak memory not measurable here (/proc/self/clear_refs unavailable)"),
    }
}

fn load(c: &mut Criterion) {
    let m = edges_wanted();
    let path = bench_file(m);
    peak_memory(&path, m);
    let mut g = c.benchmark_group(format!("load_{m}_edges"));
    g.throughput(Throughput::Elements(m));
    g.sample_size(10);
    g.bench_function("read_count_lines", |b| {
        b.iter(|| assert_eq!(read_count_lines(&path), m + 1));
    });
    g.bench_function("bare_split_parse", |b| {
        b.iter(|| assert_eq!(bare_split_parse(&path).len() as u64, m));
    });
    g.bench_function("load_edge_list", |b| {
        b.iter(|| {
            let l = load_edge_list(&path, &EdgeListOptions::default()).unwrap();
            assert_eq!(l.report.rows, m);
            l
        });
    });
    g.finish();
}

criterion_group!(benches, load);
criterion_main!(benches);
