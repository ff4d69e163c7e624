//! Stage 1 of the grasp (DESIGN 3.4): each finger closes at the supply pressure on an
//! object held at its scene pose; contacts are frictionless here (normal forces only).
//!
//! Method: each finger is the rod of [`crate::rod`] with its section law, its own weight
//! (rubber density times volume, lumped at element midpoints, gravity `-z`) and
//! unilateral contact against the object and the palm. The pressure is ramped from zero
//! in steps (the finger closes from open, as on the bench). Each pressure step is solved
//! by SQP steps ([`crate::rod::contact_step`]): before every step the contact geometry
//! is linearised about the current configuration — for every body piece within
//! [`PREDICTION`] of an obstacle, parry's closest points give a gap
//! `g = d - n_p . (x - x_0)` for the material point under the contact, `n_p` the in-plane
//! part of the contact normal — and one quadratic program in the angles, with those gaps
//! as linear constraints, gives the step and the contact forces together. The step is
//! limited to node moves of half the prediction distance (what the linearisation sees).
//! A step is settled when the equilibrium residual is below 1e-8 relative (DESIGN 3.3),
//! the step itself below 1e-9 rad and the true penetration below
//! [`PENETRATION_TOLERANCE`] (0.01 mm). The forces and active set of one step seed the
//! next, matched by body piece. (An earlier version solved each linearisation to
//! convergence with the active-set method of [`crate::rod::solve_with_gaps`], itself a
//! sequence of Newton solves: the same equilibria, at many times the cost.)
//! Out-of-plane components of contact forces are carried by
//! the finger's lateral stiffness, taken as rigid (DESIGN 3.3). A finger whose contact
//! normal lies almost out of its plane (in-plane part below 5 %) cannot push that way and
//! gets no gap there. The section where the chamber leaves the hub is clamped and gets
//! no gap (no angle moves it). Only body pieces whose bounding sphere comes within the
//! prediction distance of an obstacle's box are built and queried.
//!
//! Step control: a pressure step that does not settle is halved. A solve that carries
//! the body deeper into an obstacle than a quarter of the obstacle's smallest extent
//! (a finger snapping past a limit point, through a thin palm, say) is retried at the
//! same pressure with gaps against obstacles up to 4, 16, ... times farther (at most the
//! finger's length), since the nearest face of a deep overlap may be the far one.
//!
//! Each finger closes here against the object and the palm alone. Neighbouring fingers
//! are obstacles of each other too (DESIGN 3.3): fingers whose closed bodies intersect
//! are closed again together by [`super::coupled`], and any overlap left after that is
//! reported as interference (a failure of the grasp).

use parry3d_f64::bounding_volume::BoundingVolume;
use parry3d_f64::query;
use parry3d_f64::shape::SharedShape;

use super::ContactReport;
use crate::actuator::Actuator;
use crate::geometry::{FingerBody, FingerFrame, ObjectGeometry, PieceKind};
use crate::math::{Pose, Vec2, Vec3};
use crate::rod::{
    Chain, GAP_TOLERANCE, MaterialPoint, PointGap, PointLoad, RESIDUAL_TOLERANCE, Rod, SolveReport,
    SolveStatus, contact_step, limit_step_with_nodes,
};
use crate::section::SectionModel;

/// Standard gravity (m/s²; the conventional value, CGPM 1901).
pub const GRAVITY: f64 = 9.806_65;
/// Distance within which a body piece gets a (possibly open) gap (m).
pub const PREDICTION: f64 = 6e-3;
/// Largest penetration accepted in a converged closed state (m), DESIGN 3.3.
pub const PENETRATION_TOLERANCE: f64 = 1e-5;
/// Deepest penetration after a solve that re-linearisation may repair, as a fraction of
/// the obstacle's smallest extent (its bounding box's): deeper, the nearest face may be
/// the far one (a thin palm passed through), the linearisation does not hold, and the
/// pressure step is retried smaller.
const MAX_STEP_DEPTH: f64 = 0.25;
/// Largest pressure step (Pa) of the ramp from open (straight, at zero pressure): the
/// ramp to a pressure `p` takes `ceil(p / RAMP_STEP)` equal steps (4 to the demo's
/// 100 kPa supply, one to a sweep's first point at 20 kPa). A closing from a nearby
/// closed state (the previous point of a sweep) tries the whole step at once.
pub(super) const RAMP_STEP: f64 = 25e3;

