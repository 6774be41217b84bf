//! The record of the descent over `A = Q[X]/(f)`: re-checked exactly.
//!
//! Checked: `f` is the monic model of the minimal curve; `S` holds 2 and
//! every prime of `disc(f)`; each candidate's valuations at the primes
//! outside `S` are even (its norm has no other primes than `S` and the
//! listed ones; at each listed `p`, unramified as `p` does not divide
//! `disc(f)`, the valuations at the primes of degree one come from the
//! roots of `f` lifted to `p`-adic precision, the last one from the norm);
//! for `Q x Q x Q` the candidates span the whole group of square-norm
//! classes; each Selmer element is the product its mask names and has
//! square norm; at every place of `S` and at the real place the local
//! points lie on `Y^2 = f(X)` over `Q_v` (exact: they are rationals) and
//! their images with those of `E(Q)[2]` span a space of exactly the known
//! dimension `dim E(Q_v)[2] + [v = 2]` (`- 1` at the real place; Silverman
//! AEC X.1, VII.6), with `#E(Q_v)[2]` from the roots of `f` in `Q_v`;
//! the Selmer group is recomputed by F2 linear algebra as the candidates of
//! square norm whose localisations lie in every local image, and must
//! equal the span of the recorded basis.
//!
//! The local square test in `A (x) Q_v` (independent of the descent's
//! code): at the real place `x` is a square when its real conjugates are
//! positive (the norm when `f` has one real root; the three symmetric
//! functions when it has three); at a prime, `x` with `N(x)` a square in
//! `Q_p` is a square exactly when `gamma = x N(x)` (norm `n^2`, `n = N(x)^2`)
//! is, and that holds exactly when the resolvent
//! `(s^2 - e1)^2 - 8 n s - 4 e2` (`e1`, `e2` the first symmetric functions
//! of `gamma`) has a root in `Q_p` (a root is the trace of a square root;
//! `gamma` is first multiplied by a square `(X + k)^2` until its
//! conjugates are distinct). Roots in `Z_p` are counted digit by digit
//! (Hensel's lemma at simple roots modulo `p`), with the roots modulo `p`
//! from the number-field module's F_p root finder, each re-checked.
//!
//! Taken on trust: the completeness of the candidates for `Q x K` and `K`
//! cubic (the class group and units of `K` behind `K(S,2)`); a bound that
//! is Bach's rests on GRH, and then the record gives no unconditional
//! bound.

use super::curve::CheckedCurve;
use super::{place_name, CertificateError, Ctx};
use crate::certificate::algebra::{product_of, symmetric, times, AlgebraElement, AlgebraRecord};
use crate::certificate::check::{is_padic_square, is_rational_square, local_coords, split, square_class_vector};
use crate::certificate::Certificate;
use crate::descent::algebra::AlgebraShape;
use crate::solubility::Place;
use malachite::base::num::arithmetic::traits::{Lcm, ModInverse, Pow};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};

/// How many digits the `p`-adic root count may descend before it gives up.
const DIGIT_CAP: u32 = 600;

type Res<T> = Result<T, String>;

fn q(n: &Integer) -> Rational {
    Rational::from(n.clone())
}

/// `g(x)` for a polynomial with integer coefficients (low degree first).
fn eval_int(g: &[Integer], x: &Integer) -> Integer {
    g.iter().rev().fold(Integer::ZERO, |acc, c| acc * x + c)
}

/// `f(x)` for `f = x^3 + c2 x^2 + c1 x + c0` at a rational.
fn f_at(f: &[Integer; 3], x: &Rational) -> Rational {
    ((x + q(&f[2])) * x + q(&f[1])) * x + q(&f[0])
}

/// The discriminant of `x^3 + a x^2 + b x + c`.
fn cubic_disc(a: &Rational, b: &Rational, c: &Rational) -> Rational {
    a * a * b * b - Rational::from(4) * b * b * b - Rational::from(4) * a * a * a * c - Rational::from(27) * c * c + Rational::from(18) * a * b * c
}

