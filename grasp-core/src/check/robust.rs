//! Robustness of a grasp check: how likely each object still passes when material and
//! dimensions vary as they do in a hand-cast shop.
//!
//! A Monte Carlo study (N. Metropolis and S. Ulam, "The Monte Carlo method", J. Amer.
//! Stat. Assoc. 44, 335–341, 1949): each sample perturbs a copy of the scene and runs
//! [`check_scene`] on it at the supply pressure (no sweep). Every finger is cast on its
//! own, so each finger gets its own draw of the modulus and wall thicknesses (its own
//! copy of its actuator); each object gets its own draw of friction and size. The
//! spreads ([`Spreads`]) are normal, truncated at three standard deviations:
//!
//! | quantity | spread (default) | applied as |
//! | --- | --- | --- |
//! | modulus | 10 % | every stress parameter of the material times `1 + d` |
//! | wall thicknesses | 0.25 mm | added to each wall, floor and under-layer, kept above a fifth of the nominal |
//! | friction | 15 % | times `1 + d` |
//! | object size | 5 % | every dimension times `1 + d`, the mass times `(1 + d)^3` (same density) |
//!
//! The defaults are our estimate of a small shop's scatter (common practice, no
//! published source): batch-to-batch and mixing variation of casting silicones, a
//! quarter millimetre on hand-poured walls, the scatter of friction on produce, and the
//! grading of fruit and eggs. State your own with [`Spreads`].
//!
//! Random numbers: sample `k` draws from its own PCG stream
//! (`oorandom::Rand64::new_inc(seed, k)`; M. E. O'Neill, "PCG: a family of simple fast
//! space-efficient statistically good algorithms for random number generation", 2014),
//! normal deviates by the Box–Muller transform. The result depends only on the seed and
//! the sample count, never on the thread count; samples run in parallel (rayon).

use rayon::prelude::*;

use super::{CheckError, CheckReport, CheckSettings, Failure, Verdict, check_scene};
use crate::calibrate::scale_model;
use crate::scene::{ObjectShape, Scene};
use crate::section::{BoxSection, HalfRoundSection, SectionProfile};

/// Standard deviations of the perturbations.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Spreads {
    /// Relative spread of the material's modulus.
    pub modulus: f64,
    /// Absolute spread of each wall thickness (m).
    pub wall: f64,
    /// Relative spread of the friction coefficient.
    pub friction: f64,
    /// Relative spread of the object's size.
    pub size: f64,
}

impl Default for Spreads {
    fn default() -> Self {
        Self { modulus: 0.10, wall: 0.25e-3, friction: 0.15, size: 0.05 }
    }
}

/// Knobs of the study.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RobustSettings {
    /// Number of samples (>= 1).
    pub samples: usize,
    /// Seed of the random streams.
    pub seed: u64,
    /// The spreads.
    pub spreads: Spreads,
    /// Settings of each check (its pressure override applies; the sweep is dropped).
    pub check: CheckSettings,
}

/// Most samples accepted.
pub const MAX_SAMPLES: usize = 100_000;

/// One object's robustness.
#[derive(Debug, Clone, PartialEq)]
pub struct ObjectRobustness {
    /// Object name.
    pub name: String,
    /// Samples in which it passed.
    pub passes: usize,
    /// Samples checked.
    pub samples: usize,
    /// How often each criterion failed, by kind (see [`Failure::kind`]), most frequent
    /// first (ties by name). A sample can fail several criteria.
    pub failures: Vec<(&'static str, usize)>,
}

impl ObjectRobustness {
    /// Share of samples in which it passed.
    pub fn pass_probability(&self) -> f64 {
        self.passes as f64 / self.samples.max(1) as f64
    }
    /// The criterion that fails most often, if any failed.
    pub fn most_failing(&self) -> Option<&'static str> {
        self.failures.first().map(|(k, _)| *k)
    }
}

