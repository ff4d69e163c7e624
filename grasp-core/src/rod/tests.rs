//! Validation of the rod against closed forms and published tables (DESIGN 3.3).

use super::*;
use crate::actuator::Actuator;
use crate::kinematics::FingerShape;
use crate::section::SectionModel;
use approx::assert_relative_eq;

fn demo_actuator() -> Actuator {
    Actuator::example()
}

/// DESIGN 3.3 (a): with no load the rod reproduces the free bending of DESIGN 3.2: every
/// joint at the free curvature and the tip where the constant-curvature arc puts it.
#[test]
fn unloaded_rod_reproduces_free_bending() {
    let a = demo_actuator();
    let rod = Rod::of_actuator(&a, 40).unwrap();
    for kpa in [10.0, 35.0, 60.0] {
        let law = a.law(kpa * 1e3, SectionModel::WallPressure);
        let free = a.free_bending(kpa * 1e3).unwrap();
        let sol = solve(&rod, &law, &[], &[], None).unwrap();
        assert!(sol.report.converged(), "{:?}", sol.report);
        assert!(sol.report.residual < 1e-8);
        for k in &sol.curvatures {
            assert_relative_eq!(*k, free.curvature, max_relative = 1e-7);
        }
        let tip = *sol.nodes.last().unwrap();
        assert_relative_eq!(tip.x, free.tip.x, max_relative = 1e-7);
        assert_relative_eq!(tip.y, free.tip.y, max_relative = 1e-7, epsilon = 1e-9);
    }
}

/// One row of K. E. Bisshopp and D. C. Drucker, "Large deflection of cantilever beams",
/// Quart. Appl. Math. 3(3), 272–275, 1945 (values evaluated from their elliptic-integral
/// solution; tests/data/bisshopp-drucker-1945.csv).
struct BdRow {
    alpha: f64,
    deflection: f64,
    axial: f64,
    slope_deg: f64,
}

fn bisshopp_drucker_table() -> Vec<BdRow> {
    let text = include_str!("../../../tests/data/bisshopp-drucker-1945.csv");
    text.lines()
        .skip(1)
        .filter(|l| !l.trim().is_empty())
        .map(|l| {
            let v: Vec<f64> = l.split(',').map(|x| x.trim().parse().unwrap()).collect();
            BdRow { alpha: v[0], deflection: v[2], axial: v[3], slope_deg: v[4] }
        })
        .collect()
}

/// DESIGN 3.3 (b): a linear law `m = EI kappa` with a dead tip load `P` normal to the
/// unloaded axis matches Bisshopp & Drucker's large-deflection table to 0.5 % for every
/// tabulated `alpha = P L^2 / EI` from 0.1 to 20, with 40 elements.
#[test]
fn linear_cantilever_matches_bisshopp_drucker_1945() {
    let (l, ei) = (0.1, 2e-3);
    let rod = Rod::new(0.0, l, 0.0, 40).unwrap();
    let law = LinearLaw { stiffness: ei, rest_curvature: 0.0 };
    let table = bisshopp_drucker_table();
    assert_eq!(table.len(), 14);
    for row in table {
        let p = row.alpha * ei / (l * l);
        let load = PointLoad { point: rod.tip_point(), force: Vec2::new(p, 0.0) };
        let sol = solve(&rod, &law, &[load], &[], None).unwrap();
        assert!(sol.report.converged(), "alpha {}: {:?}", row.alpha, sol.report);
        let tip = *sol.nodes.last().unwrap();
        let slope = sol.angles.last().unwrap().to_degrees();
        assert_relative_eq!(tip.x / l, row.deflection, max_relative = 5e-3);
        assert_relative_eq!(tip.y / l, row.axial, max_relative = 5e-3);
        assert_relative_eq!(slope, row.slope_deg, max_relative = 5e-3);
    }
}

/// The discretisation is second order: the tip-deflection error at alpha = 10 falls by
/// about 4x when the elements double (the scheme's expected order; see the module docs).
#[test]
fn discretisation_error_is_second_order() {
    let (l, ei) = (0.1, 2e-3);
    let law = LinearLaw { stiffness: ei, rest_curvature: 0.0 };
    // Bisshopp & Drucker 1945 at alpha = 10: tip deflection 0.81061 L
    let err = |n| {
        let rod = Rod::new(0.0, l, 0.0, n).unwrap();
        let load = PointLoad { point: rod.tip_point(), force: Vec2::new(10.0 * ei / (l * l), 0.0) };
        let sol = solve(&rod, &law, &[load], &[], None).unwrap();
        (sol.nodes.last().unwrap().x / l - 0.81061).abs()
    };
    let (e20, e40) = (err(20), err(40));
    assert!(e40 < e20 / 3.0 && e40 < 2e-3, "e20 {e20:e}, e40 {e40:e}");
}

