//! Reverse-reachable (RR) sets (Borgs, Brautbar, Chayes & Lucier 2014;
//! Tang, Shi & Xiao 2015) and greedy maximum coverage over them.
//!
//! An RR set is drawn by picking a uniformly random root among the people
//! who can adopt and collecting everyone who reaches it over live arcs of
//! a fresh live-edge realization (a reverse BFS over in-arcs). For any seed
//! set `S`, `n · Pr[S meets a random RR set]` is its expected reach, so the
//! fraction of sampled sets that `S` covers is an unbiased estimate.
//!
//! Sets are stored flat (one `Vec<u32>` of members plus offsets). Set `j`
//! takes all its randomness — root and arc coins — from
//! `key(seed, Stage::RrSet, base + j)`, so a collection is identical for
//! any thread count. Sampling runs in parallel in fixed chunks.

use std::cmp::Reverse;
use std::collections::BinaryHeap;

use rayon::prelude::*;

use crate::rng::{hash, hit, key, Stage};
use crate::seed::Cascade;

/// A collection of RR sets stored flat.
///
/// Sets with a single member (the root alone — most sets when
/// probabilities are small) are kept as a per-person count instead of being
/// stored, unless the collection was made with [`RrSets::new_stored`]; they
/// count in [`RrSets::len`] and in coverage exactly like stored sets.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct RrSets {
    members: Vec<u32>,
    offsets: Vec<u64>,
    /// `singles[v]` = single-member sets `{v}` (empty until the first draw).
    singles: Vec<u32>,
    single_count: u64,
    compact: bool,
    drawn: u64,
    base: u64,
}

impl RrSets {
    /// An empty collection whose `j`-th draw uses the random key of index
    /// `base + j` (independent collections use distinct bases), with
    /// single-member sets counted, not stored.
    pub fn new(base: u64) -> RrSets {
        RrSets { offsets: vec![0], compact: true, base, ..Default::default() }
    }

    /// Like [`RrSets::new`] but storing every set, so that
    /// [`RrSets::set`] reaches all of them in draw order.
    pub fn new_stored(base: u64) -> RrSets {
        RrSets { compact: false, ..RrSets::new(base) }
    }

    /// Number of sets drawn (stored plus single-member).
    pub fn len(&self) -> usize {
        self.drawn as usize
    }

    /// Whether there are no sets.
    pub fn is_empty(&self) -> bool {
        self.drawn == 0
    }

    /// Number of stored sets (reachable with [`RrSets::set`]).
    pub fn stored_len(&self) -> usize {
        self.offsets.len() - 1
    }

    /// Members of stored set `j`.
    #[inline]
    pub fn set(&self, j: usize) -> &[u32] {
        &self.members[self.offsets[j] as usize..self.offsets[j + 1] as usize]
    }

    /// Single-member sets `{v}` that were counted, not stored.
    #[inline]
    pub fn singles_of(&self, v: u32) -> u32 {
        self.singles.get(v as usize).copied().unwrap_or(0)
    }

    /// Total members over all sets.
    pub fn total_members(&self) -> u64 {
        self.members.len() as u64 + self.single_count
    }

    /// Bytes held by the members, offsets and single-member counts.
    pub fn memory_bytes(&self) -> u64 {
        (self.members.capacity() * 4 + self.offsets.capacity() * 8 + self.singles.capacity() * 4)
            as u64
    }

