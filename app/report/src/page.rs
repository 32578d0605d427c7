//! Pages as display lists, and their rendering to PDF with krilla.
//!
//! Layout code fills [`Page`]s with plain drawing operations in points (origin top left, y
//! down); [`render`] turns them into a PDF. Keeping the list lets tests inspect what is on a
//! page (for example that no text runs past the margins) without parsing the PDF.
//! Everything is drawn in greys, so the sheet prints the same on a greyscale printer.

use krilla::Document;
use krilla::color::luma;
use krilla::geom::{PathBuilder, Point};
use krilla::metadata::Metadata;
use krilla::num::NormalizedF32;
use krilla::page::PageSettings;
use krilla::paint::{Fill, LineCap, LineJoin, Stroke, StrokeDash};
use krilla::text::{Font, TextDirection};

use super::fonts::{self, Weight};

/// Paper size.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Paper {
    /// ISO A4, 210 × 297 mm.
    #[default]
    A4,
    /// US Letter, 8.5 × 11 in.
    Letter,
}

impl Paper {
    /// Width and height (pt, 1/72 in).
    pub fn size(self) -> (f32, f32) {
        match self {
            Paper::A4 => (595.28, 841.89),
            Paper::Letter => (612.0, 792.0),
        }
    }

    /// Name as printed.
    pub fn name(self) -> &'static str {
        match self {
            Paper::A4 => "A4",
            Paper::Letter => "Letter",
        }
    }

    /// Parses "a4" or "letter" (any case).
    pub fn parse(text: &str) -> Option<Paper> {
        match text.to_ascii_lowercase().as_str() {
            "a4" => Some(Paper::A4),
            "letter" | "us-letter" => Some(Paper::Letter),
            _ => None,
        }
    }
}

/// A grey level; the sheet uses no colour.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Ink {
    Black,
    /// Secondary text and the deformed geometry's details.
    Dark,
    /// Labels of fields, dimension lines.
    Mid,
    /// The drawn geometry, rules between table rows.
    Light,
    /// Backgrounds of header rows and bands.
    Tint,
    White,
}

impl Ink {
    fn luma(self) -> u8 {
        match self {
            Ink::Black => 0,
            Ink::Dark => 55,
            Ink::Mid => 110,
            Ink::Light => 175,
            Ink::Tint => 232,
            Ink::White => 255,
        }
    }
}

/// How a path is stroked.
#[derive(Debug, Clone, PartialEq)]
pub struct Pen {
    pub width: f32,
    pub ink: Ink,
    /// Dash pattern (pt on, pt off, …); solid when empty.
    pub dash: Vec<f32>,
}

impl Pen {
    pub fn solid(width: f32, ink: Ink) -> Pen {
        Pen {
            width,
            ink,
            dash: Vec::new(),
        }
    }

    pub fn dashed(width: f32, ink: Ink, on: f32, off: f32) -> Pen {
        Pen {
            width,
            ink,
            dash: vec![on, off],
        }
    }
}

/// One drawing operation (pt, origin top left, y down).
#[derive(Debug, Clone, PartialEq)]
pub enum Op {
    /// Text with its baseline starting at (x, y).
    Text {
        x: f32,
        y: f32,
        size: f32,
        weight: Weight,
        ink: Ink,
        text: String,
    },
    /// A polyline or polygon.
    Path {
        points: Vec<(f32, f32)>,
        closed: bool,
        pen: Option<Pen>,
        fill: Option<Ink>,
    },
    /// A circle.
    Circle {
        centre: (f32, f32),
        radius: f32,
        pen: Option<Pen>,
        fill: Option<Ink>,
    },
}

/// Type size (pt), weight and grey of a text run.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Style {
    pub size: f32,
    pub weight: Weight,
    pub ink: Ink,
}

impl Style {
    pub fn new(size: f32, weight: Weight, ink: Ink) -> Style {
        Style { size, weight, ink }
    }
}

/// Horizontal alignment of a text run.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Align {
    Left,
    Centre,
    Right,
}

/// One page as a list of operations.
#[derive(Debug, Clone, Default)]
pub struct Page {
    pub ops: Vec<Op>,
}

impl Page {
    /// Text with its baseline at `y`, aligned on `x`.
    pub fn text(&mut self, (x, y): (f32, f32), style: Style, align: Align, text: &str) {
        let Style { size, weight, ink } = style;
        if text.is_empty() {
            return;
        }
        let text = &quotes(text);
        let w = fonts::width(text, size, weight);
        let x = match align {
            Align::Left => x,
            Align::Centre => x - w / 2.0,
            Align::Right => x - w,
        };
        self.ops.push(Op::Text {
            x,
            y,
            size,
            weight,
            ink,
            text: text.to_string(),
        });
    }

    pub fn line(&mut self, a: (f32, f32), b: (f32, f32), pen: Pen) {
        self.path(vec![a, b], false, Some(pen), None);
    }

    pub fn path(&mut self, points: Vec<(f32, f32)>, closed: bool, pen: Option<Pen>, fill: Option<Ink>) {
        self.ops.push(Op::Path { points, closed, pen, fill });
    }