/// Closed form: a cantilever with uniform intrinsic curvature `kappa0` on the chamber
/// (length `L`, rigid straight tip of length `t`) held at `u_tip = 0` by a force `F`.
/// Small-deflection beam theory gives `u_free = kappa0 L (L/2 + t)` and the tip
/// compliance `((L + t)^3 - t^3) / (3 EI)`, so `F = 3 EI kappa0 L (L/2 + t) / ((L+t)^3 - t^3)`
/// (superposition, e.g. Timoshenko & Gere, "Mechanics of Materials", 1972, ch. 7).
#[test]
fn blocked_force_linear_small_curvature_closed_form() {
    let (b, l, t, ei) = (0.005, 0.09, 0.01, 1.5e-3);
    let kappa0 = 0.01; // kappa0 L ~ 1 mrad: geometric nonlinearity ~ 1e-6
    let rod = Rod::new(b, l, t, 40).unwrap();
    let law = LinearLaw { stiffness: ei, rest_curvature: kappa0 };
    let hold = [PointConstraint { point: rod.tip_point(), direction: Vec2::X, target: 0.0 }];
    let sol = solve(&rod, &law, &[], &hold, None).unwrap();
    assert!(sol.report.converged());
    let f = 3.0 * ei * kappa0 * l * (l / 2.0 + t) / ((l + t).powi(3) - t.powi(3));
    // 40 elements: the O(h^2) discretisation error is about 1e-4 here
    assert_relative_eq!(sol.multipliers[0], f, max_relative = 3e-4);
    let fine = solve(&Rod::new(b, l, t, 160).unwrap(), &law, &[], &hold, None).unwrap();
    assert_relative_eq!(fine.multipliers[0], f, max_relative = 3e-5);
    assert_relative_eq!(sol.nodes.last().unwrap().x, 0.0, epsilon = 1e-12);
}

/// The same closed form through [`blocked_tip_force`] with the actuator's section law at
/// small pressure: the section law's tangent at zero curvature plays `EI`, its free
/// curvature plays `kappa0`.
#[test]
fn blocked_force_of_actuator_at_small_pressure_matches_closed_form() {
    let a = demo_actuator();
    let rod = Rod::of_actuator(&a, 40).unwrap();
    let p = 50.0; // Pa
    let law = a.law(p, SectionModel::WallPressure);
    let kappa0 = a.free_bending(p).unwrap().curvature;
    let ei = law.moment(kappa0).unwrap().1;
    let (l, t) = (a.chamber_length, a.tip_length);
    let f = 3.0 * ei * kappa0 * l * (l / 2.0 + t) / ((l + t).powi(3) - t.powi(3));
    let bf = blocked_tip_force(&rod, &law, None).unwrap();
    assert!(bf.solution.report.converged());
    assert_relative_eq!(bf.force, f, max_relative = 2e-3);
}

/// Independent boundary-value solution of the blocked actuator (DESIGN 3.3 (c)): the
/// continuous elastica `phi' = kappa(M(s))`, `m(kappa) = F (w(s) - w_tip)` on the chamber
/// (the only load is the tip force `-F` along `u`, whose lever arm about the section at
/// `s` is `w_tip - w(s)`), integrated from the tip to the clamp by fourth-order Runge–Kutta with 400
/// steps and shot on the two unknowns `(F, phi_tip)` until `phi(clamp) = 0` and
/// `u(clamp) = 0`. It shares only the section law with the rod.
#[test]
fn blocked_force_matches_an_independent_shooting_solution() {
    let a = demo_actuator();
    let rod = Rod::of_actuator(&a, 48).unwrap();
    for kpa in [20.0, 50.0] {
        let law = a.law(kpa * 1e3, SectionModel::WallPressure);
        let bf = blocked_tip_force(&rod, &law, None).unwrap();
        assert!(bf.solution.report.converged(), "{:?}", bf.solution.report);
        let f_ref = shoot_blocked(&a, &law, bf.force, *bf.solution.angles.last().unwrap());
        // O(h^2) discretisation error of the rod with 48 elements
        assert_relative_eq!(bf.force, f_ref, max_relative = 2e-3);
    }
}

