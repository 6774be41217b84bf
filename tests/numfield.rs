//! Tests of the number-field module against published values and
//! independent computations (reduced binary quadratic forms, continued
//! fractions), and laws on random fields.

use malachite::base::num::basic::traits::One;
use malachite::{Integer, Rational};
use twofold::numfield::{ClassGroupOptions, NumberField};

fn z(v: &[i64]) -> Vec<Integer> {
    v.iter().map(|&c| Integer::from(c)).collect()
}

fn is_fundamental(d: i64) -> bool {
    let sf = |m: i64| (2..).take_while(|q| q * q <= m.abs()).all(|q| m % (q * q) != 0);
    match d.rem_euclid(4) {
        1 => sf(d) && d != 1,
        0 => {
            let m = d / 4;
            (m.rem_euclid(4) == 2 || m.rem_euclid(4) == 3) && sf(m)
        }
        _ => false,
    }
}

/// The quadratic field of discriminant d: x^2 - d/4 or x^2 - x + (1-d)/4.
fn quadratic(d: i64) -> NumberField {
    let f = if d.rem_euclid(4) == 0 { z(&[-d / 4, 0, 1]) } else { z(&[(1 - d) / 4, -1, 1]) };
    NumberField::new(&f).unwrap()
}

/// Independent: the number of reduced primitive forms (a, b, c) of
/// discriminant d < 0 (Gauss; Cohen GTM 138, Algorithm 5.3.5 in spirit).
fn forms_count(d: i64) -> i64 {
    let mut h = 0;
    let mut a = 1;
    while 3 * a * a <= -d {
        for b in -a + 1..=a {
            let num = b * b - d;
            if num % (4 * a) != 0 {
                continue;
            }
            let c = num / (4 * a);
            if c < a || (c == a && b < 0) {
                continue;
            }
            let g = gcd(gcd(a, b.abs()), c);
            if g == 1 {
                h += 1;
            }
        }
        a += 1;
    }
    h
}

fn gcd(a: i64, b: i64) -> i64 {
    if b == 0 { a } else { gcd(b, a % b) }
}

#[test]
fn class_number_one_imaginary_quadratic() {
    // Heegner (1952), Baker (1966), Stark (1967): the nine discriminants of class number 1
    let opts = ClassGroupOptions::default();
    for d in [-3i64, -4, -7, -8, -11, -19, -43, -67, -163] {
        let cg = quadratic(d).class_group(&opts).unwrap();
        assert_eq!(cg.class_number, 1, "d = {d}");
    }
    // and the others up to -200 have h > 1 (same theorem)
    for d in -200i64..-3 {
        if is_fundamental(d) && ![-3i64, -4, -7, -8, -11, -19, -43, -67, -163].contains(&d) {
            assert!(quadratic(d).class_group(&opts).unwrap().class_number > 1, "d = {d}");
        }
    }
}

#[test]
fn class_number_two_imaginary_quadratic() {
    // Baker (1971), Stark (1975): the 18 fundamental discriminants of class number 2
    let list = [-15i64, -20, -24, -35, -40, -51, -52, -88, -91, -115, -123, -148, -187, -232, -235, -267, -403, -427];
    let opts = ClassGroupOptions::default();
    for d in list {
        assert_eq!(quadratic(d).class_group(&opts).unwrap().class_number, 2, "d = {d}");
    }
}

#[test]
fn imaginary_quadratic_against_reduced_forms() {
    // independent: counting reduced forms, every fundamental -4000 < d < 0
    let opts = ClassGroupOptions::default();
    for d in (-3999i64..0).rev() {
        if !is_fundamental(d) {
            continue;
        }
        let cg = quadratic(d).class_group(&opts).unwrap();
        assert_eq!(cg.class_number, forms_count(d), "d = {d}");
        assert!((cg.analytic_ratio - 1.0).abs() < 0.3, "d = {d} ratio {}", cg.analytic_ratio);
    }
}

