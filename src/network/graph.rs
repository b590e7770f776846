//! The [`Network`]: compressed sparse rows with `u32` node indices and
//! `u64` offsets, built once and never mutated.
//!
//! Undirected networks store each edge in both endpoints' rows with one
//! shared edge index, so an edge's transmission coin is the same from both
//! sides. Directed networks store out-rows and in-rows. Edge `e` is the
//! `e`-th entry of [`Network::edges`], sorted by `(source, target)`
//! (undirected: `source < target`). Building drops self-loops and merges
//! duplicates; the counts go to a [`BuildReport`].
//!
//! Loading files is `network::load`; generating is `network::generate`.

use serde::Serialize;

/// How the weights of merged duplicate edges combine.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize)]
#[serde(rename_all = "kebab-case")]
pub enum WeightMerge {
    /// The largest weight wins (default: an edge listed in both directions
    /// keeps its weight, and a probability never exceeds 1).
    #[default]
    Max,
    /// Weights add (durations, contact counts).
    Sum,
    /// The first occurrence in the file wins.
    First,
    /// Independent transmission chances combine: `1 − Π(1 − w)`.
    NoisyOr,
}

/// What building a network dropped or merged.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize)]
pub struct BuildReport {
    /// Self-loops dropped.
    pub self_loops_dropped: u64,
    /// Duplicate edges merged into an earlier one.
    pub duplicates_merged: u64,
}

/// Why a network could not be built.
#[derive(Debug, thiserror::Error, PartialEq)]
pub enum BuildError {
    /// An endpoint is not below the node count.
    #[error("edge {edge}: node index {node} is not below the node count {nodes}")]
    NodeOutOfRange {
        /// Position of the edge in the input.
        edge: usize,
        /// The bad index.
        node: u32,
        /// The node count.
        nodes: u32,
    },
    /// More edges than `u32` edge indices can address.
    #[error("{0} edges exceed the limit of 4294967295")]
    TooManyEdges(usize),
    /// Weights given for a different number of edges.
    #[error("{weights} weights given for {edges} edges")]
    WeightCount {
        /// Number of weights.
        weights: usize,
        /// Number of edges.
        edges: usize,
    },
}

/// A contact network in compressed sparse rows.
#[derive(Clone, Debug, PartialEq)]
pub struct Network {
    directed: bool,
    n: u32,
    edges: Vec<[u32; 2]>,
    weights: Option<Vec<f32>>,
    out_offsets: Vec<u64>,
    out_targets: Vec<u32>,
    out_edge_ids: Vec<u32>,
    // Directed only; empty for undirected networks (rows are shared).
    in_offsets: Vec<u64>,
    in_sources: Vec<u32>,
    in_edge_ids: Vec<u32>,
}

