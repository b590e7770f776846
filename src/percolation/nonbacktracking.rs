//! The message-passing threshold: the spectral radius of the
//! transmissibility-weighted non-backtracking (Hashimoto) matrix of a
//! residual network (Karrer, Newman & Zdeborová 2014, PRL 113:208702).
//!
//! On the `2M` directed edges of an undirected network,
//! `B_{(u→v),(v→w)} = T_{vw} · φ_w` for `w ≠ u` (zero otherwise), where `T`
//! is the transmissibility and `φ_w ∈ [0, 1]` the probability that `w` is
//! susceptible (occupied). Bond percolation with these probabilities has a
//! giant component on a locally tree-like network iff `ρ(B) > 1`; this
//! radius is `r_eff`, and for uniform `T` the critical transmissibility is
//! `1 / ρ(B_φ)` with `B_φ` the same matrix at `T = 1`.
//!
//! Method: nodes with `φ = 0` and edges with `T = 0` are removed, then the
//! network is pruned to its 2-core (directed edges into a dangling tree are
//! transient and add only zero eigenvalues); an empty 2-core gives `ρ = 0`.
//! The radius of the whole matrix is the maximum over the connected
//! components of the 2-core, so each component is iterated on its own,
//! largest first, from the all-ones vector (positive on every edge; a
//! decision against a level may start from a previous call's vector). A
//! component is skipped when its bound with the all-ones vector cannot beat
//! the best lower bound found so far. Power iteration runs on the shifted
//! matrix `B + s·I` with `s > 0` set from the current estimate (see
//! `shift`): it has the same eigenvectors, and `ρ + s` strictly dominates
//! every other eigenvalue `μ + s` of the same modulus class (bipartite
//! networks and lattices give `B` the eigenvalue `−ρ`, which stalls plain
//! power iteration). After each
//! step the Collatz–Wielandt bounds `min_i (Bu)_i/u_i ≤ ρ ≤ max_i
//! (Bu)_i/u_i`, valid for any nonnegative matrix and positive `u`, are
//! computed on the component's edges; the iteration stops when `upper −
//! lower ≤ tol · upper`. "Below threshold" is certified by `upper < 1`.

use super::realization::{check_prob, PercolationError, Transmissibility};
use crate::network::Network;

/// Iteration limit per component of [`nonbacktracking_radius`].
pub const NB_MAX_ITERATIONS: u32 = 20_000;

/// The spectral radius of a non-negative matrix with certified bounds.
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize)]
pub struct SpectralRadius {
    /// Point estimate, `(lower + upper) / 2` (the lower bound when a
    /// decision ([`nonbacktracking_radius_above`]) left `upper` unknown).
    pub estimate: f64,
    /// Collatz–Wielandt lower bound.
    pub lower: f64,
    /// Collatz–Wielandt upper bound (infinite when a decision stopped
    /// before every component was bounded).
    pub upper: f64,
    /// Power iterations spent (the largest over the components iterated).
    pub iterations: u32,
    /// Whether every component that could hold the maximum reached
    /// `upper − lower ≤ tol · upper`.
    pub converged: bool,
}

impl SpectralRadius {
    /// The radius of a matrix known to be zero (empty 2-core).
    pub fn zero() -> Self {
        SpectralRadius { estimate: 0.0, lower: 0.0, upper: 0.0, iterations: 0, converged: true }
    }
}

/// The critical transmissibility of a residual network for uniform `T`.
#[derive(Clone, Copy, Debug, PartialEq, serde::Serialize)]
pub struct CriticalTransmissibility {
    /// `1 / ρ(B_φ)`; infinite when the 2-core is empty (no `T` reaches the
    /// threshold).
    pub estimate: f64,
    /// `1 / upper` of the radius.
    pub lower: f64,
    /// `1 / lower` of the radius (infinite if the lower bound is 0).
    pub upper: f64,
    /// The radius `ρ(B_φ)` at `T = 1`.
    pub radius: SpectralRadius,
}

