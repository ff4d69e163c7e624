//! What the viewer shows, without bevy: the scene, the object looked at, the pressure,
//! the core's result for them, and from those the parts to draw and the panel's lines.
//!
//! The result comes from [`grasp_core::check::check_object`], the grasp check's own
//! evaluation of one object at one pressure; the surfaces from [`grasp_core::draw`]. The
//! pressure windows need the whole sweep, which takes seconds: the viewer computes them
//! once with [`grasp_core::check::check_scene`] on a thread and hands them in with
//! [`ViewState::set_windows`].

use std::time::{Duration, Instant};

use grasp_core::check::{CheckSettings, Failure, ObjectAtPressure, Verdict, check_object};
use grasp_core::draw::{self, Surface};
use grasp_core::geometry::FingerFrame;
use grasp_core::math::Vec3;
use grasp_core::rod::Rod;
use grasp_core::scene::Scene;

/// Length of a force arrow per newton (m): 6 mm/N.
pub const ARROW_PER_NEWTON: f64 = 6e-3;
/// Longest force arrow drawn (m); the panel gives the true forces.
pub const ARROW_MAX: f64 = 0.045;
/// Shortest force arrow drawn (m), so that small forces stay visible.
pub const ARROW_MIN: f64 = 0.003;
/// Shaft radius of force arrows (m).
const ARROW_RADIUS: f64 = 6e-4;
/// Radius of a contact point's marker (m).
const MARKER_RADIUS: f64 = 1.2e-3;

/// Pressure windows per object (Pa): the widest passing range of each, if any.
pub type Windows = Vec<Option<(f64, f64)>>;

/// What the sweep thread hands in: the windows and the recommended pressure (Pa).
pub type SweepOutcome = Result<(Windows, Option<f64>), String>;

/// What a drawn part stands for (it decides the colour).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Role {
    /// The palm.
    Palm,
    /// A finger; `flagged` when it interferes with another.
    Finger {
        /// Interferes with another finger.
        flagged: bool,
    },
    /// The fiber winding of a finger.
    Fiber,
    /// The object looked at; `flagged` when a contact exceeds its force limit.
    Object {
        /// Over its force limit.
        flagged: bool,
    },
    /// Another object of the set, drawn see-through.
    OtherObject,
    /// A contact marker or force arrow; `flagged` when over the object's force limit.
    Force {
        /// Over the object's force limit.
        flagged: bool,
    },
}

/// One surface to draw.
#[derive(Debug, Clone)]
pub struct Part {
    /// What it is.
    pub role: Role,
    /// Its triangles (m, gripper frame).
    pub surface: Surface,
}

/// What to show besides the gripper and the object.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Toggles {
    /// Contact markers and force arrows.
    pub forces: bool,
    /// The fiber winding.
    pub fibers: bool,
    /// The other objects of the set, see-through at their positions.
    pub object_set: bool,
}

impl Default for Toggles {
    fn default() -> Self {
        Self { forces: true, fibers: true, object_set: false }
    }
}

/// The viewer's state.
pub struct ViewState {
    /// The scene shown.
    pub scene: Scene,
    /// The check's settings.
    pub settings: CheckSettings,
    /// Index of the object looked at.
    pub object: usize,
    /// Supply pressure (Pa).
    pub pressure: f64,
    /// The core's result at `object` and `pressure`, or why there is none.
    pub solved: Result<ObjectAtPressure, String>,
    /// Wall time of the last solve.
    pub solve_time: Duration,
    /// Pressure windows per object (Pa) from the whole check; `None` while computing.
    pub windows: Option<Result<Windows, String>>,
    /// Recommended pressure of the whole check (Pa), once known.
    pub recommended: Option<f64>,
    /// What else is drawn.
    pub toggles: Toggles,
}

impl ViewState {
    /// The state for `scene` looking at object `object` at `pressure` (Pa), solved.
    pub fn new(scene: Scene, settings: CheckSettings, object: usize, pressure: f64) -> Self {
        let mut s = Self {
            scene,
            settings,
            object,
            pressure,
            solved: Err("not solved yet".into()),
            solve_time: Duration::ZERO,
            windows: None,
            recommended: None,
            toggles: Toggles::default(),
        };
        s.solve();
        s
    }

