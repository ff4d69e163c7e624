//! "Did you mean ...?" suggestions by Levenshtein distance.

/// Edit distance between `a` and `b` (insertions, deletions, substitutions; V. I.
/// Levenshtein, 1966), by the two-row dynamic programme.
pub fn levenshtein(a: &str, b: &str) -> usize {
    let b: Vec<char> = b.chars().collect();
    let mut prev: Vec<usize> = (0..=b.len()).collect();
    let mut cur = vec![0; b.len() + 1];
    for (i, ca) in a.chars().enumerate() {
        cur[0] = i + 1;
        for (j, &cb) in b.iter().enumerate() {
            let sub = prev[j] + usize::from(ca != cb);
            cur[j + 1] = sub.min(prev[j + 1] + 1).min(cur[j] + 1);
        }
        std::mem::swap(&mut prev, &mut cur);
    }
    prev[b.len()]
}

/// The candidate nearest to `word`, if it is near enough to be a plausible typo (at most
/// a third of the word's length in edits, and at least one).
pub fn did_you_mean<'a>(word: &str, candidates: impl IntoIterator<Item = &'a str>) -> Option<&'a str> {
    let limit = (word.chars().count() / 3).max(1);
    candidates
        .into_iter()
        .map(|c| (levenshtein(&word.to_lowercase(), &c.to_lowercase()), c))
        .filter(|(d, _)| *d <= limit)
        .min_by_key(|(d, _)| *d)
        .map(|(_, c)| c)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Textbook examples: kitten/sitting = 3, flaw/lawn = 2 (e.g. Wagner & Fischer,
    /// "The string-to-string correction problem", J. ACM 21(1), 1974).
    #[test]
    fn levenshtein_textbook_values() {
        assert_eq!(levenshtein("kitten", "sitting"), 3);
        assert_eq!(levenshtein("flaw", "lawn"), 2);
        assert_eq!(levenshtein("", "abc"), 3);
        assert_eq!(levenshtein("same", "same"), 0);
    }

    #[test]
    fn suggests_only_plausible_typos() {
        let c = ["top_wall_mm", "floor_mm", "side_wall_mm"];
        assert_eq!(did_you_mean("top_wal_mm", c), Some("top_wall_mm"));
        assert_eq!(did_you_mean("xyz", c), None);
    }
}
