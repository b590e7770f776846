//! [`DegreeDistribution`]: a degree distribution p_k, optionally split into
//! classes (degree × group) carrying a per-class dose cost and uptake.
//!
//! Owns reading the survey table (a documented exception to "only
//! `network::load` touches files": a degree table is not a network), its
//! validation, the aggregated p_k, moments, and sampling degree sequences for
//! the configuration model. Parametric models are parsed in `spec`;
//! generating functions and their fixed points are in `pgf`.
//!
//! # Table format
//!
//! CSV (comma, tab or semicolon, detected from the header line), `#` lines
//! and blank lines ignored, a header naming the columns in any order:
//!
//! - `degree` (required): a non-negative integer;
//! - `count` or `probability` (or `weight`): a finite non-negative weight —
//!   the weights are normalized to sum to 1; without either column, each
//!   row is one respondent (weight 1);
//! - `group` (optional): a group label for a grouped survey;
//! - `cost` (optional): cost of one dose for this class (> 0, default 1);
//! - `uptake` (optional): probability an offered dose is accepted, in
//!   `[0, 1]` (default 1).
//!
//! Rows with the same degree and group are added up (they must agree on
//! cost and uptake).

use std::path::{Path, PathBuf};

use rand::Rng;

use crate::rng::{self, Stage};

/// Why a degree distribution could not be built.
#[derive(Debug, thiserror::Error)]
pub enum DegreeError {
    /// The table file could not be read.
    #[error("cannot read {}: {source}", path.display())]
    Io {
        /// The file.
        path: PathBuf,
        /// The I/O error.
        source: std::io::Error,
    },
    /// A line of the table is malformed.
    #[error("{}:{line}: {msg}", path.display())]
    Parse {
        /// The file (or a label such as `<table>` for in-memory text).
        path: PathBuf,
        /// 1-based line number.
        line: u64,
        /// What is wrong, showing the bad value.
        msg: String,
    },
    /// The table as a whole is unusable (empty, zero total weight).
    #[error("{}: {msg}", path.display())]
    Table {
        /// The file.
        path: PathBuf,
        /// What is wrong.
        msg: String,
    },
    /// A model spec is malformed.
    #[error("degree model {spec:?}: {msg}")]
    Spec {
        /// The spec as given.
        spec: String,
        /// What is wrong, naming the key and value.
        msg: String,
    },
}

/// One class of people: a degree, an optional group, its share of the
/// population and the cost and uptake of a dose offered to its members.
#[derive(Clone, Debug, PartialEq)]
pub struct DegreeClass {
    /// Number of contacts k.
    pub degree: u32,
    /// Group index into [`DegreeDistribution::group_names`], if grouped.
    pub group: Option<u32>,
    /// Share of the population in this class (all classes sum to 1).
    pub prob: f64,
    /// Cost of one dose (budget units; 1 unless the table says otherwise).
    pub cost: f64,
    /// Probability that an offered dose is accepted, in `[0, 1]`.
    pub uptake: f64,
}

/// A degree distribution p_k over a finite support, with its classes.
///
/// ```
/// use spreadplan::degree::DegreeDistribution;
/// let d = DegreeDistribution::from_csv_str("degree,count\n1,2\n3,2\n", "t.csv").unwrap();
/// assert_eq!(d.mean(), 2.0);
/// assert_eq!(d.pmf(3), 0.5);
/// ```
#[derive(Clone, Debug, PartialEq)]
pub struct DegreeDistribution {
    degrees: Vec<u32>,
    probs: Vec<f64>,
    classes: Vec<DegreeClass>,
    group_names: Vec<String>,
    description: String,
    dropped_tail: f64,
}

/// Tail at which infinite supports (Poisson, geometric, negative
/// binomial, power law with only an exponential cutoff) are truncated: the
/// support stops at the first k beyond the mode where the remaining tail of
/// k² p_k (so also the tail mass) is below this times the kept mass, and
/// the kept probabilities are renormalized.
pub const TAIL_MASS: f64 = 1e-12;

