//! Kernel polynomials of rational `l`-isogenies (`l` an odd prime), found
//! modulo a prime `p`, lifted `p`-adically and checked exactly over `Q`.
//!
//! Let `C` be a cyclic subgroup of order `l` defined over `Q` and `χ` the
//! character by which Galois acts on it. At a good prime `p ≠ l` where
//! `χ(Frob_p) = 1` the reduction of `C` is a subgroup of `E(F_p)[l]`, so it is
//! among the `1` or `l + 1` cyclic subgroups of `E(F_p)[l]`. For each of them
//! the `x`-coordinates of its non-zero points up to sign are simple roots of
//! `f_l` modulo `p` (`f_l` is square-free modulo a good prime `p ≠ l`), which
//! Newton's iteration lifts to `Z/p^k`. The monic polynomial `K` with these
//! roots has, if it comes from `C`, rational coefficients with denominators
//! dividing `l`: by Gauss's lemma `K = K_0 / lc(K_0)` with `K_0` a primitive
//! integral factor of `f_l`, and `lc(K_0)` divides `lc(f_l) = l`. So `l K`
//! is integral, with coefficients bounded by `l 2^{deg f_l} ||f_l||_2`
//! (Mignotte's bound), and the symmetric residue of `l K` modulo `p^k` for
//! `p^k` beyond twice that bound is `l K` itself. The candidate is accepted
//! only after the exact test `K | f_l` in `Q[x]`. A rational factor of `f_l`
//! that reduces to the `x`-coordinates of a cyclic subgroup is the kernel
//! polynomial of a cyclic subgroup defined over `Q` (reduction modulo `p` is
//! injective on `E[l]` and respects the group law), so every accepted `K` is
//! a true kernel polynomial; a kernel missed at one prime is looked for at
//! the next ones, and one never found only costs a missed shortcut.
//!
//! The image curve and the map on points follow Vélu (*Isogénies entre
//! courbes elliptiques*, C. R. Acad. Sci. Paris 273 (1971)) written with the
//! kernel polynomial: with `s_1, s_2, s_3` the elementary symmetric functions
//! of its roots and `n = (l - 1)/2`,
//!
//! ```text
//!   t = 6(s_1^2 - 2 s_2) + b2 s_1 + n b4
//!   w = 10(s_1^3 - 3 s_1 s_2 + 3 s_3) + 2 b2 (s_1^2 - 2 s_2) + 3 b4 s_1 + n b6
//!   E' = [a1, a2, a3, a4 - 5t, a6 - b2 t - 7w]
//!   X(P) = x + Σ_Q ( t_Q / (x - x_Q) + u_Q / (x - x_Q)^2 ),
//! ```
//!
//! with `t_Q = 6 x_Q^2 + b2 x_Q + b4` and `u_Q = 4 x_Q^3 + b2 x_Q^2 + 2 b4 x_Q + b6`
//! summed over the roots `x_Q` of `K`; the sums are `T/K` and `-(U/K)'` with
//! `T = t K' mod K` and `U = u K' mod K`.

use super::division::DivisionPolys;
use super::poly::*;
use crate::arith::{inv_mod, mul_mod, primes_up_to, sqrt_mod_prime};
use crate::curve::{Curve, Point};
use malachite::base::num::arithmetic::traits::Mod;
use malachite::base::num::basic::traits::{One, Zero};
use malachite::base::num::logic::traits::SignificantBits;
use malachite::{Integer, Natural, Rational};

/// A point of `Y^2 = x^3 + A2 x^2 + A4 x + A6` over `F_p`; `None` is infinity.
type Pt = Option<(u64, u64)>;

struct ModCurve {
    p: u64,
    a2: u64,
    a4: u64,
    a6: u64,
}

