//! The pages of a sheet: the title block and footer on every page, and the body blocks
//! (verdict, load cases, drawing, warnings, members, nodes, frequencies, stiffness, design
//! factors, notes) flowed down the pages, tables continuing with their heading repeated.
//!
//! This file chooses the layout (everything on one page, or a summary on page 1 and the
//! complete tables after) and puts the blocks in order; `flow.rs` fills the pages, `frame.rs`
//! draws what every page carries, `blocks.rs` and `tables.rs` make the body blocks.

mod blocks;
mod flow;
mod frame;
mod tables;

use rigwright_core::sizing::Status;

use self::blocks::{cases_table, design_block, modes_block, stiffness_block, verdict, warnings_block};
use self::flow::{Flow, GAP};
use self::frame::{FOOTER_H, MARGIN, TITLE_H, footer, title_block};
use self::tables::{members_table, nodes_table};
use crate::content::Sheet;
use crate::drawing::{self, Area};
use crate::fonts::Weight;
use crate::format::Fmt;
use crate::page::{Page, Paper};

pub use self::frame::CAUTIONS;

/// Lays the whole sheet out on pages of `paper`. Everything on one page when it fits, with the
/// drawing as large as allows that. Otherwise page 1 is the summary (verdict, load cases,
/// drawing, warnings, the most utilised members, frequencies, design basis) and the complete
/// member and node tables follow on the next pages.
pub fn pages(sheet: &Sheet, paper: Paper) -> Vec<Page> {
    // One page: the drawing takes what the rest leaves, between its smallest and largest size.
    let n = sheet.report.members.len();
    let most_rows = MOST_ROWS_ON_A_PAGE;
    let least = (n + sheet.model.nodes.len() <= most_rows).then(|| lay_out(sheet, paper, DRAWING_MIN, Members::All, Pass::Measure));
    if let Some(least) = least.filter(|l| l.pages.len() == 1) {
        let grown = (DRAWING_MIN + least.room).min(DRAWING_MAX);
        let laid = lay_out(sheet, paper, grown, Members::All, Pass::Full);
        let laid = if laid.pages.len() == 1 {
            laid
        } else {
            lay_out(sheet, paper, DRAWING_MIN, Members::All, Pass::Full)
        };
        return finish(laid.pages, sheet, paper);
    }
    // A summary on page 1: every member when they fit beside a drawing of some size, else as
    // many of the most utilised as fit beside the largest drawing that leaves room for a few.
    let mut choices = Vec::new();
    for drawing in [DRAWING_MAX, 240.0, 200.0, DRAWING_MIN] {
        let fits = |k: usize| lay_out(sheet, paper, drawing, Members::Summary(k), Pass::Measure).summary_pages == 1;
        if !fits(0) {
            continue;
        }
        // Every member, when that fits (the trailer under a complete table is shorter, so
        // fitting is not quite monotone at the top).
        if n <= most_rows && fits(n) {
            return finish(lay_out(sheet, paper, drawing, Members::Summary(n), Pass::Full).pages, sheet, paper);
        }
        // The most rows that keep the summary on page 1 (fitting is monotone in rows).
        let (mut lo, mut hi) = (0, n.min(most_rows));
        while lo < hi {
            let mid = (lo + hi).div_ceil(2);
            if fits(mid) { lo = mid } else { hi = mid - 1 }
        }
        // (Every member fitting returned above, so fewer than all fit here.)
        choices.push((drawing, lo));
    }
    // Every failing member on page 1 when it can be; those that do not fit are named below
    // the table.
    let fails = sheet.report.members.iter().filter(|m| m.status == Status::Fail).count();
    let wanted = n.min(6).max(fails.min(most_rows));
    let chosen = choices
        .iter()
        .find(|(_, rows)| *rows >= wanted)
        .or(choices.last())
        .map(|&(drawing, rows)| lay_out(sheet, paper, drawing, Members::Summary(rows), Pass::Full));
    // Not even the summary fits on one page (a very long list of warnings, say): everything
    // flows on from page 1.
    let laid = chosen.unwrap_or_else(|| lay_out(sheet, paper, DRAWING_MAX, Members::All, Pass::Full));
    finish(laid.pages, sheet, paper)
}

/// More table rows than ever fit on one page: a row is at least 12 pt high (5.5 pt type) and no
/// page body is 720 pt high. Bounds the search for the rows of page 1 on large rigs.
const MOST_ROWS_ON_A_PAGE: usize = 60;

/// Smallest and largest height of the drawing (pt).
const DRAWING_MIN: f32 = 160.0;

const DRAWING_MAX: f32 = 290.0;

/// Which member rows page 1 shows.
#[derive(Clone, Copy)]
enum Members {
    /// Every member, followed by the nodes.
    All,
    /// The `k` most utilised members on page 1; every member and the nodes from page 2.
    Summary(usize),
}

/// A layout to look at, or only to measure page 1 (much faster on a large rig).
#[derive(Clone, Copy, PartialEq, Eq)]
enum Pass {
    Measure,
    Full,
}

/// Laid-out body pages, how many of them the summary part took, and the height left free at
/// the foot of the last page (pt).
struct Laid {
    pages: Vec<Page>,
    summary_pages: usize,
    room: f32,
}

/// Warnings printed on a summary page; the rest are listed on the next pages.
const SUMMARY_WARNINGS: usize = 6;

fn finish(mut pages: Vec<Page>, sheet: &Sheet, paper: Paper) -> Vec<Page> {
    let n = pages.len();
    for (i, page) in pages.iter_mut().enumerate() {
        title_block(page, sheet, paper, i + 1, n);
        footer(page, sheet, paper);
    }
    pages
}

