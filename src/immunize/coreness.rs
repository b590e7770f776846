//! The `coreness` rule: k-shell order, highest core number first, ties by
//! higher residual degree, then lower index. Core numbers come from the
//! Batagelj–Zaversnik (2003, arXiv cs/0310049) O(N + M) bin-sort peeling
//! on the residual network (absent people removed), computed by
//! [`network::inspect::core_numbers_of`](crate::network::inspect::core_numbers_of).

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
    crate::network::inspect::core_numbers_of(present.net, Some(&present.alive))
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
