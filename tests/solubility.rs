//! Local solubility of y^2 = g(x, z): known examples, laws, and independent
//! brute-force computations.

use malachite::base::num::arithmetic::traits::Pow;
use malachite::{Integer, Natural};
use proptest::prelude::*;
use std::collections::HashMap;
use twofold::solubility::{
    check_witness, everywhere_locally_soluble, is_locally_soluble, is_p_adic_square, local_witness,
    quartic_discriminant, try_local_witness, LocalWitness, Place,
};
use twofold::ErrorKind;

fn q(v: [i64; 5]) -> [Integer; 5] {
    v.map(Integer::from)
}

fn prime(p: u64) -> Place {
    Place::Prime(Natural::from(p))
}

fn value(g: &[i64; 5], x: i128, z: i128) -> i128 {
    let mut v = 0i128;
    let mut zp = 1i128;
    for c in g.iter() {
        v = v * x + (*c as i128) * zp;
        zp *= z;
    }
    v
}

// ---------------------------------------------------------------------
// Independent p-adic computation: points modulo p^k.
//
// If y^2 = g(x, z) has a Q_p-point it has one with (x, z) primitive and
// y in Z_p, so g(x, z) = y^2 (mod p^k) is solvable for every k. Conversely,
// if there is no Q_p-point then g has no root on P^1(Q_p) (a root is a
// point with y = 0), so v_p(g(x, z)) <= V on the compact set of primitive
// pairs, and for k > V + 3 a solution modulo p^k would force v(g) even and
// the unit part a square modulo p^(k-V), hence a p-adic square. So: not
// soluble  <=>  for some k there is no primitive (x, z) and y with
// g(x, z) = y^2 mod p^k. Scaling (x, z) by a unit u multiplies g by u^4, so
// it suffices to try (x, 1) for x mod p^k and (1, z) for z = 0 mod p.
// ---------------------------------------------------------------------

struct SquareTables(HashMap<(u64, u32), Vec<bool>>);

impl SquareTables {
    fn get(&mut self, p: u64, k: u32) -> &Vec<bool> {
        self.0.entry((p, k)).or_insert_with(|| {
            let m = p.pow(k);
            let mut t = vec![false; m as usize];
            for y in 0..m {
                t[((y as u128 * y as u128) % m as u128) as usize] = true;
            }
            t
        })
    }
}

fn has_point_mod(g: &[i64; 5], p: u64, k: u32, tables: &mut SquareTables) -> bool {
    let m = p.pow(k) as i128;
    let sq = tables.get(p, k);
    let modv = |v: i128| v.rem_euclid(m) as usize;
    // Horner with reductions, coefficients reduced first
    let gm: Vec<i128> = g.iter().map(|&c| (c as i128).rem_euclid(m)).collect();
    let eval = |x: i128, z: i128| -> usize {
        let mut v = 0i128;
        let mut zp = 1i128;
        for c in gm.iter() {
            v = (v * x + c * zp) % m;
            zp = zp * z % m;
        }
        modv(v)
    };
    (0..m).any(|x| sq[eval(x, 1)]) || (0..m).step_by(p as usize).any(|z| sq[eval(1, z)])
}

/// `Some(k)`: no point modulo p^k (a proof of insolubility); `None`: points
/// modulo every p^j with j <= kmax.
fn first_obstruction(g: &[i64; 5], p: u64, kmax: u32, tables: &mut SquareTables) -> Option<u32> {
    (1..=kmax).find(|&k| !has_point_mod(g, p, k, tables))
}

struct Lcg(u64);
impl Lcg {
    fn next(&mut self) -> u64 {
        // Knuth's MMIX multiplier and increment
        self.0 = self.0.wrapping_mul(6364136223846793005).wrapping_add(1442695040888963407);
        self.0 >> 33
    }
    fn range(&mut self, lo: i64, hi: i64) -> i64 {
        lo + (self.next() % (hi - lo + 1) as u64) as i64
    }
}

/// Random quartics with non-zero discriminant, many with coefficients
/// divisible by powers of `p` so that bad reduction is common.
fn random_quartic(rng: &mut Lcg, p: u64, bound: i64) -> [i64; 5] {
    loop {
        let mut g = [0i64; 5];
        for c in g.iter_mut() {
            let e = [0u32, 0, 0, 1, 1, 2][rng.range(0, 5) as usize];
            *c = rng.range(-bound, bound) * (p as i64).pow(e);
        }
        if quartic_discriminant(&q(g)) != 0u32 {
            return g;
        }
    }
}

