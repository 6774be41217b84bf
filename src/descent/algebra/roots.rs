//! Roots of polynomials over `Q_p` and `R`, exactly.
//!
//! `Z_p`: the residues `r` of the roots modulo `p` (found in words by the
//! number-field module's F_p root finder), then for each one either a
//! simple root modulo `p` (one root of `Z_p` above it, by Hensel's lemma,
//! lifted by Newton's iteration) or the substitution `x = r + p t` with the
//! `p`-content removed, again (a loop over a stack of residue discs, not a
//! call recursion). For a separable polynomial the roots separate into
//! distinct residue discs after at most `v_p(Res(g, g'))` steps
//! (`depth_bound`), so the descent ends; a descent past 24 digits reruns on
//! the square-free part under that bound, so a repeated root cannot loop.
//! `Q_p`: roots of valuation `>= 0` from the polynomial cleared of
//! denominators, roots of negative valuation from the reversed polynomial
//! at `p t`. `R`: the number of real roots by a Sturm sequence.

use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{DivisibleBy, Lcm, ModInverse, Pow};
use malachite::base::num::logic::traits::SignificantBits;
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};
use std::cmp::Ordering;

fn pvalue(n: &Integer, p: &Natural) -> u32 {
    pvalue_capped(n, p, u32::MAX)
}

/// `min(v_p(n), cap)` (`cap` for `n = 0`): trailing zero bits at 2, else
/// by divisions by `p^(2^j)`, climbing then descending, so `O(log v)`
/// divisions of `n` rather than `v`.
pub(super) fn pvalue_capped(n: &Integer, p: &Natural, cap: u32) -> u32 {
    if *n == 0 {
        return cap;
    }
    if *p == 2u32 {
        // the number of trailing zero bits, without a division per bit
        return n.trailing_zeros().map_or(cap, |v| u32::try_from(v).unwrap_or(u32::MAX).min(cap));
    }
    let mut pows = vec![Integer::from(p.clone())];
    if cap == 0 || !n.divisible_by(&pows[0]) {
        return 0;
    }
    let mut m = n.clone();
    let mut v = 0u32;
    // climb: divide by p, p^2, p^4, ... while they divide
    loop {
        let j = pows.len() - 1;
        let step = 1u32 << j.min(31);
        if j >= 31 || v.saturating_add(step) > cap || !(&m).divisible_by(&pows[j]) {
            break;
        }
        m /= &pows[j];
        v += step;
        let sq = &pows[j] * &pows[j];
        if sq.significant_bits() > m.significant_bits() + 1 {
            break;
        }
        pows.push(sq);
    }
    // descend: the rest is below the last power tried, in binary
    for j in (0..pows.len()).rev() {
        let step = 1u32 << j;
        if v.saturating_add(step) <= cap && (&m).divisible_by(&pows[j]) {
            m /= &pows[j];
            v += step;
        }
    }
    v
}

fn eval(g: &[Integer], x: &Integer) -> Integer {
    g.iter().rev().fold(Integer::ZERO, |acc, c| acc * x + c)
}

fn derivative(g: &[Integer]) -> Vec<Integer> {
    g.iter().enumerate().skip(1).map(|(i, c)| Integer::from(i as u64) * c).collect()
}

/// `g(a + b t)` as a polynomial in `t`.
fn substitute(g: &[Integer], a: &Integer, b: &Integer) -> Vec<Integer> {
    let mut out: Vec<Integer> = vec![Integer::ZERO; g.len()];
    for c in g.iter().rev() {
        // out = out * (a + b t) + c
        let mut next = vec![Integer::ZERO; g.len()];
        for (i, o) in out.iter().enumerate() {
            if *o == 0 {
                continue;
            }
            next[i] += a * o;
            if i + 1 < next.len() {
                next[i + 1] += b * o;
            }
        }
        next[0] += c;
        out = next;
    }
    out
}

/// Divides out the largest power of `p` dividing every coefficient.
fn strip_content(g: &mut [Integer], p: &Natural) {
    // the smallest valuation, each coefficient counted only up to the least so far
    let mut v = u32::MAX;
    for c in g.iter().filter(|c| **c != 0) {
        v = pvalue_capped(c, p, v);
        if v == 0 {
            return;
        }
    }
    if v == u32::MAX {
        return;
    }
    if v > 0 {
        let pv = Integer::from(p.pow(u64::from(v)));
        for c in g.iter_mut() {
            *c /= &pv;
        }
    }
}