/// The roots modulo `p` of `g` (words, low degree first), each checked.
fn roots_mod(g: &[u64], p: u64) -> Res<Vec<u64>> {
    let rs = crate::numfield::fp::roots(g, p);
    for &r in &rs {
        if crate::numfield::fp::eval(g, r, p) != 0 {
            return Err(format!("{r} is not a root modulo {p}"));
        }
    }
    Ok(rs)
}

fn words_mod(g: &[Integer], p: u64) -> Vec<u64> {
    let pi = Integer::from(p);
    g.iter()
        .map(|c| {
            let r = c % &pi;
            let r = if r < 0u32 { r + &pi } else { r };
            u64::try_from(&r).unwrap_or(0)
        })
        .collect()
}

/// The number of roots in `Z_p` of `g` (integer coefficients, low degree
/// first, separable, non-zero); with `first`, stops at the first.
fn zp_root_count(g: Vec<Integer>, p: u64, first: bool) -> Res<usize> {
    if p >= 1 << 62 {
        return Err(format!("the prime {p} is too large for the root count"));
    }
    let pi = Integer::from(p);
    let mut stack = vec![(g, 0u32)];
    let mut found = 0;
    while let Some((mut h, depth)) = stack.pop() {
        if depth > DIGIT_CAP {
            return Err(format!("the {p}-adic digits of the roots did not separate"));
        }
        let content = h.iter().filter(|c| **c != 0u32).map(|c| split(c, &pi).0).min().unwrap_or(0);
        if content > 0 {
            let pk = Integer::from(Natural::from(p).pow(content));
            h.iter_mut().for_each(|c| *c /= &pk);
        }
        let w = words_mod(&h, p);
        if w.iter().skip(1).all(|&x| x == 0) {
            continue;
        }
        let dh: Vec<Integer> = h.iter().enumerate().skip(1).map(|(i, c)| Integer::from(i as u64) * c).collect();
        for r in roots_mod(&w, p)? {
            let r = Integer::from(r);
            if !(&eval_int(&dh, &r) % &pi == 0u32) {
                found += 1;
                if first {
                    return Ok(found);
                }
            } else {
                // h(r + p t)
                let mut shifted: Vec<Integer> = vec![Integer::ZERO; h.len()];
                for c in h.iter().rev() {
                    let mut next = vec![Integer::ZERO; h.len()];
                    for (i, s) in shifted.iter().enumerate() {
                        next[i] += &r * s;
                        if i + 1 < next.len() {
                            next[i + 1] += &pi * s;
                        }
                    }
                    next[0] += c;
                    shifted = next;
                }
                stack.push((shifted, depth + 1));
            }
        }
    }
    Ok(found)
}

/// Whether `g` (rational coefficients, low degree first, separable) has a root in `Q_p`.
fn has_qp_root(g: &[Rational], p: u64) -> Res<bool> {
    let den = g.iter().fold(Natural::ONE, |l, c| l.lcm(c.to_denominator()));
    let ints: Vec<Integer> = g.iter().map(|c| Integer::try_from(c * Rational::from(den.clone())).unwrap_or(Integer::ZERO)).collect();
    if zp_root_count(ints.clone(), p, true)? > 0 {
        return Ok(true);
    }
    // roots of negative valuation: x = 1/(p u), u in Z_p
    let mut rev: Vec<Integer> = ints.into_iter().rev().collect();
    let mut pk = Integer::ONE;
    for c in rev.iter_mut() {
        *c *= &pk;
        pk *= Integer::from(p);
    }
    Ok(zp_root_count(rev, p, true)? > 0)
}

