//! The `collective-influence` rule of Morone & Makse (2015, Nature
//! 524:65), with the reinsertion step of Morone, Min, Bo, Mari & Makse
//! (2016, Sci Rep 6:30062).
//!
//! Removal phase: `CI_ℓ(i) = (k_i − 1)₊ Σ_{j ∈ ∂Ball(i, ℓ)} (k_j − 1)₊`,
//! with `k` the current degrees, `(x)₊ = max(x, 0)` and `∂Ball(i, ℓ)` the
//! nodes at shortest-path distance exactly ℓ from i in the current
//! network. The node of largest CI is removed (ties: higher current
//! degree, then lower index — so once every CI is 0 the order continues by
//! degree). The initial values are computed in parallel (one ℓ-search per
//! node; the values do not depend on the thread count). A lazy 4-ary
//! max-heap holds the keys `(CI, degree, −index)`, packed into one
//! integer (64 bits when they fit): a key that falls leaves the old
//! entry, which is refreshed when it surfaces; a key that rises pushes a
//! new entry.
//!
//! Update after removing v (degree `k_v` before the removal), by the
//! distance d = d(u, v) before the removal (Morone & Makse: only nodes
//! within ℓ + 1 change; the arithmetic below is exact, and the tests check
//! the whole order against full recomputation after every removal):
//! - d = 1, and 2 ≤ d ≤ ℓ − 1: the degree or the ball changes; CI is
//!   recomputed by an ℓ-search (for ℓ ≥ 3 it can rise).
//! - d = ℓ (ℓ ≥ 2): no shortest path of length ≤ ℓ from u passes through
//!   v except the one ending there, so the boundary only loses v:
//!   `CI(u) −= (k_u − 1)₊ (k_v − 1)₊` (k_u is unchanged for d ≥ 2).
//! - d = ℓ and d = ℓ + 1: each neighbour j of v at distance ℓ from u whose
//!   degree before the removal was ≥ 2 lowers u's sum by one:
//!   `CI(u) −= (k_u − 1)₊`.
//! - d ≥ ℓ + 2: unchanged.
//!
//! The pairs (j, u) with d(j, u) = ℓ come from the ℓ-search from each
//! neighbour j with v already removed — the same search that recomputes
//! CI(j) (a path from j through v has length ≥ ℓ + 1 to any u with d ≥ ℓ,
//! so removing v does not change those distances). So a removal costs one
//! ℓ-search per neighbour, plus one from v when ℓ ≥ 2 and `k_v` ≥ 2 (and
//! one per node at 2 ≤ d ≤ ℓ − 1). (A lazy form for ℓ ≤ 2 — no updates,
//! recompute a node's CI by one search when its entry surfaces, exact
//! because no key rises — was measured on G(10⁶, 4·10⁶): it needed about
//! 12 searches per removal and was slower.) For ℓ ≤ 2 no CI can rise (the boundary
//! only shrinks and degrees only fall), so nodes of CI 0 leave the heap,
//! and once it is empty the rest of the order is adaptive degree, taken
//! from the bucket queue of `degree-adaptive` (the same tie rule).
//!
//! Memory layout (no effect on the order): the adjacency rows of present
//! nodes are kept compact (a removed node is taken out of its neighbours'
//! rows), each node's mark, degree and CI share one slot, and each search
//! layer first reads its rows and slots in passes of independent loads so
//! that cache misses overlap.
//!
//! Reinsertion: let P be the shortest prefix of the removal order after
//! which the largest component has at most `G* = max(1, ⌊target·N⌋)`
//! present people (`target` = [`RuleParams::dismantle_target`](super::RuleParams),
//! default 1%). Starting from the network without P, removed nodes are
//! put back one at a time, each time the one that joins the fewest
//! distinct clusters (ties: smaller resulting cluster, then lower index;
//! a candidate's key is re-evaluated lazily when it reaches the top of a
//! min-heap), as long as the cluster it forms stays within G*. The final
//! order is: the nodes of P that were not put back, in CI order; then the
//! put-back nodes, last put back first; then the rest of the CI order.

use std::cmp::Reverse;
use std::collections::BinaryHeap;