/// The first pressure step (Pa) of a closing from `from` to `to`: the whole way from a
/// closed state (`warm`), an equal share of at most [`RAMP_STEP`] from open.
pub(super) fn first_pressure_step(from: f64, to: f64, warm: bool) -> f64 {
    if warm { to - from } else { (to - from) / ((to - from).abs() / RAMP_STEP).ceil().max(1.0) }
}
/// SQP steps (each with a fresh linearisation of the contact geometry) allowed per
/// pressure step.
pub(super) const MAX_STEPS: usize = 60;
/// SQP steps allowed in one whole closing, over all its pressure steps and retries: a
/// first attempt and one halved attempt of [`MAX_STEPS`] each. A closing that settles
/// needs far fewer: on the demo sweep's 10 000 single-finger closings at most 82 (8 on
/// average from the previous sweep point, 10 from open), while one that never settles
/// (a finger slipping past a limit point, where no nearby equilibrium exists) would
/// otherwise spend [`MAX_STEPS`] on every one of its [`MAX_HALVINGS`] smaller steps.
pub(super) const CLOSING_BUDGET: usize = 2 * MAX_STEPS;
/// Largest angle step (rad) of a settled state: the next step would not move it.
pub(super) const STEP_TOLERANCE: f64 = 1e-9;
/// Pressure-step halvings allowed in one closing.
pub const MAX_HALVINGS: usize = 12;
/// Failed settles at one and the same pressure after which a closing ends as not
/// converged: that pressure lies past a limit point of the quasi-static path (a finger
/// slipping past the object), since it was not reached from two different settled
/// states below it. After a failure the step is halved; the halved step settles, and
/// the grown step after it is cut back to the target, which then fails again, up to
/// [`MAX_HALVINGS`] times. On the bench sweep's 64 candidates (10 100 single closings)
/// every closing that converged reached each pressure by its first or second try, while
/// the 93 that did not converge spent 6 200 of their 11 200 steps on third and later
/// tries.
pub(super) const REPEATED_FAILURES: usize = 2;

/// The failed settles of one closing, by target pressure: how often each target
/// failed and the equilibrium residual its latest failure ended with. Targets are
/// compared exactly, as a retried target is the very value tried before (the closing's
/// own pressure, or one of the sweep's).
#[derive(Debug, Default)]
pub(super) struct FailedTargets(Vec<FailedTarget>);

#[derive(Debug)]
struct FailedTarget {
    pressure: f64,
    count: usize,
    residual: f64,
}

impl FailedTargets {
    /// Records a failed settle at `target` (Pa) that ended with `residual`; returns how
    /// many times `target` has failed now, and the residual of its previous failure.
    pub(super) fn record(&mut self, target: f64, residual: f64) -> (usize, Option<f64>) {
        match self.0.iter_mut().find(|f| f.pressure == target) {
            Some(f) => {
                f.count += 1;
                let previous = std::mem::replace(&mut f.residual, residual);
                (f.count, Some(previous))
            }
            None => {
                self.0.push(FailedTarget { pressure: target, count: 1, residual });
                (1, None)
            }
        }
    }
}
/// Smallest move allowed per SQP step (m): when steps that keep turning back have
/// halved the allowed move below this (ten million times below the penetration
/// tolerance), the iteration is stuck between two linearisations and no later step
/// changes the state; the pressure step is reported as stalled at once instead of
/// spending the remaining steps.
pub(super) const MIN_MOVE: f64 = 1e-12;
/// Move bound (m) below which a step that still leaves a relative equilibrium residual
/// above [`STALL_RESIDUAL`] is taken as stalled: the steps keep reversing while the
/// finger is far from equilibrium, so no equilibrium lies within a micrometre of the
/// linearisations (a limit point, the finger about to slip past the object or another
/// finger). On the bench sweep's 64 candidates (10 500 single and 300 joint settles) a
/// settle that converged never had a residual above 6e-5 once its bound was this
/// small, while three quarters of those that never settled had one of 1e-2 to 1e-1 and
/// spent 20 to 40 more steps halving the bound down to [`MIN_MOVE`].
pub(super) const STALL_MOVE: f64 = 1e-6;
/// See [`STALL_MOVE`]: a relative residual (over the rod's moment scale) ten times the
/// largest seen in a converging settle at that bound.
pub(super) const STALL_RESIDUAL: f64 = 1e-3;

/// The settle is stuck: the move bound `max_move` (m) after a halving has fallen below
/// [`MIN_MOVE`], or below [`STALL_MOVE`] with the relative `residual` of the step still
/// above [`STALL_RESIDUAL`].
pub(super) fn stalled(max_move: f64, residual: f64) -> bool {
    max_move < MIN_MOVE || (max_move < STALL_MOVE && residual > STALL_RESIDUAL)
}

/// The closed state of one finger on one object.
#[derive(Debug, Clone)]
pub struct ClosedFinger {
    /// Element-end angles of the solved rod (rad).
    pub angles: Vec<f64>,
    /// The body in the closed state.
    pub body: FingerBody,
    /// Contacts with the object (normal forces > 0).
    pub contacts: Vec<ContactReport>,
    /// Largest penetration of the body into the object or the palm (m; <= 0 if apart).
    pub penetration: f64,
    /// Convergence of the last rod solve (status `Converged` only if every step and the
    /// penetration test converged).
    pub report: SolveReport,
}

