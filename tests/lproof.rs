//! Proven L-values and root numbers against the published tables and an
//! independent f64 computation.

use malachite::Natural;
use twofold::arith::FactorLimits;
use twofold::lproof::{prove_analytic_rank, prove_l_value, prove_root_number};
use twofold::lseries::special_values;
use twofold::Curve;

mod common;

/// The rows of a published table through the shared reader (tests/common):
/// conductor, isogeny class (0 where the table has none), a-invariants, rank.
fn rows(name: &str) -> Vec<(u64, u32, [i64; 5], u32)> {
    common::read_table(name).into_iter().map(|r| (r.conductor, r.class.unwrap_or(0), r.coefficients, r.rank as u32)).collect()
}

fn all_table_curves() -> Vec<(u64, u32, [i64; 5], u32)> {
    let mut v = rows("curves-small-conductor.tsv");
    v.extend(rows("curves-with-sha.tsv"));
    v
}

/// Every curve of both tables (J. E. Cremona, Algorithms for Modular
/// Elliptic Curves, 2nd ed., 1997, Table 1, and the list of curves with
/// non-trivial Sha in tests/data, copies of ../shared/data): the proven root number is
/// (-1)^rank, the proven leading value excludes 0 (every curve there has
/// analytic rank 0 or 1), and contains the f64 value of lseries (an
/// independent computation with its own error bound).
#[test]
fn every_table_curve_gets_its_rank_proven() {
    let lim = FactorLimits::default();
    let curves = all_table_curves();
    assert_eq!(curves.len(), 595);
    for (n, _, a, rank) in curves {
        let e = Curve::from_coefficients(a).unwrap();
        let nn = Natural::from(n);
        let p = prove_analytic_rank(&e, &nn, &lim).unwrap();
        let w = if rank % 2 == 0 { 1 } else { -1 };
        assert_eq!(p.root_number.sign, Some(w), "{a:?}");
        assert_eq!(p.rank, Some(rank as u8), "{a:?}");
        let v = p.value.unwrap();
        assert!(v.complete && v.high - v.low < 1e-9, "{a:?}: {v:?}");
        let f = special_values(&e, &nn, w, 1).unwrap();
        let fv = &f[rank as usize];
        assert!(v.low <= fv.value + fv.error && fv.value - fv.error <= v.high, "{a:?}: {v:?} vs {fv:?}");
    }
}

/// Curves of one isogeny class have the same L-function (Faltings'
/// isogeny theorem the other way round: isogenous curves have equal a_p),
/// so their enclosures must be equal; a change of model leaves them equal.
#[test]
fn equal_for_isogenous_curves_and_invariant_under_change_of_model() {
    let lim = FactorLimits::default();
    let curves = rows("curves-small-conductor.tsv");
    let mut prev: Option<((u64, u32), twofold::lproof::ProvenLValue)> = None;
    for (n, class, a, rank) in curves.into_iter().take(200) {
        let e = Curve::from_coefficients(a).unwrap();
        let w = if rank % 2 == 0 { 1 } else { -1 };
        let v = prove_l_value(&e, &Natural::from(n), w, &lim).unwrap();
        if let Some((key, pv)) = &prev {
            if *key == (n, class) {
                assert_eq!(pv, &v, "{a:?}");
            }
        }
        prev = Some(((n, class), v.clone()));
    }
    // a non-minimal model (x -> 4x, y -> 8y) of y^2 + y = x^3 - x^2 - 10x - 20 reduces
    // to the same minimal model, hence the same enclosure
    let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
    let big = Curve::from_coefficients([0, -4, 8, -160, -1280]).unwrap();
    let (m, _) = big.minimal_model(&[Natural::from(2u32), Natural::from(11u32)]).unwrap();
    let lim = FactorLimits::default();
    assert_eq!(prove_l_value(&m, &Natural::from(11u32), 1, &lim).unwrap(), prove_l_value(&e, &Natural::from(11u32), 1, &lim).unwrap());
    // the non-minimal model itself is refused (its discriminant has a factor 2^12 prime to the conductor)
    assert!(prove_l_value(&big, &Natural::from(11u32), 1, &lim).is_err());
}