/// The study.
#[derive(Debug, Clone, PartialEq)]
pub struct RobustReport {
    /// Samples run.
    pub samples: usize,
    /// Seed used.
    pub seed: u64,
    /// Spreads used.
    pub spreads: Spreads,
    /// Supply pressure the samples were checked at (Pa).
    pub pressure: f64,
    /// Per object, in scene order.
    pub objects: Vec<ObjectRobustness>,
    /// Samples whose scene the model could not evaluate at all (counted as failures of
    /// kind `"model-range"` for every object).
    pub unevaluated: usize,
}

/// A normal deviate truncated at three standard deviations.
fn normal(rng: &mut oorandom::Rand64) -> f64 {
    loop {
        let u1 = 1.0 - rng.rand_float(); // (0, 1]
        let u2 = rng.rand_float();
        let z = (-2.0 * u1.ln()).sqrt() * (std::f64::consts::TAU * u2).cos();
        if z.abs() <= 3.0 {
            return z;
        }
    }
}

/// A thickness perturbed by `wall * z`, kept above a fifth of its nominal value.
fn thickness(t: f64, d: f64) -> f64 {
    if t == 0.0 { 0.0 } else { (t + d).max(0.2 * t) }
}

/// Sample `index` of the study: a perturbed copy of `scene`.
///
/// # Errors
/// A perturbed actuator or section that cannot be built (it never should: thicknesses
/// stay positive and scales inside `1 ± 3` spreads).
pub fn perturbed_scene(scene: &Scene, spreads: &Spreads, seed: u64, index: usize) -> Result<Scene, String> {
    let mut rng = oorandom::Rand64::new_inc(u128::from(seed), index as u128);
    let mut out = scene.clone();
    out.criteria.sweep = None;
    let mut actuators = Vec::with_capacity(scene.gripper.fingers.len());
    for (i, finger) in scene.gripper.fingers.iter().enumerate() {
        let base = scene.actuators.get(finger.actuator).ok_or_else(|| format!("finger {i}: no actuator"))?;
        let mut a = base.clone();
        let scale = 1.0 + spreads.modulus * normal(&mut rng);
        a.material.model = scale_model(&a.material.model, scale).map_err(|e| e.to_string())?;
        let mut d = || spreads.wall * normal(&mut rng);
        let section = match &a.section {
            SectionProfile::Box(s) => BoxSection::new(
                s.chamber_width,
                s.chamber_height,
                thickness(s.side_wall, d()),
                thickness(s.top_wall, d()),
                thickness(s.floor, d()),
                thickness(s.under_layer, d()),
            )
            .map(SectionProfile::Box),
            SectionProfile::HalfRound(s) => HalfRoundSection::new(
                s.radius,
                thickness(s.wall, d()),
                thickness(s.floor, d()),
                thickness(s.under_layer, d()),
            )
            .map(SectionProfile::HalfRound),
        }
        .map_err(|e| e.to_string())?;
        let a = crate::actuator::Actuator::new(
            a.name.clone(),
            a.material_name.clone(),
            a.material.clone(),
            section,
            a.chamber_length,
            a.base_length,
            a.tip_length,
            a.fiber,
            a.max_pressure,
            a.section_model,
        )
        .map_err(|e| e.to_string())?;
        actuators.push(a);
    }
    for (i, f) in out.gripper.fingers.iter_mut().enumerate() {
        f.actuator = i;
    }
    out.actuators = actuators;
    for o in &mut out.objects {
        o.friction = (o.friction * (1.0 + spreads.friction * normal(&mut rng))).max(0.0);
        let s = 1.0 + spreads.size * normal(&mut rng);
        o.mass *= s * s * s;
        match &mut o.shape {
            ObjectShape::Sphere { radius } => *radius *= s,
            ObjectShape::Box { size } => *size *= s,
            ObjectShape::Cylinder { radius, height } => {
                *radius *= s;
                *height *= s;
            }
            ObjectShape::Capsule { radius, length } => {
                *radius *= s;
                *length *= s;
            }
            ObjectShape::Ellipsoid { semi_axes } => *semi_axes *= s,
            ObjectShape::Mesh { mesh, .. } => {
                for v in &mut mesh.vertices {
                    *v *= s;
                }
            }
        }
    }
    Ok(out)
}

