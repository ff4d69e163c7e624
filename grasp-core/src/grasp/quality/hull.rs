//! Convex hull of a point set in `D` dimensions, as the facet hyperplanes the epsilon
//! quality needs.
//!
//! Incremental construction in the manner of Quickhull (C. B. Barber, D. P. Dobkin and
//! H. Huhdanpaa, "The Quickhull algorithm for convex hulls", ACM TOMS 22(4), 1996): start
//! from a full-dimensional simplex, keep for every facet the set of points above it, and
//! repeatedly add the farthest point of some facet's set, replacing the facets it sees by
//! the cone from it over their horizon. Facets are simplices (`D` vertices); a face of the
//! hull with more than `D` vertices ends up triangulated into several simplices in the
//! same hyperplane, which leaves the facet distances unchanged.
//!
//! Cost: `O(n F D^2)` for `n` points and `F` facets created (visibility is tested against
//! every live facet), and `F` grows like `n^(D/2)` at worst (the upper bound theorem); for
//! the grasp sizes here (tens of points in 6-D) that is well under a second even in a debug
//! build.
//!
//! Round-off: a point within `DISTANCE_TOLERANCE` (relative to the largest coordinate) of
//! a facet's hyperplane counts as on it, so the hull may miss a point by that much. The
//! result is checked before it is returned: every point must lie below every facet (to 100
//! times the tolerance) and every ridge must be shared by exactly two facets (a closed
//! surface); otherwise the outcome is [`Hull::Failed`] rather than a wrong answer.

use std::collections::BTreeMap;

/// Distance below which a point counts as on a hyperplane, relative to the largest
/// coordinate magnitude of the input.
pub(crate) const DISTANCE_TOLERANCE: f64 = 1e-9;

/// A hull facet: the hyperplane `normal . x = offset` with every point of the set on the
/// side `normal . x <= offset` (the normal points out of the hull).
#[derive(Debug, Clone, PartialEq)]
pub(crate) struct Facet<const D: usize> {
    /// Indices of the facet's vertices in the input.
    pub vertices: [usize; D],
    /// Unit outward normal.
    pub normal: [f64; D],
    /// Signed distance of the hyperplane from the origin along `normal`.
    pub offset: f64,
}

/// The outcome of a hull computation.
#[derive(Debug, Clone, PartialEq)]
pub(crate) enum Hull<const D: usize> {
    /// The points span all `D` dimensions; the facets of their hull.
    Full(Vec<Facet<D>>),
    /// The points lie in an affine subspace of dimension `rank < D` (or there are none).
    Flat {
        /// Dimension of the affine hull of the points.
        rank: usize,
    },
    /// Round-off made the construction inconsistent (see the module docs).
    Failed,
}

fn dot<const D: usize>(a: &[f64; D], b: &[f64; D]) -> f64 {
    a.iter().zip(b).map(|(x, y)| x * y).sum()
}

fn sub<const D: usize>(a: &[f64; D], b: &[f64; D]) -> [f64; D] {
    std::array::from_fn(|k| a[k] - b[k])
}

fn norm<const D: usize>(a: &[f64; D]) -> f64 {
    dot(a, a).sqrt()
}

/// Removes from `v` its components along the orthonormal `basis` (twice, for accuracy).
fn project_out<const D: usize>(v: &mut [f64; D], basis: &[[f64; D]]) {
    for _ in 0..2 {
        for q in basis {
            let d = dot(v, q);
            for k in 0..D {
                v[k] -= d * q[k];
            }
        }
    }
}

/// Unit normal of the hyperplane through the `D` points `ids`, or `None` when they are
/// affinely dependent (to `degenerate` in absolute length).
fn hyperplane_normal<const D: usize>(
    points: &[[f64; D]],
    ids: &[usize; D],
    degenerate: f64,
) -> Option<[f64; D]> {
    let origin = &points[ids[0]];
    let mut basis: Vec<[f64; D]> = Vec::with_capacity(D);
    for &id in &ids[1..] {
        let mut e = sub(&points[id], origin);
        project_out(&mut e, &basis);
        let len = norm(&e);
        if !(len > degenerate) {
            return None;
        }
        basis.push(e.map(|x| x / len));
    }
    // The coordinate axis with the largest component off the facet's span gives the best
    // conditioned normal; at least one has a residual >= 1/sqrt(D).
    let mut best = [0.0; D];
    let mut best_len = 0.0;
    for axis in 0..D {
        let mut v = [0.0; D];
        v[axis] = 1.0;
        project_out(&mut v, &basis);
        let len = norm(&v);
        if len > best_len {
            best_len = len;
            best = v;
        }
    }
    if !(best_len > 0.0) {
        return None;
    }
    Some(best.map(|x| x / best_len))
}

