//! Union–find over `u32` nodes with component sizes (union by size, path
//! halving; Tarjan 1975), tracking the largest component and `Σ s²`
//! incrementally, so that after every union the giant fraction and the
//! mean outbreak size `Σ s² / N²` are known in O(1). It also counts the
//! nodes in "large" components (size at least [`UnionFind::set_large_min`]),
//! updated in O(1) per union: the basis of `outbreak_probability`.

/// Disjoint sets with sizes; a node may be inactive (not yet added).
#[derive(Clone, Debug)]
pub struct UnionFind {
    parent: Vec<u32>,
    size: Vec<u32>,
    largest: u32,
    sum_sq: u64,
    active: u64,
    large_min: u32,
    in_large: u64,
}

const INACTIVE: u32 = u32::MAX;

impl UnionFind {
    /// `n` singleton components, all active.
    ///
    /// ```
    /// let mut uf = spreadplan::percolation::UnionFind::new(4);
    /// uf.union(0, 1);
    /// uf.union(2, 3);
    /// uf.union(1, 3);
    /// assert_eq!((uf.largest(), uf.sum_sq()), (4, 16));
    /// ```
    pub fn new(n: usize) -> Self {
        UnionFind {
            parent: (0..n as u32).collect(),
            size: vec![1; n],
            largest: u32::from(n > 0),
            sum_sq: n as u64,
            active: n as u64,
            large_min: u32::MAX,
            in_large: 0,
        }
    }

    /// `n` nodes, none active: add them with [`UnionFind::activate`].
    pub fn new_inactive(n: usize) -> Self {
        UnionFind {
            parent: vec![INACTIVE; n],
            size: vec![0; n],
            largest: 0,
            sum_sq: 0,
            active: 0,
            large_min: u32::MAX,
            in_large: 0,
        }
    }

    /// Sets the size from which a component counts as large (at least 1)
    /// and recounts [`UnionFind::in_large`] from the current components
    /// (O(N); call it once, before the unions).
    pub fn set_large_min(&mut self, large_min: u32) {
        self.large_min = large_min.max(1);
        let mut count = 0u64;
        for (i, &p) in self.parent.iter().enumerate() {
            if p == i as u32 && self.size[i] >= self.large_min {
                count += self.size[i] as u64;
            }
        }
        self.in_large = count;
    }

    /// The size from which a component counts as large (`u32::MAX` until
    /// set).
    pub fn large_min(&self) -> u32 {
        self.large_min
    }

    /// Number of active nodes in components of size at least
    /// [`UnionFind::large_min`].
    #[inline]
    pub fn in_large(&self) -> u64 {
        self.in_large
    }

    /// Resets to `n` singletons without reallocating.
    pub fn reset(&mut self) {
        for (i, p) in self.parent.iter_mut().enumerate() {
            *p = i as u32;
        }
        self.size.fill(1);
        let n = self.parent.len();
        self.largest = u32::from(n > 0);
        self.sum_sq = n as u64;
        self.active = n as u64;
        self.in_large = if self.large_min <= 1 { n as u64 } else { 0 };
    }

    /// Resets to all nodes inactive without reallocating.
    pub fn reset_inactive(&mut self) {
        self.parent.fill(INACTIVE);
        self.size.fill(0);
        self.largest = 0;
        self.sum_sq = 0;
        self.active = 0;
        self.in_large = 0;
    }

    /// Makes an inactive node a singleton component.
    #[inline]
    pub fn activate(&mut self, v: u32) {
        let i = v as usize;
        debug_assert_eq!(self.parent[i], INACTIVE);
        self.parent[i] = v;
        self.size[i] = 1;
        self.sum_sq += 1;
        self.active += 1;
        self.largest = self.largest.max(1);
        if self.large_min <= 1 {
            self.in_large += 1;
        }
    }