/// Published values (from memory): L(E,1) of y^2 + y = x^3 - x^2 - 10x - 20
/// and L'(E,1) of y^2 + y = x^3 - x.
#[test]
fn known_values_inside_the_enclosures() {
    let lim = FactorLimits::default();
    let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
    let v = prove_l_value(&e, &Natural::from(11u32), 1, &lim).unwrap();
    assert!(v.low <= 0.2538418608559106 && 0.2538418608559106 <= v.high, "{v:?}");
    let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
    let v = prove_l_value(&e, &Natural::from(37u32), -1, &lim).unwrap();
    assert!(v.low <= 0.3059997738340523 && 0.3059997738340523 <= v.high, "{v:?}");
    assert!(v.high - v.low < 5e-12, "{v:?}");
    // the rank-2 curve y^2 + y = x^3 + x^2 - 2x (conductor 389): w = +1 and
    // L(E,1) = 0, so the enclosure must contain 0 and the rank stays undecided
    let e = Curve::from_coefficients([0, 1, 1, -2, 0]).unwrap();
    let a = prove_analytic_rank(&e, &Natural::from(389u32), &lim).unwrap();
    assert_eq!(a.root_number.sign, Some(1));
    assert!(a.value.as_ref().unwrap().low <= 0.0 && 0.0 <= a.value.as_ref().unwrap().high);
    assert_eq!(a.rank, None);
    // the rank-3 curve y^2 + y = x^3 - 7x + 6 (conductor 5077): w = -1, L'(E,1) = 0
    let e = Curve::from_coefficients([0, 0, 1, -7, 6]).unwrap();
    let a = prove_analytic_rank(&e, &Natural::from(5077u32), &lim).unwrap();
    assert_eq!((a.root_number.sign, a.rank), (Some(-1), None));
}

/// A wrong conductor is refused; the budget is honoured.
#[test]
fn wrong_input_and_budget() {
    let lim = FactorLimits::default();
    let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
    assert!(prove_root_number(&e, &Natural::from(74u32), &lim).is_err());
    assert!(prove_l_value(&e, &Natural::from(37u32), 0, &lim).is_err());
    let expired = FactorLimits::default().with_deadline(std::time::Instant::now());
    let r = prove_root_number(&e, &Natural::from(37u32), &expired).unwrap();
    assert!(!r.complete && r.sign.is_none());
    let v = prove_l_value(&e, &Natural::from(37u32), -1, &expired).unwrap();
    assert!(!v.complete && v.low <= 0.3059997738340523 && 0.3059997738340523 <= v.high);
}

/// Larger conductors (curves of our own choosing, prime conductor computed
/// by the library): the proven enclosure contains the f64 value of lseries
/// (an independent computation: the old point counter and the f64 G-functions
/// with a hand-derived error bound).
#[test]
fn larger_conductors_against_the_f64_path() {
    let lim = FactorLimits::default();
    for (a, n) in [([0, 0, 1, -23, 1], 778013u64), ([0, 0, 1, 26, 1], 1125539), ([0, 0, 1, -119, 1], 107849501)] {
        let e = Curve::from_coefficients(a).unwrap();
        let nn = Natural::from(n);
        let p = prove_analytic_rank(&e, &nn, &lim).unwrap();
        let w = p.root_number.sign.unwrap();
        let v = p.value.unwrap();
        let f = special_values(&e, &nn, w, 1).unwrap();
        let fv = &f[v.order as usize];
        assert!(v.low <= fv.value + fv.error && fv.value - fv.error <= v.high, "{a:?}: {v:?} vs {fv:?}");
        assert!(v.nonzero_proven() && v.high - v.low < 1e-9);
    }
}

