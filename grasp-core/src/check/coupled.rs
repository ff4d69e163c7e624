//! Fingers that meet each other while closing (DESIGN 3.3: neighbouring fingers are
//! unilateral obstacles of each other), solved together.
//!
//! Method: the fingers' rods are stacked into one SQP ([`crate::rod::coupled_step`]: a
//! block-diagonal Hessian, one tridiagonal block per finger). Before every step the
//! contact geometry is linearised as in [`super::closing`]: gaps against the object and
//! the palm per finger, and between every two pieces of different fingers within
//! [`PREDICTION`] a gap `g = d - n . (x_i - x_i0) + n . (x_j - x_j0)` (parry's closest
//! points, `n` from finger `i` toward finger `j`), whose gradient has a block for each
//! finger: `-n_p,i . dx_i/dpsi_i` with `n_p,i` the part of `n` in finger `i`'s plane, and
//! `+n_p,j . dx_j/dpsi_j` in finger `j`'s (out-of-plane motion is rigid, DESIGN 3.3).
//! Its force `f` pushes finger `i` by `-f n` and finger `j` by `+f n`: equal and
//! opposite, and not on the object (only finger–object contacts are the grasp's). The
//! pressure is ramped from zero (the fingers open) as in a single closing, so they meet
//! rather than pass through each other; a pressure step that does not settle is halved,
//! at most [`COUPLED_HALVINGS`] times and within [`COUPLED_BUDGET`] SQP steps in all,
//! and then the closing is reported as not converged.

use parry3d_f64::bounding_volume::BoundingVolume;
use parry3d_f64::query;

use super::closing::{
    ClosedFinger, FailedTargets, Linearised, MAX_STEPS, Obstacles, PENETRATION_TOLERANCE, PREDICTION,
    STEP_TOLERANCE, element_index, first_pressure_step, fresh_report, is_closed, linearise, object_contacts,
    stalled, turns_back, weight_loads,
};
use crate::actuator::Actuator;
use crate::geometry::{FingerBody, FingerFrame, PieceKind};
use crate::math::Vec3;
use crate::rod::{
    Chain, PointGap, PointLoad, RESIDUAL_TOLERANCE, Rod, RodBlock, SharedGap, SolveReport, SolveStatus,
    coupled_step, limit_step,
};
use crate::section::SectionModel;

/// SQP steps allowed per pressure step of a coupled closing: more than a single
/// finger's [`MAX_STEPS`], since contacts between two fingers' faces switch between
/// piece pairs and the shifted steps then approach the equilibrium only linearly (on
/// the demo sweep's coupled closings a settled step took at most 84).
const COUPLED_STEPS: usize = 2 * MAX_STEPS;
/// Pressure-step halvings allowed in one coupled closing: fewer than a single finger's
/// [`super::closing::MAX_HALVINGS`]. Fingers that slide along each other reach a limit point (the tips
/// about to slip past each other), where no nearby equilibrium exists beyond some
/// pressure; smaller and smaller steps then only creep toward it. Steps down to 1/16 of
/// the way are tried; past that the closing is reported as not converged. (Of the 330
/// coupled closings that converged on the bench sweep's 128 candidates, two seeds, none
/// needed more than four halvings.)
const COUPLED_HALVINGS: usize = 4;
/// Failed settles at one and the same pressure after which a coupled closing ends as
/// not converged (see [`super::closing::REPEATED_FAILURES`]): one more than a single
/// finger's, as contacts between fingers switch between piece pairs and a pressure
/// that failed twice was reached on the third try in 1 of the 330 coupled closings
/// that converged on the bench sweep's 128 candidates (two seeds). With this and four
/// halvings, those closings all converge as before, and the ones that do not spend a
/// sixth fewer steps.
const COUPLED_REPEATED_FAILURES: usize = 3;
/// A coupled closing also ends at its second failure at a pressure when the equilibrium
/// residual of the failed settle's last step has not fallen below this fraction of the
/// previous failure's there: the steps end at the same point that is not an equilibrium
/// (in the stuck closings of the bench sweep's samples the residual repeats to within
/// 10 %, while in the one that converged on a third try it fell eightfold). On the two
/// 64-candidate samples this stops no closing that converges and saves a tenth of the
/// coupled steps.
const STUCK_RESIDUAL_RATIO: f64 = 0.5;
/// SQP steps allowed in one whole coupled closing, over all its pressure steps: a first
/// attempt and one halved attempt of [`COUPLED_STEPS`] each. On the demo sweep's coupled
/// closings one that settled took at most 229 (most under 80; one pressure step at most
/// 95); one that never settles would otherwise spend [`COUPLED_STEPS`] on each of its
/// [`COUPLED_HALVINGS`] smaller steps before it is reported.
const COUPLED_BUDGET: usize = 2 * COUPLED_STEPS;

