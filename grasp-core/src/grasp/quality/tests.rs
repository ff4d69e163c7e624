//! Validation of the epsilon quality: Ferrari & Canny's planar disk, the force-closure
//! conditions of Murray, Li & Sastry, a brute-force facet enumeration by definition, and
//! ray-shooting linear programs solved by microlp.

use std::f64::consts::PI;

use approx::assert_relative_eq;
use microlp::{ComparisonOp, OptimizationDirection, Problem};
use nalgebra::{Matrix6, Vector6};

use super::*;

fn contact(point: Vec3, normal: Vec3, friction: f64, finger: usize) -> GraspContact {
    GraspContact { point, normal, normal_force: 1.0, friction, finger }
}

/// Contacts on a sphere of radius `r` around `c` at (azimuth, elevation) in degrees,
/// normals toward the centre.
fn on_sphere(c: Vec3, r: f64, spots: &[(f64, f64)], mu: f64) -> Vec<GraspContact> {
    spots
        .iter()
        .enumerate()
        .map(|(i, &(az, el))| {
            let (sa, ca) = f64::to_radians(az).sin_cos();
            let (se, ce) = f64::to_radians(el).sin_cos();
            let out = Vec3::new(ce * ca, ce * sa, se);
            contact(c + r * out, -out, mu, i)
        })
        .collect()
}

fn planar_on_disk(c: Vec2, r: f64, angles: &[f64], mu: f64) -> Vec<PlanarContact> {
    angles
        .iter()
        .map(|&a| {
            let out = Vec2::from_angle(a);
            PlanarContact { point: c + r * out, normal: -out, friction: mu }
        })
        .collect()
}

/// Ferrari & Canny's example (C. Ferrari and J. Canny, "Planning optimal grasps", ICRA
/// 1992; values as given in the project's reference notes): a disk of radius `r` held by
/// two antipodal point contacts with friction 0.5, torque scaled by `r`: L1 quality 1/3,
/// L-infinity quality 1/sqrt(3).
///
/// By hand for L1: the primitive wrenches are `(-1, +-1/2, +-1/2)` and `(1, +-1/2, -+1/2)`,
/// a tetrahedron whose face through `(-1, 1/2, 1/2)`, `(-1, -1/2, -1/2)`, `(1, 1/2, -1/2)`
/// has normal `(1, -2, 2) / 3` and lies at distance `1/3`; by symmetry so do the others.
/// For L-infinity the plane `x + y + z = 1` supports the Minkowski sum at the four points
/// `(1, 1/2, -1/2)`, `(1, -1/2, 1/2)`, `(0, 1, 0)`, `(0, 0, 1)`: distance `1/sqrt(3)`.
///
/// A planar friction cone has exactly two edges, so there is no linearisation and the
/// values are reproduced to round-off for any disk size and position.
#[test]
fn ferrari_canny_disk_l1_one_third_linf_one_over_sqrt3() {
    for (c, r) in [(Vec2::ZERO, 1.0), (Vec2::new(0.12, -0.3), 0.04)] {
        let grasp = planar_on_disk(c, r, &[0.0, PI], 0.5);
        let l1 = planar_epsilon(&grasp, c, r, WrenchNorm::L1).unwrap();
        assert_eq!(l1.status, QualityStatus::ForceClosure);
        assert_relative_eq!(l1.epsilon, 1.0 / 3.0, max_relative = 1e-12);
        assert_eq!(l1.wrench_count, 4);
        let linf = planar_epsilon(&grasp, c, r, WrenchNorm::LInf).unwrap();
        assert_eq!(linf.status, QualityStatus::ForceClosure);
        assert_relative_eq!(linf.epsilon, 1.0 / 3f64.sqrt(), max_relative = 1e-12);
        // The L1 set is inside the L-infinity set (a unit sum budget is tighter).
        assert!(l1.epsilon < linf.epsilon);
    }
}

