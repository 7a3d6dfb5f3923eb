//! Native tests of the plot drawing code, painted into SVG strings.
use super::*;
use crate::plots::data::tests::{mixture_data, recipe_data};
use plotters_svg::SVGBackend;

fn svg_of(f: impl FnOnce(&DrawingArea<SVGBackend<'_>, Shift>)) -> String {
    let mut out = String::new();
    {
        let root = SVGBackend::with_string(&mut out, (720, 420)).into_drawing_area();
        f(&root);
        let _ = root.present();
    }
    out
}

fn hex(c: RGBColor) -> String {
    format!("#{:02X}{:02X}{:02X}", c.0, c.1, c.2)
}

/// Curves (polylines of more than 20 points) stroked in `c` at full opacity;
/// legend swatches and markers are shorter.
fn polylines(svg: &str, c: RGBColor) -> usize {
    let want = format!("stroke=\"{}\"", hex(c));
    svg.split("<polyline")
        .skip(1)
        .filter_map(|p| p.split("/>").next())
        .filter(|p| p.contains(&want) && p.contains("opacity=\"1\""))
        .filter(|p| p.matches(',').count() > 20)
        .count()
}

/// Every `<text>` content, trimmed.
fn texts(svg: &str) -> Vec<String> {
    svg.split("<text")
        .skip(1)
        .filter_map(|t| t.split_once('>'))
        .filter_map(|(_, rest)| rest.split("</text>").next())
        .map(|t| t.trim().to_string())
        .collect()
}

fn has_text(svg: &str, want: &str) -> bool {
    texts(svg).iter().any(|t| t == want)
}

fn has_text_starting(svg: &str, want: &str) -> bool {
    texts(svg).iter().any(|t| t.starts_with(want))
}

#[test]
fn species_svg_has_axes_one_path_per_species_legend_and_pk() {
    let d = recipe_data();
    let mut frame = None;
    let svg = svg_of(|a| frame = draw_species(a, &d, Quantity::Fraction, None, 1.0).ok());
    let frame = frame.unwrap_or_else(|| unreachable!("drawing failed"));
    assert!(has_text(&svg, "pH"), "x-axis label");
    assert!(svg.contains("fraction of system total"), "y-axis label");
    for (i, s) in d.series.iter().enumerate() {
        assert_eq!(
            polylines(&svg, species_color(i)),
            1,
            "one path for {}",
            s.name
        );
        assert!(has_text(&svg, &s.name), "legend {}", s.name);
    }
    assert!(has_text(&svg, "working pH 7.40"), "working pH in legend");
    assert!(has_text_starting(&svg, "pK₂ 7."), "pK₂ marker label");
    assert!(svg.contains("pKa at 37 °C"), "pK legend entry");
    assert!(frame.left > 0 && frame.right > frame.left && frame.bottom > frame.top);
    let mid = f64::from(frame.left + frame.right) / 2.0;
    assert!((frame.x_at(mid).unwrap_or(0.0) - 7.0).abs() < 0.05);
}

#[test]
fn concentration_mode_and_cursor() {
    let d = mixture_data();
    let svg = svg_of(|a| {
        let _ = draw_species(a, &d, Quantity::Concentration, Some(8.0), 1.0);
    });
    assert!(svg.contains("concentration, mmol/L"));
    assert_eq!(polylines(&svg, species_color(0)), 1);
    assert_eq!(polylines(&svg, species_color(1)), 1);
    assert_eq!(
        svg.matches(&format!("stroke=\"{}\"", hex(CURSOR))).count(),
        1,
        "cursor line"
    );
    assert!(svg.matches("<circle").count() >= 2, "cursor dots");
}

#[test]
fn capacity_svg() {
    let d = recipe_data();
    let svg = svg_of(|a| {
        let _ = draw_capacity(a, &d, None, 1.0);
    });
    assert!(has_text(&svg, "pH"));
    assert!(svg.contains("β, mmol/(L·pH)"));
    assert!(svg.contains("buffer capacity β"));
    assert!(polylines(&svg, CAPACITY) >= 1);
    assert!(has_text_starting(&svg, "pK₂ 7."));
    assert!(svg.contains("working pH 7.40 (β = "));
}

#[test]
fn titration_svg() {
    let d = recipe_data();
    let svg = svg_of(|a| {
        let _ = draw_titration(a, &d, Some(10.0), 1.0);
    });
    assert!(svg.contains("HCl added"));
    assert!(has_text(&svg, "pH"));
    assert_eq!(polylines(&svg, TITRATION), 1);
    assert!(has_text_starting(&svg, "pK₂ 7."));
    assert!(svg.contains("start: nothing added, pH 7.40"));
}

#[test]
fn scale_multiplies_fonts_and_widths() {
    let d = recipe_data();
    let at = |scale: f64| {
        let mut out = String::new();
        {
            let w = (720.0 * scale) as u32;
            let h = (420.0 * scale) as u32;
            let root = SVGBackend::with_string(&mut out, (w, h)).into_drawing_area();
            let _ = draw_species(&root, &d, Quantity::Fraction, None, scale);
        }
        out
    };
    let one = at(1.0);
    let two = at(2.0);
    let size = |svg: &str| {
        svg.split("font-size=\"")
            .nth(1)
            .and_then(|r| r.split('"').next())
            .and_then(|v| v.parse::<f64>().ok())
            .unwrap_or(0.0)
    };
    assert!((size(&two) - 2.0 * size(&one)).abs() < 1e-6);
    assert!(two.contains("stroke-width=\"4\""), "2× curve width");
    assert_eq!(polylines(&two, species_color(0)), 1);
}

#[test]
fn several_systems_get_labelled_entries_and_per_system_pks() {
    use solver::mixture::{ComponentSpec, MixtureSpec};
    let comp = |system: &str, conc_m: f64| ComponentSpec {
        system: system.into(),
        form: None,
        conc_m,
    };
    let src = super::super::data::Source {
        kind: solver::document::PlotSource::Mixture,
        mixture: MixtureSpec {
            temperature_c: 25.0,
            activity: solver::equilibrium::activity::ActivityModel::Davies,
            components: vec![comp("citrate", 0.02), comp("acetate", 0.03)],
            additives: vec![],
        },
        custom: vec![],
    };
    let d = super::super::data::compute(&src).unwrap_or_else(|e| unreachable!("{e}"));
    assert_eq!(d.series.len(), 6);
    let svg = svg_of(|a| {
        let _ = draw_species(a, &d, Quantity::Fraction, None, 1.0);
    });
    for ser in &d.series {
        assert!(has_text(&svg, &d.label(ser)), "legend {}", d.label(ser));
    }
    assert!(has_text(&svg, "CH₃COOH (Acetate)"));
    assert!(has_text_starting(&svg, "pKa Citrate (25 °C, I = 0): 3."));
    assert!(has_text_starting(&svg, "pKa Acetate (25 °C, I = 0): 4.7"));
    // First system solid (one path per species), second dashed (many short paths).
    assert_eq!(polylines(&svg, species_color(0)), 1);
    assert!(
        svg.matches(&format!("stroke=\"{}\"", hex(species_color(4))))
            .count()
            > 5
    );
}

#[test]
fn clip_top_cuts_runs() {
    let xs = [0.0, 1.0, 2.0, 3.0, 4.0];
    let ys = [5.0, 1.0, 1.0, 5.0, 1.0];
    let runs = clip_top(&xs, &ys, 2.0);
    assert_eq!(runs.len(), 2);
    let first = runs.first().cloned().unwrap_or_default();
    assert_eq!(first.first().copied(), Some((0.75, 2.0)));
    assert_eq!(first.last().copied(), Some((2.25, 2.0)));
}

fn luminance(c: RGBColor) -> f64 {
    let ch = |v: u8| {
        let s = f64::from(v) / 255.0;
        if s <= 0.040_45 {
            s / 12.92
        } else {
            ((s + 0.055) / 1.055).powf(2.4)
        }
    };
    0.2126 * ch(c.0) + 0.7152 * ch(c.1) + 0.0722 * ch(c.2)
}

#[test]
fn palette_contrast_on_white_is_at_least_3_to_1() {
    for c in PALETTE
        .iter()
        .chain([INK, MUTED, CAPACITY, TITRATION, METER, BAND].iter())
    {
        let ratio = 1.05 / (luminance(*c) + 0.05);
        assert!(ratio >= 3.0, "{c:?}: {ratio:.2}");
    }
}

#[test]
fn summaries_name_the_numbers() {
    let d = recipe_data();
    assert!(species_summary(&d).contains("working pH 7.40"));
    assert!(capacity_summary(&d).contains("β = "));
    assert!(titration_summary(&d).contains("mmol/L HCl"));
    assert_eq!(tick(0.5), "0.5");
    assert_eq!(tick(10.0), "10");
    assert_eq!(subscript(12), "₁₂");
}

fn recipe_marks(meter: Option<(f64, f64)>) -> Marks {
    Marks {
        target: 7.4,
        tolerance: 0.05,
        meter,
    }
}

#[test]
fn recipe_plot_marks_target_tolerance_and_meter_over_a_narrow_range() {
    let d = recipe_data();
    let m = recipe_marks(Some((7.52, 22.0)));
    let mut frame = None;
    let svg = svg_of(|a| frame = draw_recipe_chemistry(a, &d, &m, 1.0).ok());
    let frame = frame.unwrap_or_else(|| unreachable!("drawing failed"));
    assert_eq!(frame.x, (5.4, 9.4), "4 pH wide, centred on the target");
    // Legend of the marks.
    assert!(has_text(&svg, "target pH 7.40"));
    assert!(has_text(&svg, "tolerance ±0.05 (7.35–7.45)"));
    assert!(has_text(&svg, "meter reads 7.52 at 22 °C"));
    assert!(has_text(&svg, "meter"), "label beside the meter line");
    assert!(
        !svg.contains("working pH"),
        "the marks replace the working-pH line"
    );
    // The tolerance window: a light filled box in the band colour, once per panel
    // (plus the legend swatch).
    let band = format!("fill=\"{}\"", hex(BAND));
    let boxes = svg
        .split("<rect")
        .skip(1)
        .filter(|r| r.contains(&band) && r.contains("opacity=\"0.16\""))
        .count();
    assert_eq!(boxes, 3, "legend swatch + species panel + capacity panel");
    // The meter line is dashed: many short strokes in its colour, in both panels.
    let meter_strokes = svg.matches(&format!("stroke=\"{}\"", hex(METER))).count();
    assert!(meter_strokes > 8, "dashed meter line: {meter_strokes}");
    // Same curves as the Species tab, cut to the range: one path per species, and β.
    for (i, _) in d.series.iter().enumerate().filter(|(_, s)| {
        s.fraction
            .iter()
            .zip(d.grid.iter())
            .any(|(f, x)| (5.4..=9.4).contains(x) && *f > 0.01)
    }) {
        assert_eq!(polylines(&svg, species_color(i)), 1, "species {i}");
    }
    assert!(polylines(&svg, CAPACITY) >= 1);
    assert!(svg.contains("β, mmol/(L·pH)") && svg.contains("fraction of system total"));
    // Ticks every half pH inside the range; nothing from outside it.
    assert!(has_text(&svg, "6") && has_text(&svg, "9"));
    assert!(!has_text(&svg, "12") && !has_text(&svg, "3"));
    assert!(has_text_starting(&svg, "pK₂ 7."), "pK inside the range");
    assert!(
        !has_text_starting(&svg, "pK₁ 2."),
        "pK outside the range left out"
    );
}

#[test]
fn recipe_plot_without_meter_and_at_the_edges() {
    let d = recipe_data();
    let svg = svg_of(|a| {
        let _ = draw_recipe_chemistry(a, &d, &recipe_marks(None), 2.0);
    });
    assert_eq!(
        svg.matches(&format!("stroke=\"{}\"", hex(METER))).count(),
        0,
        "no meter mark when it reads the working pH"
    );
    assert!(!svg.contains("meter reads"));
    assert_eq!(recipe_window(1.0), (0.0, 4.0));
    assert_eq!(recipe_window(13.5), (10.0, 14.0));
    assert_eq!(recipe_window(f64::NAN), (5.0, 9.0));
    let text = recipe_summary(&d, &recipe_marks(Some((7.52, 22.0))));
    assert!(
        text.contains("target pH 7.40") && text.contains("meter reads 7.52 at 22 °C"),
        "{text}"
    );
    assert!(METER != BAND && luminance(METER) < 0.3);
}
