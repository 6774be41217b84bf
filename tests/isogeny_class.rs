//! Odd-degree isogeny classes against Cremona 1997, Table 1 (*Algorithms for
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
        classes.entry(key).or_default().push(r.coefficients);
        let odd = torsion_odd.entry(key).or_insert(true);
        *odd &= r.torsion_order % 2 == 1;
    }
    let mut complete_checked = 0;
    for r in &rows {
        let key = (r.conductor, r.class.unwrap());
        let e = Curve::from_coefficients(r.coefficients).unwrap();
        let class = odd_isogeny_class(&e, &bad_primes(&e)).unwrap();
        let table: HashSet<[i64; 5]> = classes[&key].iter().copied().collect();
        let got: HashSet<[i64; 5]> = class
            .curves
            .iter()
            .map(|c| c.coefficients().clone().map(|v| i64::try_from(&v).unwrap()))
            .collect();
        assert!(got.is_subset(&table), "{:?}: computed {got:?} not within the table class {table:?}", r.coefficients);
        for (a, b, phi) in &class.links {
            for p in [5u64, 7, 13, 17, 19, 23, 29, 31] {
                if r.conductor % p != 0 {
                    assert_eq!(class.curves[*a].count_points_mod(p), class.curves[*b].count_points_mod(p), "{:?} link of degree {}", r.coefficients, phi.degree);
                }
            }
        }
        if torsion_odd[&key] {
            assert_eq!(got, table, "{:?}: class incomplete", r.coefficients);
            complete_checked += 1;
        }
    }
    assert!(complete_checked > 100, "{complete_checked}");
}

/// Points map to points: the generator of y^2 + y = x^3 - x has no isogenous partner, but
/// y^2 + y = x^3 - x^2's torsion point (0, 0) of order 5 maps to a point of the image.
#[test]
fn points_map_onto_the_image() {
    let e = Curve::from_coefficients([0, -1, 1, 0, 0]).unwrap(); // y^2 + y = x^3 - x^2
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

/// An isogeny of odd degree induces Sel^2(E) ≅ Sel^2(E') (its dual composed
/// with it is multiplication by an odd number): on every odd link of the table
/// between curves small enough to enumerate directly, both full descents give
/// the same Selmer dimension.
#[test]
fn selmer_dimension_is_constant_on_odd_links() {
    use malachite::base::num::arithmetic::traits::UnsignedAbs;
    use twofold::descent::full::full_descent;
    let rows = common::read_table("curves-small-conductor.tsv");
    let mut checked = 0;
    for r in rows.iter().step_by(3) {
        let e = Curve::from_coefficients(r.coefficients).unwrap();
        let class = odd_isogeny_class(&e, &bad_primes(&e)).unwrap();
        for (a, b, _) in &class.links {
            let (ea, eb) = (&class.curves[*a], &class.curves[*b]);
            if ea.c4().unsigned_abs() > 100_000u32 || eb.c4().unsigned_abs() > 100_000u32 {
                continue;
            }
            let o = twofold::RankOptions::default();
            let (sa, sb) = (full_descent(ea, &o).unwrap().selmer_dim, full_descent(eb, &o).unwrap().selmer_dim);
            assert_eq!(sa, sb, "{:?} -> {:?}", ea.coefficients(), eb.coefficients());
            checked += 1;
        }
    }
    assert!(checked >= 20, "{checked}");
}
