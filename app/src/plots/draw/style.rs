//! The plots' shared drawing primitives: colours, font sizes, the CSS-to-backend pixel
//! scale, line and text styles, legend swatches and the [`Frame`] a drawing returns.

use plotters::prelude::*;

/// Species colours: our own palette, each at least 3:1 against white.
/// Species of the second and later systems are also drawn dashed.
pub const PALETTE: [RGBColor; 12] = [
    RGBColor(0x1d, 0x5f, 0xa6),
    RGBColor(0xc0, 0x4a, 0x0b),
    RGBColor(0x0e, 0x7c, 0x5a),
    RGBColor(0x9c, 0x27, 0x7b),
    RGBColor(0x5b, 0x45, 0xb8),
    RGBColor(0x8a, 0x6a, 0x00),
    RGBColor(0xb4, 0x23, 0x3c),
    RGBColor(0x2c, 0x6e, 0x7f),
    RGBColor(0x4a, 0x7a, 0x12),
    RGBColor(0xc2, 0x18, 0x6e),
    RGBColor(0x6b, 0x4a, 0x2b),
    RGBColor(0x3f, 0x51, 0x6b),
];
/// Text and the working-pH marker.
pub const INK: RGBColor = RGBColor(0x1b, 0x1f, 0x24);
/// Axis labels and pK markers.
pub const MUTED: RGBColor = RGBColor(0x5f, 0x66, 0x70);
/// Grid lines.
pub const GRID: RGBColor = RGBColor(0xe3, 0xe7, 0xeb);
/// Pointer cursor.
pub const CURSOR: RGBColor = RGBColor(0x8a, 0x93, 0x9e);
/// Buffer capacity curve.
pub const CAPACITY: RGBColor = RGBColor(0x0f, 0x6b, 0x74);
/// Titration curve.
pub const TITRATION: RGBColor = RGBColor(0x3d, 0x3a, 0x9e);

/// Font family for every plot label: generic, measured by the browser.
const FAMILY: &str = "sans-serif";
pub(crate) const FONT_PX: f64 = 13.0;
pub(super) const SMALL_PX: f64 = 12.0;
pub(super) const LEGEND_ROW: i32 = 20;

/// Species colour for series `i`.
pub fn species_color(i: usize) -> RGBColor {
    PALETTE.get(i % PALETTE.len()).copied().unwrap_or(INK)
}

/// The plotting rectangle (CSS px) and the data ranges it shows.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Frame {
    /// Left edge, px.
    pub left: i32,
    /// Right edge, px.
    pub right: i32,
    /// Top edge, px.
    pub top: i32,
    /// Bottom edge, px.
    pub bottom: i32,
    /// Data x at the left and right edges.
    pub x: (f64, f64),
}

impl Frame {
    /// Data x under pixel column `px` (clamped to the range), or `None` when the
    /// frame is degenerate.
    pub fn x_at(&self, px: f64) -> Option<f64> {
        let w = f64::from(self.right - self.left);
        if w < 1.0 {
            return None;
        }
        let t = ((px - f64::from(self.left)) / w).clamp(0.0, 1.0);
        Some(self.x.0 + t * (self.x.1 - self.x.0))
    }
}

/// What a legend entry's swatch looks like.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) enum Swatch {
    Line(RGBColor),
    Dashed(RGBColor),
    Dot(RGBColor),
    /// A light filled box (the tolerance window).
    Band(RGBColor),
}

pub(crate) type DrawResult<T, DB> =
    Result<T, DrawingAreaErrorKind<<DB as DrawingBackend>::ErrorType>>;

/// Size factor from CSS pixels to backend pixels (the device pixel ratio on
/// the page's canvas, 1 in SVG tests): every length, width and font size goes through it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Sc(f64);

impl Sc {
    pub(crate) fn new(scale: f64) -> Self {
        Sc(if scale.is_finite() && scale > 0.0 {
            scale.clamp(0.25, 8.0)
        } else {
            1.0
        })
    }
    /// A length in backend pixels.
    pub(crate) fn i(self, css_px: i32) -> i32 {
        (f64::from(css_px) * self.0).round() as i32
    }
    /// A width or radius in backend pixels (at least 1).
    pub(crate) fn u(self, css_px: u32) -> u32 {
        (f64::from(css_px) * self.0).round().max(1.0) as u32
    }
}

pub(crate) fn font(s: Sc, px: f64) -> TextStyle<'static> {
    TextStyle::from((FAMILY, px * s.0).into_font()).color(&INK)
}

pub(crate) fn line(s: Sc, color: RGBColor, width: u32) -> ShapeStyle {
    ShapeStyle {
        color: color.to_rgba(),
        filled: false,
        stroke_width: s.u(width),
    }
}
