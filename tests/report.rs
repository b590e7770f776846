//! Integration tests: report. The studies here are hand-built (invented
//! numbers, never expected values of a method): the checks are about
//! structure — the files written, self-containment, escaping, that every
//! number shown in the HTML ranking table equals the JSON it came from,
//! byte-identical rewrites, and that a browser renders the charts.

use serde_json::Value;
use spreadplan::outcome::{AllocationRow, CurvePoint, Metric, RuleOutcome, Study};
use spreadplan::report;
use spreadplan::stats::Estimate;

use crate::common::tempdir;

fn est(mean: f64, lo: f64, hi: f64) -> Metric {
    Metric::Estimate(Estimate { mean, ci_low: lo, ci_high: hi })
}

/// A hand-built immunization study shaped like the ranking's output.
pub(crate) fn immunize_study() -> Study {
    let mut s = Study::new("immunize");
    s.input.insert("network".into(), "town <&> edges.csv".into());
    s.input.insert("network_sha256".into(), "abc123".into());
    s.parameters.insert("budget".into(), 40.into());
    s.parameters.insert("transmissibility".into(), 0.3.into());
    s.parameters.insert("runs".into(), 50.into());
    s.parameters.insert("seed".into(), 7.into());
    s.baseline.insert("giant_fraction".into(), est(0.61, 0.6, 0.62));
    s.baseline.insert("r_eff".into(), Metric::Number(2.4));
    let rules = [("corehd", 0.0123456, 0.83), ("degree", 0.05, 0.97), ("ran<dom>", 0.4, 1.7)];
    for (i, (name, g, r)) in rules.iter().enumerate() {
        let mut o = RuleOutcome {
            rule: (*name).into(),
            rank: i as u32 + 1,
            doses: 40.0,
            information: if i == 2 { "none".into() } else { "whole network".into() },
            ..Default::default()
        };
        o.metrics.insert("giant_fraction".into(), est(*g, g * 0.9, g * 1.1));
        o.metrics.insert("mean_outbreak_fraction".into(), est(g * g, g * g * 0.8, g * g * 1.2));
        o.metrics.insert("r_eff".into(), Metric::Number(*r));
        o.metrics.insert("below_threshold".into(), Metric::Flag(*r < 1.0));
        if i < 2 {
            o.extra.insert("doses_to_contain".into(), (30 + 5 * i).into());
        } else {
            o.extra.insert("doses_to_contain".into(), "not within 200".into());
        }
        s.rules.push(o);
        for d in 0..=8 {
            let x = f64::from(d) * 5.0;
            for (m, base) in [("giant_fraction", 0.61), ("mean_outbreak_fraction", 0.37)] {
                let mean = base * (1.0 - x / (40.0 + 20.0 * i as f64)).max(0.01);
                s.curves.push(CurvePoint {
                    rule: (*name).into(),
                    budget: x,
                    metric: m.into(),
                    mean,
                    ci_low: mean * 0.9,
                    ci_high: mean * 1.1,
                });
            }
        }
        for k in 0..6u64 {
            s.allocation.push(AllocationRow {
                rule: (*name).into(),
                order: k + 1,
                id: format!("p{k}"),
                group: Some(if k % 2 == 0 { "care home".into() } else { "school".into() }),
                doses: 1.0,
            });
        }
    }
    s.extra.insert(
        "degree_distribution".into(),
        serde_json::json!([{"degree": 1, "count": 50}, {"degree": 2, "count": 30},
                           {"degree": 5, "count": 9}, {"degree": 20, "count": 1}]),
    );
    s.notes.push("static network; all-or-nothing vaccine".into());
    s.cautions.push(spreadplan::outcome::IMMUNIZATION_CAUTION.into());
    s
}

