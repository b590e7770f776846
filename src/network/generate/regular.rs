//! Random `k`-regular graphs: every node has degree exactly `k`.
//!
//! For `k <= 3` the configuration pairing is repeated until it is simple
//! (exactly uniform over simple `k`-regular graphs, Bollobás 1980; the
//! acceptance probability tends to `exp(−(k² − 1)/4)`). For larger `k` the
//! Steger–Wormald (1999) pairing is used: stubs are paired uniformly among
//! the *suitable* pairs only (different nodes, not yet joined), restarting
//! if no suitable pair remains. Its law is asymptotically uniform for
//! `k = o(n^{1/28})` (Steger & Wormald 1999; Kim & Vu 2003 extend the
//! range), and close to uniform for the modest `k` of contact models.

use super::{bad, GenerateError};
use crate::network::Network;
use crate::rng::{self, Stage};
use rand::Rng;
use rand_chacha::ChaCha8Rng;

const MAX_ATTEMPTS: u64 = 10_000;

/// A random simple `k`-regular graph on `n` nodes (`n·k` even, `k < n`).
///
/// ```
/// let net = spreadplan::network::generate::random_regular(20, 3, 1).unwrap();
/// assert_eq!(net.edge_count(), 30);
/// assert!((0..20).all(|v| net.degree(v) == 3));
/// ```
pub fn random_regular(n: u32, k: u32, seed: u64) -> Result<Network, GenerateError> {
    if k > 0 && k >= n {
        return Err(bad("k", k, format!("must be below n = {n}")));
    }
    if (n as u64 * k as u64) % 2 == 1 {
        return Err(bad("k", k, format!("n·k must be even (n = {n})")));
    }
    if (n as u64) * (k as u64) > u32::MAX as u64 * 2 {
        return Err(bad("k", k, "n·k/2 edges exceed the u32 edge limit"));
    }
    if k == 0 {
        return Ok(Network::from_sorted_unique(n, false, Vec::new(), None));
    }
    let mut rng = rng::stream(seed, Stage::Generate, 0);
    for _ in 0..MAX_ATTEMPTS {
        let edges = if k <= 3 { pairing(n, k, &mut rng) } else { steger_wormald(n, k, &mut rng) };
        if let Some(e) = edges {
            return Ok(Network::from_sorted_unique(n, false, e, None));
        }
    }
    Err(GenerateError::GaveUp {
        attempts: MAX_ATTEMPTS,
        what: format!("a simple {k}-regular graph on {n} nodes"),
    })
}

/// One configuration pairing of `k` stubs per node; `None` unless simple.
fn pairing(n: u32, k: u32, rng: &mut ChaCha8Rng) -> Option<Vec<[u32; 2]>> {
    let mut stubs: Vec<u32> = (0..n).flat_map(|v| std::iter::repeat_n(v, k as usize)).collect();
    rng::shuffle(rng, &mut stubs);
    let mut edges: Vec<[u32; 2]> = stubs
        .chunks_exact(2)
        .map(|c| if c[0] < c[1] { [c[0], c[1]] } else { [c[1], c[0]] })
        .collect();
    if edges.iter().any(|e| e[0] == e[1]) {
        return None;
    }
    edges.sort_unstable();
    if edges.windows(2).any(|w| w[0] == w[1]) {
        return None;
    }
    Some(edges)
}

/// One Steger–Wormald pass; `None` when it gets stuck.
fn steger_wormald(n: u32, k: u32, rng: &mut ChaCha8Rng) -> Option<Vec<[u32; 2]>> {
    let mut open: Vec<u32> = (0..n).flat_map(|v| std::iter::repeat_n(v, k as usize)).collect();
    let mut adj: Vec<Vec<u32>> = vec![Vec::with_capacity(k as usize); n as usize];
    let mut edges: Vec<[u32; 2]> = Vec::with_capacity(open.len() / 2);
    let mut failures = 0u32;
    while !open.is_empty() {
        let len = open.len();
        let i = rng.random_range(0..len);
        let mut j = rng.random_range(0..len - 1);
        if j >= i {
            j += 1;
        }
        let (u, v) = (open[i], open[j]);
        if u != v && !adj[u as usize].contains(&v) {
            adj[u as usize].push(v);
            adj[v as usize].push(u);
            edges.push(if u < v { [u, v] } else { [v, u] });
            let (hi, lo) = if i > j { (i, j) } else { (j, i) };
            open.swap_remove(hi);
            open.swap_remove(lo);
            failures = 0;
            continue;
        }
        failures += 1;
        if failures >= 64 {
            if !any_suitable(&open, &adj) {
                return None;
            }
            failures = 0;
        }
    }
    edges.sort_unstable();
    Some(edges)
}

/// Whether some pair of open stubs could still be joined.
fn any_suitable(open: &[u32], adj: &[Vec<u32>]) -> bool {
    let mut nodes = open.to_vec();
    nodes.sort_unstable();
    nodes.dedup();
    for (a, &u) in nodes.iter().enumerate() {
        for &v in &nodes[a + 1..] {
            if !adj[u as usize].contains(&v) {
                return true;
            }
        }
    }
    false
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_degree_is_k() {
        for (n, k) in [(10, 9), (50, 4), (101, 6), (12, 1), (30, 2)] {
            let net = random_regular(n, k, 3).unwrap();
            assert!((0..n).all(|v| net.degree(v) == k as usize), "n={n} k={k}");
        }
    }

    #[test]
    fn rejects_odd_and_large() {
        assert!(random_regular(5, 3, 0).is_err());
        assert!(random_regular(5, 5, 0).is_err());
        assert_eq!(random_regular(0, 0, 0).unwrap().node_count(), 0);
    }
}
