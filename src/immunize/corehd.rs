//! The `corehd` rule of Zdeborová, Zhang & Zhou (2016, Sci Rep 6:37954):
//! repeatedly remove the highest-degree node of the current 2-core, then
//! break the remaining forest.
//!
//! Core phase: the 2-core is kept incrementally — removing a node lowers
//! its neighbours' core degrees, and any node whose core degree falls below
//! 2 is peeled off the core (it stays in the network, it is not dosed),
//! cascading. The highest core degree is taken from a lazy bucket queue
//! (the one adaptive degree uses) that gives the order of a max-heap keyed
//! `(core degree, −index)`: ties go to the lower index.
//!
//! Forest phase (once the 2-core is empty, everything left is a forest):
//! the largest remaining tree is broken at its centroid (the node whose
//! removal leaves the smallest largest piece; of two centroids the lower
//! index), its pieces go back in the queue, and so on until single nodes
//! remain, which come last by index. This greedy centroid breaking is our
//! documented choice for the tree stage; it halves the largest tree at
//! every cut, in O(N log N).

use std::cmp::Reverse;

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
    // degree 2 after them (the queue refiles lowered keys lazily).
    let peel = |stack: &mut Vec<u32>, in_core: &mut Vec<bool>, cdeg: &mut Vec<u32>| {
        while let Some(v) = stack.pop() {
            for &u in net.neighbors(v) {
                let ui = u as usize;
                if in_core[ui] {
                    cdeg[ui] -= 1;
                    if cdeg[ui] < 2 {
                        in_core[ui] = false;
                        stack.push(u);
                    }
                }
            }
        }
    };
    peel(&mut stack, &mut in_core, &mut cdeg);
    let mut queue = super::degree::LazyBuckets::new(
        (0..n as u32).filter(|&v| in_core[v as usize]).map(|v| (v, cdeg[v as usize])),
    );
    let mut order = Vec::with_capacity(present.candidates().len());
    loop {
        let next = queue.pop(|v| if in_core[v as usize] { cdeg[v as usize] } else { u32::MAX });
        let Some(v) = next else { break };
        in_core[v as usize] = false;
        removed[v as usize] = true;
        order.push(v);
        // Removing v lowers its core neighbours exactly as peeling it would.
        stack.push(v);
        peel(&mut stack, &mut in_core, &mut cdeg);
    }
    debug_assert!(!in_core.iter().any(|&c| c), "the 2-core is empty when the heap is");
    (order, removed)
}

/// Appends to `order` every node not yet `removed`, breaking the forest
/// they form at centroids of the largest tree first. `removed` must leave
/// a forest.
///
/// The cut sequence is that of a max-heap of pieces keyed `(size, −root)`
/// (a piece's root is the neighbour of the previous cut inside it; a whole
/// tree's root is its lowest index): pop the largest piece, remove its
/// centroid, push the pieces it leaves, until only single nodes remain,
/// which follow by index. Pieces are disjoint and a cut depends only on
/// its own piece, and every piece is smaller than the piece it came from,
/// so each tree is decomposed on its own (relabeled in search order, for
/// locality) and the cuts of all trees are then sorted by `(size, −root)`:
/// the same sequence as the heap.
pub(crate) fn break_forest(
    net: &crate::network::Network,
    removed: &mut [bool],
    order: &mut Vec<u32>,
) {
    let n = removed.len();
    // The forest's own rows (neighbours not removed, in network order), in
    // one sequential pass: the tree searches below then read short rows of
    // a small array instead of whole contact lists at random.
    let mut foff: Vec<u32> = Vec::with_capacity(n + 1);
    let mut fadj: Vec<u32> = Vec::new();
    foff.push(0);
    for v in 0..n as u32 {
        if !removed[v as usize] {
            fadj.extend(net.neighbors(v).iter().filter(|&&u| !removed[u as usize]));
        }
        foff.push(fadj.len() as u32);
    }
    let forest = |v: u32| &fadj[foff[v as usize] as usize..foff[v as usize + 1] as usize];
    // Local (per tree) labels: position in a search of the tree.
    let mut local = vec![u32::MAX; n];
    let mut tree: Vec<u32> = Vec::new();
    let mut dec = TreeCuts::default();
    // (piece size, piece root, centroid), global labels.
    let mut cuts: Vec<(u32, u32, u32)> = Vec::new();
    for s in 0..n as u32 {
        if removed[s as usize] || local[s as usize] != u32::MAX {
            continue;
        }
        // One search of the tree gives its local labels and, row by row in
        // label order, its forest adjacency (global labels until relabeled).
        tree.clear();
        tree.push(s);
        local[s as usize] = 0;
        dec.off.clear();
        dec.adj.clear();
        dec.off.push(0);
        let mut i = 0;
        while i < tree.len() {
            let v = tree[i];
            i += 1;
            for &u in forest(v) {
                dec.adj.push(u);
                if local[u as usize] == u32::MAX {
                    local[u as usize] = tree.len() as u32;
                    tree.push(u);
                }
            }
            dec.off.push(dec.adj.len() as u32);
        }
        if tree.len() < 2 {
            continue;
        }
        dec.load(&local, tree.len());
        let first = cuts.len();
        dec.run(&tree, &mut cuts);
        for c in &mut cuts[first..] {
            *c = (c.0, tree[c.1 as usize], tree[c.2 as usize]);
        }
    }
    cuts.sort_unstable_by_key(|&(size, root, _)| (Reverse(size), root));
    for &(_, _, c) in &cuts {
        removed[c as usize] = true;
        order.push(c);
    }
    for (v, r) in removed.iter_mut().enumerate() {
        if !*r {
            *r = true;
            order.push(v as u32);
        }
    }
}

