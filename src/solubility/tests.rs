//! Unit tests of the internals; the public behaviour is tested in
//! tests/solubility.rs.

use super::coeff::Coeff;
use super::*;
use proptest::prelude::*;

fn ints(v: [i64; 5]) -> [Integer; 5] {
    v.map(Integer::from)
}

#[test]
fn discriminant_known_values() {
    // disc(x^4 + a x + b) = -27 a^4 + 256 b^3 (classical; e.g. the
    // discriminant table in Cohen, A Course in Computational Algebraic
    // Number Theory, section 3.3 (from memory))
    for (a, b) in [(-1i64, 0i64), (1, 1), (3, -2), (0, 5), (7, 11)] {
        let g = ints([1, 0, 0, a, b]);
        assert_eq!(kernel::discriminant(&g), Integer::from(-27 * a.pow(4) + 256 * b.pow(3)));
    }
    // disc(x^4 + c x^2 + e) = 16 e (c^2 - 4e)^2 (biquadratic, same source)
    for (c, e) in [(1i64, 1i64), (-5, 4), (3, -7)] {
        let g = ints([1, 0, c, 0, e]);
        assert_eq!(kernel::discriminant(&g), Integer::from(16 * e * (c * c - 4 * e).pow(2)));
    }
    // word path and big path agree: scale by a large square factor lambda,
    // disc(lambda g) = lambda^6 disc(g)
    let g = ints([3, -1, 4, 1, -5]);
    let d = kernel::discriminant(&g);
    let lam = Integer::from(1u64 << 40);
    let big = g.clone().map(|c| c * &lam);
    assert_eq!(kernel::discriminant(&big), d * lam.pow(6));
}

#[test]
fn primality_of_large_places() {
    use malachite::base::num::arithmetic::traits::PowerOf2;
    let m = |e: u64| Natural::power_of_2(e) - Natural::from(1u32);
    // Mersenne primes 2^89 - 1, 2^107 - 1, 2^127 - 1 (OEIS A000043)
    for e in [89u64, 107, 127] {
        assert!(kernel::is_prime(&m(e), &mut kernel::PrimeMemo::default()));
    }
    // 2^67 - 1 = 193707721 * 761838257287 (Cole 1903)
    assert!(!kernel::is_prime(&m(67), &mut kernel::PrimeMemo::default()));
    assert!(!kernel::is_prime(&(Natural::from(1_000_000_007u64) * Natural::from(998_244_353u64) * Natural::from(3u32)), &mut kernel::PrimeMemo::default()));
    assert!(!kernel::is_prime(&Natural::from(0u32), &mut kernel::PrimeMemo::default()) && !kernel::is_prime(&Natural::from(1u32), &mut kernel::PrimeMemo::default()));
}

#[test]
fn odd_part_of_degenerate_forms() {
    // (x^2 + z^2)^2 -> a constant square class 1
    let r = kernel::odd_part(&ints([1, 0, 2, 0, 1]));
    assert_eq!(r.len(), 1);
    assert!(r[0] > 0u32 && crate::arith::is_square(&r[0]));
    // x^3 z -> x z
    let r = kernel::odd_part(&ints([0, 1, 0, 0, 0]));
    assert_eq!(r, vec![Integer::from(0), Integer::from(1), Integer::from(0)]);
    // 3 (x - z)^2 (x^2 + 2 z^2) -> 3 (x^2 + 2 z^2) up to a square
    // (x - z)^2 (x^2 + 2 z^2) = x^4 - 2x^3 z + 3 x^2 z^2 - 4 x z^3 + 2 z^4
    let r = kernel::odd_part(&ints([3, -6, 9, -12, 6]));
    assert_eq!(r, vec![Integer::from(3), Integer::from(0), Integer::from(6)]);
}

