//! Root numbers checked against published tables, known values, published
//! theorems (the twisting formula), an independent second computation (the
//! local formulas against the numerical functional-equation test), and for
//! invariance under change of model.
//!
//! Tables (tests/data, see tests/data/README.md): J. E. Cremona,
//! *Algorithms for Modular Elliptic Curves*, 2nd ed., CUP 1997, Table 1
//! (all 572 curves of conductor 11..162), and the same author's list of
//! curves with non-trivial Sha up to conductor 390. For these curves the
//! rank is 0 or 1, equal to the analytic rank (the tables list both; for
//! analytic rank at most 1 equality is the Gross–Zagier–Kolyvagin theorem),
//! and the sign of the functional equation is `(-1)^(analytic rank)`
//! because `L(E, s)` vanishes at `s = 1` to even order when `w = 1` and to
//! odd order when `w = -1`.

mod common;

use malachite::base::num::arithmetic::traits::UnsignedAbs;
use malachite::{Integer, Natural, Rational};
use proptest::prelude::*;
use twofold::arith::{factor, kronecker_i64, FactorLimits};
use twofold::local::{local_data, Reduction};
use twofold::rootno::{
    local_root_number, root_number, root_number_numerical, RootNumber, RootNumberMethod,
};
use twofold::{Curve, ModelChange};

fn curve(a: [i64; 5]) -> Curve {
    Curve::from_coefficients(a).unwrap()
}

fn all_table_rows() -> Vec<common::Row> {
    let mut rows = common::read_table("curves-small-conductor.tsv");
    assert_eq!(rows.len(), 572);
    let sha = common::read_table("curves-with-sha.tsv");
    assert_eq!(sha.len(), 23);
    rows.extend(sha);
    rows
}

fn nat(n: u64) -> Natural {
    Natural::from(n)
}

#[test]
fn known_values_from_memory() {
    // the published tables (Cremona 1997) (from memory): y^2 + y = x^3 - x^2 - 10x - 20 w = +1 (rank 0), y^2 + y = x^3 - x w = -1
    // (rank 1), y^2 + y = x^3 + x^2 - 2x w = +1 (rank 2), y^2 + y = x^3 - 7x + 6 w = -1 (rank 3).
    for (a, w, n) in [
        ([0, -1, 1, -10, -20], 1, 11u64),
        ([0, 0, 1, -1, 0], -1, 37),
        ([0, 1, 1, -2, 0], 1, 389),
        ([0, 0, 1, -7, 6], -1, 5077),
    ] {
        let r = root_number(&curve(a)).unwrap();
        assert_eq!(r.global, w, "{a:?}");
        assert_eq!(r.conductor, nat(n));
        assert_eq!(r.method, RootNumberMethod::LocalAndNumerical);
        assert_eq!(root_number_numerical(&curve(a)), Some(w));
    }
}

/// Every table curve: w = (-1)^rank, the numerical test agrees with the
/// local formulas wherever they cover all bad primes, the conductor is the
/// published one, and entries of `local` are consistent with the global sign.
#[test]
fn published_tables_sign_is_parity_of_rank() {
    let rows = all_table_rows();
    let mut by_method = [0usize; 3];
    for row in &rows {
        let e = curve(row.coefficients);
        let r = root_number(&e).unwrap_or_else(|err| panic!("{:?}: {err}", row.coefficients));
        let want = if row.rank % 2 == 0 { 1 } else { -1 };
        assert_eq!(r.global, want, "{:?} (conductor {}, rank {})", row.coefficients, row.conductor, row.rank);
        assert_eq!(r.conductor, nat(row.conductor), "{:?}", row.coefficients);
        check_consistent(&r);
        match &r.method {
            RootNumberMethod::LocalAndNumerical => by_method[0] += 1,
            RootNumberMethod::Numerical { deduced } if !deduced.is_empty() => by_method[1] += 1,
            RootNumberMethod::Numerical { .. } => by_method[2] += 1,
            m => panic!("unexpected method {m:?} at conductor {}", row.conductor),
        }
        // The numerical route alone gives the same sign.
        assert_eq!(root_number_numerical(&e), Some(want), "{:?}", row.coefficients);
    }
    eprintln!(
        "table curves: {} by local formulas checked numerically, {} with one local sign deduced, {} with w_2 w_3 joint",
        by_method[0], by_method[1], by_method[2]
    );
    assert_eq!(by_method.iter().sum::<usize>(), rows.len());
}

