//! A small line plot of a quantity against the roll's diameter, drawn cell by cell: zones of the roll as
//! labelled bands (alternate bands dotted, so they read without colour), horizontal reference
//! lines (zero, core crush rating), one curve in braille dots and an optional comparison curve
//! in bullets.

use ratatui::buffer::Buffer;
use ratatui::layout::Rect;
use ratatui::style::Style;
use ratatui::text::Line;
use ratatui::widgets::{Block, Paragraph, Widget};

/// How a curve is drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Glyph {
    /// Braille dots, 2×4 per cell.
    Braille,
    /// One bullet per cell.
    Bullet,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Series {
    pub points: Vec<(f64, f64)>,
    pub glyph: Glyph,
    pub style: Style,
}

#[derive(Debug, Clone, PartialEq)]
pub struct ReferenceLine {
    pub y: f64,
    pub label: String,
    pub glyph: char,
    pub style: Style,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Band {
    pub label: String,
    pub from: f64,
    pub to: f64,
}

pub struct ZonePlot<'a> {
    pub block: Block<'a>,
    pub series: Vec<Series>,
    pub bands: Vec<Band>,
    pub lines: Vec<ReferenceLine>,
    pub format_y: &'a dyn Fn(f64) -> String,
    pub format_x: &'a dyn Fn(f64) -> String,
    pub band_style: Style,
    pub axis_style: Style,
}

/// Where a plot put its words and its curves, in buffer cells: what the layout test checks
/// (no label on a curve or on another label).
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Drawn {
    /// Each label as (column, row, text).
    pub labels: Vec<(u16, u16, String)>,
    /// Cells holding a curve glyph.
    pub curve: Vec<(u16, u16)>,
}

impl Drawn {
    /// The cells of each label.
    pub fn label_cells(&self) -> impl Iterator<Item = Vec<(u16, u16)>> + '_ {
        self.labels.iter().map(|(x, y, text)| {
            (0..text.chars().count() as u16)
                .map(|i| (x + i, *y))
                .collect()
        })
    }

    fn put(&mut self, buf: &mut Buffer, x: u16, y: u16, text: &str, style: Style) {
        buf.set_string(x, y, text, style);
        self.labels.push((x, y, text.to_string()));
    }

    /// Whether `text` at (x, y) would cover a curve cell.
    fn on_curve(&self, x: u16, y: u16, text: &str) -> bool {
        let end = x + text.chars().count() as u16;
        self.curve
            .iter()
            .any(|&(cx, cy)| cy == y && cx >= x && cx < end)
    }
}

const BRAILLE_BITS: [[u8; 4]; 2] = [[0x01, 0x02, 0x04, 0x40], [0x08, 0x10, 0x20, 0x80]];

fn range_of(values: impl Iterator<Item = f64>) -> Option<(f64, f64)> {
    values
        .filter(|v| v.is_finite())
        .fold(None, |acc, v| match acc {
            None => Some((v, v)),
            Some((lo, hi)) => Some((lo.min(v), hi.max(v))),
        })
}

/// A short label for a band `width` cells wide: the name, else its abbreviation (a whole
/// short form with its full stop, never a cut word such as "sur"), else its initial in capitals.
fn fitted_label(label: &str, width: usize) -> String {
    let short = match label {
        "surface" => "surf.",
        "middle" => "mid.",
        "outer" => "out.",
        "inner" => "inn.",
        _ => "",
    };
    if label.chars().count() <= width {
        label.to_string()
    } else if !short.is_empty() && short.chars().count() <= width {
        short.to_string()
    } else if width >= 1 {
        label.chars().take(1).collect::<String>().to_uppercase()
    } else {
        String::new()
    }
}

/// Where the plot area is and which data ranges it shows.
#[derive(Debug, Clone, Copy)]
struct Frame {
    plot: Rect,
    w: usize,
    h: usize,
    x0: f64,
    x1: f64,
    y0: f64,
    y1: f64,
}

impl Frame {
    /// The data x at the middle of column `c`.
    fn column_x(&self, c: usize) -> f64 {
        self.x0 + (c as f64 + 0.5) / self.w as f64 * (self.x1 - self.x0)
    }

    /// The row showing `y`, if it is on the plot.
    fn row_of(&self, y: f64) -> Option<usize> {
        let f = (self.y1 - y) / (self.y1 - self.y0);
        (0.0..=1.0)
            .contains(&f)
            .then(|| ((f * self.h as f64) as usize).min(self.h - 1))
    }

