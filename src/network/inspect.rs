//! Structural summaries of a network: degree moments, components,
//! clustering, assortativity, cores and the configuration-model threshold
//! estimate. Pure functions of a [`Network`]; reading files is
//! `network::load`, printing is `cli::inspect`.
//!
//! Directed networks: [`core_numbers`] uses the total degree (in + out,
//! direction ignored), [`connected_components`] gives weakly connected
//! components and [`strongly_connected_components`] the strong ones.

use serde::Serialize;

use super::load::LoadReport;
use super::{Network, WeightMerge};

/// A partition of the nodes into components.
///
/// Component ids are dense, `0..count()`, and numbered in order of each
/// component's smallest node index, so they do not depend on the algorithm.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Components {
    /// Component id of each node.
    pub of: Vec<u32>,
    /// Number of nodes in each component, by id.
    pub sizes: Vec<u64>,
}

impl Components {
    /// Number of components (isolated nodes count as components).
    pub fn count(&self) -> usize {
        self.sizes.len()
    }

    /// Size of the largest component (0 for an empty network).
    pub fn largest(&self) -> u64 {
        self.sizes.iter().copied().max().unwrap_or(0)
    }

    /// Size of the second-largest component (0 when there is at most one).
    /// Ties count: two components of size 5 give largest 5, second 5.
    pub fn second_largest(&self) -> u64 {
        let (mut a, mut b) = (0u64, 0u64);
        for &s in &self.sizes {
            if s > a {
                b = a;
                a = s;
            } else if s > b {
                b = s;
            }
        }
        b
    }

    /// Id of a largest component (the lowest id among ties), if any.
    pub fn largest_id(&self) -> Option<u32> {
        let best = self.largest();
        self.sizes.iter().position(|&s| s == best && s > 0).map(|i| i as u32)
    }

    /// Renumbers arbitrary labels `raw[v]` (each `< raw_count`) into ids
    /// ordered by smallest member.
    fn from_labels(raw: Vec<u32>, raw_count: usize) -> Components {
        const NONE: u32 = u32::MAX;
        let mut map = vec![NONE; raw_count];
        let mut sizes: Vec<u64> = Vec::new();
        let mut of = raw;
        for c in of.iter_mut() {
            let m = &mut map[*c as usize];
            if *m == NONE {
                *m = sizes.len() as u32;
                sizes.push(0);
            }
            *c = *m;
            sizes[*m as usize] += 1;
        }
        Components { of, sizes }
    }
}

/// Core number of every node: the largest `k` such that the node belongs
/// to the `k`-core, the maximal subgraph whose nodes all have degree ≥ `k`.
///
/// Batagelj & Zaversnik (2003), "An O(m) algorithm for cores decomposition
/// of networks", arXiv:cs/0310049: nodes are kept in buckets by current
/// degree and peeled in increasing order; `deg`, `bin`, `pos`, `vert` are
/// the paper's arrays. O(N + M) time.
///
/// Directed networks use the total degree, in-degree + out-degree, with
/// direction ignored (the convention of networkx `core_number`); a pair of
/// opposite edges counts twice.
///
/// ```
/// use spreadplan::network::{inspect::core_numbers, Network, WeightMerge};
/// // A triangle with a pendant node.
/// let e = vec![(0, 1), (1, 2), (0, 2), (2, 3)];
/// let (net, _) = Network::from_edges(4, false, e, None, WeightMerge::Max).unwrap();
/// assert_eq!(core_numbers(&net), vec![2, 2, 2, 1]);
/// ```
pub fn core_numbers(net: &Network) -> Vec<u32> {
    core_numbers_of(net, None)
}