/// `w = -prod local * (product over joint)`, with each local entry also
/// given by `local_root_number` unless it was deduced.
fn check_consistent(r: &RootNumber) {
    let prod: i8 = r.local.iter().map(|(_, s)| *s).product();
    match &r.method {
        RootNumberMethod::Numerical { deduced } if r.joint.is_empty() => {
            assert_eq!(deduced.len(), 1);
            assert_eq!(r.global, -prod);
        }
        RootNumberMethod::Numerical { deduced } => {
            assert!(deduced.is_empty());
            assert_eq!(r.joint, vec![nat(2), nat(3)]);
        }
        RootNumberMethod::Transferred { deduced, .. } if r.joint.is_empty() => {
            assert_eq!(deduced.len(), 1);
            assert_eq!(r.global, -prod);
        }
        RootNumberMethod::Transferred { deduced, .. } => {
            assert!(deduced.is_empty());
            assert_eq!(r.joint, vec![nat(2), nat(3)]);
        }
        _ => {
            assert!(r.joint.is_empty());
            assert_eq!(r.global, -prod);
        }
    }
}

/// The conductor from Tate's algorithm at the primes of the discriminant
/// (test helper, cheaper than a root number).
fn conductor_of(e: &Curve) -> Natural {
    twofold::local::conductor(e, &bad_primes(e)).unwrap().unsigned_abs()
}

/// The primes dividing the discriminant (test helper).
fn bad_primes(e: &Curve) -> Vec<Natural> {
    factor(e.discriminant(), &FactorLimits::default()).unwrap().primes().cloned().collect()
}

#[test]
fn local_entries_match_local_function() {
    for row in all_table_rows().iter().step_by(7) {
        let e = curve(row.coefficients);
        let r = root_number(&e).unwrap();
        let deduced = match &r.method {
            RootNumberMethod::Numerical { deduced } | RootNumberMethod::Transferred { deduced, .. } => deduced.clone(),
            _ => vec![],
        };
        for (p, s) in &r.local {
            let got = local_root_number(&e, p).unwrap();
            if deduced.contains(p) {
                assert_eq!(got, None);
            } else {
                assert_eq!(got, Some(*s), "{:?} at {p}", row.coefficients);
            }
        }
        for p in bad_primes(&e) {
            if local_data(&e, &p).unwrap().reduction == Reduction::Good {
                assert_eq!(local_root_number(&e, &p).unwrap(), Some(1));
            }
        }
    }
}

/// The curve `y^2 = x^3 - 27 D^2 c4 x - 54 D^3 c6`, the quadratic twist by `D`.
fn twist(e: &Curve, d: i64) -> Curve {
    let d = Integer::from(d);
    let a4 = Integer::from(-27) * &d * &d * e.c4();
    let a6 = Integer::from(-54) * &d * &d * &d * e.c6();
    Curve::new([Integer::from(0), Integer::from(0), Integer::from(0), a4, a6]).unwrap()
}

fn is_fundamental_discriminant(d: i64) -> bool {
    let squarefree = |m: i64| (2..=m.abs()).take_while(|k| k * k <= m.abs()).all(|k| m % (k * k) != 0);
    match d.rem_euclid(4) {
        1 => d != 1 && squarefree(d),
        0 => {
            let m = d / 4;
            matches!(m.rem_euclid(4), 2 | 3) && squarefree(m)
        }
        _ => false,
    }
}

/// Quadratic twists of the table curves by fundamental discriminants `D`
/// prime to `N`: `w(E ⊗ χ_D) = χ_D(-N) w(E)` (the twisting formula for
/// newforms: H. Iwaniec and E. Kowalski, *Analytic Number Theory*, AMS
/// 2004, Prop. 14.20 (from memory); Shimura 1971).
#[test]
fn twisting_formula_on_table_curves() {
    let ds = [-3i64, -4, 5, -7, -8, 8, -11, 12, 13, -15, 17, -19, -20, 21, -23, -24, 24];
    let mut checked = 0;
    for (i, row) in all_table_rows().iter().enumerate().step_by(3) {
        let e = curve(row.coefficients);
        let n = row.conductor as i64;
        let w = if row.rank % 2 == 0 { 1 } else { -1 };
        for &d in ds.iter().skip(i % 5).step_by(5) {
            assert!(is_fundamental_discriminant(d));
            let g = (1..=d.unsigned_abs()).filter(|k| d.unsigned_abs().is_multiple_of(*k) && (n as u64).is_multiple_of(*k)).max().unwrap();
            if g != 1 {
                continue;
            }
            // χ_D(-N) = χ_D(-1) χ_D(N), and χ_D(-1) = sign(D) for a discriminant D
            let chi = kronecker_i64(d, n as u64) * if d < 0 { -1 } else { 1 };
            let r = root_number(&twist(&e, d)).unwrap();
            assert_eq!(r.conductor, nat((n * d * d) as u64), "{:?} twisted by {d}", row.coefficients);
            assert_eq!(i32::from(r.global), chi * w, "{:?} twisted by {d}", row.coefficients);
            check_consistent(&r);
            checked += 1;
        }
    }
    assert!(checked > 100, "{checked}");
}

