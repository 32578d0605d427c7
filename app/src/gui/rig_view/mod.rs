//! The Rig view: the canvas where the rig is drawn, edited and pulled.
//!
//! Responsible for the model↔screen transform (pan, zoom, view plane), drawing the drawn and
//! solved geometry with its symbols, and turning presses and drags into commands or a Pull.
//! Not responsible for solving: it draws what the last solve returned.
//!
//! This file draws a frame of it; `camera.rs` holds the transform and the interaction state,
//! `draw.rs` the rig, `symbols.rs` its marks, `overlay.rs` what lies over it, `input.rs` what
//! presses and drags do, `moving.rs` the rig in motion.

mod camera;
mod draw;
mod input;
mod moving;
mod overlay;
mod symbols;

use eframe::egui::{self, Align2, Color32, FontId, Sense};
use rigwright_core::Vec3;

use self::draw::{draw_answer, draw_box_selection, draw_drawn, draw_member_start};
use self::input::{interact, navigate};
use self::overlay::{draw_banners, draw_grid, draw_legend, draw_scale_bar_and_axes};
use crate::gui::RigApp;
use crate::gui::palette as pal;
use camera::node_pos;

pub use camera::RigView;

/// Draws the Rig view and handles its input.
pub fn ui(app: &mut RigApp, ui: &mut egui::Ui) {
    let (response, painter) = ui.allocate_painter(ui.available_size(), Sense::click_and_drag());
    let rect = response.rect;
    app.view.rect = rect;
    if app.view.fit_next {
        app.view.fit_next = false;
        app.view.fit_frames = 3;
    }
    if app.view.fit_frames > 0 {
        // Panels settle over the first frames; fit again until they have.
        app.view.fit_frames -= 1;
        let mut pts: Vec<Vec3> = (0..app.doc.project.nodes.len()).map(|i| node_pos(&app.doc.project, i)).collect();
        if let Some(a) = app.answer() {
            pts.extend(a.eq.positions());
        }
        app.view.fit(&pts);
    }
    navigate(app, ui, &response);

    painter.rect_filled(rect, 0.0, pal::PAPER);
    let units = app.settings.units;
    draw_grid(&app.view, &painter, units);
    if app.settings.drawn_geometry || app.answer().is_none() {
        draw_drawn(app, &painter);
    }
    let mut banners: Vec<(String, Color32)> = Vec::new();
    if let Some(d) = app.diagnostic() {
        banners.push((d, pal::ALARM));
    }
    if let Some(note) = app.route_note() {
        banners.push((format!("Note — {note}"), pal::CAUTION));
    }
    if let Some(p) = &app.doc.problems {
        banners.push((
            format!("Edit not solved — the rig as edited is not valid; showing the last valid rig.\n{p}"),
            pal::CAUTION,
        ));
    }
    if let Some(pull) = app.pull.as_ref().filter(|p| p.active)
        && let Some(f) = &pull.failure
    {
        banners.push((format!("Pull: no equilibrium with `{}` held here — {f}", pull.node_id), pal::ALARM));
    }
    if let Some((positions, forces)) = super::pluck::moving_positions(app) {
        moving::draw_moving(app, &painter, &positions, forces.as_deref());
    } else if let Some(a) = app.answer() {
        draw_answer(app, &a, &painter, units);
    }
    draw_member_start(app, &painter);
    draw_box_selection(app, &painter, response.interact_pointer_pos());
    draw_scale_bar_and_axes(&app.view, &painter, units);
    draw_banners(&painter, rect, &banners);
    if app.answer().is_some() {
        draw_legend(app, &painter, units);
    }
    if app.doc.project.nodes.is_empty() {
        painter.text(
            rect.center(),
            Align2::CENTER_CENTER,
            "Empty rig — pick Anchor in the toolbar and click here to start",
            FontId::proportional(15.0),
            pal::INK,
        );
    }
    interact(app, ui, &response);
}
