//! Shared algebra of models written in the invariants `I1 = l1^2 + l2^2 + l3^2` and
//! `I2 = l1^-2 + l2^-2 + l3^-2`, with `l3 = 1/(l1 l2)`.
//!
//! With `a = dI1/dl1 = 2 (l1 - l1^-3 l2^-2)` and `b = dI2/dl1 = 2 (l1 l2^2 - l1^-3)`,
//! the reduced stress is `s1 = W1 a + W2 b` and its derivative
//! `W11 a^2 + 2 W12 a b + W22 b^2 + W1 da/dl1 + W2 db/dl1` (chain rule; cf. Ogden,
//! "Non-linear Elastic Deformations", 1984, eq. 7.2.8).

/// First and second derivatives of `W(I1, I2)`.
#[derive(Debug, Clone, Copy, Default)]
pub(crate) struct InvariantDerivatives {
    pub w1: f64,
    pub w2: f64,
    pub w11: f64,
    pub w12: f64,
    pub w22: f64,
}

/// `(I1, I2)` at the reduced state `(l1, l2)`.
pub(crate) fn invariants(l1: f64, l2: f64) -> (f64, f64) {
    let l3 = 1.0 / (l1 * l2);
    (l1 * l1 + l2 * l2 + l3 * l3, 1.0 / (l1 * l1) + 1.0 / (l2 * l2) + 1.0 / (l3 * l3))
}

/// `s1 = dW/dl1`.
pub(crate) fn stress_1(d: InvariantDerivatives, l1: f64, l2: f64) -> f64 {
    let (a, b, _, _) = chain(l1, l2);
    d.w1 * a + d.w2 * b
}

/// `d s1 / d l1`.
pub(crate) fn stress_1_d1(d: InvariantDerivatives, l1: f64, l2: f64) -> f64 {
    let (a, b, da, db) = chain(l1, l2);
    d.w11 * a * a + 2.0 * d.w12 * a * b + d.w22 * b * b + d.w1 * da + d.w2 * db
}

fn chain(l1: f64, l2: f64) -> (f64, f64, f64, f64) {
    let l1m3 = 1.0 / (l1 * l1 * l1);
    let l1m4 = l1m3 / l1;
    let l2m2 = 1.0 / (l2 * l2);
    let a = 2.0 * (l1 - l1m3 * l2m2);
    let b = 2.0 * (l1 * l2 * l2 - l1m3);
    let da = 2.0 * (1.0 + 3.0 * l1m4 * l2m2);
    let db = 2.0 * (l2 * l2 + 3.0 * l1m4);
    (a, b, da, db)
}
