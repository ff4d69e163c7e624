//! The scene file's schema (DESIGN 4.2), as serde types.
//!
//! These mirror the file exactly, in file units (mm, kPa, g, degrees, with the unit in
//! each field name). `scene_file` parses them, validates them with field paths and
//! converts them to the SI model of `grasp_core::scene`. Every struct denies unknown
//! fields so a misspelt field is an error (with the nearest valid name suggested), not a
//! silently ignored line. Maps keep file order and refuse duplicate keys.

use serde::{Deserialize, Serialize};

use crate::ordered_map::OrderedMap;

/// `Scene(...)`, the top level.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename = "Scene", deny_unknown_fields)]
pub struct SceneDoc {
    /// Scene name.
    pub name: String,
    /// Materials by name.
    #[serde(default)]
    pub materials: OrderedMap<MaterialDoc>,
    /// Actuator designs by name.
    pub actuators: OrderedMap<ActuatorDoc>,
    /// The gripper.
    pub gripper: GripperDoc,
    /// Target objects.
    pub objects: Vec<ObjectDoc>,
    /// Pass/fail criteria.
    pub criteria: CriteriaDoc,
}

/// A material block.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MaterialDoc {
    /// Constitutive model.
    pub model: MaterialModelDoc,
    /// Density (g/cm³).
    pub density_g_cm3: f64,
    /// Elongation at break as a strain (9.0 = 900 %); the stretch at break is `1 + this`.
    pub elongation_at_break: f64,
}

/// One Ogden term in the file.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct OgdenTermDoc {
    /// `mu_k` (kPa), Ogden's own convention (`mu = 1/2 sum mu_k alpha_k`).
    pub mu_kpa: f64,
    /// `alpha_k`.
    pub alpha: f64,
}

/// The constitutive model of a material block.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum MaterialModelDoc {
    /// `NeoHookean(mu_kpa: ..)`.
    NeoHookean {
        /// Shear modulus (kPa).
        mu_kpa: f64,
    },
    /// `MooneyRivlin(c10_kpa: .., c01_kpa: ..)`.
    MooneyRivlin {
        /// C10 (kPa).
        c10_kpa: f64,
        /// C01 (kPa).
        c01_kpa: f64,
    },
    /// `Yeoh(c10_kpa: .., c20_kpa: .., c30_kpa: ..)`; c20 and c30 default to 0.
    Yeoh {
        /// C10 (kPa).
        c10_kpa: f64,
        /// C20 (kPa).
        #[serde(default)]
        c20_kpa: f64,
        /// C30 (kPa).
        #[serde(default)]
        c30_kpa: f64,
    },
    /// `Ogden(terms: [(mu_kpa: .., alpha: ..), ..])`.
    Ogden {
        /// The terms.
        terms: Vec<OgdenTermDoc>,
    },
}

/// Which moment balance an actuator uses.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Serialize, Deserialize)]
pub enum SectionModelDoc {
    /// Plain moment balance.
    Baseline,
    /// With the through-thickness wall pressure (default).
    #[default]
    WallPressure,
}

/// An actuator block.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ActuatorDoc {
    /// A key of `materials`, or a built-in class name.
    pub material: String,
    /// Chamber (bending) length (mm).
    pub chamber_length_mm: f64,
    /// Straight passive base in the hub (mm).
    pub base_length_mm: f64,
    /// Straight tip cap (mm).
    pub tip_length_mm: f64,
    /// Chamber profile.
    pub section: SectionDoc,
    /// Fiber winding.
    pub fiber: FiberDoc,
    /// Rated maximum pressure (kPa).
    pub max_pressure_kpa: f64,
    /// Moment balance (default `WallPressure`).
    #[serde(default)]
    pub section_model: SectionModelDoc,
}

/// A chamber profile.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum SectionDoc {
    /// Rectangular chamber.
    Box {
        /// Chamber width (mm).
        chamber_width_mm: f64,
        /// Chamber height (mm).
        chamber_height_mm: f64,
        /// Side walls (mm).
        side_wall_mm: f64,
        /// Top wall (mm).
        top_wall_mm: f64,
        /// Floor between layer and chamber (mm).
        floor_mm: f64,
        /// Rubber below the layer (mm).
        under_layer_mm: f64,
    },
    /// Semicircular chamber.
    HalfRound {
        /// Chamber radius (mm).
        radius_mm: f64,
        /// Wall (mm).
        wall_mm: f64,
        /// Floor (mm).
        floor_mm: f64,
        /// Rubber below the layer (mm).
        under_layer_mm: f64,
    },
}

