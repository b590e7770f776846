//! The [`NodeTable`]: external string ids ↔ dense `u32` indices, and the
//! optional per-person attributes a planner supplies (`group`, `cost`,
//! `uptake`, `immune`).
//!
//! Indices are assigned at load and never change; ids are restored only in
//! `report`. Reading a node-table file is `network::load`.
//!
//! Storage: the ids are concatenated in one string with their end offsets,
//! so a million ids cost a few bytes each rather than one allocation each.
//! Canonical decimal ids (`0`, `17`, not `017`) are found through a dense
//! table indexed by their value; other ids through an open-addressing hash
//! table of node indices (linear probing; Knuth, TAOCP vol. 3, §6.4).

use std::hash::BuildHasher;

use rustc_hash::FxBuildHasher;

/// Marker for an empty slot.
const NONE: u32 = u32::MAX;

/// The value of a canonical decimal id (`0` or no leading zero, at most 9
/// digits), else `None`.
#[inline]
pub(crate) fn canonical_u32(t: &[u8]) -> Option<u32> {
    if t.is_empty() || t.len() > 9 || (t[0] == b'0' && t.len() > 1) {
        return None;
    }
    let mut v = 0u32;
    for &b in t {
        let d = b.wrapping_sub(b'0');
        if d > 9 {
            return None;
        }
        v = v * 10 + d as u32;
    }
    Some(v)
}

/// Ids in index order with the two lookups described in the module docs.
/// Every id is in exactly one lookup: the dense table when it was
/// canonical and within the table's reach when first added, else the hash.
#[derive(Clone, Debug, Default)]
struct IdSet {
    /// All ids, concatenated.
    text: String,
    /// `ends[v]` is where id `v` ends in `text`.
    ends: Vec<usize>,
    /// `dense[value]`: index of the canonical id `value`, or [`NONE`].
    dense: Vec<u32>,
    /// Hash slots holding indices, or [`NONE`]; empty or a power of two long.
    slots: Vec<u32>,
    /// Ids in `slots`.
    hashed: usize,
    /// Entries the dense table may grow to regardless of `len` (a reserve).
    dense_hint: usize,
}

impl IdSet {
    fn len(&self) -> usize {
        self.ends.len()
    }

    #[inline]
    fn get(&self, v: usize) -> Option<&str> {
        let end = *self.ends.get(v)?;
        let start = if v == 0 { 0 } else { self.ends[v - 1] };
        Some(&self.text[start..end])
    }

    /// The index of canonical id `value` in the dense table, if there.
    #[inline]
    fn dense_index(&self, value: u32) -> Option<u32> {
        self.dense.get(value as usize).copied().filter(|&i| i != NONE)
    }

    #[inline]
    fn hash(id: &str) -> usize {
        FxBuildHasher.hash_one(id.as_bytes()) as usize
    }

    /// The slot holding `id`, or the empty slot where it would go.
    fn probe(&self, id: &str) -> usize {
        let mask = self.slots.len() - 1;
        let mut s = Self::hash(id) & mask;
        loop {
            let i = self.slots[s];
            if i == NONE || self.get(i as usize) == Some(id) {
                return s;
            }
            s = (s + 1) & mask;
        }
    }

    fn index_of(&self, id: &str) -> Option<u32> {
        if let Some(v) = canonical_u32(id.as_bytes()) {
            if let Some(i) = self.dense_index(v) {
                return Some(i);
            }
        }
        if self.hashed == 0 {
            return None;
        }
        let i = self.slots[self.probe(id)];
        (i != NONE).then_some(i)
    }

    /// Adds an id known to be absent; returns its index.
    fn push_new(&mut self, id: &str) -> u32 {
        let i = self.len() as u32;
        self.text.push_str(id);
        self.ends.push(self.text.len());
        if let Some(v) = canonical_u32(id.as_bytes()) {
            let v = v as usize;
            // Up to 4 slots per id known (plus a floor) or the reserve, so
            // sparse huge ids cannot blow memory up.
            let limit = ((1 << 16) + 4 * self.len()).max(self.dense_hint);
            if v >= self.dense.len() && v < limit {
                let new_len = (v + 1).max(2 * self.dense.len()).min(limit);
                self.dense.resize(new_len, NONE);
            }
            if let Some(slot) = self.dense.get_mut(v) {
                *slot = i;
                return i;
            }
        }
        if 2 * (self.hashed + 1) > self.slots.len() {
            self.grow();
        }
        let s = self.probe(id);
        self.slots[s] = i;
        self.hashed += 1;
        i
    }