/// The residual 2-core as compact rows over directed edges ("slots").
struct Core {
    /// Slot range of each core node, nodes grouped by component.
    offsets: Vec<usize>,
    /// Weight `T_{vw} φ_w` of slot `v → w`.
    weight: Vec<f64>,
    /// The reverse slot `w → v` of slot `v → w`.
    rev: Vec<u32>,
    /// The head `w` (core numbering) of slot `v → w`.
    head: Vec<u32>,
    /// Node ranges (in core numbering) of the components, largest first.
    components: Vec<(usize, usize)>,
    /// The directed edge of each slot: `2e` for `src → dst` of edge `e`,
    /// `2e + 1` for `dst → src` (the index of a warm-start vector).
    arc: Vec<u32>,
    /// The network node of each core node.
    node: Vec<u32>,
}

// Slot loops index targets and edge ids in step.
#[allow(clippy::needless_range_loop)]
fn residual_core(
    net: &Network,
    t: &Transmissibility,
    occupation: Option<&[f64]>,
) -> Result<Core, PercolationError> {
    if net.is_directed() {
        return Err(PercolationError::Directed("the non-backtracking radius"));
    }
    t.validate(net)?;
    let n = net.node_count();
    let phi = |v: usize| occupation.map_or(1.0, |o| o[v]);
    if let Some(o) = occupation {
        if o.len() != n {
            return Err(PercolationError::NodeCount { given: o.len(), nodes: n });
        }
        for (v, &x) in o.iter().enumerate() {
            check_prob("occupation", x, Some(v))?;
        }
    }
    let (offs, targets, eids) = net.out_rows();
    let live = |v: usize, p: usize| {
        let w = targets[p] as usize;
        phi(v) > 0.0 && phi(w) > 0.0 && t.of(eids[p] as usize) > 0.0
    };
    let mut alive: Vec<bool> = (0..n).map(|v| phi(v) > 0.0).collect();
    let (label, order, comps) = core_components(
        &mut alive,
        |v| offs[v] as usize..offs[v + 1] as usize,
        |p| targets[p] as usize,
        live,
    );
    // Compact slots; the two slots of an undirected edge share its edge id,
    // which links each slot to its reverse in O(M).
    let mut offsets = Vec::with_capacity(order.len() + 1);
    let mut weight = Vec::new();
    let mut slot_target: Vec<u32> = Vec::new();
    let mut arc: Vec<u32> = Vec::new();
    // Slots are u32: a network has fewer than 2^31 edges in any memory
    // this runs in (each edge id is already a u32).
    let mut rev: Vec<u32> = Vec::new();
    let mut first_slot = vec![u32::MAX; net.edge_count()];
    offsets.push(0);
    for &v in &order {
        let vi = v as usize;
        for p in offs[vi] as usize..offs[vi + 1] as usize {
            let w = targets[p] as usize;
            if alive[w] && live(vi, p) {
                let e = eids[p] as usize;
                let here = weight.len();
                weight.push(t.of(e) * phi(w));
                slot_target.push(label[w]);
                arc.push(2 * e as u32 + u32::from(vi as u32 > w as u32));
                rev.push(u32::MAX);
                if first_slot[e] == u32::MAX {
                    first_slot[e] = here as u32;
                } else {
                    rev[here] = first_slot[e];
                    rev[first_slot[e] as usize] = here as u32;
                }
            }
        }
        offsets.push(weight.len());
    }
    debug_assert!(rev.iter().all(|&r| r != u32::MAX));
    Ok(Core { offsets, weight, rev, head: slot_target, components: comps, arc, node: order })
}

