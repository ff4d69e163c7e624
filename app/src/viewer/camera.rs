//! `CameraPlugin`: the orbit camera. Left drag turns about the target, right (or
//! middle) drag pans, the wheel zooms; [`Action::ResetView`] goes back to the fitted
//! view; MSAA and shadows are toggled here (both off by default: software rendering).
//!
//! The camera's state is the [`Orbit`] component; [`place_camera`] turns it into the
//! transform only when it changed.

use bevy::input::mouse::{AccumulatedMouseMotion, AccumulatedMouseScroll, MouseScrollUnit};
use bevy::prelude::*;
use bevy::render::view::Msaa;

use super::framing::{CameraPose, FOV_Y};
use super::scene::{Action, SceneSystems, Sun};

/// An orbit about `target` (mm): the eye at `distance` along
/// `(cos pitch cos yaw, cos pitch sin yaw, sin pitch)`, `+z` up.
#[derive(Component, Debug, Clone, Copy, PartialEq)]
pub struct Orbit {
    /// Point looked at (mm).
    pub target: Vec3,
    /// Azimuth of the eye (rad, from `+x` about `+z`).
    pub yaw: f32,
    /// Elevation of the eye (rad).
    pub pitch: f32,
    /// Eye distance (mm).
    pub distance: f32,
    /// The fitted view, for reset.
    pub home: (Vec3, f32, f32, f32),
}

/// Highest elevation (rad): just short of straight up or down, where `+z` stops being
/// a usable up direction.
const PITCH_LIMIT: f32 = 1.55;

impl Orbit {
    /// The orbit of a fitted camera.
    pub fn of_pose(pose: &CameraPose) -> Self {
        let target = Vec3::new(pose.target[0] as f32, pose.target[1] as f32, pose.target[2] as f32);
        let d = [pose.eye[0] - pose.target[0], pose.eye[1] - pose.target[1], pose.eye[2] - pose.target[2]];
        let yaw = d[1].atan2(d[0]) as f32;
        let pitch = ((d[2] / pose.distance).clamp(-1.0, 1.0).asin() as f32).clamp(-PITCH_LIMIT, PITCH_LIMIT);
        let distance = pose.distance as f32;
        Self { target, yaw, pitch, distance, home: (target, yaw, pitch, distance) }
    }

    /// The camera transform.
    pub fn transform(&self) -> Transform {
        let (sy, cy) = self.yaw.sin_cos();
        let (sp, cp) = self.pitch.sin_cos();
        let eye = self.target + self.distance * Vec3::new(cp * cy, cp * sy, sp);
        Transform::from_translation(eye).looking_at(self.target, Vec3::Z)
    }
}

/// The perspective of every camera: [`FOV_Y`], aspect from the target.
pub fn projection() -> Projection {
    let near = 1.0;
    Projection::Perspective(PerspectiveProjection {
        fov: FOV_Y as f32,
        near,
        far: 50_000.0,
        near_clip_plane: Vec4::new(0.0, 0.0, -1.0, -near),
        ..default()
    })
}

/// The orbit camera.
pub struct CameraPlugin;

impl Plugin for CameraPlugin {
    fn build(&self, app: &mut App) {
        app.add_systems(
            Update,
            // before the rebuild: the parts' materials follow the shadow toggle there
            (orbit_with_mouse, camera_actions, place_camera)
                .chain()
                .after(SceneSystems::Apply)
                .before(SceneSystems::Rebuild),
        );
    }
}

/// Mouse drags and the wheel move the orbit.
fn orbit_with_mouse(
    buttons: Res<ButtonInput<MouseButton>>,
    motion: Res<AccumulatedMouseMotion>,
    scroll: Res<AccumulatedMouseScroll>,
    mut orbits: Query<&mut Orbit>,
) {
    let d = motion.delta;
    let wheel = match scroll.unit {
        MouseScrollUnit::Line => scroll.delta.y,
        MouseScrollUnit::Pixel => scroll.delta.y / 40.0,
    };
    if d == Vec2::ZERO && wheel == 0.0 {
        return;
    }
    for mut o in &mut orbits {
        if buttons.pressed(MouseButton::Left) && d != Vec2::ZERO {
            o.yaw -= d.x * 0.008;
            o.pitch = (o.pitch + d.y * 0.008).clamp(-PITCH_LIMIT, PITCH_LIMIT);
        } else if (buttons.pressed(MouseButton::Right) || buttons.pressed(MouseButton::Middle))
            && d != Vec2::ZERO
        {
            let t = o.transform();
            let scale = o.distance * 0.0015;
            let shift = (-d.x * t.right().as_vec3() + d.y * t.up().as_vec3()) * scale;
            o.target += shift;
        }
        if wheel != 0.0 {
            o.distance = (o.distance * (1.0 - 0.1 * wheel.clamp(-5.0, 5.0))).clamp(20.0, 20_000.0);
        }
    }
}

/// Reset view, MSAA and shadow toggles.
fn camera_actions(
    mut actions: MessageReader<Action>,
    mut cams: Query<(&mut Orbit, &mut Msaa)>,
    mut suns: Query<&mut DirectionalLight, With<Sun>>,
) {
    for a in actions.read() {
        match a {
            Action::ResetView => {
                for (mut o, _) in &mut cams {
                    let (t, y, p, d) = o.home;
                    (o.target, o.yaw, o.pitch, o.distance) = (t, y, p, d);
                }
            }
            Action::ToggleMsaa => {
                for (_, mut m) in &mut cams {
                    *m = if *m == Msaa::Off { Msaa::Sample4 } else { Msaa::Off };
                }
            }
            Action::ToggleShadows => {
                for mut s in &mut suns {
                    s.shadow_maps_enabled = !s.shadow_maps_enabled;
                }
            }
            _ => {}
        }
    }
}

/// Moves the camera when its orbit changed.
fn place_camera(mut cams: Query<(&Orbit, &mut Transform), Changed<Orbit>>) {
    for (o, mut t) in &mut cams {
        *t = o.transform();
    }
}
