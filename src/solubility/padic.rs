//! The p-adic residue-class search with Hensel's lemma.
//!
//! A primitive pair `(x, z)` over `Z_p` is, up to a unit, either `(t, 1)`
//! with `t` in `Z_p` (the x-chart) or `(1, t)` with `t` in `pZ_p` (the
//! z-chart). Multiplying a pair by a unit `u` multiplies the even-degree form
//! by `u^n`, a square, so the square class of the value only depends on the
//! point of `P^1(Q_p)`. In each chart we search the classes `t0 + p^k Z_p`.
//! For a class we keep the polynomial `h(s) = p^-M f(t0 + p^k s)` with
//! `h` primitive and remember the parity of `M`.
//!
//! * `p` odd: if `M` is even and `h mod p` takes a non-zero square value at
//!   `s0`, then every `s = s0 (mod p)` gives `h(s) = h(s0) mod p`, a unit
//!   square, hence a square in `Z_p` (Hensel's lemma): a witness. Classes
//!   where `h mod p` is a non-zero non-square, or any unit when `M` is odd,
//!   hold no square value. Only the roots of `h mod p` are refined.
//! * `p = 2`: the same with `h(s) mod 8` for `s mod 8` (an odd number is a
//!   square in `Z_2` iff it is `1 mod 8`), refining the roots of `h mod 2`.
//!
//! Termination (see Cremona, *Algorithms for Modular Elliptic Curves*,
//! 2nd ed., section 3.5, for the same kind of search): a root `s0` of
//! `h mod p` of multiplicity `m` carries exactly `m` roots of `h` (over the
//! completion of an algebraic closure) in the disc `s = s0 (mod p)` (Newton
//! polygon of `h(s0 + u)`). At a simple root the refined polynomial is
//! `c0 + c1 r + ...` with `c1` a unit and all higher terms divisible by `p`,
//! so one refinement (two if `M` is odd) exhibits a witness: a polynomial
//! map with unit derivative is onto modulo every power of `p`. A multiple
//! root carries two distinct roots `alpha`, `beta` of the squarefree form, and
//! the disc of level `k + 1` containing both forces
//! `2 (k + 1) <= 2 v(alpha - beta) <= v_p(disc)`, so the search depth is at
//! most `v_p(disc) / 2 + 3`.

use super::coeff::Coeff;
use malachite::base::num::arithmetic::traits::Pow;
use malachite::base::num::logic::traits::BitIterable;
use malachite::{Integer, Natural};

/// Residue classes are enumerated exhaustively for primes below this bound;
/// above it the Weil bound guarantees a non-zero square value (see
/// [`Search::class_large`]).
pub(crate) const EXHAUSTIVE_BELOW: u64 = 64;

/// A word operation overflowed; redo the computation over `Integer`.
#[derive(Debug)]
pub(crate) struct Overflow;

/// A witness found by the search: the chart, the parameter `t` (the point is
/// `(t, 1)` in the x-chart and `(1, t)` in the z-chart), and `radius` `K`
/// such that every `t' = t (mod p^K)` is a witness as well.
#[derive(Debug, Clone)]
pub(crate) struct PadicHit {
    pub(crate) x_chart: bool,
    pub(crate) t: Integer,
    pub(crate) radius: u32,
}

enum LargeClass<C> {
    Witness(C),
    Roots(Vec<C>),
}

struct Search<'a, C: Coeff> {
    p: C,
    /// `p^0 .. p^4`, `None` where the power overflows the word type.
    pw: [Option<C>; 5],
    p_nat: &'a Natural,
    /// `Some(p)` when `p` is odd and below [`EXHAUSTIVE_BELOW`].
    small: Option<u64>,
    two: bool,
    /// Bit `v` set iff `v` is a non-zero square modulo the small prime.
    qr_mask: u64,
    /// On success: the witness parameter, accumulated while unwinding.
    acc: Integer,
    /// On success: the level of the last digit.
    last_level: u32,
    /// The deepest level visited (for the termination test).
    deepest: u32,
}

