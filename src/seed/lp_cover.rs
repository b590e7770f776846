//! The `lp` rule: the LP relaxation of maximum coverage over RR sets,
//! rounded by pipage rounding (Ageev & Sviridenko 2004).
//!
//! On a collection of RR sets `R_1 … R_m` (identical sets merged, with
//! weight `w_j` = how many times they occur):
//!
//! ```text
//! max Σ_j w_j y_j   s.t.  y_j ≤ Σ_{i ∈ R_j} x_i,  Σ_i x_i ≤ K,  0 ≤ x, y ≤ 1
//! ```
//!
//! solved with `lp::solve` (microlp, a dense simplex). To keep it
//! tractable it is solved on its own sample of `max_sets` RR sets (drawn
//! exactly like IMM's, from an independent key range), over the people who
//! appear in them. Pipage rounding then moves pairs of
//! fractional `x_i, x_l` along `e_i − e_l` to whichever end raises
//! `F(x) = Σ_j w_j (1 − Π_{i ∈ R_j} (1 − x_i))` (convex along that line),
//! until `x` is integral; since `F ≥ (1 − (1 − 1/K)^K) · LP` at the LP
//! optimum, the rounded seeds cover at least `1 − (1 − 1/K)^K ≥ 1 − 1/e`
//! of the LP optimum on the subsample (Ageev & Sviridenko 2004). If fewer
//! than `K` people are rounded up (every set covered), the rest are
//! filled by greedy coverage on the full collection. Seeds are ordered by
//! greedy coverage among the rounded set.

use std::collections::BTreeMap;

use crate::lp::{solve, Cmp, Constraint, LinearProgram, Sense};
use crate::seed::rr_sets::{greedy_cover, RrSets};
use crate::seed::{Cascade, SeedError};

/// Key offset of the LP's own RR sample (independent of IMM's sets and
/// the bound's).
pub const LP_BASE: u64 = 1 << 52;

/// The `lp` rule's output.
#[derive(Clone, Debug, PartialEq)]
pub struct LpCover {
    /// Seeds in order.
    pub seeds: Vec<u32>,
    /// LP optimum (weighted sets covered) on the subsample.
    pub lp_value: f64,
    /// Coverage of the rounded seeds on the subsample.
    pub rounded_value: f64,
    /// RR sets in the subsample.
    pub sets_used: usize,
    /// Distinct sets (LP rows).
    pub distinct_sets: usize,
    /// Candidate people (LP columns).
    pub candidates: usize,
}

/// Solves and rounds the coverage LP (see the module doc); `sets` (IMM's
/// collection) orders the seeds and fills any budget left after rounding.
pub fn lp_cover(
    c: &Cascade<'_>,
    sets: &RrSets,
    k: usize,
    max_sets: usize,
    seed: u64,
) -> Result<LpCover, SeedError> {
    let n = c.network().node_count();
    let mut sample = RrSets::new_stored(LP_BASE);
    sample.extend_to(c, max_sets as u64, seed);
    let m = sample.stored_len();
    let mut merged: BTreeMap<Vec<u32>, u32> = BTreeMap::new();
    for j in 0..m {
        let mut s = sample.set(j).to_vec();
        s.sort_unstable();
        *merged.entry(s).or_insert(0) += 1;
    }
    let rows: Vec<(Vec<u32>, u32)> = merged.into_iter().collect();
    let mut var_of = vec![u32::MAX; n];
    let mut cand: Vec<u32> = Vec::new();
    for (s, _) in &rows {
        for &v in s {
            if var_of[v as usize] == u32::MAX {
                var_of[v as usize] = cand.len() as u32;
                cand.push(v);
            }
        }
    }
    let nx = cand.len();
    let ny = rows.len();
    let mut x = vec![0f64; nx];
    let lp_value;
    if nx <= k {
        x.fill(1.0);
        lp_value = m as f64;
    } else {
        let mut objective = vec![0f64; nx];
        objective.extend(rows.iter().map(|r| f64::from(r.1)));
        let mut constraints = Vec::with_capacity(ny + 1);
        for (j, (s, _)) in rows.iter().enumerate() {
            let mut terms = vec![(nx + j, 1.0)];
            terms.extend(s.iter().map(|&v| (var_of[v as usize] as usize, -1.0)));
            constraints.push(Constraint {
                name: format!("cover {j}"),
                terms,
                cmp: Cmp::Le,
                rhs: 0.0,
            });
        }
        constraints.push(Constraint {
            name: "budget".into(),
            terms: (0..nx).map(|i| (i, 1.0)).collect(),
            cmp: Cmp::Le,
            rhs: k as f64,
        });
        let lp = LinearProgram {
            sense: Sense::Maximize,
            objective,
            lower: vec![0.0; nx + ny],
            upper: vec![1.0; nx + ny],
            constraints,
        };
        let sol = solve(&lp).map_err(|e| SeedError::Lp(e.to_string()))?;
        lp_value = sol.objective;
        for (xi, &v) in x.iter_mut().zip(&sol.values) {
            *xi = v.clamp(0.0, 1.0);
        }
    }
    // Inverted index over the LP rows.
    let mut inv: Vec<Vec<u32>> = vec![Vec::new(); nx];
    for (j, (s, _)) in rows.iter().enumerate() {
        for &v in s {
            inv[var_of[v as usize] as usize].push(j as u32);
        }
    }
    pipage(&mut x, &rows, &var_of, &inv);
    let value = coverage_value(&x, &rows, &var_of);
    let mut allowed = vec![false; n];
    let mut picked = 0;
    for (i, &xi) in x.iter().enumerate() {
        if xi > 0.5 && picked < k {
            allowed[cand[i] as usize] = true;
            picked += 1;
        }
    }
    let ordered = greedy_cover(sets, c, picked, &[], Some(&allowed)).seeds;
    let seeds = greedy_cover(sets, c, k, &ordered, None).seeds;
    Ok(LpCover {
        seeds,
        lp_value,
        rounded_value: value,
        sets_used: m,
        distinct_sets: ny,
        candidates: nx,
    })
}

