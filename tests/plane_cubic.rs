//! Points on plane cubics (the coverings of a 3-descent): the lattice
//! search against the plain one, the chord law, Selmer's cubic, and the
//! generator of y^2 = x^3 + 9279 on a covering of it.

use malachite::base::num::arithmetic::traits::{CheckedRoot, CheckedSqrt, Gcd, UnsignedAbs};
use malachite::{Integer, Natural, Rational};
use proptest::prelude::*;
use std::collections::BTreeSet;
use twofold::heights::{mordell_weil_basis_of, SaturationOptions};
use twofold::search::{search_plane_cubic, search_plane_cubic_naive, PlanePoint, SearchLimits};
use twofold::{Curve, CurveData, Point, Work};

const MONOMIALS: [[u32; 3]; 10] = [[3, 0, 0], [2, 1, 0], [2, 0, 1], [1, 2, 0], [1, 1, 1], [1, 0, 2], [0, 3, 0], [0, 2, 1], [0, 1, 2], [0, 0, 3]];

fn form(c: [i64; 10]) -> [Integer; 10] {
    c.map(Integer::from)
}

fn eval(c: &[Integer; 10], p: &[Integer; 3]) -> Integer {
    let mut s = Integer::from(0);
    for (k, e) in MONOMIALS.iter().enumerate() {
        let mut t = c[k].clone();
        for i in 0..3 {
            for _ in 0..e[i] {
                t *= &p[i];
            }
        }
        s += t;
    }
    s
}

/// The cubic `F(M s)`: coefficients of the form in the new coordinates `s`.
fn transformed(c: &[i64; 10], m: [[i64; 3]; 3]) -> [i64; 10] {
    // expand each monomial of (M s) exactly: coefficients of s-monomials
    let index = |e: [u32; 3]| MONOMIALS.iter().position(|&f| f == e).unwrap();
    let mut out = [0i64; 10];
    for (k, e) in MONOMIALS.iter().enumerate() {
        // product of three linear forms (row i of M), with multiplicity e[i]
        let mut poly: Vec<([u32; 3], i64)> = vec![([0, 0, 0], c[k])];
        for i in 0..3 {
            for _ in 0..e[i] {
                let mut next = Vec::new();
                for (mono, coef) in &poly {
                    for j in 0..3 {
                        if m[i][j] != 0 {
                            let mut m2 = *mono;
                            m2[j] += 1;
                            next.push((m2, coef * m[i][j]));
                        }
                    }
                }
                poly = next;
            }
        }
        for (mono, coef) in poly {
            out[index(mono)] += coef;
        }
    }
    out
}

fn points(out: &[PlanePoint]) -> BTreeSet<[i64; 3]> {
    out.iter().map(|p| [&p.x, &p.y, &p.z].map(|v| i64::try_from(v).unwrap())).collect()
}

/// Both searches to height `h`, their points compared.
fn agree(c: [i64; 10], h: u64) -> usize {
    let f = form(c);
    let lattice = search_plane_cubic(&f, &SearchLimits::new(h)).unwrap();
    let plain = search_plane_cubic_naive(&f, &SearchLimits::new(h)).unwrap();
    assert!(plain.complete);
    let (lp, pp) = (points(&lattice.points), points(&plain.points));
    // every point found is a point; a complete search (a smooth cubic: no
    // arc met a singular point) finds them all
    assert!(lp.is_subset(&pp), "cubic {c:?} to height {h}");
    if lattice.complete {
        // a singular point of the cubic (a node, a cusp, or an isolated real
        // point such as (1:0:0) on x (y^2 + 2 z^2)) is no arc's point: the
        // search is for smooth cubics, which have none
        let grad_zero = |p: &[i64; 3]| {
            let pi = p.map(Integer::from);
            (0..3).all(|i| {
                let mut e = [Integer::from(0), Integer::from(0), Integer::from(0)];
                e[i] = Integer::from(1);
                // dF/dx_i by F(p + e) - F(p - e) = 2 dF/dx_i + 2 (third-order term)
                let plus = eval(&f, &[&pi[0] + &e[0], &pi[1] + &e[1], &pi[2] + &e[2]]);
                let minus = eval(&f, &[&pi[0] - &e[0], &pi[1] - &e[1], &pi[2] - &e[2]]);
                let third = Integer::from(2) * &f[[0, 6, 9][i]];
                plus - minus - third == 0
            })
        };
        let missed: Vec<_> = pp.difference(&lp).filter(|p| !grad_zero(p)).collect();
        assert!(missed.is_empty(), "cubic {c:?} to height {h}: missed {missed:?}");
    }
    for p in &lattice.points {
        assert_eq!(eval(&f, &[p.x.clone(), p.y.clone(), p.z.clone()]), 0);
        assert!(p.height() <= h);
    }
    lattice.points.len()
}