    /// Samples sets until there are `target` of them.
    pub fn extend_to(&mut self, c: &Cascade<'_>, target: u64, seed: u64) {
        let have = self.drawn;
        if target <= have {
            return;
        }
        let roots: Vec<u32> =
            (0..c.network().node_count() as u32).filter(|&v| !c.is_blocked(v)).collect();
        if roots.is_empty() {
            return;
        }
        let n = c.network().node_count();
        if self.compact && self.singles.is_empty() {
            self.singles = vec![0; n];
        }
        // A few contiguous parts per thread: each part allocates its visited
        // marks once. Set j's randomness depends on j only, and parts are
        // joined in order, so the collection is the same for any split.
        let count = target - have;
        let parts = (4 * rayon::current_num_threads() as u64).clamp(1, count.div_ceil(256));
        let base = self.base;
        let compact = self.compact;
        let chunks: Vec<(Vec<u32>, Vec<u32>, Vec<u32>)> = (0..parts)
            .into_par_iter()
            .map(|ch| {
                let lo = have + count * ch / parts;
                let hi = have + count * (ch + 1) / parts;
                let mut stamp = vec![0u32; n];
                let mut members = Vec::new();
                let mut lens = Vec::new();
                let mut singles = Vec::new();
                for (g, j) in (lo..hi).enumerate() {
                    let g = g as u32 + 1;
                    let start = members.len();
                    sample_one(
                        c,
                        &roots,
                        key(seed, Stage::RrSet, base + j),
                        &mut stamp,
                        g,
                        &mut members,
                    );
                    if compact && members.len() == start + 1 {
                        singles.push(members.pop().expect("the root is a member"));
                    } else {
                        lens.push((members.len() - start) as u32);
                    }
                }
                (members, lens, singles)
            })
            .collect();
        let extra: usize = chunks.iter().map(|p| p.0.len()).sum();
        self.members.reserve(extra);
        for (m, lens, singles) in chunks {
            self.members.extend_from_slice(&m);
            let mut off = *self.offsets.last().expect("offsets start with 0");
            for l in lens {
                off += u64::from(l);
                self.offsets.push(off);
            }
            for v in singles {
                self.singles[v as usize] += 1;
                self.single_count += 1;
            }
        }
        self.drawn = target;
    }

    /// For each node, the stored sets that contain it: `(offsets, set ids)`.
    pub fn inverted(&self, n: usize) -> (Vec<u64>, Vec<u32>) {
        let mut count = vec![0u64; n + 1];
        for &v in &self.members {
            count[v as usize + 1] += 1;
        }
        for i in 0..n {
            count[i + 1] += count[i];
        }
        let mut fill = count.clone();
        let mut ids = vec![0u32; self.members.len()];
        for j in 0..self.stored_len() {
            for &v in self.set(j) {
                ids[fill[v as usize] as usize] = j as u32;
                fill[v as usize] += 1;
            }
        }
        (count, ids)
    }
}

/// One RR set: reverse BFS from a random root over live in-arcs.
fn sample_one(
    c: &Cascade<'_>,
    roots: &[u32],
    k: u64,
    stamp: &mut [u32],
    g: u32,
    members: &mut Vec<u32>,
) {
    let (offsets, sources, eids) = c.network().in_rows();
    let thr = c.in_thresholds();
    // Root: the top bits of a coin outside the arc index range (u64::MAX).
    let r = ((u128::from(hash(k, u64::MAX)) * roots.len() as u128) >> 64) as usize;
    let root = roots[r];
    stamp[root as usize] = g;
    let start = members.len();
    members.push(root);
    let mut head = start;
    while head < members.len() {
        let v = members[head];
        head += 1;
        for i in offsets[v as usize] as usize..offsets[v as usize + 1] as usize {
            let u = sources[i];
            if stamp[u as usize] == g || c.is_blocked(u) {
                continue;
            }
            if hit(thr[i], hash(k, c.coin_index(eids[i], u, v))) {
                stamp[u as usize] = g;
                members.push(u);
            }
        }
    }
}

/// The result of greedy maximum coverage.
#[derive(Clone, Debug, PartialEq)]
pub struct Coverage {
    /// Seeds in pick order.
    pub seeds: Vec<u32>,
    /// `covered[i]` = sets covered by the first `i + 1` seeds.
    pub covered: Vec<u64>,
    /// With `track_bound`: `min_i (Λ(S_i) + Σ of the k largest marginal
    /// coverages given S_i)` over `i = 0..k`, an upper bound on the best
    /// coverage of any `k` nodes (submodularity; Tang et al. 2018, OPIM-C).
    pub coverage_bound: Option<u64>,
}

/// Sum of the `k` largest values of `cnt` (`scratch` is reused).
fn top_k_sum(cnt: &[u32], k: usize, scratch: &mut Vec<u32>) -> u64 {
    scratch.clear();
    scratch.extend(cnt.iter().copied().filter(|&c| c > 0));
    if scratch.len() > k {
        let idx = scratch.len() - k;
        scratch.select_nth_unstable(idx);
        scratch[idx..].iter().map(|&c| u64::from(c)).sum()
    } else {
        scratch.iter().map(|&c| u64::from(c)).sum()
    }
}