#[inline]
fn eval_mod(c: &[u64; 5], s: u64, m: u64) -> u64 {
    let mut v = c[4];
    for i in (0..4).rev() {
        v = (v * s + c[i]) % m;
    }
    v % m
}

#[inline]
fn deriv_mod(c: &[u64; 5], s: u64, m: u64) -> u64 {
    let mut v = 4 * c[4] % m;
    for i in (1..4).rev() {
        v = (v * s + i as u64 * c[i]) % m;
    }
    v
}

/// Search `P^1(Z_p)` for a point where the binary form `form` (coefficient
/// `form[i]` of `x^(n-i) z^i`, `n = form.len() - 1` even, squarefree, not
/// zero) takes a non-zero square value in `Q_p`. `p` must be prime, and below
/// `2^62` when `C = i128`.
pub(crate) fn padic_hit<C: Coeff>(form: &[C], p: C, p_nat: &Natural) -> Result<Option<PadicHit>, Overflow> {
    padic_hit_with(form, p, p_nat, EXHAUSTIVE_BELOW)
}

/// [`padic_hit`] with the exhaustive-enumeration bound as a parameter (tests
/// lower it to 17, the least bound for which the Weil argument holds).
pub(crate) fn padic_hit_with<C: Coeff>(
    form: &[C],
    p: C,
    p_nat: &Natural,
    exhaustive_below: u64,
) -> Result<Option<PadicHit>, Overflow> {
    search_with_depth(form, p, p_nat, exhaustive_below).map(|r| r.0)
}

/// [`padic_hit_with`], also returning the deepest level of `p^k` visited.
pub(crate) fn search_with_depth<C: Coeff>(
    form: &[C],
    p: C,
    p_nat: &Natural,
    exhaustive_below: u64,
) -> Result<(Option<PadicHit>, u32), Overflow> {
    debug_assert!(exhaustive_below >= 17);
    let n = form.len() - 1;
    debug_assert!(n <= 4 && n.is_multiple_of(2));
    let mut pw: [Option<C>; 5] = [Some(C::from_u64(1)), Some(p.clone()), None, None, None];
    for i in 2..5 {
        pw[i] = pw[i - 1].as_ref().and_then(|q| q.mul(&p));
    }
    // invariant: p_nat is below exhaustive_below, a u64, in this branch
    let small_val = if *p_nat < exhaustive_below { Some(u64::try_from(p_nat).expect("small prime")) } else { None };
    let two = small_val == Some(2);
    let mut qr_mask = 0u64;
    if let Some(q) = small_val.filter(|&q| q < 64) {
        for i in 1..q {
            qr_mask |= 1u64 << (i * i % q);
        }
    }
    let mut search = Search {
        p: p.clone(),
        pw,
        p_nat,
        small: if two { None } else { small_val.filter(|&q| q < 64) },
        two,
        qr_mask,
        acc: Integer::from(0),
        last_level: 0,
        deepest: 0,
    };

    // divide out the content
    let mut c: [C; 5] = [C::zero(), C::zero(), C::zero(), C::zero(), C::zero()];
    c[..=n].clone_from_slice(form);
    let c = &mut c[..=n];
    let mut m0 = 0u32;
    while c.iter().all(|x| x.divisible_by(&p)) {
        for x in c.iter_mut() {
            *x = x.div_exact(&p);
        }
        m0 += 1;
    }

    // x-chart: f(t) = form(t, 1), coefficient of t^j is c[n - j]
    let mut xs: [C; 5] = [C::zero(), C::zero(), C::zero(), C::zero(), C::zero()];
    for j in 0..=n {
        xs[j] = c[n - j].clone();
    }
    if search.explore(&xs, m0 % 2 == 1, 0)? {
        let d = search.deepest;
        return Ok((Some(search.hit(true)), d));
    }

    // z-chart: f(t) = form(1, t) with t = p s
    let mut zs: [C; 5] = [C::zero(), C::zero(), C::zero(), C::zero(), C::zero()];
    zs[..=n].clone_from_slice(c);
    let (zh, delta) = search.scale_normalise(zs)?;
    if search.explore(&zh, (m0 + delta) % 2 == 1, 1)? {
        let d = search.deepest;
        return Ok((Some(search.hit(false)), d));
    }
    Ok((None, search.deepest))
}

