//! Readouts: the results area under the Rig view, one tab per kind of result.
//!
//! Responsible for tables of the solved equilibrium, the stiffness of the selected node and
//! the Pull plot. Shows nothing as a result unless the last solve converged to a stable state.
//! Further tabs are added by extending [`ReadoutTab`] and its `match` in [`ui`].

use eframe::egui::{self, RichText};
use egui_plot::{Legend, Line, LineStyle, Plot, PlotPoints};
use rigwright_core::{NodeStiffness, Vec3};

use super::palette as pal;
use super::{RigApp, Selection};
use rigwright_report::units::{Quantity, Units, significant};

/// The tabs of the Readouts area.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ReadoutTab {
    Members,
    Nodes,
    Stiffness,
    Pull,
    Modes,
    Pluck,
    Checks,
    Sweep,
}

impl ReadoutTab {
    pub const ALL: [ReadoutTab; 8] = [
        ReadoutTab::Members,
        ReadoutTab::Nodes,
        ReadoutTab::Stiffness,
        ReadoutTab::Pull,
        ReadoutTab::Modes,
        ReadoutTab::Pluck,
        ReadoutTab::Checks,
        ReadoutTab::Sweep,
    ];

    pub fn label(self) -> &'static str {
        match self {
            ReadoutTab::Members => "Members",
            ReadoutTab::Nodes => "Nodes",
            ReadoutTab::Stiffness => "Stiffness",
            ReadoutTab::Pull => "Pull curve",
            ReadoutTab::Modes => "Modes",
            ReadoutTab::Pluck => "Pluck",
            ReadoutTab::Checks => "Checks",
            ReadoutTab::Sweep => "Sweep",
        }
    }

    fn tip(self) -> &'static str {
        match self {
            ReadoutTab::Members => "Force, length, strain and state of every member",
            ReadoutTab::Nodes => "Displacement of every node and reactions at supports",
            ReadoutTab::Stiffness => "Condensed tangent stiffness of the selected free node",
            ReadoutTab::Pull => "Restoring force and force–displacement curve of the last Pull",
            ReadoutTab::Modes => "Natural frequencies and mode shapes about the equilibrium; animate any mode",
            ReadoutTab::Pluck => "The free vibration after a pulled node is let go: time history, frequency, energy",
            ReadoutTab::Checks => "Every member checked in every load case: utilisation, status and the governing check; auto-size",
            ReadoutTab::Sweep => "Vary one parameter over a range and plot an output",
        }
    }
}

pub fn ui(app: &mut RigApp, ui: &mut egui::Ui) {
    ui.add_space(4.0);
    ui.horizontal(|ui| {
        ui.label(RichText::new("Readouts").strong());
        ui.separator();
        for tab in ReadoutTab::ALL {
            if ui
                .selectable_label(app.readout_tab == tab, tab.label())
                .on_hover_text(tab.tip())
                .clicked()
            {
                app.readout_tab = tab;
            }
        }
        ui.separator();
        if let Some(c) = app.doc.model.cases.get(app.case) {
            ui.label(format!("load case: {}", c.name));
        }
    });
    ui.separator();
    match app.readout_tab {
        ReadoutTab::Pull => return pull(app, ui),
        ReadoutTab::Pluck => return super::pluck::pluck_ui(app, ui),
        ReadoutTab::Modes => return super::pluck::modes_ui(app, ui),
        ReadoutTab::Checks => return super::sizing::checks_ui(app, ui),
        ReadoutTab::Sweep => return super::sizing::sweep_ui(app, ui),
        _ => {}
    }
    let Some(answer) = app.answer() else {
        match app.diagnostic() {
            Some(d) => ui.label(RichText::new(d).color(pal::ALARM)),
            None => ui.label("Nothing solved yet."),
        };
        return;
    };
    let units = app.settings.units;
    egui::ScrollArea::both()
        .auto_shrink([false, false])
        .show(ui, |ui| match app.readout_tab {
            ReadoutTab::Members => members(&answer, units, ui),
            ReadoutTab::Nodes => nodes(&answer, units, ui),
            ReadoutTab::Stiffness => stiffness(app, units, ui),
            ReadoutTab::Pull | ReadoutTab::Modes | ReadoutTab::Pluck | ReadoutTab::Checks | ReadoutTab::Sweep => {}
        });
}