/// Lifts a simple root `r` of `g` modulo `p` to a root modulo `p^prec`.
fn newton(g: &[Integer], r: Integer, p: &Natural, prec: u32) -> Integer {
    let modulus = p.pow(u64::from(prec));
    let m = Integer::from(modulus.clone());
    let dg = derivative(g);
    let mut x = r;
    let mut known = 1u32;
    while known < prec {
        let d = Natural::try_from(eval(&dg, &x) % &m + &m).unwrap_or(Natural::ONE) % &modulus;
        let Some(inv) = d.mod_inverse(&modulus) else { break };
        x -= eval(g, &x) * Integer::from(inv);
        x %= &m;
        if x < 0 {
            x += &m;
        }
        known = known.saturating_mul(2);
    }
    x
}

/// Digit steps tried before the exact bound is computed: most descents end
/// within a few digits, and the bound costs a resultant.
const QUICK_DEPTH: u32 = 24;

/// The roots of `g` (integer coefficients, low degree first, not zero) in
/// `Z_p`, as approximations modulo `p^prec`; with `first`, stops at the
/// first root found. Each root is found once: when the descent goes deeper
/// than [`QUICK_DEPTH`] digits, a repeated factor of `g` is divided out
/// (the square-free part has the same roots) and the descent reruns under
/// the exact bound [`depth_bound`].
pub(super) fn integral_roots(g: &[Integer], p: &Natural, prec: u32, first: bool) -> Result<Vec<Integer>, Error> {
    let pw = u64::try_from(p).map_err(|_| Error::new(ErrorKind::TooLarge, "a prime of S above 2^64"))?;
    if pw >= 1 << 62 {
        return Err(Error::new(ErrorKind::TooLarge, "a prime of S above 2^62"));
    }
    let mut g = g.to_vec();
    while g.last() == Some(&Integer::ZERO) {
        g.pop();
    }
    if g.len() < 2 {
        return Ok(Vec::new()); // a non-zero constant (or zero, refused by the callers)
    }
    strip_content(&mut g, p);
    if let Some(found) = descend(g.clone(), p, pw, prec, first, QUICK_DEPTH) {
        return Ok(found);
    }
    let (g, cap) = match depth_bound(&g, p) {
        Some(cap) => (g, cap),
        None => {
            let mut h = squarefree_part(&g);
            strip_content(&mut h, p);
            let cap = depth_bound(&h, p).ok_or_else(|| Error::internal("the algebra descent", "the square-free part has a repeated root"))?;
            (h, cap)
        }
    };
    descend(g, p, pw, prec, first, cap).ok_or_else(|| {
        Error::internal("the algebra descent", format!("the p-adic root descent passed its bound of {cap} digits"))
    })
}

/// The largest number of digit steps the descent can take on `g`
/// (separable, integral, content stripped): if the residue disc
/// `x = x0 (mod p^(d+1))` still holds two roots of `g` (counted in an
/// algebraic closure), then `v(g(x0)) >= 2 (d + 1)` and
/// `v(g'(x0)) >= d + 1` (Gauss's lemma bounds the roots of negative
/// valuation by the leading coefficient), while `A g + B g' = Res(g, g')`
/// with `A, B` integral; so `d + 1 <= v_p(Res(g, g'))`, and
/// `Res(g, g') = +- lead(g) disc(g)`.
/// `None` when `g` has a repeated root (the resultant vanishes).
fn depth_bound(g: &[Integer], p: &Natural) -> Option<u32> {
    let q: Vec<Rational> = g.iter().map(|c| Rational::from(c.clone())).collect();
    let dq: Vec<Rational> = q.iter().enumerate().skip(1).map(|(i, c)| Rational::from(i as u64) * c).collect();
    match Integer::try_from(resultant(&q, &dq)) {
        Ok(r) if r != 0 => Some(pvalue(&r, p).saturating_add(1)),
        _ => None,
    }
}

/// Work items of the digit descent: the roots of `g` (coefficients low
/// degree first) give the roots `base + scale t` of the original polynomial,
/// known modulo `p^prec` relative to `t`.
struct Disc {
    g: Vec<Integer>,
    base: Integer,
    scale: Integer,
    prec: u32,
    depth: u32,
}

