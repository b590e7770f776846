//! A synthetic "town": people in households, children in classrooms,
//! working adults in workplaces, some elderly people in care homes with
//! their care workers, plus a few random community contacts.
//!
//! This is an invented model for demos and teaching, not fitted to any
//! data: every number in [`TownConfig::default`] is a round illustrative
//! value. Contacts inside a setting are a clique (households) or a dense
//! random graph (each pair joined with the setting's probability).

use super::{bad, check_edges, check_prob, GenerateError};
use crate::network::{BuildReport, Groups, Network, NodeTable, WeightMerge};
use crate::rng::{self, Stage};
use rand::Rng;
use rand_chacha::ChaCha8Rng;
use serde::{Deserialize, Serialize};

/// Group names of the town model, by group index.
pub const TOWN_GROUPS: [&str; 5] = ["child", "adult", "elder", "care-home resident", "care worker"];

/// Parameters of the town model. All defaults are invented round numbers.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(default, deny_unknown_fields)]
pub struct TownConfig {
    /// Number of people (including care-home residents).
    pub people: u32,
    /// Household-size law: `household_sizes[i]` is the relative weight of
    /// size `i + 1` (default 1…6 people: 28, 34, 15, 13, 7, 3).
    pub household_sizes: Vec<f64>,
    /// In households of one or two people, the chance that a member is
    /// elderly (others are adults). Households of three or more hold two
    /// adults and children.
    pub elder_share_small_households: f64,
    /// Fraction of people living in care homes.
    pub care_home_share: f64,
    /// Residents per care home.
    pub care_home_size: u32,
    /// Contact probability between two residents of one care home.
    pub care_home_contact: f64,
    /// Care workers per care home (adults who work there).
    pub care_workers_per_home: u32,
    /// Contact probability between a care worker and a resident.
    pub care_contact: f64,
    /// Children per classroom.
    pub class_size: u32,
    /// Contact probability between two children of one classroom.
    pub class_contact: f64,
    /// Fraction of adults (not care workers) who go to a workplace.
    pub employment: f64,
    /// People per workplace.
    pub workplace_size: u32,
    /// Contact probability between two colleagues.
    pub work_contact: f64,
    /// Mean number of random community contacts per person.
    pub community_degree: f64,
}

impl Default for TownConfig {
    fn default() -> Self {
        TownConfig {
            people: 10_000,
            household_sizes: vec![28.0, 34.0, 15.0, 13.0, 7.0, 3.0],
            elder_share_small_households: 0.35,
            care_home_share: 0.01,
            care_home_size: 40,
            care_home_contact: 0.5,
            care_workers_per_home: 10,
            care_contact: 0.5,
            class_size: 25,
            class_contact: 0.3,
            employment: 0.75,
            workplace_size: 12,
            work_contact: 0.3,
            community_degree: 2.0,
        }
    }
}

/// A generated town.
#[derive(Clone, Debug)]
pub struct Town {
    /// The contact network.
    pub network: Network,
    /// Numbered ids with each person's group (see [`TOWN_GROUPS`]).
    pub nodes: NodeTable,
    /// Household of each person (`u32::MAX` for care-home residents).
    pub household: Vec<u32>,
    /// Contacts listed in more than one setting, merged into one edge.
    pub report: BuildReport,
    /// Numbers of households, classrooms, workplaces and care homes.
    pub settings: [u32; 4],
}

const CHILD: u32 = 0;
const ADULT: u32 = 1;
const ELDER: u32 = 2;
const RESIDENT: u32 = 3;
const WORKER: u32 = 4;

