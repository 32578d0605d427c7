//! The Load path tab of the Readouts: load factor against a node's displacement, traced
//! through limit points and unstable stretches, and the explicit choice to follow the rig past
//! a limit point to the state it snaps to.

use eframe::egui::{self, RichText};
use egui_plot::{Legend, Line, LineStyle, Plot, PlotPoints, Points};
use rigwright_core::solve::sig6;
use rigwright_report::units::Quantity;

use crate::gui::palette as pal;
use crate::gui::{RigApp, Selection};

/// The free node the trace follows: the selected node, else the one that moves most.
fn node_to_trace(app: &RigApp) -> Option<usize> {
    let model = &app.doc.model;
    let free = |i: usize| model.nodes.get(i).is_some_and(|n| !n.support.is_anchor());
    if let Selection::Node(i) = app.selection
        && let Some(m) = app.doc.project.nodes.get(i).and_then(|n| model.node_index(&n.id))
        && free(m)
    {
        return Some(m);
    }
    if let Some(a) = app.answer() {
        return a
            .eq
            .nodes
            .iter()
            .enumerate()
            .filter(|(i, _)| free(*i))
            .max_by(|x, y| x.1.displacement.norm().total_cmp(&y.1.displacement.norm()))
            .map(|(i, _)| i);
    }
    (0..model.nodes.len()).find(|&i| free(i))
}

pub(super) fn ui(app: &mut RigApp, ui: &mut egui::Ui) {
    app.poll_path();
    let units = app.settings.units;
    if let Some(lambda) = app.critical() {
        ui.label(
            RichText::new(format!(
                "The load path stops at a critical point at load factor {}: no answer is shown for the full load.",
                sig6(lambda)
            ))
            .color(pal::ALARM),
        );
    }
    ui.horizontal(|ui| {
        ui.checkbox(&mut app.follow, "Follow past limit points")
            .on_hover_text("Show the stable state the rig snaps to beyond a limit point or bifurcation. The answer then lies on another branch than the load path, and says so. Off by default: a critical point is reported, never passed silently.");
        if app.follow {
            ui.label(RichText::new("on: answers past a limit point are on another branch").color(pal::CAUTION));
        }
    });
    ui.separator();
    let node = node_to_trace(app);
    ui.horizontal(|ui| {
        match node {
            Some(n) => {
                let id = app.doc.model.nodes[n].id.clone();
                if ui
                    .button(format!("Trace the load path at node {id}"))
                    .on_hover_text("Load factor against this node's displacement, from the unloaded rig to the full load case, through limit points (select another node to trace it)")
                    .clicked()
                {
                    app.trace_path(n);
                }
            }
            None => {
                ui.label("Select a free node to trace the load path at.");
            }
        }
        if app.path.as_ref().is_some_and(|p| p.job.is_some()) {
            ui.spinner();
            ui.label("tracing…");
        }
    });
    let Some(Some(result)) = app.path.as_ref().map(|p| p.result.as_ref()) else {
        ui.label("Nothing traced yet.");
        return;
    };
    let trace = match result {
        Ok(t) => t,
        Err(e) => {
            ui.label(RichText::new(e).color(pal::ALARM));
            return;
        }
    };
    // Plot the displacement component that changes most along the path.
    let axis = (0..3)
        .max_by(|&a, &b| {
            let range = |k: usize| {
                let v = trace.points.iter().map(|p| p.displacement[k]);
                v.clone().fold(f64::NEG_INFINITY, f64::max) - v.fold(f64::INFINITY, f64::min)
            };
            range(a).total_cmp(&range(b))
        })
        .unwrap_or(1);
    let lu = Quantity::Length;
    let x = |p: &rigwright_core::solve::PathPoint| units.to_display(lu, p.displacement[axis]);
    for c in &trace.critical {
        ui.label(
            RichText::new(format!(
                "{} at load factor {} ({} {} = {})",
                c.kind,
                sig6(c.load_factor),
                trace.node,
                ["x", "y", "z"][axis],
                units.show(lu, c.displacement[axis])
            ))
            .color(pal::ALARM),
        );
    }
    if !trace.reached {
        ui.label(RichText::new("The path stopped before the full load.").color(pal::CAUTION));
    }
    // Stable and unstable stretches as separate lines.
    let mut stable: Vec<Vec<[f64; 2]>> = Vec::new();
    let mut unstable: Vec<Vec<[f64; 2]>> = Vec::new();
    let mut last: Option<(bool, [f64; 2])> = None;
    for p in &trace.points {
        let pt = [x(p), p.load_factor];
        let list = if p.stable { &mut stable } else { &mut unstable };
        match last {
            Some((was, _)) if was == p.stable => {}
            // A new stretch starts where the last one ended, so the curve has no gaps.
            Some((_, prev)) => list.push(vec![prev]),
            None => list.push(Vec::new()),
        }
        list.last_mut().expect("a stretch").push(pt);
        last = Some((p.stable, pt));
    }
    let critical: Vec<[f64; 2]> = trace
        .critical
        .iter()
        .map(|c| [units.to_display(lu, c.displacement[axis]), c.load_factor])
        .collect();
    Plot::new("path-plot")
        .height(260.0)
        .legend(Legend::default())
        .x_axis_label(format!(
            "displacement of {} along {} ({})",
            trace.node,
            ["x", "y", "z"][axis],
            units.symbol(lu)
        ))
        .y_axis_label("load factor (1 = the full load case)")
        .y_axis_min_width(48.0)
        .show(ui, |plot| {
            for s in stable {
                plot.line(Line::new("stable", PlotPoints::from(s)).color(pal::STIFFNESS).width(2.0));
            }
            for s in unstable {
                plot.line(
                    Line::new("unstable", PlotPoints::from(s))
                        .color(pal::ALARM)
                        .style(LineStyle::dashed_loose()),
                );
            }
            plot.points(
                Points::new("critical points", PlotPoints::from(critical))
                    .radius(5.0)
                    .color(pal::ALARM),
            );
        });
}
