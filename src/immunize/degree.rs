//! The `degree` (static) and `degree-adaptive` rules.
//!
//! Tie rule (both): among people of equal (current) degree, the lower node
//! index goes first. Node indices follow first appearance in the edge list
//! (or the node table), so the tie rule is reproducible from the input.

use std::collections::BinaryHeap;

use super::Present;

/// Highest residual degree first, computed once; ties by lower index.
/// O(N log N).
pub fn degree_order(present: &Present<'_>) -> Vec<u32> {
    let mut order = present.candidates();
    order.sort_by_key(|&v| (std::cmp::Reverse(present.degree[v as usize]), v));
    order
}

/// Highest *current* degree first, recomputed after each removal; ties by
/// lower index.
///
/// A lazy max-heap keyed `(degree, −index)`: a removal pushes one fresh
/// entry per neighbour whose degree drops, stale entries are skipped when
/// popped. O((N + M) log N); an intrusive bucket queue would be O(N + M)
/// but cannot give the lowest-index tie rule that the networkx reference
/// check uses.
pub fn degree_adaptive_order(present: &Present<'_>) -> Vec<u32> {
    let net = present.net;
    let mut deg = present.degree.clone();
    let mut alive = present.alive.clone();
    let key = |d: u32, v: u32| ((d as u64) << 32) | (u32::MAX - v) as u64;
    let mut heap: BinaryHeap<u64> =
        present.candidates().into_iter().map(|v| key(deg[v as usize], v)).collect();
    let mut order = Vec::with_capacity(heap.len());
    while let Some(k) = heap.pop() {
        let v = u32::MAX - (k as u32);
        let d = (k >> 32) as u32;
        if !alive[v as usize] || deg[v as usize] != d {
            continue;
        }
        alive[v as usize] = false;
        order.push(v);
        for &u in net.neighbors(v) {
            if alive[u as usize] {
                deg[u as usize] -= 1;
                heap.push(key(deg[u as usize], u));
            }
        }
    }
    order
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::{Network, WeightMerge};

    fn net(n: u32, e: &[(u32, u32)]) -> Network {
        Network::from_edges(n, false, e.to_vec(), None, WeightMerge::Max).unwrap().0
    }

    #[test]
    fn adaptive_differs_from_static_on_two_stars_sharing_leaves() {
        // Hub 0 and hub 1 share leaves 2,3; hub 0 also has 4,5. Node 6-7 pair.
        let g = net(8, &[(0, 2), (0, 3), (0, 4), (0, 5), (1, 2), (1, 3), (6, 7), (1, 6)]);
        let p = Present::new(&g, &[]);
        assert_eq!(degree_order(&p), vec![0, 1, 2, 3, 6, 4, 5, 7]);
        // After 0 and 1 go, 6 and 7 keep degree 1, everyone else 0.
        assert_eq!(degree_adaptive_order(&p), vec![0, 1, 6, 2, 3, 4, 5, 7]);
    }
}
