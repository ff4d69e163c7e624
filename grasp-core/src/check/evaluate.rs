//! The scene-level grasp check: every object against the gripper at the supply pressure
//! and over the pressure sweep (DESIGN 3.4).
//!
//! For one object at one pressure: every finger closes on it ([`super::closing`]); the
//! contacts give the holding margins of the lift and lateral load cases (a second-order
//! cone program, [`crate::grasp::holding`]) and the Ferrari–Canny epsilon
//! ([`crate::grasp::quality`]); the closed fingers and the palm give the enclosure
//! ([`crate::grasp::enclosure`]). Fingers whose independent closings intersect are
//! closed again together, each an obstacle of the others ([`super::coupled`]); bodies of
//! different fingers that still intersect then are interference. The verdict passes only if every criterion of the scene holds.
//!
//! Objects are independent and evaluated in parallel (rayon). Each object is evaluated
//! along one path of rising pressure, the sweep's pressures with the supply pressure
//! among them, each closing starting from the previous pressure's closed fingers (the
//! first from open), as the fingers close when the supply valve is opened slowly.
//! Results are collected in scene order, so they do not depend on the thread count.

use parry3d_f64::bounding_volume::BoundingVolume;
use parry3d_f64::query;
use parry3d_f64::shape::SharedShape;
use rayon::prelude::*;

use super::closing::{ClosedFinger, Obstacles, close_finger};
use super::coupled::{Member, close_together};
use super::{
    CheckError, CheckReport, CheckSettings, ContactReport, Failure, FingerReport, HoldingMargins,
    ObjectReport, Verdict,
};
use crate::geometry::{FingerBody, FingerFrame, ObjectGeometry, free_angles, palm_body};
use crate::grasp::{self, GraspContact, HoldingSettings};
use crate::math::Pose;
use crate::rod::{Rod, SolveStatus};
use crate::scene::{ObjectShape, Scene, TargetObject};

/// Overlap of two fingers' bodies that counts as interference (m): 0.1 mm, ten times
/// the contact solve's penetration tolerance.
pub const INTERFERENCE_TOLERANCE: f64 = 1e-4;

/// Everything about the gripper that does not depend on the object.
struct Rig<'a> {
    scene: &'a Scene,
    frames: Vec<FingerFrame>,
    rods: Vec<Rod>,
    palm: (Pose, SharedShape),
}

impl<'a> Rig<'a> {
    fn new(scene: &'a Scene, settings: &CheckSettings) -> Result<Self, CheckError> {
        let geo = |e: &dyn std::fmt::Display| CheckError::Geometry(e.to_string());
        let mut frames = Vec::new();
        let mut rods = Vec::new();
        for (i, m) in scene.gripper.fingers.iter().enumerate() {
            let a = scene
                .actuators
                .get(m.actuator)
                .ok_or_else(|| CheckError::Geometry(format!("finger {i}: no actuator")))?;
            frames.push(FingerFrame::of_mount(m).map_err(|e| geo(&format!("finger {i}: {e}")))?);
            rods.push(Rod::of_actuator(a, settings.elements).map_err(|e| geo(&e))?);
        }
        let palm = palm_body(&scene.gripper.palm).map_err(|e| geo(&e))?;
        Ok(Self { scene, frames, rods, palm })
    }

    fn actuator(&self, finger: usize) -> &crate::actuator::Actuator {
        &self.scene.actuators[self.scene.gripper.fingers[finger].actuator]
    }
}

/// One object at one pressure, before the verdict's reasons are turned into a report.
struct Evaluation {
    report: ObjectReport,
    closed: Vec<ClosedFinger>,
}

