//! Cut templates at 1:1 scale as SVG pages that print on both A4 and US Letter.
//!
//! A page is 195 × 265 mm, inside both A4 (210 × 297 mm) and Letter (215.9 × 279.4 mm)
//! with a printer margin of at least 6 mm; the SVG's `width`/`height` are in mm and its
//! `viewBox` is the same numbers, so one user unit is one millimetre. Each page carries
//! a 100 mm and a 4 in scale bar: print at 100 % ("actual size", no fit-to-page) and
//! measure them. Pieces are placed in rows (largest first), turned when that fits better;
//! a rectangle longer than a page is split into parts with a dashed join line. Output is
//! deterministic (fixed order, fixed decimals).

use std::fmt::Write as _;

use grasp_core::fab::{Notch, Outline, Piece};

/// Page width (mm).
pub const PAGE_W: f64 = 195.0;
/// Page height (mm).
pub const PAGE_H: f64 = 265.0;
// A4 is 210 × 297 mm, Letter 215.9 × 279.4 mm: the page leaves a 6 mm printer margin on both.
const _: () = assert!(PAGE_W <= 210.0 - 12.0 && PAGE_H <= 279.4 - 12.0);
const MARGIN: f64 = 8.0;
/// Header (title) band (mm).
const HEADER: f64 = 12.0;
/// Footer (scale bars) band (mm).
const FOOTER: f64 = 20.0;
/// Room for a piece's label above it (mm).
const LABEL: f64 = 5.0;
/// Width of one label character at the label's 2.6 mm font size, generously (mm).
const LABEL_CHAR: f64 = 1.45;
/// Gap between pieces (mm).
const GAP: f64 = 4.0;

/// A piece as drawn: outline in mm, label, and whether it is a part of a split piece.
#[derive(Debug, Clone)]
struct Item {
    label: String,
    outline: Outline,
    /// `(width, height)` as drawn (mm), after turning.
    size: (f64, f64),
    turned: bool,
    /// Draw a dashed join line on the right edge (a split piece continues there).
    joins: bool,
}

fn mm(outline: Outline) -> Outline {
    match outline {
        Outline::Rect { width, height } => Outline::Rect { width: width * 1e3, height: height * 1e3 },
        Outline::Notched { width, height, notch: Notch::HalfDisk { radius } } => Outline::Notched {
            width: width * 1e3,
            height: height * 1e3,
            notch: Notch::HalfDisk { radius: radius * 1e3 },
        },
    }
}

/// Escapes text for XML.
pub fn xml_escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&apos;"),
            c if (c as u32) < 0x20 && c != '\t' => out.push(' '),
            c => out.push(c),
        }
    }
    out
}

/// Splits and turns the pieces so each fits the drawing area.
fn items(pieces: &[Piece]) -> Result<Vec<Item>, String> {
    let area_w = PAGE_W - 2.0 * MARGIN;
    let area_h = PAGE_H - 2.0 * MARGIN - HEADER - FOOTER - LABEL;
    let mut out = Vec::new();
    for p in pieces {
        let outline = mm(p.outline);
        let (w, h) = outline.size();
        let label =
            |extra: &str, w: f64, h: f64| format!("{}{extra} - cut {} - {w:.1} x {h:.1} mm", p.name, p.count);
        let fits = |a: f64, b: f64| a <= area_w && b <= area_h;
        if fits(w, h) && (w >= h || !fits(h, w)) {
            out.push(Item { label: label("", w, h), outline, size: (w, h), turned: false, joins: false });
        } else if fits(h, w) {
            out.push(Item { label: label("", w, h), outline, size: (h, w), turned: true, joins: false });
        } else {
            // too long for a page either way: only plain strips are split
            let Outline::Rect { .. } = outline else {
                return Err(format!("{}: {w:.1} x {h:.1} mm does not fit on a page", p.name));
            };
            let (long, short) = if w >= h { (w, h) } else { (h, w) };
            if short > area_h.min(area_w) {
                return Err(format!("{}: {w:.1} x {h:.1} mm does not fit on a page", p.name));
            }
            let parts = (long / (area_w - 1.0)).ceil() as usize;
            let piece_len = long / parts as f64;
            for k in 0..parts {
                let extra = format!(" (part {} of {parts}, join at the dashed edge)", k + 1);
                out.push(Item {
                    label: label(&extra, long, short),
                    outline: Outline::Rect { width: piece_len, height: short },
                    size: (piece_len, short),
                    turned: false,
                    joins: k + 1 < parts,
                });
            }
        }
    }
    Ok(out)
}

