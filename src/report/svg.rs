//! SVG charts of a [`Study`], drawn with plotters into strings: metric
//! curves against the budget with their 95% bands and reference lines, bar
//! charts of one metric per rule, and the degree distribution on log–log
//! axes. Owns chart layout and the colour palette; which numbers exist is
//! the evaluators' business, and the HTML page around the charts is
//! [`super::html`]. Nothing here computes a new estimate: every mark is a
//! value read from the study.

use plotters::coord::ranged1d::ValueFormatter;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};
use serde_json::Value;

use crate::outcome::{Metric, Study};

/// The Okabe–Ito colour-blind-safe palette (Okabe & Ito 2008, "Color
/// Universal Design"), reordered so the first colours contrast most on
/// white; yellow is left out because it vanishes on a white page.
pub const PALETTE: [(u8, u8, u8); 7] = [
    (0x00, 0x72, 0xB2), // blue
    (0xE6, 0x9F, 0x00), // orange
    (0x00, 0x9E, 0x73), // bluish green
    (0xD5, 0x5E, 0x00), // vermillion
    (0xCC, 0x79, 0xA7), // reddish purple
    (0x56, 0xB4, 0xE9), // sky blue
    (0x00, 0x00, 0x00), // black
];

/// Chart width in pixels.
pub const WIDTH: u32 = 900;
/// Chart height in pixels.
pub const HEIGHT: u32 = 420;

const GRID: RGBColor = RGBColor(0xE4, 0xE4, 0xE4);
const FAINT: RGBColor = RGBColor(0xF3, 0xF3, 0xF3);
const INK: RGBColor = RGBColor(0x33, 0x33, 0x33);

/// The palette colour of series `i` (cycling).
pub fn colour(i: usize) -> RGBColor {
    let (r, g, b) = PALETTE[i % PALETTE.len()];
    RGBColor(r, g, b)
}

/// The colour as a CSS hex string, e.g. `#0072B2`.
///
/// ```
/// assert_eq!(spreadplan::report::svg::css_colour(0), "#0072B2");
/// ```
pub fn css_colour(i: usize) -> String {
    let (r, g, b) = PALETTE[i % PALETTE.len()];
    format!("#{r:02X}{g:02X}{b:02X}")
}

/// One line of a chart: points `(x, mean, ci_low, ci_high)` in x order.
#[derive(Clone, Debug, PartialEq)]
pub struct Series {
    /// Legend text.
    pub label: String,
    /// Palette index.
    pub colour: usize,
    /// `(x, mean, ci_low, ci_high)`.
    pub points: Vec<(f64, f64, f64, f64)>,
    /// Draw dashed (e.g. a bound rather than an estimate).
    pub dashed: bool,
}

/// A reference line across the chart.
#[derive(Clone, Debug, PartialEq)]
pub struct RefLine {
    /// Position on the axis it crosses.
    pub at: f64,
    /// Legend text.
    pub label: String,
    /// Palette index, or `None` for the neutral ink colour.
    pub colour: Option<usize>,
}

/// A line chart with interval bands and reference lines.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct LineChart {
    /// Caption above the plot.
    pub title: String,
    /// x-axis description with its unit.
    pub x_label: String,
    /// y-axis description with its unit.
    pub y_label: String,
    /// The lines.
    pub series: Vec<Series>,
    /// Horizontal reference lines (at a y value).
    pub hlines: Vec<RefLine>,
    /// Vertical reference lines (at an x value).
    pub vlines: Vec<RefLine>,
    /// Logarithmic x and y axes (points with non-positive values are left out).
    pub log_log: bool,
    /// Draw markers at each point instead of connecting lines.
    pub points_only: bool,
}

/// One bar of a bar chart.
#[derive(Clone, Debug, PartialEq)]
pub struct Bar {
    /// Category (rule) name.
    pub label: String,
    /// Length of the bar, or `None` when there is no number (see `text`).
    pub value: Option<f64>,
    /// `(ci_low, ci_high)` whisker, when the value is an estimate.
    pub interval: Option<(f64, f64)>,
    /// Text printed beside the bar (the value, or e.g. "not within 1000").
    pub text: String,
    /// Palette index.
    pub colour: usize,
}

/// A horizontal bar chart, one bar per category.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct BarChart {
    /// Caption above the plot.
    pub title: String,
    /// Value-axis description with its unit.
    pub x_label: String,
    /// The bars, top to bottom.
    pub bars: Vec<Bar>,
    /// A vertical reference line (e.g. r_eff = 1).
    pub reference: Option<RefLine>,
}

