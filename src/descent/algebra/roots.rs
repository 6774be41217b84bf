//! Roots of separable polynomials over `Q_p` and `R`, exactly.
//!
//! `Z_p`: the residues `r` of the roots modulo `p` (found in words by the
//! number-field module's F_p root finder), then for each one either a
//! simple root modulo `p` (one root of `Z_p` above it, by Hensel's lemma,
//! lifted by Newton's iteration) or the substitution `x = r + p t` with the
//! `p`-content removed, recursively. For a separable polynomial the roots
//! separate into distinct residue discs after at most about `v_p(disc)`
//! steps, so the recursion ends (a depth cap turns a runaway into an error).
//! `Q_p`: roots of valuation `>= 0` from the polynomial cleared of
//! denominators, roots of negative valuation from the reversed polynomial
//! at `p t`. `R`: the number of real roots by a Sturm sequence.

use crate::arith::valuation;
use crate::error::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{DivisibleBy, Lcm, ModInverse, Pow};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};
use std::cmp::Ordering;

/// How deep the digit recursion may go before it is called a runaway.
const MAX_DEPTH: u32 = 400;

fn pvalue(n: &Integer, p: &Natural) -> u32 {
    if *p == 2u32 {
        // the number of trailing zero bits, without a division per bit
        return n.trailing_zeros().map_or(u32::MAX, |v| u32::try_from(v).unwrap_or(u32::MAX));
    }
    valuation(n, p).unwrap_or(u32::MAX)
}

/// `min(v_p(n), cap)` by at most `cap` divisions (`cap` for `n = 0`).
fn pvalue_capped(n: &Integer, p: &Natural, cap: u32) -> u32 {
    if *n == 0 {
        return cap;
    }
    if *p == 2u32 {
        return pvalue(n, p).min(cap);
    }
    let pi = Integer::from(p.clone());
    let mut m = n.clone();
    let mut v = 0;
    while v < cap && (&m).divisible_by(&pi) {
        m /= &pi;
        v += 1;
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

/// The roots of `g` (integer coefficients, low degree first, separable,
/// not zero) in `Z_p`, as approximations modulo `p^prec`; with `first`,
/// stops at the first root found.
pub(super) fn integral_roots(g: &[Integer], p: &Natural, prec: u32, first: bool) -> Result<Vec<Integer>, Error> {
    let pw = u64::try_from(p).map_err(|_| Error::new(ErrorKind::TooLarge, "a prime of S above 2^64"))?;
    if pw >= 1 << 62 {
        return Err(Error::new(ErrorKind::TooLarge, "a prime of S above 2^62"));
    }
    let mut out = Vec::new();
    let mut g = g.to_vec();
    strip_content(&mut g, p);
    descend(&g, p, pw, prec, first, 0, &mut out)?;
    Ok(out)
}

fn descend(g: &[Integer], p: &Natural, pw: u64, prec: u32, first: bool, depth: u32, out: &mut Vec<Integer>) -> Result<(), Error> {
    if depth > MAX_DEPTH {
        return Err(Error::internal("the algebra descent", "the p-adic root recursion did not separate the roots"));
    }
    let pi = Integer::from(p.clone());
    let words: Vec<u64> = g
        .iter()
        .map(|c| {
            let r = c % &pi;
            let r = if r < 0 { r + &pi } else { r };
            u64::try_from(&r).unwrap_or(0)
        })
        .collect();
    if words.iter().skip(1).all(|&w| w == 0) {
        return Ok(()); // a non-zero constant modulo p
    }
    let dg = derivative(g);
    for r in crate::numfield::fp::roots(&words, pw) {
        let r = Integer::from(r);
        if !eval(&dg, &r).divisible_by(&pi) {
            if prec > 0 {
                out.push(newton(g, r, p, prec));
            } else {
                out.push(r);
            }
        } else {
            let mut h = substitute(g, &r, &pi);
            strip_content(&mut h, p);
            let mut sub = Vec::new();
            descend(&h, p, pw, prec.saturating_sub(1), first, depth + 1, &mut sub)?;
            out.extend(sub.into_iter().map(|t| &r + &pi * t));
        }
        if first && !out.is_empty() {
            return Ok(());
        }
    }
    Ok(())
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
