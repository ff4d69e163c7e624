//! Validation of the holding program against closed forms from Coulomb friction and
//! statics, and against an independent linear program (microlp) on linearised cones.

use std::f64::consts::{FRAC_PI_4, PI, TAU};

use approx::assert_relative_eq;
use microlp::{ComparisonOp, OptimizationDirection, Problem, Variable};

use super::*;

const G: f64 = STANDARD_GRAVITY;

fn settings() -> HoldingSettings {
    HoldingSettings::default()
}

fn contact(point: Vec3, normal: Vec3, normal_force: f64, friction: f64, finger: usize) -> GraspContact {
    GraspContact { point, normal, normal_force, friction, finger }
}

/// Two horizontal antipodal contacts on a sphere of radius `r` centred at `c`, along x.
fn pinch(c: Vec3, r: f64, n1: f64, n2: f64, mu: f64) -> [GraspContact; 2] {
    [
        contact(c + Vec3::new(r, 0.0, 0.0), Vec3::NEG_X, n1, mu, 0),
        contact(c - Vec3::new(r, 0.0, 0.0), Vec3::X, n2, mu, 1),
    ]
}

/// Horizontal contacts on a circle of radius `r` around `c` at the given azimuths, normals
/// pointing at the centre.
fn ring(c: Vec3, r: f64, azimuths_deg: &[f64], n: f64, mu: f64) -> Vec<GraspContact> {
    azimuths_deg
        .iter()
        .enumerate()
        .map(|(i, a)| {
            let (s, co) = a.to_radians().sin_cos();
            let radial = Vec3::new(co, s, 0.0);
            contact(c + r * radial, -radial, n, mu, i)
        })
        .collect()
}

fn solved(contacts: &[GraspContact], com: Vec3, load: &LoadCase) -> HoldingResult {
    let r = holding_scale(contacts, com, load, &settings()).expect("valid input");
    assert_eq!(r.status, HoldingStatus::Solved, "{} -> {r:?}", load.name);
    assert!(r.residual < 1e-7, "balance residual {} for {}", r.residual, load.name);
    r
}

/// Symmetric two-finger pinch of a sphere lifted with acceleration `a`: closed form from
/// Coulomb's law and statics (derived here).
///
/// Contacts at `c +- R x` with normals `-+x`, normal forces `f_n1, f_n2 <= N`, friction
/// `mu`; load `F = -m (g + a) z`. Force balance along x gives `f_n1 = f_n2`; along z the
/// two friction forces carry the weight, `t_z1 + t_z2 = s m (g + a)`, with
/// `|t_zi| <= mu f_ni <= mu N`. Torque about `c`: `R x X (f1 - f2) = 0` requires equal
/// tangential forces, which the symmetric optimum has. Hence `s = 2 mu N / (m (g + a))`,
/// reached with both normal forces at their bound `N` and both friction forces `mu N` up.
#[test]
fn pinch_lift_margin_equals_coulomb_closed_form() {
    let (m, a, n, mu, r) = (0.085, 5.0, 2.0, 0.6, 0.03);
    let c = Vec3::new(0.004, -0.002, -0.07);
    let lift = &load_cases(m, a, 3.0).unwrap()[0];
    assert_eq!(lift.kind, LoadKind::Lift);
    let res = solved(&pinch(c, r, n, n, mu), c, lift);
    let expected = 2.0 * mu * n / (m * (G + a));
    assert_relative_eq!(res.scale, expected, max_relative = 1e-7);
    // The optimum is unique: both fingers at N, friction mu N straight up.
    let f = &res.contact_forces;
    assert_relative_eq!(f[0].x, -n, max_relative = 1e-6);
    assert_relative_eq!(f[1].x, n, max_relative = 1e-6);
    assert_relative_eq!(f[0].z, mu * n, max_relative = 1e-6);
    assert_relative_eq!(f[1].z, mu * n, max_relative = 1e-6);
    assert!(f[0].y.abs() < 1e-6 && f[1].y.abs() < 1e-6);
}

/// The same pinch with unequal closing forces `N1 > N2`: x balance forces equal normal
/// forces, so the weaker finger's bound caps both: `s = 2 mu min(N1, N2) / (m (g + a))`
/// (derived as in the symmetric case).
#[test]
fn pinch_lift_is_capped_by_the_weaker_finger() {
    let (m, a, mu, r) = (0.06, 2.0, 0.8, 0.025);
    let c = Vec3::new(0.0, 0.0, -0.05);
    let lift = LoadCase::new("lift", Vec3::new(0.0, 0.0, -m * (G + a)), Vec3::ZERO).unwrap();
    let res = solved(&pinch(c, r, 2.5, 1.2, mu), c, &lift);
    assert_relative_eq!(res.scale, 2.0 * mu * 1.2 / (m * (G + a)), max_relative = 1e-7);
}