/// `n w(x, z)^2 + p h(x, z)` with `w` a random binary quadratic, `h` a random
/// quartic and `n` random: modulo p a constant times a square, which sends
/// the search into its deeper branches.
fn near_square_quartic(rng: &mut Lcg, p: u64, bound: i64) -> [i64; 5] {
    loop {
        let n = rng.range(1, p as i64 - 1);
        let (u, v, w) = (rng.range(-bound, bound), rng.range(-bound, bound), rng.range(-bound, bound));
        // (u x^2 + v x z + w z^2)^2
        let sq = [u * u, 2 * u * v, v * v + 2 * u * w, 2 * v * w, w * w];
        let e = rng.range(1, 2) as u32;
        let mut g = [0i64; 5];
        for i in 0..5 {
            g[i] = n * sq[i] + (p as i64).pow(e) * rng.range(-bound, bound);
        }
        if quartic_discriminant(&q(g)) != 0u32 {
            return g;
        }
    }
}

fn brute_force_sweep(p: u64, count: usize, bound: i64, kcheck: u32, kmax: u32, seed: u64) {
    let mut rng = Lcg(seed);
    let mut tables = SquareTables(HashMap::new());
    let (mut yes, mut no) = (0, 0);
    for i in 0..count {
        let g = if i % 3 == 2 { near_square_quartic(&mut rng, p, bound) } else { random_quartic(&mut rng, p, bound) };
        let gi = q(g);
        let place = prime(p);
        match local_witness(&gi, &place) {
            Some(w) => {
                yes += 1;
                assert!(check_witness(&gi, &place, &w), "{g:?} at {p}: bad witness {w:?}");
                assert_eq!(first_obstruction(&g, p, kcheck, &mut tables), None, "{g:?} at {p}: said soluble");
            }
            None => {
                no += 1;
                assert!(
                    first_obstruction(&g, p, kmax, &mut tables).is_some(),
                    "{g:?} at {p}: said insoluble, but points modulo p^k for all k <= {kmax}"
                );
            }
        }
    }
    eprintln!("p = {p}: {yes} soluble, {no} insoluble");
    // both verdicts must be exercised for the sweep to mean anything
    assert!(yes > count / 10 && no > count / 20, "p = {p}: {yes} soluble, {no} insoluble");
}

#[test]
fn brute_force_p2() {
    brute_force_sweep(2, 4000, 12, 9, 14, 1);
}

#[test]
fn brute_force_p3() {
    brute_force_sweep(3, 3000, 12, 6, 10, 2);
}

#[test]
fn brute_force_p5() {
    brute_force_sweep(5, 2000, 12, 4, 7, 3);
}

#[test]
fn brute_force_p7() {
    brute_force_sweep(7, 2000, 12, 4, 6, 4);
}

#[test]
fn brute_force_large_prime_path() {
    // p = 67 and 71 go through the Weil-bound and Cantor-Zassenhaus branch
    brute_force_sweep(67, 400, 6, 2, 3, 5);
    brute_force_sweep(71, 400, 6, 2, 3, 6);
}

// ---------------------------------------------------------------------
// Independent real computation: complex roots by the Durand-Kerner
// iteration in floating point (test oracle only), compared with the exact
// Sturm-based answer. With a > 0 the form is positive at (1, 0); with a = 0
// it has a root at infinity; with a < 0 it is positive somewhere iff g(t, 1)
// has a real root (all roots simple).
// ---------------------------------------------------------------------

