//! The scaled drawing of the rig: drawn geometry light and dashed, the deformed geometry of
//! the sheet's load case solid, node ids, supports, loads, overall dimensions, a scale bar and
//! the axes.
//!
//! The drawing is to a standard scale (1:1, 1:2, 1:2.5, 1:5 × 10ⁿ) at 100 % print size.
//! Displacements may be magnified by a stated factor so that a stiff rig's deformation can be
//! seen; dimensions always refer to the drawn geometry.
//!
//! This file draws; `scale.rs` chooses the scale, `marks.rs` makes the symbols and `labels.rs`
//! keeps the labels clear of one another.

mod labels;
mod marks;
mod scale;

use rigwright_core::{MemberKind, Vec3};

use self::labels::{Placed, text_box};
use self::marks::{arrow_head, at, dimension, guide_side, sub, support, unit, zigzag};
use self::scale::{PT_PER_MM, bar_length, fonts_free_number, magnification, standard_scale};
use crate::content::Sheet;
use crate::fonts::{self, Weight};
use crate::format::Fmt;
use crate::page::{Align, Ink, Page, Paper, Pen, Style};
use crate::plane::Plane;

/// A rectangle on the page (pt, top left).
#[derive(Debug, Clone, Copy)]
pub struct Area {
    pub x: f32,
    pub y: f32,
    pub w: f32,
    pub h: f32,
}

/// Room kept free around the rig for labels, arrows and the dimensions (pt).
const PAD: f32 = 30.0;

/// Room kept free above and below the rig (pt).
const PAD_Y: f32 = 18.0;

/// Length of a load arrow (pt).
const ARROW: f32 = 26.0;

