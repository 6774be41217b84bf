//! Local root numbers at 2 and 3 carried over from an auxiliary curve.
//!
//! The local root number `w_p(E)` depends only on `E` over `Q_p` up to
//! isomorphism (it is the root number of the Weil–Deligne representation of
//! `E / Q_p`). So if a curve `E'` over Q is isomorphic to `E` over `Q_p` for
//! every prime `p` of the set `U ⊂ {2, 3}` where the local formulas leave
//! `w_p(E)` open, then `∏_{p∈U} w_p(E) = ∏_{p∈U} w_p(E')`, and the latter
//! product follows from the global root number of `E'` and its other local
//! root numbers (all of which the local formulas must give; a candidate
//! where they do not is passed over):
//! `∏_{p∈U} w_p(E') = -w(E') / ∏_{p∉U} w_p(E')`. When `E'` has a much
//! smaller conductor than `E`, its global root number is proven by the test
//! of the functional equation ([`super::numeric`]) where that of `E` is out
//! of reach. The auxiliary curve is a twist of `E` by a class that is
//! trivial at the primes of `U`:
//!
//! * any `j`: the quadratic twist `E^d` by an integer `d` that is a square in
//!   `Q_p` for `p ∈ U` (`d ≡ 1 mod 8` at 2, `d ≡ 1 mod 3` at 3, so
//!   `d ≡ 1 mod 24` when both are open), `±` a product of additive primes
//!   `q ≥ 5` of `E` (twisting by `q` turns type `I0*` into good and `In*`
//!   into `In` reduction) and at most one extra prime that fixes the class;
//!   the prime of `{2, 3}` outside `U` may enter `d`. The few best candidates
//!   by an estimate are set up exactly and the smallest conductor wins;
//! * `j = 0`: `E ≅ y^2 = x^3 + k` and `y^2 = x^3 + k'` with `k'/k` a sixth
//!   power in `Q_2` and `Q_3` (unit parts congruent modulo 72: the sixth
//!   powers of units are `1 + 8Z_2` and `1 + 9Z_3`);
//! * `j = 1728`: `E ≅ y^2 = x^3 + A x` and `y^2 = x^3 + A' x` with `A'/A` a
//!   fourth power in `Q_2` and `Q_3` (unit parts congruent modulo 48: the
//!   fourth powers of units are `1 + 16Z_2` and `1 + 3Z_3`).
//!
//! In each case `E'` becomes isomorphic to `E` over `Q_p(sqrt d)`,
//! `Q_p(k'/k)^{1/6}` or `Q_p((A'/A)^{1/4})`, which is `Q_p` itself
//! (Silverman, *The Arithmetic of Elliptic Curves*, X.5: twists are
//! classified by `H^1(G, Aut E)`, which is `Q^*/Q^*2`, `Q^*/Q^*6` or
//! `Q^*/Q^*4` in the three cases). This replaces, for the curves it
//! reaches, the published tables for the wildly ramified cases (which are
//! not reproduced here): the method is our own reduction, a proof given the
//! modularity theorem like the functional-equation test it rests on. It
//! cannot reach every curve: a twist leaves the multiplicative primes of
//! `E` in the conductor (`v_q(j) < 0` is twist-invariant), and a curve over
//! Q isomorphic to `E` over `Q_p` has the same `j`, so it is a twist.

use super::{internal, local_sign, Setup};
use crate::arith::{valuation, FactorLimits};
use crate::curve::Curve;
use crate::error::Error;
use crate::local::{Kodaira, Reduction};
use malachite::base::num::arithmetic::traits::{Mod, Pow};
use malachite::{Integer, Natural};

/// Extra primes (prime to 6) that may be thrown into `d` to reach the class
/// `1 mod 24` (or `1 mod 8`, `1 mod 3`); together with ±1 they cover every unit class mod 24.
const EXTRA: [u64; 8] = [5, 7, 11, 13, 17, 19, 23, 29];

/// At most this many additive primes are tried in the quadratic case.
const MAX_CHOICE: usize = 12;