/// R. M. Murray, Z. Li and S. S. Sastry, "A Mathematical Introduction to Robotic
/// Manipulation", CRC Press, 1994, ch. 5 (force-closure conditions; from memory): a
/// planar grasp with two point contacts with friction is force closure if and only if the
/// segment joining the contacts lies strictly inside both friction cones. On a disk with
/// contacts at angles 0 and `pi - delta` (radial normals) the segment makes the angle
/// `delta / 2` with each normal, so force closure holds iff `tan(delta / 2) < mu`.
#[test]
fn planar_two_finger_force_closure_iff_segment_inside_both_cones() {
    let mu: f64 = 0.5;
    let limit = mu.atan();
    let mut last = f64::INFINITY;
    for half in [0.0, 0.5 * limit, 0.9 * limit, 0.99 * limit] {
        let q = planar_epsilon(
            &planar_on_disk(Vec2::ZERO, 0.03, &[0.0, PI - 2.0 * half], mu),
            Vec2::ZERO,
            0.03,
            WrenchNorm::L1,
        )
        .unwrap();
        assert_eq!(q.status, QualityStatus::ForceClosure, "half angle {half}");
        assert!(
            q.epsilon > 0.0 && q.epsilon < last,
            "quality should fall as the segment nears the cone edge"
        );
        last = q.epsilon;
    }
    for half in [1.01 * limit, 1.2 * limit, 0.4 * PI] {
        let q = planar_epsilon(
            &planar_on_disk(Vec2::ZERO, 0.03, &[0.0, PI - 2.0 * half], mu),
            Vec2::ZERO,
            0.03,
            WrenchNorm::L1,
        )
        .unwrap();
        assert_eq!(q.status, QualityStatus::NoForceClosure, "half angle {half}");
        assert_eq!(q.epsilon, 0.0);
    }
}

/// Without friction, contacts on a disk push through its centre and cannot resist a
/// torque: no force closure with any number of them (Murray, Li & Sastry 1994, ch. 5:
/// frictionless contacts resist only along their normals; from memory).
#[test]
fn frictionless_disk_contacts_are_not_force_closure() {
    let grasp = planar_on_disk(Vec2::ZERO, 0.02, &[0.0, 2.0, 4.0, 5.0], 0.0);
    let q = planar_epsilon(&grasp, Vec2::ZERO, 0.02, WrenchNorm::L1).unwrap();
    assert_eq!((q.status, q.epsilon), (QualityStatus::NoForceClosure, 0.0));
}

/// In space, two point contacts with friction are never force closure: neither can
/// apply a torque about the line joining them (Murray, Li & Sastry 1994, ch. 5, where the
/// spatial two-finger result needs soft-finger contacts; from memory). The primitive
/// wrenches span only 5 of the 6 dimensions.
#[test]
fn spatial_two_point_contacts_are_not_force_closure() {
    let c = Vec3::new(0.0, 0.0, -0.06);
    let grasp = on_sphere(c, 0.03, &[(0.0, 0.0), (180.0, 0.0)], 1.0);
    let q = epsilon_quality(&grasp, c, 0.03, DEFAULT_CONE_EDGES).unwrap();
    assert_eq!((q.status, q.epsilon), (QualityStatus::NoForceClosure, 0.0));
}

fn three_fingers() -> (Vec<GraspContact>, Vec3, f64) {
    let c = Vec3::new(0.001, -0.002, -0.07);
    (on_sphere(c, 0.03, &[(0.0, 0.0), (120.0, 0.0), (240.0, 0.0)], 0.5), c, 0.03)
}

