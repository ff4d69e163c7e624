//! The ranking table printed at the end of `sweep` and by `merge --top N`.

use std::fmt::Write as _;

use super::record::Record;
use crate::report::table::sanitize;

fn window(w: Option<[f64; 2]>) -> String {
    match w {
        Some([a, b]) => format!("{a:.1}-{b:.1}"),
        None => "none".into(),
    }
}

/// The table of the first `top` records of `ranked` (best first), the Pareto front and a
/// closing line about the best candidate.
pub fn render(ranked: &[&Record], front: &[usize], top: usize, total_objects: usize) -> String {
    let mut s = String::new();
    let _ = writeln!(
        s,
        "{:>4} {:>6} {:<14} {:>3} {:<12} {:>9} {:>7} {:>7} {:>7} {:>7} {:<13} {:>6}  front",
        "rank",
        "index",
        "layout",
        "n",
        "actuator",
        "radius mm",
        "tilt °",
        "az °",
        "sprd °",
        "covered",
        "window kPa",
        "margin"
    );
    for (k, r) in ranked.iter().take(top).enumerate() {
        let l = &r.layout;
        let spread = l.spread_deg.map_or("-".to_string(), |v| format!("{v:.1}"));
        let (covered, win, margin) = match &r.score {
            Some(sc) => (
                format!("{}/{}", sc.covered, sc.objects),
                format!("{}{}", window(sc.shared_window_kpa), if sc.whole_set { " all" } else { "" }),
                format!("{:.2}", sc.min_margin),
            ),
            None => ("error".into(), "-".into(), "-".into()),
        };
        let _ = writeln!(
            s,
            "{:>4} {:>6} {:<14} {:>3} {:<12} {:>9.2} {:>7.2} {:>7.2} {:>7} {:>7} {:<13} {:>6}  {}",
            k + 1,
            r.index,
            l.pattern,
            l.fingers,
            sanitize(&l.actuator),
            l.radius_mm,
            l.tilt_deg,
            l.azimuth_offset_deg,
            spread,
            covered,
            win,
            margin,
            if front.contains(&r.index) { "*" } else { "" }
        );
        if let Some(e) = &r.error {
            let _ = writeln!(s, "{:>11} error: {}", "", sanitize(e));
        }
    }
    let list: Vec<String> = front.iter().map(ToString::to_string).collect();
    let _ = writeln!(
        s,
        "Pareto front over (objects covered, shared window, fingers): candidates {}",
        if list.is_empty() { "none".into() } else { list.join(", ") }
    );
    match ranked.first().and_then(|r| r.score.as_ref().map(|sc| (r, sc))) {
        Some((r, sc)) if sc.whole_set => {
            let _ = writeln!(
                s,
                "Best: candidate {} holds all {} objects at one pressure ({} kPa).",
                r.index,
                sc.objects,
                window(sc.shared_window_kpa)
            );
        }
        Some((r, sc)) => {
            let _ = writeln!(
                s,
                "Best: candidate {} covers {} of {} objects; no candidate holds the whole set at one pressure.",
                r.index, sc.covered, sc.objects
            );
        }
        None => {
            let _ = writeln!(s, "No candidate could be checked (of {total_objects} objects).");
        }
    }
    s
}