/// Whether `x` is a square in `A (x) Q_v`.
fn is_local_square(f: &[Integer; 3], x: &AlgebraElement, place: &Place, real_roots: usize) -> Res<bool> {
    let [e1, e2, norm] = symmetric(f, x);
    if norm == 0u32 {
        return Err("a zero divisor in the algebra".into());
    }
    let p = match place {
        Place::Real => {
            return Ok(if real_roots == 1 { norm > 0u32 } else { e1 > 0u32 && e2 > 0u32 && norm > 0u32 });
        }
        Place::Prime(p) => u64::try_from(p).map_err(|_| format!("the prime {p} is too large"))?,
    };
    let (nn, nd) = norm.to_numerator_and_denominator();
    let signed = if norm < 0u32 { -Integer::from(nn * nd) } else { Integer::from(nn * nd) };
    if !is_padic_square(&signed, &Integer::from(p)) {
        return Ok(false);
    }
    let gamma: AlgebraElement = x.clone().map(|c| c * &norm);
    let n0 = &norm * &norm;
    for k in 0i64..64 {
        let u: AlgebraElement = [Rational::from(k), Rational::ONE, Rational::ZERO];
        let beta = times(f, &gamma, &times(f, &u, &u));
        let [a1, a2, a3] = symmetric(f, &beta);
        // N(X + k) = -f(-k)
        let n = &n0 * -f_at(f, &Rational::from(-k));
        if &n * &n != a3 {
            return Err("the norm of a square-norm element is not the square of the expected value".into());
        }
        if a3 == 0u32 || cubic_disc(&-&a1, &a2, &-&a3) == 0u32 {
            continue;
        }
        let r = [&a1 * &a1 - Rational::from(4) * &a2, Rational::from(-8) * &n, Rational::from(-2) * &a1, Rational::ZERO, Rational::ONE];
        return has_qp_root(&r, p);
    }
    Err("no multiplier made the conjugates distinct".into())
}

/// A subspace of F2^64 in echelon form (pivot = leading bit).
#[derive(Default)]
struct Span {
    rows: Vec<u64>,
}

impl Span {
    fn reduce(&self, mut v: u64) -> u64 {
        while v != 0 {
            let lead = 63 - v.leading_zeros();
            match self.rows.iter().find(|r| 63 - r.leading_zeros() == lead) {
                Some(r) => v ^= r,
                None => break,
            }
        }
        v
    }
    fn insert(&mut self, v: u64) -> bool {
        let r = self.reduce(v);
        if r == 0 {
            return false;
        }
        self.rows.push(r);
        true
    }
}

/// The combinations (masks over the columns) of `current` whose `vector`
/// (XOR of the columns' vectors) reduces to zero modulo `image`.
fn restrict(current: &[u64], vectors: &[u64], image: &Span) -> Vec<u64> {
    let vec_of = |mask: u64| vectors.iter().enumerate().filter(|(j, _)| mask >> j & 1 == 1).fold(0u64, |a, (_, v)| a ^ v);
    let mut pivots: Vec<(u64, u64)> = Vec::new();
    let mut kernel = Vec::new();
    for &c in current {
        let (mut r, mut m) = (image.reduce(vec_of(c)), c);
        while r != 0 {
            let lead = 63 - r.leading_zeros();
            match pivots.iter().find(|(pr, _)| 63 - pr.leading_zeros() == lead) {
                Some((pr, pm)) => {
                    r = image.reduce(r ^ pr);
                    m ^= pm;
                }
                None => break,
            }
        }
        if r == 0 {
            kernel.push(m);
        } else {
            pivots.push((r, m));
        }
    }
    kernel
}

/// Coordinates in `(A (x) Q_v)*/squares`: the rational classes of the
/// components at the rational roots, the rational class of the norm, and
/// adaptive coordinates of `x N(x)` with its rational components set to 1
/// (together injective).
struct LocalCoords<'a> {
    f: &'a [Integer; 3],
    place: &'a Place,
    real_roots: usize,
    /// Each rational root `e` with the idempotent `q_e(X)/q_e(e)` of its factor.
    rational: Vec<(Rational, AlgebraElement)>,
    combos: Vec<AlgebraElement>,
}

fn rational_bits(r: &Rational, place: &Place) -> Res<u64> {
    if *r == 0u32 {
        return Err("a zero component".into());
    }
    let (n, d) = r.to_numerator_and_denominator();
    let s = Integer::from(n * d);
    Ok(u64::from(local_coords(&if *r < 0u32 { -s } else { s }, place)))
}

fn value_at(x: &AlgebraElement, e: &Rational) -> Rational {
    &x[0] + &x[1] * e + &x[2] * e * e
}