impl Network {
    /// Builds a network on nodes `0..n` from an edge list, dropping
    /// self-loops and merging duplicate edges (undirected: `(u, v)` and
    /// `(v, u)` are the same edge) with `merge` combining their weights.
    ///
    /// ```
    /// use spreadplan::network::{Network, WeightMerge};
    /// let (net, rep) = Network::from_edges(3, false, vec![(0, 1), (1, 0), (2, 2), (1, 2)], None,
    ///     WeightMerge::Max).unwrap();
    /// assert_eq!((net.node_count(), net.edge_count()), (3, 2));
    /// assert_eq!((rep.self_loops_dropped, rep.duplicates_merged), (1, 1));
    /// assert_eq!(net.neighbors(1), &[0, 2]);
    /// ```
    pub fn from_edges(
        n: u32,
        directed: bool,
        edges: Vec<(u32, u32)>,
        weights: Option<Vec<f32>>,
        merge: WeightMerge,
    ) -> Result<(Network, BuildReport), BuildError> {
        if let Some(w) = &weights {
            if w.len() != edges.len() {
                return Err(BuildError::WeightCount { weights: w.len(), edges: edges.len() });
            }
        }
        if weights.is_none() {
            return Network::from_unweighted(n, directed, edges);
        }
        let mut report = BuildReport::default();
        // Each edge becomes one sortable key `(a << bits) | b` with `a, b <
        // n`; sorting keys sorts by `(source, target)`. The LSD radix sort
        // is stable, so `First` keeps the first occurrence in input order.
        let bits = if n <= 1 { 1 } else { 32 - (n - 1).leading_zeros() };
        let low = (1u64 << bits) - 1;
        let mut key_of = |i: usize, u: u32, v: u32| -> Result<Option<u64>, BuildError> {
            for x in [u, v] {
                if x >= n {
                    return Err(BuildError::NodeOutOfRange { edge: i, node: x, nodes: n });
                }
            }
            if u == v {
                report.self_loops_dropped += 1;
                return Ok(None);
            }
            let (a, b) = if directed || u < v { (u, v) } else { (v, u) };
            Ok(Some(((a as u64) << bits) | b as u64))
        };
        let decode = |k: u64| [(k >> bits) as u32, (k & low) as u32];
        let (out_edges, weights) = match weights {
            None => {
                let mut keys: Vec<u64> = Vec::with_capacity(edges.len());
                for (i, &(u, v)) in edges.iter().enumerate() {
                    if let Some(k) = key_of(i, u, v)? {
                        keys.push(k);
                    }
                }
                drop(edges);
                radix_sort(&mut keys, |&k| k, 2 * bits);
                let before = keys.len();
                keys.dedup();
                report.duplicates_merged = (before - keys.len()) as u64;
                let out: Vec<[u32; 2]> = keys.iter().map(|&k| decode(k)).collect();
                (out, None)
            }
            Some(w) => {
                let mut keyed: Vec<(u64, f32)> = Vec::with_capacity(edges.len());
                for (i, &(u, v)) in edges.iter().enumerate() {
                    if let Some(k) = key_of(i, u, v)? {
                        keyed.push((k, w[i]));
                    }
                }
                drop(edges);
                drop(w);
                radix_sort(&mut keyed, |&(k, _)| k, 2 * bits);
                let mut out: Vec<[u32; 2]> = Vec::with_capacity(keyed.len());
                let mut out_w: Vec<f32> = Vec::with_capacity(keyed.len());
                let mut last = u64::MAX;
                for &(k, x) in &keyed {
                    if k == last {
                        report.duplicates_merged += 1;
                        let cur = out_w.last_mut().expect("a merged edge follows its first copy");
                        *cur = match merge {
                            WeightMerge::Max => cur.max(x),
                            WeightMerge::Sum => *cur + x,
                            WeightMerge::First => *cur,
                            WeightMerge::NoisyOr => 1.0 - (1.0 - *cur) * (1.0 - x),
                        };
                        continue;
                    }
                    last = k;
                    out.push(decode(k));
                    out_w.push(x);
                }
                (out, Some(out_w))
            }
        };
        if out_edges.len() > u32::MAX as usize {
            return Err(BuildError::TooManyEdges(out_edges.len()));
        }
        Ok((Network::from_sorted_unique(n, directed, out_edges, weights), report))
    }

    /// [`Network::from_edges`] without weights: the pairs are normalized and
    /// radix-sorted in their own buffer (which becomes the edge list), and
    /// the sort's scratch buffer becomes the rows' column array, so the
    /// build allocates little beyond the network itself.
    fn from_unweighted(
        n: u32,
        directed: bool,
        edges: Vec<(u32, u32)>,
    ) -> Result<(Network, BuildReport), BuildError> {
        let mut report = BuildReport::default();
        for (i, &(u, v)) in edges.iter().enumerate() {
            for x in [u, v] {
                if x >= n {
                    return Err(BuildError::NodeOutOfRange { edge: i, node: x, nodes: n });
                }
            }
            report.self_loops_dropped += (u == v) as u64;
        }
        // In place (same layout): loops dropped, undirected edges as (min, max).
        let mut kept: Vec<[u32; 2]> = edges
            .into_iter()
            .filter(|&(u, v)| u != v)
            .map(|(u, v)| if directed || u < v { [u, v] } else { [v, u] })
            .collect();
        let bits = if n <= 1 { 1 } else { 32 - (n - 1).leading_zeros() };
        let mut scratch = Vec::new();
        sort_pairs(&mut kept, &mut scratch, bits);
        let before = kept.len();
        kept.dedup();
        report.duplicates_merged = (before - kept.len()) as u64;
        if kept.len() > u32::MAX as usize {
            return Err(BuildError::TooManyEdges(kept.len()));
        }
        kept.shrink_to_fit();
        if directed {
            drop(scratch);
            return Ok((Network::from_sorted_unique(n, directed, kept, None), report));
        }
        let mut net = Network::empty(n, false, kept, None);
        let (o, t, id) = rows_undirected(n as usize, &net.edges, scratch.into_flattened());
        (net.out_offsets, net.out_targets, net.out_edge_ids) = (o, t, id);
        Ok((net, report))
    }

