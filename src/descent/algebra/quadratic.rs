//! `Sel^2(E)` over `A = Q x K`, `K = Q(sqrt D)` quadratic: curves with
//! exactly one rational point of order 2, `f(X) = (X - e) q(X)` with `q`
//! irreducible.
//!
//! An element of `A` is a pair `(r, beta)`; the image of `E(Q)` has
//! `r = N(beta)` modulo squares, so the candidates are `K(S,2)` itself
//! (the number-field module's basis, in compact form). Locally,
//! `A (x) Q_v = Q_v x (K (x) Q_v)`: the first factor's classes are the
//! rational ones ([`super::local`]); in `K (x) Q_v = Q_v[T]/(T^2 - D)` an
//! element `a + b T` is a square exactly when (for `b != 0`) its norm
//! `N = a^2 - D b^2` is a square `n^2` in `Q_v` and `(a + n)/2` or
//! `(a - n)/2` is a non-zero square in `Q_v` (write `(x + yT)^2 = a + bT`:
//! `x^2 = (a +- n)/2`, `y = b/(2x)`), and (for `b = 0`) when `a` or `a/D` is a
//! square. This holds whether `D` is a square in `Q_v` or not, so split and
//! non-split places need no separate code. At a prime the square root `n`
//! is taken modulo a power of `p` large enough that `a +- n` (whose product
//! is `D b^2`) is known to its valuation plus three digits.
//!
//! Coordinates in `(K (x) Q_v)*/squares` come from an adaptive basis: an
//! element is reduced by testing its products with every combination of
//! the basis found so far; if none is a square it joins the basis. The
//! basis never exceeds the known dimension `2 + 2 [K_v : Q_v]`-style bound
//! (see [`KvClasses::new`]), else the error is internal.

use super::local::{class_width, rational_class};
use super::{eval_cubic, AlgebraDescent, AlgebraLocalImage, AlgebraShape};
use crate::arith::{sqrt_mod_prime_power, valuation, FactorLimits};
use crate::budget::Work;
use super::roots::pvalue_capped;
use super::selmer::restrict_to_image;
use crate::descent::f2::{F2Span, SquareClasses as RationalClasses};
use crate::error::{Error, ErrorKind};
use crate::numfield::{ClassGroupOptions, FactorBaseBound, NumberField};
use crate::solubility::Place;
use malachite::base::num::arithmetic::traits::{CheckedSqrt, Lcm, Pow};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};

/// `a + b T` in `Q_v[T]/(T^2 - D)`, scaled by a rational square to integers.
type Pair = (Integer, Integer);

/// Scales `(a, b)` (rationals) by the square of the lcm of the denominators.
fn integral_pair(a: &Rational, b: &Rational) -> Pair {
    let l: Natural = a.denominator_ref().lcm(b.denominator_ref());
    let l = Rational::from(&l * &l);
    let to_int = |r: Rational| -> Integer {
        // invariant: r has denominator dividing l^2, so it is integral after scaling
        Integer::try_from(r).expect("integral after scaling by the square of the denominators")
    };
    (to_int(a * &l), to_int(b * &l))
}

fn pair_mul(x: &Pair, y: &Pair, d: &Integer) -> Pair {
    (&x.0 * &y.0 + d * &x.1 * &y.1, &x.0 * &y.1 + &x.1 * &y.0)
}

fn pair_norm(x: &Pair, d: &Integer) -> Integer {
    &x.0 * &x.0 - d * &x.1 * &x.1
}

fn int_class(n: &Integer, place: &Place) -> Option<u64> {
    rational_class(&Rational::from(n.clone()), place)
}