/// A finished chart: what it shows and its SVG text.
#[derive(Clone, Debug, PartialEq)]
pub struct Chart {
    /// Stable identifier (e.g. `curve-giant_fraction`).
    pub id: String,
    /// Caption.
    pub title: String,
    /// One sentence under the chart saying how to read it.
    pub caption: String,
    /// The `<svg>` element.
    pub svg: String,
}

type Res<T> = Result<T, String>;

fn err<E: std::fmt::Display>(e: E) -> String {
    e.to_string()
}

fn finite(x: f64) -> bool {
    x.is_finite()
}

/// Pads a data range so that lines do not sit on the frame.
fn padded(lo: f64, hi: f64, floor_zero: bool) -> (f64, f64) {
    let (lo, hi) = if lo.is_finite() && hi.is_finite() { (lo, hi) } else { (0.0, 1.0) };
    let span = hi - lo;
    let pad = if span > 0.0 { span * 0.05 } else { lo.abs().max(1.0) * 0.05 };
    let low = if floor_zero && lo >= 0.0 { 0.0 } else { lo - pad };
    (low, hi + pad)
}

/// Axis tick label: short, no trailing zeros.
fn tick(x: f64) -> String {
    if x == 0.0 {
        return "0".into();
    }
    let a = x.abs();
    if !(1e-3..1e6).contains(&a) {
        return format!("{x:.0e}");
    }
    let s = if a >= 100.0 { format!("{x:.0}") } else { format!("{x:.3}") };
    if s.contains('.') {
        s.trim_end_matches('0').trim_end_matches('.').to_owned()
    } else {
        s
    }
}

fn text_style(size: u32) -> TextStyle<'static> {
    ("sans-serif", size).into_font().color(&INK)
}

