//! The validated scene model: what a scene file describes, in SI units.
//!
//! The application parses the file (RON, in mm, kPa, g and degrees), validates it with
//! field paths in its messages, and builds these values; everything downstream takes a
//! [`Scene`]. Coordinate systems: the gripper frame has its origin at the centre of the
//! palm's lower face, `+z` up (away from the objects), gravity along `-z`; fingers hang
//! along `-z` (DESIGN 2).

use crate::actuator::Actuator;
use crate::material::Material;
use crate::math::Vec3;

/// A complete, validated scene.
#[derive(Debug, Clone, PartialEq)]
pub struct Scene {
    /// Scene name.
    pub name: String,
    /// Materials defined in the scene, in file order.
    pub materials: Vec<(String, Material)>,
    /// Actuator designs, in file order.
    pub actuators: Vec<Actuator>,
    /// The gripper: palm and fingers.
    pub gripper: Gripper,
    /// Target objects, in file order.
    pub objects: Vec<TargetObject>,
    /// Pass/fail criteria.
    pub criteria: Criteria,
}

impl Scene {
    /// The actuator of this name.
    pub fn actuator(&self, name: &str) -> Option<&Actuator> {
        self.actuators.iter().find(|a| a.name == name)
    }
}

/// The palm the fingers hang from.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Palm {
    /// A disk with its lower face at `z = 0`, extending up to `z = thickness`.
    Disk {
        /// Radius (m).
        radius: f64,
        /// Thickness (m).
        thickness: f64,
    },
}

/// Where one finger is mounted.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FingerMount {
    /// Index into [`Scene::actuators`].
    pub actuator: usize,
    /// Azimuth from `+x` about `+z` (rad).
    pub azimuth: f64,
    /// Radius of the mount (m): the base of the reference line sits at
    /// `(r cos a, r sin a, 0)`.
    pub radius: f64,
    /// Tilt of the unbent axis in the finger's radial plane (rad, positive = splayed
    /// away from the gripper axis).
    pub tilt: f64,
}

/// The gripper.
#[derive(Debug, Clone, PartialEq)]
pub struct Gripper {
    /// The palm.
    pub palm: Palm,
    /// The fingers, in file order.
    pub fingers: Vec<FingerMount>,
}

/// A triangle mesh (m), as loaded from a file by the application.
#[derive(Debug, Clone, PartialEq)]
pub struct TriangleMesh {
    /// Vertices (m), in the object's frame.
    pub vertices: Vec<Vec3>,
    /// Triangles as vertex indices.
    pub triangles: Vec<[u32; 3]>,
}

/// The shape of a target object, in its own frame (centred on its position).
#[derive(Debug, Clone, PartialEq)]
pub enum ObjectShape {
    /// A sphere.
    Sphere {
        /// Radius (m).
        radius: f64,
    },
    /// A box.
    Box {
        /// Edge lengths along x, y, z (m).
        size: Vec3,
    },
    /// A cylinder with its axis along z.
    Cylinder {
        /// Radius (m).
        radius: f64,
        /// Height (m).
        height: f64,
    },
    /// A capsule with its axis along z.
    Capsule {
        /// Radius (m).
        radius: f64,
        /// Length of the straight part between the two hemispheres' centres (m).
        length: f64,
    },
    /// An ellipsoid with semi-axes along x, y, z.
    Ellipsoid {
        /// Semi-axes (m).
        semi_axes: Vec3,
    },
    /// A triangle mesh.
    Mesh {
        /// The mesh, scaled to m.
        mesh: TriangleMesh,
        /// Where it came from (for messages and reports).
        source: String,
    },
}

/// One target object of the product mix.
#[derive(Debug, Clone, PartialEq)]
pub struct TargetObject {
    /// Name.
    pub name: String,
    /// Shape.
    pub shape: ObjectShape,
    /// Mass (kg).
    pub mass: f64,
    /// Coulomb friction coefficient against the finger skin.
    pub friction: f64,
    /// Position of the object's centre in the gripper frame (m).
    pub position: Vec3,
    /// Largest normal force any one contact may press on it (N); `None` = no limit.
    pub max_contact_force: Option<f64>,
}

/// A supply-pressure sweep `from..=to` in steps of `step` (Pa).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PressureSweep {
    /// First pressure (Pa).
    pub from: f64,
    /// Last pressure (Pa).
    pub to: f64,
    /// Step (Pa, > 0).
    pub step: f64,
}

impl PressureSweep {
    /// The pressures of the sweep, `to` included when it falls on the grid (within a
    /// millionth of a step).
    pub fn pressures(&self) -> Vec<f64> {
        let n = ((self.to - self.from) / self.step + 1e-6).floor() as usize;
        (0..=n).map(|i| self.from + self.step * i as f64).collect()
    }
}

/// What a grasp must achieve.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Criteria {
    /// Supply pressure (Pa).
    pub pressure: f64,
    /// Pressure sweep for the pressure windows.
    pub sweep: Option<PressureSweep>,
    /// Required holding margin (load scale) (dimensionless, >= 1).
    pub safety_factor: f64,
    /// Upward acceleration of the lift case (m/s²).
    pub lift_accel: f64,
    /// Horizontal acceleration of the lateral cases (m/s²).
    pub lateral_accel: f64,
    /// Fewest fingers that must touch the object.
    pub min_fingers_in_contact: usize,
    /// Smallest enclosure fraction (0..=1).
    pub min_enclosure: f64,
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sweep_includes_its_end_on_the_grid() {
        let s = PressureSweep { from: 0.0, to: 60e3, step: 2.5e3 };
        let p = s.pressures();
        assert_eq!(p.len(), 25);
        assert_eq!(p[24], 60e3);
        let s = PressureSweep { from: 0.0, to: 10e3, step: 3e3 };
        assert_eq!(s.pressures(), vec![0.0, 3e3, 6e3, 9e3]);
    }
}