fn header(ui: &mut egui::Ui, cols: &[&str]) {
    for c in cols {
        ui.label(RichText::new(*c).strong());
    }
    ui.end_row();
}

fn members(a: &super::Answer<'_>, units: Units, ui: &mut egui::Ui) {
    let l = units.symbol(Quantity::Length);
    let f = units.symbol(Quantity::Force);
    egui::Grid::new("members-table").striped(true).spacing([18.0, 4.0]).show(ui, |ui| {
        header(
            ui,
            &[
                "member",
                "kind",
                "state",
                &format!("force ({f})"),
                &format!("length ({l})"),
                &format!("unstressed ({l})"),
                "strain (%)",
            ],
        );
        for r in &a.eq.members {
            let state = if r.slack {
                "slack"
            } else if r.force > 0.0 {
                "tension"
            } else if r.force < 0.0 {
                "compression"
            } else {
                "unloaded"
            };
            ui.label(&r.id);
            ui.label(r.kind.name());
            ui.label(state);
            ui.label(units.show(Quantity::Force, r.force));
            ui.label(units.show(Quantity::Length, r.length));
            ui.label(units.show(Quantity::Length, r.unstressed_length));
            ui.label(format!("{} %", significant(r.strain * 100.0, 4)));
            ui.end_row();
        }
    });
}

fn vec_text(units: Units, q: Quantity, v: &Vec3, planar: bool) -> String {
    let n = if planar { 2 } else { 3 };
    let parts: Vec<String> = (0..n).map(|k| significant(units.to_display(q, v[k]), 4)).collect();
    format!("({}) {}", parts.join(", "), units.symbol(q))
}

fn nodes(a: &super::Answer<'_>, units: Units, ui: &mut egui::Ui) {
    let planar = a.model.planar;
    egui::Grid::new("nodes-table").striped(true).spacing([18.0, 4.0]).show(ui, |ui| {
        header(
            ui,
            &[
                "node",
                "support",
                "mass",
                "position",
                "displacement",
                "|displacement|",
                "reaction",
                "|reaction|",
            ],
        );
        for (i, (n, r)) in a.model.nodes.iter().zip(&a.eq.nodes).enumerate() {
            let support = if n.support.is_anchor() {
                "anchor"
            } else if a.model.has_reaction(i) {
                "guided"
            } else {
                "free"
            };
            ui.label(&n.id);
            ui.label(support);
            ui.label(units.show(Quantity::Mass, n.mass));
            ui.label(vec_text(units, Quantity::Length, &r.position, planar));
            ui.label(vec_text(units, Quantity::Length, &r.displacement, planar));
            ui.label(units.show(Quantity::Length, r.displacement.norm()));
            match r.reaction.filter(|_| a.model.has_reaction(i)) {
                Some(f) => {
                    ui.label(vec_text(units, Quantity::Force, &f, planar));
                    ui.label(units.show(Quantity::Force, f.norm()));
                }
                None => {
                    ui.label("—");
                    ui.label("—");
                }
            }
            ui.end_row();
        }
    });
}

fn stiffness(app: &RigApp, units: Units, ui: &mut egui::Ui) {
    let node = match app.selection {
        Selection::Node(i) => app.doc.project.nodes.get(i).map(|n| n.id.clone()),
        _ => None,
    };
    let Some(node) = node else {
        ui.label("Select a free node on the Rig view to see its tangent stiffness.");
        return;
    };
    match app.solved.as_ref().and_then(|s| s.stiffness.as_ref()) {
        Some(Ok(k)) if k.node == node => stiffness_table(k, units, ui),
        Some(Err(e)) => {
            ui.label(RichText::new(format!("No stiffness at `{node}`: {e}")).color(pal::ALARM));
        }
        _ => {
            ui.label(format!("`{node}` has no free direction (a support), or it is not solved yet."));
        }
    }
}