fn interference(bodies: &[&FingerBody]) -> Vec<(usize, usize)> {
    let mut pairs = Vec::new();
    for i in 0..bodies.len() {
        for j in i + 1..bodies.len() {
            let (a, b) = (bodies[i], bodies[j]);
            if !a.aabb().intersects(&b.aabb()) {
                continue;
            }
            let boxes: Vec<_> = b.pieces.iter().map(|q| q.shape.compute_aabb(&q.pose)).collect();
            let hit = a.pieces.iter().any(|p| {
                let pbox = p.shape.compute_aabb(&p.pose);
                b.pieces.iter().zip(&boxes).any(|(q, qbox)| {
                    pbox.intersects(qbox)
                        && matches!(
                            query::contact(&p.pose, p.shape.as_ref(), &q.pose, q.shape.as_ref(), 0.0),
                            Ok(Some(c)) if c.dist < -INTERFERENCE_TOLERANCE
                        )
                })
            });
            if hit {
                pairs.push((i, j));
            }
        }
    }
    pairs
}

/// The connected groups (each sorted, in order of their first finger) of `count`
/// fingers linked by the interfering `pairs`; fingers in no pair are left out.
fn groups(pairs: &[(usize, usize)], count: usize) -> Vec<Vec<usize>> {
    let mut label: Vec<usize> = (0..count).collect();
    for _ in 0..count {
        for &(i, j) in pairs {
            let m = label[i].min(label[j]);
            label[i] = m;
            label[j] = m;
        }
    }
    let mut out: Vec<Vec<usize>> = Vec::new();
    for root in 0..count {
        let g: Vec<usize> = (0..count).filter(|&k| label[k] == root).collect();
        if g.len() > 1 {
            out.push(g);
        }
    }
    out
}

/// How much of an evaluation to compute.
#[derive(Clone, Copy, PartialEq, Eq)]
enum Detail {
    /// Every criterion and the epsilon quality: the report at the supply pressure.
    Full,
    /// Only the verdict, for a sweep point: the criteria in order of cost, stopping at
    /// the first that fails; no epsilon (it is reported, not a criterion).
    Verdict,
}

/// Whether the object is unchanged by every rotation about the gripper's `z` axis: a
/// sphere, an upright cylinder or capsule, or an ellipsoid with equal horizontal
/// semi-axes, centred on the axis. The palm (a disk on the axis) and gravity (`-z`) are
/// too, so then fingers with the same actuator, mount radius and tilt face the same
/// closing problem, each in its own plane.
fn axisymmetric(object: &TargetObject) -> bool {
    let on_axis = object.position.x == 0.0 && object.position.y == 0.0;
    on_axis
        && match &object.shape {
            ObjectShape::Sphere { .. } | ObjectShape::Cylinder { .. } | ObjectShape::Capsule { .. } => true,
            ObjectShape::Ellipsoid { semi_axes } => semi_axes.x == semi_axes.y,
            ObjectShape::Box { .. } | ObjectShape::Mesh { .. } => false,
        }
}

/// Fingers `i` and `j` close identically on an axisymmetric object: same actuator, rod,
/// mount radius and tilt, and the same starting state.
fn same_closing(rig: &Rig<'_>, starts: Option<&[(f64, Vec<f64>)]>, i: usize, j: usize) -> bool {
    let (a, b) = (&rig.scene.gripper.fingers[i], &rig.scene.gripper.fingers[j]);
    let start = |k: usize| starts.and_then(|s| s.get(k));
    a.actuator == b.actuator
        && a.radius == b.radius
        && a.tilt == b.tilt
        && rig.rods[i] == rig.rods[j]
        && start(i) == start(j)
}

/// The closing of finger `from` turned about the `z` axis onto finger `to` (the angles
/// are the same; the body is rebuilt in `to`'s frame; contact points and normals turn by
/// the azimuth difference).
fn rotated_closing(rig: &Rig<'_>, c: &ClosedFinger, from: usize, to: usize) -> Result<ClosedFinger, String> {
    let fingers = &rig.scene.gripper.fingers;
    let turn = crate::math::Rotation::from_rotation_z(fingers[to].azimuth - fingers[from].azimuth);
    let actuator = rig.actuator(to);
    let body = FingerBody::new(&rig.rods[to], &c.angles, &actuator.section, rig.frames[to])
        .map_err(|e| e.to_string())?;
    let contacts = c
        .contacts
        .iter()
        .map(|k| ContactReport { finger: to, point: turn * k.point, normal: turn * k.normal, ..*k })
        .collect();
    Ok(ClosedFinger {
        angles: c.angles.clone(),
        body,
        contacts,
        penetration: c.penetration,
        report: c.report,
    })
}

