//! L-series special values, analytic ranks and BSD quotients against
//! published values and the tables in tests/data (see tests/data/README.md).

mod common;

use malachite::Natural;
use twofold::rootno::minimal_conductor_sign;
use twofold::lseries::{
    analytic_rank, bsd_sha, dirichlet_coefficients, special_values, BsdInputs, RankBasis,
};
use twofold::{Curve, ErrorKind};

fn curve(a: [i64; 5]) -> Curve {
    Curve::from_coefficients(a).unwrap()
}

fn nat(n: u64) -> Natural {
    Natural::from(n)
}

/// `|got - want| <= tol |want|`, and the stated error bound covers the
/// distance to the published value up to its printed digits.
fn close(got: f64, want: f64, tol: f64) -> bool {
    (got - want).abs() <= tol * want.abs()
}

#[test]
fn rank_zero_conductor_11() {
    // L(y^2 + y = x^3 - x^2 - 10x - 20, 1) = 0.2538418608559... (from memory; the published tables (Cremona 1997))
    let v = special_values(&curve([0, -1, 1, -10, -20]), &nat(11), 1, 3).unwrap();
    assert!(close(v[0].value, 0.2538418608559, 1e-12), "{:?}", v[0]);
    assert!(v[0].error < 1e-14, "{:?}", v[0]);
    assert!(v[1].by_sign && v[3].by_sign && !v[2].by_sign);
    let a = analytic_rank(&curve([0, -1, 1, -10, -20]), &nat(11), 1).unwrap();
    assert_eq!((a.rank, a.basis), (0, RankBasis::NonZeroValue));
}

#[test]
fn rank_one_conductor_37() {
    // L'(y^2 + y = x^3 - x, 1) = 0.3059997738340... (from memory; the published tables (Cremona 1997))
    let a = analytic_rank(&curve([0, 0, 1, -1, 0]), &nat(37), -1).unwrap();
    assert_eq!((a.rank, a.basis), (1, RankBasis::NonZeroValue));
    assert!(close(a.leading.value, 0.3059997738340, 1e-12), "{:?}", a.leading);
    assert!(a.leading.error < 1e-13);
}

#[test]
fn rank_two_conductor_389() {
    // L''(y^2 + y = x^3 + x^2 - 2x, 1)/2! = 0.7593165002... (from memory: L'' = 1.5186330005)
    let a = analytic_rank(&curve([0, 1, 1, -2, 0]), &nat(389), 1).unwrap();
    assert_eq!((a.rank, a.basis), (2, RankBasis::NumericalZeros));
    let (c, err) = a.leading_coefficient();
    assert!(close(c, 0.7593165002, 2e-10), "{c}"); // recalled digits truncated
    assert!(err < 1e-12, "{err}");
    assert!(a.values[0].value.abs() <= a.values[0].error && a.values[0].error < 1e-13);
}

#[test]
fn rank_three_conductor_5077() {
    // y^2 + y = x^3 - 7x + 6 = [0,0,1,-7,6], rank 3, L'''(E,1)/3! = 1.7318... (from memory)
    let a = analytic_rank(&curve([0, 0, 1, -7, 6]), &nat(5077), -1).unwrap();
    assert_eq!((a.rank, a.basis), (3, RankBasis::NumericalZeros));
    let (c, err) = a.leading_coefficient();
    assert!(close(c, 1.7318, 1e-4), "{c}");
    assert!(err < 1e-12);
}