impl<C: Coeff> Search<'_, C> {
    fn hit(&mut self, x_chart: bool) -> PadicHit {
        let radius = if self.two { self.last_level + 3 } else { self.last_level + 1 };
        PadicHit { x_chart, t: std::mem::take(&mut self.acc), radius }
    }

    /// Record digit `s` at `level` while unwinding a successful search.
    fn add_digit(&mut self, s: &C, level: u32) {
        if !s.is_zero() {
            let p = Integer::from(self.p_nat.clone());
            self.acc += s.to_integer() * p.pow(u64::from(level));
        }
    }

    /// Success at a leaf: `s` is the last digit.
    fn leaf(&mut self, s: &C, level: u32) -> Result<bool, Overflow> {
        self.acc = Integer::from(0);
        self.last_level = level;
        self.add_digit(s, level);
        Ok(true)
    }

    /// Given `t(r) = sum t_i r^i` primitive, return the primitive part of
    /// `t(p r)` and the power of `p` divided out.
    fn scale_normalise(&self, t: [C; 5]) -> Result<([C; 5], u32), Overflow> {
        let mut best = 5u32;
        for (i, ti) in t.iter().enumerate() {
            if ti.is_zero() {
                continue;
            }
            let i = i as u32;
            let mut v = 0u32;
            let mut x = ti.clone();
            while i + v < best && x.divisible_by(&self.p) {
                x = x.div_exact(&self.p);
                v += 1;
            }
            best = best.min(i + v);
        }
        debug_assert!(best <= 4, "a primitive polynomial has a unit coefficient");
        let d = best as usize;
        let mut out: [C; 5] = [C::zero(), C::zero(), C::zero(), C::zero(), C::zero()];
        for (i, ti) in t.iter().enumerate() {
            if ti.is_zero() {
                continue;
            }
            out[i] = if i >= d {
                let q = self.pw[i - d].as_ref().ok_or(Overflow)?;
                ti.mul(q).ok_or(Overflow)?
            } else {
                let q = self.pw[d - i].as_ref().ok_or(Overflow)?;
                ti.div_exact(q)
            };
        }
        Ok((out, best))
    }

    /// The primitive part of `h(s + p r)` and the power of `p` removed.
    fn descend(&self, h: &[C; 5], s: &C) -> Result<([C; 5], u32), Overflow> {
        let mut t = h.clone();
        // Taylor shift t(r) = h(s + r) by repeated synthetic division
        if !s.is_zero() {
            for i in 0..4 {
                for j in (i..4).rev() {
                    let prod = s.mul(&t[j + 1]).ok_or(Overflow)?;
                    t[j] = t[j].add(&prod).ok_or(Overflow)?;
                }
            }
        }
        self.scale_normalise(t)
    }

    /// Search the class described by `h` (primitive) and the parity `odd` of
    /// the power of `p` in front of it. On success the digits of the witness
    /// are accumulated in `self.acc`.
    fn explore(&mut self, h: &[C; 5], odd: bool, level: u32) -> Result<bool, Overflow> {
        self.deepest = self.deepest.max(level);
        let mut roots: [Option<C>; 4] = [None, None, None, None];
        let mut simple = [false; 4];
        let mut nroots = 0usize;
        if self.two {
            let r = [h[0].rem_u64(8), h[1].rem_u64(8), h[2].rem_u64(8), h[3].rem_u64(8), h[4].rem_u64(8)];
            if !odd {
                for s in 0..8u64 {
                    if eval_mod(&r, s, 8) == 1 {
                        return self.leaf(&C::from_u64(s), level);
                    }
                }
            }
            for s in 0..2u64 {
                if eval_mod(&r, s, 2) == 0 {
                    roots[nroots] = Some(C::from_u64(s));
                    simple[nroots] = deriv_mod(&r, s, 2) != 0;
                    nroots += 1;
                }
            }
        } else if let Some(p) = self.small {
            let r = [h[0].rem_u64(p), h[1].rem_u64(p), h[2].rem_u64(p), h[3].rem_u64(p), h[4].rem_u64(p)];
            for s in 0..p {
                let v = eval_mod(&r, s, p);
                if v == 0 {
                    // a non-zero polynomial of degree <= 4 has at most 4 roots
                    // (and for p = 3 there are only 3 residues)
                    roots[nroots] = Some(C::from_u64(s));
                    simple[nroots] = deriv_mod(&r, s, p) != 0;
                    nroots += 1;
                } else if !odd && (self.qr_mask >> v) & 1 == 1 {
                    return self.leaf(&C::from_u64(s), level);
                }
            }
        } else {
            match self.class_large(h, odd) {
                LargeClass::Witness(s) => return self.leaf(&s, level),
                LargeClass::Roots(list) => {
                    let hb: Vec<C> = h.iter().map(|c| c.rem(&self.p)).collect();
                    let dh = fp::derivative(&hb, &self.p);
                    for s in list {
                        simple[nroots] = !fp::eval(&dh, &s, &self.p).is_zero();
                        roots[nroots] = Some(s);
                        nroots += 1;
                    }
                }
            }
        }
        // simple roots first: their classes always hold a witness
        for want_simple in [true, false] {
            for i in 0..nroots {
                if simple[i] != want_simple {
                    continue;
                }
                // invariant: every slot i < nroots was filled by the root finder above
                let s = roots[i].clone().expect("root slot filled");
                let (next, delta) = self.descend(h, &s)?;
                if self.explore(&next, odd ^ (delta % 2 == 1), level + 1)? {
                    self.add_digit(&s, level);
                    return Ok(true);
                }
            }
        }
        Ok(false)
    }

    /// One class for an odd prime `p >= EXHAUSTIVE_BELOW`.
    ///
    /// Write `hbar = c w^2 u` with `u` monic squarefree of degree `d`. If
    /// `d >= 1`, Weil's bound for character sums (Lidl and Niederreiter,
    /// *Finite Fields*, Theorem 5.41) gives `|sum_s chi(u(s))| <= (d-1) sqrt p`,
    /// so the number of `s` with `hbar(s)` a non-zero square is at least
    /// `(p - 3 sqrt p - 4) / 2 > 0` for `p >= 17`; the scan below therefore
    /// stops. If `d = 0` the non-zero values all lie in the class of `c`.
    fn class_large(&self, h: &[C; 5], odd: bool) -> LargeClass<C> {
        let p = &self.p;
        let mut hb: Vec<C> = h.iter().map(|c| c.rem(p)).collect();
        fp::trim(&mut hb);
        if !odd {
            // a few direct tries first: any non-zero square value will do
            for s in 0..4u64 {
                let sc = C::from_u64(s);
                let v = fp::eval(&hb, &sc, p);
                if !v.is_zero() && v.legendre(p) == 1 {
                    return LargeClass::Witness(sc);
                }
            }
            match fp::square_shape(&hb, p) {
                None => {
                    let mut s = 0u64;
                    loop {
                        let sc = C::from_u64(s);
                        let v = fp::eval(&hb, &sc, p);
                        if !v.is_zero() && v.legendre(p) == 1 {
                            return LargeClass::Witness(sc);
                        }
                        s += 1;
                    }
                }
                Some(c) if c.legendre(p) == 1 => {
                    let mut s = 0u64;
                    loop {
                        let sc = C::from_u64(s);
                        if !fp::eval(&hb, &sc, p).is_zero() {
                            return LargeClass::Witness(sc);
                        }
                        s += 1;
                    }
                }
                Some(_) => {}
            }
        }
        LargeClass::Roots(fp::roots(&hb, p, self.p_nat))
    }
}

