//! Newman–Ziff sweeps (Newman & Ziff 2000, PRL 85:4104; 2001, PRE
//! 64:016706): occupy the bonds (or sites) of a network one at a time in a
//! random order, keeping components in a union–find, so every occupation
//! level `k = 0..=K` (`K = M` bonds or `N` sites) is seen in one O(M α)
//! pass per realization.
//!
//! Observables at level `k` (the microcanonical ensemble): the largest
//! component `S₁`, the second largest `S₂` (exact, from a histogram of
//! component sizes), `Σ s²`, the nodes in large components (size ≥
//! [`large_outbreak_min`]`(N)`), and the mean size of the non-giant clusters
//! `χ = (Σ s² − S₁²) / (n_occ − S₁)` (the expected cluster size of a random
//! occupied node outside the giant; `n_occ = N` for bonds, `k` for sites).
//! They are turned into values at occupation probability `p` (the
//! canonical ensemble) by the binomial convolution `Q(p) = Σ_k C(K, k) p^k
//! (1 − p)^{K−k} Q_k`; the weights are built from the mode outwards by the
//! ratio `w_{k+1}/w_k = (K − k)/(k + 1) · p/(1 − p)`, cut below `1e-16` of the
//! mode and normalized, which never overflows or underflows.
//!
//! The critical point of one realization is the level `k*` at which `χ_k`
//! is largest, `p* = k*/K` (the peak of the mean non-giant cluster size;
//! finite networks shift it by about `L^{−1/ν}` on lattices). Its mean and
//! 95% interval across realizations are the Newman–Ziff estimate of `T_c`
//! (bonds) or the site threshold. The occupation order of realization `r`
//! comes from `rng::stream(seed, Stage::Sweep, r)`, so results do not depend
//! on the thread count.

use rayon::prelude::*;

use super::realization::{large_outbreak_min, PercolationError};
use super::UnionFind;
use crate::network::Network;
use crate::rng::{self, Stage};
use crate::stats::{mean_ci, Estimate};

/// Parameters of a Newman–Ziff sweep.
#[derive(Clone, Debug, PartialEq)]
pub struct SweepConfig {
    /// Occupy sites (all edges present) instead of bonds.
    pub site: bool,
    /// Realizations.
    pub runs: u64,
    /// Master seed.
    pub seed: u64,
    /// Occupation probabilities at which to report the canonical curve.
    pub points: Vec<f64>,
    /// Smallest component counted as a large outbreak (`None` =
    /// [`large_outbreak_min`]`(N)`).
    pub large_min: Option<u32>,
}

/// The canonical observables at one occupation probability, averaged over
/// realizations.
#[derive(Clone, Debug, PartialEq, serde::Serialize)]
pub struct SweepPoint {
    /// Occupation probability (the transmissibility for bonds).
    pub occupation: f64,
    /// `S₁ / N`.
    pub giant_fraction: Estimate,
    /// `Σ s² / N²` (unoccupied sites count as size 0).
    pub mean_outbreak_fraction: Estimate,
    /// Nodes in components of at least the large cut, over `N`.
    pub outbreak_probability: Estimate,
    /// `S₂ / N`.
    pub second_largest_fraction: Estimate,
    /// The mean non-giant cluster size `χ` (nodes).
    pub mean_cluster_size: Estimate,
}

/// The result of a sweep.
#[derive(Clone, Debug, PartialEq, serde::Serialize)]
pub struct Sweep {
    /// Whether sites (true) or bonds were occupied.
    pub site: bool,
    /// Realizations.
    pub runs: u64,
    /// The canonical curve at the requested points, in their order.
    pub points: Vec<SweepPoint>,
    /// The critical occupation: mean and 95% interval of the per-realization
    /// peak location of `χ`.
    pub critical: Estimate,
    /// The per-realization peak locations `k*/K`, by realization.
    pub peaks: Vec<f64>,
}

/// Binomial weights of `Binomial(total, p)` over a window `[lo, lo + w.len())`.
#[derive(Clone, Debug)]
struct Window {
    lo: usize,
    w: Vec<f64>,
}

fn binomial_window(total: usize, p: f64) -> Window {
    if p <= 0.0 {
        return Window { lo: 0, w: vec![1.0] };
    }
    if p >= 1.0 {
        return Window { lo: total, w: vec![1.0] };
    }
    let mode = (((total + 1) as f64) * p).floor().min(total as f64) as usize;
    let odds = p / (1.0 - p);
    let cut = 1e-16;
    let mut up = Vec::new();
    let mut x = 1.0f64;
    let mut k = mode;
    while k < total {
        x *= (total - k) as f64 / (k + 1) as f64 * odds;
        if x < cut {
            break;
        }
        up.push(x);
        k += 1;
    }
    let mut down = Vec::new();
    let mut x = 1.0f64;
    let mut k = mode;
    while k > 0 {
        x *= k as f64 / (total - k + 1) as f64 / odds;
        if x < cut {
            break;
        }
        down.push(x);
        k -= 1;
    }
    let lo = mode - down.len();
    let mut w: Vec<f64> = down.into_iter().rev().collect();
    w.push(1.0);
    w.extend(up);
    let s: f64 = w.iter().sum();
    w.iter_mut().for_each(|x| *x /= s);
    Window { lo, w }
}

