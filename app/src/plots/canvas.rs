//! The plot canvas: backing store at CSS size × devicePixelRatio, redrawn on resize, ratio change and data change.
//!
//! plotters-canvas lays out in backing-store pixels, which is blurry on
//! tablets when the backing store equals the CSS size. Here the backing store
//! is CSS size × devicePixelRatio, the context transform is set absolutely
//! (`set_transform`, never a cumulative `scale`) to map the backing store 1:1,
//! and the drawing code receives the ratio as its scale: fonts, widths and
//! margins are multiplied by it while curve vertices keep whole-device-pixel
//! precision (plotters rounds coordinates to integers, so drawing in CSS px
//! under a 2× transform would put curve vertices on a 2-pixel grid).
//!
//! Text sizes are measured on a detached canvas (`measureText`) and
//! remembered per text and font: plotters measures a label by putting a span
//! in the page and reading its size, which forces a layout of the whole page
//! each time (measured as most of a redraw's cost at ×4 CPU throttling,
//! `app/PERF.md`); the canvas gives the same numbers without a layout.

use super::draw::Frame;
use leptos::html::Canvas;
use leptos::leptos_dom::helpers::WindowListenerHandle;
use leptos::prelude::*;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters_backend::{
    BackendColor, BackendCoord, BackendStyle, BackendTextStyle, DrawingErrorKind,
};
use plotters_canvas::CanvasBackend;
use std::cell::RefCell;
use std::collections::HashMap;
use std::rc::Rc;
use wasm_bindgen::closure::Closure;
use wasm_bindgen::JsCast;
use web_sys::{CanvasRenderingContext2d, HtmlCanvasElement, MediaQueryList, ResizeObserver};

/// The plotters canvas backend, sized to the backing store (kept as a wrapper so
/// the reported size is the one this module chose, whatever the element says).
///
/// Straight lines in one opaque colour and width that come one after another
/// (grid lines, ticks, the dashes of a dashed line) are stroked as one path:
/// plotters-canvas sets the colour and width and strokes each line on its own,
/// several calls into the browser for each of a plot's hundreds of lines. The
/// lines are the same ones plotters-canvas would stroke (the same half-pixel
/// shift of horizontal and vertical lines); where two of them cross, the
/// anti-aliased edge may differ by a shade. Everything else goes to
/// plotters-canvas, after the lines waiting.
pub struct HiDpiCanvas {
    inner: CanvasBackend,
    size: (u32, u32),
    ctx: CanvasRenderingContext2d,
    lines: Vec<((f64, f64), (f64, f64))>,
    line_style: Option<((u8, u8, u8), u32)>,
}

impl HiDpiCanvas {
    /// The backend of `canvas` at its current backing-store size.
    pub fn new(canvas: &HtmlCanvasElement) -> Option<Self> {
        let ctx: CanvasRenderingContext2d = canvas.get_context("2d").ok()??.dyn_into().ok()?;
        Some(HiDpiCanvas {
            inner: CanvasBackend::with_canvas_object(canvas.clone())?,
            size: (canvas.width(), canvas.height()),
            ctx,
            lines: Vec::new(),
            line_style: None,
        })
    }

    /// Stroke the lines waiting, if any, as one path.
    fn flush_lines(&mut self) {
        let Some(((r, g, b), width)) = self.line_style else {
            return;
        };
        if !self.lines.is_empty() {
            self.ctx
                .set_stroke_style_str(&format!("rgba({r},{g},{b},1)"));
            self.ctx.set_line_width(f64::from(width));
            self.ctx.begin_path();
            for (from, to) in self.lines.drain(..) {
                self.ctx.move_to(from.0, from.1);
                self.ctx.line_to(to.0, to.1);
            }
            self.ctx.stroke();
        }
        self.line_style = None;
    }
}

/// A line's ends as plotters-canvas strokes them: horizontal and vertical
/// lines move half a pixel so a one-pixel line covers one pixel row or column.
fn stroked_ends(from: BackendCoord, to: BackendCoord) -> ((f64, f64), (f64, f64)) {
    let mut a = (f64::from(from.0), f64::from(from.1));
    let mut b = (f64::from(to.0), f64::from(to.1));
    if from.0 == to.0 {
        a.0 -= 0.5;
        b.0 -= 0.5;
    }
    if from.1 == to.1 {
        a.1 -= 0.5;
        b.1 -= 0.5;
    }
    (a, b)
}

type CanvasError = <CanvasBackend as DrawingBackend>::ErrorType;

impl DrawingBackend for HiDpiCanvas {
    type ErrorType = CanvasError;

