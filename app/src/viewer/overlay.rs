//! `OverlayPlugin`: the panel in the top left corner with the object's verdict,
//! margins, enclosure, pressure window and failed criteria (the lines of
//! [`super::model::ViewState::panel`]), rebuilt only when the state changes.

use bevy::prelude::*;
use bevy::text::FontSize;

use super::palette;
use super::scene::{Model, SceneSystems, color};

/// The panel's root node.
#[derive(Component)]
pub struct Panel;

/// The panel.
pub struct OverlayPlugin;

impl Plugin for OverlayPlugin {
    fn build(&self, app: &mut App) {
        app.add_systems(Startup, spawn_panel)
            .add_systems(Update, fill_panel.run_if(resource_changed::<Model>).after(SceneSystems::Apply));
    }
}

fn spawn_panel(mut commands: Commands) {
    commands.spawn((
        Panel,
        Node {
            position_type: PositionType::Absolute,
            left: Val::Px(10.0),
            top: Val::Px(10.0),
            max_width: Val::Px(620.0),
            padding: UiRect::all(Val::Px(8.0)),
            flex_direction: FlexDirection::Column,
            row_gap: Val::Px(2.0),
            ..default()
        },
        BackgroundColor(color(palette::PANEL)),
    ));
}

/// Replaces the panel's lines.
fn fill_panel(mut commands: Commands, model: Res<Model>, panels: Query<Entity, With<Panel>>) {
    let lines = model.0.panel();
    for panel in &panels {
        commands.entity(panel).despawn_related::<Children>();
        commands.entity(panel).with_children(|p| {
            for (text, good) in &lines {
                let c = if *good {
                    palette::PASS_TEXT
                } else if text.starts_with("FAILED") || text == "verdict: FAIL" {
                    palette::PROBLEM
                } else {
                    palette::TEXT
                };
                p.spawn((
                    Text::new(text.clone()),
                    TextFont { font_size: FontSize::Px(14.0), ..default() },
                    TextColor(color(c)),
                ));
            }
        });
    }
}