/// The binomial weights `C(total, k) p^k (1 − p)^{total − k}` for `k` in a
/// window around the mode, as `(first k, weights)`, normalized to sum 1;
/// weights below `1e-16` of the mode's are dropped (module doc).
///
/// ```
/// let (lo, w) = spreadplan::percolation::binomial_weights(4, 0.5);
/// assert_eq!(lo, 0);
/// let want = [1.0, 4.0, 6.0, 4.0, 1.0].map(|c| c / 16.0);
/// assert!(w.iter().zip(want).all(|(a, b)| (a - b).abs() < 1e-15));
/// ```
pub fn binomial_weights(total: usize, p: f64) -> (usize, Vec<f64>) {
    let w = binomial_window(total, p);
    (w.lo, w.w)
}

const OBS: usize = 5;

/// Per-thread buffers of a sweep.
struct SweepScratch {
    uf: UnionFind,
    hist: Vec<u32>,
    order: Vec<u32>,
}

/// The microcanonical state after `k` occupations.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
struct Level {
    s1: u32,
    s2: u32,
    sum_sq: u64,
    in_large: u64,
    occupied: u64,
}

/// Occupies the bonds or sites of realization `r` in order, calling `f(k,
/// level)` at every level `k = 0..=K`.
fn sweep_levels(
    net: &Network,
    site: bool,
    seed: u64,
    large: u32,
    r: u64,
    s: &mut SweepScratch,
    mut f: impl FnMut(usize, Level),
) {
    let n = net.node_count();
    let total = if site { n } else { net.edge_count() };
    s.order.clear();
    s.order.extend(0..total as u32);
    rng::shuffle(&mut rng::stream(seed, Stage::Sweep, r), &mut s.order);
    let uf = &mut s.uf;
    if site {
        uf.reset_inactive();
    } else {
        uf.reset();
    }
    uf.set_large_min(large);
    let hist = &mut s.hist;
    hist.fill(0);
    if !site {
        hist[1] = n as u32;
    }
    let edges = net.edges();
    let mut s2: u32 = if !site && n >= 2 { 1 } else { 0 };
    let mut k = 0usize;
    loop {
        f(
            k,
            Level {
                s1: uf.largest(),
                s2,
                sum_sq: uf.sum_sq(),
                in_large: uf.in_large(),
                occupied: uf.active(),
            },
        );
        if k == total {
            break;
        }
        let item = s.order[k];
        k += 1;
        let old_s1 = uf.largest();
        let join = |uf: &mut UnionFind, hist: &mut [u32], a: u32, b: u32| {
            uf.union_sizes(a, b).map(|(sa, sb)| {
                let m = sa + sb;
                hist[sa as usize] -= 1;
                hist[sb as usize] -= 1;
                hist[m as usize] += 1;
                m
            })
        };
        let mut touched = 0u32;
        if site {
            uf.activate(item);
            hist[1] += 1;
            touched = 1;
            for &w in net.neighbors(item) {
                if uf.is_active(w) {
                    if let Some(m) = join(uf, hist, item, w) {
                        touched = m;
                    }
                }
            }
        } else {
            let [a, b] = edges[item as usize];
            if let Some(m) = join(uf, hist, a, b) {
                touched = m;
            }
        }
        if touched > 0 {
            s2 = second_largest(hist, uf.largest(), old_s1, s2, touched);
        }
    }
}

/// The mean non-giant cluster size `χ` of a level.
#[inline]
fn chi(l: &Level) -> f64 {
    let rest = l.occupied - l.s1 as u64;
    if rest == 0 {
        0.0
    } else {
        (l.sum_sq - l.s1 as u64 * l.s1 as u64) as f64 / rest as f64
    }
}

