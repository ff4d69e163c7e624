//! Property tests (proptest): laws that must hold for every input in a range, not only
//! for the worked examples next to the code.
//!
//! * constant-curvature kinematics keeps arc length and orthonormal frames (Webster &
//!   Jones, IJRR 2010, eq. 2; a circular arc's chord is `2 sin(k s / 2) / k`);
//! * the free curvature rises with pressure (the moment balance is monotone: DESIGN 3.2);
//! * the contact solve leaves no penetration above its tolerance (DESIGN 3.3), checked by
//!   recomputing the gaps and distances independently of the solver;
//! * a gripper with `n` identical fingers evenly spaced about a centred object that is
//!   symmetric under rotations about the axis gives `n` equal finger forces (symmetry).
//!
//! Case counts are kept small so the whole file runs in seconds in a debug build, and the
//! random seed is fixed so a CI run is reproducible (set `PROPTEST_CASES` to run more).

use grasp_core::actuator::{Actuator, Fiber};
use grasp_core::check::closing::{Obstacles, PENETRATION_TOLERANCE, close_finger};
use grasp_core::check::{CheckSettings, check_scene};
use grasp_core::geometry::{FingerFrame, ObjectGeometry, PieceKind, palm_body};
use grasp_core::kinematics::{FingerShape, arc_transform};
use grasp_core::material::{HyperelasticModel, Material, NeoHookean};
use grasp_core::math::{Mat3, Vec2, Vec3};
use grasp_core::rod::{GAP_TOLERANCE, LinearLaw, MaterialPoint, PointGap, Rod, SolveStatus, solve_with_gaps};
use grasp_core::scene::{Criteria, FingerMount, Gripper, ObjectShape, Palm, Scene, TargetObject};
use grasp_core::section::{BoxSection, HalfRoundSection, SectionModel, SectionProfile};
use proptest::prelude::*;
use proptest::test_runner::{Config, RngSeed};

/// A fixed seed and no failure files; `cases` unless `PROPTEST_CASES` says otherwise.
fn config(cases: u32) -> Config {
    let cases = std::env::var("PROPTEST_CASES").ok().and_then(|v| v.parse().ok()).unwrap_or(cases);
    Config { cases, rng_seed: RngSeed::Fixed(0x5eed_a5c0), failure_persistence: None, ..Config::default() }
}

/// A finger of the demo family (invented values): neo-Hookean rubber of shear modulus
/// `mu_kpa`, a Box or HalfRound section with walls `wall_mm`, rated 60 kPa.
fn finger(mu_kpa: f64, wall_mm: f64, half_round: bool, chamber_mm: f64) -> Actuator {
    let section = if half_round {
        SectionProfile::HalfRound(HalfRoundSection::new(7e-3, wall_mm * 1e-3, 2.5e-3, 1e-3).unwrap())
    } else {
        SectionProfile::Box(
            BoxSection::new(14e-3, 10e-3, wall_mm * 1e-3, wall_mm * 1e-3, 2.5e-3, 1e-3).unwrap(),
        )
    };
    Actuator::new(
        "f",
        "neo-Hookean rubber",
        Material {
            model: HyperelasticModel::NeoHookean(NeoHookean::new(mu_kpa * 1e3).unwrap()),
            density: 1070.0,
            stretch_at_break: 10.0,
        },
        section,
        chamber_mm * 1e-3,
        0.006,
        0.005,
        Fiber { pitch: 3.5e-3, width: 1e-3 },
        60e3,
        SectionModel::WallPressure,
    )
    .unwrap()
}