/// Curvature where the law's moment equals `target` (safeguarded Newton on a monotone law).
fn invert_law(law: &crate::section::SectionLaw, target: f64, guess: f64) -> f64 {
    let (lo0, hi0) = law.curvature_range();
    let (mut lo, mut hi) = (lo0 * 0.999, hi0.min(1e4) * 0.999);
    let mut k = guess.clamp(lo, hi);
    for _ in 0..200 {
        let (m, dm) = law.moment(k).unwrap();
        let r = m - target;
        if r.abs() < 1e-15 {
            break;
        }
        if r > 0.0 {
            hi = k
        } else {
            lo = k
        }
        let n = k - r / dm;
        k = if n > lo && n < hi { n } else { 0.5 * (lo + hi) };
    }
    k
}

/// Shooting solution of the finger held at its tip by a force along `-u` acting at the
/// point `P = tip + depth (cos phi, -sin phi)` (`depth` below the reference line, toward
/// the bend side; 0 = the tip on the reference line), with `u(P) = target_u`. Integrates
/// from the chamber's end back to its start with unknowns `F` and the tip angle, and
/// returns `F` after Newton on the two conditions at the chamber's start (`phi = 0` and
/// `u = 0`), with a finite-difference Jacobian.
fn shoot_tip_contact(
    a: &Actuator,
    law: &crate::section::SectionLaw,
    f0: f64,
    phi0: f64,
    target_u: f64,
    depth: f64,
) -> f64 {
    let (l, t) = (a.chamber_length, a.tip_length);
    let residual = |f: f64, phi_tip: f64| -> (f64, f64) {
        // state relative to P: (phi, du = u(s) - u_P, dw = w(s) - w_P); start at the
        // chamber's end x_N = tip - t d(phi), P = tip + depth n(phi)
        let mut phi = phi_tip;
        let mut du = -t * phi.sin() - depth * phi.cos();
        let mut dw = -t * phi.cos() + depth * phi.sin();
        let n = 400;
        let h = l / n as f64;
        // the holder pushes with -F along u at P; its moment about the section at s, in the
        // sense of increasing phi, is F (w(s) - w_P) = F dw
        let mut k_guess = 0.0;
        let mut rhs = |phi: f64, dw: f64| -> (f64, f64, f64) {
            let kappa = invert_law(law, f * dw, k_guess);
            k_guess = kappa;
            // d/ds: phi' = kappa, u' = sin phi, w' = cos phi (integrated with -h)
            (kappa, phi.sin(), phi.cos())
        };
        for _ in 0..n {
            let (k1, u1, w1) = rhs(phi, dw);
            let (k2, u2, w2) = rhs(phi - 0.5 * h * k1, dw - 0.5 * h * w1);
            let (k3, u3, w3) = rhs(phi - 0.5 * h * k2, dw - 0.5 * h * w2);
            let (k4, u4, w4) = rhs(phi - h * k3, dw - h * w3);
            phi -= h / 6.0 * (k1 + 2.0 * k2 + 2.0 * k3 + k4);
            du -= h / 6.0 * (u1 + 2.0 * u2 + 2.0 * u3 + u4);
            dw -= h / 6.0 * (w1 + 2.0 * w2 + 2.0 * w3 + w4);
        }
        // at the chamber's start: phi = 0 and u = 0, i.e. du = -u_P = -target_u
        (phi, du + target_u)
    };
    let (mut f, mut ph) = (f0, phi0);
    for _ in 0..30 {
        let (r1, r2) = residual(f, ph);
        if r1.abs() < 1e-12 && r2.abs() < 1e-13 {
            break;
        }
        let (ef, ep) = (1e-6 * f.abs().max(1e-3), 1e-7);
        let (a1, a2) = residual(f + ef, ph);
        let (b1, b2) = residual(f, ph + ep);
        let (j11, j21, j12, j22) = ((a1 - r1) / ef, (a2 - r2) / ef, (b1 - r1) / ep, (b2 - r2) / ep);
        let det = j11 * j22 - j12 * j21;
        f -= (r1 * j22 - r2 * j12) / det;
        ph -= (j11 * r2 - j21 * r1) / det;
    }
    f
}

fn shoot_blocked(a: &Actuator, law: &crate::section::SectionLaw, f0: f64, phi0: f64) -> f64 {
    shoot_tip_contact(a, law, f0, phi0, 0.0, 0.0)
}