/// Largest support a distribution may have (distinct degrees), so that no
/// spec can exhaust memory.
pub const MAX_SUPPORT: usize = 10_000_000;

impl DegreeDistribution {
    /// A distribution from `(degree, weight)` pairs (weights need not sum
    /// to 1; zero weights are dropped). `description` names it in reports.
    pub fn from_weights(pairs: &[(u32, f64)], description: &str) -> Result<Self, DegreeError> {
        let classes = pairs
            .iter()
            .map(|&(k, w)| DegreeClass { degree: k, group: None, prob: w, cost: 1.0, uptake: 1.0 })
            .collect();
        Self::from_classes(classes, Vec::new(), description, 0.0)
            .map_err(|msg| DegreeError::Table { path: PathBuf::from(description), msg })
    }

    /// Builds from classes with raw weights in `prob` (merged by (degree,
    /// group), normalized). `Err` is a message.
    pub(crate) fn from_classes(
        mut classes: Vec<DegreeClass>,
        group_names: Vec<String>,
        description: &str,
        dropped_tail: f64,
    ) -> Result<Self, String> {
        for c in &classes {
            if !c.prob.is_finite() || c.prob < 0.0 {
                return Err(format!(
                    "weight of degree {} must be finite and >= 0, got {}",
                    c.degree, c.prob
                ));
            }
        }
        classes.retain(|c| c.prob > 0.0);
        if classes.is_empty() {
            return Err("no degree has a positive weight".into());
        }
        classes.sort_by_key(|c| (c.degree, c.group));
        let mut merged: Vec<DegreeClass> = Vec::with_capacity(classes.len());
        for c in classes {
            match merged.last_mut() {
                Some(m) if m.degree == c.degree && m.group == c.group => {
                    if m.cost != c.cost || m.uptake != c.uptake {
                        return Err(format!(
                            "degree {} appears twice with different cost or uptake",
                            c.degree
                        ));
                    }
                    m.prob += c.prob;
                }
                _ => merged.push(c),
            }
        }
        let total: f64 = merged.iter().map(|c| c.prob).sum();
        if !total.is_finite() || total <= 0.0 {
            return Err(format!("weights cannot be normalized (total {total})"));
        }
        for c in &mut merged {
            c.prob /= total;
        }
        if merged.len() > MAX_SUPPORT {
            return Err(format!("more than {MAX_SUPPORT} classes"));
        }
        let mut degrees: Vec<u32> = Vec::new();
        let mut probs: Vec<f64> = Vec::new();
        for c in &merged {
            if degrees.last() == Some(&c.degree) {
                *probs.last_mut().expect("nonempty") += c.prob;
            } else {
                degrees.push(c.degree);
                probs.push(c.prob);
            }
        }
        Ok(DegreeDistribution {
            degrees,
            probs,
            classes: merged,
            group_names,
            description: description.to_owned(),
            dropped_tail,
        })
    }

    /// Reads a degree table file (format in the module docs).
    pub fn from_csv_path(path: &Path) -> Result<Self, DegreeError> {
        let text = std::fs::read_to_string(path)
            .map_err(|source| DegreeError::Io { path: path.to_owned(), source })?;
        Self::parse_table(&text, path)
    }

    /// Parses a degree table held in memory; `label` stands for the file
    /// name in errors and reports.
    pub fn from_csv_str(text: &str, label: &str) -> Result<Self, DegreeError> {
        Self::parse_table(text, Path::new(label))
    }

