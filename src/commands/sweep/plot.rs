//! `growth.svg`: log₁₀(orbit size) and log₁₀ λ_g against the genus, one line per theory,
//! drawn as plain SVG text (no plotting library: two panels of lines, markers, ticks and
//! a legend are a few hundred bytes of markup each).
//!
//! Saturated runs are filled markers joined by solid lines. A run stopped at its cap is a
//! hollow marker with an upward arrow at N, the number of lines found: the orbit has at least
//! N lines, so the point is a lower bound, joined by a dashed line; the series' name then
//! ends in `(∞)` when the image was proved infinite (a witness), `(?)` when the image was
//! asked for and not decided, `(capped)` when nothing more was asked.
//! Every series is named at its last point (names pushed apart so that none hides another;
//! series with identical values share one name tag). λ_g exists only for saturated orbits
//! with B = λ_g·G⁻¹; a panel with nothing to show says so. Coordinates are floating-point
//! for drawing only.

use cyclorb_pipeline::sweep::RunResult;

/// What is known of a run's orbit.
#[derive(Clone, Copy, PartialEq, Debug)]
enum Closure {
    /// Saturated: the point is the orbit size.
    Closed,
    /// Stopped at a cap; the image was proved infinite (a witness).
    Infinite,
    /// Stopped at a cap; the image was asked for and not decided.
    Undecided,
    /// Stopped at a cap; nothing more asked.
    Capped,
}

impl Closure {
    fn of(r: &RunResult) -> Closure {
        let infinite = r.image.as_ref().is_some_and(|i| i.finite == Some(false))
            || r.witness.as_ref().is_some_and(|w| w.found);
        match (r.saturated, infinite, &r.image) {
            (Some(true), _, _) => Closure::Closed,
            (_, true, _) => Closure::Infinite,
            (_, false, Some(_)) => Closure::Undecided,
            _ => Closure::Capped,
        }
    }

    /// What the name of a series ending at such a point says after it.
    fn suffix(self) -> &'static str {
        match self {
            Closure::Infinite => " (∞)",
            Closure::Undecided => " (?)",
            Closure::Capped => " (capped)",
            Closure::Closed => "",
        }
    }
}

/// One theory's points: (genus, log₁₀ value, closure).
struct Series {
    /// The theory spec (runs of one spec under several labels share a line).
    theory: String,
    /// The label of its first run, for the legend.
    label: String,
    orbit: Vec<(usize, f64, Closure)>,
    lambda: Vec<(usize, f64)>,
}

/// Colours of successive theories (a colour-blind-safe qualitative palette, common practice).
const PALETTE: [&str; 8] = [
    "#0072b2", "#d55e00", "#009e73", "#cc79a7", "#e69f00", "#56b4e9", "#000000", "#f0e442",
];

const PANEL_W: f64 = 400.0;
const PANEL_H: f64 = 320.0;
const LEFT: f64 = 70.0;
const TOP: f64 = 56.0;
/// Room right of each panel for the names of the series.
const GAP: f64 = 170.0;
/// Font sizes: titles, axes and names, notes.
const TITLE_SIZE: f64 = 18.0;
const TEXT_SIZE: f64 = 15.0;
const NOTE_SIZE: f64 = 14.0;
/// Smallest vertical distance between two series names.
const NAME_SPACING: f64 = 17.0;

/// log₁₀ of a positive decimal integer or fraction `p/q` given as text (display only).
pub fn log10_of_decimal(text: &str) -> Option<f64> {
    fn log_int(digits: &str) -> Option<f64> {
        let digits = digits.trim().trim_start_matches('+');
        if digits.is_empty() || !digits.bytes().all(|b| b.is_ascii_digit()) {
            return None;
        }
        let digits = digits.trim_start_matches('0');
        if digits.is_empty() {
            return None;
        }
        let lead: f64 = digits[..digits.len().min(15)].parse().ok()?;
        Some(lead.log10() + digits.len().saturating_sub(15) as f64)
    }
    match text.split_once('/') {
        Some((p, q)) => Some(log_int(p)? - log_int(q)?),
        None => log_int(text),
    }
}

fn superscript(n: i64) -> String {
    const DIGITS: [char; 10] = ['⁰', '¹', '²', '³', '⁴', '⁵', '⁶', '⁷', '⁸', '⁹'];
    let mut s = String::new();
    if n < 0 {
        s.push('⁻');
    }
    for c in n.unsigned_abs().to_string().chars() {
        s.push(DIGITS[c.to_digit(10).unwrap_or(0) as usize]);
    }
    s
}