/// The pages of templates for `pieces`, titled `title`.
///
/// # Errors
/// A piece that cannot fit on any page (a profile larger than the page).
pub fn template_pages(title: &str, pieces: &[Piece]) -> Result<Vec<String>, String> {
    let mut items = items(pieces)?;
    // tallest first, then by label for a fixed order
    items.sort_by(|a, b| b.size.1.total_cmp(&a.size.1).then_with(|| a.label.cmp(&b.label)));
    let top = MARGIN + HEADER;
    let bottom = PAGE_H - MARGIN - FOOTER;
    let mut pages: Vec<Vec<(Item, f64, f64)>> = vec![Vec::new()];
    let (mut x, mut y, mut row_h) = (MARGIN, top, 0.0f64);
    for it in items {
        let (w, h) = it.size;
        // the label sits above the piece and may be wider than it
        let label_w = (it.label.chars().count() as f64 * LABEL_CHAR).min(PAGE_W - 2.0 * MARGIN);
        let w = w.max(label_w);
        if x + w > PAGE_W - MARGIN + 1e-9 {
            x = MARGIN;
            y += row_h + GAP;
            row_h = 0.0;
        }
        if y + LABEL + h > bottom + 1e-9 {
            pages.push(Vec::new());
            x = MARGIN;
            y = top;
            row_h = 0.0;
        }
        if let Some(page) = pages.last_mut() {
            page.push((it, x, y));
        }
        x += w + GAP;
        row_h = row_h.max(LABEL + h);
    }
    let n = pages.len();
    Ok(pages.iter().enumerate().map(|(i, page)| page_svg(title, i + 1, n, page)).collect())
}

