//! JSON rendering of a [`Study`]: one object, keys as in the design
//! (`tool`, `version`, `command`, `input`, `parameters`, `baseline`,
//! `rules`, …, `cautions`).

use crate::outcome::Study;

/// The study as pretty-printed JSON with a final newline.
///
/// ```
/// let s = spreadplan::outcome::Study::new("inspect");
/// let j = spreadplan::report::json::to_string(&s);
/// assert!(j.starts_with("{\n  \"tool\": \"spreadplan\""));
/// ```
pub fn to_string(study: &Study) -> String {
    let mut s =
        serde_json::to_string_pretty(study).unwrap_or_else(|e| format!("{{\"error\":\"{e}\"}}"));
    s.push('\n');
    s
}