/// One finger of a coupled closing.
#[derive(Clone, Copy)]
pub struct Member<'a> {
    /// The finger's index on the hub.
    pub index: usize,
    /// Its actuator.
    pub actuator: &'a Actuator,
    /// Its rod.
    pub rod: &'a Rod,
    /// Its mount.
    pub frame: FingerFrame,
    /// The section model of its law.
    pub model: SectionModel,
}

/// A contact between two fingers in a coupled closed state.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FingerContact {
    /// The two fingers (hub indices), `i` first.
    pub fingers: (usize, usize),
    /// The element of each (0-based; the tip cap is `elements`).
    pub elements: (usize, usize),
    /// The witness on each finger's body (m, gripper frame).
    pub points: (Vec3, Vec3),
    /// Unit normal from finger `i` toward finger `j`.
    pub normal: Vec3,
    /// Normal force (N): `-force * normal` on `i`, `+force * normal` on `j`.
    pub force: f64,
}

/// The fingers of a coupled closing in their closed state.
#[derive(Debug, Clone)]
pub struct CoupledClosing {
    /// Per member, in the order given.
    pub closed: Vec<ClosedFinger>,
    /// The finger–finger contacts with a force.
    pub between: Vec<FingerContact>,
}

/// One linearised gap between two members (indices into the member list).
struct Between {
    members: (usize, usize),
    pieces: (PieceKind, PieceKind),
    gap: SharedGap,
    points: (Vec3, Vec3),
    normal: Vec3,
}

/// What a gap is against, to carry forces from one step to the next.
#[derive(Clone, Copy, PartialEq)]
enum Key {
    Obstacle(usize, PieceKind, bool),
    Finger(usize, PieceKind, usize, PieceKind),
}