fn escape(text: &str) -> String {
    text.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
        .replace('"', "&quot;")
}

fn series_of(rows: &[&RunResult]) -> Vec<Series> {
    let mut all: Vec<Series> = Vec::new();
    for r in rows {
        let index = match all.iter().position(|s| s.theory == r.theory) {
            Some(i) => i,
            None => {
                all.push(Series {
                    theory: r.theory.clone(),
                    label: r.label.clone(),
                    orbit: Vec::new(),
                    lambda: Vec::new(),
                });
                all.len() - 1
            }
        };
        let s = &mut all[index];
        if let (Some(n), Some(_)) = (r.orbit_size, r.saturated) {
            s.orbit
                .push((r.genus, (n.max(1) as f64).log10(), Closure::of(r)));
        }
        if let Some(l) = r.prefactor().and_then(log10_of_decimal) {
            s.lambda.push((r.genus, l));
        }
    }
    for s in &mut all {
        s.orbit.sort_by_key(|p| p.0);
        s.lambda.sort_by_key(|p| p.0);
    }
    all
}

/// The frame of one panel: maps (genus, log value) to SVG coordinates.
struct Panel {
    x0: f64,
    genus_min: usize,
    genus_max: usize,
    top_decade: f64,
}

impl Panel {
    fn x(&self, genus: usize) -> f64 {
        let span = (self.genus_max - self.genus_min).max(1) as f64;
        let pad = 0.08 * PANEL_W;
        let t = (genus - self.genus_min) as f64 / span;
        let t = if self.genus_max == self.genus_min {
            0.5
        } else {
            t
        };
        self.x0 + pad + t * (PANEL_W - 2.0 * pad)
    }

    fn y(&self, value: f64) -> f64 {
        TOP + PANEL_H - value.max(0.0) / self.top_decade * PANEL_H
    }

    /// The frame, ticks and title; `title` is SVG text markup (already escaped).
    fn frame(&self, title: &str) -> String {
        let mut s = format!(
            "<rect x=\"{:.1}\" y=\"{TOP}\" width=\"{PANEL_W}\" height=\"{PANEL_H}\" fill=\"none\" stroke=\"#444\"/>\n\
             <text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\" font-size=\"{TITLE_SIZE}\">{title}</text>\n",
            self.x0,
            self.x0 + PANEL_W / 2.0,
            TOP - 16.0,
        );
        for g in self.genus_min..=self.genus_max {
            let x = self.x(g);
            s.push_str(&format!(
                "<line x1=\"{x:.1}\" y1=\"{:.1}\" x2=\"{x:.1}\" y2=\"{:.1}\" stroke=\"#444\"/>\n\
                 <text x=\"{x:.1}\" y=\"{:.1}\" text-anchor=\"middle\" font-size=\"{TEXT_SIZE}\">{g}</text>\n",
                TOP + PANEL_H,
                TOP + PANEL_H + 5.0,
                TOP + PANEL_H + 22.0
            ));
        }
        s.push_str(&format!(
            "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\" font-size=\"{TEXT_SIZE}\">genus <tspan font-style=\"italic\">g</tspan></text>\n",
            self.x0 + PANEL_W / 2.0,
            TOP + PANEL_H + 44.0
        ));
        let decades = self.top_decade as i64;
        let step = (decades / 8).max(1);
        for k in (0..=decades).step_by(step as usize) {
            let y = self.y(k as f64);
            s.push_str(&format!(
                "<line x1=\"{:.1}\" y1=\"{y:.1}\" x2=\"{:.1}\" y2=\"{y:.1}\" stroke=\"#ddd\"/>\n\
                 <text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"end\" font-size=\"{TEXT_SIZE}\">10{}</text>\n",
                self.x0,
                self.x0 + PANEL_W,
                self.x0 - 6.0,
                y + 5.0,
                superscript(k)
            ));
        }
        s
    }

    /// A note in the middle of an empty panel.
    fn empty_note(&self, note: &str) -> String {
        format!(
            "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\" font-size=\"{NOTE_SIZE}\" fill=\"#444\">{}</text>\n",
            self.x0 + PANEL_W / 2.0,
            TOP + PANEL_H / 2.0,
            escape(note)
        )
    }
}