/// An auxiliary curve isomorphic to the curve of `setup` over `Q_2` and
/// `Q_3`, with a smaller conductor, with its own set-up; `None` when no
/// twist of the kinds above lowers the conductor.
pub(crate) fn auxiliary(setup: &Setup, unknown: &[Natural], limits: &FactorLimits) -> Result<Option<Setup>, Error> {
    let e = &setup.minimal;
    let c4 = e.c4();
    let c6 = e.c6();
    let zero = Integer::from(0);
    let bad: Vec<Natural> = setup.bad.iter().map(|(p, _, _)| p.clone()).collect();
    // candidates: (coefficients a4, a6 of a short model, extra primes of its discriminant)
    let mut cands: Vec<(Integer, Integer, Vec<Natural>)> = Vec::new();
    if *c4 == 0u32 {
        // j = 0: E ≅ y^2 = x^3 + k with k = -54 c6; the discriminant
        // -432 k'^2 is small: its primes by trial division
        let k2 = reduce_class(&(Integer::from(-54) * c6), 6, 72);
        let ps = small_prime_factors(&k2);
        cands.push((zero.clone(), k2, ps));
    } else if *c6 == 0u32 {
        // j = 1728: E ≅ y^2 = x^3 + A x with A = -27 c4
        let a2 = reduce_class(&(Integer::from(-27) * c4), 4, 48);
        let ps = small_prime_factors(&a2);
        cands.push((a2, zero.clone(), ps));
    }
    // quadratic twists (for every j): the discriminant is 6^12 d^6 Δ, so its
    // primes are the bad primes, 2, 3 and those of d
    for (d, d_primes) in twist_candidates(setup, unknown) {
        let a4 = Integer::from(-27) * (&d).pow(2) * c4;
        let a6 = Integer::from(-54) * (&d).pow(3) * c6;
        cands.push((a4, a6, d_primes.into_iter().map(Natural::from).collect()));
    }
    // each candidate is set up exactly; the smallest conductor among the
    // usable ones wins
    let mut best: Option<Setup> = None;
    for (a4, a6, extra) in cands {
        if limits.deadline.is_some_and(|t| std::time::Instant::now() >= t) {
            break;
        }
        let aux = Curve::new([zero.clone(), zero.clone(), zero.clone(), a4, a6])
            .map_err(|_| internal("the auxiliary twist is singular"))?;
        let mut ps = bad.clone();
        ps.extend(extra);
        ps.push(Natural::from(2u32));
        ps.push(Natural::from(3u32));
        ps.sort();
        ps.dedup();
        let aux_setup = Setup::with_primes(&aux, &ps)?;
        if aux_setup.conductor >= setup.conductor || !usable(&aux_setup, unknown)? {
            continue;
        }
        if best.as_ref().is_none_or(|b| aux_setup.conductor < b.conductor) {
            best = Some(aux_setup);
        }
    }
    Ok(best)
}

/// Whether the local formulas know every local root number of the
/// auxiliary curve outside the unknown primes (a twist that is not trivial
/// at a known prime among 2 and 3 may turn it wild there).
fn usable(aux: &Setup, unknown: &[Natural]) -> Result<bool, Error> {
    for (p, model, data) in &aux.bad {
        if unknown.contains(p) {
            continue;
        }
        if local_sign(model, data)?.is_none() {
            return Ok(false);
        }
    }
    Ok(true)
}

/// `x = ± 2^a 3^b m` (m prime to 6) replaced by `2^(a mod n) 3^(b mod n) m'`
/// with `m' ≡ ±m (mod modulus)` of least absolute value.
fn reduce_class(x: &Integer, n: u32, modulus: i64) -> Integer {
    let two = Natural::from(2u32);
    let three = Natural::from(3u32);
    let a = valuation(x, &two).unwrap_or(0);
    let b = valuation(x, &three).unwrap_or(0);
    let unit = x / (Integer::from(2).pow(u64::from(a)) * Integer::from(3).pow(u64::from(b)));
    // invariant: a residue modulo an i64 modulus lies in [0, modulus), so it fits an i64
    let r = i64::try_from(&unit.mod_op(Integer::from(modulus))).expect("a residue fits");
    let m = if r > modulus / 2 { r - modulus } else { r };
    Integer::from(2).pow(u64::from(a % n)) * Integer::from(3).pow(u64::from(b % n)) * Integer::from(m)
}

/// The prime factors of a small non-zero integer (`|m| < 2^64`, trial division).
fn small_prime_factors(m: &Integer) -> Vec<Natural> {
    let mut n = u64::try_from(&malachite::base::num::arithmetic::traits::UnsignedAbs::unsigned_abs(m)).unwrap_or(0);
    let mut out = Vec::new();
    let mut p = 2u64;
    while n > 1 && p * p <= n {
        if n % p == 0 {
            out.push(Natural::from(p));
            while n % p == 0 {
                n /= p;
            }
        }
        p += 1;
    }
    if n > 1 {
        out.push(Natural::from(n));
    }
    out
}

/// How many candidate twists (best estimates first) are set up exactly.
const CANDIDATES: usize = 6;

