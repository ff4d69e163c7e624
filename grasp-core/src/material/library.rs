//! Built-in casting-silicone classes, by generic name.
//!
//! The values are datasheet-class figures for platinum-cure casting silicones, **from
//! memory** (collected in the project's `shared/references/README.md`, not re-read in
//! any datasheet): specific gravity, the 100 % modulus (uniaxial nominal stress at
//! stretch 2) and elongation at break. Where only the 100 % modulus is known the model is
//! neo-Hookean with `mu = s100 / 1.75`, because a neo-Hookean solid's uniaxial nominal
//! stress at stretch 2 is `mu (2 - 1/4) = 1.75 mu`. Use them for a first design; fit your
//! own batch with `arcfinger fit` for anything that matters.

use super::{HyperelasticModel, Material, NeoHookean, Yeoh};

/// One built-in material class.
#[derive(Debug, Clone, PartialEq)]
pub struct LibraryEntry {
    /// Generic class name, e.g. `"platinum silicone, Shore 00-30"`.
    pub name: &'static str,
    /// The material.
    pub material: Material,
    /// Typical cure time at room temperature (h), from memory.
    pub cure_time_h: f64,
    /// Where the numbers come from.
    pub source: &'static str,
}

const FROM_MEMORY_S100: &str = "datasheet-class values, from memory; neo-Hookean mu = (100 % modulus) / 1.75";

fn neo_hookean_class(
    name: &'static str,
    sg: f64,
    s100_kpa: f64,
    elongation: f64,
    cure_time_h: f64,
) -> LibraryEntry {
    let mu = s100_kpa * 1e3 / 1.75;
    LibraryEntry {
        name,
        material: Material {
            // mu > 0 and finite for every table row below, so `new` cannot fail.
            model: HyperelasticModel::NeoHookean(NeoHookean::new(mu).unwrap_or_else(|_| unreachable!())),
            density: sg * 1000.0,
            stretch_at_break: 1.0 + elongation,
        },
        cure_time_h,
        source: FROM_MEMORY_S100,
    }
}

/// The built-in classes, in a fixed order.
pub fn library() -> Vec<LibraryEntry> {
    vec![
        neo_hookean_class("platinum silicone, Shore 00-30", 1.07, 69.0, 9.0, 4.0),
        neo_hookean_class("platinum silicone, Shore 00-50", 1.07, 83.0, 9.8, 3.0),
        neo_hookean_class("platinum silicone, Shore 10A", 1.07, 152.0, 10.0, 5.0),
        neo_hookean_class("platinum silicone, Shore 20A", 1.08, 338.0, 6.2, 4.0),
        neo_hookean_class("platinum silicone, Shore 30A", 1.08, 593.0, 3.64, 16.0),
        LibraryEntry {
            name: "platinum silicone, Shore 28A (9:1 mix)",
            material: Material {
                model: HyperelasticModel::Yeoh(
                    Yeoh::new(0.11e6, 0.02e6, 0.0).unwrap_or_else(|_| unreachable!()),
                ),
                density: 1130.0,
                stretch_at_break: 8.0,
            },
            cure_time_h: 12.0,
            source: "Yeoh C10 = 0.11 MPa, C20 = 0.02 MPa; datasheet-class values, from memory",
        },
    ]
}

/// The built-in class with this exact name.
pub fn library_entry(name: &str) -> Option<LibraryEntry> {
    library().into_iter().find(|e| e.name == name)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::material::StrainEnergy;
    use approx::assert_relative_eq;

    /// Each neo-Hookean class reproduces its tabulated 100 % modulus (shared/references,
    /// datasheet-class values from memory) through the closed form `mu (l - l^-2)`.
    #[test]
    fn classes_reproduce_their_100_percent_modulus() {
        for (name, s100_kpa) in [
            ("platinum silicone, Shore 00-30", 69.0),
            ("platinum silicone, Shore 10A", 152.0),
            ("platinum silicone, Shore 30A", 593.0),
        ] {
            let e = library_entry(name).unwrap();
            assert_relative_eq!(e.material.model.uniaxial_stress(2.0), s100_kpa * 1e3, max_relative = 1e-12);
        }
    }

    #[test]
    fn names_are_unique_and_values_physical() {
        let lib = library();
        for (i, a) in lib.iter().enumerate() {
            assert!(lib[i + 1..].iter().all(|b| b.name != a.name));
            assert!(a.material.stretch_at_break > 1.0);
            assert!((1000.0..1500.0).contains(&a.material.density));
            assert!(a.material.model.check_planar_stability(0.3, a.material.stretch_at_break).is_ok());
        }
    }
}