proptest! {
    #![proptest_config(config(64))]

    /// The arc transform of Webster & Jones (2010) eq. 2: the rotation is orthonormal
    /// with determinant +1; the end point's distance from the start is the chord of a
    /// circular arc, `|2 sin(k s/2) / k|`; the position moves at unit speed along `s`
    /// (central differences), in the direction of the frame's tangent (third column) —
    /// so the curve has arc length `s`.
    #[test]
    fn arc_keeps_arc_length_and_an_orthonormal_frame(
        k in prop_oneof![-60.0..60.0f64, -1e-3..1e-3f64],
        phi in -std::f64::consts::PI..std::f64::consts::PI,
        s in 1e-3..0.2f64,
    ) {
        let t = arc_transform(k, phi, s);
        let r = Mat3::from_mat4(t);
        prop_assert!((r.transpose() * r).abs_diff_eq(Mat3::IDENTITY, 1e-12));
        prop_assert!((r.determinant() - 1.0).abs() < 1e-12);
        let p = t.w_axis.truncate();
        let chord = if (k * s).abs() < 1e-9 { s } else { (2.0 * (0.5 * k * s).sin() / k).abs() };
        prop_assert!((p.length() - chord).abs() <= 1e-12 + 1e-9 * s, "chord {} vs {chord}", p.length());
        let h = 1e-6;
        let v = (arc_transform(k, phi, s + h).w_axis - arc_transform(k, phi, s - h).w_axis).truncate() / (2.0 * h);
        prop_assert!((v.length() - 1.0).abs() < 1e-6, "speed {}", v.length());
        prop_assert!((v - r.z_axis).length() < 1e-6, "velocity {v} vs tangent {}", r.z_axis);
    }

    /// The finger's centreline (base, arc, tip cap) is parametrised by arc length: unit
    /// speed everywhere, and the tip is at the chord distance the segments add up to.
    #[test]
    fn finger_centreline_is_parametrised_by_arc_length(
        k in -40.0..40.0f64,
        base in 0.0..0.02f64,
        chamber in 0.02..0.15f64,
        tip in 0.0..0.02f64,
        at in 0.0..1.0f64,
    ) {
        let f = FingerShape { base_length: base, chamber_length: chamber, tip_length: tip, curvature: k };
        let h = 1e-7;
        let s = (at * f.length()).clamp(2.0 * h, f.length() - 2.0 * h);
        let speed = (f.point_at(s + h) - f.point_at(s - h)).length() / (2.0 * h);
        prop_assert!((speed - 1.0).abs() < 1e-5, "speed {speed} at s = {s}");
        let len: f64 = f.polyline(4000).windows(2).map(|w| (w[1] - w[0]).length()).sum();
        prop_assert!((len / f.length() - 1.0).abs() < 1e-5, "polyline {len} vs {}", f.length());
    }

    /// A finger frame maps the finger plane into the gripper frame by a rigid motion:
    /// its axes are a right-handed orthonormal basis for any mount.
    #[test]
    fn finger_frames_are_right_handed_and_orthonormal(
        azimuth in -7.0..7.0f64,
        radius in 0.0..0.2f64,
        tilt in -1.5..1.5f64,
    ) {
        let f = FingerFrame::new(azimuth, radius, tilt).unwrap();
        for a in [f.u_axis, f.w_axis, f.lateral_axis] {
            prop_assert!((a.length() - 1.0).abs() < 1e-12);
        }
        prop_assert!(f.u_axis.dot(f.w_axis).abs() < 1e-12);
        prop_assert!((f.u_axis.cross(f.w_axis) - f.lateral_axis).length() < 1e-12);
        let (p, q) = (Vec2::new(0.01, 0.03), Vec2::new(-0.02, 0.07));
        let d = (f.to_world(p) - f.to_world(q)).length();
        prop_assert!((d - (p - q).length()).abs() < 1e-14);
    }
}

