//! Pictures with no window and no display: a bevy app without winit whose camera draws
//! into an image, driven frame by frame from here, as for `arcfinger render` and the
//! review report's pictures.
//!
//! All shots of one call share one app (bevy starts once, ~1 s of the time): for each
//! shot the state is set (the core solves the object at the pressure), the camera is
//! fitted ([`super::framing::fit`]), a few frames are drawn, and the captured frame is
//! encoded as PNG. Every wait has a frame limit, so a driver that never delivers ends in
//! an error rather than a hang.

use std::sync::{Arc, Mutex};
use std::time::Duration;

use bevy::asset::RenderAssetUsages;
use bevy::camera::RenderTarget;
use bevy::image::Image;
use bevy::prelude::*;
use bevy::render::RenderPlugin;
use bevy::render::render_resource::{Extent3d, PollType, TextureDimension, TextureFormat, TextureUsages};
use bevy::render::renderer::RenderDevice;
use bevy::render::view::Msaa;
use bevy::render::view::screenshot::{Screenshot, ScreenshotCaptured};
use bevy::window::ExitCondition;
use bevy::winit::WinitPlugin;
use grasp_core::check::CheckSettings;
use grasp_core::scene::Scene;

use super::camera::projection;
use super::framing::{self, CameraPose, View};
use super::model::ViewState;
use super::scene::{Model, Shading};
use super::{ViewerPlugins, probe};
use crate::error::AppError;

/// One picture to take.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Shot {
    /// Scene (index into the scenes given to [`render`]).
    pub scene: usize,
    /// Object held (index).
    pub object: usize,
    /// Supply pressure (Pa).
    pub pressure: f64,
    /// Where from.
    pub view: View,
}

/// A taken picture.
pub struct Picture {
    /// The PNG file's bytes.
    pub png: Vec<u8>,
    /// The camera it was taken with (mm, gripper frame).
    pub camera: CameraPose,
    /// The object's verdict at the pressure (`"pass"`, `"fail"`, or `"unknown"`).
    pub verdict: &'static str,
}

/// Frames drawn before a capture is asked for (meshes spawned, pipelines ready).
const SETTLE_FRAMES: usize = 3;
/// Frames to wait for a capture to arrive.
const CAPTURE_FRAMES: usize = 60;
/// Longest wait for the GPU (or the CPU driver) to finish a frame.
const FRAME_TIMEOUT: Duration = Duration::from_secs(60);

/// Encodes a captured frame as an 8-bit RGBA PNG.
///
/// # Errors
/// A frame in a format that cannot be converted.
pub fn encode_png(image: &Image) -> Result<Vec<u8>, String> {
    let rgba = image.clone().try_into_dynamic().map_err(|e| format!("captured frame: {e}"))?.to_rgba8();
    let (w, h) = rgba.dimensions();
    let mut out = Vec::new();
    {
        let mut enc = png::Encoder::new(&mut out, w, h);
        enc.set_color(png::ColorType::Rgba);
        enc.set_depth(png::BitDepth::Eight);
        let mut writer = enc.write_header().map_err(|e| e.to_string())?;
        writer.write_image_data(rgba.as_raw()).map_err(|e| e.to_string())?;
    }
    Ok(out)
}

/// Renders `shots` of `scenes` at `size` pixels.
///
/// # Errors
/// No Vulkan adapter (exit 2, naming the packages), a scene or object index out of
/// range, or a frame that never arrives.
pub fn render(
    scenes: &[&Scene],
    settings: &CheckSettings,
    shots: &[Shot],
    size: (u32, u32),
) -> Result<Vec<Picture>, AppError> {
    render_shaded(scenes, settings, shots, size, Shading::Auto)
}

