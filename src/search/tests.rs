//! Tests of the point searches: known points from the literature, the sieve
//! against the naive search on generated input, and the stopping rules.

use super::*;
use crate::Curve;
use malachite::base::num::basic::traits::Zero;
use malachite::{Integer, Rational};
use proptest::prelude::*;
use std::collections::BTreeSet;
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use std::time::{Duration, Instant};

fn q(s: &str) -> Rational {
    s.parse().unwrap()
}

fn quartic(c: [i64; 5]) -> [Integer; 5] {
    c.map(Integer::from)
}

fn eval_quartic(g: &[Integer; 5], x: &Integer, z: &Integer) -> Integer {
    // Term by term (not Horner), as an independent evaluation.
    let mut v = Integer::ZERO;
    for (k, c) in g.iter().enumerate() {
        let mut t = c.clone();
        for _ in 0..(4 - k) {
            t *= x;
        }
        for _ in 0..k {
            t *= z;
        }
        v += t;
    }
    v
}

fn on_curve(e: &Curve, x: &Rational, y: &Rational) -> bool {
    let [a1, a2, a3, a4, a6] = e.coefficients().clone().map(Rational::from);
    y * y + &a1 * x * y + &a3 * y == x * x * x + &a2 * x * x + &a4 * x + &a6
}

/// Chord-and-tangent addition on a general Weierstrass model (Silverman,
/// AEC, III.2.3); `None` is the point at infinity.
fn add(e: &Curve, p: &Option<(Rational, Rational)>, r: &Option<(Rational, Rational)>) -> Option<(Rational, Rational)> {
    let [a1, a2, a3, a4, _] = e.coefficients().clone().map(Rational::from);
    let (Some((x1, y1)), Some((x2, y2))) = (p, r) else {
        return p.clone().or(r.clone());
    };
    let lambda = if x1 != x2 {
        (y2 - y1) / (x2 - x1)
    } else {
        let den = Rational::from(2) * y1 + &a1 * x1 + &a3;
        if den == Rational::ZERO || y1 != y2 {
            return None;
        }
        (Rational::from(3) * x1 * x1 + Rational::from(2) * &a2 * x1 + &a4 - &a1 * y1) / den
    };
    let nu = y1 - &lambda * x1;
    let x3 = &lambda * &lambda + &a1 * &lambda - &a2 - x1 - x2;
    let y3 = -(&lambda + &a1) * &x3 - nu - a3;
    Some((x3, y3))
}

fn naive_height(x: &Rational) -> Integer {
    let n = Integer::from(x.numerator_ref().clone());
    let d = Integer::from(x.denominator_ref().clone());
    n.max(d)
}

fn check_quartic_points(g: &[Integer; 5], out: &SearchOutcome<QuarticPoint>) {
    for p in &out.points {
        assert_eq!(&p.y * &p.y, eval_quartic(g, &p.x, &p.z), "not a point: {p:?}");
        assert!(p.y >= 0 && p.z >= 0);
    }
}

// ---- known points ----------------------------------------------------------

#[test]
fn rank_one_conductor_37_points_are_the_multiples_of_the_generator() {
    // y^2 + y = x^3 - x, conductor 37: the published tables (Cremona 1997) (Algorithms for
    // Modular Elliptic Curves, table 1, curve y^2 + y = x^3 - x) give rank 1, trivial
    // torsion, generator P = (0, 0). Recalled x-coordinates of nP (from
    // memory), each checked on the equation below: 0, 1, -1, 2, 1/4, 6,
    // -5/9, 21/25, -20/49, 161/16.
    let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
    let remembered = ["0", "1", "-1", "2", "1/4", "6", "-5/9", "21/25", "-20/49", "161/16"];
    // Independent computation: the multiples nP by chord and tangent.
    let gen = Some((q("0"), q("0")));
    let mut mult = gen.clone();
    let mut xs = Vec::new();
    for _ in 1..=15 {
        let (x, y) = mult.clone().unwrap();
        assert!(on_curve(&e, &x, &y));
        xs.push(x);
        mult = add(&e, &mult, &gen);
    }
    for (n, s) in remembered.iter().enumerate() {
        assert_eq!(xs[n], q(s), "x({}P)", n + 1);
    }
    // The points of naive height <= 100 are +-nP for n <= 9; ĥ(P) ~ 0.051
    // makes H(x(nP)) grow like exp(0.051 n^2), far past 100 beyond n = 15.
    let want: BTreeSet<Rational> = xs.iter().filter(|x| naive_height(x) <= 100).cloned().collect();
    assert_eq!(want.len(), 9);
    let out = search_curve(&e, &SearchLimits::new(100));
    assert!(out.complete);
    assert_eq!(out.height_reached, 100);
    let got: BTreeSet<Rational> = out.points.iter().map(|p| p.0.clone()).collect();
    assert_eq!(got, want);
    // Both P and -P = (x, -1 - y) for every x: 18 points.
    assert_eq!(out.points.len(), 18);
    for (x, y) in &out.points {
        assert!(on_curve(&e, x, y));
        assert!(out.points.contains(&(x.clone(), -y - Rational::from(1))));
    }
    assert_eq!(out, search_curve_naive(&e, &SearchLimits::new(100)));
}