/// Draws a line chart into an SVG string.
///
/// ```
/// use spreadplan::report::svg::{line_chart, LineChart, Series};
/// let c = LineChart {
///     title: "t".into(), x_label: "doses (people)".into(), y_label: "fraction of N".into(),
///     series: vec![Series { label: "random".into(), colour: 0, dashed: false,
///         points: vec![(0.0, 0.5, 0.4, 0.6), (10.0, 0.2, 0.1, 0.3)] }],
///     ..Default::default()
/// };
/// let svg = line_chart(&c).unwrap();
/// assert!(svg.starts_with("<svg") && svg.contains("doses (people)"));
/// ```
pub fn line_chart(c: &LineChart) -> Result<String, String> {
    let mut buf = String::new();
    {
        let root = SVGBackend::with_string(&mut buf, (WIDTH, HEIGHT)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let (plot, side) = root.split_horizontally(WIDTH - LEGEND_WIDTH);
        draw_lines(&plot, c)?;
        draw_legend(&side, &legend_entries(c))?;
        root.present().map_err(err)?;
    }
    Ok(buf)
}

/// Width of the legend column right of a line chart, in pixels.
const LEGEND_WIDTH: u32 = 210;

/// How a legend entry's sample line is drawn.
#[derive(Clone, Copy, PartialEq)]
enum Stroke {
    Solid,
    Dashed,
    Dotted,
    Dot,
}

fn legend_entries(c: &LineChart) -> Vec<(String, RGBColor, Stroke)> {
    let mut out: Vec<(String, RGBColor, Stroke)> = Vec::new();
    for s in &c.series {
        let st = if c.points_only {
            Stroke::Dot
        } else if s.dashed {
            Stroke::Dashed
        } else {
            Stroke::Solid
        };
        out.push((s.label.clone(), colour(s.colour), st));
    }
    for h in &c.hlines {
        out.push((h.label.clone(), h.colour.map_or(INK, colour), Stroke::Dashed));
    }
    for v in &c.vlines {
        out.push((v.label.clone(), v.colour.map_or(INK, colour), Stroke::Dotted));
    }
    out
}

fn draw_legend(
    area: &DrawingArea<SVGBackend<'_>, Shift>,
    entries: &[(String, RGBColor, Stroke)],
) -> Res<()> {
    let mut y = 52;
    for (label, col, st) in entries.iter().take(16) {
        let x = 6;
        match st {
            Stroke::Solid => area
                .draw(&PathElement::new(vec![(x, y), (x + 24, y)], col.stroke_width(3)))
                .map_err(err)?,
            Stroke::Dashed => {
                for i in 0..3 {
                    let a = x + i * 9;
                    area.draw(&PathElement::new(vec![(a, y), (a + 5, y)], col.stroke_width(2)))
                        .map_err(err)?;
                }
            }
            Stroke::Dotted => {
                for i in 0..5 {
                    let a = x + i * 5;
                    area.draw(&PathElement::new(vec![(a, y), (a + 2, y)], col.stroke_width(2)))
                        .map_err(err)?;
                }
            }
            Stroke::Dot => area.draw(&Circle::new((x + 12, y), 4, col.filled())).map_err(err)?,
        }
        let mut text: String = label.chars().take(28).collect();
        if label.chars().count() > 28 {
            text.push('…');
        }
        area.draw(&Text::new(
            text,
            (x + 32, y),
            text_style(12).pos(Pos::new(HPos::Left, VPos::Center)),
        ))
        .map_err(err)?;
        y += 20;
    }
    Ok(())
}

fn ranges(c: &LineChart) -> ((f64, f64), (f64, f64)) {
    let keep = |x: f64, y: f64| finite(x) && finite(y) && (!c.log_log || (x > 0.0 && y > 0.0));
    let (mut x0, mut x1, mut y0, mut y1) =
        (f64::INFINITY, f64::NEG_INFINITY, f64::INFINITY, f64::NEG_INFINITY);
    for s in &c.series {
        for &(x, m, lo, hi) in &s.points {
            for y in [m, lo, hi] {
                if keep(x, y) {
                    x0 = x0.min(x);
                    x1 = x1.max(x);
                    y0 = y0.min(y);
                    y1 = y1.max(y);
                }
            }
        }
    }
    for h in &c.hlines {
        if keep(1.0, h.at) {
            y0 = y0.min(h.at);
            y1 = y1.max(h.at);
        }
    }
    for v in &c.vlines {
        if keep(v.at, 1.0) {
            x0 = x0.min(v.at);
            x1 = x1.max(v.at);
        }
    }
    if !x0.is_finite() {
        (x0, x1) = (1.0, 10.0);
    }
    if !y0.is_finite() {
        (y0, y1) = (0.1, 1.0);
    }
    if c.log_log {
        let x1 = if x1 > x0 { x1 * 1.3 } else { x0 * 10.0 };
        let y1 = if y1 > y0 { y1 * 1.5 } else { y0 * 10.0 };
        ((x0 / 1.3, x1), (y0 / 1.5, y1))
    } else {
        (padded(x0, x1, false), padded(y0, y1, true))
    }
}

fn draw_lines(root: &DrawingArea<SVGBackend<'_>, Shift>, c: &LineChart) -> Res<()> {
    let ((x0, x1), (y0, y1)) = ranges(c);
    let mut b = ChartBuilder::on(root);
    b.caption(&c.title, text_style(17)).margin(14).x_label_area_size(46).y_label_area_size(70);
    if c.log_log {
        let mut chart =
            b.build_cartesian_2d((x0..x1).log_scale(), (y0..y1).log_scale()).map_err(err)?;
        plot_series(&mut chart, c, (x0, x1), (y0, y1))
    } else {
        let mut chart = b.build_cartesian_2d(x0..x1, y0..y1).map_err(err)?;
        plot_series(&mut chart, c, (x0, x1), (y0, y1))
    }
}

fn plot_series<'a, X, Y>(
    chart: &mut ChartContext<'a, SVGBackend<'a>, Cartesian2d<X, Y>>,
    c: &LineChart,
    (x0, x1): (f64, f64),
    (y0, y1): (f64, f64),
) -> Res<()>
where
    X: Ranged<ValueType = f64> + ValueFormatter<f64>,
    Y: Ranged<ValueType = f64> + ValueFormatter<f64>,
{
    // The mesh (grid, ticks, axis labels) is the same on linear and log axes.
    chart
        .configure_mesh()
        .light_line_style(FAINT)
        .max_light_lines(2)
        .bold_line_style(GRID)
        .x_desc(c.x_label.as_str())
        .y_desc(c.y_label.as_str())
        .x_label_formatter(&|x| tick(*x))
        .y_label_formatter(&|y| tick(*y))
        .label_style(text_style(12))
        .axis_desc_style(text_style(13))
        .draw()
        .map_err(err)?;
    let keep = |x: f64, y: f64| finite(x) && finite(y) && (!c.log_log || (x > 0.0 && y > 0.0));
    // Bands first, so every line is drawn over every band.
    for s in &c.series {
        let pts: Vec<_> = s
            .points
            .iter()
            .filter(|p| keep(p.0, p.2) && keep(p.0, p.3) && p.3 > p.2)
            .copied()
            .collect();
        if pts.len() >= 2 {
            let mut poly: Vec<(f64, f64)> = pts.iter().map(|p| (p.0, p.3)).collect();
            poly.extend(pts.iter().rev().map(|p| (p.0, p.2)));
            let style = colour(s.colour).mix(0.18).filled();
            chart.draw_series(std::iter::once(Polygon::new(poly, style))).map_err(err)?;
        }
    }
    for s in &c.series {
        let col = colour(s.colour);
        let pts: Vec<(f64, f64)> =
            s.points.iter().filter(|p| keep(p.0, p.1)).map(|p| (p.0, p.1)).collect();
        if pts.is_empty() {
            continue;
        }
        let style = col.stroke_width(2);
        let anno = if c.points_only {
            chart.draw_series(pts.iter().map(|&p| Circle::new(p, 3, col.filled()))).map_err(err)?
        } else if s.dashed {
            chart.draw_series(DashedLineSeries::new(pts.clone(), 6, 4, style)).map_err(err)?
        } else if pts.len() == 1 {
            chart.draw_series(pts.iter().map(|&p| Circle::new(p, 4, col.filled()))).map_err(err)?
        } else {
            chart.draw_series(LineSeries::new(pts.clone(), style)).map_err(err)?
        };
        let dashed = s.dashed;
        anno.label(s.label.as_str()).legend(move |(x, y)| {
            let st = col.stroke_width(3);
            if dashed {
                PathElement::new(vec![(x, y), (x + 7, y)], st)
            } else {
                PathElement::new(vec![(x, y), (x + 18, y)], st)
            }
        });
    }
    for h in c.hlines.iter().filter(|h| keep(x0.max(1e-300), h.at)) {
        let col = h.colour.map_or(INK, colour);
        chart
            .draw_series(DashedLineSeries::new(
                vec![(x0, h.at), (x1, h.at)],
                8,
                5,
                col.stroke_width(2),
            ))
            .map_err(err)?
            .label(h.label.as_str())
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 7, y)], col.stroke_width(2)));
    }
    for v in c.vlines.iter().filter(|v| keep(v.at, y0.max(1e-300))) {
        let col = v.colour.map_or(INK, colour);
        chart
            .draw_series(DashedLineSeries::new(
                vec![(v.at, y0), (v.at, y1)],
                3,
                4,
                col.stroke_width(2),
            ))
            .map_err(err)?
            .label(v.label.as_str())
            .legend(move |(x, y)| PathElement::new(vec![(x, y), (x + 3, y)], col.stroke_width(2)));
    }
    Ok(())
}