/// Peels the nodes marked `alive` to their 2-core (alive is cleared for
/// the peeled ones) and numbers the core by breadth-first search, one
/// component after another: `label[v]` is v's core label (`u32::MAX` off
/// the core), `order[l]` the node of label l, and the components' label
/// ranges come largest first (ties by first label). Node v's slots are
/// `slots(v)`, slot p leads to `head(p)` and counts only when `live(v, p)`.
fn core_components(
    alive: &mut [bool],
    slots: impl Fn(usize) -> std::ops::Range<usize>,
    head: impl Fn(usize) -> usize,
    live: impl Fn(usize, usize) -> bool,
) -> (Vec<u32>, Vec<u32>, Vec<(usize, usize)>) {
    let n = alive.len();
    let mut deg: Vec<u32> = (0..n)
        .map(|v| {
            if alive[v] {
                slots(v).filter(|&p| alive[head(p)] && live(v, p)).count() as u32
            } else {
                0
            }
        })
        .collect();
    let mut stack: Vec<u32> =
        (0..n as u32).filter(|&v| alive[v as usize] && deg[v as usize] < 2).collect();
    while let Some(v) = stack.pop() {
        let vi = v as usize;
        if !alive[vi] {
            continue;
        }
        alive[vi] = false;
        for p in slots(vi) {
            let w = head(p);
            if alive[w] && live(vi, p) {
                deg[w] -= 1;
                if deg[w] == 1 {
                    stack.push(w as u32);
                }
            }
        }
    }
    let mut label = vec![u32::MAX; n];
    let mut order: Vec<u32> = Vec::new();
    let mut comps: Vec<(usize, usize)> = Vec::new();
    for s in 0..n {
        if !alive[s] || label[s] != u32::MAX {
            continue;
        }
        let start = order.len();
        label[s] = start as u32;
        order.push(s as u32);
        let mut next = start;
        while next < order.len() {
            let v = order[next] as usize;
            next += 1;
            for p in slots(v) {
                let w = head(p);
                if alive[w] && live(v, p) && label[w] == u32::MAX {
                    label[w] = order.len() as u32;
                    order.push(w as u32);
                }
            }
        }
        comps.push((start, order.len()));
    }
    comps.sort_by_key(|&(a, b)| (std::cmp::Reverse(b - a), a));
    (label, order, comps)
}

/// The residual 2-core under `occupation` computed from `core` (the core
/// under an occupation that is positive wherever this one is) in
/// O(size of `core`) instead of O(N + M). It equals [`residual_core`] of
/// the whole network: the 2-core of `G − S` is the 2-core of
/// `2-core(G) − S` (each is the largest subgraph of minimum degree 2
/// avoiding S). Each node keeps its slots in network order, so the
/// iteration gives the same numbers on either.
fn restrict_core(
    core: &Core,
    t: &Transmissibility,
    occupation: &[f64],
) -> Result<Core, PercolationError> {
    let nc = core.node.len();
    let mut alive: Vec<bool> = Vec::with_capacity(nc);
    for &v in &core.node {
        let x = occupation.get(v as usize).copied().ok_or(PercolationError::NodeCount {
            given: occupation.len(),
            nodes: v as usize + 1,
        })?;
        check_prob("occupation", x, Some(v as usize))?;
        alive.push(x > 0.0);
    }
    let slots = |l: usize| core.offsets[l]..core.offsets[l + 1];
    let (label, order, comps) =
        core_components(&mut alive, slots, |p| core.head[p] as usize, |_, _| true);
    let mut new_slot = vec![u32::MAX; core.weight.len()];
    let mut offsets = Vec::with_capacity(order.len() + 1);
    let (mut weight, mut head, mut arc, mut from) =
        (Vec::new(), Vec::new(), Vec::new(), Vec::new());
    offsets.push(0);
    for &l in &order {
        for p in slots(l as usize) {
            let w = core.head[p] as usize;
            if alive[w] {
                new_slot[p] = weight.len() as u32;
                weight.push(t.of(core.arc[p] as usize / 2) * occupation[core.node[w] as usize]);
                head.push(label[w]);
                arc.push(core.arc[p]);
                from.push(p as u32);
            }
        }
        offsets.push(weight.len());
    }
    let rev = from.iter().map(|&p| new_slot[core.rev[p as usize] as usize]).collect();
    let node = order.iter().map(|&l| core.node[l as usize]).collect();
    Ok(Core { offsets, weight, rev, head, components: comps, arc, node })
}

/// The residual 2-core of a network under one occupation, kept so that
/// decisions on residual networks with more people removed (a search over
/// dose counts) start from it instead of the whole network.
pub(crate) struct ResidualCore<'a> {
    core: Core,
    /// Directed edges of the network (`2M`, the length of a warm vector).
    arcs: usize,
    /// The transmissibility the core was built with (its restrictions
    /// keep it).
    t: &'a Transmissibility,
}