proptest! {
    #![proptest_config(config(24))]

    /// The free curvature rises strictly with pressure, for both moment balances, any
    /// wall thickness and rubber stiffness of the family (DESIGN 3.2: the balance is
    /// monotone in the curvature and the pressure moment grows with pressure).
    #[test]
    fn free_curvature_rises_with_pressure(
        mu in 10.0..120.0f64,
        wall in 1.5..4.0f64,
        half_round in any::<bool>(),
        baseline in any::<bool>(),
        p1 in 0.0..30.0f64,
        dp in 0.5..30.0f64,
    ) {
        let a = finger(mu, wall, half_round, 100.0);
        let model = if baseline { SectionModel::Baseline } else { SectionModel::WallPressure };
        let lo = a.free_bending_with(p1 * 1e3, model);
        let hi = a.free_bending_with((p1 + dp) * 1e3, model);
        // out of the model's range is an error, and stays one at higher pressure
        if let (Ok(lo), Ok(hi)) = (&lo, &hi) {
            prop_assert!(hi.curvature > lo.curvature, "{} kPa: {} then {} kPa: {}", p1, lo.curvature, p1 + dp, hi.curvature);
            prop_assert!(hi.bend_angle > lo.bend_angle);
        } else {
            prop_assert!(hi.is_err(), "solved at {} kPa but not at {} kPa", p1 + dp, p1);
        }
    }

    /// The rod's contact solve against a flat wall at a random distance, with gaps on
    /// every element end and the tip (a linear law with rest curvature stands for the
    /// pressure): when it converges, every gap recomputed from the returned shape is
    /// closed by at most the tolerance, every contact force is compressive, and only
    /// closed gaps carry force (complementarity).
    #[test]
    fn rod_contact_leaves_no_penetration(
        rest in 2.0..30.0f64,
        wall in 0.1..0.95f64,
        elements in 40usize..64,
    ) {
        let rod = Rod::new(0.005, 0.09, 0.005, elements).unwrap();
        let law = LinearLaw { stiffness: 2e-3, rest_curvature: rest };
        let free_tip_u = grasp_core::kinematics::FingerShape {
            base_length: 0.005, chamber_length: 0.09, tip_length: 0.005, curvature: rest,
        }.tip().x.abs();
        let d = wall * free_tip_u.max(1e-3);
        let h = rod.element_length();
        let mut gaps: Vec<PointGap> = (1..=elements)
            .map(|i| PointGap { point: MaterialPoint { s: 0.005 + h * i as f64, y: -1e-3 }, normal: Vec2::new(-1.0, 0.0), offset: -d })
            .collect();
        gaps.push(PointGap { point: MaterialPoint { s: rod.length(), y: -1e-3 }, normal: Vec2::new(-1.0, 0.0), offset: -d });
        let c = solve_with_gaps(&rod, &law, &[], &[], &gaps, None, None).unwrap();
        prop_assume!(c.solution.report.status == SolveStatus::Converged);
        for (g, (force, active)) in gaps.iter().zip(c.gap_forces.iter().zip(&c.active)) {
            let x = rod.position(&c.solution.angles, g.point).unwrap();
            let gap = g.normal.dot(x) - g.offset;
            prop_assert!(gap >= -GAP_TOLERANCE - 1e-12, "gap {gap} at s = {}", g.point.s);
            prop_assert!(*force >= -1e-9, "tensile contact force {force}");
            if *force > 1e-9 { prop_assert!(*active && gap.abs() < 1e-8, "force {force} on an open gap {gap}"); }
        }
    }
}