fn evaluate(
    rig: &Rig<'_>,
    object: &TargetObject,
    geometry: &ObjectGeometry,
    pressure: f64,
    settings: &CheckSettings,
    starts: Option<&[(f64, Vec<f64>)]>,
    detail: Detail,
) -> Result<Evaluation, CheckError> {
    let criteria = &rig.scene.criteria;
    let obstacles = Obstacles { object: geometry, palm: &rig.palm };
    let mut failures = Vec::new();
    let mut closed = Vec::with_capacity(rig.frames.len());
    let symmetric = axisymmetric(object);
    for (i, frame) in rig.frames.iter().enumerate() {
        let actuator = rig.actuator(i);
        let start = starts.and_then(|s| s.get(i)).map(|(p, a)| (*p, a.as_slice()));
        if symmetric && let Some(j) = (0..i).find(|&j| same_closing(rig, starts, i, j)) {
            let c = rotated_closing(rig, &closed[j], j, i).map_err(CheckError::Geometry)?;
            if c.report.status != SolveStatus::Converged {
                failures.push(Failure::NotConverged {
                    what: format!("finger {i} closing on \"{}\" ({})", object.name, c.report.status.name()),
                });
            }
            closed.push(c);
            continue;
        }
        let c = close_finger(
            i,
            actuator,
            &rig.rods[i],
            *frame,
            actuator.section_model,
            pressure,
            &obstacles,
            start,
        )
        .map_err(CheckError::Geometry)?;
        if c.report.status != SolveStatus::Converged {
            failures.push(Failure::NotConverged {
                what: format!("finger {i} closing on \"{}\" ({})", object.name, c.report.status.name()),
            });
        }
        closed.push(c);
    }
    // fingers that run into each other close again, together (each an obstacle of the
    // others), from open
    let bodies: Vec<&FingerBody> = closed.iter().map(|c| &c.body).collect();
    for group in groups(&interference(&bodies), closed.len()) {
        let members: Vec<Member<'_>> = group
            .iter()
            .map(|&i| Member {
                index: i,
                actuator: rig.actuator(i),
                rod: &rig.rods[i],
                frame: rig.frames[i],
                model: rig.actuator(i).section_model,
            })
            .collect();
        // from the previous sweep point's state of the group when it has one (converged,
        // so without overlap between them), else from open
        let start = starts.and_then(|s| {
            let of_group: Option<Vec<&(f64, Vec<f64>)>> = group.iter().map(|&i| s.get(i)).collect();
            let of_group = of_group?;
            let p0 = of_group.first()?.0;
            of_group
                .iter()
                .all(|(p, _)| *p == p0)
                .then(|| (p0, of_group.iter().map(|(_, a)| a.clone()).collect()))
        });
        let together = close_together(&members, pressure, &obstacles, start).map_err(CheckError::Geometry)?;
        let status = together.closed.first().map_or(SolveStatus::Converged, |c| c.report.status);
        if status != SolveStatus::Converged {
            failures.push(Failure::NotConverged {
                what: format!(
                    "fingers {group:?} closing together on \"{}\" ({})",
                    object.name,
                    status.name()
                ),
            });
        }
        for (&i, c) in group.iter().zip(together.closed) {
            closed[i] = c;
        }
    }
    let contacts: Vec<ContactReport> = closed.iter().flat_map(|c| c.contacts.iter().copied()).collect();
    let mut touching: Vec<usize> = contacts.iter().map(|c| c.finger).collect();
    touching.sort_unstable();
    touching.dedup();
    let fingers_in_contact = touching.len();
    let peak_contact_force = contacts.iter().map(|c| c.normal_force).fold(0.0, f64::max);
    let mut report = ObjectReport {
        name: object.name.clone(),
        verdict: Verdict::Fail,
        failures: Vec::new(),
        fingers_in_contact,
        contacts,
        enclosure: 0.0,
        epsilon: 0.0,
        holding: HoldingMargins { lift: 0.0, lateral_min: 0.0 },
        peak_contact_force,
        pressure_window: None,
    };
    // the criteria in order of cost; a sweep point stops at the first failure
    let done = |failures: &Vec<Failure>| detail == Detail::Verdict && !failures.is_empty();
    if fingers_in_contact < criteria.min_fingers_in_contact {
        failures
            .push(Failure::TooFewFingers { got: fingers_in_contact, need: criteria.min_fingers_in_contact });
    }
    if let Some(limit) = object.max_contact_force
        && peak_contact_force > limit
    {
        failures.push(Failure::ContactForce { peak: peak_contact_force, limit });
    }
    if !done(&failures) {
        let bodies: Vec<&FingerBody> = closed.iter().map(|c| &c.body).collect();
        let pairs = interference(&bodies);
        if !pairs.is_empty() {
            failures.push(Failure::Interference { pairs });
        }
    }
    let grasp_contacts: Vec<GraspContact> = report
        .contacts
        .iter()
        .map(|c| GraspContact {
            point: c.point,
            normal: c.normal.normalize(),
            normal_force: c.normal_force,
            friction: object.friction,
            finger: c.finger,
        })
        .collect();
    if !done(&failures) {
        if detail == Detail::Verdict {
            holding_verdict(object, &grasp_contacts, criteria, &mut failures)?;
        } else {
            holding(object, &grasp_contacts, criteria, &mut report.holding, &mut failures)?;
        }
    }
    if !done(&failures) {
        // enclosure by the closed fingers and the palm
        let mut obstacles_list: Vec<(Pose, SharedShape)> =
            closed.iter().flat_map(|c| c.body.obstacles()).collect();
        obstacles_list.push(rig.palm.clone());
        report.enclosure = grasp::enclosure::enclosure(
            geometry.shape.as_ref(),
            &geometry.pose,
            geometry.bounding_radius,
            &obstacles_list,
            settings.enclosure_directions,
        )
        .map_err(|e| CheckError::Geometry(e.to_string()))?
        .fraction;
        if report.enclosure < criteria.min_enclosure {
            failures.push(Failure::Enclosure { got: report.enclosure, need: criteria.min_enclosure });
        }
    }
    if detail == Detail::Full && settings.epsilon && !grasp_contacts.is_empty() {
        report.epsilon = grasp::epsilon_quality(
            &grasp_contacts,
            object.position,
            geometry.bounding_radius,
            grasp::DEFAULT_CONE_EDGES,
        )
        .map(|q| q.epsilon)
        .unwrap_or(0.0);
    }
    report.verdict = if failures.is_empty() { Verdict::Pass } else { Verdict::Fail };
    report.failures = failures;
    Ok(Evaluation { report, closed })
}