/// What a finger closes against.
pub struct Obstacles<'a> {
    /// The target object.
    pub object: &'a ObjectGeometry,
    /// The palm.
    pub palm: &'a (Pose, SharedShape),
}

impl Obstacles<'_> {
    /// A test of a body piece's bounding sphere (centre, radius; m) against the
    /// obstacles' boxes grown by `prediction` (m): false means no contact query on the piece
    /// can report a contact.
    fn near(&self, prediction: f64) -> impl Fn(Vec3, f64) -> bool + use<> {
        let boxes = [
            self.object.shape.compute_aabb(&self.object.pose).loosened(prediction),
            self.palm.1.compute_aabb(&self.palm.0).loosened(prediction),
        ];
        move |centre: Vec3, radius: f64| {
            boxes.iter().any(|b| {
                let nearest = centre.clamp(b.mins, b.maxs);
                (nearest - centre).length() <= radius
            })
        }
    }
}

/// Point loads of the finger's own weight: the rubber of each chamber element (section
/// rubber area times its length) at the element's middle, the solid tip cap at its
/// middle, on the rubber's centroid height; the base is clamped and carries its own.
pub fn weight_loads(actuator: &Actuator, rod: &Rod, frame: &FingerFrame) -> Vec<PointLoad> {
    let (gravity_plane, _) = frame.plane_direction(Vec3::new(0.0, 0.0, -GRAVITY));
    let rho = actuator.material.density;
    let q = actuator.section.quadrature(crate::actuator::SECTION_GAUSS_POINTS);
    let area = q.rubber_moment(0);
    let y_c = q.rubber_moment(1) / area;
    let h = rod.element_length();
    let mut loads: Vec<PointLoad> = (0..rod.elements)
        .map(|i| PointLoad {
            point: MaterialPoint { s: rod.base_length + h * (i as f64 + 0.5), y: y_c },
            force: rho * area * h * gravity_plane,
        })
        .collect();
    if rod.tip_length > 0.0 {
        let full = area + actuator.section.chamber_area();
        let y_full = (q.rubber_moment(1) + q.chamber_area * q.chamber_centroid) / full;
        loads.push(PointLoad {
            point: MaterialPoint { s: rod.length() - 0.5 * rod.tip_length, y: y_full },
            force: rho * full * rod.tip_length * gravity_plane,
        });
    }
    loads
}

/// One linearised contact: which piece, the gap, and how to turn its force into a
/// world-frame contact.
pub(super) struct Linearised {
    pub(super) piece: PieceKind,
    pub(super) gap: PointGap,
    /// In-plane share of the unit world normal, `|n_p|`.
    pub(super) in_plane: f64,
    /// Witness on the obstacle (m, gripper frame).
    pub(super) point: Vec3,
    /// World normal from the finger into the obstacle.
    pub(super) normal: Vec3,
    /// Against the object (true) or the palm.
    pub(super) on_object: bool,
}

