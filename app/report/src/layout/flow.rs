//! Pages being filled top to bottom: headings, wrapped paragraphs, tables that continue on
//! the next page with their heading repeated, and titled blocks set one after the other or
//! side by side.

use crate::fonts::{self, Weight};
use crate::page::{Align, Ink, Page, Pen, Style};
use crate::table::Table;

pub(super) const GAP: f32 = 8.0;

/// Pages being filled top to bottom.
pub(super) struct Flow {
    /// Only finding out whether the summary fits on page 1: nothing past page 1 is laid out.
    pub(super) measure: bool,
    pub(super) pages: Vec<Page>,
    pub(super) y: f32,
    pub(super) top: f32,
    pub(super) bottom: f32,
    pub(super) x: f32,
    pub(super) w: f32,
}

impl Flow {
    pub(super) fn page(&mut self) -> &mut Page {
        self.pages.last_mut().expect("a flow always has a page")
    }

    pub(super) fn new_page(&mut self) {
        self.pages.push(Page::default());
        self.y = self.top;
    }

    /// Starts a new page unless `h` more points fit on this one.
    pub(super) fn ensure(&mut self, h: f32) {
        if self.y + h > self.bottom && self.y > self.top {
            self.new_page();
        }
    }

    pub(super) fn heading(&mut self, text: &str, keep: f32) {
        self.ensure(16.0 + keep);
        let (x, y, w) = (self.x, self.y, self.w);
        let text = fonts::fit(&crate::page::quotes(text), 8.5, Weight::Bold, w);
        let page = self.page();
        page.text((x, y + 9.0), Style::new(8.5, Weight::Bold, Ink::Black), Align::Left, &text);
        page.line((x, y + 12.0), (x + w, y + 12.0), Pen::solid(0.4, Ink::Mid));
        self.y += 16.0;
    }

    /// A paragraph of wrapped text.
    pub(super) fn paragraph(&mut self, text: &str, size: f32, weight: Weight, indent: f32) {
        let lines = fonts::wrap(text, size, weight, self.w - indent);
        for l in lines {
            self.ensure(size * 1.3);
            let (x, y) = (self.x + indent, self.y);
            self.page()
                .text((x, y + size), Style::new(size, weight, Ink::Black), Align::Left, &l);
            self.y += size * 1.3;
        }
    }

    /// True when measuring and page 1 is already full.
    fn past_page_one(&self) -> bool {
        self.measure && self.pages.len() > 1
    }

    pub(super) fn table(&mut self, title: &str, table: &Table) {
        if self.past_page_one() {
            return;
        }
        let first = if table.rows.is_empty() { 0.0 } else { table.row_height(0) };
        self.heading(title, table.head_height() + first);
        self.y = table.draw_head(self.pages.last_mut().expect("page"), self.x, self.y);
        for r in 0..table.rows.len() {
            if self.past_page_one() {
                return;
            }
            let h = table.row_height(r);
            if self.y + h > self.bottom {
                self.new_page();
                self.heading(&format!("{title} (continued)"), table.head_height() + h);
                self.y = table.draw_head(self.pages.last_mut().expect("page"), self.x, self.y);
            }
            let (x, y) = (self.x, self.y);
            self.y = table.draw_row(self.pages.last_mut().expect("page"), x, y, r);
        }
        self.y += GAP;
    }
}

/// A titled block: a table, statements, or both.
pub(super) struct Block {
    pub(super) title: String,
    pub(super) table: Option<Table>,
    pub(super) lines: Vec<String>,
}

impl Block {
    /// Height on the page (pt), when it is not split.
    fn height(&self, w: f32) -> f32 {
        let table = self
            .table
            .as_ref()
            .map(|t| t.head_height() + (0..t.rows.len()).map(|r| t.row_height(r)).sum::<f32>())
            .unwrap_or(0.0);
        let lines: usize = self.lines.iter().map(|l| fonts::wrap(l, 7.5, Weight::Regular, w).len()).sum();
        16.0 + table + lines as f32 * 7.5 * 1.3 + GAP
    }
}

impl Flow {
    pub(super) fn block(&mut self, b: &Block) {
        match &b.table {
            Some(t) => self.table(&b.title, t),
            None => self.heading(&b.title, 10.0),
        }
        for l in &b.lines {
            self.paragraph(l, 7.5, Weight::Regular, 0.0);
        }
        if b.table.is_none() {
            self.y += GAP;
        }
    }

    /// Two blocks side by side when both fit on this page, else one after the other.
    pub(super) fn pair(&mut self, a: &Block, b: &Block) {
        let half = (self.w - 12.0) / 2.0;
        let h = a.height(half).max(b.height(half));
        if self.y + h > self.bottom {
            self.block(a);
            self.block(b);
            return;
        }
        let (x, w, y) = (self.x, self.w, self.y);
        self.w = half;
        self.block(a);
        let ya = self.y;
        self.y = y;
        self.x = x + half + 12.0;
        self.block(b);
        self.y = self.y.max(ya);
        self.x = x;
        self.w = w;
    }
}
