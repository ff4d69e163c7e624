//! Checks of the fabrication plan against closed-form solids, the helix length and
//! common shop practice.

use super::*;
use crate::actuator::Fiber;
use crate::material::{HyperelasticModel, Material, NeoHookean};
use crate::section::{BoxSection, HalfRoundSection, SectionModel};
use approx::assert_relative_eq;

/// A `Box` test finger (mm; the demo's first `box-100`): 14 × 10 chamber, 3 mm walls, floor 2.5,
/// under-layer 1; 100 mm chamber, 6 mm base, 5 mm tip; pitch 3.5, ribbon 1.
fn box_100() -> Actuator {
    let s = BoxSection::new(14e-3, 10e-3, 3e-3, 3e-3, 2.5e-3, 1e-3).unwrap();
    actuator(SectionProfile::Box(s), 100e-3, 6e-3, 5e-3, Fiber { pitch: 3.5e-3, width: 1e-3 })
}

fn actuator(section: SectionProfile, chamber: f64, base: f64, tip: f64, fiber: Fiber) -> Actuator {
    let rubber = HyperelasticModel::NeoHookean(NeoHookean::new(39.4e3).unwrap());
    Actuator::new(
        "test",
        "platinum silicone, Shore 00-30",
        Material { model: rubber, density: 1070.0, stretch_at_break: 10.0 },
        section,
        chamber,
        base,
        tip,
        fiber,
        60e3,
        SectionModel::WallPressure,
    )
    .unwrap()
}

fn cast(p: &FabPlan, name: &str) -> f64 {
    p.casts.iter().find(|c| c.name == name).unwrap().volume
}

/// Box casts against the closed-form solids, worked by hand (mm³): body
/// `111 × 20 × 13 - 100 × 14 × 10 = 14860`, under-layer `111 × 20 × 1 = 2220`, floor
/// `111 × 20 × 2.5 = 5550`; together the actuator's own rubber volume (section area
/// `20 × 16.5 - 14 × 10 = 190 mm²` over the chamber, solid `330 mm²` caps).
#[test]
fn box_casts_are_the_closed_form_solids() {
    let a = box_100();
    let p = plan(&a, Some(4.0), &FabSettings::default()).unwrap();
    assert_relative_eq!(cast(&p, "body"), 14860e-9, max_relative = 1e-12);
    assert_relative_eq!(cast(&p, "under-layer"), 2220e-9, max_relative = 1e-12);
    assert_relative_eq!(cast(&p, "floor"), 5550e-9, max_relative = 1e-12);
    assert_relative_eq!(p.rubber_volume, 22630e-9, max_relative = 1e-12);
    assert_relative_eq!(p.rubber_volume, a.rubber_volume(), max_relative = 1e-12);
    // bonding coat: 0.5 mm over the open face less the core's opening, 111 × 20 - 100 × 14
    assert_relative_eq!(cast(&p, "bonding coat"), 0.5 * (2220.0 - 1400.0) * 1e-9, max_relative = 1e-12);
    let top = p.molds.iter().find(|m| m.name == "top mold").unwrap();
    assert_eq!(top.inside.map(|x| (x * 1e4).round() / 10.0), [111.0, 20.0, 13.0]);
    let plate = p.molds.iter().find(|m| m.name == "plate mold").unwrap();
    assert_relative_eq!(plate.fill[0].0, 1e-3);
    assert_relative_eq!(plate.fill[1].0, 3.5e-3, max_relative = 1e-12);
    assert_relative_eq!(p.strain_layer.0, 109e-3, max_relative = 1e-12);
    assert_relative_eq!(p.strain_layer.1, 18e-3, max_relative = 1e-12);
    assert_relative_eq!(p.tubing.max_outer_diameter, 10e-3);
}

/// HalfRound casts against half cylinders, and the whole against the section
/// quadrature's area (an independent integration of the same profile).
#[test]
fn half_round_casts_are_half_cylinders() {
    let s = HalfRoundSection::new(6e-3, 2e-3, 2e-3, 1e-3).unwrap();
    let a = actuator(SectionProfile::HalfRound(s), 90e-3, 5e-3, 5e-3, Fiber { pitch: 4e-3, width: 1.5e-3 });
    let p = plan(&a, None, &FabSettings::default()).unwrap();
    let (r, rc, l, lc) = (8e-3f64, 6e-3f64, 100e-3f64, 90e-3f64);
    let half = |radius: f64, len: f64| PI * radius * radius / 2.0 * len;
    assert_relative_eq!(cast(&p, "body"), half(r, l) - half(rc, lc), max_relative = 1e-12);
    assert_relative_eq!(
        cast(&p, "floor") + cast(&p, "under-layer"),
        2.0 * r * 3e-3 * l,
        max_relative = 1e-12
    );
    let q = a.section.quadrature(8);
    let by_quadrature = q.rubber_moment(0) * lc + (q.rubber_moment(0) + a.section.chamber_area()) * 10e-3;
    assert_relative_eq!(p.rubber_volume, by_quadrature, max_relative = 1e-10);
    // the largest circle inside the half-disk chamber has the chamber's radius as diameter
    assert_relative_eq!(p.tubing.max_outer_diameter, 6e-3);
    assert_eq!(p.cure_before_demold_h, 4.0);
}