    fn empty(n: u32, directed: bool, edges: Vec<[u32; 2]>, weights: Option<Vec<f32>>) -> Network {
        Network {
            directed,
            n,
            edges,
            weights,
            out_offsets: Vec::new(),
            out_targets: Vec::new(),
            out_edge_ids: Vec::new(),
            in_offsets: Vec::new(),
            in_sources: Vec::new(),
            in_edge_ids: Vec::new(),
        }
    }

    /// Builds the rows from edges that are already sorted by `(source,
    /// target)`, unique, free of self-loops and (undirected) have `source <
    /// target`. Generators that produce such lists call this directly.
    pub fn from_sorted_unique(
        n: u32,
        directed: bool,
        edges: Vec<[u32; 2]>,
        weights: Option<Vec<f32>>,
    ) -> Network {
        debug_assert!(edges.windows(2).all(|w| w[0] < w[1]));
        debug_assert!(edges.iter().all(|e| directed || e[0] < e[1]));
        let nn = n as usize;
        let mut net = Network::empty(n, directed, edges, weights);
        if directed {
            let (o, t, id) = rows(nn, &net.edges, |e| [(e[0], e[1])].into_iter());
            let (io, is, iid) = rows(nn, &net.edges, |e| [(e[1], e[0])].into_iter());
            (net.out_offsets, net.out_targets, net.out_edge_ids) = (o, t, id);
            (net.in_offsets, net.in_sources, net.in_edge_ids) = (io, is, iid);
        } else {
            let (o, t, id) = rows_undirected(nn, &net.edges, Vec::new());
            (net.out_offsets, net.out_targets, net.out_edge_ids) = (o, t, id);
        }
        net
    }

    /// Whether edges have a direction.
    pub fn is_directed(&self) -> bool {
        self.directed
    }

    /// Number of nodes `N`.
    pub fn node_count(&self) -> usize {
        self.n as usize
    }

    /// Number of (merged, loop-free) edges `M`.
    pub fn edge_count(&self) -> usize {
        self.edges.len()
    }

    /// Edge endpoints by edge index, sorted; undirected edges have
    /// `source < target`.
    pub fn edges(&self) -> &[[u32; 2]] {
        &self.edges
    }

    /// Per-edge weights aligned with [`Network::edges`], if loaded.
    pub fn weights(&self) -> Option<&[f32]> {
        self.weights.as_deref()
    }

    /// Degree (undirected) or out-degree (directed) of `v`.
    #[inline]
    pub fn degree(&self, v: u32) -> usize {
        let v = v as usize;
        (self.out_offsets[v + 1] - self.out_offsets[v]) as usize
    }

    /// In-degree of `v` (equals [`Network::degree`] when undirected).
    #[inline]
    pub fn in_degree(&self, v: u32) -> usize {
        if !self.directed {
            return self.degree(v);
        }
        let v = v as usize;
        (self.in_offsets[v + 1] - self.in_offsets[v]) as usize
    }

    /// Neighbors (undirected) or out-neighbors (directed) of `v`, ascending.
    #[inline]
    pub fn neighbors(&self, v: u32) -> &[u32] {
        let (a, b) = self.out_range(v);
        &self.out_targets[a..b]
    }

    /// Edge indices aligned with [`Network::neighbors`].
    #[inline]
    pub fn neighbor_edges(&self, v: u32) -> &[u32] {
        let (a, b) = self.out_range(v);
        &self.out_edge_ids[a..b]
    }

    /// In-neighbors of `v`, ascending (all neighbors when undirected).
    #[inline]
    pub fn in_neighbors(&self, v: u32) -> &[u32] {
        if !self.directed {
            return self.neighbors(v);
        }
        let (a, b) = self.in_range(v);
        &self.in_sources[a..b]
    }

    /// Edge indices aligned with [`Network::in_neighbors`].
    #[inline]
    pub fn in_neighbor_edges(&self, v: u32) -> &[u32] {
        if !self.directed {
            return self.neighbor_edges(v);
        }
        let (a, b) = self.in_range(v);
        &self.in_edge_ids[a..b]
    }

    /// The raw out-rows `(offsets, targets, edge ids)` for hot loops:
    /// the row of `v` is `offsets[v]..offsets[v + 1]`.
    pub fn out_rows(&self) -> (&[u64], &[u32], &[u32]) {
        (&self.out_offsets, &self.out_targets, &self.out_edge_ids)
    }

