//! Speed of the single-finger solvers (targets in the README):
//! one free-curvature solve under 20 µs, one rod solve with a tip constraint under 2 ms.
//! Run with `cargo bench -p grasp-core --bench solvers`.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use grasp_core::actuator::{Actuator, Fiber, free_curvature};
use grasp_core::material::{HyperelasticModel, Material, NeoHookean, Ogden, OgdenTerm, Yeoh};
use grasp_core::rod::{Rod, blocked_tip_force};
use grasp_core::section::{BoxSection, HalfRoundSection, SectionModel, SectionProfile};

fn actuator(model: HyperelasticModel, section: SectionProfile) -> Actuator {
    Actuator::new(
        "bench",
        "bench",
        Material { model, density: 1070.0, stretch_at_break: 10.0 },
        section,
        0.1,
        0.006,
        0.005,
        Fiber { pitch: 3.5e-3, width: 1e-3 },
        60e3,
        SectionModel::WallPressure,
    )
    .expect("valid bench actuator")
}

fn demo_box() -> SectionProfile {
    SectionProfile::Box(BoxSection::new(14e-3, 10e-3, 3e-3, 3e-3, 2.5e-3, 1e-3).expect("valid"))
}

fn benches(c: &mut Criterion) {
    let materials = [
        ("neo-hookean", HyperelasticModel::NeoHookean(NeoHookean::new(39.4e3).expect("valid"))),
        ("yeoh", HyperelasticModel::Yeoh(Yeoh::new(110e3, 20e3, 0.0).expect("valid"))),
        (
            "ogden3",
            HyperelasticModel::Ogden(
                Ogden::new(vec![
                    OgdenTerm { mu: 0.63e6, alpha: 1.3 },
                    OgdenTerm { mu: 0.0012e6, alpha: 5.0 },
                    OgdenTerm { mu: -0.01e6, alpha: -2.0 },
                ])
                .expect("valid"),
            ),
        ),
    ];
    let mut g = c.benchmark_group("free_curvature");
    for (name, m) in &materials {
        let a = actuator(m.clone(), demo_box());
        let p = if *name == "neo-hookean" { 40e3 } else { 200e3 };
        let law = a.law(p, SectionModel::WallPressure);
        g.bench_function(format!("box_{name}"), |b| b.iter(|| free_curvature(black_box(&law))));
    }
    let half = actuator(
        materials[0].1.clone(),
        SectionProfile::HalfRound(HalfRoundSection::new(7e-3, 2.5e-3, 2e-3, 1e-3).expect("valid")),
    );
    let law = half.law(40e3, SectionModel::WallPressure);
    g.bench_function("half_round_neo-hookean", |b| b.iter(|| free_curvature(black_box(&law))));
    g.finish();

    let mut g = c.benchmark_group("blocked_rod_solve");
    let a = actuator(materials[0].1.clone(), demo_box());
    for n in [40, 48, 80] {
        let rod = Rod::of_actuator(&a, n).expect("valid rod");
        let law = a.law(30e3, SectionModel::WallPressure);
        g.bench_function(format!("cold_{n}_elements"), |b| {
            b.iter(|| blocked_tip_force(&rod, black_box(&law), None))
        });
        let warm = blocked_tip_force(&rod, &a.law(28e3, SectionModel::WallPressure), None).expect("solves");
        g.bench_function(format!("warm_{n}_elements"), |b| {
            b.iter(|| blocked_tip_force(&rod, black_box(&law), Some(&warm.solution.angles)))
        });
    }
    g.finish();
}

criterion_group!(solvers, benches);
criterion_main!(solvers);
