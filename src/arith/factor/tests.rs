//! Tests of the factorisation driver and of each method.

use super::*;
use super::ecm::{ecm_curve, CurveResult, OddPrimeBits};
use malachite::base::num::basic::traits::Zero;
use proptest::prelude::*;

fn nat(s: &str) -> Natural {
    s.parse().unwrap()
}

fn int(s: &str) -> Integer {
    s.parse().unwrap()
}

fn lim() -> FactorLimits {
    FactorLimits::default()
}

/// Deterministic generator for test primes (SplitMix64).
struct Gen(u64);
impl Gen {
    fn next(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9e37_79b9_7f4a_7c15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xbf58_476d_1ce4_e5b9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94d0_49bb_1331_11eb);
        z ^ (z >> 31)
    }
    /// A random prime with exactly `digits` decimal digits.
    fn prime(&mut self, digits: u32) -> Natural {
        let lo = Natural::from(10u32).pow(u64::from(digits - 1));
        let span = Natural::from(10u32).pow(u64::from(digits)) - &lo;
        let mut x = Natural::ZERO;
        for _ in 0..digits.div_ceil(19) + 1 {
            x = (x << 64u32) + Natural::from(self.next());
        }
        let mut p = lo + x % span;
        loop {
            if is_probable_prime(&p) {
                return p;
            }
            p += Natural::ONE;
        }
    }
}

fn pairs(f: &Factorization) -> Vec<(String, u32)> {
    f.factors().iter().map(|(p, e)| (p.to_string(), *e)).collect()
}

#[test]
fn known_factorisations() {
    // Classical factorisations (Fermat numbers: Euler 1732 for F5,
    // Landry 1880 for F6, Morrison-Brillhart 1970 for F7; Cole 1903 for
    // 2^67 - 1; the repunit R19 is prime; 10^20 + 1 = 73 137 1676321 5964848081
    // (from memory)).
    let cases: [(&str, &[(&str, u32)]); 6] = [
        ("4294967297", &[("641", 1), ("6700417", 1)]),
        ("18446744073709551617", &[("274177", 1), ("67280421310721", 1)]),
        (
            "340282366920938463463374607431768211457",
            &[("59649589127497217", 1), ("5704689200685129054721", 1)],
        ),
        ("147573952589676412927", &[("193707721", 1), ("761838257287", 1)]),
        ("1111111111111111111", &[("1111111111111111111", 1)]),
        ("100000000000000000001", &[("73", 1), ("137", 1), ("1676321", 1), ("5964848081", 1)]),
    ];
    for (n, want) in cases {
        let f = factor(&int(n), &lim()).unwrap();
        let want: Vec<(String, u32)> = want.iter().map(|(p, e)| (p.to_string(), *e)).collect();
        assert_eq!(pairs(&f), want, "n = {n}");
    }
}

#[test]
fn signs_units_and_powers() {
    let f = factor(&int("1"), &lim()).unwrap();
    assert!(f.factors().is_empty() && f.sign() == 1);
    let f = factor(&int("-1"), &lim()).unwrap();
    assert!(f.factors().is_empty() && f.sign() == -1);
    assert_eq!(factor(&int("0"), &lim()).unwrap_err().kind(), &ErrorKind::InvalidValue);
    // (2^61 - 1)^3 * (2^31 - 1)^2 * -12: perfect-power cofactor
    let m61 = nat("2305843009213693951");
    let m31 = nat("2147483647");
    let n = -Integer::from(&m61 * &m61 * &m61 * &m31 * &m31 * Natural::from(12u32));
    let f = factor(&n, &lim()).unwrap();
    assert_eq!(f.sign(), -1);
    assert_eq!(
        pairs(&f),
        vec![("2".into(), 2), ("3".into(), 1), ("2147483647".into(), 2), ("2305843009213693951".into(), 3)]
    );
    // a square of a 30-digit prime
    let mut g = Gen(7);
    let p = g.prime(30);
    let f = factor(&Integer::from(&p * &p), &lim()).unwrap();
    assert_eq!(f.factors(), &[(p, 2)]);
}

#[test]
fn squarefree_and_radical() {
    // -2^3 3^2 5 7^4 = -s m^2 with s = 2*5, m = 2*3*49
    let n = Integer::from(-8 * 9 * 5 * 2401);
    let f = factor(&n, &lim()).unwrap();
    assert_eq!(f.squarefree_part(), Integer::from(-10));
    assert_eq!(f.square_root_of_square_part(), Natural::from(2u32 * 3 * 49));
    assert_eq!(f.radical(), Natural::from(210u32));
    let s = f.squarefree_part();
    let m = Integer::from(f.square_root_of_square_part());
    assert_eq!(&s * &m * &m, n);
    assert_eq!(f.divisors().len(), 4 * 3 * 2 * 5); // tau = prod (e + 1)
}