pub(super) fn linearise(
    chain: &Chain<'_>,
    body: &FingerBody,
    obstacles: &Obstacles<'_>,
    prediction: f64,
) -> Result<(Vec<Linearised>, f64, bool), String> {
    let rod = chain.rod();
    let mut out = Vec::new();
    let mut penetration = f64::NEG_INFINITY;
    let mut too_deep = false;
    let targets: [(&Pose, &SharedShape, bool); 2] = [
        (&obstacles.object.pose, &obstacles.object.shape, true),
        (&obstacles.palm.0, &obstacles.palm.1, false),
    ];
    let depth_limit = |pose: &Pose, shape: &SharedShape| {
        let e = shape.compute_aabb(pose).extents();
        MAX_STEP_DEPTH * e.x.min(e.y).min(e.z)
    };
    let limits = [depth_limit(targets[0].0, targets[0].1), depth_limit(targets[1].0, targets[1].1)];
    // no contact within `prediction` where the boxes grown by it do not meet
    let boxes = targets.map(|(pose, shape, _)| shape.compute_aabb(pose).loosened(prediction));
    for (i, piece) in body.pieces.iter().enumerate() {
        if piece.kind == PieceKind::Base {
            continue; // clamped in the hub: it cannot move to open or close a gap
        }
        let piece_box = piece.shape.compute_aabb(&piece.pose);
        for ((&(pose, shape, on_object), &limit), reach) in targets.iter().zip(&limits).zip(&boxes) {
            if !reach.intersects(&piece_box) {
                continue;
            }
            let c = query::contact(&piece.pose, piece.shape.as_ref(), pose, shape.as_ref(), prediction)
                .map_err(|_| "unsupported shape pair in the contact query".to_string())?;
            let Some(c) = c else { continue };
            penetration = penetration.max(-c.dist);
            too_deep |= -c.dist > limit;
            let normal: Vec3 = c.normal1;
            let (np, _) = body.frame.plane_direction(normal);
            let in_plane = np.length();
            if in_plane < 0.05 {
                continue;
            }
            let (mp, _) = body.material_point(i, c.point1).map_err(|e| e.to_string())?;
            if mp.s <= rod.base_length + 1e-9 * rod.length() {
                // the section where the chamber leaves the hub is clamped: no angle moves
                // it, so a gap there is a constant that the rod can neither open nor close
                continue;
            }
            // neighbouring pieces share their end sections: a contact on the shared edge
            // shows up twice, as the same gap
            if out.iter().any(|l: &Linearised| {
                l.on_object == on_object
                    && (l.gap.point.s - mp.s).abs() < 1e-9
                    && (l.gap.point.y - mp.y).abs() < 1e-9
            }) {
                continue;
            }
            let x0 = chain.position(mp).map_err(|e| e.to_string())?;
            // g = d - n_p . (x - x0) >= 0, scaled by 1/|n_p|: unit normal -n_p/|n_p|
            let unit = -np / in_plane;
            let gap = PointGap { point: mp, normal: unit, offset: unit.dot(x0) - c.dist / in_plane };
            out.push(Linearised { piece: piece.kind, gap, in_plane, point: c.point2, normal, on_object });
        }
    }
    Ok((out, penetration, too_deep))
}

pub(super) fn element_index(kind: PieceKind, elements: usize) -> usize {
    match kind {
        PieceKind::Base => 0,
        PieceKind::Element(i) => i,
        PieceKind::Tip => elements,
    }
}

/// The outcome of one pressure step of the closing ramp.
struct StepResult {
    angles: Vec<f64>,
    lin: Vec<Linearised>,
    forces: Vec<f64>,
    penetration: f64,
}

/// How one pressure step of the closing ended.
enum Settle {
    /// Closed within the tolerances.
    Settled(StepResult),
    /// The solve moved the body deep into an obstacle (it jumped, e.g. a finger
    /// snapping past a limit point toward the palm): worth retrying with gaps against
    /// more distant obstacles. With gaps against everything the finger can reach, a deep
    /// state is left to re-linearisation to repair.
    TooDeep,
    /// Did not settle: take a smaller step.
    Failed,
}

