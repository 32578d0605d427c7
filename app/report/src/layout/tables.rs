//! The member and node tables: every member checked across all load cases, every node of the
//! drawn case with its drawn position, displacement and reaction.

use rigwright_core::MemberKind;
use rigwright_core::model::Rest;
use rigwright_core::sizing::Status;

use super::flow::{Flow, GAP};
use crate::content::Sheet;
use crate::fonts::{self, Weight};
use crate::format::{Fmt, percent};
use crate::page::Align;
use crate::table::{Cell, Column, Table};

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
            } else if m.sags() {
                "upper-end pretension"
            } else {
                "pretension"
            };
            Cell::two(format!("{what} {}", fmt.force_u(t)), format!("{word} {l0}"))
        }
        Some(Rest::Horizontal(h)) => Cell::two(format!("horizontal pretension {}", fmt.force_u(h)), format!("{word} {l0}")),
        Some(Rest::Length(_)) => Cell::text(format!("{word} {l0}")),
        _ => Cell::two(format!("{word} {l0}"), "unstressed as drawn"),
    }
}

/// The member rows `rows` (indices into the report) under `title`.
pub(super) fn members_table(flow: &mut Flow, sheet: &Sheet, fmt: &Fmt, rows: &[usize], title: &str) {
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

pub(super) fn nodes_table(flow: &mut Flow, sheet: &Sheet, fmt: &Fmt) {
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
