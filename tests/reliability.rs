//! Regression tests for issue 12 (reliability under hostile input and long
//! work): every reproducer of the issue, with short budgets so the tests
//! stay fast. A budgeted call must return within 1.5 times its budget plus
//! 50 ms, with what it proved so far. The curves are the issue's own
//! reproducers (invented or random inputs, not table data); the expected
//! answers are the exact checks named beside each test.

use malachite::{Integer, Natural};
use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Arc;
use std::time::{Duration, Instant};
use twofold::batch::{analyse_batch, analyse_text, BatchOptions};
use twofold::quartic::{covering_class, quartics_with_invariants, same_covering, Quartic, SearchOptions};
use twofold::{analyse, Curve, ErrorKind, RankOptions};

fn allowed(budget: Duration) -> Duration {
    budget.mul_f64(1.5) + Duration::from_millis(50)
}

fn timed<T>(f: impl FnOnce() -> T) -> (T, Duration) {
    let t = Instant::now();
    let r = f();
    (r, t.elapsed())
}

/// (a) The quartic enumeration's size estimate and set-up: these two curves
/// ran for minutes under `--budget 0.2` (the loop over the leading
/// coefficient of the estimate had no clock). Now they return in time.
#[test]
fn quartic_setup_holds_the_budget() {
    let budget = Duration::from_millis(200);
    for c in [[341240, 0, 1, -1, 0], [87672989, 1, 1, -2, 0]] {
        let e = Curve::from_coefficients(c).unwrap();
        let opts = RankOptions::default().with_evidence(false).with_time_limit(budget);
        let (r, el) = timed(|| analyse(&e, &opts));
        assert!(el <= allowed(budget), "{c:?}: {el:?}");
        let r = r.unwrap();
        if let (Some(l), Some(u)) = (r.rank_lower, r.rank_upper) {
            assert!(l <= u);
        }
    }
}

/// (a) The same curves with no time limit but a cancellation flag set after
/// 100 ms: the batch stops promptly.
#[test]
fn quartic_setup_honours_the_cancel_flag() {
    let flag = Arc::new(AtomicBool::new(false));
    // a large enumeration limit, so that only the flag can stop the search
    let rank = RankOptions::default().with_evidence(false).with_max_quartic_candidates(u64::MAX / 8);
    let opts = BatchOptions::new(rank).with_threads(1).with_cancel(flag.clone());
    let f2 = flag.clone();
    let setter = std::thread::spawn(move || {
        std::thread::sleep(Duration::from_millis(100));
        f2.store(true, Ordering::Relaxed);
    });
    let (run, el) = timed(|| analyse_batch(["[341240,0,1,-1,0]", "[87672989,1,1,-2,0]"], &opts));
    setter.join().unwrap();
    assert!(el <= Duration::from_millis(100) + allowed(Duration::ZERO) + Duration::from_millis(100), "{el:?}");
    for it in &run.items {
        if let Ok(r) = &it.result {
            assert!(r.rank_upper.is_none() || r.budget_exhausted || r.rank().is_some());
        }
    }
}

/// (a) The public enumeration with a hopeless box and a candidate limit:
/// refused by the size estimate at once, even though the loop over the
/// leading coefficient alone would be of length about 10^11.
#[test]
fn hopeless_enumeration_is_refused_at_once() {
    let e = Curve::from_coefficients([341240, 0, 1, -1, 0]).unwrap();
    let (i, j) = (e.c4().clone(), Integer::from(2) * e.c6());
    let opts = SearchOptions::default().with_max_candidates(1_000_000_000);
    let (r, el) = timed(|| quartics_with_invariants(&i, &j, &opts));
    assert!(el < Duration::from_millis(250), "{el:?}");
    assert!(matches!(r.unwrap_err().kind(), ErrorKind::Budget | ErrorKind::TooLarge));
    // and with no candidate limit, a deadline alone stops it
    let opts = SearchOptions::default().with_deadline(Instant::now() + Duration::from_millis(100));
    let (r, el) = timed(|| quartics_with_invariants(&i, &j, &opts));
    assert!(el <= allowed(Duration::from_millis(100)), "{el:?}");
    assert!(r.is_err());
}

