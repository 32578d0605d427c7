//! The body blocks of a sheet besides the member and node tables: the verdict, the load
//! cases, the warnings, the natural frequencies, the tangent stiffness at marked nodes and the
//! design basis.

use rigwright_core::NodeStiffness;
use rigwright_core::sizing::DesignFactors;

use super::flow::{Block, Flow, GAP};
use crate::content::{CaseChoice, Sheet};
use crate::fonts::{self, Weight};
use crate::format::{Fmt, percent};
use crate::page::{Align, Ink, Pen, Style};
use crate::table::{Cell, Column, Table};

/// A list of warnings under `title` (nothing when empty).
pub(super) fn warnings_block(flow: &mut Flow, warnings: &[String], title: &str) {
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

pub(super) fn verdict(flow: &mut Flow, sheet: &Sheet) {
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

pub(super) fn cases_table(flow: &mut Flow, sheet: &Sheet, fmt: &Fmt) {
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
                    "stable equilibrium ({}, {})",
                    crate::format::count(eq.iterations, "Newton iteration"),
                    crate::format::count(eq.load_steps, "load step")
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

pub(super) fn modes_block(sheet: &Sheet, fmt: &Fmt, width: f32) -> Block {
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
            let mut lines = Vec::new();
            if !m.cables.is_empty() {
                let links: usize = m.cables.iter().map(|c| c.links).sum();
                lines.push(format!(
                    "With {} sagging cable{} cut into {links} links, so that their own mass vibrates.",
                    m.cables.len(),
                    if m.cables.len() == 1 { "" } else { "s" }
                ));
            }
            if let Some(note) = &m.note {
                lines.push(format!("Note: {note}."));
            }
            Block {
                title,
                table: Some(Table::new(columns, rows, width)),
                lines,
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

pub(super) fn stiffness_block(sheet: &Sheet, fmt: &Fmt, width: f32) -> Option<Block> {
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
pub(super) fn design_block(sheet: &Sheet, fmt: &Fmt, width: f32) -> Block {
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