/// Curves `y^2 + xy = x^3 + a2 x^2 + a4 x + a6` (good or multiplicative at
/// 2, as `c4` is odd; not additive at 3 when `a2 ≢ 2 mod 3`) built to have
/// additive, potentially good reduction of type II, III or IV at a prime
/// `p ≥ 5` by prescribing `c4` and `c6` modulo `p^2` or `p^3`. Rohrlich's
/// formula (Compositio 87, 1993) at `p` is checked against the numerical
/// test (`LocalAndNumerical` means the two agreed).
#[test]
fn rohrlich_formula_against_functional_equation() {
    let mut per_case = std::collections::BTreeMap::new();
    for p in [5i64, 7, 11, 13] {
        // (target c4, target c6, modulus exponent, e): II: v(c4) >= 2,
        // v(c6) = 1; III: v(c4) = 1, v(c6) >= 2; IV: v(c4) >= 2, v(c6) = 2.
        for (c4t, c6t, k, e) in
            [(0, p, 2, 6u32), (p, 0, 2, 4), (0, p * p, 3, 3), (0, 2 * p, 2, 6), (3 * p, 0, 2, 4), (0, 3 * p * p, 3, 3)]
        {
            let pk = p.pow(k);
            let inv = |a: i64| (1..pk).find(|x| (a.rem_euclid(pk) * x) % pk == 1).unwrap();
            let centred = |x: i64| {
                let r = x.rem_euclid(pk);
                if 2 * r > pk { r - pk } else { r }
            };
            let mut found = 0;
            'scan: for a2 in -12i64..=12 {
                if a2.rem_euclid(3) == 2 {
                    continue;
                }
                let b2 = 1 + 4 * a2;
                // c4 = b2^2 - 48 a4, c6 = -b2^3 + 72 b2 a4 - 864 a6
                let a4 = centred((b2 * b2 - c4t).rem_euclid(pk) * inv(48));
                let a6 = centred((-b2 * b2 * b2 + 72 * b2 * a4 - c6t).rem_euclid(pk) * inv(864));
                for (k4, k6) in [(0, 0), (1, 0), (0, 1), (-1, 0), (0, -1), (1, 1), (-1, -1), (1, -1), (-1, 1)] {
                    let (a4, a6) = (a4 + k4 * pk, a6 + k6 * pk);
                    let Ok(e_curve) = Curve::from_coefficients([1, a2, 0, a4, a6]) else { continue };
                    let d = local_data(&e_curve, &nat(p as u64)).unwrap();
                    assert_eq!(d.reduction, Reduction::Additive);
                    assert_eq!(12 / gcd(12, d.minimal_valuation_disc), e, "{:?}", e_curve.coefficients());
                    if conductor_of(&e_curve) > nat(8_000_000) {
                        continue;
                    }
                    let want = match e {
                        6 => kronecker_i64(-1, p as u64),
                        4 => kronecker_i64(-2, p as u64),
                        _ => kronecker_i64(-3, p as u64),
                    };
                    assert_eq!(local_root_number(&e_curve, &nat(p as u64)).unwrap(), Some(want as i8));
                    let r = root_number(&e_curve).unwrap();
                    assert_eq!(r.method, RootNumberMethod::LocalAndNumerical, "{:?}", e_curve.coefficients());
                    found += 1;
                    if found == 2 {
                        break 'scan;
                    }
                }
            }
            *per_case.entry((p, e)).or_insert(0) += found;
        }
    }
    eprintln!("curves per (p, e): {per_case:?}");
    for (k, n) in &per_case {
        assert!(*n >= 1, "no curve for p, e = {k:?}");
    }
    assert!(per_case.values().sum::<usize>() >= 40);
}

fn gcd(a: u32, b: u32) -> u32 {
    if b == 0 {
        a
    } else {
        gcd(b, a % b)
    }
}

