//! The covering search is raised step by step while the bounds do not meet
//! (issue: find the points). y^2 = x^3 + 1000003 has a generator too large
//! for the first height (300): with the ceiling at 300 the rank is left
//! open, with the default ceiling the bounds meet at 3. The rank is proven
//! by the descent itself (three independent points verified exactly, and
//! the Selmer bound); no published value is used here.

use std::time::Duration;
use twofold::{analyse, Curve, RankOptions};

fn curve() -> Curve {
    Curve::from_coefficients([0, 0, 0, 0, 1000003]).unwrap()
}

#[test]
fn a_fixed_height_leaves_the_gap_open() {
    let opts = RankOptions::default().with_evidence(false).with_search_height_ceiling(300);
    let r = analyse(&curve(), &opts).unwrap();
    assert_eq!(r.rank_upper, Some(3));
    assert!(r.rank_lower < Some(3));
    assert!(r.sha_suspects.iter().all(|s| s.searched_height == 300 && !s.in_sha));
}

#[test]
fn the_adaptive_search_closes_it() {
    let opts = RankOptions::default().with_evidence(false);
    let r = analyse(&curve(), &opts).unwrap();
    assert_eq!(r.rank(), Some(3));
    assert_eq!(r.rank_proven_by, vec![twofold::report::ProofRoute::Descent]);
    assert_eq!(r.points.len(), 3);
    assert!(r.points.iter().all(|p| curve().contains(p)));
    assert_eq!(r.sha2_dim, Some(0));
}

/// y^2 = x^3 - 3901: conductor 6,574,090,032 (above the Heegner route's
/// range, so the plain search is the only source of a point), Sel^2 of
/// dimension 1, analytic rank 1 proven here. Its generator lies beyond the
/// former fixed ceiling 4800 (the covering point is found between 9,600 and
/// 19,200); the ladder driven by the budget reaches it with the default
/// options of the `rank` example (30 s budget).
fn k3901() -> Curve {
    Curve::from_coefficients([0, 0, 0, 0, -3901]).unwrap()
}

#[test]
fn the_budget_driven_ladder_finds_a_generator_beyond_the_old_ceiling() {
    let e = k3901();
    let opts = RankOptions::default().with_time_limit(Duration::from_secs(30));
    let r = analyse(&e, &opts).unwrap();
    assert_eq!(r.rank(), Some(1));
    assert_eq!(r.points.len(), 1);
    // verified exactly on the curve (rational arithmetic)
    assert!(e.contains(&r.points[0]));
    assert!(!r.budget_exhausted);
    // a generator, not a multiple: by the Birch and Swinnerton-Dyer formula
    // (Birch and Swinnerton-Dyer 1965; rank 1: Gross-Zagier 1986),
    // L'(E,1) = Omega R #Sha prod c_p / #T^2 with trivial torsion, every
    // c_p = 1 (Kodaira type II at 2, 3, 47, 83: c_p = 1 by Tate's
    // algorithm) and one real component; so h(P) = R k^2 = k^2 L'(E,1) /
    // (Omega #Sha) for the index k of P. The ratio 1 (to 1e-8) means k = 1
    // and #Sha = 1, conditional on BSD (the report's L' enclosure and
    // period are the inputs).
    let lp = r.analytic.as_ref().and_then(|a| a.value.as_ref()).expect("L'(E,1) enclosure");
    let ev = r.evidence.as_ref().unwrap();
    let omega = ev.real_period.unwrap();
    let h = ev.heights[0];
    let predicted = 0.5 * (lp.low + lp.high) / omega;
    assert!((h / predicted - 1.0).abs() < 1e-8, "height {h}, L'/Omega {predicted}");
}

#[test]
fn the_old_ceiling_leaves_its_own_covering_without_a_point() {
    let opts = RankOptions::default().with_time_limit(Duration::from_secs(30)).with_search_height_ceiling(4800).with_evidence(false);
    // the curve's own covering alone, up to the old ceiling
    let d = twofold::descent::full::full_descent(&k3901(), &opts).unwrap();
    assert_eq!((d.lower, d.upper), (0, Some(1)));
    // the pipeline then searches the 3-isogenous y^2 = x^3 + 27 * 3901,
    // whose generator has a third of the height (see
    // `a_generator_comes_from_the_three_isogenous_curve` below)
    let r = analyse(&k3901(), &opts).unwrap();
    assert_eq!(r.rank(), Some(1));
    assert_eq!(r.points.len(), 1);
    assert!(k3901().contains(&r.points[0]));
    assert_eq!(r.descent_curve, Some((Curve::from_coefficients([0, 0, 0, 0, 105327]).unwrap(), 3)));
}