/// The pinch under the 8 lateral cases: closed form (derived here). The gripper
/// accelerates at `a` toward `theta`; the load is `F = m (-a cos theta, -a sin theta, -g)`.
/// Torque balance about `c` makes the two tangential forces equal, each
/// `s m (a sin theta, g) / 2` in (y, z); x balance gives `f_n2 - f_n1 = s m a cos theta`.
/// With `f_n <= N` the finger that the load pulls away from is the limit:
/// `s m sqrt(a^2 sin^2 theta + g^2) / 2 <= mu (N - s m a |cos theta|)`, so
/// `s = mu N / (m (sqrt(a^2 sin^2 theta + g^2) / 2 + mu a |cos theta|))`.
#[test]
fn pinch_lateral_margins_match_closed_form() {
    let (m, a_lat, n, mu, r) = (0.11, 3.0, 1.7, 0.5, 0.032);
    let c = Vec3::new(-0.01, 0.005, -0.09);
    let cases = load_cases(m, 5.0, a_lat).unwrap();
    let grasp = pinch(c, r, n, n, mu);
    let mut smallest = f64::INFINITY;
    for case in &cases[1..] {
        let LoadKind::Lateral { direction } = case.kind else { panic!("{case:?} is not lateral") };
        let (s, co) = direction.sin_cos();
        let expected = mu * n / (m * ((a_lat * a_lat * s * s + G * G).sqrt() / 2.0 + mu * a_lat * co.abs()));
        let res = solved(&grasp, c, case);
        assert_relative_eq!(res.scale, expected, max_relative = 1e-7);
        smallest = smallest.min(expected);
    }
    let margins = holding_margins(&grasp, c, &cases, &settings()).unwrap();
    assert!(margins.all_answered);
    assert_relative_eq!(margins.lateral_min.unwrap(), smallest, max_relative = 1e-7);
    assert_relative_eq!(margins.lift.unwrap(), 2.0 * mu * n / (m * (G + 5.0)), max_relative = 1e-7);
}

/// Three horizontal contacts at 120°, mu = 0.5, N = 1, unit downward load: 1.5
/// (= 3 mu N), the value measured with clarabel in the project's crate notes, and the
/// closed form (derived here): with horizontal normals only friction carries vertical
/// load, and `sum_i |t_i| <= sum_i mu f_ni <= 3 mu N` bounds it; `f_ni = N` with `mu N` of
/// friction straight up at each contact balances forces (equal normals at 120° cancel)
/// and torques (`sum_i (p_i - c) x z = (sum_i (p_i - c)) x z = 0`), so the bound is
/// reached.
#[test]
fn three_fingers_at_120_degrees_lift_three_mu_n() {
    let c = Vec3::new(0.0, 0.0, -0.06);
    let grasp = ring(c, 0.03, &[0.0, 120.0, 240.0], 1.0, 0.5);
    let unit = LoadCase::new("unit", Vec3::new(0.0, 0.0, -1.0), Vec3::ZERO).unwrap();
    let res = solved(&grasp, c, &unit);
    assert_relative_eq!(res.scale, 1.5, max_relative = 1e-8);
    assert!(res.iterations > 0 && res.iterations < 30, "{} iterations", res.iterations);
    // With mass and acceleration: 3 mu N / (m (g + a)).
    let (m, a) = (0.05, 4.0);
    let margins = holding_margins(&grasp, c, &load_cases(m, a, 2.0).unwrap(), &settings()).unwrap();
    assert_relative_eq!(margins.lift.unwrap(), 1.5 / (m * (G + a)), max_relative = 1e-7);
}

/// Frictionless cradle: a contact directly under the centre of mass pushing up with at
/// most `N_b`, and two horizontal antipodal ones: only the bottom contact can carry weight
/// and its line of action passes through `c`, so `s = N_b / (m (g + a))` (statics).
#[test]
fn frictionless_cradle_holds_with_the_bottom_contact() {
    let (m, a, nb, r) = (0.2, 3.0, 4.0, 0.04);
    let c = Vec3::new(0.0, 0.0, -0.1);
    let mut grasp = pinch(c, r, 1.0, 1.0, 0.0).to_vec();
    grasp.push(contact(c - Vec3::new(0.0, 0.0, r), Vec3::Z, nb, 0.0, 2));
    let lift = &load_cases(m, a, 1.0).unwrap()[0];
    let res = solved(&grasp, c, lift);
    assert_relative_eq!(res.scale, nb / (m * (G + a)), max_relative = 1e-7);
    // And the frictionless pinch alone cannot hold any weight.
    let res = solved(&grasp[..2], c, lift);
    assert!(res.scale < 1e-8, "frictionless pinch held {}", res.scale);
}

