//! Monsky's theorem (Monsky 1996, appendix to Heath-Brown, Invent. Math.
//! 118): over Q the parity of dim Sel^2(E) - dim E(Q)[2] equals that of
//! (1 - w(E))/2, w the global root number. A theorem, so a strong check of
//! both the Selmer computation and the root number.

mod common;

use proptest::prelude::*;
use twofold::descent::full::full_descent;
use twofold::rootno::root_number;
use twofold::{analyse, Curve, RankOptions};

fn parity_holds(e: &Curve) -> Option<bool> {
    let d = full_descent(e, &RankOptions::default()).ok()?;
    let s = d.selmer_dim?;
    let w = root_number(e).ok()?.global;
    Some(((s - d.two_torsion_dim) % 2 == 1) == (w == -1))
}

/// The same through the whole pipeline, where the quartic descent may run on
/// an odd-degree isogenous curve (same Sel^2 and E(Q)[2]).
fn parity_holds_report(e: &Curve) -> Option<bool> {
    let opts = RankOptions::default().with_cross_check_routes(true);
    let r = analyse(e, &opts).ok()?;
    let s = r.two_selmer_dim?;
    let t = r.torsion.iter().filter(|n| *n % 2 == 0).count();
    let w = root_number(e).ok()?.global;
    Some(((s - t) % 2 == 1) == (w == -1))
}

/// Every curve of both published tables whose enumeration completes.
#[test]
fn monsky_parity_on_the_tables() {
    let mut rows = common::read_table("curves-small-conductor.tsv");
    rows.extend(common::read_table("curves-with-sha.tsv"));
    let mut checked = 0;
    for r in &rows {
        let e = Curve::from_coefficients(r.coefficients).unwrap();
        if let Some(ok) = parity_holds_report(&e) {
            assert!(ok, "{:?}: Monsky parity fails", r.coefficients);
            checked += 1;
        }
    }
    // all but one Sha-16 curve beyond the enumeration cap
    assert!(checked + 1 >= rows.len(), "only {checked} of {} checked", rows.len());
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 40, ..ProptestConfig::default() })]
    /// Random small curves.
    #[test]
    fn monsky_parity_random(a1 in 0i64..=1, a2 in -1i64..=1, a3 in 0i64..=1, a4 in -40i64..=40, a6 in -80i64..=80) {
        if let Ok(e) = Curve::from_coefficients([a1, a2, a3, a4, a6]) {
            if let Some(ok) = parity_holds(&e) {
                prop_assert!(ok, "{:?}", [a1, a2, a3, a4, a6]);
            }
        }
    }
}
