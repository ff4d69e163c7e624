//! Gauss–Legendre quadrature nodes and weights.
//!
//! Nodes are the roots of the Legendre polynomial `P_n`, found by Newton's method from
//! the Tricomi initial guess `cos(pi (i - 1/4) / (n + 1/2))`, with weights
//! `2 / ((1 - x^2) P_n'(x)^2)` (Abramowitz & Stegun, "Handbook of Mathematical
//! Functions", 1964, eq. 25.4.29). An `n`-point rule integrates polynomials of degree
//! `2n - 1` exactly.

/// An `n`-point Gauss–Legendre rule on `[-1, 1]`.
#[derive(Debug, Clone, PartialEq)]
pub struct GaussLegendre {
    /// Nodes in `[-1, 1]`, ascending.
    pub nodes: Vec<f64>,
    /// Weights, summing to 2.
    pub weights: Vec<f64>,
}

impl GaussLegendre {
    /// The `n`-point rule (`n >= 1`; `n = 0` gives the empty rule).
    pub fn new(n: usize) -> Self {
        let mut nodes = vec![0.0; n];
        let mut weights = vec![0.0; n];
        let nf = n as f64;
        for i in 0..n.div_ceil(2) {
            let mut x = (std::f64::consts::PI * (i as f64 + 0.75) / (nf + 0.5)).cos();
            let mut dp = 1.0;
            // Newton on P_n; converges in a handful of steps from the Tricomi guess.
            for _ in 0..100 {
                let (p, d) = legendre_and_derivative(n, x);
                dp = d;
                let dx = p / d;
                x -= dx;
                if dx.abs() < 1e-16 {
                    break;
                }
            }
            let (_, d) = legendre_and_derivative(n, x);
            dp = if d.is_finite() { d } else { dp };
            let w = 2.0 / ((1.0 - x * x) * dp * dp);
            nodes[i] = -x;
            nodes[n - 1 - i] = x;
            weights[i] = w;
            weights[n - 1 - i] = w;
        }
        if n % 2 == 1 {
            nodes[n / 2] = 0.0;
        }
        Self { nodes, weights }
    }

    /// Nodes and weights mapped to `[a, b]`, as `(x, w)` pairs.
    pub fn on_interval(&self, a: f64, b: f64) -> impl Iterator<Item = (f64, f64)> + '_ {
        let half = 0.5 * (b - a);
        let mid = 0.5 * (a + b);
        self.nodes.iter().zip(&self.weights).map(move |(x, w)| (mid + half * x, half * w))
    }

    /// Integral of `f` over `[a, b]`.
    pub fn integrate(&self, a: f64, b: f64, mut f: impl FnMut(f64) -> f64) -> f64 {
        self.on_interval(a, b).map(|(x, w)| w * f(x)).sum()
    }
}

/// `(P_n(x), P_n'(x))` by the three-term recurrence.
fn legendre_and_derivative(n: usize, x: f64) -> (f64, f64) {
    let (mut p0, mut p1) = (1.0, x);
    if n == 0 {
        return (1.0, 0.0);
    }
    for k in 2..=n {
        let kf = k as f64;
        let p2 = ((2.0 * kf - 1.0) * x * p1 - (kf - 1.0) * p0) / kf;
        p0 = p1;
        p1 = p2;
    }
    let d = n as f64 * (x * p1 - p0) / (x * x - 1.0);
    (p1, d)
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Tabulated 5-point rule (Abramowitz & Stegun 1964, Table 25.4).
    #[test]
    fn five_point_rule_matches_abramowitz_stegun_table_25_4() {
        let r = GaussLegendre::new(5);
        assert_relative_eq!(r.nodes[4], 0.906_179_845_938_664, epsilon = 1e-14);
        assert_relative_eq!(r.nodes[3], 0.538_469_310_105_683, epsilon = 1e-14);
        assert_relative_eq!(r.nodes[2], 0.0, epsilon = 1e-15);
        assert_relative_eq!(r.weights[4], 0.236_926_885_056_189, epsilon = 1e-14);
        assert_relative_eq!(r.weights[3], 0.478_628_670_499_366, epsilon = 1e-14);
        assert_relative_eq!(r.weights[2], 0.568_888_888_888_889, epsilon = 1e-14);
    }

    #[test]
    fn n_point_rule_is_exact_for_degree_2n_minus_1() {
        for n in 1..=24 {
            let r = GaussLegendre::new(n);
            let deg = 2 * n - 1;
            // integral of x^deg + x^(deg-1) over [0, 2]
            let got = r.integrate(0.0, 2.0, |x| x.powi(deg as i32) + x.powi(deg as i32 - 1));
            let exact = 2f64.powi(deg as i32 + 1) / (deg as f64 + 1.0) + 2f64.powi(deg as i32) / deg as f64;
            assert_relative_eq!(got, exact, max_relative = 1e-12);
            assert_relative_eq!(r.weights.iter().sum::<f64>(), 2.0, max_relative = 1e-13);
        }
    }
}