impl LocalCoords<'_> {
    fn vector(&mut self, x: &AlgebraElement) -> Res<u64> {
        let mut v = 0u64;
        let mut shift = 0;
        let mut delta = x.clone();
        let norm = symmetric(self.f, x)[2].clone();
        for (e, _) in &self.rational {
            let c = value_at(x, e);
            v |= rational_bits(&c, self.place)? << shift;
            shift += 3;
        }
        v |= rational_bits(&norm, self.place)? << shift;
        shift += 3;
        if self.rational.len() == 3 {
            return Ok(v);
        }
        delta = delta.map(|c| c * &norm);
        for (e, idem) in &self.rational {
            let c = value_at(&delta, e);
            for i in 0..3 {
                delta[i] += (Rational::ONE - &c) * &idem[i];
            }
        }
        for (mask, c) in self.combos.iter().enumerate() {
            if is_local_square(self.f, &times(self.f, &delta, c), self.place, self.real_roots)? {
                return Ok(v | (mask as u64) << shift);
            }
        }
        if self.combos.len() >= 1 << 10 {
            return Err(format!("more than 10 independent classes at {}", place_name(self.place)));
        }
        let new: Vec<AlgebraElement> = self.combos.iter().map(|c| times(self.f, c, &delta)).collect();
        let bit = self.combos.len() as u64;
        self.combos.extend(new);
        Ok(v | bit << shift)
    }
}

/// The valuations of `x` at the primes above `p` (not dividing `disc(f)`)
/// are even.
fn even_valuations(f: &[Integer; 3], x: &AlgebraElement, p: u64) -> Res<bool> {
    let den = x.iter().fold(Natural::ONE, |l, c| l.lcm(c.to_denominator()));
    let a: Vec<Integer> = x.iter().map(|c| Integer::try_from(c * Rational::from(den.clone())).unwrap_or(Integer::ZERO)).collect();
    let pi = Integer::from(p);
    let vd = split(&Integer::from(den.clone()), &pi).0;
    let norm_a = symmetric(f, &[q(&a[0]), q(&a[1]), q(&a[2])])[2].clone();
    let norm_a = Integer::try_from(norm_a).map_err(|_| "the norm of an integral element is not an integer".to_string())?;
    if norm_a == 0u32 {
        return Err("a zero divisor in the algebra".into());
    }
    let vn = split(&norm_a, &pi).0;
    let poly = [f[0].clone(), f[1].clone(), f[2].clone(), Integer::ONE];
    let roots = roots_mod(&words_mod(&poly, p), p)?;
    let k = vn + 1;
    let modulus = Natural::from(p).pow(k);
    let m = Integer::from(modulus.clone());
    let dpoly: Vec<Integer> = vec![f[1].clone(), Integer::from(2) * &f[2], Integer::from(3)];
    let mut used = 0u64;
    let mut one_degree = Vec::new();
    for r in &roots {
        // Newton's iteration to p^k (the root is simple: p does not divide disc f)
        let mut big = Integer::from(*r);
        for _ in 0..=(64 - k.leading_zeros()) {
            let d = Natural::try_from((eval_int(&dpoly, &big) % &m + &m) % &m).unwrap_or(Natural::ZERO);
            let inv = d.mod_inverse(&modulus).ok_or_else(|| format!("a multiple root of f modulo {p}"))?;
            big -= eval_int(&poly, &big) * Integer::from(inv);
            big = (big % &m + &m) % &m;
        }
        let val = (eval_int(&a, &big) % &m + &m) % &m;
        if val == 0u32 {
            return Err(format!("the valuation at a prime above {p} exceeds the norm's"));
        }
        let v = split(&val, &pi).0;
        used += v;
        one_degree.push(v);
    }
    let rest_degree = 3 - roots.len() as u64;
    if used > vn || (rest_degree == 0 && used != vn) || (rest_degree > 0 && (vn - used) % rest_degree != 0) {
        return Err(format!("the valuations above {p} do not add up to the norm's"));
    }
    let mut all: Vec<i64> = one_degree.iter().map(|&v| v as i64 - vd as i64).collect();
    if rest_degree > 0 {
        all.push(((vn - used) / rest_degree) as i64 - vd as i64);
    }
    Ok(all.iter().all(|v| v % 2 == 0))
}