    /// The raw in-rows (the out-rows when undirected).
    pub fn in_rows(&self) -> (&[u64], &[u32], &[u32]) {
        if self.directed {
            (&self.in_offsets, &self.in_sources, &self.in_edge_ids)
        } else {
            self.out_rows()
        }
    }

    /// All degrees (out-degrees when directed) as a vector.
    pub fn degrees(&self) -> Vec<u32> {
        (0..self.n).map(|v| self.degree(v) as u32).collect()
    }

    /// The same network with node `v` renamed `perm[v]` (a permutation of
    /// `0..N`), e.g. for memory locality. Edge indices are renumbered in the
    /// new sorted order; weights follow their edges.
    pub fn relabeled(&self, perm: &[u32]) -> Network {
        assert_eq!(perm.len(), self.node_count(), "permutation length must equal node count");
        let mut keyed: Vec<(u64, u32)> = self
            .edges
            .iter()
            .enumerate()
            .map(|(i, e)| {
                let (mut a, mut b) = (perm[e[0] as usize], perm[e[1] as usize]);
                if !self.directed && a > b {
                    std::mem::swap(&mut a, &mut b);
                }
                (((a as u64) << 32) | b as u64, i as u32)
            })
            .collect();
        keyed.sort_unstable();
        let edges = keyed.iter().map(|&(k, _)| [(k >> 32) as u32, k as u32]).collect();
        let weights =
            self.weights.as_ref().map(|w| keyed.iter().map(|&(_, i)| w[i as usize]).collect());
        Network::from_sorted_unique(self.n, self.directed, edges, weights)
    }

    #[inline]
    fn out_range(&self, v: u32) -> (usize, usize) {
        let v = v as usize;
        (self.out_offsets[v] as usize, self.out_offsets[v + 1] as usize)
    }

    #[inline]
    fn in_range(&self, v: u32) -> (usize, usize) {
        let v = v as usize;
        (self.in_offsets[v] as usize, self.in_offsets[v + 1] as usize)
    }
}

/// Stable LSD radix sort of `v` by the low `bits` bits of `key` (digits of
/// at most 11 bits, passes where all keys share a digit are skipped); small
/// inputs use the standard stable sort. O(passes · len) time, one scratch
/// copy of `v`. Knuth, TAOCP vol. 3, §5.2.5 (radix sorting).
fn radix_sort<T: Copy + Default>(v: &mut Vec<T>, key: impl Fn(&T) -> u64, bits: u32) {
    radix_sort_with(v, &mut Vec::new(), key, bits);
}

/// [`radix_sort`] with the scratch buffer supplied and handed back (it is
/// `v.len()` long afterwards, with unspecified contents, when the radix
/// path ran; the caller may reuse its memory). The digit counts of all
/// passes are gathered in one read of `v`.
fn radix_sort_with<T: Copy + Default>(
    v: &mut Vec<T>,
    scratch: &mut Vec<T>,
    key: impl Fn(&T) -> u64,
    bits: u32,
) {
    if v.len() < 4096 {
        v.sort_by_key(|x| key(x));
        return;
    }
    let bits = bits.clamp(1, 64);
    let passes = bits.div_ceil(11) as usize;
    let d = bits.div_ceil(passes as u32);
    let mask = (1u64 << d) - 1;
    let width = 1usize << d;
    let mut count = vec![0usize; passes * width];
    for x in v.iter() {
        let k = key(x);
        for (p, c) in count.chunks_exact_mut(width).enumerate() {
            c[((k >> (p as u32 * d)) & mask) as usize] += 1;
        }
    }
    scratch.clear();
    scratch.resize(v.len(), T::default());
    for (p, c) in count.chunks_exact_mut(width).enumerate() {
        if c.contains(&v.len()) {
            continue;
        }
        let shift = p as u32 * d;
        let mut sum = 0;
        for c in c.iter_mut() {
            let k = *c;
            *c = sum;
            sum += k;
        }
        for x in v.iter() {
            let b = ((key(x) >> shift) & mask) as usize;
            scratch[c[b]] = *x;
            c[b] += 1;
        }
        std::mem::swap(v, scratch);
    }
}

