//! Square and triangular lattices on an `L × L` grid, open or periodic.
//!
//! Node `(r, c)` (row, column) has index `r·L + c`. The square lattice joins
//! right and down neighbours; the triangular lattice adds the diagonal
//! `(r, c) — (r + 1, c + 1)`, giving every interior node six neighbours.

use super::{bad, check_edges, GenerateError};
use crate::network::{Network, WeightMerge};

fn grid_edges(side: u32, periodic: bool, diagonal: bool) -> Result<Network, GenerateError> {
    if side == 0 {
        return Err(bad("side", side, "must be at least 1"));
    }
    if periodic && side < 3 {
        return Err(bad("side", side, "a periodic lattice needs side >= 3"));
    }
    let n = (side as u64) * (side as u64);
    if n > u32::MAX as u64 {
        return Err(bad("side", side, "side² nodes exceed the u32 node limit"));
    }
    check_edges("side", side, n as f64 * if diagonal { 3.0 } else { 2.0 })?;
    let l = side;
    let idx = |r: u32, c: u32| r * l + c;
    let mut edges = Vec::with_capacity((n * if diagonal { 3 } else { 2 }) as usize);
    for r in 0..l {
        for c in 0..l {
            let v = idx(r, c);
            let right = if c + 1 < l { Some(idx(r, c + 1)) } else { periodic.then(|| idx(r, 0)) };
            let down = if r + 1 < l { Some(idx(r + 1, c)) } else { periodic.then(|| idx(0, c)) };
            let diag = if !diagonal {
                None
            } else if r + 1 < l && c + 1 < l {
                Some(idx(r + 1, c + 1))
            } else {
                periodic.then(|| idx((r + 1) % l, (c + 1) % l))
            };
            for w in [right, down, diag].into_iter().flatten() {
                edges.push((v, w));
            }
        }
    }
    let (net, _) = Network::from_edges(n as u32, false, edges, None, WeightMerge::First)
        .expect("lattice indices are below the node count");
    Ok(net)
}

/// The `side × side` square lattice; `periodic` wraps both directions
/// into a torus (needs `side >= 3`).
///
/// Edge counts: open `2L(L − 1)`, periodic `2L²`; every node of the
/// periodic lattice has degree 4.
///
/// ```
/// let net = spreadplan::network::generate::square_lattice(3, false).unwrap();
/// assert_eq!((net.node_count(), net.edge_count()), (9, 12));
/// assert_eq!(net.degree(4), 4);
/// ```
pub fn square_lattice(side: u32, periodic: bool) -> Result<Network, GenerateError> {
    grid_edges(side, periodic, false)
}

/// The `side × side` triangular lattice (square lattice plus one diagonal
/// per cell); `periodic` wraps into a torus (needs `side >= 3`).
///
/// Edge counts: open `3L² − 4L + 1`, periodic `3L²`; every node of the
/// periodic lattice has degree 6.
///
/// ```
/// let net = spreadplan::network::generate::triangular_lattice(3, true).unwrap();
/// assert_eq!(net.edge_count(), 27);
/// assert!((0..9).all(|v| net.degree(v) == 6));
/// ```
pub fn triangular_lattice(side: u32, periodic: bool) -> Result<Network, GenerateError> {
    grid_edges(side, periodic, true)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn open_triangular_counts() {
        let net = triangular_lattice(4, false).unwrap();
        assert_eq!(net.edge_count(), 3 * 16 - 16 + 1);
        // corner (0,0): right, down, diagonal
        assert_eq!(net.degree(0), 3);
        // corner (0,3): left, down
        assert_eq!(net.degree(3), 2);
    }

    #[test]
    fn rejects_small_periodic() {
        assert!(square_lattice(2, true).is_err());
        assert!(square_lattice(0, false).is_err());
        assert_eq!(square_lattice(1, false).unwrap().edge_count(), 0);
    }
}