/// The number of roots of `f` in `Q_v`.
fn roots_in(f: &[Integer; 3], place: &Place) -> Res<usize> {
    match place {
        Place::Real => Ok(if cubic_disc(&q(&f[2]), &q(&f[1]), &q(&f[0])) > 0u32 { 3 } else { 1 }),
        Place::Prime(p) => {
            let p = u64::try_from(p).map_err(|_| format!("the prime {p} is too large"))?;
            zp_root_count(vec![f[0].clone(), f[1].clone(), f[2].clone(), Integer::ONE], p, false)
        }
    }
}

/// The image of the point of order 2 with `X = e`: `e - X + q(X)`, `q = f / (X - e)`.
fn torsion_image(f: &[Integer; 3], e: &Rational) -> AlgebraElement {
    let u = q(&f[2]) + e;
    let w = q(&f[1]) + e * &u;
    [e + &w, u - Rational::ONE, Rational::ONE]
}

/// Checks the algebra record; returns the upper bound it establishes with
/// the statements that bound takes on trust, or `None` when the record
/// rests on GRH.
pub(super) fn verify_algebra(ctx: &mut Ctx, cc: &CheckedCurve, c: &Certificate, t: usize, rec: &AlgebraRecord) -> Result<Option<(usize, Vec<String>)>, CertificateError> {
    check(ctx, cc, c, t, rec).map_err(|m| CertificateError::Rejected(format!("algebra route: {m}")))
}

