//! Calibration of an actuator against a measured prototype.
//!
//! A hand-cast batch of silicone is rarely the datasheet's: mixing, degassing, cure
//! temperature and the fibers' and coats' own stiffness all move the curve. Given the
//! bend angle (and optionally the blocked tip force) measured at a few pressures, this
//! module fits
//!
//! * a **modulus scale** `c`: every stress parameter of the material model is multiplied
//!   by `c` (the shape of the stress-stretch curve is kept), and optionally
//! * an **effective floor thickness** `t_f` (the rubber between the strain-limiting layer
//!   and the chamber, the dimension a hand cast controls worst),
//!
//! so that the model of DESIGN 3.2 (free bending) and 3.3 (blocked force) matches the
//! measurements in the least-squares sense. Residuals are scaled per series by the
//! series' root-mean-square measured value, so angles and forces weigh alike. The fit is
//! Levenberg–Marquardt (K. Levenberg 1944; D. W. Marquardt, J. SIAM 11, 431–441, 1963)
//! on `ln c` and `ln t_f`, with a central-difference Jacobian; the standard errors come
//! from the Gauss–Newton covariance `s^2 (J^T J)^-1`, `s^2` the residual variance
//! (e.g. Press et al., "Numerical Recipes", 3rd ed., 2007, section 15.5).
//!
//! A measured pressure past the held branch's limit point has no blocked force; the
//! model then uses the largest held force, the most the finger can push on its axis.

use nalgebra::{DMatrix, DVector};

use crate::actuator::{Actuator, BendError};
use crate::material::{HyperelasticModel, MaterialError, MooneyRivlin, NeoHookean, Ogden, OgdenTerm, Yeoh};
use crate::rod::{BlockedOutcome, Rod, RodError, blocked_force_curve};
use crate::section::SectionProfile;

/// One measured point of a prototype.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Measurement {
    /// Pressure (Pa).
    pub pressure: f64,
    /// Bend angle of the tip (rad).
    pub bend_angle: f64,
    /// Blocked tip force (N), if measured.
    pub blocked_force: Option<f64>,
}

/// Knobs of the calibration.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CalibrationSettings {
    /// Fit the floor thickness as well as the modulus scale.
    pub fit_floor: bool,
    /// Rod elements for the blocked-force solves (>= 40).
    pub elements: usize,
    /// Most Levenberg–Marquardt iterations.
    pub max_iterations: usize,
}

impl Default for CalibrationSettings {
    fn default() -> Self {
        Self { fit_floor: false, elements: 40, max_iterations: 60 }
    }
}

/// Why a calibration could not run.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum CalibrateError {
    /// Too few points for the parameters.
    #[error("{points} measured values cannot fit {parameters} parameters; measure at more pressures")]
    TooFewPoints {
        /// Residuals available.
        points: usize,
        /// Parameters fitted.
        parameters: usize,
    },
    /// A measurement is not usable.
    #[error("measurement {index}: {reason}")]
    BadMeasurement {
        /// 0-based index.
        index: usize,
        /// What is wrong.
        reason: String,
    },
    /// The model cannot be evaluated at the starting parameters.
    #[error("the model cannot be evaluated at the scene's parameters: {0}")]
    Model(String),
    /// Scaling produced an invalid material.
    #[error("scaled material: {0}")]
    Material(#[from] MaterialError),
}

/// Residuals of the model against the measurements.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Residuals {
    /// Root-mean-square bend-angle error (rad).
    pub bend_rms: f64,
    /// Root-mean-square blocked-force error (N), when forces were measured.
    pub force_rms: Option<f64>,
}

/// The model's values at the measured pressures.
#[derive(Debug, Clone, PartialEq)]
pub struct Prediction {
    /// Bend angle per measurement (rad).
    pub bend_angle: Vec<f64>,
    /// Blocked force per measurement (N), where measured.
    pub blocked_force: Vec<Option<f64>>,
}

