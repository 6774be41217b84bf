//! Torsion orders against the published table (Cremona, Algorithms for
//! Modular Elliptic Curves, 2nd ed., Table 1, via tests/data/).

mod common;
use twofold::torsion::TorsionGroup;
use twofold::Curve;
use malachite::Natural;

fn small_primes_of(n: &malachite::Integer) -> Vec<Natural> {
    use malachite::base::num::arithmetic::traits::{Abs, DivisibleBy};
    let mut m = n.clone().abs();
    let mut out = Vec::new();
    let mut p = malachite::Integer::from(2);
    while &p * &p <= m {
        if (&m).divisible_by(&p) {
            out.push(Natural::try_from(p.clone()).unwrap());
            while (&m).divisible_by(&p) {
                m /= &p;
            }
        }
        p += malachite::Integer::from(1);
    }
    if m > 1 {
        out.push(Natural::try_from(m).unwrap());
    }
    out
}

#[test]
fn torsion_orders_match_published_table() {
    // Cremona 1997, Table 1 (tests/data/curves-small-conductor.tsv)
    let mut n = 0;
    for row in common::read_table("curves-small-conductor.tsv") {
        let e = Curve::from_coefficients(row.coefficients).unwrap();
        let t = TorsionGroup::compute(&e, &small_primes_of(e.discriminant()));
        assert_eq!(t.order().to_string(), row.torsion_order.to_string(), "curve {:?}", row.coefficients);
        for p in t.points() {
            assert!(e.contains(p));
        }
        n += 1;
    }
    assert_eq!(n, 572);
}