/// A finger pressed against a flat rigid wall (issue "grasp check": contact force and
/// shape against a boundary-value solution computed independently). The wall is the
/// plane `u = d` parallel to the unbent axis, on the side the finger bends to; gaps are
/// set at the inner face (`y = -t_u`) of every element end and of the tip. The active set
/// finds the tip's inner corner as the only contact; the force equals the shooting
/// solution of the rod equations with the force at that corner, and every other gap stays
/// open (no penetration beyond the tolerance).
#[test]
fn finger_pressed_against_a_flat_wall_matches_a_shooting_solution() {
    let a = demo_actuator();
    let rod = Rod::of_actuator(&a, 48).unwrap();
    let law = a.law(10e3, SectionModel::WallPressure);
    let free = a.free_bending(10e3).unwrap();
    let d = 0.6 * free.tip.x; // the wall stops the finger well short of its free tip
    let depth = a.section.under_layer();
    let h = rod.element_length();
    let mut gaps: Vec<PointGap> = (1..=rod.elements)
        .map(|i| PointGap {
            point: MaterialPoint { s: a.base_length + h * i as f64, y: -depth },
            normal: Vec2::new(-1.0, 0.0),
            offset: -d,
        })
        .collect();
    gaps.push(PointGap {
        point: MaterialPoint { s: rod.length(), y: -depth },
        normal: Vec2::new(-1.0, 0.0),
        offset: -d,
    });
    // both contact methods: the active set around Newton, and the SQP steps
    let by_active_set = solve_with_gaps(&rod, &law, &[], &[], &gaps, None, None).unwrap();
    let by_sqp = super::solve_with_gaps_sqp(&rod, &law, &[], &gaps, None, 5e-3).unwrap();
    for (method, c) in [("active set", by_active_set), ("sqp", by_sqp)] {
        assert!(c.solution.report.converged(), "{method}: {:?}", c.solution.report);
        let active: Vec<usize> = (0..gaps.len()).filter(|&i| c.gap_forces[i] > 0.0).collect();
        assert_eq!(active, vec![gaps.len() - 1], "{method}: only the tip corner touches");
        assert!(c.gaps.iter().all(|g| *g >= -GAP_TOLERANCE), "{method}: {:?}", c.gaps);
        assert!(c.gap_forces.iter().all(|f| *f >= 0.0));
        let f = c.gap_forces[gaps.len() - 1];
        let tip_angle = *c.solution.angles.last().unwrap();
        let f_ref = shoot_tip_contact(&a, &law, f, tip_angle, d, depth);
        assert!(f > 0.0);
        assert_relative_eq!(f, f_ref, max_relative = 2e-3);
    }
}

/// A law defined only for `|kappa| < 1 1/m` (out of range beyond, like a section whose
/// fibres would be crushed) under a tip load that needs a curvature of about 10 1/m: no
/// equilibrium exists inside the law's range, so the solver must say it did not converge
/// (status, residual above tolerance, bounded iterations) instead of returning a state.
#[test]
fn non_convergence_is_reported_not_hidden() {
    struct Narrow;
    impl MomentLaw for Narrow {
        fn moment(&self, kappa: f64) -> Result<(f64, f64), crate::section::LawError> {
            if kappa.abs() < 1.0 {
                Ok((2e-3 * kappa, 2e-3))
            } else {
                Err(crate::section::LawError::OutOfRange {
                    curvature_per_m: kappa,
                    face: "test",
                    stretch: 0.0,
                })
            }
        }
    }
    let rod = Rod::new(0.0, 0.1, 0.0, 40).unwrap();
    // linear estimate: kappa at the clamp = P L / EI = 0.2 * 0.1 / 2e-3 = 10 1/m
    let load = PointLoad { point: rod.tip_point(), force: Vec2::new(0.2, 0.0) };
    let sol = solve(&rod, &Narrow, &[load], &[], None).unwrap();
    assert_ne!(sol.report.status, SolveStatus::Converged, "{:?}", sol.report);
    assert!(!sol.report.converged());
    assert!(sol.report.residual > 1e-8);
    assert!(sol.report.iterations <= 2000);
    // every curvature of the returned (last accepted) state is inside the law's range
    assert!(sol.curvatures.iter().all(|k| k.abs() < 1.0));
}