/// The holding margins of the lift and lateral load cases (DESIGN 3.4) into `margins`,
/// and a failure for the lift case and for the weakest lateral case if below the safety
/// factor.
fn holding(
    object: &TargetObject,
    contacts: &[GraspContact],
    criteria: &crate::scene::Criteria,
    margins_out: &mut HoldingMargins,
    failures: &mut Vec<Failure>,
) -> Result<(), CheckError> {
    let cases = grasp::load_cases(object.mass, criteria.lift_accel, criteria.lateral_accel)
        .map_err(|e| CheckError::Geometry(format!("object \"{}\": {e}", object.name)))?;
    let margins = grasp::holding_margins(contacts, object.position, &cases, &HoldingSettings::default())
        .map_err(|e| CheckError::Geometry(format!("object \"{}\": {e}", object.name)))?;
    if !margins.all_answered {
        failures.push(Failure::NotConverged { what: format!("holding program for \"{}\"", object.name) });
    }
    let lift = margins.lift.unwrap_or(0.0);
    let lateral_min = margins.lateral_min.unwrap_or(0.0);
    *margins_out = HoldingMargins { lift, lateral_min };
    for m in &margins.cases {
        let is_lift = matches!(m.case.kind, grasp::LoadKind::Lift);
        let worst = if is_lift { lift } else { lateral_min };
        // one reason per kind: the lift case, and the weakest lateral case
        let already = failures
            .iter()
            .any(|f| matches!(f, Failure::Holding { case, .. } if is_lift == (case == "lift")));
        if m.result.scale < criteria.safety_factor && m.result.scale == worst && !already {
            failures.push(Failure::Holding {
                case: m.case.name.clone(),
                margin: m.result.scale,
                need: criteria.safety_factor,
            });
        }
    }
    Ok(())
}