/// The fitted calibration.
#[derive(Debug, Clone, PartialEq)]
pub struct Calibration {
    /// Fitted modulus scale.
    pub modulus_scale: f64,
    /// Its standard error.
    pub modulus_scale_error: f64,
    /// Floor thickness after the fit (m); the scene's when not fitted.
    pub floor: f64,
    /// Its standard error (m), when fitted.
    pub floor_error: Option<f64>,
    /// Residuals with the scene's parameters.
    pub before: Residuals,
    /// Residuals with the fitted ones.
    pub after: Residuals,
    /// Model values with the scene's parameters.
    pub prediction_before: Prediction,
    /// Model values with the fitted ones.
    pub prediction_after: Prediction,
    /// The calibrated actuator.
    pub actuator: Actuator,
    /// Iterations taken.
    pub iterations: usize,
    /// Whether the fit met its convergence test (otherwise it stopped at the cap).
    pub converged: bool,
}

/// `model` with every stress parameter multiplied by `scale`.
///
/// # Errors
/// A scale that makes the parameters invalid (not finite, not positive).
pub fn scale_model(model: &HyperelasticModel, scale: f64) -> Result<HyperelasticModel, MaterialError> {
    Ok(match model {
        HyperelasticModel::NeoHookean(m) => HyperelasticModel::NeoHookean(NeoHookean::new(m.mu() * scale)?),
        HyperelasticModel::MooneyRivlin(m) => {
            let (a, b) = m.coefficients();
            HyperelasticModel::MooneyRivlin(MooneyRivlin::new(a * scale, b * scale)?)
        }
        HyperelasticModel::Yeoh(m) => {
            let [a, b, c] = m.coefficients();
            HyperelasticModel::Yeoh(Yeoh::new(a * scale, b * scale, c * scale)?)
        }
        HyperelasticModel::Ogden(m) => HyperelasticModel::Ogden(Ogden::new(
            m.terms().iter().map(|t| OgdenTerm { mu: t.mu * scale, alpha: t.alpha }).collect(),
        )?),
    })
}

/// The floor thickness of a section (m).
pub fn floor_of(section: &SectionProfile) -> f64 {
    match section {
        SectionProfile::Box(s) => s.floor,
        SectionProfile::HalfRound(s) => s.floor,
    }
}

/// `actuator` with its material scaled by `scale` and its floor set to `floor` (m).
///
/// # Errors
/// Invalid scaled parameters, or a floor the section refuses.
pub fn adjusted(actuator: &Actuator, scale: f64, floor: f64) -> Result<Actuator, CalibrateError> {
    let mut material = actuator.material.clone();
    material.model = scale_model(&material.model, scale)?;
    let section = match &actuator.section {
        SectionProfile::Box(s) => crate::section::BoxSection::new(
            s.chamber_width,
            s.chamber_height,
            s.side_wall,
            s.top_wall,
            floor,
            s.under_layer,
        )
        .map(SectionProfile::Box),
        SectionProfile::HalfRound(s) => {
            crate::section::HalfRoundSection::new(s.radius, s.wall, floor, s.under_layer)
                .map(SectionProfile::HalfRound)
        }
    }
    .map_err(|e| CalibrateError::Model(e.to_string()))?;
    Actuator::new(
        actuator.name.clone(),
        actuator.material_name.clone(),
        material,
        section,
        actuator.chamber_length,
        actuator.base_length,
        actuator.tip_length,
        actuator.fiber,
        actuator.max_pressure,
        actuator.section_model,
    )
    .map_err(|e| CalibrateError::Model(e.to_string()))
}