/// Polynomials over `F_p` as coefficient vectors, lowest degree first,
/// without trailing zeros (the zero polynomial is empty).
pub(crate) mod fp {
    use super::*;

    pub fn trim<C: Coeff>(a: &mut Vec<C>) {
        while a.last().is_some_and(|c| c.is_zero()) {
            a.pop();
        }
    }

    fn addm<C: Coeff>(a: &C, b: &C, p: &C) -> C {
        // invariant: both residues are below p, whose double fits the coefficient type (checked by the caller's width choice)
        a.add(b).expect("residue sums fit").rem(p)
    }

    fn subm<C: Coeff>(a: &C, b: &C, p: &C) -> C {
        // invariant: both residues are below p, so the difference fits the coefficient type
        a.sub(b).expect("residue differences fit").rem(p)
    }

    pub fn eval<C: Coeff>(a: &[C], s: &C, p: &C) -> C {
        let mut v = C::zero();
        for c in a.iter().rev() {
            v = addm(&v.mul_mod(s, p), c, p);
        }
        v
    }

    pub fn derivative<C: Coeff>(a: &[C], p: &C) -> Vec<C> {
        let mut d: Vec<C> = (1..a.len()).map(|i| C::from_u64(i as u64).rem(p).mul_mod(&a[i], p)).collect();
        trim(&mut d);
        d
    }