/// The helix length against a fine polyline of the helix itself, wound on the Box
/// outline (a rectangle, so the developed-surface formula is not assumed) and on a
/// circle, where it is the textbook `N sqrt((2 pi r)^2 + p^2)`.
#[test]
fn helix_length_matches_a_polyline_of_the_helix() {
    // point at perimeter arc s on a w × h rectangle, starting at a corner
    let rect = |s: f64, w: f64, h: f64| -> (f64, f64) {
        let s = s.rem_euclid(2.0 * (w + h));
        if s < w {
            (s, 0.0)
        } else if s < w + h {
            (w, s - w)
        } else if s < 2.0 * w + h {
            (w - (s - w - h), h)
        } else {
            (0.0, h - (s - 2.0 * w - h))
        }
    };
    let (w, h, pitch, turns) = (20e-3, 16.5e-3, 3.5e-3, 29usize);
    let per = 2.0 * (w + h);
    // breakpoints at every corner of every turn, 50 more points along each face
    let mut ts: Vec<f64> = Vec::new();
    let corners = [0.0, w, w + h, 2.0 * w + h, per];
    for k in 0..turns {
        for face in corners.windows(2) {
            for j in 0..50 {
                ts.push(k as f64 + (face[0] + (face[1] - face[0]) * j as f64 / 50.0) / per);
            }
        }
    }
    ts.push(turns as f64);
    let mut len = 0.0;
    let mut last = (0.0, 0.0, 0.0);
    for &t in &ts[1..] {
        let (x, y) = rect(t * per, w, h);
        let z = t * pitch;
        len += ((x - last.0).powi(2) + (y - last.1).powi(2) + (z - last.2).powi(2)).sqrt();
        last = (x, y, z);
    }
    assert_relative_eq!(helix_length(per, pitch, turns), len, max_relative = 1e-9);
    let r = 11e-3;
    assert_relative_eq!(
        helix_length(2.0 * PI * r, 2.5e-3, 10),
        10.0 * ((2.0 * PI * r).powi(2) + 2.5e-3f64.powi(2)).sqrt(),
        max_relative = 1e-15
    );
    let b = box_100();
    assert_relative_eq!(outer_perimeter(&b.section), 2.0 * (20e-3 + 16.5e-3), max_relative = 1e-12);
    let p = plan(&b, None, &FabSettings::default()).unwrap();
    assert_eq!(p.fiber.turns_per_helix, 29); // ceil(100 / 3.5)
    assert_relative_eq!(
        p.fiber.total_length,
        2.0 * (helix_length(per, pitch, 29) + 0.1),
        max_relative = 1e-12
    );
}

/// Silicone: casts and coats times the density, plus the stated 15 % waste, split 1:1.
#[test]
fn silicone_mass_includes_coats_and_waste() {
    let p = plan(&box_100(), None, &FabSettings::default()).unwrap();
    let coats = cast(&p, "bonding coat") + cast(&p, "seal coat");
    assert_relative_eq!(p.coat_volume, coats, max_relative = 1e-12);
    assert_relative_eq!(p.silicone_mass, (22630e-9 + coats) * 1070.0 * 1.15, max_relative = 1e-12);
    assert_relative_eq!(2.0 * p.part_mass(), p.silicone_mass);
    let none = FabSettings { waste_allowance: 0.0, coat_thickness: 0.0, ..FabSettings::default() };
    let bare = plan(&box_100(), None, &none).unwrap();
    assert_relative_eq!(bare.silicone_mass, 22630e-9 * 1070.0, max_relative = 1e-12);
}

/// Common practice (no published source): a hand-cast finger of roughly 180 × 38 mm
/// (the top mold's outside) with a chamber core about 127 mm long and a 3 mm (1/8 in)
/// top wall takes on the order of 6 m (about 20 ft) of ribbon for a tight double wind,
/// and cures for at least 4 h before demolding. The finger: half-round, 10 mm chamber
/// radius, 3 mm wall, 2 mm floor, 1 mm under-layer, 28 mm base, 13 mm tip, wound at a
/// 3 mm pitch; 6 mm mold walls.
#[test]
fn a_hand_cast_finger_takes_about_six_metres_of_ribbon() {
    let s = HalfRoundSection::new(10e-3, 3e-3, 2e-3, 1e-3).unwrap();
    let a = actuator(SectionProfile::HalfRound(s), 127e-3, 28e-3, 13e-3, Fiber { pitch: 3e-3, width: 1e-3 });
    let p = plan(&a, Some(4.0), &FabSettings::default()).unwrap();
    let top = p.molds.iter().find(|m| m.name == "top mold").unwrap();
    let outside = (top.inside[0] + 12e-3, top.inside[1] + 12e-3);
    assert!((outside.0 - 0.18).abs() < 0.01 && (outside.1 - 0.038).abs() < 0.004, "{outside:?}");
    let core = p.molds.iter().find(|m| m.name == "chamber core").unwrap();
    assert_relative_eq!(core.inside[0], 0.127);
    assert!((4.5..8.0).contains(&p.fiber.total_length), "{} m", p.fiber.total_length);
    assert!(p.cure_before_demold_h >= 4.0);
    // a material with a 3 h cure is still left 4 h
    assert_eq!(plan(&a, Some(3.0), &FabSettings::default()).unwrap().cure_before_demold_h, 4.0);
}

#[test]
fn bad_settings_and_vanishing_sheet_are_errors() {
    let a = box_100();
    let bad = FabSettings { waste_allowance: -0.1, ..FabSettings::default() };
    assert!(matches!(plan(&a, None, &bad), Err(FabError::BadSetting { field: "waste_allowance", .. })));
    let nan = FabSettings { coat_thickness: f64::NAN, ..FabSettings::default() };
    assert!(plan(&a, None, &nan).is_err());
    let wide = FabSettings { sheet_inset: 0.011, ..FabSettings::default() };
    assert_eq!(plan(&a, None, &wide), Err(FabError::NoSheet));
}