    fn get_size(&self) -> (u32, u32) {
        self.size
    }
    fn ensure_prepared(&mut self) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.flush_lines();
        self.inner.ensure_prepared()
    }
    fn present(&mut self) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.flush_lines();
        self.inner.present()
    }
    fn draw_pixel(
        &mut self,
        point: BackendCoord,
        color: BackendColor,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.flush_lines();
        self.inner.draw_pixel(point, color)
    }
    fn draw_line<S: BackendStyle>(
        &mut self,
        from: BackendCoord,
        to: BackendCoord,
        style: &S,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        let color = style.color();
        if color.alpha < 1.0 {
            // Translucent lines blend where they cross: one stroke each, as before.
            self.flush_lines();
            return self.inner.draw_line(from, to, style);
        }
        let key = (color.rgb, style.stroke_width());
        if self.line_style != Some(key) {
            self.flush_lines();
            self.line_style = Some(key);
        }
        self.lines.push(stroked_ends(from, to));
        Ok(())
    }
    fn draw_rect<S: BackendStyle>(
        &mut self,
        upper_left: BackendCoord,
        bottom_right: BackendCoord,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.flush_lines();
        self.inner.draw_rect(upper_left, bottom_right, style, fill)
    }
    fn draw_path<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        path: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.flush_lines();
        self.inner.draw_path(path, style)
    }
    fn draw_circle<S: BackendStyle>(
        &mut self,
        center: BackendCoord,
        radius: u32,
        style: &S,
        fill: bool,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.flush_lines();
        self.inner.draw_circle(center, radius, style, fill)
    }
    fn fill_polygon<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        vert: I,
        style: &S,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.flush_lines();
        self.inner.fill_polygon(vert, style)
    }
    fn draw_text<TStyle: BackendTextStyle>(
        &mut self,
        text: &str,
        style: &TStyle,
        pos: BackendCoord,
    ) -> Result<(), DrawingErrorKind<CanvasError>> {
        self.flush_lines();
        self.inner.draw_text(text, style, pos)
    }
    fn estimate_text_size<TStyle: BackendTextStyle>(
        &self,
        text: &str,
        style: &TStyle,
    ) -> Result<(u32, u32), DrawingErrorKind<CanvasError>> {
        measure_cached(text, style)
    }
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
    let v = match measure_on_canvas(text, &key) {
        Some(v) => v,
        None => {
            // plotters' own way (a span in the page), where no 2D context exists.
            let layout = style
                .layout_box(text)
                .map_err(|e| DrawingErrorKind::FontError(Box::new(e)))?;
            (
                ((layout.1).0 - (layout.0).0) as u32,
                ((layout.1).1 - (layout.0).1) as u32,
            )
        }
    };
    MEASURED.with(|m| {
        let mut m = m.borrow_mut();
        if m.len() >= MEASURE_CAP {
            m.clear();
        }
        m.insert(key, v);
    });
    Ok(v)
}

/// Line height of the page's text (`body` in `style.css`): plotters' span
/// measurement gives a text the height of one line of the page.
const PAGE_LINE_HEIGHT: f64 = 1.45;

thread_local! {
    /// A detached canvas whose 2D context measures text (no page layout needed).
    static MEASURER: Option<CanvasRenderingContext2d> = web_sys::window()
        .and_then(|w| w.document())
        .and_then(|d| d.create_element("canvas").ok())
        .and_then(|c| c.dyn_into::<HtmlCanvasElement>().ok())
        .and_then(|c| c.get_context("2d").ok().flatten())
        .and_then(|c| c.dyn_into::<CanvasRenderingContext2d>().ok());
}

/// The size plotters' span measurement reports (`inline-block`, the text's
/// advance width rounded to a pixel, one page line high), from the canvas's
/// `measureText`: the same numbers without laying out the page.
fn measure_on_canvas(text: &str, key: &MeasureKey) -> Option<(u32, u32)> {
    let (_, family, style, size_bits) = key;
    let size = f64::from_bits(*size_bits);
    // The span took CSS `font-style`, where plotters' "bold" means nothing.
    let style = if style == "italic" || style == "oblique" {
        style.as_str()
    } else {
        "normal"
    };
    MEASURER.with(|m| {
        let ctx = m.as_ref()?;
        ctx.set_font(&format!("{style} {size}px {family}"));
        let width = ctx.measure_text(text).ok()?.width();
        // Layout keeps sizes in 1/64 px, a text's width rounded up to one,
        // and `offsetWidth` then rounds to a pixel: checked equal to the span
        // for 200 labels, sizes and families at pixel ratios 1–3 (app/PERF.md).
        let width = ((width * 64.0).ceil() / 64.0).round();
        Some((width as u32, (size * PAGE_LINE_HEIGHT).round() as u32))
    })
}