/// The model's bend angles and blocked forces at the measured pressures.
///
/// # Errors
/// A pressure outside the model's range, or a rod that cannot be built or solved.
pub fn predict(actuator: &Actuator, data: &[Measurement], elements: usize) -> Result<Prediction, String> {
    let bend_angle = data
        .iter()
        .map(|m| actuator.free_bending(m.pressure).map(|f| f.bend_angle))
        .collect::<Result<Vec<f64>, BendError>>()
        .map_err(|e| e.to_string())?;
    let forced: Vec<f64> = data.iter().filter(|m| m.blocked_force.is_some()).map(|m| m.pressure).collect();
    let mut blocked_force = vec![None; data.len()];
    if !forced.is_empty() {
        // the curve needs increasing pressures; solve in sorted order, map back
        let mut order: Vec<usize> = (0..data.len()).filter(|&i| data[i].blocked_force.is_some()).collect();
        order.sort_by(|&a, &b| data[a].pressure.total_cmp(&data[b].pressure));
        let pressures: Vec<f64> = order.iter().map(|&i| data[i].pressure).collect();
        let rod = Rod::of_actuator(actuator, elements).map_err(|e: RodError| e.to_string())?;
        let law = actuator.law(0.0, actuator.section_model);
        let curve = blocked_force_curve(&rod, &law, &pressures).map_err(|e| e.to_string())?;
        for (&i, outcome) in order.iter().zip(curve) {
            blocked_force[i] = Some(match outcome {
                BlockedOutcome::Held { force, .. } => force,
                BlockedOutcome::BeyondLimit { limit_force, .. } => limit_force,
                BlockedOutcome::NotConverged(r) => {
                    return Err(format!(
                        "blocked-force solve {} at {} Pa",
                        r.status.name(),
                        data[i].pressure
                    ));
                }
            });
        }
    }
    Ok(Prediction { bend_angle, blocked_force })
}

fn rms(v: impl Iterator<Item = f64>) -> Option<f64> {
    let (s, n) = v.fold((0.0, 0usize), |(s, n), x| (s + x * x, n + 1));
    (n > 0).then(|| (s / n as f64).sqrt())
}

/// The residuals of `p` against `data`.
pub fn residuals(p: &Prediction, data: &[Measurement]) -> Residuals {
    Residuals {
        bend_rms: rms(p.bend_angle.iter().zip(data).map(|(m, d)| m - d.bend_angle)).unwrap_or(0.0),
        force_rms: rms(p
            .blocked_force
            .iter()
            .zip(data)
            .filter_map(|(m, d)| Some(m.as_ref()? - d.blocked_force?))),
    }
}

/// The scaled residual vector of the fit.
struct Objective<'a> {
    actuator: &'a Actuator,
    data: &'a [Measurement],
    settings: CalibrationSettings,
    bend_scale: f64,
    force_scale: f64,
}

impl Objective<'_> {
    fn parameters(&self, x: &[f64]) -> (f64, f64) {
        let floor = if self.settings.fit_floor { x[1].exp() } else { floor_of(&self.actuator.section) };
        (x[0].exp(), floor)
    }

    fn eval(&self, x: &[f64]) -> Option<(DVector<f64>, Prediction)> {
        let (scale, floor) = self.parameters(x);
        let a = adjusted(self.actuator, scale, floor).ok()?;
        let p = predict(&a, self.data, self.settings.elements).ok()?;
        let mut r: Vec<f64> =
            p.bend_angle.iter().zip(self.data).map(|(m, d)| (m - d.bend_angle) / self.bend_scale).collect();
        for (m, d) in p.blocked_force.iter().zip(self.data) {
            if let (Some(m), Some(f)) = (m, d.blocked_force) {
                r.push((m - f) / self.force_scale);
            }
        }
        Some((DVector::from_vec(r), p))
    }
}

