//! Torsion orders against the published table (Cremona, Algorithms for
//! Modular Elliptic Curves, 2nd ed., Table 1, via tests/data/).

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
    let text = std::fs::read_to_string(concat!(env!("CARGO_MANIFEST_DIR"), "/../shared/data/curves-small-conductor.tsv")).unwrap();
    let mut n = 0;
    for line in text.lines().filter(|l| !l.starts_with('#') && !l.trim().is_empty()) {
        let f: Vec<&str> = line.split('\t').collect();
        let a: Vec<i64> = f[2..7].iter().map(|s| s.parse().unwrap()).collect();
        let e = Curve::from_coefficients([a[0], a[1], a[2], a[3], a[4]]).unwrap();
        let t = TorsionGroup::compute(&e, &small_primes_of(e.discriminant()));
        assert_eq!(t.order().to_string(), f[8], "curve {line}");
        for p in t.points() {
            assert!(e.contains(p));
        }
        n += 1;
    }
    assert_eq!(n, 572);
}
