//! Tables: column widths from their contents, rows of one or more lines, a shaded heading
//! row repeated on every page the table runs onto.

use super::fonts::{self, Weight};
use super::page::{Align, Ink, Page, Pen, Style};

/// Smallest and largest type size of table text (pt).
const SIZES: [f32; 4] = [7.0, 6.5, 6.0, 5.5];
/// Padding inside a cell (pt).
const PAD: f32 = 3.0;

/// One column.
#[derive(Debug, Clone)]
pub struct Column {
    /// Heading; a second line (after '\n') is printed below, e.g. the unit.
    pub head: String,
    pub align: Align,
}

impl Column {
    pub fn new(head: &str, align: Align) -> Column {
        Column {
            head: head.to_string(),
            align,
        }
    }
}

/// One cell: its first line in black, further lines smaller and grey (e.g. the load case).
#[derive(Debug, Clone, Default)]
pub struct Cell {
    pub lines: Vec<String>,
    pub bold: bool,
}

impl Cell {
    pub fn text(s: impl Into<String>) -> Cell {
        Cell {
            lines: vec![s.into()],
            bold: false,
        }
    }

    pub fn bold(s: impl Into<String>) -> Cell {
        Cell {
            lines: vec![s.into()],
            bold: true,
        }
    }

    /// A value with a smaller second line.
    pub fn two(a: impl Into<String>, b: impl Into<String>) -> Cell {
        let b = b.into();
        let mut lines = vec![a.into()];
        if !b.is_empty() {
            lines.push(b);
        }
        Cell { lines, bold: false }
    }
}

/// A table laid out to a width.
#[derive(Debug, Clone)]
pub struct Table {
    pub columns: Vec<Column>,
    pub rows: Vec<Vec<Cell>>,
    /// Type size chosen to fit (pt).
    size: f32,
    widths: Vec<f32>,
}

impl Table {
    /// Lays the table out to `width` pt: the largest type size at which the natural widths
    /// fit, spare width shared out; at the smallest size, wide columns are cut with "…".
    pub fn new(columns: Vec<Column>, rows: Vec<Vec<Cell>>, width: f32) -> Table {
        let natural = |size: f32| -> Vec<f32> {
            columns
                .iter()
                .enumerate()
                .map(|(c, col)| {
                    let head = col
                        .head
                        .split('\n')
                        .map(|l| fonts::width(l, size, Weight::Bold))
                        .fold(0.0, f32::max);
                    let cells = rows
                        .iter()
                        .filter_map(|r| r.get(c))
                        .flat_map(|cell| {
                            cell.lines.iter().enumerate().map(move |(k, l)| {
                                let (s, w) = if k == 0 && cell.bold {
                                    (size, Weight::Bold)
                                } else if k == 0 {
                                    (size, Weight::Regular)
                                } else {
                                    (size - 1.0, Weight::Regular)
                                };
                                fonts::width(l, s, w)
                            })
                        })
                        .fold(0.0, f32::max);
                    head.max(cells) + 2.0 * PAD
                })
                .collect()
        };
        let mut size = SIZES[SIZES.len() - 1];
        let mut widths = natural(size);
        for s in SIZES {
            let w = natural(s);
            if w.iter().sum::<f32>() <= width {
                size = s;
                widths = w;
                break;
            }
        }
        let total: f32 = widths.iter().sum();
        if total > width {
            // Cut the widest columns down to a common cap until the table fits.
            let mut sorted = widths.clone();
            sorted.sort_by(|a, b| b.total_cmp(a));
            let mut cap = sorted[0];
            while widths.iter().map(|w| w.min(cap)).sum::<f32>() > width && cap > 20.0 {
                cap -= 1.0;
            }
            for w in &mut widths {
                *w = w.min(cap);
            }
        }
        let total: f32 = widths.iter().sum();
        if total < width && total > 0.0 {
            let extra = (width - total) / widths.len() as f32;
            for w in &mut widths {
                *w += extra;
            }
        }
        Table {
            columns,
            rows,
            size,
            widths,
        }
    }

    fn line_height(&self) -> f32 {
        self.size * 1.22
    }

    /// Height of the heading row (pt).
    pub fn head_height(&self) -> f32 {
        let lines = self.columns.iter().map(|c| c.head.split('\n').count()).max().unwrap_or(1);
        lines as f32 * self.line_height() + 2.0 * PAD
    }

    /// Height of row `r` (pt).
    pub fn row_height(&self, r: usize) -> f32 {
        let lines = self.rows[r].iter().map(|c| c.lines.len()).max().unwrap_or(1).max(1);
        let lh = self.line_height();
        lh + (lines - 1) as f32 * (lh - 1.0) + 2.0 * PAD - 1.0
    }

    /// Draws the heading row at `y`; returns the y below it.
    pub fn draw_head(&self, page: &mut Page, x: f32, y: f32) -> f32 {
        let h = self.head_height();
        let total: f32 = self.widths.iter().sum();
        page.rect(x, y, total, h, None, Some(Ink::Tint));
        page.line((x, y), (x + total, y), Pen::solid(0.8, Ink::Black));
        page.line((x, y + h), (x + total, y + h), Pen::solid(0.5, Ink::Black));
        let mut cx = x;
        for (col, w) in self.columns.iter().zip(&self.widths) {
            for (k, l) in col.head.split('\n').enumerate() {
                let l = fonts::fit(l, self.size, Weight::Bold, w - 2.0 * PAD);
                let ty = y + PAD + self.size + k as f32 * self.line_height();
                page.text(
                    (anchor(cx, *w, col.align), ty),
                    Style::new(self.size, Weight::Bold, Ink::Black),
                    col.align,
                    &l,
                );
            }
            cx += w;
        }
        y + h
    }

    /// Draws row `r` at `y`; returns the y below it.
    pub fn draw_row(&self, page: &mut Page, x: f32, y: f32, r: usize) -> f32 {
        let h = self.row_height(r);
        let total: f32 = self.widths.iter().sum();
        let mut cx = x;
        let lh = self.line_height();
        for ((col, w), cell) in self.columns.iter().zip(&self.widths).zip(&self.rows[r]) {
            for (k, l) in cell.lines.iter().enumerate() {
                let (size, weight, ink) = if k == 0 {
                    (self.size, if cell.bold { Weight::Bold } else { Weight::Regular }, Ink::Black)
                } else {
                    (self.size - 1.0, Weight::Regular, Ink::Dark)
                };
                let l = fonts::fit(l, size, weight, w - 2.0 * PAD);
                let ty = y + PAD + self.size + k as f32 * (lh - 1.0);
                page.text((anchor(cx, *w, col.align), ty), Style::new(size, weight, ink), col.align, &l);
            }
            cx += w;
        }
        page.line((x, y + h), (x + total, y + h), Pen::solid(0.3, Ink::Light));
        y + h
    }
}

fn anchor(x: f32, w: f32, align: Align) -> f32 {
    match align {
        Align::Left => x + PAD,
        Align::Centre => x + w / 2.0,
        Align::Right => x + w - PAD,
    }
}