    fn parse_table(text: &str, path: &Path) -> Result<Self, DegreeError> {
        let perr = |line: usize, msg: String| DegreeError::Parse {
            path: path.to_owned(),
            line: line as u64 + 1,
            msg,
        };
        let mut lines = text
            .lines()
            .enumerate()
            .map(|(i, l)| (i, l.trim_end_matches('\r').trim()))
            .filter(|(_, l)| !l.is_empty() && !l.starts_with('#'));
        let (hline, header) = lines.next().ok_or_else(|| DegreeError::Table {
            path: path.to_owned(),
            msg: "the table is empty (expected a header such as degree,count)".into(),
        })?;
        let delim = [',', '\t', ';'].into_iter().find(|d| header.contains(*d)).unwrap_or(',');
        let names: Vec<String> =
            header.split(delim).map(|s| s.trim().trim_matches('"').to_ascii_lowercase()).collect();
        let col = |n: &str| names.iter().position(|x| x == n);
        let degree_col = col("degree")
            .ok_or_else(|| perr(hline, format!("header {header:?} has no `degree` column")))?;
        let weight_col = col("count").or_else(|| col("probability")).or_else(|| col("weight"));
        let group_col = col("group");
        let cost_col = col("cost");
        let uptake_col = col("uptake");
        let mut group_names: Vec<String> = Vec::new();
        let mut classes = Vec::new();
        for (i, line) in lines {
            let fields: Vec<&str> = line.split(delim).map(|s| s.trim().trim_matches('"')).collect();
            if fields.len() != names.len() {
                return Err(perr(
                    i,
                    format!("expected {} columns, found {} in {line:?}", names.len(), fields.len()),
                ));
            }
            let ds = fields[degree_col];
            let degree: u32 = ds.parse().map_err(|_| {
                perr(i, format!("degree must be a non-negative integer, got {ds:?}"))
            })?;
            let num = |c: usize, what: &str| -> Result<f64, DegreeError> {
                let s = fields[c];
                let x: f64 = s
                    .parse()
                    .map_err(|_| perr(i, format!("{what} must be a number, got {s:?}")))?;
                if !x.is_finite() {
                    return Err(perr(i, format!("{what} must be finite, got {s:?}")));
                }
                Ok(x)
            };
            let weight = match weight_col {
                Some(c) => {
                    let w = num(c, &names[c])?;
                    if w < 0.0 {
                        return Err(perr(
                            i,
                            format!("{} must be >= 0, got {}", names[c], fields[c]),
                        ));
                    }
                    w
                }
                None => 1.0,
            };
            let cost = match cost_col {
                Some(c) => {
                    let x = num(c, "cost")?;
                    if x <= 0.0 {
                        return Err(perr(i, format!("cost must be > 0, got {}", fields[c])));
                    }
                    x
                }
                None => 1.0,
            };
            let uptake = match uptake_col {
                Some(c) => {
                    let x = num(c, "uptake")?;
                    if !(0.0..=1.0).contains(&x) {
                        return Err(perr(
                            i,
                            format!("uptake must be in [0, 1], got {}", fields[c]),
                        ));
                    }
                    x
                }
                None => 1.0,
            };
            let group = match group_col {
                Some(c) => {
                    let g = fields[c];
                    if g.is_empty() {
                        return Err(perr(i, "group is empty".into()));
                    }
                    Some(match group_names.iter().position(|x| x == g) {
                        Some(j) => j as u32,
                        None => {
                            group_names.push(g.to_owned());
                            group_names.len() as u32 - 1
                        }
                    })
                }
                None => None,
            };
            classes.push(DegreeClass { degree, group, prob: weight, cost, uptake });
        }
        if classes.is_empty() {
            return Err(DegreeError::Table {
                path: path.to_owned(),
                msg: "the table has a header but no rows".into(),
            });
        }
        let label = path.display().to_string();
        Self::from_classes(classes, group_names, &label, 0.0)
            .map_err(|msg| DegreeError::Table { path: path.to_owned(), msg })
    }

    /// Parses a model spec (`poisson:mean=6`, `geometric:mean=6`,
    /// `powerlaw:exponent=2.5,min=2,max=300`, `negbin:mean=6,dispersion=0.8`,
    /// `regular:k=4`); see [`super::spec`] for the exact families.
    pub fn from_spec(spec: &str) -> Result<Self, DegreeError> {
        super::spec::parse(spec)
    }

    /// Distinct degrees with positive probability, ascending.
    pub fn support(&self) -> &[u32] {
        &self.degrees
    }

    /// p_k aligned with [`support`](Self::support); sums to 1.
    pub fn probabilities(&self) -> &[f64] {
        &self.probs
    }

