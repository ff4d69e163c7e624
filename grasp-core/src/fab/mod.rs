//! The fabrication sheet of one actuator (DESIGN 3.5): molds, silicone, fiber, tubing.
//!
//! The process is the usual hand-cast one for fiber-reinforced bending actuators
//! (common practice, no published source):
//!
//! 1. **Body.** The body (everything above the floor: side walls, top wall, base and tip
//!    caps) is cast upside down in the *top mold*, an open trough of the outer section,
//!    around the *chamber core*, whose face sits flush with the mold's open face. Fill to
//!    the brim.
//! 2. **Plate.** The floor and the under-layer are cast in the *plate mold*, a shallow
//!    tray of the finger's footprint: pour the under-layer, lay the strain-limiting sheet
//!    on it, pour the floor over it.
//! 3. **Bond.** Once both have cured, brush a thin *bonding coat* on the body's open face
//!    and press it onto the plate.
//! 4. **Wind and seal.** Wind the double helix over the chamber length, one helix in each
//!    direction, tie off, and brush a *seal coat* over the fibers.
//! 5. **Tube.** Push the supply tube through the base cap into the chamber and seal it.
//!
//! Coordinates follow the section's (DESIGN 3.2): `y` is the height above the
//! strain-limiting layer; a mold's inside is given as length × width × depth, length
//! along the finger. Everything is SI (m, m³, kg); the application converts for the
//! sheet. Quantities of the trade without a published source (waste allowance, coat
//! thickness, tie-off, inset, mold wall, minimum cure) are the fields of [`FabSettings`]
//! and are reported with the sheet, so a reader sees every assumption.

pub mod wrap;

use std::f64::consts::PI;

use crate::actuator::Actuator;
use crate::section::SectionProfile;

/// The shop assumptions behind a sheet (common practice; every one is printed with it).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FabSettings {
    /// Extra silicone mixed over what the casts and coats hold, as a fraction (cups,
    /// stirrers, degassing losses, overflow): 0.15.
    pub waste_allowance: f64,
    /// Thickness of a brushed coat (m): 0.5 mm.
    pub coat_thickness: f64,
    /// Fiber left at each end of each helix to tie off (m): 50 mm.
    pub tie_off_per_end: f64,
    /// How far the strain-limiting sheet stays inside the plate's edge all round, so the
    /// rubber closes over it (m): 1 mm.
    pub sheet_inset: f64,
    /// Thickness of the mold's sheet material for the cut templates (m): 6 mm.
    pub mold_wall: f64,
    /// Shortest cure before demolding (h): 4 h at room temperature.
    pub min_cure_h: f64,
    /// How far the tube reaches into the chamber past the base cap (m): 5 mm.
    pub tube_reach: f64,
}

impl Default for FabSettings {
    fn default() -> Self {
        Self {
            waste_allowance: 0.15,
            coat_thickness: 0.5e-3,
            tie_off_per_end: 50e-3,
            sheet_inset: 1e-3,
            mold_wall: 6e-3,
            min_cure_h: 4.0,
            tube_reach: 5e-3,
        }
    }
}

/// Why a sheet could not be made.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum FabError {
    /// A setting is out of its range.
    #[error("fabrication setting {field} must be {expected}, got {value}")]
    BadSetting {
        /// Field name.
        field: &'static str,
        /// What was expected.
        expected: &'static str,
        /// Value given.
        value: f64,
    },
    /// The strain-limiting sheet would have no area after the inset.
    #[error("the strain-limiting sheet vanishes: the finger is narrower than twice the sheet inset")]
    NoSheet,
}

impl FabSettings {
    /// Checks every field.
    ///
    /// # Errors
    /// [`FabError::BadSetting`] naming the first field out of range.
    pub fn validate(&self) -> Result<(), FabError> {
        let fields = [
            ("waste_allowance", self.waste_allowance, 0.0, 1.0),
            ("coat_thickness", self.coat_thickness, 0.0, 0.01),
            ("tie_off_per_end", self.tie_off_per_end, 0.0, 1.0),
            ("sheet_inset", self.sheet_inset, 0.0, 0.05),
            ("mold_wall", self.mold_wall, 1e-4, 0.1),
            ("min_cure_h", self.min_cure_h, 0.0, 200.0),
            ("tube_reach", self.tube_reach, 0.0, 0.1),
        ];
        for (field, value, lo, hi) in fields {
            if !(value >= lo && value <= hi) {
                return Err(FabError::BadSetting { field, expected: "inside its range", value });
            }
        }
        Ok(())
    }
}

