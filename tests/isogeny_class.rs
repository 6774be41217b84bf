//! Odd-degree isogeny classes against Cremona's table 1 (*Algorithms for
//! Modular Elliptic Curves*, 2nd ed.; tests/data/curves-small-conductor.tsv,
//! where curves with the same conductor and class number are isogenous and
//! every class is complete).

mod common;

use malachite::Natural;
use std::collections::{HashMap, HashSet};
use twofold::arith::{factor, FactorLimits};
use twofold::isogeny::odd_isogeny_class;
use twofold::Curve;

fn bad_primes(e: &Curve) -> Vec<Natural> {
    factor(e.discriminant(), &FactorLimits::default()).unwrap().primes().cloned().collect()
}

/// Every computed member is in the table's class, every link is an isogeny
/// between curves with equal point counts, and classes with no rational
/// 2-torsion anywhere (so no 2-isogenies: all links have odd degree) are
/// found complete from every member.
#[test]
fn odd_classes_match_the_table() {
    let rows = common::read_table("curves-small-conductor.tsv");
    let mut classes: HashMap<(u64, u32), Vec<[i64; 5]>> = HashMap::new();
    let mut torsion_odd: HashMap<(u64, u32), bool> = HashMap::new();
    for r in &rows {
        let key = (r.conductor, r.class.unwrap());
        classes.entry(key).or_default().push(r.ainvs);
        let odd = torsion_odd.entry(key).or_insert(true);
        *odd &= r.torsion_order % 2 == 1;
    }
    let mut complete_checked = 0;
    for r in &rows {
        let key = (r.conductor, r.class.unwrap());
        let e = Curve::from_ainvs(r.ainvs).unwrap();
        let class = odd_isogeny_class(&e, &bad_primes(&e)).unwrap();
        let table: HashSet<[i64; 5]> = classes[&key].iter().copied().collect();
        let got: HashSet<[i64; 5]> = class
            .curves
            .iter()
            .map(|c| c.ainvs().clone().map(|v| i64::try_from(&v).unwrap()))
            .collect();
        assert!(got.is_subset(&table), "{:?}: computed {got:?} not within the table class {table:?}", r.ainvs);
        for (a, b, phi) in &class.links {
            for p in [5u64, 7, 13, 17, 19, 23, 29, 31] {
                if r.conductor % p != 0 {
                    assert_eq!(class.curves[*a].count_points_mod(p), class.curves[*b].count_points_mod(p), "{:?} link of degree {}", r.ainvs, phi.degree);
                }
            }
        }
        if torsion_odd[&key] {
            assert_eq!(got, table, "{:?}: class incomplete", r.ainvs);
            complete_checked += 1;
        }
    }
    assert!(complete_checked > 100, "{complete_checked}");
}

/// Points map to points: the generator of 37a1 has no isogenous partner, but
/// 11a3's torsion point (0, 0) of order 5 maps to a point of the image.
#[test]
fn points_map_onto_the_image() {
    let e = Curve::from_ainvs([0, -1, 1, 0, 0]).unwrap(); // 11a3
    let class = odd_isogeny_class(&e, &[Natural::from(11u32)]).unwrap();
    assert_eq!(class.curves.len(), 3);
    for (a, _, phi) in &class.links {
        let src = &class.curves[*a];
        let t = twofold::torsion::TorsionGroup::compute(src, &[Natural::from(11u32)]);
        for p in t.points() {
            let q = phi.map_point_up_to_sign(p).expect("image on the target");
            assert!(phi.target.contains(&q));
        }
    }
}