/// Core numbers of the subnetwork induced by the nodes with `alive[v]`
/// (all nodes when `None`); nodes that are not alive get 0. The same
/// Batagelj–Zaversnik peeling as [`core_numbers`], on the residual network.
///
/// ```
/// use spreadplan::network::{inspect::core_numbers_of, Network, WeightMerge};
/// // A triangle with a pendant node; without node 0 the rest is a path.
/// let e = vec![(0, 1), (1, 2), (0, 2), (2, 3)];
/// let (net, _) = Network::from_edges(4, false, e, None, WeightMerge::Max).unwrap();
/// assert_eq!(core_numbers_of(&net, Some(&[false, true, true, true])), vec![0, 1, 1, 1]);
/// ```
pub fn core_numbers_of(net: &Network, alive: Option<&[bool]>) -> Vec<u32> {
    let n = net.node_count();
    let directed = net.is_directed();
    let live = |v: u32| alive.is_none_or(|a| a[v as usize]);
    let count = |nb: &[u32]| nb.iter().filter(|&&u| live(u)).count();
    let mut deg: Vec<u32> = (0..n as u32)
        .map(|v| {
            if !live(v) {
                0
            } else if directed {
                (count(net.neighbors(v)) + count(net.in_neighbors(v))) as u32
            } else {
                count(net.neighbors(v)) as u32
            }
        })
        .collect();
    let md = deg.iter().copied().max().unwrap_or(0) as usize;
    // bin[d] = start of the bucket of degree d in `vert`.
    let mut bin = vec![0u32; md + 2];
    for &d in &deg {
        bin[d as usize] += 1;
    }
    let mut start = 0u32;
    for b in bin.iter_mut() {
        let c = *b;
        *b = start;
        start += c;
    }
    let mut pos = vec![0u32; n];
    let mut vert = vec![0u32; n];
    for v in 0..n {
        let d = deg[v] as usize;
        pos[v] = bin[d];
        vert[bin[d] as usize] = v as u32;
        bin[d] += 1;
    }
    for d in (1..=md).rev() {
        bin[d] = bin[d - 1];
    }
    bin[0] = 0;
    for i in 0..n {
        let v = vert[i];
        if !live(v) {
            continue;
        }
        let dv = deg[v as usize];
        let mut peel = |u: u32| {
            let du = deg[u as usize];
            if du > dv && live(u) {
                let pu = pos[u as usize];
                let pw = bin[du as usize];
                let w = vert[pw as usize];
                if u != w {
                    pos[u as usize] = pw;
                    vert[pu as usize] = w;
                    pos[w as usize] = pu;
                    vert[pw as usize] = u;
                }
                bin[du as usize] += 1;
                deg[u as usize] = du - 1;
            }
        };
        for &u in net.neighbors(v) {
            peel(u);
        }
        if directed {
            for &u in net.in_neighbors(v) {
                peel(u);
            }
        }
    }
    deg
}

/// Connected components; weakly connected (direction ignored) for directed
/// networks. Breadth-first search with an explicit queue, O(N + M).
///
/// ```
/// use spreadplan::network::{inspect::connected_components, Network, WeightMerge};
/// let (net, _) = Network::from_edges(5, false, vec![(0, 1), (2, 3)], None,
///     WeightMerge::Max).unwrap();
/// let c = connected_components(&net);
/// assert_eq!(c.of, vec![0, 0, 1, 1, 2]);
/// assert_eq!((c.count(), c.largest(), c.second_largest()), (3, 2, 2));
/// ```
pub fn connected_components(net: &Network) -> Components {
    const NONE: u32 = u32::MAX;
    let n = net.node_count();
    let mut of = vec![NONE; n];
    let mut sizes: Vec<u64> = Vec::new();
    let mut queue: Vec<u32> = Vec::new();
    for s in 0..n as u32 {
        if of[s as usize] != NONE {
            continue;
        }
        let id = sizes.len() as u32;
        of[s as usize] = id;
        queue.clear();
        queue.push(s);
        let mut head = 0;
        while head < queue.len() {
            let v = queue[head];
            head += 1;
            let ins: &[u32] = if net.is_directed() { net.in_neighbors(v) } else { &[] };
            for &u in net.neighbors(v).iter().chain(ins) {
                if of[u as usize] == NONE {
                    of[u as usize] = id;
                    queue.push(u);
                }
            }
        }
        sizes.push(queue.len() as u64);
    }
    Components { of, sizes }
}