    /// Braille dot column (two per cell).
    fn dot_x(&self, x: f64) -> f64 {
        ((x - self.x0) / (self.x1 - self.x0) * (self.w * 2) as f64)
            .clamp(0.0, (self.w * 2 - 1) as f64)
    }

    /// Braille dot row (four per cell).
    fn dot_y(&self, y: f64) -> f64 {
        ((self.y1 - y) / (self.y1 - self.y0) * (self.h * 4) as f64)
            .clamp(0.0, (self.h * 4 - 1) as f64)
    }

    /// The dot coordinates of a segment's ends: (ax, ay, bx, by).
    fn segment(&self, pair: &[(f64, f64)]) -> (f64, f64, f64, f64) {
        (
            self.dot_x(pair[0].0),
            self.dot_y(pair[0].1),
            self.dot_x(pair[1].0),
            self.dot_y(pair[1].1),
        )
    }
}

impl ZonePlot<'_> {
    /// The y range: the data (and zero), widened for the reference lines near it. Returns the
    /// range and the lines shown and off the plot.
    fn y_range(&self) -> ((f64, f64), Vec<&ReferenceLine>, Vec<&ReferenceLine>) {
        let data = range_of(
            self.series
                .iter()
                .flat_map(|s| s.points.iter().map(|p| p.1))
                .chain(std::iter::once(0.0)),
        )
        .unwrap_or((0.0, 1.0));
        // Reference lines far above the data would flatten the curves: note them instead.
        let span = (data.1 - data.0).abs().max(f64::MIN_POSITIVE);
        let (shown_lines, off_plot): (Vec<_>, Vec<_>) = self
            .lines
            .iter()
            .partition(|l| l.y >= data.0 - span && l.y <= data.1 + span);
        let (mut y0, mut y1) = range_of(
            std::iter::once(data.0)
                .chain(std::iter::once(data.1))
                .chain(shown_lines.iter().map(|l| l.y)),
        )
        .unwrap_or((0.0, 1.0));
        if y1 <= y0 {
            y1 = y0 + 1.0;
        }
        let pad = (y1 - y0) * 0.05;
        y0 -= if y0 < 0.0 { pad } else { 0.0 };
        y1 += pad;
        ((y0, y1), shown_lines, off_plot)
    }

    /// Bands: dotted background in alternate bands, a boundary mark, labels on the top row.
    fn draw_bands(&self, f: &Frame, label_row: u16, buf: &mut Buffer, drawn: &mut Drawn) {
        let band_of = |x: f64| self.bands.iter().position(|b| x >= b.from && x <= b.to);
        let mut spans: Vec<(usize, usize, usize)> = Vec::new(); // band, first col, last col
        for c in 0..f.w {
            if let Some(b) = band_of(f.column_x(c)) {
                match spans.last_mut() {
                    Some(last) if last.0 == b => last.2 = c,
                    _ => spans.push((b, c, c)),
                }
                if b % 2 == 1 {
                    for r in 0..f.h {
                        buf[(f.plot.x + c as u16, f.plot.y + r as u16)]
                            .set_char('·')
                            .set_style(self.band_style);
                    }
                }
            }
        }
        for (i, &(b, first, last)) in spans.iter().enumerate() {
            if i > 0 {
                for r in 0..f.h {
                    buf[(f.plot.x + first as u16, f.plot.y + r as u16)]
                        .set_char('┆')
                        .set_style(self.band_style);
                }
            }
            let width = last - first + 1;
            // One free cell so neighbouring labels never run together ("outersurface").
            let text = match fitted_label(&self.bands[b].label, width.saturating_sub(1)) {
                // A one-cell band keeps its initial.
                text if text.is_empty() => fitted_label(&self.bands[b].label, width),
                text => text,
            };
            let offset = (width.saturating_sub(text.chars().count())) / 2;
            drawn.put(
                buf,
                f.plot.x + (first + offset) as u16,
                label_row,
                &text,
                self.band_style,
            );
        }
    }

    /// Reference lines across the plot.
    fn draw_lines(&self, f: &Frame, shown: &[&ReferenceLine], buf: &mut Buffer) {
        for line in shown {
            if let Some(r) = f.row_of(line.y) {
                for c in 0..f.w {
                    buf[(f.plot.x + c as u16, f.plot.y + r as u16)]
                        .set_char(line.glyph)
                        .set_style(line.style);
                }
            }
        }
    }

    /// Each reference line's label on its line where the curves leave room: the right end,
    /// else the left end, else the row above or below; never over a curve (drawn after them).
    fn draw_line_labels(
        &self,
        f: &Frame,
        shown: &[&ReferenceLine],
        buf: &mut Buffer,
        drawn: &mut Drawn,
    ) {
        for line in shown {
            let Some(r) = f.row_of(line.y) else { continue };
            let len = line.label.chars().count();
            if line.label.is_empty() || len + 2 >= f.w {
                continue;
            }
            let row = f.plot.y + r as u16;
            let (left, right) = (f.plot.x, f.plot.right() - len as u16);
            let rows = [Some(row), row.checked_sub(1), row.checked_add(1)];
            let spot = rows
                .into_iter()
                .flatten()
                .filter(|y| (f.plot.y..f.plot.bottom()).contains(y))
                .flat_map(|y| [(right, y), (left, y)])
                .find(|&(x, y)| {
                    let taken = drawn
                        .label_cells()
                        .flatten()
                        .any(|(lx, ly)| ly == y && lx >= x && lx < x + len as u16);
                    !taken && !drawn.on_curve(x, y, &line.label)
                });
            if let Some((x, y)) = spot {
                drawn.put(buf, x, y, &line.label, line.style);
            }
        }
    }

    /// Curves: comparison bullets first, then the braille curve on top.
    fn draw_curves(&self, f: &Frame, buf: &mut Buffer, drawn: &mut Drawn) {
        let (w, h) = (f.w, f.h);
        for series in self.series.iter().filter(|s| s.glyph == Glyph::Bullet) {
            for pair in series.points.windows(2) {
                let (ax, ay, bx, by) = f.segment(pair);
                let steps = ((bx - ax).abs().max((by - ay).abs()) / 2.0).ceil().max(1.0) as usize;
                for s in 0..=steps {
                    let t = s as f64 / steps as f64;
                    let c = ((ax + t * (bx - ax)) / 2.0) as usize;
                    let r = ((ay + t * (by - ay)) / 4.0) as usize;
                    let cell = (
                        f.plot.x + c.min(w - 1) as u16,
                        f.plot.y + r.min(h - 1) as u16,
                    );
                    buf[cell].set_char('•').set_style(series.style);
                    drawn.curve.push(cell);
                }
            }
        }
        for series in self.series.iter().filter(|s| s.glyph == Glyph::Braille) {
            let mut cells = vec![0u8; w * h];
            let mut set = |dx: f64, dy: f64| {
                let (dx, dy) = (dx as usize, dy as usize);
                let cell = (dy / 4).min(h - 1) * w + (dx / 2).min(w - 1);
                cells[cell] |= BRAILLE_BITS[dx % 2][dy % 4];
            };
            if series.points.len() == 1 {
                set(f.dot_x(series.points[0].0), f.dot_y(series.points[0].1));
            }
            for pair in series.points.windows(2) {
                let (ax, ay, bx, by) = f.segment(pair);
                let steps = (bx - ax).abs().max((by - ay).abs()).ceil().max(1.0) as usize;
                for s in 0..=steps {
                    let t = s as f64 / steps as f64;
                    set(ax + t * (bx - ax), ay + t * (by - ay));
                }
            }
            for (i, bits) in cells.iter().enumerate() {
                if *bits != 0 {
                    let ch = char::from_u32(0x2800 + u32::from(*bits)).unwrap_or('•');
                    let cell = (f.plot.x + (i % w) as u16, f.plot.y + (i / w) as u16);
                    buf[cell].set_char(ch).set_style(series.style);
                    drawn.curve.push(cell);
                }
            }
        }
    }

    /// Axes: y labels at top, bottom and zero; x labels at both ends and the middle.
    fn draw_axes(
        &self,
        f: &Frame,
        inner: Rect,
        y_label_width: u16,
        buf: &mut Buffer,
        drawn: &mut Drawn,
    ) {
        let mut y_marks = vec![(0usize, f.y1), (f.h - 1, f.y0)];
        if let Some(r) = f.row_of(0.0)
            && r != 0
            && r != f.h - 1
        {
            y_marks.push((r, 0.0));
        }
        for (r, v) in y_marks {
            let text = (self.format_y)(v);
            let x =
                inner.x + y_label_width - 1 - (text.chars().count() as u16).min(y_label_width - 1);
            drawn.put(buf, x, f.plot.y + r as u16, &text, self.axis_style);
        }
        let bottom = inner.bottom() - 1;
        let left = (self.format_x)(f.x0);
        let right = (self.format_x)(f.x1);
        let middle = format!("⌀ {}", (self.format_x)((f.x0 + f.x1) / 2.0));
        drawn.put(buf, f.plot.x, bottom, &left, self.axis_style);
        let rx = f.plot.right().saturating_sub(right.chars().count() as u16);
        // The right end's label only with a free cell after the left one.
        if rx > f.plot.x + left.chars().count() as u16 {
            drawn.put(buf, rx, bottom, &right, self.axis_style);
        }
        let mid_len = middle.chars().count() as u16;
        let mx = f.plot.x + f.plot.width.saturating_sub(mid_len) / 2;
        if mx > f.plot.x + left.chars().count() as u16 && mx + mid_len < rx {
            drawn.put(buf, mx, bottom, &middle, self.axis_style);
        }
    }
}

