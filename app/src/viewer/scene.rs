//! `ScenePlugin`: the meshes of the current [`ViewState`], the lights, and the actions
//! that change what is shown.
//!
//! Systems: [`apply_actions`] turns [`Action`] messages into calls on the state (the
//! core re-solves there); [`rebuild_parts`] runs only when the state changed and
//! replaces the drawn meshes. World units are millimetres in the gripper frame (`+z`
//! up); the core's metres are converted here.

use std::collections::HashMap;

use bevy::asset::RenderAssetUsages;
use bevy::light::GlobalAmbientLight;
use bevy::mesh::{Indices, PrimitiveTopology};
use bevy::prelude::*;
use grasp_core::draw::Surface;

use super::model::{Role, ViewState};
use super::palette::{self, Rgba};

/// The state shown.
#[derive(Resource)]
pub struct Model(pub ViewState);

/// Something the user (or a script) asks for.
#[derive(Message, Debug, Clone, Copy, PartialEq, Eq)]
pub enum Action {
    /// Step the pressure by this many steps.
    Pressure(i32),
    /// Next (+1) or previous (-1) object.
    Object(i32),
    /// Contact markers and force arrows on or off.
    ToggleForces,
    /// The fiber winding on or off.
    ToggleFibers,
    /// The rest of the object set on or off.
    ToggleObjectSet,
    /// Shadows on or off.
    ToggleShadows,
    /// MSAA on or off.
    ToggleMsaa,
    /// Back to the fitted view.
    ResetView,
}

/// Marks the entities drawn from the state (replaced on every change).
#[derive(Component)]
pub struct Drawn;

/// The sun of the scene (its shadows are toggled).
#[derive(Component)]
pub struct Sun;

/// One material per role, made once.
#[derive(Resource, Default)]
struct Materials(HashMap<Role, Handle<StandardMaterial>>);

/// System sets of the scene, in order.
#[derive(SystemSet, Debug, Clone, PartialEq, Eq, Hash)]
pub enum SceneSystems {
    /// Actions change the state.
    Apply,
    /// Meshes follow the state.
    Rebuild,
}

/// Meshes, lights and state actions.
pub struct ScenePlugin;

impl Plugin for ScenePlugin {
    fn build(&self, app: &mut App) {
        app.add_message::<Action>()
            .init_resource::<Materials>()
            .insert_resource(ClearColor(color(palette::BACKGROUND)))
            .insert_resource(GlobalAmbientLight { brightness: 260.0, ..default() })
            .configure_sets(Update, (SceneSystems::Apply, SceneSystems::Rebuild).chain())
            .add_systems(Startup, spawn_lights)
            .add_systems(Update, apply_actions.in_set(SceneSystems::Apply))
            .add_systems(
                Update,
                rebuild_parts.run_if(resource_changed::<Model>).in_set(SceneSystems::Rebuild),
            );
    }
}

/// A palette colour as a bevy colour.
pub fn color(c: Rgba) -> Color {
    Color::srgba(c[0], c[1], c[2], c[3])
}

fn role_color(role: Role) -> Rgba {
    match role {
        Role::Palm => palette::PALM,
        Role::Finger { flagged: false } => palette::FINGER,
        Role::Finger { flagged: true } | Role::Object { flagged: true } | Role::Force { flagged: true } => {
            palette::PROBLEM
        }
        Role::Fiber => palette::FIBER,
        Role::Object { flagged: false } => palette::OBJECT,
        Role::OtherObject => palette::OTHER_OBJECT,
        Role::Force { flagged: false } => palette::FORCE,
    }
}

/// A core surface (m) as a bevy mesh (mm).
pub fn mesh_of(surface: &Surface) -> Mesh {
    let positions: Vec<[f32; 3]> =
        surface.positions.iter().map(|p| (*p * 1e3).as_vec3().to_array()).collect();
    let normals: Vec<[f32; 3]> = surface.normals.iter().map(|n| n.as_vec3().to_array()).collect();
    Mesh::new(PrimitiveTopology::TriangleList, RenderAssetUsages::default())
        .with_inserted_attribute(Mesh::ATTRIBUTE_POSITION, positions)
        .with_inserted_attribute(Mesh::ATTRIBUTE_NORMAL, normals)
        .with_inserted_indices(Indices::U32(surface.indices.clone()))
}

fn spawn_lights(mut commands: Commands) {
    commands.spawn((
        Sun,
        DirectionalLight { illuminance: 9000.0, shadow_maps_enabled: false, ..default() },
        Transform::from_xyz(250.0, -350.0, 500.0).looking_at(Vec3::ZERO, Vec3::Z),
    ));
    // a weaker fill from the other side and below, so the undersides are not black
    commands.spawn((
        DirectionalLight { illuminance: 2500.0, shadow_maps_enabled: false, ..default() },
        Transform::from_xyz(-300.0, 250.0, -300.0).looking_at(Vec3::ZERO, Vec3::Z),
    ));
}

/// Applies the state's actions; the others are for the camera.
pub fn apply_actions(mut actions: MessageReader<Action>, mut model: ResMut<Model>) {
    for a in actions.read() {
        let m = &mut model.bypass_change_detection().0;
        let changed = match *a {
            Action::Pressure(k) => m.step_pressure(k),
            Action::Object(k) => m.cycle_object(k),
            Action::ToggleForces => {
                m.toggles.forces = !m.toggles.forces;
                true
            }
            Action::ToggleFibers => {
                m.toggles.fibers = !m.toggles.fibers;
                true
            }
            Action::ToggleObjectSet => {
                m.toggles.object_set = !m.toggles.object_set;
                true
            }
            Action::ToggleShadows | Action::ToggleMsaa | Action::ResetView => false,
        };
        if changed {
            model.set_changed();
        }
    }
}

/// Replaces the drawn meshes with those of the current state.
fn rebuild_parts(
    mut commands: Commands,
    model: Res<Model>,
    drawn: Query<Entity, With<Drawn>>,
    mut meshes: ResMut<Assets<Mesh>>,
    mut materials: ResMut<Assets<StandardMaterial>>,
    mut by_role: ResMut<Materials>,
) {
    for e in &drawn {
        commands.entity(e).despawn();
    }
    let parts = match model.0.parts() {
        Ok(p) => p,
        Err(e) => {
            error!("cannot draw the scene: {e}");
            return;
        }
    };
    for part in parts {
        let material = by_role
            .0
            .entry(part.role)
            .or_insert_with(|| {
                let c = role_color(part.role);
                materials.add(StandardMaterial {
                    base_color: color(c),
                    perceptual_roughness: 0.75,
                    alpha_mode: if c[3] < 1.0 { AlphaMode::Blend } else { AlphaMode::Opaque },
                    ..default()
                })
            })
            .clone();
        commands.spawn((Drawn, Mesh3d(meshes.add(mesh_of(&part.surface))), MeshMaterial3d(material)));
    }
}
