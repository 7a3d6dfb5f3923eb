//! Browser tests of the Species and capacity workspace: canvases sized to CSS × devicePixelRatio, readout, source toggle.
//!
//! The component is mounted into its own container with a fresh `AppState`
//! and a minimal copy of the page's canvas rule (width 100 %, fixed height),
//! since the test page has no stylesheet.
#![cfg(target_arch = "wasm32")]
#![allow(
    clippy::unwrap_used,
    clippy::expect_used,
    clippy::indexing_slicing,
    missing_docs
)]

use app::state::AppState;
use app::workspaces::species::SpeciesWorkspace;
use leptos::prelude::*;
use solver::document::PlotSource;
use wasm_bindgen::JsCast;
use wasm_bindgen_test::*;
use web_sys::{Element, HtmlCanvasElement, HtmlElement};

wasm_bindgen_test_configure!(run_in_browser);

fn mount_ws(state: AppState) -> Element {
    let doc = document();
    if doc.get_element_by_id("plots-test-style").is_none() {
        let style = doc.create_element("style").unwrap();
        style.set_id("plots-test-style");
        style.set_text_content(Some(
            "canvas.plot{display:block;width:100%;height:300px} .plots-host{width:720px}",
        ));
        doc.head().unwrap().append_child(&style).unwrap();
    }
    let host: HtmlElement = doc.create_element("div").unwrap().unchecked_into();
    host.set_class_name("plots-host");
    doc.body().unwrap().append_child(&host).unwrap();
    let handle = leptos::mount::mount_to(host.clone(), move || {
        provide_context(state);
        view! { <SpeciesWorkspace /> }
    });
    std::mem::forget(handle);
    host.unchecked_into()
}

/// Let effects, the ResizeObserver and a frame or two run.
async fn settle() {
    for _ in 0..4 {
        leptos::task::tick().await;
    }
    for _ in 0..3 {
        let p = js_sys::Promise::new(&mut |resolve, _| {
            window().request_animation_frame(&resolve).unwrap();
        });
        wasm_bindgen_futures::JsFuture::from(p).await.unwrap();
        leptos::task::tick().await;
    }
}

fn canvas(root: &Element, testid: &str) -> HtmlCanvasElement {
    root.query_selector(&format!("canvas[data-testid=\"{testid}\"]"))
        .unwrap()
        .expect("canvas present")
        .unchecked_into()
}

fn text(root: &Element, testid: &str) -> Option<String> {
    root.query_selector(&format!("[data-testid=\"{testid}\"]"))
        .unwrap()
        .map(|e| e.text_content().unwrap_or_default())
}

#[wasm_bindgen_test]
async fn canvases_have_a_device_pixel_backing_store_and_a_summary() {
    let root = mount_ws(AppState::new());
    settle().await;
    let dpr = window().device_pixel_ratio();
    for id in ["plot-species", "plot-capacity", "plot-titration"] {
        let c = canvas(&root, id);
        let rect = c.get_bounding_client_rect();
        assert!(rect.width() > 100.0, "{id} is laid out");
        assert_eq!(
            f64::from(c.width()),
            (rect.width() * dpr).round(),
            "{id} width"
        );
        assert_eq!(
            f64::from(c.height()),
            (rect.height() * dpr).round(),
            "{id} height"
        );
        assert_eq!(c.get_attribute("role").as_deref(), Some("img"));
        assert!(c.class_list().contains("plot"));
        let label = c.get_attribute("aria-label").unwrap_or_default();
        assert!(
            label.contains("7.40"),
            "{id} summary names the working pH: {label}"
        );
        assert!(c.get_attribute("data-draw-count").is_some(), "{id} drawn");
    }
}