impl<'a> ResidualCore<'a> {
    /// The residual 2-core of `net` under `t` and `occupation`.
    pub(crate) fn new(
        net: &Network,
        t: &'a Transmissibility,
        occupation: Option<&[f64]>,
    ) -> Result<Self, PercolationError> {
        let core = residual_core(net, t, occupation)?;
        Ok(ResidualCore { core, arcs: 2 * net.edge_count(), t })
    }

    /// The residual 2-core under `occupation`, which must be 0 wherever
    /// the occupation this core was built with is 0 (more people removed).
    pub(crate) fn restrict(&self, occupation: &[f64]) -> Result<Self, PercolationError> {
        let core = restrict_core(&self.core, self.t, occupation)?;
        Ok(ResidualCore { core, arcs: self.arcs, t: self.t })
    }

    /// [`nonbacktracking_radius_with`] on this core.
    pub(crate) fn radius(
        &self,
        tol: f64,
        max_iterations: u32,
    ) -> Result<SpectralRadius, PercolationError> {
        check_tol(tol)?;
        Ok(iterate(&self.core, self.arcs, tol, max_iterations, None, None))
    }

    /// [`nonbacktracking_radius_above`] on this core.
    pub(crate) fn radius_above(
        &self,
        level: f64,
        tol: f64,
        max_iterations: u32,
        warm: &mut Vec<f64>,
    ) -> Result<(Option<bool>, SpectralRadius), PercolationError> {
        check_tol(tol)?;
        let r = iterate(&self.core, self.arcs, tol, max_iterations, Some(level), Some(warm));
        Ok((decision(&r, level), r))
    }
}

fn check_tol(tol: f64) -> Result<(), PercolationError> {
    if tol.is_finite() && tol > 0.0 {
        Ok(())
    } else {
        Err(PercolationError::Probability { what: "tolerance", value: tol, index: None })
    }
}

/// `Some(true)` certified above `level`, `Some(false)` certified below.
fn decision(r: &SpectralRadius, level: f64) -> Option<bool> {
    if r.lower > level {
        Some(true)
    } else if r.upper < level {
        Some(false)
    } else {
        None
    }
}

/// The spectral radius of the weighted non-backtracking matrix
/// `B_{(u→v),(v→w)} = T_{vw} φ_w` (`w ≠ u`) of an undirected network
/// (Karrer, Newman & Zdeborová 2014): `r_eff` of the residual network. Nodes
/// with `φ = 0` are removed; `occupation = None` means `φ ≡ 1`. `tol` is the
/// relative gap `(upper − lower) / upper` at which iteration stops (e.g.
/// `1e-6`). Method and periodicity handling: module doc.
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::percolation::{nonbacktracking_radius, Transmissibility};
/// // K4 is 3-regular: every directed edge has 2 non-backtracking successors.
/// let e = vec![(0, 1), (0, 2), (0, 3), (1, 2), (1, 3), (2, 3)];
/// let (k4, _) = Network::from_edges(4, false, e, None, WeightMerge::Max).unwrap();
/// let r = nonbacktracking_radius(&k4, &Transmissibility::Uniform(0.5), None, 1e-9).unwrap();
/// assert!((r.estimate - 1.0).abs() < 1e-9 && r.converged);
/// ```
pub fn nonbacktracking_radius(
    net: &Network,
    t: &Transmissibility,
    occupation: Option<&[f64]>,
    tol: f64,
) -> Result<SpectralRadius, PercolationError> {
    nonbacktracking_radius_with(net, t, occupation, tol, NB_MAX_ITERATIONS)
}

/// [`nonbacktracking_radius`] with an explicit iteration limit per
/// component.
pub fn nonbacktracking_radius_with(
    net: &Network,
    t: &Transmissibility,
    occupation: Option<&[f64]>,
    tol: f64,
    max_iterations: u32,
) -> Result<SpectralRadius, PercolationError> {
    radius_iterate(net, t, occupation, tol, max_iterations, None, None)
}