/// Sorts pairs of `bits`-bit numbers: one most-significant-digit
/// distribution pass on the top (at most 11) key bits into `scratch`, then
/// an LSD radix sort of each bucket, which is small enough to stay in cache
/// (Knuth, TAOCP vol. 3, §5.2.5; the hybrid is common practice, no
/// source). Not stable, which equal pairs do not need. `scratch` ends
/// `v.len()` long with unspecified contents when the radix path ran.
fn sort_pairs(v: &mut Vec<[u32; 2]>, scratch: &mut Vec<[u32; 2]>, bits: u32) {
    let len = v.len();
    if len < 4096 {
        v.sort_unstable();
        return;
    }
    let total = 2 * bits.clamp(1, 32);
    let key = |e: &[u32; 2]| ((e[0] as u64) << (total / 2)) | e[1] as u64;
    let d1 = total.min(11);
    let rest = total - d1;
    let mut start = vec![0usize; (1 << d1) + 1];
    for e in v.iter() {
        start[(key(e) >> rest) as usize + 1] += 1;
    }
    for h in 0..1 << d1 {
        start[h + 1] += start[h];
    }
    // A fresh zeroed buffer comes from the allocator already zero (no
    // write pass); a lent one is only cleared and refilled.
    if scratch.capacity() < len {
        *scratch = vec![[0, 0]; len];
    } else {
        scratch.clear();
        scratch.resize(len, [0, 0]);
    }
    let mut next = start.clone();
    for e in v.iter() {
        let h = (key(e) >> rest) as usize;
        scratch[next[h]] = *e;
        next[h] += 1;
    }
    if rest == 0 {
        std::mem::swap(v, scratch);
        return;
    }
    let passes = rest.div_ceil(11);
    let d = rest.div_ceil(passes);
    let (mask, width) = ((1u64 << d) - 1, 1usize << d);
    let mut count = vec![0usize; passes as usize * width];
    for h in 0..1 << d1 {
        let (s, t) = (start[h], start[h + 1]);
        if t - s < 64 {
            scratch[s..t].sort_unstable();
            v[s..t].copy_from_slice(&scratch[s..t]);
            continue;
        }
        count.iter_mut().for_each(|c| *c = 0);
        for e in &scratch[s..t] {
            let k = key(e);
            for (p, c) in count.chunks_exact_mut(width).enumerate() {
                c[((k >> (p as u32 * d)) & mask) as usize] += 1;
            }
        }
        let mut in_scratch = true;
        for (p, c) in count.chunks_exact_mut(width).enumerate() {
            if c.contains(&(t - s)) {
                continue;
            }
            let mut sum = 0;
            for c in c.iter_mut() {
                let k = *c;
                *c = sum;
                sum += k;
            }
            let (src, dst): (&[[u32; 2]], &mut [[u32; 2]]) = if in_scratch {
                (&scratch[s..t], &mut v[s..t])
            } else {
                (&v[s..t], &mut scratch[s..t])
            };
            let shift = p as u32 * d;
            for e in src {
                let b = ((key(e) >> shift) & mask) as usize;
                dst[c[b]] = *e;
                c[b] += 1;
            }
            in_scratch = !in_scratch;
        }
        if in_scratch {
            v[s..t].copy_from_slice(&scratch[s..t]);
        }
    }
}

/// Counting-sort rows of an undirected network: each edge `(a, b)`, `a <
/// b`, goes to row `a` as `b` and to row `b` as `a`. With edges sorted by
/// `(a, b)`, row `r` is its entries below `r` (from edges `(c, r)`), then
/// those above (edges `(r, x)`, contiguous in the edge list, written in one
/// sequential pass). The entries below are a transpose, done as a
/// two-level counting sort (Knuth, TAOCP vol. 3, §5.2, distribution
/// counting; most significant digit first). `cols` lends its memory to the column array (any length; contents are
/// overwritten).
fn rows_undirected(n: usize, edges: &[[u32; 2]], cols: Vec<u32>) -> (Vec<u64>, Vec<u32>, Vec<u32>) {
    rows_undirected_with(n, edges, cols, true)
}