/// Twists by `±p` of curves with good or multiplicative reduction at `p`:
/// Rohrlich's formulas give `(-1/p)` for `e = 2` and for potentially
/// multiplicative reduction (Compositio 87, 1993).
#[test]
fn twists_by_p_give_legendre_of_minus_one() {
    for row in all_table_rows().iter().step_by(11) {
        let e = curve(row.coefficients);
        for p in [5u64, 7, 11, 13] {
            let t = twist(&e, p as i64);
            let d = local_data(&e, &nat(p)).unwrap();
            if d.reduction == Reduction::Additive {
                continue;
            }
            let want = kronecker_i64(-1, p) as i8;
            assert_eq!(local_root_number(&t, &nat(p)).unwrap(), Some(want), "{:?} at {p}", row.coefficients);
            assert_eq!(local_root_number(&twist(&e, -(p as i64)), &nat(p)).unwrap(), Some(want));
        }
    }
}

#[test]
fn bad_input() {
    let e = curve([0, 0, 1, -1, 0]);
    assert!(local_root_number(&e, &nat(1)).is_err());
    assert!(local_root_number(&e, &nat(91)).is_err());
    assert_eq!(local_root_number(&e, &nat(101)).unwrap(), Some(1));
}

/// Cases the local formulas leave open, and what is deduced there.
#[test]
fn wild_cases_at_two_and_three() {
    // [0,0,1,0,-7] = y^2 + y = x^3 - 7 (Cremona 1997, Table 1; rank 0): conductor 27 = 3^3,
    // so wild at 3; the numerical test decides and w_3 = -w = -1 follows.
    let e = curve([0, 0, 1, 0, -7]);
    assert_eq!(local_root_number(&e, &nat(3)).unwrap(), None);
    let r = root_number(&e).unwrap();
    assert_eq!(r.global, 1);
    assert_eq!(r.local, vec![(nat(3), -1)]);
    assert_eq!(r.method, RootNumberMethod::Numerical { deduced: vec![nat(3)] });
}

fn small_curve() -> impl Strategy<Value = [i64; 5]> {
    (0i64..=1, -1i64..=1, 0i64..=1, -40i64..=40, -40i64..=40).prop_map(|(a, b, c, d, e)| [a, b, c, d, e])
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 96, ..ProptestConfig::default() })]

    /// Random curves with conductor up to 10^5: the local formulas (where
    /// they cover all primes) agree with the numerical test, and the
    /// result is consistent.
    #[test]
    fn local_formulas_agree_with_functional_equation(a in small_curve()) {
        let Ok(e) = Curve::from_coefficients(a) else { return Ok(()) };
        if conductor_of(&e) > nat(100_000) {
            return Ok(());
        }
        let r = root_number(&e).unwrap();
        check_consistent(&r);
        prop_assert_eq!(root_number_numerical(&e), Some(r.global));
        // Where the local formulas cover every prime, the numerical test
        // (run below 10^7) must have confirmed them; where a sign at 2 or 3
        // is open, it came from the functional equation or from an
        // auxiliary twist, which below 10^7 is also cross-checked against
        // the curve's own functional equation.
        match &r.method {
            RootNumberMethod::Numerical { .. } => {}
            RootNumberMethod::Transferred { cross_checked, .. } => prop_assert!(*cross_checked),
            m => prop_assert_eq!(m, &RootNumberMethod::LocalAndNumerical),
        }
        let n: u64 = u64::try_from(&r.conductor).unwrap();
        for p in bad_primes(&e) {
            let pu = u64::try_from(&p).unwrap();
            if !n.is_multiple_of(pu) {
                prop_assert_eq!(local_root_number(&e, &p).unwrap(), Some(1));
            }
        }
    }

    /// The root number and the local root numbers do not depend on the model.
    #[test]
    fn invariant_under_change_of_model(a in small_curve(), u in 1i64..=4, r in -5i64..=5, s in -3i64..=3, t in -5i64..=5) {
        let Ok(e) = Curve::from_coefficients(a) else { return Ok(()) };
        if conductor_of(&e) > nat(1_000_000) {
            return Ok(());
        }
        let c = ModelChange::new(Rational::from_signeds(1, u), Rational::from(r), Rational::from(s), Rational::from(t)).unwrap();
        let f = e.apply_change(&c).unwrap();
        let (re, rf) = (root_number(&e).unwrap(), root_number(&f).unwrap());
        prop_assert_eq!(re.global, rf.global);
        prop_assert_eq!(&re.local, &rf.local);
        prop_assert_eq!(&re.conductor, &rf.conductor);
        for p in [2u64, 3, 5, 7] {
            prop_assert_eq!(local_root_number(&e, &nat(p)).unwrap(), local_root_number(&f, &nat(p)).unwrap());
        }
    }
}

