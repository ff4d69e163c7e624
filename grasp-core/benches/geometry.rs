//! Speed of the grasp geometry: building a finger body and one enclosure evaluation of a
//! 25 mm ball among three bent fingers (42 pieces each) and the palm, 256 directions.
//! Run with `cargo bench -p grasp-core --bench geometry`.

use std::hint::black_box;

use criterion::{Criterion, criterion_group, criterion_main};
use grasp_core::geometry::{FingerBody, FingerFrame, free_angles, palm_body};
use grasp_core::grasp::enclosure::enclosure;
use grasp_core::math::Pose;
use grasp_core::rod::Rod;
use grasp_core::scene::Palm;
use grasp_core::section::{BoxSection, SectionProfile};
use parry3d_f64::shape::{Ball, SharedShape};

fn benches(c: &mut Criterion) {
    // DESIGN 4.2's example finger: Box section, 5 + 90 + 5 mm, on a 30 mm ring
    let section = SectionProfile::Box(BoxSection::new(12e-3, 10e-3, 3e-3, 3e-3, 3e-3, 1e-3).expect("valid"));
    let rod = Rod::new(0.005, 0.09, 0.005, 40).expect("valid");
    // bent until the inner faces come within a fraction of a millimetre of the ball
    let angles = free_angles(&rod, 2.4);
    let frames: Vec<FingerFrame> = (0..3)
        .map(|k| FingerFrame::new(k as f64 * std::f64::consts::TAU / 3.0, 0.03, 0.0).expect("valid"))
        .collect();
    let mut obstacles: Vec<(Pose, SharedShape)> =
        vec![palm_body(&Palm::Disk { radius: 0.035, thickness: 0.01 }).expect("valid")];
    for f in &frames {
        obstacles.extend(FingerBody::new(&rod, &angles, &section, *f).expect("valid").obstacles());
    }
    let ball = Ball::new(0.025);
    let pose = Pose::translation(0.0, 0.0, -0.06);

    let mut g = c.benchmark_group("geometry");
    g.bench_function("finger_body_box_40", |b| {
        b.iter(|| FingerBody::new(black_box(&rod), black_box(&angles), &section, frames[0]))
    });
    g.bench_function("enclosure_3x42_pieces_256_dirs", |b| {
        b.iter(|| enclosure(&ball, black_box(&pose), 0.025, black_box(&obstacles), 256))
    });
    g.finish();
}

criterion_group!(geometry, benches);
criterion_main!(geometry);