/// Closes the finger at pressure `p` from `angles` by SQP steps ([`contact_step`]), the
/// contact geometry linearised afresh before each step, with gaps for the body pieces
/// within `prediction` (m) of an obstacle. Each step is limited to node moves of half
/// the prediction distance (what the linearisation sees); the forces and the active set
/// of one step seed the next, matched by body piece and obstacle.
#[expect(clippy::too_many_arguments, reason = "internal helper of close_finger")]
fn settle(
    actuator: &Actuator,
    rod: &Rod,
    frame: FingerFrame,
    model: SectionModel,
    p: f64,
    loads: &[PointLoad],
    (obstacles, prediction): (&Obstacles<'_>, f64),
    angles: &[f64],
    report: &mut SolveReport,
) -> Result<Settle, String> {
    let law = actuator.law(p, model);
    let mut angles = angles.to_vec();
    let near = obstacles.near(prediction);
    // (piece, on the object, force, active) of the previous step
    let mut previous: Vec<(PieceKind, bool, f64, bool)> = Vec::new();
    let mut previous_step: Option<Vec<f64>> = None;
    let mut max_move = 0.5 * prediction;
    // the nodes at the angles after the previous step, from its step limit
    let mut next_nodes: Option<Vec<Vec2>> = None;
    for _ in 0..MAX_STEPS.min(CLOSING_BUDGET.saturating_sub(report.iterations)) {
        report.iterations += 1;
        let chain = match next_nodes.take() {
            Some(nodes) => Chain::with_nodes(rod, &angles, nodes),
            None => Chain::new(rod, &angles),
        }
        .map_err(|e| e.to_string())?;
        let body =
            FingerBody::of_chain_where(&chain, &actuator.section, frame, &near).map_err(|e| e.to_string())?;
        let (lin, pen, too_deep) = linearise(&chain, &body, obstacles, prediction)?;
        if too_deep && prediction < rod.length() {
            return Ok(Settle::TooDeep);
        }
        let penetration = pen.max(0.0);
        let gaps: Vec<PointGap> = lin.iter().map(|l| l.gap).collect();
        let carried = |l: &Linearised| previous.iter().find(|q| q.0 == l.piece && q.1 == l.on_object);
        let curvature_forces: Vec<f64> = lin.iter().map(|l| carried(l).map_or(0.0, |q| q.2)).collect();
        let seed: Option<Vec<bool>> = (!previous.is_empty())
            .then(|| lin.iter().map(|l| carried(l).map_or_else(|| is_closed(&chain, l), |q| q.3)).collect());
        let step = match contact_step(&chain, &law, loads, &gaps, &curvature_forces, seed.as_deref()) {
            Ok(s) => s,
            // a curvature outside the law's range, or a degenerate contact program
            Err(_) => {
                report.status = SolveStatus::Stalled;
                return Ok(Settle::Failed);
            }
        };
        report.residual = step.residual;
        let size = step.step.iter().fold(0.0f64, |a, v| a.max(v.abs()));
        report.constraint_residual = penetration / rod.length();
        if step.residual <= RESIDUAL_TOLERANCE
            && size <= STEP_TOLERANCE
            && penetration <= PENETRATION_TOLERANCE
        {
            return Ok(Settle::Settled(StepResult { angles, lin, forces: step.forces, penetration }));
        }
        // a step that turns back on the previous one (the contact switching between two
        // pieces, each linearisation sending the finger toward the other) halves the
        // move allowed; steps taken whole let it grow back to half the prediction
        let mut d = step.step;
        let turns_back = turns_back(previous_step.as_deref(), &d);
        if turns_back {
            max_move *= 0.5;
            if stalled(max_move, step.residual) {
                report.status = SolveStatus::Stalled;
                return Ok(Settle::Failed);
            }
        }
        let (alpha, nodes) = limit_step_with_nodes(&chain, &mut d, max_move);
        next_nodes = nodes;
        if alpha >= 1.0 && !turns_back {
            max_move = (2.0 * max_move).min(0.5 * prediction);
        }
        previous_step = Some(d.clone());
        for (a, v) in angles.iter_mut().zip(&d) {
            *a += v;
        }
        if angles.iter().any(|a| !a.is_finite()) {
            report.status = SolveStatus::Stalled;
            return Ok(Settle::Failed);
        }
        previous = lin
            .iter()
            .zip(step.forces.iter().zip(&step.active))
            .map(|(l, (f, a))| (l.piece, l.on_object, *f, *a))
            .collect();
    }
    report.status = SolveStatus::IterationLimit;
    Ok(Settle::Failed)
}

/// The report of a closing before its first step.
pub(super) fn fresh_report() -> SolveReport {
    SolveReport {
        status: SolveStatus::Converged,
        iterations: 0,
        residual: 0.0,
        constraint_residual: 0.0,
        load_steps: 0,
    }
}

/// A step that turns back on the `previous` one (by more than about 107°).
pub(super) fn turns_back(previous: Option<&[f64]>, step: &[f64]) -> bool {
    previous.is_some_and(|q| {
        let dot: f64 = q.iter().zip(step).map(|(a, b)| a * b).sum();
        let norms =
            q.iter().map(|v| v * v).sum::<f64>().sqrt() * step.iter().map(|v| v * v).sum::<f64>().sqrt();
        dot < -0.3 * norms
    })
}

/// A gap closed (or nearly) at the current configuration: it starts active.
pub(super) fn is_closed(chain: &Chain<'_>, l: &Linearised) -> bool {
    chain.position(l.gap.point).is_ok_and(|x| l.gap.normal.dot(x) - l.gap.offset <= GAP_TOLERANCE)
}

/// Closes finger `finger` (mounted at `frame`) of `actuator` at `pressure` (Pa) on the
/// obstacles, from `start` (a closed state at a lower pressure of a sweep, or `None` =
/// straight at zero pressure). The pressure is ramped in steps that halve when a step
/// does not settle (at most [`MAX_HALVINGS`] times) and grow again after a success; the
/// whole closing takes at most [`CLOSING_BUDGET`] SQP steps.
///
/// # Errors
/// A geometry the queries cannot handle; non-convergence is reported in the result.
#[expect(clippy::too_many_arguments, reason = "the closing problem has this many independent inputs")]
pub fn close_finger(
    finger: usize,
    actuator: &Actuator,
    rod: &Rod,
    frame: FingerFrame,
    model: SectionModel,
    pressure: f64,
    obstacles: &Obstacles<'_>,
    start: Option<(f64, &[f64])>,
) -> Result<ClosedFinger, String> {
    let loads = weight_loads(actuator, rod, &frame);
    let (mut p_done, mut angles) = match start {
        Some((p, a)) => (p, a.to_vec()),
        None => (0.0, vec![0.0; rod.dofs()]),
    };
    let span = (pressure - p_done).abs().max(1.0);
    let mut dp = first_pressure_step(p_done, pressure, start.is_some());
    let mut report = fresh_report();
    let mut last: Option<StepResult> = None;
    let mut halvings = 0;
    let mut failed = FailedTargets::default();
    let mut prediction = PREDICTION;
    loop {
        let target = if dp.abs() >= (pressure - p_done).abs() { pressure } else { p_done + dp };
        let outcome = settle(
            actuator,
            rod,
            frame,
            model,
            target,
            &loads,
            (obstacles, prediction),
            &angles,
            &mut report,
        )?;
        if let Settle::TooDeep = outcome
            && prediction < rod.length()
        {
            // the same step again, with gaps against obstacles farther away (at most as
            // far as the finger reaches): a finger that snaps through a limit point
            // moves farther in one step than the usual prediction distance
            prediction = (4.0 * prediction).min(rod.length());
            continue;
        }
        match outcome {
            Settle::Settled(step) => {
                prediction = PREDICTION;
                angles.clone_from(&step.angles);
                p_done = target;
                report.load_steps += 1;
                last = Some(step);
                if (p_done - pressure).abs() <= 1e-12 * span {
                    break;
                }
                dp *= 1.5;
            }
            Settle::TooDeep | Settle::Failed => {
                halvings += 1;
                let (failures, _) = failed.record(target, report.residual);
                // half the step that failed: a step grown past the rest of the way
                // was cut to it, and the same step from the same state fails again
                dp = 0.5 * (target - p_done);
                if halvings > MAX_HALVINGS
                    || failures >= REPEATED_FAILURES
                    || dp.abs() < span / 4096.0
                    || report.iterations >= CLOSING_BUDGET
                {
                    if report.status == SolveStatus::Converged {
                        report.status = SolveStatus::IterationLimit;
                    }
                    let body =
                        FingerBody::new(rod, &angles, &actuator.section, frame).map_err(|e| e.to_string())?;
                    let penetration = last.as_ref().map_or(0.0, |s| s.penetration);
                    return Ok(ClosedFinger { angles, body, contacts: Vec::new(), penetration, report });
                }
                report.status = SolveStatus::Converged;
            }
        }
    }
    let body = FingerBody::new(rod, &angles, &actuator.section, frame).map_err(|e| e.to_string())?;
    let (contacts, penetration) = match last {
        Some(step) => (object_contacts(finger, rod, &step.lin, &step.forces), step.penetration),
        None => (Vec::new(), 0.0),
    };
    Ok(ClosedFinger { angles, body, contacts, penetration, report })
}

/// The contacts with the object among linearised contacts `lin` with forces `forces`
/// (the scaled gap forces of [`linearise`]): those pushing, in world terms.
pub(super) fn object_contacts(
    finger: usize,
    rod: &Rod,
    lin: &[Linearised],
    forces: &[f64],
) -> Vec<ContactReport> {
    lin.iter()
        .zip(forces)
        .filter(|(l, f)| l.on_object && **f > 0.0)
        .map(|(l, f)| ContactReport {
            finger,
            element: element_index(l.piece, rod.elements),
            point: l.point,
            normal: l.normal,
            normal_force: f / l.in_plane,
        })
        .collect()
}

#[cfg(test)]
pub(super) mod tests {
    use super::*;
    use crate::actuator::Fiber;
    use crate::geometry::palm_body;
    use crate::material::{HyperelasticModel, Material, NeoHookean};
    use crate::scene::{ObjectShape, Palm};
    use crate::section::{BoxSection, SectionProfile};

    /// The 3-finger demo scene's finger (invented demo values): Shore 00-30 class rubber.
    pub(crate) fn demo_finger() -> Actuator {
        Actuator::new(
            "box-100",
            "platinum silicone, Shore 00-30",
            Material {
                model: HyperelasticModel::NeoHookean(NeoHookean::new(69e3 / 1.75).unwrap()),
                density: 1070.0,
                stretch_at_break: 10.0,
            },
            SectionProfile::Box(BoxSection::new(14e-3, 10e-3, 3e-3, 3e-3, 2.5e-3, 1e-3).unwrap()),
            0.1,
            0.006,
            0.005,
            Fiber { pitch: 3.5e-3, width: 1e-3 },
            60e3,
            SectionModel::WallPressure,
        )
        .unwrap()
    }

    /// Every reported contact set balances the finger (statics of a rod, the free-body
    /// diagram of the part beyond a cut; Timoshenko & Gere, "Theory of Elastic
    /// Stability", 1961, ch. 2, for the elastica): at the middle of every element the
    /// internal moment of the section law, `m(kappa_j)`, equals the moment about that
    /// point of every load beyond it, the reported contact forces (`-normal_force *
    /// normal`, at the reported points, taken into the finger's plane) and the finger's
    /// weight. Recomputed here from the report alone, so a wrong point, normal, scale or
    /// element in the report shows; the discretisation error is `O(h^2)`, well under
    /// the 2 % of the largest moment allowed.
    #[test]
    fn every_reported_contact_set_balances_the_finger() {
        let a = demo_finger();
        let rod = Rod::of_actuator(&a, 40).unwrap();
        let frame = FingerFrame::new(0.0, 0.065, 0.0).unwrap();
        let palm = palm_body(&Palm::Disk { radius: 0.075, thickness: 0.012 }).unwrap();
        let cases = [
            (ObjectShape::Sphere { radius: 0.034 }, Vec3::new(0.0, 0.0, -0.075), 40.0),
            (ObjectShape::Box { size: Vec3::new(0.12, 0.08, 0.05) }, Vec3::new(0.0, 0.0, -0.08), 40.0),
            (ObjectShape::Cylinder { radius: 0.035, height: 0.09 }, Vec3::new(0.0, 0.0, -0.065), 30.0),
        ];
        for (shape, centre, kpa) in cases {
            let obj = ObjectGeometry::new(&shape, centre).unwrap();
            let obs = Obstacles { object: &obj, palm: &palm };
            let p = kpa * 1e3;
            let c = close_finger(0, &a, &rod, frame, SectionModel::WallPressure, p, &obs, None).unwrap();
            assert_eq!(c.report.status, SolveStatus::Converged, "{shape:?}");
            assert!(!c.contacts.is_empty(), "{shape:?}: touches");
            let loads: Vec<(usize, Vec3, Vec3)> =
                c.contacts.iter().map(|k| (k.element, k.point, -k.normal_force * k.normal)).collect();
            assert_balances(&a, &rod, p, &c, &loads, &format!("{shape:?}"));
        }
    }

    /// The check of [`every_reported_contact_set_balances_the_finger`] for closed finger
    /// `c` of actuator `a` at pressure `p` under the contact forces `contacts` (element,
    /// point and world force on the finger) and its weight.
    pub(crate) fn assert_balances(
        a: &Actuator,
        rod: &Rod,
        p: f64,
        c: &ClosedFinger,
        contacts: &[(usize, Vec3, Vec3)],
        what: &str,
    ) {
        use crate::math::Vec2;
        let frame = c.body.frame;
        // loads in the finger's plane: (arc length, point, force)
        let mut loads: Vec<(f64, Vec2, Vec2)> = Vec::new();
        for &(element, point, force) in contacts {
            let piece = c
                .body
                .pieces
                .iter()
                .position(|q| match q.kind {
                    PieceKind::Element(e) => e == element,
                    PieceKind::Tip => element == rod.elements,
                    PieceKind::Base => false,
                })
                .unwrap();
            let (mp, _) = c.body.material_point(piece, point).unwrap();
            let (x, _) = frame.to_plane(point);
            let (f, _) = frame.plane_direction(force);
            loads.push((mp.s, x, f));
        }
        for w in weight_loads(a, rod, &frame) {
            loads.push((w.point.s, rod.position(&c.angles, w.point).unwrap(), w.force));
        }
        let law = a.law(p, SectionModel::WallPressure);
        let h = rod.element_length();
        let kappas = rod.curvatures(&c.angles);
        let mut pairs = Vec::new();
        for (j, &kappa) in kappas.iter().enumerate() {
            let s_mid = rod.base_length + h * (j as f64 + 0.5);
            let x_mid = rod.position(&c.angles, MaterialPoint { s: s_mid, y: 0.0 }).unwrap();
            // moment about the cut of the loads beyond it (2-D cross product in (u, w))
            let beyond: f64 = loads
                .iter()
                .filter(|(s, _, _)| *s > s_mid)
                .map(|(_, x, f)| {
                    let r = *x - x_mid;
                    r.x * f.y - r.y * f.x
                })
                .sum();
            pairs.push((law.moment(kappa).unwrap().0, beyond));
        }
        let scale = pairs.iter().map(|(m, _)| m.abs()).fold(0.0, f64::max);
        assert!(scale > 0.0);
        // the internal moment balances the distal loads: m = -(moment of the loads)
        // in this sign convention (kappa > 0 toward +u, angles from +w toward +u)
        for (j, (m, beyond)) in pairs.iter().enumerate() {
            assert!(
                (m + beyond).abs() <= 0.02 * scale,
                "{what}: element {j}: m = {m:.5e}, loads beyond give {beyond:.5e} (scale {scale:.3e})"
            );
        }
    }

    /// The premise of reusing one finger's closing for the others on an axisymmetric
    /// object (`check::evaluate`): the closing problem is invariant under rotations about
    /// the gripper axis (sphere and palm disk on the axis, gravity along it), so a finger
    /// mounted at another azimuth closes to the same angles, with contacts turned by the
    /// azimuth difference (to the solver's tolerances).
    #[test]
    fn closing_is_invariant_under_rotation_about_the_axis() {
        let a = demo_finger();
        let rod = Rod::of_actuator(&a, 40).unwrap();
        let obj =
            ObjectGeometry::new(&ObjectShape::Sphere { radius: 0.034 }, Vec3::new(0.0, 0.0, -0.075)).unwrap();
        let palm = palm_body(&Palm::Disk { radius: 0.075, thickness: 0.012 }).unwrap();
        let obs = Obstacles { object: &obj, palm: &palm };
        let (az0, az1) = (0.3, 0.3 + 2.1);
        let close = |az: f64| {
            let frame = FingerFrame::new(az, 0.065, 0.05).unwrap();
            close_finger(0, &a, &rod, frame, SectionModel::WallPressure, 45e3, &obs, None).unwrap()
        };
        let (c0, c1) = (close(az0), close(az1));
        assert_eq!(c0.report.status, SolveStatus::Converged);
        assert_eq!(c1.report.status, SolveStatus::Converged);
        for (x, y) in c0.angles.iter().zip(&c1.angles) {
            assert!((x - y).abs() < 1e-7, "{x} vs {y}");
        }
        assert_eq!(c0.contacts.len(), c1.contacts.len());
        assert!(!c0.contacts.is_empty());
        let turn = crate::math::Rotation::from_rotation_z(az1 - az0);
        for (k0, k1) in c0.contacts.iter().zip(&c1.contacts) {
            assert_eq!(k0.element, k1.element);
            assert!((turn * k0.point - k1.point).length() < 1e-7);
            assert!((turn * k0.normal - k1.normal).length() < 1e-6);
            assert!((k0.normal_force / k1.normal_force - 1.0).abs() < 1e-5);
        }
    }

    /// One finger of the 3-finger demo closing on a 34 mm ball (closed forms of the
    /// sphere): the closing converges at every pressure, no body piece penetrates the
    /// ball by more than DESIGN 3.3's 0.01 mm, every contact lies on the sphere's surface
    /// with its normal pointing into the ball (along the radius, to the centre), every
    /// normal force is compressive, and the total contact force grows with pressure.
    #[test]
    fn closing_on_a_ball_touches_without_penetrating() {
        let a = demo_finger();
        let rod = Rod::of_actuator(&a, 40).unwrap();
        let frame = FingerFrame::new(0.0, 0.065, 0.0).unwrap();
        let (r, centre) = (0.034, Vec3::new(0.0, 0.0, -0.075));
        let obj = ObjectGeometry::new(&ObjectShape::Sphere { radius: r }, centre).unwrap();
        let palm = palm_body(&Palm::Disk { radius: 0.075, thickness: 0.012 }).unwrap();
        let obs = Obstacles { object: &obj, palm: &palm };
        let mut last_total = 0.0;
        for kpa in [20.0, 35.0, 50.0] {
            let c =
                close_finger(0, &a, &rod, frame, SectionModel::WallPressure, kpa * 1e3, &obs, None).unwrap();
            assert_eq!(c.report.status, SolveStatus::Converged, "{kpa} kPa: {:?}", c.report);
            assert!(c.penetration <= PENETRATION_TOLERANCE, "{kpa} kPa: penetration {}", c.penetration);
            assert!(!c.contacts.is_empty(), "{kpa} kPa: the finger reaches the ball");
            let mut total = 0.0;
            for k in &c.contacts {
                assert!(k.normal_force > 0.0);
                assert!(((k.point - centre).length() - r).abs() < 1e-6, "on the surface");
                let inward = (centre - k.point).normalize();
                assert!(k.normal.dot(inward) > 1.0 - 1e-6, "normal along the radius, into the ball");
                total += k.normal_force;
            }
            assert!(total > last_total, "{kpa} kPa: {total} <= {last_total}");
            last_total = total;
        }
    }

    /// The bookkeeping behind the repeated-failure and stuck rules: counts per exact
    /// target, the previous failure's residual at that target, and targets kept apart
    /// (a halved step is another pressure).
    #[test]
    fn failed_targets_count_each_pressure_and_return_its_previous_residual() {
        let mut failed = FailedTargets::default();
        assert_eq!(failed.record(100e3, 2e-3), (1, None));
        assert_eq!(failed.record(90e3, 5e-3), (1, None));
        assert_eq!(failed.record(100e3, 1e-3), (2, Some(2e-3)));
        assert_eq!(failed.record(100e3, 7e-4), (3, Some(1e-3)));
        assert_eq!(failed.record(90e3, 4e-3), (2, Some(5e-3)));
        assert_eq!(failed.record(100e3 + 1e-9, 1.0), (1, None));
    }
}
