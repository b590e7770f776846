//! The `degree` (static) and `degree-adaptive` rules.
//!
//! Tie rule (both): among people of equal (current) degree, the lower node
//! index goes first. Node indices follow first appearance in the edge list
//! (or the node table), so the tie rule is reproducible from the input.

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
/// A lazy bucket queue (`LazyBuckets`): each person has one entry, in the
/// bucket of a degree at least their current one; a removal only lowers
/// the neighbours' degrees, and a stale entry moves down to the bucket of
/// the current degree when its bucket is reached. Within a bucket entries
/// are taken in index order, which gives exactly the order of a max-heap
/// keyed `(degree, −index)` (the tie rule the networkx reference check
/// uses) in O(N + M) bucket moves plus one sort per bucket.
pub fn degree_adaptive_order(present: &Present<'_>) -> Vec<u32> {
    let net = present.net;
    let mut deg = present.degree.clone();
    let mut alive = present.alive.clone();
    let candidates = present.candidates();
    let mut order = Vec::with_capacity(candidates.len());
    let mut queue = LazyBuckets::new(candidates.iter().map(|&v| (v, deg[v as usize])));
    while let Some(v) = queue.pop(|v| deg[v as usize]) {
        alive[v as usize] = false;
        order.push(v);
        for &u in net.neighbors(v) {
            if alive[u as usize] {
                deg[u as usize] -= 1;
            }
        }
    }
    order
}

/// A max-priority queue of people keyed `(key, −index)` for keys that only
/// decrease, as in adaptive degree and CoreHD.
///
/// Every person has one entry, filed under a key at least their current
/// key. [`pop`](Self::pop) takes the highest non-empty bucket in index
/// order; an entry whose person's key has fallen is refiled under the
/// current key (always a lower bucket, so the bucket being emptied never
/// grows, and sorting it once when it is reached keeps index order). The
/// person returned has the highest current key and, among those, the
/// lowest index: every other person's entry sits at or above their key.
pub(crate) struct LazyBuckets {
    buckets: Vec<Vec<u32>>,
    /// The bucket being emptied and the next position in it.
    top: usize,
    pos: usize,
    sorted: bool,
}

impl LazyBuckets {
    /// A queue holding `(person, key)` entries.
    pub(crate) fn new(entries: impl Iterator<Item = (u32, u32)>) -> Self {
        let mut buckets: Vec<Vec<u32>> = Vec::new();
        for (v, k) in entries {
            let k = k as usize;
            if buckets.len() <= k {
                buckets.resize_with(k + 1, Vec::new);
            }
            buckets[k].push(v);
        }
        let top = buckets.len().saturating_sub(1);
        LazyBuckets { buckets, top, pos: 0, sorted: false }
    }

    /// The person of highest current key (lowest index among equals), or
    /// `None` when every entry has been taken. `key(v)` is v's current key,
    /// or `u32::MAX` to drop v's entry (v is no longer a candidate).
    pub(crate) fn pop(&mut self, key: impl Fn(u32) -> u32) -> Option<u32> {
        loop {
            if self.buckets.is_empty() {
                return None;
            }
            if !self.sorted {
                self.buckets[self.top].sort_unstable();
                self.sorted = true;
            }
            while self.pos < self.buckets[self.top].len() {
                let v = self.buckets[self.top][self.pos];
                self.pos += 1;
                let k = key(v);
                if k as usize == self.top {
                    return Some(v);
                }
                if (k as usize) < self.top {
                    self.buckets[k as usize].push(v);
                }
            }
            self.buckets[self.top] = Vec::new();
            if self.top == 0 {
                self.buckets.clear();
                return None;
            }
            self.top -= 1;
            self.pos = 0;
            self.sorted = false;
        }
    }
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

    /// The plain lazy max-heap keyed `(degree, −index)`, one fresh entry
    /// per degree drop (the textbook form of the rule).
    fn heap_adaptive_order(present: &Present<'_>) -> Vec<u32> {
        let mut deg = present.degree.clone();
        let mut alive = present.alive.clone();
        let key = |d: u32, v: u32| ((d as u64) << 32) | (u32::MAX - v) as u64;
        let mut heap: std::collections::BinaryHeap<u64> =
            present.candidates().into_iter().map(|v| key(deg[v as usize], v)).collect();
        let mut order = Vec::new();
        while let Some(k) = heap.pop() {
            let v = u32::MAX - (k as u32);
            if !alive[v as usize] || deg[v as usize] != (k >> 32) as u32 {
                continue;
            }
            alive[v as usize] = false;
            order.push(v);
            for &u in present.net.neighbors(v) {
                if alive[u as usize] {
                    deg[u as usize] -= 1;
                    heap.push(key(deg[u as usize], u));
                }
            }
        }
        order
    }

    #[test]
    fn bucket_queue_gives_the_heap_order() {
        for seed in 0..6 {
            let g = crate::network::generate::barabasi_albert(500, 3, seed).unwrap();
            let absent: Vec<bool> = (0..500).map(|v| v % 7 == seed as usize).collect();
            for a in [&[][..], &absent[..]] {
                let p = Present::new(&g, a);
                assert_eq!(degree_adaptive_order(&p), heap_adaptive_order(&p), "seed {seed}");
            }
        }
    }
}
