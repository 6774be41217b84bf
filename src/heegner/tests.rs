//! Tests of the Heegner point route against published values.

use crate::heights::canonical_height;
use crate::local::bad_primes_data;
use super::*;

fn run(c: [i64; 5], n: u32) -> HeegnerResult {
    let e = Curve::from_coefficients(c).unwrap();
    let r = point_of_rank_one(&e, &Natural::from(n), &HeegnerOptions::default()).unwrap();
    let r = r.unwrap_or_else(|| panic!("no point for {c:?}"));
    assert!(e.contains(&r.generator) && e.contains(&r.recognised_point));
    r
}

/// y^2 + y = x^3 - x (conductor 37, rank 1; Cremona, Algorithms for Modular
/// Elliptic Curves, Table 1): the generator (0, 0) has canonical height
/// 0.0511114082 (from memory).
#[test]
fn conductor_37() {
    let r = run([0, 0, 1, -1, 0], 37);
    eprintln!("{r:?}");
    assert!((r.height - 0.0511114082).abs() < 1e-8);
}

fn table(path: &str) -> Vec<(u32, [i64; 5], u32)> {
    let text = std::fs::read_to_string(path).expect("shared data present");
    text.lines()
        .filter(|l| !l.starts_with('#'))
        .map(|l| {
            let f: Vec<&str> = l.split('\t').collect();
            let c = [2, 3, 4, 5, 6].map(|i| f[i].parse::<i64>().unwrap());
            (f[0].parse().unwrap(), c, f[7].parse().unwrap())
        })
        .collect()
}

/// Every rank-1 curve of conductor at most 162 (J. E. Cremona, Algorithms
/// for Modular Elliptic Curves, 2nd ed., 1997, Table 1, via
/// ../shared/data/curves-small-conductor.tsv): a point is found and
/// verified, and its generator's canonical height equals the regulator of
/// the library's own saturated basis from the descent route (an independent
/// second computation).
#[test]
fn all_rank_one_curves_of_small_conductor() {
    let rows = table("../shared/data/curves-small-conductor.tsv");
    let mut count = 0;
    let t0 = Instant::now();
    for (n, c, rank) in rows {
        if rank != 1 {
            continue;
        }
        let t = Instant::now();
        let r = run(c, n);
        let e = Curve::from_coefficients(c).unwrap();
        let rep = crate::analyse(&e, &crate::RankOptions::default()).unwrap();
        let reg = rep.evidence.as_ref().and_then(|ev| ev.regulator).expect("regulator");
        eprintln!(
            "{n} {c:?}: D = {}, h = {}, m = {}, bits = {}, index = {:?}, height {:.10} (descent basis {:.10}), predicted {:.6}, {:?}",
            r.discriminant, r.class_number, r.multiplier, r.precision, r.index, r.height, reg, r.predicted_height, t.elapsed()
        );
        assert!((r.height - reg).abs() < 1e-8 * reg.max(1.0), "{c:?}: {} vs {reg}", r.height);
        // Sha = 1 on these curves (Cremona 1997 lists no non-trivial Sha
        // below conductor 571), so the Birch and Swinnerton-Dyer
        // prediction is the generator's height itself
        assert!((r.height / r.predicted_height - 1.0).abs() < 1e-6, "{c:?}: height {} predicted {}", r.height, r.predicted_height);
        count += 1;
    }
    eprintln!("{count} curves in {:?}", t0.elapsed());
    assert_eq!(count, 79);
}

/// The congruent-number curves y^2 = x^3 - n^2 x for n = 5, 6, 7 (rank 1;
/// Koblitz, Introduction to Elliptic Curves and Modular Forms, ch. I: the
/// triangles (3/2, 20/3, 41/6), (3, 4, 5) and (35/12, 24/5, 337/60)).
/// Conductors from the library's local data (32 n^2 for odd n).
#[test]
fn congruent_numbers_small() {
    for n in [5i64, 6, 7] {
        let e = Curve::from_coefficients([0, 0, 0, -n * n, 0]).unwrap();
        let (_, cond, _) = crate::rootno::minimal_conductor_sign(&e).unwrap();
        let t = Instant::now();
        let r = run([0, 0, 0, -n * n, 0], u32::try_from(&cond).unwrap());
        eprintln!("n = {n}: {:?} D = {} bits = {} index {:?} height {} predicted {} in {:?}", r.generator, r.discriminant, r.precision, r.index, r.height, r.predicted_height, t.elapsed());
        // the generator is a point of infinite order; its x gives a triangle:
        // x = (c/2)^2 with c the hypotenuse of a rational right triangle of area n
        assert!((r.height / r.predicted_height - 1.0).abs() < 1e-6, "Sha = 1 for these curves (BSD quotient)");
    }
}