/// Independent: the regulator log(eps) of Q(sqrt d) from the period of the
/// continued fraction of (s + sqrt d)/2 (product of the complete quotients
/// over one period; Cohen GTM 138, §5.7), and the norm of eps: (-1)^period.
fn cf_regulator(d: i64) -> (f64, i32) {
    let sd = (d as f64).sqrt();
    let mut s = sd.floor() as i64;
    while s * s > d {
        s -= 1;
    }
    if (s - d).rem_euclid(2) != 0 {
        s -= 1;
    }
    let (p0, q0) = (s, 2i64);
    let (mut p, mut q) = (p0, q0);
    let mut reg = 0.0;
    let mut len = 0;
    loop {
        let x = (p as f64 + sd) / q as f64;
        reg += x.ln();
        let a = ((p as f64 + sd) / q as f64).floor() as i64;
        let np = a * q - p;
        let nq = (d - np * np) / q;
        p = np;
        q = nq;
        len += 1;
        if p == p0 && q == q0 {
            break;
        }
    }
    (reg, if len % 2 == 0 { 1 } else { -1 })
}

#[test]
fn real_quadratic_regulators_by_continued_fractions() {
    // Every fundamental 0 < d < 2000: where the class group computation
    // completes, its regulator equals the continued-fraction one. Fields with
    // a large regulator (about 15 and more) often end with a budget error:
    // the relation search finds no unit in time (a known gap, not a wrong answer).
    let opts = ClassGroupOptions::default();
    let (mut done, mut total) = (0, 0);
    for d in 5i64..2000 {
        if !is_fundamental(d) {
            continue;
        }
        let k = quadratic(d);
        total += 1;
        let (reg, sign) = cf_regulator(d);
        let cg = match k.class_group(&opts) {
            Ok(cg) => cg,
            Err(e) => {
                assert_eq!(e.kind(), &twofold::ErrorKind::Budget, "d = {d}");
                assert!(reg > 10.0, "d = {d}: gave up although R = {reg}");
                continue;
            }
        };
        done += 1;
        assert!((cg.regulator - reg).abs() < 1e-6 * reg, "d = {d}: {} vs {reg}", cg.regulator);
        assert!((cg.analytic_ratio - 1.0).abs() < 0.3, "d = {d}");
        // the compact unit has norm (-1)^period when expanded (small d only)
        if reg < 60.0 {
            let u = cg.units[0].expand(&k).unwrap();
            assert_eq!(k.norm(&u), Rational::from(sign), "d = {d}");
        }
    }
    eprintln!("real quadratic fields completed: {done} of {total}");
    assert!(done * 10 >= total * 9, "{done} of {total}");
}

#[test]
fn real_quadratic_class_numbers_from_memory() {
    // (from memory) h(40) = 2, h(60) = 2, h(229) = 3, h(316) = 3, h(328) = 4, h(904) = 8, h(5) = 1
    let opts = ClassGroupOptions::default();
    for (d, h) in [(5i64, 1i64), (40, 2), (60, 2), (229, 3), (316, 3), (328, 4), (904, 8)] {
        assert_eq!(quadratic(d).class_group(&opts).unwrap().class_number, h, "d = {d}");
    }
}

#[test]
fn smallest_cubic_fields() {
    // The cubic fields of smallest |d|: class number 1; regulators (from memory, to 4 digits):
    // d = -23: 0.2812 (unit the real root of x^3 - x - 1), d = -31: 0.3822, d = -44: 0.6094,
    // d = 49: 0.5255, d = 81: 0.8493; d = 148: 1.6623 (independent: the smallest regulator of
    // pairs of units a + b t + c t^2 with |a|,|b|,|c| <= 5, found by a brute-force search in Python).
    let opts = ClassGroupOptions::default();
    for (f, d, reg) in [
        (z(&[-1, -1, 0, 1]), -23, 0.2812),
        (z(&[-1, 1, 0, 1]), -31, 0.3822),
        (z(&[1, 1, -1, 1]), -44, 0.6094),
        (z(&[1, -2, -1, 1]), 49, 0.5255),
        (z(&[-1, -3, 0, 1]), 81, 0.8493),
        (z(&[1, -3, -1, 1]), 148, 1.6623),
    ] {
        let k = NumberField::new(&f).unwrap();
        assert_eq!(k.discriminant(), &Integer::from(d));
        let cg = k.class_group(&opts).unwrap();
        assert_eq!(cg.class_number, 1, "d = {d}");
        eprintln!("d = {d}: R = {} ratio {}", cg.regulator, cg.analytic_ratio);
        assert!((cg.regulator - reg).abs() < 1e-3, "d = {d}: {}", cg.regulator);
        for u in &cg.units {
            let e = u.expand(&k).unwrap();
            assert!(e.is_integral());
            assert_eq!(k.norm(&e).numerator_ref(), &malachite::Natural::ONE);
        }
    }
}


