//! The [`NodeTable`]: external string ids ↔ dense `u32` indices, and the
//! optional per-person attributes a planner supplies (`group`, `cost`,
//! `uptake`, `immune`).
//!
//! Indices are assigned at load and never change; ids are restored only in
//! `report`. Reading a node-table file is `network::load`.

use indexmap::IndexSet;
use rustc_hash::FxBuildHasher;

/// Group labels of the people, when a node table gives them.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Groups {
    /// Group names, by group index, in order of first appearance.
    pub names: Vec<String>,
    /// Group index of each node.
    pub of: Vec<u32>,
}

/// External ids and per-person attributes, indexed by node.
#[derive(Clone, Debug, Default)]
pub struct NodeTable {
    ids: IndexSet<String, FxBuildHasher>,
    /// Group of each person.
    pub groups: Option<Groups>,
    /// Cost of one dose (or seed) for each person, in budget units.
    pub cost: Option<Vec<f64>>,
    /// Probability that an offered dose is accepted, in `[0, 1]`.
    pub uptake: Option<Vec<f64>>,
    /// Already immune before the campaign.
    pub immune: Option<Vec<bool>>,
}

impl NodeTable {
    /// A table whose ids are the decimal indices `"0"`, `"1"`, … (for
    /// generated networks).
    ///
    /// ```
    /// let t = spreadplan::network::NodeTable::numbered(3);
    /// assert_eq!((t.len(), t.id(2), t.index("1")), (3, "2", Some(1)));
    /// ```
    pub fn numbered(n: usize) -> Self {
        let mut ids = IndexSet::with_capacity_and_hasher(n, FxBuildHasher);
        for i in 0..n {
            ids.insert(i.to_string());
        }
        NodeTable { ids, ..Default::default() }
    }

    /// A table from ids in index order; `Err(id)` names the first repeat.
    pub fn from_ids<I: IntoIterator<Item = String>>(ids: I) -> Result<Self, String> {
        let mut set = IndexSet::with_hasher(FxBuildHasher);
        for id in ids {
            if let Some(dup) = set.replace(id) {
                return Err(dup);
            }
        }
        Ok(NodeTable { ids: set, ..Default::default() })
    }

    /// The index of `id`, inserting it at the end when new.
    pub fn intern(&mut self, id: &str) -> u32 {
        if let Some(i) = self.ids.get_index_of(id) {
            return i as u32;
        }
        self.ids.insert_full(id.to_owned()).0 as u32
    }

    /// Number of people.
    pub fn len(&self) -> usize {
        self.ids.len()
    }

    /// Whether the table is empty.
    pub fn is_empty(&self) -> bool {
        self.ids.is_empty()
    }

    /// External id of node `v`.
    pub fn id(&self, v: u32) -> &str {
        self.ids.get_index(v as usize).map(String::as_str).unwrap_or("?")
    }

    /// Node index of an external id.
    pub fn index(&self, id: &str) -> Option<u32> {
        self.ids.get_index_of(id).map(|i| i as u32)
    }

    /// Group name of node `v`, if groups are known.
    pub fn group_of(&self, v: u32) -> Option<&str> {
        let g = self.groups.as_ref()?;
        g.of.get(v as usize).and_then(|&i| g.names.get(i as usize)).map(String::as_str)
    }

    /// Cost of a dose for `v` (1 when no costs are given).
    pub fn cost_of(&self, v: u32) -> f64 {
        self.cost.as_ref().map_or(1.0, |c| c[v as usize])
    }

    /// Uptake probability of `v` (1 when not given).
    pub fn uptake_of(&self, v: u32) -> f64 {
        self.uptake.as_ref().map_or(1.0, |u| u[v as usize])
    }

    /// Whether `v` is listed as already immune.
    pub fn is_immune(&self, v: u32) -> bool {
        self.immune.as_ref().is_some_and(|i| i[v as usize])
    }
}