/// n = 157 (Zagier's example, quoted in Koblitz, Introduction to Elliptic
/// Curves and Modular Forms, ch. I): the twist route needs about a second
/// on a loaded machine. With a 100 ms time limit the route stops promptly
/// with a budget error and claims nothing.
#[test]
fn congruent_number_157_honours_the_time_limit() {
    let n = 157i64;
    let e = Curve::from_coefficients([0, 0, 0, -n * n, 0]).unwrap();
    let t = Instant::now();
    let opts = HeegnerOptions { time_limit: Some(Duration::from_millis(100)), ..HeegnerOptions::default() };
    let r = point_of_rank_one(&e, &Natural::from(32u32 * 157 * 157), &opts);
    assert_eq!(r.unwrap_err().kind(), &ErrorKind::Budget);
    assert!(t.elapsed() < Duration::from_secs(3), "{:?}", t.elapsed());
}

/// The full computation for n = 157 by the twist route (the curve is the
/// twist by 157 of y^2 = x^3 - x, conductor 32; about 10 s on a loaded
/// 2-core machine, 273 s by the direct series). The point is verified
/// exactly on the curve; the triangle `a = |(x^2 - n^2)/y|, b = |2nx/y|,
/// c = |(x^2 + n^2)/y|` built from it has area n and a^2 + b^2 = c^2
/// (checked exactly), and its sides are Zagier's (D. Zagier's computation,
/// quoted in N. Koblitz, Introduction to Elliptic Curves and Modular Forms,
/// ch. I; the digits below are from memory, and are themselves checked to
/// form a right triangle of area 157).
#[test]
fn congruent_number_157() {
    let n = 157i64;
    let e = Curve::from_coefficients([0, 0, 0, -n * n, 0]).unwrap();
    let t = Instant::now();
    let r = point_of_rank_one(&e, &Natural::from(32u32 * 157 * 157), &HeegnerOptions::default()).unwrap().unwrap();
    assert!(e.contains(&r.generator));
    let Point::Affine(x, y) = r.generator.clone() else { panic!("affine") };
    let nq = Rational::from(n);
    let abs = |q: Rational| if q < 0u32 { -q } else { q };
    let a = abs((&x * &x - &nq * &nq) / &y);
    let b = abs(Rational::from(2) * &nq * &x / &y);
    let c = abs((&x * &x + &nq * &nq) / &y);
    assert_eq!(&a * &b / Rational::from(2), nq);
    assert_eq!(&a * &a + &b * &b, &c * &c);
    let q = |s: &str| -> Rational {
        let (p, d) = s.split_once('/').unwrap();
        Rational::from_integers(p.parse().unwrap(), d.parse().unwrap())
    };
    // Zagier's triangle (from memory)
    let za = q("6803298487826435051217540/411340519227716149383203");
    let zb = q("411340519227716149383203/21666555693714761309610");
    let zc = q("224403517704336969924557513090674863160948472041/8912332268928859588025535178967163570016480830");
    assert_eq!(&za * &zb / Rational::from(2), nq, "the remembered sides have area 157");
    assert_eq!(&za * &za + &zb * &zb, &zc * &zc, "the remembered sides form a right triangle");
    assert_eq!(c, zc);
    assert!((a == za && b == zb) || (a == zb && b == za));
    eprintln!(
        "n = 157: generator {} (D = {}, h = {}, {} bits, {} terms, index {:?}, height {}) in {:?}\ntriangle a = {a}\nb = {b}\nc = {c}",
        r.generator, r.discriminant, r.class_number, r.precision, r.terms, r.index, r.height, t.elapsed()
    );
}

