//! The `coreness` rule: k-shell order, highest core number first, ties by
//! higher residual degree, then lower index. Core numbers come from the
//! Batagelj–Zaversnik (2003, arXiv cs/0310049) O(N + M) bin-sort peeling
//! on the residual network (absent people removed).

use super::Present;

/// Core numbers of the present nodes (0 for absent nodes), by the
/// Batagelj–Zaversnik algorithm.
///
/// ```
/// use spreadplan::immunize::{core_numbers_present, Present};
/// use spreadplan::network::{Network, WeightMerge};
/// // A triangle with a pendant: cores 2, 2, 2, 1.
/// let (net, _) = Network::from_edges(4, false, vec![(0, 1), (1, 2), (0, 2), (2, 3)], None,
///     WeightMerge::Max).unwrap();
/// assert_eq!(core_numbers_present(&Present::new(&net, &[])), vec![2, 2, 2, 1]);
/// ```
pub fn core_numbers_present(present: &Present<'_>) -> Vec<u32> {
    let net = present.net;
    let n = present.alive.len();
    let mut deg = present.degree.clone();
    let maxd = deg.iter().copied().max().unwrap_or(0) as usize;
    // bin[d] = start of degree-d block in `vert`.
    let mut bin = vec![0usize; maxd + 2];
    for &d in &deg {
        bin[d as usize + 1] += 1;
    }
    for d in 1..bin.len() {
        bin[d] += bin[d - 1];
    }
    let mut pos = vec![0usize; n];
    let mut vert = vec![0u32; n];
    {
        let mut next = bin.clone();
        for v in 0..n {
            let d = deg[v] as usize;
            pos[v] = next[d];
            vert[next[d]] = v as u32;
            next[d] += 1;
        }
    }
    for i in 0..n {
        let v = vert[i];
        if !present.alive[v as usize] {
            continue;
        }
        let dv = deg[v as usize];
        for &u in net.neighbors(v) {
            let ui = u as usize;
            if present.alive[ui] && deg[ui] > dv {
                let du = deg[ui] as usize;
                let pu = pos[ui];
                let pw = bin[du];
                let w = vert[pw];
                if u != w {
                    vert.swap(pu, pw);
                    pos[ui] = pw;
                    pos[w as usize] = pu;
                }
                bin[du] += 1;
                deg[ui] -= 1;
            }
        }
    }
    for (d, &a) in deg.iter_mut().zip(&present.alive) {
        if !a {
            *d = 0;
        }
    }
    deg
}

/// Highest core number first, ties by higher residual degree, then lower
/// index.
pub fn coreness_order(present: &Present<'_>) -> Vec<u32> {
    let core = core_numbers_present(present);
    let mut order = present.candidates();
    order.sort_by_key(|&v| {
        (std::cmp::Reverse(core[v as usize]), std::cmp::Reverse(present.degree[v as usize]), v)
    });
    order
}