fn stiffness_table(k: &NodeStiffness, units: Units, ui: &mut egui::Ui) {
    let s = units.symbol(Quantity::Stiffness);
    let axis = |a: usize| ["x", "y", "z"][a];
    ui.label(format!(
        "Tangent stiffness at `{}`, condensed (every other free node re-equilibrates). Units: {s}.",
        k.node
    ));
    ui.horizontal_top(|ui| {
        egui::Grid::new("principal").striped(true).spacing([14.0, 4.0]).show(ui, |ui| {
            header(ui, &["principal", "stiffness", "direction (x, y, z)"]);
            for (i, p) in k.principal.iter().enumerate() {
                ui.label(format!("k{}", i + 1));
                ui.label(units.show(Quantity::Stiffness, p.value));
                ui.label(format!("({:.3}, {:.3}, {:.3})", p.direction.x, p.direction.y, p.direction.z));
                ui.end_row();
            }
        });
        ui.separator();
        egui::Grid::new("split").striped(true).spacing([14.0, 4.0]).show(ui, |ui| {
            header(ui, &["entry", "total K_T", "elastic K_E", "geometric K_G"]);
            for (i, &ai) in k.axes.iter().enumerate() {
                for (j, &aj) in k.axes.iter().enumerate() {
                    if j < i {
                        continue;
                    }
                    ui.label(format!("k_{}{}", axis(ai), axis(aj)));
                    ui.label(units.show(Quantity::Stiffness, k.total[i][j]));
                    ui.label(units.show(Quantity::Stiffness, k.elastic[i][j]));
                    ui.label(units.show(Quantity::Stiffness, k.geometric[i][j]));
                    ui.end_row();
                }
            }
        });
    });
}

fn pull(app: &RigApp, ui: &mut egui::Ui) {
    let units = app.settings.units;
    let Some(p) = &app.pull else {
        ui.label("Pick the Pull tool, then drag a free node: it is held at the cursor while the rest of the rig re-equilibrates.");
        return;
    };
    ui.horizontal_top(|ui| {
        ui.vertical(|ui| {
            ui.set_width(300.0);
            ui.label(RichText::new(format!("Pull at `{}`", p.node_id)).strong());
            let d = p.target - p.start;
            ui.label(format!("displacement {}", units.show(Quantity::Length, d.norm())));
            match (&p.failure, p.force) {
                (Some(f), _) => {
                    ui.label(RichText::new(format!("No equilibrium with the node held here: {f}")).color(pal::ALARM));
                }
                (None, Some(f)) => {
                    let r = -(f - p.f0.unwrap_or_else(Vec3::zeros));
                    ui.label(RichText::new(format!("Restoring force {}", units.show(Quantity::Force, r.norm()))).color(pal::PULL));
                    ui.label(format!("components {}", vec_text(units, Quantity::Force, &r, app.doc.model.planar)));
                }
                (None, None) => {
                    ui.label("Restoring force — (drag to pull)");
                }
            }
            if let Some(k) = &p.stiffness
                && d.norm() > 0.0
            {
                let dir = d / d.norm();
                ui.label(format!(
                    "tangent stiffness along the pull {}",
                    units.show(Quantity::Stiffness, k.along(&dir))
                ));
            }
            if !p.active {
                ui.label(RichText::new("released; the rig is back at its equilibrium").weak());
            }
        });
        let lu = Quantity::Length;
        let fu = Quantity::Force;
        let measured: Vec<[f64; 2]> = p
            .samples
            .iter()
            .map(|s| [units.to_display(lu, s[0]), units.to_display(fu, s[1])])
            .collect();
        let predicted: Vec<[f64; 2]> = p
            .samples
            .iter()
            .filter(|s| s[2].is_finite())
            .map(|s| [units.to_display(lu, s[0]), units.to_display(fu, s[2])])
            .collect();
        Plot::new("pull-plot")
            .legend(Legend::default())
            .x_axis_label(format!("displacement from start ({})", units.symbol(lu)))
            .y_axis_label(format!("holding force along the pull ({})", units.symbol(fu)))
            .y_axis_min_width(56.0)
            .show(ui, |plot| {
                plot.line(
                    Line::new("equilibrium (large displacement)", PlotPoints::from(measured))
                        .color(pal::PULL)
                        .width(2.0),
                );
                plot.line(
                    Line::new("tangent prediction from the start", PlotPoints::from(predicted))
                        .color(pal::STIFFNESS)
                        .style(LineStyle::dashed_loose()),
                );
            });
    });
}