/// Draws a horizontal bar chart into an SVG string.
///
/// ```
/// use spreadplan::report::svg::{bar_chart, Bar, BarChart};
/// let c = BarChart {
///     title: "r_eff at the budget".into(),
///     x_label: "r_eff (secondary cases per case)".into(),
///     bars: vec![Bar { label: "degree".into(), value: Some(0.8), interval: None,
///                      text: "0.8".into(), colour: 0 }],
///     reference: None,
/// };
/// assert!(bar_chart(&c).unwrap().contains("<rect"));
/// ```
pub fn bar_chart(c: &BarChart) -> Result<String, String> {
    let mut buf = String::new();
    {
        let h = (90 + 34 * c.bars.len() as u32).clamp(160, 900);
        let root = SVGBackend::with_string(&mut buf, (WIDTH, h)).into_drawing_area();
        root.fill(&WHITE).map_err(err)?;
        let n = c.bars.len().max(1) as i32;
        let mut hi = c
            .bars
            .iter()
            .flat_map(|b| [b.value, b.interval.map(|i| i.1)])
            .flatten()
            .filter(|x| x.is_finite())
            .fold(0.0f64, f64::max);
        if let Some(r) = &c.reference {
            hi = hi.max(r.at);
        }
        if hi <= 0.0 {
            hi = 1.0;
        }
        let hi = hi * 1.25;
        let label_w =
            c.bars.iter().map(|b| b.label.chars().count()).max().unwrap_or(4).clamp(4, 28) as u32;
        let mut chart = ChartBuilder::on(&root)
            .caption(&c.title, text_style(17))
            .margin(14)
            .x_label_area_size(46)
            .y_label_area_size(20 + 8 * label_w)
            .build_cartesian_2d(0.0..hi, (0..n).into_segmented())
            .map_err(err)?;
        let labels: Vec<String> = c.bars.iter().map(|b| b.label.clone()).collect();
        let fmt = |v: &SegmentValue<i32>| match v {
            SegmentValue::CenterOf(i) => {
                // Top bar first: category i is drawn at row n-1-i.
                let idx = (n - 1 - *i) as usize;
                labels.get(idx).cloned().unwrap_or_default()
            }
            _ => String::new(),
        };
        chart
            .configure_mesh()
            .disable_y_mesh()
            .light_line_style(FAINT)
            .max_light_lines(2)
            .bold_line_style(GRID)
            .x_desc(c.x_label.as_str())
            .x_label_formatter(&|x| tick(*x))
            .y_label_formatter(&fmt)
            .y_labels(c.bars.len().max(1))
            .label_style(text_style(12))
            .axis_desc_style(text_style(13))
            .draw()
            .map_err(err)?;
        for (i, b) in c.bars.iter().enumerate() {
            let row = n - 1 - i as i32;
            let col = colour(b.colour);
            if let Some(v) = b.value.filter(|v| v.is_finite()) {
                let mut bar = Rectangle::new(
                    [(0.0, SegmentValue::Exact(row)), (v, SegmentValue::Exact(row + 1))],
                    col.mix(0.85).filled(),
                );
                bar.set_margin(6, 6, 0, 0);
                chart.draw_series(std::iter::once(bar)).map_err(err)?;
            }
            if let Some((lo, hi)) = b.interval.filter(|(a, b)| a.is_finite() && b.is_finite()) {
                chart
                    .draw_series(std::iter::once(PathElement::new(
                        vec![(lo, SegmentValue::CenterOf(row)), (hi, SegmentValue::CenterOf(row))],
                        INK.stroke_width(2),
                    )))
                    .map_err(err)?;
            }
            let at = b
                .interval
                .map(|i| i.1)
                .into_iter()
                .chain(b.value)
                .filter(|x| x.is_finite())
                .fold(0.0f64, f64::max);
            chart
                .draw_series(std::iter::once(Text::new(
                    format!(" {}", b.text),
                    (at, SegmentValue::CenterOf(row)),
                    text_style(12).pos(Pos::new(HPos::Left, VPos::Center)),
                )))
                .map_err(err)?;
        }
        if let Some(r) = &c.reference {
            let col = r.colour.map_or(INK, colour);
            chart
                .draw_series(DashedLineSeries::new(
                    vec![(r.at, SegmentValue::Exact(0)), (r.at, SegmentValue::Exact(n))],
                    6,
                    4,
                    col.stroke_width(2),
                ))
                .map_err(err)?
                .label(r.label.as_str())
                .legend(move |(x, y)| {
                    PathElement::new(vec![(x, y), (x + 7, y)], col.stroke_width(2))
                });
            chart
                .configure_series_labels()
                .position(SeriesLabelPosition::LowerRight)
                .background_style(WHITE.mix(0.85))
                .border_style(GRID)
                .label_font(text_style(12))
                .draw()
                .map_err(err)?;
        }
        root.present().map_err(err)?;
    }
    Ok(buf)
}