fn has_real_root_numeric(g: &[i64; 5]) -> bool {
    let a = g[0] as f64;
    let c: Vec<f64> = g.iter().map(|&x| x as f64 / a).collect(); // monic, highest first
    let f = |z: (f64, f64)| {
        let mut v = (1.0, 0.0);
        for &ci in &c[1..] {
            v = (v.0 * z.0 - v.1 * z.1 + ci, v.0 * z.1 + v.1 * z.0);
        }
        v
    };
    let mut roots: Vec<(f64, f64)> = (0..4).map(|k| {
        let r = (0.4f64, 0.9f64);
        let mut z = (1.0, 0.0);
        for _ in 0..k {
            z = (z.0 * r.0 - z.1 * r.1, z.0 * r.1 + z.1 * r.0);
        }
        z
    }).collect();
    for _ in 0..2000 {
        for i in 0..4 {
            let num = f(roots[i]);
            let mut den = (1.0, 0.0);
            for j in 0..4 {
                if i != j {
                    let d = (roots[i].0 - roots[j].0, roots[i].1 - roots[j].1);
                    den = (den.0 * d.0 - den.1 * d.1, den.0 * d.1 + den.1 * d.0);
                }
            }
            let n2 = den.0 * den.0 + den.1 * den.1;
            let qt = ((num.0 * den.0 + num.1 * den.1) / n2, (num.1 * den.0 - num.0 * den.1) / n2);
            roots[i] = (roots[i].0 - qt.0, roots[i].1 - qt.1);
        }
    }
    roots.iter().any(|r| r.1.abs() < 1e-7 * (1.0 + r.0.abs()))
}

#[test]
fn real_place_against_numeric_roots() {
    let mut rng = Lcg(77);
    let (mut yes, mut no) = (0, 0);
    for _ in 0..3000 {
        let mut g = [0i64; 5];
        for c in g.iter_mut() {
            *c = rng.range(-9, 9);
        }
        if quartic_discriminant(&q(g)) == 0u32 {
            continue;
        }
        let gi = q(g);
        let got = local_witness(&gi, &Place::Real);
        if let Some(w) = &got {
            assert!(check_witness(&gi, &Place::Real, w));
        }
        // grid sampling: any positive value forces a "soluble" verdict
        for i in -400i128..=400 {
            if value(&g, i, 40) > 0 {
                assert!(got.is_some(), "{g:?} positive at {i}/40");
                break;
            }
        }
        let want = g[0] >= 0 || has_real_root_numeric(&g);
        assert_eq!(got.is_some(), want, "{g:?}");
        if got.is_some() { yes += 1 } else { no += 1 }
    }
    assert!(yes > 300 && no > 300, "{yes} {no}");
}

#[test]
fn real_place_narrow_positivity_window() {
    // g(t, 1) = 1 - K (t^2 - 2)^2 is positive only within about 1/(2 sqrt(2K))
    // of t = +-sqrt(2); with K = 10^12 no small probe finds it.
    let k = 1_000_000_000_000i64;
    // -K t^4 + 4K t^2 - 4K + 1
    let g = q([-k, 0, 4 * k, 0, 1 - 4 * k]);
    let w = local_witness(&g, &Place::Real).expect("real point near sqrt(2)");
    assert!(check_witness(&g, &Place::Real, &w));
    // -1 - K (t^2 - 2)^2 is negative everywhere
    let h = q([-k, 0, 4 * k, 0, -1 - 4 * k]);
    assert!(local_witness(&h, &Place::Real).is_none());
}

// ---------------------------------------------------------------------
// Known examples.
// ---------------------------------------------------------------------

#[test]
fn lind_reichardt_is_everywhere_locally_soluble() {
    // 2w^2 = x^4 - 17 z^4 (Lind 1940, Reichardt 1942): locally soluble at
    // every place, no rational point. Multiplying by 2 and putting y = 2w:
    // y^2 = 2x^4 - 34 z^4.
    let g = q([2, 0, 0, 0, -34]);
    // disc = 256 a^3 e^3 = -2^14 17^3: the bad primes are 2 and 17
    assert_eq!(quartic_discriminant(&g), -(Integer::from(2).pow(14) * Integer::from(17).pow(3)));
    let ws = everywhere_locally_soluble(&g, &[Natural::from(2u32), Natural::from(17u32)]).unwrap();
    for (place, w) in &ws {
        assert!(check_witness(&g, place, w));
    }
    // the good primes need no check (Hasse-Weil), but the search agrees
    for p in twofold::arith::primes_up_to(400) {
        assert!(is_locally_soluble(&g, &prime(p)), "p = {p}");
    }
    // consistent with the theorem: no point of small height
    for x in 0..=80i128 {
        for z in 1..=80i128 {
            let v = value(&[2, 0, 0, 0, -34], x, z);
            assert!(v < 0 || !twofold::arith::is_square(&Integer::from(v)), "({x}, {z})");
        }
    }
}

