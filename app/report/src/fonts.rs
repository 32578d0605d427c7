//! The fonts embedded in every sheet (DejaVu Sans, shipped in `assets/fonts/` with its
//! licence) and the measuring of text set in them.
//!
//! Widths come from shaping with rustybuzz, the shaper krilla itself uses for
//! `draw_text`, so a measured string is exactly as wide as the one drawn.

use std::sync::OnceLock;

/// DejaVu Sans (Bitstream Vera licence; see `assets/fonts/LICENSE-DejaVu.txt`).
pub const REGULAR: &[u8] = include_bytes!("../../../assets/fonts/DejaVuSans.ttf");
/// DejaVu Sans Bold.
pub const BOLD: &[u8] = include_bytes!("../../../assets/fonts/DejaVuSans-Bold.ttf");

/// Font weight of a run of text.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Weight {
    Regular,
    Bold,
}

struct Faces {
    regular: rustybuzz::Face<'static>,
    bold: rustybuzz::Face<'static>,
}

fn faces() -> &'static Faces {
    static FACES: OnceLock<Faces> = OnceLock::new();
    FACES.get_or_init(|| Faces {
        regular: rustybuzz::Face::from_slice(REGULAR, 0).expect("the embedded regular font parses"),
        bold: rustybuzz::Face::from_slice(BOLD, 0).expect("the embedded bold font parses"),
    })
}

/// Width of `text` set at `size` (pt), in pt.
pub fn width(text: &str, size: f32, weight: Weight) -> f32 {
    let f = faces();
    let face = match weight {
        Weight::Regular => &f.regular,
        Weight::Bold => &f.bold,
    };
    let mut buffer = rustybuzz::UnicodeBuffer::new();
    buffer.push_str(text);
    buffer.guess_segment_properties();
    let glyphs = rustybuzz::shape(face, &[], buffer);
    let units: i32 = glyphs.glyph_positions().iter().map(|p| p.x_advance).sum();
    units as f32 * size / face.units_per_em() as f32
}

/// `text` cut to at most `max` pt wide at `size`, ending in "…" when cut.
pub fn fit(text: &str, size: f32, weight: Weight, max: f32) -> String {
    if width(text, size, weight) <= max {
        return text.to_string();
    }
    let chars: Vec<char> = text.chars().collect();
    let mut n = chars.len();
    while n > 0 {
        n -= 1;
        let cut: String = chars[..n].iter().collect::<String>().trim_end().to_string() + "…";
        if width(&cut, size, weight) <= max {
            return cut;
        }
    }
    String::new()
}

/// Breaks `text` into lines at most `max` pt wide at `size` (at spaces; a word longer than a
/// line is cut).
pub fn wrap(text: &str, size: f32, weight: Weight, max: f32) -> Vec<String> {
    let mut lines = Vec::new();
    for paragraph in text.split('\n') {
        let mut line = String::new();
        for word in paragraph.split_whitespace() {
            let candidate = if line.is_empty() {
                word.to_string()
            } else {
                format!("{line} {word}")
            };
            if width(&candidate, size, weight) <= max || line.is_empty() {
                line = candidate;
            } else {
                lines.push(std::mem::take(&mut line));
                line = word.to_string();
            }
            if width(&line, size, weight) > max {
                line = fit(&line, size, weight, max);
            }
        }
        lines.push(line);
    }
    lines
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn wider_text_measures_wider_and_scales_with_size() {
        let a = width("cable", 10.0, Weight::Regular);
        assert!(a > 0.0);
        assert!(width("cables", 10.0, Weight::Regular) > a);
        assert!((width("cable", 20.0, Weight::Regular) - 2.0 * a).abs() < 1e-3);
        assert!(width("cable", 10.0, Weight::Bold) > a);
    }

    #[test]
    fn wrapped_lines_fit_and_keep_every_word() {
        let text = "Rigging and tensioned structures can fail suddenly and hurt people.";
        let lines = wrap(text, 8.0, Weight::Regular, 120.0);
        assert!(lines.len() > 1);
        for l in &lines {
            assert!(width(l, 8.0, Weight::Regular) <= 120.0, "{l}");
        }
        assert_eq!(lines.join(" "), text);
        assert!(fit("a very long member identifier", 8.0, Weight::Regular, 40.0).ends_with('…'));
    }
}