#[test]
fn factor_u64_matches_trial_division() {
    fn naive(mut n: u64) -> Vec<(u64, u32)> {
        let mut out = Vec::new();
        let mut d = 2;
        while d * d <= n {
            let mut k = 0;
            while n % d == 0 {
                n /= d;
                k += 1;
            }
            if k > 0 {
                out.push((d, k));
            }
            d += 1;
        }
        if n > 1 {
            out.push((n, 1));
        }
        out
    }
    for n in 1..5000u64 {
        assert_eq!(factor_u64(n).unwrap(), naive(n), "n = {n}");
    }
    let mut g = Gen(1);
    for _ in 0..200 {
        let n = g.next() >> 24; // 40-bit
        assert_eq!(factor_u64(n).unwrap(), naive(n), "n = {n}");
    }
    // semiprimes of two 32-bit primes, and large prime squares
    for _ in 0..50 {
        let mut p = (g.next() >> 32) | 1;
        while !is_prime_u64(p) {
            p += 2;
        }
        let mut q = (g.next() >> 32) | (1 << 31) | 1;
        while !is_prime_u64(q) {
            q += 2;
        }
        let n = p.wrapping_mul(q);
        if (p as u128 * q as u128) < (1 << 64) {
            let mut want = vec![(p.min(q), 1), (p.max(q), 1)];
            if p == q {
                want = vec![(p, 2)];
            }
            assert_eq!(factor_u64(n).unwrap(), want);
        }
        if (p as u128 * p as u128) < (1 << 64) {
            assert_eq!(factor_u64(p * p).unwrap(), vec![(p, 2)]);
        }
    }
}

/// Rho and ECM on each width of Montgomery ring, and on the fallback ring.
#[test]
fn kernels_on_every_ring() {
    let mut g = Gen(3);
    let limits = lim();
    let budget = Budget { limits: &limits };
    for &(dp, dq) in &[(8u32, 12u32), (8, 30), (9, 60), (8, 150)] {
        let p = g.prime(dp);
        let q = g.prime(dq);
        let n = &p * &q;
        let rho = Rho { iterations: 1 << 20 };
        match rho.split(&n, &budget) {
            Split::Factors(v) => assert!(v.contains(&p), "rho on {n}"),
            other => panic!("rho failed on {n}: {other:?}"),
        }
        match rho.run(&NatRing::new(&n), &budget) {
            Split::Factors(v) => assert!(v.contains(&p)),
            other => panic!("rho (NatRing) failed on {n}: {other:?}"),
        }
        let ecm = Ecm { b1: 2000, b2: 200_000, curves: 200, first_sigma: 11 };
        match ecm.split(&n, &budget) {
            Split::Factors(v) => assert!(v.contains(&p), "ecm on {n}"),
            other => panic!("ecm failed on {n}: {other:?}"),
        }
    }
    // ECM on NatRing agrees with MontN curve by curve (same sigma, same outcome)
    let p = g.prime(9);
    let q = g.prime(25);
    let n = &p * &q;
    let primes = primes_up_to(500);
    let bits = OddPrimeBits::new(20_000 + 2310);
    for sigma in 6..40 {
        let a = ecm_curve(&MontN::<2>::new(&n).unwrap(), sigma, 500, 20_000, &primes, &bits, &budget);
        let b = ecm_curve(&NatRing::new(&n), sigma, 500, 20_000, &primes, &bits, &budget);
        let (a, b) = match (a, b) {
            (CurveResult::Factor(x), CurveResult::Factor(y)) => (Some(x), Some(y)),
            (CurveResult::Nothing, CurveResult::Nothing) => (None, None),
            _ => panic!("rings disagree at sigma {sigma}"),
        };
        assert_eq!(a, b);
    }
}