/// The fiber winding.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FiberDoc {
    /// Pitch of one helix (mm).
    pub pitch_mm: f64,
    /// Thread or ribbon width (mm).
    pub width_mm: f64,
}

/// The gripper block.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct GripperDoc {
    /// Palm shape.
    pub palm: PalmDoc,
    /// Finger mounts.
    pub fingers: Vec<FingerDoc>,
}

/// The palm.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum PalmDoc {
    /// A disk.
    Disk {
        /// Radius (mm).
        radius_mm: f64,
        /// Thickness (mm).
        thickness_mm: f64,
    },
}

/// One finger mount.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct FingerDoc {
    /// Actuator name.
    pub actuator: String,
    /// Azimuth from +x about +z (deg).
    pub azimuth_deg: f64,
    /// Mount radius (mm).
    pub radius_mm: f64,
    /// Tilt, positive = splayed outward (deg).
    pub tilt_deg: f64,
}

/// A target object.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ObjectDoc {
    /// Name (unique).
    pub name: String,
    /// Shape.
    pub shape: ShapeDoc,
    /// Mass (g).
    pub mass_g: f64,
    /// Coulomb friction coefficient.
    pub friction: f64,
    /// Centre in the gripper frame (mm).
    pub position_mm: (f64, f64, f64),
    /// Largest normal force per contact (N), `None` = no limit.
    #[serde(default)]
    pub max_contact_force_n: Option<f64>,
}

/// An object shape.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum ShapeDoc {
    /// `Sphere(radius_mm: ..)`.
    Sphere {
        /// Radius (mm).
        radius_mm: f64,
    },
    /// `Box(size_mm: (x, y, z))`.
    Box {
        /// Edge lengths (mm).
        size_mm: (f64, f64, f64),
    },
    /// `Cylinder(radius_mm: .., height_mm: ..)`, axis along z.
    Cylinder {
        /// Radius (mm).
        radius_mm: f64,
        /// Height (mm).
        height_mm: f64,
    },
    /// `Capsule(radius_mm: .., length_mm: ..)`, axis along z.
    Capsule {
        /// Radius (mm).
        radius_mm: f64,
        /// Straight length between the hemisphere centres (mm).
        length_mm: f64,
    },
    /// `Ellipsoid(semi_axes_mm: (a, b, c))`.
    Ellipsoid {
        /// Semi-axes (mm).
        semi_axes_mm: (f64, f64, f64),
    },
    /// `Mesh(path: "meshes/part.stl", scale: 1.0)`: STL or OBJ, path relative to the
    /// scene file, coordinates in mm times `scale`.
    Mesh {
        /// Path relative to the scene file.
        path: String,
        /// Scale applied to the file's coordinates (default 1).
        #[serde(default = "one")]
        scale: f64,
    },
}

fn one() -> f64 {
    1.0
}

/// The criteria block.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct CriteriaDoc {
    /// Supply pressure (kPa).
    pub pressure_kpa: f64,
    /// `Some((from, to, step))` (kPa) or `None`.
    #[serde(default)]
    pub sweep_kpa: Option<(f64, f64, f64)>,
    /// Required holding margin.
    pub safety_factor: f64,
    /// Lift acceleration (m/s²).
    pub lift_accel_m_s2: f64,
    /// Lateral acceleration (m/s²).
    pub lateral_accel_m_s2: f64,
    /// Fewest fingers in contact.
    pub min_fingers_in_contact: u32,
    /// Smallest enclosure fraction.
    pub min_enclosure: f64,
}

#[cfg(test)]
mod tests {
    use super::*;

    /// DESIGN 4.2's complete example parses into the schema.
    #[test]
    fn design_example_parses() {
        let text = include_str!("../../tests/data/design-example.ron");
        let doc: SceneDoc = ron::from_str(text).unwrap();
        assert_eq!(doc.actuators.keys().count(), 1);
        assert_eq!(doc.gripper.fingers.len(), 3);
        assert_eq!(doc.materials.get("soft-00-30").unwrap().density_g_cm3, 1.07);
        assert_eq!(doc.criteria.sweep_kpa, Some((0.0, 60.0, 2.5)));
    }

    /// The fit output contract of DESIGN 4.3: the model enum as serde writes it.
    #[test]
    fn model_enum_serialises_as_design_says() {
        let m = MaterialModelDoc::Ogden { terms: vec![OgdenTermDoc { mu_kpa: 630.0, alpha: 1.3 }] };
        assert_eq!(
            serde_json::to_string(&m).unwrap(),
            r#"{"Ogden":{"terms":[{"mu_kpa":630.0,"alpha":1.3}]}}"#
        );
    }
}