/// Names at the right end of series: each wants the height `y` of its last point; names are
/// placed in order of height, each at least [`NAME_SPACING`] below the previous one; if the
/// lowest would leave the panel, all move up by the overflow.
fn spread(wanted: &[f64]) -> Vec<f64> {
    let mut order: Vec<usize> = (0..wanted.len()).collect();
    order.sort_by(|&a, &b| wanted[a].total_cmp(&wanted[b]));
    let mut placed = vec![0.0; wanted.len()];
    let mut last = f64::NEG_INFINITY;
    for &i in &order {
        let y = wanted[i].max(last + NAME_SPACING);
        placed[i] = y;
        last = y;
    }
    let overflow = (last - (TOP + PANEL_H + 10.0)).max(0.0);
    placed.iter().map(|y| y - overflow).collect()
}

fn polyline(points: &[(f64, f64)], colour: &str, dashed: bool) -> String {
    if points.len() < 2 {
        return String::new();
    }
    let coords: Vec<String> = points
        .iter()
        .map(|(x, y)| format!("{x:.1},{y:.1}"))
        .collect();
    format!(
        "<polyline points=\"{}\" fill=\"none\" stroke=\"{colour}\" stroke-width=\"2\"{}/>\n",
        coords.join(" "),
        if dashed {
            " stroke-dasharray=\"5,4\""
        } else {
            ""
        }
    )
}

/// The colour of text in a series' colour: the palette's yellow is too light for text on
/// white, so its names are drawn in a darker shade of it.
fn text_colour(colour: &str) -> &str {
    if colour == "#f0e442" {
        "#9a8a00"
    } else {
        colour
    }
}

/// Marker shapes, cycled with the colours so that neighbouring theories differ in both.
#[derive(Clone, Copy)]
enum Shape {
    Circle,
    Square,
    Triangle,
    Diamond,
}

const SHAPES: [Shape; 4] = [
    Shape::Circle,
    Shape::Square,
    Shape::Triangle,
    Shape::Diamond,
];

/// Colour and shape of series `i`: colours cycle fastest, shapes change every palette.
fn style(i: usize) -> (&'static str, Shape) {
    (
        PALETTE[i % PALETTE.len()],
        SHAPES[(i / PALETTE.len() + i) % SHAPES.len()],
    )
}

fn marker(x: f64, y: f64, (colour, shape): (&str, Shape), closure: Closure) -> String {
    let filled = closure == Closure::Closed;
    let fill = if filled { colour } else { "white" };
    let paint = format!("fill=\"{fill}\" stroke=\"{colour}\" stroke-width=\"2\"");
    let r = 4.5;
    let mut s = match shape {
        Shape::Circle => format!("<circle cx=\"{x:.1}\" cy=\"{y:.1}\" r=\"{r}\" {paint}/>\n"),
        Shape::Square => format!(
            "<rect x=\"{:.1}\" y=\"{:.1}\" width=\"{:.1}\" height=\"{:.1}\" {paint}/>\n",
            x - r,
            y - r,
            2.0 * r,
            2.0 * r
        ),
        Shape::Triangle => format!(
            "<path d=\"M{x:.1},{:.1} L{:.1},{:.1} L{:.1},{:.1} Z\" {paint}/>\n",
            y - r - 1.0,
            x + r + 0.5,
            y + r,
            x - r - 0.5,
            y + r
        ),
        Shape::Diamond => format!(
            "<path d=\"M{x:.1},{:.1} L{:.1},{y:.1} L{x:.1},{:.1} L{:.1},{y:.1} Z\" {paint}/>\n",
            y - r - 1.0,
            x + r + 1.0,
            y + r + 1.0,
            x - r - 1.0
        ),
    };
    if !filled {
        s.push_str(&format!(
            "<path d=\"M{x:.1},{:.1} L{x:.1},{:.1} M{:.1},{:.1} L{x:.1},{:.1} L{:.1},{:.1}\" fill=\"none\" stroke=\"{colour}\" stroke-width=\"2\"/>\n",
            y - 7.0,
            y - 22.0,
            x - 5.0,
            y - 16.0,
            y - 22.0,
            x + 5.0,
            y - 16.0
        ));
    }
    s
}

/// Names of series with identical points joined ("ising = su2:2"), keyed by the first.
fn name_tags(series: &[Series]) -> Vec<Option<String>> {
    let same = |a: &Series, b: &Series| {
        a.orbit.len() == b.orbit.len()
            && a.orbit
                .iter()
                .zip(&b.orbit)
                .all(|(p, q)| p.0 == q.0 && p.1 == q.1 && p.2 == q.2)
            && a.lambda == b.lambda
    };
    let mut tags: Vec<Option<String>> = vec![None; series.len()];
    let mut taken = vec![false; series.len()];
    for i in 0..series.len() {
        if taken[i] {
            continue;
        }
        let mut names = vec![series[i].label.clone()];
        for j in i + 1..series.len() {
            if !taken[j] && same(&series[i], &series[j]) {
                taken[j] = true;
                names.push(series[j].label.clone());
            }
        }
        tags[i] = Some(names.join(" = "));
    }
    tags
}