/// A hand-built seeding study.
pub(crate) fn seed_study() -> Study {
    let mut s = Study::new("seed");
    s.parameters.insert("budget".into(), 5.into());
    s.parameters.insert("seed".into(), 11.into());
    for (i, name) in ["ris", "degree"].iter().enumerate() {
        let mut o = RuleOutcome {
            rule: (*name).into(),
            rank: i as u32 + 1,
            doses: 5.0,
            information: "whole network".into(),
            ..Default::default()
        };
        let reach = 120.0 - 20.0 * i as f64;
        o.metrics.insert("expected_reach".into(), est(reach, reach - 4.0, reach + 4.0));
        if i == 0 {
            o.extra.insert("upper_bound".into(), 150.5.into());
        }
        s.rules.push(o);
        for k in 1..=5 {
            let m = reach * f64::from(k) / 5.0;
            s.curves.push(CurvePoint {
                rule: (*name).into(),
                budget: f64::from(k),
                metric: "expected_reach".into(),
                mean: m,
                ci_low: m - 3.0,
                ci_high: m + 3.0,
            });
        }
    }
    s
}

/// The value of `attr="…"` inside a tag's text.
fn attr<'a>(tag: &'a str, name: &str) -> Option<&'a str> {
    let key = format!(" {name}=\"");
    let start = tag.find(&key)? + key.len();
    let end = tag[start..].find('"')? + start;
    Some(&tag[start..end])
}

fn unescape(s: &str) -> String {
    s.replace("&lt;", "<")
        .replace("&gt;", ">")
        .replace("&quot;", "\"")
        .replace("&#39;", "'")
        .replace("&amp;", "&")
}

/// Follows a path like `rules[2].metrics.r_eff` into the JSON.
fn follow<'a>(v: &'a Value, path: &str) -> Option<&'a Value> {
    let mut cur = v;
    for part in path.split('.') {
        if let Some((name, idx)) = part.split_once('[') {
            let i: usize = idx.trim_end_matches(']').parse().ok()?;
            cur = cur.get(name)?.get(i)?;
        } else {
            cur = cur.get(part)?;
        }
    }
    Some(cur)
}

/// Cells of the ranking table: (tag text, inner text).
fn ranking_cells(html: &str) -> Vec<(String, String)> {
    let start = html.find("<table id=\"ranking-table\"").expect("ranking table");
    let end = start + html[start..].find("</table>").unwrap();
    let table = &html[start..end];
    let mut out = Vec::new();
    let mut rest = table;
    while let Some(i) = rest.find("<td") {
        let tag_end = i + rest[i..].find('>').unwrap();
        let close = tag_end + rest[tag_end..].find("</td>").unwrap();
        out.push((rest[i..=tag_end].to_owned(), unescape(&rest[tag_end + 1..close])));
        rest = &rest[close..];
    }
    out
}

/// Numbers written in a cell's text, each with the half-width of its last
/// printed digit (the rounding the table applied).
fn shown_numbers(text: &str) -> Vec<(f64, f64)> {
    let mut out = Vec::new();
    for tok in text.split([' ', '[', ']', ',']) {
        if tok.is_empty() {
            continue;
        }
        let Ok(x) = tok.parse::<f64>() else { continue };
        let (mant, exp) = match tok.split_once('e') {
            Some((m, e)) => (m, e.parse::<i32>().unwrap_or(0)),
            None => (tok, 0),
        };
        let decimals = mant.split_once('.').map_or(0, |(_, d)| d.len()) as i32;
        out.push((x, 0.5 * 10f64.powi(exp - decimals) * (1.0 + 1e-9)));
    }
    out
}

#[test]
fn write_outputs_writes_five_files_atomically_named() {
    let dir = tempdir("report-files");
    let written = report::write_outputs(&dir, &immunize_study()).unwrap();
    let names: Vec<String> =
        written.iter().map(|p| p.file_name().unwrap().to_string_lossy().into_owned()).collect();
    assert_eq!(
        names,
        ["ranking.csv", "curves.csv", "allocation.csv", "summary.json", "report.html"]
    );
    // No temporary files left behind.
    let leftovers: Vec<_> = std::fs::read_dir(&dir)
        .unwrap()
        .filter_map(|e| e.ok())
        .filter(|e| e.file_name().to_string_lossy().starts_with('.'))
        .collect();
    assert!(leftovers.is_empty());
}

#[test]
fn rewriting_gives_byte_identical_files() {
    let a = tempdir("report-bytes-a");
    let b = tempdir("report-bytes-b");
    report::write_outputs(&a, &immunize_study()).unwrap();
    report::write_outputs(&b, &immunize_study()).unwrap();
    for f in ["ranking.csv", "curves.csv", "allocation.csv", "summary.json", "report.html"] {
        assert_eq!(std::fs::read(a.join(f)).unwrap(), std::fs::read(b.join(f)).unwrap(), "{f}");
    }
}

