//! Erdős–Rényi random graphs: G(n, p) by geometric skipping and G(n, m) by
//! uniform sampling of `m` distinct node pairs.
//!
//! Both walk the `n(n − 1)/2` pairs `(w, v)`, `w < v`, in row-major order
//! (row `w`, columns `v = w + 1 … n − 1`), so edges come out sorted and go
//! straight to [`Network::from_sorted_unique`].

use super::{bad, check_edges, check_prob, geometric_skip, GenerateError};
use crate::network::Network;
use crate::rng::{self, Stage};
use rand::Rng;

/// G(n, p): each of the `n(n − 1)/2` pairs is an edge independently with
/// probability `p`, in O(n + m) expected time.
///
/// Batagelj & Brandes (2005), "Efficient generation of large random
/// networks", Phys. Rev. E 71, 036113, algorithm G(n,p): instead of one coin
/// per pair, jump over `k = ⌊ln(1 − r)/ln(1 − p)⌋` pairs (`r` uniform), the
/// geometric number of failures before the next success. Here the pairs are
/// visited row by row (`w` the smaller endpoint) rather than column by column,
/// which is the same law and yields sorted edges.
///
/// ```
/// use spreadplan::network::generate::gnp;
/// assert_eq!(gnp(5, 1.0, 1).unwrap().edge_count(), 10);
/// assert_eq!(gnp(5, 0.0, 1).unwrap().edge_count(), 0);
/// assert_eq!(gnp(1000, 0.01, 7).unwrap(), gnp(1000, 0.01, 7).unwrap());
/// ```
pub fn gnp(n: u32, p: f64, seed: u64) -> Result<Network, GenerateError> {
    check_prob("p", p)?;
    let mut rng = rng::stream(seed, Stage::Generate, 0);
    let ln_q = (-p).ln_1p();
    let nn = n as u64;
    let pairs = nn * nn.saturating_sub(1) / 2;
    check_edges("p", p, pairs as f64 * p)?;
    let mut edges: Vec<[u32; 2]> =
        Vec::with_capacity(((pairs as f64 * p) * 1.05 + 16.0).min(pairs as f64) as usize);
    if nn < 2 {
        return Ok(Network::from_sorted_unique(n, false, edges, None));
    }
    // Current candidate pair (w, v); v may run past the row end.
    let (mut w, mut v) = (0u64, 1u64);
    loop {
        let skip = geometric_skip(&mut rng, ln_q);
        if skip >= pairs as f64 {
            break;
        }
        v += skip as u64;
        while v >= nn {
            // Carry the overflow into the next row, which starts at w + 2.
            v = v - nn + w + 2;
            w += 1;
            if w + 1 >= nn {
                break;
            }
        }
        if w + 1 >= nn {
            break;
        }
        edges.push([w as u32, v as u32]);
        v += 1;
    }
    Ok(Network::from_sorted_unique(n, false, edges, None))
}

/// G(n, m): a uniformly random simple graph with exactly `m` edges among
/// the `n(n − 1)/2` node pairs (Erdős & Rényi 1959).
///
/// Pair indices are drawn uniformly with replacement, exactly as many as are
/// still missing, and merged into the sorted set until it holds `m`; the
/// procedure is symmetric in the pair labels, so every `m`-subset is equally
/// likely. For `m` above half the pairs the complement is drawn instead.
/// O(m log m) time.
///
/// ```
/// use spreadplan::network::generate::gnm;
/// let net = gnm(100, 250, 3).unwrap();
/// assert_eq!(net.edge_count(), 250);
/// assert_eq!(gnm(6, 15, 3).unwrap().edge_count(), 15);
/// ```
pub fn gnm(n: u32, m: u64, seed: u64) -> Result<Network, GenerateError> {
    let nn = n as u64;
    let pairs = nn * nn.saturating_sub(1) / 2;
    if m > pairs {
        return Err(bad("m", m, format!("exceeds the {pairs} node pairs of n = {n}")));
    }
    check_edges("m", m, m as f64)?;
    let mut rng = rng::stream(seed, Stage::Generate, 0);
    let complement = m > pairs / 2;
    let want = if complement { pairs - m } else { m };
    let mut chosen: Vec<u64> = Vec::with_capacity(want as usize);
    while (chosen.len() as u64) < want {
        let missing = want - chosen.len() as u64;
        let mut fresh: Vec<u64> = (0..missing).map(|_| rng.random_range(0..pairs)).collect();
        fresh.sort_unstable();
        chosen = merge_dedup(&chosen, &fresh);
    }
    let mut edges: Vec<[u32; 2]> = Vec::with_capacity(m as usize);
    let mut emit = |t: u64, row: &mut (u64, u64)| {
        // row = (w, index of the first pair of row w)
        while t >= row.1 + (nn - 1 - row.0) {
            row.1 += nn - 1 - row.0;
            row.0 += 1;
        }
        let v = row.0 + 1 + (t - row.1);
        edges.push([row.0 as u32, v as u32]);
    };
    let mut row = (0u64, 0u64);
    if complement {
        let mut next = chosen.iter().copied().peekable();
        for t in 0..pairs {
            if next.peek() == Some(&t) {
                next.next();
            } else {
                emit(t, &mut row);
            }
        }
    } else {
        for &t in &chosen {
            emit(t, &mut row);
        }
    }
    Ok(Network::from_sorted_unique(n, false, edges, None))
}

/// Union of two sorted lists, each value once.
fn merge_dedup(a: &[u64], b: &[u64]) -> Vec<u64> {
    let mut out = Vec::with_capacity(a.len() + b.len());
    let (mut i, mut j) = (0, 0);
    while i < a.len() || j < b.len() {
        let x = if j >= b.len() || (i < a.len() && a[i] <= b[j]) {
            i += 1;
            a[i - 1]
        } else {
            j += 1;
            b[j - 1]
        };
        if out.last() != Some(&x) {
            out.push(x);
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn gnp_complete_and_sorted() {
        let net = gnp(7, 1.0, 0).unwrap();
        assert_eq!(net.edge_count(), 21);
        let net = gnp(300, 0.3, 5).unwrap();
        assert!(net.edges().windows(2).all(|w| w[0] < w[1]));
        assert!(net.edges().iter().all(|e| e[0] < e[1] && e[1] < 300));
    }

    #[test]
    fn gnp_rejects_bad_p() {
        assert!(gnp(10, 1.5, 0).is_err());
        assert!(gnp(10, f64::NAN, 0).is_err());
    }

    #[test]
    fn gnm_dense_and_sparse_are_simple() {
        for m in [0, 1, 10, 20, 44, 45] {
            let net = gnm(10, m, 9).unwrap();
            assert_eq!(net.edge_count() as u64, m);
            assert!(net.edges().windows(2).all(|w| w[0] < w[1]));
        }
        assert!(gnm(10, 46, 9).is_err());
    }
}