/// Whether the radius of [`nonbacktracking_radius`] is above `level`,
/// decided by the Collatz–Wielandt bounds: iteration on a component stops
/// as soon as its lower bound exceeds `level` (then so does the radius,
/// and the remaining components are not iterated; the returned `upper` is
/// infinite) or its upper bound falls below it. `Some(true)`: certified
/// above; `Some(false)`: certified below (every component's upper bound is
/// below `level`); `None`: not decided within `max_iterations` per
/// component (the radius is within `tol` of `level`, or converging
/// slowly) — the returned bounds still hold.
///
/// `warm` carries the iteration vector from one call to the next, indexed
/// by directed edge (`2e` for `src → dst`, `2e + 1` back): empty means
/// start from all ones; on return it holds the final vector (0 off the
/// core). Starting near the eigenvector of a similar residual network
/// (the next probe of a search over dose counts) saves most iterations;
/// the bounds are valid from any positive start, so the decision does not
/// depend on it except through the iteration limit.
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::percolation::{nonbacktracking_radius_above, Transmissibility};
/// let e = vec![(0, 1), (0, 2), (0, 3), (1, 2), (1, 3), (2, 3)];
/// let (k4, _) = Network::from_edges(4, false, e, None, WeightMerge::Max).unwrap();
/// let t = Transmissibility::Uniform(1.0); // radius 2
/// let mut warm = Vec::new();
/// let above = nonbacktracking_radius_above(&k4, &t, None, 1.5, 1e-9, 100, &mut warm).unwrap();
/// assert_eq!(above.0, Some(true));
/// let below = nonbacktracking_radius_above(&k4, &t, None, 2.5, 1e-9, 100, &mut warm).unwrap();
/// assert_eq!(below.0, Some(false));
/// ```
pub fn nonbacktracking_radius_above(
    net: &Network,
    t: &Transmissibility,
    occupation: Option<&[f64]>,
    level: f64,
    tol: f64,
    max_iterations: u32,
    warm: &mut Vec<f64>,
) -> Result<(Option<bool>, SpectralRadius), PercolationError> {
    let r = radius_iterate(net, t, occupation, tol, max_iterations, Some(level), Some(warm))?;
    Ok((decision(&r, level), r))
}

fn radius_iterate(
    net: &Network,
    t: &Transmissibility,
    occupation: Option<&[f64]>,
    tol: f64,
    max_iterations: u32,
    level: Option<f64>,
    warm: Option<&mut Vec<f64>>,
) -> Result<SpectralRadius, PercolationError> {
    check_tol(tol)?;
    let core = residual_core(net, t, occupation)?;
    Ok(iterate(&core, 2 * net.edge_count(), tol, max_iterations, level, warm))
}

/// The shift `s` of the iteration on `B + s I` for a radius estimate ρ:
/// `(ρ − √ρ) / 2`, at least `ρ / 10`. A shift keeps an eigenvalue `−ρ`
/// (bipartite networks) from stalling the iteration, at the price of the
/// ratio `(|μ| + s) / (ρ + s)` for the other eigenvalues μ; on sparse
/// random networks they lie mostly within `|μ| ≤ √ρ` (the bulk edge of the
/// non-backtracking spectrum, Krzakala et al. 2013, PNAS 110:20935 —
/// from memory), and this s equalises the two worst ratios
/// `(√ρ + s) / (ρ + s) = (ρ − s) / (ρ + s)`. Any `s > 0` converges; the
/// choice only sets the speed (≈ 40% fewer iterations than `s = ρ` in the
/// decision searches of `immunize_bench`).
fn shift(rho: f64) -> f64 {
    ((rho - rho.sqrt()) / 2.0).max(0.1 * rho)
}

