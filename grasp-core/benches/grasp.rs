//! Speed of the grasp checks on a closed grasp's contacts: one holding-margin cone program,
//! the nine load cases of a scene, and the epsilon quality at the default cone
//! linearisation. Run with `cargo bench -p grasp-core --bench grasp`.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use grasp_core::grasp::{
    DEFAULT_CONE_EDGES, GraspContact, HoldingSettings, epsilon_quality, holding_margins, holding_scale,
    load_cases,
};
use grasp_core::math::Vec3;

/// Contacts on a sphere of radius `r` around `c` at (azimuth, elevation) in degrees.
fn on_sphere(c: Vec3, r: f64, spots: &[(f64, f64, f64, f64)]) -> Vec<GraspContact> {
    spots
        .iter()
        .enumerate()
        .map(|(finger, &(az, el, normal_force, friction))| {
            let (sa, ca) = az.to_radians().sin_cos();
            let (se, ce) = el.to_radians().sin_cos();
            let out = Vec3::new(ce * ca, ce * sa, se);
            GraspContact { point: c + r * out, normal: -out, normal_force, friction, finger }
        })
        .collect()
}

fn benches(c: &mut Criterion) {
    let centre = Vec3::new(0.0, 0.0, -0.08);
    let three =
        on_sphere(centre, 0.03, &[(0.0, 0.0, 1.0, 0.5), (120.0, 0.0, 1.0, 0.5), (240.0, 0.0, 1.0, 0.5)]);
    let four = on_sphere(
        centre,
        0.035,
        &[(10.0, -10.0, 1.5, 0.6), (130.0, 5.0, 0.8, 0.4), (250.0, -25.0, 1.1, 0.8), (300.0, 20.0, 0.6, 0.5)],
    );
    let cases = load_cases(0.12, 5.0, 3.0).expect("valid load cases");
    let settings = HoldingSettings::default();

    let mut g = c.benchmark_group("holding");
    g.bench_function("lift_3_contacts", |b| {
        b.iter(|| holding_scale(black_box(&three), centre, &cases[0], &settings))
    });
    g.bench_function("lift_4_contacts", |b| {
        b.iter(|| holding_scale(black_box(&four), centre, &cases[0], &settings))
    });
    g.bench_function("nine_cases_4_contacts", |b| {
        b.iter(|| holding_margins(black_box(&four), centre, &cases, &settings))
    });
    g.finish();

    let mut g = c.benchmark_group("epsilon");
    g.bench_function("3_contacts_k8", |b| {
        b.iter(|| epsilon_quality(black_box(&three), centre, 0.03, DEFAULT_CONE_EDGES))
    });
    g.bench_function("4_contacts_k8", |b| {
        b.iter(|| epsilon_quality(black_box(&four), centre, 0.035, DEFAULT_CONE_EDGES))
    });
    g.bench_function("3_contacts_k16", |b| b.iter(|| epsilon_quality(black_box(&three), centre, 0.03, 16)));
    g.finish();
}

criterion_group!(grasp, benches);
criterion_main!(grasp);
