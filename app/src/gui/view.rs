//! The Rig view: the canvas where the rig is drawn, edited and pulled.
//!
//! Responsible for the model↔screen transform (pan, zoom, view plane), drawing the drawn and
//! solved geometry with its symbols, and turning presses and drags into commands or a Pull.
//! Not responsible for solving: it draws what the last solve returned.

use eframe::egui::{self, Align2, Color32, FontId, PointerButton, Pos2, Rect, Sense, Shape, Stroke, Vec2, pos2, vec2};
use rigwright_core::element::MemberClass;
use rigwright_core::model::{CaseDoc, LoadDoc, MemberDoc, MemberDocKind, NodeDoc, Rest};
use rigwright_core::{Project, Vec3};

use super::palette as pal;
use super::{Answer, Command, RigApp, Selection, Tool};
use rigwright_report::plane::Plane;
use rigwright_report::units::{Quantity, Units};

enum Drag {
    None,
    Pan,
    Node {
        index: usize,
        key: String,
    },
    Pull,
    /// Box selection from this screen point.
    Box {
        from: Pos2,
    },
}

/// Camera and interaction state of the Rig view.
pub struct RigView {
    pub plane: Plane,
    /// Model coordinates (u, v) at the centre of the canvas (m).
    center: [f64; 2],
    /// Pixels per metre.
    scale: f64,
    /// Canvas rectangle of the last frame.
    rect: Rect,
    /// Fit the rig into the canvas on the next frame.
    pub fit_next: bool,
    fit_frames: u8,
    /// First node picked by a member tool (document index).
    member_start: Option<usize>,
    drag: Drag,
    serial: u64,
}

impl Default for RigView {
    fn default() -> Self {
        RigView {
            plane: Plane::Elevation,
            center: [0.0, 0.0],
            scale: 80.0,
            rect: Rect::from_min_size(Pos2::ZERO, vec2(800.0, 500.0)),
            fit_next: true,
            fit_frames: 0,
            member_start: None,
            drag: Drag::None,
            serial: 0,
        }
    }
}

impl RigView {
    /// Screen position of a model point.
    pub fn to_screen(&self, p: Vec3) -> Pos2 {
        let [u, v] = self.plane.uv(&p);
        let c = self.rect.center();
        pos2(
            c.x + ((u - self.center[0]) * self.scale) as f32,
            c.y - ((v - self.center[1]) * self.scale) as f32,
        )
    }

    /// Screen vector of a model vector scaled by `px_per_unit`.
    fn dir(&self, v: &Vec3, px_per_unit: f64) -> Vec2 {
        let [u, w] = self.plane.uv(v);
        vec2((u * px_per_unit) as f32, -(w * px_per_unit) as f32)
    }

    fn to_uv(&self, s: Pos2) -> [f64; 2] {
        let c = self.rect.center();
        [
            self.center[0] + (s.x - c.x) as f64 / self.scale,
            self.center[1] - (s.y - c.y) as f64 / self.scale,
        ]
    }

    /// Drops a half-made member and any drag.
    pub fn cancel(&mut self) {
        self.member_start = None;
        self.drag = Drag::None;
    }

    pub fn set_plane(&mut self, plane: Plane) {
        if plane != self.plane {
            self.plane = plane;
            self.fit_next = true;
        }
    }

    /// Elevation for a planar rig; for a 3D rig the view in which it spreads out most.
    pub fn choose_plane(&mut self, project: &Project) {
        self.plane = Plane::for_project(project);
        self.fit_next = true;
    }

    fn fit(&mut self, points: &[Vec3]) {
        if points.is_empty() {
            self.center = [0.0, 0.0];
            self.scale = 80.0;
            return;
        }
        let mut lo = [f64::INFINITY; 2];
        let mut hi = [f64::NEG_INFINITY; 2];
        for p in points {
            let uv = self.plane.uv(p);
            for k in 0..2 {
                lo[k] = lo[k].min(uv[k]);
                hi[k] = hi[k].max(uv[k]);
            }
        }
        // Leave room for the banner (top), the legend (right) and the scale bar (bottom left).
        let inner = Rect::from_min_max(self.rect.min + vec2(100.0, 80.0), self.rect.max - vec2(290.0, 80.0));
        let w = (hi[0] - lo[0]).max(1e-3);
        let h = (hi[1] - lo[1]).max(1e-3);
        let sx = inner.width().max(50.0) as f64 / w;
        let sy = inner.height().max(50.0) as f64 / h;
        self.scale = sx.min(sy).clamp(1e-3, 1e7);
        if w < 1e-2 && h < 1e-2 {
            self.scale = 80.0;
        }
        let mid = [(lo[0] + hi[0]) / 2.0, (lo[1] + hi[1]) / 2.0];
        let off = inner.center() - self.rect.center();
        self.center = [mid[0] - off.x as f64 / self.scale, mid[1] + off.y as f64 / self.scale];
    }

