//! What the Rig view shows over the rig: the grid and the model axes, the scale bar and the
//! view's axes, banners (no equilibrium, an invalid edit, a failed Pull) and the legend.

use eframe::egui::{self, Align2, Color32, FontId, Rect, Shape, Stroke, pos2, vec2};
use rigwright_report::plane::Plane;
use rigwright_report::units::{Quantity, Units, significant};

use super::camera::{RigView, nice_down};
use super::symbols::hollow_or_solid;
use crate::gui::RigApp;
use crate::gui::palette as pal;

pub(super) fn draw_grid(view: &RigView, painter: &egui::Painter, units: Units) {
    let rect = view.rect;
    let (step, _) = view.grid_step(units);
    let lo = view.to_uv(rect.left_bottom());
    let hi = view.to_uv(rect.right_top());
    for axis in 0..2 {
        let (a, b) = (lo[axis], hi[axis]);
        let k0 = (a / step).floor() as i64;
        let k1 = (b / step).ceil() as i64;
        if k1 - k0 > 600 {
            continue;
        }
        for k in k0..=k1 {
            let t = k as f64 * step;
            let major = k.rem_euclid(5) == 0;
            let colour = if major { pal::GRID_MAJOR } else { pal::GRID_MINOR };
            let s = view.to_screen_uv([t, t]);
            if axis == 0 {
                painter.vline(s.x, rect.y_range(), Stroke::new(1.0, colour));
            } else {
                painter.hline(rect.x_range(), s.y, Stroke::new(1.0, colour));
            }
        }
    }
    // The model axes through the origin.
    let o = view.to_screen_uv([0.0, 0.0]);
    let axis = Stroke::new(1.0, Color32::from_rgb(176, 182, 190));
    if rect.x_range().contains(o.x) {
        painter.vline(o.x, rect.y_range(), axis);
    }
    if rect.y_range().contains(o.y) {
        painter.hline(rect.x_range(), o.y, axis);
    }
}

pub(super) fn draw_scale_bar_and_axes(view: &RigView, painter: &egui::Painter, units: Units) {
    let rect = view.rect;
    let unit_m = units.to_si(Quantity::Length, 1.0);
    let len_units = nice_down(120.0 / (view.scale * unit_m));
    let px = (len_units * unit_m * view.scale) as f32;
    let base = rect.left_bottom() + vec2(18.0, -18.0);
    let stroke = Stroke::new(1.5, pal::INK);
    painter.line_segment([base, base + vec2(px, 0.0)], stroke);
    for k in 0..=2 {
        let x = px * k as f32 / 2.0;
        let h = if k == 1 { 4.0 } else { 7.0 };
        painter.line_segment([base + vec2(x, 0.0), base + vec2(x, -h)], stroke);
    }
    painter.text(
        base + vec2(px / 2.0, -9.0),
        Align2::CENTER_BOTTOM,
        format!("{} {}", significant(len_units, 3), units.symbol(Quantity::Length)),
        FontId::proportional(12.0),
        pal::INK,
    );
    // Axes of the view.
    let o = base + vec2(0.0, -40.0);
    let (u, v, v_down) = match view.plane {
        Plane::Elevation => ("x", "y", false),
        Plane::Side => ("z", "y", false),
        Plane::Plan => ("x", "z", true),
    };
    let vv = if v_down { vec2(0.0, 28.0) } else { vec2(0.0, -28.0) };
    let o = if v_down { o + vec2(0.0, -28.0) } else { o };
    painter.arrow(o, vec2(28.0, 0.0), stroke);
    painter.arrow(o, vv, stroke);
    let font = FontId::proportional(12.0);
    painter.text(o + vec2(33.0, 0.0), Align2::LEFT_CENTER, u, font.clone(), pal::INK);
    painter.text(o + vv * 1.2, Align2::CENTER_CENTER, v, font.clone(), pal::INK);
    painter.text(
        rect.left_top() + vec2(12.0, 10.0),
        Align2::LEFT_TOP,
        view.plane.label(),
        FontId::proportional(12.0),
        pal::INK.gamma_multiply(0.7),
    );
}

/// Width kept free at the top right for the force legend (pt).
const LEGEND_ROOM: f64 = 220.0;