/// Strongly connected components of a directed network (for an undirected
/// network these are the connected components).
///
/// Tarjan (1972), "Depth-first search and linear graph algorithms", SIAM J.
/// Comput. 1:146–160, run with an explicit call stack so that 10⁶-node
/// paths cannot overflow the thread stack. O(N + M).
///
/// ```
/// use spreadplan::network::{inspect::strongly_connected_components, Network, WeightMerge};
/// // A 3-cycle 0→1→2→0 with a tail 2→3.
/// let e = vec![(0, 1), (1, 2), (2, 0), (2, 3)];
/// let (net, _) = Network::from_edges(4, true, e, None, WeightMerge::Max).unwrap();
/// let c = strongly_connected_components(&net);
/// assert_eq!(c.of, vec![0, 0, 0, 1]);
/// assert_eq!(c.sizes, vec![3, 1]);
/// ```
pub fn strongly_connected_components(net: &Network) -> Components {
    if !net.is_directed() {
        return connected_components(net);
    }
    const NONE: u32 = u32::MAX;
    let n = net.node_count();
    let (offsets, targets, _) = net.out_rows();
    let mut index = vec![NONE; n];
    let mut low = vec![0u32; n];
    let mut on_stack = vec![false; n];
    let mut comp = vec![NONE; n];
    let mut stack: Vec<u32> = Vec::new();
    // (node, next position in its out-row)
    let mut calls: Vec<(u32, u64)> = Vec::new();
    let mut counter = 0u32;
    let mut ncomp = 0u32;
    for s in 0..n as u32 {
        if index[s as usize] != NONE {
            continue;
        }
        index[s as usize] = counter;
        low[s as usize] = counter;
        counter += 1;
        stack.push(s);
        on_stack[s as usize] = true;
        calls.push((s, offsets[s as usize]));
        while let Some(top) = calls.last_mut() {
            let v = top.0 as usize;
            if top.1 < offsets[v + 1] {
                let w = targets[top.1 as usize] as usize;
                top.1 += 1;
                if index[w] == NONE {
                    index[w] = counter;
                    low[w] = counter;
                    counter += 1;
                    stack.push(w as u32);
                    on_stack[w] = true;
                    calls.push((w as u32, offsets[w]));
                } else if on_stack[w] {
                    low[v] = low[v].min(index[w]);
                }
                continue;
            }
            calls.pop();
            if let Some(parent) = calls.last() {
                let p = parent.0 as usize;
                low[p] = low[p].min(low[v]);
            }
            if low[v] == index[v] {
                while let Some(w) = stack.pop() {
                    on_stack[w as usize] = false;
                    comp[w as usize] = ncomp;
                    if w as usize == v {
                        break;
                    }
                }
                ncomp += 1;
            }
        }
    }
    Components::from_labels(comp, ncomp as usize)
}