#[test]
fn hand_checked_insoluble_examples() {
    // y^2 = -x^4 - z^4: g < 0 on R^2 \ {0}.
    assert!(!is_locally_soluble(&q([-1, 0, 0, 0, -1]), &Place::Real));
    // y^2 = -x^4 + x^2 z^2 - z^4: g = -((x^2 - z^2/2)^2 + 3 z^4 / 4) < 0.
    assert!(!is_locally_soluble(&q([-1, 0, 1, 0, -1]), &Place::Real));

    // y^2 = 2x^4 + 3z^4 at 3: if 3 does not divide x, g = 2x^4 = 2 (mod 3),
    // a non-square unit; if 3 | x, then z is a unit and v_3(g) = 1.
    assert!(!is_locally_soluble(&q([2, 0, 0, 0, 3]), &prime(3)));
    // and at 2: x odd, z even: g = 2 (mod 32) has valuation 1; x, z odd:
    // g = 2 + 3 = 5 (mod 16); x even, z odd: g = 3 (mod 32).
    assert!(!is_locally_soluble(&q([2, 0, 0, 0, 3]), &prime(2)));
    // y^2 = 2x^4 + 5z^4 at 5: x a unit gives g = 2 x^4 = 2 (mod 5), and 2
    // is not a square mod 5; 5 | x gives v_5(g) = 1.
    assert!(!is_locally_soluble(&q([2, 0, 0, 0, 5]), &prime(5)));
    // y^2 = 3x^4 + 2z^4 at 2: x odd, z even: g = 3 (mod 8); x, z odd:
    // g = 3 + 2 = 5 (mod 16); x even, z odd: g = 2 (z^4 + 8 (3x^4/16)),
    // valuation 1. Odd numbers are 2-adic squares only if 1 mod 8.
    assert!(!is_locally_soluble(&q([3, 0, 0, 0, 2]), &prime(2)));
    // y^2 = 7(x^4 + z^4) at 7: x^4 + z^4 for primitive pairs is a sum of
    // fourth powers mod 7, whose values are 1 (one of x, z divisible by 7)
    // or 1 + 1, 1 + 2, 1 + 4, 2 + 2, 2 + 4, 4 + 4 = 2, 3, 5, 4, 6, 1: never
    // 0, because -1 is not a fourth power mod 7. So v_7(g) = 1 always.
    assert!(!is_locally_soluble(&q([7, 0, 0, 0, 7]), &prime(7)));
}

#[test]
fn primes_beyond_words() {
    use malachite::base::num::arithmetic::traits::PowerOf2;
    // P = 2^89 - 1 is prime (OEIS A000043), P = 3 mod 4, P = 7 mod 8 and
    // P = 1 mod 3. By quadratic reciprocity (3/P) = -(P/3) = -1, (-1/P) = -1,
    // (2/P) = 1.
    let big = Natural::power_of_2(89) - Natural::from(1u32);
    let pb = Integer::from(big.clone());
    let place = Place::Prime(big);
    let g = |a: i64| [Integer::from(a), Integer::from(0), Integer::from(0), Integer::from(0), pb.clone()];
    // 3x^4 + P z^4: 3 x^4 is a non-square unit when P does not divide x, and
    // v_P = 1 otherwise: insoluble
    assert!(local_witness(&g(3), &place).is_none());
    // -3 and 2 are squares mod P: soluble at (1, 0)
    for a in [-3i64, 2] {
        let w = local_witness(&g(a), &place).unwrap();
        assert!(check_witness(&g(a), &place, &w));
    }
    // a generic quartic at P: good reduction, soluble (Hasse-Weil)
    let h = q([1, 2, -3, 4, 5]);
    let w = local_witness(&h, &place).unwrap();
    assert!(check_witness(&h, &place, &w));
}

