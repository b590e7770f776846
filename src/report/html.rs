//! The self-contained HTML report of a [`Study`]: one file with inline CSS
//! and inline SVG charts ([`super::svg`]), no scripts, fonts or links to
//! fetch. Owns the page layout and the escaping of every user string; the
//! numbers come from the study unchanged (table cells carry the exact
//! values in `data-*` attributes beside their rounded text).

use serde_json::Value;

use super::svg;
use super::table::cell;
use crate::outcome::{Metric, Study};

/// Escapes text for HTML element content and quoted attribute values.
///
/// ```
/// assert_eq!(spreadplan::report::html::escape("<a href=\"x\">&'"),
///            "&lt;a href=&quot;x&quot;&gt;&amp;&#39;");
/// ```
pub fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            c => out.push(c),
        }
    }
    out
}

/// Exact number for a `data-*` attribute (shortest round-trip form).
fn exact(x: f64) -> String {
    if x.is_finite() {
        format!("{x}")
    } else {
        String::new()
    }
}

/// A JSON value as short text for a parameter table.
fn value_text(v: &Value) -> String {
    match v {
        Value::String(s) => s.clone(),
        Value::Null => "–".into(),
        other => {
            let s = other.to_string();
            if s.chars().count() > 400 {
                let cut: String = s.chars().take(400).collect();
                format!("{cut}…")
            } else {
                s
            }
        }
    }
}