#[test]
fn bsd_quotients_of_the_first_curves() {
    // (curve, conductor, torsion, Omega incl. components, regulator, prod c_p):
    // periods and regulators from the published tables (Cremona 1997) (from memory); Sha = 1 for all four.
    let cases: [([i64; 5], u64, u64, f64, f64, u64); 4] = [
        ([0, -1, 1, -10, -20], 11, 5, 1.26920930427955, 1.0, 5),
        ([0, 0, 1, -1, 0], 37, 1, 5.98691729246392, 0.0511114082399688, 1),
        ([0, 1, 1, -2, 0], 389, 1, 4.98042512171011, 0.152460177943144, 1),
        ([0, 0, 1, -7, 6], 5077, 1, 4.15168798308693, 0.417143558758384, 1),
    ];
    for (a, n, t, omega, reg, c) in cases {
        let e = curve(a);
        let (_, _, w) = minimal_conductor_sign(&e).unwrap();
        let r = analytic_rank(&e, &nat(n), w).unwrap();
        let (lead, lead_err) = r.leading_coefficient();
        let s = bsd_sha(&BsdInputs {
            rank: r.rank,
            leading: lead,
            leading_error: lead_err,
            torsion_order: t,
            omega,
            regulator: reg,
            tamagawa_product: c,
            relative_error: 1e-13,
        })
        .unwrap();
        assert_eq!((s.nearest, s.is_square), (1, true), "{a:?}: {s:?}");
        // the recalled periods and regulators carry 15 digits
        assert!((s.value - 1.0).abs() < 1e-9, "{a:?}: {s:?}");
    }
    let bad = BsdInputs {
        rank: 0,
        leading: 1.0,
        leading_error: 0.0,
        torsion_order: 1,
        omega: 0.0,
        regulator: 1.0,
        tamagawa_product: 1,
        relative_error: 0.0,
    };
    assert_eq!(bsd_sha(&bad).unwrap_err().kind(), &ErrorKind::InvalidValue);
}

#[test]
fn table_ranks_equal_analytic_ranks() {
    // Every curve of Cremona 1997, Table 1 copy (conductor <= 162) and of the
    // Sha list (all rank 0): the analytic rank equals the published rank.
    for name in ["curves-small-conductor.tsv", "curves-with-sha.tsv"] {
        let rows = common::read_table(name);
        assert!(rows.len() > 20);
        for row in rows {
            let e = curve(row.coefficients);
            let (m, n, w) = minimal_conductor_sign(&e).unwrap();
            assert_eq!(n, nat(row.conductor), "{:?}", row.coefficients);
            let a = analytic_rank(&m, &n, w).unwrap_or_else(|err| panic!("{:?}: {err}", row.coefficients));
            assert_eq!(a.rank, row.rank, "{:?}: {:?}", row.coefficients, a.values);
            assert!(a.leading.error < 1e-12 * a.leading.value.abs(), "{:?}: {:?}", row.coefficients, a.leading);
        }
    }
}

/// `Σ a_n/n (e^{-2πnt/√N} + w e^{-2πn/(t√N)})`, which equals `L(E, 1)` for
/// every `t > 0` (the functional equation, Cremona §2.13); at `t ≠ 1` an
/// independent check of the series at `t = 1`.
fn l_value_at_split(a: &[i64], n: f64, w: f64, t: f64) -> f64 {
    let c = 2.0 * std::f64::consts::PI / n.sqrt();
    let mut s = 0.0;
    for (k, &an) in a.iter().enumerate().skip(1) {
        let k = k as f64;
        s += an as f64 / k * ((-c * k * t).exp() + w * (-c * k / t).exp());
    }
    s
}

#[test]
fn large_conductors_meet_the_accuracy_target() {
    // Curves of our own choosing with conductors between 10^5 and 10^7; the
    // conductor comes from Tate's algorithm, the sign from rootno.
    let (mut checked, mut plus) = (0, 0);
    for (a4, a6) in [(-7i64, 30i64), (-7, 60), (-7, 100), (-7, 150), (3, 250), (3, 200), (5, 120), (-11, 90)] {
        let e = curve([0, 0, 1, a4, a6]);
        let (m, n, w) = minimal_conductor_sign(&e).unwrap();
        let nn = u64::try_from(&n).unwrap();
        if !(100_000..=10_000_000).contains(&nn) {
            continue;
        }
        let v = special_values(&m, &n, w, 3).unwrap();
        for s in v.iter().filter(|s| !s.by_sign) {
            // relative 1e-10 for values of size 0.05 or more; 5e-12 absolute below
            assert!(s.error < 1e-10 * s.value.abs().max(0.05), "N = {nn}: {s:?}");
        }
        eprintln!("[0,0,1,{a4},{a6}]: N = {nn}, w = {w}, {:?}", v);
        if w == 1 {
            plus += 1;
            let terms = v[0].terms * 2;
            let coeffs = dirichlet_coefficients(&m, &n, terms).unwrap();
            let other = l_value_at_split(&coeffs, nn as f64, 1.0, 1.25);
            let d = (other - v[0].value).abs();
            eprintln!("split-point check: difference {d:e}");
            assert!(d <= v[0].error + 1e-13 * v[0].value.abs(), "N = {nn}: {} vs {other}", v[0].value);
        }
        checked += 1;
    }
    assert!(checked >= 4 && plus >= 1, "only {checked} curves in range, {plus} with w = +1");
}

