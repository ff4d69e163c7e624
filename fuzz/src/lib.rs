//! What the fuzz targets run: the app's scene loader (parsing, validation with field
//! paths, mesh reading) and the solvers of `grasp-core` on the scenes it accepts.
//!
//! The loader is the app's own code, included file by file (the `app` package is a
//! binary only), so the targets exercise exactly what `arcfinger` runs. Each function
//! here may only return: a panic, an abort or a timeout is a finding.

#![allow(dead_code, missing_docs, unused_imports, reason = "the app's modules, included partially")]

#[path = "../../app/src/error.rs"]
mod error;
#[path = "../../app/src/ordered_map.rs"]
mod ordered_map;
#[path = "../../app/src/scene_doc.rs"]
mod scene_doc;
#[path = "../../app/src/scene_file/mod.rs"]
pub mod scene_file;
#[path = "../../app/src/suggest.rs"]
mod suggest;

use arbitrary::Arbitrary;
use grasp_core::check::{CheckSettings, Verdict, check_scene};
use grasp_core::geometry::{FingerBody, FingerFrame, ObjectGeometry, free_angles, palm_body};
use grasp_core::rod::Rod;
use grasp_core::scene::Scene;

/// A closed tetrahedron (edges of 20 mm) for scenes that name `meshes/tetra.obj`.
pub const TETRA_OBJ: &[u8] = b"v 0 0 0\nv 20 0 0\nv 0 20 0\nv 0 0 20\nf 1 3 2\nf 1 2 4\nf 1 4 3\nf 2 3 4\n";

/// The mesh files a fuzzed scene can name.
pub const MESHES: &[(&str, &[u8])] = &[
    ("meshes/bell-pepper.obj", include_bytes!("../../scenes/meshes/bell-pepper.obj")),
    ("meshes/tetra.obj", TETRA_OBJ),
];

/// Everything cheap that follows a valid scene: free bending of every actuator at the
/// check pressure and the rated one, the rods, frames, finger bodies, palm and object
/// geometries. A refusal (an `Err`) is fine; a panic is not.
fn downstream(scene: &Scene) {
    let pressure = scene.criteria.pressure;
    for a in &scene.actuators {
        let _ = a.free_bending(a.max_pressure);
        let Ok(free) = a.free_bending(pressure) else { continue };
        let Ok(rod) = Rod::of_actuator(a, 40) else { continue };
        let angles = free_angles(&rod, free.curvature);
        let _ = rod.nodes(&angles);
        if let Ok(frame) = FingerFrame::new(0.0, 0.05, 0.0) {
            let _ = FingerBody::new(&rod, &angles, &a.section, frame);
        }
    }
    for m in &scene.gripper.fingers {
        let _ = FingerFrame::of_mount(m);
    }
    let _ = palm_body(&scene.gripper.palm);
    for o in &scene.objects {
        if let Ok(g) = ObjectGeometry::of_object(o) {
            assert!(g.bounding_radius.is_finite(), "{}: bounding radius {}", o.name, g.bounding_radius);
        }
    }
    if let Some(s) = scene.criteria.sweep {
        assert!(
            s.pressures().len() <= 10_001,
            "sweep of {} pressures passed validation",
            s.pressures().len()
        );
    }
}

/// Scene text through the loader, then the cheap downstream work.
pub fn scene(data: &[u8]) {
    let Ok(text) = std::str::from_utf8(data) else { return };
    match scene_file::load_embedded("fuzz.ron", text, MESHES) {
        Ok(scene) => downstream(&scene),
        Err(e) => {
            assert_eq!(e.exit_code(), 2, "{e}");
            assert!(e.to_string().starts_with("fuzz.ron"), "message without the file name: {e}");
        }
    }
}

/// A scene of one sphere and the 3-finger demo gripper, the object being a mesh read
/// from `bytes` (first byte: 0 = STL, else OBJ).
pub fn mesh(data: &[u8]) {
    let Some((&kind, bytes)) = data.split_first() else { return };
    let name = if kind % 2 == 0 { "meshes/fuzz.stl" } else { "meshes/fuzz.obj" };
    let text = SCENE_TEMPLATE
        .replace("{SHAPE}", &format!("Mesh(path: \"{name}\", scale: 1.0)"))
        .replace("{FINGERS}", &fingers(3, 65.0, 0.0))
        .replace("{SECTION}", BOX_SECTION)
        .replace("{OBJECT}", "mass_g: 50.0, friction: 0.5, position_mm: (0.0, 0.0, -75.0)")
        .replace("{PRESSURE}", "30.0");
    let table = [(name, bytes)];
    match scene_file::load_embedded("fuzz.ron", &text, &table) {
        Ok(scene) => downstream(&scene),
        Err(e) => {
            let msg = e.to_string();
            assert!(msg.starts_with("fuzz.ron: objects[0].shape.path: \""), "{msg}");
        }
    }
}

const BOX_SECTION: &str = "Box(chamber_width_mm: 14.0, chamber_height_mm: 10.0, side_wall_mm: 3.0, \
                           top_wall_mm: 3.0, floor_mm: 2.5, under_layer_mm: 1.0)";

