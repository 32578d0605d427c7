//! The marks of the Rig view: springs as zigzags, members in compression hollow, support
//! symbols, labels on a paper backing, and the grid of placed labels that keeps new ones off
//! them.

use eframe::egui::{self, Align2, Color32, FontId, Pos2, Rect, Shape, Stroke, vec2};

use super::camera::RigView;
use crate::gui::palette as pal;

/// Rectangles of the labels placed so far, bucketed by screen cell so that testing a new
/// one costs the same however many there are (a large rig has thousands).
#[derive(Default)]
pub(super) struct LabelGrid {
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
    pub(super) fn insert_if_free(&mut self, r: Rect) -> bool {
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

pub(super) fn hollow_or_solid(painter: &egui::Painter, pts: Vec<Pos2>, colour: Color32, hollow: bool, width: f32) {
    if hollow {
        // Compression: an outlined (hollow) stroke, distinct without colour.
        painter.add(Shape::line(pts.clone(), Stroke::new(width + 3.0, colour)));
        painter.add(Shape::line(pts, Stroke::new(width * 0.6, pal::PAPER)));
    } else {
        painter.add(Shape::line(pts, Stroke::new(width, colour)));
    }
}

/// A text with a paper-coloured backing so it reads over lines.
pub(super) fn label(painter: &egui::Painter, at: Pos2, text: &str, colour: Color32) {
    let galley = painter.layout_no_wrap(text.to_string(), FontId::proportional(11.5), colour);
    let r = Align2::CENTER_CENTER.anchor_size(at, galley.size());
    painter.rect_filled(r.expand(1.5), 2.0, pal::PAPER.gamma_multiply(0.85));
    painter.galley(r.min, galley, colour);
}

/// Points of a spring drawn as a zigzag between `a` and `b`.
pub(super) fn zigzag(a: Pos2, b: Pos2) -> Vec<Pos2> {
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
pub(super) fn draw_support(view: &RigView, painter: &egui::Painter, s: Pos2, fixed: [bool; 3], ink: Color32) {
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

#[cfg(test)]
mod tests {
    use super::*;
    use eframe::egui::pos2;

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