impl Widget for ZonePlot<'_> {
    fn render(self, area: Rect, buf: &mut Buffer) {
        self.draw(area, buf);
    }
}

impl ZonePlot<'_> {
    /// Draw the plot and say where its labels and curves went.
    pub fn draw(&self, area: Rect, buf: &mut Buffer) -> Drawn {
        let mut drawn = Drawn::default();
        let inner = self.block.inner(area);
        self.block.clone().render(area, buf);
        if inner.width < 16 || inner.height < 5 {
            Paragraph::new("(enlarge the window to see this plot)").render(inner, buf);
            return drawn;
        }
        let Some((x0, x1)) = range_of(
            self.series
                .iter()
                .flat_map(|s| s.points.iter().map(|p| p.0))
                .chain(self.bands.iter().flat_map(|b| [b.from, b.to])),
        ) else {
            Paragraph::new("no data").render(inner, buf);
            return drawn;
        };
        let x1 = if x1 > x0 { x1 } else { x0 + 1.0 };
        let ((y0, y1), shown_lines, off_plot) = self.y_range();
        let y_label_width = [y1, y0, 0.0]
            .iter()
            .map(|v| (self.format_y)(*v).chars().count())
            .max()
            .unwrap_or(4) as u16
            + 1;
        let plot = Rect {
            x: inner.x + y_label_width,
            y: inner.y + 1,
            width: inner.width.saturating_sub(y_label_width),
            height: inner.height.saturating_sub(2),
        };
        if plot.width < 4 || plot.height < 2 {
            return drawn;
        }
        let frame = Frame {
            plot,
            w: usize::from(plot.width),
            h: usize::from(plot.height),
            x0,
            x1,
            y0,
            y1,
        };
        self.draw_bands(&frame, inner.y, buf, &mut drawn);
        // Reference lines far off the plot are named on the bottom border, right-aligned.
        if let Some(line) = off_plot.first() {
            let text = format!(" ↑ {} {} ", line.label, (self.format_y)(line.y));
            let x = inner.right().saturating_sub(text.chars().count() as u16);
            if area.bottom() > inner.bottom() && x > inner.x {
                drawn.put(buf, x, area.bottom() - 1, &text, line.style);
            }
        }
        self.draw_lines(&frame, &shown_lines, buf);
        self.draw_curves(&frame, buf, &mut drawn);
        self.draw_line_labels(&frame, &shown_lines, buf, &mut drawn);
        self.draw_axes(&frame, inner, y_label_width, buf, &mut drawn);
        drawn
    }
}

