//! Polynomials over F_p for word-sized primes: products, remainders, gcd,
//! powers modulo a polynomial, and roots (Cantor-Zassenhaus splitting by
//! `gcd(f, (x + a)^((p-1)/2) - 1)` after `gcd(f, x^p - x)`; brute force for
//! p < 64), with factorisation of polynomials of degree at most 3.
//!
//! Coefficients run from the constant term up and are reduced into
//! `0..p`; the zero polynomial is the empty vector.
//!
//! Reference: H. Cohen, *A Course in Computational Algebraic Number
//! Theory*, GTM 138, 1993, §1.6 (Algorithms 1.6.1 and 1.6.2).

use crate::arith::{inv_mod, mul_mod, sqrt_mod_prime};

/// Drops leading zero coefficients.
pub(crate) fn trim(f: &mut Vec<u64>) {
    while f.last() == Some(&0) {
        f.pop();
    }
}

/// `f mod g` (g non-zero).
pub(crate) fn rem(f: &[u64], g: &[u64], p: u64) -> Vec<u64> {
    let mut r = f.to_vec();
    trim(&mut r);
    let dg = g.len() - 1;
    let inv = inv_mod(g[dg], p).unwrap_or(1);
    while r.len() > dg {
        let top = r.len() - 1;
        let c = mul_mod(r[top], inv, p);
        if c != 0 {
            for i in 0..=dg {
                let s = mul_mod(c, g[i], p);
                let j = top - dg + i;
                r[j] = (r[j] + p - s) % p;
            }
        }
        r.pop();
        trim(&mut r);
    }
    r
}

/// Quotient and remainder of `f` by the non-zero `g`.
pub(crate) fn div_rem(f: &[u64], g: &[u64], p: u64) -> (Vec<u64>, Vec<u64>) {
    let mut r = f.to_vec();
    trim(&mut r);
    let dg = g.len() - 1;
    if r.len() <= dg {
        return (Vec::new(), r);
    }
    let mut q = vec![0u64; r.len() - dg];
    let inv = inv_mod(g[dg], p).unwrap_or(1);
    while r.len() > dg {
        let top = r.len() - 1;
        let c = mul_mod(r[top], inv, p);
        q[top - dg] = c;
        for i in 0..=dg {
            let s = mul_mod(c, g[i], p);
            let j = top - dg + i;
            r[j] = (r[j] + p - s) % p;
        }
        r.pop();
    }
    trim(&mut r);
    trim(&mut q);
    (q, r)
}

/// The product `f g`.
pub(crate) fn mul(f: &[u64], g: &[u64], p: u64) -> Vec<u64> {
    if f.is_empty() || g.is_empty() {
        return Vec::new();
    }
    let mut r = vec![0u64; f.len() + g.len() - 1];
    for (i, &a) in f.iter().enumerate() {
        if a == 0 {
            continue;
        }
        for (j, &b) in g.iter().enumerate() {
            r[i + j] = (r[i + j] + mul_mod(a, b, p)) % p;
        }
    }
    trim(&mut r);
    r
}

/// The monic gcd of `f` and `g`.
pub(crate) fn gcd(f: &[u64], g: &[u64], p: u64) -> Vec<u64> {
    let mut a = f.to_vec();
    let mut b = g.to_vec();
    trim(&mut a);
    trim(&mut b);
    while !b.is_empty() {
        let r = rem(&a, &b, p);
        a = b;
        b = r;
    }
    make_monic(&mut a, p);
    a
}

/// Scales `f` to leading coefficient 1 (no-op on zero).
pub(crate) fn make_monic(f: &mut [u64], p: u64) {
    if let Some(&l) = f.last() {
        let inv = inv_mod(l, p).unwrap_or(1);
        for c in f.iter_mut() {
            *c = mul_mod(*c, inv, p);
        }
    }
}