use rayon::prelude::*;

use super::degree::LazyBuckets;
use super::Present;
use crate::percolation::UnionFind;

/// `mark` value of a removed node: never "unvisited".
const DEAD: u32 = u32::MAX;

/// The adjacency rows of the present nodes, kept compact: the row of a
/// present node v is `adj[off[v]..off[v] + k_v]` and holds exactly its
/// present neighbours (in no particular order), so searches never scan
/// removed nodes.
struct Rows<'a> {
    off: &'a [u64],
    adj: Vec<u32>,
}

impl<'a> Rows<'a> {
    fn new(present: &Present<'a>) -> Self {
        let (off, targets, _) = present.net.out_rows();
        let mut adj = targets.to_vec();
        for v in 0..present.alive.len() {
            let (a, b) = (off[v] as usize, off[v + 1] as usize);
            let mut w = a;
            for i in a..b {
                if present.alive[adj[i] as usize] {
                    adj[w] = adj[i];
                    w += 1;
                }
            }
        }
        Rows { off, adj }
    }

    fn row(&self, v: u32, k: u32) -> &[u32] {
        let a = self.off[v as usize] as usize;
        &self.adj[a..a + k as usize]
    }
}

/// One node's state in the removal phase, kept together so that a search
/// reads and updates a node from the single cache line it marks.
#[derive(Clone, Copy)]
struct Slot {
    /// `DEAD`, or the stamp of the last search that reached the node (a
    /// node is unvisited by the current search iff `mark < now`).
    mark: u32,
    /// Current degree (the length of the node's row).
    deg: u32,
    /// Current CI (between updates of one removal it may be stale).
    val: u64,
}

/// Current degrees and CI values, and breadth-first ball searches over
/// the nodes still present.
struct Searcher {
    node: Vec<Slot>,
    now: u32,
    /// The nodes reached at distance < radius, in distance order.
    queue: Vec<u32>,
    /// `layer[d]`: start in `queue` of the nodes at distance d, for
    /// d < radius, then `queue.len()`.
    layer: Vec<usize>,
    /// Scratch: the rows of one layer, and their entries.
    span: Vec<(usize, usize)>,
    cand: Vec<u32>,
}

impl Searcher {
    fn new(present: &Present<'_>) -> Self {
        let node = present
            .alive
            .iter()
            .zip(&present.degree)
            .map(|(&a, &k)| Slot { mark: if a { 0 } else { DEAD }, deg: k, val: 0 })
            .collect();
        Searcher {
            node,
            now: 0,
            queue: Vec::new(),
            layer: Vec::new(),
            span: Vec::new(),
            cand: Vec::new(),
        }
    }

    fn deg(&self, v: u32) -> u32 {
        self.node[v as usize].deg
    }

    fn val(&self, v: u32) -> u64 {
        self.node[v as usize].val
    }

    fn is_alive(&self, v: u32) -> bool {
        self.node[v as usize].mark != DEAD
    }

    /// Removes v: marks it dead and takes it out of its neighbours' rows
    /// (lowering their degrees). v's own row and degree are left as they
    /// were, so `rows.row(v, deg(v))` still lists its neighbours.
    fn remove(&mut self, rows: &mut Rows<'_>, v: u32) {
        self.node[v as usize].mark = DEAD;
        let a = rows.off[v as usize] as usize;
        for i in a..a + self.deg(v) as usize {
            let u = rows.adj[i];
            let x = &mut self.node[u as usize];
            let b = rows.off[u as usize] as usize;
            let k = x.deg as usize;
            // Always found in an undirected network (rows are symmetric).
            if let Some(p) = rows.adj[b..b + k].iter().position(|&w| w == v) {
                rows.adj.swap(b + p, b + k - 1);
                x.deg -= 1;
            }
        }
    }

