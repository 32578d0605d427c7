//! The marks of the drawing, in page points: arrow heads, spring zigzags, support symbols
//! (and the side each sits on), dimension lines; and the arithmetic on (x, y) pairs they use.

use rigwright_core::Vec3;

use crate::fonts::Weight;
use crate::page::{Align, Ink, Page, Pen, Style};
use crate::plane::Plane;

pub(super) fn sub(a: (f32, f32), b: (f32, f32)) -> (f32, f32) {
    (a.0 - b.0, a.1 - b.1)
}

pub(super) fn unit(v: (f32, f32)) -> (f32, f32) {
    let n = (v.0 * v.0 + v.1 * v.1).sqrt();
    if n < 1e-6 { (0.0, -1.0) } else { (v.0 / n, v.1 / n) }
}

pub(super) fn at(p: (f32, f32), d: (f32, f32), t: f32) -> (f32, f32) {
    (p.0 + d.0 * t, p.1 + d.1 * t)
}

/// Arrow head at `tip` pointing along `d` (unit).
pub(super) fn arrow_head(page: &mut Page, tip: (f32, f32), d: (f32, f32), size: f32, ink: Ink) {
    let n = (-d.1, d.0);
    let base = at(tip, d, -size);
    page.path(vec![tip, at(base, n, size * 0.4), at(base, n, -size * 0.4)], true, None, Some(ink));
}

/// A zigzag between `a` and `b` for a spring (straight leads at both ends).
pub(super) fn zigzag(a: (f32, f32), b: (f32, f32)) -> Vec<(f32, f32)> {
    let d = sub(b, a);
    let len = (d.0 * d.0 + d.1 * d.1).sqrt();
    if len < 8.0 {
        return vec![a, b];
    }
    let e = (d.0 / len, d.1 / len);
    let n = (-e.1, e.0);
    let lead = (len * 0.2).min(12.0);
    let body = len - 2.0 * lead;
    let teeth = ((body / 4.0).floor() as usize).clamp(4, 14);
    let amp = 3.0;
    let mut pts = vec![a, at(a, e, lead)];
    for k in 0..teeth {
        let t = lead + body * (k as f32 + 0.5) / teeth as f32;
        let side = if k % 2 == 0 { amp } else { -amp };
        pts.push(at(at(a, e, t), n, side));
    }
    pts.push(at(a, e, len - lead));
    pts.push(b);
    pts
}

/// The side a support symbol is drawn on: a guide held along exactly one direction of the
/// drawing plane sits on that direction's line (rollers running along the free direction),
/// on the side of `away`; otherwise `away`, the side away from the members.
pub(super) fn guide_side(plane: Plane, fixed: [bool; 3], away: (f32, f32), anchor: bool) -> (f32, f32) {
    if anchor {
        return away;
    }
    let held: Vec<(f32, f32)> = (0..3)
        .filter(|&a| fixed[a])
        .map(|a| {
            let mut e = Vec3::zeros();
            e[a] = 1.0;
            let q = plane.uv(&e);
            // Page y runs down.
            (q[0] as f32, -(q[1] as f32))
        })
        .filter(|q| q.0.abs() + q.1.abs() > 0.5)
        .collect();
    match held.as_slice() {
        [f] if f.0 * away.0 + f.1 * away.1 < 0.0 => (-f.0, -f.1),
        [f] => *f,
        _ => away,
    }
}

/// Support symbol at `p`: a triangle with its apex on the node, set on the side `u` away from
/// the members; filled with a hatched ground line for an anchor, hollow on rollers for a
/// guided support.
pub(super) fn support(page: &mut Page, p: (f32, f32), u: (f32, f32), anchor: bool) {
    let n = (-u.1, u.0);
    let base = at(p, u, 9.0);
    let tri = vec![p, at(base, n, 5.5), at(base, n, -5.5)];
    if anchor {
        page.path(tri, true, Some(Pen::solid(0.6, Ink::Black)), Some(Ink::Mid));
        let g = at(base, u, 0.5);
        page.line(at(g, n, -8.0), at(g, n, 8.0), Pen::solid(0.8, Ink::Black));
        for k in 0..5 {
            let s = -7.0 + 3.5 * k as f32;
            let from = at(g, n, s);
            page.line(from, at(at(from, u, 3.5), n, -3.0), Pen::solid(0.4, Ink::Black));
        }
    } else {
        page.path(tri, true, Some(Pen::solid(0.6, Ink::Black)), Some(Ink::White));
        for s in [-3.0, 3.0] {
            page.circle(at(at(base, u, 1.6), n, s), 1.5, Some(Pen::solid(0.5, Ink::Black)), Some(Ink::White));
        }
        let g = at(base, u, 3.4);
        page.line(at(g, n, -8.0), at(g, n, 8.0), Pen::solid(0.8, Ink::Black));
    }
}

/// A dimension line from `a` to `b` with slashed ticks and `label` beside it; `offset` is the
/// side the text goes (unit).
pub(super) fn dimension(page: &mut Page, a: (f32, f32), b: (f32, f32), label: &str, vertical: bool) {
    let pen = Pen::solid(0.4, Ink::Mid);
    page.line(a, b, pen.clone());
    for p in [a, b] {
        page.line((p.0 - 2.5, p.1 + 2.5), (p.0 + 2.5, p.1 - 2.5), Pen::solid(0.7, Ink::Dark));
    }
    let mid = ((a.0 + b.0) / 2.0, (a.1 + b.1) / 2.0);
    if vertical {
        page.text(
            (mid.0 - 4.0, mid.1 + 2.5),
            Style::new(6.5, Weight::Regular, Ink::Dark),
            Align::Right,
            label,
        );
    } else {
        page.text(
            (mid.0, mid.1 + 9.0),
            Style::new(6.5, Weight::Regular, Ink::Dark),
            Align::Centre,
            label,
        );
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_guide_sits_on_the_line_it_holds() {
        // Held along x only, drawn in elevation: the rollers stand beside the node, on the
        // members' far side; held along y: below or above; anchors and guides held only out of
        // the plane keep the side away from the members.
        let away = (-0.6, 0.8);
        assert_eq!(guide_side(Plane::Elevation, [true, false, false], away, false), (-1.0, 0.0));
        assert_eq!(guide_side(Plane::Elevation, [false, true, false], away, false), (0.0, 1.0));
        assert_eq!(guide_side(Plane::Elevation, [false, false, true], away, false), away);
        assert_eq!(guide_side(Plane::Elevation, [true, true, true], away, true), away);
        // In plan, z runs down the page.
        assert_eq!(guide_side(Plane::Plan, [false, false, true], (0.0, 1.0), false), (0.0, 1.0));
    }
}
