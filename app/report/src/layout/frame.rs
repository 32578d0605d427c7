//! What every page of a sheet carries: the title block on top (the rig, the page count, who
//! prepared and checked it) and the footer (the cautions, the program's version and the
//! project file's hash).

use crate::content::Sheet;
use crate::fonts::{self, Weight};
use crate::page::{Align, Ink, Page, Paper, Pen, Style};
use crate::units::Units;

/// The cautions printed on every page (from the product design; the same text as the app's
/// About box and the command line, from the core).
pub const CAUTIONS: &str = rigwright_core::CAUTION;

pub(super) const MARGIN: f32 = 28.0;

pub(super) const TITLE_H: f32 = 66.0;

pub(super) const FOOTER_H: f32 = 34.0;

/// A labelled field of the title block.
fn field(page: &mut Page, (x, y, w, h): (f32, f32, f32, f32), label: &str, value: &str, size: f32) {
    page.rect(x, y, w, h, Some(Pen::solid(0.5, Ink::Black)), None);
    page.text((x + 3.0, y + 6.5), Style::new(5.5, Weight::Regular, Ink::Mid), Align::Left, label);
    let v = fonts::fit(value, size, Weight::Bold, w - 6.0);
    page.text((x + 3.0, y + h - 4.5), Style::new(size, Weight::Bold, Ink::Black), Align::Left, &v);
}

pub(super) fn title_block(page: &mut Page, sheet: &Sheet, paper: Paper, n: usize, of: usize) {
    let (pw, _) = paper.size();
    let (x, y, w) = (MARGIN, MARGIN, pw - 2.0 * MARGIN);
    let info = &sheet.info;
    let units = match sheet.units {
        Units::Si => "SI (m, N, kg)",
        Units::Us => "US (ft, lbf, lb)",
    };
    // Row 1: the mark, the rig, the page.
    let h1 = 26.0;
    page.rect(x, y, 92.0, h1, Some(Pen::solid(0.5, Ink::Black)), Some(Ink::Black));
    page.text(
        (x + 6.0, y + 12.0),
        Style::new(9.5, Weight::Bold, Ink::White),
        Align::Left,
        "RIGWRIGHT",
    );
    page.text(
        (x + 6.0, y + 21.5),
        Style::new(6.5, Weight::Regular, Ink::White),
        Align::Left,
        "Sheet: sizing summary",
    );
    field(page, (x + 92.0, y, w - 92.0 - 70.0, h1), "rig", &sheet.project.title, 9.5);
    field(page, (x + w - 70.0, y, 70.0, h1), "page", &format!("{n} of {of}"), 9.5);
    // Row 2: project, location, client, units.
    let y2 = y + h1;
    let h = 20.0;
    let q = w / 4.0;
    field(page, (x, y2, q, h), "project", &info.project, 7.5);
    field(page, (x + q, y2, q, h), "location", &info.location, 7.5);
    field(page, (x + 2.0 * q, y2, q, h), "client", &info.client, 7.5);
    field(page, (x + 3.0 * q, y2, q, h), "units", units, 7.5);
    // Row 3: prepared, checked, date, revision.
    let y3 = y2 + h;
    field(page, (x, y3, q, h), "prepared by (sign)", &info.prepared_by, 7.5);
    field(page, (x + q, y3, q, h), "checked by (sign)", &info.checked_by, 7.5);
    field(page, (x + 2.0 * q, y3, q, h), "date", &info.date, 7.5);
    field(page, (x + 3.0 * q, y3, q, h), "revision", &info.revision, 7.5);
    page.rect(x, y, w, TITLE_H, Some(Pen::solid(1.2, Ink::Black)), None);
}

pub(super) fn footer(page: &mut Page, sheet: &Sheet, paper: Paper) {
    let (pw, ph) = paper.size();
    let (x, w) = (MARGIN, pw - 2.0 * MARGIN);
    let y = ph - MARGIN - FOOTER_H;
    page.line((x, y), (x + w, y), Pen::solid(0.6, Ink::Black));
    let mut ty = y + 8.0;
    let caution = format!("CAUTION. {CAUTIONS}");
    for l in fonts::wrap(&caution, 6.3, Weight::Regular, w) {
        page.text((x, ty), Style::new(6.3, Weight::Regular, Ink::Black), Align::Left, &l);
        ty += 7.8;
    }
    let unsaved = if sheet.unsaved {
        " (unsaved changes: hash of the text as it would be saved)"
    } else {
        ""
    };
    let trace = format!(
        "Rigwright {} · project file {}{unsaved} · SHA-256 {}",
        env!("CARGO_PKG_VERSION"),
        sheet.file_name,
        sheet.sha256
    );
    let trace = fonts::fit(&trace, 5.8, Weight::Regular, w);
    page.text((x, ty + 1.0), Style::new(5.8, Weight::Regular, Ink::Dark), Align::Left, &trace);
}
