//! Points on `y^2 = g(x, z)` for an integral binary quartic `g`.

use super::sieve::{Clock, Form, Sieve};
use super::{clamp_height, QuarticPoint, SearchLimits, SearchOutcome};
use crate::arith::gcd_u64;
use malachite::base::num::arithmetic::traits::{CheckedSqrt, UnsignedAbs};
use malachite::base::num::basic::traits::Zero;
use malachite::Integer;

/// `g(x, z) = a x^4 + b x^3 z + c x^2 z^2 + d x z^3 + e z^4` by Horner's rule.
fn eval(g: &[Integer; 5], x: &Integer, z: &Integer) -> Integer {
    let mut v = g[0].clone();
    let mut zp = z.clone();
    for c in &g[1..] {
        v = v * x + c * &zp;
        zp *= z;
    }
    v
}

/// The quartic point at `(x, z)` with the given root, if it checks exactly.
fn checked_point(g: &[Integer; 5], x: i64, z: u64, y: Integer) -> Option<QuarticPoint> {
    let (x, z) = (Integer::from(x), Integer::from(z));
    let ok = &y * &y == eval(g, &x, &z);
    debug_assert!(ok, "sieve produced a non-point ({x}, {z}, {y})");
    ok.then_some(QuarticPoint { x, z, y })
}

fn sort_points(points: &mut [QuarticPoint]) {
    points.sort_by(|p, q| {
        let hp = (&p.x).unsigned_abs().max((&p.z).unsigned_abs());
        let hq = (&q.x).unsigned_abs().max((&q.z).unsigned_abs());
        (hp, &p.z, &p.x).cmp(&(hq, &q.z, &q.x))
    });
}

/// Rational points of small height on `y^2 = g(x, z)`, where
/// `g = [a, b, c, d, e]` stands for the binary quartic
/// `a x^4 + b x^3 z + c x^2 z^2 + d x z^3 + e z^4` with integer coefficients.
///
/// Searches the coprime pairs `(x, z)` with `z >= 1` and
/// `max(|x|, z) <= limits.height`, and the pair `(1, 0)`, for which `g(x, z)`
/// is a perfect square `y^2`; returns the points with `y >= 0`. Pairs go
/// through a bit-parallel sieve modulo small primes and prime powers (see the
/// [module documentation](super)); survivors are evaluated in `i128` when the
/// values fit and in [`Integer`]s otherwise, and every point is checked
/// exactly. Shells of doubling height are searched in turn; `first_only`,
/// `deadline` and `cancel` stop the search early, reported through
/// [`SearchOutcome::complete`] and [`SearchOutcome::height_reached`].
///
/// For the identically zero `g` every coprime pair is a point.
///
/// ```
/// use malachite::Integer;
/// use twofold::search::{search_quartic, SearchLimits};
/// // y^2 = z^4 - x^4: by Fermat's theorem (x^4 - y^4 = z^2 has only trivial
/// // solutions) the points are (0:1:1) and (+-1:1:0).
/// let g = [-1, 0, 0, 0, 1].map(Integer::from);
/// let out = search_quartic(&g, &SearchLimits::new(100));
/// let xs: Vec<String> = out.points.iter().map(|p| p.x.to_string()).collect();
/// assert_eq!(xs, ["-1", "0", "1"]);
/// ```
pub fn search_quartic(g: &[Integer; 5], limits: &SearchLimits) -> SearchOutcome<QuarticPoint> {
    search_quartic_above(g, limits, 0)
}

/// [`search_quartic`] over the pairs of height above `from` only (a search
/// up to `from` was made before and is not repeated; the pair `(1, 0)` of
/// height 1 is looked at only when `from` is 0). `height_reached` counts
/// the pairs up to `from` as searched.
pub(crate) fn search_quartic_above(g: &[Integer; 5], limits: &SearchLimits, from: u64) -> SearchOutcome<QuarticPoint> {
    let (height, clamped) = clamp_height(limits.height);
    let mut points = Vec::new();
    let mut candidates = 0u64;
    if height >= 1 && from == 0 {
        candidates = 1;
        if g[0] >= Integer::ZERO {
            if let Some(r) = g[0].unsigned_abs_ref().checked_sqrt() {
                points.extend(checked_point(g, 1, 0, Integer::from(r)));
                if limits.first_only {
                    return SearchOutcome { points, complete: false, height_reached: 0, candidates_tested: 1 };
                }
            }
        }
    }
    let form = Form::new((0..5).map(|k| (g[k].clone(), 4 - k as u32, k as u32)).collect());
    let sieve = Sieve::new(form, 1, height);
    let mut clock = Clock::new(limits);
    let report = sieve.run(from, height, &mut clock, &mut |x, z, r| {
        if let Some(p) = checked_point(g, x, z, Integer::from(r)) {
            points.push(p);
            limits.first_only
        } else {
            false
        }
    });
    sort_points(&mut points);
    SearchOutcome {
        points,
        complete: report.complete && !clamped,
        height_reached: report.height_reached,
        candidates_tested: candidates + report.candidates,
    }
}

/// The same search as [`search_quartic`] without a sieve: every pair is
/// evaluated with [`Integer`]s, shell by shell of height `1, 2, 3, ...`.
/// With no early stop it returns exactly the output of [`search_quartic`].
///
/// ```
/// use malachite::Integer;
/// use twofold::search::{search_quartic, search_quartic_naive, SearchLimits};
/// let g = [1, 0, -3, 0, 1].map(Integer::from);
/// let limits = SearchLimits::new(30);
/// assert_eq!(search_quartic_naive(&g, &limits), search_quartic(&g, &limits));
/// ```
pub fn search_quartic_naive(g: &[Integer; 5], limits: &SearchLimits) -> SearchOutcome<QuarticPoint> {
    let (height, clamped) = clamp_height(limits.height);
    let mut out = SearchOutcome { points: Vec::new(), complete: false, height_reached: 0, candidates_tested: 0 };
    let mut clock = Clock::new(limits);
    let test = |x: i64, z: u64, out: &mut SearchOutcome<QuarticPoint>| -> bool {
        out.candidates_tested += 1;
        if gcd_u64(x.unsigned_abs(), z) != 1 {
            return false;
        }
        let v = eval(g, &Integer::from(x), &Integer::from(z));
        if v < Integer::ZERO {
            return false;
        }
        match v.unsigned_abs().checked_sqrt() {
            Some(r) => {
                out.points.extend(checked_point(g, x, z, Integer::from(r)));
                limits.first_only
            }
            None => false,
        }
    };
    for h in 1..=height {
        if clock.expired_now() {
            sort_points(&mut out.points);
            return out;
        }
        let hi = h as i64;
        let mut pairs: Vec<(i64, u64)> = Vec::new();
        if h == 1 {
            pairs.push((1, 0));
        }
        pairs.extend((-hi..=hi).map(|x| (x, h)));
        for z in 1..h {
            pairs.push((-hi, z));
            pairs.push((hi, z));
        }
        for (x, z) in pairs {
            if test(x, z, &mut out) {
                sort_points(&mut out.points);
                return out;
            }
        }
        out.height_reached = h;
    }
    out.complete = !clamped;
    sort_points(&mut out.points);
    out
}
