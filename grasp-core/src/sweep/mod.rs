//! Layout search: the search space, the candidates drawn from it, how they are ranked,
//! and how a sweep is split into shards.
//!
//! Everything here is pure: [`space`] expands a [`SearchSpace`] into numbered
//! [`Candidate`]s (grid or seeded Latin hypercube, then refinement rounds around the best
//! so far), [`rank`] orders scored candidates and finds their Pareto front, and [`Shard`]
//! picks a deterministic share of the candidate indices. Evaluating a candidate is the
//! grasp check ([`crate::check::check_scene`]) of the scene with the candidate's fingers;
//! files, resumption and merging of results live in the application.
//!
//! Start at [`SearchSpace::first_round`].

pub mod random;
pub mod rank;
pub mod space;

pub use rank::{Score, compare, pareto_front};
pub use space::{Axis, Candidate, LayoutFamily, MAX_CANDIDATES, Refinement, Sampling, SearchSpace, refine};

/// Why a search space cannot be expanded.
#[derive(Debug, Clone, PartialEq, Eq, thiserror::Error)]
#[non_exhaustive]
pub enum SweepError {
    /// A list that must not be empty is (layouts, actuators, finger counts, sampling).
    #[error("{0} must not be empty")]
    Empty(&'static str),
    /// An axis with a non-finite value, or a range whose ends are out of order.
    #[error("the {0} axis must be finite with from <= to, or a non-empty list")]
    BadAxis(&'static str),
    /// A finger or pair count of 0 or above the largest pattern.
    #[error("finger and pair counts must be between 1 and {max}")]
    BadCount {
        /// Largest count of the family.
        max: usize,
    },
    /// Refinement with zero rounds, parents or samples, or a shrink outside `(0, 1]`.
    #[error("refinement needs rounds, best and samples >= 1 and 0 < shrink <= 1")]
    BadRefinement,
    /// More candidates than [`MAX_CANDIDATES`] in one round.
    #[error("the space holds {count} candidates, more than the {MAX_CANDIDATES} a sweep takes")]
    TooMany {
        /// How many.
        count: u128,
    },
    /// A shard `I/N` with `N = 0` or `I` outside `1..=N`.
    #[error("shard {index}/{count}: expected I/N with 1 <= I <= N")]
    BadShard {
        /// `I` as given.
        index: usize,
        /// `N` as given.
        count: usize,
    },
}

/// A deterministic share of a sweep: shard `I` of `N` (1-based) takes the candidates
/// whose index leaves remainder `I - 1` when divided by `N`. Every candidate belongs to
/// exactly one shard, and consecutive candidates (which tend to cost alike) are dealt out
/// round-robin, so shards take about the same time.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Shard {
    index: usize,
    count: usize,
}

impl Shard {
    /// Shard `index` of `count` (1-based).
    ///
    /// # Errors
    /// [`SweepError::BadShard`] unless `1 <= index <= count`.
    pub fn new(index: usize, count: usize) -> Result<Self, SweepError> {
        if count == 0 || index == 0 || index > count {
            return Err(SweepError::BadShard { index, count });
        }
        Ok(Self { index, count })
    }

    /// The whole sweep (shard 1 of 1).
    pub fn whole() -> Self {
        Self { index: 1, count: 1 }
    }

    /// `I` (1-based).
    pub fn index(&self) -> usize {
        self.index
    }

    /// `N`.
    pub fn count(&self) -> usize {
        self.count
    }

    /// Whether candidate `index` belongs to this shard.
    pub fn contains(&self, candidate: usize) -> bool {
        candidate % self.count == self.index - 1
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The shards of any N partition the indices: each index in exactly one.
    #[test]
    fn shards_partition_the_candidates() {
        for n in [1, 2, 3, 16] {
            let shards: Vec<Shard> = (1..=n).map(|i| Shard::new(i, n).unwrap()).collect();
            for c in 0..200 {
                assert_eq!(shards.iter().filter(|s| s.contains(c)).count(), 1, "index {c}, {n} shards");
            }
            let sizes: Vec<usize> =
                shards.iter().map(|s| (0..200).filter(|&c| s.contains(c)).count()).collect();
            assert!(sizes.iter().max().unwrap() - sizes.iter().min().unwrap() <= 1, "{sizes:?}");
        }
        assert!(Shard::whole().contains(12345));
        assert_eq!(Shard::new(0, 4), Err(SweepError::BadShard { index: 0, count: 4 }));
        assert_eq!(Shard::new(5, 4), Err(SweepError::BadShard { index: 5, count: 4 }));
        assert!(Shard::new(1, 0).is_err());
    }
}
