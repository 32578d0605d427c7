//! The pages of a sheet: the title block and footer on every page, and the body blocks
//! (verdict, load cases, drawing, warnings, members, nodes, frequencies, stiffness, design
//! factors, notes) flowed down the pages, tables continuing with their heading repeated.

use rigwright_core::model::Rest;
use rigwright_core::sizing::{DesignFactors, Status};
use rigwright_core::{MemberKind, NodeStiffness};

use super::content::{CaseChoice, Sheet};
use super::drawing::{self, Area};
use super::fonts::{self, Weight};
use super::format::{Fmt, percent};
use super::page::{Align, Ink, Page, Paper, Pen, Style};
use super::table::{Cell, Column, Table};
use crate::units::Units;

/// The cautions printed on every page (from the product design).
pub const CAUTIONS: &str = "Rigging and tensioned structures can fail suddenly and hurt people. Results are a design aid for qualified persons; they do not replace the checks that local codes and standards require, the manufacturer's ratings of actual components, or review by a licensed engineer.";

const MARGIN: f32 = 28.0;
const TITLE_H: f32 = 66.0;
const FOOTER_H: f32 = 34.0;
const GAP: f32 = 8.0;

/// Pages being filled top to bottom.
struct Flow {
    /// Only finding out whether the summary fits on page 1: nothing past page 1 is laid out.
    measure: bool,
    pages: Vec<Page>,
    y: f32,
    top: f32,
    bottom: f32,
    x: f32,
    w: f32,
}

impl Flow {
    fn page(&mut self) -> &mut Page {
        self.pages.last_mut().expect("a flow always has a page")
    }

    fn new_page(&mut self) {
        self.pages.push(Page::default());
        self.y = self.top;
    }

    /// Starts a new page unless `h` more points fit on this one.
    fn ensure(&mut self, h: f32) {
        if self.y + h > self.bottom && self.y > self.top {
            self.new_page();
        }
    }

    fn heading(&mut self, text: &str, keep: f32) {
        self.ensure(16.0 + keep);
        let (x, y, w) = (self.x, self.y, self.w);
        let text = fonts::fit(&super::page::quotes(text), 8.5, Weight::Bold, w);
        let page = self.page();
        page.text((x, y + 9.0), Style::new(8.5, Weight::Bold, Ink::Black), Align::Left, &text);
        page.line((x, y + 12.0), (x + w, y + 12.0), Pen::solid(0.4, Ink::Mid));
        self.y += 16.0;
    }

