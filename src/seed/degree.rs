//! The `degree` rule: the `K` people with the most contacts they can
//! influence (out-degree when directed), ties broken by the smaller index.

use crate::seed::Cascade;

/// The `k` highest out-degree people who have not adopted, highest first,
/// ties by index (common practice, no source; Kempe et al. 2003 use it as
/// a baseline).
///
/// ```
/// use spreadplan::network::{Network, WeightMerge};
/// use spreadplan::seed::{degree_seeds, Cascade, CascadeModel};
/// let (net, _) = Network::from_edges(4, false, vec![(0, 1), (1, 2), (1, 3), (2, 3)], None,
///     WeightMerge::Max).unwrap();
/// let c = Cascade::new(&net, &CascadeModel::Uniform { p: 0.1 }, &[]).unwrap();
/// assert_eq!(degree_seeds(&c, 2), vec![1, 2]);
/// ```
pub fn degree_seeds(c: &Cascade<'_>, k: usize) -> Vec<u32> {
    let net = c.network();
    let mut v: Vec<u32> = (0..net.node_count() as u32).filter(|&v| !c.is_blocked(v)).collect();
    v.sort_by_key(|&x| (std::cmp::Reverse(net.degree(x)), x));
    v.truncate(k);
    v
}