/// Builds the town of `cfg` from `seed`.
///
/// People `0 .. R` are care-home residents (`R = ⌊care_home_share ·
/// people⌉`, in homes of `care_home_size`); the rest fill households whose
/// sizes are drawn from `household_sizes` (the last household is cut to
/// fit). Households are cliques. Children are shuffled into classrooms of
/// `class_size`; `care_workers_per_home` adults per home become care
/// workers; a share `employment` of the other adults is shuffled into
/// workplaces of `workplace_size`; classrooms, workplaces and care homes are
/// dense random graphs with their contact probabilities, and care workers of
/// one home form a clique. Finally `people · community_degree / 2` uniformly
/// random pairs are added. Contacts repeated across settings are merged and
/// counted in [`Town::report`].
///
/// ```
/// use spreadplan::network::generate::{town, TownConfig};
/// let t = town(&TownConfig { people: 500, ..TownConfig::default() }, 1).unwrap();
/// assert_eq!(t.network.node_count(), 500);
/// assert_eq!(t.nodes.group_of(0), Some("care-home resident"));
/// ```
pub fn town(cfg: &TownConfig, seed: u64) -> Result<Town, GenerateError> {
    check(cfg)?;
    let n = cfg.people as usize;
    let mut rng = rng::stream(seed, Stage::Generate, 0);
    let mut group = vec![ADULT; n];
    let mut household = vec![u32::MAX; n];
    let mut edges: Vec<(u32, u32)> = Vec::new();

    // Care-home residents.
    let residents = ((cfg.care_home_share * n as f64).round() as usize).min(n);
    let homes: Vec<std::ops::Range<usize>> = (0..residents)
        .step_by(cfg.care_home_size as usize)
        .map(|s| s..(s + cfg.care_home_size as usize).min(residents))
        .collect();
    group[..residents].fill(RESIDENT);
    for h in &homes {
        dense(
            h.clone().map(|v| v as u32).collect::<Vec<_>>().as_slice(),
            cfg.care_home_contact,
            &mut rng,
            &mut edges,
        );
    }

    // Households.
    let total_w: f64 = cfg.household_sizes.iter().sum();
    let mut v = residents;
    let mut households = 0u32;
    while v < n {
        let mut r = rng.random::<f64>() * total_w;
        let mut size = cfg.household_sizes.len();
        for (i, &w) in cfg.household_sizes.iter().enumerate() {
            if r < w {
                size = i + 1;
                break;
            }
            r -= w;
        }
        let size = size.min(n - v);
        for (i, u) in (v..v + size).enumerate() {
            household[u] = households;
            group[u] = if size <= 2 {
                if rng.random::<f64>() < cfg.elder_share_small_households {
                    ELDER
                } else {
                    ADULT
                }
            } else if i < 2 {
                ADULT
            } else {
                CHILD
            };
            for w in v..u {
                edges.push((w as u32, u as u32));
            }
        }
        households += 1;
        v += size;
    }

    // Classrooms.
    let mut children: Vec<u32> = (0..n as u32).filter(|&u| group[u as usize] == CHILD).collect();
    rng::shuffle(&mut rng, &mut children);
    let mut classrooms = 0u32;
    for class in children.chunks(cfg.class_size as usize) {
        dense(class, cfg.class_contact, &mut rng, &mut edges);
        classrooms += 1;
    }

    // Care workers, then workplaces.
    let mut adults: Vec<u32> = (0..n as u32).filter(|&u| group[u as usize] == ADULT).collect();
    rng::shuffle(&mut rng, &mut adults);
    let mut next = 0usize;
    for h in &homes {
        let take = (cfg.care_workers_per_home as usize).min(adults.len() - next);
        let staff = &adults[next..next + take];
        next += take;
        for (i, &a) in staff.iter().enumerate() {
            group[a as usize] = WORKER;
            for &b in &staff[..i] {
                edges.push((b, a));
            }
            for r in h.clone() {
                if rng.random::<f64>() < cfg.care_contact {
                    edges.push((r as u32, a));
                }
            }
        }
    }
    let rest = &adults[next..];
    let employed = ((cfg.employment * rest.len() as f64).round() as usize).min(rest.len());
    let mut workplaces = 0u32;
    for place in rest[..employed].chunks(cfg.workplace_size as usize) {
        dense(place, cfg.work_contact, &mut rng, &mut edges);
        workplaces += 1;
    }

    // Community contacts.
    if n >= 2 {
        let extra = (cfg.community_degree * n as f64 / 2.0).round() as u64;
        for _ in 0..extra {
            let a = rng::below(&mut rng, n as u64) as u32;
            let b = rng::below(&mut rng, n as u64) as u32;
            if a != b {
                edges.push((a, b));
            }
        }
    }

    let (network, report) = Network::from_edges(n as u32, false, edges, None, WeightMerge::First)
        .map_err(|e| bad("people", n, e))?;
    let mut nodes = NodeTable::numbered(n);
    nodes.groups =
        Some(Groups { names: TOWN_GROUPS.iter().map(|s| s.to_string()).collect(), of: group });
    Ok(Town {
        network,
        nodes,
        household,
        report,
        settings: [households, classrooms, workplaces, homes.len() as u32],
    })
}