    fn monic<C: Coeff>(a: &[C], p: &C) -> Vec<C> {
        // invariant: callers pass trimmed, non-zero polynomials
        let inv = a.last().expect("non-zero polynomial").inv_mod(p);
        a.iter().map(|c| c.mul_mod(&inv, p)).collect()
    }

    /// Remainder of `a` modulo a non-zero `m`.
    fn rem<C: Coeff>(a: &[C], m: &[C], p: &C) -> Vec<C> {
        let mut r: Vec<C> = a.to_vec();
        trim(&mut r);
        let dm = m.len() - 1;
        let inv = m[dm].inv_mod(p);
        while r.len() > dm {
            let k = r.len() - 1;
            let q = r[k].mul_mod(&inv, p);
            for j in 0..=dm {
                r[k - dm + j] = subm(&r[k - dm + j], &q.mul_mod(&m[j], p), p);
            }
            trim(&mut r);
        }
        r
    }

    /// Quotient of `a` by a monic `m` that divides it.
    fn div<C: Coeff>(a: &[C], m: &[C], p: &C) -> Vec<C> {
        let mut r: Vec<C> = a.to_vec();
        let dm = m.len() - 1;
        if r.len() <= dm {
            return vec![];
        }
        let mut q = vec![C::zero(); r.len() - dm];
        for k in (dm..r.len()).rev() {
            let c = r[k].clone();
            q[k - dm] = c.clone();
            for j in 0..=dm {
                r[k - dm + j] = subm(&r[k - dm + j], &c.mul_mod(&m[j], p), p);
            }
        }
        q
    }

    fn mulmod<C: Coeff>(a: &[C], b: &[C], m: &[C], p: &C) -> Vec<C> {
        if a.is_empty() || b.is_empty() {
            return vec![];
        }
        let mut prod = vec![C::zero(); a.len() + b.len() - 1];
        for (i, x) in a.iter().enumerate() {
            for (j, y) in b.iter().enumerate() {
                prod[i + j] = addm(&prod[i + j], &x.mul_mod(y, p), p);
            }
        }
        rem(&prod, m, p)
    }