/// One realization: canonical sums per point and the peak location.
fn one_run(
    net: &Network,
    cfg: &SweepConfig,
    windows: &[Window],
    large: u32,
    r: u64,
    s: &mut SweepScratch,
) -> (Vec<[f64; OBS]>, f64) {
    let n = net.node_count();
    let total = if cfg.site { n } else { net.edge_count() };
    let nf = n as f64;
    let mut acc = vec![[0.0f64; OBS]; windows.len()];
    let (mut ja, mut jb) = (0usize, 0usize);
    let (mut best_chi, mut best_k) = (f64::NEG_INFINITY, 0usize);
    sweep_levels(net, cfg.site, cfg.seed, large, r, s, |k, l| {
        let c = chi(&l);
        if c > best_chi {
            best_chi = c;
            best_k = k;
        }
        // Windows are sorted by p, so the ones covering k are contiguous.
        while ja < windows.len() && windows[ja].lo + windows[ja].w.len() <= k {
            ja += 1;
        }
        while jb < windows.len() && windows[jb].lo <= k {
            jb += 1;
        }
        if ja < jb {
            let q = [
                l.s1 as f64 / nf,
                l.sum_sq as f64 / (nf * nf),
                l.in_large as f64 / nf,
                l.s2 as f64 / nf,
                c,
            ];
            for (win, a) in windows[ja..jb].iter().zip(&mut acc[ja..jb]) {
                if k >= win.lo && k < win.lo + win.w.len() {
                    let w = win.w[k - win.lo];
                    for (a, x) in a.iter_mut().zip(q) {
                        *a += w * x;
                    }
                }
            }
        }
    });
    (acc, best_k as f64 / total.max(1) as f64)
}

/// The size of the largest component other than one giant, from the size
/// histogram after a merge that produced a component of size `m`.
fn second_largest(hist: &[u32], s1: u32, old_s1: u32, old_s2: u32, m: u32) -> u32 {
    if hist[s1 as usize] >= 2 {
        return s1;
    }
    // Candidates above the old second: the new component (if not the
    // giant) or the old giant (if it survives beside a new giant).
    let mut hint = old_s2;
    if m < s1 {
        hint = hint.max(m);
    }
    if old_s1 < s1 && hist[old_s1 as usize] > 0 {
        hint = hint.max(old_s1);
    }
    let mut x = hint.min(s1.saturating_sub(1));
    while x > 0 && hist[x as usize] == 0 {
        x -= 1;
    }
    x
}