struct Builder<'a, const D: usize> {
    points: &'a [[f64; D]],
    interior: [f64; D],
    tolerance: f64,
    degenerate: f64,
    facets: Vec<Facet<D>>,
    alive: Vec<bool>,
    outside: Vec<Vec<usize>>,
}

impl<const D: usize> Builder<'_, D> {
    fn distance(&self, facet: usize, point: usize) -> f64 {
        let f = &self.facets[facet];
        dot(&f.normal, &self.points[point]) - f.offset
    }

    /// Adds the facet through `vertices`, oriented away from the interior point.
    fn add_facet(&mut self, vertices: [usize; D]) -> Option<usize> {
        let mut normal = hyperplane_normal(self.points, &vertices, self.degenerate)?;
        let mut offset = vertices.iter().map(|&v| dot(&normal, &self.points[v])).sum::<f64>() / D as f64;
        let below = offset - dot(&normal, &self.interior);
        if below < 0.0 {
            normal = normal.map(|x| -x);
            offset = -offset;
        }
        if !(below.abs() > self.degenerate) {
            return None;
        }
        self.facets.push(Facet { vertices, normal, offset });
        self.alive.push(true);
        self.outside.push(Vec::new());
        Some(self.facets.len() - 1)
    }

    /// Puts each point into the outside set of the candidate facet it is farthest above.
    fn assign(&mut self, points: impl IntoIterator<Item = usize>, candidates: &[usize]) {
        for p in points {
            let mut best: Option<(usize, f64)> = None;
            for &f in candidates {
                let d = self.distance(f, p);
                if d > self.tolerance && best.is_none_or(|(_, bd)| d > bd) {
                    best = Some((f, d));
                }
            }
            if let Some((f, _)) = best {
                self.outside[f].push(p);
            }
        }
    }
}

/// The ridge of `vertices` without position `skip`, sorted, padded with `usize::MAX`.
fn ridge_key<const D: usize>(vertices: &[usize; D], skip: usize) -> [usize; D] {
    let mut key = *vertices;
    key[skip] = usize::MAX;
    key.sort_unstable();
    key
}