/// Table curves with additive, potentially good, tamely ramified reduction
/// (conductor exponent 2) at 2 or 3 that is not a quadratic twist of good
/// reduction: the derived values `w_2 = -1` and `w_3 = +1` (module
/// documentation) must agree with the numerical test on each.
#[test]
fn tame_rule_at_two_and_three_on_table_curves() {
    let mut seen = [0usize; 2];
    for row in &all_table_rows() {
        let e = curve(row.coefficients);
        for (i, p) in [2u64, 3].into_iter().enumerate() {
            let d = local_data(&e, &nat(p)).unwrap();
            if d.reduction != Reduction::Additive || d.conductor_exponent != 2 {
                continue;
            }
            // potentially good: v(j) >= 0; not a twist of good reduction: the
            // twists by the ramified classes stay bad
            let j = e.j_invariant();
            if twofold::arith::valuation(&Integer::from(j.denominator_ref().clone()), &nat(p)).unwrap_or(0) > 0 {
                continue;
            }
            let classes: &[i64] = if p == 3 { &[3, -3] } else { &[-1, 3, 2, -2, 6, -6] };
            if classes.iter().any(|&c| local_data(&twist(&e, c), &nat(p)).unwrap().reduction == Reduction::Good) {
                continue;
            }
            let want = if p == 2 { -1 } else { 1 };
            assert_eq!(local_root_number(&e, &nat(p)).unwrap(), Some(want), "{:?}", row.coefficients);
            let r = root_number(&e).unwrap();
            let want_w = if row.rank % 2 == 0 { 1 } else { -1 };
            assert_eq!(r.global, want_w);
            if r.method == RootNumberMethod::LocalAndNumerical {
                seen[i] += 1;
            }
        }
    }
    eprintln!("tame rule checked numerically at 2: {}, at 3: {}", seen[0], seen[1]);
    assert!(seen[0] > 0 && seen[1] > 0, "{seen:?}");
}

/// A curve wild at both 2 and 3: y^2 = x^3 - 3x + 1, conductor 1296 = 2^4 3^4.
/// Only the product w_2 w_3 is known; the twist by 5 (prime to 6N) obeys the
/// twisting formula w(E^5) = χ_5(-N) w(E) = w(E) (Iwaniec–Kowalski, Prop.
/// 14.20, from memory).
#[test]
fn joint_local_signs_at_two_and_three() {
    let e = curve([0, 0, 0, -3, 1]);
    assert_eq!(local_root_number(&e, &nat(2)).unwrap(), None);
    assert_eq!(local_root_number(&e, &nat(3)).unwrap(), None);
    let r = root_number(&e).unwrap();
    assert_eq!(r.conductor, nat(1296));
    assert_eq!(r.joint, vec![nat(2), nat(3)]);
    assert!(r.local.is_empty());
    check_consistent(&r);
    let r5 = root_number(&twist(&e, 5)).unwrap();
    assert_eq!(r5.conductor, nat(1296 * 25));
    assert_eq!(r5.global, r.global * kronecker_i64(5, 1296) as i8);
}

/// Every curve with a1, a3 in {0, 1}, a2 in {-1, 0, 1}, |a4|, |a6| <= 3: the
/// root number is decided, the local formulas agree with the numerical test
/// wherever they cover all bad primes, and the twist by -1 obeys the
/// twisting formula when the conductor is odd.
#[test]
fn small_coefficient_sweep() {
    let mut counts = [0usize; 2];
    for a1 in 0..=1 {
        for a2 in -1..=1 {
            for a3 in 0..=1 {
                for a4 in -3..=3 {
                    for a6 in -3..=3 {
                        let Ok(e) = Curve::from_coefficients([a1, a2, a3, a4, a6]) else { continue };
                        let r = root_number(&e).unwrap();
                        check_consistent(&r);
                        match r.method {
                            RootNumberMethod::LocalAndNumerical => counts[0] += 1,
                            RootNumberMethod::Numerical { .. } => counts[1] += 1,
                            ref m => panic!("{m:?} for {:?}", e.coefficients()),
                        }
                        let n = u64::try_from(&r.conductor).unwrap();
                        if n % 2 == 1 && n < 20_000 {
                            // D = -4: χ_{-4}(-N) = -χ_{-4}(N)
                            let t = root_number(&twist(&e, -1)).unwrap();
                            assert_eq!(t.global, -r.global * kronecker_i64(-4, n) as i8, "{:?}", e.coefficients());
                        }
                    }
                }
            }
        }
    }
    eprintln!("sweep: {} by local formulas checked numerically, {} decided numerically", counts[0], counts[1]);
}