/// Contacts all on one side of the object (both pushing +x) cannot balance a load that
/// pulls the object away from them (the x component of every contact force is its normal
/// force, `>= 0`), nor even the lift case (x balance forces every normal force to 0, and
/// with it all friction): every margin is 0 (statics).
#[test]
fn contacts_on_one_side_cannot_hold() {
    let c = Vec3::new(0.0, 0.0, -0.08);
    let r = 0.03;
    let grasp = [
        contact(c + Vec3::new(-r * 0.8, r * 0.6, 0.0), Vec3::X, 2.0, 0.9, 0),
        contact(c + Vec3::new(-r * 0.8, -r * 0.6, 0.0), Vec3::X, 2.0, 0.9, 1),
    ];
    let margins = holding_margins(&grasp, c, &load_cases(0.1, 5.0, 3.0).unwrap(), &settings()).unwrap();
    assert!(margins.all_answered);
    assert!(margins.lateral_min.unwrap() < 1e-8, "{margins:?}");
    assert!(margins.lift.unwrap() < 1e-8, "{margins:?}");
    for m in &margins.cases {
        assert!(m.result.status.is_answer());
        assert!(!m.result.passes(1.0));
    }
}

/// Zero friction everywhere: horizontal contacts carry no vertical load (Coulomb's law
/// with `mu = 0`), margin 0 in every case.
#[test]
fn zero_friction_ring_holds_nothing() {
    let c = Vec3::ZERO;
    let grasp = ring(c, 0.03, &[0.0, 90.0, 180.0, 270.0], 3.0, 0.0);
    let margins = holding_margins(&grasp, c, &load_cases(0.1, 5.0, 3.0).unwrap(), &settings()).unwrap();
    for m in &margins.cases {
        assert!(m.result.scale < 1e-8, "{}: {}", m.case.name, m.result.scale);
    }
}

/// Sign convention for torques (statics of a couple): frictionless contacts at
/// `c - d y` pushing `+x` and at `c + d y` pushing `-x` form a couple of moment
/// `+2 d f` about `+z` (`(-d y) x (f x) = d f z`, `(d y) x (-f x) = d f z`) and nothing
/// else. They balance a load torque `T = -z` up to `s = 2 d N`, and cannot balance
/// `T = +z` at all.
#[test]
fn torque_load_sign_convention() {
    let (d, n) = (0.02, 3.0);
    let c = Vec3::new(0.01, 0.0, -0.05);
    let grasp = [
        contact(c - Vec3::new(0.0, d, 0.0), Vec3::X, n, 0.0, 0),
        contact(c + Vec3::new(0.0, d, 0.0), Vec3::NEG_X, n, 0.0, 1),
    ];
    let negative = LoadCase::new("-z torque", Vec3::ZERO, Vec3::NEG_Z).unwrap();
    let r = solved(&grasp, c, &negative);
    assert_relative_eq!(r.scale, 2.0 * d * n, max_relative = 1e-7);
    let positive = LoadCase::new("+z torque", Vec3::ZERO, Vec3::Z).unwrap();
    let r = solved(&grasp, c, &positive);
    assert!(r.scale < 1e-8, "{}", r.scale);
}

#[test]
fn no_contacts_and_unloaded_contacts_give_zero() {
    let lift = &load_cases(0.1, 5.0, 3.0).unwrap()[0];
    let r = holding_scale(&[], Vec3::ZERO, lift, &settings()).unwrap();
    assert_eq!((r.scale, r.status, r.iterations), (0.0, HoldingStatus::NoContacts, 0));
    let idle = pinch(Vec3::ZERO, 0.02, 0.0, 0.0, 0.5);
    let r = holding_scale(&idle, Vec3::ZERO, lift, &settings()).unwrap();
    assert_eq!((r.scale, r.status), (0.0, HoldingStatus::NoContacts));
    assert_eq!(r.contact_forces, vec![Vec3::ZERO; 2]);
    let m = holding_margins(&[], Vec3::ZERO, &load_cases(0.1, 5.0, 3.0).unwrap(), &settings()).unwrap();
    assert_eq!((m.lift, m.lateral_min), (Some(0.0), Some(0.0)));
}

