//! The real place: a point where a squarefree binary form of even degree is
//! positive, found with exact sign evaluations and a Sturm sequence.

use malachite::base::num::arithmetic::traits::{Sign, UnsignedAbs};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};
use std::cmp::Ordering;

/// Value of the binary form (coefficient `c[i]` of `x^(n-i) z^i`) at `(x, z)`.
pub(crate) fn form_value(c: &[Integer], x: &Integer, z: &Integer) -> Integer {
    // Horner in x over the terms c[i] z^i
    let mut v = Integer::ZERO;
    let mut zp = Integer::ONE;
    for ci in c.iter() {
        v = v * x + ci * &zp;
        zp *= z;
    }
    v
}

fn poly_eval(f: &[Rational], t: &Rational) -> Rational {
    let mut v = Rational::ZERO;
    for c in f.iter().rev() {
        v = v * t + c;
    }
    v
}

fn trim(f: &mut Vec<Rational>) {
    while f.last().is_some_and(|c| *c == 0u32) {
        f.pop();
    }
}

/// Remainder of `a` by non-zero `b` over Q.
fn poly_rem(a: &[Rational], b: &[Rational]) -> Vec<Rational> {
    let mut r = a.to_vec();
    trim(&mut r);
    let db = b.len() - 1;
    while r.len() > db {
        let k = r.len() - 1;
        let q = &r[k] / &b[db];
        for j in 0..=db {
            let t = &q * &b[j];
            r[k - db + j] -= t;
        }
        r.pop();
        trim(&mut r);
    }
    r
}

/// The Sturm sequence `f, f', -rem(f, f'), ...` of a squarefree `f`.
fn sturm_chain(f: &[Rational]) -> Vec<Vec<Rational>> {
    let d: Vec<Rational> = (1..f.len()).map(|i| Rational::from(i as u64) * &f[i]).collect();
    let mut chain = vec![f.to_vec(), d];
    loop {
        let k = chain.len();
        if chain[k - 1].is_empty() {
            chain.pop();
            break;
        }
        if chain[k - 1].len() == 1 {
            break;
        }
        let r: Vec<Rational> = poly_rem(&chain[k - 2], &chain[k - 1]).into_iter().map(|c| -c).collect();
        if r.is_empty() {
            break;
        }
        chain.push(r);
    }
    chain
}

fn variations(signs: impl Iterator<Item = Ordering>) -> usize {
    let mut last = Ordering::Equal;
    let mut count = 0;
    for s in signs {
        if s == Ordering::Equal {
            continue;
        }
        if last != Ordering::Equal && s != last {
            count += 1;
        }
        last = s;
    }
    count
}

fn lead_sign(p: &[Rational], at_minus_infinity: bool) -> Ordering {
    let s = p.last().expect("non-zero").sign();
    if at_minus_infinity && (p.len() - 1) % 2 == 1 {
        s.reverse()
    } else {
        s
    }
}

/// A primitive `(x, z)` with `form(x, z) > 0`, or `None` if the form is
/// nowhere positive. `c` is squarefree of even degree `n` (any leading
/// coefficient, zero included).
pub(crate) fn real_positive_point(c: &[Integer]) -> Option<(Integer, Integer)> {
    let n = c.len() - 1;
    let one = Integer::ONE;
    let zero = Integer::ZERO;
    if c[0] > 0u32 {
        return Some((one, zero));
    }
    if c[n] > 0u32 {
        return Some((zero, one));
    }
    for x in [Integer::ONE, Integer::from(-1)] {
        if form_value(c, &x, &one) > 0u32 {
            return Some((x, one));
        }
    }
    if n == 0 {
        return None;
    }
    // f(t) = form(t, 1), coefficients lowest first
    let f_int: Vec<Integer> = (0..=n).map(|j| c[n - j].clone()).collect();
    let bound: Natural = f_int.iter().map(|a| a.unsigned_abs()).max().expect("non-empty") + Natural::from(2u32);
    let bound = Integer::from(bound);
    if c[0] == 0u32 {
        // root at infinity: f has odd degree n - 1 with leading coefficient
        // c[1] != 0 (squarefree), and beyond the Cauchy bound
        // 1 + max|f_i| every value has the sign of the leading term
        let t = if c[1] > 0u32 { bound } else { -bound };
        return Some((t, one));
    }
    // c[0] < 0: positive somewhere iff there is a real root (all roots are
    // simple, so the sign changes there); then f > 0 between the two
    // smallest roots r1 < r2.
    let f: Vec<Rational> = f_int.iter().map(|a| Rational::from(a.clone())).collect();
    let chain = sturm_chain(&f);
    let v_minus = variations(chain.iter().map(|p| lead_sign(p, true)));
    let v_plus = variations(chain.iter().map(|p| lead_sign(p, false)));
    if v_minus <= v_plus {
        return None;
    }
    // roots_upto(m) = #{real roots <= m} = V(-inf) - V(m) (Sturm's theorem;
    // for squarefree f the count is right-continuous at a root)
    let roots_upto = |m: &Rational| -> usize {
        v_minus.saturating_sub(variations(chain.iter().map(|p| poly_eval(p, m).sign())))
    };
    let mut lo = Rational::from(-bound.clone());
    let mut hi = Rational::from(bound);
    loop {
        let mid: Rational = (&lo + &hi) / Rational::from(2u32);
        let k = roots_upto(&mid);
        if k >= 2 {
            hi = mid;
        } else if k == 0 {
            lo = mid;
        } else {
            if poly_eval(&f, &mid) > 0u32 {
                let negative = mid < 0u32;
                let (num, den) = mid.into_numerator_and_denominator();
                let num = if negative { -Integer::from(num) } else { Integer::from(num) };
                return Some((num, Integer::from(den)));
            }
            // mid is the smallest root itself
            lo = mid;
        }
    }
}