/// The digit descent as a loop over a stack of residue discs, depth first
/// (children pushed in reverse so the roots come out in increasing digits);
/// `None` when a disc lies deeper than `cap` digits.
fn descend(g: Vec<Integer>, p: &Natural, pw: u64, prec: u32, first: bool, cap: u32) -> Option<Vec<Integer>> {
    let pi = Integer::from(p.clone());
    let mut out = Vec::new();
    let mut stack = vec![Disc { g, base: Integer::ZERO, scale: Integer::ONE, prec, depth: 0 }];
    while let Some(Disc { g, base, scale, prec, depth }) = stack.pop() {
        if depth > cap {
            return None;
        }
        let words: Vec<u64> = g
            .iter()
            .map(|c| {
                let r = c % &pi;
                let r = if r < 0 { r + &pi } else { r };
                u64::try_from(&r).unwrap_or(0)
            })
            .collect();
        if words.iter().skip(1).all(|&w| w == 0) {
            continue; // a non-zero constant modulo p
        }
        let dg = derivative(&g);
        let mut children = Vec::new();
        for r in crate::numfield::fp::roots(&words, pw) {
            let r = Integer::from(r);
            if !eval(&dg, &r).divisible_by(&pi) {
                let t = if prec > 0 { newton(&g, r, p, prec) } else { r };
                out.push(&base + &scale * t);
                if first {
                    return Some(out);
                }
            } else {
                let mut h = substitute(&g, &r, &pi);
                strip_content(&mut h, p);
                children.push(Disc { g: h, base: &base + &scale * &r, scale: &scale * &pi, prec: prec.saturating_sub(1), depth: depth + 1 });
            }
        }
        stack.extend(children.into_iter().rev());
    }
    Some(out)
}

/// `g / gcd(g, g')` with integer coefficients (primitive over Z up to sign),
/// low degree first; `g` itself when it is separable.
fn squarefree_part(g: &[Integer]) -> Vec<Integer> {
    let mut q: Vec<Rational> = g.iter().map(|c| Rational::from(c.clone())).collect();
    trim(&mut q);
    if q.len() <= 2 {
        return g.iter().take(q.len()).cloned().collect();
    }
    let dq: Vec<Rational> = q.iter().enumerate().skip(1).map(|(i, c)| Rational::from(i as u64) * c).collect();
    let d = gcd(&q, &dq);
    if d.len() <= 1 {
        let mut out = g.to_vec();
        out.truncate(q.len());
        return out;
    }
    let quot = quotient(&q, &d);
    // clear denominators and the content
    let den = quot.iter().fold(Natural::ONE, |l, c| l.lcm(c.denominator_ref()));
    let ints: Vec<Integer> = quot.iter().map(|c| Integer::try_from(c * Rational::from(den.clone())).unwrap_or(Integer::ZERO)).collect();
    let content = ints.iter().fold(Natural::ZERO, |acc, c| malachite::base::num::arithmetic::traits::Gcd::gcd(acc, c.unsigned_abs_ref()));
    if content > 1u32 {
        let c = Integer::from(content);
        ints.into_iter().map(|x| x / &c).collect()
    } else {
        ints
    }
}

/// The monic greatest common divisor over Q (empty for two zeros).
fn gcd(a: &[Rational], b: &[Rational]) -> Vec<Rational> {
    let (mut a, mut b) = (a.to_vec(), b.to_vec());
    trim(&mut a);
    trim(&mut b);
    while !b.is_empty() {
        let r = remainder(&a, &b);
        a = std::mem::replace(&mut b, r);
    }
    if let Some(l) = a.last().cloned() {
        for c in a.iter_mut() {
            *c /= &l;
        }
    }
    a
}

/// The exact quotient `a / b` (`b` not zero, dividing `a`).
fn quotient(a: &[Rational], b: &[Rational]) -> Vec<Rational> {
    let mut r = a.to_vec();
    trim(&mut r);
    let lead = b.last().cloned().unwrap_or(Rational::ONE);
    if r.len() < b.len() {
        return vec![];
    }
    let mut q = vec![Rational::ZERO; r.len() - b.len() + 1];
    while r.len() >= b.len() && !r.is_empty() {
        let c = r.last().cloned().unwrap_or(Rational::ZERO) / &lead;
        let shift = r.len() - b.len();
        for (i, x) in b.iter().enumerate() {
            r[shift + i] -= &c * x;
        }
        q[shift] = c;
        r.pop();
        trim(&mut r);
    }
    q
}

