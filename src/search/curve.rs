//! Rational points of small naive height on a Weierstrass curve.

use super::sieve::{Clock, Form, Sieve};
use super::{clamp_height, SearchLimits, SearchOutcome};
use crate::arith::gcd_u64;
use crate::Curve;
use malachite::base::num::arithmetic::traits::CheckedSqrt;
use malachite::base::num::basic::traits::Zero;
use malachite::{Integer, Rational};

/// Whether `(x, y)` lies on the curve, checked in exact rationals.
fn on_curve(curve: &Curve, x: &Rational, y: &Rational) -> bool {
    let [a1, a2, a3, a4, a6] = curve.coefficients().clone().map(Rational::from);
    let lhs = y * y + &a1 * x * y + &a3 * y;
    let rhs = ((x + a2) * x + a4) * x + a6;
    lhs == rhs
}

/// The points with `x = m / k^2` whose value `Y = k^3 (2y + a1 x + a3)` is
/// `+-y_abs` (one point when `y_abs = 0`), each checked on the curve.
fn points_at(curve: &Curve, m: i64, k: u64, y_abs: &Integer, out: &mut Vec<(Rational, Rational)>) {
    let a = curve.coefficients();
    let (mi, ki) = (Integer::from(m), Integer::from(k));
    let k2 = &ki * &ki;
    let k3 = &k2 * &ki;
    let x = Rational::from_integers(mi.clone(), k2);
    let shift = &a[0] * &mi * &ki + &a[2] * &k3;
    let two_k3 = Integer::from(2) * k3;
    let mut push = |big_y: Integer| {
        let y = Rational::from_integers(big_y - &shift, two_k3.clone());
        let ok = on_curve(curve, &x, &y);
        debug_assert!(ok, "curve search produced a non-point ({x}, {y})");
        if ok {
            out.push((x.clone(), y));
        }
    };
    push(y_abs.clone());
    if *y_abs != Integer::ZERO {
        push(-y_abs);
    }
}

fn sort_points(points: &mut [(Rational, Rational)]) {
    points.sort_by(|p, q| {
        let key = |r: &Rational| {
            let m = r.numerator_ref().clone();
            let d = r.denominator_ref().clone();
            (m.clone().max(d.clone()), d, r.clone())
        };
        (key(&p.0), &p.1).cmp(&(key(&q.0), &q.1))
    });
}

/// Rational points of small naive height on a Weierstrass curve.
///
/// Every affine point has `x = m / k^2`, `y = n / k^3` with `gcd(m, k) = 1`;
/// the search covers the pairs with naive height
/// `max(|m|, k^2) <= limits.height` (so `|m| <= H` and `1 <= k <= sqrt(H)`)
/// and returns every affine point with such an `x`: both `P` and `-P`, and
/// the 2-torsion points once. Completing the square,
/// `(k^3 (2y + a1 x + a3))^2 = 4 m^3 + b2 m^2 k^2 + 2 b4 m k^4 + b6 k^6`
/// (divided by 4 when `a1`, `a3` are even), and the right-hand side goes
/// through the bit-parallel sieve of the [module documentation](super) with
/// rows `k` and columns `m`. Every point returned is checked on the original
/// equation in exact rationals. `first_only` (which returns one point, not
/// its negative as well), `deadline` and `cancel` stop the search early, as
/// for [`search_quartic`](super::search_quartic).
///
/// ```
/// use twofold::Curve;
/// use twofold::search::{search_curve, SearchLimits};
/// // y^2 + y = x^3 - x (conductor 37; the published tables (Cremona 1997): rank 1, generator
/// // (0, 0), no torsion). The point 5P = (1/4, -5/8) has height 4.
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let out = search_curve(&e, &SearchLimits::new(4));
/// let xs: Vec<String> = out.points.iter().map(|p| p.0.to_string()).collect();
/// assert_eq!(xs, ["-1", "-1", "0", "0", "1", "1", "2", "2", "1/4", "1/4"]);
/// ```
pub fn search_curve(curve: &Curve, limits: &SearchLimits) -> SearchOutcome<(Rational, Rational)> {
    let (height, clamped) = clamp_height(limits.height);
    let [b2, b4, b6, _] = curve.b_invariants();
    let mut c = [Integer::from(4), b2.clone(), Integer::from(2) * b4, b6.clone()];
    let four = Integer::from(4);
    let scale = if c.iter().all(|v| (v % &four) == Integer::ZERO) {
        for v in c.iter_mut() {
            *v /= &four;
        }
        Integer::from(2)
    } else {
        Integer::from(1)
    };
    let [c0, c1, c2, c3] = c;
    let form = Form::new(vec![(c0, 3, 0), (c1, 2, 2), (c2, 1, 4), (c3, 0, 6)]);
    let sieve = Sieve::new(form, 2, height);
    let mut clock = Clock::new(limits);
    let mut points = Vec::new();
    let report = sieve.run(0, height, &mut clock, &mut |m, k, r| {
        let before = points.len();
        points_at(curve, m, k, &(&scale * Integer::from(r)), &mut points);
        limits.first_only && points.len() > before
    });
    if limits.first_only {
        points.truncate(1);
    }
    sort_points(&mut points);
    SearchOutcome {
        points,
        complete: report.complete && !clamped,
        height_reached: report.height_reached,
        candidates_tested: report.candidates,
    }
}