/// Runs a Newman–Ziff sweep (module doc) over realizations `0..runs` in
/// parallel; the canonical curve at `cfg.points` and the critical
/// occupation from the peak of the mean non-giant cluster size.
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::percolation::{newman_ziff, SweepConfig};
/// // One edge: at p the giant is 2 with probability p, else 1: S₁/N = (1 + p)/2.
/// let (net, _) = Network::from_edges(2, false, vec![(0, 1)], None, WeightMerge::Max).unwrap();
/// let cfg = SweepConfig { site: false, runs: 4, seed: 1, points: vec![0.25], large_min: None };
/// let s = newman_ziff(&net, &cfg).unwrap();
/// assert!((s.points[0].giant_fraction.mean - 0.625).abs() < 1e-12);
/// ```
pub fn newman_ziff(net: &Network, cfg: &SweepConfig) -> Result<Sweep, PercolationError> {
    if net.is_directed() {
        return Err(PercolationError::Directed("a Newman–Ziff sweep"));
    }
    if cfg.runs == 0 {
        return Err(PercolationError::TooSmall { what: "runs", value: 0, min: 1 });
    }
    for (i, &p) in cfg.points.iter().enumerate() {
        super::realization::check_prob("occupation point", p, Some(i))?;
    }
    let n = net.node_count();
    let total = if cfg.site { n } else { net.edge_count() };
    let large = cfg.large_min.unwrap_or_else(|| large_outbreak_min(n)).max(1);
    // Windows in ascending p; results mapped back to the caller's order.
    let mut idx: Vec<usize> = (0..cfg.points.len()).collect();
    idx.sort_by(|&a, &b| cfg.points[a].total_cmp(&cfg.points[b]));
    let windows: Vec<Window> = idx.iter().map(|&i| binomial_window(total, cfg.points[i])).collect();
    let runs: Vec<(Vec<[f64; OBS]>, f64)> = (0..cfg.runs)
        .into_par_iter()
        .map_init(
            || SweepScratch {
                uf: UnionFind::new(n),
                hist: vec![0; n + 1],
                order: Vec::with_capacity(total),
            },
            |s, r| one_run(net, cfg, &windows, large, r, s),
        )
        .collect();
    let peaks: Vec<f64> = runs.iter().map(|r| r.1).collect();
    let mut points = vec![None; cfg.points.len()];
    for (j, &i) in idx.iter().enumerate() {
        let est = |o: usize| mean_ci(&runs.iter().map(|r| r.0[j][o]).collect::<Vec<_>>());
        points[i] = Some(SweepPoint {
            occupation: cfg.points[i],
            giant_fraction: est(0),
            mean_outbreak_fraction: est(1),
            outbreak_probability: est(2),
            second_largest_fraction: est(3),
            mean_cluster_size: est(4),
        });
    }
    Ok(Sweep {
        site: cfg.site,
        runs: cfg.runs,
        points: points.into_iter().map(|p| p.expect("every point filled")).collect(),
        critical: mean_ci(&peaks),
        peaks,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::WeightMerge;

    fn net(n: u32, e: Vec<(u32, u32)>) -> Network {
        Network::from_edges(n, false, e, None, WeightMerge::Max).unwrap().0
    }

    #[test]
    fn binomial_weights_match_closed_form() {
        // C(10,k) 0.3^k 0.7^(10−k) at k = 3: 120 · 0.027 · 0.0823543 = 0.266828.
        let (lo, w) = binomial_weights(10, 0.3);
        assert!((w[3 - lo] - 0.266_827_932).abs() < 1e-9);
        let (lo, w) = binomial_weights(1_000_000, 0.999);
        assert!(lo > 990_000 && (w.iter().sum::<f64>() - 1.0).abs() < 1e-12);
        assert_eq!(binomial_weights(5, 0.0), (0, vec![1.0]));
        assert_eq!(binomial_weights(5, 1.0), (5, vec![1.0]));
    }

    #[test]
    fn triangle_bond_exact() {
        // Triangle, bond p: components are decided by the number k of bonds:
        // k = 0: sizes 1,1,1; k = 1: 2,1; k ≥ 2: 3 — order does not matter,
        // so every realization gives the exact canonical value
        // S₁/N = [1·(1−p)³ + 2·3p(1−p)² + 3·(3p²(1−p) + p³)] / 3.
        let g = net(3, vec![(0, 1), (1, 2), (0, 2)]);
        let p = 0.4f64;
        let cfg = SweepConfig {
            site: false,
            runs: 3,
            seed: 9,
            points: vec![p, 0.0, 1.0],
            large_min: None,
        };
        let s = newman_ziff(&g, &cfg).unwrap();
        let q = 1.0 - p;
        let want = (q.powi(3) + 2.0 * 3.0 * p * q * q + 3.0 * (3.0 * p * p * q + p.powi(3))) / 3.0;
        assert!((s.points[0].giant_fraction.mean - want).abs() < 1e-12);
        assert_eq!(s.points[0].giant_fraction.ci_low, s.points[0].giant_fraction.mean);
        assert_eq!(s.points[1].giant_fraction.mean, 1.0 / 3.0);
        assert_eq!(s.points[2].giant_fraction.mean, 1.0);
        // Second largest: 1 at k ≤ 1, 0 at k ≥ 2: (1/3)·P(k ≤ 1).
        let want2 = (q.powi(3) + 3.0 * p * q * q) / 3.0;
        assert!((s.points[0].second_largest_fraction.mean - want2).abs() < 1e-12);
        // χ peaks at k = 0 (all singletons: χ = 1): p* = 0.
        assert_eq!(s.critical.mean, 0.0);
    }

    #[test]
    fn second_largest_is_exact() {
        // Against a recount of every component at every level.
        let mut e = Vec::new();
        for i in 0..40u32 {
            e.push((i, (i * 7 + 1) % 40));
            e.push((i, (i * 11 + 3) % 40));
        }
        let g = net(40, e);
        for site in [false, true] {
            let total = if site { 40 } else { g.edge_count() };
            let mut order: Vec<u32> = (0..total as u32).collect();
            rng::shuffle(&mut rng::stream(4, Stage::Sweep, 0), &mut order);
            let mut s =
                SweepScratch { uf: UnionFind::new(40), hist: vec![0; 41], order: Vec::new() };
            let mut levels = Vec::new();
            sweep_levels(&g, site, 4, 7, 0, &mut s, |_, l| levels.push(l));
            assert_eq!(levels.len(), total + 1);
            for (k, got) in levels.iter().enumerate() {
                let mut uf = UnionFind::new_inactive(40);
                uf.set_large_min(7);
                let mut on = [!site; 40];
                if site {
                    order[..k].iter().for_each(|&v| on[v as usize] = true);
                }
                (0..40).filter(|&v| on[v as usize]).for_each(|v| uf.activate(v));
                if site {
                    for &[a, b] in g.edges() {
                        if on[a as usize] && on[b as usize] {
                            uf.union(a, b);
                        }
                    }
                } else {
                    for &i in &order[..k] {
                        let [a, b] = g.edges()[i as usize];
                        uf.union(a, b);
                    }
                }
                let mut sizes: Vec<u32> = Vec::new();
                for v in 0..40u32 {
                    if uf.is_active(v) && uf.find(v) == v {
                        sizes.push(uf.component_size(v));
                    }
                }
                sizes.sort_unstable_by(|a, b| b.cmp(a));
                let want = Level {
                    s1: sizes.first().copied().unwrap_or(0),
                    s2: sizes.get(1).copied().unwrap_or(0),
                    sum_sq: uf.sum_sq(),
                    in_large: uf.in_large(),
                    occupied: uf.active(),
                };
                assert_eq!(*got, want, "site={site} k={k}");
            }
        }
    }
}