/// The convex hull of `points`.
pub(crate) fn convex_hull<const D: usize>(points: &[[f64; D]]) -> Hull<D> {
    if points.is_empty() || D == 0 {
        return Hull::Flat { rank: 0 };
    }
    if points.iter().any(|p| p.iter().any(|x| !x.is_finite())) {
        return Hull::Failed;
    }
    let scale = points.iter().flat_map(|p| p.iter()).fold(0.0_f64, |m, x| m.max(x.abs()));
    if scale == 0.0 {
        return Hull::Flat { rank: 0 };
    }
    let tolerance = DISTANCE_TOLERANCE * scale;

    // Initial simplex: the point of largest norm, then repeatedly the point farthest from
    // the affine hull of those chosen (lowest index on ties, for reproducibility).
    let first = (0..points.len()).fold(0, |b, i| if norm(&points[i]) > norm(&points[b]) { i } else { b });
    let mut chosen = vec![first];
    let mut basis: Vec<[f64; D]> = Vec::with_capacity(D);
    while chosen.len() <= D {
        let mut best: Option<(usize, f64, [f64; D])> = None;
        for (i, p) in points.iter().enumerate() {
            let mut e = sub(p, &points[first]);
            project_out(&mut e, &basis);
            let d = norm(&e);
            if best.as_ref().is_none_or(|b| d > b.1) {
                best = Some((i, d, e));
            }
        }
        match best {
            Some((i, d, e)) if d > tolerance => {
                chosen.push(i);
                basis.push(e.map(|x| x / d));
            }
            _ => return Hull::Flat { rank: chosen.len() - 1 },
        }
    }
    let mut interior = [0.0; D];
    for &c in &chosen {
        for k in 0..D {
            interior[k] += points[c][k] / (D + 1) as f64;
        }
    }

    let mut b = Builder {
        points,
        interior,
        tolerance,
        degenerate: 1e-4 * tolerance,
        facets: Vec::new(),
        alive: Vec::new(),
        outside: Vec::new(),
    };
    let mut initial = Vec::with_capacity(D + 1);
    for skip in 0..=D {
        let mut vertices = [0; D];
        let mut k = 0;
        for (j, &c) in chosen.iter().enumerate() {
            if j != skip {
                vertices[k] = c;
                k += 1;
            }
        }
        match b.add_facet(vertices) {
            Some(f) => initial.push(f),
            None => return Hull::Failed,
        }
    }
    let rest: Vec<usize> = (0..points.len()).filter(|i| !chosen.contains(i)).collect();
    b.assign(rest, &initial);

    let mut live = initial;
    let mut next = 0;
    while next < b.facets.len() {
        if !b.alive[next] || b.outside[next].is_empty() {
            next += 1;
            continue;
        }
        let eye = b.outside[next].iter().copied().fold(None, |best: Option<(usize, f64)>, p| {
            let d = b.distance(next, p);
            if best.is_none_or(|(_, bd)| d > bd) { Some((p, d)) } else { best }
        });
        let Some((eye, _)) = eye else { break };

        let visible: Vec<usize> = live.iter().copied().filter(|&f| b.distance(f, eye) > tolerance).collect();
        let mut ridges: BTreeMap<[usize; D], u32> = BTreeMap::new();
        for &f in &visible {
            for skip in 0..D {
                *ridges.entry(ridge_key(&b.facets[f].vertices, skip)).or_insert(0) += 1;
            }
        }
        let mut orphans = Vec::new();
        for &f in &visible {
            b.alive[f] = false;
            orphans.append(&mut b.outside[f]);
        }
        let mut created = Vec::new();
        for (ridge, count) in ridges {
            if count != 1 {
                continue;
            }
            let mut vertices = ridge;
            vertices[D - 1] = eye;
            match b.add_facet(vertices) {
                Some(f) => created.push(f),
                None => return Hull::Failed,
            }
        }
        orphans.retain(|&p| p != eye);
        b.assign(orphans, &created);
        // Live facets in creation order: the survivors, then the new ones.
        live.retain(|&f| b.alive[f]);
        live.extend_from_slice(&created);
    }

    let facets: Vec<Facet<D>> =
        b.facets.into_iter().zip(b.alive).filter_map(|(f, alive)| alive.then_some(f)).collect();
    // Closed surface: every ridge in exactly two facets.
    let mut ridges: BTreeMap<[usize; D], u32> = BTreeMap::new();
    for f in &facets {
        for skip in 0..D {
            *ridges.entry(ridge_key(&f.vertices, skip)).or_insert(0) += 1;
        }
    }
    if facets.len() <= D || ridges.values().any(|&c| c != 2) {
        return Hull::Failed;
    }
    // Every point below every facet.
    let slack = 100.0 * tolerance;
    if facets.iter().any(|f| points.iter().any(|p| dot(&f.normal, p) - f.offset > slack)) {
        return Hull::Failed;
    }
    Hull::Full(facets)
}

#[cfg(test)]
mod tests {
    use approx::assert_relative_eq;

    use super::*;

    fn min_offset<const D: usize>(hull: &Hull<D>) -> f64 {
        match hull {
            Hull::Full(f) => f.iter().map(|f| f.offset).fold(f64::INFINITY, f64::min),
            other => panic!("expected a full hull, got {other:?}"),
        }
    }

    /// The cube `[-1, 1]^3` with its centre among the points: every facet at distance 1,
    /// 6 faces triangulated into 12 triangles (elementary geometry).
    #[test]
    fn cube_3d_has_unit_facet_distance_and_twelve_triangles() {
        let mut pts = vec![[0.0; 3]];
        for i in 0..8 {
            pts.push(std::array::from_fn(|k| if i >> k & 1 == 1 { 1.0 } else { -1.0 }));
        }
        let hull = convex_hull(&pts);
        assert_relative_eq!(min_offset(&hull), 1.0, epsilon = 1e-12);
        let Hull::Full(f) = hull else { unreachable!() };
        assert_eq!(f.len(), 12);
        assert!(f.iter().all(|f| (f.offset - 1.0).abs() < 1e-12));
    }