/// How the linearisation approaches the exact cone (pyramid geometry, derived in the
/// module docs): inscribed pyramids give lower bounds that grow as k doubles (the
/// pyramids nest), circumscribed ones upper bounds that shrink. The relative gap stays
/// below the relative width of the cone bracket itself, `1/cos(pi/k) - cos(pi/k)`
/// (`~ pi^2 / k^2`), and each doubling of k at least halves it (measured: 0.20, 0.068,
/// 0.022, 0.0043 for k = 4, 8, 16, 32, about `k^-1.6`).
#[test]
fn linearised_cones_bracket_the_exact_quality_and_converge() {
    let (grasp, c, r) = three_fingers();
    let ks = [4usize, 8, 16, 32];
    let mut lower = Vec::new();
    let mut upper = Vec::new();
    for &k in &ks {
        let lo = epsilon_quality(&grasp, c, r, k).unwrap();
        let hi = epsilon_with_edges(&grasp, c, r, k, Pyramid::Circumscribed).unwrap();
        assert_eq!(lo.status, QualityStatus::ForceClosure, "k = {k}");
        assert_eq!(hi.status, QualityStatus::ForceClosure, "k = {k}");
        lower.push(lo.epsilon);
        upper.push(hi.epsilon);
    }
    let tol = 1e-12;
    for i in 1..ks.len() {
        assert!(lower[i] >= lower[i - 1] - tol, "lower bounds {lower:?}");
        assert!(upper[i] <= upper[i - 1] + tol, "upper bounds {upper:?}");
    }
    let best_lower = lower[ks.len() - 1];
    assert!(upper.iter().all(|&u| u >= best_lower - tol), "{lower:?} {upper:?}");
    let gaps: Vec<f64> = lower.iter().zip(&upper).map(|(l, u)| (u - l) / u).collect();
    for (i, &k) in ks.iter().enumerate() {
        let c = (PI / k as f64).cos();
        assert!(gaps[i] <= 1.0 / c - c, "k = {k}: relative gap {}", gaps[i]);
    }
    for w in gaps.windows(2) {
        assert!(w[1] < 0.5 * w[0], "gap did not halve: {gaps:?}");
    }
}

/// A planar grasp seen in space: its quality in 6-D cannot exceed the planar one (derived
/// here: the 6-D ball meets the (fx, fy, tau_z) subspace in a 3-D ball of the same
/// radius, which lies in the projection of the 6-D hull, and that projection lies in the
/// planar hull because each edge projects into the planar sector).
#[test]
fn spatial_quality_of_a_planar_grasp_is_at_most_the_planar_one() {
    let (grasp, c, r) = three_fingers();
    let planar: Vec<PlanarContact> = grasp
        .iter()
        .map(|g| PlanarContact {
            point: g.point.truncate(),
            normal: g.normal.truncate(),
            friction: g.friction,
        })
        .collect();
    let q2 = planar_epsilon(&planar, c.truncate(), r, WrenchNorm::L1).unwrap();
    for k in [4, 8, 16] {
        let q6 = epsilon_quality(&grasp, c, r, k).unwrap();
        assert!(
            q6.epsilon > 0.0 && q6.epsilon <= q2.epsilon + 1e-12,
            "k = {k}: {} vs {}",
            q6.epsilon,
            q2.epsilon
        );
    }
}

/// The L1 quality by definition, independently of the hull construction: every set of 6
/// primitive wrenches spans a hyperplane `a . w = 1` (when it misses the origin); it
/// supports the hull when no wrench has `a . w > 1`; the quality is the smallest
/// `1 / |a|` among supporting ones (nalgebra's LU for each 6x6 system).
fn brute_force_epsilon(points: &[[f64; 6]]) -> f64 {
    let n = points.len();
    let mut best = f64::INFINITY;
    let mut idx = [0usize, 1, 2, 3, 4, 5];
    loop {
        let m = Matrix6::from_fn(|i, j| points[idx[i]][j]);
        if let Some(a) = m.lu().solve(&Vector6::repeat(1.0)) {
            let residual = (m * a - Vector6::repeat(1.0)).amax();
            if residual < 1e-9 && a.iter().all(|x| x.is_finite()) {
                let supporting = points.iter().all(|p| Vector6::from_row_slice(p).dot(&a) <= 1.0 + 1e-9);
                if supporting {
                    best = best.min(1.0 / a.norm());
                }
            }
        }
        // Next 6-combination in lexicographic order.
        let mut i = 5;
        loop {
            if idx[i] < n - 6 + i {
                idx[i] += 1;
                for j in i + 1..6 {
                    idx[j] = idx[j - 1] + 1;
                }
                break;
            }
            if i == 0 {
                return best;
            }
            i -= 1;
        }
    }
}