fn random_digits(n: usize, seed: u64) -> String {
    let mut x = seed | 1;
    let mut s = String::with_capacity(n);
    for k in 0..n {
        x ^= x << 13;
        x ^= x >> 7;
        x ^= x << 17;
        let d = (x % 10) as u8;
        s.push(char::from(b'0' + if k == 0 { 1 + d % 9 } else { d }));
    }
    s
}

/// (c) Probable-prime tests and factorisation of huge numbers: `[0,0,0,1,1/d]`
/// with `d` of 1,000 and 3,000 digits took 5.6 s and 56 s under a 2 s
/// budget; now the budget holds (here 0.2 s).
#[test]
fn huge_discriminants_hold_the_budget() {
    let budget = Duration::from_millis(200);
    // (2,000 digits took 25 s and 9,000 ran past 480 s before)
    for (n, seed) in [(1000, 1u64), (2000, 8), (3000, 2), (9000, 9)] {
        let text = format!("[0,0,0,1,1/{}]", random_digits(n, seed));
        let opts = RankOptions::default().with_time_limit(budget);
        let (r, el) = timed(|| analyse_text(&text, &opts));
        assert!(el <= allowed(budget), "{n} digits: {el:?}");
        match r {
            Ok(r) => assert!(r.budget_exhausted || r.rank().is_some()),
            Err(e) => assert!(matches!(e.kind(), ErrorKind::FactorBudget | ErrorKind::Budget), "{e}"),
        }
    }
}

/// (c) The probable-prime test itself under a deadline: a 9,689-bit Mersenne
/// prime (Gillies, 1963) is recognised without a limit and stopped by one.
#[test]
fn probable_prime_test_stops_at_the_deadline() {
    use twofold::arith::{is_probable_prime, is_probable_prime_within, FactorLimits};
    let m = (Natural::from(1u32) << 9689u32) - Natural::from(1u32);
    assert!(is_probable_prime_within(&m, &FactorLimits::default()).unwrap());
    assert!(is_probable_prime(&m));
    // 2^9689 + 1 is divisible by 3: composite, found by the small-prime screen
    let c = (Natural::from(1u32) << 9689u32) + Natural::from(1u32);
    assert!(!is_probable_prime_within(&c, &FactorLimits::default()).unwrap());
    // 2^9941 - 1 is prime too (Gillies, 1963); 10^4 bits with a 20 ms deadline
    let m2 = (Natural::from(1u32) << 9941u32) - Natural::from(1u32);
    let budget = Duration::from_millis(20);
    let limits = FactorLimits::default().with_deadline(Instant::now() + budget);
    let (r, el) = timed(|| is_probable_prime_within(&m2, &limits));
    assert!(el <= allowed(budget), "{el:?}");
    if let Err(e) = r {
        assert_eq!(e.kind(), &ErrorKind::FactorBudget);
    }
}

/// A limit beyond the clock's range is no limit, not a panic (`--budget
/// 1e19` made every curve an internal error).
#[test]
fn enormous_time_limit_is_no_limit() {
    let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
    for d in [Duration::MAX, Duration::from_secs_f64(1e19)] {
        let r = analyse(&e, &RankOptions::default().with_time_limit(d)).unwrap();
        // y^2 + y = x^3 - x has rank 1 (Cremona, Algorithms for Modular
        // Elliptic Curves, 2nd ed., 1997, Table 1: the rank-1 curve of conductor 37)
        assert_eq!(r.rank(), Some(1));
    }
}

/// A batch asked for absurdly many threads runs (capped), in input order.
#[test]
fn absurd_thread_count_is_capped() {
    let opts = BatchOptions::default().with_threads(100_000);
    assert!(opts.effective_threads() <= twofold::batch::MAX_THREADS);
    let run = analyse_batch(["[0,0,1,-1,0]", "not a curve", "[0,-1,1,-10,-20]"], &BatchOptions::default().with_threads(3));
    assert_eq!(run.items.iter().map(|i| i.index).collect::<Vec<_>>(), vec![0, 1, 2]);
}

fn q(v: [&str; 5]) -> Quartic {
    Quartic::new(v.map(|x| x.parse::<Integer>().unwrap()))
}