/// A solid that makes up a cast (all m).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Solid {
    /// A rectangular block.
    Block {
        /// Along the finger (m).
        length: f64,
        /// Across (m).
        width: f64,
        /// Height (m).
        height: f64,
    },
    /// Half a circular cylinder cut along its axis.
    HalfCylinder {
        /// Along the finger (m).
        length: f64,
        /// Radius (m).
        radius: f64,
    },
}

impl Solid {
    /// Volume (m³), closed form.
    pub fn volume(&self) -> f64 {
        match *self {
            Self::Block { length, width, height } => length * width * height,
            Self::HalfCylinder { length, radius } => 0.5 * PI * radius * radius * length,
        }
    }
}

/// One pour or coat and how much rubber it takes.
#[derive(Debug, Clone, PartialEq)]
pub struct Cast {
    /// What it is (`"body"`, `"under-layer"`, `"floor"`, `"bonding coat"`, `"seal coat"`).
    pub name: &'static str,
    /// Rubber volume (m³).
    pub volume: f64,
    /// Whether it is part of the finger's cast rubber (`false` for the coats).
    pub cast: bool,
}

/// The outline of a flat piece to cut.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Outline {
    /// A rectangle `width × height` (m).
    Rect {
        /// Width (m).
        width: f64,
        /// Height (m).
        height: f64,
    },
    /// A rectangle with a notch at the middle of its top edge (a mold's end profile).
    Notched {
        /// Width (m).
        width: f64,
        /// Height (m).
        height: f64,
        /// The notch.
        notch: Notch,
    },
}

/// A notch cut into the top edge of a piece: the cavity's profile.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Notch {
    /// A half disk of `radius`.
    HalfDisk {
        /// Radius (m).
        radius: f64,
    },
}

impl Outline {
    /// The bounding box `(width, height)` (m).
    pub fn size(&self) -> (f64, f64) {
        match *self {
            Self::Rect { width, height } | Self::Notched { width, height, .. } => (width, height),
        }
    }
}

/// A flat piece of a cut template.
#[derive(Debug, Clone, PartialEq)]
pub struct Piece {
    /// Label, e.g. `"top mold: long wall"`.
    pub name: String,
    /// How many to cut.
    pub count: usize,
    /// Its outline at 1:1.
    pub outline: Outline,
}

/// A mold (or the core) and how it is filled.
#[derive(Debug, Clone, PartialEq)]
pub struct Mold {
    /// `"chamber core"`, `"top mold"` or `"plate mold"`.
    pub name: &'static str,
    /// Inside (for the core: outside) dimensions `[length, width, depth]` (m).
    pub inside: [f64; 3],
    /// Fill heights from the mold's bottom, in pour order, with what each pour is (m).
    pub fill: Vec<(f64, &'static str)>,
    /// Pieces to cut for it (flat sheet material of thickness `FabSettings::mold_wall`).
    pub pieces: Vec<Piece>,
    /// A remark on how it is made or placed.
    pub note: String,
}

/// The double helix.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FiberPlan {
    /// Axial pitch of one helix (m).
    pub pitch: f64,
    /// Perimeter of the wound outer section (m).
    pub perimeter: f64,
    /// Length wound (m): the chamber length, covered by whole turns.
    pub wound_length: f64,
    /// Whole turns of one helix.
    pub turns_per_helix: usize,
    /// Fiber in one helix, `N sqrt(P^2 + p^2)` (m), tie-off not included.
    pub length_per_helix: f64,
    /// Tie-off allowance of one helix, both ends (m).
    pub tie_off_per_helix: f64,
    /// Both helices with their tie-offs (m).
    pub total_length: f64,
}

/// The supply tube.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Tubing {
    /// Largest outer diameter whose end fits inside the chamber's section (m): the
    /// diameter of the largest circle inscribed in it.
    pub max_outer_diameter: f64,
    /// How deep to push it in: through the base cap and `tube_reach` into the chamber (m).
    pub insert_length: f64,
}

/// Everything needed to make one actuator.
#[derive(Debug, Clone, PartialEq)]
pub struct FabPlan {
    /// Actuator name.
    pub name: String,
    /// Pours and coats, in process order.
    pub casts: Vec<Cast>,
    /// The finger's cast rubber (m³), coats and waste excluded; equals
    /// [`Actuator::rubber_volume`].
    pub rubber_volume: f64,
    /// Rubber of the coats (m³).
    pub coat_volume: f64,
    /// Silicone to mix (kg): casts and coats, plus the waste allowance.
    pub silicone_mass: f64,
    /// Waste allowance used (fraction).
    pub waste_allowance: f64,
    /// The molds and the core.
    pub molds: Vec<Mold>,
    /// The fiber.
    pub fiber: FiberPlan,
    /// Strain-limiting sheet `(length, width)` (m).
    pub strain_layer: (f64, f64),
    /// The tube.
    pub tubing: Tubing,
    /// Cure before demolding (h): the material's cure time if known, at least
    /// `min_cure_h`.
    pub cure_before_demold_h: f64,
}