/// Greedy maximum coverage of `sets` by `k` nodes (Nemhauser, Wolsey &
/// Fisher 1978: coverage ≥ (1 − (1 − 1/k)^k) of the best `k` nodes), with
/// lazy evaluation (counts only fall, so a stale heap entry is re-pushed
/// with its current count). Ties go to the smaller index. `start` seeds are
/// taken first (in that order); `allowed` restricts the candidates. When
/// every set is covered, remaining picks are the smallest unused allowed
/// indices that are not blocked.
pub fn greedy_cover(
    sets: &RrSets,
    c: &Cascade<'_>,
    k: usize,
    start: &[u32],
    allowed: Option<&[bool]>,
) -> Coverage {
    greedy_cover_tracked(sets, c, k, start, allowed, false)
}

/// [`greedy_cover`], optionally tracking the submodular upper bound on the
/// optimal coverage (`track_bound`; costs `O(n)` per pick; `start` and
/// `allowed` must be empty/`None` for the bound to be meaningful).
pub fn greedy_cover_tracked(
    sets: &RrSets,
    c: &Cascade<'_>,
    k: usize,
    start: &[u32],
    allowed: Option<&[bool]>,
    track_bound: bool,
) -> Coverage {
    let n = c.network().node_count();
    let (inv_off, inv_ids) = sets.inverted(n);
    let mut cnt: Vec<u32> =
        (0..n).map(|v| (inv_off[v + 1] - inv_off[v]) as u32 + sets.singles_of(v as u32)).collect();
    let mut covered_set = vec![false; sets.stored_len()];
    let mut chosen = vec![false; n];
    let mut seeds = Vec::with_capacity(k);
    let mut covered = Vec::with_capacity(k);
    let mut total = 0u64;
    let take = |v: u32, cnt: &mut Vec<u32>, covered_set: &mut Vec<bool>| -> u64 {
        let single = sets.singles_of(v);
        cnt[v as usize] -= single;
        let mut gained = u64::from(single);
        for &j in &inv_ids[inv_off[v as usize] as usize..inv_off[v as usize + 1] as usize] {
            if !covered_set[j as usize] {
                covered_set[j as usize] = true;
                gained += 1;
                for &w in sets.set(j as usize) {
                    cnt[w as usize] -= 1;
                }
            }
        }
        gained
    };
    for &s in start.iter().take(k) {
        if !chosen[s as usize] {
            chosen[s as usize] = true;
            total += take(s, &mut cnt, &mut covered_set);
            seeds.push(s);
            covered.push(total);
        }
    }
    let ok = |v: usize| allowed.is_none_or(|a| a[v]) && !c.is_blocked(v as u32);
    let mut heap: BinaryHeap<(u32, Reverse<u32>)> = (0..n)
        .filter(|&v| cnt[v] > 0 && !chosen[v] && ok(v))
        .map(|v| (cnt[v], Reverse(v as u32)))
        .collect();
    let mut scratch = Vec::new();
    let mut bound = if track_bound { Some(top_k_sum(&cnt, k, &mut scratch)) } else { None };
    while seeds.len() < k {
        let Some((stored, Reverse(v))) = heap.pop() else { break };
        let now = cnt[v as usize];
        if now != stored {
            if now > 0 {
                heap.push((now, Reverse(v)));
            }
            continue;
        }
        chosen[v as usize] = true;
        total += take(v, &mut cnt, &mut covered_set);
        seeds.push(v);
        covered.push(total);
        if let Some(b) = bound.as_mut() {
            *b = (*b).min(total + top_k_sum(&cnt, k, &mut scratch));
        }
    }
    if let Some(b) = bound.as_mut() {
        *b = (*b).max(total);
    }
    let mut v = 0usize;
    while seeds.len() < k && v < n {
        if !chosen[v] && ok(v) {
            chosen[v] = true;
            seeds.push(v as u32);
            covered.push(total);
        }
        v += 1;
    }
    Coverage { seeds, covered, coverage_bound: bound }
}