/// Fits the calibration of `actuator` to `data`.
///
/// # Errors
/// Too few points, unusable measurements, or a model that cannot be evaluated at the
/// scene's parameters.
pub fn calibrate(
    actuator: &Actuator,
    data: &[Measurement],
    settings: &CalibrationSettings,
) -> Result<Calibration, CalibrateError> {
    for (index, m) in data.iter().enumerate() {
        let bad = |reason: &str| Err(CalibrateError::BadMeasurement { index, reason: reason.into() });
        if !(m.pressure.is_finite() && m.pressure > 0.0) {
            return bad("pressure must be > 0");
        }
        if m.pressure > actuator.max_pressure * (1.0 + 1e-12) {
            return bad("pressure is above the actuator's rated maximum");
        }
        if !m.bend_angle.is_finite() || m.blocked_force.is_some_and(|f| !f.is_finite()) {
            return bad("values must be finite numbers");
        }
    }
    let n_params = if settings.fit_floor { 2 } else { 1 };
    let n_res = data.len() + data.iter().filter(|m| m.blocked_force.is_some()).count();
    if n_res < n_params + 1 {
        return Err(CalibrateError::TooFewPoints { points: n_res, parameters: n_params });
    }
    let positive = |x: Option<f64>| x.filter(|v| *v > 0.0);
    let objective = Objective {
        actuator,
        data,
        settings: *settings,
        bend_scale: positive(rms(data.iter().map(|m| m.bend_angle))).unwrap_or(1.0),
        force_scale: positive(rms(data.iter().filter_map(|m| m.blocked_force))).unwrap_or(1.0),
    };
    let floor0 = floor_of(&actuator.section);
    let mut x = vec![0.0];
    if settings.fit_floor {
        x.push(floor0.ln());
    }
    let (mut r, before) =
        objective.eval(&x).ok_or_else(|| CalibrateError::Model(model_failure(actuator, data, settings)))?;
    let mut cost = r.norm_squared();
    let mut lambda = 1e-3;
    let mut converged = false;
    let mut iterations = 0;
    let mut jac = jacobian(&objective, &x, &r).unwrap_or_else(|| DMatrix::zeros(r.len(), x.len()));
    while iterations < settings.max_iterations {
        iterations += 1;
        let jtj = jac.transpose() * &jac;
        let g = jac.transpose() * &r;
        if g.amax() <= 1e-12 * cost.max(1e-300).sqrt() {
            converged = true;
            break;
        }
        let mut improved = false;
        for _ in 0..12 {
            let mut a = jtj.clone();
            for i in 0..x.len() {
                a[(i, i)] += lambda * jtj[(i, i)].max(1e-12);
            }
            let Some(step) = a.lu().solve(&(-&g)) else {
                lambda *= 10.0;
                continue;
            };
            let trial: Vec<f64> = x.iter().zip(step.iter()).map(|(xi, s)| xi + s.clamp(-1.0, 1.0)).collect();
            match objective.eval(&trial) {
                Some((rt, _)) if rt.norm_squared() < cost => {
                    let small = step.amax() < 1e-9;
                    let flat = cost - rt.norm_squared() <= 1e-14 * cost;
                    x = trial;
                    r = rt;
                    cost = r.norm_squared();
                    lambda = (lambda / 3.0).max(1e-12);
                    improved = true;
                    converged = small || flat;
                    break;
                }
                _ => lambda *= 10.0,
            }
        }
        if !improved {
            // no step lowers the cost: a minimum to the precision of the model's solves
            converged = true;
        }
        if converged {
            break;
        }
        match jacobian(&objective, &x, &r) {
            Some(j) => jac = j,
            None => break,
        }
    }
    let (_, after) = objective
        .eval(&x)
        .ok_or_else(|| CalibrateError::Model("the fitted model cannot be evaluated".into()))?;
    let jac = jacobian(&objective, &x, &r).unwrap_or(jac);
    let dof = (r.len() - x.len()).max(1) as f64;
    let s2 = cost / dof;
    let cov = (jac.transpose() * &jac).try_inverse().map(|m| m * s2);
    let (scale, floor) = objective.parameters(&x);
    let err = |i: usize| cov.as_ref().map_or(f64::NAN, |c| c[(i, i)].max(0.0).sqrt());
    Ok(Calibration {
        modulus_scale: scale,
        // d c = c d(ln c)
        modulus_scale_error: scale * err(0),
        floor,
        floor_error: settings.fit_floor.then(|| floor * err(1)),
        before: residuals(&before, data),
        after: residuals(&after, data),
        prediction_before: before,
        prediction_after: after,
        actuator: adjusted(actuator, scale, floor)?,
        iterations,
        converged,
    })
}