/// `same_covering(g, g)` was `false` for this 12-digit quartic (floating
/// point roots of the resolvent missed an integer root); it must be `true`,
/// and so must be the test against a transform of determinant 2 times a
/// square (the covering is unchanged: Cremona, *Classical invariants and
/// 2-descent on elliptic curves*, J. Symbolic Comput. 31 (2001)).
#[test]
fn same_covering_is_exact_on_the_reported_quartic() {
    let g = Quartic::from_coeffs([-6821176i64, 7464, -7, -762661, -516301012545]);
    assert!(same_covering(&g, &g));
    let c = covering_class(&g).unwrap();
    assert!(c.same_as(&c));
    let m = [[Integer::from(1), Integer::from(1)], [Integer::from(-1), Integer::from(1)]];
    let h = Quartic::new(g.transform(&m).coeffs().map(|x| x * Integer::from(9)));
    assert!(same_covering(&g, &h));
    // and a class is not the same as its product with a non-square
    // (x^4 - z^4 is the trivial class; x^4 - 5x^2 z^2 + 4z^4 has invariants of
    // another algebra: compared classes must agree on the algebra)
    assert!(!same_covering(&Quartic::from_coeffs([1, 0, 0, 0, -1]), &Quartic::from_coeffs([1, 0, 0, 0, 1])));
}

/// A 154-digit quartic panicked in the resolvent sort (NaN); now every
/// covering test on it decides, and it is the same covering as itself and
/// as its transforms.
#[test]
fn huge_quartics_do_not_panic() {
    let d = |n: usize, s: u64| random_digits(n, s);
    let (a, b, c, dd, e) = (d(154, 3), d(150, 4), d(154, 5), d(152, 6), d(154, 7));
    let g = q([&a, &format!("-{b}"), &c, &dd, &format!("-{e}")]);
    assert!(same_covering(&g, &g));
    let cl = covering_class(&g).unwrap();
    assert!(cl.same_as(&cl));
    let m = [[Integer::from(2), Integer::from(1)], [Integer::from(1), Integer::from(1)]];
    assert!(same_covering(&g, &g.transform(&m)));
    assert!(twofold::quartic::gl2z_equivalent(&g, &g.transform(&m)));
    let _ = twofold::quartic::reduce(&g);
}

/// (b) The numerical root-number test took no deadline: `[0,0,108,39,0]`
/// under 0.5 s took 9.7 s and `[0,0,0,-2362,0]` under 0.2 s took 5.6 s, both
/// with `budget_exhausted: false`. The proven test in interval arithmetic
/// now checks the deadline between segments of coefficients.
#[test]
fn root_number_test_holds_the_budget() {
    for (c, ms) in [([0, 0, 108, 39, 0], 500u64), ([0, 0, 0, -2362, 0], 200)] {
        let budget = Duration::from_millis(ms);
        let e = Curve::from_coefficients(c).unwrap();
        let (r, el) = timed(|| analyse(&e, &RankOptions::default().with_time_limit(budget)));
        assert!(el <= allowed(budget), "{c:?}: {el:?}");
        let r = r.unwrap();
        assert!(r.budget_exhausted || el <= budget, "{c:?}");
    }
}

/// The odd isogeny-class search took no deadline: with a 0.5 s budget these
/// two curves of conductor 130050 (tests/data/curves-wider.tsv) ran 2.5 to
/// 20 s (found by the Python sweep tests). The search now stops with the
/// work and the quartic route reports no upper bound.
#[test]
fn isogeny_class_search_holds_the_budget() {
    let budget = Duration::from_millis(500);
    for c in [[1, -1, 0, -148617, 24758541], [1, -1, 1, -5945, 199257]] {
        let e = Curve::from_coefficients(c).unwrap();
        let opts = RankOptions::default().with_time_limit(budget);
        let (r, el) = timed(|| analyse(&e, &opts));
        assert!(el <= allowed(budget), "{c:?}: {el:?}");
        let r = r.unwrap();
        assert_eq!(r.conductor, 130050);
        assert!(r.rank_lower.unwrap_or(0) <= r.rank_upper.unwrap_or(usize::MAX));
    }
}