    /// Grid step (m) and its value in display units: about 40 px, a 1-2-5 multiple of a power of ten.
    fn grid_step(&self, units: Units) -> (f64, f64) {
        let unit_m = units.to_si(Quantity::Length, 1.0);
        let raw = 40.0 / (self.scale * unit_m);
        let step = nice_up(raw);
        (step * unit_m, step)
    }

    fn snap(&self, uv: [f64; 2], units: Units, on: bool) -> [f64; 2] {
        if !on {
            return uv;
        }
        let (s, _) = self.grid_step(units);
        [(uv[0] / s).round() * s, (uv[1] / s).round() * s]
    }
}

/// Smallest 1, 2 or 5 × 10ⁿ at or above `x`.
fn nice_up(x: f64) -> f64 {
    let e = x.log10().floor();
    let b = 10f64.powf(e);
    for m in [1.0, 2.0, 5.0, 10.0] {
        if m * b >= x * (1.0 - 1e-9) {
            return m * b;
        }
    }
    10.0 * b
}

/// Largest 1, 2 or 5 × 10ⁿ at or below `x`.
fn nice_down(x: f64) -> f64 {
    let e = x.log10().floor();
    let b = 10f64.powf(e);
    for m in [5.0, 2.0, 1.0] {
        if m * b <= x * (1.0 + 1e-9) {
            return m * b;
        }
    }
    b
}

fn node_pos(p: &Project, i: usize) -> Vec3 {
    let a = p.nodes[i].at;
    Vec3::new(a.0, a.1, a.2)
}

/// A short id like `cable-3` not yet used in `taken`.
pub fn fresh_id<'a>(prefix: &str, taken: impl Iterator<Item = &'a str> + Clone) -> String {
    (1..)
        .map(|k| format!("{prefix}-{k}"))
        .find(|id| !taken.clone().any(|t| t == id))
        .expect("some id is free")
}

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
        super::pluck::draw_moving(app, &painter, &positions, forces.as_deref());
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

fn navigate(app: &mut RigApp, ui: &egui::Ui, response: &egui::Response) {
    let view = &mut app.view;
    if let Some(hover) = response.hover_pos() {
        let (scroll, zoom) = ui.input(|i| (i.smooth_scroll_delta.y, i.zoom_delta()));
        let factor = zoom as f64 * (scroll as f64 * 0.0025).exp();
        if (factor - 1.0).abs() > 1e-6 {
            let before = view.to_uv(hover);
            view.scale = (view.scale * factor).clamp(1e-3, 1e7);
            let after = view.to_uv(hover);
            view.center[0] += before[0] - after[0];
            view.center[1] += before[1] - after[1];
        }
    }
    let space = ui.input(|i| i.key_down(egui::Key::Space));
    let panning = response.dragged_by(PointerButton::Middle)
        || response.dragged_by(PointerButton::Secondary)
        || (space && response.dragged_by(PointerButton::Primary))
        || matches!(view.drag, Drag::Pan);
    if panning && response.dragged() {
        let d = response.drag_delta();
        view.center[0] -= d.x as f64 / view.scale;
        view.center[1] += d.y as f64 / view.scale;
        if space && response.drag_started_by(PointerButton::Primary) {
            view.drag = Drag::Pan;
        }
    }
    if matches!(view.drag, Drag::Pan) && response.drag_stopped() {
        view.drag = Drag::None;
    }
}