proptest! {
    #![proptest_config(config(4))]

    /// One finger closing on a ball anywhere in front of it (clear of the unbent finger,
    /// within its reach): when the closing converges, no piece of the closed body
    /// (recomputed with parry's contact query, apart from the clamped base) penetrates
    /// the ball or the palm by more than DESIGN 3.3's 0.01 mm.
    #[test]
    fn closing_leaves_no_penetration_above_the_tolerance(
        radius_mm in 15.0..40.0f64,
        clearance_mm in 2.0..25.0f64,
        depth in 55.0..95.0f64,
        kpa in 10.0..55.0f64,
    ) {
        let a = finger(39.4, 3.0, false, 100.0);
        let rod = Rod::of_actuator(&a, 40).unwrap();
        let frame = FingerFrame::new(0.0, 0.065, 0.0).unwrap();
        // the finger's inner face is 8 mm from its centreline at most (Box section)
        let centre_u = radius_mm + 8.0 + clearance_mm;
        let centre = Vec3::new(0.065 - centre_u * 1e-3, 0.0, -depth * 1e-3);
        let obj = ObjectGeometry::new(&ObjectShape::Sphere { radius: radius_mm * 1e-3 }, centre).unwrap();
        let palm = palm_body(&Palm::Disk { radius: 0.075, thickness: 0.012 }).unwrap();
        let obstacles = Obstacles { object: &obj, palm: &palm };
        let c = close_finger(0, &a, &rod, frame, SectionModel::WallPressure, kpa * 1e3, &obstacles, None).unwrap();
        prop_assume!(c.report.status == SolveStatus::Converged);
        for piece in c.body.pieces.iter().filter(|p| p.kind != PieceKind::Base) {
            for (pose, shape) in [(&obj.pose, &obj.shape), (&palm.0, &palm.1)] {
                let hit = parry3d_f64::query::contact(&piece.pose, piece.shape.as_ref(), pose, shape.as_ref(), 0.0).unwrap();
                if let Some(h) = hit {
                    prop_assert!(-h.dist <= PENETRATION_TOLERANCE * (1.0 + 1e-9), "penetration {} m", -h.dist);
                }
            }
        }
        prop_assert!(c.contacts.iter().all(|k| k.normal_force > 0.0 && k.normal_force.is_finite()));
    }

    /// `n` identical fingers at azimuths `360° i / n` around a centred ball, cylinder or
    /// capsule (each symmetric under every rotation about the gripper axis): the check
    /// gives every finger the same total contact force (to a relative 1e-4) and the same
    /// lowest contact height (to 0.01 mm); every finger touches.
    #[test]
    fn symmetric_gripper_on_a_centred_symmetric_object_gives_symmetric_forces(
        n in 2usize..=4,
        shape in 0u8..3,
        size_mm in 25.0..38.0f64,
        depth in 60.0..85.0f64,
        kpa in 20.0..50.0f64,
    ) {
        let r = size_mm * 1e-3;
        let shape = match shape {
            0 => ObjectShape::Sphere { radius: r },
            1 => ObjectShape::Cylinder { radius: r, height: 0.05 },
            _ => ObjectShape::Capsule { radius: r, length: 0.02 },
        };
        let scene = Scene {
            name: "symmetric".into(),
            materials: Vec::new(),
            actuators: vec![finger(39.4, 3.0, false, 100.0)],
            gripper: Gripper {
                palm: Palm::Disk { radius: 0.075, thickness: 0.012 },
                fingers: (0..n).map(|i| FingerMount { actuator: 0, azimuth: std::f64::consts::TAU * i as f64 / n as f64, radius: 0.065, tilt: 0.0 }).collect(),
            },
            objects: vec![TargetObject { name: "o".into(), shape, mass: 0.1, friction: 0.6, position: Vec3::new(0.0, 0.0, -depth * 1e-3), max_contact_force: None }],
            criteria: Criteria { pressure: kpa * 1e3, sweep: None, safety_factor: 1.5, lift_accel: 2.0, lateral_accel: 1.0, min_fingers_in_contact: 1, min_enclosure: 0.2 },
        };
        let report = check_scene(&scene, &CheckSettings::default()).unwrap();
        let o = &report.objects[0];
        prop_assume!(!o.failures.iter().any(|f| matches!(f, grasp_core::check::Failure::NotConverged { .. })));
        let mut force = vec![0.0f64; n];
        let mut height = vec![f64::NAN; n];
        for c in &o.contacts {
            force[c.finger] += c.normal_force;
            height[c.finger] = if height[c.finger].is_nan() { c.point.z } else { height[c.finger].min(c.point.z) };
        }
        // the object is within reach of every finger at these pressures
        prop_assert_eq!(o.fingers_in_contact, n, "forces {:?}", force);
        prop_assert!(force[0] > 0.0);
        // Equal to the closing's own accuracy, not to machine precision: each finger's
        // re-linearisation stops once its penetration is under 0.01 mm, so mirror-image
        // fingers may stop at iterates a little apart (seen: 1.6e-6 relative).
        for i in 1..n {
            prop_assert!((force[i] - force[0]).abs() <= 1e-4 * force[0], "forces {force:?}");
            prop_assert!((height[i] - height[0]).abs() <= PENETRATION_TOLERANCE, "heights {height:?}");
        }
    }
}