    /// Breadth-first search from the present node `s` to depth `radius`:
    /// `f(u, slot of u)` is called once for every node u at distance
    /// exactly `radius`; the nodes nearer than that are left in `queue`.
    fn visit(&mut self, rows: &Rows<'_>, s: u32, radius: u32, mut f: impl FnMut(u32, &mut Slot)) {
        self.now += 1;
        if self.now == DEAD {
            for x in self.node.iter_mut().filter(|x| x.mark != DEAD) {
                x.mark = 0;
            }
            self.now = 1;
        }
        let now = self.now;
        self.queue.clear();
        self.layer.clear();
        self.node[s as usize].mark = now;
        if radius == 0 {
            f(s, &mut self.node[s as usize]);
            return;
        }
        self.queue.push(s);
        self.layer.push(0);
        let mut start = 0;
        for d in 1..=radius {
            let end = self.queue.len();
            if d < radius {
                self.layer.push(end);
            }
            // The layer's rows, then the slots of their entries, are first
            // read in passes of independent loads, so that their cache
            // misses overlap instead of queueing behind one another.
            let mut touch = 0u32;
            self.span.clear();
            for &v in &self.queue[start..end] {
                let k = self.node[v as usize].deg as usize;
                if k > 0 {
                    let a = rows.off[v as usize] as usize;
                    touch ^= rows.adj[a];
                    self.span.push((a, k));
                }
            }
            self.cand.clear();
            for &(a, k) in &self.span {
                self.cand.extend_from_slice(&rows.adj[a..a + k]);
            }
            for &u in &self.cand {
                touch ^= self.node[u as usize].mark;
            }
            std::hint::black_box(touch);
            start = end;
            if d < radius {
                for &u in &self.cand {
                    let x = &mut self.node[u as usize];
                    if x.mark < now {
                        x.mark = now;
                        self.queue.push(u);
                    }
                }
            } else {
                for &u in &self.cand {
                    let x = &mut self.node[u as usize];
                    if x.mark < now {
                        x.mark = now;
                        f(u, x);
                    }
                }
            }
        }
        self.layer.push(self.queue.len());
    }

    /// `CI_radius(s)` in the current network.
    fn ci(&mut self, rows: &Rows<'_>, s: u32, radius: u32) -> u64 {
        let ks = self.deg(s) as u64;
        if ks <= 1 {
            return 0;
        }
        let mut sum = 0u64;
        self.visit(rows, s, radius, |_, x| sum += (x.deg as u64).saturating_sub(1));
        (ks - 1) * sum
    }
}

/// `CI_radius` of every node (0 for absent ones), computed in parallel
/// over blocks of nodes (the values do not depend on the split).
fn initial_values(present: &Present<'_>, rows: &Rows<'_>, radius: u32) -> Vec<u64> {
    let n = present.alive.len();
    let block = (n / (4 * rayon::current_num_threads().max(1))).max(4096);
    let blocks: Vec<Vec<u64>> = (0..n.div_ceil(block))
        .into_par_iter()
        .map(|b| {
            let mut s = Searcher::new(present);
            (b * block..((b + 1) * block).min(n))
                .map(|v| if present.alive[v] { s.ci(rows, v as u32, radius) } else { 0 })
                .collect()
        })
        .collect();
    blocks.concat()
}

/// The Collective Influence order with reinsertion (see the module doc).
///
/// `radius` is ℓ; `target` the dismantled giant size as a fraction of N.
/// Meant for undirected networks (the ranking rejects directed ones).
pub fn collective_influence_order(present: &Present<'_>, radius: u32, target: f64) -> Vec<u32> {
    let order = removal_phase(present, radius);
    reinsert(present, order, target)
}

/// Heap keys `(CI, degree, −index)` packed into one integer, so that the
/// integer order is the key order.
trait Key: Copy + Ord {
    fn pack(ci: u64, k: u32, v: u32, layout: Layout) -> Self;
    fn node(self, layout: Layout) -> u32;
}

/// Bit widths of the degree and index fields of a [`Key`].
#[derive(Clone, Copy)]
struct Layout {
    deg_bits: u32,
    idx_bits: u32,
}

impl Key for u128 {
    fn pack(ci: u64, k: u32, v: u32, _: Layout) -> Self {
        ((ci as u128) << 64) | ((k as u128) << 32) | (u32::MAX - v) as u128
    }
    fn node(self, _: Layout) -> u32 {
        u32::MAX - self as u32
    }
}