impl ModCurve {
    fn add(&self, a: Pt, b: Pt) -> Pt {
        let p = self.p;
        let (Some((x1, y1)), Some((x2, y2))) = (a, b) else {
            return if a.is_none() { b } else { a };
        };
        let lam = if x1 == x2 {
            if (y1 + y2) % p == 0 {
                return None;
            }
            let num = (3 * mul_mod(x1, x1, p) + 2 * mul_mod(self.a2, x1, p) + self.a4) % p;
            mul_mod(num, inv_mod(2 * y1 % p, p)?, p)
        } else {
            mul_mod((y2 + p - y1) % p, inv_mod((x2 + p - x1) % p, p)?, p)
        };
        let x3 = (mul_mod(lam, lam, p) + 3 * p - self.a2 - x1 - x2) % p;
        let y3 = (p - (y1 + mul_mod(lam, (x3 + p - x1) % p, p)) % p) % p;
        Some((x3, y3))
    }

    fn mul(&self, mut n: u64, a: Pt) -> Pt {
        let mut r: Pt = None;
        let mut b = a;
        while n > 0 {
            if n & 1 == 1 {
                r = self.add(r, b);
            }
            b = self.add(b, b);
            n >>= 1;
        }
        r
    }

    fn rhs(&self, x: u64) -> u64 {
        let p = self.p;
        let x2 = mul_mod(x, x, p);
        (mul_mod(x2, x, p) + mul_mod(self.a2, x2, p) + mul_mod(self.a4, x, p) + self.a6) % p
    }
}

fn residue(n: &Integer, p: u64) -> u64 {
    // invariant: a residue mod p < 2^64 is in [0, p) and fits a u64
    u64::try_from(&n.mod_op(Integer::from(p))).expect("residue fits a word")
}

/// Candidate kernel `x`-coordinate sets modulo `p`: for each cyclic subgroup
/// of `E(F_p)[l]`, the `x`-coordinates of `kT`, `1 ≤ k ≤ (l-1)/2`.
fn subgroups_mod_p(curve: &Curve, l: u64, p: u64) -> Vec<Vec<u64>> {
    let [b2, b4, b6, _] = curve.b_invariants();
    // invariant: the only caller passes primes p >= 5, so 2 is invertible mod p
    let inv2 = inv_mod(2, p).unwrap();
    let inv4 = mul_mod(inv2, inv2, p);
    let m = ModCurve { p, a2: mul_mod(residue(b2, p), inv4, p), a4: mul_mod(residue(b4, p), inv2, p), a6: mul_mod(residue(b6, p), inv4, p) };
    // the group order and its l-part
    let mut pts: Vec<(u64, u64)> = Vec::new();
    let mut order = 1u64;
    for x in 0..p {
        let r = m.rhs(x);
        if r == 0 {
            order += 1;
        } else if let Some(y) = sqrt_mod_prime(r, p) {
            order += 2;
            if pts.len() < 64 {
                pts.push((x, y));
            }
        }
    }
    if order % l != 0 {
        return Vec::new();
    }
    let mut cof = order;
    while cof % l == 0 {
        cof /= l;
    }
    // points of order exactly l from the l-parts of the sample points
    let mut gens: Vec<(u64, u64)> = Vec::new();
    let in_span = |gens: &Vec<(u64, u64)>, q: (u64, u64)| -> bool {
        // membership in the span of one or two generators of order l
        match gens.len() {
            0 => false,
            1 => (1..l).any(|k| m.mul(k, Some(gens[0])) == Some(q)),
            _ => true,
        }
    };
    for &pt in pts.iter() {
        let mut q = m.mul(cof, Some(pt));
        if q.is_none() {
            continue;
        }
        loop {
            let next = m.mul(l, q);
            if next.is_none() {
                break;
            }
            q = next;
        }
        // invariant: q is Some: checked before the loop, which only replaces it by a Some
        let q = q.unwrap();
        if !in_span(&gens, q) {
            gens.push(q);
            if gens.len() == 2 {
                break;
            }
        }
    }
    let mut lines: Vec<(u64, u64)> = Vec::new();
    match gens.len() {
        0 => return Vec::new(),
        1 => lines.push(gens[0]),
        _ => {
            lines.push(gens[0]);
            for k in 0..l {
                if let Some(q) = m.add(Some(gens[1]), m.mul(k, Some(gens[0]))) {
                    lines.push(q);
                }
            }
        }
    }
    let n = (l - 1) / 2;
    lines
        .into_iter()
        // invariant: t generates a subgroup of order l, so every multiple kT with k < l is affine
        .map(|t| (1..=n).map(|k| m.mul(k, Some(t)).expect("a point of order l").0).collect())
        .collect()
}

