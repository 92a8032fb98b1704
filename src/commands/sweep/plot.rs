//! `growth.svg`: log₁₀(orbit size) and log₁₀ λ_g against the genus, one line per theory,
//! drawn as plain SVG text (no plotting library: two panels of lines, markers, ticks and
//! a legend are a few hundred bytes of markup each).
//!
//! Saturated runs are filled markers joined by solid lines. A run stopped at its cap is a
//! hollow marker with an upward arrow at N, the number of lines found: the orbit has at least
//! N lines, so the point is a lower bound, joined by a dashed line. λ_g exists only for
//! saturated orbits with B = λ_g·G⁻¹. Coordinates are floating-point for drawing only.

use super::result::RunResult;

/// One theory's points: (genus, log₁₀ value, saturated).
struct Series {
    /// The theory spec (runs of one spec under several labels share a line).
    theory: String,
    /// The label of its first run, for the legend.
    label: String,
    orbit: Vec<(usize, f64, bool)>,
    lambda: Vec<(usize, f64)>,
}

/// Colours of successive theories (a colour-blind-safe qualitative palette, common practice).
const PALETTE: [&str; 8] = [
    "#0072b2", "#d55e00", "#009e73", "#cc79a7", "#e69f00", "#56b4e9", "#000000", "#f0e442",
];

const PANEL_W: f64 = 380.0;
const PANEL_H: f64 = 280.0;
const LEFT: f64 = 60.0;
const TOP: f64 = 50.0;
const GAP: f64 = 90.0;

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
        if let (Some(n), Some(saturated)) = (r.orbit_size, r.saturated) {
            s.orbit
                .push((r.genus, (n.max(1) as f64).log10(), saturated));
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

    fn frame(&self, title: &str) -> String {
        let mut s = format!(
            "<rect x=\"{:.1}\" y=\"{TOP}\" width=\"{PANEL_W}\" height=\"{PANEL_H}\" fill=\"none\" stroke=\"#444\"/>\n\
             <text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\" font-size=\"15\">{}</text>\n",
            self.x0,
            self.x0 + PANEL_W / 2.0,
            TOP - 14.0,
            escape(title)
        );
        for g in self.genus_min..=self.genus_max {
            let x = self.x(g);
            s.push_str(&format!(
                "<line x1=\"{x:.1}\" y1=\"{:.1}\" x2=\"{x:.1}\" y2=\"{:.1}\" stroke=\"#444\"/>\n\
                 <text x=\"{x:.1}\" y=\"{:.1}\" text-anchor=\"middle\" font-size=\"12\">{g}</text>\n",
                TOP + PANEL_H,
                TOP + PANEL_H + 5.0,
                TOP + PANEL_H + 19.0
            ));
        }
        s.push_str(&format!(
            "<text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"middle\" font-size=\"12\">genus g</text>\n",
            self.x0 + PANEL_W / 2.0,
            TOP + PANEL_H + 38.0
        ));
        let decades = self.top_decade as i64;
        let step = (decades / 8).max(1);
        for k in (0..=decades).step_by(step as usize) {
            let y = self.y(k as f64);
            s.push_str(&format!(
                "<line x1=\"{:.1}\" y1=\"{y:.1}\" x2=\"{:.1}\" y2=\"{y:.1}\" stroke=\"#ddd\"/>\n\
                 <text x=\"{:.1}\" y=\"{:.1}\" text-anchor=\"end\" font-size=\"12\">10{}</text>\n",
                self.x0,
                self.x0 + PANEL_W,
                self.x0 - 6.0,
                y + 4.0,
                superscript(k)
            ));
        }
        s
    }
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

fn marker(x: f64, y: f64, (colour, shape): (&str, Shape), filled: bool) -> String {
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

/// The SVG of both panels and the legend.
pub fn growth_svg(rows: &[&RunResult]) -> String {
    let series = series_of(rows);
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
        x0: LEFT + PANEL_W + GAP,
        genus_min,
        genus_max,
        top_decade: lambda_top,
    };
    let legend_rows = series.len().div_ceil(4);
    let width = LEFT + 2.0 * PANEL_W + GAP + 30.0;
    let height = TOP + PANEL_H + 60.0 + 22.0 * (legend_rows as f64 + 1.0);
    let mut svg = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{width:.0}\" height=\"{height:.0}\" \
         viewBox=\"0 0 {width:.0} {height:.0}\" font-family=\"sans-serif\">\n\
         <rect width=\"100%\" height=\"100%\" fill=\"white\"/>\n"
    );
    svg.push_str(&orbit_panel.frame("orbit size (lines of the vacuum)"));
    svg.push_str(&lambda_panel.frame("prefactor λ_g (B = λ_g·G⁻¹)"));
    for (i, s) in series.iter().enumerate() {
        let look = style(i);
        let colour = look.0;
        // a small sideways shift per theory keeps coinciding points apart
        let shift = (i as f64 - (series.len() as f64 - 1.0) / 2.0) * 2.5;
        let pts: Vec<(f64, f64, bool)> = s
            .orbit
            .iter()
            .map(|&(g, v, sat)| (orbit_panel.x(g) + shift, orbit_panel.y(v), sat))
            .collect();
        for pair in pts.windows(2) {
            let dashed = !(pair[0].2 && pair[1].2);
            svg.push_str(&polyline(
                &[(pair[0].0, pair[0].1), (pair[1].0, pair[1].1)],
                colour,
                dashed,
            ));
        }
        for &(x, y, sat) in &pts {
            svg.push_str(&marker(x, y, look, sat));
        }
        let lpts: Vec<(f64, f64)> = s
            .lambda
            .iter()
            .map(|&(g, v)| (lambda_panel.x(g) + shift, lambda_panel.y(v)))
            .collect();
        svg.push_str(&polyline(&lpts, colour, false));
        for &(x, y) in &lpts {
            svg.push_str(&marker(x, y, look, true));
        }
    }
    let legend_top = TOP + PANEL_H + 62.0;
    for (i, s) in series.iter().enumerate() {
        let look = style(i);
        let colour = look.0;
        let x = LEFT + (i % 4) as f64 * 200.0;
        let y = legend_top + (i / 4) as f64 * 22.0;
        svg.push_str(&format!(
            "<line x1=\"{x:.1}\" y1=\"{y:.1}\" x2=\"{:.1}\" y2=\"{y:.1}\" stroke=\"{colour}\" stroke-width=\"3\"/>\n\
             <text x=\"{:.1}\" y=\"{:.1}\" font-size=\"13\">{}</text>\n",
            x + 24.0,
            x + 30.0,
            y + 4.0,
            escape(&s.label)
        ));
        svg.push_str(&marker(x + 12.0, y, look, true));
    }
    svg.push_str(&format!(
        "<text x=\"{LEFT}\" y=\"{:.1}\" font-size=\"12\" fill=\"#444\">filled marker: orbit closed · \
         hollow marker with arrow, dashed: not closed, at least N lines (stopped at a cap)</text>\n</svg>\n",
        legend_top + legend_rows as f64 * 22.0 + 6.0
    ));
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
    fn superscripts() {
        assert_eq!(superscript(12), "¹²");
        assert_eq!(superscript(-3), "⁻³");
    }
}