fn brute_roots(a: &[u64], p: u64) -> Vec<u64> {
    (0..p)
        .filter(|&s| {
            let mut v = 0u128;
            for c in a.iter().rev() {
                v = (v * s as u128 + *c as u128) % p as u128;
            }
            v == 0
        })
        .collect()
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(300))]

    /// Cantor-Zassenhaus roots equal the roots found by trying every residue.
    #[test]
    fn fp_roots_match_exhaustion(c in proptest::collection::vec(0u64..1_000_000, 1..6), pi in 0usize..4) {
        let p = [67u64, 101, 1009, 7919][pi];
        let mut a: Vec<u64> = c.iter().map(|x| x % p).collect();
        while a.last() == Some(&0) { a.pop(); }
        prop_assume!(!a.is_empty());
        let aw: Vec<i128> = a.iter().map(|&x| x as i128).collect();
        let mut got: Vec<u64> = padic::fp::roots(&aw, &(p as i128), &Natural::from(p)).into_iter().map(|x| x as u64).collect();
        got.sort();
        prop_assert_eq!(got, brute_roots(&a, p));
        // Integer path too
        let ai: Vec<Integer> = a.iter().map(|&x| Integer::from(x)).collect();
        let mut goti: Vec<Integer> = padic::fp::roots(&ai, &Integer::from(p), &Natural::from(p));
        goti.sort();
        let want: Vec<Integer> = brute_roots(&a, p).into_iter().map(Integer::from).collect();
        prop_assert_eq!(goti, want);
    }

    /// For 17 <= p < 64 the Weil-bound branch (lowered threshold) and the
    /// exhaustive branch reach the same verdict, and both witnesses check.
    #[test]
    fn weil_branch_agrees_with_exhaustion(c in proptest::array::uniform5(-40i64..40), e in proptest::array::uniform5(0u32..3), pi in 0usize..6) {
        let p = [17u64, 19, 23, 29, 31, 61][pi];
        let g: [Integer; 5] = std::array::from_fn(|i| Integer::from(c[i]) * Integer::from(p).pow(u64::from(e[i])));
        prop_assume!(kernel::discriminant(&g) != 0u32);
        let words: Vec<i128> = g.iter().map(|x| i128::try_from(x).unwrap()).collect();
        let pn = Natural::from(p);
        let a = padic::padic_hit_with(&words, p as i128, &pn, 17).unwrap();
        let b = padic::padic_hit_with(&words, p as i128, &pn, 64).unwrap();
        prop_assert_eq!(a.is_some(), b.is_some());
        let place = Place::Prime(pn.clone());
        for h in [a, b].into_iter().flatten() {
            let w = hit_point(&h, &h.t);
            prop_assert!(check_witness(&g, &place, &w));
        }
    }

    /// The i128 search and the Integer search agree.
    #[test]
    fn word_and_big_paths_agree(c in proptest::array::uniform5(-1000i64..1000), pi in 0usize..6) {
        let p = [2u64, 3, 5, 7, 67, 1_000_003][pi];
        let g: [Integer; 5] = c.map(Integer::from);
        prop_assume!(kernel::discriminant(&g) != 0u32);
        let words: Vec<i128> = c.iter().map(|&x| x as i128).collect();
        let pn = Natural::from(p);
        let a = padic::padic_hit(&words, p as i128, &pn).unwrap();
        let b = padic::padic_hit(&g, Integer::from(p), &pn).unwrap();
        prop_assert_eq!(a.is_some(), b.is_some());
        if let (Some(a), Some(b)) = (a, b) {
            prop_assert_eq!(a.t, b.t);
        }
    }
}

#[test]
fn word_overflow_falls_back() {
    // coefficients near 2^100 with p = 2: the word path overflows in the
    // Taylor shifts and the Integer path must give a checked answer
    let big = Integer::from(1u128 << 100);
    let g = [big.clone() + Integer::from(1), Integer::from(0), Integer::from(0), Integer::from(0), -big * Integer::from(3) + Integer::from(7)];
    let words: Vec<i128> = g.iter().map(|x| i128::try_from(x).unwrap()).collect();
    for p in [2u64, 3, 5] {
        let pn = Natural::from(p);
        let place = Place::Prime(pn.clone());
        let r = padic::padic_hit(&words, p as i128, &pn);
        let exact = padic::padic_hit(&g, Integer::from(p), &pn).unwrap();
        if let Ok(r) = r {
            assert_eq!(r.is_some(), exact.is_some());
        }
        assert_eq!(local_witness(&g, &place).is_some(), exact.is_some());
        if let Some(w) = local_witness(&g, &place) {
            assert!(check_witness(&g, &place, &w));
        }
    }
}

