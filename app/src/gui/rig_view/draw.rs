//! The rig on the Rig view: the geometry as drawn (faint, with the selection), the solved
//! equilibrium (members coloured by force, supports, masses, reactions, loads, labels), and
//! what the user is doing (the stiffness ellipse, the Pull, a box selection, a half-made
//! member).

use eframe::egui::{self, Align2, Color32, FontId, Pos2, Rect, Shape, Stroke, Vec2, vec2};
use rigwright_core::Vec3;
use rigwright_core::element::MemberClass;
use rigwright_core::model::MemberDocKind;
use rigwright_report::units::{Quantity, Units};

use super::camera::{Drag, node_pos};
use super::symbols::{LabelGrid, draw_support, hollow_or_solid, label, zigzag};
use crate::gui::palette as pal;
use crate::gui::{Answer, RigApp, Selection};

/// The geometry as drawn, faint, with selection highlights.
pub(super) fn draw_drawn(app: &RigApp, painter: &egui::Painter) {
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
pub(super) fn draw_answer(app: &RigApp, a: &Answer<'_>, painter: &egui::Painter, units: Units) {
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
            // A cable that sags under its own weight: its curve, at true scale.
            MemberClass::Cable if r.sag.is_some() => {
                let curve = &r.sag.as_ref().expect("checked").curve;
                let pts: Vec<Pos2> = curve.iter().map(|c| view.to_screen(*c)).collect();
                hollow_or_solid(painter, pts, colour, false, 3.2);
            }
            _ => hollow_or_solid(painter, vec![sa, sb], colour, compression, 3.2),
        }
        if app.settings.sag_dimensions
            && let Some(sag) = &r.sag
        {
            sag_dimension(
                view,
                painter,
                sag,
                eq.nodes[m.ends[0]].position,
                eq.nodes[m.ends[1]].position,
                units,
                &mut texts,
            );
        }
        if labels && !r.slack && sa.distance(sb) > 56.0 {
            let (mut mid, mut n) = (sa + (sb - sa) * 0.5, (sb - sa).normalized().rot90());
            if let Some(sag) = &r.sag
                && sag.curve.len() >= 3
            {
                // Beside the curve's middle, not the chord's.
                let k = sag.curve.len() / 2;
                let (p, q) = (view.to_screen(sag.curve[k - 1]), view.to_screen(sag.curve[k + 1]));
                mid = view.to_screen(sag.curve[k]);
                n = (q - p).normalized().rot90();
            }
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
pub(super) fn draw_box_selection(app: &RigApp, painter: &egui::Painter, pointer: Option<Pos2>) {
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

pub(super) fn draw_member_start(app: &RigApp, painter: &egui::Painter) {
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

/// The sag of a cable dimensioned: a thin line from its chord, square to it, to the point of
/// the curve farthest from it, with the distance written beside it.
fn sag_dimension(
    view: &super::camera::RigView,
    painter: &egui::Painter,
    sag: &rigwright_core::solve::SagResult,
    a: Vec3,
    b: Vec3,
    units: Units,
    texts: &mut Vec<(Pos2, String, Color32)>,
) {
    let chord = b - a;
    let len2 = chord.norm_squared();
    if len2 <= 0.0 || sag.curve.is_empty() {
        return;
    }
    // The curve's point farthest from the chord line, and its foot on the chord.
    let foot_of = |p: &Vec3| a + chord * ((p - a).dot(&chord) / len2);
    let Some(far) = sag
        .curve
        .iter()
        .max_by(|p, q| (*p - foot_of(p)).norm().total_cmp(&(*q - foot_of(q)).norm()))
    else {
        return;
    };
    let (p, q) = (view.to_screen(*far), view.to_screen(foot_of(far)));
    if p.distance(q) < 4.0 {
        return;
    }
    let stroke = Stroke::new(1.0, pal::MUTED);
    // The chord the sag is measured from, dashed.
    painter.extend(Shape::dashed_line(&[view.to_screen(a), view.to_screen(b)], stroke, 5.0, 4.0));
    painter.line_segment([p, q], stroke);
    for end in [p, q] {
        let n = (p - q).normalized().rot90() * 4.0;
        painter.line_segment([end - n, end + n], stroke);
    }
    texts.push((
        p + (p - q).normalized() * 22.0,
        format!("sag {}", units.show(Quantity::Length, sag.sag)),
        pal::MUTED,
    ));
}