impl FabPlan {
    /// Silicone per part of a two-part 1:1 mix (kg).
    pub fn part_mass(&self) -> f64 {
        0.5 * self.silicone_mass
    }
}

/// Length of a helix of `turns` whole turns of axial pitch `pitch` wound on a prism of
/// perimeter `perimeter` (m).
///
/// Unrolled onto the plane, a helix of constant pitch on any prism (circular or not) is
/// a straight line across a strip `turns × perimeter` long and `turns × pitch` wide, so
/// its length is `N sqrt(P^2 + p^2)`; on a circular cylinder of radius `r` this is the
/// textbook helix length `N sqrt((2 pi r)^2 + p^2)`. The fiber's centre line is taken on
/// the surface (a thin ribbon).
pub fn helix_length(perimeter: f64, pitch: f64, turns: usize) -> f64 {
    turns as f64 * perimeter.hypot(pitch)
}

/// Perimeter of the finger's outer section, around which the fiber is wound (m).
pub fn outer_perimeter(section: &SectionProfile) -> f64 {
    match section {
        SectionProfile::Box(s) => 2.0 * (s.outer_width() + s.top() + s.under_layer),
        SectionProfile::HalfRound(s) => {
            let r = s.outer_radius();
            PI * r + 2.0 * r + 2.0 * (s.floor + s.under_layer)
        }
    }
}