#[test]
fn lattice_and_plain_searches_agree_on_sums_of_two_cubes() {
    // x^3 + y^3 = n z^3 and three changes of coordinates of it (the plain
    // search is the independent route; the transforms move the points off
    // the coordinate axes)
    let moves = [[[1, 0, 0], [0, 1, 0], [0, 0, 1]], [[1, 1, 0], [0, 1, 1], [1, 0, 2]], [[2, -1, 1], [1, 1, 0], [0, 1, -1]]];
    let mut with_points = 0;
    for n in 2..=40i64 {
        for m in moves {
            let c = transformed(&[1, 0, 0, 0, 0, 0, 1, 0, 0, -n], m);
            if agree(c, 30) > 1 {
                with_points += 1;
            }
        }
    }
    // besides (1 : -1 : 0), the cubics with n = 2, 7, 9, 12, 19, 26, 28, 35,
    // ... have points of small height (Selmer 1951 lists the cube sums)
    assert!(with_points >= 18, "{with_points}");
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 24, ..ProptestConfig::default() })]
    /// Cubics through `(1:0:0)` and `(0:1:0)` moved by a unimodular map:
    /// the lattice search finds exactly the points of the plain one.
    #[test]
    fn lattice_and_plain_searches_agree_on_random_cubics(
        c in prop::array::uniform10(-6i64..=6),
        a in -2i64..=2, b in -2i64..=2, d in -2i64..=2,
    ) {
        let mut c = c;
        c[0] = 0;
        c[6] = 0;
        prop_assume!(c.iter().any(|&v| v != 0));
        // a unimodular matrix: a product of elementary ones
        let m = [[1, a, b], [0, 1, d], [0, 0, 1]];
        let m2 = [[1, 0, 0], [b, 1, 0], [a, d, 1]];
        let mut prod = [[0i64; 3]; 3];
        for i in 0..3 { for j in 0..3 { for k in 0..3 { prod[i][j] += m[i][k] * m2[k][j]; } } }
        let f = transformed(&c, prod);
        agree(f, 25);
    }
}