/// Power iteration on a residual core (module doc); `arcs` is the length
/// of a warm vector (`2M`).
fn iterate(
    core: &Core,
    arcs: usize,
    tol: f64,
    max_iterations: u32,
    level: Option<f64>,
    warm: Option<&mut Vec<f64>>,
) -> SpectralRadius {
    if core.weight.is_empty() {
        return SpectralRadius::zero();
    }
    let mut x = vec![0.0f64; core.weight.len()];
    let mut y = vec![0.0f64; core.weight.len()];
    // Per component: (lower, upper, converged, iterations).
    let mut found: Vec<(f64, f64, bool, u32)> = Vec::new();
    let mut best_lower = 0.0f64;
    // Set when a component certified the radius above `level` before the
    // remaining components were looked at: their upper bounds are unknown.
    let mut cut_short = false;
    for &(a, b) in &core.components {
        if level.is_some_and(|l| best_lower > l) {
            cut_short = true;
            break;
        }
        let (sa, sb) = (core.offsets[a], core.offsets[b]);
        match warm.as_deref() {
            Some(w) if w.len() == arcs => {
                // A positive start near the previous vector.
                let m = (sa..sb).map(|p| w[core.arc[p] as usize]).fold(0.0, f64::max);
                for p in sa..sb {
                    let v = w[core.arc[p] as usize];
                    x[p] = if m > 0.0 && v > 0.0 { (v / m).max(1e-2) } else { 1.0 };
                }
            }
            _ => x[sa..sb].fill(1.0),
        }
        let mut iterations = 0u32;
        loop {
            // y_{v→w} = S_w − weight_{w→v} x_{w→v} (all successors of v→w but
            // the reverse), with S_w = Σ_{q leaving w} weight_q x_q: node by
            // node, S_w from w's own slots, then scattered to the reverse of
            // each (one random access per slot).
            for w in a..b {
                let (p, q) = (core.offsets[w], core.offsets[w + 1]);
                let (wk, xk) = (&core.weight[p..q], &x[p..q]);
                let acc: f64 = wk.iter().zip(xk).fold(0.0, |a, (w, x)| a + w * x);
                for ((&r, w), x) in core.rev[p..q].iter().zip(wk).zip(xk) {
                    y[r as usize] = (acc - w * x).max(0.0);
                }
            }
            let (mut lo, mut hi) = (f64::INFINITY, 0.0f64);
            for p in sa..sb {
                let ratio = y[p] / x[p];
                lo = lo.min(ratio);
                hi = hi.max(ratio);
            }
            if iterations == 0 && hi <= best_lower {
                // Bounded by a component already found: cannot hold the maximum.
                break;
            }
            let done = hi - lo <= tol * hi;
            let decided = level.is_some_and(|l| lo > l || hi < l);
            if done || decided || iterations >= max_iterations {
                best_lower = best_lower.max(lo);
                found.push((lo, hi, done, iterations));
                break;
            }
            // x ← (B + s I) x, normalized by its maximum.
            let s = shift(0.5 * (lo + hi));
            let mut m = 0.0f64;
            for p in sa..sb {
                x[p] = y[p] + s * x[p];
                m = m.max(x[p]);
            }
            let inv = 1.0 / m;
            for xp in &mut x[sa..sb] {
                // Keep u > 0 so the bounds stay defined.
                *xp = (*xp * inv).max(1e-150);
            }
            iterations += 1;
        }
    }
    if let Some(w) = warm {
        w.clear();
        w.resize(arcs, 0.0);
        for (p, &a) in core.arc.iter().enumerate() {
            w[a as usize] = x[p];
        }
    }
    let lower = found.iter().map(|f| f.0).fold(0.0, f64::max);
    let mut upper = found.iter().map(|f| f.1).fold(0.0, f64::max);
    if cut_short {
        upper = f64::INFINITY;
    }
    // A component whose upper bound is below the overall lower bound cannot
    // hold the maximum; its convergence does not matter.
    let converged = !cut_short && found.iter().all(|&(_, hi, done, _)| done || hi <= lower);
    let iterations = found.iter().map(|f| f.3).max().unwrap_or(0);
    let estimate = if cut_short { lower } else { 0.5 * (lower + upper) };
    SpectralRadius { estimate, lower, upper, iterations, converged }
}