/// Only whether the grasp holds, for a sweep point: the load cases in order (lift first)
/// until one falls below the safety factor or its program gives no answer; the same
/// verdict as [`holding`] (which fails exactly when some case does), without the
/// programs of the cases after the first failure. The margins are not reported.
fn holding_verdict(
    object: &TargetObject,
    contacts: &[GraspContact],
    criteria: &crate::scene::Criteria,
    failures: &mut Vec<Failure>,
) -> Result<(), CheckError> {
    let err = |e: &dyn std::fmt::Display| CheckError::Geometry(format!("object \"{}\": {e}", object.name));
    let cases =
        grasp::load_cases(object.mass, criteria.lift_accel, criteria.lateral_accel).map_err(|e| err(&e))?;
    for case in &cases {
        let r = grasp::holding_scale(contacts, object.position, case, &HoldingSettings::default())
            .map_err(|e| err(&e))?;
        if !r.status.is_answer() {
            failures.push(Failure::NotConverged { what: format!("holding program for \"{}\"", object.name) });
            return Ok(());
        }
        if r.scale < criteria.safety_factor {
            failures.push(Failure::Holding {
                case: case.name.clone(),
                margin: r.scale,
                need: criteria.safety_factor,
            });
            return Ok(());
        }
    }
    Ok(())
}

/// The deepest overlap (m, and with what) of the object at its position with the open
/// fingers (straight, no pressure) and the palm, if deeper than
/// [`INTERFERENCE_TOLERANCE`]: such an object cannot be brought into the gripper.
fn open_overlap(
    open: &[FingerBody],
    palm: &(Pose, SharedShape),
    geometry: &ObjectGeometry,
) -> Result<Option<(String, f64)>, CheckError> {
    let mut worst: Option<(String, f64)> = None;
    let mut consider = |what: &dyn Fn() -> String, pose: &Pose, shape: &SharedShape| {
        let c = query::contact(pose, shape.as_ref(), &geometry.pose, geometry.shape.as_ref(), 0.0)
            .map_err(|_| CheckError::Geometry("unsupported shape pair in the fit test".into()))?;
        if let Some(c) = c
            && -c.dist > INTERFERENCE_TOLERANCE
            && worst.as_ref().is_none_or(|(_, d)| -c.dist > *d)
        {
            worst = Some((what(), -c.dist));
        }
        Ok::<(), CheckError>(())
    };
    for (i, body) in open.iter().enumerate() {
        for piece in &body.pieces {
            consider(&|| format!("finger {i}"), &piece.pose, &piece.shape)?;
        }
    }
    consider(&|| "the palm".to_string(), &palm.0, &palm.1)?;
    Ok(worst)
}

/// Widest run of consecutive `true`s: `(first, last)` indices.
fn widest_run(pass: &[bool]) -> Option<(usize, usize)> {
    let mut best: Option<(usize, usize)> = None;
    let mut start = None;
    for (i, &p) in pass.iter().chain(std::iter::once(&false)).enumerate() {
        match (p, start) {
            (true, None) => start = Some(i),
            (false, Some(s)) => {
                if best.is_none_or(|(a, b)| i - 1 - s > b - a) {
                    best = Some((s, i - 1));
                }
                start = None;
            }
            _ => {}
        }
    }
    best
}