/// Runs the study.
///
/// # Errors
/// [`CheckError::BadSetting`] for a sample count out of range or negative spreads;
/// otherwise the errors of [`check_scene`] on the unperturbed settings.
pub fn robust_check(scene: &Scene, settings: &RobustSettings) -> Result<RobustReport, CheckError> {
    if !(1..=MAX_SAMPLES).contains(&settings.samples) {
        return Err(CheckError::BadSetting(format!(
            "robustness samples must be between 1 and {MAX_SAMPLES}, got {}",
            settings.samples
        )));
    }
    let sp = settings.spreads;
    for (name, v) in
        [("modulus", sp.modulus), ("wall", sp.wall), ("friction", sp.friction), ("size", sp.size)]
    {
        // at 3 spreads a relative perturbation must keep the value positive
        let cap = if name == "wall" { 0.01 } else { 0.3 };
        if !(v >= 0.0 && v <= cap) {
            return Err(CheckError::BadSetting(format!("spread of {name} must be in [0, {cap}], got {v}")));
        }
    }
    let check = CheckSettings { ..settings.check };
    let results: Vec<Result<CheckReport, String>> = (0..settings.samples)
        .into_par_iter()
        .map(|k| {
            let s = perturbed_scene(scene, &sp, settings.seed, k)?;
            check_scene(&s, &check).map_err(|e| e.to_string())
        })
        .collect();
    let mut objects: Vec<ObjectRobustness> = scene
        .objects
        .iter()
        .map(|o| ObjectRobustness {
            name: o.name.clone(),
            passes: 0,
            samples: settings.samples,
            failures: Vec::new(),
        })
        .collect();
    let mut unevaluated = 0;
    let mut counts: Vec<std::collections::BTreeMap<&'static str, usize>> =
        vec![Default::default(); objects.len()];
    for r in &results {
        match r {
            Ok(report) => {
                for (i, o) in report.objects.iter().enumerate().take(objects.len()) {
                    if o.verdict == Verdict::Pass {
                        objects[i].passes += 1;
                    }
                    let mut kinds: Vec<&'static str> = o.failures.iter().map(Failure::kind).collect();
                    kinds.sort_unstable();
                    kinds.dedup();
                    for k in kinds {
                        *counts[i].entry(k).or_default() += 1;
                    }
                }
            }
            Err(_) => {
                unevaluated += 1;
                for c in &mut counts {
                    *c.entry("model-range").or_default() += 1;
                }
            }
        }
    }
    for (o, c) in objects.iter_mut().zip(counts) {
        let mut f: Vec<(&'static str, usize)> = c.into_iter().collect();
        f.sort_by(|a, b| b.1.cmp(&a.1).then(a.0.cmp(b.0)));
        o.failures = f;
    }
    Ok(RobustReport {
        samples: settings.samples,
        seed: settings.seed,
        spreads: sp,
        pressure: settings.check.pressure_override.unwrap_or(scene.criteria.pressure),
        objects,
        unevaluated,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::actuator::Actuator;
    use crate::material::StrainEnergy;
    use crate::math::Vec3;
    use crate::scene::{Criteria, FingerMount, Gripper, Palm, TargetObject};

    /// A small pinch: two opposed example fingers and one 25 mm ball.
    fn scene() -> Scene {
        let finger = |az: f64| FingerMount { actuator: 0, azimuth: az, radius: 0.03, tilt: 0.0 };
        Scene {
            name: "robust-test".into(),
            materials: Vec::new(),
            actuators: vec![Actuator::example()],
            gripper: Gripper {
                palm: Palm::Disk { radius: 0.04, thickness: 0.01 },
                fingers: vec![finger(0.0), finger(std::f64::consts::PI)],
            },
            objects: vec![TargetObject {
                name: "ball".into(),
                shape: ObjectShape::Sphere { radius: 0.0125 },
                mass: 0.01,
                friction: 0.8,
                position: Vec3::new(0.0, 0.0, -0.07),
                max_contact_force: None,
            }],
            criteria: Criteria {
                pressure: 20e3,
                sweep: None,
                safety_factor: 1.5,
                lift_accel: 2.0,
                lateral_accel: 1.0,
                min_fingers_in_contact: 2,
                min_enclosure: 0.2,
            },
        }
    }

    /// Perturbations follow the spreads: over many draws the modulus scale has mean 1
    /// and standard deviation close to the spread (truncation at 3 sigma shrinks it by
    /// 1.3 %), every finger gets its own actuator, the sweep is dropped, and the same
    /// seed gives the same scene.
    #[test]
    fn perturbations_follow_the_spreads_and_repeat_for_a_seed() {
        let s = scene();
        let sp = Spreads::default();
        let mu0 = s.actuators[0].material.model.shear_modulus();
        let n = 4000;
        let scales: Vec<f64> = (0..n)
            .map(|k| {
                perturbed_scene(&s, &sp, 11, k).unwrap().actuators[1].material.model.shear_modulus() / mu0
            })
            .collect();
        let mean = scales.iter().sum::<f64>() / n as f64;
        let sd = (scales.iter().map(|x| (x - mean).powi(2)).sum::<f64>() / (n - 1) as f64).sqrt();
        // standard error of the mean 0.1/sqrt(4000) = 0.0016; of the sd about 0.0011
        assert!((mean - 1.0).abs() < 0.006, "{mean}");
        assert!((sd - 0.0987).abs() < 0.005, "{sd}");
        assert!(scales.iter().all(|x| (x - 1.0).abs() <= 0.3 + 1e-12));
        let a = perturbed_scene(&s, &sp, 11, 5).unwrap();
        assert_eq!(a, perturbed_scene(&s, &sp, 11, 5).unwrap());
        assert_ne!(a, perturbed_scene(&s, &sp, 12, 5).unwrap());
        assert_eq!(a.actuators.len(), 2);
        assert_ne!(a.actuators[0], a.actuators[1]);
        assert!(a.criteria.sweep.is_none());
        let zero = Spreads { modulus: 0.0, wall: 0.0, friction: 0.0, size: 0.0 };
        let same = perturbed_scene(&s, &zero, 3, 0).unwrap();
        assert_eq!(same.actuators[0], s.actuators[0]);
        assert_eq!(same.objects, s.objects);
    }

    /// With no spread every sample is the nominal scene, so the pass probability is the
    /// nominal verdict exactly (0 or 1); with spreads the study is deterministic for a
    /// seed whatever the thread count.
    #[test]
    fn no_spread_reproduces_the_nominal_check_and_runs_are_deterministic() {
        let s = scene();
        let check = CheckSettings::default();
        let nominal = check_scene(&s, &check).unwrap();
        let zero = Spreads { modulus: 0.0, wall: 0.0, friction: 0.0, size: 0.0 };
        let r = robust_check(&s, &RobustSettings { samples: 2, seed: 1, spreads: zero, check }).unwrap();
        let pass = nominal.objects[0].verdict == Verdict::Pass;
        assert_eq!(r.objects[0].passes, if pass { 2 } else { 0 });
        // every criterion the nominal scene fails, fails in both samples
        for f in &nominal.objects[0].failures {
            assert!(r.objects[0].failures.contains(&(f.kind(), 2)), "{:?}", r.objects[0].failures);
        }
        let settings = RobustSettings { samples: 3, seed: 42, spreads: Spreads::default(), check };
        let one = rayon::ThreadPoolBuilder::new().num_threads(1).build().unwrap();
        let a = one.install(|| robust_check(&s, &settings)).unwrap();
        let b = robust_check(&s, &settings).unwrap();
        assert_eq!(a, b);
        assert!(robust_check(&s, &RobustSettings { samples: 0, ..settings }).is_err());
    }
}