/// Newton lifting of a simple root of `f` modulo `p` to a root modulo `p^(2^steps)`.
fn lift_root(f: &ZPoly, df: &ZPoly, root: u64, p: u64, target_bits: u64, stop: &dyn Fn() -> bool) -> Option<(Integer, Integer)> {
    let pz = Integer::from(p);
    let mut modulus = pz.clone();
    let mut r = Integer::from(root);
    if z_eval_mod(df, &r, &pz) == 0 {
        return None;
    }
    while modulus.significant_bits() < target_bits {
        if stop() {
            return None;
        }
        modulus = &modulus * &modulus;
        let fv = z_eval_mod(f, &r, &modulus);
        let dv = z_eval_mod(df, &r, &modulus);
        let inv = invert_mod(&dv, &modulus)?;
        r = (r - fv * inv).mod_op(&modulus);
    }
    Some((r, modulus))
}

/// Whether `k` divides `f` in `Q[x]` (low to high coefficients, `k`
/// non-constant with non-zero leading coefficient `c`): the pseudo-remainder
/// of `c^{deg f - deg k + 1} f` by `k` vanishes exactly then. `None` when
/// `stop` ends it.
fn pseudo_divides(k: &ZPoly, f: &ZPoly, stop: &dyn Fn() -> bool) -> Option<bool> {
    let m = k.len().checked_sub(1)?;
    let c = k.last()?.clone();
    if m == 0 || c == 0 {
        return Some(m == 0 && c != 0);
    }
    let mut r: ZPoly = f.clone();
    while r.len() > m && r.last().is_some_and(|x| *x == 0) {
        r.pop();
    }
    while r.len() > m {
        if stop() {
            return None;
        }
        let top = r.len() - 1;
        // invariant: r.len() > m >= 1, so r has a last element
        let lead = r[top].clone();
        let shift = top - m;
        for x in r.iter_mut() {
            *x *= &c;
        }
        for (i, kc) in k.iter().enumerate() {
            r[shift + i] -= &lead * kc;
        }
        // the top coefficient is now c·lead - lead·c = 0
        r.pop();
        while r.len() > m && r.last().is_some_and(|x| *x == 0) {
            r.pop();
        }
    }
    Some(r.iter().all(|x| *x == 0))
}

fn invert_mod(a: &Integer, m: &Integer) -> Option<Integer> {
    use malachite::base::num::arithmetic::traits::ExtendedGcd;
    let (g, s, _) = a.clone().extended_gcd(m.clone());
    (g == 1u32).then(|| s.mod_op(m))
}

fn symmetric(a: Integer, m: &Integer) -> Integer {
    let a = a.mod_op(m);
    let half: Integer = m >> 1u64;
    if a > half {
        a - m
    } else {
        a
    }
}