fn page_svg(title: &str, page: usize, pages: usize, items: &[(Item, f64, f64)]) -> String {
    let mut s = String::new();
    let _ = writeln!(
        s,
        r#"<svg xmlns="http://www.w3.org/2000/svg" width="{PAGE_W}mm" height="{PAGE_H}mm" viewBox="0 0 {PAGE_W} {PAGE_H}" font-family="sans-serif">"#
    );
    let _ = writeln!(s, r#"<rect x="0" y="0" width="{PAGE_W}" height="{PAGE_H}" fill="white"/>"#);
    let _ = writeln!(
        s,
        r#"<text x="{MARGIN}" y="{:.1}" font-size="4">{} - cut templates, page {page} of {pages}</text>"#,
        MARGIN + 5.0,
        xml_escape(title)
    );
    let _ = writeln!(
        s,
        r#"<text x="{MARGIN}" y="{:.1}" font-size="2.6">Scale 1:1. Print at 100 % (actual size, no fit-to-page) on A4 or Letter; measure the scale bars before cutting.</text>"#,
        MARGIN + 10.0
    );
    for (it, x, y) in items {
        let _ = writeln!(
            s,
            r#"<text x="{x:.2}" y="{:.2}" font-size="2.6">{}</text>"#,
            y + LABEL - 1.2,
            xml_escape(&it.label)
        );
        let (ox, oy) = (*x, y + LABEL);
        draw_outline(&mut s, it, ox, oy);
    }
    scale_bars(&mut s);
    s.push_str("</svg>\n");
    s
}

fn draw_outline(s: &mut String, it: &Item, x: f64, y: f64) {
    let stroke = r#"fill="none" stroke="black" stroke-width="0.3""#;
    match it.outline {
        Outline::Rect { .. } => {
            let (w, h) = it.size;
            let _ = writeln!(
                s,
                r#"<rect class="piece" x="{x:.2}" y="{y:.2}" width="{w:.3}" height="{h:.3}" {stroke}/>"#
            );
            if it.joins {
                let _ = writeln!(
                    s,
                    r#"<line x1="{:.2}" y1="{y:.2}" x2="{:.2}" y2="{:.2}" stroke="black" stroke-width="0.3" stroke-dasharray="2 1.5"/>"#,
                    x + w,
                    x + w,
                    y + h
                );
            }
        }
        Outline::Notched { width, height, notch: Notch::HalfDisk { radius } } => {
            // drawn upright in its own frame, then turned if needed: a rectangle with a
            // half-disk bite from the middle of its top edge
            let cx = width / 2.0;
            let d = format!(
                "M 0 0 L {:.3} 0 A {radius:.3} {radius:.3} 0 0 0 {:.3} 0 L {width:.3} 0 L {width:.3} {height:.3} L 0 {height:.3} Z",
                cx - radius,
                cx + radius
            );
            let transform = if it.turned {
                format!("translate({:.2} {y:.2}) rotate(90)", x + height)
            } else {
                format!("translate({x:.2} {y:.2})")
            };
            let _ = writeln!(s, r#"<path class="piece" transform="{transform}" d="{d}" {stroke}/>"#);
        }
    }
}

fn scale_bars(s: &mut String) {
    let y = PAGE_H - MARGIN - 12.0;
    bar(s, y, 100.0, 10, "100 mm");
    bar(s, y + 8.0, 101.6, 4, "4 in");
}

fn bar(s: &mut String, y: f64, length: f64, ticks: usize, label: &str) {
    let x = MARGIN;
    let _ = writeln!(
        s,
        r#"<line class="scale-bar" x1="{x}" y1="{y:.2}" x2="{:.2}" y2="{y:.2}" stroke="black" stroke-width="0.4"/>"#,
        x + length
    );
    for i in 0..=ticks {
        let tx = x + length * i as f64 / ticks as f64;
        let _ = writeln!(
            s,
            r#"<line x1="{tx:.2}" y1="{:.2}" x2="{tx:.2}" y2="{y:.2}" stroke="black" stroke-width="0.3"/>"#,
            y - 2.0
        );
    }
    let _ =
        writeln!(s, r#"<text x="{:.2}" y="{:.2}" font-size="3">{label}</text>"#, x + length + 3.0, y + 1.0);
}

#[cfg(test)]
mod tests {
    use super::*;

    fn rect(name: &str, w: f64, h: f64) -> Piece {
        Piece { name: name.into(), count: 1, outline: Outline::Rect { width: w, height: h } }
    }

    /// The page fits A4 and Letter, one user unit is one mm, the scale bar is 100 units
    /// long, and every piece is drawn at its own size.
    #[test]
    fn pages_are_one_to_one_and_fit_a4_and_letter() {
        let pieces = [rect("a <&>", 0.1234, 0.0135), rect("b", 0.04, 0.03)];
        let pages = template_pages("t", &pieces).unwrap();
        assert_eq!(pages.len(), 1);
        let doc = roxmltree::Document::parse(&pages[0]).unwrap();
        let root = doc.root_element();
        assert_eq!(root.attribute("width"), Some("195mm"));
        assert_eq!(root.attribute("viewBox"), Some("0 0 195 265"));
        let rects: Vec<(f64, f64)> = doc
            .descendants()
            .filter(|n| n.attribute("class") == Some("piece"))
            .map(|n| {
                (
                    n.attribute("width").unwrap().parse().unwrap(),
                    n.attribute("height").unwrap().parse().unwrap(),
                )
            })
            .collect();
        assert!(rects.contains(&(123.4, 13.5)) && rects.contains(&(40.0, 30.0)), "{rects:?}");
        let bar = doc.descendants().find(|n| n.attribute("class") == Some("scale-bar")).unwrap();
        let x = |k: &str| bar.attribute(k).unwrap().parse::<f64>().unwrap();
        assert!((x("x2") - x("x1") - 100.0).abs() < 1e-9);
        assert!(pages[0].contains("a &lt;&amp;&gt;"));
    }

    /// A strip longer than the page is split into parts that add up to its length, and
    /// many pieces spill onto more pages, each within the page.
    #[test]
    fn long_strips_split_and_pieces_spill_over_pages() {
        let pages = template_pages("t", &[rect("long", 0.400, 0.02)]).unwrap();
        let doc = roxmltree::Document::parse(&pages[0]).unwrap();
        let widths: Vec<f64> = doc
            .descendants()
            .filter(|n| n.attribute("class") == Some("piece"))
            .map(|n| n.attribute("width").unwrap().parse().unwrap())
            .collect();
        assert!(widths.len() == 3 && (widths.iter().sum::<f64>() - 400.0).abs() < 0.01, "{widths:?}");
        let many: Vec<Piece> = (0..12).map(|i| rect(&format!("p{i}"), 0.17, 0.05)).collect();
        let pages = template_pages("t", &many).unwrap();
        assert!(pages.len() >= 3);
        for p in &pages {
            let doc = roxmltree::Document::parse(p).unwrap();
            for n in doc.descendants().filter(|n| n.attribute("class") == Some("piece")) {
                let y: f64 = n.attribute("y").unwrap().parse().unwrap();
                let h: f64 = n.attribute("height").unwrap().parse().unwrap();
                assert!(y + h <= PAGE_H - MARGIN - FOOTER + 1e-9);
            }
        }
    }

    /// A profile gauge is drawn as its rectangle with a half-disk bite of the cavity's
    /// radius from the middle of its top edge, at 1:1.
    #[test]
    fn profile_gauges_carry_their_half_disk() {
        let gauge = Piece {
            name: "gauge".into(),
            count: 2,
            outline: Outline::Notched {
                width: 0.031,
                height: 0.0155,
                notch: Notch::HalfDisk { radius: 0.0095 },
            },
        };
        let pages = template_pages("t", &[gauge]).unwrap();
        let doc = roxmltree::Document::parse(&pages[0]).unwrap();
        let path = doc.descendants().find(|n| n.has_tag_name("path")).unwrap();
        let d = path.attribute("d").unwrap();
        assert_eq!(d, "M 0 0 L 6.000 0 A 9.500 9.500 0 0 0 25.000 0 L 31.000 0 L 31.000 15.500 L 0 15.500 Z");
    }
}
