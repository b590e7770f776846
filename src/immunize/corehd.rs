//! The `corehd` rule of Zdeborová, Zhang & Zhou (2016, Sci Rep 6:37954):
//! repeatedly remove the highest-degree node of the current 2-core, then
//! break the remaining forest.
//!
//! Core phase: the 2-core is kept incrementally — removing a node lowers
//! its neighbours' core degrees, and any node whose core degree falls below
//! 2 is peeled off the core (it stays in the network, it is not dosed),
//! cascading. The highest core degree is taken from a lazy max-heap keyed
//! `(core degree, −index)`, so ties go to the lower index.
//!
//! Forest phase (once the 2-core is empty, everything left is a forest):
//! the largest remaining tree is broken at its centroid (the node whose
//! removal leaves the smallest largest piece; of two centroids the lower
//! index), its pieces go back in the queue, and so on until single nodes
//! remain, which come last by index. This greedy centroid breaking is our
//! documented choice for the tree stage; it halves the largest tree at
//! every cut, in O(N log N).

use std::cmp::Reverse;
use std::collections::BinaryHeap;

use super::Present;

/// The CoreHD removal order (see the module doc).
pub fn corehd_order(present: &Present<'_>) -> Vec<u32> {
    let (mut order, mut removed) = core_phase(present);
    break_forest(present.net, &mut removed, &mut order);
    order
}

/// The core phase: nodes removed while the 2-core is not empty, in order,
/// and the removed/absent mask it leaves (a forest remains).
fn core_phase(present: &Present<'_>) -> (Vec<u32>, Vec<bool>) {
    let net = present.net;
    let n = present.alive.len();
    let mut removed: Vec<bool> = present.alive.iter().map(|a| !a).collect();
    let mut in_core = present.alive.clone();
    let mut cdeg = present.degree.clone();
    let mut stack: Vec<u32> = Vec::new();
    // Peel to the 2-core.
    for v in 0..n as u32 {
        if in_core[v as usize] && cdeg[v as usize] < 2 {
            in_core[v as usize] = false;
            stack.push(v);
        }
    }
    // Peels the nodes on `stack` and everything that falls below core
    // degree 2 after them; nodes that stay in the core with a lowered core
    // degree go to `touched`, so their heap key can be refreshed.
    let peel = |stack: &mut Vec<u32>,
                in_core: &mut Vec<bool>,
                cdeg: &mut Vec<u32>,
                touched: &mut Vec<u32>| {
        while let Some(v) = stack.pop() {
            for &u in net.neighbors(v) {
                let ui = u as usize;
                if in_core[ui] {
                    cdeg[ui] -= 1;
                    if cdeg[ui] < 2 {
                        in_core[ui] = false;
                        stack.push(u);
                    } else {
                        touched.push(u);
                    }
                }
            }
        }
    };
    let mut touched: Vec<u32> = Vec::new();
    peel(&mut stack, &mut in_core, &mut cdeg, &mut touched);
    touched.clear();
    let key = |d: u32, v: u32| ((d as u64) << 32) | (u32::MAX - v) as u64;
    let mut heap: BinaryHeap<u64> =
        (0..n as u32).filter(|&v| in_core[v as usize]).map(|v| key(cdeg[v as usize], v)).collect();
    let mut order = Vec::with_capacity(present.candidates().len());
    while let Some(k) = heap.pop() {
        let v = u32::MAX - (k as u32);
        if !in_core[v as usize] || cdeg[v as usize] != (k >> 32) as u32 {
            continue;
        }
        in_core[v as usize] = false;
        removed[v as usize] = true;
        order.push(v);
        // Removing v lowers its core neighbours exactly as peeling it would.
        stack.push(v);
        peel(&mut stack, &mut in_core, &mut cdeg, &mut touched);
        for u in touched.drain(..) {
            if in_core[u as usize] {
                heap.push(key(cdeg[u as usize], u));
            }
        }
    }
    debug_assert!(!in_core.iter().any(|&c| c), "the 2-core is empty when the heap is");
    (order, removed)
}

