//! Completeness of the enumeration against brute force, and the loop over
//! `(a, H)` against the reference loop over `(a, b, c)`.

use super::*;
use crate::quartic::gl2z_equivalent;

fn all_box(bound: i64) -> HashMap<(i64, i64), Vec<[i64; 5]>> {
    let mut m: HashMap<(i64, i64), Vec<[i64; 5]>> = HashMap::new();
    let r = -bound..=bound;
    for a in r.clone() {
        for b in r.clone() {
            for c in r.clone() {
                for d in r.clone() {
                    for e in r.clone() {
                        let i = 12 * a * e - 3 * b * d + c * c;
                        let j = 72 * a * c * e + 9 * b * c * d - 27 * a * d * d - 27 * e * b * b - 2 * c * c * c;
                        if 4 * i * i * i != j * j {
                            m.entry((i, j)).or_default().push([a, b, c, d, e]);
                        }
                    }
                }
            }
        }
    }
    m
}

/// Brute-force completeness: every quartic with coefficients in a box is
/// equivalent to exactly one listed representative, and the list is
/// pairwise inequivalent.
#[test]
fn enumeration_complete_on_box() {
    let bx = all_box(4);
    let mut keys: Vec<(i64, i64)> = bx.keys().copied().collect();
    keys.sort_by_key(|k| std::cmp::Reverse(bx[k].len()));
    let mut tested = 0;
    let mut by_type = [0usize; 4];
    for key in keys.iter().take(60).chain(keys.iter().skip(500).step_by(97).take(40)) {
        let (i, j) = (Integer::from(key.0), Integer::from(key.1));
        let list = quartics_with_invariants(&i, &j, &Default::default()).unwrap();
        for (x, g) in list.iter().enumerate() {
            for h in &list[x + 1..] {
                assert!(!gl2z_equivalent(g, h), "duplicate classes {g:?} {h:?}");
            }
        }
        for f in &bx[key] {
            let f = Quartic::from_coeffs(*f);
            let hits = list.iter().filter(|g| gl2z_equivalent(g, &f)).count();
            assert_eq!(hits, 1, "form {f:?} (I,J)={key:?} matched {hits} of {list:?}");
            by_type[f.root_type().unwrap() as usize] += 1;
        }
        tested += 1;
    }
    assert!(tested >= 90);
    assert!(by_type.iter().all(|&n| n > 0), "{by_type:?}");
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig::with_cases(40))]
    /// A random quartic is equivalent to exactly one listed representative of its invariants.
    #[test]
    fn random_form_is_listed_once(g in proptest::array::uniform5(-15i64..15)) {
        let g = Quartic::from_coeffs(g);
        proptest::prop_assume!(g.discriminant() != 0);
        let list = quartics_with_invariants(&g.invariant_i(), &g.invariant_j(), &Default::default()).unwrap();
        let hits = list.iter().filter(|h| gl2z_equivalent(h, &g)).count();
        proptest::prop_assert_eq!(hits, 1);
    }
}

/// Larger brute-force sweep (box 6, 300 invariant pairs); run with --ignored.
#[test]
#[ignore]
fn enumeration_complete_on_bigger_box() {
    let bx = all_box(6);
    let mut keys: Vec<(i64, i64)> = bx.keys().copied().collect();
    keys.sort();
    let step = (keys.len() / 300).max(1);
    let mut by_count = keys.clone();
    by_count.sort_by_key(|k| std::cmp::Reverse(bx[k].len()));
    for key in keys.iter().step_by(step).chain(by_count.iter().take(200)) {
        let (i, j) = (Integer::from(key.0), Integer::from(key.1));
        let list = quartics_with_invariants(&i, &j, &Default::default()).unwrap();
        for (x, g) in list.iter().enumerate() {
            for h in &list[x + 1..] {
                assert!(!gl2z_equivalent(g, h), "duplicate classes {g:?} {h:?}");
            }
        }
        for f in &bx[key] {
            let f = Quartic::from_coeffs(*f);
            let hits = list.iter().filter(|g| gl2z_equivalent(g, &f)).count();
            assert_eq!(hits, 1, "form {f:?} (I,J)={key:?} matched {hits} of {list:?}");
        }
    }
}

