//! TOML scenario files that reproduce a whole study: which ranking
//! (`kind`), the inputs (a network edge list with an optional node table,
//! or a degree distribution), the ranking's parameters (the config structs
//! of the rankings, embedded as they are), and where outputs go. Owns
//! parsing, validation with file-line errors, resolving paths relative to
//! the scenario file, and [`Scenario::run`], which calls the ranking and
//! returns its [`Study`]. Loading is `network::load`; writing files is
//! `report`.
//!
//! ```toml
//! name = "Marrowby, 300 doses"
//! kind = "seed"                  # immunize | seed | threshold
//!
//! [network]
//! edges = "contacts.csv.gz"      # relative to this file
//! nodes = "people.csv"           # optional: id, group, cost, uptake, immune
//!
//! [parameters]                   # the ranking's config (e.g. seed::SeedConfig)
//! budget = 10
//! model = { uniform = { p = 0.05 } }
//!
//! [outputs]
//! dir = "out"                    # relative to this file; `--out` overrides
//! ```

use std::ops::Range;
use std::path::{Path, PathBuf};

use serde::de::DeserializeOwned;
use serde::Deserialize;
use serde_json::Value;

use crate::degree::DegreeDistribution;
use crate::network::load::{self, EdgeListOptions, LoadError, Loaded};
use crate::network::WeightMerge;
use crate::outcome::Study;
use crate::progress::Progress;

/// Why a scenario cannot be read or run.
#[derive(Debug, thiserror::Error)]
pub enum ScenarioError {
    /// The scenario file could not be read.
    #[error("{path}: {source}")]
    Io {
        /// The scenario file.
        path: PathBuf,
        /// The cause.
        source: std::io::Error,
    },
    /// The file is not valid TOML or a key has a bad value.
    #[error("{file}:{line}: {key}: {msg}")]
    Invalid {
        /// The scenario file.
        file: String,
        /// 1-based line of the offending key (0 when unknown).
        line: usize,
        /// The key, as a dotted path (`parameters.budget`).
        key: String,
        /// What is wrong, showing the bad value.
        msg: String,
    },
    /// An input named by the scenario could not be loaded.
    #[error(transparent)]
    Load(#[from] LoadError),
    /// The ranking refused its parameters or failed.
    #[error("{file}: {msg}")]
    Ranking {
        /// The scenario file.
        file: String,
        /// The ranking's error.
        msg: String,
    },
    /// This kind or input is not available in this build.
    #[error("{file}: {msg}")]
    Unsupported {
        /// The scenario file.
        file: String,
        /// What is missing.
        msg: String,
    },
}

/// Which ranking a scenario runs.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Deserialize)]
#[serde(rename_all = "snake_case")]
pub enum Kind {
    /// Immunization ranking (`spreadplan immunize`).
    Immunize,
    /// Seeding ranking (`spreadplan seed`).
    Seed,
    /// Percolation threshold study (`spreadplan threshold`).
    Threshold,
}

impl Kind {
    /// The subcommand name.
    pub fn name(self) -> &'static str {
        match self {
            Kind::Immunize => "immunize",
            Kind::Seed => "seed",
            Kind::Threshold => "threshold",
        }
    }
}

/// A network input: an edge list and optional node table.
#[derive(Clone, Debug, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct NetworkInput {
    /// Edge list, relative to the scenario file.
    pub edges: PathBuf,
    /// Node table (`id`, `group`, `cost`, `uptake`, `immune`), relative to the scenario file.
    #[serde(default)]
    pub nodes: Option<PathBuf>,
    /// Read `source,target` as directed.
    #[serde(default)]
    pub directed: bool,
    /// Header name (or 1-based column) of the weight / probability column.
    #[serde(default)]
    pub weight_column: Option<String>,
    /// Seeding: people who already adopted (one id per line), relative to the scenario file.
    #[serde(default)]
    pub exclude: Option<PathBuf>,
}

/// A degree-distribution input: a table or a model spec.
#[derive(Clone, Debug, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct DistributionInput {
    /// `degree,count` or `degree,probability` table, relative to the scenario file.
    #[serde(default)]
    pub table: Option<PathBuf>,
    /// Model spec such as `negbin:mean=6,dispersion=0.8`.
    #[serde(default)]
    pub model: Option<String>,
}