/// The critical uniform transmissibility of a residual network: `1 /
/// ρ(B_φ)` with `B_φ` the non-backtracking matrix at `T = 1` and node
/// weights `φ` (the unweighted matrix of the residual when `φ ∈ {0, 1}`);
/// Karrer, Newman & Zdeborová 2014. Bounds come from the radius bounds.
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::percolation::critical_transmissibility;
/// let e = vec![(0, 1), (0, 2), (0, 3), (1, 2), (1, 3), (2, 3)];
/// let (k4, _) = Network::from_edges(4, false, e, None, WeightMerge::Max).unwrap();
/// let c = critical_transmissibility(&k4, None, 1e-9).unwrap();
/// assert!((c.estimate - 0.5).abs() < 1e-9);
/// ```
pub fn critical_transmissibility(
    net: &Network,
    occupation: Option<&[f64]>,
    tol: f64,
) -> Result<CriticalTransmissibility, PercolationError> {
    let radius = nonbacktracking_radius(net, &Transmissibility::Uniform(1.0), occupation, tol)?;
    let inv = |x: f64| if x > 0.0 { 1.0 / x } else { f64::INFINITY };
    Ok(CriticalTransmissibility {
        estimate: inv(radius.estimate),
        lower: inv(radius.upper),
        upper: inv(radius.lower),
        radius,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::network::WeightMerge;

    fn net(n: u32, e: Vec<(u32, u32)>) -> Network {
        Network::from_edges(n, false, e, None, WeightMerge::Max).unwrap().0
    }

    fn radius(g: &Network) -> SpectralRadius {
        nonbacktracking_radius(g, &Transmissibility::Uniform(1.0), None, 1e-10).unwrap()
    }

    /// Circulant k-regular graph (k even): i ~ i ± 1..k/2.
    fn circulant(n: u32, k: u32) -> Network {
        let mut e = Vec::new();
        for i in 0..n {
            for d in 1..=k / 2 {
                e.push((i, (i + d) % n));
            }
        }
        net(n, e)
    }

    #[test]
    fn regular_cycle_tree_star() {
        // k-regular: the all-ones vector is an eigenvector, ρ = k − 1 exactly.
        for k in [2, 4, 6] {
            let r = radius(&circulant(30, k));
            assert_eq!((r.lower, r.upper), ((k - 1) as f64, (k - 1) as f64), "k={k}");
        }
        // Cycle: ρ = 1.
        assert_eq!(radius(&circulant(7, 2)).estimate, 1.0);
        // Tree (path) and star: empty 2-core, ρ = 0.
        assert_eq!(radius(&net(5, vec![(0, 1), (1, 2), (2, 3), (3, 4)])), SpectralRadius::zero());
        assert_eq!(radius(&net(5, vec![(0, 1), (0, 2), (0, 3), (0, 4)])), SpectralRadius::zero());
    }

    #[test]
    fn complete_bipartite_is_periodic_but_converges() {
        // K_{a,b}: by symmetry λ x_{A→B} = (a−1) x_{B→A}, λ x_{B→A} = (b−1) x_{A→B},
        // so ρ = √((a−1)(b−1)); B has the eigenvalue −ρ too (bipartite).
        let (a, b) = (3u32, 6u32);
        let mut e = Vec::new();
        for i in 0..a {
            for j in 0..b {
                e.push((i, a + j));
            }
        }
        let g = net(a + b, e);
        let r = radius(&g);
        let want = (((a - 1) * (b - 1)) as f64).sqrt();
        assert!(r.converged && (r.estimate - want).abs() < 1e-8, "{r:?} vs {want}");
        assert!(r.lower <= want && want <= r.upper);
    }

    #[test]
    fn disconnected_takes_the_largest_component() {
        // A triangle (ρ = 1) beside K4 (ρ = 2), plus a pendant path on the triangle.
        let mut e = vec![(0, 1), (1, 2), (0, 2), (2, 9)];
        for (i, j) in [(3, 4), (3, 5), (3, 6), (4, 5), (4, 6), (5, 6)] {
            e.push((i, j));
        }
        let r = radius(&net(10, e));
        assert!((r.estimate - 2.0).abs() < 1e-9 && r.converged, "{r:?}");
    }

    #[test]
    fn weights_and_occupation_scale() {
        // Uniform T and φ on a k-regular graph: ρ = T·φ·(k − 1).
        let g = circulant(20, 4);
        let phi = vec![0.5; 20];
        let r =
            nonbacktracking_radius(&g, &Transmissibility::Uniform(0.4), Some(&phi), 1e-10).unwrap();
        assert!((r.estimate - 0.4 * 0.5 * 3.0).abs() < 1e-12);
        // Removing a node (φ = 0) of a cycle leaves a path: ρ = 0.
        let mut phi = vec![1.0; 7];
        phi[3] = 0.0;
        let r = nonbacktracking_radius(
            &circulant(7, 2),
            &Transmissibility::Uniform(1.0),
            Some(&phi),
            1e-9,
        )
        .unwrap();
        assert_eq!(r.estimate, 0.0);
        let c = critical_transmissibility(&circulant(7, 2), Some(&phi), 1e-9).unwrap();
        assert!(c.estimate.is_infinite());
    }

    #[test]
    fn bounds_bracket_an_irregular_graph() {
        // Wheel-like graph: irregular, so the first bounds differ; they must
        // close to within tol and keep bracketing.
        let mut e = Vec::new();
        for i in 1..9u32 {
            e.push((0, i));
            e.push((i, if i == 8 { 1 } else { i + 1 }));
        }
        e.push((2, 6));
        let g = net(9, e);
        let r = radius(&g);
        assert!(r.converged && r.lower <= r.upper && r.upper - r.lower <= 1e-10 * r.upper);
        assert!(r.iterations > 0);
    }

    #[test]
    fn a_core_restricted_from_a_larger_one_gives_the_same_numbers() {
        // The identity 2-core(G − S) = 2-core(2-core(G) − S) (module doc of
        // `restrict_core`): bounds, estimate and iteration count must equal
        // those of the core built from the whole network, for nested
        // removals, partial occupation and per-edge weights.
        let g = crate::network::generate::gnm(3000, 4500, 5).unwrap();
        let weights: Vec<f64> =
            (0..g.edge_count()).map(|e| 0.3 + 0.7 * ((e * 37 % 101) as f64 / 100.0)).collect();
        for t in [Transmissibility::Uniform(0.6), Transmissibility::PerEdge(weights)] {
            // People with `v·7 mod 3000` below `zero` removed, below `part`
            // occupied with probability 0.4.
            let occ = |zero: usize, part: usize| -> Vec<f64> {
                (0..3000)
                    .map(|v| match v * 7 % 3000 {
                        x if x < zero => 0.0,
                        x if x < part => 0.4,
                        _ => 1.0,
                    })
                    .collect()
            };
            let base = ResidualCore::new(&g, &t, Some(&occ(300, 0))).unwrap();
            let mut inner = base.restrict(&occ(900, 0)).unwrap();
            for (zero, part) in [(900, 0), (1500, 0), (300, 1200)] {
                let o = occ(zero, part);
                let r = base.restrict(&o).unwrap().radius(1e-9, 10_000).unwrap();
                let full = nonbacktracking_radius_with(&g, &t, Some(&o), 1e-9, 10_000).unwrap();
                assert!(full.lower > 0.5, "a nontrivial core");
                assert_eq!(r, full, "removed {zero}, partial {part}");
                if part == 0 {
                    // Restricting twice (nested supports) is the same again.
                    inner = inner.restrict(&o).unwrap();
                    assert_eq!(inner.radius(1e-9, 10_000).unwrap(), full, "nested {zero}");
                    let mut w = Vec::new();
                    let level = full.estimate * 0.99;
                    let (d, _) = inner.radius_above(level, 1e-9, 10_000, &mut w).unwrap();
                    assert_eq!(d, Some(true));
                }
            }
        }
    }

    #[test]
    fn bad_input_is_an_error() {
        let g = circulant(5, 2);
        assert!(nonbacktracking_radius(&g, &Transmissibility::Uniform(1.5), None, 1e-6).is_err());
        assert!(nonbacktracking_radius(&g, &Transmissibility::Uniform(0.5), Some(&[0.5]), 1e-6)
            .is_err());
        assert!(nonbacktracking_radius(&g, &Transmissibility::Uniform(0.5), None, 0.0).is_err());
    }
}