/// A contact with `N_i = 0` carries nothing: the pinch plus an idle third finger gives
/// the pinch's closed form `2 mu N / W`.
#[test]
fn idle_contact_is_left_out() {
    let mut grasp = pinch(Vec3::ZERO, 0.02, 1.0, 1.0, 0.5).to_vec();
    grasp.push(contact(Vec3::new(0.0, 0.0, -0.02), Vec3::Z, 0.0, 0.5, 2));
    let unit = LoadCase::new("unit", Vec3::new(0.0, 0.0, -1.0), Vec3::ZERO).unwrap();
    let r = solved(&grasp, Vec3::ZERO, &unit);
    assert_relative_eq!(r.scale, 1.0, max_relative = 1e-7);
    assert_eq!(r.contact_forces[2], Vec3::ZERO);
}

#[test]
fn zero_load_and_tiny_load_are_capped() {
    let grasp = pinch(Vec3::ZERO, 0.02, 1.0, 1.0, 0.5);
    let none = LoadCase::new("none", Vec3::ZERO, Vec3::ZERO).unwrap();
    let r = holding_scale(&grasp, Vec3::ZERO, &none, &settings()).unwrap();
    assert_eq!((r.scale, r.status), (MAX_LOAD_SCALE, HoldingStatus::NoLoad));
    // 1e-9 N of weight against 1 N fingers: the true margin is 1e9, above the cap.
    let tiny = LoadCase::new("tiny", Vec3::new(0.0, 0.0, -1e-9), Vec3::ZERO).unwrap();
    let r = holding_scale(&grasp, Vec3::ZERO, &tiny, &settings()).unwrap();
    assert_eq!((r.scale, r.status), (MAX_LOAD_SCALE, HoldingStatus::Capped));
    assert!(r.passes(2.0));
}

/// An iteration cap of 1 cannot reach the optimum: the status says so and the margin is
/// not a pass.
#[test]
fn iteration_limit_is_a_status_not_a_pass() {
    let grasp = ring(Vec3::ZERO, 0.03, &[0.0, 120.0, 240.0], 1.0, 0.5);
    let unit = LoadCase::new("unit", Vec3::new(0.0, 0.0, -1.0), Vec3::ZERO).unwrap();
    let tight = HoldingSettings::default().with_max_iterations(1).unwrap();
    let r = holding_scale(&grasp, Vec3::ZERO, &unit, &tight).unwrap();
    assert_eq!(r.status, HoldingStatus::SolverFailed(SolverFailure::MaxIterations));
    assert_eq!(r.scale, 0.0);
    assert!(!r.passes(0.0));
    let m = holding_margins(&grasp, Vec3::ZERO, &[unit], &tight).unwrap();
    assert!(!m.all_answered);
}

#[test]
fn same_input_gives_bit_identical_output() {
    let c = Vec3::new(0.001, 0.002, -0.07);
    let grasp = irregular_grasp(c);
    let cases = load_cases(0.12, 4.0, 3.0).unwrap();
    let a = holding_margins(&grasp, c, &cases, &settings()).unwrap();
    let b = holding_margins(&grasp, c, &cases, &settings()).unwrap();
    for (x, y) in a.cases.iter().zip(&b.cases) {
        assert_eq!(x.result.scale.to_bits(), y.result.scale.to_bits());
        assert_eq!(x.result.iterations, y.result.iterations);
        for (f, g) in x.result.contact_forces.iter().zip(&y.result.contact_forces) {
            assert_eq!(f.to_array().map(f64::to_bits), g.to_array().map(f64::to_bits));
        }
    }
}