/// y^2 = x^3 + 1000003: conductor 2^a 3^b 1000003^2, far above the limit of
/// the functional-equation test, and wild at 2 and 3. The sextic twist
/// y^2 = x^3 - 5 (1000003 ≡ -5 mod 72) is isomorphic to it over Q_2 and
/// Q_3 and has a small conductor, so the product w_2 w_3 is carried over.
/// Outside check: the descent proves rank 3 with Sel^2 of dimension 3
/// (tests/adaptive_search.rs), so w = (-1)^3 = -1 by the 2-parity theorem
/// (P. Monsky, "Generalizing the Birch–Stephens theorem", Math. Z. 221,
/// 1996: (-1)^(dim Sel^2 - dim E(Q)[2]) = w).
#[test]
fn large_conductor_wild_at_two_and_three() {
    let e = curve([0, 0, 0, 0, 1_000_003]);
    let r = root_number(&e).unwrap();
    assert_eq!(r.global, -1);
    check_consistent(&r);
    match &r.method {
        RootNumberMethod::Transferred { auxiliary, cross_checked, .. } => {
            assert_eq!(auxiliary, &[0, 0, 0, 0, -5].map(Integer::from));
            assert!(!cross_checked);
        }
        m => panic!("{m:?}"),
    }
    assert!(r.conductor > nat(10_000_000_000));
}

/// A prime q ≥ 31 with q ∤ n, and the fundamental discriminant ±q ≡ 1 mod 4.
fn twist_prime(n: u64, from: usize) -> i64 {
    const PRIMES: [i64; 15] = [31, 37, 41, 43, 47, 53, 59, 61, 67, 71, 73, 79, 83, 89, 97];
    let q = PRIMES.iter().cycle().skip(from % PRIMES.len()).find(|&&q| n % q as u64 != 0).copied().unwrap();
    if q % 4 == 1 { q } else { -q }
}

/// The table curves wild at 2 or 3 (no local formula there), twisted by a
/// prime discriminant q* prime to 6N: the twist has type I0* at q, and the
/// auxiliary-curve route must give the same root number as the
/// functional-equation test of the twist itself (run beside it; a
/// disagreement is an internal error and fails the test) and as the
/// twisting formula w(E^q*) = χ_{q*}(-N) w(E) (Iwaniec and Kowalski,
/// Prop. 14.20, from memory) with w(E) = (-1)^rank from the tables.
/// Random changes of model are applied on the way.
#[test]
fn transferred_signs_on_twisted_table_curves() {
    let mut rows = all_table_rows();
    rows.extend(common::read_table("curves-wider.tsv").into_iter().step_by(5));
    let mut hit = std::collections::BTreeMap::new();
    let mut checked = 0;
    for (i, row) in rows.iter().enumerate() {
        let e0 = curve(row.coefficients);
        let n0 = u64::try_from(&conductor_of(&e0)).unwrap();
        let d = twist_prime(n0, i);
        let q = d.unsigned_abs();
        if n0 * q * q > 10_000_000 {
            continue;
        }
        let u = (i % 3) as i64 + 1;
        let c = ModelChange::new(Rational::from_signeds(1, u), Rational::from(i as i64 % 5 - 2), Rational::from(i as i64 % 3 - 1), Rational::from(1 - i as i64 % 4)).unwrap();
        let e = twist(&e0, d).apply_change(&c).unwrap();
        let wild: Vec<u64> = [2u64, 3].into_iter().filter(|&p| local_root_number(&e, &nat(p)).unwrap().is_none()).collect();
        if wild.is_empty() {
            continue;
        }
        let r = root_number(&e).unwrap_or_else(|err| panic!("{:?} twisted by {d}: {err}", row.coefficients));
        check_consistent(&r);
        match &r.method {
            RootNumberMethod::Transferred { cross_checked: true, .. } => {}
            m => panic!("{:?} twisted by {d}: {m:?}", row.coefficients),
        }
        let w0: i8 = if row.rank % 2 == 0 { 1 } else { -1 };
        assert_eq!(r.global, w0 * kronecker_i64(d, n0) as i8 * if d < 0 { -1 } else { 1 }, "{:?} twisted by {d}", row.coefficients);
        for p in wild {
            let dl = local_data(&e, &nat(p)).unwrap();
            *hit.entry((p, dl.kodaira.to_string(), dl.conductor_exponent)).or_insert(0usize) += 1;
        }
        checked += 1;
    }
    eprintln!("twisted table curves checked: {checked}; (prime, Kodaira symbol, conductor exponent) hit: {hit:?}");
    assert!(checked > 100, "{checked}");
}

