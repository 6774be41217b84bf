//! The real place: a point where a squarefree binary form of even degree is
//! positive, found with exact sign evaluations and a Sturm sequence.

use malachite::base::num::arithmetic::traits::{Gcd, Sign, UnsignedAbs};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural};
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

/// Whether `form(x, z) > 0`, in checked `i128` arithmetic when the words
/// `cw` of the coefficients are given and nothing overflows, exactly over
/// `Integer` otherwise.
fn positive_at(c: &[Integer], cw: Option<&[i128]>, x: i64, z: i64) -> bool {
    if let Some(cw) = cw {
        let word = || -> Option<i128> {
            let (x, z) = (x as i128, z as i128);
            let mut v = 0i128;
            let mut zp = 1i128;
            for ci in cw {
                v = v.checked_mul(x)?.checked_add(ci.checked_mul(zp)?)?;
                zp = zp.checked_mul(z)?;
            }
            Some(v)
        };
        if let Some(v) = word() {
            return v > 0;
        }
    }
    form_value(c, &Integer::from(x), &Integer::from(z)) > 0u32
}

fn words(c: &[Integer]) -> Option<[i128; 5]> {
    let mut w = [0i128; 5];
    for (k, ci) in c.iter().enumerate() {
        w[k] = i128::try_from(ci).ok()?;
    }
    Some(w)
}

fn trim(f: &mut Vec<Integer>) {
    while f.last().is_some_and(|c| *c == 0u32) {
        f.pop();
    }
}

/// A positive multiple of the remainder of `a` by non-zero `b` (integer
/// coefficients, lowest first): each elimination step multiplies by
/// `|lc(b)| > 0` and subtracts `sign(lc(b)) lead(r) x^k b`.
fn positive_prem(a: &[Integer], b: &[Integer]) -> Vec<Integer> {
    let mut r = a.to_vec();
    trim(&mut r);
    let db = b.len() - 1;
    let lb = &b[db];
    let (abs_lb, neg) = (Integer::from(lb.unsigned_abs()), *lb < 0u32);
    while r.len() > db {
        let k = r.len() - 1;
        let lr = if neg { -r[k].clone() } else { r[k].clone() };
        for x in r.iter_mut() {
            *x *= &abs_lb;
        }
        for j in 0..=db {
            let t = &lr * &b[j];
            r[k - db + j] -= t;
        }
        r.pop();
        trim(&mut r);
    }
    r
}

/// Divide by the (positive) content.
fn primitive(mut f: Vec<Integer>) -> Vec<Integer> {
    let mut g = Natural::ZERO;
    for c in &f {
        g = g.gcd(c.unsigned_abs());
    }
    if g > 1u32 {
        let g = Integer::from(g);
        for c in f.iter_mut() {
            *c /= &g;
        }
    }
    f
}

/// A Sturm sequence of a squarefree `f`: `f, f'` and then the negated
/// remainders, each scaled by a positive constant (which changes no sign).
fn sturm_chain(f: &[Integer]) -> Vec<Vec<Integer>> {
    let mut d: Vec<Integer> = (1..f.len()).map(|i| Integer::from(i as u64) * &f[i]).collect();
    trim(&mut d);
    let mut chain = vec![f.to_vec(), primitive(d)];
    loop {
        let k = chain.len();
        if chain[k - 1].is_empty() {
            chain.pop();
            break;
        }
        if chain[k - 1].len() == 1 {
            break;
        }
        let r: Vec<Integer> = positive_prem(&chain[k - 2], &chain[k - 1]).into_iter().map(|c| -c).collect();
        if r.is_empty() {
            break;
        }
        chain.push(primitive(r));
    }
    chain
}