const STYLE: &str = "\
:root{--ink:#222;--muted:#5a5a5a;--rule:#d9d9d9;--band:#f4f6f8;--accent:#0072B2;--warn:#D55E00}
*{box-sizing:border-box}
body{margin:0;color:var(--ink);background:#fff;font:15px/1.5 system-ui,-apple-system,'Segoe UI',Roboto,Helvetica,Arial,sans-serif}
main{max-width:1180px;margin:0 auto;padding:24px 28px 48px}
header{border-bottom:4px solid var(--accent);padding-bottom:10px;margin-bottom:18px}
h1{font-size:26px;margin:0 0 4px}
h2{font-size:19px;margin:30px 0 10px;padding-bottom:4px;border-bottom:1px solid var(--rule)}
h3{font-size:16px;margin:18px 0 6px}
.sub{color:var(--muted);margin:0}
.question{font-size:17px;background:var(--band);padding:12px 16px;border-left:4px solid var(--accent)}
.caution{border:2px solid var(--warn);background:#fff7f1;padding:10px 16px;margin:16px 0}
.caution h2{border:0;margin:4px 0;font-size:16px;color:var(--warn)}
table{border-collapse:collapse;margin:8px 0 14px;font-size:14px;font-variant-numeric:tabular-nums}
th,td{padding:4px 8px;border-bottom:1px solid var(--rule);text-align:left;vertical-align:top}
th{background:var(--band);font-weight:600}
td.num{text-align:right;white-space:nowrap}
tr.best td{font-weight:600}
.kv td:first-child{color:var(--muted);white-space:nowrap}
.kv td{font-family:ui-monospace,SFMono-Regular,Menlo,Consolas,monospace;font-size:13px;word-break:break-all}
.scroll{overflow-x:auto}
figure{margin:18px 0;padding:8px;border:1px solid var(--rule);border-radius:6px}
figure svg{max-width:100%;height:auto;display:block}
figcaption{color:var(--muted);font-size:13px;padding:4px 6px}
.key{display:inline-block;width:12px;height:12px;border-radius:2px;margin-right:6px;vertical-align:-1px}
pre{background:var(--band);padding:10px;overflow-x:auto;font-size:12px;max-height:320px}
footer{margin-top:36px;color:var(--muted);font-size:13px;border-top:1px solid var(--rule);padding-top:8px}
";

/// The plain-language question a study answers, from its command and
/// parameters.
pub fn question(study: &Study) -> String {
    let p = |k: &str| study.parameters.get(k).map(value_text);
    let budget = p("budget").unwrap_or_else(|| "the given".into());
    match study.command.as_str() {
        "immunize" => {
            let t = p("transmissibility")
                .map(|t| format!(" at transmissibility {t}"))
                .unwrap_or_default();
            let obj = p("objective").unwrap_or_else(|| "mean_outbreak_fraction".into());
            format!(
                "With a budget of {budget} doses{t}, which vaccination rule keeps spread smallest \
                 (ranked by {obj}), how far below the epidemic threshold does each rule get, and \
                 how many doses would each need to contain spread?"
            )
        }
        "seed" => format!(
            "With {budget} seeds, which seeding rule reaches the most people by word of mouth, \
             and how close is it to the best any seed set of that size could do?"
        ),
        "threshold" => {
            "At which transmissibility does this network start to carry large outbreaks?".into()
        }
        other => format!("What does `{other}` find for these inputs?"),
    }
}

fn kv_table(out: &mut String, rows: &[(String, String)]) {
    out.push_str("<table class=\"kv\"><tbody>\n");
    for (k, v) in rows {
        out.push_str(&format!("<tr><td>{}</td><td>{}</td></tr>\n", escape(k), escape(v)));
    }
    out.push_str("</tbody></table>\n");
}

/// Scalar rule fields shown as table columns when they are not already
/// among the metrics.
const EXTRA_COLUMNS: [&str; 3] = ["doses_to_contain", "expected_reach", "upper_bound"];

/// The columns of the ranking table: `(name, from_extra)`.
pub fn ranking_columns(study: &Study) -> Vec<(String, bool)> {
    let mut cols: Vec<(String, bool)> = Vec::new();
    for r in &study.rules {
        for k in r.metrics.keys() {
            if !cols.iter().any(|c| &c.0 == k) {
                cols.push((k.clone(), false));
            }
        }
    }
    for name in EXTRA_COLUMNS {
        if cols.iter().any(|c| c.0 == name) {
            continue;
        }
        let scalar = study.rules.iter().any(|r| {
            matches!(
                r.extra.get(name),
                Some(Value::Number(_) | Value::Object(_) | Value::String(_))
            )
        });
        if scalar {
            cols.push((name.to_owned(), true));
        }
    }
    cols
}

fn metric_cell(out: &mut String, rule: &str, name: &str, m: Option<&Metric>, path: &str) {
    let attrs = match m {
        Some(Metric::Estimate(e)) => format!(
            " data-mean=\"{}\" data-ci-low=\"{}\" data-ci-high=\"{}\"",
            exact(e.mean),
            exact(e.ci_low),
            exact(e.ci_high)
        ),
        Some(Metric::Number(x)) => format!(" data-value=\"{}\"", exact(*x)),
        Some(Metric::Count(c)) => format!(" data-value=\"{c}\""),
        Some(Metric::Flag(b)) => format!(" data-flag=\"{b}\""),
        _ => String::new(),
    };
    let text = m.map_or("–".to_owned(), cell);
    let json = match m {
        Some(Metric::Missing) | None => String::new(),
        Some(_) => format!(" data-json=\"{}\"", escape(path)),
    };
    out.push_str(&format!(
        "<td class=\"num\" data-rule=\"{}\" data-metric=\"{}\"{json}{attrs}>{}</td>",
        escape(rule),
        escape(name),
        escape(&text)
    ));
}

fn ranking_table(out: &mut String, study: &Study) {
    let cols = ranking_columns(study);
    let names = svg::rule_colours(study);
    out.push_str("<div class=\"scroll\"><table id=\"ranking-table\"><thead><tr><th>rank</th><th>rule</th><th>doses</th><th>needs</th>");
    for (c, _) in &cols {
        out.push_str(&format!("<th>{}</th>", escape(c)));
    }
    out.push_str("</tr></thead><tbody>\n");
    for (i, r) in study.rules.iter().enumerate() {
        let colour = names.iter().position(|n| n == &r.rule).unwrap_or(0);
        out.push_str(&format!(
            "<tr{}><td class=\"num\" data-json=\"rules[{i}].rank\" data-value=\"{}\">{}</td><td><span class=\"key\" style=\"background:{}\"></span>{}</td>",
            if r.rank == 1 { " class=\"best\"" } else { "" },
            r.rank,
            r.rank,
            svg::css_colour(colour),
            escape(&r.rule)
        ));
        metric_cell(
            out,
            &r.rule,
            "doses",
            Some(&Metric::Number(r.doses)),
            &format!("rules[{i}].doses"),
        );
        out.push_str(&format!("<td>{}</td>", escape(&r.information)));
        for (c, from_extra) in &cols {
            if *from_extra {
                let m = svg::rule_value(r, c);
                metric_cell(out, &r.rule, c, m.as_ref(), &format!("rules[{i}].{c}"));
            } else {
                metric_cell(out, &r.rule, c, r.metrics.get(c), &format!("rules[{i}].metrics.{c}"));
            }
        }
        out.push_str("</tr>\n");
    }
    out.push_str("</tbody></table></div>\n");
}

fn allocation_summary(out: &mut String, study: &Study) {
    if study.allocation.is_empty() {
        return;
    }
    let what = if study.command == "seed" { "seeds" } else { "doses" };
    out.push_str(&format!("<section id=\"allocation\"><h2>Allocation by group</h2>\n<p>Who receives the {what} under each rule (the full list with external ids is in <code>allocation.csv</code>).</p>\n"));
    let mut rules: Vec<&str> = Vec::new();
    let mut groups: Vec<&str> = Vec::new();
    for a in &study.allocation {
        if !rules.contains(&a.rule.as_str()) {
            rules.push(&a.rule);
        }
        let g = a.group.as_deref().unwrap_or("");
        if !groups.contains(&g) {
            groups.push(g);
        }
    }
    let grouped = groups.iter().any(|g| !g.is_empty());
    out.push_str("<div class=\"scroll\"><table id=\"allocation-table\"><thead><tr><th>rule</th>");
    if grouped {
        for g in &groups {
            out.push_str(&format!(
                "<th>{}</th>",
                escape(if g.is_empty() { "(no group)" } else { g })
            ));
        }
    }
    out.push_str(&format!(
        "<th>total {what}</th><th>entries</th><th>first in order</th></tr></thead><tbody>\n"
    ));
    for r in &rules {
        let rows: Vec<_> = study.allocation.iter().filter(|a| a.rule == *r).collect();
        out.push_str(&format!("<tr><td>{}</td>", escape(r)));
        if grouped {
            for g in &groups {
                let s: f64 = rows
                    .iter()
                    .filter(|a| a.group.as_deref().unwrap_or("") == *g)
                    .map(|a| a.doses)
                    .sum();
                out.push_str(&format!(
                    "<td class=\"num\" data-value=\"{}\">{}</td>",
                    exact(s),
                    escape(&cell(&Metric::Number(s)))
                ));
            }
        }
        let total: f64 = rows.iter().map(|a| a.doses).sum();
        let mut first: Vec<String> = rows.iter().take(10).map(|a| a.id.clone()).collect();
        if rows.len() > 10 {
            first.push("…".into());
        }
        out.push_str(&format!(
            "<td class=\"num\" data-value=\"{}\">{}</td><td class=\"num\">{}</td><td>{}</td></tr>\n",
            exact(total),
            escape(&cell(&Metric::Number(total))),
            rows.len(),
            escape(&first.join(", "))
        ));
    }
    out.push_str("</tbody></table></div></section>\n");
}

/// The whole report page.
///
/// ```
/// let mut s = spreadplan::outcome::Study::new("immunize");
/// s.notes.push("a <note>".into());
/// let page = spreadplan::report::html::render(&s);
/// assert!(page.starts_with("<!DOCTYPE html>") && page.contains("a &lt;note&gt;"));
/// ```
pub fn render(study: &Study) -> String {
    let mut o = String::with_capacity(64 * 1024);
    let title = format!("spreadplan {} report", study.command);
    o.push_str("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n");
    o.push_str("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n");
    o.push_str(&format!(
        "<title>{}</title>\n<style>\n{STYLE}</style>\n</head>\n<body>\n<main>\n",
        escape(&title)
    ));
    let name =
        study.parameters.get("scenario").or_else(|| study.input.get("scenario")).map(value_text);
    o.push_str(&format!(
        "<header><h1>{}</h1><p class=\"sub\">{} {} · command <code>{}</code>{}</p></header>\n",
        escape(&title),
        escape(&study.tool),
        escape(&study.version),
        escape(&study.command),
        name.map(|n| format!(" · scenario {}", escape(&n))).unwrap_or_default()
    ));
    o.push_str(&format!(
        "<section id=\"question\"><h2>The question</h2><p class=\"question\">{}</p>\n",
        escape(&question(study))
    ));
    if let Some(seed) = study.parameters.get("seed") {
        o.push_str(&format!(
            "<p>Master seed <code id=\"seed\">{}</code>: the same inputs, parameters and seed reproduce every number in this report.</p>\n",
            escape(&value_text(seed))
        ));
    }
    o.push_str("<h3>Inputs</h3>\n");
    let inputs: Vec<(String, String)> =
        study.input.iter().map(|(k, v)| (k.clone(), value_text(v))).collect();
    if inputs.is_empty() {
        o.push_str("<p>–</p>\n");
    } else {
        kv_table(&mut o, &inputs);
    }
    o.push_str("<h3>Parameters</h3>\n");
    let params: Vec<(String, String)> =
        study.parameters.iter().map(|(k, v)| (k.clone(), value_text(v))).collect();
    if params.is_empty() {
        o.push_str("<p>–</p>\n");
    } else {
        kv_table(&mut o, &params);
    }
    o.push_str("</section>\n");
    if !study.cautions.is_empty() {
        o.push_str("<section class=\"caution\" id=\"cautions\"><h2>Caution</h2>\n");
        for c in &study.cautions {
            o.push_str(&format!("<p>{}</p>\n", escape(c)));
        }
        o.push_str("</section>\n");
    }
    o.push_str("<section id=\"ranking\"><h2>Ranking</h2>\n");
    if !study.baseline.is_empty() {
        o.push_str("<p id=\"baseline\">No intervention: ");
        let parts: Vec<String> = study
            .baseline
            .iter()
            .map(|(k, v)| format!("{} {}", escape(k), escape(&cell(v))))
            .collect();
        o.push_str(&parts.join("; "));
        o.push_str(".</p>\n");
    }
    if study.rules.is_empty() {
        o.push_str("<p>No rules were ranked.</p>\n");
    } else {
        o.push_str("<p>Rank 1 is best by the study's objective. Estimates read <em>mean [95% interval]</em>.</p>\n");
        ranking_table(&mut o, study);
    }
    o.push_str("</section>\n");
    let charts = svg::study_charts(study);
    if !charts.is_empty() {
        o.push_str("<section id=\"charts\"><h2>Charts</h2>\n");
        for c in &charts {
            o.push_str(&format!(
                "<figure id=\"{}\">\n{}\n<figcaption>{}</figcaption></figure>\n",
                escape(&c.id),
                c.svg,
                escape(&c.caption)
            ));
        }
        o.push_str("</section>\n");
    }
    allocation_summary(&mut o, study);
    let extras: Vec<_> =
        study.extra.iter().filter(|(k, _)| k.as_str() != "degree_distribution").collect();
    if !extras.is_empty() {
        o.push_str("<section id=\"details\"><h2>Details</h2>\n");
        let mut scalars = Vec::new();
        for (k, v) in &extras {
            match v {
                Value::Array(_) | Value::Object(_) => {
                    let mut text = serde_json::to_string_pretty(v).unwrap_or_default();
                    if text.len() > 20_000 {
                        let cut: String = text.chars().take(20_000).collect();
                        text = format!("{cut}\n… (the whole section is in summary.json)");
                    }
                    o.push_str(&format!("<h3>{}</h3><pre>{}</pre>\n", escape(k), escape(&text)));
                }
                other => scalars.push(((*k).clone(), value_text(other))),
            }
        }
        if !scalars.is_empty() {
            kv_table(&mut o, &scalars);
        }
        o.push_str("</section>\n");
    }
    if !study.notes.is_empty() {
        o.push_str("<section id=\"assumptions\"><h2>Assumptions and method notes</h2><ul>\n");
        for n in &study.notes {
            o.push_str(&format!("<li>{}</li>\n", escape(n)));
        }
        o.push_str("</ul></section>\n");
    }
    o.push_str(&format!(
        "<footer>Written by {} {}. Machine-readable results: <code>summary.json</code>, <code>ranking.csv</code>, <code>curves.csv</code>, <code>allocation.csv</code> beside this file.</footer>\n",
        escape(&study.tool),
        escape(&study.version)
    ));
    o.push_str("</main>\n</body>\n</html>\n");
    o
}