/// Appends to `order` every node not yet `removed`, breaking the forest
/// they form at centroids of the largest tree first. `removed` must leave
/// a forest.
pub(crate) fn break_forest(
    net: &crate::network::Network,
    removed: &mut [bool],
    order: &mut Vec<u32>,
) {
    let n = removed.len();
    // Tree sizes, found once; later pieces get their size from the cut.
    let mut seen = vec![false; n];
    let mut heap: BinaryHeap<(u32, Reverse<u32>)> = BinaryHeap::new();
    let mut queue: Vec<u32> = Vec::new();
    for s in 0..n as u32 {
        if removed[s as usize] || seen[s as usize] {
            continue;
        }
        seen[s as usize] = true;
        queue.clear();
        queue.push(s);
        let mut i = 0;
        while i < queue.len() {
            let v = queue[i];
            i += 1;
            for &u in net.neighbors(v) {
                if !removed[u as usize] && !seen[u as usize] {
                    seen[u as usize] = true;
                    queue.push(u);
                }
            }
        }
        heap.push((queue.len() as u32, Reverse(s)));
    }
    let mut parent = vec![u32::MAX; n];
    let mut sub = vec![0u32; n];
    // Visit stamps: in a forest they change nothing (the only visited
    // neighbour is the parent), and they keep the search finite otherwise.
    let mut stamp = vec![0u32; n];
    let mut round = 0u32;
    let mut singles = Vec::new();
    while let Some((size, Reverse(root))) = heap.pop() {
        if size == 1 {
            singles.push(root);
            continue;
        }
        // BFS the tree from `root`, then subtree sizes in reverse BFS order.
        queue.clear();
        queue.push(root);
        round += 1;
        stamp[root as usize] = round;
        parent[root as usize] = u32::MAX;
        let mut i = 0;
        while i < queue.len() {
            let v = queue[i];
            i += 1;
            for &u in net.neighbors(v) {
                if !removed[u as usize] && stamp[u as usize] != round {
                    stamp[u as usize] = round;
                    parent[u as usize] = v;
                    queue.push(u);
                }
            }
        }
        debug_assert_eq!(queue.len() as u32, size);
        for &v in queue.iter().rev() {
            sub[v as usize] = 1;
        }
        for &v in queue.iter().rev() {
            let p = parent[v as usize];
            if p != u32::MAX {
                sub[p as usize] += sub[v as usize];
            }
        }
        let mut best = (u32::MAX, u32::MAX);
        for &v in &queue {
            let mut largest = size - sub[v as usize];
            for &u in net.neighbors(v) {
                if !removed[u as usize] && u != parent[v as usize] {
                    largest = largest.max(sub[u as usize]);
                }
            }
            best = best.min((largest, v));
        }
        let c = best.1;
        removed[c as usize] = true;
        order.push(c);
        for &u in net.neighbors(c) {
            if removed[u as usize] {
                continue;
            }
            let piece =
                if u == parent[c as usize] { size - sub[c as usize] } else { sub[u as usize] };
            heap.push((piece, Reverse(u)));
        }
    }
    singles.sort_unstable();
    order.extend(singles);
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::{Network, WeightMerge};

    #[test]
    fn path_is_cut_at_its_middle_then_halves() {
        // Path 0-1-2-3-4-5-6: no 2-core; centroid 3, then 1 and 5, then singles.
        let e: Vec<(u32, u32)> = (0..6).map(|i| (i, i + 1)).collect();
        let net = Network::from_edges(7, false, e, None, WeightMerge::Max).unwrap().0;
        assert_eq!(corehd_order(&Present::new(&net, &[])), vec![3, 1, 5, 0, 2, 4, 6]);
    }

    #[test]
    fn cycle_with_tail_loses_a_cycle_node_first() {
        // Cycle 0-1-2-3 with tail 3-4-5: 2-core = cycle, all core degree 2, node 0 first.
        let e = vec![(0, 1), (1, 2), (2, 3), (3, 0), (3, 4), (4, 5)];
        let net = Network::from_edges(6, false, e, None, WeightMerge::Max).unwrap().0;
        let o = corehd_order(&Present::new(&net, &[]));
        assert_eq!(o[0], 0);
        assert_eq!(o.len(), 6);
        // Remaining path 1-2-3-4-5: centroid 3.
        assert_eq!(o[1], 3);
    }

    /// Regression (issue 4): nodes whose core degree was lowered by a
    /// peeling cascade kept a stale heap key and stayed in the 2-core, so
    /// cycles reached the forest phase. After the core phase the 2-core of
    /// what remains must be empty, on random graphs dense enough to peel.
    #[test]
    fn issue4_core_phase_leaves_a_forest() {
        for seed in 0..8 {
            let net = crate::network::generate::gnm(400, 700, seed).unwrap();
            let (_, removed) = core_phase(&Present::new(&net, &[]));
            let rest: Vec<bool> = removed.iter().map(|r| !r).collect();
            let mut deg: Vec<u32> = (0..400u32)
                .map(|v| net.neighbors(v).iter().filter(|&&u| rest[u as usize]).count() as u32)
                .collect();
            let mut alive = rest.clone();
            let mut stack: Vec<u32> =
                (0..400u32).filter(|&v| alive[v as usize] && deg[v as usize] < 2).collect();
            for &v in &stack {
                alive[v as usize] = false;
            }
            while let Some(v) = stack.pop() {
                for &u in net.neighbors(v) {
                    if alive[u as usize] {
                        deg[u as usize] -= 1;
                        if deg[u as usize] < 2 {
                            alive[u as usize] = false;
                            stack.push(u);
                        }
                    }
                }
            }
            assert!(!alive.iter().any(|&a| a), "seed {seed}: a 2-core survived the core phase");
            let o = corehd_order(&Present::new(&net, &[]));
            let mut s = o.clone();
            s.sort_unstable();
            assert_eq!(s, (0..400).collect::<Vec<u32>>(), "seed {seed}: not a permutation");
        }
    }
}