#[test]
fn congruent_number_five() {
    // y^2 = x^3 - 25x, the curve of the congruent number 5 (Koblitz,
    // Introduction to Elliptic Curves and Modular Forms, I.1-I.2). Checked by
    // hand:
    //   (-4, 6):      -64 + 100 = 36 = 6^2;
    //   (45, 300):    91125 - 1125 = 90000 = 300^2;
    //   (25/4, 75/8): 15625/64 - 10000/64 = 5625/64 = (75/8)^2;
    //   (1681/144, 62279/1728): x (x^2 - 25) = 1681 * 2307361 / 144^3 and
    //     2307361 = 1519^2, 41 * 1519 = 62279, 144^3 = 1728^2 (from the
    //     triangle 3/2, 20/3, 41/6 with x = (41/12)^2);
    //   2-torsion (0, 0), (5, 0), (-5, 0).
    // (x = 45/4 is not on it: x^3 - 25x = 73125/64 and 73125 is no square.)
    let e = Curve::from_coefficients([0, 0, 0, -25, 0]).unwrap();
    let out = search_curve(&e, &SearchLimits::new(1681));
    assert!(out.complete);
    for (x, y) in [("-4", "6"), ("-4", "-6"), ("45", "300"), ("25/4", "75/8"), ("1681/144", "62279/1728"), ("0", "0"), ("5", "0"), ("-5", "0")] {
        assert!(out.points.contains(&(q(x), q(y))), "missing ({x}, {y})");
    }
    assert!(!out.points.iter().any(|p| p.0 == q("45/4")));
    for (x, y) in &out.points {
        assert!(on_curve(&e, x, y));
    }
    // 2-torsion points appear once, the others with both signs.
    assert_eq!(out.points.iter().filter(|p| p.0 == q("5")).count(), 1);
    let small = SearchLimits::new(120);
    assert_eq!(search_curve(&e, &small), search_curve_naive(&e, &small));
}

#[test]
fn lind_reichardt_quartic_has_no_points() {
    // x^4 - 17 y^4 = 2 w^2 has no non-trivial rational solution (Lind 1940,
    // Reichardt 1942; see Silverman, AEC, X.6.5), although it is soluble in
    // every completion of Q. Doubling, (2w)^2 = 2 x^4 - 34 y^4: the quartic
    // y^2 = 2 z^4 - 34 x^4 has no point.
    let g = quartic([-34, 0, 0, 0, 2]);
    let out = search_quartic(&g, &SearchLimits::new(3000));
    assert!(out.complete);
    assert!(out.points.is_empty());
    assert_eq!(out.candidates_tested, 1 + 3000 * 6001);
    let small = SearchLimits::new(150);
    assert_eq!(search_quartic(&g, &small), search_quartic_naive(&g, &small));
}

/// A search above a height already searched covers exactly the pairs left:
/// on the Lind-Reichardt quartic (no points, see above) the pairs with
/// `z >= 1` and `300 < max(|x|, z) <= 3000` are `3000 * 6001 - 300 * 601`
/// (a quarter of a rung's pairs when the height doubles); on quartics with
/// points the points below and above together are those of the whole search.
#[test]
fn a_search_above_covers_the_rest() {
    let g = quartic([-34, 0, 0, 0, 2]);
    let out = search_quartic_above(&g, &SearchLimits::new(3000), 300);
    assert!(out.complete && out.points.is_empty());
    assert_eq!(out.candidates_tested, 3000 * 6001 - 300 * 601);
    for c in [[1, 0, -3, 0, 1], [1, 2, -5, 7, 4], [-3, 1, 9, -2, 1]] {
        let g = quartic(c);
        for (lo, hi) in [(0u64, 200u64), (16, 200), (50, 200), (100, 200), (17, 500)] {
            let whole = search_quartic(&g, &SearchLimits::new(hi));
            let below = search_quartic(&g, &SearchLimits::new(lo));
            let above = search_quartic_above(&g, &SearchLimits::new(hi), lo);
            assert!(above.complete && above.height_reached == hi);
            let mut both: Vec<_> = below.points.iter().chain(&above.points).cloned().collect();
            both.sort_by_key(|p| (p.x.clone(), p.z.clone()));
            let mut all = whole.points.clone();
            all.sort_by_key(|p| (p.x.clone(), p.z.clone()));
            assert_eq!(both, all, "{c:?} {lo} {hi}");
            assert_eq!(below.candidates_tested + above.candidates_tested, whole.candidates_tested, "{c:?} {lo} {hi}");
        }
    }
}