/// The structural summary printed by `spreadplan inspect`.
///
/// Undirected networks: degrees are degrees. Directed networks: degree
/// fields use out-degrees, `mean_excess_degree` is `⟨k_in k_out⟩ / ⟨k⟩`,
/// components are weak with the strong ones beside them, clustering is
/// counted on the undirected simple graph (direction ignored, opposite
/// edges merged), assortativity correlates source out-degree with target
/// in-degree and cores use the total degree.
#[derive(Clone, Debug, Default, PartialEq, Serialize)]
pub struct Summary {
    /// Number of nodes `N`.
    pub nodes: u64,
    /// Number of edges `M` (merged, loop-free).
    pub edges: u64,
    /// Whether edges are directed.
    pub directed: bool,
    /// Self-loops dropped at load (0 unless set from a [`LoadReport`]).
    pub self_loops_dropped: u64,
    /// Duplicate edges merged at load (0 unless set from a [`LoadReport`]).
    pub duplicates_merged: u64,
    /// `⟨k⟩`.
    pub mean_degree: f64,
    /// `⟨k²⟩`.
    pub mean_sq_degree: f64,
    /// Largest degree.
    pub max_degree: u64,
    /// Mean excess degree `κ = (⟨k²⟩ − ⟨k⟩)/⟨k⟩`; directed: `⟨k_in k_out⟩/⟨k⟩`.
    pub mean_excess_degree: f64,
    /// Number of connected (directed: weakly connected) components.
    pub components: u64,
    /// Size of the largest (weak) component.
    pub largest_component: u64,
    /// Size of the second-largest (weak) component.
    pub second_largest_component: u64,
    /// Directed only: number of strongly connected components.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub strong_components: Option<u64>,
    /// Directed only: size of the largest strongly connected component.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub largest_strong_component: Option<u64>,
    /// Directed only: size of the second-largest strongly connected component.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub second_largest_strong_component: Option<u64>,
    /// Number of triangles of the undirected simple graph.
    pub triangles: u64,
    /// Global transitivity `3 × triangles / connected triples` (`null` without triples).
    pub clustering: Option<f64>,
    /// Degree assortativity `r` (`null` when all edges join equal degrees).
    pub assortativity: Option<f64>,
    /// Largest core number.
    pub max_core: u32,
    /// Configuration-model epidemic threshold estimate `T_c = 1/κ` (`null` when `κ = 0`).
    pub threshold_estimate: Option<f64>,
}

impl Summary {
    /// Copies the self-loop and duplicate counts of a load.
    pub fn with_load(mut self, report: &LoadReport) -> Self {
        self.self_loops_dropped = report.self_loops_dropped;
        self.duplicates_merged = report.duplicates_merged;
        self
    }
}

/// Computes the [`Summary`] of a network. O(N + M) plus triangle counting,
/// O(M^{3/2}) at worst (see [`triangles`]).
///
/// ```
/// use spreadplan::network::{inspect::summarize, Network, WeightMerge};
/// // K4: every degree 3, κ = (9 − 3)/3 = 2, four triangles, transitivity 1.
/// let e = vec![(0, 1), (0, 2), (0, 3), (1, 2), (1, 3), (2, 3)];
/// let (net, _) = Network::from_edges(4, false, e, None, WeightMerge::Max).unwrap();
/// let s = summarize(&net);
/// assert_eq!((s.mean_excess_degree, s.triangles, s.clustering), (2.0, 4, Some(1.0)));
/// assert_eq!((s.max_core, s.threshold_estimate), (3, Some(0.5)));
/// ```
pub fn summarize(net: &Network) -> Summary {
    let n = net.node_count() as u64;
    let m = net.edge_count() as u64;
    let directed = net.is_directed();
    let (mut s1, mut s2, mut sio, mut kmax) = (0u128, 0u128, 0u128, 0u64);
    for v in 0..net.node_count() as u32 {
        let k = net.degree(v) as u128;
        s1 += k;
        s2 += k * k;
        sio += k * net.in_degree(v) as u128;
        kmax = kmax.max(k as u64);
    }
    let nf = n.max(1) as f64;
    let mean_degree = s1 as f64 / nf;
    let mean_sq_degree = s2 as f64 / nf;
    let mean_excess_degree = if s1 == 0 {
        0.0
    } else if directed {
        sio as f64 / s1 as f64
    } else {
        (s2 - s1) as f64 / s1 as f64
    };
    let weak = connected_components(net);
    let strong = directed.then(|| strongly_connected_components(net));
    let simple;
    let undirected = if directed {
        let e = net.edges().iter().map(|e| (e[0], e[1])).collect();
        simple = Network::from_edges(net.node_count() as u32, false, e, None, WeightMerge::Max)
            .map(|(g, _)| g)
            .unwrap_or_else(|_| unreachable!("edges of a network are in range"));
        &simple
    } else {
        net
    };
    let tri = triangles(undirected);
    let triples: u128 = (0..undirected.node_count() as u32)
        .map(|v| {
            let k = undirected.degree(v) as u128;
            k * k.saturating_sub(1) / 2
        })
        .sum();
    let clustering = (triples > 0).then(|| 3.0 * tri as f64 / triples as f64);
    Summary {
        nodes: n,
        edges: m,
        directed,
        self_loops_dropped: 0,
        duplicates_merged: 0,
        mean_degree,
        mean_sq_degree,
        max_degree: kmax,
        mean_excess_degree,
        components: weak.count() as u64,
        largest_component: weak.largest(),
        second_largest_component: weak.second_largest(),
        strong_components: strong.as_ref().map(|c| c.count() as u64),
        largest_strong_component: strong.as_ref().map(Components::largest),
        second_largest_strong_component: strong.as_ref().map(Components::second_largest),
        triangles: tri,
        clustering,
        assortativity: degree_assortativity(net),
        max_core: core_numbers(net).into_iter().max().unwrap_or(0),
        threshold_estimate: (mean_excess_degree > 0.0).then(|| 1.0 / mean_excess_degree),
    }
}