/// Where outputs go.
#[derive(Clone, Debug, Default, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Outputs {
    /// Output folder, relative to the scenario file.
    #[serde(default)]
    pub dir: Option<PathBuf>,
}

/// The file's top level, generic over the ranking's parameter type.
#[derive(Debug, Deserialize)]
#[serde(deny_unknown_fields)]
struct File<P> {
    #[serde(default)]
    name: Option<String>,
    kind: Kind,
    #[serde(default)]
    network: Option<NetworkInput>,
    #[serde(default)]
    distribution: Option<DistributionInput>,
    parameters: P,
    #[serde(default)]
    outputs: Outputs,
}

struct Head {
    kind: Kind,
    distribution: bool,
}

/// The ranking's parameters, typed by kind and input.
#[derive(Clone, Debug)]
pub enum Parameters {
    /// Seeding: [`crate::seed::SeedConfig`].
    Seed(crate::seed::SeedConfig),
    /// Immunization on a network: [`crate::immunize::ImmunizeConfig`].
    Immunize(crate::immunize::ImmunizeConfig),
    /// Immunization from a degree distribution:
    /// [`crate::immunize::analytic::AnalyticConfig`] (its `population` is
    /// the population the distribution describes).
    ImmunizeDistribution(crate::immunize::analytic::AnalyticConfig),
    /// Threshold study on a network: [`crate::percolation::ThresholdConfig`].
    Threshold(crate::percolation::ThresholdConfig),
}

/// A parsed scenario.
#[derive(Clone, Debug)]
pub struct Scenario {
    /// The file it came from (as given), or `<string>`.
    pub file: PathBuf,
    /// Folder that relative paths are resolved against.
    pub base: PathBuf,
    /// The file's text (kept for line numbers and its content hash).
    pub source: String,
    /// Free-text name shown in the report.
    pub name: Option<String>,
    /// Which ranking.
    pub kind: Kind,
    /// The network input, if any.
    pub network: Option<NetworkInput>,
    /// The degree-distribution input, if any.
    pub distribution: Option<DistributionInput>,
    /// The ranking's parameters.
    pub parameters: Parameters,
    /// Where outputs go.
    pub outputs: Outputs,
}

/// 1-based line of byte offset `at` in `text`.
fn line_of(text: &str, at: usize) -> usize {
    text.as_bytes()[..at.min(text.len())].iter().filter(|&&b| b == b'\n').count() + 1
}

/// The dotted key at a byte span: the table header in effect, then the
/// key on the span's line (when the line is `key = …`).
fn key_at(text: &str, span: &Range<usize>) -> String {
    let start = span.start.min(text.len());
    let mut table = String::new();
    let mut key = String::new();
    let mut pos = 0;
    for line in text.split_inclusive('\n') {
        let end = pos + line.len();
        let t = line.trim();
        if pos > start {
            break;
        }
        if t.starts_with('[') {
            table = t.trim_matches(|c| c == '[' || c == ']').trim().to_owned();
            key.clear();
        }
        if start < end || end == text.len() {
            if let Some((k, _)) = t.split_once('=') {
                if !t.starts_with('#') && !t.starts_with('[') {
                    key = k.trim().trim_matches('"').to_owned();
                }
            }
            break;
        }
        pos = end;
    }
    match (table.is_empty(), key.is_empty()) {
        (true, true) => "(top level)".into(),
        (true, false) => key,
        (false, true) => table,
        (false, false) => format!("{table}.{key}"),
    }
}

fn invalid(file: &str, text: &str, e: &toml::de::Error) -> ScenarioError {
    let span = e.span().unwrap_or(0..0);
    let line = if e.span().is_some() { line_of(text, span.start) } else { 0 };
    let mut key = if e.span().is_some() { key_at(text, &span) } else { "(top level)".into() };
    let msg = e.message().trim().to_owned();
    // serde names a missing field in the message; the span is the table.
    if let Some(rest) = msg.strip_prefix("missing field `") {
        if let Some(f) = rest.split('`').next() {
            key = if key == "(top level)" { f.to_owned() } else { format!("{key}.{f}") };
        }
    }
    ScenarioError::Invalid { file: file.to_owned(), line, key, msg }
}

