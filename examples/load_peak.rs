//! Loads one edge list and prints wall time, edges/s and the peak resident
//! memory of the load per edge (Linux: VmHWM from /proc/self/status, reset
//! through /proc/self/clear_refs just before loading).
//!
//! ```text
//! cargo run --release --example load_peak -- FILE
//! ```
//! A 10⁷-edge test file is written by `cargo bench --bench load` (its path
//! is printed there), or use any edge list.
#![allow(clippy::print_stdout)]

use std::path::PathBuf;
use std::time::Instant;

use spreadplan::network::load::{load_edge_list, EdgeListOptions};

fn status_kb(key: &str) -> Option<u64> {
    let s = std::fs::read_to_string("/proc/self/status").ok()?;
    let line = s.lines().find(|l| l.starts_with(key))?;
    line.split_whitespace().nth(1)?.parse().ok()
}

fn main() -> Result<(), Box<dyn std::error::Error>> {
    let path: PathBuf = std::env::args_os().nth(1).ok_or("usage: load_peak FILE")?.into();
    let before = status_kb("VmRSS:").unwrap_or(0);
    let reset = std::fs::write("/proc/self/clear_refs", "5").is_ok();
    let t = Instant::now();
    let l = load_edge_list(&path, &EdgeListOptions::default())?;
    let secs = t.elapsed().as_secs_f64();
    let rows = l.report.rows as f64;
    println!(
        "rows {} nodes {} edges {}",
        l.report.rows,
        l.network.node_count(),
        l.network.edge_count()
    );
    println!("load {secs:.3} s, {:.3e} rows/s", rows / secs);
    if let Some(hwm) = status_kb("VmHWM:") {
        println!(
            "peak RSS {} MiB ({} reset), {:.1} bytes/row above the {} MiB before",
            hwm / 1024,
            if reset { "after" } else { "no" },
            (hwm.saturating_sub(before) * 1024) as f64 / rows,
            before / 1024
        );
    }
    Ok(())
}