/// A small deterministic generator (xorshift) for the random sweep.
struct Rng(u64);

impl Rng {
    fn next(&mut self) -> u64 {
        self.0 ^= self.0 << 13;
        self.0 ^= self.0 >> 7;
        self.0 ^= self.0 << 17;
        self.0
    }
    fn range(&mut self, lo: i64, hi: i64) -> i64 {
        lo + (self.next() % (hi - lo + 1) as u64) as i64
    }
}

/// Random curves (random coefficients, random quadratic twists by -1, ±2,
/// ±3, ±6 to make 2 and 3 wild, often a further twist by a prime q ≥ 31
/// so that an auxiliary twist exists, and a random change of model) with
/// conductor up to 10^7: every root number is decided, and wherever the
/// local formulas or the auxiliary twist decide it, the curve's own
/// functional equation is tested beside them inside `root_number` (a
/// disagreement is an internal error, which fails here with the curve).
/// Records which local cases at 2 and 3 were decided by the auxiliary twist.
#[test]
fn random_curves_all_routes_agree() {
    let mut rng = Rng(0x9e37_79b9_7f4a_7c15);
    let mut methods = [0usize; 4];
    let mut hit = std::collections::BTreeMap::new();
    let mut tried = 0;
    while methods.iter().sum::<usize>() < 1500 {
        tried += 1;
        assert!(tried < 100_000);
        let a = [rng.range(0, 1), rng.range(-1, 1), rng.range(0, 1), rng.range(-30, 30), rng.range(-30, 30)];
        let Ok(e0) = Curve::from_coefficients(a) else { continue };
        let s = [1i64, -1, 2, -2, 3, -3, 6, -6][rng.range(0, 7) as usize];
        let q = if rng.range(0, 3) > 0 { [31i64, 37, 41, 43, 47, 53, 59, 61, 67, 71, 73, 97][rng.range(0, 11) as usize] } else { 1 };
        let e1 = twist(&e0, s * q);
        let c = ModelChange::new(
            Rational::from_signeds(1, rng.range(1, 3)),
            Rational::from(rng.range(-4, 4)),
            Rational::from(rng.range(-2, 2)),
            Rational::from(rng.range(-4, 4)),
        )
        .unwrap();
        let e = e1.apply_change(&c).unwrap();
        if conductor_of(&e) > nat(10_000_000) {
            continue;
        }
        let r = root_number(&e).unwrap_or_else(|err| panic!("{:?} (twist of {a:?} by {}): {err}", e.coefficients(), s * q));
        check_consistent(&r);
        let slot = match &r.method {
            RootNumberMethod::LocalAndNumerical => 0,
            RootNumberMethod::Transferred { cross_checked, .. } => {
                assert!(cross_checked, "{:?}", e.coefficients());
                for p in [2u64, 3] {
                    if local_root_number(&e, &nat(p)).unwrap().is_none() {
                        let d = local_data(&e, &nat(p)).unwrap();
                        *hit.entry((p, d.kodaira.to_string(), d.conductor_exponent)).or_insert(0usize) += 1;
                    }
                }
                1
            }
            RootNumberMethod::Numerical { .. } => 2,
            m => panic!("{m:?} for {:?}", e.coefficients()),
        };
        methods[slot] += 1;
    }
    eprintln!(
        "random curves: {} by local formulas, {} by an auxiliary twist, {} by the curve's own functional equation (all cross-checked); \
         wild cases (prime, Kodaira symbol, conductor exponent) decided by a twist: {hit:?}",
        methods[0], methods[1], methods[2]
    );
    assert!(methods[1] > 50, "{methods:?}");
}