/// The body pages with a drawing `drawing_h` high (pt).
fn lay_out(sheet: &Sheet, paper: Paper, drawing_h: f32, members: Members, pass: Pass) -> Laid {
    let (pw, ph) = paper.size();
    let largest = sheet
        .report
        .cases
        .iter()
        .filter_map(|c| c.equilibrium.as_ref())
        .flat_map(|eq| {
            eq.members
                .iter()
                .map(|m| m.force.abs())
                .chain(eq.nodes.iter().filter_map(|n| n.reaction.map(|r| r.norm())))
        })
        .fold(0.0, f64::max);
    let fmt = Fmt::new(sheet.units, largest);
    let top = MARGIN + TITLE_H + GAP;
    let mut flow = Flow {
        measure: pass == Pass::Measure,
        pages: vec![Page::default()],
        y: top,
        top,
        bottom: ph - MARGIN - FOOTER_H - 4.0,
        x: MARGIN,
        w: pw - 2.0 * MARGIN,
    };
    verdict(&mut flow, sheet);
    cases_table(&mut flow, sheet, &fmt);
    flow.ensure(drawing_h);
    let area = Area {
        x: flow.x,
        y: flow.y,
        w: flow.w,
        h: drawing_h,
    };
    drawing::draw(flow.page(), sheet, &fmt, area, paper);
    flow.y += drawing_h + GAP;
    let summary = matches!(members, Members::Summary(_));
    let shown = if summary {
        sheet.warnings.len().min(SUMMARY_WARNINGS)
    } else {
        sheet.warnings.len()
    };
    warnings_block(&mut flow, &sheet.warnings[..shown], "Warnings");
    if shown < sheet.warnings.len() {
        let more = sheet.warnings.len() - shown;
        flow.paragraph(&format!("{more} more warning(s): next page."), 7.0, Weight::Bold, 10.0);
        flow.y += GAP;
    }
    let all: Vec<usize> = (0..sheet.report.members.len()).collect();
    let title = "Members: checks across all load cases (force tension positive)";
    match members {
        Members::All => {
            members_table(&mut flow, sheet, &fmt, &all, title);
            nodes_table(&mut flow, sheet, &fmt);
        }
        Members::Summary(k) if k >= all.len() => {
            members_table(&mut flow, sheet, &fmt, &all, title);
            flow.paragraph(&format!("{}: next page.", later(sheet, false)), 7.0, Weight::Regular, 0.0);
            flow.y += GAP;
        }
        Members::Summary(k) => {
            let mut rows = sheet.report.members_by_concern();
            let left_off: Vec<String> = rows[k.min(rows.len())..]
                .iter()
                .filter(|&&i| sheet.report.members[i].status == Status::Fail)
                .map(|&i| sheet.report.members[i].id.clone())
                .collect();
            rows.truncate(k);
            let n = all.len();
            if k > 0 {
                members_table(
                    &mut flow,
                    sheet,
                    &fmt,
                    &rows,
                    &format!("Members of most concern, {k} of {n}: failing first, then by utilisation (force tension positive)"),
                );
            }
            if !left_off.is_empty() {
                flow.paragraph(
                    &format!(
                        "{}: {}.",
                        if k > 0 { "Also FAILING, not listed above" } else { "FAILING" },
                        crate::warnings::id_list(&left_off, n)
                    ),
                    7.5,
                    Weight::Bold,
                    0.0,
                );
            }
            flow.paragraph(&format!("{}: next pages.", later(sheet, true)), 7.0, Weight::Regular, 0.0);
            flow.y += GAP;
        }
    }
    let half = (flow.w - 12.0) / 2.0;
    match stiffness_block(sheet, &fmt, half) {
        Some(k) => {
            flow.pair(&modes_block(sheet, &fmt, half), &k);
            flow.block(&design_block(sheet, &fmt, flow.w));
        }
        // The frequencies and the design basis share the width.
        None => flow.pair(&modes_block(sheet, &fmt, half), &design_block(sheet, &fmt, half)),
    }
    let notes = |flow: &mut Flow| {
        if !sheet.project.notes.trim().is_empty() {
            flow.heading("Notes", 10.0);
            flow.paragraph(&sheet.project.notes, 7.0, Weight::Regular, 0.0);
            flow.y += GAP;
        }
    };
    if let Members::All = members {
        notes(&mut flow);
    }
    let summary_pages = flow.pages.len();
    if let (Members::Summary(k), Pass::Full) = (members, pass) {
        flow.new_page();
        if shown < sheet.warnings.len() {
            warnings_block(&mut flow, &sheet.warnings[shown..], "Warnings (continued)");
        }
        notes(&mut flow);
        if k < all.len() {
            members_table(
                &mut flow,
                sheet,
                &fmt,
                &all,
                "All members: checks across all load cases (force tension positive)",
            );
        }
        nodes_table(&mut flow, sheet, &fmt);
    }
    Laid {
        room: (flow.bottom - flow.y).max(0.0),
        pages: flow.pages,
        summary_pages,
    }
}

/// What a summary page leaves to the next pages, for the pointer under its member table.
fn later(sheet: &Sheet, all_members: bool) -> String {
    let mut parts = Vec::new();
    if all_members {
        parts.push(format!("All {} members", sheet.report.members.len()));
    }
    parts.push("the nodes (drawn position, displacement, reaction)".to_string());
    if !sheet.project.notes.trim().is_empty() {
        parts.push("the notes".to_string());
    }
    let text = match parts.len() {
        1 => parts.remove(0),
        _ => {
            let last = parts.pop().unwrap_or_default();
            format!("{} and {last}", parts.join(", "))
        }
    };
    let mut chars = text.chars();
    chars.next().map(|c| c.to_uppercase().chain(chars).collect()).unwrap_or_default()
}
