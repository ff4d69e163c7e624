//! One object at one pressure, with the fingers as they close on it: what an
//! interactive viewer shows after a pressure step.
//!
//! The report is the grasp check's own: [`check_scene`] on the scene reduced to that
//! object, at that pressure, with no sweep, so every number equals what `check` reports
//! for the object at that pressure on a scene without a sweep. (With a sweep, the check
//! reaches its supply pressure along the sweep's pressures: the same equilibrium to the
//! closing's tolerance, unless the closing has two, as fingers pressed against each
//! other do.) The closed shapes come from the closing stage called as the check calls
//! it from open (each finger against the object and the palm). The closing therefore
//! runs twice; the check does not hand out its closed fingers.

use super::closing::{ClosedFinger, Obstacles, close_finger};
use super::{CheckError, CheckSettings, Failure, FingerReport, ObjectReport, check_scene};
use crate::geometry::{FingerFrame, ObjectGeometry, palm_body};
use crate::rod::Rod;
use crate::scene::Scene;

/// One object at one pressure.
#[derive(Debug, Clone)]
pub struct ObjectAtPressure {
    /// Supply pressure (Pa).
    pub pressure: f64,
    /// The object's report, as the check gives it at this pressure (no pressure window:
    /// that needs the sweep).
    pub report: ObjectReport,
    /// The free fingers at this pressure (bend, tip, interference of the free bodies).
    pub fingers: Vec<FingerReport>,
    /// Each finger's element-end angles closed on the object (rad); the open, straight
    /// finger (all zero) when the object does not fit into the open gripper.
    pub closed_angles: Vec<Vec<f64>>,
}

