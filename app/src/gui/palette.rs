//! Colours of the Rig view: the project's own tension palette and symbol colours.

use eframe::egui::Color32;

/// Canvas background.
pub const PAPER: Color32 = Color32::from_rgb(250, 250, 247);
/// Minor and major grid lines.
pub const GRID_MINOR: Color32 = Color32::from_rgb(234, 236, 238);
pub const GRID_MAJOR: Color32 = Color32::from_rgb(214, 218, 222);
/// Drawn (unloaded) geometry.
pub const DRAWN: Color32 = Color32::from_rgb(188, 194, 200);
/// Ink for nodes, symbols and text.
pub const INK: Color32 = Color32::from_rgb(38, 44, 52);
/// Slack cables.
pub const SLACK: Color32 = Color32::from_rgb(150, 156, 164);
/// Support reactions.
pub const REACTION: Color32 = Color32::from_rgb(22, 120, 72);
/// Point loads.
pub const LOAD: Color32 = Color32::from_rgb(140, 48, 140);
/// Pull: the restoring force and the hand.
pub const PULL: Color32 = Color32::from_rgb(224, 92, 20);
/// Selection highlight.
pub const SELECT: Color32 = Color32::from_rgb(0, 132, 214);
/// Stiffness ellipse.
pub const STIFFNESS: Color32 = Color32::from_rgb(30, 96, 200);
/// Banner for a state that is not an answer.
pub const ALARM: Color32 = Color32::from_rgb(178, 34, 34);
/// Banner for an edit that was not applied.
pub const CAUTION: Color32 = Color32::from_rgb(176, 112, 0);

/// Tension ramp: low → high, from a cool slate through sea green and ochre to brick.
const TENSION: [(f32, [u8; 3]); 4] = [
    (0.0, [112, 136, 160]),
    (0.35, [40, 150, 130]),
    (0.7, [214, 160, 40]),
    (1.0, [190, 52, 40]),
];
/// Compression ramp: low → high, slate to indigo.
const COMPRESSION: [(f32, [u8; 3]); 2] = [(0.0, [112, 136, 160]), (1.0, [84, 52, 196])];

fn ramp(stops: &[(f32, [u8; 3])], t: f32) -> Color32 {
    let t = t.clamp(0.0, 1.0);
    for w in stops.windows(2) {
        let (t0, c0) = w[0];
        let (t1, c1) = w[1];
        if t <= t1 {
            let s = if t1 > t0 { (t - t0) / (t1 - t0) } else { 0.0 };
            let mix = |a: u8, b: u8| (a as f32 + (b as f32 - a as f32) * s).round() as u8;
            return Color32::from_rgb(mix(c0[0], c1[0]), mix(c0[1], c1[1]), mix(c0[2], c1[2]));
        }
    }
    let c = stops[stops.len() - 1].1;
    Color32::from_rgb(c[0], c[1], c[2])
}

/// Colour of a member force `force` (N, tension positive) on a scale of `max` (N).
pub fn force_colour(force: f64, max: f64) -> Color32 {
    let t = if max > 0.0 { (force.abs() / max) as f32 } else { 0.0 };
    if force >= 0.0 { ramp(&TENSION, t) } else { ramp(&COMPRESSION, t) }
}
/// A check that passes (always beside the word "pass").
pub const OK: Color32 = Color32::from_rgb(22, 120, 72);
/// A check near its limit (always beside the words "near limit").
pub const WARN: Color32 = CAUTION;
/// Something not checked.
pub const MUTED: Color32 = SLACK;