/// [`render`] with the parts' material chosen by `shading`.
fn render_shaded(
    scenes: &[&Scene],
    settings: &CheckSettings,
    shots: &[Shot],
    size: (u32, u32),
    shading: Shading,
) -> Result<Vec<Picture>, AppError> {
    if shots.iter().any(|s| scenes.get(s.scene).is_none_or(|sc| s.object >= sc.objects.len())) {
        return Err(AppError::input("render: scene or object index out of range"));
    }
    probe::vulkan_adapter()?;
    let first = shots.first().ok_or_else(|| AppError::input("render: nothing to render"))?;
    let mut app = App::new();
    app.add_plugins(
        DefaultPlugins
            .set(WindowPlugin { primary_window: None, exit_condition: ExitCondition::DontExit, ..default() })
            .set(RenderPlugin { synchronous_pipeline_compilation: true, ..default() })
            .disable::<WinitPlugin>()
            .disable::<bevy::log::LogPlugin>(),
    )
    .add_plugins(ViewerPlugins { overlay: false })
    .insert_resource(shading)
    .insert_resource(Model(ViewState::new(
        scenes[first.scene].clone(),
        *settings,
        first.object,
        first.pressure,
    )));
    app.finish();
    app.cleanup();
    let mut target = Image::new_uninit(
        Extent3d { width: size.0, height: size.1, depth_or_array_layers: 1 },
        TextureDimension::D2,
        TextureFormat::Rgba8UnormSrgb,
        RenderAssetUsages::RENDER_WORLD,
    );
    target.texture_descriptor.usage |= TextureUsages::RENDER_ATTACHMENT | TextureUsages::COPY_SRC;
    let handle = app.world_mut().resource_mut::<Assets<Image>>().add(target);
    let camera = app
        .world_mut()
        .spawn((Camera3d::default(), RenderTarget::from(handle.clone()), projection(), Msaa::Sample4))
        .id();
    let aspect = f64::from(size.0) / f64::from(size.1);
    let mut pictures = Vec::with_capacity(shots.len());
    let mut shown = first.scene;
    for shot in shots {
        if shot.scene != shown {
            let state = ViewState::new(scenes[shot.scene].clone(), *settings, shot.object, shot.pressure);
            app.world_mut().insert_resource(Model(state));
            shown = shot.scene;
        }
        let verdict = {
            let mut model = app.world_mut().resource_mut::<Model>();
            let m = &mut model.0;
            if m.object != shot.object || m.pressure != shot.pressure {
                m.object = shot.object;
                m.pressure = shot.pressure;
                m.solve();
            }
            match &m.solved {
                Ok(s) => s.report.verdict.name(),
                Err(_) => "unknown",
            }
        };
        let (lo, hi) = app.world().resource::<Model>().0.bounds();
        let pose = framing::fit((lo * 1e3).to_array(), (hi * 1e3).to_array(), shot.view, aspect);
        let eye = Vec3::new(pose.eye[0] as f32, pose.eye[1] as f32, pose.eye[2] as f32);
        let target = Vec3::new(pose.target[0] as f32, pose.target[1] as f32, pose.target[2] as f32);
        let up = Vec3::new(pose.up[0] as f32, pose.up[1] as f32, pose.up[2] as f32);
        app.world_mut().entity_mut(camera).insert(Transform::from_translation(eye).looking_at(target, up));
        for _ in 0..SETTLE_FRAMES {
            frame(&mut app)?;
        }
        let captured: Arc<Mutex<Option<Image>>> = Arc::new(Mutex::new(None));
        let slot = captured.clone();
        app.world_mut().spawn(Screenshot::image(handle.clone())).observe(
            move |frame: On<ScreenshotCaptured>| {
                if let Ok(mut s) = slot.lock() {
                    *s = Some(frame.image.clone());
                }
            },
        );
        let mut image = None;
        for _ in 0..CAPTURE_FRAMES {
            frame(&mut app)?;
            if let Some(i) = captured.lock().ok().and_then(|mut s| s.take()) {
                image = Some(i);
                break;
            }
        }
        let image = image.ok_or_else(|| {
            AppError::input(format!(
                "render: no frame arrived after {CAPTURE_FRAMES} frames; {}",
                probe::INSTALL_HINT
            ))
        })?;
        let png = encode_png(&image).map_err(AppError::input)?;
        pictures.push(Picture { png, camera: pose, verdict });
    }
    Ok(pictures)
}

/// One update of the app, then a wait until the device has finished it.
fn frame(app: &mut App) -> Result<(), AppError> {
    app.update();
    app.world()
        .resource::<RenderDevice>()
        .wgpu_device()
        .poll(PollType::Wait { submission_index: None, timeout: Some(FRAME_TIMEOUT) })
        .map_err(|e| AppError::input(format!("render: the frame did not finish: {e}")))?;
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    fn decode(png_bytes: &[u8]) -> (u32, u32, Vec<u8>) {
        let mut reader = png::Decoder::new(std::io::Cursor::new(png_bytes)).read_info().expect("a PNG");
        let mut buf = vec![0; reader.output_buffer_size().expect("buffer size")];
        let info = reader.next_frame(&mut buf).expect("a frame");
        buf.truncate(info.buffer_size());
        (info.width, info.height, buf)
    }

    /// The viewer's material draws what bevy's standard material draws with shadows off:
    /// the same lighting functions, only the shadow lookups left out. The picture holds
    /// palm, fingers, fiber winding, object and contact arrows.
    #[test]
    fn viewer_material_draws_what_the_standard_material_draws() {
        if let Err(e) = probe::vulkan_adapter() {
            assert!(
                std::env::var_os("ARCFINGER_REQUIRE_VIEWER").is_none(),
                "ARCFINGER_REQUIRE_VIEWER is set but this machine cannot render: {e}"
            );
            eprintln!("note: no Vulkan adapter, material comparison not run: {e}");
            return;
        }
        let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../scenes/packing-line-3f.ron");
        let scene = crate::scene_file::load(&root).expect("the demo scene loads");
        let shot = Shot { scene: 0, object: 0, pressure: 100e3, view: View::Iso };
        let settings = CheckSettings::default();
        let take = |shading| {
            let mut p = render_shaded(&[&scene], &settings, &[shot], (320, 240), shading).expect("rendered");
            decode(&p.remove(0).png)
        };
        let (w, h, plain) = take(Shading::Auto);
        let (w2, h2, standard) = take(Shading::Standard);
        assert_eq!((w, h), (w2, h2));
        // the picture is not the background alone: at least 5 % of it differs from the
        // corner pixel
        let corner = &plain[..3];
        let drawn =
            plain.chunks(4).filter(|p| p[..3].iter().zip(corner).any(|(a, b)| a.abs_diff(*b) > 8)).count();
        assert!(drawn * 20 > (w * h) as usize, "only {drawn} pixels drawn");
        // the same shader functions in another order may round differently: one step of
        // 8-bit colour
        let worst = plain.iter().zip(&standard).map(|(a, b)| a.abs_diff(*b)).max().unwrap_or(0);
        assert!(worst <= 1, "pictures differ by up to {worst} in a channel");
    }
}