/// The names of the series at their last points in one panel: `ends[i]` is series i's last
/// point (if any); names go right of the panel, pushed apart, with a leader line.
fn names_at_ends(
    panel: &Panel,
    ends: &[Option<(f64, f64, Closure)>],
    tags: &[Option<String>],
) -> String {
    let shown: Vec<usize> = (0..ends.len())
        .filter(|&i| ends[i].is_some() && tags[i].is_some())
        .collect();
    let wanted: Vec<f64> = shown.iter().map(|&i| ends[i].expect("shown").1).collect();
    let placed = spread(&wanted);
    let x_text = panel.x0 + PANEL_W + 14.0;
    let mut s = String::new();
    for (k, &i) in shown.iter().enumerate() {
        let (x, y, closure) = ends[i].expect("shown");
        let colour = style(i).0;
        let name = format!(
            "{}{}",
            tags[i].as_deref().unwrap_or_default(),
            closure.suffix()
        );
        s.push_str(&format!(
            "<path d=\"M{:.1},{y:.1} L{:.1},{y:.1} L{:.1},{:.1}\" fill=\"none\" stroke=\"{colour}\" stroke-width=\"0.8\" stroke-dasharray=\"2,2\"/>\n\
             <text x=\"{x_text:.1}\" y=\"{:.1}\" font-size=\"{TEXT_SIZE}\" fill=\"{}\">{}</text>\n",
            x + 8.0,
            panel.x0 + PANEL_W + 4.0,
            x_text - 2.0,
            placed[k],
            placed[k] + 5.0,
            text_colour(colour),
            escape(&name)
        ));
    }
    s
}