/// Whether the rational `q` is the square of a rational.
fn is_rational_square(q: &Rational) -> bool {
    use malachite::base::num::arithmetic::traits::CheckedSqrt;
    *q >= 0u32 && q.numerator_ref().clone().checked_sqrt().is_some() && q.denominator_ref().clone().checked_sqrt().is_some()
}

/// n = 543 and n = 965 on y^2 = x^3 - n^2 x (Tunnell's A = 2B, root
/// number -1; the last two n <= 1000 without a point before the eleventh
/// session). The Heegner trace is `k Q + T` with `T` of order 2 here, so
/// the route must divide `P + T`, not only `P`: before, n = 543 returned
/// `2 Q + T` (height 185.6, four times the prediction) as the generator.
/// Checks, each exact: the point is on the curve; the triangle it gives has
/// area n and a^2 + b^2 = c^2 (Koblitz, Introduction to Elliptic Curves and
/// Modular Forms, ch. I, Prop. 18); no `G + T` (T in E(Q)_tors) lies in
/// 2E(Q): with all of E[2] rational, `P` is in 2E(Q) iff `x - e_i` is a
/// square for each root `e_i` (Silverman, The Arithmetic of Elliptic
/// Curves, Prop. X.1.4 and its proof; Knapp, Elliptic Curves, Thm. 4.2), so
/// the generator is 2-saturated. And numerically the generator's height is
/// the height the Birch and Swinnerton-Dyer formula predicts for Sha = 1
/// (ratio 1; `#Sha = predicted / height` must be a square: Gross and
/// Zagier 1986, Cremona 1997 §3.5 for the formula's factors).
#[test]
fn congruent_numbers_543_and_965() {
    for n in [543i64, 965] {
        let e = Curve::from_coefficients([0, 0, 0, -n * n, 0]).unwrap();
        let (m, cond, w) = crate::rootno::minimal_conductor_sign(&e).unwrap();
        assert_eq!((w, &m), (-1, &e));
        let t = Instant::now();
        let r = point_of_rank_one(&e, &cond, &HeegnerOptions::default()).unwrap().expect("a point");
        let g = r.generator.clone();
        assert!(e.contains(&g) && e.torsion_order_of(&g).is_none());
        let Point::Affine(x, y) = g.clone() else { panic!("affine") };
        let nq = Rational::from(n);
        let abs = |q: Rational| if q < 0u32 { -q } else { q };
        let (a, b, c) = (abs((&x * &x - &nq * &nq) / &y), abs(Rational::from(2) * &nq * &x / &y), abs((&x * &x + &nq * &nq) / &y));
        assert_eq!(&a * &b / Rational::from(2), nq);
        assert_eq!(&a * &a + &b * &b, &c * &c);
        let roots = [Rational::from(0), nq.clone(), -nq.clone()];
        let primes: Vec<Natural> = crate::arith::factor_u64(u64::try_from(&cond).unwrap()).unwrap().into_iter().map(|(p, _)| Natural::from(p)).collect();
        let torsion = TorsionGroup::compute(&e, &primes);
        assert_eq!(torsion.order(), 4);
        for tp in torsion.points() {
            let Point::Affine(xs, _) = e.add(&g, tp) else { panic!("G + T is not O") };
            assert!(!roots.iter().all(|r| is_rational_square(&(&xs - r))), "n = {n}: G + T in 2E(Q)");
        }
        assert_eq!(r.index, Some(1), "the recognised point is the generator");
        assert!((r.height / r.predicted_height - 1.0).abs() < 1e-6, "n = {n}: {} vs {}", r.height, r.predicted_height);
        eprintln!("n = {n}: {} bits, D = {}, k = {}, height {:.6}, predicted {:.6}, {:?}", r.precision, r.discriminant, r.divisor, r.height, r.predicted_height, t.elapsed());
    }
}