/// A legend line for a plot title.
pub fn legend(items: &[(&str, &str)]) -> Line<'static> {
    let text = items
        .iter()
        .map(|(glyph, what)| format!("{glyph} {what}"))
        .collect::<Vec<_>>()
        .join("  ");
    Line::from(text)
}

#[cfg(test)]
mod tests {
    use super::fitted_label;

    /// A zone name that does not fit shows whole: the name, its abbreviation or its initial.
    #[test]
    fn zone_labels_are_never_cut_words() {
        assert_eq!(fitted_label("surface", 7), "surface");
        assert_eq!(fitted_label("surface", 6), "surf.");
        assert_eq!(fitted_label("surface", 4), "S");
        assert_eq!(fitted_label("outer", 4), "out.");
        assert_eq!(fitted_label("outer", 3), "O");
        assert_eq!(fitted_label("middle", 5), "mid.");
        assert_eq!(fitted_label("core", 3), "C");
        assert_eq!(fitted_label("surface", 0), "");
        for name in ["core", "inner", "middle", "outer", "surface"] {
            for width in 0..9 {
                let shown = fitted_label(name, width);
                assert!(shown.chars().count() <= width, "{name} in {width}: {shown}");
                let whole = shown == name
                    || shown.ends_with('.')
                    || (shown.chars().count() == 1 && shown.chars().all(char::is_uppercase))
                    || shown.is_empty();
                assert!(whole, "{name} in {width} cells shows a cut word {shown:?}");
            }
        }
    }
}