#[test]
fn soluble_examples_with_witnesses() {
    // x^4 + 7z^4 at 2: (1, 2) gives 113 = 1 mod 8 (hand check).
    let g = q([1, 0, 0, 0, 7]);
    let w = local_witness(&g, &prime(2)).unwrap();
    assert!(check_witness(&g, &prime(2), &w));
    // a simple root modulo p forces a p-adic root and hence a point:
    // g = (x - 3z)(x^3 + 5 z^3) + 7 z^4 has x = 3 a simple root mod 7.
    // (x - 3z)(x^3 + 5z^3) = x^4 - 3x^3 z + 5 x z^3 - 15 z^4
    let g = q([1, -3, 0, 5, -8]);
    assert!(is_locally_soluble(&g, &prime(7)));
}

#[test]
fn degenerate_quartics_follow_the_documented_meaning() {
    // 2 (x^2 + z^2)^2 takes the values 2 * (non-zero square): a non-zero
    // square in Q_p iff 2 is, i.e. for p = 7 (3^2 = 2 mod 7), not for p = 3,
    // 5 (2 is a non-residue) nor p = 2 (odd valuation); positive over R.
    let g = q([2, 0, 4, 0, 2]);
    for (p, want) in [(2u64, false), (3, false), (5, false), (7, true)] {
        let w = local_witness(&g, &prime(p));
        assert_eq!(w.is_some(), want, "p = {p}");
        if let Some(w) = w {
            assert!(check_witness(&g, &prime(p), &w));
        }
    }
    assert!(check_witness(&g, &Place::Real, &local_witness(&g, &Place::Real).unwrap()));
    // x^2 z^2: g(x, z) = (xz)^2, a square whenever xz != 0
    let g = q([0, 0, 1, 0, 0]);
    for place in [Place::Real, prime(2), prime(3)] {
        let w = local_witness(&g, &place).unwrap();
        assert!(check_witness(&g, &place, &w));
    }
    // x^3 z: the square class of x z; -x^3 z at the real place is positive
    // for x z < 0
    let g = q([0, -1, 0, 0, 0]);
    let w = local_witness(&g, &Place::Real).unwrap();
    assert!(check_witness(&g, &Place::Real, &w));
    // the zero form and typed errors
    assert!(local_witness(&q([0; 5]), &Place::Real).is_none());
    assert_eq!(try_local_witness(&q([0; 5]), &prime(3)).unwrap_err().kind(), &ErrorKind::Singular);
    assert_eq!(try_local_witness(&q([1, 0, 0, 0, 1]), &prime(15)).unwrap_err().kind(), &ErrorKind::InvalidValue);
    assert!(local_witness(&q([1, 0, 0, 0, 1]), &prime(1)).is_none());
}

#[test]
fn p_adic_squares_known_values() {
    // Serre, A Course in Arithmetic, II.3.3: units of Z_2 are squares iff
    // 1 mod 8; for odd p iff squares mod p.
    let p = Natural::from;
    for n in [1i64, 9, 17, -7, -15, 4 * 17, 64 * 41] {
        assert!(is_p_adic_square(&Integer::from(n), &p(2u32)), "{n}");
    }
    for n in [3i64, 5, 7, -1, 2, 8, 12] {
        assert!(!is_p_adic_square(&Integer::from(n), &p(2u32)), "{n}");
    }
    // -1 is a square in Q_p iff p = 1 mod 4 (Serre II.3.3, Theorem 3 corollary)
    for q in [5u32, 13, 17, 29] {
        assert!(is_p_adic_square(&Integer::from(-1), &p(q)));
    }
    for q in [3u32, 7, 11, 19] {
        assert!(!is_p_adic_square(&Integer::from(-1), &p(q)));
    }
    assert!(is_p_adic_square(&Integer::from(0), &p(3u32)));
    assert!(!is_p_adic_square(&Integer::from(4), &p(4u32)));
}

// ---------------------------------------------------------------------
// Laws on generated inputs.
// ---------------------------------------------------------------------

/// g(x + k z, z)
fn shear(g: &[Integer; 5], k: i64) -> [Integer; 5] {
    // write g = sum g_i x^(4-i) z^i; substitute x -> x + k z
    let k = Integer::from(k);
    let binom = [[1, 0, 0, 0, 0], [1, 1, 0, 0, 0], [1, 2, 1, 0, 0], [1, 3, 3, 1, 0], [1, 4, 6, 4, 1]];
    let mut out: [Integer; 5] = std::array::from_fn(|_| Integer::from(0));
    for i in 0..5 {
        // g_i (x + kz)^(4-i) z^i = g_i sum_j C(4-i, j) x^(4-i-j) (kz)^j z^i
        let d = 4 - i;
        for j in 0..=d {
            out[i + j] += &g[i] * Integer::from(binom[d][j]) * (&k).pow(j as u64);
        }
    }
    out
}

