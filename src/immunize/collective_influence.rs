//! The `collective-influence` rule of Morone & Makse (2015, Nature
//! 524:65), with the reinsertion step of Morone, Min, Bo, Mari & Makse
//! (2016, Sci Rep 6:30062).
//!
//! Removal phase: `CI_ℓ(i) = (k_i − 1) Σ_{j ∈ ∂Ball(i, ℓ)} (k_j − 1)`,
//! with `k` the current degrees and `∂Ball(i, ℓ)` the nodes at shortest-path
//! distance exactly ℓ from i in the current network. The node of largest
//! CI is removed (ties: higher current degree, then lower index — so once
//! every CI is 0 the order continues by degree). Only nodes within ℓ + 1 of
//! it can change: those within ℓ are recomputed, and those at exactly
//! ℓ + 1 are updated in place (their ball is unchanged; each neighbour j of
//! the removed node at distance ℓ from them lowers their sum by one), found
//! by one ℓ-search from each neighbour; a lazy max-heap skips stale
//! entries. O(N log N) overall on sparse networks of bounded degree.
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

use super::Present;
use crate::network::Network;
use crate::percolation::UnionFind;

struct Ball {
    stamp: Vec<u32>,
    dist: Vec<u32>,
    now: u32,
    queue: Vec<u32>,
}

impl Ball {
    fn new(n: usize) -> Self {
        Ball { stamp: vec![0; n], dist: vec![0; n], now: 0, queue: Vec::new() }
    }

    /// BFS from `s` over alive nodes to depth `radius`; `queue` holds the
    /// visited nodes with `dist` set.
    fn search(&mut self, net: &Network, alive: &[bool], s: u32, radius: u32) {
        self.now = self.now.wrapping_add(1);
        if self.now == 0 {
            self.stamp.fill(0);
            self.now = 1;
        }
        self.queue.clear();
        self.queue.push(s);
        self.stamp[s as usize] = self.now;
        self.dist[s as usize] = 0;
        let mut i = 0;
        while i < self.queue.len() {
            let v = self.queue[i];
            i += 1;
            let d = self.dist[v as usize];
            if d == radius {
                continue;
            }
            for &u in net.neighbors(v) {
                let ui = u as usize;
                if alive[ui] && self.stamp[ui] != self.now {
                    self.stamp[ui] = self.now;
                    self.dist[ui] = d + 1;
                    self.queue.push(u);
                }
            }
        }
    }
}

fn ci(net: &Network, alive: &[bool], deg: &[u32], ball: &mut Ball, i: u32, radius: u32) -> u64 {
    let ki = deg[i as usize] as u64;
    if ki <= 1 {
        return 0;
    }
    ball.search(net, alive, i, radius);
    let mut s = 0u64;
    for &j in &ball.queue {
        if ball.dist[j as usize] == radius {
            s += (deg[j as usize] as u64).saturating_sub(1);
        }
    }
    (ki - 1) * s
}

