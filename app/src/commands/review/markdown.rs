//! The Markdown summary for a pull request: candidates, the verdict matrix, the
//! fabrication figures and the cautions. User text goes through the check report's Markdown escape.

use std::fmt::Write as _;

use super::{Candidate, object_names};
use crate::report::markdown::escape;
use crate::report::{CAUTIONS, Status, fixed, object_status, recommendation};

/// The summary.
pub fn summary(cands: &[Candidate]) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "## Gripper design review: {} candidate(s)\n", cands.len());
    s.push_str("| | scene | fingers | objects passing | supply (kPa) | one pressure for all |\n|---|---|---|---|---|---|\n");
    for (k, c) in cands.iter().enumerate() {
        let passing = c.report.objects.iter().filter(|o| object_status(o) == Status::Pass).count();
        let _ = writeln!(
            s,
            "| C{} | {} | {} | {} of {} | {} | {} |",
            k + 1,
            escape(&c.report.scene),
            c.scene.gripper.fingers.len(),
            passing,
            c.report.objects.len(),
            fixed(c.report.pressure / 1e3, 1),
            escape(&recommendation(&c.report, |n| format!("\"{n}\"")))
        );
    }
    s.push_str("\n| object |");
    for k in 0..cands.len() {
        let _ = write!(s, " C{} |", k + 1);
    }
    s.push_str("\n|---|");
    s.push_str(&"---|".repeat(cands.len()));
    s.push('\n');
    for name in object_names(cands) {
        let _ = write!(s, "| {} |", escape(&name));
        for c in cands {
            let cell =
                c.report.objects.iter().find(|o| o.name == name).map_or("—", |o| object_status(o).word());
            let _ = write!(s, " {cell} |");
        }
        s.push('\n');
    }
    s.push_str("\nFabrication, per finger (`arcfinger fab SCENE` for the whole sheet):\n\n\
                | | actuator | fingers | silicone to mix (g) | fiber (m) | wrap-pitch margin |\n|---|---|---|---|---|---|\n");
    for (k, row) in super::fab_rows(cands) {
        match row {
            Ok([actuator, fingers, _, silicone, _, fiber, wrap]) => {
                let _ = writeln!(
                    s,
                    "| C{} | {} | {fingers} | {silicone} | {fiber} | {} |",
                    k + 1,
                    escape(&actuator),
                    escape(&wrap)
                );
            }
            Err(e) => {
                let _ = writeln!(s, "| C{} | no sheet: {} | | | | |", k + 1, escape(&e));
            }
        }
    }
    let _ = writeln!(s, "\n{CAUTIONS}");
    s
}
