//! The HTML page: one file, no external resources (inline CSS, SVG charts inlined,
//! pictures as `data:` URIs), every piece of user text escaped ([`crate::escape::html`]).
//! The markup is also well-formed XML (void elements self-closed), so tests can parse it.

use std::fmt::Write as _;

use super::escape::base64;
use super::{Candidate, charts, object_names};
use crate::error::AppError;
use crate::escape::html as esc;
use crate::report::{CAUTIONS, Status, fixed, object_status, recommendation, window_kpa};

const STYLE: &str = "body{font-family:sans-serif;margin:2em;max-width:1200px;color:#222}\
table{border-collapse:collapse;margin:1em 0}td,th{border:1px solid #bbb;padding:4px 8px;text-align:left}\
th{background:#f2f2f2}.pass{color:#0072b2;font-weight:bold}.fail{color:#d55e00;font-weight:bold}\
.unknown{color:#cc79a7;font-weight:bold}.cards{display:flex;flex-wrap:wrap;gap:1em}\
.card{border:1px solid #bbb;padding:1em;width:340px}.picture{width:320px;min-height:240px;background:#f6f6f6;\
display:flex;flex-direction:column;align-items:center;justify-content:center;text-align:center;color:#666;font-size:90%}\
.picture img{max-width:320px;max-height:240px}.chart svg{width:380px;height:auto}.caution{border-left:4px solid #d55e00;padding-left:1em}";

fn status_cell(st: Status) -> String {
    let class = match st {
        Status::Pass => "pass",
        Status::Fail => "fail",
        Status::Unknown => "unknown",
    };
    format!("<span class=\"{class}\">{}</span>", st.word())
}

fn label(k: usize) -> String {
    format!("C{}", k + 1)
}

