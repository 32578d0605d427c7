//! The rig in motion on the Rig view: a Pluck, its members coloured by their force, or an
//! animated mode shape.

use eframe::egui::{self, Color32, Pos2, Stroke};
use rigwright_core::Model;
use rigwright_core::Vec3;

use crate::gui::RigApp;
use crate::gui::palette as pal;

/// Draws the moving rig (Pluck or an animated mode) on the Rig view.
pub(super) fn draw_moving(app: &RigApp, painter: &egui::Painter, positions: &[Vec3], forces: Option<&[f64]>) {
    let (model, nodes): (&Model, usize) = match (&app.pluck, app.answer()) {
        (Some(p), _) => (&p.rig, p.original_nodes),
        (None, Some(a)) => (a.model, a.model.nodes.len()),
        _ => return,
    };
    let view = &app.view;
    let max = forces.map(|f| f.iter().map(|v| v.abs()).fold(0.0, f64::max)).unwrap_or(0.0);
    for (k, m) in model.members.iter().enumerate() {
        let (a, b) = (view.to_screen(positions[m.ends[0]]), view.to_screen(positions[m.ends[1]]));
        let (colour, slack) = match forces {
            Some(f) => (
                pal::force_colour(f[k], max),
                matches!(m.kind, rigwright_core::MemberKind::Cable { .. }) && f[k] == 0.0,
            ),
            None => (pal::INK, false),
        };
        if slack {
            painter.add(egui::Shape::dashed_line(&[a, b], Stroke::new(1.5, pal::SLACK), 6.0, 4.0));
        } else {
            painter.line_segment([a, b], Stroke::new(3.0, colour));
        }
    }
    // The rig's own nodes; the joints of cables cut into links are drawn by their links.
    for (i, n) in model.nodes.iter().enumerate().take(nodes) {
        let s: Pos2 = view.to_screen(positions[i]);
        let r = if n.mass > 0.0 { 5.0 } else { 3.0 };
        painter.circle(
            s,
            r,
            if n.support.is_anchor() { pal::INK } else { Color32::WHITE },
            Stroke::new(1.5, pal::INK),
        );
    }
}