const TOL: f64 = 1e-9;

fn is_frac(v: f64) -> bool {
    v > TOL && v < 1.0 - TOL
}

/// `F(x)` = weighted sets covered in expectation when each `i` is taken
/// independently with probability `x_i`.
fn coverage_value(x: &[f64], rows: &[(Vec<u32>, u32)], var_of: &[u32]) -> f64 {
    rows.iter()
        .map(|(s, w)| {
            let miss: f64 = s.iter().map(|&v| 1.0 - x[var_of[v as usize] as usize]).product();
            f64::from(*w) * (1.0 - miss)
        })
        .sum()
}

/// Pipage rounding (Ageev & Sviridenko 2004) of `x` in place.
fn pipage(x: &mut [f64], rows: &[(Vec<u32>, u32)], var_of: &[u32], inv: &[Vec<u32>]) {
    // The part of F that depends on x_i or x_l.
    let local = |x: &[f64], i: usize, l: usize| -> f64 {
        let mut sum = 0.0;
        let mut add = |j: u32| {
            let (s, w) = &rows[j as usize];
            let miss: f64 = s.iter().map(|&v| 1.0 - x[var_of[v as usize] as usize]).product();
            sum += f64::from(*w) * (1.0 - miss);
        };
        for &j in &inv[i] {
            add(j);
        }
        for &j in &inv[l] {
            // Sets holding both were counted with i.
            if inv[i].binary_search(&j).is_err() {
                add(j);
            }
        }
        sum
    };
    let mut frac: Vec<usize> = (0..x.len()).filter(|&i| is_frac(x[i])).collect();
    while frac.len() >= 2 {
        let (i, l) = (frac[frac.len() - 2], frac[frac.len() - 1]);
        let up = (1.0 - x[i]).min(x[l]); // x_i += up, x_l -= up
        let down = x[i].min(1.0 - x[l]); // x_i -= down, x_l += down
        let (xi, xl) = (x[i], x[l]);
        x[i] = xi + up;
        x[l] = xl - up;
        let f_up = local(x, i, l);
        x[i] = xi - down;
        x[l] = xl + down;
        let f_down = local(x, i, l);
        if f_up >= f_down {
            x[i] = xi + up;
            x[l] = xl - up;
        }
        for v in [i, l] {
            if x[v] <= TOL {
                x[v] = 0.0;
            } else if x[v] >= 1.0 - TOL {
                x[v] = 1.0;
            }
        }
        frac.retain(|&v| is_frac(x[v]));
    }
    // One fractional left: Σx was not integral (budget slack); rounding it
    // up only raises F, and keeps Σx ≤ K because Σx ≤ K and the rest is integral.
    for v in x.iter_mut() {
        if is_frac(*v) {
            *v = 1.0;
        }
    }
}