#[test]
fn bad_input_is_an_error() {
    let e = curve([0, -1, 1, -10, -20]);
    assert_eq!(special_values(&e, &nat(11), 0, 1).unwrap_err().kind(), &ErrorKind::InvalidValue);
    assert_eq!(special_values(&e, &nat(11), 1, 4).unwrap_err().kind(), &ErrorKind::InvalidValue);
    assert_eq!(special_values(&e, &nat(121), 1, 1).unwrap_err().kind(), &ErrorKind::InvalidValue);
    assert_eq!(special_values(&e, &nat(22), 1, 1).unwrap_err().kind(), &ErrorKind::InvalidValue);
    assert_eq!(special_values(&e, &nat(0), 1, 1).unwrap_err().kind(), &ErrorKind::InvalidValue);
    // a non-minimal model (scaled by u = 2) of y^2 + y = x^3 - x
    let big = curve([0, 0, 8, -16, 0]);
    assert_eq!(special_values(&big, &nat(37), -1, 1).unwrap_err().kind(), &ErrorKind::InvalidValue);
    assert_eq!(special_values(&e, &nat(20_000_000_000), 1, 1).unwrap_err().kind(), &ErrorKind::TooLarge);
}

#[test]
fn isogenous_curves_share_their_values() {
    // Isogenous curves have the same L-series (Tate's isogeny theorem, the
    // easy direction: equal a_p); the table lists each class's curves
    // under one (conductor, class), with different models and point counts.
    let rows = common::read_table("curves-small-conductor.tsv");
    let mut first: std::collections::HashMap<(u64, u32), (f64, f64)> = Default::default();
    let mut compared = 0;
    for row in rows {
        let e = curve(row.coefficients);
        let (m, n, w) = minimal_conductor_sign(&e).unwrap();
        let a = analytic_rank(&m, &n, w).unwrap();
        let key = (row.conductor, row.class.unwrap());
        match first.get(&key) {
            None => {
                first.insert(key, (a.leading.value, a.leading.error));
            }
            Some(&(v, err)) => {
                assert!((v - a.leading.value).abs() <= err + a.leading.error, "{:?}: {v} vs {}", row.coefficients, a.leading.value);
                compared += 1;
            }
        }
    }
    assert!(compared > 100, "{compared}");
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig::with_cases(64))]
    /// The shared point counter against brute force over F_p^2 (any model,
    /// singular reductions included: both count the affine solutions plus one).
    #[test]
    fn point_counter_matches_brute_force(a in proptest::array::uniform5(-60i64..60), i in 0usize..60) {
        let Ok(e) = Curve::from_coefficients(a) else { return Ok(()) };
        let p = twofold::arith::primes_up_to(300)[i];
        let mut naive = 1u64;
        let r = |v: i64| v.rem_euclid(p as i64) as u64;
        let [a1, a2, a3, a4, a6] = a.map(r);
        for x in 0..p {
            for y in 0..p {
                let lhs = (y * y + a1 * x % p * y + a3 * y) % p;
                let rhs = (x * x % p * x + a2 * x % p * x + a4 * x + a6) % p;
                naive += u64::from(lhs == rhs);
            }
        }
        proptest::prop_assert_eq!(twofold::curve::PointCounter::new(&e).count(p), naive);
    }
}