/// The direct series and the twist route give the same generator (up to
/// sign and torsion) on the congruent-number curves for n = 5, 7, 13
/// (twists of y^2 = x^3 - x by 5, -7, 13): two routes that must agree.
#[test]
fn twist_and_direct_routes_agree() {
    for n in [5i64, 7, 13] {
        let e = Curve::from_coefficients([0, 0, 0, -n * n, 0]).unwrap();
        let cond = Natural::from(32u64 * (n * n) as u64);
        let tw = point_of_rank_one(&e, &cond, &HeegnerOptions::default()).unwrap().unwrap();
        let direct = point_of_rank_one(&e, &cond, &HeegnerOptions { use_twist: false, ..HeegnerOptions::default() }).unwrap().unwrap();
        assert!((tw.height - direct.height).abs() < 1e-9 * tw.height, "n = {n}: {} vs {}", tw.height, direct.height);
        let g = &tw.generator;
        let h = &direct.generator;
        let torsion = TorsionGroup::compute(&e, &[Natural::from(2u32), Natural::from(n as u64)]);
        let same = torsion.points().iter().any(|t| {
            let s = e.add(h, t);
            s == *g || s == e.negate(g)
        }) || h == g || *h == e.negate(g);
        assert!(same, "n = {n}: {g:?} vs {h:?}");
    }
}

/// [1,0,1,-977837,-372256741], conductor 130017, published rank 1 with
/// torsion of order 2 (tests/data/curves-wider.tsv, class 4 of 130017, the
/// open tables extending Cremona 1997; the class's four curves are linked
/// by 2-isogenies): the generator has height 226.6 (a 943-bit series on the
/// curve itself), but the Birch and Swinnerton-Dyer formula predicts a
/// quarter of that on the member [1,0,1,-1012137,-344748155] (torsion 4,
/// Tamagawa product 16 against 1), so the series runs there and the point
/// is carried back along the isogeny of degree 4: `ĥ(φ P) = 4 ĥ(P)`
/// (Silverman, The Arithmetic of Elliptic Curves, exercise 8.8). The
/// carried point is the generator (index 1) and its height the prediction
/// (Sha trivial); 226.6058 is the height the series on the curve itself
/// found (twelfth session, 943 bits; a regression value, not a reference).
#[test]
fn a_smaller_generator_on_an_isogenous_curve() {
    let c = [1, 0, 1, -977837, -372256741];
    let e = Curve::from_coefficients(c).unwrap();
    let t = Instant::now();
    let r = run(c, 130017);
    let via = Instant::now() - t;
    let (member, degree) = r.isogenous_curve.clone().expect("the series ran on an isogenous curve");
    assert_eq!((member, degree), (Curve::from_coefficients([1, 0, 1, -1012137, -344748155]).unwrap(), 4));
    assert!(e.torsion_order_of(&r.generator).is_none());
    assert_eq!(r.index, Some(1));
    assert!(r.saturation.is_saturated(), "{}", r.saturation);
    assert!((r.height / r.predicted_height - 1.0).abs() < 1e-6, "height {} predicted {}", r.height, r.predicted_height);
    assert!((r.height - 226.6058).abs() < 1e-3, "{}", r.height);
    eprintln!("via the isogenous curve: {} bits, D = {}, k = {}, {via:?}", r.precision, r.discriminant, r.divisor);
}

/// `z(W_N τ) = z(τ)` for root number -1 (Atkin and Lehner 1970: the
/// newform is a `W_N`-eigenform with eigenvalue `-w`; the constant vanishes
/// at the fixed point `i / sqrt N`): on y^2 + y = x^3 - x (conductor 37,
/// w = -1; Cremona 1997, Table 1) and the rank-one curve
/// [1, -1, 0, 2781, 114151] of conductor 130014 (curves-wider.tsv), every
/// Heegner form that `nearer_to_infinity` replaces gives the same value of
/// the series modulo the period lattice, and none gets a larger first
/// coefficient.
#[test]
fn involution_images_give_the_same_value() {
    let work = crate::Work::unlimited();
    let mut replaced = 0;
    for (c, n) in [([0, 0, 1, -1, 0], 37u64), ([1, -1, 0, 2781, 114151], 130014)] {
        let e = Curve::from_coefficients(c).unwrap();
        let primes: Vec<Natural> = crate::arith::factor_u64(n).unwrap().into_iter().map(|(p, _)| Natural::from(p)).collect();
        let bad: Vec<(u64, i64)> = crate::local::CurveData::new(&e, &work).unwrap().bad_prime_traces().unwrap();
        assert_eq!(primes.len(), bad.len());
        let lat = crate::heights::elliptic::Lattice::new(&PeriodLattice::compute(&e, 120).unwrap(), 120);
        let mut pairs = Vec::new();
        for h in heegner_discriminants(n, 4).unwrap() {
            let moved = nearer_to_infinity(&h.forms, n);
            for (f, g) in h.forms.iter().zip(moved) {
                assert!(g.a <= f.a && g.a % n as i128 == 0 && g.discriminant() == f.discriminant());
                if *f != g {
                    pairs.push((*f, g, h.discriminant));
                }
            }
        }
        replaced += pairs.len();
        let m = pairs.iter().map(|(f, _, d)| analytic::terms_needed(f.a as f64, (-d) as f64, 80)).max().unwrap_or(1);
        let a = traces::dirichlet_coefficients_fast(&e, &bad, m + 10, &|| false).unwrap();
        for (f, g, d) in pairs {
            let zf = analytic::modular_sum(&a, &[f], d, 80, &work).unwrap();
            let zg = analytic::modular_sum(&a, &[g], d, 80, &work).unwrap();
            let (x, y) = lat.coordinates(&zf.sub(&zg));
            let (x, y) = (to_f64(&x), to_f64(&y));
            assert!((x - x.round()).abs() < 1e-15 && (y - y.round()).abs() < 1e-15, "{c:?} {f:?} {g:?}: {x} {y}");
        }
    }
    assert!(replaced > 0);
}

