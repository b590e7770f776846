//! `spreadplan demo [--out DIR]`: runs the bundled demo scenarios (invented
//! places and data, made by `examples/make_demo_data.rs`) and prints where
//! their reports are. The inputs are embedded in the binary, so the demo
//! works from any folder; they are written beside the reports so that
//! `spreadplan run DIR/inputs/<name>.toml` reproduces each study.

use std::path::{Path, PathBuf};

use super::Format;

/// Arguments of `spreadplan demo`.
#[derive(Debug, clap::Args)]
pub(crate) struct Args {
    /// Folder for the demo inputs and reports
    #[arg(long, default_value = "spreadplan-demo")]
    pub(crate) out: PathBuf,
    /// Output format of the rankings on stdout
    #[arg(long, value_enum, default_value_t = Format::Table)]
    pub(crate) format: Format,
    /// No progress bars or notes on stderr
    #[arg(long)]
    pub(crate) quiet: bool,
    /// Worker threads (default: all cores); results do not depend on it
    #[arg(long)]
    pub(crate) threads: Option<usize>,
}

macro_rules! bundled {
    ($($name:literal),* $(,)?) => {
        &[$(($name, include_bytes!(concat!(env!("CARGO_MANIFEST_DIR"), "/demo-data/", $name)) as &[u8])),*]
    };
}

/// The demo inputs, by path under `demo-data/`.
const FILES: &[(&str, &[u8])] = bundled!(
    "marrowby.toml",
    "marrowby/contacts.csv.gz",
    "marrowby/people.csv",
    "pebblepost.toml",
    "pebblepost/friends.csv.gz",
    "harrowgate.toml",
    "harrowgate-survey.csv",
);

/// The scenarios, in the order they run, with a one-line description.
const SCENARIOS: &[(&str, &str)] = &[
    (
        "marrowby",
        "Marrowby, a fictional town: who gets 300 doses (immunization on a contact network)",
    ),
    ("pebblepost", "Pebblepost, a fictional community app: whom to invite first (seeding)"),
    ("harrowgate", "Harrowgate, a fictional contact survey: allocation without a contact map"),
];

fn write_inputs(dir: &Path) -> anyhow::Result<()> {
    for (name, bytes) in FILES {
        spreadplan::report::write_atomic(&dir.join(name), bytes)?;
    }
    Ok(())
}

pub(crate) fn run(args: Args) -> anyhow::Result<()> {
    super::init_threads(args.threads)?;
    let inputs = args.out.join("inputs");
    write_inputs(&inputs)?;
    let mut done = Vec::new();
    for (name, what) in SCENARIOS {
        println!("== {what}");
        let scenario = inputs.join(format!("{name}.toml"));
        let out = args.out.join(name);
        match super::run::run_file(&scenario, Some(out.clone()), args.format, args.quiet) {
            Ok(_) => done.push((name, out.join("report.html"))),
            Err(e) => match e.downcast_ref::<spreadplan::scenario::ScenarioError>() {
                Some(spreadplan::scenario::ScenarioError::Unsupported { msg, .. }) => {
                    println!("skipped: {msg}");
                }
                _ => return Err(e.context(format!("demo scenario {name}"))),
            },
        }
        println!();
    }
    println!("reports:");
    for (name, report) in &done {
        println!("  {name:<11} {}", report.display());
    }
    println!("re-run any of them with: spreadplan run {}", inputs.join("<name>.toml").display());
    Ok(())
}