#[test]
fn fermat_quartics() {
    // Fermat: x^4 + y^4 = z^2 and x^4 - y^4 = z^2 have only trivial
    // solutions (Hardy & Wright, Theorems 226 and 228 (from memory)).
    let g = quartic([1, 0, 0, 0, 1]);
    let out = search_quartic(&g, &SearchLimits::new(1000));
    let pts: Vec<(i64, i64, i64)> = out.points.iter().map(|p| (to_i64(&p.x), to_i64(&p.z), to_i64(&p.y))).collect();
    assert_eq!(pts, [(1, 0, 1), (0, 1, 1)]);
    let g = quartic([-1, 0, 0, 0, 1]);
    let out = search_quartic(&g, &SearchLimits::new(1000));
    let pts: Vec<(i64, i64, i64)> = out.points.iter().map(|p| (to_i64(&p.x), to_i64(&p.z), to_i64(&p.y))).collect();
    assert_eq!(pts, [(-1, 1, 0), (0, 1, 1), (1, 1, 0)]);
    let g = quartic([1, 0, 0, 0, -1]);
    let out = search_quartic(&g, &SearchLimits::new(1000));
    let pts: Vec<(i64, i64, i64)> = out.points.iter().map(|p| (to_i64(&p.x), to_i64(&p.z), to_i64(&p.y))).collect();
    assert_eq!(pts, [(1, 0, 1), (-1, 1, 0), (1, 1, 0)]);
}

fn to_i64(n: &Integer) -> i64 {
    i64::try_from(n).unwrap()
}

#[test]
fn quartic_with_large_point() {
    // g = (x^2 - 577 z^2)^2 + 4 x z (z^2 - x^2) is a square wherever
    // x z (z^2 - x^2) = 0: the points (1:0:1), (0:1:577), (+-1:1:576).
    let g = quartic([1, -4, -1154, 4, 577 * 577]);
    let lim = SearchLimits::new(200);
    let out = search_quartic(&g, &lim);
    check_quartic_points(&g, &out);
    assert_eq!(out, search_quartic_naive(&g, &lim));
    for (x, z) in [(1, 0), (0, 1), (1, 1), (-1, 1)] {
        assert!(out.points.iter().any(|p| p.x == x && p.z == z), "({x}:{z})");
    }
}

// ---- limits ------------------------------------------------------------------

#[test]
fn first_only_stops_at_one_point() {
    let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
    let all = search_curve(&e, &SearchLimits::new(100));
    let one = search_curve(&e, &SearchLimits { first_only: true, ..SearchLimits::new(100) });
    assert_eq!(one.points.len(), 1);
    assert!(!one.complete);
    assert!(all.points.contains(&one.points[0]));
    assert!(one.candidates_tested < all.candidates_tested);

    let g = quartic([1, 0, -3, 0, 1]);
    let all = search_quartic(&g, &SearchLimits::new(50));
    let one = search_quartic(&g, &SearchLimits { first_only: true, ..SearchLimits::new(50) });
    assert_eq!(one.points.len(), 1);
    assert!(all.points.contains(&one.points[0]));
    let one = search_quartic_naive(&g, &SearchLimits { first_only: true, ..SearchLimits::new(50) });
    assert_eq!(one.points.len(), 1);
    assert!(all.points.contains(&one.points[0]));
}

#[test]
fn deadline_and_cancel_stop_the_search() {
    let g = quartic([-34, 0, 0, 0, 2]);
    let past = SearchLimits { deadline: Some(Instant::now()), ..SearchLimits::new(100_000) };
    let out = search_quartic(&g, &past);
    assert!(!out.complete);
    assert!(out.height_reached < 100_000);
    let out = search_quartic_naive(&g, &past);
    assert!(!out.complete && out.height_reached == 0);

    let flag = Arc::new(AtomicBool::new(true));
    let cancelled = SearchLimits { cancel: Some(flag.clone()), ..SearchLimits::new(100_000) };
    let out = search_quartic(&g, &cancelled);
    assert!(!out.complete && out.height_reached == 0);
    let e = Curve::from_coefficients([0, 0, 0, -25, 0]).unwrap();
    let out = search_curve(&e, &cancelled);
    assert!(!out.complete && out.height_reached == 0);

    // A short deadline on a long search: stops soon, exhaustive up to
    // height_reached (every point of the full search up to there is found).
    flag.store(false, Ordering::Relaxed);
    let start = Instant::now();
    let soon = SearchLimits { deadline: Some(start + Duration::from_millis(50)), ..SearchLimits::new(1 << 30) };
    let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
    let out = search_curve(&e, &soon);
    assert!(start.elapsed() < Duration::from_secs(5));
    assert!(!out.complete);
    let h = out.height_reached;
    let full = search_curve(&e, &SearchLimits::new(h));
    for p in &full.points {
        assert!(out.points.contains(p));
    }
}