    /// p_k (0 outside the support).
    pub fn pmf(&self, k: u32) -> f64 {
        match self.degrees.binary_search(&k) {
            Ok(i) => self.probs[i],
            Err(_) => 0.0,
        }
    }

    /// The classes (degree × group), sorted by degree then group.
    pub fn classes(&self) -> &[DegreeClass] {
        &self.classes
    }

    /// Group labels of a grouped table (empty otherwise).
    pub fn group_names(&self) -> &[String] {
        &self.group_names
    }

    /// Whether any class has a group.
    pub fn is_grouped(&self) -> bool {
        !self.group_names.is_empty()
    }

    /// The model spec or the table's file name.
    pub fn description(&self) -> &str {
        &self.description
    }

    /// Probability mass dropped when truncating an infinite support (0 for
    /// tables and finite models); the kept mass was renormalized.
    pub fn dropped_tail(&self) -> f64 {
        self.dropped_tail
    }

    /// Largest degree with positive probability.
    pub fn max_degree(&self) -> u32 {
        *self.degrees.last().expect("non-empty by construction")
    }

    /// The n-th raw moment ⟨k^n⟩ = Σ_k k^n p_k.
    pub fn moment(&self, n: i32) -> f64 {
        self.degrees.iter().zip(&self.probs).map(|(&k, &p)| f64::from(k).powi(n) * p).sum()
    }

    /// Mean degree ⟨k⟩.
    pub fn mean(&self) -> f64 {
        self.moment(1)
    }

    /// Second moment ⟨k²⟩.
    pub fn second_moment(&self) -> f64 {
        self.moment(2)
    }

    /// Variance ⟨k²⟩ − ⟨k⟩².
    pub fn variance(&self) -> f64 {
        self.second_moment() - self.mean().powi(2)
    }

    /// κ = ⟨k(k−1)⟩/⟨k⟩ = (⟨k²⟩ − ⟨k⟩)/⟨k⟩, the mean excess degree of a
    /// neighbour (Molloy & Reed 1995; Newman 2002). 0 when ⟨k⟩ = 0.
    pub fn kappa(&self) -> f64 {
        let m = self.mean();
        if m > 0.0 {
            (self.second_moment() - m) / m
        } else {
            0.0
        }
    }

    /// Samples `n` i.i.d. degrees from p_k for the configuration model,
    /// from `rng::stream(seed, Stage::Generate, 0)`; see
    /// [`sample_degrees_in`](Self::sample_degrees_in).
    pub fn sample_degrees(&self, n: usize, seed: u64) -> Vec<u32> {
        self.sample_degrees_in(n, seed, 0)
    }