fn model_failure(actuator: &Actuator, data: &[Measurement], settings: &CalibrationSettings) -> String {
    predict(actuator, data, settings.elements).err().unwrap_or_else(|| "unknown".into())
}

/// Central-difference Jacobian of the residuals in the (log) parameters; a one-sided
/// difference where the model cannot be evaluated on one side.
fn jacobian(objective: &Objective<'_>, x: &[f64], r0: &DVector<f64>) -> Option<DMatrix<f64>> {
    let h = 1e-4;
    let mut j = DMatrix::zeros(r0.len(), x.len());
    for k in 0..x.len() {
        let mut xp = x.to_vec();
        xp[k] += h;
        let mut xm = x.to_vec();
        xm[k] -= h;
        let col = match (objective.eval(&xp), objective.eval(&xm)) {
            (Some((rp, _)), Some((rm, _))) => (rp - rm) / (2.0 * h),
            (Some((rp, _)), None) => (rp - r0) / h,
            (None, Some((rm, _))) => (r0 - rm) / h,
            (None, None) => return None,
        };
        j.set_column(k, &col);
    }
    Some(j)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::material::StrainEnergy;
    use approx::assert_relative_eq;

    /// Standard normal deviates from a seeded PCG stream (Box–Muller).
    fn normals(seed: u128, n: usize) -> Vec<f64> {
        let mut rng = oorandom::Rand64::new(seed);
        (0..n)
            .map(|_| {
                let u1 = 1.0 - rng.rand_float();
                let u2 = rng.rand_float();
                (-2.0 * u1.ln()).sqrt() * (std::f64::consts::TAU * u2).cos()
            })
            .collect()
    }

    fn synthetic(
        truth: &Actuator,
        pressures: &[f64],
        noise_deg: f64,
        noise_n: Option<f64>,
    ) -> Vec<Measurement> {
        let clean: Vec<Measurement> = pressures
            .iter()
            .map(|&p| Measurement { pressure: p, bend_angle: 0.0, blocked_force: noise_n.map(|_| 0.0) })
            .collect();
        let pred = predict(truth, &clean, 40).unwrap();
        let z = normals(7, 2 * pressures.len());
        clean
            .iter()
            .enumerate()
            .map(|(i, m)| Measurement {
                pressure: m.pressure,
                bend_angle: pred.bend_angle[i] + noise_deg.to_radians() * z[i],
                blocked_force: noise_n
                    .map(|s| pred.blocked_force[i].unwrap_or(0.0) + s * z[pressures.len() + i]),
            })
            .collect()
    }

    /// Scaling every stress parameter scales the small-strain modulus and every stress
    /// by the same factor, for all four families.
    #[test]
    fn scaled_models_scale_their_stresses() {
        let models = [
            HyperelasticModel::NeoHookean(NeoHookean::new(20e3).unwrap()),
            HyperelasticModel::MooneyRivlin(MooneyRivlin::new(10e3, 2e3).unwrap()),
            HyperelasticModel::Yeoh(Yeoh::new(12e3, 0.4e3, 0.01e3).unwrap()),
            HyperelasticModel::Ogden(
                Ogden::new(vec![OgdenTerm { mu: 24e3, alpha: 1.8 }, OgdenTerm { mu: 0.4e3, alpha: 6.0 }])
                    .unwrap(),
            ),
        ];
        for m in &models {
            let s = scale_model(m, 0.7).unwrap();
            assert_relative_eq!(s.shear_modulus(), 0.7 * m.shear_modulus(), max_relative = 1e-14);
            for l in [0.6, 1.3, 2.5] {
                assert_relative_eq!(s.planar_stress(l), 0.7 * m.planar_stress(l), max_relative = 1e-13);
            }
        }
        assert!(scale_model(&models[0], -1.0).is_err());
    }

    /// Bend angles generated from a known modulus scale (0.8) with 0.5° of Gaussian
    /// noise: the fit recovers the scale within three standard errors, the standard
    /// error is small, and the residual after the fit is at the noise level.
    #[test]
    fn recovers_a_known_modulus_scale_within_the_noise() {
        let base = Actuator::example();
        let truth = adjusted(&base, 0.8, floor_of(&base.section)).unwrap();
        let pressures: Vec<f64> = (1..=10).map(|i| i as f64 * 4e3).collect();
        let data = synthetic(&truth, &pressures, 0.5, None);
        let c = calibrate(&base, &data, &CalibrationSettings::default()).unwrap();
        assert!(c.converged, "{c:?}");
        assert!(
            (c.modulus_scale - 0.8).abs() < 3.0 * c.modulus_scale_error,
            "{} ± {}",
            c.modulus_scale,
            c.modulus_scale_error
        );
        assert!(c.modulus_scale_error < 0.01);
        let after_deg = c.after.bend_rms.to_degrees();
        assert!(after_deg < 0.75 && after_deg > 0.2, "{after_deg}° after, noise 0.5°");
        assert!(c.before.bend_rms.to_degrees() > 5.0);
        assert!(c.actuator.material.model.shear_modulus() < base.material.model.shear_modulus());
    }

    /// Bend angles and blocked forces from a known scale (1.25) and floor (3.6 mm instead
    /// of 3 mm), with 0.5° and 5 mN of noise: both parameters come back within three
    /// standard errors and the residuals after the fit are at the noise level.
    #[test]
    fn recovers_modulus_scale_and_floor_from_angles_and_forces() {
        let base = Actuator::example();
        let truth = adjusted(&base, 1.25, 3.6e-3).unwrap();
        let pressures: Vec<f64> = (1..=8).map(|i| i as f64 * 6e3).collect();
        let data = synthetic(&truth, &pressures, 0.5, Some(0.005));
        let settings = CalibrationSettings { fit_floor: true, ..CalibrationSettings::default() };
        let c = calibrate(&base, &data, &settings).unwrap();
        assert!(c.converged, "{c:?}");
        let fe = c.floor_error.unwrap();
        assert!(
            (c.modulus_scale - 1.25).abs() < 3.0 * c.modulus_scale_error,
            "{} ± {}",
            c.modulus_scale,
            c.modulus_scale_error
        );
        assert!((c.floor - 3.6e-3).abs() < 3.0 * fe, "{} ± {}", c.floor, fe);
        assert!(fe < 0.3e-3);
        assert!(c.after.bend_rms.to_degrees() < 0.8);
        assert!(c.after.force_rms.unwrap() < 0.008);
        assert!(c.after.force_rms.unwrap() < c.before.force_rms.unwrap());
    }

    #[test]
    fn bad_measurements_are_refused() {
        let a = Actuator::example();
        let m = |p: f64, b: f64| Measurement { pressure: p, bend_angle: b, blocked_force: None };
        let s = CalibrationSettings::default();
        assert!(matches!(calibrate(&a, &[m(10e3, 0.5)], &s), Err(CalibrateError::TooFewPoints { .. })));
        assert!(matches!(
            calibrate(&a, &[m(10e3, 0.5), m(70e3, 1.0)], &s),
            Err(CalibrateError::BadMeasurement { index: 1, .. })
        ));
        assert!(matches!(
            calibrate(&a, &[m(10e3, f64::NAN), m(20e3, 1.0)], &s),
            Err(CalibrateError::BadMeasurement { index: 0, .. })
        ));
    }
}