#[test]
fn html_is_self_contained_and_escaped() {
    let html = report::html::render(&immunize_study());
    for banned in ["<script", "<link", "@import", "url(", " src=", "href=\"http"] {
        assert!(!html.contains(banned), "report contains {banned:?}");
    }
    // The only URL is the SVG namespace identifier, which is never fetched.
    let urls = html.matches("http").count();
    let ns = html.matches("http://www.w3.org/2000/svg").count();
    assert_eq!(urls, ns);
    assert!(html.contains("ran&lt;dom&gt;"));
    assert!(!html.contains("ran<dom>"));
    assert!(html.contains("town &lt;&amp;&gt; edges.csv"));
    assert!(html.contains("follow national immunization guidance"));
    assert!(html.contains("static network; all-or-nothing vaccine"));
}

#[test]
fn html_charts_have_content_and_labels() {
    let html = report::html::render(&immunize_study());
    for id in [
        "curve-giant_fraction",
        "curve-mean_outbreak_fraction",
        "bars-r_eff",
        "bars-doses_to_contain",
        "degree-distribution",
    ] {
        let start = html.find(&format!("<figure id=\"{id}\"")).unwrap_or_else(|| panic!("{id}"));
        let end = start + html[start..].find("</figure>").unwrap();
        let fig = &html[start..end];
        assert!(fig.contains("<svg"), "{id}");
        assert!(fig.contains("<text"), "{id} has no text labels");
        assert!(
            fig.contains("<polyline")
                || fig.contains("<path")
                || fig.contains("<rect")
                || fig.contains("<circle"),
            "{id} has no marks"
        );
    }
    // Axis labels with units and the legend entries.
    assert!(html.contains("doses given (people)"));
    assert!(html.contains("largest component (fraction of N)"));
    assert!(html.contains("degree k (contacts per person, log scale)"));
    assert!(html.contains("corehd: r_eff &lt; 1"));
    // Interval bands are filled polygons.
    assert!(html.contains("<polygon"));
    let seed = report::html::render(&seed_study());
    assert!(seed.contains("curve-expected_reach"));
    assert!(seed.contains("upper bound at K = 5"));
    assert!(seed.contains("seeds K (people)"));
}

#[test]
fn html_table_numbers_equal_the_json() {
    for study in [immunize_study(), seed_study()] {
        let html = report::html::render(&study);
        let json: Value = serde_json::from_str(&report::json::to_string(&study)).unwrap();
        let cells = ranking_cells(&html);
        let mut checked = 0;
        for (tag, text) in &cells {
            let Some(path) = attr(tag, "data-json") else { continue };
            let v = follow(&json, path).unwrap_or_else(|| panic!("{path} not in json"));
            let shown = shown_numbers(text);
            match v {
                Value::Object(o) => {
                    let want: Vec<f64> = ["mean", "ci_low", "ci_high"]
                        .iter()
                        .map(|k| o[*k].as_f64().unwrap())
                        .collect();
                    for (k, w) in ["data-mean", "data-ci-low", "data-ci-high"].iter().zip(&want) {
                        let a: f64 = attr(tag, k).unwrap().parse().unwrap();
                        assert_eq!(a, *w, "{path} {k}");
                    }
                    assert_eq!(shown.len(), 3, "{path}: {text}");
                    for ((x, tol), w) in shown.iter().zip(&want) {
                        assert!((x - w).abs() <= *tol, "{path}: shown {x} vs json {w}");
                    }
                }
                Value::Number(n) => {
                    let w = n.as_f64().unwrap();
                    let a: f64 = attr(tag, "data-value").unwrap().parse().unwrap();
                    assert_eq!(a, w, "{path}");
                    assert_eq!(shown.len(), 1, "{path}: {text}");
                    assert!((shown[0].0 - w).abs() <= shown[0].1, "{path}: {text} vs {w}");
                }
                Value::Bool(b) => {
                    assert_eq!(text, if *b { "yes" } else { "no" }, "{path}");
                }
                Value::String(s) => assert_eq!(text, s, "{path}"),
                other => panic!("{path}: unexpected {other}"),
            }
            checked += 1;
        }
        let per_rule = cells.len() / study.rules.len();
        assert!(checked >= study.rules.len() * 3, "only {checked} cells checked");
        assert!(per_rule >= 5);
    }
}