/// Half the memory of `u128` keys, used when every CI, degree and index
/// the phase can meet fits (ℓ ≤ 2, where CI and degrees only fall).
impl Key for u64 {
    fn pack(ci: u64, k: u32, v: u32, l: Layout) -> Self {
        let mask = (1u64 << l.idx_bits) - 1;
        (ci << (l.deg_bits + l.idx_bits)) | ((k as u64) << l.idx_bits) | (mask - v as u64)
    }
    fn node(self, l: Layout) -> u32 {
        let mask = (1u64 << l.idx_bits) - 1;
        (mask - (self & mask)) as u32
    }
}

/// Bits needed to write `x`.
fn bits(x: u64) -> u32 {
    64 - x.leading_zeros()
}

/// A 4-ary max-heap of keys (fewer levels, hence fewer cache misses, than
/// a binary heap; the order of equal keys is irrelevant as keys are
/// distinct).
struct Heap<K>(Vec<K>);

impl<K: Key> FromIterator<K> for Heap<K> {
    fn from_iter<I: IntoIterator<Item = K>>(it: I) -> Self {
        let mut h = Heap(it.into_iter().collect());
        for i in (0..h.0.len().div_ceil(4)).rev() {
            h.sift_down(i);
        }
        h
    }
}

impl<K: Key> Heap<K> {
    fn peek(&self) -> Option<K> {
        self.0.first().copied()
    }

    fn push(&mut self, k: K) {
        let mut i = self.0.len();
        self.0.push(k);
        while i > 0 {
            let p = (i - 1) / 4;
            if self.0[p] >= k {
                break;
            }
            self.0[i] = self.0[p];
            i = p;
        }
        self.0[i] = k;
    }

    fn pop(&mut self) {
        if let Some(last) = self.0.pop() {
            if !self.0.is_empty() {
                self.0[0] = last;
                self.sift_down(0);
            }
        }
    }

    /// Replaces the top key by `k` (not larger).
    fn replace_top(&mut self, k: K) {
        self.0[0] = k;
        self.sift_down(0);
    }

    fn sift_down(&mut self, mut i: usize) {
        let h = &mut self.0;
        let n = h.len();
        let k = h[i];
        loop {
            let c = 4 * i + 1;
            if c >= n {
                break;
            }
            let mut best = c;
            for d in c + 1..(c + 4).min(n) {
                if h[d] > h[best] {
                    best = d;
                }
            }
            if h[best] <= k {
                break;
            }
            h[i] = h[best];
            i = best;
        }
        h[i] = k;
    }
}

/// The removal phase (module doc): every present node, in CI order.
fn removal_phase(present: &Present<'_>, radius: u32) -> Vec<u32> {
    let n = present.alive.len();
    let rows = Rows::new(present);
    let mut s = Searcher::new(present);
    for (x, c) in s.node.iter_mut().zip(initial_values(present, &rows, radius)) {
        x.val = c;
    }
    let layout = Layout {
        deg_bits: bits(present.degree.iter().copied().max().unwrap_or(0) as u64),
        idx_bits: bits(n as u64),
    };
    let ci_bits = bits(s.node.iter().map(|x| x.val).max().unwrap_or(0));
    if radius <= 2 && ci_bits.max(1) + layout.deg_bits + layout.idx_bits <= 64 {
        removal_loop::<u64>(rows, s, radius, layout)
    } else {
        removal_loop::<u128>(rows, s, radius, layout)
    }
}