/// Number of triangles of an undirected network (a directed network's
/// rows are read as given: out-neighbors only).
///
/// The "forward" algorithm (Schank & Wagner 2005, "Finding, counting and
/// listing all triangles in large graphs", WEA 2005; Latapy 2008): orient
/// every edge from the lower to the higher node in (degree, index) order,
/// then count, for each oriented edge `u→v`, the common out-neighbors of `u`
/// and `v` with a marker array. O(M^{3/2}) time, O(N + M) memory.
///
/// ```
/// use spreadplan::network::{inspect::triangles, Network, WeightMerge};
/// let e = vec![(0, 1), (1, 2), (0, 2), (2, 3), (3, 0)];
/// let (net, _) = Network::from_edges(4, false, e, None, WeightMerge::Max).unwrap();
/// assert_eq!(triangles(&net), 2);
/// ```
pub fn triangles(net: &Network) -> u64 {
    let n = net.node_count();
    let rank_lt = |a: u32, b: u32| (net.degree(a), a) < (net.degree(b), b);
    // Oriented rows: neighbors of higher rank.
    let mut offsets = vec![0usize; n + 1];
    for v in 0..n as u32 {
        offsets[v as usize + 1] =
            offsets[v as usize] + net.neighbors(v).iter().filter(|&&u| rank_lt(v, u)).count();
    }
    let mut fwd = vec![0u32; offsets[n]];
    for v in 0..n as u32 {
        let mut i = offsets[v as usize];
        for &u in net.neighbors(v) {
            if rank_lt(v, u) {
                fwd[i] = u;
                i += 1;
            }
        }
    }
    let mut mark = vec![u32::MAX; n];
    let mut count = 0u64;
    for u in 0..n {
        let row = &fwd[offsets[u]..offsets[u + 1]];
        for &w in row {
            mark[w as usize] = u as u32;
        }
        for &v in row {
            let v = v as usize;
            for &w in &fwd[offsets[v]..offsets[v + 1]] {
                count += (mark[w as usize] == u as u32) as u64;
            }
        }
    }
    count
}