/// The largest `t` with `t u` in the convex hull of the wrenches, by the simplex method of
/// microlp (a general-purpose LP solver): `max t` s.t. `sum_j l_j w_j = t u`,
/// `sum_j l_j = 1`, `l >= 0`.
fn ray_to_boundary(points: &[[f64; 6]], u: &[f64; 6]) -> f64 {
    let mut p = Problem::new(OptimizationDirection::Maximize);
    let t = p.add_var(1.0, (0.0, f64::INFINITY));
    let l: Vec<_> = points.iter().map(|_| p.add_var(0.0, (0.0, f64::INFINITY))).collect();
    // Round-off residues (1e-17 where a component is zero) are dropped: the simplex code
    // refuses rows whose coefficients span more than about 1e6.
    let clean = |x: f64| if x.abs() < 1e-12 { 0.0 } else { x };
    for d in 0..6 {
        let mut row: Vec<_> = l.iter().zip(points).map(|(&v, w)| (v, clean(w[d]))).collect();
        row.push((t, -clean(u[d])));
        p.add_constraint(row, ComparisonOp::Eq, 0.0);
    }
    p.add_constraint(l.iter().map(|&v| (v, 1.0)).collect::<Vec<_>>(), ComparisonOp::Eq, 1.0);
    p.solve().expect("feasible at t = 0 when the origin is inside").solution().expect("finished").objective()
}

/// The 6-D hull quality against the brute-force definition and against microlp: the ray
/// toward the weakest direction leaves the hull exactly at `epsilon`, and rays in other
/// directions go at least that far.
#[test]
fn spatial_quality_matches_definition_and_lp_ray_shooting() {
    let c = Vec3::new(0.002, -0.001, -0.08);
    let grasps = [
        (on_sphere(c, 0.03, &[(0.0, 0.0), (120.0, 0.0), (240.0, 0.0)], 0.5), 6usize),
        (on_sphere(c, 0.035, &[(10.0, -10.0), (130.0, 5.0), (250.0, -25.0), (300.0, 20.0)], 0.6), 5),
    ];
    let mut state = 0x2545_f491_4f6c_dd1d_u64;
    let mut uniform = move || {
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        (state >> 11) as f64 / (1u64 << 53) as f64 * 2.0 - 1.0
    };
    for (grasp, k) in &grasps {
        let q = epsilon_quality(grasp, c, 0.03, *k).unwrap();
        assert_eq!(q.status, QualityStatus::ForceClosure);
        let points = primitive_wrenches(grasp, c, 0.03, *k, Pyramid::Inscribed);
        assert_relative_eq!(q.epsilon, brute_force_epsilon(&points), max_relative = 1e-9);
        let u = q.weakest_direction.expect("force closure has a weakest direction");
        assert_relative_eq!(ray_to_boundary(&points, &u), q.epsilon, max_relative = 1e-7);
        for _ in 0..40 {
            let v: [f64; 6] = std::array::from_fn(|_| uniform());
            let len = v.iter().map(|x| x * x).sum::<f64>().sqrt();
            let v = v.map(|x| x / len);
            assert!(ray_to_boundary(&points, &v) >= q.epsilon * (1.0 - 1e-7));
        }
    }
}

/// Scaling the whole grasp and the torque length by the same factor leaves the quality
/// unchanged (torque over length is dimensionless: the reason Ferrari and Canny scale
/// torques by a length).
#[test]
fn quality_is_invariant_under_scaling_with_the_torque_length() {
    let (grasp, c, r) = three_fingers();
    let q = epsilon_quality(&grasp, c, r, 8).unwrap();
    let big: Vec<GraspContact> = grasp.iter().map(|g| GraspContact { point: 3.0 * g.point, ..*g }).collect();
    let q3 = epsilon_quality(&big, 3.0 * c, 3.0 * r, 8).unwrap();
    assert_relative_eq!(q.epsilon, q3.epsilon, max_relative = 1e-12);
}

#[test]
fn same_input_gives_bit_identical_quality() {
    let (grasp, c, r) = three_fingers();
    let a = epsilon_quality(&grasp, c, r, 16).unwrap();
    let b = epsilon_quality(&grasp, c, r, 16).unwrap();
    assert_eq!(a.epsilon.to_bits(), b.epsilon.to_bits());
    assert_eq!(a.facet_count, b.facet_count);
    assert_eq!(
        a.weakest_direction.map(|d| d.map(f64::to_bits)),
        b.weakest_direction.map(|d| d.map(f64::to_bits))
    );
}