#[test]
fn bad_inputs_are_errors() {
    let rod = Rod::new(0.0, 0.1, 0.0, 10).unwrap();
    let law = LinearLaw { stiffness: 1.0, rest_curvature: 0.0 };
    let off = PointLoad { point: MaterialPoint { s: 0.2, y: 0.0 }, force: Vec2::X };
    assert!(solve(&rod, &law, &[off], &[], None).is_err());
    let nan = PointLoad { point: rod.tip_point(), force: Vec2::new(f64::NAN, 0.0) };
    assert!(solve(&rod, &law, &[nan], &[], None).is_err());
    assert!(matches!(solve(&rod, &law, &[], &[], Some(&[0.0; 3])), Err(RodError::BadInitialGuess { .. })));
    assert!(Rod::new(0.0, 0.0, 0.0, 10).is_err());
    assert!(Rod::new(0.0, 0.1, 0.0, 0).is_err());
}

#[test]
fn material_point_offsets_follow_the_section() {
    // a straight rod: the inner face (y < 0) lies toward +u
    let rod = Rod::new(0.01, 0.1, 0.01, 10).unwrap();
    let angles = vec![0.0; rod.dofs()];
    let p = rod.position(&angles, MaterialPoint { s: 0.05, y: -0.002 }).unwrap();
    assert_relative_eq!(p.x, 0.002, epsilon = 1e-15);
    assert_relative_eq!(p.y, 0.05, epsilon = 1e-15);
    // on a uniformly bent rod, points of the reference line lie on the arc of FingerShape
    let k = 12.0;
    let h = rod.element_length();
    let angles: Vec<f64> = (1..=rod.elements).map(|i| i as f64 * k * h).collect();
    let shape = FingerShape { base_length: 0.01, chamber_length: 0.1, tip_length: 0.01, curvature: k };
    let nodes = rod.nodes(&angles);
    for (i, n) in nodes.iter().enumerate().skip(1).take(rod.elements + 1) {
        let q = shape.point_at(0.01 + h * (i - 1) as f64);
        assert_relative_eq!(n.x, q.x, epsilon = 1e-14);
        assert_relative_eq!(n.y, q.y, epsilon = 1e-14);
    }
    let tip = shape.tip();
    assert_relative_eq!(nodes.last().unwrap().x, tip.x, epsilon = 1e-14);
}

/// DESIGN 4.2's example actuator bends so far that its held branch ends: past about
/// 54 kPa the tip, held on the axis, curls past the holder. The curve follows the branch
/// up to the limit point and reports the pressures beyond it as such, with the force at
/// the limit larger than every held force before it; it never reports a silent value.
#[test]
fn blocked_curve_stops_at_the_limit_point_of_the_held_branch() {
    let a = demo_actuator();
    let rod = Rod::of_actuator(&a, 48).unwrap();
    let law = a.law(0.0, SectionModel::WallPressure);
    let pressures: Vec<f64> = (0..=12).map(|i| 5e3 * i as f64).collect();
    let curve = blocked_force_curve(&rod, &law, &pressures).unwrap();
    let mut held_max: f64 = 0.0;
    let mut saw_limit = false;
    for (p, o) in pressures.iter().zip(&curve) {
        match o {
            BlockedOutcome::Held { force, report } => {
                assert!(!saw_limit && report.converged());
                assert!(*force >= held_max, "at {p}: {force} < {held_max}");
                held_max = *force;
            }
            BlockedOutcome::BeyondLimit { limit_pressure, limit_force } => {
                saw_limit = true;
                assert!(*limit_pressure > 50e3 && *limit_pressure < *p, "{limit_pressure}");
                assert!(*limit_force > held_max);
            }
            BlockedOutcome::NotConverged(r) => panic!("at {p}: {r:?}"),
        }
    }
    assert!(saw_limit);
    // and the held forces agree with independent single solves warm-started nowhere
    let single = blocked_tip_force(&rod, &law.at_pressure(20e3), None).unwrap();
    let BlockedOutcome::Held { force, .. } = &curve[4] else { panic!() };
    assert_relative_eq!(*force, single.force, max_relative = 1e-9);
}