/// Runs the grasp check of `scene`.
///
/// # Errors
/// [`CheckError`] for settings out of range or geometry the solvers refuse. Solver
/// non-convergence is not an error: it is a [`Failure::NotConverged`] in the object's
/// report.
pub fn check_scene(scene: &Scene, settings: &CheckSettings) -> Result<CheckReport, CheckError> {
    if settings.elements < 40 || settings.elements > 400 {
        return Err(CheckError::BadSetting(format!(
            "elements must be between 40 and 400, got {}",
            settings.elements
        )));
    }
    if settings.enclosure_directions < grasp::enclosure::MIN_DIRECTIONS
        || settings.enclosure_directions > grasp::enclosure::MAX_DIRECTIONS
    {
        return Err(CheckError::BadSetting(format!(
            "enclosure directions must be between {} and {}, got {}",
            grasp::enclosure::MIN_DIRECTIONS,
            grasp::enclosure::MAX_DIRECTIONS,
            settings.enclosure_directions
        )));
    }
    let pressure = settings.pressure_override.unwrap_or(scene.criteria.pressure);
    if !(pressure.is_finite() && pressure >= 0.0) {
        return Err(CheckError::BadSetting(format!("pressure must be finite and >= 0, got {pressure} Pa")));
    }
    let rig = Rig::new(scene, settings)?;
    // the fingers, free (weightless, as `bend` reports them)
    let mut fingers = Vec::new();
    let mut free_bodies = Vec::new();
    for (i, frame) in rig.frames.iter().enumerate() {
        let a = rig.actuator(i);
        let free = a.free_bending(pressure).map_err(|e| CheckError::Geometry(format!("finger {i}: {e}")))?;
        let body =
            FingerBody::new(&rig.rods[i], &free_angles(&rig.rods[i], free.curvature), &a.section, *frame)
                .map_err(|e| CheckError::Geometry(e.to_string()))?;
        free_bodies.push(body);
        fingers.push(FingerReport {
            index: i,
            actuator: a.name.clone(),
            free_bend: free.bend_angle,
            tip: frame.to_world(free.tip),
            max_stretch: free.max_stretch,
            interferes_with: Vec::new(),
        });
    }
    let refs: Vec<&FingerBody> = free_bodies.iter().collect();
    for (i, j) in interference(&refs) {
        fingers[i].interferes_with.push(j);
        fingers[j].interferes_with.push(i);
    }
    let geometries: Vec<ObjectGeometry> = scene
        .objects
        .iter()
        .map(|o| {
            ObjectGeometry::of_object(o)
                .map_err(|e| CheckError::Geometry(format!("object \"{}\": {e}", o.name)))
        })
        .collect::<Result<_, _>>()?;
    let sweep: Vec<f64> = scene.criteria.sweep.map(|s| s.pressures()).unwrap_or_default();
    let open: Vec<FingerBody> = rig
        .frames
        .iter()
        .enumerate()
        .map(|(i, frame)| {
            FingerBody::new(&rig.rods[i], &vec![0.0; rig.rods[i].dofs()], &rig.actuator(i).section, *frame)
                .map_err(|e| CheckError::Geometry(e.to_string()))
        })
        .collect::<Result<_, _>>()?;
    let per_object: Vec<Result<(ObjectReport, Vec<bool>), CheckError>> = scene
        .objects
        .par_iter()
        .zip(geometries.par_iter())
        .map(|(object, geometry)| {
            if let Some((obstacle, depth)) = open_overlap(&open, &rig.palm, geometry)? {
                // nothing to close on: the gripper cannot take it at any pressure
                let report = ObjectReport {
                    name: object.name.clone(),
                    verdict: Verdict::Fail,
                    failures: vec![Failure::DoesNotFit { obstacle, depth }],
                    fingers_in_contact: 0,
                    contacts: Vec::new(),
                    enclosure: 0.0,
                    epsilon: 0.0,
                    holding: HoldingMargins { lift: 0.0, lateral_min: 0.0 },
                    peak_contact_force: 0.0,
                    pressure_window: None,
                };
                return Ok((report, vec![false; sweep.len()]));
            }
            // one quasi-static path of rising pressure through the sweep's pressures and
            // the supply pressure (each closing from the previous one's state, the first
            // from open): every criterion at the supply pressure, the verdict alone at the
            // other sweep points; a sweep point at the supply pressure takes the supply's
            // verdict, so the window agrees with it there
            let supply_on_sweep = sweep.contains(&pressure);
            let mut path = sweep.clone();
            if !supply_on_sweep {
                path.push(pressure);
                path.sort_by(f64::total_cmp);
            }
            let mut supply = None;
            let mut passes = Vec::with_capacity(sweep.len());
            let mut starts: Option<Vec<(f64, Vec<f64>)>> = None;
            for &p in &path {
                let at_supply = p == pressure;
                let detail = if at_supply { Detail::Full } else { Detail::Verdict };
                let e = evaluate(&rig, object, geometry, p, settings, starts.as_deref(), detail)?;
                if !at_supply || supply_on_sweep {
                    passes.push(e.report.verdict == Verdict::Pass);
                }
                let converged = e.closed.iter().all(|c| c.report.status == SolveStatus::Converged);
                starts = converged.then(|| e.closed.into_iter().map(|c| (p, c.angles)).collect());
                if at_supply {
                    supply = Some(e.report);
                }
            }
            let supply = supply
                .ok_or_else(|| CheckError::Geometry("the supply pressure is not on the path".into()))?;
            let mut report = supply;
            report.pressure_window = widest_run(&passes).map(|(a, b)| (sweep[a], sweep[b]));
            Ok((report, passes))
        })
        .collect();
    let mut objects = Vec::with_capacity(per_object.len());
    let mut pass_sets = Vec::with_capacity(per_object.len());
    for r in per_object {
        let (report, passes) = r?;
        objects.push(report);
        pass_sets.push(passes);
    }
    let (recommended_pressure, clashes) = if sweep.is_empty() {
        (None, Vec::new())
    } else {
        let all: Vec<bool> = (0..sweep.len()).map(|k| pass_sets.iter().all(|p| p[k])).collect();
        match widest_run(&all) {
            Some((a, b)) => (Some(sweep[(a + b) / 2]), Vec::new()),
            None => {
                let mut clashes = Vec::new();
                for i in 0..objects.len() {
                    for j in i + 1..objects.len() {
                        let (pi, pj) = (&pass_sets[i], &pass_sets[j]);
                        let both_somewhere = pi.iter().any(|&x| x) && pj.iter().any(|&x| x);
                        if both_somewhere && !pi.iter().zip(pj).any(|(a, b)| *a && *b) {
                            clashes.push((objects[i].name.clone(), objects[j].name.clone()));
                        }
                    }
                }
                (None, clashes)
            }
        }
    };
    let verdict =
        if objects.iter().all(|o| o.verdict == Verdict::Pass) { Verdict::Pass } else { Verdict::Fail };
    Ok(CheckReport {
        scene: scene.name.clone(),
        pressure,
        verdict,
        fingers,
        objects,
        recommended_pressure,
        clashes,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn widest_run_picks_the_longest_contiguous_pass() {
        assert_eq!(widest_run(&[false, true, true, false, true, true, true]), Some((4, 6)));
        assert_eq!(widest_run(&[true, false]), Some((0, 0)));
        assert_eq!(widest_run(&[false, false]), None);
        assert_eq!(widest_run(&[]), None);
        // ties go to the first run
        assert_eq!(widest_run(&[true, true, false, true, true]), Some((0, 1)));
    }
}