/// Whether `a + b T` is a square in `Q_v[T]/(T^2 - D)` (`D` not a rational square).
fn is_square_kv(x: &Pair, d: &Integer, place: &Place) -> Result<bool, Error> {
    let (a, b) = x;
    if *b == 0 {
        if *a == 0 {
            return Err(Error::internal("the algebra descent", "zero in K (x) Q_v"));
        }
        return Ok(int_class(a, place) == Some(0) || int_class(&(a * d), place) == Some(0));
    }
    let n2 = pair_norm(x, d);
    if int_class(&n2, place) != Some(0) {
        return Ok(false);
    }
    match place {
        // N > 0 and a + sqrt(N) > 0, i.e. a > 0 or a^2 < N (D < 0)
        Place::Real => Ok(*a > 0 || *d < 0),
        Place::Prime(p) => {
            let k = valuation(&n2, p).unwrap_or(0) / 2;
            let vdb = valuation(&(d * b * b), p).unwrap_or(0);
            let m = vdb + k + 8;
            let Some(n) = sqrt_mod_prime_power(&n2, p, m + 2 * k + 2) else {
                return Err(Error::internal("the algebra descent", "a local square has no square root modulo p^k"));
            };
            // x = +-n modulo p^(m + k): a +- x is known to p^m at least
            let pm = Integer::from(p.pow(u64::from(m)));
            for t in [a + &n, a - &n] {
                let mut r = &t % &pm;
                if r < 0 {
                    r += &pm;
                }
                if r == 0 {
                    continue; // the other sign carries the root
                }
                let vr = valuation(&r, p).unwrap_or(m);
                if vr + 3 >= m {
                    return Err(Error::internal("the algebra descent", "a p-adic square root lacks precision"));
                }
                if int_class(&(Integer::from(2) * r), place) == Some(0) {
                    return Ok(true);
                }
            }
            Ok(false)
        }
    }
}

/// A small element of the square class of the integral `x = a + b T` in
/// `Q_p[T]/(T^2 - D)` (`x != 0`): the even power of `p` in the content
/// dropped, then `a` and `b` reduced modulo `p^N`, `N = v_p(N(x)) + 2 v_p(2) + 1`.
/// The result `y` has `y / x = 1 + p^N delta conj(x) / N(x)` with `delta`
/// integral, so `y / x` lies in `1 + p^(2 v_p(2) + 1) O`, a square (Hensel's
/// lemma in the ring of integers `O` of `K (x) Q_p`). The elements of `K(S,2)`
/// (products of the factors of odd exponent of their compact forms) and
/// their products have many digits; the local square tests then work on
/// numbers below `p^(2N)`.
fn reduce_pair_at(x: &Pair, d: &Integer, p: &Natural) -> Pair {
    let (a, b) = x;
    let content_v = pvalue_capped(a, p, u32::MAX).min(pvalue_capped(b, p, u32::MAX));
    if content_v == u32::MAX {
        return x.clone(); // zero: the square test reports it
    }
    let pi = Integer::from(p.clone());
    let (a, b) = if content_v >= 2 {
        let pk = (&pi).pow(u64::from(content_v / 2 * 2));
        (a / &pk, b / &pk)
    } else {
        (a.clone(), b.clone())
    };
    let n = &a * &a - d * &b * &b;
    let nv = pvalue_capped(&n, p, u32::MAX);
    if nv == u32::MAX {
        return (a, b);
    }
    let prec = nv + if *p == 2u32 { 3 } else { 1 };
    let modulus = (&pi).pow(u64::from(prec));
    if a.unsigned_abs_ref() < modulus.unsigned_abs_ref() && b.unsigned_abs_ref() < modulus.unsigned_abs_ref() {
        return (a, b);
    }
    let residue = |c: &Integer| {
        let r = c % &modulus;
        if r < 0 {
            r + &modulus
        } else {
            r
        }
    };
    (residue(&a), residue(&b))
}

/// Coordinates in `(K (x) Q_v)*/squares` on an adaptive basis.
struct KvClasses {
    place: Place,
    d: Integer,
    /// `combos[mask]`: the product of the basis elements in `mask`.
    combos: Vec<Pair>,
    dim: usize,
    max_dim: usize,
}

impl KvClasses {
    /// `max_dim`: 0 or 2 at the real place (D < 0 or D > 0); at an odd
    /// prime 2 (field) or 4 (split); at 2, 4 (field) or 6 (split)
    /// (Serre, A Course in Arithmetic, II.3; for a local field of degree
    /// n over Q_2 the dimension is n + 2).
    fn new(place: &Place, d: &Integer) -> KvClasses {
        let split = int_class(d, place) == Some(0);
        let max_dim = match place {
            Place::Real => {
                if *d > 0 {
                    2
                } else {
                    0
                }
            }
            Place::Prime(p) if *p == 2u32 => {
                if split {
                    6
                } else {
                    4
                }
            }
            Place::Prime(_) => {
                if split {
                    4
                } else {
                    2
                }
            }
        };
        KvClasses { place: place.clone(), d: d.clone(), combos: vec![(Integer::ONE, Integer::ZERO)], dim: 0, max_dim }
    }