#[test]
fn the_chord_through_two_points_meets_a_third_point_found_by_the_search() {
    // x^3 + y^3 = 7 z^3: to height 10^5 the search finds 11 points (among
    // them (2 : -1 : 1), (4 : 5 : 3), (17 : -73 : -38)); for points P, Q on a cubic the line through
    // them meets it again in R = F'(Q).P P - F'(P).Q Q (the polar forms),
    // which must be among the points found whenever its height is small
    let f = form([1, 0, 0, 0, 0, 0, 1, 0, 0, -7]);
    let h = 100_000;
    let out = search_plane_cubic(&f, &SearchLimits::new(h)).unwrap();
    assert!(out.complete);
    assert_eq!(out.points.len(), 11);
    let found = points(&out.points);
    let polar = |p: &[Integer; 3], q: &[Integer; 3]| -> Integer {
        // sum_i dF/dx_i(p) q_i, by the exact difference F(p + t q) at t = 1, -1 and 2
        let at = |t: i64| eval(&f, &[&p[0] + Integer::from(t) * &q[0], &p[1] + Integer::from(t) * &q[1], &p[2] + Integer::from(t) * &q[2]]);
        let (f1, fm1, f2) = (at(1), at(-1), at(2));
        let (fp, fq) = (eval(&f, p), eval(&f, q));
        // f1 = fp + A + B + fq, fm1 = fp - A + B - fq, f2 = fp + 2A + 4B + 8fq
        let a_plus_b = &f1 - &fp - &fq;
        let b_minus_a = &fm1 - &fp + &fq;
        let b = (&a_plus_b + &b_minus_a) / Integer::from(2);
        let a = &a_plus_b - &b;
        assert_eq!(f2, &fp + Integer::from(2) * &a + Integer::from(4) * &b + Integer::from(8) * &fq);
        a
    };
    let pts: Vec<[Integer; 3]> = found.iter().map(|p| p.map(Integer::from)).collect();
    let mut checked = 0;
    let mut small_thirds = 0;
    for (i, p) in pts.iter().enumerate() {
        for q in &pts[i + 1..] {
            let (a, b) = (polar(p, q), polar(q, p));
            let r: [Integer; 3] = [0, 1, 2].map(|t| &b * &p[t] - &a * &q[t]);
            if r.iter().all(|v| *v == 0) {
                continue;
            }
            assert_eq!(eval(&f, &r), 0, "the third point of the chord");
            let g = r.iter().fold(Natural::from(0u32), |g, v| g.gcd(v.unsigned_abs()));
            let mut r = r.map(|v| v / Integer::from(g.clone()));
            if r.iter().find(|v| **v != 0).is_some_and(|v| *v < 0) {
                r = r.map(|v| -v);
            }
            let small = r.iter().all(|v| v.unsigned_abs() <= Natural::from(h));
            if small {
                let key = r.clone().map(|v| i64::try_from(&v).unwrap());
                assert!(found.contains(&key), "third point {key:?} of the chord through {p:?} and {q:?} not found");
                small_thirds += 1;
            }
            checked += 1;
        }
    }
    assert_eq!(checked, 55);
    assert!(small_thirds > 10, "{small_thirds}");
}

#[test]
fn selmers_cubic_has_no_points() {
    // 3 x^3 + 4 y^3 + 5 z^3 = 0 is soluble in every completion of Q and has
    // no rational point (Selmer, Acta Math. 85 (1951)): nothing to 2 * 10^4
    let out = search_plane_cubic(&form([3, 0, 0, 0, 0, 0, 4, 0, 0, 5]), &SearchLimits::new(20_000)).unwrap();
    assert!(out.complete);
    assert!(out.points.is_empty());
    assert_eq!(out.height_reached, 20_000);
}

#[test]
fn bad_forms_are_typed_errors() {
    let zero = form([0; 10]);
    assert_eq!(search_plane_cubic(&zero, &SearchLimits::new(10)).unwrap_err().kind(), &twofold::ErrorKind::InvalidValue);
    let mut big = form([1, 0, 0, 0, 0, 0, 1, 0, 0, -7]);
    big[4] = Integer::from(1) << 130u32;
    assert_eq!(search_plane_cubic(&big, &SearchLimits::new(10)).unwrap_err().kind(), &twofold::ErrorKind::TooLarge);
    assert_eq!(search_plane_cubic_naive(&form([1, 0, 0, 0, 0, 0, 1, 0, 0, -7]), &SearchLimits::new(2000)).unwrap_err().kind(), &twofold::ErrorKind::TooLarge);
}

/// The coefficients of `F(M s)` for the ternary form `c` (any size).
fn eval_form_at(c: &[i64; 10], t: &[Integer; 3]) -> Integer {
    eval(&form(*c), t)
}