    /// Pressure step of the keys (Pa): the scene's sweep step, or 2.5 kPa.
    pub fn pressure_step(&self) -> f64 {
        self.scene.criteria.sweep.map(|s| s.step).filter(|s| *s > 0.0).unwrap_or(2.5e3)
    }

    /// Highest pressure the keys go to (Pa): the lowest rated pressure of the fingers'
    /// actuators (the scene must not be run above it).
    pub fn max_pressure(&self) -> f64 {
        self.scene
            .gripper
            .fingers
            .iter()
            .filter_map(|f| self.scene.actuators.get(f.actuator))
            .map(|a| a.max_pressure)
            .fold(f64::INFINITY, f64::min)
    }

    /// Solves the current object at the current pressure with the core.
    pub fn solve(&mut self) {
        let t = Instant::now();
        self.solved =
            check_object(&self.scene, self.object, self.pressure, &self.settings).map_err(|e| e.to_string());
        self.solve_time = t.elapsed();
    }

    /// Steps the pressure by `steps` key steps, within 0 and the rated pressure, and
    /// re-solves; false if it did not change.
    pub fn step_pressure(&mut self, steps: i32) -> bool {
        let step = self.pressure_step();
        let p = ((self.pressure / step).round() + f64::from(steps)) * step;
        let p = p.clamp(0.0, self.max_pressure());
        if (p - self.pressure).abs() < 1e-9 {
            return false;
        }
        self.pressure = p;
        self.solve();
        true
    }

    /// Looks at the next (`+1`) or previous (`-1`) object and re-solves.
    pub fn cycle_object(&mut self, delta: i32) -> bool {
        let n = self.scene.objects.len() as i64;
        if n < 2 {
            return false;
        }
        self.object = (self.object as i64 + i64::from(delta)).rem_euclid(n) as usize;
        self.solve();
        true
    }

    /// Hands in the pressure windows of the whole check.
    pub fn set_windows(&mut self, windows: SweepOutcome) {
        match windows {
            Ok((w, rec)) => {
                self.windows = Some(Ok(w));
                self.recommended = rec;
            }
            Err(e) => self.windows = Some(Err(e)),
        }
    }

    /// Fingers flagged for interference: in a pair of the closed state's interference
    /// failure (the state drawn; the free fingers' own interference is a different
    /// configuration and is not flagged here).
    fn flagged_fingers(&self) -> Vec<bool> {
        let n = self.scene.gripper.fingers.len();
        let mut flags = vec![false; n];
        if let Ok(s) = &self.solved {
            for f in &s.report.failures {
                if let Failure::Interference { pairs } = f {
                    for &(a, b) in pairs {
                        flags[a] = true;
                        flags[b] = true;
                    }
                }
            }
        }
        flags
    }

    /// The parts to draw (m, gripper frame).
    ///
    /// # Errors
    /// A finger that cannot be drawn (bad geometry the scene loader let through).
    pub fn parts(&self) -> Result<Vec<Part>, String> {
        let mut parts =
            vec![Part { role: Role::Palm, surface: draw::palm_surface(&self.scene.gripper.palm) }];
        let flags = self.flagged_fingers();
        for (i, mount) in self.scene.gripper.fingers.iter().enumerate() {
            let a = &self.scene.actuators[mount.actuator];
            let rod = Rod::of_actuator(a, self.settings.elements).map_err(|e| e.to_string())?;
            let frame = FingerFrame::of_mount(mount).map_err(|e| e.to_string())?;
            let straight = vec![0.0; rod.dofs()];
            let angles = self.solved.as_ref().ok().and_then(|s| s.closed_angles.get(i)).unwrap_or(&straight);
            let body = draw::finger_surface(&rod, angles, &a.section, &frame).map_err(|e| e.to_string())?;
            parts.push(Part { role: Role::Finger { flagged: flags[i] }, surface: body });
            if self.toggles.fibers {
                let fiber = draw::fiber_ribbons(&rod, angles, &a.section, &frame, &a.fiber)
                    .map_err(|e| e.to_string())?;
                parts.push(Part { role: Role::Fiber, surface: fiber });
            }
        }
        let over = self.over_limit();
        for (k, o) in self.scene.objects.iter().enumerate() {
            if k == self.object {
                parts.push(Part {
                    role: Role::Object { flagged: over.is_some() },
                    surface: draw::object_surface(o),
                });
            } else if self.toggles.object_set {
                parts.push(Part { role: Role::OtherObject, surface: draw::object_surface(o) });
            }
        }
        if self.toggles.forces
            && let Ok(s) = &self.solved
        {
            let limit = self.scene.objects[self.object].max_contact_force;
            for c in &s.report.contacts {
                let flagged = limit.is_some_and(|l| c.normal_force > l);
                let len = (ARROW_PER_NEWTON * c.normal_force).clamp(ARROW_MIN, ARROW_MAX);
                let n = c.normal.normalize_or_zero();
                // the arrow pushes along the normal into the object and ends at the contact
                let mut s = draw::arrow(c.point - len * n, c.point, ARROW_RADIUS);
                s.append(&draw::shapes::sphere(MARKER_RADIUS).translated(c.point));
                parts.push(Part { role: Role::Force { flagged }, surface: s });
            }
        }
        Ok(parts)
    }