/// A number from a JSON value: a plain number, or the `mean` of an
/// estimate object.
pub fn json_number(v: &Value) -> Option<f64> {
    match v {
        Value::Number(n) => n.as_f64(),
        Value::Object(o) => o.get("mean").or_else(|| o.get("value")).and_then(Value::as_f64),
        _ => None,
    }
}

/// A rule's value of `name`, looked up in its metrics and then in its
/// extra fields.
pub fn rule_value(r: &crate::outcome::RuleOutcome, name: &str) -> Option<Metric> {
    if let Some(m) = r.metrics.get(name) {
        return Some(m.clone());
    }
    match r.extra.get(name)? {
        Value::Number(n) => n.as_f64().map(Metric::Number),
        Value::String(s) => Some(Metric::Text(s.clone())),
        Value::Bool(b) => Some(Metric::Flag(*b)),
        Value::Object(o) => {
            let g = |k: &str| o.get(k).and_then(Value::as_f64);
            Some(Metric::Estimate(crate::stats::Estimate {
                mean: g("mean")?,
                ci_low: g("ci_low").unwrap_or(f64::NAN),
                ci_high: g("ci_high").unwrap_or(f64::NAN),
            }))
        }
        _ => None,
    }
}

/// Palette index of each rule: its position in the study's rule list,
/// then the order of first appearance in the curves.
pub fn rule_colours(study: &Study) -> Vec<String> {
    let mut names: Vec<String> = study.rules.iter().map(|r| r.rule.clone()).collect();
    for p in &study.curves {
        if !names.contains(&p.rule) {
            names.push(p.rule.clone());
        }
    }
    names
}