fn parse<P: DeserializeOwned>(file: &str, text: &str) -> Result<File<P>, ScenarioError> {
    toml::from_str::<File<P>>(text).map_err(|e| invalid(file, text, &e))
}

impl Scenario {
    /// Reads and validates a scenario file; relative paths inside it are
    /// resolved against its folder.
    pub fn from_file(path: &Path) -> Result<Scenario, ScenarioError> {
        let text = std::fs::read_to_string(path)
            .map_err(|source| ScenarioError::Io { path: path.to_owned(), source })?;
        let base = path.parent().map(Path::to_owned).unwrap_or_default();
        Scenario::from_str_at(&text, path, &base)
    }

    /// Parses a scenario from text; relative paths resolve against `base`,
    /// and errors name `file`.
    ///
    /// ```
    /// use spreadplan::scenario::{Scenario, ScenarioError};
    /// let text = "kind = \"seed\"\n[network]\nedges = \"e.csv\"\n[parameters]\nbudget = \"ten\"\nmodel = \"weighted_cascade\"\n";
    /// let err = Scenario::from_str_at(text, "s.toml".as_ref(), ".".as_ref()).unwrap_err();
    /// assert!(matches!(err, ScenarioError::Invalid { line: 5, .. }), "{err}");
    /// assert!(err.to_string().starts_with("s.toml:5: parameters.budget:"));
    /// ```
    pub fn from_str_at(text: &str, file: &Path, base: &Path) -> Result<Scenario, ScenarioError> {
        let name = file.display().to_string();
        let head: Head = {
            #[derive(Deserialize)]
            struct Loose {
                kind: Option<Kind>,
            }
            let loose: Loose = toml::from_str::<toml::Table>(text)
                .map_err(|e| invalid(&name, text, &e))
                .and_then(|t| {
                    let kind = t.get("kind").cloned();
                    let v = toml::Value::Table(
                        kind.map(|k| [("kind".to_owned(), k)].into_iter().collect())
                            .unwrap_or_default(),
                    );
                    v.try_into::<Loose>().map_err(|e| {
                        let at = text.find("kind").unwrap_or(0);
                        ScenarioError::Invalid {
                            file: name.clone(),
                            line: line_of(text, at),
                            key: "kind".into(),
                            msg: format!(
                                "{}; expected immunize, seed or threshold",
                                e.message().trim()
                            ),
                        }
                    })
                })?;
            let distribution = toml::from_str::<toml::Table>(text)
                .map(|t| t.contains_key("distribution"))
                .unwrap_or(false);
            match loose.kind {
                Some(kind) => Head { kind, distribution },
                None => {
                    return Err(ScenarioError::Invalid {
                        file: name,
                        line: 1,
                        key: "kind".into(),
                        msg: "missing; expected immunize, seed or threshold".into(),
                    })
                }
            }
        };
        let (name_field, kind, network, distribution, outputs, parameters) = match head.kind {
            Kind::Seed => {
                let f: File<crate::seed::SeedConfig> = parse(&name, text)?;
                (
                    f.name,
                    f.kind,
                    f.network,
                    f.distribution,
                    f.outputs,
                    Parameters::Seed(f.parameters),
                )
            }
            Kind::Immunize if head.distribution => {
                let f: File<crate::immunize::analytic::AnalyticConfig> = parse(&name, text)?;
                (
                    f.name,
                    f.kind,
                    f.network,
                    f.distribution,
                    f.outputs,
                    Parameters::ImmunizeDistribution(f.parameters),
                )
            }
            Kind::Immunize => {
                let f: File<crate::immunize::ImmunizeConfig> = parse(&name, text)?;
                (
                    f.name,
                    f.kind,
                    f.network,
                    f.distribution,
                    f.outputs,
                    Parameters::Immunize(f.parameters),
                )
            }
            Kind::Threshold => {
                let f: File<crate::percolation::ThresholdConfig> = parse(&name, text)?;
                (
                    f.name,
                    f.kind,
                    f.network,
                    f.distribution,
                    f.outputs,
                    Parameters::Threshold(f.parameters),
                )
            }
        };
        let line = |key: &str| text.find(key).map_or(0, |at| line_of(text, at));
        match (&network, &distribution) {
            (Some(_), Some(_)) => {
                return Err(ScenarioError::Invalid {
                    file: name,
                    line: line("[distribution]"),
                    key: "distribution".into(),
                    msg: "give either [network] or [distribution], not both".into(),
                })
            }
            (None, None) => {
                return Err(ScenarioError::Invalid {
                    file: name,
                    line: 0,
                    key: "network".into(),
                    msg: "missing: give [network] (edges = \"…\") or [distribution]".into(),
                })
            }
            _ => {}
        }
        if let Some(d) = &distribution {
            if d.table.is_some() == d.model.is_some() {
                return Err(ScenarioError::Invalid {
                    file: name,
                    line: line("[distribution]"),
                    key: "distribution".into(),
                    msg: "give exactly one of table = \"…\" or model = \"…\"".into(),
                });
            }
        }
        Ok(Scenario {
            file: file.to_owned(),
            base: base.to_owned(),
            source: text.to_owned(),
            name: name_field,
            kind,
            network,
            distribution,
            parameters,
            outputs,
        })
    }

