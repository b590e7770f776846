//! The terminal ranking table of a [`Study`], with its notes and cautions.

use crate::outcome::{Metric, Study};

/// Formats a metric for a table cell: estimates as `mean [low, high]`.
pub fn cell(m: &Metric) -> String {
    let f = |x: f64| {
        if x.is_nan() {
            "–".to_owned()
        } else if x != 0.0 && (x.abs() >= 1e5 || x.abs() < 1e-3) {
            format!("{x:.3e}")
        } else if x.fract() == 0.0 && x.abs() < 1e5 {
            format!("{x:.0}")
        } else {
            format!("{x:.4}")
        }
    };
    match m {
        Metric::Estimate(e) => format!("{} [{}, {}]", f(e.mean), f(e.ci_low), f(e.ci_high)),
        Metric::Number(x) => f(*x),
        Metric::Count(c) => c.to_string(),
        Metric::Flag(b) => if *b { "yes" } else { "no" }.to_owned(),
        Metric::Text(t) => t.clone(),
        Metric::Missing => "–".to_owned(),
    }
}

/// Aligns rows of cells into columns separated by two spaces.
pub fn align(rows: &[Vec<String>]) -> String {
    let cols = rows.iter().map(Vec::len).max().unwrap_or(0);
    let mut width = vec![0usize; cols];
    for r in rows {
        for (i, c) in r.iter().enumerate() {
            width[i] = width[i].max(c.chars().count());
        }
    }
    let mut out = String::new();
    for r in rows {
        let mut line = String::new();
        for (i, c) in r.iter().enumerate() {
            line.push_str(c);
            if i + 1 < r.len() {
                line.push_str(&" ".repeat(width[i] - c.chars().count() + 2));
            }
        }
        out.push_str(line.trim_end());
        out.push('\n');
    }
    out
}

/// The ranking as a text table: rank, rule, doses, information, then each
/// metric; followed by notes and cautions.
pub fn render(study: &Study) -> String {
    let mut names: Vec<&str> = Vec::new();
    for r in &study.rules {
        for (k, _) in &r.metrics {
            if !names.contains(&k.as_str()) {
                names.push(k);
            }
        }
    }
    let mut rows = vec![{
        let mut h = vec!["rank".to_owned(), "rule".into(), "doses".into(), "needs".into()];
        h.extend(names.iter().map(|s| s.to_string()));
        h
    }];
    for r in &study.rules {
        let mut row = vec![
            r.rank.to_string(),
            r.rule.clone(),
            cell(&Metric::Number(r.doses)),
            r.information.clone(),
        ];
        row.extend(names.iter().map(|n| r.metrics.get(*n).map_or("–".to_owned(), cell)));
        rows.push(row);
    }
    let mut out = String::new();
    if !study.baseline.is_empty() {
        out.push_str("baseline (no intervention):");
        for (k, v) in &study.baseline {
            out.push_str(&format!(" {k} {}", cell(v)));
            out.push(';');
        }
        out.pop();
        out.push('\n');
    }
    if !study.rules.is_empty() {
        out.push_str(&align(&rows));
    }
    for n in &study.notes {
        out.push_str(&format!("note: {n}\n"));
    }
    for c in &study.cautions {
        out.push_str(&format!("caution: {c}\n"));
    }
    out
}