/// [0,-1,1,-929,-10595]: conductor 571, rank 0, #Sha = 4 (Cremona 1997,
/// Table 1 and Table 4; from memory), no rational 2-torsion: dim Sel^2 = 2
/// and the two non-trivial coverings have no rational point.
fn sha_curve() -> Curve {
    Curve::from_coefficients([0, -1, 1, -929, -10595]).unwrap()
}

#[test]
fn the_ladder_stays_at_the_floor_when_the_bounds_meet() {
    // the analytic route proves rank 0, so the lower bound 0 already meets
    // the rank: the coverings are searched at the floor only
    let r = analyse(&sha_curve(), &RankOptions::default().with_evidence(false)).unwrap();
    assert_eq!(r.rank(), Some(0));
    assert_eq!(r.sha2_dim, Some(2));
    assert!(!r.sha_suspects.is_empty());
    assert!(r.sha_suspects.iter().all(|s| s.searched_height == 300), "{:?}", r.sha_suspects);
    // a rank-one curve whose point comes at the floor: y^2 + y = x^3 - x
    // (conductor 37, rank 1: Cremona 1997, Table 1)
    let d = twofold::descent::full::full_descent(&Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(), &RankOptions::default()).unwrap();
    assert_eq!((d.lower, d.upper, d.searched_height), (1, Some(1), 300));
}

#[test]
fn without_a_proof_the_ladder_climbs_until_its_cpu_cap() {
    // without the analytic route nothing tells the ladder that the gap
    // [0, 2] is Sha: it climbs while its next rung fits in 300 ms of CPU
    // time, and says how high it went; that stop is the ladder's design,
    // not a budget cut short
    let opts = RankOptions::default()
        .with_evidence(false)
        .with_analytic_route(false)
        .with_search_time_limit(Duration::from_millis(300));
    let r = analyse(&sha_curve(), &opts).unwrap();
    assert_eq!((r.rank_lower, r.rank_upper), (Some(0), Some(2)));
    assert!(!r.budget_exhausted);
    let h = r.sha_suspects.iter().map(|s| s.searched_height).min().unwrap();
    assert!(h > 300 && h < 1 << 20, "searched to {h}");
    assert!(r.sha_suspects.iter().all(|s| s.searched_height == h));
}

/// y^2 = x^3 - 2558: rank 1 proven here (analytic rank 1; conductor above
/// the Heegner route's range), Sel^2 of dimension 1. Its generator has
/// canonical height about 68, beyond the quartic search on the curve's own
/// covering within the default budget; the 3-isogenous curve
/// y^2 = x^3 + 27 * 2558 has one of a third of that height (for a rank-one
/// class linked by an isogeny of prime degree l, one generator has l times
/// the height of the other: h(phi P) = l h(P) and phi' phi = [l]), which
/// its covering search finds at once, and the isogeny carries it back.
#[test]
fn a_generator_comes_from_the_three_isogenous_curve() {
    let e = Curve::from_coefficients([0, 0, 0, 0, -2558]).unwrap();
    let opts = RankOptions::default().with_time_limit(Duration::from_secs(30));
    let r = analyse(&e, &opts).unwrap();
    assert_eq!(r.rank(), Some(1));
    assert_eq!(r.points.len(), 1);
    assert!(e.contains(&r.points[0]));
    // y^2 = x^3 + k and y^2 = x^3 - 27k are 3-isogenous (the kernel is
    // {O, (0, +-sqrt k)}; Velu's formulas)
    let (other, degree) = r.descent_curve.clone().expect("the search ran on the isogenous curve");
    assert_eq!(degree, 3);
    assert_eq!(other, Curve::from_coefficients([0, 0, 0, 0, 69066]).unwrap());
    // the point is a generator: the Birch and Swinnerton-Dyer formula
    // (Gross-Zagier 1986 for rank one) with trivial torsion gives
    // h(P) = k^2 L'(E,1) / (Omega #Sha prod c_p) for the index k of P; the
    // ratio 1 (to 1e-8) means k = 1 and #Sha = 1, conditional on BSD
    let lp = r.analytic.as_ref().and_then(|a| a.value.as_ref()).expect("L'(E,1) enclosure");
    let ev = r.evidence.as_ref().unwrap();
    assert!(r.torsion.is_empty(), "{:?}", r.torsion);
    let c: f64 = ev.tamagawa.iter().map(|(_, c)| *c as f64).product();
    let predicted = 0.5 * (lp.low + lp.high) / (ev.real_period.unwrap() * c);
    let h = ev.heights[0];
    assert!((h / predicted - 1.0).abs() < 1e-8, "height {h}, L'/(Omega c) {predicted}");
}
