//! SVG charts (plotters, SVG backend: text is left to the viewer's fonts, so no font
//! files are needed). Colours are from the Okabe–Ito palette (M. Okabe and K. Ito,
//! "Color Universal Design", 2002), distinguishable with the common colour-vision
//! deficiencies.

use plotters::prelude::*;

use crate::commands::bend::BendDoc;

/// Okabe–Ito blue.
const BLUE: RGBColor = RGBColor(0x00, 0x72, 0xB2);
/// Okabe–Ito vermillion.
const VERMILLION: RGBColor = RGBColor(0xD5, 0x5E, 0x00);

fn range(values: impl Iterator<Item = f64>) -> (f64, f64) {
    let (lo, hi) = values.fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| (a.min(v), b.max(v)));
    if !lo.is_finite() {
        return (0.0, 1.0);
    }
    let lo = lo.min(0.0);
    let hi = if hi > lo { hi } else { lo + 1.0 };
    (lo, hi + 0.05 * (hi - lo))
}

/// Bend angle and blocked force against pressure, one panel each.
///
/// # Errors
/// Drawing failures, as text.
pub fn bend_svg(doc: &BendDoc) -> Result<String, String> {
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (720, 720)).into_drawing_area();
        root.fill(&WHITE).map_err(|e| e.to_string())?;
        let (top, bottom) = root.split_vertically(360);
        let (p_lo, p_hi) = range(doc.points.iter().map(|p| p.pressure_kpa));
        let bend: Vec<(f64, f64)> =
            doc.points.iter().filter_map(|p| p.bend_deg.map(|b| (p.pressure_kpa, b))).collect();
        let force: Vec<(f64, f64)> =
            doc.points.iter().filter_map(|p| p.blocked_force_n.map(|f| (p.pressure_kpa, f))).collect();
        let panels =
            [(&top, "bend angle (deg)", BLUE, bend), (&bottom, "blocked tip force (N)", VERMILLION, force)];
        for (i, (area, label, colour, data)) in panels.into_iter().enumerate() {
            let (y_lo, y_hi) = range(data.iter().map(|d| d.1));
            let caption = if i == 0 {
                format!("actuator \"{}\" ({} model)", doc.actuator, doc.model)
            } else {
                String::new()
            };
            let mut chart = ChartBuilder::on(area)
                .caption(caption, ("sans-serif", 18))
                .margin(12)
                .x_label_area_size(40)
                .y_label_area_size(60)
                .build_cartesian_2d(p_lo..p_hi, y_lo..y_hi)
                .map_err(|e| e.to_string())?;
            chart
                .configure_mesh()
                .x_desc("pressure (kPa)")
                .y_desc(label)
                .draw()
                .map_err(|e| e.to_string())?;
            chart
                .draw_series(LineSeries::new(data.iter().copied(), colour.stroke_width(2)))
                .map_err(|e| e.to_string())?;
            chart
                .draw_series(data.iter().map(|&(x, y)| Circle::new((x, y), 3, colour.filled())))
                .map_err(|e| e.to_string())?;
        }
        root.present().map_err(|e| e.to_string())?;
    }
    Ok(svg)
}