/// The stage-2 continuation finds a prime whose curve order has one
/// large prime factor in (B1, B2]: checked by brute force on a small
/// prime, where the group order is counted by the Legendre symbol.
#[test]
fn ecm_stage2_catches_the_large_prime() {
    use crate::arith::jacobi_u64;
    let p = 10007u64;
    let mut found_stage2 = false;
    for sigma in 6..200u64 {
        // the curve mod p and its group order, counted naively
        let md = |a: i128| a.rem_euclid(p as i128) as u64;
        let u = md(sigma as i128 * sigma as i128 - 5);
        let v = md(4 * sigma as i128);
        let inv = |a: u64| super::super::word::inv_mod(a, p);
        let den = (16 * u % p) * u % p * u % p * v % p;
        let Some(dinv) = inv(den) else { continue };
        let vmu = md(v as i128 - u as i128);
        let a24 = vmu * vmu % p * vmu % p * ((3 * u + v) % p) % p * dinv % p;
        let a = md(4 * a24 as i128 - 2);
        if a == 2 || a == p - 2 {
            continue; // singular modulo p
        }
        let x0 = u * u % p * u % p * inv(v * v % p * v % p).unwrap() % p;
        // B = x0^3 + A x0^2 + x0 (y = 1); #E = p + 1 + sum chi(B (x^3 + A x^2 + x))
        let bb = (x0 * x0 % p * x0 + a * x0 % p * x0 + x0) % p;
        if bb == 0 {
            continue;
        }
        let mut order: i64 = p as i64 + 1;
        for x in 0..p {
            let rhs = (x * x % p * x + a * x % p * x + x) % p;
            order += jacobi_u64(bb * rhs % p, p) as i64;
        }
        let f = factor_u64(order as u64).unwrap();
        let big = f.last().unwrap().0;
        let smooth_rest = f.iter().all(|&(q, e)| q == big || q.pow(e) <= 100);
        if !(smooth_rest && big > 100 && big <= 5000 && f.last().unwrap().1 == 1) {
            continue;
        }
        // the point's order divides #E; with B1 = 100, B2 = 5000 stage 2 must
        // reach it unless the point order is already B1-smooth.
        // a second prime large enough that its curve is never smooth enough
        let q = Natural::from((1u64 << 61) - 1);
        let n = Natural::from(p) * &q;
        let limits = lim();
        let budget = Budget { limits: &limits };
        let primes = primes_up_to(100);
        let bits = OddPrimeBits::new(5000 + 2310);
        let ring = MontN::<2>::new(&n).unwrap();
        match ecm_curve(&ring, sigma, 100, 5000, &primes, &bits, &budget) {
            CurveResult::Factor(d) => {
                assert_eq!(d, Natural::from(p));
                found_stage2 = true;
            }
            _ => {
                // acceptable only if the point's order is B1-smooth and stage 1
                // already caught both primes, which does not happen here.
                panic!("sigma {sigma}: order {order} = {f:?} should be caught");
            }
        }
    }
    assert!(found_stage2);
}

#[test]
fn siqs_backend_agrees_with_ecm() {
    // The quadratic sieve against our own rho/ECM on independent
    // semiprimes of 20 to 34 digits; both factorisations must agree.
    let mut g = Gen(11);
    for i in 0..12u32 {
        let dp = 10 + i % 6;
        let dq = 10 + (i * 7) % 8 + 4;
        let p = g.prime(dp);
        let q = g.prime(dq);
        let n = Integer::from(&p * &q);
        let a = factor_with(&n, &lim(), Plan::SieveFirst).unwrap();
        let b = factor_with(&n, &lim(), Plan::NoSieve).unwrap();
        assert_eq!(a, b, "n = {n}");
        assert_eq!(a.product(), n);
    }
}

/// Slow sweep (run with `--ignored`): the sieve backend against rho/ECM
/// on 120 semiprimes and 3-factor products of 20 to 44 digits.
#[test]
#[ignore]
fn siqs_backend_sweep() {
    let mut g = Gen(0x5eed);
    for i in 0..120u32 {
        let dp = 8 + i % 15;
        let dq = 12 + (i * 5) % 11;
        let mut n = g.prime(dp) * g.prime(dq);
        if i % 4 == 0 {
            n *= g.prime(6 + i % 7);
        }
        let n = Integer::from(n);
        let a = factor_with(&n, &lim(), Plan::SieveFirst).unwrap();
        let b = factor_with(&n, &lim(), Plan::NoSieve).unwrap();
        assert_eq!(a, b, "n = {n}");
    }
}

#[test]
fn balanced_semiprimes_and_mixed_products() {
    let mut g = Gen(5);
    // 40-digit balanced semiprime through the default strategy
    let p = g.prime(20);
    let q = g.prime(20);
    let n = Integer::from(&p * &q);
    let f = factor(&n, &lim()).unwrap();
    let mut want = vec![(p.clone(), 1), (q.clone(), 1)];
    want.sort();
    assert_eq!(f.factors(), want.as_slice());
    // product of primes of many sizes with repeats
    let parts = [g.prime(5), g.prime(9), g.prime(14), g.prime(18), g.prime(22)];
    let mut n = Natural::ONE;
    for (i, p) in parts.iter().enumerate() {
        n *= p.pow(1 + (i as u64 % 2));
    }
    let f = factor(&Integer::from(&n), &lim()).unwrap();
    assert_eq!(f.factors().len(), 5);
    assert_eq!(f.product(), Integer::from(n));
}

