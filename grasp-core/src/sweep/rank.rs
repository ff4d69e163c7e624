//! Ranking candidates and their Pareto front.
//!
//! A candidate's [`Score`] comes from its per-object pressure windows and holding
//! margins. Candidates are ranked by, in this order:
//!
//! 1. objects covered (more first): an object is covered when it passes at some
//!    pressure of the sweep, i.e. it has a pressure window;
//! 2. a single-pressure window for the whole object set (candidates that have one first);
//! 3. width of the shared window (wider first): the intersection of the windows of the
//!    covered objects (each object's widest run of passing sweep pressures);
//! 4. the summed width of the covered objects' own windows (wider first): room to spare
//!    object by object when the shared window is as narrow;
//! 5. the smallest holding margin over the covered objects at the check pressure (larger
//!    first), rounded to 1e-6 so that solver round-off (1e-15 against 0) never decides;
//! 6. fewer fingers;
//! 7. the candidate index (lower first), so the order is total and repeatable.
//!
//! Candidates that could not be evaluated rank after all others. The Pareto front is the
//! set of evaluated candidates that no other one dominates in (coverage, shared window
//! width, finger count): at least as many objects covered, at least as wide a window and
//! at most as many fingers, and strictly better in one.

use std::cmp::Ordering;

/// What the ranking compares for one candidate.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Score {
    /// Objects with a pressure window.
    pub covered: usize,
    /// Objects in the set.
    pub objects: usize,
    /// Intersection of the windows of the covered objects (Pa), if not empty.
    pub shared_window: Option<(f64, f64)>,
    /// Whether every object is covered and the shared window is not empty.
    pub whole_set: bool,
    /// Width of the shared window (Pa; 0 when there is none).
    pub window_width: f64,
    /// Sum of the widths of the covered objects' windows (Pa).
    pub total_window_width: f64,
    /// Smallest holding margin (lift and lateral cases) over the covered objects at the
    /// check pressure, or over all objects when none is covered (load scale, rounded to
    /// 1e-6; a value that is not finite counts as 0).
    pub min_margin: f64,
    /// Number of fingers.
    pub fingers: usize,
}

impl Score {
    /// The score of a candidate with these per-object windows (Pa) and smallest holding
    /// margins, one entry per object.
    pub fn new(windows: &[Option<(f64, f64)>], margins: &[f64], fingers: usize) -> Self {
        let covered: Vec<(f64, f64)> = windows.iter().flatten().copied().collect();
        let shared_window = if covered.is_empty() {
            None
        } else {
            let lo = covered.iter().map(|w| w.0).fold(f64::NEG_INFINITY, f64::max);
            let hi = covered.iter().map(|w| w.1).fold(f64::INFINITY, f64::min);
            (lo <= hi).then_some((lo, hi))
        };
        let any_covered = !covered.is_empty();
        let min_margin = margins
            .iter()
            .zip(windows.iter().map(Option::is_some).chain(std::iter::repeat(false)))
            .filter(|(_, c)| *c || !any_covered)
            .map(|(&m, _)| if m.is_finite() { (m * 1e6).round() / 1e6 + 0.0 } else { 0.0 })
            .fold(f64::INFINITY, f64::min);
        Self {
            covered: covered.len(),
            objects: windows.len(),
            shared_window,
            whole_set: !windows.is_empty() && covered.len() == windows.len() && shared_window.is_some(),
            window_width: shared_window.map_or(0.0, |(a, b)| b - a),
            total_window_width: covered.iter().map(|(a, b)| b - a).sum(),
            min_margin: if min_margin.is_finite() { min_margin } else { 0.0 },
            fingers,
        }
    }
}

/// `Less` when `a` ranks before (is better than) `b`; ties at every key are `Equal`.
pub fn compare(a: &Score, b: &Score) -> Ordering {
    b.covered
        .cmp(&a.covered)
        .then(b.whole_set.cmp(&a.whole_set))
        .then(b.window_width.total_cmp(&a.window_width))
        .then(b.total_window_width.total_cmp(&a.total_window_width))
        .then(b.min_margin.total_cmp(&a.min_margin))
        .then(a.fingers.cmp(&b.fingers))
}

/// Candidate indices, best first; `None` scores (not evaluated) last, ties by index.
pub fn rank(entries: &[(usize, Option<Score>)]) -> Vec<usize> {
    let mut order: Vec<&(usize, Option<Score>)> = entries.iter().collect();
    order.sort_by(|(ia, a), (ib, b)| {
        match (a, b) {
            (Some(a), Some(b)) => compare(a, b),
            (Some(_), None) => Ordering::Less,
            (None, Some(_)) => Ordering::Greater,
            (None, None) => Ordering::Equal,
        }
        .then(ia.cmp(ib))
    });
    order.into_iter().map(|(i, _)| *i).collect()
}

/// Whether `a` dominates `b` in (coverage, window width, finger count).
pub fn dominates(a: &Score, b: &Score) -> bool {
    let no_worse = a.covered >= b.covered && a.window_width >= b.window_width && a.fingers <= b.fingers;
    let better = a.covered > b.covered || a.window_width > b.window_width || a.fingers < b.fingers;
    no_worse && better
}