#[test]
fn known_small_lists() {
    // x^4 - z^4 type: (I, J) = (-12, 0). Classes found must all have these invariants.
    let l = quartics_with_invariants(&Integer::from(-12), &Integer::from(0), &Default::default()).unwrap();
    assert!(l.iter().any(|g| gl2z_equivalent(g, &Quartic::from_coeffs([1, 0, 0, 0, -1]))));
    // negative definite excluded on request
    let l2 = quartics_with_invariants(&Integer::from(12), &Integer::from(0), &SearchOptions { include_negative_definite: false, ..Default::default() }).unwrap();
    assert!(l2.iter().all(|g| g.root_type() != Some(RootType::NegativeDefinite)));
    let l3 = quartics_with_invariants(&Integer::from(12), &Integer::from(0), &Default::default()).unwrap();
    assert!(l3.len() > l2.len());
    // zero discriminant is an error
    assert!(quartics_with_invariants(&Integer::from(1), &Integer::from(2), &Default::default()).is_err());
}

#[test]
fn budget_is_respected() {
    let r = quartics_with_invariants(&Integer::from(480000), &Integer::from(-4320000), &SearchOptions { max_candidates: Some(10), ..Default::default() });
    assert_eq!(r.unwrap_err().kind(), &ErrorKind::Budget);
}

/// Raw search (with duplicates) by the reference loop over `(a, b, c)`.
fn raw_reference(i: &Integer, j: &Integer, pd: bool) -> Vec<Quartic> {
    raw_search(i, j, pd, &mut 0, &SearchOptions::default(), Mode { count_only: false, reference: true }).unwrap()
}

fn assert_same_raw(i: &Integer, j: &Integer) {
    for pd in [false, true] {
        let mut x = raw_search(i, j, pd, &mut 0, &SearchOptions::default(), Mode::default()).unwrap();
        let mut y = raw_reference(i, j, pd);
        x.sort_by_key(size_key);
        y.sort_by_key(size_key);
        assert_eq!(x, y, "(I, J) = ({i}, {j}), positive definite only = {pd}");
    }
}

fn table_curves() -> Vec<[i64; 5]> {
    let mut out = vec![];
    for (f, off) in [("tests/data/curves-small-conductor.tsv", 2usize), ("tests/data/curves-with-sha.tsv", 1)] {
        let txt = std::fs::read_to_string(format!("{}/{}", env!("CARGO_MANIFEST_DIR"), f)).unwrap();
        for line in txt.lines().filter(|l| !l.starts_with('#') && !l.trim().is_empty()) {
            let v: Vec<i64> = line.split('\t').map(|x| x.trim().parse().unwrap()).collect();
            out.push([v[off], v[off + 1], v[off + 2], v[off + 3], v[off + 4]]);
        }
    }
    out
}

/// The loop over `(a, H)` finds exactly the raw forms of the reference
/// loop over `(a, b, c)`: on invariants of small forms (independent
/// brute-force box) and on the invariants `(c4, 2c6)` of curves of the
/// published table in tests/data (published tables, Cremona 1997), where the reference is
/// cheap enough.
#[test]
fn by_h_matches_reference() {
    let bx = all_box(3);
    let mut keys: Vec<(i64, i64)> = bx.keys().copied().collect();
    keys.sort();
    for key in keys.iter().step_by((keys.len() / 150).max(1)) {
        assert_same_raw(&Integer::from(key.0), &Integer::from(key.1));
    }
    let mut done = 0;
    for ai in table_curves().into_iter().take(100) {
        let e = Curve::from_coefficients(ai).unwrap();
        let (i, j) = (e.c4().clone(), Integer::from(2) * e.c6());
        let mut cost = 0;
        raw_search(&i, &j, false, &mut cost, &SearchOptions::default(), Mode { count_only: true, reference: true }).unwrap();
        if cost > 300_000 {
            continue;
        }
        assert_same_raw(&i, &j);
        done += 1;
    }
    assert!(done >= 60, "{done}");
}