/// `(x + a)^e` modulo the monic cubic `x^3 + m[2] x^2 + m[1] x + m[0]`
/// for `p < 2^32` (coefficients below `p`): left-to-right binary powering
/// on fixed arrays, products summed in `u128` and reduced once per
/// coefficient, the multiplication by `x + a` a shift.
pub(crate) fn pow_linear_mod_cubic(a: u64, e: u64, m: [u64; 3], p: u64) -> [u64; 3] {
    let pp = p as u128;
    // x^3 = -(m0 + m1 x + m2 x^2), x^4 = x * x^3
    let n0 = (p - m[0]) % p;
    let n1 = (p - m[1]) % p;
    let n2 = (p - m[2]) % p;
    // x^3 = n0 + n1 x + n2 x^2; x^4 = n2 n0 + (n0 + n2 n1) x + (n1 + n2 n2) x^2
    let q0 = (n2 as u128 * n0 as u128 % pp) as u64;
    let q1 = ((n0 as u128 + n2 as u128 * n1 as u128) % pp) as u64;
    let q2 = ((n1 as u128 + n2 as u128 * n2 as u128) % pp) as u64;
    let mut r = [1u64, 0, 0];
    if e == 0 {
        return r;
    }
    for bit in (0..(64 - e.leading_zeros())).rev() {
        // square: degree 4, then fold x^3 and x^4
        let (r0, r1, r2) = (r[0] as u128, r[1] as u128, r[2] as u128);
        let c0 = r0 * r0 % pp;
        let c1 = 2 * r0 * r1 % pp;
        let c2 = (2 * r0 * r2 + r1 * r1) % pp;
        let c3 = 2 * r1 * r2 % pp;
        let c4 = r2 * r2 % pp;
        r = [
            ((c0 + c3 * n0 as u128 + c4 * q0 as u128) % pp) as u64,
            ((c1 + c3 * n1 as u128 + c4 * q1 as u128) % pp) as u64,
            ((c2 + c3 * n2 as u128 + c4 * q2 as u128) % pp) as u64,
        ];
        if (e >> bit) & 1 == 1 {
            // times x + a: x r + a r, x r = r2 x^3 + r1 x^2 + r0 x
            let (r0, r1, r2) = (r[0] as u128, r[1] as u128, r[2] as u128);
            let aa = a as u128;
            r = [
                ((aa * r0 + r2 * n0 as u128) % pp) as u64,
                ((r0 + aa * r1 + r2 * n1 as u128) % pp) as u64,
                ((r1 + aa * r2 + r2 * n2 as u128) % pp) as u64,
            ];
        }
    }
    r
}

/// `base^e mod m` (m of degree at least 1).
pub(crate) fn pow_mod_poly(base: &[u64], e: u64, m: &[u64], p: u64) -> Vec<u64> {
    if m.len() == 4
        && m[3] == 1
        && p < 1 << 32
        && base.len() == 2
        && base[1] == 1
        && m.iter().chain(base).all(|&c| c < p)
    {
        let r = pow_linear_mod_cubic(base[0], e, [m[0], m[1], m[2]], p);
        let mut v = r.to_vec();
        trim(&mut v);
        return v;
    }
    pow_mod_poly_plain(base, e, m, p)
}

/// `base^e mod m` by the general routines.
fn pow_mod_poly_plain(base: &[u64], mut e: u64, m: &[u64], p: u64) -> Vec<u64> {
    let mut result = vec![1u64];
    let mut b = rem(base, m, p);
    while e > 0 {
        if e & 1 == 1 {
            result = rem(&mul(&result, &b, p), m, p);
        }
        e >>= 1;
        if e > 0 {
            b = rem(&mul(&b, &b, p), m, p);
        }
    }
    result
}

/// Value of `f` at `x`.
pub(crate) fn eval(f: &[u64], x: u64, p: u64) -> u64 {
    let mut acc = 0u64;
    for &c in f.iter().rev() {
        acc = (mul_mod(acc, x, p) + c) % p;
    }
    acc
}

/// The distinct roots of `f` in F_p, sorted. `p` must be prime.
///
/// Brute force below 64; above, `g = gcd(f, x^p - x)` then random
/// splitting by `gcd(g, (x + a)^((p-1)/2) - 1)` with `a = 0, 1, 2, ...`
/// (deterministic order, expected O(1) tries per split).
pub(crate) fn roots(f: &[u64], p: u64) -> Vec<u64> {
    let mut f = f.to_vec();
    trim(&mut f);
    if f.len() <= 1 {
        return Vec::new();
    }
    let mut out = Vec::new();
    if p < 64 {
        for x in 0..p {
            if eval(&f, x, p) == 0 {
                out.push(x);
            }
        }
        return out;
    }
    make_monic(&mut f, p);
    let xp = pow_mod_poly(&[0, 1], p, &f, p);
    let mut xp_minus_x = xp.clone();
    xp_minus_x.resize(xp_minus_x.len().max(2), 0);
    xp_minus_x[1] = (xp_minus_x[1] + p - 1) % p;
    trim(&mut xp_minus_x);
    let g = gcd(&f, &xp_minus_x, p);
    split_roots(&g, p, &mut out);
    out.sort_unstable();
    out
}