/// The drawing area the page's plots paint into.
pub type CanvasArea = DrawingArea<HiDpiCanvas, Shift>;

/// CSS size and device pixel ratio of a canvas.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct Size {
    /// CSS width, px.
    pub w: f64,
    /// CSS height, px.
    pub h: f64,
    /// `window.devicePixelRatio`.
    pub dpr: f64,
}

fn device_pixel_ratio() -> f64 {
    web_sys::window()
        .map(|w| w.device_pixel_ratio())
        .filter(|r| r.is_finite() && *r > 0.0)
        .unwrap_or(1.0)
}

/// Largest CSS size drawn, px: without the page's stylesheet a canvas takes its
/// CSS size from its backing store, which would otherwise grow by the pixel
/// ratio on every resize observation.
const MAX_CSS: f64 = 2400.0;

fn measure(canvas: &HtmlCanvasElement) -> Size {
    let rect = canvas.get_bounding_client_rect();
    Size {
        w: rect.width().min(MAX_CSS),
        h: rect.height().min(MAX_CSS),
        dpr: device_pixel_ratio(),
    }
}

fn now_ms() -> f64 {
    web_sys::window()
        .and_then(|w| w.performance())
        .map_or(0.0, |p| p.now())
}

/// Size the backing store, reset the transform, and run `paint` on a device-pixel
/// area with the scale (device px per CSS px). Returns the frame in device px.
fn repaint<P>(canvas: &HtmlCanvasElement, size: Size, paint: &P) -> Option<Frame>
where
    P: Fn(&CanvasArea, f64) -> Option<Frame>,
{
    if size.w < 2.0 || size.h < 2.0 {
        return None; // hidden (display: none) or not laid out yet
    }
    let bw = (size.w * size.dpr).round().max(1.0);
    let bh = (size.h * size.dpr).round().max(1.0);
    // Setting width/height clears the canvas and resets the context state.
    if f64::from(canvas.width()) != bw {
        canvas.set_width(bw as u32);
    }
    if f64::from(canvas.height()) != bh {
        canvas.set_height(bh as u32);
    }
    let ctx: CanvasRenderingContext2d = canvas.get_context("2d").ok()??.dyn_into().ok()?;
    // Absolute transform (identity: one unit = one backing-store pixel), whatever was set before.
    ctx.set_transform(1.0, 0.0, 0.0, 1.0, 0.0, 0.0).ok()?;
    ctx.set_line_join("round");
    let backend = HiDpiCanvas::new(canvas)?;
    let area = backend.into_drawing_area();
    let frame = paint(&area, bw / size.w);
    let _ = area.present();
    frame
}

type SharedClosure = Rc<RefCell<Option<Closure<dyn FnMut()>>>>;

/// Watches `(resolution: Ndppx)` so a move to a screen with another pixel ratio
/// (or a zoom) re-measures; re-armed with the new ratio on every change.
#[derive(Clone)]
struct DprWatch {
    query: Rc<RefCell<Option<MediaQueryList>>>,
    handler: SharedClosure,
}

impl DprWatch {
    fn start(on_change: Rc<dyn Fn()>) -> Self {
        let watch = DprWatch {
            query: Rc::new(RefCell::new(None)),
            handler: Rc::new(RefCell::new(None)),
        };
        let again = watch.clone();
        let cb = Closure::<dyn FnMut()>::new(move || {
            on_change();
            again.arm();
        });
        *watch.handler.borrow_mut() = Some(cb);
        watch.arm();
        watch
    }

    fn arm(&self) {
        if let Some(old) = self.query.borrow_mut().take() {
            old.set_onchange(None);
        }
        let q = format!("(resolution: {}dppx)", device_pixel_ratio());
        let mql = web_sys::window().and_then(|w| w.match_media(&q).ok().flatten());
        if let (Some(mql), Some(cb)) = (mql, self.handler.borrow().as_ref()) {
            mql.set_onchange(Some(cb.as_ref().unchecked_ref()));
            *self.query.borrow_mut() = Some(mql);
        }
    }

    fn stop(&self) {
        if let Some(old) = self.query.borrow_mut().take() {
            old.set_onchange(None);
        }
        self.handler.borrow_mut().take();
    }
}