/// Joins each pair of `members` with probability `p`.
fn dense(members: &[u32], p: f64, rng: &mut ChaCha8Rng, edges: &mut Vec<(u32, u32)>) {
    for (i, &a) in members.iter().enumerate() {
        for &b in &members[..i] {
            if rng.random::<f64>() < p {
                edges.push((b, a));
            }
        }
    }
}

fn check(cfg: &TownConfig) -> Result<(), GenerateError> {
    if cfg.household_sizes.len() > 100 {
        return Err(bad("household_sizes", cfg.household_sizes.len(), "at most 100 sizes"));
    }
    if cfg.household_sizes.is_empty()
        || cfg.household_sizes.iter().any(|w| !w.is_finite() || *w < 0.0)
        || cfg.household_sizes.iter().sum::<f64>() <= 0.0
    {
        return Err(bad(
            "household_sizes",
            format!("{:?}", cfg.household_sizes),
            "needs non-negative weights with a positive sum",
        ));
    }
    for (name, p) in [
        ("elder_share_small_households", cfg.elder_share_small_households),
        ("care_home_share", cfg.care_home_share),
        ("care_home_contact", cfg.care_home_contact),
        ("care_contact", cfg.care_contact),
        ("class_contact", cfg.class_contact),
        ("employment", cfg.employment),
        ("work_contact", cfg.work_contact),
    ] {
        check_prob(name, p)?;
    }
    for (name, s) in [
        ("care_home_size", cfg.care_home_size),
        ("class_size", cfg.class_size),
        ("workplace_size", cfg.workplace_size),
    ] {
        if s == 0 || s > 10_000 {
            return Err(bad(name, s, "must be between 1 and 10000"));
        }
    }
    if !cfg.community_degree.is_finite() || cfg.community_degree < 0.0 {
        return Err(bad(
            "community_degree",
            cfg.community_degree,
            "must be finite and non-negative",
        ));
    }
    check_edges(
        "community_degree",
        cfg.community_degree,
        cfg.community_degree * cfg.people as f64 / 2.0,
    )?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn groups_and_settings_are_consistent() {
        let cfg = TownConfig { people: 5_000, ..TownConfig::default() };
        let t = town(&cfg, 3).unwrap();
        let g = t.nodes.groups.as_ref().unwrap();
        let count = |k: u32| g.of.iter().filter(|&&x| x == k).count();
        assert_eq!(count(RESIDENT), 50);
        assert_eq!(count(WORKER), 20); // 50 residents in homes of 40 and 10
        assert!(count(CHILD) > 500 && count(ELDER) > 300);
        assert_eq!(t.settings[3], 2);
        // household members are pairwise joined
        for u in 50..200u32 {
            for w in 50..200u32 {
                if u != w && t.household[u as usize] == t.household[w as usize] {
                    assert!(t.network.neighbors(u).contains(&w));
                }
            }
        }
        // deterministic
        let again = town(&cfg, 3).unwrap();
        assert_eq!(again.network, t.network);
    }

    #[test]
    fn rejects_bad_config() {
        let bad_cfg = TownConfig { class_contact: 1.5, ..TownConfig::default() };
        assert!(town(&bad_cfg, 0).is_err());
        let bad_cfg = TownConfig { household_sizes: vec![], ..TownConfig::default() };
        assert!(town(&bad_cfg, 0).is_err());
        let tiny = TownConfig { people: 1, ..TownConfig::default() };
        assert_eq!(town(&tiny, 0).unwrap().network.edge_count(), 0);
    }
}