/// Makes the fabrication plan of `actuator`; `cure_time_h` is the material's cure time
/// at room temperature when known.
///
/// # Errors
/// A setting out of range, or a sheet that vanishes after the inset.
pub fn plan(
    actuator: &Actuator,
    cure_time_h: Option<f64>,
    settings: &FabSettings,
) -> Result<FabPlan, FabError> {
    settings.validate()?;
    let s = &actuator.section;
    let total = actuator.length();
    let lc = actuator.chamber_length;
    let width = s.outer_width();
    let (floor, under) = match s {
        SectionProfile::Box(b) => (b.floor, b.under_layer),
        SectionProfile::HalfRound(h) => (h.floor, h.under_layer),
    };
    let tw = settings.mold_wall;
    // body = outer solid of the part above the floor minus the core; opening = the
    // core's width on the body's open face
    let (body_outer, core, opening, depth, inscribed, body_pieces, core_pieces) = match s {
        SectionProfile::Box(b) => {
            let depth = b.chamber_height + b.top_wall;
            (
                Solid::Block { length: total, width, height: depth },
                Solid::Block { length: lc, width: b.chamber_width, height: b.chamber_height },
                b.chamber_width,
                depth,
                b.chamber_width.min(b.chamber_height),
                box_mold_pieces("top mold", total, width, depth, tw),
                vec![
                    Piece {
                        name: "chamber core: side".into(),
                        count: 2,
                        outline: Outline::Rect { width: lc, height: b.chamber_height },
                    },
                    Piece {
                        name: "chamber core: face".into(),
                        count: 2,
                        outline: Outline::Rect { width: lc, height: b.chamber_width },
                    },
                    Piece {
                        name: "chamber core: end profile".into(),
                        count: 1,
                        outline: Outline::Rect { width: b.chamber_width, height: b.chamber_height },
                    },
                ],
            )
        }
        SectionProfile::HalfRound(h) => {
            let r = h.outer_radius();
            (
                Solid::HalfCylinder { length: total, radius: r },
                Solid::HalfCylinder { length: lc, radius: h.radius },
                2.0 * h.radius,
                r,
                // the largest circle inside a half disk of radius a has diameter a
                h.radius,
                vec![Piece {
                    name: "top mold: trough gauge (end profile)".into(),
                    count: 2,
                    outline: Outline::Notched {
                        width: width + 2.0 * tw,
                        height: r + tw,
                        notch: Notch::HalfDisk { radius: r },
                    },
                }],
                vec![Piece {
                    name: "chamber core: profile gauge".into(),
                    count: 1,
                    outline: Outline::Notched {
                        width: 2.0 * h.radius + 2.0 * tw,
                        height: h.radius + tw,
                        notch: Notch::HalfDisk { radius: h.radius },
                    },
                }],
            )
        }
    };
    let body = body_outer.volume() - core.volume();
    let under_pour = Solid::Block { length: total, width, height: under }.volume();
    let floor_pour = Solid::Block { length: total, width, height: floor }.volume();
    let perimeter = outer_perimeter(s);
    let bond_area = total * width - lc * opening;
    let bonding = settings.coat_thickness * bond_area;
    let turns = (lc / actuator.fiber.pitch - 1e-9).ceil().max(1.0) as usize;
    let wound = turns as f64 * actuator.fiber.pitch;
    let seal = settings.coat_thickness * perimeter * wound;
    let mut casts = vec![Cast { name: "body", volume: body, cast: true }];
    if under > 0.0 {
        casts.push(Cast { name: "under-layer", volume: under_pour, cast: true });
    }
    casts.push(Cast { name: "floor", volume: floor_pour, cast: true });
    casts.push(Cast { name: "bonding coat", volume: bonding, cast: false });
    casts.push(Cast { name: "seal coat", volume: seal, cast: false });
    let rubber_volume: f64 = casts.iter().filter(|c| c.cast).map(|c| c.volume).sum();
    let coat_volume = bonding + seal;
    let silicone_mass =
        (rubber_volume + coat_volume) * actuator.material.density * (1.0 + settings.waste_allowance);

    let sheet = (total - 2.0 * settings.sheet_inset, width - 2.0 * settings.sheet_inset);
    if !(sheet.0 > 0.0 && sheet.1 > 0.0) {
        return Err(FabError::NoSheet);
    }
    let plate_depth = under + floor;
    let mut plate_fill = Vec::new();
    if under > 0.0 {
        plate_fill.push((under, "under-layer; then lay the strain-limiting sheet"));
    }
    plate_fill.push((plate_depth, "floor, over the sheet"));
    let molds = vec![
        Mold {
            name: "chamber core",
            inside: [lc, opening, core_depth(s)],
            fill: Vec::new(),
            pieces: core_pieces,
            note: format!(
                "outside dimensions; its face flush with the top mold's open face, {:.1} mm from the base end",
                actuator.base_length * 1e3
            ),
        },
        Mold {
            name: "top mold",
            inside: [total, width, depth],
            fill: vec![(depth, "body, to the brim")],
            pieces: body_pieces,
            note: match s {
                SectionProfile::Box(_) => "an open box: base plate, two long walls, two end walls".into(),
                SectionProfile::HalfRound(_) => {
                    "a half-round trough: print or carve it; the gauge checks its profile".into()
                }
            },
        },
        Mold {
            name: "plate mold",
            inside: [total, width, plate_depth],
            fill: plate_fill,
            pieces: box_mold_pieces("plate mold", total, width, plate_depth, tw),
            note: "an open tray: base plate, two long walls, two end walls".into(),
        },
    ];
    let fiber = FiberPlan {
        pitch: actuator.fiber.pitch,
        perimeter,
        wound_length: wound,
        turns_per_helix: turns,
        length_per_helix: helix_length(perimeter, actuator.fiber.pitch, turns),
        tie_off_per_helix: 2.0 * settings.tie_off_per_end,
        total_length: 2.0
            * (helix_length(perimeter, actuator.fiber.pitch, turns) + 2.0 * settings.tie_off_per_end),
    };
    Ok(FabPlan {
        name: actuator.name.clone(),
        casts,
        rubber_volume,
        coat_volume,
        silicone_mass,
        waste_allowance: settings.waste_allowance,
        molds,
        fiber,
        strain_layer: sheet,
        tubing: Tubing {
            max_outer_diameter: inscribed,
            insert_length: actuator.base_length + settings.tube_reach,
        },
        cure_before_demold_h: cure_time_h.unwrap_or(0.0).max(settings.min_cure_h),
    })
}

fn core_depth(s: &SectionProfile) -> f64 {
    match s {
        SectionProfile::Box(b) => b.chamber_height,
        SectionProfile::HalfRound(h) => h.radius,
    }
}

/// The five pieces of an open box mold of inside `length × width × depth` from sheet of
/// thickness `wall`: the long walls stand on the base and run past the end walls.
fn box_mold_pieces(mold: &str, length: f64, width: f64, depth: f64, wall: f64) -> Vec<Piece> {
    vec![
        Piece {
            name: format!("{mold}: base"),
            count: 1,
            outline: Outline::Rect { width: length + 2.0 * wall, height: width + 2.0 * wall },
        },
        Piece {
            name: format!("{mold}: long wall"),
            count: 2,
            outline: Outline::Rect { width: length + 2.0 * wall, height: depth },
        },
        Piece {
            name: format!("{mold}: end wall"),
            count: 2,
            outline: Outline::Rect { width, height: depth },
        },
    ]
}

#[cfg(test)]
mod tests;
