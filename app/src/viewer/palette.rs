//! The viewer's colours: chosen for contrast on a dark background and to stay apart for
//! the common colour-vision deficiencies (blue against orange carries the main
//! distinction, problems are a saturated magenta and are also named in the panel).
//! sRGB components in 0..1 with opacity last (the renderer converts them to linear light).

/// An sRGB colour with opacity.
pub type Rgba = [f32; 4];

/// Background.
pub const BACKGROUND: Rgba = srgb(0.10, 0.11, 0.13);
/// The palm.
pub const PALM: Rgba = srgb(0.50, 0.52, 0.55);
/// A finger.
pub const FINGER: Rgba = srgb(0.56, 0.70, 0.88);
/// A finger that interferes with another.
pub const PROBLEM: Rgba = srgb(0.86, 0.20, 0.60);
/// The fiber winding.
pub const FIBER: Rgba = srgb(0.10, 0.18, 0.40);
/// The object looked at.
pub const OBJECT: Rgba = srgb(0.95, 0.60, 0.12);
/// The other objects of the set (see-through).
pub const OTHER_OBJECT: Rgba = [0.80, 0.80, 0.80, 0.22];
/// Contact markers and force arrows under the object's limit.
pub const FORCE: Rgba = srgb(0.95, 0.95, 0.92);
/// Panel text.
pub const TEXT: Rgba = srgb(0.93, 0.93, 0.90);
/// Panel text of a pass.
pub const PASS_TEXT: Rgba = srgb(0.45, 0.75, 1.00);
/// Panel background.
pub const PANEL: Rgba = [0.0, 0.0, 0.0, 0.62];

const fn srgb(r: f32, g: f32, b: f32) -> Rgba {
    [r, g, b, 1.0]
}
