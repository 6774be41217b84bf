//! The fuzz harness, short version (the long runs: `examples/fuzz.rs`, see
//! README.md). Random and mutated text to the parser and to the batch's line
//! handling, random curves of growing size to `analyse` under short budgets
//! (and again after a random change of model), random quartics and numbers
//! to the public functions that take them. The checks are in
//! `tests/fuzz_common`; all inputs are random (invented data).

mod fuzz_common;

use fuzz_common::*;
use fuzz_common::Rng;
use proptest::prelude::*;
use std::time::Duration;

proptest! {
    #![proptest_config(ProptestConfig { cases: 3000, ..ProptestConfig::default() })]

    /// Any text at all (proptest's own strings, any Unicode).
    #[test]
    fn parser_never_panics_on_any_text(t in ".{0,40}") {
        prop_assert_eq!(check_parser(&t), Ok(()));
    }

    /// Text over the curve alphabet and valid curves with random edits.
    #[test]
    fn parser_on_curve_like_text(seed in any::<u64>()) {
        let mut rng = Rng::new(seed);
        prop_assert_eq!(check_parser(&random_text(&mut rng)), Ok(()));
        prop_assert_eq!(check_parser(&mutated_text(&mut rng)), Ok(()));
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 200, ..ProptestConfig::default() })]

    /// Quartics with coefficients up to 40 digits: exact covering test, no panic.
    #[test]
    fn quartic_functions_hold(seed in any::<u64>(), digits in 1u32..40) {
        let mut rng = Rng::new(seed);
        let g = random_quartic(&mut rng, digits);
        prop_assert!(check_quartic(&g, &mut rng).is_ok(), "{:?}", check_quartic(&g, &mut rng));
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 24, ..ProptestConfig::default() })]

    /// Quartics of 12 to 100 digits against their moved copies by unimodular
    /// matrices of up to 12 digits: `same_covering` and `gl2z_decide` say
    /// equivalent, with a matrix that maps one onto the other.
    #[test]
    fn gl2z_pairs_are_equivalent(seed in any::<u64>(), digits in 12u32..100, md in 1u32..12) {
        let mut rng = Rng::new(seed);
        let g = random_quartic(&mut rng, digits);
        let r = check_gl2z_pair(&g, &mut rng, md);
        prop_assert!(r.is_ok(), "{:?}", r);
    }
}

/// Degenerate quartics (zero discriminant, zero form, 200-digit-plus
/// coefficients, leading coefficient zero): no panic in any quartic function.
#[test]
fn degenerate_quartics_do_not_panic() {
    let mut rng = Rng::new(2027);
    for k in 0..8u32 {
        assert_eq!(check_degenerate_quartic(&mut rng, 12 + 10 * k), Ok(()));
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 40, ..ProptestConfig::default() })]

    /// Numbers up to 60 digits under a 30 ms deadline.
    #[test]
    fn numbers_under_a_deadline(seed in any::<u64>(), digits in 1u32..60) {
        let mut rng = Rng::new(seed);
        prop_assert_eq!(check_numbers(&mut rng, digits, Duration::from_millis(30)), Ok(()));
    }
}

/// The batch gives exactly one item per line, in order, on random lines.
#[test]
fn batch_lines_one_item_each() {
    let mut rng = Rng::new(12);
    for _ in 0..20 {
        let n = 1 + rng.below(4) as usize;
        let lines: Vec<String> = (0..n).map(|_| if rng.below(2) == 0 { random_text(&mut rng) } else { mutated_text(&mut rng) }).collect();
        assert_eq!(check_lines(&lines, Duration::from_millis(100)), Ok(()));
    }
}

/// Random curves with coefficients of 1 to 30 digits, 0.1 s each, and again
/// after a random change of model (the descent and search; the evidence
/// stage is in the test below).
#[test]
fn random_curves_hold_their_budget_and_invariants() {
    random_curves(false);
}

/// The same with the evidence stage and the analytic route, whose
/// root-number test and L-value sums take the deadline.
#[test]
fn random_curves_with_evidence_hold_their_budget() {
    random_curves(true);
}

fn random_curves(evidence: bool) {
    let mut rng = Rng::new(2026);
    let mut stats = CurveStats::default();
    let mut n = 0;
    while n < 12 {
        let digits = 1 + (n as u32 * 30) / 12;
        let Some(c) = random_curve(&mut rng, digits) else { continue };
        n += 1;
        if let Err(e) = check_curve(&c, &mut rng, Duration::from_millis(100), evidence, &mut stats) {
            panic!("{e}");
        }
    }
    assert!(stats.compared + stats.cut_short + stats.errors > 0);
}