#[test]
fn edge_cases_and_invalid_inputs() {
    let (grasp, c, r) = three_fingers();
    let none = epsilon_quality(&[], c, r, 8).unwrap();
    assert_eq!((none.status, none.epsilon), (QualityStatus::NoContacts, 0.0));
    let one = epsilon_quality(&grasp[..1], c, r, 8).unwrap();
    assert_eq!((one.status, one.epsilon), (QualityStatus::NoForceClosure, 0.0));
    let planar_none = planar_epsilon(&[], Vec2::ZERO, 1.0, WrenchNorm::LInf).unwrap();
    assert_eq!(planar_none.status, QualityStatus::NoContacts);
    assert_eq!(epsilon_quality(&grasp, c, 0.0, 8), Err(QualityError::InvalidTorqueLength { value: 0.0 }));
    assert_eq!(epsilon_quality(&grasp, c, r, 2), Err(QualityError::InvalidConeEdges { value: 2 }));
    assert_eq!(epsilon_quality(&grasp, Vec3::NAN, r, 8), Err(QualityError::InvalidCentre));
    assert_eq!(
        epsilon_quality(&grasp, c, r, 200),
        Err(QualityError::TooManyWrenches { count: 600, max: MAX_PRIMITIVE_WRENCHES })
    );
    let mut bad = grasp.clone();
    bad[2].normal = Vec3::new(0.0, 0.0, 0.5);
    assert!(matches!(
        epsilon_quality(&bad, c, r, 8),
        Err(QualityError::Contact(ContactError::NotUnitNormal { index: 2, .. }))
    ));
    let many = planar_on_disk(Vec2::ZERO, 1.0, &[0.0; 11], 0.3);
    assert_eq!(
        planar_epsilon(&many, Vec2::ZERO, 1.0, WrenchNorm::LInf),
        Err(QualityError::TooManyContacts { count: 11, max: MAX_LINF_CONTACTS })
    );
}

/// Random grasps (2–5 contacts, 3–10 cone edges, every third one snapped to 30° steps so
/// that coplanar and symmetric wrench sets are common, some frictionless): the hull never
/// fails its own check, and every force-closure quality equals the brute-force
/// definition (for up to 16 wrenches) and microlp's ray to the boundary along the weakest
/// direction (80 trials: 40 force closures, 9 of them small enough for the brute force;
/// in 300 trials while developing the largest relative difference was 1.8e-7, the LP's
/// tolerance).
#[test]
fn random_grasps_agree_with_definition_and_lp() {
    let mut state = 0x9e37_79b9_7f4a_7c15_u64;
    let mut uniform = move || {
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        (state >> 11) as f64 / (1u64 << 53) as f64
    };
    let c = Vec3::new(0.01, -0.02, -0.07);
    let (mut closures, mut by_definition) = (0, 0);
    for trial in 0..80 {
        let n = 2 + (uniform() * 4.0) as usize;
        let k = 3 + (uniform() * 8.0) as usize;
        let snap = trial % 3 == 0;
        let spots: Vec<(f64, f64)> = (0..n)
            .map(|_| {
                let (az, el) = (uniform() * 360.0, uniform() * 120.0 - 60.0);
                if snap { ((az / 30.0).round() * 30.0, (el / 30.0).round() * 30.0) } else { (az, el) }
            })
            .collect();
        let mu = if trial % 7 == 0 { 0.0 } else { 0.2 + uniform() };
        let grasp = on_sphere(c, 0.03, &spots, mu);
        let q = epsilon_quality(&grasp, c, 0.03, k).unwrap();
        assert_ne!(q.status, QualityStatus::HullFailed, "trial {trial}: {spots:?}, k = {k}");
        if q.status != QualityStatus::ForceClosure {
            continue;
        }
        closures += 1;
        let points = primitive_wrenches(&grasp, c, 0.03, k, Pyramid::Inscribed);
        let u = q.weakest_direction.expect("force closure has a weakest direction");
        assert_relative_eq!(ray_to_boundary(&points, &u), q.epsilon, max_relative = 1e-6);
        if points.len() <= 16 {
            assert_relative_eq!(brute_force_epsilon(&points), q.epsilon, max_relative = 1e-9);
            by_definition += 1;
        }
    }
    assert!(
        closures > 20 && by_definition > 5,
        "{closures} force closures, {by_definition} by definition: too few"
    );
}