/// The x-axis description of the study's curves, with its unit.
pub fn budget_axis(study: &Study) -> String {
    let costed = study.parameters.get("budget_unit").and_then(Value::as_str).map(str::to_owned);
    match study.command.as_str() {
        "seed" => "seeds K (people)".into(),
        "threshold" => "transmissibility T (probability per contact)".into(),
        _ => match costed {
            Some(u) => format!("budget ({u})"),
            None => "doses given (people)".into(),
        },
    }
}

/// The y-axis description of a metric, with its unit.
pub fn metric_axis(metric: &str) -> String {
    match metric {
        "giant_fraction" => "largest component (fraction of N)".into(),
        "mean_outbreak_fraction" => "expected outbreak size (fraction of N)".into(),
        "outbreak_probability" => "large-outbreak probability".into(),
        "r_eff" => "r_eff (next-generation spectral radius)".into(),
        "expected_reach" => "expected adopters incl. seeds (people)".into(),
        "expected_reach_fraction" => "expected adopters (fraction of N)".into(),
        "susceptibility" => "mean small-component size (people)".into(),
        other => other.replace('_', " "),
    }
}

fn metric_title(metric: &str, study: &Study) -> String {
    let against = match study.command.as_str() {
        "seed" => "seeds",
        "threshold" => "transmissibility",
        _ => "doses",
    };
    format!("{} against {against}", metric.replace('_', " "))
}

/// The degree distribution a study carries in `extra["degree_distribution"]`
/// as `(degree, probability)` pairs, normalized. Accepted shapes: an array
/// of objects with `degree` (or `k`) and `count` / `probability` (or `p`,
/// `fraction`); an array of `[k, value]` pairs; or an object of parallel
/// arrays `degree(s)` and `count(s)` / `probability` / `probabilities`.
pub fn degree_points(v: &Value) -> Vec<(f64, f64)> {
    let pick = |o: &serde_json::Map<String, Value>, keys: &[&str]| {
        keys.iter().find_map(|k| o.get(*k).and_then(Value::as_f64))
    };
    let pick_arr = |o: &serde_json::Map<String, Value>, keys: &[&str]| {
        keys.iter().find_map(|k| o.get(*k).and_then(Value::as_array)).cloned()
    };
    let mut pts: Vec<(f64, f64)> = Vec::new();
    match v {
        Value::Array(rows) => {
            for r in rows {
                match r {
                    Value::Object(o) => {
                        if let (Some(k), Some(p)) = (
                            pick(o, &["degree", "k"]),
                            pick(o, &["probability", "p", "fraction", "count", "n"]),
                        ) {
                            pts.push((k, p));
                        }
                    }
                    Value::Array(a) if a.len() >= 2 => {
                        if let (Some(k), Some(p)) = (a[0].as_f64(), a[1].as_f64()) {
                            pts.push((k, p));
                        }
                    }
                    _ => {}
                }
            }
        }
        Value::Object(o) => {
            let ks = pick_arr(o, &["degree", "degrees", "k"]);
            let ps = pick_arr(o, &["probability", "probabilities", "p", "count", "counts"]);
            if let (Some(ks), Some(ps)) = (ks, ps) {
                for (k, p) in ks.iter().zip(&ps) {
                    if let (Some(k), Some(p)) = (k.as_f64(), p.as_f64()) {
                        pts.push((k, p));
                    }
                }
            }
        }
        _ => {}
    }
    pts.retain(|(k, p)| k.is_finite() && p.is_finite() && *p >= 0.0);
    let total: f64 = pts.iter().map(|p| p.1).sum();
    if total > 0.0 {
        for p in &mut pts {
            p.1 /= total;
        }
    }
    pts.sort_by(|a, b| a.0.total_cmp(&b.0));
    pts
}