#[test]
fn coeff_word_and_big_residue_ops_agree() {
    let p = 1_000_003i128;
    for a in [1i128, 2, 3, 999_999, 123_456] {
        let ai = Integer::from(a);
        let pi = Integer::from(p);
        assert_eq!(a.inv_mod(&p), i128::try_from(&ai.inv_mod(&pi)).unwrap());
        assert_eq!(a.legendre(&p), ai.legendre(&pi));
        assert_eq!((-a).rem(&p), i128::try_from(&(-ai.clone()).rem(&pi)).unwrap());
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(400))]

    /// The exact Sturm search, the float-guided probes and the discriminant
    /// shortcuts reach the same verdict at the real place.
    #[test]
    fn real_paths_agree(c in proptest::array::uniform5(-500i64..500)) {
        let mut c = c;
        c[0] = -(c[0].abs() + 1);
        let g: [Integer; 5] = c.map(Integer::from);
        let d = kernel::discriminant(&g);
        prop_assume!(d != 0u32);
        use malachite::base::num::arithmetic::traits::Sign;
        let fast = real::real_positive_point(&g, Some(d.sign()));
        let slow = real::sturm_point(&g);
        prop_assert_eq!(fast.is_some(), slow.is_some(), "{:?}", c);
        for (x, z) in [fast, slow].into_iter().flatten() {
            prop_assert!(real::form_value(&g, &x, &z) > 0u32);
        }
    }
}

#[test]
fn sturm_finds_windows_floats_cannot() {
    // 1 - K (t^2 - 2)^2 with K = 10^36 is positive only within about
    // 3.5e-19 of +-sqrt(2), far below the dyadic probes' resolution
    let k = Integer::from(10u32).pow(36);
    let g = [-k.clone(), Integer::from(0), Integer::from(4) * &k, Integer::from(0), Integer::from(1) - Integer::from(4) * &k];
    assert!(real::float_guided_point_for_tests(&g).is_none());
    let w = local_witness(&g, &Place::Real).unwrap();
    assert!(check_witness(&g, &Place::Real, &w));
    // coefficients beyond i128: no float guide at all
    let k = Integer::from(10u32).pow(45);
    let g = [-k.clone(), Integer::from(0), Integer::from(4) * &k, Integer::from(0), Integer::from(1) - Integer::from(4) * &k];
    let w = local_witness(&g, &Place::Real).unwrap();
    assert!(check_witness(&g, &Place::Real, &w));
    let h = [-k.clone(), Integer::from(0), Integer::from(4) * &k, Integer::from(0), Integer::from(-1) - Integer::from(4) * &k];
    assert!(local_witness(&h, &Place::Real).is_none());
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(500))]

    /// The termination argument of the padic module: the search never goes
    /// deeper than v_p(disc) / 2 + 3 levels.
    #[test]
    fn search_depth_is_bounded_by_the_discriminant(c in proptest::array::uniform5(-30i64..30), e in proptest::array::uniform5(0u32..4), pi in 0usize..5) {
        let p = [2u64, 3, 5, 7, 67][pi];
        let g: [Integer; 5] = std::array::from_fn(|i| Integer::from(c[i]) * Integer::from(p).pow(u64::from(e[i])));
        let d = kernel::discriminant(&g);
        prop_assume!(d != 0u32);
        let pn = Natural::from(p);
        let v = crate::arith::valuation(&d, &pn).unwrap();
        let (_, depth) = padic::search_with_depth(&g, Integer::from(p), &pn, 64).unwrap();
        prop_assert!(depth <= v / 2 + 3, "{:?}: depth {} with v_p(disc) = {}", c, depth, v);
    }
}