/// Each class is paired with the class of `[C N, B, A / N]` (the form of
/// `W_N(-conj τ)`), whose series value is the complex conjugate modulo the
/// period lattice (Gross, Kohnen and Zagier 1987, §I.1, for the
/// equivalence of Heegner forms; checked here numerically, an independent
/// second computation of both values), and the paired sum (one series per
/// pair, twice its real part) equals the sum over every class modulo the
/// lattice. Curves: y^2 + y = x^3 - x and y^2 + y = x^3 + x^2 (conductors
/// 37 and 43, rank 1, Cremona 1997, Table 1) with their first twelve
/// discriminants, and the curve of conductor 130014 of the benches with its
/// first.
#[test]
fn conjugate_classes_give_conjugate_values() {
    let work = crate::Work::unlimited();
    let (mut pairs, mut fixed) = (0, 0);
    for (c, n, count) in [([0, 0, 1, -1, 0], 37u64, 12), ([0, 1, 1, 0, 0], 43, 12), ([1, -1, 0, 2781, 114151], 130014, 1)] {
        let e = Curve::from_coefficients(c).unwrap();
        let bad: Vec<(u64, i64)> = crate::local::CurveData::new(&e, &work).unwrap().bad_prime_traces().unwrap();
        let lat = crate::heights::elliptic::Lattice::new(&PeriodLattice::compute(&e, 120).unwrap(), 120);
        let in_lattice = |z: &Cx| {
            let (x, y) = lat.coordinates(z);
            let (x, y) = (to_f64(&x), to_f64(&y));
            (x - x.round()).abs() < 1e-15 && (y - y.round()).abs() < 1e-15
        };
        for h in heegner_discriminants(n, count).unwrap().into_iter().filter(|h| h.forms.len() > 1) {
            let d = h.discriminant;
            let m = h.forms.iter().map(|f| analytic::terms_needed(f.a as f64, (-d) as f64, 80)).max().unwrap();
            let a = traces::dirichlet_coefficients_fast(&e, &bad, m + 10, &|| false).unwrap();
            let n128 = i128::from(n);
            for f in &h.forms {
                let g = forms::QuadraticForm { a: f.c * n128, b: f.b, c: f.a / n128 }.reduced();
                let partner = h.forms.iter().find(|k| k.reduced() == g).expect("the conjugate class is listed");
                let zf = analytic::modular_sum(&a, &[*f], d, 80, &work).unwrap();
                let zg = analytic::modular_sum(&a, &[*partner], d, 80, &work).unwrap();
                let conj = Cx::new(zf.re.clone(), -zf.im.clone());
                assert!(in_lattice(&zg.sub(&conj)), "{c:?} D = {d}: {f:?} and {partner:?}");
                if partner == f {
                    fixed += 1;
                } else {
                    pairs += 1;
                }
            }
            let evals = paired_evaluations(&h.forms, n);
            assert_eq!(evals.iter().map(|e| if e.twice_real { 2 } else { 1 }).sum::<usize>(), h.forms.len());
            let whole = analytic::modular_sum(&a, &h.forms, d, 80, &work).unwrap();
            let paired = analytic::modular_sum_at(&a, &evals, d, 80, &work).unwrap();
            assert!(in_lattice(&whole.sub(&paired)), "{c:?} D = {d}: the paired sum differs");
        }
    }
    eprintln!("{pairs} paired, {fixed} fixed");
    assert!(pairs >= 20 && fixed >= 3, "{pairs} paired, {fixed} fixed");
}