#[wasm_bindgen_test]
async fn pointer_readout_and_source_toggle() {
    let state = AppState::new();
    let root = mount_ws(state);
    settle().await;
    let species = canvas(&root, "plot-species");
    let rect = species.get_bounding_client_rect();
    let init = web_sys::PointerEventInit::new();
    init.set_bubbles(true);
    init.set_client_x((rect.left() + rect.width() * 0.5) as i32);
    init.set_client_y((rect.top() + rect.height() * 0.5) as i32);
    let ev = web_sys::PointerEvent::new_with_event_init_dict("pointermove", &init).unwrap();
    species.dispatch_event(&ev).unwrap();
    settle().await;
    let readout = text(&root, "plot-readout").unwrap();
    assert!(readout.starts_with("pH "), "{readout}");
    assert!(readout.contains("mM/pH"), "{readout}");

    let before: u64 = canvas(&root, "plot-titration")
        .get_attribute("data-draw-count")
        .and_then(|v| v.parse().ok())
        .unwrap();
    let radio: HtmlElement = root
        .query_selector("[data-testid=\"plot-source-mixture\"]")
        .unwrap()
        .unwrap()
        .unchecked_into();
    radio.click();
    settle().await;
    assert_eq!(
        state.design.get_untracked().plot_source,
        PlotSource::Mixture
    );
    assert!(text(&root, "plot-context").unwrap().contains("Tris"));
    let after: u64 = canvas(&root, "plot-titration")
        .get_attribute("data-draw-count")
        .and_then(|v| v.parse().ok())
        .unwrap();
    assert!(after > before, "titration redrawn for the mixture");
}

#[wasm_bindgen_test]
async fn a_recipe_without_solution_shows_the_reason() {
    let state = AppState::new();
    state
        .design
        .update(|d| d.recipe.system = "no-such-system".into());
    let root = mount_ws(state);
    settle().await;
    let err = text(&root, "plot-error").unwrap();
    assert!(err.contains("recipe"), "{err}");
    let label = canvas(&root, "plot-species")
        .get_attribute("aria-label")
        .unwrap();
    assert!(label.starts_with("No plot"), "{label}");
}

/// A chart with a grid, ticks, a dashed line, a curve and text, drawn by `backend`.
fn draw_test_chart<DB: plotters::prelude::DrawingBackend>(backend: DB) {
    use plotters::prelude::*;
    let root = backend.into_drawing_area();
    root.fill(&WHITE).unwrap();
    let mut chart = ChartBuilder::on(&root)
        .margin(20)
        .x_label_area_size(40)
        .y_label_area_size(50)
        .build_cartesian_2d(0.0..14.0, 0.0..1.0)
        .unwrap();
    chart
        .configure_mesh()
        .bold_line_style(RGBColor(0xe3, 0xe7, 0xeb))
        .light_line_style(TRANSPARENT)
        .x_desc("pH")
        .draw()
        .unwrap();
    chart
        .draw_series(DashedLineSeries::new(
            vec![(7.2, 0.0), (7.2, 1.0)],
            10,
            8,
            RGBColor(0x5f, 0x66, 0x70).stroke_width(2),
        ))
        .unwrap();
    chart
        .draw_series(LineSeries::new(
            (0..=140).map(|i| {
                let x = f64::from(i) / 10.0;
                (x, 1.0 / (1.0 + 10f64.powf(x - 7.2)))
            }),
            RGBColor(0x0f, 0x6e, 0x75).stroke_width(3),
        ))
        .unwrap();
    chart
        .draw_series(std::iter::once(PathElement::new(
            vec![(3.0, 0.2), (11.0, 0.2)],
            RGBColor(0, 0, 0).mix(0.5).stroke_width(2),
        )))
        .unwrap();
    root.present().unwrap();
}

fn pixels(c: &HtmlCanvasElement) -> Vec<u8> {
    let ctx: web_sys::CanvasRenderingContext2d =
        c.get_context("2d").unwrap().unwrap().unchecked_into();
    ctx.get_image_data(0.0, 0.0, f64::from(c.width()), f64::from(c.height()))
        .unwrap()
        .data()
        .0
}

/// The page's wrapper strokes runs of same-style lines as one path: the pixels
/// are those plotters-canvas gives drawing each line on its own.
#[wasm_bindgen_test]
fn batched_lines_draw_the_same_pixels_as_plotters_canvas() {
    let doc = document();
    let make = || {
        let c: HtmlCanvasElement = doc.create_element("canvas").unwrap().unchecked_into();
        c.set_width(900);
        c.set_height(600);
        c
    };
    let (ours, theirs) = (make(), make());
    draw_test_chart(app::plots::canvas::HiDpiCanvas::new(&ours).unwrap());
    draw_test_chart(plotters_canvas::CanvasBackend::with_canvas_object(theirs.clone()).unwrap());
    let (a, b) = (pixels(&ours), pixels(&theirs));
    assert_eq!(a.len(), b.len());
    let differing = a.iter().zip(&b).filter(|(x, y)| x != y).count();
    assert_eq!(differing, 0, "{differing} channel values differ");
    // The chart drew something (grid, curve and text are there).
    assert!(a.chunks(4).filter(|p| p[0] < 128).count() > 1000);
}
