//! Tate's algorithm (J. Tate, "Algorithm for determining the type of a
//! singular fiber in an elliptic pencil", LNM 476, 1975), in the step order
//! of Silverman, *Advanced Topics in the Arithmetic of Elliptic Curves*,
//! IV.9.4, with the coordinate changes spelt out as in Cremona, *Algorithms
//! for Modular Elliptic Curves*, 3.2. Valid at every prime, 2 and 3 included.

use super::modp::{CubicRoots, Fp, QuadRoots};
use super::{Kodaira, LocalData, Reduction};
use crate::curve::change::shift_coefficients;
use crate::curve::ModelChange;
use malachite::base::num::arithmetic::traits::{DivisibleBy, Mod, Pow};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};

/// What Tate's algorithm finds at one prime.
pub(crate) struct TateOutcome {
    pub(crate) data: LocalData,
    /// How many times the model was scaled by `u = p` to reach minimality.
    pub(crate) scalings: u32,
    /// The p-minimal model the algorithm ends in.
    pub(crate) model: [Integer; 5],
    /// The change from the input model to `model`.
    pub(crate) change: ModelChange,
}

/// Integral changes met so far: `u = p^k`, integral `r, s, t`.
struct Tracker {
    change: ModelChange,
}

impl Tracker {
    fn shift(&mut self, a: &mut [Integer; 5], r: &Integer, s: &Integer, t: &Integer) {
        *a = shift_coefficients(a, r, s, t);
        let step = ModelChange {
            u: Rational::ONE,
            r: Rational::from(r.clone()),
            s: Rational::from(s.clone()),
            t: Rational::from(t.clone()),
        };
        self.change = self.change.compose(&step);
    }

    fn scale_down(&mut self, a: &mut [Integer; 5], p: &Integer) {
        let pows = [1u64, 2, 3, 4, 6];
        for (x, e) in a.iter_mut().zip(pows) {
            let pe = p.pow(e);
            debug_assert!((&*x).divisible_by(&pe));
            *x /= pe;
        }
        let step = ModelChange {
            u: Rational::from(p.clone()),
            r: Rational::ZERO,
            s: Rational::ZERO,
            t: Rational::ZERO,
        };
        self.change = self.change.compose(&step);
    }
}

fn divides(pk: &Integer, x: &Integer) -> bool {
    x.divisible_by(pk)
}

fn b_invariants(a: &[Integer; 5]) -> (Integer, Integer, Integer, Integer) {
    let [a1, a2, a3, a4, a6] = a;
    let b2 = a1 * a1 + Integer::from(4) * a2;
    let b4 = a1 * a3 + Integer::from(2) * a4;
    let b6 = a3 * a3 + Integer::from(4) * a6;
    let b8 = a1 * a1 * a6 + Integer::from(4) * a2 * a6 - a1 * a3 * a4 + a2 * a3 * a3 - a4 * a4;
    (b2, b4, b6, b8)
}