/// Gaps between the pieces of different members within `PREDICTION`, and the deepest
/// overlap among them (m).
fn linearise_between(chains: &[Chain<'_>], bodies: &[FingerBody]) -> Result<(Vec<Between>, f64), String> {
    let mut out: Vec<Between> = Vec::new();
    let mut penetration = f64::NEG_INFINITY;
    for a in 0..chains.len() {
        for b in a + 1..chains.len() {
            let (ba, bb) = (&bodies[a], &bodies[b]);
            if !ba.aabb().loosened(PREDICTION).intersects(&bb.aabb()) {
                continue;
            }
            let boxes: Vec<_> = bb.pieces.iter().map(|q| q.shape.compute_aabb(&q.pose)).collect();
            for (pi, p) in ba.pieces.iter().enumerate() {
                let pbox = p.shape.compute_aabb(&p.pose).loosened(PREDICTION);
                for (qi, q) in bb.pieces.iter().enumerate() {
                    if (p.kind == PieceKind::Base && q.kind == PieceKind::Base)
                        || !pbox.intersects(&boxes[qi])
                    {
                        continue;
                    }
                    let c = query::contact(&p.pose, p.shape.as_ref(), &q.pose, q.shape.as_ref(), PREDICTION)
                        .map_err(|_| "unsupported shape pair in the contact query".to_string())?;
                    let Some(c) = c else { continue };
                    penetration = penetration.max(-c.dist);
                    let n: Vec3 = c.normal1;
                    let (na, _) = ba.frame.plane_direction(n);
                    let (nb, _) = bb.frame.plane_direction(n);
                    if na.length() < 0.05 && nb.length() < 0.05 {
                        continue; // neither finger can push that way
                    }
                    let (ma, _) = ba.material_point(pi, c.point1).map_err(|e| e.to_string())?;
                    let (mb, _) = bb.material_point(qi, c.point2).map_err(|e| e.to_string())?;
                    // neighbouring pieces share their end sections: the same gap twice
                    let twin = out.iter().any(|l| {
                        l.members == (a, b)
                            && (l.gap.parts[0].1.point.s - ma.s).abs() < 1e-9
                            && (l.gap.parts[1].1.point.s - mb.s).abs() < 1e-9
                    });
                    if twin {
                        continue;
                    }
                    let xa = chains[a].position(ma).map_err(|e| e.to_string())?;
                    let xb = chains[b].position(mb).map_err(|e| e.to_string())?;
                    // g = d - n_a . (x_a - x_a0) + n_b . (x_b - x_b0)
                    let gap = SharedGap {
                        parts: vec![
                            (a, PointGap { point: ma, normal: -na, offset: -na.dot(xa) - c.dist }),
                            (b, PointGap { point: mb, normal: nb, offset: nb.dot(xb) }),
                        ],
                    };
                    out.push(Between {
                        members: (a, b),
                        pieces: (p.kind, q.kind),
                        gap,
                        points: (c.point1, c.point2),
                        normal: n,
                    });
                }
            }
        }
    }
    Ok((out, penetration))
}

/// A settled pressure step.
struct Settled {
    angles: Vec<Vec<f64>>,
    own: Vec<Vec<Linearised>>,
    own_forces: Vec<Vec<f64>>,
    between: Vec<Between>,
    between_forces: Vec<f64>,
    penetration: f64,
}

/// The members settled at pressure `p` from `angles` by coupled SQP steps; `None` if
/// they do not settle within [`MAX_STEPS`].
fn settle(
    members: &[Member<'_>],
    loads: &[Vec<PointLoad>],
    obstacles: &Obstacles<'_>,
    p: f64,
    angles: &[Vec<f64>],
    report: &mut SolveReport,
) -> Result<Option<Settled>, String> {
    let laws: Vec<_> = members.iter().map(|m| m.actuator.law(p, m.model)).collect();
    let mut angles = angles.to_vec();
    let mut previous: Vec<(Key, f64, bool)> = Vec::new();
    let mut previous_step: Option<Vec<f64>> = None;
    let mut max_move = 0.5 * PREDICTION;
    for _ in 0..COUPLED_STEPS.min(COUPLED_BUDGET.saturating_sub(report.iterations)) {
        report.iterations += 1;
        let chains: Vec<Chain<'_>> = members
            .iter()
            .zip(&angles)
            .map(|(m, a)| Chain::new(m.rod, a).map_err(|e| e.to_string()))
            .collect::<Result<_, _>>()?;
        let bodies: Vec<FingerBody> = members
            .iter()
            .zip(&chains)
            .map(|(m, c)| {
                FingerBody::of_chain_where(c, &m.actuator.section, m.frame, |_, _| true)
                    .map_err(|e| e.to_string())
            })
            .collect::<Result<_, _>>()?;
        let mut penetration = 0.0f64;
        let mut own = Vec::with_capacity(members.len());
        for (chain, body) in chains.iter().zip(&bodies) {
            let (lin, pen, _) = linearise(chain, body, obstacles, PREDICTION)?;
            penetration = penetration.max(pen);
            own.push(lin);
        }
        let (between, pen) = linearise_between(&chains, &bodies)?;
        penetration = penetration.max(pen);
        let mut gaps = Vec::new();
        let mut keys = Vec::new();
        let mut closed_now = Vec::new();
        for (f, lin) in own.iter().enumerate() {
            for l in lin {
                gaps.push(SharedGap { parts: vec![(f, l.gap)] });
                keys.push(Key::Obstacle(f, l.piece, l.on_object));
                closed_now.push(is_closed(&chains[f], l));
            }
        }
        for l in &between {
            keys.push(Key::Finger(l.members.0, l.pieces.0, l.members.1, l.pieces.1));
            let value: f64 = l
                .gap
                .parts
                .iter()
                .map(|(f, g)| chains[*f].position(g.point).map_or(0.0, |x| g.normal.dot(x)) - g.offset)
                .sum();
            closed_now.push(value <= crate::rod::GAP_TOLERANCE);
            gaps.push(l.gap.clone());
        }
        let carried = |k: &Key| previous.iter().find(|q| q.0 == *k);
        let curvature_forces: Vec<f64> = keys.iter().map(|k| carried(k).map_or(0.0, |q| q.1)).collect();
        let seed: Option<Vec<bool>> = (!previous.is_empty())
            .then(|| keys.iter().zip(&closed_now).map(|(k, c)| carried(k).map_or(*c, |q| q.2)).collect());
        let blocks: Vec<RodBlock<'_>> = members
            .iter()
            .enumerate()
            .map(|(f, m)| RodBlock {
                rod: m.rod,
                law: &laws[f],
                loads: &loads[f],
                angles: &angles[f],
                nodes: Some(chains[f].nodes()),
            })
            .collect();
        let Ok(step) = coupled_step(&blocks, &gaps, &curvature_forces, seed.as_deref()) else {
            report.status = SolveStatus::Stalled;
            return Ok(None);
        };
        report.residual = step.residual;
        report.constraint_residual = penetration / members[0].rod.length();
        let size = step.steps.iter().flatten().fold(0.0f64, |a, v| a.max(v.abs()));
        if step.residual <= RESIDUAL_TOLERANCE
            && size <= STEP_TOLERANCE
            && penetration <= PENETRATION_TOLERANCE
        {
            let mut own_forces = Vec::with_capacity(members.len());
            let mut k = 0;
            for lin in &own {
                own_forces.push(step.forces[k..k + lin.len()].to_vec());
                k += lin.len();
            }
            let between_forces = step.forces[k..].to_vec();
            return Ok(Some(Settled { angles, own, own_forces, between, between_forces, penetration }));
        }
        // one factor for all fingers: the linearisation of the gaps between them holds
        // for their joint move
        let flat: Vec<f64> = step.steps.iter().flatten().copied().collect();
        let turns_back = turns_back(previous_step.as_deref(), &flat);
        if turns_back {
            max_move *= 0.5;
            if stalled(max_move, step.residual) {
                report.status = SolveStatus::Stalled;
                return Ok(None);
            }
        }
        let mut alpha = 1.0f64;
        for (chain, d) in chains.iter().zip(&step.steps) {
            let mut trial = d.clone();
            alpha = alpha.min(limit_step(chain, &mut trial, max_move));
        }
        if alpha >= 1.0 && !turns_back {
            max_move = (2.0 * max_move).min(0.5 * PREDICTION);
        }
        previous_step = Some(flat.iter().map(|v| alpha * v).collect());
        for (a, d) in angles.iter_mut().zip(&step.steps) {
            for (x, v) in a.iter_mut().zip(d) {
                *x += alpha * v;
            }
        }
        if angles.iter().flatten().any(|a| !a.is_finite()) {
            report.status = SolveStatus::Stalled;
            return Ok(None);
        }
        previous =
            keys.iter().zip(step.forces.iter().zip(&step.active)).map(|(k, (f, a))| (*k, *f, *a)).collect();
    }
    report.status = SolveStatus::IterationLimit;
    Ok(None)
}

/// Closes `members` together at `pressure` (Pa) on the obstacles, each an obstacle of the
/// others: from open (straight at zero pressure), or with `start = (p0, angles)` from a
/// closed state of the members at `p0` that has no overlap between them (a sweep's
/// previous point), trying the whole step from `p0` first.
///
/// # Errors
/// A geometry the queries cannot handle; non-convergence is reported in the result.
pub fn close_together(
    members: &[Member<'_>],
    pressure: f64,
    obstacles: &Obstacles<'_>,
    start: Option<(f64, Vec<Vec<f64>>)>,
) -> Result<CoupledClosing, String> {
    let loads: Vec<Vec<PointLoad>> =
        members.iter().map(|m| weight_loads(m.actuator, m.rod, &m.frame)).collect();
    let warm = start.is_some();
    let (mut p_done, mut angles) =
        start.unwrap_or_else(|| (0.0, members.iter().map(|m| vec![0.0; m.rod.dofs()]).collect()));
    if angles.len() != members.len() || angles.iter().zip(members).any(|(a, m)| a.len() != m.rod.dofs()) {
        return Err("a coupled closing's start does not match its fingers".to_string());
    }
    let mut report = fresh_report();
    let span = (pressure - p_done).abs().max(1.0);
    let mut dp = first_pressure_step(p_done, pressure, warm);
    let mut halvings = 0;
    let mut failed = FailedTargets::default();
    let mut last: Option<Settled> = None;
    while (p_done - pressure).abs() > 1e-12 * span {
        let target = if dp.abs() >= (pressure - p_done).abs() { pressure } else { p_done + dp };
        match settle(members, &loads, obstacles, target, &angles, &mut report)? {
            Some(s) => {
                angles.clone_from(&s.angles);
                p_done = target;
                report.load_steps += 1;
                report.status = SolveStatus::Converged;
                last = Some(s);
                dp *= 1.5;
            }
            None => {
                halvings += 1;
                let (failures, previous) = failed.record(target, report.residual);
                let stuck = previous.is_some_and(|r| report.residual > STUCK_RESIDUAL_RATIO * r);
                // half the step that failed: a step grown past the rest of the way
                // was cut to it, and the same step from the same state fails again
                dp = 0.5 * (target - p_done);
                if halvings > COUPLED_HALVINGS
                    || failures >= COUPLED_REPEATED_FAILURES
                    || stuck
                    || dp.abs() < span / 4096.0
                    || report.iterations >= COUPLED_BUDGET
                {
                    if report.status == SolveStatus::Converged {
                        report.status = SolveStatus::IterationLimit;
                    }
                    last = None;
                    break;
                }
            }
        }
    }
    let mut closed = Vec::with_capacity(members.len());
    for (f, m) in members.iter().enumerate() {
        let body =
            FingerBody::new(m.rod, &angles[f], &m.actuator.section, m.frame).map_err(|e| e.to_string())?;
        let (contacts, penetration) = match &last {
            Some(s) => (object_contacts(m.index, m.rod, &s.own[f], &s.own_forces[f]), s.penetration),
            None => (Vec::new(), 0.0),
        };
        closed.push(ClosedFinger { angles: angles[f].clone(), body, contacts, penetration, report });
    }
    let between = last.map_or_else(Vec::new, |s| {
        s.between
            .iter()
            .zip(&s.between_forces)
            .filter(|(_, f)| **f > 0.0)
            .map(|(l, f)| FingerContact {
                fingers: (members[l.members.0].index, members[l.members.1].index),
                elements: (
                    element_index(l.pieces.0, members[l.members.0].rod.elements),
                    element_index(l.pieces.1, members[l.members.1].rod.elements),
                ),
                points: l.points,
                normal: l.normal,
                force: *f,
            })
            .collect()
    });
    Ok(CoupledClosing { closed, between })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::check::closing::close_finger;
    use crate::check::closing::tests::demo_finger;
    use crate::geometry::{ObjectGeometry, palm_body};
    use crate::scene::{ObjectShape, Palm};

    /// Two identical fingers mounted opposite each other (azimuths 0 and 180°) closing on
    /// nothing. The problem is symmetric under the mirror `x -> -x` (the finger at 180° is
    /// the mirror image of the one at 0°, its section being symmetric about its plane), so
    /// the mirror image of one finger pressed against a rigid wall in the mirror plane is
    /// an equilibrium of the pair, the wall's reaction supplied by the other finger (a
    /// closed-form symmetry argument). The wall case is solved with the single-finger path;
    /// at the mirrored state the coupled step must find equilibrium with the same total
    /// force, contacts on the plane, equal and opposite, and no step. That symmetric
    /// equilibrium is unstable without friction (the tips slide past each other), so the
    /// coupled closing from open ends in an asymmetric state: it must converge with the
    /// fingers touching each other and overlapping by no more than DESIGN 3.3's 0.01 mm.
    #[test]
    fn opposite_fingers_pressed_together_are_a_finger_on_a_wall() {
        let a = demo_finger();
        let rod = Rod::of_actuator(&a, 40).unwrap();
        let palm = palm_body(&Palm::Disk { radius: 0.03, thickness: 0.01 }).unwrap();
        let far =
            ObjectGeometry::new(&ObjectShape::Sphere { radius: 0.01 }, Vec3::new(0.0, 0.0, 1.0)).unwrap();
        let p = 30e3;
        let model = SectionModel::WallPressure;
        let frames = [
            FingerFrame::new(0.0, 0.02, 0.0).unwrap(),
            FingerFrame::new(std::f64::consts::PI, 0.02, 0.0).unwrap(),
        ];
        let members: Vec<Member<'_>> = frames
            .iter()
            .enumerate()
            .map(|(index, &frame)| Member { index, actuator: &a, rod: &rod, frame, model })
            .collect();
        // the wall x = 0: a box filling x < 0 below the hub. It stands 0.1 nm past the
        // mirror plane, so that the mirrored fingertips overlap by 0.2 nm: touching corner
        // to corner at a round-off distance instead, their closest points would give no
        // defined normal (any direction between the two corners)
        let wall = ObjectGeometry::new(
            &ObjectShape::Box { size: Vec3::new(0.2, 0.2, 0.2) },
            Vec3::new(-0.1 + 1e-10, 0.0, -0.1),
        )
        .unwrap();
        let w =
            close_finger(0, &a, &rod, frames[0], model, p, &Obstacles { object: &wall, palm: &palm }, None)
                .unwrap();
        assert_eq!(w.report.status, SolveStatus::Converged);
        let wall_total: f64 = w.contacts.iter().map(|k| k.normal_force).sum();
        assert!(wall_total > 0.0, "the finger reaches the wall");
        // the pair at the mirrored state
        let angles = [w.angles.clone(), w.angles.clone()];
        let bodies: Vec<FingerBody> =
            frames.iter().map(|&f| FingerBody::new(&rod, &w.angles, &a.section, f).unwrap()).collect();
        let chains: Vec<Chain<'_>> = angles.iter().map(|x| Chain::new(&rod, x).unwrap()).collect();
        let (between, _) = linearise_between(&chains, &bodies).unwrap();
        assert!(!between.is_empty());
        let law = a.law(p, model);
        let loads = weight_loads(&a, &rod, &frames[0]);
        let blocks: Vec<RodBlock<'_>> = angles
            .iter()
            .map(|x| RodBlock { rod: &rod, law: &law, loads: &loads, angles: x, nodes: None })
            .collect();
        let gaps: Vec<SharedGap> = between.iter().map(|l| l.gap.clone()).collect();
        let step = coupled_step(&blocks, &gaps, &vec![0.0; gaps.len()], None).unwrap();
        assert!(step.residual < 1e-7, "equilibrium: residual {}", step.residual);
        let size = step.steps.iter().flatten().fold(0.0f64, |m, v| m.max(v.abs()));
        assert!(size < 1e-6, "no step at an equilibrium: {size}");
        let total: f64 = step.forces.iter().sum();
        assert!((total / wall_total - 1.0).abs() < 1e-3, "force {total} vs on the wall {wall_total}");
        for (l, f) in between.iter().zip(&step.forces) {
            if *f > 0.0 {
                assert!(l.points.0.x.abs() < 2e-5 && l.points.1.x.abs() < 2e-5, "on the mirror plane");
                assert!((l.normal.x + 1.0).abs() < 1e-6, "normal across the plane: {:?}", l.normal);
            }
        }
        // closing together from open
        let c = close_together(&members, p, &Obstacles { object: &far, palm: &palm }, None).unwrap();
        for f in &c.closed {
            assert_eq!(f.report.status, SolveStatus::Converged, "{:?}", f.report);
            assert!(f.contacts.is_empty(), "nothing to touch but each other");
        }
        assert!(!c.between.is_empty(), "the fingertips meet");
        for (p0, q0) in
            c.closed[0].body.pieces.iter().flat_map(|p| c.closed[1].body.pieces.iter().map(move |q| (p, q)))
        {
            if let Some(k) =
                query::contact(&p0.pose, p0.shape.as_ref(), &q0.pose, q0.shape.as_ref(), 0.0).unwrap()
            {
                assert!(-k.dist <= PENETRATION_TOLERANCE, "overlap {}", -k.dist);
            }
        }
    }

    /// Newton's third law and the statics of each finger in joint closings: two opposed
    /// fingers pressed together, and four fingers 90° apart closing on a ball smaller
    /// than their half-width (they meet before all reach it). Every finger–finger contact
    /// acts at one place on both bodies (the witnesses within the penetration tolerance),
    /// pushes finger `i` by `-f n` and finger `j` by `+f n`, and with these and its object
    /// contacts and weight every finger balances at every element's middle, closed from
    /// open and continued from a closed state to a higher pressure (the check of
    /// `closing::tests::every_reported_contact_set_balances_the_finger`: Timoshenko &
    /// Gere, "Theory of Elastic Stability", 1961, ch. 2).
    #[test]
    fn finger_forces_are_equal_and_opposite_and_every_finger_balances() {
        use crate::check::closing::tests::assert_balances;
        let a = demo_finger();
        let rod = Rod::of_actuator(&a, 40).unwrap();
        let palm = palm_body(&Palm::Disk { radius: 0.03, thickness: 0.01 }).unwrap();
        let model = SectionModel::WallPressure;
        let far =
            ObjectGeometry::new(&ObjectShape::Sphere { radius: 0.01 }, Vec3::new(0.0, 0.0, 1.0)).unwrap();
        let ball =
            ObjectGeometry::new(&ObjectShape::Sphere { radius: 0.006 }, Vec3::new(0.0, 0.0, -0.1)).unwrap();
        let quarter = std::f64::consts::FRAC_PI_2;
        let cases = [
            (vec![0.0, 2.0 * quarter], &far, 30e3),
            (vec![0.0, quarter, 2.0 * quarter, 3.0 * quarter], &ball, 40e3),
        ];
        for (azimuths, object, p) in cases {
            let frames: Vec<FingerFrame> =
                azimuths.iter().map(|&z| FingerFrame::new(z, 0.02, 0.0).unwrap()).collect();
            let members: Vec<Member<'_>> = frames
                .iter()
                .enumerate()
                .map(|(index, &frame)| Member { index, actuator: &a, rod: &rod, frame, model })
                .collect();
            let cold = close_together(&members, p, &Obstacles { object, palm: &palm }, None).unwrap();
            // and continued from that state to a higher pressure, as a sweep does
            let start = (p, cold.closed.iter().map(|c| c.angles.clone()).collect());
            let warm =
                close_together(&members, p + 15e3, &Obstacles { object, palm: &palm }, Some(start)).unwrap();
            for (c, p) in [(cold, p), (warm, p + 15e3)] {
                let what = format!("{} fingers at {} kPa", azimuths.len(), p / 1e3);
                assert!(!c.between.is_empty(), "{what}: the fingers meet");
                for (f, closed) in c.closed.iter().enumerate() {
                    assert_eq!(closed.report.status, SolveStatus::Converged, "{what}: {:?}", closed.report);
                    let mut loads: Vec<(usize, Vec3, Vec3)> = closed
                        .contacts
                        .iter()
                        .map(|k| (k.element, k.point, -k.normal_force * k.normal))
                        .collect();
                    for k in &c.between {
                        assert!((k.points.0 - k.points.1).length() <= PENETRATION_TOLERANCE, "{what}: {k:?}");
                        assert!((k.normal.length() - 1.0).abs() < 1e-9);
                        if k.fingers.0 == f {
                            loads.push((k.elements.0, k.points.0, -k.force * k.normal));
                        }
                        if k.fingers.1 == f {
                            loads.push((k.elements.1, k.points.1, k.force * k.normal));
                        }
                    }
                    assert_balances(&a, &rod, p, closed, &loads, &format!("{what}, finger {f}"));
                }
            }
        }
        let members: Vec<Member<'_>> = [0.0, std::f64::consts::PI]
            .iter()
            .enumerate()
            .map(|(index, &z)| Member {
                index,
                actuator: &a,
                rod: &rod,
                frame: FingerFrame::new(z, 0.02, 0.0).unwrap(),
                model,
            })
            .collect();
        let wrong = Some((30e3, vec![vec![0.0; 3], vec![0.0; rod.dofs()]]));
        assert!(close_together(&members, 40e3, &Obstacles { object: &far, palm: &palm }, wrong).is_err());
    }
}