/// Draws the rig into `area`, with its caption at the bottom.
pub fn draw(page: &mut Page, sheet: &Sheet, fmt: &Fmt, area: Area, paper: Paper) {
    let model = &sheet.model;
    let plane = Plane::for_project(&sheet.project);
    let uv = |p: &Vec3| plane.uv(p);
    let eq = sheet.equilibrium();
    // Bounds of the drawn geometry, then of everything drawn.
    let drawn: Vec<[f64; 2]> = model.nodes.iter().map(|n| uv(&n.position)).collect();
    let mut lo = [f64::INFINITY; 2];
    let mut hi = [f64::NEG_INFINITY; 2];
    for p in &drawn {
        for k in 0..2 {
            lo[k] = lo[k].min(p[k]);
            hi[k] = hi[k].max(p[k]);
        }
    }
    if drawn.is_empty() {
        page.text(
            (area.x, area.y + 12.0),
            Style::new(8.0, Weight::Regular, Ink::Black),
            Align::Left,
            "The rig has no nodes.",
        );
        return;
    }
    let dims = [hi[0] - lo[0], hi[1] - lo[1]];
    let extent = model.extent();
    let (largest, at_node) = eq
        .map(|eq| {
            eq.nodes
                .iter()
                .map(|n| (n.displacement.norm(), n.id.as_str()))
                .fold((0.0, ""), |b, x| if x.0 > b.0 { x } else { b })
        })
        .unwrap_or((0.0, ""));
    let mag = magnification(largest, extent);
    let deformed: Option<Vec<[f64; 2]>> = eq.map(|eq| {
        model
            .nodes
            .iter()
            .zip(&eq.nodes)
            .map(|(n, r)| uv(&(n.position + r.displacement * mag)))
            .collect()
    });
    let (mut blo, mut bhi) = (lo, hi);
    for p in deformed.iter().flatten() {
        for k in 0..2 {
            blo[k] = blo[k].min(p[k]);
            bhi[k] = bhi[k].max(p[k]);
        }
    }
    // Room: PAD all round, plus the dimension lines (left, bottom) and the caption strip.
    let caption_h = 24.0;
    let plot = Area {
        x: area.x + PAD + 34.0,
        y: area.y + PAD_Y,
        w: area.w - 2.0 * PAD - 34.0,
        h: area.h - 2.0 * PAD_Y - 20.0 - caption_h,
    };
    let span = [(bhi[0] - blo[0]).max(extent * 0.05), (bhi[1] - blo[1]).max(extent * 0.05)];
    let pt_per_m_fit = (plot.w as f64 / span[0]).min(plot.h as f64 / span[1]);
    let ratio = standard_scale(pt_per_m_fit / PT_PER_MM);
    let s = 1000.0 / ratio * PT_PER_MM; // pt per model metre
    let cx = plot.x as f64 + plot.w as f64 / 2.0 - s * (blo[0] + bhi[0]) / 2.0;
    let cy = plot.y as f64 + plot.h as f64 / 2.0 + s * (blo[1] + bhi[1]) / 2.0;
    let to_page = |p: [f64; 2]| ((cx + s * p[0]) as f32, (cy - s * p[1]) as f32);
    let dp: Vec<(f32, f32)> = drawn.iter().map(|p| to_page(*p)).collect();
    let fp: Option<Vec<(f32, f32)>> = deformed.as_ref().map(|d| d.iter().map(|p| to_page(*p)).collect());
    page.rect(area.x, area.y, area.w, area.h, Some(Pen::solid(0.5, Ink::Mid)), None);

    // Drawn geometry, light and dashed.
    for m in &model.members {
        page.line(dp[m.ends[0]], dp[m.ends[1]], Pen::dashed(0.6, Ink::Light, 3.0, 2.0));
    }
    // Deformed geometry, solid: cables thin, struts thick, springs as zigzags, slack dashed.
    let mut sags: Vec<((f32, f32), String)> = Vec::new();
    let shown = fp.as_ref().unwrap_or(&dp);
    if let (Some(fp), Some(eq)) = (&fp, eq) {
        for (m, r) in model.members.iter().zip(&eq.members) {
            let (a, b) = (fp[m.ends[0]], fp[m.ends[1]]);
            match m.kind {
                MemberKind::Cable { .. } if r.sag.is_some() => {
                    // The sagged curve at true scale, carried with its ends' (magnified) moves.
                    let sag = r.sag.as_ref().expect("checked");
                    let (ua, ub) = (eq.nodes[m.ends[0]].displacement, eq.nodes[m.ends[1]].displacement);
                    let n = sag.curve.len().max(2) - 1;
                    let pts: Vec<(f32, f32)> = sag
                        .curve
                        .iter()
                        .enumerate()
                        .map(|(k, c)| {
                            let f = k as f64 / n as f64;
                            to_page(uv(&(c + (ua * (1.0 - f) + ub * f) * (mag - 1.0))))
                        })
                        .collect();
                    if sheet.sag_dimensions && pts.len() >= 2 {
                        sag_dimension(page, &pts, sag.sag, fmt, &mut sags);
                    }
                    page.path(pts, false, Some(Pen::solid(0.9, Ink::Black)), None);
                }
                MemberKind::Cable { .. } if r.slack => page.line(a, b, Pen::dashed(0.9, Ink::Black, 2.0, 1.6)),
                MemberKind::Cable { .. } => page.line(a, b, Pen::solid(0.9, Ink::Black)),
                MemberKind::Strut { .. } => page.line(a, b, Pen::solid(2.2, Ink::Dark)),
                MemberKind::Spring { .. } => page.path(zigzag(a, b), false, Some(Pen::solid(0.8, Ink::Black)), None),
            }
        }
    }
    // Labels already on the drawing: the load labels go first, then node ids and member ids
    // where they overlap none.
    let mut labels = Placed::default();
    // Sag dimensions first: asked for, so they take their places before the other labels.
    for (at, text) in &sags {
        if labels.place(text_box(*at, 5.5, Align::Centre, text)) {
            page.text(*at, Style::new(5.5, Weight::Regular, Ink::Mid), Align::Centre, text);
        }
    }
    // Point loads of the case, arrows ending on the node.
    let case = &model.cases[sheet.case];
    for (node, f) in &case.loads {
        let p = shown[*node];
        let fuv = uv(f);
        let len = (fuv[0] * fuv[0] + fuv[1] * fuv[1]).sqrt();
        // The part toward the viewer (the plane's normal: u × v).
        let toward = match plane {
            Plane::Elevation => f.z,
            Plane::Plan => f.y,
            Plane::Side => -f.x,
        };
        if f.norm() == 0.0 {
            continue;
        }
        // Mostly across the drawing (the part in its plane under 5 %): a ring.
        if len < 0.05 * f.norm() {
            // Across the drawing: a ring round the node, crossed when the load points away
            // from the viewer (into the page), plain when toward the viewer.
            let r = 5.5;
            page.circle(p, r, Some(Pen::solid(1.0, Ink::Black)), None);
            if toward < 0.0 {
                let k = r * 0.7;
                page.line((p.0 - k, p.1 - k), (p.0 + k, p.1 + k), Pen::solid(0.8, Ink::Black));
                page.line((p.0 - k, p.1 + k), (p.0 + k, p.1 - k), Pen::solid(0.8, Ink::Black));
            }
            let way = if toward < 0.0 { "into the page" } else { "out of the page" };
            let label = format!("{} {way}", fmt.force_u(f.norm()));
            let at = (p.0 + r + 3.0, p.1 - r - 1.0);
            page.text(at, Style::new(6.5, Weight::Bold, Ink::Black), Align::Left, &label);
            labels.block(text_box(at, 6.5, Align::Left, &label));
            labels.block((p.0 - r, p.1 - r, p.0 + r, p.1 + r));
            continue;
        }
        let label = if toward.abs() > 1e-6 * f.norm() {
            format!("{} ({} in the page's plane)", fmt.force_u(f.norm()), fmt.force_u(len))
        } else {
            fmt.force_u(f.norm())
        };
        let d = (fuv[0] as f32 / len as f32, -fuv[1] as f32 / len as f32);
        let tail = at(p, d, -ARROW);
        page.line(tail, at(p, d, -3.0), Pen::solid(1.0, Ink::Black));
        arrow_head(page, at(p, d, -2.5), d, 5.0, Ink::Black);
        let align = if d.0 > 0.3 {
            Align::Right
        } else if d.0 < -0.3 {
            Align::Left
        } else {
            Align::Centre
        };
        let ty = if d.1 > 0.3 { tail.1 - 3.0 } else { tail.1 + 10.0 };
        page.text((tail.0, ty), Style::new(6.5, Weight::Bold, Ink::Black), align, &label);
        labels.block(text_box((tail.0, ty), 6.5, align, &label));
    }
    // Nodes, supports and node ids.
    let mut away = vec![(0.0f32, 0.0f32); model.nodes.len()];
    for m in &model.members {
        for (i, j) in [(m.ends[0], m.ends[1]), (m.ends[1], m.ends[0])] {
            let d = unit(sub(shown[j], shown[i]));
            away[i] = (away[i].0 - d.0, away[i].1 - d.1);
        }
    }
    let label_small = model.nodes.len() > 30;
    let mut left_out = 0;
    // Each node's support symbol: whether it is drawn as an anchor, and the side it sits on.
    let symbols: Vec<(bool, (f32, f32))> = model
        .nodes
        .iter()
        .enumerate()
        .map(|(i, node)| {
            let anchor = node.support.is_anchor() || (model.planar && node.support.fixed[0] && node.support.fixed[1]);
            (anchor, guide_side(plane, node.support.fixed, unit(away[i]), anchor))
        })
        .collect();
    // Node ids keep off the nodes themselves and their support symbols.
    for (i, p) in shown.iter().enumerate() {
        labels.block((p.0 - 2.5, p.1 - 2.5, p.0 + 2.5, p.1 + 2.5));
        if model.has_reaction(i) {
            let c = at(*p, symbols[i].1, 7.0);
            labels.block((c.0 - 8.0, c.1 - 8.0, c.0 + 8.0, c.1 + 8.0));
        }
    }
    // Nodes that fall on one point of the drawing share one label: "a / b", or "a +3" for more.
    let mut label: Vec<Option<String>> = model.nodes.iter().map(|n| Some(n.id.clone())).collect();
    let mut sharing = vec![1usize; model.nodes.len()];
    for i in 0..model.nodes.len() {
        for j in 0..i {
            let d = sub(shown[i], shown[j]);
            if label[j].is_some() && d.0.abs() < 2.0 && d.1.abs() < 2.0 {
                let id = label[i].take().unwrap_or_default();
                sharing[j] += 1;
                if sharing[j] == 2
                    && let Some(l) = label[j].as_mut()
                {
                    l.push_str(" / ");
                    l.push_str(&id);
                }
                break;
            }
        }
    }
    for (l, &k) in label.iter_mut().zip(&sharing) {
        if k > 2
            && let Some(l) = l.as_mut()
        {
            let first = l.split(" / ").next().unwrap_or_default().to_string();
            *l = format!("{first} +{}", k - 1);
        }
    }
    for (i, node) in model.nodes.iter().enumerate() {
        let p = shown[i];
        let u = unit(away[i]);
        let supported = model.has_reaction(i);
        let (anchor, side) = symbols[i];
        if supported {
            support(page, p, side, anchor);
        }
        if node.mass > 0.0 {
            page.circle(p, 2.4, None, Some(Ink::Black));
        } else {
            page.circle(p, 1.5, Some(Pen::solid(0.6, Ink::Black)), Some(Ink::White));
        }
        // Where the id may go, best first: beside a support symbol, or away from the members
        // of a free node; then the other sides. The first place clear of every label, node and
        // support symbol wins.
        let candidates = if supported {
            [(-side.1, side.0), (side.1, -side.0), (-side.0, -side.1), side]
        } else {
            [u, (-u.1, u.0), (u.1, -u.0), (-u.0, -u.1)]
        };
        let size = if label_small { 5.0 } else { 6.5 };
        if let Some(l) = &label[i] {
            // Farther out only on small rigs, where ids are few and worth the room.
            let reaches: &[f32] = if label_small { &[5.0] } else { &[5.0, 12.0] };
            let tries = reaches.iter().flat_map(|&reach| candidates.map(|dir| (dir, reach)));
            let spot = tries.into_iter().find_map(|(dir, reach)| {
                let dir = if dir.0.abs() < 0.2 && dir.1.abs() > 0.9 {
                    (0.7, dir.1.signum() * 0.7)
                } else {
                    dir
                };
                let q = at(p, dir, reach);
                let align = if dir.0 < 0.0 { Align::Right } else { Align::Left };
                let at = (q.0, q.1 + 2.3 + dir.1 * 2.0);
                labels.place(text_box(at, size, align, l)).then_some((at, align))
            });
            match spot {
                Some((at, align)) => page.text(at, Style::new(size, Weight::Bold, Ink::Black), align, l),
                None => left_out += 1,
            }
        }
    }
    // Member ids at mid-length, on small rigs, where they are clear of the other labels.
    if model.members.len() <= 24 {
        for (k, m) in model.members.iter().enumerate() {
            let (a, b) = (shown[m.ends[0]], shown[m.ends[1]]);
            let d = sub(b, a);
            if (d.0 * d.0 + d.1 * d.1).sqrt() < fonts::width(&m.id, 5.5, Weight::Regular) + 16.0 {
                continue; // too short on paper to carry its id
            }
            let e = unit(d);
            let mut n = (-e.1, e.0);
            // Right of steep members, above flat ones.
            let steep = e.1.abs() > e.0.abs();
            if (steep && n.0 < 0.0) || (!steep && n.1 > 0.0) {
                n = (-n.0, -n.1);
            }
            // Alternate along the length so that labels of neighbouring members part.
            let t = if k % 2 == 0 { 0.42 } else { 0.58 };
            let mid = at((a.0 + (b.0 - a.0) * t, a.1 + (b.1 - a.1) * t), n, 5.0);
            let align = if n.0 < -0.3 {
                Align::Right
            } else if n.0 > 0.3 {
                Align::Left
            } else {
                Align::Centre
            };
            let at = (mid.0, mid.1 + 2.0);
            // Last in line: a member id gives way to every other label.
            if labels.place(text_box(at, 5.5, align, &m.id)) {
                page.text(at, Style::new(5.5, Weight::Regular, Ink::Mid), align, &m.id);
            }
        }
    }
    // Overall dimensions of the drawn geometry.
    let left = (cx + s * lo[0]) as f32;
    let right = (cx + s * hi[0]) as f32;
    let top = (cy - s * hi[1]) as f32;
    let bottom = (cy - s * lo[1]) as f32;
    let names = |k: usize| -> &'static str {
        match (plane, k) {
            (Plane::Elevation, 0) | (Plane::Plan, 0) => "x",
            (Plane::Side, 0) => "z",
            (Plane::Plan, _) => "z",
            _ => "y",
        }
    };
    let below = (cy - s * blo[1]) as f32 + 14.0;
    if dims[0] > 1e-9 {
        page.line((left, bottom + 3.0), (left, below + 3.0), Pen::solid(0.3, Ink::Light));
        page.line((right, bottom + 3.0), (right, below + 3.0), Pen::solid(0.3, Ink::Light));
        dimension(
            page,
            (left, below),
            (right, below),
            &format!("{} ({})", fmt.length_u(dims[0]), names(0)),
            false,
        );
    }
    let beside = (cx + s * blo[0]) as f32 - 16.0;
    if dims[1] > 1e-9 {
        page.line((left - 3.0, top), (beside - 3.0, top), Pen::solid(0.3, Ink::Light));
        page.line((left - 3.0, bottom), (beside - 3.0, bottom), Pen::solid(0.3, Ink::Light));
        dimension(
            page,
            (beside, top),
            (beside, bottom),
            &format!("{} ({})", fmt.length_u(dims[1]), names(1)),
            true,
        );
    }
    // Axes, top right.
    let origin = (area.x + area.w - 30.0, area.y + 26.0);
    for axis in 0..3 {
        let mut e = Vec3::zeros();
        e[axis] = 1.0;
        let d = uv(&e);
        if d[0].abs() + d[1].abs() < 0.5 {
            continue;
        }
        let dir = (d[0] as f32, -d[1] as f32);
        let tip = at(origin, dir, 16.0);
        page.line(origin, at(origin, dir, 13.0), Pen::solid(0.6, Ink::Black));
        arrow_head(page, tip, dir, 4.0, Ink::Black);
        let l = at(tip, dir, 5.0);
        page.text(
            (l.0, l.1 + 2.5),
            Style::new(7.0, Weight::Bold, Ink::Black),
            Align::Centre,
            ["x", "y", "z"][axis],
        );
    }
    // Scale bar and the scale, bottom left; the legend bottom right.
    let base_y = area.y + area.h - caption_h - 4.0;
    // A round length in the sheet's unit, not longer than the rig's larger span, nor than
    // 400 pt of paper.
    let per = fmt.metres_per_length_unit();
    let bar_units = bar_length((400.0 / s).min(5.0 * span[0].max(span[1])) / per);
    let bar = bar_units * per;
    let bw = (bar * s) as f32;
    let bx = area.x + 10.0;
    for k in 0..4 {
        let x0 = bx + bw * k as f32 / 4.0;
        let fill = if k % 2 == 0 { Ink::Black } else { Ink::White };
        page.rect(x0, base_y - 4.0, bw / 4.0, 4.0, Some(Pen::solid(0.5, Ink::Black)), Some(fill));
    }
    page.text((bx, base_y - 6.0), Style::new(6.0, Weight::Regular, Ink::Dark), Align::Centre, "0");
    page.text(
        (bx + bw, base_y - 6.0),
        Style::new(6.0, Weight::Regular, Ink::Dark),
        Align::Centre,
        &format!("{} {}", fonts_free_number(bar_units), fmt.length_unit()),
    );
    let ratio_text = if ratio >= 1.0 {
        format!("1:{}", fonts_free_number(ratio))
    } else {
        format!("{}:1", fonts_free_number(1.0 / ratio))
    };
    page.text(
        (bx + bw + 8.0, base_y),
        Style::new(6.5, Weight::Regular, Ink::Dark),
        Align::Left,
        &format!("scale {ratio_text} on {} at 100 %", paper.name()),
    );
    // Caption: what is drawn.
    let view_name = match plane {
        Plane::Elevation => "elevation, x to the right, y up",
        Plane::Side => "side view, z to the right, y up",
        Plane::Plan => "plan, x to the right, z down",
    };
    let omitted = match left_out {
        0 => String::new(),
        1 => " One node id left out where crowded.".to_string(),
        n => format!(" {n} node ids left out where crowded."),
    };
    let line1 = match eq {
        Some(_) => format!(
            "Rig, {view_name}. Dashed grey: geometry as drawn. Solid: equilibrium of load case `{}`.{omitted}",
            case.name
        ),
        None => format!("Rig, {view_name}. Dashed grey: geometry as drawn.{omitted}"),
    };
    let line2 = match eq {
        Some(_) if mag > 1.0 => format!(
            "Displacements drawn ×{mag} (largest {} {} at `{at_node}`). Cable thin, strut thick, spring zigzag, slack cable dashed; filled dot: node with mass.",
            fmt.small(largest),
            fmt.small_unit()
        ),
        Some(_) => format!(
            "Displacements to scale (largest {} {} at `{at_node}`). Cable thin, strut thick, spring zigzag, slack cable dashed; filled dot: node with mass.",
            fmt.small(largest),
            fmt.small_unit()
        ),
        None => "NO EQUILIBRIUM in this load case: only the geometry as drawn is shown; nothing here is a result.".to_string(),
    };
    let cy0 = area.y + area.h - caption_h + 9.0;
    for (k, l) in [line1, line2].iter().enumerate() {
        let l = fonts::fit(l, 6.5, Weight::Regular, area.w - 16.0);
        let weight = if eq.is_none() && k == 1 { Weight::Bold } else { Weight::Regular };
        page.text(
            (area.x + 8.0, cy0 + 9.0 * k as f32),
            Style::new(6.5, weight, Ink::Black),
            Align::Left,
            &l,
        );
    }
}