#[test]
fn invalid_inputs_are_typed_errors() {
    let grasp = pinch(Vec3::ZERO, 0.02, 1.0, 1.0, 0.5);
    let lift = &load_cases(0.1, 5.0, 3.0).unwrap()[0];
    let s = settings();
    assert_eq!(
        holding_scale(&grasp, Vec3::new(f64::NAN, 0.0, 0.0), lift, &s),
        Err(HoldingError::InvalidCentre)
    );
    let mut bad = grasp;
    bad[1].friction = -0.1;
    assert!(matches!(
        holding_scale(&bad, Vec3::ZERO, lift, &s),
        Err(HoldingError::Contact(ContactError::InvalidFriction { index: 1, .. }))
    ));
    assert!(LoadCase::new("x", Vec3::new(f64::INFINITY, 0.0, 0.0), Vec3::ZERO).is_err());
    let nan_load = LoadCase { force: Vec3::new(0.0, f64::NAN, 0.0), ..lift.clone() };
    assert!(matches!(
        holding_scale(&grasp, Vec3::ZERO, &nan_load, &s),
        Err(HoldingError::InvalidLoad { .. })
    ));
    assert_eq!(load_cases(0.0, 1.0, 1.0), Err(HoldingError::InvalidMass { value: 0.0 }));
    assert!(matches!(
        load_cases(1.0, -1.0, 1.0),
        Err(HoldingError::InvalidAcceleration { what: "lift", .. })
    ));
    assert!(matches!(
        load_cases(1.0, 1.0, f64::NAN),
        Err(HoldingError::InvalidAcceleration { what: "lateral", .. })
    ));
    assert!(HoldingSettings::default().with_max_iterations(0).is_err());
    assert!(HoldingSettings::default().with_tolerance(0.0).is_err());
    assert!(HoldingSettings::default().with_tolerance(1e-8).is_ok());
}

/// The nine load cases: lift `m (g + a)` down, lateral cases `m (-a cos, -a sin, -g)` at
/// 45° steps from +x (d'Alembert: the load is weight minus mass times the gripper's
/// acceleration).
#[test]
fn load_cases_are_lift_and_eight_lateral_directions() {
    let (m, al, at) = (0.25, 5.0, 3.0);
    let cases = load_cases(m, al, at).unwrap();
    assert_eq!(cases.len(), 9);
    assert_eq!(cases[0].name, "lift");
    assert_relative_eq!(cases[0].force.z, -m * (G + al), max_relative = 1e-15);
    let names: Vec<&str> = cases[1..].iter().map(|c| c.name.as_str()).collect();
    assert_eq!(
        names,
        [
            "lateral-000deg",
            "lateral-045deg",
            "lateral-090deg",
            "lateral-135deg",
            "lateral-180deg",
            "lateral-225deg",
            "lateral-270deg",
            "lateral-315deg"
        ]
    );
    for (k, c) in cases[1..].iter().enumerate() {
        let theta = k as f64 * FRAC_PI_4;
        assert_eq!(c.kind, LoadKind::Lateral { direction: theta });
        assert_relative_eq!(c.force.x, -m * at * theta.cos(), epsilon = 1e-15);
        assert_relative_eq!(c.force.y, -m * at * theta.sin(), epsilon = 1e-15);
        assert_relative_eq!(c.force.z, -m * G, max_relative = 1e-15);
        assert_eq!(c.torque, Vec3::ZERO);
    }
}

/// An irregular five-finger grasp of a 35 mm sphere (one frictionless contact underneath),
/// used for the comparisons with the linear program.
fn irregular_grasp(c: Vec3) -> Vec<GraspContact> {
    let r = 0.035;
    let spots = [
        // (azimuth deg, elevation deg, N, mu)
        (10.0, -10.0, 1.5, 0.6),
        (130.0, 5.0, 0.8, 0.4),
        (250.0, -25.0, 1.1, 0.8),
        (300.0, 20.0, 0.6, 0.5),
        (0.0, -80.0, 0.4, 0.0),
    ];
    spots
        .iter()
        .enumerate()
        .map(|(i, &(az, el, n, mu)): (usize, &(f64, f64, f64, f64))| {
            let (sa, ca) = f64::to_radians(az).sin_cos();
            let (se, ce) = f64::to_radians(el).sin_cos();
            let out = Vec3::new(ce * ca, ce * sa, se);
            contact(c + r * out, -out, n, mu, i)
        })
        .collect()
}