    /// `x` itself at the real place, a small element of its square class
    /// at a prime ([`reduce_pair_at`]).
    fn small(&self, x: &Pair) -> Pair {
        match &self.place {
            Place::Real => x.clone(),
            Place::Prime(p) => reduce_pair_at(x, &self.d, p),
        }
    }

    fn class_of(&mut self, x: &Pair) -> Result<u64, Error> {
        let x = &self.small(x);
        for (mask, c) in self.combos.iter().enumerate() {
            if is_square_kv(&self.small(&pair_mul(x, c, &self.d)), &self.d, &self.place)? {
                return Ok(mask as u64);
            }
        }
        if self.dim >= self.max_dim {
            return Err(Error::internal(
                "the algebra descent",
                format!("more than {} independent square classes in K (x) Q_v at {:?}", self.max_dim, self.place),
            ));
        }
        let new: Vec<Pair> = self.combos.iter().map(|c| self.small(&pair_mul(c, x, &self.d))).collect();
        self.combos.extend(new);
        self.dim += 1;
        Ok(1u64 << (self.dim - 1))
    }
}

/// The curve's cubic split as `(X - e)(X^2 + u X + w)`.
struct Split {
    e: Integer,
    u: Integer,
    w: Integer,
}

impl Split {
    /// `4 (X - theta')` as a pair, `theta' = (-u + T)/2`, scaled to integers.
    fn point_pair(&self, x: &Rational) -> Pair {
        let a = Rational::from(4) * x + Rational::from(Integer::from(2) * &self.u);
        integral_pair(&a, &Rational::from(-2))
    }
    fn q_at(&self, x: &Rational) -> Rational {
        let mut v = x.clone();
        v += Rational::from(self.u.clone());
        v *= x;
        v += Rational::from(self.w.clone());
        v
    }
    /// The local vector of the image of the point with abscissa `x`.
    fn point_vector(&self, x: &Rational, kv: &mut KvClasses, place: &Place) -> Result<u64, Error> {
        let width = class_width(place);
        let e = Rational::from(self.e.clone());
        let r = if *x == e { self.q_at(x) } else { x - &e };
        let qc = rational_class(&r, place).ok_or_else(|| Error::internal("the algebra descent", "zero class"))?;
        Ok(qc | kv.class_of(&self.point_pair(x))? << width)
    }
}

/// `n / p^(2k)`, `c + n p^k` for the given centres `c` (the rational root,
/// approximations of the other roots in `Q_p`, their midpoint).
pub(super) fn candidates(p: &Natural, roots: Vec<Rational>, depth: u32, reach: i64) -> impl Iterator<Item = Rational> {
    let p = Rational::from(p.clone());
    (0..=depth).flat_map(move |k| {
        let pk = (&p).pow(k as u64);
        let p2k = (&p).pow(2 * k as u64);
        let roots = roots.clone();
        (1..=reach).flat_map(move |n| {
            let mut v = Vec::with_capacity(2 + 2 * roots.len());
            for s in [n, -n] {
                let r = Rational::from(s);
                v.push(&r / &p2k);
                for ei in &roots {
                    v.push(ei + &r * &pk);
                }
            }
            if n == 1 {
                v.push(Rational::ZERO);
            }
            v
        })
    })
}

/// Fields with `|d_K|` at most this use the Minkowski bound (an
/// unconditional `K(S,2)`; the bound is then below about `2 * 10^5`).
const UNCONDITIONAL_DISC: u64 = 1_000_000_000_000;