#[test]
fn allocation_summary_sums_groups() {
    let html = report::html::render(&immunize_study());
    let start = html.find("<table id=\"allocation-table\"").expect("allocation table");
    let table = &html[start..start + html[start..].find("</table>").unwrap()];
    assert!(table.contains("<th>care home</th>") && table.contains("<th>school</th>"));
    // Each rule has 3 care-home rows and 3 school rows of one dose each.
    assert_eq!(table.matches("data-value=\"3\"").count(), 6);
    assert_eq!(table.matches("data-value=\"6\"").count(), 3);
}

/// Browser check: headless Chromium renders the report to a screenshot
/// that is not blank. Skipped (passing) when `chromium` is not on PATH;
/// CI installs it.
#[test]
#[allow(clippy::print_stderr)]
fn chromium_renders_the_report() {
    let Some(chromium) = find_on_path(&["chromium", "chromium-browser"]) else {
        eprintln!("skip: chromium not on PATH; the browser check runs where it is installed");
        return;
    };
    let dir = tempdir("report-browser");
    report::write_outputs(&dir, &immunize_study()).unwrap();
    let page = dir.join("report.html");
    let shot = dir.join("shot.png");
    let profile = dir.join("profile");
    let out = std::process::Command::new(chromium)
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-quic",
            "--no-first-run",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
            "--hide-scrollbars",
        ])
        .arg(format!("--user-data-dir={}", profile.display()))
        .arg(format!("--screenshot={}", shot.display()))
        .arg("--window-size=1200,2000")
        .arg(format!("file://{}", page.display()))
        .output()
        .expect("chromium runs");
    assert!(
        shot.exists(),
        "no screenshot; chromium said: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    let bytes = std::fs::read(&shot).unwrap();
    assert!(bytes.len() > 20_000, "screenshot only {} bytes", bytes.len());
    let (w, h, px, data) = decode_png(&bytes);
    // Count distinct colours on a coarse grid: a blank or error page has a
    // handful; the report's palette, text anti-aliasing and bands give many.
    let mut colours: Vec<[u8; 3]> = Vec::new();
    let mut coloured = 0usize;
    for y in (0..h).step_by(3) {
        for x in (0..w).step_by(3) {
            let i = (y * w + x) * px;
            let c = [data[i], data[i + 1], data[i + 2]];
            // Saturated pixels: the palette's chart marks, not grey text.
            let (mx, mn) = (c.iter().max().unwrap(), c.iter().min().unwrap());
            if mx - mn > 60 {
                coloured += 1;
            }
            if !colours.contains(&c) && colours.len() < 5000 {
                colours.push(c);
            }
        }
    }
    assert!(colours.len() > 50, "only {} distinct colours: blank page?", colours.len());
    assert!(coloured > 500, "only {coloured} coloured pixels: charts not drawn?");
}

fn find_on_path(names: &[&str]) -> Option<std::path::PathBuf> {
    let path = std::env::var_os("PATH")?;
    for dir in std::env::split_paths(&path) {
        for n in names {
            let p = dir.join(n);
            if p.is_file() {
                return Some(p);
            }
        }
    }
    None
}