#[test]
#[ignore = "slow since the small-base relation search: fields whose unit search fails run to the round cap; larger_cubic_fields_laws checks the same laws with deadlines"]
fn random_cubic_fields_laws() {
    // laws: relations factor over the factor base (checked inside), units have norm +-1,
    // the regulator is non-zero, h R matches the analytic formula, d_K divides disc(f)
    // with a square quotient.
    let mut s = 2024u64;
    let mut rnd = |m: i64| {
        s = s.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
        ((s >> 33) % (2 * m as u64 + 1)) as i64 - m
    };
    let opts = ClassGroupOptions::default();
    let mut tested = 0;
    while tested < 12 {
        let f = z(&[rnd(30), rnd(30), rnd(5), 1]);
        let Ok(k) = NumberField::new(&f) else { continue };
        let q = k.polynomial_discriminant().clone() / k.discriminant().clone();
        assert_eq!(q.clone() * k.discriminant().clone(), *k.polynomial_discriminant());
        assert_eq!(q, k.index() * k.index());
        let cg = match k.class_group(&opts) {
            Ok(cg) => cg,
            Err(e) => {
                assert_eq!(e.kind(), &twofold::ErrorKind::Budget);
                continue;
            }
        };
        tested += 1;
        assert!((cg.analytic_ratio - 1.0).abs() < 0.2, "{f:?}: ratio {}", cg.analytic_ratio);
        assert!(cg.regulator > 0.1);
        assert_eq!(cg.unit_products.len(), k.signature().0 + k.signature().1 - 1);
        for u in &cg.unit_products {
            assert!(u.is_unit(&k), "{f:?}");
        }
        for u in &cg.units {
            // exact units (every valuation zero); the f64 log norm of a compact
            // product with large exponents carries a rounding error
            let l: f64 = u.log_embedding(&k).iter().sum();
            assert!(l.abs() < 1e-4, "{f:?}: log norm {l}");
            if u.log_embedding(&k).iter().map(|x| x.abs()).sum::<f64>() < 200.0 {
                let e = u.expand(&k).unwrap();
                use malachite::base::num::arithmetic::traits::Abs;
                assert_eq!(k.norm(&e).abs(), Rational::ONE, "{f:?}");
            }
        }
    }
}

#[test]
fn larger_cubic_fields_laws() {
    // laws on random cubics x^3 + a x + b of discriminant about 10^8 to 10^12 (the
    // relation search over a small factor base, then every prime ideal up to the
    // bound shown to lie in the group it generates): h R matches the Euler-product
    // estimate of the analytic class number formula (Cohen GTM 138, §4.9.2), the
    // units have norm +-1 (log norm 0) and a non-zero regulator, and K(S,2) for
    // S empty has dimension r + 1 + (2-rank of Cl) (Cohen GTM 193, §5.2).
    let mut s = 77u64;
    let mut rnd = |m: i64| {
        s = s.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
        ((s >> 33) % (2 * m as u64 + 1)) as i64 - m
    };
    let mut tested = 0;
    let mut attempts = 0;
    while tested < 6 && attempts < 40 {
        attempts += 1;
        let f = z(&[rnd(2000), rnd(300), 0, 1]);
        let Ok(k) = NumberField::new(&f) else { continue };
        let opts = ClassGroupOptions::default().with_deadline(std::time::Instant::now() + std::time::Duration::from_secs(20));
        let cg = match k.class_group(&opts) {
            Ok(cg) => cg,
            Err(e) => {
                assert_eq!(e.kind(), &twofold::ErrorKind::Budget, "{f:?}: {e}");
                continue;
            }
        };
        // the second route: K(S,2) from the relations mod 2 only
        let ks = k.square_classes(&[], &opts).unwrap();
        assert_eq!(ks.conditional_on_grh(), cg.bound_kind == twofold::numfield::FactorBaseBound::BachGrh);
        tested += 1;
        let cg = &cg;
        assert!((cg.analytic_ratio - 1.0).abs() < 0.2, "{f:?}: ratio {}", cg.analytic_ratio);
        let want = if cg.bound_kind == twofold::numfield::FactorBaseBound::BachGrh { k.bach_bound() } else { k.minkowski_bound() };
        assert!(cg.generation_bound as f64 >= want.floor());
        let r = k.signature().0 + k.signature().1 - 1;
        assert_eq!(cg.unit_products.len(), r);
        assert!(r == 0 || cg.regulator > 0.01);
        for u in &cg.unit_products {
            // norm +-1 decided exactly (coprime base of the factors' norms), and log norm 0
            assert!(u.is_unit(&k), "{f:?}");
            let l: f64 = u.log_embedding(&k).iter().sum();
            assert!(l.abs() < 1e-4, "{f:?}: log norm {l}");
        }
        let two_rank = cg.structure.iter().filter(|d| (*d).clone() % Integer::from(2) == 0).count();
        assert_eq!(ks.dimension(), r + 1 + two_rank, "{f:?}");
    }
    assert!(tested >= 3, "only {tested} fields completed");
}

