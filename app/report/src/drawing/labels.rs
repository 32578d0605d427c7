//! Where the drawing's labels may go: the box a text takes on the page, and the boxes taken
//! so far (labels, nodes, support symbols) that a new label must keep off.

use crate::fonts::{self, Weight};
use crate::page::Align;

/// A text's box (x0, y0, x1, y1) on the page from its baseline point, size and alignment.
pub(super) fn text_box(at: (f32, f32), size: f32, align: Align, text: &str) -> (f32, f32, f32, f32) {
    let w = fonts::width(text, size, Weight::Bold);
    let x0 = match align {
        Align::Left => at.0,
        Align::Right => at.0 - w,
        Align::Centre => at.0 - w / 2.0,
    };
    (x0, at.1 - size, x0 + w, at.1 + 0.25 * size)
}

/// Boxes of the labels placed so far on a drawing.
#[derive(Default)]
pub(super) struct Placed(Vec<(f32, f32, f32, f32)>);

impl Placed {
    /// Keeps `b` and returns true when it overlaps no box kept before (a drawing holds at most a
    /// few hundred labels, so a plain list does).
    pub(super) fn place(&mut self, b: (f32, f32, f32, f32)) -> bool {
        let free = self.0.iter().all(|p| b.2 <= p.0 || p.2 <= b.0 || b.3 <= p.1 || p.3 <= b.1);
        if free {
            self.0.push(b);
        }
        free
    }

    /// Keeps `b` as something labels must keep off (a node, a support), overlapping or not.
    pub(super) fn block(&mut self, b: (f32, f32, f32, f32)) {
        self.0.push(b);
    }
}
