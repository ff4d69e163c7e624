//! `ScenePlugin`: the meshes of the current [`ViewState`], the lights, and the actions
//! that change what is shown.
//!
//! Systems: [`apply_actions`] turns [`Action`] messages into calls on the state (the
//! core re-solves there); [`rebuild_parts`] runs only when the state changed and
//! replaces the drawn meshes; [`follow_shadows`] gives the parts bevy's standard
//! material while the sun casts shadows and the viewer's [`SurfaceMaterial`] otherwise
//! (the same lighting without the shadow lookups, see [`super::surface`]). World units
//! are millimetres in the gripper frame (`+z` up); the core's metres are converted here.

use std::collections::HashMap;

use bevy::asset::RenderAssetUsages;
use bevy::light::{CascadeShadowConfigBuilder, GlobalAmbientLight};
use bevy::mesh::{Indices, PrimitiveTopology};
use bevy::prelude::*;
use grasp_core::draw::Surface;

use super::model::{Role, ViewState};
use super::palette::{self, Rgba};
use super::surface::{SurfaceMaterial, SurfacePlugin};

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

/// Marks the entities drawn from the state (replaced on every change), with what they
/// stand for.
#[derive(Component)]
pub struct Drawn(pub Role);

/// The sun of the scene (its shadows are toggled).
#[derive(Component)]
pub struct Sun;

/// Which material the drawn parts get.
#[derive(Resource, Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Shading {
    /// The viewer's [`SurfaceMaterial`] while the sun casts no shadows, bevy's standard
    /// material while it does.
    #[default]
    Auto,
    /// Bevy's standard material always (to compare the two).
    Standard,
}

/// The two materials of a role: without and with shadows.
#[derive(Clone)]
struct RoleMaterials {
    plain: Handle<SurfaceMaterial>,
    standard: Handle<StandardMaterial>,
}

/// The materials per role, made once.
#[derive(Resource, Default)]
struct Materials(HashMap<Role, RoleMaterials>);

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
        app.add_plugins(SurfacePlugin)
            .add_message::<Action>()
            .init_resource::<Materials>()
            .init_resource::<Shading>()
            .insert_resource(ClearColor(color(palette::BACKGROUND)))
            .insert_resource(GlobalAmbientLight { brightness: 260.0, ..default() })
            .configure_sets(Update, (SceneSystems::Apply, SceneSystems::Rebuild).chain())
            .add_systems(Startup, spawn_lights)
            .add_systems(Update, apply_actions.in_set(SceneSystems::Apply))
            .add_systems(
                Update,
                // swap first: its commands reach the old parts before the rebuild despawns them
                (follow_shadows, rebuild_parts.run_if(resource_changed::<Model>))
                    .chain()
                    .in_set(SceneSystems::Rebuild),
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

/// Distance from the eye covered by the sun's shadows (mm), room to zoom out.
const SHADOW_RANGE: f32 = 3000.0;
/// Far end of the sun's first, finer shadow cascade (mm): the fitted cameras of the demo
/// scenes are 410-460 mm from their target, so the whole fitted view is in it.
const SHADOW_NEAR_RANGE: f32 = 900.0;

fn spawn_lights(mut commands: Commands) {
    commands.spawn((
        Sun,
        DirectionalLight { illuminance: 9000.0, shadow_maps_enabled: false, ..default() },
        Transform::from_xyz(250.0, -350.0, 500.0).looking_at(Vec3::ZERO, Vec3::Z),
        // world units are mm: bevy's default cascades end 150 units from the eye, closer
        // than the fitted camera, which left the S key without visible shadows
        CascadeShadowConfigBuilder {
            num_cascades: 2,
            minimum_distance: 1.0,
            first_cascade_far_bound: SHADOW_NEAR_RANGE,
            maximum_distance: SHADOW_RANGE,
            ..default()
        }
        .build(),
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

/// True when the parts get bevy's standard material: asked for, or the sun casts shadows.
fn use_standard(shading: Shading, suns: &Query<&DirectionalLight, With<Sun>>) -> bool {
    shading == Shading::Standard || suns.iter().any(|s| s.shadow_maps_enabled)
}

/// The materials of a role, made on first use.
fn role_materials(
    role: Role,
    by_role: &mut Materials,
    plain: &mut Assets<SurfaceMaterial>,
    standard: &mut Assets<StandardMaterial>,
) -> RoleMaterials {
    by_role
        .0
        .entry(role)
        .or_insert_with(|| {
            let m = SurfaceMaterial::of(color(role_color(role)));
            RoleMaterials { standard: standard.add(m.standard()), plain: plain.add(m) }
        })
        .clone()
}

/// Gives the drawn parts the material that matches the sun's shadows when they change.
#[allow(clippy::too_many_arguments)] // a bevy system: one parameter per resource
fn follow_shadows(
    mut commands: Commands,
    changed: Query<(), (With<Sun>, Changed<DirectionalLight>)>,
    suns: Query<&DirectionalLight, With<Sun>>,
    shading: Res<Shading>,
    drawn: Query<(Entity, &Drawn)>,
    mut by_role: ResMut<Materials>,
    mut plain: ResMut<Assets<SurfaceMaterial>>,
    mut standard: ResMut<Assets<StandardMaterial>>,
) {
    if changed.is_empty() && !shading.is_changed() {
        return;
    }
    let standard_material = use_standard(*shading, &suns);
    for (e, Drawn(role)) in &drawn {
        let m = role_materials(*role, &mut by_role, &mut plain, &mut standard);
        if standard_material {
            commands
                .entity(e)
                .try_remove::<MeshMaterial3d<SurfaceMaterial>>()
                .try_insert(MeshMaterial3d(m.standard));
        } else {
            commands
                .entity(e)
                .try_remove::<MeshMaterial3d<StandardMaterial>>()
                .try_insert(MeshMaterial3d(m.plain));
        }
    }
}

/// Replaces the drawn meshes with those of the current state.
#[allow(clippy::too_many_arguments)] // a bevy system: one parameter per resource
fn rebuild_parts(
    mut commands: Commands,
    model: Res<Model>,
    drawn: Query<Entity, With<Drawn>>,
    suns: Query<&DirectionalLight, With<Sun>>,
    shading: Res<Shading>,
    mut meshes: ResMut<Assets<Mesh>>,
    mut plain: ResMut<Assets<SurfaceMaterial>>,
    mut standard: ResMut<Assets<StandardMaterial>>,
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
    let standard_material = use_standard(*shading, &suns);
    for part in parts {
        let m = role_materials(part.role, &mut by_role, &mut plain, &mut standard);
        let mut e = commands.spawn((Drawn(part.role), Mesh3d(meshes.add(mesh_of(&part.surface)))));
        if standard_material {
            e.insert(MeshMaterial3d(m.standard));
        } else {
            e.insert(MeshMaterial3d(m.plain));
        }
    }
}
