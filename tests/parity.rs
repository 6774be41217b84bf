//! Monsky's theorem (Monsky 1996, appendix to Heath-Brown, Invent. Math.
//! 118): over Q the parity of dim Sel^2(E) - dim E(Q)[2] equals that of
//! (1 - w(E))/2, w the global root number. A theorem, so a strong check of
//! both the Selmer computation and the root number.

mod common;

use proptest::prelude::*;
use twofold::descent::full::full_descent;
use twofold::rootno::root_number;
use twofold::{Curve, RankOptions};

fn parity_holds(e: &Curve) -> Option<bool> {
    let d = full_descent(e, &RankOptions::default()).ok()?;
    let s = d.selmer_dim?;
    let w = root_number(e).ok()?.global;
    Some(((s - d.two_torsion_dim) % 2 == 1) == (w == -1))
}

/// Every curve of both published tables whose enumeration completes.
#[test]
fn monsky_parity_on_the_tables() {
    let mut rows = common::read_table("curves-small-conductor.tsv");
    rows.extend(common::read_table("curves-with-sha.tsv"));
    let mut checked = 0;
    for r in &rows {
        let e = Curve::from_ainvs(r.ainvs).unwrap();
        if let Some(ok) = parity_holds(&e) {
            assert!(ok, "{:?}: Monsky parity fails", r.ainvs);
            checked += 1;
        }
    }
    assert!(checked * 10 >= rows.len() * 9, "only {checked} checked");
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 40, ..ProptestConfig::default() })]
    /// Random small curves.
    #[test]
    fn monsky_parity_random(a1 in 0i64..=1, a2 in -1i64..=1, a3 in 0i64..=1, a4 in -40i64..=40, a6 in -80i64..=80) {
        if let Ok(e) = Curve::from_ainvs([a1, a2, a3, a4, a6]) {
            if let Some(ok) = parity_holds(&e) {
                prop_assert!(ok, "{:?}", [a1, a2, a3, a4, a6]);
            }
        }
    }
}