/// The class group options for `K(S,2)` within `work`: unconditional (the
/// Minkowski bound) for cubic fields with `|d_K|` up to [`UNCONDITIONAL_DISC`], else the
/// number-field module's choice (Bach's bound, conditional on GRH, when it
/// is the smaller).
pub(super) fn grh_options(k: &NumberField, work: &Work) -> ClassGroupOptions {
    let mut opts = ClassGroupOptions::default();
    if let Some(t) = work.deadline() {
        opts = opts.with_deadline(t);
    }
    if let Some(c) = work.cancel_flag() {
        opts = opts.with_cancel(c.clone());
    }
    let d = k.discriminant();
    opts.with_unconditional(k.degree() == 3 && *d <= UNCONDITIONAL_DISC && *d >= -Integer::from(UNCONDITIONAL_DISC))
}

/// `Sel^2(E)` for `A = Q x K`.
pub(super) fn rational_times_quadratic(cubic: [Integer; 3], e: Integer, s: Vec<Natural>, work: &Work) -> Result<AlgebraDescent, Error> {
    let u = &cubic[2] + &e;
    let w = &cubic[1] + &e * &u;
    if -(&e * &w) != cubic[0] {
        return Err(Error::internal("the algebra descent", "the rational root does not divide the cubic"));
    }
    let d = &u * &u - Integer::from(4) * &w;
    let sp = Split { e: e.clone(), u: u.clone(), w: w.clone() };
    let s_words: Vec<u64> = s
        .iter()
        .map(|p| u64::try_from(p).map_err(|_| Error::new(ErrorKind::TooLarge, "a prime of S above 2^64")))
        .collect::<Result<_, _>>()?;
    let limits = FactorLimits::within(work);
    // D = m^2 D0 with D0 square-free: every prime of D divides disc(f), so lies in S
    let mut d0 = if d < 0 { -Integer::ONE } else { Integer::ONE };
    let mut rest = d.clone();
    for p in &s {
        let pi = Integer::from(p.clone());
        let v = valuation(&rest, p).unwrap_or(0);
        for _ in 0..v {
            rest /= &pi;
        }
        if v % 2 == 1 {
            d0 *= &pi;
        }
    }
    let m = match Natural::try_from(&d / &d0).ok().and_then(|n| n.checked_sqrt()) {
        Some(m) => Integer::from(m),
        _ => return Err(Error::new(ErrorKind::InvalidValue, "a prime of disc(q) is missing from S")),
    };
    // disc(x^2 - D0) = 4 D0: its primes are 2 and those of S already
    let k = NumberField::with_known_primes(&[-d0.clone(), Integer::ZERO, Integer::ONE], &s, &limits)?;
    let ks = k.square_classes(&s_words, &grh_options(&k, work))?;
    let grh = ks.bound_kind == FactorBaseBound::BachGrh;
    let n = ks.dimension();
    if n > 64 {
        return Err(Error::new(ErrorKind::TooLarge, "K(S,2) of dimension above 64"));
    }
    // the factors with odd exponent of each basis element, as pairs a + b T
    // (T = sqrt(D) = 2 theta' + u), scaled by squares
    let basis_factors: Vec<Vec<Pair>> = ks
        .basis
        .iter()
        .map(|b| {
            b.factors
                .iter()
                .filter(|(_, x)| x.rem_euclid(2) == 1)
                .map(|(el, _)| {
                    let c = k.to_power_basis(el);
                    let zero = Rational::ZERO;
                    let c0 = c.first().unwrap_or(&zero);
                    let c1 = c.get(1).unwrap_or(&zero);
                    // beta = c0 + c1 sqrt(D0) = c0 + (c1 / m) T
                    integral_pair(c0, &(c1 / Rational::from(m.clone())))
                })
                .collect()
        })
        .collect();
    let mut places = vec![Place::Real];
    places.extend(s.iter().cloned().map(Place::Prime));
    let mut current: Vec<u64> = (0..n).map(|j| 1u64 << j).collect();
    let mut images = Vec::new();
    let ef = Rational::from(e.clone());
    for place in &places {
        if work.exhausted() {
            return Err(Error::new(ErrorKind::Budget, "the algebra descent ran out of time"));
        }
        let width = class_width(place);
        let mut kv = KvClasses::new(place, &d);
        let split = int_class(&d, place) == Some(0);
        let target = match place {
            Place::Real => usize::from(d > 0),
            Place::Prime(p) => 1 + usize::from(split) + usize::from(*p == 2u32),
        };
        let mut span = F2Span::new();
        span.insert(sp.point_vector(&ef, &mut kv, place)?);
        let mut witnesses = Vec::new();
        match place {
            Place::Real => {
                if span.dim() < target {
                    // e is the largest real root: X = -u/2 lies between the other two, f(X) = (X - e)(-D/4) > 0
                    let x = Rational::from_integers(-u.clone(), Integer::from(2));
                    if eval_cubic(&cubic, &x) <= Rational::ZERO {
                        return Err(Error::internal("the algebra descent", "no real point between the two smaller roots"));
                    }
                    if span.insert(sp.point_vector(&x, &mut kv, place)?) {
                        witnesses.push(x);
                    }
                }
            }
            Place::Prime(p) => {
                let close = (valuation(&d, p).unwrap_or(0).max(2 * valuation(&sp.q_at(&ef).numerator_ref().into(), p).unwrap_or(0)) / 2) as u32;
                let depth = close + if *p == 2u32 { 6 } else { 3 };
                let reach = if *p == 2u32 { 64 } else { 2 * u64::try_from(p).map_or(64, |q| q.min(64)) as i64 };
                // centres: e, the midpoint -u/2 of the conjugate roots (the
                // points nearest both where they are not in Q_p), and
                // approximations of the roots of q in Q_p where they are
                let mut roots = vec![ef.clone(), Rational::from_integers(-u.clone(), Integer::from(2))];
                if split {
                    let prec = 2 * depth + 8;
                    let pm = Integer::from(p.pow(u64::from(prec)));
                    if let Some(delta) = sqrt_mod_prime_power(&d, p, prec) {
                        for t in [-&u + &delta, -&u - &delta] {
                            if *p == 2u32 {
                                if (&t % Integer::from(2)) == 0 {
                                    roots.push(Rational::from(t / Integer::from(2)));
                                }
                            } else {
                                let half = (&pm + Integer::ONE) / Integer::from(2);
                                let mut r = (t * half) % &pm;
                                if r < 0 {
                                    r += &pm;
                                }
                                roots.push(Rational::from(r));
                            }
                        }
                    }
                }
                for (count, x) in candidates(p, roots, depth, reach).enumerate() {
                    if span.dim() >= target {
                        break;
                    }
                    if count % 256 == 0 && work.exhausted() {
                        return Err(Error::new(ErrorKind::Budget, "the local images of the algebra descent ran out of time"));
                    }
                    let fx = eval_cubic(&cubic, &x);
                    if rational_class(&fx, place) != Some(0) {
                        continue;
                    }
                    if span.insert(sp.point_vector(&x, &mut kv, place)?) {
                        witnesses.push(x);
                    }
                }
            }
        }
        if span.dim() != target {
            return Err(Error::internal(
                "the algebra descent",
                format!("the local image at {place:?} has dimension {} instead of {target}", span.dim()),
            ));
        }
        // the candidates' localisations: (class of N(beta), class of beta)
        let mut loc = Vec::with_capacity(n);
        for fs in &basis_factors {
            let mut v = 0u64;
            for f in fs {
                let qc = int_class(&pair_norm(f, &d), place).ok_or_else(|| Error::internal("the algebra descent", "zero norm"))?;
                v ^= qc | kv.class_of(f)? << width;
            }
            loc.push(v);
        }
        current = restrict_to_image(&current, &loc, &span);
        images.push(AlgebraLocalImage { place: place.clone(), dim: span.dim(), witnesses });
    }
    let mut selmer = F2Span::new();
    for &c in &current {
        selmer.insert(c);
    }
    // the image of the point of order 2, e - theta', must be a Selmer element
    // e - theta' = (e + u/2) - (m/2) sqrt(D0)
    let half = Rational::from_integers(Integer::ONE, Integer::from(2));
    let t_elem = k.from_power_basis(&[&ef + Rational::from(u.clone()) * &half, -Rational::from(m.clone()) * &half])?;
    let coords = ks.coordinates(&k, &t_elem, &limits)?;
    let tv = coords.iter().enumerate().fold(0u64, |v, (j, &b)| v | (u64::from(b) << j));
    if !selmer.contains(tv) {
        return Err(Error::internal("the algebra descent", "the image of the point of order 2 is not in the Selmer group"));
    }
    // output: each basis element as (square-free norm class, bit mask over the K(S,2) basis)
    let rc = RationalClasses::new(s.clone());
    let selmer_basis = selmer
        .basis()
        .iter()
        .map(|&v| {
            let mut norm = Integer::ONE;
            for (j, fs) in basis_factors.iter().enumerate() {
                if v >> j & 1 == 1 {
                    for f in fs {
                        norm *= pair_norm(f, &d);
                    }
                }
            }
            let nv = rc
                .vector_of(&Rational::from(norm))
                .ok_or_else(|| Error::internal("the algebra descent", "the norm of a Selmer element is not in Q(S,2)"))?;
            Ok(vec![rc.integer_of(nv), Integer::from(v)])
        })
        .collect::<Result<Vec<_>, Error>>()?;
    let dim = selmer.dim();
    // the candidates as elements of A = Q[X]/((X - e) q): (N(beta), beta) for
    // beta = a + b T, T = 2 X + u modulo q, as beta(X) + k q(X) with
    // k = (N(beta) - beta(e)) / q(e)
    let qe = sp.q_at(&ef);
    let candidates = basis_factors
        .iter()
        .map(|fs| {
            let (a, b) = fs.iter().fold((Integer::ONE, Integer::ZERO), |acc, f| pair_mul(&acc, f, &d));
            let r = Rational::from(pair_norm(&(a.clone(), b.clone()), &d));
            let c0 = Rational::from(&a + &b * &u);
            let c1 = Rational::from(Integer::from(2) * &b);
            let kq = (&r - (&c0 + &c1 * &ef)) / &qe;
            [c0 + &kq * Rational::from(w.clone()), c1 + &kq * Rational::from(u.clone()), kq]
        })
        .collect();
    if dim == 0 {
        return Err(Error::internal("the algebra descent", "Sel^2(E) misses the point of order 2"));
    }
    Ok(AlgebraDescent {
        candidates,
        selmer_masks: selmer.basis().to_vec(),
        field_discriminant: Some(k.discriminant().clone()),
        generation_bound: Some(ks.generation_bound),
        shape: AlgebraShape::RationalTimesQuadratic,
        cubic,
        primes: s,
        selmer_basis,
        selmer_dim: dim,
        two_torsion_dim: 1,
        upper: dim - 1,
        local_images: images,
        conditional_on_grh: grh,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// `reduce_pair_at` keeps the local square class: `x` times its reduction
    /// is a square in `Q_p[T]/(T^2 - D)` (and, by the square test's own
    /// check, so is the reduction of `x y^2`), on elements built with high
    /// powers of `p` and many digits, for split, inert and ramified `D`.
    #[test]
    fn reduction_keeps_the_local_class() {
        let mut seed = 0x2545_f491_4f6c_dd1du64;
        let mut next = || {
            seed ^= seed << 13;
            seed ^= seed >> 7;
            seed ^= seed << 17;
            seed
        };
        for (p, d) in [(2u32, -7i64), (2, 5), (2, -4), (2, 12), (3, -5), (3, 7), (3, 12), (5, -1), (5, 6), (7, 5), (13, -3)] {
            let (pn, d) = (Natural::from(p), Integer::from(d));
            let place = Place::Prime(pn.clone());
            for _ in 0..40 {
                let big = |r: u64| Integer::from(r as i64 >> 20) * Integer::from(p).pow(r % 9) * Integer::from(1_000_003u64).pow(r % 4);
                let x: Pair = (big(next()), big(next()));
                if pair_norm(&x, &d) == 0 {
                    continue;
                }
                let y = reduce_pair_at(&x, &d, &pn);
                assert!(is_square_kv(&pair_mul(&x, &y, &d), &d, &place).unwrap(), "{x:?} -> {y:?} at {p}, D = {d}");
                let (a, b) = (&y.0, &y.1);
                let bound = Integer::from(p).pow(u64::from(pvalue_capped(&pair_norm(&y, &d), &pn, 64)) + 3);
                assert!(a.unsigned_abs_ref() < bound.unsigned_abs_ref() || a.unsigned_abs_ref() <= x.0.unsigned_abs_ref());
                assert!(b.unsigned_abs_ref() <= x.1.unsigned_abs_ref().max(bound.unsigned_abs_ref()));
            }
        }
    }
}