/// The table curves wild at exactly one of 2 and 3, twisted by -7 and by 5
/// (type I0* at 7 or 5 where that prime is good): a twist back by an integer
/// that is a square at the wild prime alone (d = 1 mod 8 at 2, d = 1 mod 3 at
/// 3) reaches a curve of smaller conductor, where a twist by d = 1 mod 24
/// needs an extra prime that costs more than it saves. The transferred sign
/// must agree with the curve's own functional equation (run beside it
/// inside `root_number`: a disagreement is an internal error) and with the
/// twisting formula w(E^d) = χ_d(-N) w(E) (Iwaniec and Kowalski, Prop. 14.20,
/// from memory) with w(E) = (-1)^rank from the tables (Cremona 1997, Table 1).
#[test]
fn twists_square_at_one_wild_prime_only() {
    let (mut checked, mut transferred) = (0, 0);
    for (i, row) in all_table_rows().iter().enumerate() {
        let e0 = curve(row.coefficients);
        let n0 = u64::try_from(&conductor_of(&e0)).unwrap();
        for d in [-7i64, 5] {
            let q = d.unsigned_abs();
            if n0 % q == 0 || n0 * q * q > 10_000_000 {
                continue;
            }
            let e = twist(&e0, d);
            let wild: Vec<u64> = [2u64, 3].into_iter().filter(|&p| local_root_number(&e, &nat(p)).unwrap().is_none()).collect();
            if wild.len() != 1 {
                continue;
            }
            let r = root_number(&e).unwrap_or_else(|err| panic!("{:?} twisted by {d}: {err}", row.coefficients));
            check_consistent(&r);
            let w0: i8 = if row.rank % 2 == 0 { 1 } else { -1 };
            assert_eq!(r.global, w0 * kronecker_i64(d, n0) as i8 * if d < 0 { -1 } else { 1 }, "{:?} twisted by {d}", row.coefficients);
            checked += 1;
            match &r.method {
                RootNumberMethod::Transferred { cross_checked, auxiliary_conductor, .. } => {
                    assert!(*cross_checked && *auxiliary_conductor < r.conductor, "{:?} twisted by {d} (row {i})", row.coefficients);
                    transferred += 1;
                }
                // no usable twist (one that is a square at the wild prime may
                // turn the other of 2 and 3 wild): the curve's own test decided
                RootNumberMethod::Numerical { .. } => {}
                m => panic!("{:?} twisted by {d} (row {i}): {m:?}", row.coefficients),
            }
        }
    }
    eprintln!("twists with one wild prime checked: {checked}, by an auxiliary twist: {transferred}");
    assert!(transferred > 50 && 2 * transferred > checked, "{checked} {transferred}");
}

/// y^2 = x^3 + 2x + 27011: wild at 2 (no local formula), conductor
/// 45026380112 (above NUMERIC_MAX_CONDUCTOR) and no twist that is a square
/// at 2 has a smaller one. Without a deadline the sign is refused at once;
/// with one, the functional-equation test runs at this conductor and proves
/// w = -1. Outside check: Monsky's 2-parity theorem (P. Monsky, Math. Z. 221,
/// 1996): (-1)^(dim Sel^2(E) - dim E(Q)[2]) = w, with Sel^2 from the descent.
#[test]
fn beyond_the_default_limit_with_a_deadline() {
    use std::time::{Duration, Instant};
    let e = curve([0, 0, 0, 2, 27011]);
    let err = root_number(&e).unwrap_err();
    assert_eq!(err.kind(), &twofold::ErrorKind::TooLarge, "{err}");
    let lim = twofold::arith::FactorLimits::default().with_deadline(Instant::now() + Duration::from_secs(300));
    let r = twofold::rootno::root_number_with_limits(&e, &lim).unwrap();
    assert_eq!(r.conductor, nat(45_026_380_112));
    assert_eq!(r.method, RootNumberMethod::Numerical { deduced: vec![nat(2)] });
    check_consistent(&r);
    let rep = twofold::analyse(&e, &twofold::RankOptions::default().with_evidence(false)).unwrap();
    let sel = rep.two_selmer_dim.expect("Sel^2 by the descent");
    let two_torsion = rep.torsion.iter().filter(|&&n| n % 2 == 0).count();
    assert_eq!(r.global, if (sel - two_torsion) % 2 == 0 { 1 } else { -1 }, "dim Sel^2 = {sel}");
}

/// A curve the random test above drew (CI, 2026-12-04): its sign at 2 has
/// no local formula, so the sign comes from an auxiliary twist and is
/// cross-checked against the curve's own functional equation.
#[test]
fn transferred_sign_is_cross_checked_below_the_numeric_limit() {
    let e = curve([0, 1, 0, 17, 38]);
    let r = root_number(&e).unwrap();
    check_consistent(&r);
    assert!(matches!(r.method, RootNumberMethod::Transferred { cross_checked: true, .. }), "{:?}", r.method);
    assert_eq!(root_number_numerical(&e), Some(r.global));
}