#[test]
fn class_group_budget_is_honoured() {
    // a cubic field of discriminant about 10^30 with a 200 ms deadline: a budget
    // error (or a result) within about the deadline, never a hang
    let f = vec![Integer::from(999_999_999_989i64), Integer::from(123_456_789_012i64), Integer::from(0), Integer::from(1)];
    let k = NumberField::new(&f).unwrap();
    let t = std::time::Instant::now();
    let opts = ClassGroupOptions::default().with_deadline(t + std::time::Duration::from_millis(200));
    if let Err(e) = k.class_group(&opts) {
        assert_eq!(e.kind(), &twofold::ErrorKind::Budget);
    }
    assert!(t.elapsed().as_secs_f64() < 1.5, "{:?}", t.elapsed());
}

/// `x^3 + c2 x^2 + c1 x + c0`.
fn cubic(c2: i64, c1: i64, c0: i64) -> NumberField {
    NumberField::new(&z(&[c0, c1, c2, 1])).unwrap()
}

fn two_rank(cg: &twofold::numfield::ClassGroup) -> usize {
    cg.structure.iter().filter(|d| (*d).clone() % Integer::from(2) == 0).count()
}

#[test]
fn first_cubic_fields_with_class_number_above_one() {
    // Totally real cubic fields (Ennola and Turunen 1985, table of totally real cubic
    // fields; values recalled from memory): d = 1957 is the first with h = 2, d = 3969
    // (cyclic, conductor 63 = 7 * 9) has h = 3. Independent of memory for the cyclic one:
    // genus theory (Hasse 1948; Cohen GTM 138, §6.4) gives 3^(t-1) | h for a cyclic cubic
    // field whose conductor has t prime factors, here t = 2. The polynomials were found by
    // a search for the discriminants; the field discriminant is the module's own Round 2.
    // (Two polynomials of discriminant 8281 tried for the conductor-91 fields define the
    // field of discriminant 49: left out. No complex cubic field with h > 1 is checked:
    // no value recalled with confidence.)
    let opts = ClassGroupOptions::default();
    for (k, d, h) in [
        (cubic(0, -40, 97), 1957, 2),
        (cubic(0, -21, 35), 3969, 3),
    ] {
        assert_eq!(k.discriminant(), &Integer::from(d));
        let cg = k.class_group(&opts).unwrap();
        if d != 1957 {
            assert_eq!(cg.class_number.clone() % Integer::from(3), 0, "d = {d}: genus theory");
        }
        assert_eq!(cg.class_number, h, "d = {d}");
        // K(S,2), S empty: dimension r + 1 + 2-rank of Cl (Cohen GTM 193, §5.2), by both routes
        let ks = k.square_classes(&[], &opts).unwrap();
        assert_eq!(ks.dimension(), 3 + two_rank(&cg), "d = {d}");
    }
}

#[test]
fn square_classes_of_large_quadratic_fields_follow_genus_theory() {
    // Gauss's genus theory (Gauss, Disquisitiones Arithmeticae, art. 261 and 287;
    // Cohen GTM 138, §5.6): for an imaginary quadratic field whose discriminant has t prime
    // divisors, Cl[2] has rank t - 1, so K(empty,2) has dimension 1 + (t - 1) = t (the
    // unit -1 and the genus classes). Discriminants up to about 10^16, beyond a
    // reduced-form count, each a product of chosen primes.
    let opts = ClassGroupOptions::default().with_deadline(std::time::Instant::now() + std::time::Duration::from_secs(120));
    for primes in [vec![1_000_003i64, 1_000_033], vec![3, 7, 1_000_037], vec![5, 13, 17, 1_000_039], vec![1_000_003, 1_000_033, 11], vec![99_999_989, 3]] {
        let m: i64 = primes.iter().product();
        // d = -m when m = 3 mod 4, else -4m (then 2 is a further ramified prime)
        let (d, t) = if m % 4 == 3 { (-m, primes.len()) } else { (-4 * m, primes.len() + 1) };
        let k = quadratic(d);
        assert_eq!(k.discriminant(), &Integer::from(d));
        let ks = k.square_classes(&[], &opts).unwrap();
        assert_eq!(ks.dimension(), t, "d = {d}");
        // S = the primes above 2 and 3: each ramified or split prime adds its ideals
        let ks2 = k.square_classes(&[2, 3], &opts).unwrap();
        // dim = 1 + |S| + dim Cl_S[2], and Cl_S = Cl / <S> loses at most |S| of the 2-rank
        assert!(ks2.dimension() >= t.max(1 + ks2.prime_ideals), "d = {d}");
    }
}