/// A uniformly distributed load `q` on a linear cantilever, lumped at the 40 element
/// midpoints (as the finger's own weight is), deflects the tip by `q L^4 / (8 EI)` in the
/// small-deflection limit (Euler–Bernoulli; Timoshenko & Gere, "Mechanics of Materials",
/// 1972, table of beam deflections). Exercises the shared-chord assembly of many loads.
#[test]
fn distributed_load_matches_the_euler_bernoulli_cantilever() {
    let (l, ei) = (0.1, 2e-3);
    let rod = Rod::new(0.0, l, 0.0, 40).unwrap();
    let law = LinearLaw { stiffness: ei, rest_curvature: 0.0 };
    let q = 1e-3 * 8.0 * ei / l.powi(4); // tip deflection 1e-3 L: geometric nonlinearity ~1e-6
    let h = rod.element_length();
    let loads: Vec<PointLoad> = (0..rod.elements)
        .map(|i| PointLoad {
            point: MaterialPoint { s: h * (i as f64 + 0.5), y: 0.0 },
            force: Vec2::new(q * h, 0.0),
        })
        .collect();
    let sol = solve(&rod, &law, &loads, &[], None).unwrap();
    assert!(sol.report.converged());
    let tip = sol.nodes.last().unwrap().x;
    // midpoint lumping is second order: 40 elements leave ~1e-4 relative
    assert_relative_eq!(tip, q * l.powi(4) / (8.0 * ei), max_relative = 5e-4);
}

/// The placement cache and the node chain give the same numbers as walking the chain
/// for every point
/// (`Rod::position`, `point_derivatives`: bit for bit, the same terms in the same order),
/// and those numbers are right: on a uniform bend every point of the reference line lies
/// on the arc of `FingerShape` (Webster & Jones, IJRR 29(13), 2010: constant curvature),
/// and on a non-uniform bend the first derivatives equal central finite differences of
/// the position (a closed-form check of the chain rule, error O(step^2)).
#[test]
fn placement_equals_the_chain_walk_and_its_derivatives_are_the_slopes() {
    use super::solve::{Placement, point_derivatives};
    let rod = Rod::new(0.01, 0.1, 0.008, 20).unwrap();
    let h = rod.element_length();
    let k = 15.0;
    let uniform: Vec<f64> = (1..=rod.elements).map(|i| i as f64 * k * h).collect();
    let shape = FingerShape { base_length: 0.01, chamber_length: 0.1, tip_length: 0.008, curvature: k };
    let placed = Placement::new(&rod, &uniform, None).unwrap();
    for s in [0.004, 0.0137, 0.05, 0.0999, 0.1102, rod.length()] {
        let x = placed.position(MaterialPoint { s, y: 0.0 }).unwrap();
        let q = shape.point_at(s);
        assert_relative_eq!(x.x, q.x, epsilon = 1e-14);
        assert_relative_eq!(x.y, q.y, epsilon = 1e-14);
    }
    let bent: Vec<f64> =
        (1..=rod.elements).map(|i| 2.0 * (i as f64 / 20.0).powf(1.5) + 0.05 * (i as f64).sin()).collect();
    let placed = Placement::new(&rod, &bent, None).unwrap();
    let chain = Chain::new(&rod, &bent).unwrap();
    let from_nodes = Placement::new(&rod, &bent, Some(chain.nodes())).unwrap();
    for (s, y) in [(0.003, 0.001), (0.0137, -0.002), (0.061, 0.004), (0.1049, -0.001), (0.113, 0.003)] {
        let p = MaterialPoint { s, y };
        assert_eq!(placed.position(p).unwrap(), rod.position(&bent, p).unwrap());
        assert_eq!(from_nodes.position(p).unwrap(), rod.position(&bent, p).unwrap());
        assert_eq!(Chain::new(&rod, &bent).unwrap().position(p).unwrap(), rod.position(&bent, p).unwrap());
        let fast = placed.derivatives(p).unwrap();
        let slow = point_derivatives(&rod, &bent, p).unwrap();
        assert_eq!(fast.first, slow.first);
        assert_eq!(fast.second, slow.second);
        let mut slope = vec![Vec2::ZERO; rod.dofs()];
        for (k, d) in &fast.first {
            slope[*k] += *d;
        }
        let e = 1e-6;
        for (k, d) in slope.iter().enumerate() {
            let mut up = bent.clone();
            let mut down = bent.clone();
            up[k] += e;
            down[k] -= e;
            let fd = (rod.position(&up, p).unwrap() - rod.position(&down, p).unwrap()) / (2.0 * e);
            assert!((fd - *d).length() < 1e-8, "s {s}, dof {k}: {d:?} vs {fd:?}");
        }
    }
    assert!(Placement::new(&rod, &bent[..5], None).is_err());
    assert!(Placement::new(&rod, &bent, Some(&chain.nodes()[..5])).is_err());
    assert!(Chain::new(&rod, &bent[..5]).is_err());
}