/// [`rows_undirected`]; `pack = false` forces the unpacked transpose (for
/// tests; it is otherwise taken only when the packed entries do not fit).
fn rows_undirected_with(
    n: usize,
    edges: &[[u32; 2]],
    mut cols: Vec<u32>,
    pack: bool,
) -> (Vec<u64>, Vec<u32>, Vec<u32>) {
    // offsets[a + 1] counts the entries above (sequential: edges are sorted
    // by a), below[b] those below (4-byte counters keep the random
    // increments in cache).
    let mut offsets = vec![0u64; n + 1];
    let mut below = vec![0u32; n];
    for e in edges {
        offsets[e[0] as usize + 1] += 1;
        below[e[1] as usize] += 1;
    }
    for i in 0..n {
        offsets[i + 1] += offsets[i] + below[i] as u64;
    }
    let total = offsets[n] as usize;
    if cols.len() >= total {
        cols.truncate(total);
        cols.shrink_to_fit();
    } else {
        cols = vec![0u32; total];
    }
    let mut ids = vec![0u32; total];
    // Entries above the row: fill each row's tail backwards.
    let mut ptr = 0usize;
    let mut row = u32::MAX;
    for (i, e) in edges.iter().enumerate().rev() {
        if e[0] != row {
            row = e[0];
            ptr = offsets[row as usize + 1] as usize;
        }
        ptr -= 1;
        cols[ptr] = e[1];
        ids[ptr] = i as u32;
    }
    // Entries below the row: edge ids are first bucketed by sections of
    // rows (one sequential read, a few hundred write streams), then each
    // section, whose rows fit in cache, is filled from its bucket in edge
    // order, i.e. ascending source within every row. below[r] now counts
    // the entries written.
    let per = (total / n.max(1)).max(1);
    let shift = ((32usize << 10) / per).max(1).ilog2();
    let sections = (n >> shift) + 1;
    let mut start = vec![0usize; sections + 1];
    for (r, &b) in below.iter().enumerate() {
        start[(r >> shift) + 1] += b as usize;
    }
    for h in 0..sections {
        start[h + 1] += start[h];
    }
    let mut next = start.clone();
    below.iter_mut().for_each(|b| *b = 0);
    let mut place = |r: usize, a: u32, i: u32| {
        let s = offsets[r] as usize + below[r] as usize;
        below[r] += 1;
        cols[s] = a;
        ids[s] = i;
    };
    let bits = |x: usize| usize::BITS - x.saturating_sub(1).leading_zeros();
    let (ba, bi) = (bits(n), bits(edges.len()));
    if pack && ba + shift + bi <= 64 {
        // Each bucket entry packs (edge id, row within the section, source),
        // so the fill reads the buckets alone.
        let mut bucket = vec![0u64; edges.len()];
        for (i, e) in edges.iter().enumerate() {
            let r = e[1] as usize;
            let h = r >> shift;
            let local = (r & ((1 << shift) - 1)) as u64;
            bucket[next[h]] = ((i as u64) << (ba + shift)) | (local << ba) | e[0] as u64;
            next[h] += 1;
        }
        let (amask, lmask) = ((1u64 << ba) - 1, (1u64 << shift) - 1);
        for h in 0..sections {
            for &x in &bucket[start[h]..start[h + 1]] {
                let r = (h << shift) | ((x >> ba) & lmask) as usize;
                place(r, (x & amask) as u32, (x >> (ba + shift)) as u32);
            }
        }
    } else {
        // Too large to pack: bucket edge ids and read the edges again.
        let mut bucket = vec![0u32; edges.len()];
        for (i, e) in edges.iter().enumerate() {
            let h = e[1] as usize >> shift;
            bucket[next[h]] = i as u32;
            next[h] += 1;
        }
        for &i in &bucket {
            let [a, r] = edges[i as usize];
            place(r as usize, a, i);
        }
    }
    (offsets, cols, ids)
}