fn swap(g: &[Integer; 5]) -> [Integer; 5] {
    [g[4].clone(), g[3].clone(), g[2].clone(), g[1].clone(), g[0].clone()]
}

fn places() -> Vec<Place> {
    let mut v = vec![Place::Real];
    for p in [2u64, 3, 5, 7, 11, 13, 67, 1_000_003] {
        v.push(prime(p));
    }
    v
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]

    /// Every returned witness passes the independent check.
    #[test]
    fn witnesses_check(c in proptest::array::uniform5(-200i64..200), e in proptest::array::uniform5(0u32..3), b in 0usize..4) {
        let base = [2i64, 3, 5, 7][b];
        let g: [Integer; 5] = std::array::from_fn(|i| Integer::from(c[i]) * Integer::from(base).pow(u64::from(e[i])));
        prop_assume!(quartic_discriminant(&g) != 0u32);
        for place in places() {
            if let Some(w) = local_witness(&g, &place) {
                prop_assert!(check_witness(&g, &place, &w), "{:?} {:?} {:?}", g, place, w);
            }
        }
    }

    /// GL_2(Z) substitutions permute primitive pairs, so solubility is
    /// unchanged; so is multiplying g by a non-zero rational square.
    #[test]
    fn invariance_laws(c in proptest::array::uniform5(-60i64..60), k1 in -5i64..5, k2 in -5i64..5, u in 1i64..12) {
        let g = q(c);
        prop_assume!(quartic_discriminant(&g) != 0u32);
        let h = shear(&swap(&shear(&g, k1)), k2);
        let s: [Integer; 5] = g.clone().map(|x| x * Integer::from(u * u));
        for place in places() {
            let a = is_locally_soluble(&g, &place);
            prop_assert_eq!(a, is_locally_soluble(&h, &place), "{:?} vs {:?} at {:?}", g, h, place);
            prop_assert_eq!(a, is_locally_soluble(&s, &place), "{:?} times {}^2 at {:?}", g, u, place);
        }
    }

    /// Odd primes not dividing the discriminant never obstruct (Hasse-Weil
    /// bound and Hensel's lemma, see everywhere_locally_soluble).
    #[test]
    fn good_odd_primes_are_soluble(c in proptest::array::uniform5(-1000i64..1000)) {
        let g = q(c);
        let d = quartic_discriminant(&g);
        prop_assume!(d != 0u32);
        for p in [3u64, 5, 7, 11, 13, 17, 19, 23, 101, 65537] {
            if &d % Integer::from(p) != 0u32 {
                prop_assert!(is_locally_soluble(&g, &prime(p)), "{:?} at {}", g, p);
            }
        }
    }

    /// everywhere_locally_soluble agrees with the place-by-place answers.
    #[test]
    fn everywhere_matches_places(c in proptest::array::uniform5(-30i64..30)) {
        let g = q(c);
        prop_assume!(quartic_discriminant(&g) != 0u32);
        let ps: Vec<Natural> = [2u32, 3, 5, 7].map(Natural::from).to_vec();
        let all = everywhere_locally_soluble(&g, &ps);
        let first_bad = std::iter::once(Place::Real)
            .chain(ps.iter().cloned().map(Place::Prime))
            .find(|pl| !is_locally_soluble(&g, pl));
        match (all, first_bad) {
            (Ok(ws), None) => {
                prop_assert_eq!(ws.len(), 5);
                for (pl, w) in &ws {
                    prop_assert!(check_witness(&g, pl, w));
                }
            }
            (Err(pl), Some(bad)) => prop_assert_eq!(pl, bad),
            (a, b) => prop_assert!(false, "{:?} vs {:?}", a, b),
        }
    }
}

#[test]
fn witness_type_is_plain_data() {
    let w = LocalWitness { x: Integer::from(3), z: Integer::from(-2) };
    assert_eq!(w.clone(), w);
}