#[test]
fn small_and_clamped_heights() {
    let g = quartic([1, 0, 0, 0, 1]);
    let out = search_quartic(&g, &SearchLimits::new(0));
    assert!(out.complete && out.points.is_empty() && out.candidates_tested == 0);
    assert_eq!(out, search_quartic_naive(&g, &SearchLimits::new(0)));
    for h in 1..=20 {
        let lim = SearchLimits::new(h);
        assert_eq!(search_quartic(&g, &lim), search_quartic_naive(&g, &lim), "height {h}");
    }
    let huge = SearchLimits { deadline: Some(Instant::now()), ..SearchLimits::new(u64::MAX) };
    assert!(!search_quartic(&g, &huge).complete);
}

// ---- sieve against the naive search -------------------------------------------

/// A quartic with the planted point (x0 : 1 : y0).
fn planted_quartic(a: i64, b: i64, c: i64, d: i64, x0: i64, y0: i64) -> [Integer; 5] {
    let mut g = quartic([a, b, c, d, 0]);
    let v = eval_quartic(&g, &Integer::from(x0), &Integer::from(1));
    g[4] = Integer::from(y0) * Integer::from(y0) - v;
    g
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 64, ..ProptestConfig::default() })]

    #[test]
    fn quartic_sieve_matches_naive(a in -30i64..30, b in -30i64..30, c in -30i64..30, d in -30i64..30,
                                   x0 in -20i64..20, y0 in 0i64..50, h in 0u64..45) {
        let g = planted_quartic(a, b, c, d, x0, y0);
        let lim = SearchLimits::new(h);
        let fast = search_quartic(&g, &lim);
        check_quartic_points(&g, &fast);
        prop_assert_eq!(&fast, &search_quartic_naive(&g, &lim));
        if h >= x0.unsigned_abs() && h >= 1 {
            prop_assert!(fast.points.iter().any(|p| p.x == x0 && p.z == 1));
        }
    }

    #[test]
    fn quartic_sieve_matches_naive_big_coefficients(a in any::<i64>(), e in any::<i64>(), b in -5i64..5,
                                                    x0 in -9i64..9, y0 in any::<u32>(), h in 9u64..25) {
        // Coefficients near 2^100 force the Integer path.
        let big = Integer::from(1) << 100u32;
        let mut g = planted_quartic(0, b, 0, 0, x0, y0 as i64);
        g[0] = Integer::from(a) * &big;
        g[2] = Integer::from(e);
        g[4] = Integer::ZERO;
        let v = eval_quartic(&g, &Integer::from(x0), &Integer::from(1));
        g[4] = Integer::from(y0) * Integer::from(y0) - v;
        let lim = SearchLimits::new(h);
        let fast = search_quartic(&g, &lim);
        check_quartic_points(&g, &fast);
        prop_assert_eq!(&fast, &search_quartic_naive(&g, &lim));
        prop_assert!(fast.points.iter().any(|p| p.x == x0 && p.z == 1));
    }

    #[test]
    fn quartic_square_forms(p in -6i64..6, r in -6i64..6, s in 1i64..6, t in -3i64..4, h in 1u64..40) {
        // g = t^2 (p x^2 + r x z + s z^2)^2 - x z^3: many residues square.
        let g = quartic([t * t * p * p, 2 * t * t * p * r, t * t * (r * r + 2 * p * s), 2 * t * t * r * s - 1, t * t * s * s]);
        let lim = SearchLimits::new(h);
        prop_assert_eq!(search_quartic(&g, &lim), search_quartic_naive(&g, &lim));
    }

    #[test]
    fn curve_sieve_matches_naive(a1 in -3i64..3, a2 in -10i64..10, a3 in -3i64..3, a4 in -30i64..30,
                                 x0 in -15i64..15, y0 in -40i64..40, h in 0u64..160) {
        let a6 = y0 * y0 + a1 * x0 * y0 + a3 * y0 - x0 * x0 * x0 - a2 * x0 * x0 - a4 * x0;
        let Ok(e) = Curve::from_coefficients([a1, a2, a3, a4, a6]) else { return Ok(()) };
        let lim = SearchLimits::new(h);
        let fast = search_curve(&e, &lim);
        for (x, y) in &fast.points {
            prop_assert!(on_curve(&e, x, y));
        }
        prop_assert_eq!(&fast, &search_curve_naive(&e, &lim));
        if h >= x0.unsigned_abs() && h >= 1 {
            prop_assert!(fast.points.contains(&(Rational::from(x0), Rational::from(y0))));
        }
    }
}