/// The whole page.
///
/// # Errors
/// A chart that cannot be drawn.
pub fn page(cands: &[Candidate]) -> Result<String, AppError> {
    let chart_err = |e: String| AppError::input(format!("drawing a chart of the review: {e}"));
    let objects = object_names(cands);
    let mut s = String::new();
    let _ = write!(
        s,
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n\
         <meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'; img-src data:\"/>\n\
         <title>Gripper design review</title>\n<style>{STYLE}</style>\n</head>\n<body>\n\
         <h1>Gripper design review: {} candidate(s)</h1>\n",
        cands.len()
    );
    // candidates
    s.push_str("<h2>Candidates</h2>\n<div class=\"cards\">\n");
    for (k, c) in cands.iter().enumerate() {
        let passing = c.report.objects.iter().filter(|o| object_status(o) == Status::Pass).count();
        let mut actuators: Vec<&str> = c
            .scene
            .gripper
            .fingers
            .iter()
            .filter_map(|f| c.scene.actuators.get(f.actuator))
            .map(|a| a.name.as_str())
            .collect();
        actuators.dedup();
        let picture = match &c.picture {
            Some(png) => format!(
                "<img alt=\"{}: {}\" src=\"data:image/png;base64,{}\"/><br/>{}",
                esc(&c.report.scene),
                esc(&c.picture_note),
                base64(png),
                esc(&c.picture_note)
            ),
            None => esc(&c.picture_note),
        };
        let _ = write!(
            s,
            "<div class=\"card\" id=\"candidate-{n}\"><h3>{l}: {name}</h3>\n<div class=\"picture\">{picture}</div>\n\
             <p>Scene file: <code>{file}</code><br/>{fingers} finger(s), actuator {act}<br/>\
             Objects passing at {p} kPa: {passing} of {total}, {st}<br/>{rec}</p></div>\n",
            n = k + 1,
            l = label(k),
            name = esc(&c.report.scene),
            file = esc(&c.file),
            fingers = c.scene.gripper.fingers.len(),
            act = esc(&actuators.join(", ")),
            p = fixed(c.report.pressure / 1e3, 1),
            total = c.report.objects.len(),
            st = status_cell(c.status()),
            rec = esc(&recommendation(&c.report, |n| format!("\"{n}\""))),
        );
    }
    s.push_str("</div>\n");
    // verdict matrix
    s.push_str("<h2>Verdicts at the supply pressure</h2>\n<table id=\"verdicts\"><tr><th>object</th>");
    for k in 0..cands.len() {
        let _ = write!(s, "<th>{}</th>", label(k));
    }
    s.push_str("</tr>\n");
    for name in &objects {
        let _ = write!(s, "<tr><td>{}</td>", esc(name));
        for c in cands {
            match c.report.objects.iter().find(|o| o.name == *name) {
                Some(o) => {
                    let reasons: Vec<String> = o.failures.iter().map(ToString::to_string).collect();
                    let _ = write!(
                        s,
                        "<td title=\"{}\">{}</td>",
                        esc(&reasons.join("; ")),
                        status_cell(object_status(o))
                    );
                }
                None => s.push_str("<td>not in this scene</td>"),
            }
        }
        s.push_str("</tr>\n");
    }
    s.push_str("</table>\n");
    // pressure windows
    let windows: Vec<Vec<Option<(f64, f64)>>> = objects
        .iter()
        .map(|name| {
            cands
                .iter()
                .map(|c| {
                    c.report
                        .objects
                        .iter()
                        .find(|o| o.name == *name)
                        .and_then(|o| o.pressure_window)
                        .map(|(a, b)| (a * 1e-3, b * 1e-3))
                })
                .collect()
        })
        .collect();
    let p_max = cands
        .iter()
        .flat_map(|c| c.scene.criteria.sweep.map(|sw| sw.to).into_iter().chain([c.report.pressure]))
        .fold(0.0, f64::max)
        * 1e-3;
    let names: Vec<String> = (0..cands.len()).map(label).collect();
    s.push_str("<h2>Pressure windows</h2>\n<p>Where each object passes over each candidate's pressure sweep (widest run).</p>\n");
    s.push_str(&charts::windows_svg(&objects, &names, &windows, p_max).map_err(chart_err)?);
    s.push('\n');
    if windows.iter().flatten().all(Option::is_none) {
        s.push_str("<p>No object passes at any swept pressure of any candidate.</p>\n");
    }
    // margins
    s.push_str("<h2>Margins at the supply pressure</h2>\n<table id=\"margins\"><tr><th>object</th><th>candidate</th>\
                <th>lift</th><th>lateral (min)</th><th>enclosure</th><th>peak contact force (N)</th><th>window (kPa)</th></tr>\n");
    for name in &objects {
        for (k, c) in cands.iter().enumerate() {
            if let Some(o) = c.report.objects.iter().find(|o| o.name == *name) {
                let _ = writeln!(
                    s,
                    "<tr><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td></tr>",
                    esc(name),
                    label(k),
                    fixed(o.holding.lift, 2),
                    fixed(o.holding.lateral_min, 2),
                    crate::report::percent(o.enclosure),
                    fixed(o.peak_contact_force, 2),
                    window_kpa(o.pressure_window, "-")
                );
            }
        }
    }
    s.push_str("</table>\n");
    // bend curves
    s.push_str("<h2>Bend and blocked force</h2>\n<div class=\"cards\">\n");
    for (k, c) in cands.iter().enumerate() {
        for b in &c.bends {
            let svg = crate::plot::bend_svg(b).map_err(chart_err)?;
            let _ = writeln!(
                s,
                "<div class=\"chart\"><h3>{}: actuator {}</h3>\n{svg}</div>",
                label(k),
                esc(&b.actuator)
            );
        }
    }
    s.push_str("</div>\n");
    s.push_str(
        "<h2>Fabrication</h2>\n<p>Per finger unless said otherwise, from the fabrication sheet \
                (<code>arcfinger fab SCENE</code> gives the molds, cut templates and process) with its \
                common-practice shop values: a 1:1 mix by mass with its waste allowance, bonding coats, \
                fiber tie-offs.</p>\n<table id=\"fabrication\"><tr><th>candidate</th><th>actuator</th>\
                <th>fingers</th><th>cast rubber (ml)</th><th>silicone to mix (g)</th>\
                <th>silicone for the gripper (g)</th><th>fiber (m)</th><th>wrap-pitch margin</th></tr>\n",
    );
    for (k, row) in super::fab_rows(cands) {
        match row {
            Ok(cells) => {
                let cells: String = cells.iter().map(|c| format!("<td>{}</td>", esc(c))).collect();
                let _ = writeln!(s, "<tr><td>{}</td>{cells}</tr>", label(k));
            }
            Err(e) => {
                let _ =
                    writeln!(s, "<tr><td>{}</td><td colspan=\"7\">no sheet: {}</td></tr>", label(k), esc(&e));
            }
        }
    }
    s.push_str("</table>\n");
    let _ = write!(s, "<h2>Cautions</h2>\n<p class=\"caution\">{}</p>\n</body>\n</html>\n", esc(CAUTIONS));
    Ok(s)
}
