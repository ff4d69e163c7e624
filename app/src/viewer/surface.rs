//! The material of the drawn parts while shadows are off (the default): bevy's own
//! lighting of a rough dielectric (`surface.wgsl`), without the standard material's
//! shadow-map lookups and light-cluster loops.
//!
//! Why: Mesa's CPU rasterizer evaluates both sides of every branch and each loop body at
//! least once, so the standard material's shader sampled the shadow maps of every light
//! kind on every pixel even with shadows off; that was most of the frame time at
//! 1280x720. With shadows on, the parts get the standard material again (see
//! `scene.rs`), so the shadows are bevy's own.

use bevy::asset::{AssetPath, embedded_asset, embedded_path};
use bevy::prelude::*;
use bevy::render::render_resource::AsBindGroup;
use bevy::shader::ShaderRef;

/// Perceptual roughness of every drawn part (matte silicone, painted palm, fruit).
pub const ROUGHNESS: f32 = 0.75;
/// Reflectance of every drawn part: bevy's default, 4 % at normal incidence.
pub const REFLECTANCE: f32 = 0.5;

/// A flat-coloured, lit surface.
#[derive(Asset, TypePath, AsBindGroup, Debug, Clone)]
pub struct SurfaceMaterial {
    /// Linear colour and alpha.
    #[uniform(0)]
    pub base_color: LinearRgba,
    /// Perceptual roughness, reflectance, 1 when alpha-blended, unused.
    #[uniform(0)]
    pub params: Vec4,
    /// Opaque or blended.
    pub alpha_mode: AlphaMode,
}

impl SurfaceMaterial {
    /// The surface of a colour; see-through (blended) when its alpha is below 1.
    pub fn of(color: Color) -> Self {
        let base_color = color.to_linear();
        let blend = base_color.alpha < 1.0;
        Self {
            base_color,
            params: Vec4::new(ROUGHNESS, REFLECTANCE, if blend { 1.0 } else { 0.0 }, 0.0),
            alpha_mode: if blend { AlphaMode::Blend } else { AlphaMode::Opaque },
        }
    }

    /// The standard material that looks the same (used while shadows are on).
    pub fn standard(&self) -> StandardMaterial {
        StandardMaterial {
            base_color: self.base_color.into(),
            perceptual_roughness: self.params.x,
            reflectance: self.params.y,
            alpha_mode: self.alpha_mode,
            ..default()
        }
    }
}

impl Material for SurfaceMaterial {
    fn fragment_shader() -> ShaderRef {
        ShaderRef::Path(AssetPath::from_path_buf(embedded_path!("surface.wgsl")).with_source("embedded"))
    }

    fn alpha_mode(&self) -> AlphaMode {
        self.alpha_mode
    }
}

/// Registers the material and embeds its shader in the binary.
pub struct SurfacePlugin;

impl Plugin for SurfacePlugin {
    fn build(&self, app: &mut App) {
        embedded_asset!(app, "surface.wgsl");
        app.add_plugins(MaterialPlugin::<SurfaceMaterial>::default());
    }
}