/// The resultant of two polynomials over Q (low degree first, not zero), by
/// Euclid: `Res(a, b) = (-1)^(deg a deg b) lead(b)^(deg a - deg r) Res(b, r)`
/// with `r = a mod b`; zero when they share a factor.
fn resultant(a: &[Rational], b: &[Rational]) -> Rational {
    let (mut a, mut b) = (a.to_vec(), b.to_vec());
    trim(&mut a);
    trim(&mut b);
    let mut acc = Rational::ONE;
    loop {
        if a.is_empty() || b.is_empty() {
            return Rational::ZERO;
        }
        let (da, db) = (a.len() - 1, b.len() - 1);
        if db == 0 {
            return acc * b[0].clone().pow(da as u64);
        }
        if da < db {
            if da * db % 2 == 1 {
                acc = -acc;
            }
            std::mem::swap(&mut a, &mut b);
            continue;
        }
        let r = remainder(&a, &b);
        if r.is_empty() {
            return Rational::ZERO;
        }
        let dr = r.len() - 1;
        if da * db % 2 == 1 {
            acc = -acc;
        }
        acc *= b[db].clone().pow((da - dr) as u64);
        a = std::mem::replace(&mut b, r);
    }
}

/// Whether `g` (rational coefficients, low degree first, separable, of
/// degree at least 1) has a root in `Q_p`.
pub(super) fn has_root_in_qp(g: &[Rational], p: &Natural) -> Result<bool, Error> {
    let den = g.iter().fold(Natural::ONE, |l, c| l.lcm(c.denominator_ref()));
    let ints: Vec<Integer> = g
        .iter()
        .map(|c| Integer::try_from(c * Rational::from(den.clone())).map_err(|_| Error::internal("the algebra descent", "a denominator left after clearing")))
        .collect::<Result<_, _>>()?;
    if !integral_roots(&ints, p, 0, true)?.is_empty() {
        return Ok(true);
    }
    // roots of negative valuation: x = 1/t, t in p Z_p, t = p u
    let mut rev: Vec<Integer> = ints.iter().rev().cloned().collect();
    while rev.last() == Some(&Integer::ZERO) {
        rev.pop();
    }
    let rev = substitute(&rev, &Integer::ZERO, &Integer::from(p.clone()));
    Ok(!integral_roots(&rev, p, 0, true)?.is_empty())
}

fn trim(f: &mut Vec<Rational>) {
    while f.last() == Some(&Rational::ZERO) {
        f.pop();
    }
}

/// The remainder of `a` by `b` (`b` not zero).
fn remainder(a: &[Rational], b: &[Rational]) -> Vec<Rational> {
    let mut r = a.to_vec();
    trim(&mut r);
    let lead = b.last().cloned().unwrap_or(Rational::ONE);
    while r.len() >= b.len() && !r.is_empty() {
        let q = r.last().cloned().unwrap_or(Rational::ZERO) / &lead;
        let shift = r.len() - b.len();
        for (i, c) in b.iter().enumerate() {
            r[shift + i] -= &q * c;
        }
        r.pop();
        trim(&mut r);
    }
    r
}