/// Every chart the study supports, in reading order: one curve chart per
/// metric in the curves (seeding upper-bound curves join the reach chart),
/// r_eff at the budget, doses to contain, expected reach at the budget, and
/// the degree distribution. A chart that cannot be drawn is left out with
/// its reason in the caption of an empty chart.
pub fn study_charts(study: &Study) -> Vec<Chart> {
    let names = rule_colours(study);
    let col = |rule: &str| names.iter().position(|n| n == rule).unwrap_or(0);
    let mut out = Vec::new();
    let mut metrics: Vec<&str> = Vec::new();
    for p in &study.curves {
        if !metrics.contains(&p.metric.as_str()) && p.metric != "upper_bound" {
            metrics.push(&p.metric);
        }
    }
    let containment: Vec<(usize, f64, String)> = study
        .rules
        .iter()
        .filter_map(|r| {
            let d = rule_value(r, "doses_to_contain")?.value()?;
            Some((col(&r.rule), d, r.rule.clone()))
        })
        .collect();
    let critical_t = study
        .extra
        .get("critical_transmissibility")
        .and_then(json_number)
        .or_else(|| study.baseline.get("critical_transmissibility").and_then(Metric::value));
    for m in metrics {
        let series_for = |metric: &str, dashed: bool, suffix: &str| -> Vec<Series> {
            let mut rules: Vec<&str> = Vec::new();
            for p in study.curves.iter().filter(|p| p.metric == metric) {
                if !rules.contains(&p.rule.as_str()) {
                    rules.push(&p.rule);
                }
            }
            rules
                .iter()
                .map(|r| {
                    let mut points: Vec<_> = study
                        .curves
                        .iter()
                        .filter(|p| p.metric == metric && p.rule == *r)
                        .map(|p| (p.budget, p.mean, p.ci_low, p.ci_high))
                        .collect();
                    points.sort_by(|a, b| a.0.total_cmp(&b.0));
                    Series { label: format!("{r}{suffix}"), colour: col(r), points, dashed }
                })
                .collect()
        };
        let mut chart = LineChart {
            title: metric_title(m, study),
            x_label: budget_axis(study),
            y_label: metric_axis(m),
            series: series_for(m, false, ""),
            ..Default::default()
        };
        let mut caption = format!(
            "Mean {} per rule; shaded bands are 95% confidence intervals.",
            m.replace('_', " ")
        );
        if matches!(m, "giant_fraction" | "mean_outbreak_fraction" | "outbreak_probability") {
            for (c, d, rule) in &containment {
                chart.vlines.push(RefLine {
                    at: *d,
                    label: format!("{rule}: r_eff < 1"),
                    colour: Some(*c),
                });
            }
            if !containment.is_empty() {
                caption.push_str(
                    " Dotted vertical lines mark each rule's doses to contain (r_eff falls below 1).",
                );
            }
        }
        if m == "r_eff" {
            chart.hlines.push(RefLine { at: 1.0, label: "r_eff = 1".into(), colour: None });
            caption.push_str(
                " Below the dashed line at 1 the network is below its epidemic threshold.",
            );
        }
        if study.command == "threshold" {
            if let Some(t) = critical_t {
                chart.vlines.push(RefLine {
                    at: t,
                    label: format!("critical T = {}", tick(t)),
                    colour: None,
                });
                caption.push_str(" The dotted line marks the critical transmissibility.");
            }
        }
        if m.starts_with("expected_reach") {
            let ub = series_for("upper_bound", true, " upper bound");
            if !ub.is_empty() {
                chart.series.extend(ub);
                caption.push_str(" Dashed lines are upper bounds on the best reach any seed set of that size could achieve.");
            } else if let Some(u) = study
                .rules
                .iter()
                .filter_map(|r| rule_value(r, "upper_bound")?.value())
                .max_by(|a, b| a.total_cmp(b))
            {
                let k = study.rules.iter().map(|r| r.doses).fold(0.0, f64::max);
                chart.hlines.push(RefLine {
                    at: u,
                    label: format!("upper bound at K = {}", tick(k)),
                    colour: None,
                });
                caption.push_str(" The dashed line is an upper bound on the best reach any K seeds could achieve.");
            }
        }
        push_line(&mut out, format!("curve-{m}"), chart, caption);
    }
    // r_eff at the budget.
    let bars_of = |name: &str| -> Vec<Bar> {
        study
            .rules
            .iter()
            .filter_map(|r| {
                let m = rule_value(r, name)?;
                let (value, interval) = match &m {
                    Metric::Estimate(e) => (Some(e.mean), Some((e.ci_low, e.ci_high))),
                    Metric::Missing => return None,
                    other => (other.value(), None),
                };
                let text = super::table::cell(&m);
                Some(Bar { label: r.rule.clone(), value, interval, text, colour: col(&r.rule) })
            })
            .collect()
    };
    let reff = bars_of("r_eff");
    if !reff.is_empty() {
        let c = BarChart {
            title: "r_eff at the budget".into(),
            x_label: "r_eff (next-generation spectral radius, secondary cases per case)".into(),
            bars: reff,
            reference: Some(RefLine { at: 1.0, label: "threshold r_eff = 1".into(), colour: None }),
        };
        push_bar(
            &mut out,
            "bars-r_eff".into(),
            c,
            "Effective reproduction number of the residual network after each rule's doses; bars left of the dashed line are below the epidemic threshold.".into(),
        );
    }
    let dtc = bars_of("doses_to_contain");
    if !dtc.is_empty() {
        let c = BarChart {
            title: "doses to contain".into(),
            x_label: "doses until r_eff < 1 (people)".into(),
            bars: dtc,
            reference: None,
        };
        push_bar(
            &mut out,
            "bars-doses_to_contain".into(),
            c,
            "Fewest doses with which each rule brings r_eff below 1; \"not within N\" means even the rule's whole order does not.".into(),
        );
    }
    if study.command == "seed" && !metrics_has_curve(study, "expected_reach") {
        let reach = bars_of("expected_reach");
        if !reach.is_empty() {
            let c = BarChart {
                title: "expected reach at the budget".into(),
                x_label: "expected adopters incl. seeds (people)".into(),
                bars: reach,
                reference: None,
            };
            push_bar(
                &mut out,
                "bars-expected_reach".into(),
                c,
                "Expected adopters per rule with 95% intervals.".into(),
            );
        }
    }
    if let Some(v) = study.extra.get("degree_distribution") {
        let pts = degree_points(v);
        let shown: Vec<_> = pts.iter().filter(|p| p.0 > 0.0 && p.1 > 0.0).copied().collect();
        if !shown.is_empty() {
            let c = LineChart {
                title: "degree distribution".into(),
                x_label: "degree k (contacts per person, log scale)".into(),
                y_label: "share of people p_k (log scale)".into(),
                series: vec![Series {
                    label: "p_k".into(),
                    colour: 0,
                    points: shown.iter().map(|&(k, p)| (k, p, p, p)).collect(),
                    dashed: false,
                }],
                log_log: true,
                points_only: true,
                ..Default::default()
            };
            let left = pts.len() - shown.len();
            let mut caption =
                "Share of people with each number of contacts, on log–log axes.".to_owned();
            if left > 0 {
                caption.push_str(&format!(
                    " {left} class(es) with degree 0 or share 0 cannot appear on log axes."
                ));
            }
            push_line(&mut out, "degree-distribution".into(), c, caption);
        }
    }
    out
}