/// The demo gripper's scene with holes for the parts a case varies.
pub const SCENE_TEMPLATE: &str = r#"Scene(
    name: "fuzz",
    actuators: {
        "f": (
            material: "platinum silicone, Shore 00-30",
            chamber_length_mm: 100.0, base_length_mm: 6.0, tip_length_mm: 5.0,
            section: {SECTION},
            fiber: (pitch_mm: 3.5, width_mm: 1.0),
            max_pressure_kpa: 60.0,
        ),
    },
    gripper: (palm: Disk(radius_mm: 75.0, thickness_mm: 12.0), fingers: [{FINGERS}]),
    objects: [(name: "o", shape: {SHAPE}, {OBJECT})],
    criteria: (pressure_kpa: {PRESSURE}, safety_factor: 1.5, lift_accel_m_s2: 2.0,
               lateral_accel_m_s2: 1.0, min_fingers_in_contact: 1, min_enclosure: 0.2),
)"#;

/// `n` fingers evenly spaced about the axis.
fn fingers(n: usize, radius_mm: f64, tilt_deg: f64) -> String {
    (0..n)
        .map(|i| {
            format!(
                "(actuator: \"f\", azimuth_deg: {}, radius_mm: {radius_mm}, tilt_deg: {tilt_deg})",
                360.0 * i as f64 / n as f64
            )
        })
        .collect::<Vec<_>>()
        .join(", ")
}

/// One small grasp problem: the parameters a fuzz input picks (mapped to ranges that
/// validation may or may not accept).
#[derive(Debug, Clone, Arbitrary)]
pub struct CheckCase {
    pub fingers: u8,
    pub mount_radius: u8,
    pub tilt: i8,
    pub half_round: bool,
    pub wall_tenths: u8,
    pub shape: u8,
    pub dims: [u8; 3],
    pub position: [i8; 3],
    pub mass: u8,
    pub friction: u8,
    pub pressure: u8,
}

impl CheckCase {
    /// The scene text of this case.
    pub fn scene_text(&self) -> String {
        let d = |i: usize| 1.0 + f64::from(self.dims[i]) * 0.5; // 1 to 128.5 mm
        let shape = match self.shape % 6 {
            0 => format!("Sphere(radius_mm: {})", d(0)),
            1 => format!("Box(size_mm: ({}, {}, {}))", d(0), d(1), d(2)),
            2 => format!("Cylinder(radius_mm: {}, height_mm: {})", d(0), d(1)),
            3 => format!("Capsule(radius_mm: {}, length_mm: {})", d(0), d(1)),
            4 => format!("Ellipsoid(semi_axes_mm: ({}, {}, {}))", d(0), d(1), d(2)),
            _ => format!("Mesh(path: \"meshes/tetra.obj\", scale: {})", 0.1 + f64::from(self.dims[0]) / 32.0),
        };
        let p = |i: usize| f64::from(self.position[i]) * 0.5; // -64 to 63.5 mm
        let object = format!(
            "mass_g: {}, friction: {}, position_mm: ({}, {}, {})",
            1.0 + f64::from(self.mass) * 4.0,
            f64::from(self.friction) / 200.0,
            p(0),
            p(1),
            p(2) - 70.0
        );
        let wall = 0.5 + f64::from(self.wall_tenths) / 20.0;
        let section = if self.half_round {
            format!("HalfRound(radius_mm: 8.0, wall_mm: {wall}, floor_mm: 2.5, under_layer_mm: 1.0)")
        } else {
            format!(
                "Box(chamber_width_mm: 14.0, chamber_height_mm: 10.0, side_wall_mm: {wall}, \
                 top_wall_mm: {wall}, floor_mm: 2.5, under_layer_mm: 1.0)"
            )
        };
        SCENE_TEMPLATE
            .replace("{SHAPE}", &shape)
            .replace(
                "{FINGERS}",
                &fingers(
                    1 + usize::from(self.fingers % 4),
                    20.0 + f64::from(self.mount_radius) / 4.0,
                    f64::from(self.tilt) / 4.0,
                ),
            )
            .replace("{SECTION}", &section)
            .replace("{OBJECT}", &object)
            .replace("{PRESSURE}", &format!("{}", f64::from(self.pressure % 61)))
    }
}

/// The grasp check of a case at one pressure, no sweep, 40 elements.
pub fn check(case: &CheckCase) {
    let text = case.scene_text();
    let Ok(scene) = scene_file::load_embedded("fuzz.ron", &text, MESHES) else { return };
    let Ok(report) = check_scene(&scene, &CheckSettings::default()) else { return };
    assert_eq!(report.objects.len(), scene.objects.len());
    for o in &report.objects {
        assert_eq!(o.verdict == Verdict::Pass, o.failures.is_empty(), "{o:?}");
        for c in &o.contacts {
            assert!(c.point.is_finite() && c.normal.is_finite(), "{c:?}");
        }
        assert!((0.0..=1.0).contains(&o.enclosure), "enclosure {}", o.enclosure);
    }
}