fn check(ctx: &mut Ctx, cc: &CheckedCurve, c: &Certificate, t: usize, rec: &AlgebraRecord) -> Result<Option<(usize, Vec<String>)>, String> {
    let f = &rec.cubic;
    let [b2, b4, b6, _] = cc.min.b_invariants();
    if [q(&f[0]), q(&f[1]), q(&f[2])] != [Rational::from(16) * b6, Rational::from(8) * b4, b2] {
        return Err("the cubic is not X^3 + b2 X^2 + 8 b4 X + 16 b6 of the minimal model".into());
    }
    let want = match rec.shape {
        AlgebraShape::ThreeRational => 2,
        AlgebraShape::RationalTimesQuadratic => 1,
        AlgebraShape::Cubic => 0,
    };
    if rec.two_torsion_dim != t || want != t {
        return Err(format!("dim E(Q)[2] is {t}, the record says {} ({:?})", rec.two_torsion_dim, rec.shape));
    }
    // the rational roots of f: X = 4x at the points of order 2 (their number is checked by the curve part)
    let [a1, _, a3, _, _] = &cc.min.a;
    let roots: Vec<Rational> = c
        .torsion
        .iter()
        .filter(|(x, y)| Rational::from(2) * y + a1 * x + a3 == 0u32)
        .map(|(x, _)| Rational::from(4) * x)
        .collect();
    if roots.len() != [0, 1, 3][t] || roots.iter().any(|e| f_at(f, e) != 0u32) {
        return Err("the points of order 2 do not give the rational roots of f".into());
    }
    // S: 2 and the primes of disc(f)
    let disc = cubic_disc(&q(&f[2]), &q(&f[1]), &q(&f[0]));
    let mut rest = Integer::try_from(disc).map_err(|_| "disc(f) is not an integer")?;
    if rest == 0u32 {
        return Err("f has a repeated root".into());
    }
    if !rec.primes.iter().any(|p| *p == 2u32) {
        return Err("2 is not in S".into());
    }
    let s_int: Vec<Integer> = rec.primes.iter().map(|p| Integer::from(p.clone())).collect();
    for (p, pi) in rec.primes.iter().zip(&s_int) {
        ctx.check_prime(p).map_err(|e| e.to_string())?;
        rest = split(&rest, pi).1;
    }
    if rest != 1u32 && rest != -1i32 {
        return Err("a prime of disc(f) is missing from S".into());
    }
    // the candidates: valuations outside S even
    let n = rec.candidates.len();
    if n > 64 {
        return Err("more than 64 candidates".into());
    }
    for (j, cand) in rec.candidates.iter().enumerate() {
        let norm = symmetric(f, &cand.element)[2].clone();
        if norm == 0u32 {
            return Err(format!("candidate {j} is a zero divisor"));
        }
        let (nn, nd) = norm.to_numerator_and_denominator();
        let mut left = Integer::from(nn * nd);
        for pi in &s_int {
            left = split(&left, pi).1;
        }
        for p in &cand.outside {
            if rec.primes.contains(p) {
                return Err(format!("candidate {j}: {p} is listed outside S but lies in S"));
            }
            ctx.check_prime(p).map_err(|e| e.to_string())?;
            left = split(&left, &Integer::from(p.clone())).1;
            let pw = u64::try_from(p).map_err(|_| format!("candidate {j}: the prime {p} is too large"))?;
            if !even_valuations(f, &cand.element, pw)? {
                return Err(format!("candidate {j} has an odd valuation above {p}"));
            }
        }
        if left != 1u32 {
            return Err(format!("candidate {j}: its norm has primes neither in S nor listed"));
        }
    }
    let elements: Vec<AlgebraElement> = rec.candidates.iter().map(|c| c.element.clone()).collect();
    let mut trusted = Vec::new();
    if roots.len() == 3 {
        // completeness: the classes of the first two components span Q(S,2)^2
        let m = 1 + rec.primes.len();
        if 2 * m > 64 {
            return Err("too many primes in S".into());
        }
        let mut span = Span::default();
        for (j, x) in elements.iter().enumerate() {
            let v0 = square_class_vector(&value_at(x, &roots[0]), &s_int).ok_or_else(|| format!("candidate {j} is not an S-class"))?;
            let v1 = square_class_vector(&value_at(x, &roots[1]), &s_int).ok_or_else(|| format!("candidate {j} is not an S-class"))?;
            span.insert(v0 | v1 << m);
        }
        if span.rows.len() != 2 * m {
            return Err(format!("the candidates span {} of the {} dimensions of the square-norm classes", span.rows.len(), 2 * m));
        }
    } else {
        let disc_k = rec.field_discriminant.clone().ok_or("no field discriminant")?;
        let bound = rec.generation_bound.ok_or("no generation bound")?;
        let kind = if rec.conditional_on_grh {
            "Bach's bound, conditional on GRH".to_string()
        } else {
            // Minkowski's bound n!/n^n (4/pi)^r2 sqrt|d_K| (ideal norms are integers: its floor suffices) (degree n = 3 - number of rational roots)
            let deg = 3 - roots.len();
            let r2 = if disc_k < 0u32 { 1 } else { 0 };
            let d = f64::try_from(&Rational::from(disc_k.clone())).unwrap_or(f64::INFINITY).abs();
            let fact = if deg == 3 { 6.0 / 27.0 } else { 0.5 };
            let mk = fact * (4.0 / std::f64::consts::PI).powi(r2) * d.sqrt();
            if (bound as f64) < (mk * (1.0 - 1e-9)).floor() {
                return Err(format!("the generation bound {bound} is below Minkowski's bound {mk:.1} without GRH"));
            }
            "at least Minkowski's bound".to_string()
        };
        trusted.push(format!(
            "the algebra route's candidates span K(S,2) (the class group and units of the field of discriminant {disc_k}, every prime ideal of norm up to {bound}, {kind}, in the factor base's class subgroup)"
        ));
    }
    // the Selmer basis
    if rec.selmer.len() != rec.selmer_dim || rec.selmer_dim < t {
        return Err(format!("{} Selmer elements for dimension {}", rec.selmer.len(), rec.selmer_dim));
    }
    for (m, x) in &rec.selmer {
        if *m >> n.min(63) != 0 && n < 64 {
            return Err(format!("the mask {m} names more than {n} candidates"));
        }
        if product_of(f, &elements, *m) != *x {
            return Err(format!("the Selmer element of mask {m} is not the product it names"));
        }
        if !is_rational_square(&symmetric(f, x)[2]) {
            return Err(format!("the Selmer element of mask {m} has a norm that is not a square"));
        }
    }
    // the norm condition
    let norms: Vec<u64> = elements
        .iter()
        .map(|x| square_class_vector(&symmetric(f, x)[2], &s_int).ok_or_else(|| "a candidate's norm is not an S-class".to_string()))
        .collect::<Res<_>>()?;
    let mut current = restrict(&(0..n).map(|j| 1u64 << j).collect::<Vec<_>>(), &norms, &Span::default());
    // the local images
    let mut places = vec![Place::Real];
    places.extend(rec.primes.iter().cloned().map(Place::Prime));
    if rec.local.len() != places.len() || rec.local.iter().zip(&places).any(|(l, p)| l.place != *p) {
        return Err("the local images are not those of R and the primes of S in order".into());
    }
    for l in &rec.local {
        let place = &l.place;
        let nr = roots_in(f, place)?;
        let torsion_dim = match nr {
            3 => 2,
            1 => 1,
            _ => 0,
        };
        let expected = match place {
            Place::Real => torsion_dim - 1,
            Place::Prime(p) if *p == 2u32 => torsion_dim + 1,
            Place::Prime(_) => torsion_dim,
        };
        if l.dim != expected {
            return Err(format!("the local image at {} has dimension {expected}, not {}", place_name(place), l.dim));
        }
        let real_roots = if *place == Place::Real { nr } else { 0 };
        let rational = roots
            .iter()
            .map(|e| {
                // q_e(X) / q_e(e), q_e = f / (X - e)
                let u = q(&f[2]) + e;
                let w = q(&f[1]) + e * &u;
                let qe = e * e + &u * e + &w;
                (e.clone(), [&w / &qe, &u / &qe, Rational::ONE / &qe])
            })
            .collect();
        let mut coords = LocalCoords { f, place, real_roots, rational, combos: vec![[Rational::ONE, Rational::ZERO, Rational::ZERO]] };
        let mut image = Span::default();
        for e in &roots {
            image.insert(coords.vector(&torsion_image(f, e))?);
        }
        for x in &l.witnesses {
            let fx = f_at(f, x);
            let on_curve = match place {
                Place::Real => fx > 0u32,
                Place::Prime(p) => {
                    let (a, b) = fx.to_numerator_and_denominator();
                    let sign = if fx < 0u32 { Integer::from(-1) } else { Integer::ONE };
                    fx != 0u32 && is_padic_square(&(Integer::from(a * b) * sign), &Integer::from(p.clone()))
                }
            };
            if !on_curve {
                return Err(format!("X = {x} is not on Y^2 = f(X) over Q_{}", place_name(place)));
            }
            ctx.local_points += 1;
            image.insert(coords.vector(&[x.clone(), -Rational::ONE, Rational::ZERO])?);
        }
        if image.rows.len() != expected {
            return Err(format!("the local points at {} span dimension {}, not {expected}", place_name(place), image.rows.len()));
        }
        let vectors: Vec<u64> = elements.iter().map(|x| coords.vector(x)).collect::<Res<_>>()?;
        current = restrict(&current, &vectors, &image);
    }
    // the recomputed Selmer group against the record
    if current.len() != rec.selmer_dim {
        return Err(format!("the recomputed Sel^2(E) has dimension {}, the record {}", current.len(), rec.selmer_dim));
    }
    let mut computed = Span::default();
    for m in &current {
        computed.insert(*m);
    }
    let mut recorded = Span::default();
    for (m, _) in &rec.selmer {
        if computed.reduce(*m) != 0 {
            return Err(format!("the recorded Selmer element of mask {m} fails a local condition"));
        }
        if !recorded.insert(*m) {
            return Err("the recorded Selmer basis is dependent".into());
        }
    }
    if rec.conditional_on_grh {
        return Ok(None);
    }
    Ok(Some((rec.selmer_dim - t, trusted)))
}