/// The torsion computation honours the work's cancel flag: a curve of our
/// own choosing, y^2 = x (x - 30030)(x + 7429) (full 2-torsion, so the
/// order bound exceeds 1, and a discriminant with many square divisors, so
/// more than a thousand Nagell-Lutz candidates), with the flag already set,
/// ends at once with a budget error that states what was known; without the
/// flag it finishes and holds the three points of order 2. A missing prime
/// of the discriminant is a typed error, not a panic.
#[test]
fn torsion_honours_the_cancel_flag() {
    use twofold::arith::{factor, FactorLimits};
    use twofold::torsion::TorsionGroup;
    use twofold::Work;
    let (a, b) = (30030i64, 7429i64);
    // x (x - a)(x + b) = x^3 + (b - a) x^2 - a b x
    let e = Curve::from_coefficients([0, b - a, 0, -a * b, 0]).unwrap();
    let primes: Vec<Natural> = factor(e.discriminant(), &FactorLimits::default()).unwrap().primes().cloned().collect();
    let flag = Arc::new(AtomicBool::new(true));
    let work = Work::new(&RankOptions::default().with_cancel(flag));
    let (r, took) = timed(|| TorsionGroup::compute_within(&e, &primes, &work));
    let err = r.unwrap_err();
    assert_eq!(err.kind(), &ErrorKind::Budget);
    assert!(err.to_string().contains("order divides"), "{err}");
    assert!(took < Duration::from_millis(200), "{took:?}");
    let t = TorsionGroup::compute_within(&e, &primes, &Work::unlimited()).unwrap();
    assert_eq!(t.two_torsion().len(), 3);
    let missing = TorsionGroup::compute_within(&e, &primes[..primes.len() - 1], &Work::unlimited()).unwrap_err();
    assert_eq!(missing.kind(), &ErrorKind::InvalidValue);
}

/// `gl2z_equivalent` on the 12-digit quartic of the covering report
/// (`[-6821176, 7464, -7, -762661, -516301012545]`): equivalent to itself and
/// to its images under unimodular matrices with random entries of growing
/// size (forms of about 20 to 160 digits), and the matrix found maps one
/// form onto the other exactly. Random matrices: invented data (a fixed
/// seed); the equivalence holds by construction.
#[test]
fn gl2z_equivalence_on_the_reported_quartic_and_its_transforms() {
    use twofold::quartic::{gl2z_equivalence, gl2z_equivalent};
    let g = Quartic::from_coeffs([-6821176i64, 7464, -7, -762661, -516301012545]);
    assert!(gl2z_equivalent(&g, &g));
    let mut state = 0x5eed_0012u64;
    let mut next = move |bound: u64| {
        state = state.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
        (state >> 11) % bound
    };
    for digits in [1u32, 2, 4, 6, 9, 12, 15, 18] {
        for _ in 0..4 {
            // a unimodular matrix as a product of two elementary moves with
            // entries of `digits` digits (matrix entries of up to twice as
            // many digits, forms of about 20 to 160 digits)
            let bound = 10u64.pow(digits);
            let mut m = [[Integer::from(1), Integer::from(0)], [Integer::from(0), Integer::from(1)]];
            for k in 0..2 {
                let t = Integer::from(next(bound) as i64 + 1) * if next(2) == 0 { Integer::from(1) } else { Integer::from(-1) };
                let e = if k % 2 == 0 {
                    [[Integer::from(1), t], [Integer::from(0), Integer::from(1)]]
                } else {
                    [[Integer::from(1), Integer::from(0)], [t, Integer::from(1)]]
                };
                m = [
                    [&m[0][0] * &e[0][0] + &m[0][1] * &e[1][0], &m[0][0] * &e[0][1] + &m[0][1] * &e[1][1]],
                    [&m[1][0] * &e[0][0] + &m[1][1] * &e[1][0], &m[1][0] * &e[0][1] + &m[1][1] * &e[1][1]],
                ];
            }
            let h = g.transform(&m);
            let n = gl2z_equivalence(&g, &h).unwrap_or_else(|| panic!("not recognised: {h:?} = g o {m:?}"));
            assert_eq!(g.transform(&n), h);
        }
    }
}

// ------------------------------------------------ proven GL2(Z) test ----

mod common;