    /// Whether `v` has been activated.
    #[inline]
    pub fn is_active(&self, v: u32) -> bool {
        self.parent[v as usize] != INACTIVE
    }

    /// The root of `v`'s component (path halving). `v` must be active.
    #[inline]
    pub fn find(&mut self, mut v: u32) -> u32 {
        loop {
            let p = self.parent[v as usize];
            if p == v {
                return v;
            }
            let gp = self.parent[p as usize];
            self.parent[v as usize] = gp;
            v = gp;
        }
    }

    /// Joins the components of `a` and `b`; returns whether they differed.
    #[inline]
    pub fn union(&mut self, a: u32, b: u32) -> bool {
        let (mut ra, mut rb) = (self.find(a), self.find(b));
        if ra == rb {
            return false;
        }
        let (sa, sb) = (self.size[ra as usize], self.size[rb as usize]);
        if sa < sb {
            std::mem::swap(&mut ra, &mut rb);
        }
        let s = sa + sb;
        self.parent[rb as usize] = ra;
        self.size[ra as usize] = s;
        self.sum_sq += 2 * sa as u64 * sb as u64;
        self.largest = self.largest.max(s);
        let l = self.large_min;
        if s >= l {
            // Each side that was small joins the large nodes now.
            self.in_large +=
                if sa < l { sa as u64 } else { 0 } + if sb < l { sb as u64 } else { 0 };
        }
        true
    }

    /// Like [`UnionFind::union`], returning the two sizes joined (`None`
    /// when `a` and `b` were already together).
    #[inline]
    pub fn union_sizes(&mut self, a: u32, b: u32) -> Option<(u32, u32)> {
        let (ra, rb) = (self.find(a), self.find(b));
        if ra == rb {
            return None;
        }
        let sizes = (self.size[ra as usize], self.size[rb as usize]);
        self.union(ra, rb);
        Some(sizes)
    }

    /// Size of `v`'s component.
    #[inline]
    pub fn component_size(&mut self, v: u32) -> u32 {
        let r = self.find(v);
        self.size[r as usize]
    }

    /// Size of the largest component.
    #[inline]
    pub fn largest(&self) -> u32 {
        self.largest
    }

    /// `Σ s²` over components.
    #[inline]
    pub fn sum_sq(&self) -> u64 {
        self.sum_sq
    }

    /// Number of active nodes.
    #[inline]
    pub fn active(&self) -> u64 {
        self.active
    }

    /// Number of nodes (active or not).
    pub fn len(&self) -> usize {
        self.parent.len()
    }

    /// Whether there are no nodes.
    pub fn is_empty(&self) -> bool {
        self.parent.is_empty()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn activation_order() {
        let mut uf = UnionFind::new_inactive(3);
        uf.activate(2);
        uf.activate(0);
        assert_eq!((uf.largest(), uf.sum_sq(), uf.active()), (1, 2, 2));
        assert!(uf.union(0, 2));
        assert!(!uf.union(2, 0));
        assert_eq!((uf.largest(), uf.sum_sq()), (2, 4));
        assert!(!uf.is_active(1));
    }

    #[test]
    fn large_counter_by_hand() {
        // Path 0-1-2-3-4 joined left to right with large_min = 3: the count
        // jumps to 3 when the first component reaches size 3, then grows by 1.
        let mut uf = UnionFind::new(5);
        uf.set_large_min(3);
        assert_eq!(uf.in_large(), 0);
        uf.union(0, 1);
        assert_eq!(uf.in_large(), 0);
        uf.union(1, 2);
        assert_eq!(uf.in_large(), 3);
        uf.union(3, 4);
        assert_eq!(uf.in_large(), 3);
        uf.union(2, 3);
        assert_eq!(uf.in_large(), 5);
        uf.reset_inactive();
        uf.activate(0);
        assert_eq!(uf.in_large(), 0);
        uf.set_large_min(1);
        assert_eq!(uf.in_large(), 1);
    }
}