/// The holding program with each Coulomb cone replaced by a `k`-edge pyramid
/// `f = sum_j l_j (n + rho mu (cos phi_j t1 + sin phi_j t2))`, `l_j >= 0`, `sum_j l_j <= N`,
/// `phi_j = 2 pi j / k`, solved by the simplex method of microlp (a
/// general-purpose LP solver, independent of clarabel). `rho = 1` gives the inscribed
/// pyramid; `rho = 1 / cos(pi/k)` the circumscribed one.
fn pyramid_lp(contacts: &[GraspContact], com: Vec3, load: &LoadCase, k: usize, rho: f64) -> f64 {
    // Torque rows are divided by the largest lever arm: the same equations, but with
    // coefficients of the force rows' size, so that the LP's absolute feasibility
    // tolerance means the same on both (with arms of a few mm it otherwise admits a
    // spurious margin of ~1e-5).
    let arm = contacts.iter().map(|c| (c.point - com).length()).fold(0.0, f64::max);
    let length = if arm > 0.0 { arm } else { 1.0 };
    let mut p = Problem::new(OptimizationDirection::Maximize);
    let s = p.add_var(1.0, (0.0, f64::INFINITY));
    let mut rows: Vec<Vec<(Variable, f64)>> = vec![Vec::new(); 6];
    for d in 0..3 {
        rows[d].push((s, load.force[d]));
        rows[3 + d].push((s, load.torque[d] / length));
    }
    for c in contacts {
        let (n, t1, t2) = c.frame();
        let edges = if c.friction > 0.0 { k } else { 1 };
        let mut budget = Vec::new();
        for j in 0..edges {
            let phi = TAU * j as f64 / k as f64;
            let f = n + rho * c.friction * (phi.cos() * t1 + phi.sin() * t2);
            let moment = (c.point - com).cross(f) / length;
            let l = p.add_var(0.0, (0.0, f64::INFINITY));
            // Round-off residues (1e-17 where a component is zero) are dropped: the simplex
            // code refuses rows whose coefficients span more than about 1e6.
            let clean = |x: f64| if x.abs() < 1e-12 { 0.0 } else { x };
            for d in 0..3 {
                rows[d].push((l, clean(f[d])));
                rows[3 + d].push((l, clean(moment[d])));
            }
            budget.push((l, 1.0));
        }
        p.add_constraint(budget, ComparisonOp::Le, c.normal_force);
    }
    for row in rows {
        p.add_constraint(row, ComparisonOp::Eq, 0.0);
    }
    let outcome = p.solve().expect("the pyramid LP is feasible (s = 0) and bounded");
    outcome.solution().expect("the LP finished").objective()
}

fn with_friction_scaled(contacts: &[GraspContact], factor: f64) -> Vec<GraspContact> {
    contacts.iter().map(|c| GraspContact { friction: c.friction * factor, ..*c }).collect()
}

/// The cone program against an independent LP (microlp) on linearised cones. Pyramid
/// geometry: the inscribed `k`-gon of radius `mu f_n` contains the circle of radius
/// `mu cos(pi/k) f_n`, and the circumscribed one (`mu / cos(pi/k)`) lies inside the circle
/// of radius `mu f_n / cos(pi/k)`. Since the margin grows with friction, for every load
///
/// `s(mu cos(pi/k)) <= LP_inscribed(mu) <= s(mu) <= LP_circumscribed(mu) <= s(mu / cos(pi/k))`
///
/// where `s` is the cone program's margin. Checked for the scene's nine cases and a load
/// with a torque, at k = 8 and 32; the bracket narrows with k like `1 - cos(pi/k)`.
#[test]
fn cone_program_lies_between_inscribed_and_circumscribed_pyramid_lps() {
    let c = Vec3::new(0.002, -0.001, -0.08);
    let grasp = irregular_grasp(c);
    let mut cases = load_cases(0.12, 4.0, 3.0).unwrap();
    cases.push(LoadCase::new("twist", Vec3::new(0.1, 0.0, -0.5), Vec3::new(0.01, -0.005, 0.003)).unwrap());
    for k in [8usize, 32] {
        let cos = (PI / k as f64).cos();
        let weaker = with_friction_scaled(&grasp, cos);
        let stronger = with_friction_scaled(&grasp, 1.0 / cos);
        for case in &cases {
            let s = solved(&grasp, c, case).scale;
            let s_low = solved(&weaker, c, case).scale;
            let s_high = solved(&stronger, c, case).scale;
            let lp_in = pyramid_lp(&grasp, c, case, k, 1.0);
            let lp_out = pyramid_lp(&grasp, c, case, k, 1.0 / cos);
            let tol = 1e-7 * s.max(1e-3);
            assert!(s > 0.1, "{}: the grasp should hold, s = {s}", case.name);
            let chain = [s_low, lp_in, s, lp_out, s_high];
            assert!(chain.windows(2).all(|w| w[0] <= w[1] + tol), "k = {k}, {}: chain {chain:?}", case.name);
            // The pyramids' error is of the order of 1 - cos(pi/k) of the margin.
            assert!((lp_out - lp_in) / s <= 4.0 * (1.0 / cos - cos), "k = {k}, {}: {chain:?}", case.name);
        }
    }
}