#[test]
fn the_generator_of_y2_x3_9279_lies_on_a_plane_cubic_covering() {
    // y^2 = x^3 + 9279 (rank one; the 2-coverings have no point up to height
    // 2^20: DEVELOPERS.md, issue-16 evidence). A 3-descent by the 3-isogeny
    // (a prototype outside the library, fifteenth session: the class of the
    // generator under P -> y + sqrt(9279) is the fundamental unit
    // eps = A + B sqrt(1031) of Q(sqrt 1031); the binary cubic of its covering,
    // a second descent over its cubic field, minimisation at 2 and 3 and
    // reduction) gave the plane cubic below; the library's lattice search
    // finds its point, which is mapped back to E by the prototype's maps
    // (the data here) and verified with exact arithmetic.
    let d = [3, -6, 7, 15, -16, -23, -3, 4, 31, -10];
    let out = search_plane_cubic(&form(d), &SearchLimits::new(4096)).unwrap();
    assert!(out.complete);
    let found = points(&out.points);
    assert_eq!(found.iter().copied().collect::<Vec<_>>(), vec![[3725, 995, 1647]]);
    let s = [3725i64, 995, 1647];
    // back to the reduced model (the minimisation's index-6 sublattice): t = M s
    let m = [[-1i64, 2, 4], [1, 0, 0], [0, 1, -1]];
    let t: [Integer; 3] = [0, 1, 2].map(|i| Integer::from(m[i][0] * s[0] + m[i][1] * s[1] + m[i][2] * s[2]));
    assert_eq!(eval(&form([11, -39, 24, -93, 588, -318, 281, -120, 510, 128]), &t), 0);
    // the binary cubic's variables: X = U(t) / 3, Y = -V(t), then (u, v) by a
    // unimodular change (GL2 reduction of the binary cubic, undone)
    let big_x = Rational::from_integers(eval_form_at(&[-200, 3288, -3120, 1272, -5952, 10704, -3368, 34032, -21840, 10312], &t), Integer::from(3));
    let big_y = Rational::from(-eval_form_at(&[-70, -30, 492, 2058, -2832, 2292, 866, 3012, 5748, -1312], &t));
    let u = Rational::from(662541) * &big_x + Rational::from(83516) * &big_y;
    let v = Rational::from(-6878) * &big_x - Rational::from(867) * &big_y;
    // (u, v) as coprime integers (a projective pair)
    let den = Integer::from(malachite::base::num::arithmetic::traits::Lcm::lcm(u.denominator_ref().clone(), v.denominator_ref().clone()));
    let (u, v) = (Integer::try_from(&u * Rational::from(den.clone())).unwrap(), Integer::try_from(&v * Rational::from(den)).unwrap());
    let g = Integer::from(u.unsigned_abs_ref().clone().gcd(v.unsigned_abs_ref().clone()));
    let (u, v) = (u / &g, v / &g);
    // y + sqrt k = eps ((u + v sqrt k) / (w/3))^3, k = 9279 = 9 * 1031,
    // eps = A + (B/3) sqrt k; its sqrt(k) part gives w^3 = 27 [eps (u + v sqrt k)^3]_{sqrt k}
    let (a, b, k) = (Integer::from(651737448664200i64), Integer::from(20297537082877i64), Integer::from(9279));
    assert_eq!(&a * &a - Integer::from(1031) * &b * &b, 1, "eps has norm 1");
    let w3 = Integer::from(9) * (&b * &u * &u * &u + Integer::from(9) * &a * &u * &u * &v + Integer::from(3) * &k * &b * &u * &v * &v + Integer::from(3) * &k * &a * &v * &v * &v);
    let w = w3.checked_root(3).expect("a cube");
    let x = Rational::from_integers(Integer::from(9) * (&u * &u - &k * &v * &v), &w * &w);
    let rhs = &x * &x * &x + Rational::from(k.clone());
    let y = Rational::from_integers(rhs.numerator_ref().checked_sqrt().unwrap().into(), rhs.denominator_ref().checked_sqrt().unwrap().into());
    let e = Curve::from_coefficients([0, 0, 0, 0, 9279]).unwrap();
    let p = Point::Affine(x.clone(), y);
    assert!(e.contains(&p));
    assert_eq!(x, Rational::from_integers(Integer::from(234815800832699168650175209u128), Integer::from(54324205395515756480160000u128)));
    // a generator: the 2-descent proves rank <= 1 (dim Sel^2 = 1), the point
    // has infinite order, and saturation is proven at every prime of the index bound
    let data = CurveData::new(&e, &Work::unlimited()).unwrap();
    let basis = mordell_weil_basis_of(&data, &[p], 256, &SaturationOptions::default()).unwrap();
    assert!(basis.saturation.is_saturated(), "{:?}", basis.saturation);
    let h = basis.regulator_f64();
    // BSD with trivial torsion and #Sha = 1 predicts h = L'(E,1) / (Omega prod c_p);
    // 62.77 is that prediction as the rank example printed it (DEVELOPERS.md,
    // issue-16 evidence, fourteenth session), checked here to 1e-3
    assert!((h - 62.7715).abs() < 1e-3, "height {h}");
}