#[test]
fn square_classes_of_large_cubic_fields_laws() {
    // Laws for cubic fields of discriminant about 10^15 to 10^20, beyond the class group
    // route: (1) for a cyclic cubic field the 2-rank of Cl is even (Cl[2] is a module over
    // F2[C3] with no fixed points but 0, whose non-trivial simple module has dimension 2:
    // standard, from memory), so dim K(empty,2) = 3 + even; the fields are D. Shanks's
    // simplest cubics x^3 - a x^2 - (a + 3) x - 1 ("The simplest cubic fields", Math. Comp.
    // 28, 1974), discriminant (a^2 + 3a + 9)^2. (2) Every field: dim K(S,2) >= r + 1 + |S|.
    // (3) The coordinate map read from an expanded basis element (characters of the
    // explicit element) agrees with the one built from its factors: e_i, and a product of
    // two basis elements gives the sum of their coordinates.
    let opts = || ClassGroupOptions::default().with_deadline(std::time::Instant::now() + std::time::Duration::from_secs(60));
    for a in [1000i64, 31_622, 100_003] {
        let k = cubic(-a, -(a + 3), -1);
        let q = Integer::from(a * a + 3 * a + 9);
        assert_eq!(k.polynomial_discriminant(), &(q.clone() * q));
        let ks = k.square_classes(&[], &opts()).unwrap();
        assert!(ks.dimension() >= 3 && (ks.dimension() - 3) % 2 == 0, "a = {a}: dim {}", ks.dimension());
    }
    for (a, b) in [(123_457i64, 9_876_541i64), (2_345_678, 1_234_567_891)] {
        let k = cubic(0, a, b);
        let ks = k.square_classes(&[2, 3], &opts()).unwrap();
        let (r1, r2) = k.signature();
        assert!(ks.dimension() >= r1 + r2 + ks.prime_ideals, "{a} {b}");
        assert!(ks.conditional_on_grh());
        let elems: Vec<twofold::numfield::Element> = ks.basis.iter().map(|b| b.expand(&k).unwrap()).collect();
        let m = elems.len();
        for (i, e) in elems.iter().enumerate() {
            let c = ks.coordinates_unchecked(&k, e).unwrap();
            assert_eq!(c, (0..m).map(|j| u8::from(i == j)).collect::<Vec<_>>(), "{a} {b}: basis element {i}");
        }
        let prod = k.mul(&elems[0], &elems[m - 1]);
        let c = ks.coordinates_unchecked(&k, &prod).unwrap();
        assert_eq!(c, (0..m).map(|j| u8::from(j == 0) ^ u8::from(j == m - 1)).collect::<Vec<_>>());
    }
}

/// The discriminant's factorisation may come from the caller (the descent
/// knows the curve's): the field is the same as with its own factoring, and
/// a factorisation of another number is refused with a typed error. With no
/// time to factor a discriminant of 180 digits the field is refused with
/// `ErrorKind::FactorBudget`, never built on a partial factorisation.
/// (t^3 - t - 1 has discriminant -23: the smallest cubic field, Cohen GTM
/// 138, appendix B.)
#[test]
fn discriminants_factored_by_the_caller_or_not_in_time() {
    use twofold::arith::{factor, FactorLimits};
    use twofold::ErrorKind;
    let f = vec![Integer::from(-1), Integer::from(-1), Integer::from(0), Integer::from(1)];
    let fac = factor(&Integer::from(-23), &FactorLimits::default()).unwrap();
    let k = NumberField::with_factored_discriminant(&f, &fac).unwrap();
    assert_eq!(*k.discriminant(), -23);
    assert_eq!(k.discriminant(), NumberField::new(&f).unwrap().discriminant());
    let wrong = factor(&Integer::from(-24), &FactorLimits::default()).unwrap();
    let e = NumberField::with_factored_discriminant(&f, &wrong).unwrap_err();
    assert_eq!(*e.kind(), ErrorKind::InvalidValue);
    // t^3 + a t + b with 60-digit a and b: a discriminant of about 180 digits
    let a: Integer = "314159265358979323846264338327950288419716939937510582097494".parse().unwrap();
    let b: Integer = "271828182845904523536028747135266249775724709369995957496696".parse().unwrap();
    let big = vec![b, a, Integer::from(0), Integer::from(1)];
    let spent = FactorLimits::default().with_deadline(std::time::Instant::now());
    let e = NumberField::with_limits(&big, &spent).unwrap_err();
    assert_eq!(*e.kind(), ErrorKind::FactorBudget, "{e}");
}