/// Sign of `P(u / z)` for `z > 0`: the sign of `sum P_j u^j z^(d-j)`.
fn sign_at(p: &[Integer], u: &Integer, z: &Integer) -> Ordering {
    let d = p.len() - 1;
    let mut v = p[d].clone();
    let mut zp = Integer::ONE;
    for j in (0..d).rev() {
        zp *= z;
        v = v * u + &p[j] * &zp;
    }
    v.sign()
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

fn lead_sign(p: &[Integer], at_minus_infinity: bool) -> Ordering {
    // invariant: Sturm sequence members are trimmed, non-zero polynomials
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
///
/// `disc_sign`, when given, is the sign of the discriminant of a quartic
/// (`n = 4`), used for two shortcuts with a negative leading coefficient:
/// the sign of the discriminant of a real polynomial with distinct roots is
/// `(-1)^s` for `s` pairs of complex conjugate roots (each pair contributes
/// `(2 i Im)^2 < 0`, the other factors come in conjugate pairs), so a
/// negative discriminant means two real roots; and four real roots force
/// `f''` to have two distinct real roots (Rolle), i.e.
/// `disc(f'') = -12 (8ac - 3b^2) > 0`, so a positive discriminant with
/// `8ac - 3b^2 >= 0` means no real root.
pub(crate) fn real_positive_point(c: &[Integer], disc_sign: Option<Ordering>) -> Option<(Integer, Integer)> {
    let n = c.len() - 1;
    let one = Integer::ONE;
    let zero = Integer::ZERO;
    if c[0] > 0u32 {
        return Some((one, zero));
    }
    if c[n] > 0u32 {
        return Some((zero, one));
    }
    let cw = words(c);
    let cw = cw.as_ref().map(|w| &w[..=n]);
    for x in [1i64, -1] {
        if positive_at(c, cw, x, 1) {
            return Some((Integer::from(x), one));
        }
    }
    if n == 0 {
        return None;
    }
    // f(t) = form(t, 1), coefficients lowest first
    let f_int: Vec<Integer> = (0..=n).map(|j| c[n - j].clone()).collect();
    // invariant: n >= 1 here, so f_int has n + 1 >= 2 entries
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
    let mut known_real_root = false;
    if n == 4 {
        match disc_sign {
            Some(Ordering::Less) => known_real_root = true,
            Some(Ordering::Greater) => {
                let p = Integer::from(8) * &c[0] * &c[2] - Integer::from(3) * &c[1] * &c[1];
                if p >= 0u32 {
                    return None;
                }
            }
            _ => {}
        }
    }
    if let Some(cw) = cw {
        if let Some(w) = float_guided_point(c, cw) {
            return Some(w);
        }
    }
    let found = sturm_point(c);
    debug_assert!(found.is_some() || !known_real_root);
    found
}

/// The exact search for `c[0] < 0`: Sturm count, then bisection for a point
/// between the two smallest real roots.
pub(crate) fn sturm_point(c: &[Integer]) -> Option<(Integer, Integer)> {
    let n = c.len() - 1;
    let f_int: Vec<Integer> = (0..=n).map(|j| c[n - j].clone()).collect();
    // invariant: c has degree n >= 0, so f_int has n + 1 >= 1 entries
    let bound: Natural = f_int.iter().map(|a| a.unsigned_abs()).max().expect("non-empty") + Natural::from(2u32);
    let bound = Integer::from(bound);
    let chain = sturm_chain(&f_int);
    let v_minus = variations(chain.iter().map(|p| lead_sign(p, true)));
    let v_plus = variations(chain.iter().map(|p| lead_sign(p, false)));
    if v_minus <= v_plus {
        return None;
    }
    // roots_upto(u / z) = #{real roots <= u / z} = V(-inf) - V(u / z)
    // (Sturm's theorem; for squarefree f the count is right-continuous at a
    // root, since f' does not vanish there)
    let roots_upto = |u: &Integer, z: &Integer| -> usize {
        v_minus.saturating_sub(variations(chain.iter().map(|p| sign_at(p, u, z))))
    };
    // bisection on dyadic points lo / z < hi / z
    let mut lo = -bound.clone();
    let mut hi = bound;
    let mut z = Integer::ONE;
    loop {
        lo <<= 1u32;
        hi <<= 1u32;
        z <<= 1u32;
        let mid: Integer = (&lo + &hi) >> 1u32;
        let k = roots_upto(&mid, &z);
        if k >= 2 {
            hi = mid;
        } else if k == 0 {
            lo = mid;
        } else {
            if sign_at(&f_int, &mid, &z) == Ordering::Greater {
                let g = Integer::from((&mid).unsigned_abs().gcd((&z).unsigned_abs()));
                return Some((mid / &g, z / g));
            }
            // mid / z is the smallest root itself
            lo = mid;
        }
    }
}

/// Candidate points from floating-point critical points of `f(t) = form(t, 1)`
/// (the maximum of `f` sits at one of them), rounded to dyadic rationals of
/// increasing precision and **verified exactly**; `None` if none is positive
/// (then the exact Sturm search decides).
fn float_guided_point(c: &[Integer], cw: &[i128]) -> Option<(Integer, Integer)> {
    let n = c.len() - 1;
    let mut w = [0f64; 5];
    for (k, ci) in cw.iter().enumerate() {
        w[k] = *ci as f64;
    }
    let crit: Vec<f64> = match n {
        2 => vec![-w[1] / (2.0 * w[0])],
        4 => {
            // f'(t) / (4a) = t^3 + p2 t^2 + p1 t + p0
            let a4 = 4.0 * w[0];
            let (p2, p1, p0) = (3.0 * w[1] / a4, 2.0 * w[2] / a4, w[3] / a4);
            let mut r = cubic_real_roots(p2, p1, p0);
            for t in r.iter_mut() {
                for _ in 0..4 {
                    let v = ((*t + p2) * *t + p1) * *t + p0;
                    let d = (3.0 * *t + 2.0 * p2) * *t + p1;
                    if d != 0.0 {
                        *t -= v / d;
                    }
                }
            }
            r
        }
        _ => return None,
    };
    for t in crit {
        if !t.is_finite() {
            continue;
        }
        for k in [0u32, 1, 2, 3, 4, 6, 8, 12, 16, 20, 26, 32, 40, 48] {
            let scaled = t * (1u64 << k) as f64;
            if scaled.abs() > 4.0e18 {
                break;
            }
            let (x, z) = (scaled.round() as i64, 1i64 << k);
            if positive_at(c, Some(cw), x, z) {
                // reduce: z is a power of two
                let sh = x.trailing_zeros().min(k);
                let (x, z) = if x == 0 { (0, 1) } else { (x >> sh, z >> sh) };
                return Some((Integer::from(x), Integer::from(z)));
            }
        }
    }
    None
}

/// Real roots of `t^3 + a t^2 + b t + c` in floating point (trigonometric
/// form for three real roots, Cardano for one).
fn cubic_real_roots(a: f64, b: f64, c: f64) -> Vec<f64> {
    let p = b - a * a / 3.0;
    let q = 2.0 * a * a * a / 27.0 - a * b / 3.0 + c;
    let shift = -a / 3.0;
    let disc = q * q / 4.0 + p * p * p / 27.0;
    if disc < 0.0 {
        let m = 2.0 * (-p / 3.0).sqrt();
        let arg = (3.0 * q / (p * m)).clamp(-1.0, 1.0);
        let theta = arg.acos() / 3.0;
        (0..3).map(|k| m * (theta - 2.0 * std::f64::consts::PI * k as f64 / 3.0).cos() + shift).collect()
    } else {
        let s = disc.sqrt();
        vec![(-q / 2.0 + s).cbrt() + (-q / 2.0 - s).cbrt() + shift]
    }
}

#[cfg(test)]
pub(crate) fn float_guided_point_for_tests(c: &[Integer]) -> Option<(Integer, Integer)> {
    let cw = words(c)?;
    float_guided_point(c, &cw[..c.len()])
}