/// A unimodular matrix as a product of elementary moves with entries of up
/// to `digits` digits, from a small generator (invented data).
fn random_unimodular(next: &mut impl FnMut(u64) -> u64, digits: u32) -> [[Integer; 2]; 2] {
    let bound = 10u64.pow(digits.min(18));
    let mut m = [[Integer::from(1), Integer::from(0)], [Integer::from(0), Integer::from(1)]];
    for k in 0..3 {
        let t = Integer::from(next(bound) as i64) * if next(2) == 0 { Integer::from(1) } else { Integer::from(-1) };
        let e = if k % 2 == 0 {
            [[Integer::from(1), t], [Integer::from(0), Integer::from(1)]]
        } else {
            [[Integer::from(1), Integer::from(0)], [t, Integer::from(1)]]
        };
        m = [
            [&m[0][0] * &e[0][0] + &m[0][1] * &e[1][0], &m[0][0] * &e[0][1] + &m[0][1] * &e[1][1]],
            [&m[1][0] * &e[0][0] + &m[1][1] * &e[1][0], &m[1][0] * &e[0][1] + &m[1][1] * &e[1][1]],
        ];
    }
    if next(2) == 0 {
        // determinant -1 as well
        m = [[m[0][1].clone(), m[0][0].clone()], [m[1][1].clone(), m[1][0].clone()]];
    }
    m
}

fn generator(seed: u64) -> impl FnMut(u64) -> u64 {
    let mut state = seed;
    move |bound: u64| {
        state = state.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
        (state >> 11) % bound.max(1)
    }
}

/// The values of `g` at primitive vectors, modulo `m`: a `GL2(Z)`-invariant
/// (a unimodular matrix permutes the primitive vectors, and the vectors
/// `(x, z)` modulo `m` with `gcd(x, z, m) = 1` are exactly their reductions).
/// Elementary; used as an independent witness of inequivalence.
fn primitive_values_mod(g: &Quartic, m: i64) -> Vec<bool> {
    let mut seen = vec![false; m as usize];
    let gcd = |mut a: i64, mut b: i64| {
        while b != 0 {
            (a, b) = (b, a % b);
        }
        a.abs()
    };
    let c: Vec<i64> = g.coeffs().iter().map(|x| i64::try_from(&(x % Integer::from(m))).unwrap_or(0)).collect();
    for x in 0..m {
        for z in 0..m {
            if gcd(gcd(x, z), m) != 1 {
                continue;
            }
            let (x2, z2) = (x * x % m, z * z % m);
            let v = (c[0] * (x2 * x2 % m) + c[1] * (x2 * x % m * z % m) + c[2] * (x2 * z2 % m) + c[3] * (x * z2 % m * z % m) + c[4] * (z2 * z2 % m)) % m;
            seen[v.rem_euclid(m) as usize] = true;
        }
    }
    seen
}

fn separated_by_values(g: &Quartic, h: &Quartic) -> bool {
    [3i64, 4, 5, 7, 8, 9, 11, 13, 16, 25, 27, 32].iter().any(|&m| primitive_values_mod(g, m) != primitive_values_mod(h, m))
}

/// Inequivalent forms with equal invariants from a curve with non-trivial
/// Sha[2]: `y^2 + xy + y = x^3 + x^2 - 352x - 2689` (conductor 66, Sha of
/// order 4, rank 0: tests/data/curves-with-sha.tsv, from Cremona,
/// *Algorithms for Modular Elliptic Curves*, 2nd ed., 1997). All the
/// `GL2(Z)`-classes of quartics with its invariants `(c4, 2c6)` are
/// enumerated; each pair, moved by random unimodular matrices to forms of
/// 20 to 100 digits, must be declared inequivalent, and each form equivalent
/// to its own moved copies (with the matrix checked). Every inequivalent
/// pair is confirmed independently where possible: different 2-covering
/// classes (exact, `covering_class`) or different values at primitive
/// vectors modulo small numbers.
#[test]
#[ignore = "26.5 s on a loaded machine (load 6 on 2 cores); run with `cargo test --release --all-features --test reliability -- --ignored`"]
fn gl2z_decides_classes_of_a_curve_with_sha() {
    use twofold::quartic::gl2z_decide;
    let rows = common::read_table("curves-with-sha.tsv");
    let row = rows.iter().find(|r| r.coefficients == [1, 1, 1, -352, -2689]).expect("the conductor-66 row");
    assert_eq!(row.sha_order, Some(4));
    let e = Curve::from_coefficients(row.coefficients).unwrap();
    let (i, j) = (e.c4().clone(), Integer::from(2) * e.c6());
    let classes = quartics_with_invariants(&i, &j, &SearchOptions::default()).unwrap();
    assert!(classes.len() >= 4, "{} classes", classes.len());
    let mut next = generator(0x66);
    let mut confirmed = 0;
    for (a, g) in classes.iter().enumerate() {
        for digits in [3u32, 6, 9] {
            let u = random_unimodular(&mut next, digits);
            let v = random_unimodular(&mut next, digits);
            let (gu, gv) = (g.transform(&u), g.transform(&v));
            let m = gl2z_decide(&gu, &gv).unwrap().expect("a form and its moved copy");
            assert_eq!(gu.transform(&m), gv);
        }
        for h in &classes[a + 1..] {
            let u = random_unimodular(&mut next, 6);
            let v = random_unimodular(&mut next, 6);
            assert!(gl2z_decide(&g.transform(&u), &h.transform(&v)).unwrap().is_none(), "{g:?} ~ {h:?}?");
            let different_class = !covering_class(g).unwrap().same_as(&covering_class(h).unwrap());
            if different_class || separated_by_values(g, h) {
                confirmed += 1;
            }
        }
    }
    let pairs = classes.len() * (classes.len() - 1) / 2;
    assert!(confirmed * 2 >= pairs, "only {confirmed} of {pairs} pairs confirmed independently");
}