    /// Samples `n` i.i.d. degrees from p_k by inverse-CDF lookup on
    /// `rng::stream(seed, Stage::Generate, realization)`, deterministic for
    /// a given (seed, realization).
    ///
    /// Even sum: a configuration model needs Σ k even. If the sum is odd,
    /// the last person's degree is redrawn (same stream) up to 64 times
    /// until the parity flips; if it never does (every degree in the
    /// support has the same parity, e.g. `regular:k=3` with odd n), the
    /// last person's degree is increased by one. Either way at most one
    /// person's degree differs from an i.i.d. draw.
    ///
    /// ```
    /// use spreadplan::degree::DegreeDistribution;
    /// let d = DegreeDistribution::from_spec("poisson:mean=3").unwrap();
    /// let a = d.sample_degrees(1001, 7);
    /// assert_eq!(a, d.sample_degrees(1001, 7));
    /// assert_eq!(a.iter().map(|&k| k as u64).sum::<u64>() % 2, 0);
    /// ```
    pub fn sample_degrees_in(&self, n: usize, seed: u64, realization: u64) -> Vec<u32> {
        let mut cdf = Vec::with_capacity(self.probs.len());
        let mut acc = 0.0;
        for &p in &self.probs {
            acc += p;
            cdf.push(acc);
        }
        let last = self.degrees.len() - 1;
        let mut rng = rng::stream(seed, Stage::Generate, realization);
        let draw = |rng: &mut rand_chacha::ChaCha8Rng| -> u32 {
            let x: f64 = rng.random::<f64>() * acc;
            let i = cdf.partition_point(|&c| c <= x).min(last);
            self.degrees[i]
        };
        let mut out: Vec<u32> = (0..n).map(|_| draw(&mut rng)).collect();
        let odd = out.iter().map(|&k| u64::from(k)).sum::<u64>() % 2 == 1;
        if odd {
            if let Some(lastk) = out.last_mut() {
                let old = *lastk;
                let mut fixed = false;
                for _ in 0..64 {
                    let k = draw(&mut rng);
                    if (k ^ old) & 1 == 1 {
                        *lastk = k;
                        fixed = true;
                        break;
                    }
                }
                if !fixed {
                    *lastk = old.saturating_add(1);
                }
            }
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn table_counts_and_probabilities() {
        let d = DegreeDistribution::from_csv_str("# survey\ndegree,count\n2,1\n4,3\n2,0\n", "s")
            .unwrap();
        assert_eq!(d.support(), &[2, 4]);
        assert_eq!(d.probabilities(), &[0.25, 0.75]);
        let p =
            DegreeDistribution::from_csv_str("probability\tdegree\n0.5\t1\n0.5\t0\n", "p").unwrap();
        assert_eq!(p.support(), &[0, 1]);
    }

    #[test]
    fn respondent_rows_and_groups() {
        let d = DegreeDistribution::from_csv_str(
            "degree,group,cost,uptake\n3,a,1,0.9\n3,b,2,1\n5,a,1,0.9\n3,a,1,0.9\n",
            "g",
        )
        .unwrap();
        assert_eq!(d.group_names(), &["a".to_string(), "b".to_string()]);
        assert_eq!(d.classes().len(), 3);
        assert_eq!(d.classes()[0].prob, 0.5);
        assert_eq!(d.pmf(3), 0.75);
    }

    #[test]
    fn table_errors_name_line_and_value() {
        let e = DegreeDistribution::from_csv_str("degree,count\n2,1\n-3,1\n", "s.csv")
            .unwrap_err()
            .to_string();
        assert_eq!(e, "s.csv:3: degree must be a non-negative integer, got \"-3\"");
        let e = DegreeDistribution::from_csv_str("degree,count\n2,nan\n", "s.csv")
            .unwrap_err()
            .to_string();
        assert!(e.starts_with("s.csv:2:") && e.contains("nan"), "{e}");
        let e = DegreeDistribution::from_csv_str("degree,count\n2,-1\n", "s.csv")
            .unwrap_err()
            .to_string();
        assert!(e.contains("-1"), "{e}");
        let e = DegreeDistribution::from_csv_str("degree,count\n2,0\n", "s.csv")
            .unwrap_err()
            .to_string();
        assert!(e.contains("positive weight"), "{e}");
        assert!(DegreeDistribution::from_csv_str("", "s.csv").is_err());
        assert!(DegreeDistribution::from_csv_str("deg,count\n1,1\n", "s.csv").is_err());
        assert!(DegreeDistribution::from_csv_str("degree,count\n1\n", "s.csv").is_err());
        let e = DegreeDistribution::from_csv_str("degree,uptake\n1,1.5\n", "s.csv")
            .unwrap_err()
            .to_string();
        assert!(e.contains("1.5"), "{e}");
    }

    #[test]
    fn samples_are_even_and_follow_p() {
        let d = DegreeDistribution::from_spec("regular:k=3").unwrap();
        let s = d.sample_degrees(5, 1);
        assert_eq!(s.iter().sum::<u32>() % 2, 0);
        assert_eq!(s.iter().filter(|&&k| k != 3).count(), 1);
        let d = DegreeDistribution::from_csv_str("degree,count\n1,1\n2,3\n", "t").unwrap();
        let s = d.sample_degrees(40_000, 3);
        // Binomial(40000, 0.25): sd 87; 5 sd tolerance.
        let ones = s.iter().filter(|&&k| k == 1).count() as f64;
        assert!((ones - 10_000.0).abs() < 435.0, "{ones}");
    }
}