/// Candidate integers `d`, each a square in `Q_p` for every unknown prime
/// `p` (`d ≡ 1 mod 8` for 2, `d ≡ 1 mod 3` for 3, so `d ≡ 1 mod 24` when both
/// are unknown), for which the twist `E^d` may have a smaller conductor than
/// `E`, best estimate first, with their primes. `d` is `±` a product of
/// additive primes `q >= 5` of `E` (twisting by `q` turns type `I0*` into good
/// and `In*` into `In` reduction) and at most one extra prime `r` that fixes
/// the residue class (estimated cost `r^2`); when only one of 2 and 3 is
/// unknown, the other may enter `d` (its reduction then changes, and the
/// exact set-up decides whether that pays).
fn twist_candidates(setup: &Setup, unknown: &[Natural]) -> Vec<(Integer, Vec<u64>)> {
    let need2 = unknown.iter().any(|p| *p == 2u32);
    let need3 = unknown.iter().any(|p| *p == 3u32);
    let modulus: u64 = match (need2, need3) {
        (true, true) => 24,
        (true, false) => 8,
        (false, true) => 3,
        (false, false) => return vec![],
    };
    // additive primes q >= 5 with the change of log N when twisting by q
    let mut choice: Vec<(u64, f64)> = setup
        .bad
        .iter()
        .filter(|(_, _, d)| d.reduction == Reduction::Additive)
        .filter_map(|(p, _, d)| {
            let q = u64::try_from(p).ok().filter(|&q| q >= 5)?;
            let gain = match d.kodaira {
                Kodaira::I0Star => -2.0,
                Kodaira::InStar(_) => -1.0,
                _ => 0.0,
            };
            Some((q, gain * (q as f64).ln()))
        })
        .collect();
    choice.sort_by(|x, y| x.1.total_cmp(&y.1));
    choice.truncate(MAX_CHOICE);
    let bad: Vec<u64> = setup.bad.iter().filter_map(|(p, _, _)| u64::try_from(p).ok()).collect();
    let mut extras: Vec<u64> = EXTRA.iter().copied().filter(|r| !bad.contains(r)).collect();
    if !need2 {
        extras.insert(0, 2);
    }
    if !need3 {
        extras.insert(0, 3);
    }
    // (estimate, mask, sign, extra)
    let mut all: Vec<(f64, u32, i8, u64)> = Vec::new();
    for mask in 0u32..(1 << choice.len()) {
        let mut res = 1u64;
        let mut cost = 0.0;
        for (i, (q, g)) in choice.iter().enumerate() {
            if mask >> i & 1 == 1 {
                res = res * (q % modulus) % modulus;
                cost += g;
            }
        }
        for sign in [1i8, -1] {
            let base = if sign == 1 { res } else { (modulus - res) % modulus };
            for r in std::iter::once(1u64).chain(extras.iter().copied()) {
                if base * (r % modulus) % modulus != 1 % modulus {
                    continue;
                }
                let c = cost + if r == 1 { 0.0 } else { 2.0 * (r as f64).ln() };
                if c < -1e-9 {
                    all.push((c, mask, sign, r));
                }
            }
        }
    }
    all.sort_by(|x, y| x.0.total_cmp(&y.0));
    let mut out: Vec<(Integer, Vec<u64>)> = Vec::new();
    for (_, mask, sign, r) in all {
        if out.len() >= CANDIDATES {
            break;
        }
        let mut d = Integer::from(sign) * Integer::from(r);
        let mut d_primes = if r == 1 { vec![] } else { vec![r] };
        for (i, (q, _)) in choice.iter().enumerate() {
            if mask >> i & 1 == 1 {
                d *= Integer::from(*q);
                d_primes.push(*q);
            }
        }
        if d == 1u32 || out.iter().any(|(x, _)| *x == d) {
            continue;
        }
        debug_assert!((&d).mod_op(Integer::from(modulus)) == 1u32 % modulus as u32);
        out.push((d, d_primes));
    }
    out
}

/// The product `w_2 w_3` over the primes of `unknown` (a subset of {2, 3})
/// of the curve of `setup`, from the auxiliary curve `aux` and its proven
/// global root number `w_aux`. Checks that the auxiliary curve has the same
/// reduction data at 2 and 3 and that the local formulas know the same
/// primes there.
pub(crate) fn unknown_product(setup: &Setup, aux: &Setup, unknown: &[Natural], w_aux: i8) -> Result<i8, Error> {
    for (p, _, _) in &setup.bad {
        if unknown.contains(p) && !aux.bad.iter().any(|(q, _, _)| q == p) {
            return Err(internal(&format!("the auxiliary curve has good reduction at {p}, though isomorphic there")));
        }
    }
    let mut known: i8 = 1;
    for (p, model, data) in &aux.bad {
        let small = unknown.contains(p);
        if small {
            let mine = setup.bad.iter().find(|(q, _, _)| q == p).map(|(_, _, d)| (d.conductor_exponent, d.kodaira));
            if mine != Some((data.conductor_exponent, data.kodaira)) {
                return Err(internal(&format!("the auxiliary curve differs from the curve at {p}, though isomorphic there")));
            }
        }
        match local_sign(model, data)? {
            Some(s) if small && unknown.contains(p) => {
                return Err(internal(&format!("the local formulas know w_{p} = {s} on the auxiliary curve only")))
            }
            Some(s) => known *= s,
            None if small && unknown.contains(p) => {}
            None => return Err(internal(&format!("no local root number at {p} on the auxiliary curve"))),
        }
    }
    Ok(-w_aux * known)
}
