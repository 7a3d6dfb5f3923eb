//! The page's plotters backend: plotters-canvas's drawing calls, with fewer round trips to JavaScript.
//!
//! It issues the same canvas operations as plotters-canvas 0.3 (same
//! coordinates, the same half-pixel shift of horizontal and vertical lines,
//! same colours, fonts, anchors), so the picture is the same; what changes is
//! the cost of getting there:
//!
//! - Consecutive strokes with the same colour and width that do not overlap
//!   (the dashes of a dashed line, the grid's horizontal and vertical lines
//!   at odd widths, which cover whole pixels) are stroked together as one path
//!   of several subpaths: one `stroke` and one style set instead of one each.
//!   Measured: the canvases are byte-identical at DPR 1 and 2; at DPR 3 (odd
//!   line widths, edges on half pixels) a few anti-aliased edge pixels of
//!   batched dashes differ by 1 of 255 in one channel.
//!   (Building a `Path2D` from SVG path text was tried and was slower: the
//!   text formatting, its transfer and parsing cost more than the `lineTo` calls.)
//! - Context state (stroke and fill colour, line width, font, text alignment
//!   and baseline) is set only when it changes.
//! - Text sizes (the legend's layout) are measured through the DOM as
//!   plotters does, once per text and font, then kept ([`measure_cached`]):
//!   each DOM measurement forces a layout of the page.

use plotters_backend::text_anchor::{HPos, VPos};
use plotters_backend::{
    BackendColor, BackendCoord, BackendStyle, BackendTextStyle, DrawingBackend, DrawingErrorKind,
    FontTransform,
};
use std::cell::RefCell;
use std::collections::HashMap;
use wasm_bindgen::JsValue;
use web_sys::CanvasRenderingContext2d;

/// Error of a canvas call (the thrown value, as text).
#[derive(Debug)]
pub struct CanvasError(String);

impl std::fmt::Display for CanvasError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(f, "canvas error: {}", self.0)
    }
}

impl std::error::Error for CanvasError {}

fn js_err(e: &JsValue) -> DrawingErrorKind<CanvasError> {
    DrawingErrorKind::DrawingError(CanvasError(format!("{e:?}")))
}

/// Colour as plotters-canvas writes it.
fn css_color(c: BackendColor) -> String {
    let (r, g, b) = c.rgb;
    format!("rgba({},{},{},{})", r, g, b, c.alpha)
}

fn same_color(a: BackendColor, b: BackendColor) -> bool {
    a.rgb == b.rgb && a.alpha.to_bits() == b.alpha.to_bits()
}

/// Key of one remembered text measurement: text, family, style, size.
type MeasureKey = (String, String, String, u64);

thread_local! {
    static MEASURED: RefCell<HashMap<MeasureKey, (u32, u32)>> = RefCell::new(HashMap::new());
}

/// Most texts remembered; the table is emptied when full (labels with changing
/// numbers would otherwise accumulate).
const MEASURE_CAP: usize = 1024;

/// Text size as plotters measures it in the browser (a span in the page),
/// remembered per text, font family, style and size.
///
/// # Errors
///
/// The font's error.
pub fn measure_cached<S: BackendTextStyle>(
    text: &str,
    style: &S,
) -> Result<(u32, u32), DrawingErrorKind<CanvasError>> {
    let key: MeasureKey = (
        text.to_string(),
        style.family().as_str().to_string(),
        style.style().as_str().to_string(),
        style.size().to_bits(),
    );
    if let Some(v) = MEASURED.with(|m| m.borrow().get(&key).copied()) {
        return Ok(v);
    }
    // The same computation as plotters' default `estimate_text_size`.
    let layout = style
        .layout_box(text)
        .map_err(|e| DrawingErrorKind::FontError(Box::new(e)))?;
    let v = (
        ((layout.1).0 - (layout.0).0) as u32,
        ((layout.1).1 - (layout.0).1) as u32,
    );
    MEASURED.with(|m| {
        let mut m = m.borrow_mut();
        if m.len() >= MEASURE_CAP {
            m.clear();
        }
        m.insert(key, v);
    });
    Ok(v)
}

/// Strokes waiting to be drawn together: same colour and width, no overlap.
struct Batch {
    color: BackendColor,
    width: u32,
    /// The strokes' points (canvas units), one list per stroke.
    paths: Vec<Vec<(f64, f64)>>,
    /// Bounding boxes (device px, inclusive, widened by the half width) of the
    /// subpaths so far: a new stroke that touches one starts a new batch.
    boxes: Vec<(f64, f64, f64, f64)>,
    /// The batch holds only axis-aligned lines of odd width (they cover whole pixels, so
    /// crossings are drawn the same either way).
    pixel_exact: bool,
}

/// The canvas backend of the page's plots (see the module docs).
pub struct FastCanvas {
    ctx: CanvasRenderingContext2d,
    size: (u32, u32),
    stroke: Option<BackendColor>,
    fill: Option<BackendColor>,
    line_width: Option<u32>,
    font: Option<String>,
    align: Option<&'static str>,
    baseline: Option<&'static str>,
    batch: Option<Batch>,
}

