//! Rendering a [`Study`]: terminal table ([`table`]), CSV ([`csv`]), JSON
//! ([`json`]), SVG charts and a self-contained HTML report. The only module
//! besides `network::load` that writes files; it reads outcomes and never
//! computes new numbers.

pub mod csv;
pub mod html;
pub mod json;
pub mod svg;
pub mod table;

use std::io::Write;
use std::path::{Path, PathBuf};

use crate::outcome::Study;

/// Why report files could not be written.
#[derive(Debug, thiserror::Error)]
pub enum ReportError {
    /// A file could not be written.
    #[error("{path}: {source}")]
    Io {
        /// The file.
        path: PathBuf,
        /// The cause.
        source: std::io::Error,
    },
}

/// Writes `bytes` to `path` through a temporary file in the same folder and
/// a rename, so a reader never sees a partial file.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<(), ReportError> {
    let io = |source| ReportError::Io { path: path.to_owned(), source };
    let dir = path.parent().filter(|p| !p.as_os_str().is_empty()).unwrap_or(Path::new("."));
    std::fs::create_dir_all(dir).map_err(io)?;
    let name = path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
    let tmp = dir.join(format!(".{name}.tmp{}", std::process::id()));
    let mut f = std::fs::File::create(&tmp).map_err(io)?;
    f.write_all(bytes).and_then(|_| f.sync_all()).map_err(io)?;
    drop(f);
    std::fs::rename(&tmp, path).map_err(io)
}

/// Writes `ranking.csv`, `curves.csv`, `allocation.csv`, `summary.json`
/// and `report.html` into `dir` (created if missing), each atomically;
/// returns the paths written.
pub fn write_outputs(dir: &Path, study: &Study) -> Result<Vec<PathBuf>, ReportError> {
    let files: [(&str, String); 5] = [
        ("ranking.csv", csv::ranking(study)),
        ("curves.csv", csv::curves(study)),
        ("allocation.csv", csv::allocation(study)),
        ("summary.json", json::to_string(study)),
        ("report.html", html::render(study)),
    ];
    let mut written = Vec::new();
    for (name, text) in files {
        let p = dir.join(name);
        write_atomic(&p, text.as_bytes())?;
        written.push(p);
    }
    Ok(written)
}