#[test]
fn budget_is_honoured() {
    let mut g = Gen(9);
    let n = Integer::from(g.prime(40) * g.prime(40));
    let limits = FactorLimits { deadline: Some(Instant::now()), cancel: None };
    assert_eq!(factor(&n, &limits).unwrap_err().kind(), &ErrorKind::FactorBudget);
    let flag = Arc::new(AtomicBool::new(true));
    let limits = FactorLimits { deadline: None, cancel: Some(flag) };
    assert_eq!(factor(&n, &limits).unwrap_err().kind(), &ErrorKind::FactorBudget);
    // a deadline in the middle of the sieve stops it promptly
    let start = Instant::now();
    let limits = FactorLimits { deadline: Some(start + std::time::Duration::from_millis(200)), cancel: None };
    let r = factor(&n, &limits);
    assert!(start.elapsed() < std::time::Duration::from_secs(5));
    if let Ok(f) = r {
        assert_eq!(f.product(), n); // finished in time: still right
    }
    // small numbers need no budget at all
    let limits = FactorLimits { deadline: Some(Instant::now()), cancel: None };
    assert!(factor(&Integer::from(30), &limits).is_ok());
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(64))]
    #[test]
    fn factorisations_multiply_back(a in any::<u64>(), b in any::<u64>(), c in 1u64..1_000_000, neg in any::<bool>()) {
        let m = Natural::from(a.max(1)) * Natural::from(b.max(1)) * Natural::from(c);
        let n = if neg { -Integer::from(m) } else { Integer::from(m) };
        let f = factor(&n, &lim()).unwrap();
        prop_assert_eq!(f.product(), n);
        for (p, e) in f.factors() {
            prop_assert!(*e >= 1 && is_probable_prime(p));
        }
    }

    #[test]
    fn small_factorisations_match_factor_u64(n in 1u64..) {
        let f = factor(&Integer::from(n), &lim()).unwrap();
        let got: Vec<(u64, u32)> = f.factors().iter().map(|(p, e)| (u64::saturating_from(p), *e)).collect();
        prop_assert_eq!(got, factor_u64(n).unwrap());
    }
}

/// Two ways: the factorisation from known primes (some of the true primes,
/// in any order, with strangers that do not divide) equals the plain one;
/// a composite known factor that divides `n` is refused with
/// `InvalidValue`; a spent deadline stops only a cofactor that needs work.
#[test]
fn known_primes_agree_with_plain_factoring() {
    let mut state = 0x1234_5678_9abc_def0u64;
    let mut next = || {
        state = state.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
        state >> 33
    };
    for _ in 0..200 {
        let n = Integer::from(next() + 2) * Integer::from(next() + 2) * Integer::from(next() % 1000 + 1);
        let n = if next() % 2 == 0 { -n } else { n };
        let plain = factor(&n, &lim()).unwrap();
        let mut known: Vec<Natural> = plain.primes().filter(|_| next() % 2 == 0).cloned().collect();
        known.push(Natural::from(1_000_003u32)); // may or may not divide
        known.reverse();
        let f = factor_with_known_primes(&n, &known, &lim()).unwrap();
        assert_eq!(f, plain, "{n}");
    }
    // 2^2 3^3 5 7: 15 divides and is composite
    let n = Integer::from(3780);
    let e = factor_with_known_primes(&n, &[Natural::from(15u32)], &lim()).unwrap_err();
    assert_eq!(*e.kind(), ErrorKind::InvalidValue);
    // every prime known: no work left, a spent deadline does not matter
    let spent = FactorLimits::default().with_deadline(Instant::now());
    let known: Vec<Natural> = [2u32, 3, 5, 7].iter().map(|&p| Natural::from(p)).collect();
    assert_eq!(factor_with_known_primes(&n, &known, &spent).unwrap().product(), n);
    // (2^61 - 1)(2^31 - 1) with only 2^31 - 1 known: the Mersenne cofactor 2^61 - 1 is left
    let m = Integer::from((1u64 << 61) - 1) * Integer::from((1u64 << 31) - 1);
    let f = factor_with_known_primes(&m, &[Natural::from((1u32 << 31) - 1)], &lim()).unwrap();
    assert_eq!(f.exponent(&Natural::from((1u64 << 61) - 1)), 1);
    assert!(factor_with_known_primes(&Integer::from(0), &known, &lim()).is_err());
}