impl FastCanvas {
    /// A backend drawing on `ctx`, reporting `size` (the backing store, device px).
    /// The context state is assumed unknown: the first use of each setting sets it.
    pub fn new(ctx: CanvasRenderingContext2d, size: (u32, u32)) -> Self {
        FastCanvas {
            ctx,
            size,
            stroke: None,
            fill: None,
            line_width: None,
            font: None,
            align: None,
            baseline: None,
            batch: None,
        }
    }

    fn set_stroke(&mut self, color: BackendColor, width: u32) {
        if !self.stroke.is_some_and(|c| same_color(c, color)) {
            self.ctx.set_stroke_style_str(&css_color(color));
            self.stroke = Some(color);
        }
        if self.line_width != Some(width) {
            self.ctx.set_line_width(f64::from(width));
            self.line_width = Some(width);
        }
    }

    fn set_fill(&mut self, color: BackendColor) {
        if !self.fill.is_some_and(|c| same_color(c, color)) {
            self.ctx.set_fill_style_str(&css_color(color));
            self.fill = Some(color);
        }
    }

    /// Stroke the pending batch, if any.
    fn flush(&mut self) -> Result<(), DrawingErrorKind<CanvasError>> {
        let Some(b) = self.batch.take() else {
            return Ok(());
        };
        self.set_stroke(b.color, b.width);
        self.ctx.begin_path();
        for path in &b.paths {
            let mut pts = path.iter();
            if let Some((x, y)) = pts.next() {
                self.ctx.move_to(*x, *y);
            }
            for (x, y) in pts {
                self.ctx.line_to(*x, *y);
            }
        }
        self.ctx.stroke();
        Ok(())
    }

    /// Add a stroke (points in canvas units) to the batch when it can join it
    /// (same colour and width, and no overlap unless both cover whole pixels);
    /// otherwise flush and start a new batch.
    fn queue_stroke(&mut self, pts: Vec<(f64, f64)>, color: BackendColor, width: u32, exact: bool) {
        let half = f64::from(width) / 2.0 + 1.0;
        let (mut x0, mut y0, mut x1, mut y1) = (f64::MAX, f64::MAX, f64::MIN, f64::MIN);
        for (x, y) in &pts {
            x0 = x0.min(*x - half);
            y0 = y0.min(*y - half);
            x1 = x1.max(*x + half);
            y1 = y1.max(*y + half);
        }
        let bb = (x0, y0, x1, y1);
        let joins = self.batch.as_ref().is_some_and(|b| {
            same_color(b.color, color)
                && b.width == width
                && ((b.pixel_exact && exact)
                    || !b
                        .boxes
                        .iter()
                        .any(|o| o.0 <= bb.2 && bb.0 <= o.2 && o.1 <= bb.3 && bb.1 <= o.3))
        });
        if !joins {
            // A flush error only loses the pending strokes' picture; plotters has no way
            // to report it from here other than at the next flush.
            let _ = self.flush();
            self.batch = Some(Batch {
                color,
                width,
                paths: Vec::new(),
                boxes: Vec::new(),
                pixel_exact: exact,
            });
        }
        if let Some(b) = self.batch.as_mut() {
            b.pixel_exact &= exact;
            b.paths.push(pts);
            b.boxes.push(bb);
        }
    }
}

impl Drop for FastCanvas {
    fn drop(&mut self) {
        let _ = self.flush();
    }
}

/// plotters-canvas's half-pixel shift of horizontal and vertical lines (crisp 1-px lines).
fn fine_hor_ver_lines(from: BackendCoord, end: BackendCoord) -> ((f64, f64), (f64, f64)) {
    let mut from = (f64::from(from.0), f64::from(from.1));
    let mut end = (f64::from(end.0), f64::from(end.1));
    if from.0 == end.0 {
        from.0 -= 0.5;
        end.0 -= 0.5;
    }
    if from.1 == end.1 {
        from.1 -= 0.5;
        end.1 -= 0.5;
    }
    (from, end)
}

impl DrawingBackend for FastCanvas {
    type ErrorType = CanvasError;

    fn get_size(&self) -> (u32, u32) {
        self.size
    }

    fn ensure_prepared(&mut self) -> Result<(), DrawingErrorKind<CanvasError>> {
        Ok(())
    }