fn metrics_has_curve(study: &Study, metric: &str) -> bool {
    study.curves.iter().any(|p| p.metric == metric)
}

fn push_line(out: &mut Vec<Chart>, id: String, c: LineChart, caption: String) {
    let svg = line_chart(&c).unwrap_or_else(|e| failed(&e));
    out.push(Chart { id, title: c.title, caption, svg });
}

fn push_bar(out: &mut Vec<Chart>, id: String, c: BarChart, caption: String) {
    let svg = bar_chart(&c).unwrap_or_else(|e| failed(&e));
    out.push(Chart { id, title: c.title, caption, svg });
}

fn failed(e: &str) -> String {
    format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{WIDTH}\" height=\"40\"><text x=\"8\" y=\"24\">chart unavailable: {}</text></svg>",
        super::html::escape(e)
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use serde_json::json;

    #[test]
    fn degree_points_accepts_shapes_and_normalizes() {
        let a = degree_points(&json!([{"degree": 1, "count": 1}, {"degree": 2, "count": 3}]));
        assert_eq!(a, vec![(1.0, 0.25), (2.0, 0.75)]);
        let b = degree_points(&json!({"degrees": [2, 1], "probabilities": [0.5, 0.5]}));
        assert_eq!(b, vec![(1.0, 0.5), (2.0, 0.5)]);
        let c = degree_points(&json!([[3, 2.0], [4, 2.0]]));
        assert_eq!(c, vec![(3.0, 0.5), (4.0, 0.5)]);
        assert!(degree_points(&json!("nope")).is_empty());
    }

    #[test]
    fn ticks_are_short() {
        assert_eq!(tick(0.25), "0.25");
        assert_eq!(tick(1200.0), "1200");
        assert_eq!(tick(0.0), "0");
        assert_eq!(tick(1.5e-5), "2e-5");
    }

    #[test]
    fn log_chart_draws_points() {
        let c = LineChart {
            title: "d".into(),
            x_label: "k".into(),
            y_label: "p".into(),
            series: vec![Series {
                label: "p_k".into(),
                colour: 0,
                points: vec![(1.0, 0.5, 0.5, 0.5), (10.0, 0.01, 0.01, 0.01)],
                dashed: false,
            }],
            log_log: true,
            points_only: true,
            ..Default::default()
        };
        let s = line_chart(&c).unwrap();
        assert!(s.contains("<circle"), "{s}");
    }
}