/// Minimal PNG decoder for the screenshot (8-bit RGB or RGBA, not
/// interlaced — what Chromium writes), after the PNG specification (W3C,
/// 2003): chunks, zlib-compressed IDAT, per-row filters 0–4. Returns
/// width, height, bytes per pixel and the pixel bytes.
fn decode_png(bytes: &[u8]) -> (usize, usize, usize, Vec<u8>) {
    use std::io::Read;
    assert_eq!(&bytes[..8], b"\x89PNG\r\n\x1a\n", "not a PNG");
    let be = |b: &[u8]| u32::from_be_bytes([b[0], b[1], b[2], b[3]]) as usize;
    let (mut w, mut h, mut px) = (0, 0, 0);
    let mut idat = Vec::new();
    let mut i = 8;
    while i + 8 <= bytes.len() {
        let len = be(&bytes[i..]);
        let kind = &bytes[i + 4..i + 8];
        let body = &bytes[i + 8..i + 8 + len];
        match kind {
            b"IHDR" => {
                w = be(body);
                h = be(&body[4..]);
                assert_eq!(body[8], 8, "bit depth");
                assert_eq!(body[12], 0, "interlaced");
                px = match body[9] {
                    2 => 3,
                    6 => 4,
                    t => panic!("colour type {t}"),
                };
            }
            b"IDAT" => idat.extend_from_slice(body),
            b"IEND" => break,
            _ => {}
        }
        i += 12 + len;
    }
    let mut raw = Vec::new();
    flate2::read::ZlibDecoder::new(&idat[..]).read_to_end(&mut raw).unwrap();
    let stride = w * px;
    let mut out = vec![0u8; h * stride];
    for y in 0..h {
        let f = raw[y * (stride + 1)];
        let src = &raw[y * (stride + 1) + 1..(y + 1) * (stride + 1)];
        for x in 0..stride {
            let a = if x >= px { out[y * stride + x - px] } else { 0 };
            let b = if y > 0 { out[(y - 1) * stride + x] } else { 0 };
            let c = if x >= px && y > 0 { out[(y - 1) * stride + x - px] } else { 0 };
            let pred = match f {
                0 => 0,
                1 => a,
                2 => b,
                3 => ((u16::from(a) + u16::from(b)) / 2) as u8,
                4 => {
                    let p = i16::from(a) + i16::from(b) - i16::from(c);
                    let (pa, pb, pc) = (
                        (p - i16::from(a)).abs(),
                        (p - i16::from(b)).abs(),
                        (p - i16::from(c)).abs(),
                    );
                    if pa <= pb && pa <= pc {
                        a
                    } else if pb <= pc {
                        b
                    } else {
                        c
                    }
                }
                f => panic!("filter {f}"),
            };
            out[y * stride + x] = src[x].wrapping_add(pred);
        }
    }
    (w, h, px, out)
}

/// Path of a bundled demo scenario.
fn demo(name: &str) -> std::path::PathBuf {
    std::path::PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("demo-data").join(name)
}

#[test]
fn run_scenario_twice_gives_byte_identical_csv_and_json() {
    // Issue 7: "running a scenario twice gives byte-identical CSV and JSON".
    let a = tempdir("run-twice-a");
    let b = tempdir("run-twice-b");
    for (dir, threads) in [(&a, "1"), (&b, "2")] {
        let out = crate::common::spreadplan(&[
            "run",
            demo("harrowgate.toml").to_str().unwrap(),
            "--out",
            dir.to_str().unwrap(),
            "--quiet",
            "--threads",
            threads,
        ]);
        assert!(out.status.success(), "{}", String::from_utf8_lossy(&out.stderr));
    }
    for f in ["ranking.csv", "curves.csv", "allocation.csv", "summary.json", "report.html"] {
        let x = std::fs::read(a.join(f)).unwrap();
        assert!(!x.is_empty(), "{f} empty");
        assert_eq!(x, std::fs::read(b.join(f)).unwrap(), "{f} differs");
    }
    let json: Value =
        serde_json::from_str(&std::fs::read_to_string(a.join("summary.json")).unwrap()).unwrap();
    assert_eq!(json["version"], spreadplan::VERSION);
    assert!(json["input"]["scenario_hash"].is_string());
    assert!(json["input"]["degrees_hash"].is_string());
    assert_eq!(json["parameters"]["transmissibility"], 0.25);
}

#[test]
fn bad_scenario_names_key_and_line_and_exits_2() {
    let dir = tempdir("run-bad");
    let f = dir.join("bad.toml");
    std::fs::write(
        &f,
        "kind = \"immunize\"\n[distribution]\ntable = \"t.csv\"\n[parameters]\npopulation = 10\nbudget = \"5%\"\ntransmissibility = \"high\"\n",
    )
    .unwrap();
    let out = crate::common::spreadplan(&["run", f.to_str().unwrap()]);
    assert_eq!(out.status.code(), Some(2));
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("bad.toml:7: parameters.transmissibility:"), "{err}");
    // Nothing was written.
    assert!(!dir.join("out").exists());
}