/// Evaluates object number `object` of `scene` at supply pressure `pressure` (Pa).
///
/// # Errors
/// An object index out of range, and everything [`check_scene`] refuses.
pub fn check_object(
    scene: &Scene,
    object: usize,
    pressure: f64,
    settings: &CheckSettings,
) -> Result<ObjectAtPressure, CheckError> {
    let target = scene.objects.get(object).ok_or_else(|| {
        CheckError::BadSetting(format!("object {object}: the scene has {} objects", scene.objects.len()))
    })?;
    let mut one = scene.clone();
    one.objects = vec![target.clone()];
    one.criteria.sweep = None;
    let settings = CheckSettings { pressure_override: Some(pressure), ..*settings };
    let mut checked = check_scene(&one, &settings)?;
    let report = checked.objects.remove(0);
    let geo = |e: &dyn std::fmt::Display| CheckError::Geometry(e.to_string());
    let does_not_fit = report.failures.iter().any(|f| matches!(f, Failure::DoesNotFit { .. }));
    let geometry = ObjectGeometry::of_object(target).map_err(|e| geo(&e))?;
    let palm = palm_body(&scene.gripper.palm).map_err(|e| geo(&e))?;
    let obstacles = Obstacles { object: &geometry, palm: &palm };
    let mut closed_angles = Vec::with_capacity(scene.gripper.fingers.len());
    for (i, mount) in scene.gripper.fingers.iter().enumerate() {
        let actuator = &scene.actuators[mount.actuator];
        let rod = Rod::of_actuator(actuator, settings.elements).map_err(|e| geo(&e))?;
        if does_not_fit {
            closed_angles.push(vec![0.0; rod.dofs()]);
            continue;
        }
        let frame = FingerFrame::of_mount(mount).map_err(|e| geo(&e))?;
        let c: ClosedFinger =
            close_finger(i, actuator, &rod, frame, actuator.section_model, pressure, &obstacles, None)
                .map_err(CheckError::Geometry)?;
        closed_angles.push(c.angles);
    }
    Ok(ObjectAtPressure { pressure, report, fingers: checked.fingers, closed_angles })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::actuator::Actuator;
    use crate::math::Vec3;
    use crate::scene::{Criteria, FingerMount, Gripper, ObjectShape, Palm, TargetObject};

    /// Two opposed example fingers, a 25 mm ball they reach and a box too wide to fit.
    fn demo_scene() -> Scene {
        let finger = |az: f64| FingerMount { actuator: 0, azimuth: az, radius: 0.03, tilt: 0.0 };
        let object = |name: &str, shape| TargetObject {
            name: name.into(),
            shape,
            mass: 0.01,
            friction: 0.8,
            position: Vec3::new(0.0, 0.0, -0.07),
            max_contact_force: None,
        };
        Scene {
            name: "single-test".into(),
            materials: Vec::new(),
            actuators: vec![Actuator::example()],
            gripper: Gripper {
                palm: Palm::Disk { radius: 0.04, thickness: 0.01 },
                fingers: vec![finger(0.0), finger(std::f64::consts::PI)],
            },
            objects: vec![
                object("ball", ObjectShape::Sphere { radius: 0.0125 }),
                object("wide box", ObjectShape::Box { size: Vec3::new(0.08, 0.02, 0.02) }),
            ],
            criteria: Criteria {
                pressure: 20e3,
                sweep: None,
                safety_factor: 1.5,
                lift_accel: 2.0,
                lateral_accel: 1.0,
                min_fingers_in_contact: 2,
                min_enclosure: 0.2,
            },
        }
    }

    #[test]
    fn one_object_reports_what_the_whole_check_reports() {
        let scene = demo_scene();
        let settings = CheckSettings::default();
        let whole = check_scene(&scene, &settings).unwrap();
        for (k, o) in whole.objects.iter().enumerate() {
            let one = check_object(&scene, k, scene.criteria.pressure, &settings).unwrap();
            let mut expected = o.clone();
            expected.pressure_window = None;
            assert_eq!(one.report, expected, "object {}", o.name);
            assert_eq!(one.fingers, whole.fingers);
            assert_eq!(one.closed_angles.len(), scene.gripper.fingers.len());
        }
        // the ball is touched (the closed fingers are bent), the box does not fit (open)
        let ball = check_object(&scene, 0, scene.criteria.pressure, &settings).unwrap();
        assert!(ball.report.fingers_in_contact > 0);
        assert!(ball.closed_angles.iter().all(|a| a.iter().any(|x| x.abs() > 1e-3)));
        let wide = check_object(&scene, 1, scene.criteria.pressure, &settings).unwrap();
        assert_eq!(wide.report.failures[0].kind(), "does-not-fit");
        assert!(wide.closed_angles.iter().all(|a| a.iter().all(|x| *x == 0.0)));
        assert!(check_object(&scene, 99, 1e4, &settings).is_err());
    }

    /// The check reaches the supply pressure along the sweep's pressures, here with the
    /// supply between two of them: the window lists sweep pressures only, and the report
    /// at the supply is the same equilibrium as the check without a sweep (closing from
    /// open) to the closing's tolerance (residual 1e-8 relative, DESIGN 3.3). A 32 mm
    /// ball low between the two fingers: both reach it at every pressure of the sweep,
    /// without meeting each other (a unique equilibrium).
    #[test]
    fn the_supply_reached_along_the_sweep_is_the_same_equilibrium() {
        let mut scene = demo_scene();
        scene.objects.truncate(1);
        scene.objects[0].shape = ObjectShape::Sphere { radius: 0.016 };
        scene.objects[0].position = Vec3::new(0.0, 0.0, -0.08);
        scene.criteria.lateral_accel = 0.0;
        scene.criteria.pressure = 14e3;
        let settings = CheckSettings::default();
        let from_open = check_scene(&scene, &settings).unwrap();
        scene.criteria.sweep = Some(crate::scene::PressureSweep { from: 8e3, to: 24e3, step: 4e3 });
        let along = check_scene(&scene, &settings).unwrap();
        let (a, b) = (&from_open.objects[0], &along.objects[0]);
        assert_eq!(a.verdict, b.verdict);
        assert_eq!(b.fingers_in_contact, 2, "both fingers reach the ball");
        assert_eq!(a.contacts.len(), b.contacts.len());
        let close = |x: f64, y: f64| (x - y).abs() <= 1e-6 * x.abs().max(1e-9);
        for (p, q) in a.contacts.iter().zip(&b.contacts) {
            assert!(close(p.normal_force, q.normal_force), "{} vs {}", p.normal_force, q.normal_force);
            assert!((p.point - q.point).length() < 1e-8, "{:?} vs {:?}", p.point, q.point);
        }
        assert!(close(a.holding.lift, b.holding.lift), "{} vs {}", a.holding.lift, b.holding.lift);
        assert_eq!(a.pressure_window, None, "no sweep, no window");
        let (lo, hi) = b.pressure_window.expect("the ball is held somewhere on the sweep");
        for p in [lo, hi] {
            let k = (p - 8e3) / 4e3;
            assert!((k - k.round()).abs() < 1e-9 && (0.0..=4.0).contains(&k), "{p} Pa is a sweep pressure");
        }
    }
}