    /// Doubles the hash slots and re-inserts the hashed ids.
    fn grow(&mut self) {
        let cap = (2 * self.slots.len()).max(16);
        let old = std::mem::replace(&mut self.slots, vec![NONE; cap]);
        let mask = cap - 1;
        for i in old.into_iter().filter(|&i| i != NONE) {
            let id = self.get(i as usize).unwrap_or_default();
            let mut s = Self::hash(id) & mask;
            while self.slots[s] != NONE {
                s = (s + 1) & mask;
            }
            self.slots[s] = i;
        }
    }
}

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
    ids: IdSet,
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
        let mut t = NodeTable::default();
        t.reserve(n);
        for i in 0..n {
            t.ids.push_new(&i.to_string());
        }
        t
    }

    /// A table from ids in index order; `Err(id)` names the first repeat.
    pub fn from_ids<I: IntoIterator<Item = String>>(ids: I) -> Result<Self, String> {
        let mut t = NodeTable::default();
        for id in ids {
            if t.ids.index_of(&id).is_some() {
                return Err(id);
            }
            t.ids.push_new(&id);
        }
        Ok(t)
    }

    /// The index of `id`, inserting it at the end when new.
    pub fn intern(&mut self, id: &str) -> u32 {
        match self.ids.index_of(id) {
            Some(i) => i,
            None => self.ids.push_new(id),
        }
    }

    /// Makes room for `additional` more ids (canonical decimal ids below
    /// the new length are then found without hashing).
    ///
    /// ```
    /// let mut t = spreadplan::network::NodeTable::default();
    /// t.reserve(1000);
    /// assert_eq!((t.intern("999"), t.intern("a"), t.index("999")), (0, 1, Some(0)));
    /// ```
    pub fn reserve(&mut self, additional: usize) {
        let ids = &mut self.ids;
        ids.ends.reserve(additional);
        ids.dense_hint = ids.dense_hint.max(ids.len() + additional);
    }

    /// Lets the dense table of canonical decimal ids grow to `entries`
    /// regardless of the number of ids (the loader passes its row estimate).
    /// Canonical ids hashed earlier for being out of reach move to the dense
    /// table when they are now within it.
    pub(crate) fn allow_dense(&mut self, entries: usize) {
        let ids = &mut self.ids;
        ids.dense_hint = ids.dense_hint.max(entries);
        if ids.hashed == 0 {
            return;
        }
        let limit = ((1 << 16) + 4 * ids.len()).max(ids.dense_hint);
        let hashed: Vec<u32> = ids.slots.iter().copied().filter(|&i| i != NONE).collect();
        let mut stay = Vec::new();
        for i in hashed {
            let value = ids.get(i as usize).and_then(|id| canonical_u32(id.as_bytes()));
            match value.map(|v| v as usize) {
                Some(v) if v < limit => {
                    if v >= ids.dense.len() {
                        ids.dense.resize(v + 1, NONE);
                    }
                    ids.dense[v] = i;
                }
                _ => stay.push(i),
            }
        }
        ids.slots.iter_mut().for_each(|s| *s = NONE);
        ids.hashed = 0;
        for i in stay {
            let id = ids.get(i as usize).unwrap_or_default().to_owned();
            let s = ids.probe(&id);
            ids.slots[s] = i;
            ids.hashed += 1;
        }
    }

    /// The dense table: entry `v` is the index of the canonical decimal id
    /// with value `v`, or `u32::MAX` ("look it up by text", not "absent").
    #[inline]
    pub(crate) fn dense_table(&self) -> &[u32] {
        &self.ids.dense
    }

    /// The index of the canonical decimal id with value `v` when it is in
    /// the dense table (the loader's fast path); `None` means "look it up
    /// by text", not "absent".
    #[inline]
    pub(crate) fn dense_index(&self, v: u32) -> Option<u32> {
        self.ids.dense_index(v)
    }

    /// Number of people.
    pub fn len(&self) -> usize {
        self.ids.len()
    }

    /// Whether the table is empty.
    pub fn is_empty(&self) -> bool {
        self.ids.len() == 0
    }

    /// External id of node `v`.
    pub fn id(&self, v: u32) -> &str {
        self.ids.get(v as usize).unwrap_or("?")
    }

    /// Node index of an external id.
    pub fn index(&self, id: &str) -> Option<u32> {
        self.ids.index_of(id)
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn canonical_ids() {
        assert_eq!(canonical_u32(b"0"), Some(0));
        assert_eq!(canonical_u32(b"123456789"), Some(123_456_789));
        assert_eq!(canonical_u32(b"007"), None);
        assert_eq!(canonical_u32(b"1234567890"), None);
        assert_eq!(canonical_u32(b"1a"), None);
        assert_eq!(canonical_u32(b""), None);
    }

    #[test]
    fn dense_and_hashed_ids_agree() {
        // Ids of every kind, some added twice: canonical small, canonical
        // beyond the dense reach (then inside it once the table grew),
        // non-canonical digits, text, empty-looking ones.
        let mut t = NodeTable::default();
        let mut expect: Vec<String> = Vec::new();
        for k in 0..5000u32 {
            let id = match k % 7 {
                0 => (k * 37 % 1000).to_string(),
                1 => (90_000_000 + k).to_string(),
                2 => format!("0{}", k % 50),
                3 => format!("person-{}", k % 300),
                4 => (k * 13).to_string(),
                5 => " ".repeat((k % 3) as usize + 1),
                _ => (200_000 - k).to_string(),
            };
            let i = t.intern(&id);
            match expect.iter().position(|e| *e == id) {
                Some(p) => assert_eq!(i as usize, p, "{id:?}"),
                None => {
                    assert_eq!(i as usize, expect.len(), "{id:?}");
                    expect.push(id);
                }
            }
        }
        assert_eq!(t.len(), expect.len());
        for (v, id) in expect.iter().enumerate() {
            assert_eq!(t.id(v as u32), id);
            assert_eq!(t.index(id), Some(v as u32), "{id:?}");
        }
        assert_eq!(t.index("person-300"), None);
        assert_eq!(t.index("1000000000"), None);
        assert_eq!(t.id(expect.len() as u32), "?");
    }

    #[test]
    fn widening_the_dense_reach_keeps_every_id() {
        let mut t = NodeTable::default();
        let ids: Vec<String> = (0..3000u32)
            .map(|k| if k % 5 == 0 { format!("x{k}") } else { (k * 977).to_string() })
            .collect();
        for id in &ids {
            t.intern(id);
        }
        assert!(t.ids.hashed > 600, "some canonical ids were out of reach");
        t.allow_dense(4_000_000);
        assert_eq!(t.ids.hashed, 600, "only the text ids stay hashed");
        for (v, id) in ids.iter().enumerate() {
            assert_eq!((t.index(id), t.id(v as u32)), (Some(v as u32), id.as_str()));
        }
        assert_eq!(t.intern("x5"), 5);
        assert_eq!(t.intern("977"), 1);
        assert_eq!(t.intern("978"), 3000);
    }

    #[test]
    fn numbered_and_from_ids() {
        let t = NodeTable::numbered(100);
        assert_eq!((t.index("57"), t.index("057"), t.id(99)), (Some(57), None, "99"));
        let t = NodeTable::from_ids(["b", "a", "10"].map(String::from)).unwrap();
        assert_eq!((t.index("a"), t.index("10"), t.id(0)), (Some(1), Some(2), "b"));
        assert_eq!(NodeTable::from_ids(["x", "7", "7"].map(String::from)).unwrap_err(), "7");
    }
}