pub(super) fn draw_banners(painter: &egui::Painter, rect: Rect, banners: &[(String, Color32)]) {
    let mut y = rect.top() + 30.0;
    // Banners wrap clear of the legend, which is drawn at the top right.
    let wrap = (rect.width() - 80.0 - LEGEND_ROOM as f32).max(200.0);
    for (text, colour) in banners {
        let galley = painter.layout(text.clone(), FontId::proportional(13.5), Color32::WHITE, wrap);
        let r = Rect::from_min_size(pos2(rect.left() + 24.0, y), galley.size() + vec2(20.0, 12.0));
        painter.rect_filled(r, 4.0, *colour);
        painter.galley(r.min + vec2(10.0, 6.0), galley, Color32::WHITE);
        y = r.bottom() + 6.0;
    }
}

pub(super) fn draw_legend(app: &RigApp, painter: &egui::Painter, units: Units) {
    let Some(a) = app.answer() else { return };
    let rect = app.view.rect;
    let max_t = a.eq.members.iter().map(|m| m.force).fold(0.0, f64::max);
    let max_c = a.eq.members.iter().map(|m| -m.force).fold(0.0, f64::max);
    let max = max_t.max(max_c);
    let w = 196.0;
    let rows = 6.0 + if max_c > 0.0 { 1.0 } else { 0.0 };
    let r = Rect::from_min_size(rect.right_top() + vec2(-w - 12.0, 12.0), vec2(w, 22.0 + rows * 19.0));
    painter.rect_filled(r, 4.0, Color32::from_rgba_unmultiplied(255, 255, 255, 235));
    painter.rect_stroke(r, 4.0, Stroke::new(1.0, pal::GRID_MAJOR), egui::StrokeKind::Inside);
    let font = FontId::proportional(11.5);
    let mut y = r.top() + 12.0;
    painter.text(
        pos2(r.left() + 10.0, y),
        Align2::LEFT_CENTER,
        "Member force",
        FontId::proportional(12.5),
        pal::INK,
    );
    y += 19.0;
    let bar = |y: f32, sign: f64, to: f64, label: &str| {
        let x0 = r.left() + 10.0;
        let bw = 90.0;
        let n = 30;
        for k in 0..n {
            let t = k as f64 / (n - 1) as f64;
            let c = pal::force_colour(sign * t * max.max(1e-300), max.max(1e-300));
            let xr = Rect::from_min_size(pos2(x0 + bw * k as f32 / n as f32, y - 5.0), vec2(bw / n as f32 + 0.5, 10.0));
            painter.rect_filled(xr, 0.0, c);
        }
        painter.text(
            pos2(x0 + bw + 6.0, y),
            Align2::LEFT_CENTER,
            format!("{label} {}", units.show(Quantity::Force, to)),
            font.clone(),
            pal::INK,
        );
    };
    bar(y, 1.0, max_t, "tension to");
    y += 19.0;
    if max_c > 0.0 {
        bar(y, -1.0, max_c, "compr. to");
        y += 19.0;
    }
    let x0 = r.left() + 10.0;
    let key = |y: f32, text: &str| {
        painter.text(pos2(x0 + 40.0, y), Align2::LEFT_CENTER, text, font.clone(), pal::INK);
    };
    painter.extend(Shape::dashed_line(
        &[pos2(x0, y), pos2(x0 + 30.0, y)],
        Stroke::new(1.6, pal::SLACK),
        6.0,
        4.0,
    ));
    key(y, "slack cable");
    y += 19.0;
    hollow_or_solid(
        painter,
        vec![pos2(x0, y), pos2(x0 + 30.0, y)],
        pal::force_colour(-1.0, 1.0),
        true,
        3.2,
    );
    key(y, "in compression (hollow)");
    y += 19.0;
    painter.arrow(pos2(x0, y), vec2(26.0, 0.0), Stroke::new(2.0, pal::REACTION));
    key(y, "support reaction");
    y += 19.0;
    painter.arrow(pos2(x0, y), vec2(26.0, 0.0), Stroke::new(2.2, pal::LOAD));
    key(y, "point load");
    y += 19.0;
    painter.arrow(pos2(x0, y), vec2(26.0, 0.0), Stroke::new(2.6, pal::PULL));
    key(y, "restoring force (Pull)");
}