/// Counting-sort rows: `entries(e)` yields `(row, column)` pairs of edge `e`.
fn rows<I: Iterator<Item = (u32, u32)>>(
    n: usize,
    edges: &[[u32; 2]],
    entries: impl Fn(&[u32; 2]) -> I,
) -> (Vec<u64>, Vec<u32>, Vec<u32>) {
    let mut offsets = vec![0u64; n + 1];
    for e in edges {
        for (r, _) in entries(e) {
            offsets[r as usize + 1] += 1;
        }
    }
    for i in 0..n {
        offsets[i + 1] += offsets[i];
    }
    let total = offsets[n] as usize;
    let mut cols = vec![0u32; total];
    let mut ids = vec![0u32; total];
    let mut next: Vec<u64> = offsets[..n].to_vec();
    for (i, e) in edges.iter().enumerate() {
        for (r, c) in entries(e) {
            let slot = next[r as usize] as usize;
            cols[slot] = c;
            ids[slot] = i as u32;
            next[r as usize] += 1;
        }
    }
    (offsets, cols, ids)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A fixed pseudo-random sequence (64-bit LCG, Knuth MMIX constants):
    /// `next(k)` is uniform-ish in `0..k`.
    fn lcg(mut x: u64) -> impl FnMut(u64) -> u64 {
        move |k| {
            x = x.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
            (x >> 33) % k
        }
    }

    fn path(n: u32) -> Network {
        let e = (0..n - 1).map(|i| (i, i + 1)).collect();
        Network::from_edges(n, false, e, None, WeightMerge::Max).unwrap().0
    }

    #[test]
    fn path_degrees() {
        let net = path(4);
        assert_eq!(net.degrees(), vec![1, 2, 2, 1]);
        assert_eq!(net.neighbors(2), &[1, 3]);
        // The shared edge index: edge (1,2) seen from both sides.
        let e12 = net.neighbor_edges(1)[1];
        assert_eq!(net.neighbor_edges(2)[0], e12);
        assert_eq!(net.edges()[e12 as usize], [1, 2]);
    }

    #[test]
    fn directed_rows() {
        let (net, _) =
            Network::from_edges(3, true, vec![(0, 1), (1, 0), (2, 1)], None, WeightMerge::Max)
                .unwrap();
        assert_eq!(net.edge_count(), 3);
        assert_eq!(net.neighbors(1), &[0]);
        assert_eq!(net.in_neighbors(1), &[0, 2]);
        assert_eq!(net.in_degree(0), 1);
    }

    #[test]
    fn weights_merge() {
        let e = vec![(0, 1), (1, 0), (1, 0)];
        let w = Some(vec![0.5f32, 0.5, 0.2]);
        let get = |m| Network::from_edges(2, false, e.clone(), w.clone(), m).unwrap().0;
        assert_eq!(get(WeightMerge::Max).weights().unwrap(), &[0.5]);
        assert_eq!(get(WeightMerge::Sum).weights().unwrap(), &[1.2]);
        assert_eq!(get(WeightMerge::First).weights().unwrap(), &[0.5]);
        assert!((get(WeightMerge::NoisyOr).weights().unwrap()[0] - 0.8).abs() < 1e-6);
    }

    #[test]
    fn out_of_range_is_an_error() {
        let r = Network::from_edges(2, false, vec![(0, 2)], None, WeightMerge::Max);
        assert!(matches!(r, Err(BuildError::NodeOutOfRange { node: 2, .. })));
    }

    #[test]
    fn radix_sort_matches_stable_sort() {
        // A fixed pseudo-random sequence (64-bit LCG, Knuth MMIX constants).
        let mut x = 1u64;
        let mut v: Vec<(u64, u32)> = (0..20_000u32)
            .map(|i| {
                x = x.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
                ((x >> 40) % 5000, i)
            })
            .collect();
        let mut expect = v.clone();
        expect.sort_by_key(|p| p.0);
        radix_sort(&mut v, |p| p.0, 13);
        assert_eq!(v, expect);
    }

    #[test]
    fn large_build_merges_like_small() {
        // Enough edges for the radix path; every edge listed twice reversed.
        let n = 3000u32;
        let e: Vec<(u32, u32)> =
            (0..n).flat_map(|i| [(i, (i * 7 + 1) % n), ((i * 7 + 1) % n, i)]).collect();
        let (net, rep) = Network::from_edges(n, false, e, None, WeightMerge::Max).unwrap();
        assert_eq!(rep.duplicates_merged, 3000);
        assert_eq!(net.edge_count(), 3000);
        assert!(net.edges().windows(2).all(|w| w[0] < w[1]));
        // Rows ascending, and each entry's edge id names the same pair.
        for v in 0..n {
            assert!(net.neighbors(v).windows(2).all(|w| w[0] < w[1]), "row {v}");
            for (&u, &e) in net.neighbors(v).iter().zip(net.neighbor_edges(v)) {
                assert_eq!(net.edges()[e as usize], [u.min(v), u.max(v)]);
            }
        }
    }

    #[test]
    fn unweighted_build_equals_weighted_build() {
        // The row-first build (no weights) against the sort-first build
        // (weights given): the same edges, rows, edge ids and counts, on a
        // multigraph with loops and repeats in both directions, above and
        // below the radix-sort size. A fixed pseudo-random sequence (64-bit
        // LCG, Knuth MMIX constants).
        let mut lcg = lcg(7);
        let mut next = |k: u32| lcg(k as u64) as u32;
        for (n, m) in [(1u32, 3usize), (5, 40), (300, 3000), (2000, 30_000), (70_000, 300_000)] {
            let e: Vec<(u32, u32)> = (0..m).map(|_| (next(n), next(n))).collect();
            for directed in [false, true] {
                let (a, ra) =
                    Network::from_edges(n, directed, e.clone(), None, WeightMerge::Max).unwrap();
                let ones = Some(vec![1.0f32; e.len()]);
                let (b, rb) =
                    Network::from_edges(n, directed, e.clone(), ones, WeightMerge::Max).unwrap();
                assert_eq!(ra, rb, "n {n} directed {directed}");
                assert_eq!(a.edges(), b.edges());
                assert_eq!(a.out_rows(), b.out_rows());
                assert_eq!(a.in_rows(), b.in_rows());
                assert!(a.weights().is_none());
                // Rows against the definition: the sorted (neighbor, edge)
                // pairs of every node, built naively from the edge list.
                let mut naive = vec![Vec::new(); n as usize];
                let mut naive_in = vec![Vec::new(); n as usize];
                for (i, &[u, v]) in a.edges().iter().enumerate() {
                    naive[u as usize].push((v, i as u32));
                    if directed {
                        naive_in[v as usize].push((u, i as u32));
                    } else {
                        naive[v as usize].push((u, i as u32));
                    }
                }
                for v in 0..n {
                    naive[v as usize].sort_unstable();
                    naive_in[v as usize].sort_unstable();
                    let row: Vec<(u32, u32)> = a
                        .neighbors(v)
                        .iter()
                        .copied()
                        .zip(a.neighbor_edges(v).iter().copied())
                        .collect();
                    assert_eq!(row, naive[v as usize], "row {v}");
                    if directed {
                        let row: Vec<(u32, u32)> = a
                            .in_neighbors(v)
                            .iter()
                            .copied()
                            .zip(a.in_neighbor_edges(v).iter().copied())
                            .collect();
                        assert_eq!(row, naive_in[v as usize], "in-row {v}");
                    }
                }
                let mut sorted: Vec<[u32; 2]> = e
                    .iter()
                    .filter(|p| p.0 != p.1)
                    .map(|&(u, v)| if directed || u < v { [u, v] } else { [v, u] })
                    .collect();
                sorted.sort_unstable();
                sorted.dedup();
                assert_eq!(a.edges(), &sorted[..]);
            }
        }
    }

    #[test]
    fn sort_pairs_sorts() {
        // Uniform, skewed (most sources tiny) and few-bit inputs, with
        // repeats; against the standard sort.
        let mut next = lcg(5);
        for (n, len, skew) in [
            (2u32, 5000usize, false),
            (40, 9000, false),
            (3000, 50_000, true),
            (1 << 20, 70_000, false),
            (u32::MAX, 20_000, false),
        ] {
            let bits = if n <= 1 { 1 } else { 32 - (n - 1).leading_zeros() };
            let mut v: Vec<[u32; 2]> = (0..len)
                .map(|_| {
                    let a = if skew { next(n as u64).min(next(8)) } else { next(n as u64) };
                    [a as u32, next(n as u64) as u32]
                })
                .collect();
            let mut expect = v.clone();
            expect.sort_unstable();
            let mut scratch = Vec::new();
            sort_pairs(&mut v, &mut scratch, bits);
            assert_eq!(v, expect, "n {n}");
            assert_eq!(scratch.len(), len);
        }
    }

    #[test]
    fn packed_and_unpacked_transpose_agree() {
        let mut lcg = lcg(11);
        let mut next = |k: u32| lcg(k as u64) as u32;
        let n = 50_000u32;
        let e: Vec<(u32, u32)> = (0..200_000).map(|_| (next(n), next(n))).collect();
        let (net, _) = Network::from_edges(n, false, e, None, WeightMerge::Max).unwrap();
        let unpacked = rows_undirected_with(n as usize, net.edges(), Vec::new(), false);
        let (o, t, i) = net.out_rows();
        assert_eq!((o, t, i), (&unpacked.0[..], &unpacked.1[..], &unpacked.2[..]));
    }

    #[test]
    fn relabel_reverses() {
        let net = path(3);
        let r = net.relabeled(&[2, 1, 0]);
        assert_eq!(r.edges(), &[[0, 1], [1, 2]]);
        assert_eq!(r.degrees(), vec![1, 2, 1]);
    }
}