/// Forms with equal invariants that define the same 2-covering but are not
/// `GL2(Z)`-equivalent: `g(2x, z)/4` beside `g` (invariants `I, J` keep
/// their values: `I(λ g∘M) = λ^2 det(M)^4 I`, `J(λ g∘M) = λ^3 det(M)^6 J`).
/// Whenever the values at primitive vectors modulo small numbers differ
/// (an independent proof of inequivalence), the test must say "not
/// equivalent"; whenever it says "equivalent", the matrix must map one onto
/// the other. Random forms: invented data.
#[test]
fn gl2z_separates_forms_of_one_covering() {
    use twofold::quartic::gl2z_decide;
    let mut next = generator(0x2024);
    let mut separated = 0;
    for _ in 0..200 {
        let r = |next: &mut dyn FnMut(u64) -> u64| next(41) as i64 - 20;
        let (a, b, c) = (r(&mut next), r(&mut next), r(&mut next));
        let d = 2 * r(&mut next);
        let e = 4 * r(&mut next);
        let g = Quartic::from_coeffs([a, b, c, d, e]);
        if g.discriminant() == 0 {
            continue;
        }
        let h = Quartic::from_coeffs([4 * a, 2 * b, c, d / 2, e / 4]);
        assert_eq!((g.invariant_i(), g.invariant_j()), (h.invariant_i(), h.invariant_j()));
        let u = random_unimodular(&mut next, 4);
        let hu = h.transform(&u);
        match gl2z_decide(&g, &hu).unwrap() {
            Some(m) => assert_eq!(g.transform(&m), hu),
            None => {}
        }
        if separated_by_values(&g, &h) {
            separated += 1;
            assert!(gl2z_decide(&g, &hu).unwrap().is_none(), "{g:?} and {h:?} are separated by their values");
        }
        assert!(same_covering(&g, &h));
    }
    assert!(separated > 50, "{separated}");
}

/// The 154-digit quartic of the issue (NaN in the resolvent sort): the
/// proven test decides it against itself and its moved copies (no panic),
/// and against a form with the same invariants that is not equivalent.
#[test]
fn gl2z_decides_the_154_digit_quartic() {
    use twofold::quartic::gl2z_decide;
    let d = |n: usize, s: u64| random_digits(n, s);
    let (a, b, c, dd, e) = (d(154, 3), d(150, 4), d(154, 5), d(152, 6), d(154, 7));
    let g = q([&a, &format!("-{b}"), &c, &dd, &format!("-{e}")]);
    let mut next = generator(154);
    for digits in [1u32, 5, 12] {
        let u = random_unimodular(&mut next, digits);
        let gu = g.transform(&u);
        let m = gl2z_decide(&g, &gu).unwrap().expect("equivalent");
        assert_eq!(g.transform(&m), gu);
    }
    // -g has invariants (I, -J): not equivalent (and decided at once)
    let neg = Quartic::new(g.coeffs().map(|x| -x));
    assert!(gl2z_decide(&g, &neg).unwrap().is_none());
}

