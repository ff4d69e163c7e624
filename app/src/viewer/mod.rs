//! The 3-D viewer and the offscreen renderer (cargo feature `viewer`, bevy 0.19).
//!
//! The viewer holds no physics: [`model::ViewState`] asks `grasp-core` for the object's
//! result at a pressure (the grasp check's own evaluation) and for the surfaces to draw;
//! the bevy side only copies them into meshes and text.
//!
//! Module map:
//! - [`model`], [`framing`], [`palette`]: no bevy. What is shown, the camera that fits
//!   it, the colours.
//! - [`scene`]: `ScenePlugin`, the meshes of the current [`model::ViewState`] (rebuilt
//!   only when it changes), lights, and the [`scene::Action`]s that change it.
//! - [`surface`]: the parts' material while shadows are off (bevy's lighting without the
//!   shadow lookups that a CPU rasterizer pays for on every pixel).
//! - [`camera`]: `CameraPlugin`, the orbit camera (mouse), reset, MSAA and shadows.
//! - [`overlay`]: `OverlayPlugin`, the panel with verdict, margins, window, failures.
//! - [`window`]: the interactive viewer (keys, reactive redraw, scripted steps).
//! - [`offscreen`]: pictures with no window and no display (`render`, `review`).
//! - [`probe`]: finds a Vulkan adapter (with a timeout) before bevy starts.

pub mod camera;
pub mod framing;
pub mod model;
pub mod offscreen;
pub mod overlay;
pub mod palette;
pub mod probe;
pub mod scene;
pub mod surface;
pub mod window;

use bevy::app::{PluginGroup, PluginGroupBuilder};

/// The viewer's own plugins: scene, camera, overlay.
pub struct ViewerPlugins {
    /// Draw the panel (the offscreen pictures leave it out).
    pub overlay: bool,
}

impl PluginGroup for ViewerPlugins {
    fn build(self) -> PluginGroupBuilder {
        let g = PluginGroupBuilder::start::<Self>().add(scene::ScenePlugin).add(camera::CameraPlugin);
        if self.overlay { g.add(overlay::OverlayPlugin) } else { g }
    }
}