    /// `Some((peak, limit))` (N) when a contact exceeds the object's force limit.
    fn over_limit(&self) -> Option<(f64, f64)> {
        let s = self.solved.as_ref().ok()?;
        s.report.failures.iter().find_map(|f| match f {
            Failure::ContactForce { peak, limit } => Some((*peak, *limit)),
            _ => None,
        })
    }

    /// Bounding box of everything that fits the camera (m): palm, fingers, all objects
    /// (so that cycling objects keeps the framing).
    pub fn bounds(&self) -> (Vec3, Vec3) {
        let mut lo = Vec3::splat(f64::INFINITY);
        let mut hi = Vec3::splat(f64::NEG_INFINITY);
        let mut grow = |s: &Surface| {
            if let Some((a, b)) = s.bounds() {
                lo = lo.min(a);
                hi = hi.max(b);
            }
        };
        grow(&draw::palm_surface(&self.scene.gripper.palm));
        for o in &self.scene.objects {
            grow(&draw::object_surface(o));
        }
        // the fingers open (straight) reach farthest down; bent ones stay inside
        for mount in &self.scene.gripper.fingers {
            let a = &self.scene.actuators[mount.actuator];
            if let (Ok(rod), Ok(frame)) = (Rod::of_actuator(a, 40), FingerFrame::of_mount(mount))
                && let Ok(s) = draw::finger_surface(&rod, &vec![0.0; rod.dofs()], &a.section, &frame)
            {
                grow(&s);
            }
        }
        (lo, hi)
    }