/// The cancel flag stops the sum; the partial enclosure still holds.
#[test]
fn cancel_flag_cuts_short() {
    use std::sync::atomic::AtomicBool;
    use std::sync::Arc;
    let flag = Arc::new(AtomicBool::new(true));
    let lim = FactorLimits::default().with_cancel(flag);
    // y^2 + y = x^3 - x^2 - 10x - 20: L(E,1) = 0.2538418608559106 (from memory)
    let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
    let v = prove_l_value(&e, &Natural::from(11u32), 1, &lim).unwrap();
    assert!(!v.complete && v.low <= 0.2538418608559106 && 0.2538418608559106 <= v.high);
    let r = prove_root_number(&e, &Natural::from(11u32), &lim).unwrap();
    assert!(!r.complete && r.sign.is_none());
}

/// Local formulas and the proven functional-equation test agree: on 1500
/// pseudo-random small curves, `rootno::root_number` (which runs both for
/// conductors up to 10^7 and returns an error if they disagree) never
/// errs except for a conductor beyond the numerical limit, and the test
/// decides the sign for every curve it is run on.
#[test]
fn local_formulas_and_the_proven_test_agree_on_random_curves() {
    use twofold::rootno::{root_number, RootNumberMethod};
    let mut state = 0x2545_f491_4f6c_dd1du64;
    let mut next = |m: i64| {
        state ^= state << 13;
        state ^= state >> 7;
        state ^= state << 17;
        (state % (2 * m as u64 + 1)) as i64 - m
    };
    let (mut both, mut numeric_only) = (0, 0);
    for _ in 0..1500 {
        let a = [next(1).abs(), next(1), next(1).abs(), next(60), next(60)];
        let Ok(e) = Curve::from_coefficients(a) else { continue };
        match root_number(&e) {
            Ok(r) => match r.method {
                RootNumberMethod::LocalAndNumerical => both += 1,
                RootNumberMethod::Numerical { .. } => numeric_only += 1,
                _ => {}
            },
            Err(err) => assert_eq!(err.kind(), &twofold::ErrorKind::TooLarge, "{a:?}: {err}"),
        }
    }
    assert!(both > 1000, "{both} {numeric_only}");
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig { cases: 24, ..proptest::prelude::ProptestConfig::default() })]

    /// The proven enclosure of the leading value at s = 1 is a property of the
    /// L-function: equal for every model of a curve (through its minimal
    /// model) and for the 2-isogenous curves y^2 = x(x^2 + a x + b) and
    /// y^2 = x(x^2 - 2a x + a^2 - 4b) (isogenous curves have the same a_p:
    /// Silverman, AEC III.4 with the Néron-Ogg-Shafarevich criterion; the
    /// same conductor and root number follow).
    #[test]
    fn enclosure_is_a_property_of_the_l_function(a in -12i64..=12, b in -30i64..=30, u in 1i64..=3, r in -4i64..=4, s in -2i64..=2, t in -4i64..=4) {
        proptest::prop_assume!(b != 0 && a * a - 4 * b != 0);
        let e = Curve::from_coefficients([0, a, 0, b, 0]).unwrap();
        let e1 = Curve::from_coefficients([0, -2 * a, 0, a * a - 4 * b, 0]).unwrap();
        let c = twofold::ModelChange::new(malachite::Rational::from_signeds(1, u), r.into(), s.into(), t.into()).unwrap();
        let e2 = e.apply_change(&c).unwrap();
        let lim = FactorLimits::default();
        let mut out = Vec::new();
        for x in [&e, &e1, &e2] {
            let (m, n, w) = twofold::rootno::minimal_conductor_sign(x).unwrap();
            proptest::prop_assume!(n <= Natural::from(2_000_000u32));
            out.push((n.clone(), w, prove_l_value(&m, &n, w, &lim).unwrap()));
        }
        proptest::prop_assert_eq!(&out[0], &out[1]);
        proptest::prop_assert_eq!(&out[0], &out[2]);
    }
}