/// Indices of the Pareto front, in ascending index order.
///
/// Candidates with equal (coverage, finger count) compete only on width, so each such
/// group is reduced to its widest window first: `O(n g)` for `g` groups.
pub fn pareto_front(entries: &[(usize, Option<Score>)]) -> Vec<usize> {
    // the widest window of each (covered, fingers) group
    let mut groups: Vec<(usize, usize, f64)> = Vec::new();
    for s in entries.iter().filter_map(|(_, s)| s.as_ref()) {
        match groups.iter_mut().find(|g| g.0 == s.covered && g.1 == s.fingers) {
            Some(g) => g.2 = g.2.max(s.window_width),
            None => groups.push((s.covered, s.fingers, s.window_width)),
        }
    }
    let mut front: Vec<usize> = entries
        .iter()
        .filter_map(|(i, s)| s.as_ref().map(|s| (*i, s)))
        .filter(|(_, s)| {
            !groups.iter().any(|&(covered, fingers, width)| {
                let best = Score { covered, fingers, window_width: width, ..**s };
                dominates(&best, s)
            })
        })
        .map(|(i, _)| i)
        .collect();
    front.sort_unstable();
    front
}

#[cfg(test)]
mod tests {
    use super::*;

    fn score(covered: usize, width: f64, fingers: usize) -> Score {
        Score {
            covered,
            objects: 5,
            shared_window: (width > 0.0).then_some((0.0, width)),
            whole_set: covered == 5 && width > 0.0,
            window_width: width,
            total_window_width: width,
            min_margin: 1.0,
            fingers,
        }
    }

    #[test]
    fn score_intersects_the_windows_of_the_covered_objects() {
        let s = Score::new(&[Some((10e3, 40e3)), None, Some((20e3, 50e3))], &[2.0, 0.5, f64::NAN], 3);
        assert_eq!((s.covered, s.objects, s.whole_set), (2, 3, false));
        assert_eq!(s.shared_window, Some((20e3, 40e3)));
        assert_eq!((s.window_width, s.total_window_width), (20e3, 60e3));
        assert_eq!(s.min_margin, 0.0, "a NaN margin counts as 0, it never ranks a candidate up");
        // margins of uncovered objects do not count; round-off does not either
        let s = Score::new(&[Some((10e3, 40e3)), None], &[2.0 + 1e-12, 0.0], 3);
        assert_eq!(s.min_margin, 2.0);
        let none = Score::new(&[None, None], &[0.7, 5e-16], 3);
        assert_eq!(none.min_margin, 0.0);
        let all = Score::new(&[Some((10e3, 40e3)), Some((40e3, 45e3))], &[2.0, 3.0], 4);
        assert!(all.whole_set);
        assert_eq!((all.shared_window, all.window_width, all.min_margin), (Some((40e3, 40e3)), 0.0, 2.0));
        let disjoint = Score::new(&[Some((10e3, 20e3)), Some((30e3, 45e3))], &[2.0, 3.0], 4);
        assert!(!disjoint.whole_set && disjoint.shared_window.is_none());
        assert!(!Score::new(&[], &[], 3).whole_set);
    }

    /// The keys apply in their documented order.
    #[test]
    fn ranking_applies_the_keys_in_order() {
        let mut whole = score(5, 10e3, 4);
        let mut partial_wide = score(4, 50e3, 3);
        assert_eq!(compare(&whole, &partial_wide), Ordering::Less, "coverage first");
        let mut no_shared = score(5, 0.0, 3);
        no_shared.whole_set = false;
        assert_eq!(compare(&whole, &no_shared), Ordering::Less, "then a window for the whole set");
        let wider = score(5, 20e3, 6);
        assert_eq!(compare(&wider, &whole), Ordering::Less, "then width");
        let mut roomier = whole;
        roomier.total_window_width = 40e3;
        roomier.min_margin = 0.5;
        assert_eq!(compare(&roomier, &whole), Ordering::Less, "then the objects' own windows");
        partial_wide.covered = 5;
        partial_wide.whole_set = true;
        partial_wide.window_width = 10e3;
        partial_wide.total_window_width = 10e3;
        whole.min_margin = 3.0;
        assert_eq!(compare(&whole, &partial_wide), Ordering::Less, "then margins");
        whole.min_margin = 1.0;
        assert_eq!(compare(&partial_wide, &whole), Ordering::Less, "then fewer fingers");
        let entries = vec![(3, Some(whole)), (1, None), (0, Some(whole)), (2, Some(wider))];
        assert_eq!(rank(&entries), [2, 0, 3, 1]);
    }

    /// The front against the definition, checked by brute force over all pairs.
    #[test]
    fn pareto_front_equals_brute_force_dominance() {
        let mut entries = Vec::new();
        let mut g = crate::sweep::random::SplitMix64::new(3);
        for i in 0..300 {
            let s = score(g.below(6) as usize, (g.below(8) * 5000) as f64, 2 + g.below(5) as usize);
            entries.push((i, if i % 17 == 0 { None } else { Some(s) }));
        }
        let brute: Vec<usize> = entries
            .iter()
            .filter_map(|(i, s)| s.map(|s| (*i, s)))
            .filter(|(_, s)| !entries.iter().any(|(_, o)| o.is_some_and(|o| dominates(&o, s))))
            .map(|(i, _)| i)
            .collect();
        assert_eq!(pareto_front(&entries), brute);
        assert!(!brute.is_empty());
        // a small case by hand: (5, 10, 4) and (4, 30, 3) trade off; (4, 20, 4) is dominated
        let hand =
            vec![(0, Some(score(5, 10.0, 4))), (1, Some(score(4, 30.0, 3))), (2, Some(score(4, 20.0, 4)))];
        assert_eq!(pareto_front(&hand), [0, 1]);
    }
}