/// Monic kernel polynomials (low to high) of the rational cyclic subgroups of
/// order `l` found at good primes `p ≤ max_p` (at most `tries` primes with
/// `l | #E(F_p)` are used). `bad` are the primes dividing the discriminant.
pub(crate) fn kernel_polynomials(
    curve: &Curve,
    l: u64,
    bad: &[Natural],
    divpolys: &mut DivisionPolys,
    tries: usize,
    max_p: u64,
    stop: &dyn Fn() -> bool,
) -> Vec<QPoly> {
    let Some(f) = divpolys.f_within(l, stop) else { return Vec::new() };
    let df = z_derivative(&f);
    // Mignotte: coefficients of any integral factor of f are at most 2^deg ||f||_2
    let norm_bits = f.iter().map(|c| c.significant_bits()).max().unwrap_or(0) + (f.len() as u64).significant_bits();
    let target_bits = (l.significant_bits()) + (f.len() as u64) + norm_bits + 8;
    let lz = Integer::from(l);
    let mut found: Vec<QPoly> = Vec::new();
    let mut used = 0usize;
    for p in primes_up_to(max_p) {
        if p < 5 || p == l || bad.iter().any(|q| *q == Natural::from(p)) {
            continue;
        }
        if stop() {
            break;
        }
        let sets = subgroups_mod_p(curve, l, p);
        if sets.is_empty() {
            continue;
        }
        used += 1;
        for roots in sets {
            if stop() {
                return found;
            }
            let mut lifted = Vec::with_capacity(roots.len());
            let mut modulus = Integer::ONE;
            for &r in &roots {
                match lift_root(&f, &df, r, p, target_bits, stop) {
                    Some((x, m)) => {
                        modulus = m;
                        lifted.push(x);
                    }
                    None => break,
                }
            }
            if lifted.len() != roots.len() {
                continue;
            }
            // l * prod (x - r) modulo p^k, symmetric residues
            let mut k: ZPoly = vec![lz.clone()];
            for r in &lifted {
                let lin = vec![-r.clone(), Integer::ONE];
                k = z_mul(&k, &lin).into_iter().map(|c| c.mod_op(&modulus)).collect();
            }
            let k: ZPoly = k.into_iter().map(|c| symmetric(c, &modulus)).collect();
            if k.last() != Some(&lz) {
                continue;
            }
            let monic: QPoly = k.iter().map(|c| Rational::from(c.clone()) / Rational::from(l)).collect();
            // K | f over Q, tested by pseudo-division in integers (no
            // rational normalisation; the deadline is checked as it goes)
            let Some(divides) = pseudo_divides(&k, &f, stop) else { return found };
            if divides && !found.contains(&monic) {
                found.push(monic);
            }
        }
        if found.len() >= 2 || used >= tries {
            break;
        }
    }
    found
}

/// Vélu's image model `[a1, a2, a3, a4 - 5t, a6 - b2 t - 7w]` for the odd
/// kernel with monic kernel polynomial `k` (low to high).
pub(crate) fn velu_model(curve: &Curve, k: &QPoly) -> [Rational; 5] {
    let n = k.len() - 1;
    let coef = |i: isize| -> Rational { if i < 0 { Rational::ZERO } else { k[i as usize].clone() } };
    let n_i = n as isize;
    let s1 = -coef(n_i - 1);
    let s2 = coef(n_i - 2);
    let s3 = -coef(n_i - 3);
    let [b2, b4, b6, _] = curve.b_invariants().clone().map(Rational::from);
    let a = curve.coefficients().clone().map(Rational::from);
    let nq = Rational::from(n as u64);
    let p2 = &s1 * &s1 - Rational::from(2) * &s2;
    let p3 = &s1 * &s1 * &s1 - Rational::from(3) * &s1 * &s2 + Rational::from(3) * &s3;
    let t = Rational::from(6) * &p2 + &b2 * &s1 + &nq * &b4;
    let w = Rational::from(10) * p3 + Rational::from(2) * &b2 * &p2 + Rational::from(3) * &b4 * &s1 + &nq * &b6;
    [
        a[0].clone(),
        a[1].clone(),
        a[2].clone(),
        &a[3] - Rational::from(5) * &t,
        &a[4] - &b2 * &t - Rational::from(7) * w,
    ]
}

/// Vélu's image model for the kernel `{O, Q}` with `Q` a rational point of
/// order 2 with `x(Q) = x0`: there `v_Q = g^x_Q = (6 x0^2 + b2 x0 + b4) / 2`
/// (half the odd case's `t_Q`, as `Q = -Q` is counted once) and `u_Q = 0`
/// (`g^y_Q = 0`), so `t = v_Q`, `w = x0 t` (Vélu 1971).
pub(crate) fn velu_model_two(curve: &Curve, x0: &Rational) -> [Rational; 5] {
    let t = two_torsion_t(curve, x0);
    let w = x0 * &t;
    let [b2, _, _, _] = curve.b_invariants().clone().map(Rational::from);
    let a = curve.coefficients().clone().map(Rational::from);
    [a[0].clone(), a[1].clone(), a[2].clone(), &a[3] - Rational::from(5) * &t, &a[4] - &b2 * &t - Rational::from(7) * w]
}

/// `v_Q = (6 x0^2 + b2 x0 + b4) / 2` for the point of order 2 at `x0`.
fn two_torsion_t(curve: &Curve, x0: &Rational) -> Rational {
    let [b2, b4, _, _] = curve.b_invariants().clone().map(Rational::from);
    (Rational::from(6) * x0 * x0 + b2 * x0 + b4) / Rational::from(2)
}