/// The SVG of both panels and the legend.
pub fn growth_svg(rows: &[&RunResult]) -> String {
    let series = series_of(rows);
    let tags = name_tags(&series);
    let genera = rows.iter().map(|r| r.genus);
    let genus_min = genera.clone().min().unwrap_or(1);
    let genus_max = genera.max().unwrap_or(1);
    let top = |values: &mut dyn Iterator<Item = f64>| values.fold(1.0_f64, f64::max).ceil();
    let orbit_top = top(&mut series.iter().flat_map(|s| s.orbit.iter().map(|p| p.1)));
    let lambda_top = top(&mut series.iter().flat_map(|s| s.lambda.iter().map(|p| p.1)));
    let orbit_panel = Panel {
        x0: LEFT,
        genus_min,
        genus_max,
        top_decade: orbit_top,
    };
    let lambda_panel = Panel {
        x0: LEFT + PANEL_W + GAP + 10.0,
        genus_min,
        genus_max,
        top_decade: lambda_top,
    };
    let legend_rows = series.len().div_ceil(4);
    let width = lambda_panel.x0 + PANEL_W + GAP;
    let height = TOP + PANEL_H + 70.0 + 24.0 * (legend_rows as f64 + 3.0);
    let mut svg = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{width:.0}\" height=\"{height:.0}\" \
         viewBox=\"0 0 {width:.0} {height:.0}\" font-family=\"sans-serif\">\n\
         <rect width=\"100%\" height=\"100%\" fill=\"white\"/>\n"
    );
    svg.push_str(&orbit_panel.frame("orbit size (lines of the vacuum)"));
    let sub_g =
        "<tspan font-size=\"75%\" dy=\"4\" font-style=\"italic\">g</tspan><tspan dy=\"-4\">";
    svg.push_str(&lambda_panel.frame(&format!(
        "prefactor λ{sub_g} (B = λ</tspan>{sub_g}·G⁻¹)</tspan>"
    )));
    if series.iter().all(|s| s.orbit.is_empty()) {
        svg.push_str(&orbit_panel.empty_note("no orbit was run"));
    }
    if series.iter().all(|s| s.lambda.is_empty()) {
        svg.push_str(&lambda_panel.empty_note("no closed orbit with B = λ·G⁻¹ in this sweep"));
    }
    let mut orbit_ends = Vec::new();
    let mut lambda_ends = Vec::new();
    for (i, s) in series.iter().enumerate() {
        let look = style(i);
        let colour = look.0;
        // a sideways shift per theory keeps coinciding points apart
        let shift = (i as f64 - (series.len() as f64 - 1.0) / 2.0) * 4.0;
        let pts: Vec<(f64, f64, Closure)> = s
            .orbit
            .iter()
            .map(|&(g, v, c)| (orbit_panel.x(g) + shift, orbit_panel.y(v), c))
            .collect();
        for pair in pts.windows(2) {
            let dashed = pair[0].2 != Closure::Closed || pair[1].2 != Closure::Closed;
            svg.push_str(&polyline(
                &[(pair[0].0, pair[0].1), (pair[1].0, pair[1].1)],
                colour,
                dashed,
            ));
        }
        for &(x, y, c) in &pts {
            svg.push_str(&marker(x, y, look, c));
        }
        orbit_ends.push(pts.last().copied());
        let lpts: Vec<(f64, f64)> = s
            .lambda
            .iter()
            .map(|&(g, v)| (lambda_panel.x(g) + shift, lambda_panel.y(v)))
            .collect();
        svg.push_str(&polyline(&lpts, colour, false));
        for &(x, y) in &lpts {
            svg.push_str(&marker(x, y, look, Closure::Closed));
        }
        lambda_ends.push(lpts.last().map(|&(x, y)| (x, y, Closure::Closed)));
    }
    svg.push_str(&names_at_ends(&orbit_panel, &orbit_ends, &tags));
    svg.push_str(&names_at_ends(&lambda_panel, &lambda_ends, &tags));
    let legend_top = TOP + PANEL_H + 76.0;
    for (i, s) in series.iter().enumerate() {
        let look = style(i);
        let colour = look.0;
        let x = LEFT + (i % 4) as f64 * 230.0;
        let y = legend_top + (i / 4) as f64 * 24.0;
        svg.push_str(&format!(
            "<line x1=\"{x:.1}\" y1=\"{y:.1}\" x2=\"{:.1}\" y2=\"{y:.1}\" stroke=\"{colour}\" stroke-width=\"3\"/>\n\
             <text x=\"{:.1}\" y=\"{:.1}\" font-size=\"{TEXT_SIZE}\">{}</text>\n",
            x + 24.0,
            x + 30.0,
            y + 5.0,
            escape(&s.label)
        ));
        svg.push_str(&marker(x + 12.0, y, look, Closure::Closed));
    }
    let notes_top = legend_top + legend_rows as f64 * 24.0 + 8.0;
    for (k, line) in [
        "filled marker, solid line: orbit closed (its size)",
        "hollow marker with arrow, dashed line: stopped at a cap, at least that many lines",
        "after a name: (∞) image proved infinite (a witness), (?) image not decided, (capped) not asked",
    ]
    .iter()
    .enumerate()
    {
        svg.push_str(&format!(
            "<text x=\"{LEFT}\" y=\"{:.1}\" font-size=\"{NOTE_SIZE}\" fill=\"#444\">{line}</text>\n",
            notes_top + k as f64 * 20.0
        ));
    }
    svg.push_str("</svg>\n");
    svg
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn logarithms_of_exact_numbers() {
        // log10(384) = 2.5843… and log10(3/2) = 0.1760… (standard tables, common practice)
        assert!((log10_of_decimal("384").unwrap() - 2.584_331).abs() < 1e-5);
        assert!((log10_of_decimal("3/2").unwrap() - 0.176_091).abs() < 1e-5);
        let big = format!("1{}", "0".repeat(40));
        assert!((log10_of_decimal(&big).unwrap() - 40.0).abs() < 1e-9);
        assert_eq!(log10_of_decimal("-3"), None);
        assert_eq!(log10_of_decimal("(1 + z)/2"), None);
    }

    #[test]
    fn names_are_pushed_apart_but_stay_near_their_points() {
        let placed = spread(&[100.0, 101.0, 300.0, 102.0]);
        let mut sorted = placed.clone();
        sorted.sort_by(f64::total_cmp);
        for w in sorted.windows(2) {
            assert!(w[1] - w[0] >= NAME_SPACING - 1e-9, "{placed:?}");
        }
        // names without neighbours stay where they were wanted
        assert_eq!(placed[0], 100.0);
        assert_eq!(placed[2], 300.0);
    }

    #[test]
    fn superscripts() {
        assert_eq!(superscript(12), "¹²");
        assert_eq!(superscript(-3), "⁻³");
    }
}
