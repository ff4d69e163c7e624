//! SVG charts of the review (plotters' SVG backend, which escapes the text it draws).
//! Colours from the Okabe–Ito palette (M. Okabe and K. Ito, "Color Universal Design",
//! 2002), one per candidate.

use plotters::prelude::*;

/// Okabe–Ito colours for up to six candidates.
pub const PALETTE: [RGBColor; 6] = [
    RGBColor(0x00, 0x72, 0xB2),
    RGBColor(0xD5, 0x5E, 0x00),
    RGBColor(0x00, 0x9E, 0x73),
    RGBColor(0xCC, 0x79, 0xA7),
    RGBColor(0xE6, 0x9F, 0x00),
    RGBColor(0x56, 0xB4, 0xE9),
];

/// Horizontal bars: for each object (rows, top to bottom) and candidate, its pressure
/// window in kPa; `p_max` is the axis end.
///
/// # Errors
/// Drawing failures, as text.
pub fn windows_svg(
    objects: &[String],
    candidates: &[String],
    windows: &[Vec<Option<(f64, f64)>>],
    p_max: f64,
) -> Result<String, String> {
    let rows = objects.len().max(1);
    let height = 80 + 34 * rows as u32 + 22 * candidates.len() as u32;
    let mut svg = String::new();
    {
        let root = SVGBackend::with_string(&mut svg, (760, height)).into_drawing_area();
        root.fill(&WHITE).map_err(|e| e.to_string())?;
        let mut chart = ChartBuilder::on(&root)
            .margin(12)
            .x_label_area_size(36)
            .y_label_area_size(130)
            .build_cartesian_2d(0.0..p_max.max(1.0), 0.0..rows as f64)
            .map_err(|e| e.to_string())?;
        chart
            .configure_mesh()
            .x_desc("supply pressure (kPa)")
            .y_labels(0)
            .disable_y_mesh()
            .draw()
            .map_err(|e| e.to_string())?;
        // object names beside their rows (the axis's own labels fall on tick values)
        for (o, name) in objects.iter().enumerate() {
            let (_, y) = chart.backend_coord(&(0.0, rows as f64 - o as f64 - 0.5));
            root.draw(&Text::new(name.clone(), (16, y - 7), ("sans-serif", 14)))
                .map_err(|e| e.to_string())?;
        }
        let n = candidates.len().max(1) as f64;
        for (c, name) in candidates.iter().enumerate() {
            let colour = PALETTE[c % PALETTE.len()];
            let bars: Vec<Rectangle<(f64, f64)>> = windows
                .iter()
                .enumerate()
                .filter_map(|(o, per)| {
                    per.get(c).copied().flatten().map(|(lo, hi)| {
                        let top = rows as f64 - o as f64 - 0.1 - 0.8 * c as f64 / n;
                        let bottom = top - 0.8 / n;
                        // a one-pressure window still shows as a sliver
                        let hi = if hi - lo < 0.004 * p_max { lo + 0.004 * p_max } else { hi };
                        Rectangle::new([(lo, bottom), (hi, top)], colour.filled())
                    })
                })
                .collect();
            chart
                .draw_series(bars)
                .map_err(|e| e.to_string())?
                .label(name.clone())
                .legend(move |(x, y)| Rectangle::new([(x, y - 5), (x + 14, y + 5)], colour.filled()));
        }
        chart
            .configure_series_labels()
            .background_style(WHITE.mix(0.8))
            .border_style(BLACK)
            .position(SeriesLabelPosition::LowerRight)
            .draw()
            .map_err(|e| e.to_string())?;
        root.present().map_err(|e| e.to_string())?;
    }
    Ok(svg)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// One bar per window, labels escaped by the backend.
    #[test]
    fn window_chart_has_a_bar_per_window_and_escapes_names() {
        let svg = windows_svg(
            &["egg <b>".into(), "jar".into()],
            &["a & b".into(), "c".into()],
            &[vec![Some((10.0, 30.0)), None], vec![Some((20.0, 40.0)), Some((25.0, 25.0))]],
            60.0,
        )
        .unwrap();
        assert!(svg.starts_with("<svg"), "{}", &svg[..50]);
        assert!(svg.contains("egg &lt;b&gt;") && !svg.contains("egg <b>"));
        assert!(svg.contains("a &amp; b"));
        // the three windows, plus two legend swatches, plus the background
        let filled = svg.matches("<rect").count();
        assert!(filled >= 3 + 2, "{filled} rects");
    }
}
