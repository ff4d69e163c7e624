//! "Did you mean …?": the nearest valid name to a misspelt one (scene fields, variants,
//! references, command-line names).
//!
//! Edit distance is the plain Levenshtein distance (insertions, deletions and
//! substitutions, each costing one), computed over characters with the usual two-row
//! dynamic programme. A candidate is suggested only when it is close enough that the
//! suggestion is more likely help than noise: at most half the length of the longer of
//! the two names. Field names carry unit suffixes (`_mm`, `_kpa`), so a name given
//! without its suffix (`top_wall`) is at distance 3 from the right one and still passes.

/// Levenshtein distance between `a` and `b`, in characters.
pub fn levenshtein(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    let mut cur = vec![0; b.len() + 1];
    for (i, ca) in a.chars().enumerate() {
        cur[0] = i + 1;
        for (j, &cb) in b.iter().enumerate() {
            let substitution = prev[j] + usize::from(ca != cb);
            cur[j + 1] = substitution.min(prev[j + 1] + 1).min(cur[j] + 1);
        }
        std::mem::swap(&mut prev, &mut cur);
    }
    prev[b.len()]
}

/// The candidate nearest to `given`, if it is close enough to be worth suggesting.
///
/// Ties go to the candidate listed first. Comparison ignores ASCII case, so
/// `wallpressure` finds `WallPressure`.
pub fn nearest<'a, I>(given: &str, candidates: I) -> Option<&'a str>
where
    I: IntoIterator<Item = &'a str>,
{
    let given_lower = given.to_ascii_lowercase();
    let mut best: Option<(usize, &'a str)> = None;
    for c in candidates {
        if c == given {
            continue;
        }
        let d = levenshtein(&given_lower, &c.to_ascii_lowercase());
        let limit = given.chars().count().max(c.chars().count()) / 2;
        if d <= limit && best.is_none_or(|(bd, _)| d < bd) {
            best = Some((d, c));
        }
    }
    best.map(|(_, c)| c)
}

/// The actuator called `name` in `scene` (read from `origin`).
///
/// # Errors
/// [`AppError::Input`] naming the nearest defined actuator and listing them all.
pub fn actuator_named<'a>(
    scene: &'a grasp_core::scene::Scene,
    name: &str,
    origin: &str,
) -> Result<&'a grasp_core::actuator::Actuator, crate::error::AppError> {
    scene.actuator(name).ok_or_else(|| {
        let names: Vec<&str> = scene.actuators.iter().map(|a| a.name.as_str()).collect();
        crate::error::AppError::input(format!(
            "--actuator: no actuator \"{name}\" in {origin}{} (defined: {})",
            nearest(name, names.iter().copied())
                .map(|s| format!("; did you mean \"{s}\"?"))
                .unwrap_or_default(),
            names.join(", ")
        ))
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Textbook values: kitten → sitting is 3 (two substitutions, one insertion), and
    /// the distance to the empty string is the length.
    #[test]
    fn levenshtein_matches_textbook_cases() {
        assert_eq!(levenshtein("kitten", "sitting"), 3);
        assert_eq!(levenshtein("", "abc"), 3);
        assert_eq!(levenshtein("abc", ""), 3);
        assert_eq!(levenshtein("flaw", "lawn"), 2);
        assert_eq!(levenshtein("same", "same"), 0);
        // characters, not bytes: one substitution of a two-byte character
        assert_eq!(levenshtein("größe", "grösse"), 2);
    }

    #[test]
    fn nearest_finds_unit_suffix_and_typo_but_not_noise() {
        let fields = ["chamber_width_mm", "top_wall_mm", "floor_mm", "under_layer_mm"];
        assert_eq!(nearest("top_wal", fields), Some("top_wall_mm"));
        assert_eq!(nearest("top_wall", fields), Some("top_wall_mm"));
        assert_eq!(nearest("flor_mm", fields), Some("floor_mm"));
        assert_eq!(nearest("colour", fields), None);
        assert_eq!(nearest("wallpressure", ["Baseline", "WallPressure"]), Some("WallPressure"));
        assert_eq!(nearest("f10", ["f100", "f80"]), Some("f100"));
    }
}
