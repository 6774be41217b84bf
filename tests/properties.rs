//! Property tests on random curves: group law, Hasse's bound, torsion and
//! rank bounds under changes of model, isogenous curves.

use malachite::{Integer, Natural, Rational};
use proptest::prelude::*;
use twofold::arith::{factor, primes_up_to, FactorLimits};
use twofold::search::{search_curve, SearchLimits};
use twofold::torsion::TorsionGroup;
use twofold::{analyse, Curve, ModelChange, Point, RankOptions};

fn bad_primes(e: &Curve) -> Vec<Natural> {
    factor(e.discriminant(), &FactorLimits::default()).unwrap().primes().cloned().collect()
}

fn small_curve() -> impl Strategy<Value = Curve> {
    (-2i64..=2, -3i64..=3, -2i64..=2, -30i64..=30, -60i64..=60)
        .prop_filter_map("singular", |(a1, a2, a3, a4, a6)| Curve::from_coefficients([a1 % 2, a2, a3 % 2, a4, a6]).ok())
}

fn change() -> impl Strategy<Value = ModelChange> {
    (prop::sample::select(vec![1i64, 2, 3, 6]), -5i64..=5, -3i64..=3, -5i64..=5).prop_map(|(u, r, s, t)| {
        // u = 1/k keeps the model integral: a_i' = k^i (...)
        ModelChange::new(Rational::from_signeds(1, u), Rational::from(r), Rational::from(s), Rational::from(t)).unwrap()
    })
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 48, ..ProptestConfig::default() })]

    /// The group law is commutative and associative on the points a small
    /// search finds, and P + (-P) = O (Silverman, AEC III.2).
    #[test]
    fn group_law(e in small_curve()) {
        let pts = search_curve(&e, &SearchLimits::new(30)).points;
        let pts: Vec<Point> = pts.into_iter().take(4).map(|(x, y)| Point::Affine(x, y)).collect();
        for p in &pts {
            prop_assert!(e.contains(p));
            prop_assert_eq!(e.add(p, &e.negate(p)), Point::Infinity);
            for q in &pts {
                let s = e.add(p, q);
                prop_assert!(e.contains(&s));
                prop_assert_eq!(&s, &e.add(q, p));
                for r in &pts {
                    prop_assert_eq!(e.add(&s, r), e.add(p, &e.add(q, r)));
                }
            }
        }
    }

    /// Hasse's theorem: |a_p| <= 2 sqrt(p) at good primes.
    #[test]
    fn hasse_bound(e in small_curve()) {
        for p in primes_up_to(400) {
            if twofold::arith::valuation(e.discriminant(), &Natural::from(p)) == Some(0) {
                let a = e.trace_of_frobenius(p);
                prop_assert!((a * a) as u64 <= 4 * p, "p = {}, a_p = {}", p, a);
            }
        }
    }

    /// Torsion structure, j, dim Sel^2 and the rank bounds do not depend on the model.
    #[test]
    fn invariance_under_change_of_model(e in small_curve(), c in change()) {
        let Ok(e2) = e.apply_change(&c) else { return Ok(()) };
        prop_assert_eq!(e.j_invariant(), e2.j_invariant());
        let t1 = TorsionGroup::compute(&e, &bad_primes(&e));
        let t2 = TorsionGroup::compute(&e2, &bad_primes(&e2));
        prop_assert_eq!(t1.invariants(), t2.invariants());
        let o = RankOptions::default().with_search_height(60);
        let r1 = analyse(&e, &o).unwrap();
        let r2 = analyse(&e2, &o).unwrap();
        prop_assert_eq!(&r1.conductor, &r2.conductor);
        prop_assert_eq!(r1.rank_upper, r2.rank_upper);
        // dim Sel^2(E) is an invariant of the curve, not of the model
        prop_assert_eq!(r1.two_selmer_dim, r2.two_selmer_dim);
        if let (Some(a), Some(b)) = (r1.rank(), r2.rank()) {
            prop_assert_eq!(a, b);
        }
        for p in &r2.points {
            prop_assert!(e2.contains(p));
        }
    }

    /// Isogenous curves have the same rank: the intervals of E and of
    /// E' = E / <T> intersect, and proven ranks agree (Silverman, AEC III.4).
    #[test]
    fn isogenous_curves(a in -20i64..=20, b in -40i64..=40) {
        prop_assume!(b != 0 && a * a - 4 * b != 0);
        let e = Curve::from_coefficients([0, a, 0, b, 0]).unwrap();
        let e1 = Curve::from_coefficients([0, -2 * a, 0, a * a - 4 * b, 0]).unwrap();
        let o = RankOptions::default().with_search_height(60);
        let r = analyse(&e, &o).unwrap();
        let r1 = analyse(&e1, &o).unwrap();
        let (l, u) = (r.rank_lower.unwrap(), r.rank_upper.unwrap());
        let (l1, u1) = (r1.rank_lower.unwrap(), r1.rank_upper.unwrap());
        prop_assert!(l.max(l1) <= u.min(u1), "[{}, {}] and [{}, {}]", l, u, l1, u1);
        for p in r.points.iter() { prop_assert!(e.contains(p)); }
        let _ = Integer::from(0);
    }
}
