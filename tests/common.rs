//! Helpers shared by the integration tests.
#![allow(dead_code)]

use std::path::PathBuf;
use std::process::{Command, Output};

/// Runs the spreadplan binary with `args`.
pub(crate) fn spreadplan(args: &[&str]) -> Output {
    Command::new(env!("CARGO_BIN_EXE_spreadplan")).args(args).output().expect("binary runs")
}

/// A fresh temporary folder under the target directory.
pub(crate) fn tempdir(name: &str) -> PathBuf {
    let d =
        PathBuf::from(env!("CARGO_TARGET_TMPDIR")).join(format!("{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&d);
    std::fs::create_dir_all(&d).unwrap();
    d
}

/// Path of a fixture in `tests/data/`.
pub(crate) fn data(name: &str) -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("tests/data").join(name)
}

/// Whether the slow, large-network checks should run.
pub(crate) fn slow() -> bool {
    std::env::var_os("SPREADPLAN_SLOW").is_some()
}