/// The same search as [`search_curve`] with no sieve: for every pair
/// `(m, k)`, shell by shell of naive height `1, 2, 3, ...`, the discriminant
/// `(a1 x + a3)^2 + 4 (x^3 + a2 x^2 + a4 x + a6)` of the equation in `y` is
/// computed as a [`Rational`] and tested for being a square. With no early
/// stop it returns exactly the output of [`search_curve`].
///
/// ```
/// use twofold::Curve;
/// use twofold::search::{search_curve, search_curve_naive, SearchLimits};
/// let e = Curve::from_coefficients([1, -1, 1, -3, 3]).unwrap();
/// let limits = SearchLimits::new(60);
/// assert_eq!(search_curve_naive(&e, &limits), search_curve(&e, &limits));
/// ```
pub fn search_curve_naive(curve: &Curve, limits: &SearchLimits) -> SearchOutcome<(Rational, Rational)> {
    let (height, clamped) = clamp_height(limits.height);
    let [a1, a2, a3, a4, a6] = curve.coefficients().clone().map(Rational::from);
    let mut out = SearchOutcome { points: Vec::new(), complete: false, height_reached: 0, candidates_tested: 0 };
    let mut clock = Clock::new(limits);
    let two = Rational::from(2);
    let test = |m: i64, k: u64, out: &mut SearchOutcome<(Rational, Rational)>| -> bool {
        out.candidates_tested += 1;
        if gcd_u64(m.unsigned_abs(), k) != 1 {
            return false;
        }
        let x = Rational::from_integers(Integer::from(m), Integer::from(k * k));
        let lin = &a1 * &x + &a3;
        let disc = &lin * &lin + Rational::from(4) * (((&x + &a2) * &x + &a4) * &x + &a6);
        if disc < Rational::ZERO {
            return false;
        }
        let Some(s) = (&disc).checked_sqrt() else { return false };
        let before = out.points.len();
        for y in [(&s - &lin) / &two, (-&s - &lin) / &two] {
            if on_curve(curve, &x, &y) && !out.points.iter().skip(before).any(|p| p.1 == y) {
                out.points.push((x.clone(), y));
            }
        }
        limits.first_only && out.points.len() > before
    };
    for h in 1..=height {
        if clock.expired_now() {
            sort_points(&mut out.points);
            return out;
        }
        let hi = h as i64;
        let mut k = 1u64;
        while k * k <= h {
            let ms: Vec<i64> = if k * k == h { (-hi..=hi).collect() } else { vec![-hi, hi] };
            for m in ms {
                if test(m, k, &mut out) {
                    out.points.truncate(1);
                    return out;
                }
            }
            k += 1;
        }
        out.height_reached = h;
    }
    out.complete = !clamped;
    sort_points(&mut out.points);
    out
}