    /// A paragraph of wrapped text.
    fn paragraph(&mut self, text: &str, size: f32, weight: Weight, indent: f32) {
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

    fn table(&mut self, title: &str, table: &Table) {
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
                        super::content::id_list(&left_off, n)
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

/// A list of warnings under `title` (nothing when empty).
fn warnings_block(flow: &mut Flow, warnings: &[String], title: &str) {
    if warnings.is_empty() {
        return;
    }
    flow.heading(title, 20.0);
    for w in warnings {
        flow.ensure(10.0);
        let (x, y) = (flow.x, flow.y);
        flow.page()
            .text((x + 2.0, y + 7.0), Style::new(7.0, Weight::Bold, Ink::Black), Align::Left, "!");
        flow.paragraph(w, 7.0, Weight::Regular, 10.0);
        flow.y += 1.5;
    }
    flow.y += GAP - 1.5;
}

fn verdict(flow: &mut Flow, sheet: &Sheet) {
    let text = sheet.verdict();
    let lines = fonts::wrap(&text, 9.0, Weight::Bold, flow.w - 16.0);
    let h = 8.0 + lines.len() as f32 * 11.5;
    let (x, y, w) = (flow.x, flow.y, flow.w);
    let bad = !sheet.report.passes();
    let page = flow.page();
    page.rect(
        x,
        y,
        w,
        h,
        Some(Pen::solid(if bad { 1.6 } else { 0.6 }, Ink::Black)),
        Some(Ink::Tint),
    );
    for (k, l) in lines.iter().enumerate() {
        page.text(
            (x + 8.0, y + 14.0 + k as f32 * 11.5),
            Style::new(9.0, Weight::Bold, Ink::Black),
            Align::Left,
            l,
        );
    }
    flow.y += h + GAP;
}

fn cases_table(flow: &mut Flow, sheet: &Sheet, fmt: &Fmt) {
    let model = &sheet.model;
    let rows = sheet
        .report
        .cases
        .iter()
        .enumerate()
        .map(|(i, c)| {
            let case = &model.cases[i];
            // Each point load as its node and force vector (the first three; then a count).
            let mut loads: Vec<String> = case
                .loads
                .iter()
                .take(3)
                .map(|(node, f)| {
                    let c: Vec<String> = (0..3).filter(|&a| a < 2 || !model.planar).map(|a| fmt.force(f[a])).collect();
                    format!("{}: ({}) {}", model.nodes[*node].id, c.join(", "), fmt.force_unit())
                })
                .collect();
            if case.loads.len() > 3 {
                loads.push(format!("and {} more", case.loads.len() - 3));
            }
            let loads = if loads.is_empty() {
                Cell::text("none")
            } else {
                Cell { lines: loads, bold: false }
            };
            let state = match (&c.equilibrium, &c.error) {
                (Some(eq), _) => Cell::text(format!(
                    "stable equilibrium ({} Newton iterations, {} load step(s))",
                    eq.iterations, eq.load_steps
                )),
                (None, e) => Cell {
                    lines: vec!["NO EQUILIBRIUM".into(), e.clone().unwrap_or_default()],
                    bold: true,
                },
            };
            let drawn = if i == sheet.case {
                match sheet.choice {
                    CaseChoice::Chosen => "drawn (chosen)",
                    CaseChoice::Governing => "drawn (governing)",
                    CaseChoice::First => "drawn",
                }
            } else {
                ""
            };
            vec![
                Cell::bold(c.name.clone()),
                Cell::text(format!("{} × g", case.gravity)),
                loads,
                state,
                Cell::text(drawn),
            ]
        })
        .collect();
    let table = Table::new(
        vec![
            Column::new("load case", Align::Left),
            Column::new("gravity", Align::Right),
            Column::new(
                if model.planar {
                    "point loads\nnode: (x, y)"
                } else {
                    "point loads\nnode: (x, y, z)"
                },
                Align::Left,
            ),
            Column::new("state", Align::Left),
            Column::new("", Align::Left),
        ],
        rows,
        flow.w,
    );
    flow.table("Load cases", &table);
}

fn rest_text(sheet: &Sheet, i: usize, fmt: &Fmt) -> Cell {
    let m = &sheet.model.members[i];
    let l0 = fmt.length_u(m.kind.rest_length());
    let doc = sheet.project.members.iter().find(|d| d.id == m.id);
    let rest = doc.map(|d| match d.kind {
        rigwright_core::model::MemberDocKind::Cable { rest, .. }
        | rigwright_core::model::MemberDocKind::Spring { rest, .. }
        | rigwright_core::model::MemberDocKind::Strut { rest, .. } => rest,
    });
    // The member's own unstressed length (for a spring in a link, the whole link).
    let word = "L0";
    match rest {
        Some(Rest::Tension(t)) => {
            let what = if matches!(m.kind, MemberKind::Spring { .. }) {
                "preload"
            } else {
                "pretension"
            };
            Cell::two(format!("{what} {}", fmt.force_u(t)), format!("{word} {l0}"))
        }
        Some(Rest::Length(_)) => Cell::text(format!("{word} {l0}")),
        _ => Cell::two(format!("{word} {l0}"), "unstressed as drawn"),
    }
}

/// The member rows `rows` (indices into the report) under `title`.
fn members_table(flow: &mut Flow, sheet: &Sheet, fmt: &Fmt, rows: &[usize], title: &str) {
    let fu = fmt.force_unit();
    let rows = rows
        .iter()
        .map(|&i| {
            let m = &sheet.report.members[i];
            let force = |f: &Option<(f64, String)>| match f {
                Some((v, case)) => Cell::two(fmt.force(*v), format!("`{case}`")),
                None => Cell::text("—"),
            };
            let made_of = match &m.made_of {
                Some(s) => {
                    let lines = fonts::wrap(s, 6.5, Weight::Regular, 120.0);
                    Cell { lines, bold: false }
                }
                None => {
                    let k = &sheet.model.members[i].kind;
                    Cell::two(
                        "(no part given)",
                        match k {
                            MemberKind::Cable { ea, .. } | MemberKind::Strut { ea, .. } => format!("EA {}", fmt.force_u(*ea)),
                            MemberKind::Spring { k, .. } => format!("rate {} {}", fmt.stiffness(*k), fmt.stiffness_unit()),
                        },
                    )
                }
            };
            let capacity = match &m.capacity {
                Some(c) => Cell::two(fmt.in_unit(c.value, c.unit), c.what),
                None => Cell::text("—"),
            };
            // The governing check with its own utilisation (a failing slack check has none,
            // even when another check of the member has one).
            let util = match m.governing_line() {
                Some(l) => Cell::two(
                    l.utilisation.map_or_else(|| "—".to_string(), percent),
                    format!("{} `{}`", l.check, l.case).replace(" ``", ""),
                ),
                None => Cell::text("—"),
            };
            let status = Cell {
                lines: vec![m.status.word().to_string()],
                bold: matches!(m.status, Status::Fail | Status::Near),
            };
            vec![
                Cell::bold(m.id.clone()),
                Cell::text(m.class.name()),
                made_of,
                rest_text(sheet, i, fmt),
                force(&m.force_min),
                force(&m.force_max),
                capacity,
                match m.efficiency {
                    Some(e) => Cell::two(format!("{}", m.design_factor), format!("e {e}")),
                    None => Cell::text(format!("{}", m.design_factor)),
                },
                util,
                status,
            ]
        })
        .collect();
    let table = Table::new(
        vec![
            Column::new("member", Align::Left),
            Column::new("kind", Align::Left),
            Column::new("made of", Align::Left),
            Column::new("unstressed length\nor pretension", Align::Left),
            Column::new(&format!("min force\n[{fu}] (case)"), Align::Right),
            Column::new(&format!("max force\n[{fu}] (case)"), Align::Right),
            Column::new("capacity", Align::Right),
            Column::new("design\nfactor", Align::Right),
            Column::new("utilisation\n(check)", Align::Right),
            Column::new("status", Align::Left),
        ],
        rows,
        flow.w,
    );
    flow.table(title, &table);
}

fn nodes_table(flow: &mut Flow, sheet: &Sheet, fmt: &Fmt) {
    let title = format!("Nodes: load case `{}`", sheet.case_name());
    let Some(eq) = sheet.equilibrium() else {
        flow.heading(&title, 12.0);
        let why = sheet.report.cases[sheet.case].error.clone().unwrap_or_default();
        flow.paragraph(
            &format!("NO EQUILIBRIUM in this load case, so no displacements or reactions are given: {why}"),
            7.5,
            Weight::Bold,
            0.0,
        );
        flow.y += GAP;
        return;
    };
    let model = &sheet.model;
    let axes: &[usize] = if model.planar { &[0, 1] } else { &[0, 1, 2] };
    let names = ["x", "y", "z"];
    let (lu, su, fu) = (fmt.length_unit(), fmt.small_unit(), fmt.force_unit());
    let mut columns = vec![Column::new("node", Align::Left), Column::new("support", Align::Left)];
    for &a in axes {
        columns.push(Column::new(&format!("{}\n[{lu}]", names[a]), Align::Right));
    }
    columns.push(Column::new("mass", Align::Right));
    for &a in axes {
        columns.push(Column::new(&format!("u{}\n[{su}]", names[a]), Align::Right));
    }
    for &a in axes {
        columns.push(Column::new(&format!("R{}\n[{fu}]", names[a]), Align::Right));
    }
    let rows = model
        .nodes
        .iter()
        .zip(&eq.nodes)
        .enumerate()
        .map(|(i, (n, r))| {
            let support = if !model.has_reaction(i) {
                "free"
            } else if n.support.is_anchor() || axes.iter().all(|&a| n.support.fixed[a]) {
                "anchor"
            } else {
                "guided"
            };
            let mut row = vec![Cell::bold(n.id.clone()), Cell::text(support)];
            for &a in axes {
                row.push(Cell::text(fmt.length(n.position[a])));
            }
            row.push(Cell::text(if n.mass > 0.0 { fmt.mass_u(n.mass) } else { "—".into() }));
            for &a in axes {
                row.push(Cell::text(if n.support.fixed[a] {
                    "—".into()
                } else {
                    fmt.small(r.displacement[a])
                }));
            }
            for &a in axes {
                row.push(Cell::text(match (&r.reaction, n.support.fixed[a]) {
                    (Some(f), true) => fmt.force(f[a]),
                    _ => "—".into(),
                }));
            }
            row
        })
        .collect();
    let table = Table::new(columns, rows, flow.w);
    flow.table(&format!("{title}: drawn position, displacement, reaction on the rig"), &table);
}

/// A titled block: a table, statements, or both.
struct Block {
    title: String,
    table: Option<Table>,
    lines: Vec<String>,
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
    fn block(&mut self, b: &Block) {
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
    fn pair(&mut self, a: &Block, b: &Block) {
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

fn modes_block(sheet: &Sheet, fmt: &Fmt, width: f32) -> Block {
    let title = format!("Natural frequencies, `{}`", sheet.case_name());
    match &sheet.modes {
        Ok(m) if !m.modes.is_empty() => {
            let axes: &[usize] = if sheet.model.planar { &[0, 1] } else { &[0, 1, 2] };
            let rows = m
                .modes
                .iter()
                .enumerate()
                .map(|(k, mode)| {
                    let mut row = vec![
                        Cell::bold(format!("{}", k + 1)),
                        Cell::text(format!("{:.3}", mode.frequency_hz)),
                        Cell::text(format!("{:.4}", mode.period_s)),
                    ];
                    row.extend(axes.iter().map(|&a| Cell::text(fmt.mass(mode.effective_mass[a]))));
                    row
                })
                .collect();
            let mut columns = vec![
                Column::new("mode", Align::Left),
                Column::new("frequency\n[Hz]", Align::Right),
                Column::new("period\n[s]", Align::Right),
            ];
            for &a in axes {
                columns.push(Column::new(
                    &format!("eff. mass {}\n[{}]", ["x", "y", "z"][a], fmt.mass_unit()),
                    Align::Right,
                ));
            }
            Block {
                title,
                table: Some(Table::new(columns, rows, width)),
                lines: Vec::new(),
            }
        }
        Ok(_) => Block {
            title,
            table: None,
            lines: vec!["No modes: nothing with mass can move.".into()],
        },
        Err(e) => Block {
            title,
            table: None,
            lines: vec![format!("None given: {e}.")],
        },
    }
}

/// A direction cosine to three decimals, without a sign on zero.
fn d3(v: f64) -> String {
    let s = format!("{v:.3}");
    if s == "-0.000" { "0.000".into() } else { s }
}

/// `dᵀ K d` over the free axes of a condensed stiffness.
fn along(k: &NodeStiffness, mat: &[Vec<f64>], d: &rigwright_core::Vec3) -> f64 {
    let mut s = 0.0;
    for (i, &ai) in k.axes.iter().enumerate() {
        for (j, &aj) in k.axes.iter().enumerate() {
            s += d[ai] * mat[i][j] * d[aj];
        }
    }
    s
}

fn stiffness_block(sheet: &Sheet, fmt: &Fmt, width: f32) -> Option<Block> {
    if sheet.stiffness.is_empty() {
        return None;
    }
    let ku = fmt.stiffness_unit();
    let mut rows = Vec::new();
    let mut lines = Vec::new();
    for (id, k) in &sheet.stiffness {
        match k {
            Ok(k) => {
                for (n, p) in k.principal.iter().enumerate() {
                    let d = p.direction;
                    rows.push(vec![
                        if n == 0 { Cell::bold(id.clone()) } else { Cell::text("") },
                        Cell::text(fmt.stiffness(p.value)),
                        Cell::text(format!("({}, {}, {})", d3(d.x), d3(d.y), d3(d.z))),
                        Cell::text(fmt.stiffness(along(k, &k.elastic, &d))),
                        Cell::text(fmt.stiffness(along(k, &k.geometric, &d))),
                    ]);
                }
            }
            Err(e) => lines.push(format!("Node `{id}`: no stiffness: {e}.")),
        }
    }
    let table = (!rows.is_empty()).then(|| {
        Table::new(
            vec![
                Column::new("node", Align::Left),
                Column::new(&format!("principal\n[{ku}]"), Align::Right),
                Column::new("direction\n(x, y, z)", Align::Left),
                Column::new(&format!("elastic\n[{ku}]"), Align::Right),
                Column::new(&format!("geometric\n[{ku}]"), Align::Right),
            ],
            rows,
            width,
        )
    });
    Some(Block {
        title: format!("Tangent stiffness at marked nodes, `{}`", sheet.case_name()),
        table,
        lines,
    })
}

/// The design factors and limits with their sources: a table at full width, a list of
/// statements in a narrow column (so that no source is cut short).
fn design_block(sheet: &Sheet, fmt: &Fmt, width: f32) -> Block {
    use rigwright_core::element::MemberClass;
    let df = &sheet.report.design_factors;
    let sizing = &sheet.project.sizing;
    let present = |c: MemberClass| sheet.model.members.iter().any(|m| m.kind.class() == c);
    let mut items: Vec<(String, String, String)> = [MemberClass::Cable, MemberClass::Spring, MemberClass::Strut]
        .into_iter()
        .filter(|c| present(*c))
        .map(|c| {
            let v = df.of(c);
            let default = DesignFactors::default().of(c);
            let source = if v == default {
                DesignFactors::source(c).to_string()
            } else {
                format!("set in the project (default {default}: {})", DesignFactors::source(c))
            };
            (format!("{} design factor", c.name()), format!("{v}"), source)
        })
        .collect();
    if present(MemberClass::Cable) {
        items.push((
            "cable termination efficiency".into(),
            format!("{}", sizing.termination_efficiency),
            "where a cable gives none; 0.8 is common practice for wire rope grips (from memory)".into(),
        ));
    }
    items.push((
        "near-limit utilisation".into(),
        percent(sheet.report.near_limit),
        "a passing member above this is reported as near limit".into(),
    ));
    if present(MemberClass::Cable) {
        items.push((
            "slack threshold".into(),
            fmt.force_u(sizing.slack_threshold),
            "a cable not marked `may slacken` fails at or below this tension".into(),
        ));
    }
    let title = "Design factors and limits".to_string();
    if width < 400.0 {
        let lines = items
            .into_iter()
            .map(|(name, value, source)| format!("{name}: {value} — {source}."))
            .collect();
        return Block { title, table: None, lines };
    }
    let rows = items
        .into_iter()
        .map(|(name, value, source)| vec![Cell::bold(name), Cell::text(value), Cell::text(source)])
        .collect();
    let table = Table::new(
        vec![
            Column::new("design basis", Align::Left),
            Column::new("value", Align::Right),
            Column::new("source", Align::Left),
        ],
        rows,
        width,
    );
    Block {
        title,
        table: Some(table),
        lines: Vec::new(),
    }
}

/// A labelled field of the title block.
fn field(page: &mut Page, (x, y, w, h): (f32, f32, f32, f32), label: &str, value: &str, size: f32) {
    page.rect(x, y, w, h, Some(Pen::solid(0.5, Ink::Black)), None);
    page.text((x + 3.0, y + 6.5), Style::new(5.5, Weight::Regular, Ink::Mid), Align::Left, label);
    let v = fonts::fit(value, size, Weight::Bold, w - 6.0);
    page.text((x + 3.0, y + h - 4.5), Style::new(size, Weight::Bold, Ink::Black), Align::Left, &v);
}

fn title_block(page: &mut Page, sheet: &Sheet, paper: Paper, n: usize, of: usize) {
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

fn footer(page: &mut Page, sheet: &Sheet, paper: Paper) {
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