proptest::proptest! {
    #![proptest_config(proptest::prelude::ProptestConfig::with_cases(64))]
    /// Random quartics (invented data) against random unimodular moves of
    /// themselves: always equivalent, with an exact matrix; against a random
    /// other form with the same invariants (`g(2x, z)/4`): never equivalent
    /// when the values at primitive vectors differ.
    #[test]
    fn gl2z_decide_on_random_forms(c in proptest::array::uniform5(-1_000_000i64..1_000_000), s in proptest::prelude::any::<u64>(), digits in 1u32..10) {
        use twofold::quartic::gl2z_decide;
        let g = Quartic::from_coeffs(c);
        proptest::prop_assume!(g.discriminant() != 0);
        let mut next = generator(s);
        let u = random_unimodular(&mut next, digits);
        let gu = g.transform(&u);
        let m = gl2z_decide(&g, &gu).unwrap();
        proptest::prop_assert!(m.is_some());
        proptest::prop_assert_eq!(g.transform(&m.unwrap()), gu.clone());
        let h = Quartic::from_coeffs([4 * c[0], 2 * c[1], c[2], 2 * c[3], 16 * c[4]]);
        // h = g'(2x, z)/4 for g' = [c0, c1, c2, 4 c3, 64 c4]: compare h with g'
        let g2 = Quartic::from_coeffs([c[0], c[1], c[2], 4 * c[3], 64 * c[4]]);
        if g2.discriminant() != 0 && separated_by_values(&g2, &h) {
            proptest::prop_assert!(gl2z_decide(&g2, &h.transform(&u)).unwrap().is_none());
        }
    }
}

/// Torsion cut short by the work (here the cancel flag, set before the
/// analysis: the deadline acts the same way) is not an error: the report
/// keeps the curve's data, says the torsion is not known, gives no rank
/// bound, sets `budget_exhausted`, and states the bound on the torsion
/// order; its JSON form has `"torsion": null`. The same curve without the
/// flag has full 2-torsion (y^2 = x (x - 30030)(x + 7429), a curve of our
/// own choosing: three rational roots, exact).
#[test]
fn torsion_cut_short_leaves_a_consistent_report() {
    use twofold::{analyse_data, CurveData, Work};
    let (a, b) = (30030i64, 7429i64);
    let e = Curve::from_coefficients([0, b - a, 0, -a * b, 0]).unwrap();
    let data = CurveData::new(&e, &Work::unlimited()).unwrap();
    let flag = Arc::new(AtomicBool::new(true));
    let opts = RankOptions::default().with_cancel(flag);
    let (r, took) = timed(|| analyse_data(&data, &opts, &Work::new(&opts)));
    let r = r.expect("a report, not an error");
    assert!(took < Duration::from_millis(200), "{took:?}");
    assert!(!r.torsion_known && r.budget_exhausted);
    assert!(r.torsion.is_empty() && r.torsion_points.is_empty());
    assert_eq!((r.rank_lower, r.rank_upper, r.rank()), (None, None, None));
    assert!(r.rank_proven_by.is_empty() && r.points.is_empty());
    let ev = r.evidence.as_ref().expect("a statement on the torsion");
    assert!(ev.statements.iter().any(|s| s.claim.contains("order divides")), "{:?}", ev.statements);
    let json = r.to_json("[0,-22601,0,-223092870,0]");
    assert!(json.contains("\"torsion\":null"), "{json}");
    // without the flag (a short budget: only the torsion step matters here)
    let short = RankOptions::default().with_evidence(false).with_time_limit(Duration::from_secs(1));
    let full = analyse_data(&data, &short, &Work::new(&short)).unwrap();
    assert!(full.torsion_known);
    assert_eq!(full.torsion.iter().product::<u32>() % 4, 0);
}

/// The batch and the deadline: a torsion step cut by a tiny budget inside
/// a batch gives a report line, never an error, for a curve that simply ran
/// out of time (the Python sweep test once caught such an error).
#[test]
fn tiny_budgets_give_reports_not_errors() {
    let opts = RankOptions::default().with_time_limit(Duration::from_micros(1));
    for c in ["[0,-22601,0,-223092870,0]", "[0,0,1,-1,0]", "[1,-1,0,-314603520,2147876881280]"] {
        match analyse_text(c, &opts) {
            Ok(r) => assert!(r.budget_exhausted || r.rank().is_some(), "{c}"),
            Err(e) => assert!(matches!(e.kind(), ErrorKind::FactorBudget | ErrorKind::Budget), "{c}: {e}"),
        }
    }
}