    /// Parses a scenario from text, resolving relative paths against the
    /// current folder.
    pub fn parse_str(text: &str) -> Result<Scenario, ScenarioError> {
        Scenario::from_str_at(text, Path::new("<string>"), Path::new(""))
    }

    /// A path from the scenario, resolved against its folder.
    pub fn resolve(&self, p: &Path) -> PathBuf {
        if p.is_absolute() || self.base.as_os_str().is_empty() {
            p.to_owned()
        } else {
            self.base.join(p)
        }
    }

    /// The output folder the scenario names, resolved, if any.
    pub fn output_dir(&self) -> Option<PathBuf> {
        self.outputs.dir.as_deref().map(|d| self.resolve(d))
    }

    fn file_name(&self) -> String {
        self.file.display().to_string()
    }

    fn ranking_err(&self, e: impl std::fmt::Display) -> ScenarioError {
        ScenarioError::Ranking { file: self.file_name(), msg: e.to_string() }
    }

    fn unsupported(&self, msg: &str) -> ScenarioError {
        ScenarioError::Unsupported { file: self.file_name(), msg: msg.to_owned() }
    }

    /// Loads the network input with its node table.
    pub fn load_network(&self, merge: WeightMerge) -> Result<Loaded, ScenarioError> {
        let Some(n) = &self.network else {
            return Err(self.unsupported("this kind needs a [network] input"));
        };
        let opts =
            EdgeListOptions { directed: n.directed, weight_column: n.weight_column.clone(), merge };
        let mut loaded = load::load_edge_list(&self.resolve(&n.edges), &opts)?;
        if let Some(nodes) = &n.nodes {
            load::load_node_table(&self.resolve(nodes), &mut loaded)?;
        }
        Ok(loaded)
    }