/// The number of distinct real roots of `g` (rational coefficients, low
/// degree first, not zero), by Sturm's theorem.
pub(super) fn real_root_count(g: &[Rational]) -> usize {
    let mut seq: Vec<Vec<Rational>> = vec![g.to_vec()];
    trim(&mut seq[0]);
    let d: Vec<Rational> = seq[0].iter().enumerate().skip(1).map(|(i, c)| Rational::from(i as u64) * c).collect();
    seq.push(d);
    trim(&mut seq[1]);
    while !seq.last().is_some_and(|l| l.is_empty()) {
        let n = seq.len();
        let r: Vec<Rational> = remainder(&seq[n - 2], &seq[n - 1]).into_iter().map(|c| -c).collect();
        seq.push(r);
    }
    seq.pop();
    let changes = |at_plus: bool| -> usize {
        let signs: Vec<Ordering> = seq
            .iter()
            .filter_map(|f| {
                let lead = f.last()?;
                let s = lead.cmp(&Rational::ZERO);
                Some(if !at_plus && (f.len() - 1) % 2 == 1 { s.reverse() } else { s })
            })
            .filter(|s| *s != Ordering::Equal)
            .collect();
        signs.windows(2).filter(|w| w[0] != w[1]).count()
    };
    changes(false).saturating_sub(changes(true))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn ints(v: &[i64]) -> Vec<Integer> {
        v.iter().map(|&c| Integer::from(c)).collect()
    }

    #[test]
    fn roots_against_brute_force() {
        // x^3 - x = x(x-1)(x+1): three roots in every Z_p; x^2 - 2: roots in Z_7 (3^2 = 2 mod 7), none in Z_5;
        // x^2 - 17: a root in Z_2 (17 = 1 mod 8); x^2 - 5: none in Z_2; x^2 - 9*7: none in Q_7 (odd valuation)
        let seven = Natural::from(7u32);
        assert_eq!(integral_roots(&ints(&[0, -1, 0, 1]), &seven, 5, false).unwrap().len(), 3);
        assert_eq!(integral_roots(&ints(&[-2, 0, 1]), &seven, 5, false).unwrap().len(), 2);
        assert!(integral_roots(&ints(&[-2, 0, 1]), &Natural::from(5u32), 5, false).unwrap().is_empty());
        assert_eq!(integral_roots(&ints(&[-17, 0, 1]), &Natural::from(2u32), 8, false).unwrap().len(), 2);
        assert!(integral_roots(&ints(&[-5, 0, 1]), &Natural::from(2u32), 8, false).unwrap().is_empty());
        assert!(integral_roots(&ints(&[-63, 0, 1]), &seven, 8, false).unwrap().is_empty());
        // the lifted roots are roots modulo p^prec
        let g = ints(&[-2, 0, 1]);
        for r in integral_roots(&g, &seven, 9, false).unwrap() {
            assert_eq!(eval(&g, &r) % Integer::from(7i64.pow(9)), 0);
        }
        // 1/7 is a root of 7x - 1, of negative valuation
        let q = [Rational::from(-1), Rational::from(7)];
        assert!(has_root_in_qp(&q, &seven).unwrap());
        // brute force: x^3 + a x + b has a root in Z_p iff one modulo p^6 lifts (p = 3, 5), checked below p^6
        for p in [3i64, 5] {
            let m = p.pow(6);
            for a in -6i64..6 {
                for b in -6i64..6 {
                    let disc = -4 * a * a * a - 27 * b * b;
                    if disc == 0 || disc % p == 0 {
                        continue; // the brute force is exact for p not dividing the discriminant
                    }
                    let brute = (0..p).filter(|x| (x * x * x + a * x + b).rem_euclid(p) == 0).count();
                    let found = integral_roots(&ints(&[b, a, 0, 1]), &Natural::from(p as u64), 6, false).unwrap();
                    assert_eq!(found.len(), brute, "p = {p}, a = {a}, b = {b}");
                    for r in found {
                        assert_eq!((eval(&ints(&[b, a, 0, 1]), &r)) % Integer::from(m), 0);
                    }
                }
            }
        }
    }

    /// The capped valuation against repeated division (p = 3, 5, 47 and
    /// 2; n = p^v u with u prime to p).
    #[test]
    fn capped_valuations() {
        for p in [2u64, 3, 5, 47] {
            let pn = Natural::from(p);
            for v in [0u32, 1, 2, 3, 7, 8, 63, 64, 65, 1000] {
                for u in [1i64, -7, 1_000_003] {
                    if u % p as i64 == 0 {
                        continue;
                    }
                    let n = Integer::from(pn.clone().pow(u64::from(v))) * Integer::from(u);
                    assert_eq!(pvalue_capped(&n, &pn, u32::MAX), v, "p = {p}, v = {v}");
                    for cap in [0u32, 1, 5, 64, 999] {
                        assert_eq!(pvalue_capped(&n, &pn, cap), v.min(cap), "p = {p}, v = {v}, cap = {cap}");
                    }
                }
            }
        }
    }

    /// The product of `x - r` over `rs`, low degree first.
    fn from_roots(rs: &[Integer]) -> Vec<Integer> {
        let mut g = vec![Integer::ONE];
        for r in rs {
            let mut next = vec![Integer::ZERO; g.len() + 1];
            for (i, c) in g.iter().enumerate() {
                next[i + 1] += c;
                next[i] -= c * r;
            }
            g = next;
        }
        g
    }

    /// Roots built to agree in many 2-adic (and 3-adic) digits: the descent
    /// must separate them (the pair `a`, `a + 2^k u` needs `k` digit steps,
    /// within the bound `v_2(Res(g, g'))`), find each once, and not grow
    /// the call stack with `k` (k = 3000 ran past the old depth cap and,
    /// as a recursion, past the stack). Known answers by construction.
    #[test]
    fn roots_agreeing_in_many_digits() {
        for p in [2u64, 3] {
            let pn = Natural::from(p);
            let pi = Integer::from(p);
            for k in [1u64, 5, 60, 400, 3000] {
                let a = Integer::from(12345);
                let close = &a + pi.clone().pow(k) * Integer::from(7);
                let b = Integer::from(-98765);
                let g = from_roots(&[a.clone(), close.clone(), b.clone()]);
                let prec = 40u32;
                let m = Integer::from(pn.clone().pow(u64::from(prec)));
                let md = |r: &Integer| {
                    let x = r % &m;
                    if x < 0 {
                        x + &m
                    } else {
                        x
                    }
                };
                let mut found: Vec<Integer> = integral_roots(&g, &pn, prec, false).unwrap().iter().map(md).collect();
                found.sort();
                let mut want: Vec<Integer> = [a.clone(), close.clone(), b.clone()].iter().map(md).collect();
                want.sort();
                assert_eq!(found, want, "p = {p}, k = {k}");
                // a repeated root counts once: (x - a)^2 (x - close) (x - b)
                let g2 = from_roots(&[a.clone(), a.clone(), close.clone(), b.clone()]);
                assert_eq!(integral_roots(&g2, &pn, prec, false).unwrap().len(), 3, "p = {p}, k = {k}");
                // the quadratic x^2 - 2^(2k) 17 (roots +-2^k sqrt 17 in Z_2), and x^2 - 2^(2k+1) (none)
                if p == 2 {
                    let c = Integer::from(2).pow(2 * k);
                    assert_eq!(integral_roots(&[-(&c * Integer::from(17)), Integer::ZERO, Integer::ONE], &pn, 8, false).unwrap().len(), 2);
                    assert!(integral_roots(&[-(&c * Integer::from(2)), Integer::ZERO, Integer::ONE], &pn, 8, false).unwrap().is_empty());
                    assert!(has_root_in_qp(&[Rational::from(-(&c * Integer::from(17))), Rational::ZERO, Rational::ONE], &pn).unwrap());
                }
            }
        }
    }

    /// The resultant against hand computations: `Res(g, g') =
    /// (-1)^(n(n-1)/2) lead(g) disc(g)`, disc(x^2 - 5) = 20, disc(x^3 - x) = 4;
    /// zero for a repeated root; the square-free part keeps each root once.
    #[test]
    fn resultant_and_squarefree_part() {
        let q = |v: &[i64]| v.iter().map(|&c| Rational::from(c)).collect::<Vec<_>>();
        // g = x^2 - 5: g' = 2x; Res = lead(g')^2 g(0) ... = 4 * (-5) = -20 = -disc
        assert_eq!(resultant(&q(&[-5, 0, 1]), &q(&[0, 2])), Rational::from(-20));
        // x^3 - x: disc 4; Res(g, g') = (-1)^(3*2/2) * 1 * 4 = -4
        assert_eq!(resultant(&q(&[0, -1, 0, 1]), &q(&[-1, 0, 3])), Rational::from(-4));
        assert_eq!(resultant(&q(&[1, -2, 1]), &q(&[-2, 2])), Rational::ZERO);
        // (x - 1)^2 (x + 2) -> (x - 1)(x + 2) up to sign
        let sf = squarefree_part(&ints(&[2, -3, 0, 1]));
        assert_eq!(sf.len(), 3);
        assert_eq!(eval(&sf, &Integer::from(1)), 0);
        assert_eq!(eval(&sf, &Integer::from(-2)), 0);
    }

    #[test]
    fn sturm_counts() {
        let q = |v: &[i64]| v.iter().map(|&c| Rational::from(c)).collect::<Vec<_>>();
        assert_eq!(real_root_count(&q(&[0, -1, 0, 1])), 3);
        assert_eq!(real_root_count(&q(&[1, 0, 1])), 0);
        assert_eq!(real_root_count(&q(&[-2, 0, 0, 0, 1])), 2);
        assert_eq!(real_root_count(&q(&[2, 0, 0, 0, 1])), 0);
        assert_eq!(real_root_count(&q(&[-1, 0, 0, 1])), 1);
    }
}