/// The sag of a cable dimensioned on the drawing: its chord dashed, a thin line square to it
/// from the farthest point of the curve, and the sag in the sheet's length unit beside it
/// (collected in `labels`, written after the members).
fn sag_dimension(page: &mut Page, pts: &[(f32, f32)], sag_m: f64, fmt: &Fmt, labels: &mut Vec<((f32, f32), String)>) {
    let (a, b) = (pts[0], pts[pts.len() - 1]);
    let (dx, dy) = (b.0 - a.0, b.1 - a.1);
    let len2 = dx * dx + dy * dy;
    if len2 <= 0.0 {
        return;
    }
    let foot = |p: (f32, f32)| {
        let t = ((p.0 - a.0) * dx + (p.1 - a.1) * dy) / len2;
        (a.0 + t * dx, a.1 + t * dy)
    };
    let dist = |p: (f32, f32)| {
        let f = foot(p);
        ((p.0 - f.0).powi(2) + (p.1 - f.1).powi(2)).sqrt()
    };
    let far = pts.iter().copied().fold(a, |m, p| if dist(p) > dist(m) { p } else { m });
    let f = foot(far);
    // Square to the chord, on the side the cable sags to (downwards on the page when the sag
    // is too small to draw).
    let len = len2.sqrt();
    let (mut ux, mut uy) = (-dy / len, dx / len);
    if dist(far) >= 2.0 {
        page.line(a, b, Pen::dashed(0.4, Ink::Mid, 2.0, 1.5));
        page.line(far, f, Pen::solid(0.4, Ink::Mid));
        (ux, uy) = ((far.0 - f.0) / dist(far), (far.1 - f.1) / dist(far));
    } else if uy < 0.0 {
        (ux, uy) = (-ux, -uy);
    }
    labels.push(((far.0 + ux * 9.0, far.1 + uy * 9.0), format!("sag {}", fmt.length_u(sag_m))));
}