    fn present(&mut self) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.flush()
    }

    fn draw_pixel(
        &mut self,
        point: BackendCoord,
        color: BackendColor,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        if color.alpha == 0.0 {
            return Ok(());
        }
        self.flush()?;
        self.set_fill(color);
        self.ctx
            .fill_rect(f64::from(point.0), f64::from(point.1), 1.0, 1.0);
        Ok(())
    }

    fn draw_line<S: BackendStyle>(
        &mut self,
        from: BackendCoord,
        to: BackendCoord,
        style: &S,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        if style.color().alpha == 0.0 {
            return Ok(());
        }
        let axis_aligned = from.0 == to.0 || from.1 == to.1;
        let (from, to) = fine_hor_ver_lines(from, to);
        let exact = axis_aligned && style.stroke_width() % 2 == 1;
        self.queue_stroke(vec![from, to], style.color(), style.stroke_width(), exact);
        Ok(())
    }

    fn draw_rect<S: BackendStyle>(
        &mut self,
        upper_left: BackendCoord,
        bottom_right: BackendCoord,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        if style.color().alpha == 0.0 {
            return Ok(());
        }
        self.flush()?;
        let (x, y) = (f64::from(upper_left.0), f64::from(upper_left.1));
        let (w, h) = (
            f64::from(bottom_right.0 - upper_left.0),
            f64::from(bottom_right.1 - upper_left.1),
        );
        if fill {
            self.set_fill(style.color());
            self.ctx.fill_rect(x, y, w, h);
        } else {
            self.set_stroke(style.color(), style.stroke_width());
            self.ctx.stroke_rect(x, y, w, h);
        }
        Ok(())
    }

    fn draw_path<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        path: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        if style.color().alpha == 0.0 {
            return Ok(());
        }
        let pts: Vec<(f64, f64)> = path
            .into_iter()
            .map(|(x, y)| (f64::from(x), f64::from(y)))
            .collect();
        // An empty or one-point path strokes nothing (butt caps).
        if pts.len() >= 2 {
            self.queue_stroke(pts, style.color(), style.stroke_width(), false);
        }
        Ok(())
    }

    fn draw_circle<S: BackendStyle>(
        &mut self,
        center: BackendCoord,
        radius: u32,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        if style.color().alpha == 0.0 {
            return Ok(());
        }
        self.flush()?;
        if fill {
            self.set_fill(style.color());
        } else {
            self.set_stroke(style.color(), style.stroke_width());
        }
        self.ctx.begin_path();
        self.ctx
            .arc(
                f64::from(center.0),
                f64::from(center.1),
                f64::from(radius),
                0.0,
                std::f64::consts::PI * 2.0,
            )
            .map_err(|e| js_err(&e))?;
        if fill {
            self.ctx.fill();
        } else {
            self.ctx.stroke();
        }
        Ok(())
    }

    fn fill_polygon<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        vert: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        if style.color().alpha == 0.0 {
            return Ok(());
        }
        self.flush()?;
        let mut vert = vert.into_iter();
        self.ctx.begin_path();
        if let Some(start) = vert.next() {
            self.set_fill(style.color());
            self.ctx.move_to(f64::from(start.0), f64::from(start.1));
            for next in vert {
                self.ctx.line_to(f64::from(next.0), f64::from(next.1));
            }
            self.ctx.close_path();
        }
        self.ctx.fill();
        Ok(())
    }

    fn draw_text<TStyle: BackendTextStyle>(
        &mut self,
        text: &str,
        style: &TStyle,
        pos: BackendCoord,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        let color = style.color();
        if color.alpha == 0.0 {
            return Ok(());
        }
        self.flush()?;
        let (mut x, mut y) = (pos.0, pos.1);
        let degree = match style.transform() {
            FontTransform::None => 0.0,
            FontTransform::Rotate90 => 90.0,
            FontTransform::Rotate180 => 180.0,
            FontTransform::Rotate270 => 270.0,
        } / 180.0
            * std::f64::consts::PI;
        if degree != 0.0 {
            self.ctx.save();
            self.ctx
                .translate(f64::from(x), f64::from(y))
                .map_err(|e| js_err(&e))?;
            self.ctx.rotate(degree).map_err(|e| js_err(&e))?;
            x = 0;
            y = 0;
        }
        let baseline = match style.anchor().v_pos {
            VPos::Top => "top",
            VPos::Center => "middle",
            VPos::Bottom => "bottom",
        };
        if self.baseline != Some(baseline) {
            self.ctx.set_text_baseline(baseline);
            self.baseline = Some(baseline);
        }
        let align = match style.anchor().h_pos {
            HPos::Left => "start",
            HPos::Right => "end",
            HPos::Center => "center",
        };
        if self.align != Some(align) {
            self.ctx.set_text_align(align);
            self.align = Some(align);
        }
        self.set_fill(color);
        let font = format!(
            "{} {}px {}",
            style.style().as_str(),
            style.size(),
            style.family().as_str(),
        );
        if self.font.as_deref() != Some(font.as_str()) {
            self.ctx.set_font(&font);
            self.font = Some(font);
        }
        self.ctx
            .fill_text(text, f64::from(x), f64::from(y))
            .map_err(|e| js_err(&e))?;
        if degree != 0.0 {
            self.ctx.restore();
            // `restore` brings back the state from before `save`: forget what was set since.
            self.stroke = None;
            self.fill = None;
            self.line_width = None;
            self.font = None;
            self.align = None;
            self.baseline = None;
        }
        Ok(())
    }

    fn estimate_text_size<TStyle: BackendTextStyle>(
        &self,
        text: &str,
        style: &TStyle,
    ) -> Result<(u32, u32), DrawingErrorKind<CanvasError>> {
        measure_cached(text, style)
    }
}
