//! Presses and drags on the Rig view: zoom about the cursor and pan, picking nodes and
//! members, and each tool's action (move, Pull, add an anchor, node, member or load) as a
//! command.

use eframe::egui::{self, PointerButton, Pos2, Rect};
use rigwright_core::model::{CaseDoc, LoadDoc, MemberDoc, MemberDocKind, NodeDoc, Rest};
use rigwright_core::{Project, Vec3};
use rigwright_report::plane::Plane;

use super::camera::{Drag, node_pos};
use crate::gui::{Command, RigApp, Selection, Tool};

/// A short id like `cable-3` not yet used in `taken`.
pub fn fresh_id<'a>(prefix: &str, taken: impl Iterator<Item = &'a str> + Clone) -> String {
    (1..)
        .map(|k| format!("{prefix}-{k}"))
        .find(|id| !taken.clone().any(|t| t == id))
        .expect("some id is free")
}

pub(super) fn navigate(app: &mut RigApp, ui: &egui::Ui, response: &egui::Response) {
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

pub(super) fn interact(app: &mut RigApp, ui: &egui::Ui, response: &egui::Response) {
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