mod property {
    use super::*;
    use proptest::prelude::*;

    fn rank_one_rows() -> Vec<(u32, [i64; 5])> {
        table("../shared/data/curves-small-conductor.tsv").into_iter().filter(|r| r.2 == 1).map(|r| (r.0, r.1)).collect()
    }

    proptest! {
        #![proptest_config(ProptestConfig { cases: 12, ..ProptestConfig::default() })]
        /// Points from the Heegner route are on the curve (checked exactly),
        /// and the recognised point has the height that the Birch and
        /// Swinnerton-Dyer formula predicts for a generator (Sha = 1 on
        /// these curves: J. E. Cremona, Algorithms for Modular Elliptic
        /// Curves, Table 1 lists no Sha below conductor 571) times the
        /// square of an integer index.
        #[test]
        fn heegner_points_have_the_predicted_height(i in 0usize..79) {
            let rows = rank_one_rows();
            let (n, c) = rows[i];
            let e = Curve::from_coefficients(c).unwrap();
            let r = point_of_rank_one(&e, &Natural::from(n), &HeegnerOptions::default()).unwrap().unwrap();
            prop_assert!(e.contains(&r.generator) && e.contains(&r.recognised_point));
            let primes: Vec<Natural> = crate::arith::factor_u64(u64::from(n)).unwrap().into_iter().map(|(p, _)| Natural::from(p)).collect();
            let local = bad_primes_data(&e, &primes).unwrap();
            let h = to_f64(&canonical_height(&e, &local, &r.recognised_point, 128).unwrap());
            let k2 = h / r.predicted_height;
            let k = k2.sqrt().round();
            prop_assert!(k >= 1.0 && (k2 - k * k).abs() < 1e-6 * k2.max(1.0), "{c:?}: ratio {k2}");
            prop_assert_eq!(r.index, Some(k as u64));
        }

        /// The twist route on the congruent-number curves y^2 = x^3 - n^2 x,
        /// n square-free, n = 5, 6, 7 mod 8 (root number -1; twists of
        /// y^2 = x^3 - x): the points are on the curve, and the height of
        /// the recognised point is `index^2 / #Sha` times the height the
        /// Birch and Swinnerton-Dyer formula predicts with Sha trivial, for
        /// a square `#Sha` (Cassels: the order of Sha is a square when
        /// finite); the index is checked exactly by `finish`.
        #[test]
        fn twisted_heegner_points_have_the_predicted_height(i in 0usize..12) {
            let ns = [5i64, 6, 7, 13, 14, 15, 21, 22, 23, 29, 30, 31];
            let n = ns[i];
            let e = Curve::from_coefficients([0, 0, 0, -n * n, 0]).unwrap();
            let (m, cond, w) = crate::rootno::minimal_conductor_sign(&e).unwrap();
            prop_assert_eq!(w, -1);
            let r = point_of_rank_one(&m, &cond, &HeegnerOptions::default()).unwrap().unwrap();
            prop_assert!(m.contains(&r.generator) && m.contains(&r.recognised_point));
            let primes: Vec<Natural> = crate::arith::factor_u64(u64::try_from(&cond).unwrap()).unwrap().into_iter().map(|(p, _)| Natural::from(p)).collect();
            let local = bad_primes_data(&m, &primes).unwrap();
            let h = to_f64(&canonical_height(&m, &local, &r.recognised_point, 128).unwrap());
            let k = r.index.expect("index checked exactly") as f64;
            let sha = k * k * r.predicted_height / h;
            let root = sha.sqrt().round();
            prop_assert!(root >= 1.0 && (sha - root * root).abs() < 1e-6 * sha, "n = {n}: #Sha = {sha}");
        }
    }
}