/// The removal loop of [`removal_phase`] with heap keys of type `K`.
fn removal_loop<K: Key>(mut rows: Rows<'_>, mut s: Searcher, radius: u32, l: Layout) -> Vec<u32> {
    let n = s.node.len();
    // For ℓ ≤ 2 no CI rises: every node with CI > 0 has exactly one
    // entry, and nodes of CI 0 need none.
    let rises = radius >= 3;
    let entry = |s: &Searcher, v: u32| K::pack(s.val(v), s.deg(v), v, l);
    let mut heap: Heap<K> = (0..n as u32)
        .filter(|&v| s.is_alive(v) && (rises || s.val(v) > 0))
        .map(|v| entry(&s, v))
        .collect();
    // ℓ ≥ 3: `bound[v]` is the key of v's heap entry that is at least v's
    // current key. A key that falls pushes nothing (the entry is refreshed
    // when it surfaces); a key that rises pushes a new entry.
    let mut bound: Vec<K> =
        if rises { (0..n as u32).map(|v| entry(&s, v)).collect() } else { Vec::new() };
    let mut order = Vec::with_capacity(n);
    // Nodes at 2 ≤ d ≤ ℓ − 1 and at d = ℓ from the removed node.
    let mut inner: Vec<u32> = Vec::new();
    let mut shell: Vec<u32> = Vec::new();
    // Recomputed CI of the removed node's neighbours.
    let mut fresh: Vec<(u32, u64)> = Vec::new();
    while let Some(top) = heap.peek() {
        let v = top.node(l);
        let vi = v as usize;
        if !s.is_alive(v) {
            heap.pop();
            continue;
        }
        let now = entry(&s, v);
        if now != top {
            // A stale entry: refresh it in place if it is v's bound (ℓ ≥ 3)
            // or v's CI is still positive (ℓ ≤ 2).
            if rises && bound[vi] == top {
                bound[vi] = now;
                heap.replace_top(now);
            } else if !rises && s.val(v) > 0 {
                heap.replace_top(now);
            } else {
                heap.pop();
            }
            continue;
        }
        heap.pop();
        let kv = s.deg(v);
        order.push(v);
        if kv == 0 {
            s.remove(&mut rows, v);
            continue;
        }
        inner.clear();
        shell.clear();
        if (radius >= 2 && kv >= 2) || radius >= 3 {
            // Distances from v before its removal: nodes at d = ℓ get the
            // v term, nodes at 2 ≤ d ≤ ℓ − 1 are recomputed.
            let reach = if kv >= 2 { radius } else { radius - 1 };
            let target = if kv >= 2 { &mut shell } else { &mut inner };
            s.visit(&rows, v, reach, |u, _| target.push(u));
            if reach >= 2 {
                inner.extend_from_slice(&s.queue[s.layer[2]..]);
            }
        }
        s.remove(&mut rows, v);
        let tv = (kv - 1) as u64;
        for &u in &shell {
            let x = &mut s.node[u as usize];
            x.val -= (x.deg as u64).saturating_sub(1) * tv;
        }
        fresh.clear();
        for &j in rows.row(v, kv) {
            let kj = s.deg(j) as u64;
            if kj == 0 {
                fresh.push((j, 0));
                continue;
            }
            // Old degree ≥ 2: j's boundary term drops by one for every u at
            // distance ℓ from j. Values of nodes within ℓ − 1 of v (the
            // neighbours and `inner`) are overwritten below, so the
            // subtraction may wrap for them.
            let mut sum = 0u64;
            s.visit(&rows, j, radius, |_, x| {
                let t = (x.deg as u64).saturating_sub(1);
                sum += t;
                x.val = x.val.wrapping_sub(t);
            });
            fresh.push((j, kj.saturating_sub(1) * sum));
        }
        for &(j, x) in &fresh {
            s.node[j as usize].val = x;
        }
        for &u in &inner {
            s.node[u as usize].val = s.ci(&rows, u, radius);
        }
        for u in fresh.iter().map(|&(j, _)| j).chain(inner.iter().copied()).filter(|_| rises) {
            let k = entry(&s, u);
            if k > bound[u as usize] {
                bound[u as usize] = k;
                heap.push(k);
            }
        }
    }
    // ℓ ≤ 2: the heap is empty once every CI is 0, and they stay 0, so the
    // rest is adaptive degree (highest degree, then lower index — the
    // heap's tie rule). ℓ ≥ 3: nobody is left.
    drop(heap);
    finish_by_degree(&mut rows, &mut s, &mut order);
    order
}

/// Appends the present nodes of `s` in adaptive-degree order (highest
/// current degree first, ties by lower index).
fn finish_by_degree(rows: &mut Rows<'_>, s: &mut Searcher, order: &mut Vec<u32>) {
    let rest: Vec<(u32, u32)> =
        (0..s.node.len() as u32).filter(|&v| s.is_alive(v)).map(|v| (v, s.deg(v))).collect();
    let mut queue = LazyBuckets::new(rest.into_iter());
    while let Some(v) = queue.pop(|v| s.deg(v)) {
        s.remove(rows, v);
        order.push(v);
    }
}