/// A plot on a canvas with class `plot`.
///
/// `paint` draws the whole plot at the given scale (device px per CSS px) and
/// returns its frame in device px; it runs inside an
/// effect, so the signals it reads (data, options, cursor) trigger a redraw,
/// as do size and pixel-ratio changes. `on_point` receives the data x under
/// the pointer; `on_step` receives −1/+1 (±10 with Shift) from the arrow
/// keys, so the readout works without a pointer too.
#[component]
pub fn PlotCanvas<P>(
    /// `data-testid` of the canvas.
    testid: &'static str,
    /// Accessible summary (the canvas is `role="img"`).
    #[prop(into)]
    label: Signal<String>,
    /// Paints the plot.
    paint: P,
    /// Pointer position in data units.
    on_point: Callback<f64>,
    /// Keyboard steps.
    on_step: Callback<i32>,
) -> impl IntoView
where
    P: Fn(&CanvasArea, f64) -> Option<Frame> + 'static,
{
    let canvas_ref = NodeRef::<Canvas>::new();
    let size = RwSignal::new(Size::default());
    let frame = StoredValue::new(None::<Frame>);
    let observer = StoredValue::new_local(None::<(ResizeObserver, Closure<dyn FnMut()>)>);
    let dpr_watch = StoredValue::new_local(None::<DprWatch>);
    let resize_listener = StoredValue::new_local(None::<WindowListenerHandle>);
    let draws = StoredValue::new(0_u64);

    canvas_ref.on_load(move |canvas: HtmlCanvasElement| {
        let remeasure: Rc<dyn Fn()> = {
            let canvas = canvas.clone();
            Rc::new(move || {
                let s = measure(&canvas);
                if size.get_untracked() != s {
                    size.set(s);
                }
            })
        };
        let on_resize = remeasure.clone();
        let cb = Closure::<dyn FnMut()>::new(move || on_resize());
        if let Ok(ro) = ResizeObserver::new(cb.as_ref().unchecked_ref()) {
            ro.observe(&canvas);
            observer.set_value(Some((ro, cb)));
        }
        dpr_watch.set_value(Some(DprWatch::start(remeasure.clone())));
        // Browser zoom changes the ratio and fires `resize`; a cheap extra trigger.
        let on_window = remeasure.clone();
        resize_listener.set_value(Some(window_event_listener(leptos::ev::resize, move |_| {
            on_window()
        })));
        // No measuring here: reading the size now would force a layout of the
        // page being built; the observer's first report (after the browser's
        // own layout, before it paints) brings the size.
    });
    on_cleanup(move || {
        observer.update_value(|o| {
            if let Some((ro, _)) = o.take() {
                ro.disconnect();
            }
        });
        dpr_watch.update_value(|w| {
            if let Some(w) = w.take() {
                w.stop();
            }
        });
        resize_listener.update_value(|h| {
            if let Some(h) = h.take() {
                h.remove();
            }
        });
    });

    // Sync with the canvas: the only effect here.
    // Nothing is drawn before the page's first paint (see `AppState::painted`).
    let painted = use_context::<crate::state::AppState>().map(|a| a.painted);
    Effect::new(move |_| {
        if painted.is_some_and(|p| !p.get()) {
            return;
        }
        let s = size.get();
        let Some(canvas) = canvas_ref.get() else {
            return;
        };
        let t0 = now_ms();
        let f = repaint(&canvas, s, &paint);
        if f.is_some() {
            frame.set_value(f);
            draws.update_value(|n| *n += 1);
            let t1 = now_ms();
            let _ = canvas.set_attribute("data-draw-count", &draws.get_value().to_string());
            let _ = canvas.set_attribute("data-draw-ms", &format!("{:.2}", t1 - t0));
            let _ = canvas.set_attribute("data-drawn-at", &format!("{t1:.2}"));
        }
    });

    let point = move |x: i32| {
        let ratio = size.get_untracked();
        let to_device = if ratio.w > 0.0 {
            (ratio.w * ratio.dpr).round() / ratio.w
        } else {
            1.0
        };
        if let Some(v) = frame
            .get_value()
            .and_then(|f| f.x_at(f64::from(x) * to_device))
        {
            on_point.run(v);
        }
    };
    view! {
        <canvas
            node_ref=canvas_ref
            class="plot"
            data-testid=testid
            role="img"
            tabindex="0"
            aria-label=move || label.get()
            on:pointermove=move |ev| point(ev.offset_x())
            on:pointerdown=move |ev| point(ev.offset_x())
            on:keydown=move |ev| {
                let step = if ev.shift_key() { 10 } else { 1 };
                let dir = match ev.key().as_str() {
                    "ArrowLeft" | "ArrowDown" => -step,
                    "ArrowRight" | "ArrowUp" => step,
                    _ => return,
                };
                ev.prevent_default();
                on_step.run(dir);
            }
        ></canvas>
    }
}