fn draw_grid(view: &RigView, painter: &egui::Painter, units: Units) {
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

impl RigView {
    fn to_screen_uv(&self, uv: [f64; 2]) -> Pos2 {
        let c = self.rect.center();
        pos2(
            c.x + ((uv[0] - self.center[0]) * self.scale) as f32,
            c.y - ((uv[1] - self.center[1]) * self.scale) as f32,
        )
    }
}

/// The geometry as drawn, faint, with selection highlights.
fn draw_drawn(app: &RigApp, painter: &egui::Painter) {
    let p = &app.doc.project;
    let view = &app.view;
    let faint_only = app.answer().is_some();
    let index = |id: &str| p.nodes.iter().position(|n| n.id == id);
    for (mi, m) in p.members.iter().enumerate() {
        let (Some(a), Some(b)) = (index(&m.ends.0), index(&m.ends.1)) else {
            continue;
        };
        let (sa, sb) = (view.to_screen(node_pos(p, a)), view.to_screen(node_pos(p, b)));
        let selected = app.selection == Selection::Member(mi);
        let stroke = Stroke::new(if selected { 3.0 } else { 1.2 }, if selected { pal::SELECT } else { pal::DRAWN });
        match m.kind {
            MemberDocKind::Spring { .. } => {
                painter.add(Shape::line(zigzag(sa, sb), stroke));
            }
            _ => {
                painter.line_segment([sa, sb], stroke);
            }
        }
    }
    for (i, n) in p.nodes.iter().enumerate() {
        let s = view.to_screen(node_pos(p, i));
        if n.fixed != [false; 3] && !faint_only {
            draw_support(view, painter, s, n.fixed, pal::DRAWN);
        }
        let selected = app.selection == Selection::Node(i) || app.boxed.contains(&i);
        if selected {
            painter.circle_stroke(s, 8.0, Stroke::new(2.0, pal::SELECT));
        }
        painter.circle(s, 2.5, pal::PAPER, Stroke::new(1.0, pal::DRAWN));
    }
}

/// The solved equilibrium: members coloured by force, symbols, arrows, stiffness, Pull.
fn draw_answer(app: &RigApp, a: &Answer<'_>, painter: &egui::Painter, units: Units) {
    let view = &app.view;
    let model = a.model;
    let eq = a.eq;
    let labels = app.settings.force_labels;
    let max_force = eq.members.iter().map(|m| m.force.abs()).fold(0.0, f64::max);
    let pos = |i: usize| view.to_screen(eq.nodes[i].position);
    let mut texts: Vec<(Pos2, String, Color32)> = Vec::new();

    for (m, r) in model.members.iter().zip(&eq.members) {
        let (sa, sb) = (pos(m.ends[0]), pos(m.ends[1]));
        let colour = pal::force_colour(r.force, max_force);
        let compression = r.force < 0.0 && !r.slack;
        match r.kind {
            MemberClass::Cable if r.slack => {
                painter.extend(Shape::dashed_line(&[sa, sb], Stroke::new(1.6, pal::SLACK), 7.0, 5.0));
            }
            MemberClass::Spring => hollow_or_solid(painter, zigzag(sa, sb), colour, compression, 2.0),
            _ => hollow_or_solid(painter, vec![sa, sb], colour, compression, 3.2),
        }
        if labels && !r.slack && sa.distance(sb) > 56.0 {
            let mid = sa + (sb - sa) * 0.5;
            let n = (sb - sa).normalized().rot90();
            texts.push((mid + n * 11.0, units.show(Quantity::Force, r.force), pal::INK));
        } else if labels && r.slack {
            texts.push((sa + (sb - sa) * 0.3, "slack".into(), pal::SLACK));
        }
    }

    // Supports, masses and free nodes.
    for (i, n) in model.nodes.iter().enumerate() {
        let s = pos(i);
        let fixed = if model.planar {
            [n.support.fixed[0], n.support.fixed[1], false]
        } else {
            n.support.fixed
        };
        if fixed != [false; 3] {
            draw_support(view, painter, s, fixed, pal::INK);
        }
        if n.mass > 0.0 && !n.support.is_anchor() {
            let r = (3.0 + 1.6 * n.mass.cbrt()).clamp(4.0, 11.0) as f32;
            painter.circle(s, r, pal::INK, Stroke::new(1.0, pal::PAPER));
            if labels {
                texts.push((s + vec2(0.0, r + 11.0), units.show(Quantity::Mass, n.mass), pal::INK));
            }
        } else if !model.has_reaction(i) {
            painter.circle(s, 3.0, pal::PAPER, Stroke::new(1.4, pal::INK));
        }
        if app.settings.node_ids {
            texts.push((s + vec2(0.0, -16.0), n.id.clone(), pal::MUTED));
        }
    }

    // Reactions.
    if app.settings.reactions {
        let reactions: Vec<(usize, Vec3)> = eq
            .nodes
            .iter()
            .enumerate()
            .filter(|(i, _)| model.has_reaction(*i))
            .filter_map(|(i, n)| n.reaction.map(|r| (i, r)))
            .collect();
        let max = reactions.iter().map(|(_, r)| r.norm()).fold(0.0, f64::max);
        for (i, r) in reactions {
            if max <= 0.0 || r.norm() < max * 1e-6 {
                continue;
            }
            let v = view.dir(&r, 64.0 / max);
            if v.length() < 3.0 {
                continue;
            }
            // Drawn outside the rig: a pull starts at the support, a push ends at it.
            let inward: Vec2 = model
                .members
                .iter()
                .filter_map(|m| match m.ends {
                    [a, b] if a == i => Some(b),
                    [a, b] if b == i => Some(a),
                    _ => None,
                })
                .map(|o| (pos(o) - pos(i)).normalized())
                .fold(Vec2::ZERO, |acc, d| acc + d);
            let u = v.normalized();
            let (tail, label_at) = if inward.dot(u) > 0.0 {
                let tip = pos(i) - u * 6.0;
                (tip - v, tip - v - u * 22.0)
            } else {
                let tail = pos(i) + u * 6.0;
                (tail, tail + v + u * 22.0)
            };
            painter.arrow(tail, v, Stroke::new(2.0, pal::REACTION));
            if labels {
                texts.push((label_at, units.show(Quantity::Force, r.norm()), pal::REACTION));
            }
        }
    }

    // Point loads of the case.
    if let Some(case) = model.cases.get(app.case) {
        let max = case.loads.iter().map(|(_, f)| f.norm()).fold(0.0, f64::max);
        for (node, f) in &case.loads {
            if max <= 0.0 {
                continue;
            }
            let v = view.dir(f, 56.0 / max);
            if v.length() < 3.0 {
                continue;
            }
            let tip = pos(*node) - v.normalized() * 4.0;
            painter.arrow(tip - v, v, Stroke::new(2.2, pal::LOAD));
            if labels {
                texts.push((tip - v * 1.15, units.show(Quantity::Force, f.norm()), pal::LOAD));
            }
        }
    }

    // What the user is measuring right now is placed first, so a dense rig never hides it.
    let mut first = Vec::new();
    draw_stiffness(app, a, painter, units, &mut first);
    draw_pull(app, a, painter, units, &mut first);
    first.append(&mut texts);
    let texts = first;

    // Labels that would land on an earlier one (members seen edge-on in a projection) are
    // stacked below it, so none hides another; one with no free place nearby is left out (a
    // dense rig at this zoom) and the view says how many, the Readouts list every value.
    let inside = view.rect.shrink(30.0);
    let mut placed = LabelGrid::default();
    let mut hidden = 0usize;
    for (p, t, c) in texts {
        let mut at = p.clamp(inside.min, inside.max);
        let mut free = false;
        for _ in 0..6 {
            let r = Rect::from_center_size(at, vec2(7.0 * t.chars().count() as f32, 14.0));
            if placed.insert_if_free(r) {
                free = true;
                break;
            }
            at.y += 15.0;
        }
        if free {
            label(painter, at, &t, c);
        } else {
            hidden += 1;
        }
    }
    if hidden > 0 {
        let text = format!("{hidden} labels left out where they would overlap: zoom in, or read the values in the Readouts");
        let galley = painter.layout_no_wrap(text, FontId::proportional(12.0), pal::INK);
        let r = Align2::LEFT_TOP.anchor_size(view.rect.left_top() + vec2(10.0, 28.0), galley.size());
        painter.rect_filled(r.expand(3.0), 3.0, pal::PAPER);
        painter.galley(r.min, galley, pal::INK);
    }
}

/// Rectangles of the labels placed so far, bucketed by screen cell so that testing a new
/// one costs the same however many there are (a large rig has thousands).
#[derive(Default)]
struct LabelGrid {
    cells: std::collections::HashMap<(i32, i32), Vec<Rect>>,
}

impl LabelGrid {
    const CELL: f32 = 64.0;

    fn cells_of(r: Rect) -> impl Iterator<Item = (i32, i32)> {
        let (x0, x1) = ((r.min.x / Self::CELL).floor() as i32, (r.max.x / Self::CELL).floor() as i32);
        let (y0, y1) = ((r.min.y / Self::CELL).floor() as i32, (r.max.y / Self::CELL).floor() as i32);
        (x0..=x1).flat_map(move |x| (y0..=y1).map(move |y| (x, y)))
    }

    /// Places `r` and returns true when it overlaps no placed rectangle.
    fn insert_if_free(&mut self, r: Rect) -> bool {
        let taken = Self::cells_of(r).any(|c| self.cells.get(&c).is_some_and(|v| v.iter().any(|q| q.intersects(r))));
        if taken {
            return false;
        }
        for c in Self::cells_of(r) {
            self.cells.entry(c).or_default().push(r);
        }
        true
    }
}

fn hollow_or_solid(painter: &egui::Painter, pts: Vec<Pos2>, colour: Color32, hollow: bool, width: f32) {
    if hollow {
        // Compression: an outlined (hollow) stroke, distinct without colour.
        painter.add(Shape::line(pts.clone(), Stroke::new(width + 3.0, colour)));
        painter.add(Shape::line(pts, Stroke::new(width * 0.6, pal::PAPER)));
    } else {
        painter.add(Shape::line(pts, Stroke::new(width, colour)));
    }
}

/// A text with a paper-coloured backing so it reads over lines.
fn label(painter: &egui::Painter, at: Pos2, text: &str, colour: Color32) {
    let galley = painter.layout_no_wrap(text.to_string(), FontId::proportional(11.5), colour);
    let r = Align2::CENTER_CENTER.anchor_size(at, galley.size());
    painter.rect_filled(r.expand(1.5), 2.0, pal::PAPER.gamma_multiply(0.85));
    painter.galley(r.min, galley, colour);
}

/// Points of a spring drawn as a zigzag between `a` and `b`.
fn zigzag(a: Pos2, b: Pos2) -> Vec<Pos2> {
    let d = b - a;
    let len = d.length();
    if len < 8.0 {
        return vec![a, b];
    }
    let dir = d / len;
    let n = dir.rot90();
    let lead = len * 0.2;
    let body = len - 2.0 * lead;
    let half_turns = 12;
    let amp = (len * 0.06).clamp(3.0, 7.0);
    let mut pts = vec![a, a + dir * lead];
    for k in 1..half_turns {
        let t = lead + body * (k as f32) / (half_turns as f32);
        let side = if k % 2 == 1 { 1.0 } else { -1.0 };
        pts.push(a + dir * t + n * amp * side);
    }
    pts.push(b - dir * lead);
    pts.push(b);
    pts
}

/// Support symbol at `s`: a filled triangle on hatched ground for a node held in both view
/// directions, a triangle on rollers for one held direction, a square when held only out of view.
fn draw_support(view: &RigView, painter: &egui::Painter, s: Pos2, fixed: [bool; 3], ink: Color32) {
    let (hu, hv) = view.plane.held(fixed);
    let stroke = Stroke::new(1.3, ink);
    // Local frame: `along` the ground, `out` from the node to the ground.
    let (along, out) = match (hu, hv) {
        (true, false) => (vec2(0.0, 1.0), vec2(-1.0, 0.0)),
        _ => (vec2(1.0, 0.0), vec2(0.0, 1.0)),
    };
    let at = |a: f32, o: f32| s + along * a + out * o;
    match (hu, hv) {
        (true, true) => {
            painter.add(Shape::convex_polygon(
                vec![s, at(-7.0, 12.0), at(7.0, 12.0)],
                ink.gamma_multiply(0.9),
                stroke,
            ));
            painter.line_segment([at(-12.0, 12.0), at(12.0, 12.0)], stroke);
            for k in 0..5 {
                let x = -10.0 + 5.0 * k as f32;
                painter.line_segment([at(x, 12.0), at(x - 4.0, 17.0)], Stroke::new(1.0, ink));
            }
        }
        (false, false) => {
            painter.rect_stroke(Rect::from_center_size(s, vec2(10.0, 10.0)), 0.0, stroke, egui::StrokeKind::Middle);
        }
        _ => {
            painter.add(Shape::convex_polygon(vec![s, at(-7.0, 11.0), at(7.0, 11.0)], pal::PAPER, stroke));
            painter.circle_stroke(at(-4.0, 14.0), 2.6, stroke);
            painter.circle_stroke(at(4.0, 14.0), 2.6, stroke);
            painter.line_segment([at(-12.0, 17.2), at(12.0, 17.2)], stroke);
        }
    }
}

fn draw_stiffness(app: &RigApp, a: &Answer<'_>, painter: &egui::Painter, units: Units, texts: &mut Vec<(Pos2, String, Color32)>) {
    let Some(Some(Ok(k))) = app.solved.as_ref().map(|s| s.stiffness.as_ref()) else {
        return;
    };
    let Some(node) = a.model.node_index(&k.node) else { return };
    let view = &app.view;
    let c = view.to_screen(a.eq.nodes[node].position);
    let max = k.principal.iter().map(|p| p.value).fold(0.0, f64::max);
    if max <= 0.0 {
        return;
    }
    let radius = 56.0;
    let axes: Vec<Vec2> = k.principal.iter().map(|p| view.dir(&p.direction, radius * p.value / max)).collect();
    let stroke = Stroke::new(1.6, pal::STIFFNESS);
    for i in 0..axes.len() {
        for j in i + 1..axes.len() {
            let pts: Vec<Pos2> = (0..=72)
                .map(|t| {
                    let th = t as f32 / 72.0 * std::f32::consts::TAU;
                    c + axes[i] * th.cos() + axes[j] * th.sin()
                })
                .collect();
            painter.add(Shape::line(pts, stroke));
        }
    }
    for (p, v) in k.principal.iter().zip(&axes) {
        if v.length() < 1.0 {
            continue;
        }
        painter.line_segment([c - *v, c + *v], Stroke::new(1.0, pal::STIFFNESS.gamma_multiply(0.7)));
        texts.push((c + *v * 1.18, units.show(Quantity::Stiffness, p.value), pal::STIFFNESS));
    }
}

fn draw_pull(app: &RigApp, a: &Answer<'_>, painter: &egui::Painter, units: Units, texts: &mut Vec<(Pos2, String, Color32)>) {
    let Some(pull) = &app.pull else { return };
    if !pull.active {
        return;
    }
    let view = &app.view;
    let start = view.to_screen(pull.start);
    let target = view.to_screen(pull.target);
    painter.extend(Shape::dashed_line(&[start, target], Stroke::new(1.0, pal::PULL), 4.0, 3.0));
    painter.circle_stroke(start, 3.0, Stroke::new(1.0, pal::PULL));
    painter.circle_stroke(target, 7.0, Stroke::new(1.6, pal::PULL));
    let (Some(f), Some(hold)) = (pull.force, a.eq.hold.as_ref()) else {
        return;
    };
    let restoring = -(f - pull.f0.unwrap_or_else(Vec3::zeros));
    let max = pull.samples.iter().map(|s| s[1].abs()).fold(restoring.norm(), f64::max);
    if max <= 0.0 {
        return;
    }
    let v = view.dir(&restoring, 80.0 / max);
    let at = view.to_screen(hold.position);
    if v.length() > 2.0 {
        painter.arrow(at, v, Stroke::new(2.6, pal::PULL));
    }
    texts.push((
        at + v + v.normalized() * 16.0 + vec2(0.0, -10.0),
        format!("restoring {}", units.show(Quantity::Force, restoring.norm())),
        pal::PULL,
    ));
}

/// The rubber band of a box selection, and rings on the nodes it caught.
fn draw_box_selection(app: &RigApp, painter: &egui::Painter, pointer: Option<Pos2>) {
    if let (Drag::Box { from }, Some(to)) = (&app.view.drag, pointer) {
        let area = Rect::from_two_pos(*from, to);
        painter.rect_filled(area, 0.0, pal::SELECT.gamma_multiply(0.08));
        painter.rect_stroke(area, 0.0, Stroke::new(1.0, pal::SELECT), egui::StrokeKind::Inside);
    }
    let p = &app.doc.project;
    for &i in app.boxed.iter().filter(|&&i| i < p.nodes.len()) {
        painter.circle_stroke(app.view.to_screen(node_pos(p, i)), 9.0, Stroke::new(2.0, pal::SELECT));
    }
}

fn draw_member_start(app: &RigApp, painter: &egui::Painter) {
    let Some(i) = app.view.member_start else { return };
    if i >= app.doc.project.nodes.len() {
        return;
    }
    let s = app.view.to_screen(node_pos(&app.doc.project, i));
    painter.circle_stroke(s, 9.0, Stroke::new(2.0, pal::SELECT));
    if let Some(h) = painter.ctx().pointer_hover_pos() {
        painter.extend(Shape::dashed_line(&[s, h], Stroke::new(1.2, pal::SELECT), 5.0, 4.0));
    }
}

fn draw_scale_bar_and_axes(view: &RigView, painter: &egui::Painter, units: Units) {
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
        format!(
            "{} {}",
            rigwright_report::units::significant(len_units, 3),
            units.symbol(Quantity::Length)
        ),
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

fn draw_banners(painter: &egui::Painter, rect: Rect, banners: &[(String, Color32)]) {
    let mut y = rect.top() + 30.0;
    for (text, colour) in banners {
        let galley = painter.layout(text.clone(), FontId::proportional(13.5), Color32::WHITE, rect.width() - 80.0);
        let r = Rect::from_min_size(pos2(rect.left() + 24.0, y), galley.size() + vec2(20.0, 12.0));
        painter.rect_filled(r, 4.0, *colour);
        painter.galley(r.min + vec2(10.0, 6.0), galley, Color32::WHITE);
        y = r.bottom() + 6.0;
    }
}

fn draw_legend(app: &RigApp, painter: &egui::Painter, units: Units) {
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

/// Nearest document node within `radius` px of `s`.
fn pick_node(app: &RigApp, s: Pos2, radius: f32) -> Option<usize> {
    let p = &app.doc.project;
    (0..p.nodes.len())
        .map(|i| (i, app.view.to_screen(node_pos(p, i)).distance(s)))
        .filter(|(_, d)| *d <= radius)
        .min_by(|a, b| a.1.total_cmp(&b.1))
        .map(|(i, _)| i)
}

fn pick_member(app: &RigApp, s: Pos2) -> Option<usize> {
    let p = &app.doc.project;
    let index = |id: &str| p.nodes.iter().position(|n| n.id == id);
    p.members
        .iter()
        .enumerate()
        .filter_map(|(i, m)| {
            let (a, b) = (index(&m.ends.0)?, index(&m.ends.1)?);
            let (sa, sb) = (app.view.to_screen(node_pos(p, a)), app.view.to_screen(node_pos(p, b)));
            let d = sb - sa;
            let t = ((s - sa).dot(d) / d.length_sq().max(1e-6)).clamp(0.0, 1.0);
            let dist = (sa + d * t).distance(s);
            (dist <= 6.0).then_some((i, dist))
        })
        .min_by(|a, b| a.1.total_cmp(&b.1))
        .map(|(i, _)| i)
}

/// Nearest free node of the solved model within `radius` px.
fn pick_solved_free_node(app: &RigApp, s: Pos2, radius: f32) -> Option<usize> {
    let a = app.answer()?;
    a.eq.nodes
        .iter()
        .enumerate()
        .filter(|(i, _)| !a.model.has_reaction(*i))
        .map(|(i, n)| (i, app.view.to_screen(n.position).distance(s)))
        .filter(|(_, d)| *d <= radius)
        .min_by(|a, b| a.1.total_cmp(&b.1))
        .map(|(i, _)| i)
}

fn interact(app: &mut RigApp, ui: &egui::Ui, response: &egui::Response) {
    let units = app.settings.units;
    let snap = app.settings.snap;
    let space = ui.input(|i| i.key_down(egui::Key::Space));
    let primary_drag_start = response.drag_started_by(PointerButton::Primary) && !space;
    let press = ui.input(|i| i.pointer.press_origin());
    let pointer = response.interact_pointer_pos().or(response.hover_pos());

    // Drags: move a node (Select) or pull one (Pull).
    if primary_drag_start && let Some(at) = press {
        match app.tool {
            Tool::Select => {
                if let Some(i) = pick_node(app, at, 10.0) {
                    app.view.serial += 1;
                    app.view.drag = Drag::Node {
                        index: i,
                        key: format!("drag-node-{}", app.view.serial),
                    };
                    app.selection = Selection::Node(i);
                    app.boxed.clear();
                } else {
                    // A drag from empty space draws a selection box.
                    app.view.drag = Drag::Box { from: at };
                }
            }
            Tool::Pull => {
                if let Some(i) = pick_solved_free_node(app, at, 12.0)
                    && app.start_pull(i)
                {
                    app.view.drag = Drag::Pull;
                    if let Some(d) = app
                        .doc
                        .project
                        .nodes
                        .iter()
                        .position(|n| n.id == app.pull.as_ref().map(|p| p.node_id.as_str()).unwrap_or(""))
                    {
                        app.selection = Selection::Node(d);
                    }
                }
            }
            _ => {}
        }
    }
    if response.dragged_by(PointerButton::Primary)
        && let Some(s) = pointer
    {
        match &app.view.drag {
            Drag::Node { index, key } => {
                let (index, key) = (*index, key.clone());
                if index < app.doc.project.nodes.len() {
                    let base = node_pos(&app.doc.project, index);
                    let uv = app.view.snap(app.view.to_uv(s), units, snap);
                    let p = app.view.plane.from_uv(uv, &base);
                    if (p - base).norm() > 0.0 {
                        app.queue(Command::Edit {
                            merge: Some(key),
                            apply: Box::new(move |doc: &mut Project| {
                                if let Some(n) = doc.nodes.get_mut(index) {
                                    n.at = (p.x, p.y, p.z);
                                }
                            }),
                        });
                    }
                }
            }
            Drag::Pull => {
                let uv = app.view.to_uv(s);
                if let Some(pull) = app.pull.as_mut() {
                    pull.target = app.view.plane.from_uv(uv, &pull.start);
                }
            }
            _ => {}
        }
    }
    if response.drag_stopped() {
        match app.view.drag {
            Drag::Node { .. } => app.queue(Command::Seal),
            Drag::Box { from } => {
                if let Some(to) = pointer {
                    let area = Rect::from_two_pos(from, to);
                    let p = &app.doc.project;
                    app.boxed = (0..p.nodes.len())
                        .filter(|&i| area.contains(app.view.to_screen(node_pos(p, i))))
                        .collect();
                    app.selection = match app.boxed.as_slice() {
                        [one] => Selection::Node(*one),
                        _ => Selection::None,
                    };
                }
            }
            Drag::Pull => {
                if let Some(p) = app.pull.as_mut() {
                    p.active = false;
                    if app.pluck_on_release {
                        app.queue(Command::Pluck);
                    }
                }
            }
            _ => {}
        }
        app.view.drag = Drag::None;
    }

    if !response.clicked() {
        return;
    }
    app.boxed.clear();
    let Some(s) = pointer else { return };
    let project = &app.doc.project;
    match app.tool {
        Tool::Select | Tool::Pull => {
            app.selection = match (pick_node(app, s, 10.0), pick_member(app, s)) {
                (Some(n), _) => Selection::Node(n),
                (None, Some(m)) => Selection::Member(m),
                _ => Selection::None,
            };
        }
        Tool::Anchor | Tool::Guided | Tool::Node => {
            if project.planar && app.view.plane != Plane::Elevation {
                app.message = Some(("This rig is planar (x–y): switch to the Elevation view to add to it.".into(), true));
                return;
            }
            let uv = app.view.snap(app.view.to_uv(s), units, snap);
            let p = app.view.plane.from_uv(uv, &Vec3::zeros());
            let tool = app.tool;
            let (prefix, fixed, mass) = match tool {
                Tool::Anchor => ("anchor", [true; 3], 0.0),
                Tool::Guided => ("guide", [false, true, false], 0.0),
                _ => ("node", [false; 3], 10.0),
            };
            let id = fresh_id(prefix, project.nodes.iter().map(|n| n.id.as_str()));
            let index = project.nodes.len();
            app.queue(Command::Edit {
                merge: None,
                apply: Box::new(move |doc: &mut Project| {
                    doc.nodes.push(NodeDoc {
                        id,
                        at: (p.x, p.y, p.z),
                        mass,
                        fixed,
                    })
                }),
            });
            app.selection = Selection::Node(index);
        }
        Tool::Cable | Tool::Spring | Tool::Strut => {
            let Some(n) = pick_node(app, s, 10.0) else {
                app.view.member_start = None;
                return;
            };
            match app.view.member_start.take() {
                None => app.view.member_start = Some(n),
                Some(first) if first == n => {}
                Some(first) if first < project.nodes.len() => {
                    let (kind, prefix) = match app.tool {
                        Tool::Cable => (
                            MemberDocKind::Cable {
                                ea: 1.62e6,
                                rest: Rest::AsDrawn,
                            },
                            "cable",
                        ),
                        Tool::Spring => (
                            MemberDocKind::Spring {
                                rate: 5000.0,
                                rest: Rest::AsDrawn,
                            },
                            "spring",
                        ),
                        _ => (
                            MemberDocKind::Strut {
                                ea: 2.0e8,
                                rest: Rest::AsDrawn,
                            },
                            "strut",
                        ),
                    };
                    let id = fresh_id(prefix, project.members.iter().map(|m| m.id.as_str()));
                    let ends = (project.nodes[first].id.clone(), project.nodes[n].id.clone());
                    let index = project.members.len();
                    app.queue(Command::Edit {
                        merge: None,
                        apply: Box::new(move |doc: &mut Project| {
                            doc.members.push(MemberDoc {
                                id,
                                ends,
                                kind,
                                mass_per_length: 0.0,
                                design: None,
                            })
                        }),
                    });
                    app.selection = Selection::Member(index);
                }
                Some(_) => {}
            }
        }
        Tool::Load => {
            let Some(n) = pick_node(app, s, 10.0) else { return };
            let node = project.nodes[n].id.clone();
            let case = app.case;
            let index = project.cases.get(case).map_or(0, |c| c.loads.len());
            app.queue(Command::Edit {
                merge: None,
                apply: Box::new(move |doc: &mut Project| {
                    if doc.cases.is_empty() {
                        doc.cases.push(CaseDoc {
                            name: "gravity".into(),
                            gravity: 1.0,
                            loads: Vec::new(),
                        });
                    }
                    let case = case.min(doc.cases.len() - 1);
                    doc.cases[case].loads.push(LoadDoc {
                        node,
                        force: (0.0, -500.0, 0.0),
                    });
                }),
            });
            app.selection = Selection::Load(index);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_label_is_placed_only_where_it_overlaps_none_placed_before() {
        let mut grid = LabelGrid::default();
        let at = |x: f32, y: f32| Rect::from_min_size(pos2(x, y), vec2(50.0, 14.0));
        assert!(grid.insert_if_free(at(60.0, 60.0)), "straddles four cells");
        assert!(!grid.insert_if_free(at(100.0, 70.0)), "overlaps it from another cell");
        assert!(grid.insert_if_free(at(111.0, 60.0)), "just clear to the right");
        assert!(grid.insert_if_free(at(60.0, 75.0)), "just clear below");
        assert!(!grid.insert_if_free(at(-10.0, 61.0).translate(vec2(75.0, 0.0))), "inside the first");
    }
}