/// The rational functions `X = x + T/K - (U' K - U K')/K^2` of Vélu's map.
pub(crate) struct VeluMap {
    k: QPoly,
    dk: QPoly,
    t: QPoly,
    u: QPoly,
    du: QPoly,
}

impl VeluMap {
    pub(crate) fn new(curve: &Curve, k: &QPoly) -> VeluMap {
        let [b2, b4, b6, _] = curve.b_invariants().clone().map(Rational::from);
        let dk = q_derivative(k);
        let tq: QPoly = vec![b4.clone(), b2.clone(), Rational::from(6)];
        let uq: QPoly = vec![b6, Rational::from(2) * &b4, b2, Rational::from(4)];
        let t = q_divrem(&q_mul(&tq, &dk), k).1;
        let u = q_divrem(&q_mul(&uq, &dk), k).1;
        let du = q_derivative(&u);
        VeluMap { k: k.clone(), dk, t, u, du }
    }

    /// Vélu's map for the kernel `{O, Q}`, `x(Q) = x0`, `2 Q = O`:
    /// `X = x + v_Q / (x - x0)` (see [`velu_model_two`]).
    pub(crate) fn for_two_torsion(curve: &Curve, x0: &Rational) -> VeluMap {
        VeluMap {
            k: vec![-x0.clone(), Rational::ONE],
            dk: vec![Rational::ONE],
            t: vec![two_torsion_t(curve, x0)],
            u: vec![Rational::ZERO],
            du: vec![Rational::ZERO],
        }
    }

    /// The image of `P` on Vélu's model `image` (given by its a-invariants),
    /// with the sign of `y` left open: the point with that `x`-coordinate whose
    /// `y` is the larger root. Images of independent points under an isogeny
    /// are independent, whichever sign is taken.
    pub(crate) fn image_up_to_sign(&self, image: &[Rational; 5], p: &Point) -> Option<Point> {
        let Point::Affine(x, _) = p else { return Some(Point::Infinity) };
        let kv = q_eval(&self.k, x);
        if kv == 0u32 {
            return Some(Point::Infinity);
        }
        let big_x = x + q_eval(&self.t, x) / &kv - (q_eval(&self.du, x) * &kv - q_eval(&self.u, x) * q_eval(&self.dk, x)) / (&kv * &kv);
        // y^2 + (a1 X + a3) y - (X^3 + a2 X^2 + a4 X + a6) = 0
        let [a1, a2, a3, a4, a6] = image;
        let lin = a1 * &big_x + a3;
        let cubic = ((&big_x + a2) * &big_x + a4) * &big_x + a6;
        let disc = &lin * &lin + Rational::from(4) * cubic;
        let root = rational_sqrt(&disc)?;
        let y = (root - lin) / Rational::from(2);
        Some(Point::Affine(big_x, y))
    }
}

fn rational_sqrt(q: &Rational) -> Option<Rational> {
    use malachite::base::num::arithmetic::traits::{CheckedSqrt, Sign};
    use std::cmp::Ordering;
    if q.sign() == Ordering::Less {
        return None;
    }
    let (n, d) = q.to_numerator_and_denominator();
    let rn = n.checked_sqrt()?;
    let rd = d.checked_sqrt()?;
    Some(Rational::from_naturals(rn, rd))
}

#[cfg(test)]
mod pseudo_division_tests {
    use super::*;

    #[test]
    fn pseudo_division_decides_divisibility_over_q() {
        let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<ZPoly>();
        // (3x - 2)(x^2 + 1) = 3x^3 - 2x^2 + 3x - 2
        let k = z(&[-2, 3]);
        assert_eq!(pseudo_divides(&k, &z(&[-2, 3, -2, 3]), &|| false), Some(true));
        assert_eq!(pseudo_divides(&k, &z(&[-1, 3, -2, 3]), &|| false), Some(false));
        // (3x - 2)(5x^2 - 7) times 2, and a stop that says stop
        assert_eq!(pseudo_divides(&k, &z(&[28, -42, -20, 30]), &|| false), Some(true));
        assert_eq!(pseudo_divides(&k, &z(&[28, -42, -20, 30]), &|| true), None);
    }
}