/// The reinsertion step (module doc) applied to a complete removal order.
fn reinsert(present: &Present<'_>, order: Vec<u32>, target: f64) -> Vec<u32> {
    let net = present.net;
    let n = present.alive.len();
    let cap = ((target * n as f64).floor() as u32).max(1);
    // Largest component after removing the first k, for every k (reverse add).
    let mut uf = UnionFind::new_inactive(n);
    let mut largest_after = vec![0u32; order.len() + 1];
    let mut k = order.len();
    largest_after[k] = 0;
    while k > 0 {
        k -= 1;
        let v = order[k];
        uf.activate(v);
        for &u in net.neighbors(v) {
            if uf.is_active(u) {
                uf.union(v, u);
            }
        }
        largest_after[k] = uf.largest();
    }
    let p = (0..=order.len()).find(|&k| largest_after[k] <= cap).unwrap_or(order.len());
    // State: everyone except the prefix P present.
    uf.reset_inactive();
    for &v in &order[p..] {
        uf.activate(v);
    }
    for &v in &order[p..] {
        for &u in net.neighbors(v) {
            if u > v && uf.is_active(u) {
                uf.union(v, u);
            }
        }
    }
    let mut roots: Vec<u32> = Vec::new();
    let key_of = |uf: &mut UnionFind, v: u32, roots: &mut Vec<u32>| -> (u32, u32) {
        roots.clear();
        for &u in net.neighbors(v) {
            if uf.is_active(u) {
                roots.push(uf.find(u));
            }
        }
        roots.sort_unstable();
        roots.dedup();
        let mut size = 1u32;
        for &r in roots.iter() {
            size += uf.component_size(r);
        }
        (roots.len() as u32, size)
    };
    let mut heap: BinaryHeap<Reverse<(u32, u32, u32)>> = BinaryHeap::new();
    for &v in &order[..p] {
        let (c, s) = key_of(&mut uf, v, &mut roots);
        heap.push(Reverse((c, s, v)));
    }
    let mut back = vec![false; n];
    let mut put_back: Vec<u32> = Vec::new();
    while let Some(Reverse((c, s, v))) = heap.pop() {
        let (c2, s2) = key_of(&mut uf, v, &mut roots);
        if (c2, s2) != (c, s) {
            heap.push(Reverse((c2, s2, v)));
            continue;
        }
        if s > cap {
            break;
        }
        uf.activate(v);
        for &u in net.neighbors(v) {
            if uf.is_active(u) {
                uf.union(v, u);
            }
        }
        back[v as usize] = true;
        put_back.push(v);
    }
    let mut out: Vec<u32> = order[..p].iter().copied().filter(|&v| !back[v as usize]).collect();
    out.extend(put_back.iter().rev());
    out.extend_from_slice(&order[p..]);
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::generate::{barabasi_albert, gnm};
    use crate::network::{Network, WeightMerge};

    /// CI_radius(i) by a plain BFS over `alive` (independent of `Searcher`).
    fn plain_ci(net: &Network, alive: &[bool], deg: &[u32], i: u32, radius: u32) -> u64 {
        let ki = deg[i as usize] as u64;
        if ki <= 1 {
            return 0;
        }
        let mut dist = vec![u32::MAX; alive.len()];
        dist[i as usize] = 0;
        let mut queue = vec![i];
        let mut q = 0;
        let mut s = 0u64;
        while q < queue.len() {
            let v = queue[q];
            q += 1;
            let d = dist[v as usize];
            if d == radius {
                s += (deg[v as usize] as u64).saturating_sub(1);
                continue;
            }
            for &u in net.neighbors(v) {
                if alive[u as usize] && dist[u as usize] == u32::MAX {
                    dist[u as usize] = d + 1;
                    queue.push(u);
                }
            }
        }
        (ki - 1) * s
    }

    #[test]
    fn ci_of_a_path_node_counts_the_distance_two_boundary() {
        // Path 0-1-2-3-4, worked by hand from the definition in Morone &
        // Makse (2015): CI_2(2) = (2−1)·((k_0 − 1) + (k_4 − 1)) = 0;
        // CI_2(1) = 1·(k_3 − 1) = 1; CI_1(2) = 1·((k_1 − 1) + (k_3 − 1)) = 2.
        let e: Vec<(u32, u32)> = (0..4).map(|i| (i, i + 1)).collect();
        let net = Network::from_edges(5, false, e, None, WeightMerge::Max).unwrap().0;
        let p = Present::new(&net, &[]);
        let (rows, mut s) = (Rows::new(&p), Searcher::new(&p));
        for (i, r, want) in [(2, 2, 0), (1, 2, 1), (0, 2, 0), (2, 1, 2), (1, 0, 1)] {
            assert_eq!(s.ci(&rows, i, r), want, "CI_{r}({i})");
            assert_eq!(plain_ci(&net, &p.alive, &p.degree, i, r), want, "CI_{r}({i})");
        }
    }

    /// The removal phase by its definition: after every removal, the CI of
    /// every present node is recomputed from scratch and the largest key
    /// `(CI, degree, −index)` goes next.
    fn naive_ci_order(present: &Present<'_>, radius: u32) -> Vec<u32> {
        let net = present.net;
        let n = present.alive.len();
        let mut alive = present.alive.clone();
        let mut deg = present.degree.clone();
        let mut order = Vec::new();
        for _ in 0..present.candidates().len() {
            let mut best: Option<(u64, u32, Reverse<u32>)> = None;
            for v in 0..n as u32 {
                if alive[v as usize] {
                    let c = plain_ci(net, &alive, &deg, v, radius);
                    best = best.max(Some((c, deg[v as usize], Reverse(v))));
                }
            }
            let v = best.unwrap().2 .0;
            alive[v as usize] = false;
            for &u in net.neighbors(v) {
                if alive[u as usize] {
                    deg[u as usize] -= 1;
                }
            }
            order.push(v);
        }
        order
    }

    fn check(net: &Network, absent: &[bool], radius: u32, what: &str) {
        let p = Present::new(net, absent);
        // Huge target: no reinsertion, so the order is the removal phase.
        let fast = collective_influence_order(&p, radius, 1.0);
        assert_eq!(fast, naive_ci_order(&p, radius), "{what}, radius {radius}");
    }

    #[test]
    fn incremental_updates_match_full_recomputation() {
        let net = gnm(300, 700, 9).unwrap();
        for radius in [0, 1, 2, 3, 4] {
            check(&net, &[], radius, "G(300, 700)");
        }
        for seed in [1, 2, 3] {
            let net = gnm(250, 500 + 100 * seed, seed).unwrap();
            let absent: Vec<bool> = (0..250).map(|v| v % 5 == seed as usize).collect();
            for radius in [1, 2, 3] {
                check(&net, &absent, radius, &format!("G(250, m) seed {seed}, absent"));
            }
        }
        let ba = barabasi_albert(300, 2, 4).unwrap();
        let absent: Vec<bool> = (0..300).map(|v| v % 11 == 3).collect();
        for radius in [1, 2, 3] {
            check(&ba, &[], radius, "Barabási–Albert(300, 2)");
            check(&ba, &absent, radius, "Barabási–Albert(300, 2), absent");
        }
    }

    #[test]
    fn incremental_updates_match_full_recomputation_at_2000_nodes() {
        let net = gnm(2000, 5000, 17).unwrap();
        check(&net, &[], 2, "G(2000, 5000)");
    }

    #[test]
    fn order_is_a_permutation() {
        let e = vec![(0, 1), (1, 2), (2, 0), (2, 3), (3, 4), (4, 5), (5, 3), (5, 6)];
        let net = Network::from_edges(8, false, e, None, WeightMerge::Max).unwrap().0;
        let mut o = collective_influence_order(&Present::new(&net, &[]), 2, 0.01);
        o.sort_unstable();
        assert_eq!(o, (0..8).collect::<Vec<_>>());
    }
}
