//! CSV renderings of a [`Study`]: `ranking.csv` (one row per rule),
//! `curves.csv` (rule, budget, metric, mean, ci_low, ci_high) and
//! `allocation.csv` (rule, order, id, group, doses).

use crate::outcome::{Metric, Study};

/// Quotes a CSV field when needed (RFC 4180).
pub fn field(s: &str) -> String {
    if s.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s.to_owned()
    }
}

/// Formats a number for CSV: shortest round-trip form, empty for NaN.
pub fn num(x: f64) -> String {
    if x.is_nan() {
        String::new()
    } else {
        format!("{x}")
    }
}

/// One row per rule: rank, rule, doses, information, then each metric
/// (estimates as `_mean`, `_ci_low`, `_ci_high` columns).
pub fn ranking(study: &Study) -> String {
    let mut names: Vec<&str> = Vec::new();
    for r in &study.rules {
        for (k, _) in &r.metrics {
            if !names.contains(&k.as_str()) {
                names.push(k);
            }
        }
    }
    let estimate_cols = |name: &str| {
        study.rules.iter().any(|r| matches!(r.metrics.get(name), Some(Metric::Estimate(_))))
    };
    let mut out = String::from("rank,rule,doses,information");
    for n in &names {
        if estimate_cols(n) {
            out.push_str(&format!(",{n}_mean,{n}_ci_low,{n}_ci_high"));
        } else {
            out.push_str(&format!(",{n}"));
        }
    }
    out.push('\n');
    for r in &study.rules {
        out.push_str(&format!(
            "{},{},{},{}",
            r.rank,
            field(&r.rule),
            num(r.doses),
            field(&r.information)
        ));
        for n in &names {
            let est = estimate_cols(n);
            match r.metrics.get(*n) {
                Some(Metric::Estimate(e)) => {
                    out.push_str(&format!(",{},{},{}", num(e.mean), num(e.ci_low), num(e.ci_high)))
                }
                Some(m) => {
                    let v = metric_text(m);
                    if est {
                        out.push_str(&format!(",{v},{v},{v}"));
                    } else {
                        out.push_str(&format!(",{v}"));
                    }
                }
                None => out.push_str(if est { ",,," } else { "," }),
            }
        }
        out.push('\n');
    }
    out
}

fn metric_text(m: &Metric) -> String {
    match m {
        Metric::Estimate(e) => num(e.mean),
        Metric::Number(x) => num(*x),
        Metric::Count(c) => c.to_string(),
        Metric::Flag(b) => b.to_string(),
        Metric::Text(t) => field(t),
        Metric::Missing => String::new(),
    }
}

/// `rule,budget,metric,mean,ci_low,ci_high`, one row per curve point.
pub fn curves(study: &Study) -> String {
    let mut out = String::from("rule,budget,metric,mean,ci_low,ci_high\n");
    for p in &study.curves {
        out.push_str(&format!(
            "{},{},{},{},{},{}\n",
            field(&p.rule),
            num(p.budget),
            field(&p.metric),
            num(p.mean),
            num(p.ci_low),
            num(p.ci_high)
        ));
    }
    out
}

/// `rule,order,id,group,doses`, one row per person (or class) given a dose or seed.
pub fn allocation(study: &Study) -> String {
    let mut out = String::from("rule,order,id,group,doses\n");
    for a in &study.allocation {
        out.push_str(&format!(
            "{},{},{},{},{}\n",
            field(&a.rule),
            a.order,
            field(&a.id),
            field(a.group.as_deref().unwrap_or("")),
            num(a.doses)
        ));
    }
    out
}