/// Centroid decomposition of one tree in local labels (search order).
#[derive(Default)]
struct TreeCuts {
    off: Vec<u32>,
    adj: Vec<u32>,
    cut: Vec<bool>,
    parent: Vec<u32>,
    sub: Vec<u32>,
    stamp: Vec<u32>,
    round: u32,
    queue: Vec<u32>,
    pieces: Vec<(u32, u32)>,
}

impl TreeCuts {
    /// Relabels the adjacency rows filled by the search (`local[v]` = v's
    /// label) and sizes the work arrays for a tree of `s` nodes.
    fn load(&mut self, local: &[u32], s: usize) {
        for u in &mut self.adj {
            *u = local[*u as usize];
        }
        self.cut.clear();
        self.cut.resize(s, false);
        self.parent.clear();
        self.parent.resize(s, u32::MAX);
        self.sub.clear();
        self.sub.resize(s, 0);
        self.stamp.clear();
        self.stamp.resize(s, 0);
        self.round = 0;
    }

    /// Cuts every piece of at least two nodes at its centroid (the node
    /// whose removal leaves the smallest largest piece; of two, the lower
    /// global index) and appends `(size, root, centroid)` in local labels.
    fn run(&mut self, glob: &[u32], cuts: &mut Vec<(u32, u32, u32)>) {
        self.pieces.clear();
        self.pieces.push((glob.len() as u32, 0));
        while let Some((size, root)) = self.pieces.pop() {
            if size < 2 {
                continue;
            }
            // Search the piece from its root, then subtree sizes in
            // reverse search order. Stamps keep the search finite even if
            // the input were not a forest.
            self.round += 1;
            let round = self.round;
            self.queue.clear();
            self.queue.push(root);
            self.stamp[root as usize] = round;
            self.parent[root as usize] = u32::MAX;
            let mut i = 0;
            while i < self.queue.len() {
                let v = self.queue[i] as usize;
                i += 1;
                for &u in &self.adj[self.off[v] as usize..self.off[v + 1] as usize] {
                    let ui = u as usize;
                    if !self.cut[ui] && self.stamp[ui] != round {
                        self.stamp[ui] = round;
                        self.parent[ui] = v as u32;
                        self.queue.push(u);
                    }
                }
            }
            debug_assert_eq!(self.queue.len() as u32, size);
            for &v in &self.queue {
                self.sub[v as usize] = 1;
            }
            for &v in self.queue.iter().rev() {
                let p = self.parent[v as usize];
                if p != u32::MAX {
                    self.sub[p as usize] += self.sub[v as usize];
                }
            }
            let mut best = (u32::MAX, u32::MAX, 0u32);
            for &v in &self.queue {
                let vi = v as usize;
                let mut largest = size - self.sub[vi];
                for &u in &self.adj[self.off[vi] as usize..self.off[vi + 1] as usize] {
                    if !self.cut[u as usize] && u != self.parent[vi] {
                        largest = largest.max(self.sub[u as usize]);
                    }
                }
                if (largest, glob[vi]) < (best.0, best.1) {
                    best = (largest, glob[vi], v);
                }
            }
            let c = best.2 as usize;
            self.cut[c] = true;
            cuts.push((size, root, c as u32));
            for &u in &self.adj[self.off[c] as usize..self.off[c + 1] as usize] {
                if self.cut[u as usize] {
                    continue;
                }
                let piece =
                    if u == self.parent[c] { size - self.sub[c] } else { self.sub[u as usize] };
                self.pieces.push((piece, u));
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::{Network, WeightMerge};
    use std::collections::BinaryHeap;

    /// The plain max-heap form of [`break_forest`] (global labels).
    fn heap_break_forest(
        net: &crate::network::Network,
        removed: &mut [bool],
        order: &mut Vec<u32>,
    ) {
        let n = removed.len();
        // The forest's own adjacency (edges between nodes not removed): the
        // repeated tree searches below then scan short lists instead of every
        // contact of the original network.
        let mut off = vec![0u32; n + 1];
        for v in 0..n {
            off[v + 1] = off[v]
                + if removed[v] {
                    0
                } else {
                    net.neighbors(v as u32).iter().filter(|&&u| !removed[u as usize]).count() as u32
                };
        }
        let mut adj = vec![0u32; off[n] as usize];
        for v in 0..n {
            if !removed[v] {
                let mut k = off[v] as usize;
                for &u in net.neighbors(v as u32) {
                    if !removed[u as usize] {
                        adj[k] = u;
                        k += 1;
                    }
                }
            }
        }
        let forest = |v: u32| &adj[off[v as usize] as usize..off[v as usize + 1] as usize];
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
                for &u in forest(v) {
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
                for &u in forest(v) {
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
                for &u in forest(v) {
                    if !removed[u as usize] && u != parent[v as usize] {
                        largest = largest.max(sub[u as usize]);
                    }
                }
                best = best.min((largest, v));
            }
            let c = best.1;
            removed[c as usize] = true;
            order.push(c);
            for &u in forest(c) {
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

    #[test]
    fn per_tree_decomposition_gives_the_heap_order() {
        // Sparse random graphs (mean degree 1.6) are mostly forests; the
        // core phase first removes what cycles there are.
        for seed in 0..8 {
            let net = crate::network::generate::gnm(2000, 1600, seed).unwrap();
            let p = Present::new(&net, &[]);
            let (mut fast, mut removed) = core_phase(&p);
            let (mut slow, mut removed2) = (fast.clone(), removed.clone());
            break_forest(&net, &mut removed, &mut fast);
            heap_break_forest(&net, &mut removed2, &mut slow);
            assert_eq!(fast, slow, "seed {seed}");
        }
    }

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

    /// The core phase with a plain lazy max-heap keyed `(core degree,
    /// −index)` and a fresh entry per lowered key (the textbook form).
    fn heap_core_order(present: &Present<'_>) -> Vec<u32> {
        let net = present.net;
        let n = present.alive.len();
        let mut in_core = present.alive.clone();
        let mut cdeg = present.degree.clone();
        let mut stack: Vec<u32> =
            (0..n as u32).filter(|&v| in_core[v as usize] && cdeg[v as usize] < 2).collect();
        for &v in &stack {
            in_core[v as usize] = false;
        }
        let key = |d: u32, v: u32| ((d as u64) << 32) | (u32::MAX - v) as u64;
        let mut heap = BinaryHeap::new();
        let mut order = Vec::new();
        let mut first = true;
        loop {
            while let Some(v) = stack.pop() {
                for &u in net.neighbors(v) {
                    if in_core[u as usize] {
                        cdeg[u as usize] -= 1;
                        if cdeg[u as usize] < 2 {
                            in_core[u as usize] = false;
                            stack.push(u);
                        } else if !first {
                            heap.push(key(cdeg[u as usize], u));
                        }
                    }
                }
            }
            if first {
                first = false;
                heap = (0..n as u32)
                    .filter(|&v| in_core[v as usize])
                    .map(|v| key(cdeg[v as usize], v))
                    .collect();
            }
            let Some(k) = heap.pop() else { break };
            let v = u32::MAX - (k as u32);
            if !in_core[v as usize] || cdeg[v as usize] != (k >> 32) as u32 {
                continue;
            }
            in_core[v as usize] = false;
            order.push(v);
            stack.push(v);
        }
        order
    }

    #[test]
    fn bucket_queue_core_phase_gives_the_heap_order() {
        for seed in 0..6 {
            let net = crate::network::generate::gnm(600, 1500, seed).unwrap();
            let absent: Vec<bool> = (0..600).map(|v| v % 5 == seed as usize).collect();
            for a in [&[][..], &absent[..]] {
                let p = Present::new(&net, a);
                assert_eq!(core_phase(&p).0, heap_core_order(&p), "seed {seed}");
            }
        }
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