/// Tate's algorithm at the prime `p` on the integral model `a` with
/// discriminant `disc` (non-zero). `p` must be prime (checked by callers).
pub(crate) fn tate(a_in: &[Integer; 5], disc: &Integer, p: &Natural) -> TateOutcome {
    let f = Fp::new(p);
    let pi = f.pi.clone();
    let p2 = &pi * &pi;
    let p3 = &p2 * &pi;
    let p4 = &p3 * &pi;
    let is2 = *p == 2u32;
    let is3 = *p == 3u32;
    let mut a = a_in.clone();
    let mut tr = Tracker { change: ModelChange::identity() };
    // invariant: a Curve has a non-zero discriminant
    let mut vd = crate::arith::valuation(disc, p).expect("non-zero discriminant");
    let mut scalings = 0u32;

    let finish = |kodaira: Kodaira, f_exp: u32, c: u32, red: Reduction, vd: u32, a: [Integer; 5], tr: Tracker, sc: u32| {
        TateOutcome {
            data: LocalData {
                prime: p.clone(),
                kodaira,
                conductor_exponent: f_exp,
                tamagawa: c,
                reduction: red,
                minimal_valuation_disc: vd,
            },
            scalings: sc,
            model: a,
            change: tr.change,
        }
    };

    loop {
        if vd == 0 {
            return finish(Kodaira::I0, 0, 1, Reduction::Good, vd, a, tr, scalings);
        }
        // Step 1: move the singular point of the reduction to (0, 0).
        let (b2, b4, b6, _) = b_invariants(&a);
        let [a1, _, a3, _, _] = &a;
        let (r, t) = if is2 {
            if f.is_zero(&b2) {
                // a1 even: x0^2 = a4, y0^2 = x0^3 + a2 x0^2 + a4 x0 + a6
                let r = f.red(&a[3]);
                let t = f.red(&(&r * (Integer::ONE + &a[1] + &a[3]) + &a[4]));
                (r, t)
            } else {
                // a1 odd: x0 = a3, y0 = x0^2 + a4
                let r = f.red(a3);
                let t = f.red(&(&r + &a[3]));
                (r, t)
            }
        } else if is3 {
            let r = if f.is_zero(&b2) { f.red(&(-&b6)) } else { f.red(&(-(&b2 * &b4))) };
            let t = f.red(&(a1 * &r + a3));
            (r, t)
        } else {
            let c4 = &b2 * &b2 - Integer::from(24) * &b4;
            let r = if f.is_zero(&c4) {
                f.red(&(-(&b2) * f.inv(&Integer::from(12))))
            } else {
                let c6 = -(&b2 * &b2 * &b2) + Integer::from(36) * &b2 * &b4 - Integer::from(216) * &b6;
                f.red(&(-(&c6 + &b2 * &c4) * f.inv(&(Integer::from(12) * &c4))))
            };
            let t = f.red(&(-(a1 * &r + a3) * f.inv(&Integer::from(2))));
            (r, t)
        };
        tr.shift(&mut a, &r, &Integer::ZERO, &t);
        debug_assert!(f.is_zero(&a[2]) && f.is_zero(&a[3]) && f.is_zero(&a[4]), "singular point at origin");

        // Step 2: multiplicative reduction.
        let (b2, _, b6, b8) = b_invariants(&a);
        if !f.is_zero(&b2) {
            let split = f.quadratic(&Integer::ONE, &a[0], &(-&a[1])) == QuadRoots::Distinct(2);
            let (c, red) = if split {
                (vd, Reduction::SplitMultiplicative)
            } else {
                (if vd.is_multiple_of(2) { 2 } else { 1 }, Reduction::NonSplitMultiplicative)
            };
            return finish(Kodaira::In(vd), 1, c, red, vd, a, tr, scalings);
        }
        // Step 3.
        if !divides(&p2, &a[4]) {
            return finish(Kodaira::II, vd, 1, Reduction::Additive, vd, a, tr, scalings);
        }
        // Step 4.
        if !divides(&p3, &b8) {
            return finish(Kodaira::III, vd - 1, 2, Reduction::Additive, vd, a, tr, scalings);
        }
        // Step 5.
        if !divides(&p3, &b6) {
            let q = f.quadratic(&Integer::ONE, &(&a[2] / &pi), &(-(&a[4] / &p2)));
            let c = if q == QuadRoots::Distinct(2) { 3 } else { 1 };
            return finish(Kodaira::IV, vd - 2, c, Reduction::Additive, vd, a, tr, scalings);
        }
        // Step 6: make p | a1, a2; p^2 | a3, a4; p^3 | a6.
        let (s, t) = if is2 {
            (f.red(&a[1]), Integer::from(2) * f.red(&(&a[4] / Integer::from(4))))
        } else {
            let half = f.inv(&Integer::from(2));
            let s = f.red(&(-&a[0] * &half));
            // inverse of 2 modulo p^2 is (p^2 + 1) / 2
            let inv2_p2 = (&p2 + Integer::ONE) / Integer::from(2);
            let t = (-&a[2] * inv2_p2).mod_op(&p2);
            (s, t)
        };
        tr.shift(&mut a, &Integer::ZERO, &s, &t);
        debug_assert!(f.is_zero(&a[0]) && f.is_zero(&a[1]));
        debug_assert!(divides(&p2, &a[2]) && divides(&p2, &a[3]) && divides(&p3, &a[4]));
        let cubic = f.cubic(&(&a[1] / &pi), &(&a[3] / &p2), &(&a[4] / &p3));
        match cubic {
            CubicRoots::Distinct(k) => {
                return finish(Kodaira::I0Star, vd - 4, 1 + k, Reduction::Additive, vd, a, tr, scalings);
            }
            CubicRoots::Double(beta) => {
                // Step 7: the subprocedure for I_m*.
                tr.shift(&mut a, &(&pi * beta), &Integer::ZERO, &Integer::ZERO);
                let mut m = 1u32;
                let mut mx = p2.clone();
                let mut my = p2.clone();
                let c = loop {
                    assert!(m + 6 <= vd, "Tate's algorithm: I_m* loop ran past the discriminant valuation");
                    let xa3 = &a[2] / &my;
                    let xa6 = &a[4] / (&mx * &my);
                    match f.quadratic(&Integer::ONE, &xa3, &(-xa6)) {
                        QuadRoots::Distinct(k) => break if k == 2 { 4 } else { 2 },
                        QuadRoots::Double(rho) => {
                            let t = &my * rho;
                            tr.shift(&mut a, &Integer::ZERO, &Integer::ZERO, &t);
                        }
                    }
                    my *= &pi;
                    m += 1;
                    assert!(m + 6 <= vd, "Tate's algorithm: I_m* loop ran past the discriminant valuation");
                    let xa2 = &a[1] / &pi;
                    let xa4 = &a[3] / (&pi * &mx);
                    let xa6 = &a[4] / (&mx * &my);
                    match f.quadratic(&xa2, &xa4, &xa6) {
                        QuadRoots::Distinct(k) => break if k == 2 { 4 } else { 2 },
                        QuadRoots::Double(rho) => {
                            let r = &mx * rho;
                            tr.shift(&mut a, &r, &Integer::ZERO, &Integer::ZERO);
                        }
                    }
                    mx *= &pi;
                    m += 1;
                };
                return finish(Kodaira::InStar(m), vd - 4 - m, c, Reduction::Additive, vd, a, tr, scalings);
            }
            CubicRoots::Triple(alpha) => {
                tr.shift(&mut a, &(&pi * alpha), &Integer::ZERO, &Integer::ZERO);
                debug_assert!(divides(&p2, &a[1]) && divides(&p3, &a[3]) && divides(&p4, &a[4]));
                // Step 8.
                match f.quadratic(&Integer::ONE, &(&a[2] / &p2), &(-(&a[4] / &p4))) {
                    QuadRoots::Distinct(k) => {
                        let c = if k == 2 { 3 } else { 1 };
                        return finish(Kodaira::IVStar, vd - 6, c, Reduction::Additive, vd, a, tr, scalings);
                    }
                    QuadRoots::Double(rho) => {
                        let t = &p2 * rho;
                        tr.shift(&mut a, &Integer::ZERO, &Integer::ZERO, &t);
                    }
                }
                // Step 9.
                if !divides(&p4, &a[3]) {
                    return finish(Kodaira::IIIStar, vd - 7, 2, Reduction::Additive, vd, a, tr, scalings);
                }
                // Step 10.
                if !divides(&(&p3 * &p3), &a[4]) {
                    return finish(Kodaira::IIStar, vd - 8, 1, Reduction::Additive, vd, a, tr, scalings);
                }
                // Step 11: the model was not minimal; scale by u = p and repeat.
                tr.scale_down(&mut a, &pi);
                vd -= 12;
                scalings += 1;
            }
        }
    }
}