fn split_roots(g: &[u64], p: u64, out: &mut Vec<u64>) {
    match g.len() {
        0 | 1 => {}
        2 => out.push((p - g[0]) % p),
        3 => {
            // monic quadratic with two distinct roots: the quadratic formula
            let b = g[1];
            let c = g[0];
            let disc = (mul_mod(b, b, p) + p - mul_mod(4 % p, c, p)) % p;
            if let Some(s) = sqrt_mod_prime(disc, p) {
                let inv2 = inv_mod(2, p).unwrap_or(1);
                let r1 = mul_mod((p - b + s) % p, inv2, p);
                let r2 = mul_mod((2 * p - b - s) % p, inv2, p);
                out.push(r1);
                if r2 != r1 {
                    out.push(r2);
                }
            }
        }
        _ => {
            let mut a = 0u64;
            loop {
                let h = pow_mod_poly(&[a % p, 1], (p - 1) / 2, g, p);
                let mut h1 = h.clone();
                if h1.is_empty() {
                    h1.push(0);
                }
                h1[0] = (h1[0] + p - 1) % p;
                trim(&mut h1);
                let d = gcd(g, &h1, p);
                if d.len() > 1 && d.len() < g.len() {
                    let (q, _) = div_rem(g, &d, p);
                    let mut q = q;
                    make_monic(&mut q, p);
                    split_roots(&d, p, out);
                    split_roots(&q, p, out);
                    return;
                }
                a += 1;
            }
        }
    }
}

/// Factorisation of a polynomial of degree 1 to 3 over F_p into monic
/// irreducibles with multiplicities, sorted by degree then coefficients.
/// Returns `None` for degree 0 or above 3, or for the zero polynomial.
///
/// A cubic with no root is irreducible, a quadratic with no root too; the
/// rest splits off linear factors.
pub(crate) fn factor_small(f: &[u64], p: u64) -> Option<Vec<(Vec<u64>, u32)>> {
    let mut f = f.to_vec();
    trim(&mut f);
    if f.len() < 2 || f.len() > 4 {
        return None;
    }
    make_monic(&mut f, p);
    let mut out: Vec<(Vec<u64>, u32)> = Vec::new();
    for r in roots(&f, p) {
        let lin = vec![(p - r) % p, 1];
        let mut e = 0u32;
        loop {
            let (q, rr) = div_rem(&f, &lin, p);
            if !rr.is_empty() {
                break;
            }
            f = q;
            e += 1;
        }
        out.push((lin, e));
    }
    if f.len() > 1 {
        make_monic(&mut f, p);
        out.push((f, 1));
    }
    out.sort_by(|a, b| a.0.len().cmp(&b.0.len()).then(a.0.cmp(&b.0)));
    Some(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn cubic_powering_agrees_with_the_general_routine() {
        // two ways: the fixed-array powering modulo a monic cubic against
        // products and remainders of general polynomials
        let mut s = 7u64;
        let mut rnd = || {
            s ^= s << 13;
            s ^= s >> 7;
            s ^= s << 17;
            s
        };
        for p in [5u64, 7, 101, 65537, 1_000_003, 4_294_967_291] {
            for _ in 0..40 {
                let m = [rnd() % p, rnd() % p, rnd() % p, 1];
                let a = rnd() % p;
                let e = match rnd() % 3 {
                    0 => rnd() % 20,
                    1 => p,
                    _ => rnd(),
                };
                assert_eq!(
                    pow_mod_poly(&[a, 1], e, &m, p),
                    pow_mod_poly_plain(&[a, 1], e, &m, p),
                    "{m:?} {a} {e} mod {p}"
                );
            }
        }
    }

    fn brute_roots(f: &[u64], p: u64) -> Vec<u64> {
        (0..p).filter(|&x| eval(f, x, p) == 0).collect()
    }

    #[test]
    fn roots_agree_with_brute_force() {
        // independent check: evaluation at every residue
        for &p in &[67u64, 101, 257, 1009, 7919] {
            for seed in 0..200u64 {
                let f = vec![
                    (seed * 7919 + 3) % p,
                    (seed * 31 + 1) % p,
                    (seed * seed + 5) % p,
                    1,
                ];
                assert_eq!(roots(&f, p), brute_roots(&f, p), "p={p} f={f:?}");
            }
        }
    }

    #[test]
    fn factor_product_is_input() {
        for &p in &[2u64, 3, 5, 7, 101, 1009] {
            for seed in 0..100u64 {
                let f = vec![(seed * 13 + 1) % p, (seed * 5 + 2) % p, seed % p, 1];
                let fac = factor_small(&f, p).unwrap();
                let mut prod = vec![1u64];
                for (g, e) in &fac {
                    for _ in 0..*e {
                        prod = mul(&prod, g, p);
                    }
                }
                let mut ff = f.clone();
                trim(&mut ff);
                assert_eq!(prod, ff);
                // irreducible factors of degree >= 2 have no roots
                for (g, _) in &fac {
                    if g.len() > 2 {
                        assert!(brute_roots(g, p).is_empty());
                    }
                }
            }
        }
    }

    #[test]
    fn x_cubed_minus_2_mod_31() {
        // 2 is a cube mod 31 (4^3 = 64 = 2) and 31 = 1 mod 3: three roots
        // (hand computation: 4, 4*5=20, 4*25=100=7, 5 a cube root of unity mod 31)
        assert_eq!(roots(&[29, 0, 0, 1], 31), vec![4, 7, 20]);
    }
}