/// The narrow class number of the real quadratic discriminant `d` as the
/// number of cycles of reduced indefinite forms under the reduction
/// operator rho (Gauss; Cohen GTM 138, Definitions 5.6.2 and 5.6.4 and
/// Proposition 5.6.6: the reduced forms properly equivalent to a form make
/// up one cycle of rho). A form `(a, b, c)`, `b^2 - 4ac = d`, is reduced
/// when `|sqrt d - 2|a|| < b < sqrt d`; `rho(a, b, c) = (c, r, (r^2 - d)/4c)`
/// with `r = -b mod 2|c|` in `(sqrt d - 2|c|, sqrt d)`. Exact integer
/// comparisons only.
fn narrow_class_number_by_cycles(d: i64) -> usize {
    let s = {
        let mut s = (d as f64).sqrt() as i64;
        while s * s > d {
            s -= 1;
        }
        while (s + 1) * (s + 1) <= d {
            s += 1;
        }
        s
    };
    let reduced = |a: i64, b: i64| -> bool {
        let a2 = 2 * a.abs();
        b > 0 && b * b < d && (a2 + b) * (a2 + b) > d && (a2 <= b || (a2 - b) * (a2 - b) < d)
    };
    let mut forms: Vec<(i64, i64, i64)> = Vec::new();
    for b in 1..=s {
        if (b * b - d) % 4 != 0 {
            continue;
        }
        let ac = (b * b - d) / 4; // negative
        for a in 1..=ac.abs() {
            if ac % a != 0 {
                continue;
            }
            for a in [a, -a] {
                if reduced(a, b) {
                    forms.push((a, b, ac / a));
                }
            }
        }
    }
    let rho = |(_, b, c): (i64, i64, i64)| -> (i64, i64, i64) {
        let m = 2 * c.abs();
        let r = s - (s + b).rem_euclid(m);
        (c, r, (r * r - d) / (4 * c))
    };
    let mut seen = vec![false; forms.len()];
    let mut cycles = 0;
    for i in 0..forms.len() {
        if seen[i] {
            continue;
        }
        cycles += 1;
        let mut f = forms[i];
        loop {
            let j = forms.iter().position(|g| *g == f).expect("rho leaves the reduced forms");
            if seen[j] {
                break;
            }
            seen[j] = true;
            f = rho(f);
        }
    }
    cycles
}

/// Every fundamental `0 < d < 2000`: the class number from the class group
/// against the cycles of reduced forms: `h+ = h` when the fundamental unit
/// has norm -1, else `h+ = 2h` (the norm read off the parity of the
/// continued fraction's period, `cf_regulator`).
#[test]
fn real_quadratic_class_numbers_by_cycles_of_reduced_forms() {
    let opts = ClassGroupOptions::default();
    let mut checked = 0;
    for d in 5i64..2000 {
        if !is_fundamental(d) {
            continue;
        }
        let narrow = narrow_class_number_by_cycles(d);
        let (_, sign) = cf_regulator(d);
        let cg = match quadratic(d).class_group(&opts) {
            Ok(cg) => cg,
            Err(e) => {
                assert_eq!(e.kind(), &twofold::ErrorKind::Budget, "d = {d}");
                continue;
            }
        };
        let h = usize::try_from(&cg.class_number).unwrap();
        assert_eq!(narrow, if sign == -1 { h } else { 2 * h }, "d = {d}: h = {h}, N(unit) = {sign}, cycles {narrow}");
        checked += 1;
    }
    // h+ of the smallest discriminants with a unit of norm +1 (from memory):
    // d = 12 (2 + sqrt 3): h = 1, h+ = 2
    assert_eq!(narrow_class_number_by_cycles(12), 2);
    assert_eq!(narrow_class_number_by_cycles(5), 1);
    assert!(checked >= 600, "{checked}");
}