    /// The 6-D cross-polytope (`+-e_k`): 2^6 = 64 simplex facets `sum_k s_k x_k = 1`
    /// (one per sign pattern `s`), each at distance `1/sqrt(6)` from the centre
    /// (elementary geometry).
    #[test]
    fn cross_polytope_6d() {
        let mut pts = Vec::new();
        for k in 0..6 {
            for s in [1.0, -1.0] {
                let mut p = [0.0; 6];
                p[k] = s;
                pts.push(p);
            }
        }
        let hull = convex_hull(&pts);
        assert_relative_eq!(min_offset(&hull), 1.0 / 6f64.sqrt(), epsilon = 1e-12);
        let Hull::Full(f) = hull else { unreachable!() };
        assert_eq!(f.len(), 64);
    }

    /// The 6-cube `[-1, 1]^6` shifted by `c`: its 12 faces are all coplanar-rich (32 points
    /// each), so this exercises the triangulation of non-simplicial faces. The nearest face
    /// to the origin is at `1 - max |c_k|`, and every facet lies on one of the 12 face
    /// hyperplanes (elementary geometry).
    #[test]
    fn shifted_hypercube_6d() {
        let c = [0.1, -0.2, 0.05, 0.0, 0.3, -0.15];
        let pts: Vec<[f64; 6]> = (0..64)
            .map(|i| std::array::from_fn(|k| c[k] + if i >> k & 1 == 1 { 1.0 } else { -1.0 }))
            .collect();
        let hull = convex_hull(&pts);
        assert_relative_eq!(min_offset(&hull), 0.7, epsilon = 1e-12);
        let Hull::Full(f) = hull else { unreachable!() };
        for facet in &f {
            let axis = (0..6).find(|&k| (facet.normal[k].abs() - 1.0).abs() < 1e-9);
            assert!(axis.is_some(), "facet normal {:?} is not a face normal", facet.normal);
        }
    }

    /// Points on a plane in 3-D are flat with rank 2; coincident points have rank 0.
    #[test]
    fn flat_inputs_report_their_rank() {
        let plane = [[0.0, 0.0, 1.0], [1.0, 0.0, 1.0], [0.0, 1.0, 1.0], [1.0, 1.0, 1.0]];
        assert_eq!(convex_hull(&plane), Hull::Flat { rank: 2 });
        assert_eq!(convex_hull(&[[2.0, 2.0, 2.0]; 5]), Hull::Flat { rank: 0 });
        assert_eq!(convex_hull::<3>(&[]), Hull::Flat { rank: 0 });
        assert_eq!(convex_hull(&[[f64::NAN, 0.0, 0.0]]), Hull::Failed);
    }

    /// Points on a sphere: every point is a hull vertex, every facet's vertices lie on it,
    /// and the nearest facet is inside the sphere. Checked against the definition of a
    /// supporting hyperplane by brute force over all points (independent of the
    /// construction).
    #[test]
    fn sphere_points_all_below_every_facet() {
        let n = 60;
        let golden = std::f64::consts::PI * (3.0 - 5f64.sqrt());
        let pts: Vec<[f64; 3]> = (0..n)
            .map(|i| {
                let z = 1.0 - 2.0 * (i as f64 + 0.5) / n as f64;
                let r = (1.0 - z * z).sqrt();
                let a = golden * i as f64;
                [r * a.cos(), r * a.sin(), z]
            })
            .collect();
        let Hull::Full(f) = convex_hull(&pts) else { panic!("sphere hull failed") };
        // Euler: a triangulated sphere with V = 60 vertices has 2V - 4 = 116 triangles.
        assert_eq!(f.len(), 2 * n - 4);
        for facet in &f {
            for p in &pts {
                assert!(dot(&facet.normal, p) <= facet.offset + 1e-12);
            }
            assert!(facet.offset > 0.8 && facet.offset < 1.0);
        }
    }
}