    /// A rectangle from its top-left corner.
    pub fn rect(&mut self, x: f32, y: f32, w: f32, h: f32, pen: Option<Pen>, fill: Option<Ink>) {
        self.path(vec![(x, y), (x + w, y), (x + w, y + h), (x, y + h)], true, pen, fill);
    }

    pub fn circle(&mut self, centre: (f32, f32), radius: f32, pen: Option<Pen>, fill: Option<Ink>) {
        self.ops.push(Op::Circle { centre, radius, pen, fill });
    }

    /// Every text run on the page, in drawing order.
    pub fn texts(&self) -> impl Iterator<Item = &str> {
        self.ops.iter().filter_map(|op| match op {
            Op::Text { text, .. } => Some(text.as_str()),
            _ => None,
        })
    }
}

/// Names quoted with backticks (as the core writes them) get typographic quotes on paper.
pub fn quotes(text: &str) -> String {
    let mut open = true;
    text.chars()
        .map(|c| {
            if c == '`' {
                let q = if open { '“' } else { '”' };
                open = !open;
                q
            } else {
                c
            }
        })
        .collect()
}

fn fill_of(ink: Ink) -> Fill {
    Fill {
        paint: luma::Color::new(ink.luma()).into(),
        opacity: NormalizedF32::ONE,
        rule: Default::default(),
    }
}

fn stroke_of(pen: &Pen) -> Stroke {
    Stroke {
        paint: luma::Color::new(pen.ink.luma()).into(),
        width: pen.width,
        miter_limit: 4.0,
        line_cap: LineCap::Butt,
        line_join: LineJoin::Round,
        opacity: NormalizedF32::ONE,
        dash: (!pen.dash.is_empty()).then(|| StrokeDash {
            array: pen.dash.clone(),
            offset: 0.0,
        }),
    }
}

/// Four cubic Béziers approximating a circle (κ = 0.5523).
fn circle_path(pb: &mut PathBuilder, (cx, cy): (f32, f32), r: f32) {
    let k = 0.552_284_8 * r;
    pb.move_to(cx + r, cy);
    pb.cubic_to(cx + r, cy + k, cx + k, cy + r, cx, cy + r);
    pb.cubic_to(cx - k, cy + r, cx - r, cy + k, cx - r, cy);
    pb.cubic_to(cx - r, cy - k, cx - k, cy - r, cx, cy - r);
    pb.cubic_to(cx + k, cy - r, cx + r, cy - k, cx + r, cy);
    pb.close();
}

/// Renders the pages to PDF bytes. The same pages give the same bytes.
pub fn render(pages: &[Page], paper: Paper, title: &str) -> Result<Vec<u8>, String> {
    let regular = Font::new(fonts::REGULAR.into(), 0).ok_or("the embedded regular font could not be read")?;
    let bold = Font::new(fonts::BOLD.into(), 0).ok_or("the embedded bold font could not be read")?;
    let (w, h) = paper.size();
    let mut document = Document::new();
    document.set_metadata(
        Metadata::new()
            .title(title.to_string())
            .creator(format!("Rigwright {}", env!("CARGO_PKG_VERSION"))),
    );
    for page in pages {
        let settings = PageSettings::from_wh(w, h).ok_or("invalid paper size")?;
        let mut pdf_page = document.start_page_with(settings);
        let mut surface = pdf_page.surface();
        for op in &page.ops {
            match op {
                Op::Text {
                    x,
                    y,
                    size,
                    weight,
                    ink,
                    text,
                } => {
                    surface.set_fill(Some(fill_of(*ink)));
                    surface.set_stroke(None);
                    let font = match weight {
                        Weight::Regular => regular.clone(),
                        Weight::Bold => bold.clone(),
                    };
                    surface.draw_text(Point::from_xy(*x, *y), font, *size, text, false, TextDirection::LeftToRight);
                }
                Op::Path { points, closed, pen, fill } => {
                    let mut pb = PathBuilder::new();
                    for (i, (px, py)) in points.iter().enumerate() {
                        if i == 0 {
                            pb.move_to(*px, *py);
                        } else {
                            pb.line_to(*px, *py);
                        }
                    }
                    if *closed {
                        pb.close();
                    }
                    if let Some(path) = pb.finish() {
                        surface.set_fill(fill.map(fill_of));
                        surface.set_stroke(pen.as_ref().map(stroke_of));
                        surface.draw_path(&path);
                    }
                }
                Op::Circle { centre, radius, pen, fill } => {
                    let mut pb = PathBuilder::new();
                    circle_path(&mut pb, *centre, *radius);
                    if let Some(path) = pb.finish() {
                        surface.set_fill(fill.map(fill_of));
                        surface.set_stroke(pen.as_ref().map(stroke_of));
                        surface.draw_path(&path);
                    }
                }
            }
        }
        surface.finish();
        pdf_page.finish();
    }
    document.finish().map_err(|e| format!("the PDF could not be written: {e:?}"))
}