    /// The panel's lines: the object's verdict, margins, enclosure, pressure window and
    /// failed criteria, and the keys.
    pub fn panel(&self) -> Vec<(String, bool)> {
        let mut lines = Vec::new();
        let n = self.scene.objects.len();
        let o = &self.scene.objects[self.object];
        let c = &self.scene.criteria;
        lines.push((
            format!(
                "{}   object {}/{}: {}   {:.1} kPa",
                self.scene.name,
                self.object + 1,
                n,
                o.name,
                self.pressure * 1e-3
            ),
            false,
        ));
        match &self.solved {
            Err(e) => lines.push((format!("could not evaluate: {e}"), false)),
            Ok(s) => {
                let r = &s.report;
                let pass = r.verdict == Verdict::Pass;
                lines.push((format!("verdict: {}", if pass { "PASS" } else { "FAIL" }), pass));
                lines.push((
                    format!(
                        "fingers in contact: {} (need {})",
                        r.fingers_in_contact, c.min_fingers_in_contact
                    ),
                    false,
                ));
                lines.push((
                    format!(
                        "enclosure: {:.0} % (need {:.0} %)   epsilon: {:.3}",
                        r.enclosure * 100.0,
                        c.min_enclosure * 100.0,
                        r.epsilon
                    ),
                    false,
                ));
                lines.push((
                    format!(
                        "holding margin: lift {:.2}, lateral {:.2} (need {:.2})",
                        r.holding.lift, r.holding.lateral_min, c.safety_factor
                    ),
                    false,
                ));
                let limit = o.max_contact_force.map(|l| format!(" (limit {l:.1} N)")).unwrap_or_default();
                lines.push((format!("peak contact force: {:.2} N{limit}", r.peak_contact_force), false));
                for f in &r.failures {
                    lines.push((format!("FAILED: {f}"), false));
                }
            }
        }
        let window = match &self.windows {
            None => "computing the sweep...".to_string(),
            Some(Err(e)) => format!("not available ({e})"),
            Some(Ok(w)) => match w.get(self.object).copied().flatten() {
                Some((a, b)) => format!("{:.1} to {:.1} kPa", a * 1e-3, b * 1e-3),
                None if c.sweep.is_none() => "no sweep in the scene".to_string(),
                None => "none".to_string(),
            },
        };
        lines.push((format!("pressure window: {window}"), false));
        if let Some(p) = self.recommended {
            lines.push((format!("recommended for the whole set: {:.1} kPa", p * 1e-3), false));
        }
        lines.push((format!("solved in {:.0} ms", self.solve_time.as_secs_f64() * 1e3), false));
        lines.push((
            format!(
                "keys: Up/Down pressure +/-{:.1} kPa, Left/Right object, F forces, W fiber, A object set, \
                 S shadows, M MSAA, R reset view; mouse: left orbit, right pan, wheel zoom",
                self.pressure_step() * 1e-3
            ),
            false,
        ));
        lines
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn demo() -> ViewState {
        let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../scenes/packing-line-4f.ron");
        let scene = crate::scene_file::load(&path).unwrap();
        let p = scene.criteria.pressure;
        ViewState::new(scene, CheckSettings::default(), 0, p)
    }

    #[test]
    fn parts_come_from_the_core_result() {
        let mut v = demo();
        let s = v.solved.as_ref().unwrap();
        let contacts = s.report.contacts.len();
        let parts = v.parts().unwrap();
        let count = |f: &dyn Fn(&Role) -> bool| parts.iter().filter(|p| f(&p.role)).count();
        let fingers = v.scene.gripper.fingers.len();
        assert_eq!(count(&|r| matches!(r, Role::Finger { .. })), fingers);
        assert_eq!(count(&|r| matches!(r, Role::Fiber)), fingers);
        assert_eq!(count(&|r| matches!(r, Role::Force { .. })), contacts);
        assert_eq!(count(&|r| matches!(r, Role::Object { .. })), 1);
        assert_eq!(count(&|r| matches!(r, Role::OtherObject)), 0);
        // every arrow ends on its contact point
        let arrows: Vec<&Part> = parts.iter().filter(|p| matches!(p.role, Role::Force { .. })).collect();
        for (a, c) in arrows.iter().zip(&s.report.contacts) {
            let nearest =
                a.surface.positions.iter().map(|p| (*p - c.point).length()).fold(f64::MAX, f64::min);
            assert!(nearest < 1e-12);
        }
        v.toggles = Toggles { forces: false, fibers: false, object_set: true };
        let parts = v.parts().unwrap();
        assert!(parts.iter().all(|p| !matches!(p.role, Role::Force { .. } | Role::Fiber)));
        assert_eq!(parts.iter().filter(|p| p.role == Role::OtherObject).count(), v.scene.objects.len() - 1);
    }

    #[test]
    fn pressure_steps_stay_between_zero_and_the_rating() {
        let mut v = demo();
        let step = v.pressure_step();
        let p0 = v.pressure;
        assert!(v.step_pressure(1));
        assert!((v.pressure - (p0 / step).round() * step - step).abs() < 1e-9);
        assert!(v.solved.is_ok());
        let max = v.max_pressure();
        v.pressure = max;
        assert!(!v.step_pressure(1));
        v.pressure = 0.0;
        assert!(!v.step_pressure(-1));
        assert!(v.cycle_object(-1));
        assert_eq!(v.object, v.scene.objects.len() - 1);
    }

    #[test]
    fn panel_names_verdict_and_every_failure() {
        let v = demo();
        let lines: Vec<String> = v.panel().into_iter().map(|l| l.0).collect();
        let r = &v.solved.as_ref().unwrap().report;
        assert!(lines.iter().any(|l| l.starts_with("verdict: ")));
        for f in &r.failures {
            assert!(lines.iter().any(|l| l.contains(&f.to_string())));
        }
        assert!(lines.iter().any(|l| l == "pressure window: computing the sweep..."));
    }
}