    fn powmod<C: Coeff>(base: &[C], e: &Natural, m: &[C], p: &C) -> Vec<C> {
        let mut r = rem(&[C::from_u64(1)], m, p);
        let b = rem(base, m, p);
        let bits: Vec<bool> = e.bits().collect();
        for bit in bits.iter().rev() {
            r = mulmod(&r, &r, m, p);
            if *bit {
                r = mulmod(&r, &b, m, p);
            }
        }
        r
    }

    /// Monic gcd (empty if both are zero).
    fn gcd<C: Coeff>(a: &[C], b: &[C], p: &C) -> Vec<C> {
        let mut x: Vec<C> = a.to_vec();
        let mut y: Vec<C> = b.to_vec();
        trim(&mut x);
        trim(&mut y);
        while !y.is_empty() {
            let r = rem(&x, &y, p);
            x = y;
            y = r;
        }
        if x.is_empty() {
            x
        } else {
            monic(&x, p)
        }
    }

    /// `Some(c)` if `a = c w^2` for a polynomial `w` (`p` odd), else `None`.
    pub fn square_shape<C: Coeff>(a: &[C], p: &C) -> Option<C> {
        let d = a.len() - 1;
        match d {
            0 => Some(a[0].clone()),
            2 => {
                // c (s^2 + B s + C) is c times a square iff B^2 = 4C
                let m = monic(a, p);
                let b2 = m[1].mul_mod(&m[1], p);
                let c4 = C::from_u64(4).rem(p).mul_mod(&m[0], p);
                if b2 == c4 {
                    Some(a[2].clone())
                } else {
                    None
                }
            }
            4 => {
                // s^4 + B s^3 + C s^2 + D s + E = (s^2 + (B/2) s + g)^2 with
                // g = (C - B^2/4)/2 iff D = B g and E = g^2
                let m = monic(a, p);
                let half = C::from_u64(2).rem(p).inv_mod(p);
                let quarter = half.mul_mod(&half, p);
                let b2 = m[3].mul_mod(&m[3], p).mul_mod(&quarter, p);
                let g = subm(&m[2], &b2, p).mul_mod(&half, p);
                if m[1] == m[3].mul_mod(&g, p) && m[0] == g.mul_mod(&g, p) {
                    Some(a[4].clone())
                } else {
                    None
                }
            }
            _ => None,
        }
    }

    /// The distinct roots in `F_p` of a non-zero polynomial, `p` an odd prime
    /// (distinct-degree then Cantor-Zassenhaus equal-degree splitting).
    pub fn roots<C: Coeff>(a: &[C], p: &C, p_nat: &Natural) -> Vec<C> {
        if a.len() <= 1 {
            return vec![];
        }
        let f = monic(a, p);
        let x = vec![C::zero(), C::from_u64(1)];
        let mut xp = powmod(&x, p_nat, &f, p);
        while xp.len() < 2 {
            xp.push(C::zero());
        }
        xp[1] = subm(&xp[1], &C::from_u64(1), p);
        trim(&mut xp);
        let lin = gcd(&f, &xp, p);
        let half = (p_nat - Natural::from(1u32)) >> 1u32;
        let mut out = Vec::new();
        split(&lin, p, &half, &mut out);
        out
    }

    fn split<C: Coeff>(g: &[C], p: &C, half: &Natural, out: &mut Vec<C>) {
        match g.len() {
            0 | 1 => {}
            2 => out.push(subm(&C::zero(), &g[0], p)),
            _ => {
                let mut delta = 0u64;
                loop {
                    let base = vec![C::from_u64(delta).rem(p), C::from_u64(1)];
                    let mut b = powmod(&base, half, g, p);
                    if b.is_empty() {
                        b.push(C::zero());
                    }
                    b[0] = subm(&b[0], &C::from_u64(1), p);
                    trim(&mut b);
                    let h = gcd(g, &b, p);
                    if h.len() > 1 && h.len() < g.len() {
                        let q = div(g, &h, p);
                        split(&h, p, half, out);
                        split(&q, p, half, out);
                        return;
                    }
                    delta += 1;
                }
            }
        }
    }
}