/// The Collective Influence order with reinsertion (see the module doc).
///
/// `radius` is ℓ; `target` the dismantled giant size as a fraction of N.
pub fn collective_influence_order(present: &Present<'_>, radius: u32, target: f64) -> Vec<u32> {
    let net = present.net;
    let n = present.alive.len();
    let mut alive = present.alive.clone();
    let mut deg = present.degree.clone();
    let mut ball = Ball::new(n);
    let mut near = Ball::new(n);
    let mut val = vec![0u64; n];
    type Key = (u64, u32, Reverse<u32>);
    let mut heap: BinaryHeap<Key> = BinaryHeap::new();
    for v in present.candidates() {
        val[v as usize] = ci(net, &alive, &deg, &mut ball, v, radius);
        heap.push((val[v as usize], deg[v as usize], Reverse(v)));
    }
    let mut order = Vec::with_capacity(heap.len());
    let mut inner: Vec<u32> = Vec::new();
    let mut outer: Vec<u32> = Vec::new();
    while let Some((c, d, Reverse(v))) = heap.pop() {
        let vi = v as usize;
        if !alive[vi] || val[vi] != c || deg[vi] != d {
            continue;
        }
        // Distances from v before its removal, to depth ℓ + 1.
        near.search(net, &alive, v, radius + 1);
        inner.clear();
        outer.clear();
        for &u in &near.queue {
            if u == v {
                continue;
            }
            if near.dist[u as usize] <= radius || radius == 0 {
                inner.push(u);
            } else {
                outer.push(u);
            }
        }
        alive[vi] = false;
        order.push(v);
        if radius > 0 {
            // A node u at distance exactly ℓ + 1 keeps its ball; only the
            // boundary terms (k_j − 1) of v's neighbours j at distance ℓ
            // from u drop by one. Count those j by an ℓ-search from each j
            // (paths avoiding v, since v is at distance ℓ + 1 from u).
            for &j in net.neighbors(v) {
                if !alive[j as usize] || deg[j as usize] < 2 {
                    continue;
                }
                ball.search(net, &alive, j, radius);
                for &u in &ball.queue {
                    let ui = u as usize;
                    if ball.dist[ui] == radius
                        && near.stamp[ui] == near.now
                        && near.dist[ui] == radius + 1
                    {
                        val[ui] -= (deg[ui] as u64).saturating_sub(1);
                    }
                }
            }
            for &u in &outer {
                heap.push((val[u as usize], deg[u as usize], Reverse(u)));
            }
        }
        for &u in net.neighbors(v) {
            if alive[u as usize] {
                deg[u as usize] -= 1;
            }
        }
        for &u in &inner {
            let x = ci(net, &alive, &deg, &mut ball, u, radius);
            val[u as usize] = x;
            heap.push((x, deg[u as usize], Reverse(u)));
        }
    }
    reinsert(present, order, target)
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
    use crate::network::WeightMerge;

    #[test]
    fn ci_of_a_path_node_counts_the_distance_two_boundary() {
        // Path 0-1-2-3-4: CI_2(2) = (2−1)·((k_0 − 1) + (k_4 − 1)) = 0;
        // CI_2(1) = 1·(k_3 − 1) = 1.
        let e: Vec<(u32, u32)> = (0..4).map(|i| (i, i + 1)).collect();
        let net = Network::from_edges(5, false, e, None, WeightMerge::Max).unwrap().0;
        let p = Present::new(&net, &[]);
        let mut b = Ball::new(5);
        assert_eq!(ci(&net, &p.alive, &p.degree, &mut b, 2, 2), 0);
        assert_eq!(ci(&net, &p.alive, &p.degree, &mut b, 1, 2), 1);
        assert_eq!(ci(&net, &p.alive, &p.degree, &mut b, 0, 2), 0);
    }

    /// The same removal phase recomputing every node within ℓ + 1.
    fn naive_ci_order(present: &Present<'_>, radius: u32) -> Vec<u32> {
        let net = present.net;
        let n = present.alive.len();
        let mut alive = present.alive.clone();
        let mut deg = present.degree.clone();
        let mut ball = Ball::new(n);
        let mut order = Vec::new();
        for _ in 0..present.candidates().len() {
            let mut best: Option<(u64, u32, Reverse<u32>)> = None;
            for v in 0..n as u32 {
                if alive[v as usize] {
                    let k =
                        (ci(net, &alive, &deg, &mut ball, v, radius), deg[v as usize], Reverse(v));
                    best = best.max(Some(k));
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

    #[test]
    fn incremental_updates_match_full_recomputation() {
        let net = crate::network::generate::gnm(300, 700, 9).unwrap();
        let p = Present::new(&net, &[]);
        for radius in [1, 2, 3] {
            // Huge target: no reinsertion, so the order is the removal phase.
            let fast = collective_influence_order(&p, radius, 1.0);
            assert_eq!(fast, naive_ci_order(&p, radius), "radius {radius}");
        }
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