    /// Runs the study the scenario describes and returns it (no files are
    /// written). The study records the scenario's name and content hash
    /// beside the ranking's own inputs and parameters.
    pub fn run(&self, progress: &dyn Progress) -> Result<Study, ScenarioError> {
        let mut study = match &self.parameters {
            Parameters::Seed(cfg) => {
                if self.distribution.is_some() {
                    return Err(self.unsupported(
                        "seeding from a [distribution] is not available in this build; use [network]",
                    ));
                }
                // Two records of one contact are two independent chances.
                let loaded = self.load_network(WeightMerge::NoisyOr)?;
                let exclude = match self.network.as_ref().and_then(|n| n.exclude.as_ref()) {
                    Some(p) => self.read_exclude(&self.resolve(p), &loaded)?,
                    None => Vec::new(),
                };
                let mut s = crate::seed::rank_seeds(&loaded, &exclude, cfg, progress)
                    .map_err(|e| self.ranking_err(e))?;
                add_degree_distribution(&mut s, &loaded);
                s
            }
            Parameters::Immunize(cfg) => {
                let loaded = self.load_network(WeightMerge::default())?;
                let mut s = crate::immunize::rank_network(&loaded, cfg, progress)
                    .map_err(|e| self.ranking_err(e))?;
                add_degree_distribution(&mut s, &loaded);
                s
            }
            Parameters::ImmunizeDistribution(cfg) => {
                let (dist, input) = self.load_distribution()?;
                let mut s = crate::immunize::analytic::rank_distribution(&dist, cfg)
                    .map_err(|e| self.ranking_err(e))?;
                for (k, v) in input {
                    s.input.entry(k).or_insert(v);
                }
                add_distribution_points(&mut s, &dist);
                s
            }
            Parameters::Threshold(cfg) => {
                if self.distribution.is_some() {
                    return Err(self.unsupported(
                        "kind = \"threshold\" needs a [network] input, not [distribution]",
                    ));
                }
                let loaded = self.load_network(WeightMerge::default())?;
                let mut s = crate::percolation::threshold_study(&loaded, cfg, progress)
                    .map_err(|e| self.ranking_err(e))?;
                add_degree_distribution(&mut s, &loaded);
                s
            }
        };
        let mut input = indexmap::IndexMap::new();
        input.insert("scenario".to_owned(), Value::from(self.file_name()));
        input.insert("scenario_hash".to_owned(), Value::from(fnv_hex(self.source.as_bytes())));
        input.extend(std::mem::take(&mut study.input));
        study.input = input;
        if let Some(n) = &self.name {
            study.parameters.insert("scenario".into(), Value::from(n.clone()));
        }
        Ok(study)
    }

    /// Reads the degree-distribution input; returns it with what to record
    /// in the study's inputs (path and content hash, or the model spec).
    pub fn load_distribution(
        &self,
    ) -> Result<(DegreeDistribution, Vec<(String, Value)>), ScenarioError> {
        let Some(d) = &self.distribution else {
            return Err(self.unsupported("this kind needs a [distribution] input"));
        };
        let bad = |e: crate::degree::DegreeError| self.ranking_err(e);
        match (&d.table, &d.model) {
            (Some(t), _) => {
                let path = self.resolve(t);
                let bytes = std::fs::read(&path)
                    .map_err(|source| LoadError::Io { path: path.clone(), source })?;
                let dist = DegreeDistribution::from_csv_path(&path).map_err(bad)?;
                Ok((
                    dist,
                    vec![
                        ("degrees".into(), Value::from(path.display().to_string())),
                        ("degrees_hash".into(), Value::from(fnv_hex(&bytes))),
                    ],
                ))
            }
            (None, Some(m)) => {
                let dist = DegreeDistribution::from_spec(m).map_err(bad)?;
                Ok((dist, vec![("degree_model".into(), Value::from(m.clone()))]))
            }
            (None, None) => Err(self.unsupported("[distribution] needs table or model")),
        }
    }

    fn read_exclude(&self, path: &Path, loaded: &Loaded) -> Result<Vec<u32>, ScenarioError> {
        let text = std::fs::read_to_string(path)
            .map_err(|source| LoadError::Io { path: path.to_owned(), source })?;
        let mut out = Vec::new();
        for (i, l) in text.lines().enumerate() {
            let id = l.trim().split([',', '\t', ' ']).next().unwrap_or("");
            if id.is_empty() || id.starts_with('#') || (i == 0 && id == "id") {
                continue;
            }
            match loaded.nodes.index(id) {
                Some(v) => out.push(v),
                None => {
                    return Err(LoadError::Parse {
                        path: path.to_owned(),
                        line: i as u64 + 1,
                        msg: format!("id {id:?} is not in the network"),
                    }
                    .into())
                }
            }
        }
        out.sort_unstable();
        out.dedup();
        Ok(out)
    }
}

/// FNV-1a 64-bit hash as 16 hex digits (the loader's content hash).
fn fnv_hex(bytes: &[u8]) -> String {
    let mut h = load::Fnv::default();
    h.write(bytes);
    format!("{:016x}", h.0)
}