/// Degree assortativity coefficient: the Pearson correlation of the
/// degrees at the two ends of an edge.
///
/// Newman (2002), "Assortative mixing in networks", PRL 89:208701, eq. (4):
/// with `j_i, k_i` the degrees at the ends of edge `i`,
/// `r = [M⁻¹Σ j_i k_i − (M⁻¹Σ ½(j_i + k_i))²] / [M⁻¹Σ ½(j_i² + k_i²) − (M⁻¹Σ ½(j_i + k_i))²]`.
/// Directed networks correlate the source's out-degree with the target's
/// in-degree (Newman 2003, PRE 67:026126; the networkx default). Sums are
/// exact integers. `None` when the denominator is zero (e.g. regular graphs)
/// or there are no edges.
///
/// ```
/// use spreadplan::network::{inspect::degree_assortativity, Network, WeightMerge};
/// // A star is perfectly disassortative.
/// let (net, _) = Network::from_edges(4, false, vec![(0, 1), (0, 2), (0, 3)], None,
///     WeightMerge::Max).unwrap();
/// assert!((degree_assortativity(&net).unwrap() + 1.0).abs() < 1e-12);
/// ```
pub fn degree_assortativity(net: &Network) -> Option<f64> {
    let m = net.edge_count() as f64;
    if m == 0.0 {
        return None;
    }
    let r = if net.is_directed() {
        let (mut sx, mut sy, mut sxx, mut syy, mut sxy) = (0u128, 0u128, 0u128, 0u128, 0u128);
        for e in net.edges() {
            let x = net.degree(e[0]) as u128;
            let y = net.in_degree(e[1]) as u128;
            (sx, sy, sxx, syy, sxy) = (sx + x, sy + y, sxx + x * x, syy + y * y, sxy + x * y);
        }
        let (mx, my) = (sx as f64 / m, sy as f64 / m);
        let cov = sxy as f64 / m - mx * my;
        let vx = sxx as f64 / m - mx * mx;
        let vy = syy as f64 / m - my * my;
        cov / (vx * vy).sqrt()
    } else {
        let (mut sjk, mut s1, mut s2) = (0u128, 0u128, 0u128);
        for e in net.edges() {
            let j = net.degree(e[0]) as u128;
            let k = net.degree(e[1]) as u128;
            sjk += j * k;
            s1 += j + k;
            s2 += j * j + k * k;
        }
        let mean = s1 as f64 / (2.0 * m);
        (sjk as f64 / m - mean * mean) / (s2 as f64 / (2.0 * m) - mean * mean)
    };
    r.is_finite().then_some(r)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::WeightMerge;

    fn net(n: u32, directed: bool, e: &[(u32, u32)]) -> Network {
        Network::from_edges(n, directed, e.to_vec(), None, WeightMerge::Max).unwrap().0
    }
    fn path(n: u32) -> Network {
        net(n, false, &(0..n - 1).map(|i| (i, i + 1)).collect::<Vec<_>>())
    }
    fn star(leaves: u32) -> Network {
        net(leaves + 1, false, &(1..=leaves).map(|i| (0, i)).collect::<Vec<_>>())
    }
    fn k4() -> Network {
        net(4, false, &[(0, 1), (0, 2), (0, 3), (1, 2), (1, 3), (2, 3)])
    }
    fn two_triangles() -> Network {
        net(6, false, &[(0, 1), (1, 2), (0, 2), (3, 4), (4, 5), (3, 5)])
    }

    // Core numbers by hand from the definition (k-core: all degrees >= k).
    #[test]
    fn cores_of_small_graphs() {
        assert_eq!(core_numbers(&path(5)), vec![1; 5]);
        assert_eq!(core_numbers(&star(4)), vec![1; 5]);
        assert_eq!(core_numbers(&k4()), vec![3; 4]);
        assert_eq!(core_numbers(&two_triangles()), vec![2; 6]);
        // K4 plus a pendant path 3-4-5 and an isolated node 6.
        let g = net(7, false, &[(0, 1), (0, 2), (0, 3), (1, 2), (1, 3), (2, 3), (3, 4), (4, 5)]);
        assert_eq!(core_numbers(&g), vec![3, 3, 3, 3, 1, 1, 0]);
    }

    #[test]
    fn cores_directed_use_total_degree() {
        // Directed 3-cycle: total degree 2 everywhere, so the 2-core is all.
        let g = net(3, true, &[(0, 1), (1, 2), (2, 0)]);
        assert_eq!(core_numbers(&g), vec![2, 2, 2]);
    }

    #[test]
    fn components_of_small_graphs() {
        let c = connected_components(&path(4));
        assert_eq!((c.count(), c.largest(), c.second_largest()), (1, 4, 0));
        let c = connected_components(&two_triangles());
        assert_eq!(c.of, vec![0, 0, 0, 1, 1, 1]);
        assert_eq!((c.count(), c.largest(), c.second_largest()), (2, 3, 3));
        assert_eq!(c.largest_id(), Some(0));
        let c = connected_components(&star(3));
        assert_eq!(c.sizes, vec![4]);
        let c = connected_components(&k4());
        assert_eq!(c.sizes, vec![4]);
    }

    #[test]
    fn weak_and_strong_directed() {
        // 0→1→2 is one weak component, three strong ones; 3⇄4 is strong.
        let g = net(5, true, &[(0, 1), (1, 2), (3, 4), (4, 3)]);
        let w = connected_components(&g);
        assert_eq!(w.sizes, vec![3, 2]);
        let s = strongly_connected_components(&g);
        assert_eq!(s.of, vec![0, 1, 2, 3, 3]);
        assert_eq!(s.sizes, vec![1, 1, 1, 2]);
        // Undirected: strong = connected.
        assert_eq!(strongly_connected_components(&two_triangles()).sizes, vec![3, 3]);
    }

    #[test]
    fn summary_of_small_graphs() {
        // Path 0-1-2-3: degrees 1,2,2,1; ⟨k⟩ = 1.5, ⟨k²⟩ = 2.5, κ = 2/3.
        let s = summarize(&path(4));
        assert_eq!((s.mean_degree, s.mean_sq_degree, s.max_degree), (1.5, 2.5, 2));
        assert!((s.mean_excess_degree - 2.0 / 3.0).abs() < 1e-12);
        assert_eq!((s.triangles, s.clustering), (0, Some(0.0)));
        // Two triangles: transitivity 1, regular so assortativity undefined.
        let s = summarize(&two_triangles());
        assert_eq!((s.triangles, s.clustering, s.assortativity), (2, Some(1.0), None));
        assert_eq!((s.components, s.largest_component, s.second_largest_component), (2, 3, 3));
        assert_eq!(s.strong_components, None);
        // Path assortativity by hand from Newman eq. (4): end degrees (1,2),
        // (2,2), (2,1): M⁻¹Σjk = 8/3, mean 5/3, M⁻¹Σ½(j²+k²) = 3, so
        // r = (8/3 − 25/9)/(3 − 25/9) = −1/2.
        let r = degree_assortativity(&path(4)).unwrap();
        assert!((r + 0.5).abs() < 1e-12, "{r}");
    }

    #[test]
    fn summary_directed() {
        // 0→1→2→0 and 2→3: out-degrees 1,1,2,0, in-degrees 1,1,1,1.
        let g = net(4, true, &[(0, 1), (1, 2), (2, 0), (2, 3)]);
        let s = summarize(&g);
        assert_eq!((s.strong_components, s.largest_strong_component), (Some(2), Some(3)));
        assert_eq!(s.second_largest_strong_component, Some(1));
        // ⟨k_in k_out⟩/⟨k⟩ = (1+1+2+0)/4 / 1 = 1.
        assert_eq!(s.mean_excess_degree, 1.0);
        assert_eq!(s.triangles, 1);
    }

    #[test]
    fn long_paths_do_not_overflow() {
        let n = 200_000u32;
        let e: Vec<(u32, u32)> = (0..n - 1).map(|i| (i, i + 1)).chain([(n - 1, 0)]).collect();
        let g = net(n, true, &e);
        assert_eq!(strongly_connected_components(&g).sizes, vec![n as u64]);
        assert_eq!(connected_components(&path(n)).sizes, vec![n as u64]);
        assert!(core_numbers(&path(n)).iter().all(|&k| k == 1));
    }
}