/// Adds the distribution's `(degree, probability)` points to
/// `study.extra["degree_distribution"]` (as parallel `degree` and
/// `probability` arrays) so the report can draw it.
pub fn add_distribution_points(study: &mut Study, dist: &DegreeDistribution) {
    let degree = Value::from(dist.support().to_vec());
    let probability = Value::from(dist.probabilities().to_vec());
    match study.extra.get_mut("degree_distribution") {
        Some(Value::Object(o)) => {
            o.entry("degree").or_insert(degree);
            o.entry("probability").or_insert(probability);
        }
        Some(_) => {}
        None => {
            let mut o = serde_json::Map::new();
            o.insert("degree".into(), degree);
            o.insert("probability".into(), probability);
            study.extra.insert("degree_distribution".into(), Value::Object(o));
        }
    }
}

/// Adds the network's degree counts to `study.extra["degree_distribution"]`
/// (rows `{degree, count}`) unless the ranking already put one there.
pub fn add_degree_distribution(study: &mut Study, loaded: &Loaded) {
    if study.extra.contains_key("degree_distribution") {
        return;
    }
    let net = &loaded.network;
    let mut counts: Vec<u64> = Vec::new();
    for v in 0..net.node_count() as u32 {
        let d = net.degree(v);
        if counts.len() <= d {
            counts.resize(d + 1, 0);
        }
        counts[d] += 1;
    }
    let rows: Vec<Value> = counts
        .iter()
        .enumerate()
        .filter(|(_, c)| **c > 0)
        .map(|(k, c)| serde_json::json!({"degree": k, "count": c}))
        .collect();
    study.extra.insert("degree_distribution".into(), Value::Array(rows));
}

#[cfg(test)]
mod tests {
    use super::*;

    fn err(text: &str) -> ScenarioError {
        Scenario::from_str_at(text, Path::new("s.toml"), Path::new(".")).unwrap_err()
    }

    #[test]
    fn unknown_key_names_key_and_line() {
        let e = err("kind = \"seed\"\n[network]\nedges = \"e.csv\"\n[parameters]\nbudget = 3\nmodel = \"weighted_cascade\"\nbudgett = 4\n");
        let s = e.to_string();
        assert!(s.starts_with("s.toml:7: parameters.budgett:"), "{s}");
    }

    #[test]
    fn missing_field_is_named() {
        let e = err("kind = \"seed\"\n[network]\nedges = \"e.csv\"\n[parameters]\nbudget = 3\n");
        let s = e.to_string();
        assert!(s.contains("parameters.model"), "{s}");
    }

    #[test]
    fn bad_kind_and_missing_input() {
        assert!(err("kind = \"vaccinate\"\n").to_string().starts_with("s.toml:1: kind:"));
        assert!(err("x = 1\n").to_string().contains("kind"));
        let s = err("kind = \"seed\"\n[parameters]\nbudget = 3\nmodel = \"weighted_cascade\"\n")
            .to_string();
        assert!(s.contains("network"), "{s}");
    }

    #[test]
    fn paths_resolve_against_the_file() {
        let sc = Scenario::from_str_at(
            "kind = \"seed\"\n[network]\nedges = \"e.csv\"\n[parameters]\nbudget = 3\nmodel = { uniform = { p = 0.1 } }\n[outputs]\ndir = \"out\"\n",
            Path::new("d/s.toml"),
            Path::new("d"),
        )
        .unwrap();
        assert_eq!(sc.output_dir(), Some(PathBuf::from("d/out")));
        assert_eq!(sc.resolve(Path::new("e.csv")), PathBuf::from("d/e.csv"));
        assert!(matches!(sc.parameters, Parameters::Seed(ref c) if c.budget == 3));
    }

    #[test]
    fn threshold_parameters_parse_with_defaults() {
        let sc = Scenario::from_str_at(
            "kind = \"threshold\"\n[network]\nedges = \"e.csv\"\n[parameters]\nsite = true\npoints = 5\n",
            Path::new("s.toml"),
            Path::new("."),
        )
        .unwrap();
        let Parameters::Threshold(c) = &sc.parameters else { panic!("{:?}", sc.parameters) };
        assert!(c.site);
        assert_eq!((c.points, c.runs), (5, 100));
        let s = err(
            "kind = \"threshold\"\n[network]\nedges = \"e.csv\"\n[parameters]\npoints = \"many\"\n",
        )
        .to_string();
        assert!(s.starts_with("s.toml:5: parameters.points:"), "{s}");
    }
}
