//! `Sel^2(E)` over `A = K`, a cubic field: curves without a rational point
//! of order 2 (`f` irreducible over Q).
//!
//! The candidates are the classes of `K(S,2)` (from the number-field
//! module) whose norm is a square: the image of `E(Q)` has norm `Y^2`.
//!
//! Local classes. `K (x) Q_v` is a product of fields of total degree 3, and
//! its square classes split as `Q_v*/squares` (the rationals: the norm of a
//! rational `r` is `r^3`, so the map is injective) times the classes of
//! norm a square: `alpha = N(alpha) * (alpha N(alpha))` modulo squares, and
//! `alpha N(alpha)` has norm `N(alpha)^4`. The first coordinate is the
//! rational class of `N(alpha)` ([`super::local`]); the second lies in the
//! classes of global square norm, where the square test is exact:
//!
//! for `gamma` not rational with `N(gamma) = n^2` (`n` rational),
//! `gamma` is a square in `K (x) Q_v` exactly when the resolvent
//! `R(s) = (s^2 - a1)^2 - 8 n s - 4 a2` has a root in `Q_v`, where
//! `a1 = Tr(gamma)` and `a2` is the second symmetric function of the
//! conjugates. (If `gamma = beta^2`, `s = Tr(beta)` with `N(beta) = n`
//! is a root, by `a1 = s1^2 - 2 s2`, `a2 = s2^2 - 2 s1 s3`; conversely a
//! root `s1` gives `c(Z) = Z^3 - s1 Z^2 + s2 Z - n` with
//! `c(Z) (-c(-Z)) = h(Z^2)`, `h` the characteristic polynomial of `gamma`,
//! and since `h(Z^2)` is separable the roots of `c` pick one square root
//! of each conjugate, stably under Galois: a square root in the algebra.)
//! A rational `gamma` of square norm is a rational square.
//!
//! Coordinates of the second part come from an adaptive basis, as in
//! `quadratic.rs`, bounded by the known dimension: with `g` fields in
//! `K (x) Q_p` (`g = 1, 2, 3` as `f` has 0, 1, 3 roots in `Q_p`), `2g - 2`
//! at an odd prime, `2g` at 2, `r1 - 1` at the real place (Serre, A Course
//! in Arithmetic, II.3). The local image has dimension
//! `dim E(Q_v)[2] + [v = 2]` (`- 1` at the real place), found from local
//! points kept as witnesses.

use super::covering::CubicContext;
use super::local::{class_width, rational_class};
use super::quadratic::{candidates, grh_options};
use super::roots::{has_root_in_qp, integral_roots, pvalue_capped, real_root_count};
use super::selmer::restrict_to_image;
use super::{eval_cubic, AlgebraDescent, AlgebraLocalImage, AlgebraShape};
use crate::arith::FactorLimits;
use crate::budget::Work;
use crate::descent::f2::{F2Span, SquareClasses as RationalClasses};
use crate::error::{Error, ErrorKind};
use crate::numfield::{Element, NumberField};
use crate::solubility::Place;
use malachite::base::num::arithmetic::traits::{CheckedSqrt, FloorSqrt, Pow};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};

/// A small element in the square class of `gamma` (norm a rational square,
/// not zero) in `K (x) Q_p`, again of square norm.
///
/// `den^2 gamma` is integral; its even power of `p` in the content is
/// dropped. Then `gamma'`, its coordinates on the integral basis reduced
/// modulo `p^N` with `N = v_p(N(gamma)) + 2 v_p(2) + 1`, has
/// `gamma' / gamma = 1 + x` with `v_P(x) >= N e_P - v_P(gamma) >
/// 2 v_P(2)` at every prime `P` above `p` (`v_P(gamma) <= v_p(N(gamma))`
/// for integral `gamma`), a square by Hensel's lemma. Its norm is then a
/// square in `Q_p`, so `u`, that norm without its even power of `p`, is
/// a square in `Q_p` and `gamma' u` (norm `u^4 p^(2j)`) is in the class of
/// `gamma`. Without this the elements of `K(S,2)` (thousands of digits,
/// divisible by high powers of the primes above `p`) gave resolvents whose
/// roots agree in tens of thousands of `p`-adic digits.
fn reduce_at(k: &NumberField, gamma: &Element, p: &Natural) -> Result<Element, Error> {
    let den = gamma.den().clone();
    let mut coords: Vec<Integer> = gamma.coords().iter().map(|c| c * &den).collect();
    let pi = Integer::from(p.clone());
    let content_v = coords.iter().filter(|c| **c != 0).fold(u32::MAX, |v, c| pvalue_capped(c, p, v));
    if content_v == u32::MAX {
        return Err(Error::internal("the algebra descent", "a square test on zero"));
    }
    if content_v >= 2 {
        let pk = pi.clone().pow(u64::from(content_v / 2 * 2));
        for c in coords.iter_mut() {
            *c /= &pk;
        }
    }
    let integral = k.element(&coords)?;
    let norm = k.norm_num(&integral);
    if norm == 0 {
        return Err(Error::internal("the algebra descent", "a square test on zero"));
    }
    let nv = pvalue_capped(&norm, p, u32::MAX);
    let prec = nv + if *p == 2u32 { 3 } else { 1 };
    let modulus = pi.clone().pow(u64::from(prec));
    if coords.iter().all(|c| c.unsigned_abs_ref() < modulus.unsigned_abs_ref()) {
        return Ok(gamma.clone()); // already small: keep the exact element
    }
    let reduced: Vec<Integer> = coords
        .iter()
        .map(|c| {
            let r = c % &modulus;
            if r < 0 {
                r + &modulus
            } else {
                r
            }
        })
        .collect();
    let small = k.element(&reduced)?;
    let norm = k.norm_num(&small);
    if norm == 0 {
        return Err(Error::internal("the algebra descent", "a reduced element of norm zero"));
    }
    let v = pvalue_capped(&norm, p, u32::MAX);
    if v != nv {
        return Err(Error::internal("the algebra descent", "the reduction modulo p^N changed the valuation of the norm"));
    }
    let u = norm / pi.pow(u64::from(v / 2 * 2));
    Ok(k.mul(&small, &k.rational(&Rational::from(u))))
}

/// Whether `gamma` (norm a rational square) is a square in `K (x) Q_v`.
fn is_square_local(k: &NumberField, gamma: &Element, place: &Place) -> Result<bool, Error> {
    let reduced;
    let gamma = match place {
        Place::Prime(p) => {
            reduced = reduce_at(k, gamma, p)?;
            &reduced
        }
        Place::Real => gamma,
    };
    let c = k.to_power_basis(gamma);
    if c.iter().skip(1).all(|x| *x == 0) {
        return Ok(true); // a rational with square norm r^3 is a square
    }
    let norm = k.norm(gamma);
    let root = |x: &Natural| x.checked_sqrt();
    let n = match (root(norm.numerator_ref()), root(norm.denominator_ref())) {
        (Some(a), Some(b)) if norm > 0 => Rational::from_naturals(a, b),
        _ => return Err(Error::internal("the algebra descent", "a square test on an element whose norm is not a square")),
    };
    let a1 = k.trace(gamma);
    let a2 = (&a1 * &a1 - k.trace(&k.mul(gamma, gamma))) / Rational::from(2);
    // R(s) = s^4 - 2 a1 s^2 - 8 n s + a1^2 - 4 a2
    let r = [&a1 * &a1 - Rational::from(4) * &a2, Rational::from(-8) * n, Rational::from(-2) * &a1, Rational::ZERO, Rational::ONE];
    match place {
        Place::Real => Ok(real_root_count(&r) > 0),
        Place::Prime(p) => has_root_in_qp(&r, p),
    }
}

/// Coordinates in `(K (x) Q_v)*/squares`: the rational class of the norm
/// (low bits) and the adaptive coordinates of `alpha N(alpha)`.
struct CubicClasses<'a> {
    k: &'a NumberField,
    place: Place,
    width: u32,
    combos: Vec<Element>,
    dim: usize,
    max_dim: usize,
}

impl CubicClasses<'_> {
    fn class_of(&mut self, alpha: &Element) -> Result<u64, Error> {
        let norm = self.k.norm(alpha);
        let rc = rational_class(&norm, &self.place).ok_or_else(|| Error::internal("the algebra descent", "zero norm"))?;
        let beta = self.k.mul(alpha, &self.k.rational(&norm));
        for (mask, c) in self.combos.iter().enumerate() {
            if is_square_local(self.k, &self.k.mul(&beta, c), &self.place)? {
                return Ok(rc | (mask as u64) << self.width);
            }
        }
        if self.dim >= self.max_dim {
            return Err(Error::internal(
                "the algebra descent",
                format!("more than {} independent square classes of square norm at {:?}", self.max_dim, self.place),
            ));
        }
        let new: Vec<Element> = self.combos.iter().map(|c| self.k.mul(c, &beta)).collect();
        self.combos.extend(new);
        self.dim += 1;
        Ok(rc | 1u64 << (self.width as usize + self.dim - 1))
    }
}

/// A real point on the bounded component (`f` with three real roots):
/// near the local maximum `X0 = (-c2 - sqrt(c2^2 - 3 c1))/3`.
fn egg_point(cubic: &[Integer; 3]) -> Option<Rational> {
    let d = &cubic[2] * &cubic[2] - Integer::from(3) * &cubic[1];
    let d = Natural::try_from(d).ok()?;
    for bits in (0..=400u64).step_by(8) {
        let scale = Natural::ONE << bits;
        let s = (&d * &scale * &scale).floor_sqrt();
        for t in [Integer::from(s.clone()), Integer::from(s) + Integer::ONE] {
            let x = Rational::from_integers(-Integer::from(scale.clone()) * &cubic[2] - t, Integer::from(scale.clone()) * Integer::from(3));
            if eval_cubic(cubic, &x) > 0 {
                return Some(x);
            }
        }
    }
    None
}

/// `Sel^2(E)` for `A = K` cubic, with the field and the explicit Selmer
/// basis (for the coverings).
pub(super) fn cubic_field(cubic: [Integer; 3], s: Vec<Natural>, work: &Work) -> Result<(AlgebraDescent, CubicContext), Error> {
    let s_words: Vec<u64> = s
        .iter()
        .map(|p| u64::try_from(p).map_err(|_| Error::new(ErrorKind::TooLarge, "a prime of S above 2^64")))
        .collect::<Result<_, _>>()?;
    let limits = FactorLimits::within(work);
    let poly = [cubic[0].clone(), cubic[1].clone(), cubic[2].clone(), Integer::ONE];
    // disc(f) is 2^12 disc(E) times squares, so its primes are those of S
    // (the curve's factored discriminant, `s_primes`): only a cofactor
    // missed by S would be factored here
    let k = NumberField::with_known_primes(&poly, &s, &limits)?;
    let ks = k.square_classes(&s_words, &grh_options(&k, work))?;
    let grh = ks.conditional_on_grh();
    let n = ks.dimension();
    if n > 64 {
        return Err(Error::new(ErrorKind::TooLarge, "K(S,2) of dimension above 64"));
    }
    // each basis element as an explicit element (the factors of odd exponent)
    let basis: Vec<Element> = ks
        .basis
        .iter()
        .map(|b| {
            b.factors.iter().filter(|(_, x)| x.rem_euclid(2) == 1).fold(Ok(k.one()), |acc: Result<Element, Error>, (el, _)| Ok(k.mul(&acc?, el)))
        })
        .collect::<Result<_, _>>()?;
    // the candidates: classes of square norm
    let rc = RationalClasses::new(s.clone());
    let norms: Vec<u64> = basis
        .iter()
        .map(|b| rc.vector_of(&k.norm(b)).ok_or_else(|| Error::internal("the algebra descent", "the norm of an element of K(S,2) is not in Q(S,2)")))
        .collect::<Result<_, _>>()?;
    let identity: Vec<u64> = (0..n).map(|j| 1u64 << j).collect();
    let mut current = restrict_to_image(&identity, &norms, &F2Span::new());
    let theta = k.generator();
    let (r1, _) = k.signature();
    let mut places = vec![Place::Real];
    places.extend(s.iter().cloned().map(Place::Prime));
    let mut images = Vec::new();
    for place in &places {
        if work.exhausted() {
            return Err(Error::new(ErrorKind::Budget, "the algebra descent ran out of time"));
        }
        let width = class_width(place);
        // the roots of f in Q_v, and approximations of them at a prime
        let (real_roots, centres, depth) = match place {
            Place::Real => (r1, vec![], 0),
            Place::Prime(p) => {
                let disc = k.polynomial_discriminant();
                let close = crate::arith::valuation(disc, p).unwrap_or(0) / 2;
                let depth = close + if *p == 2u32 { 6 } else { 3 };
                let found = integral_roots(&poly, p, 2 * depth + 8, false)?;
                let pw = u64::try_from(p).map_err(|_| Error::new(ErrorKind::TooLarge, "a prime of S above 2^64"))?;
                let g = k.primes_above(pw)?.len();
                if g != [1usize, 2, 0, 3][found.len().min(3)] {
                    return Err(Error::internal(
                        "the algebra descent",
                        format!("{} roots of f in Q_{p} but {g} primes above {p}", found.len()),
                    ));
                }
                (found.len(), found.into_iter().map(Rational::from).collect::<Vec<_>>(), depth)
            }
        };
        let torsion_dim = match real_roots {
            3 => 2,
            1 => 1,
            _ => 0,
        };
        let g = match real_roots {
            3 => 3,
            1 => 2,
            _ => 1,
        };
        let (target, max_dim) = match place {
            Place::Real => (torsion_dim - 1, r1 - 1),
            Place::Prime(p) if *p == 2u32 => (torsion_dim + 1, 2 * g),
            Place::Prime(_) => (torsion_dim, 2 * g - 2),
        };
        let mut kv = CubicClasses { k: &k, place: place.clone(), width, combos: vec![k.one()], dim: 0, max_dim };
        let mut span = F2Span::new();
        let mut witnesses = Vec::new();
        let point_vector = |x: &Rational, kv: &mut CubicClasses| kv.class_of(&k.sub(&k.rational(x), &theta));
        match place {
            Place::Real => {
                if target > 0 {
                    let x = egg_point(&cubic).ok_or_else(|| Error::internal("the algebra descent", "no real point on the bounded component"))?;
                    if span.insert(point_vector(&x, &mut kv)?) {
                        witnesses.push(x);
                    }
                }
            }
            Place::Prime(p) => {
                // first the points near the points of order 2 of E(Q_p):
                // X = e + f'(e) p^(2k) has f(X) = f'(e)^2 p^(2k) (1 + O(p^(2k)))
                let pq = Rational::from(p.clone());
                let near_torsion: Vec<Rational> = centres
                    .iter()
                    .flat_map(|e| {
                        let slope = Rational::from(3) * e * e + Rational::from(Integer::from(2) * &cubic[2]) * e + Rational::from(cubic[1].clone());
                        let (e, pq) = (e.clone(), pq.clone());
                        (2..=depth.max(2)).map(move |k| &e + &slope * (&pq).pow(2 * u64::from(k)))
                    })
                    .collect();
                // then a wider net: residues up to p^3 (64 to 512; 2048 at 2) about 0 and the roots
                let reach = if *p == 2u32 { 2048 } else { u64::try_from(p).map_or(512, |q| q.saturating_pow(3).clamp(64, 512)) as i64 };
                let mut centres = centres;
                if centres.len() == 1 {
                    // the midpoint of the two conjugate roots, where the
                    // reduction's singular point lies when they are close
                    let mid = (Rational::from(-cubic[2].clone()) - &centres[0]) / Rational::from(2);
                    centres.push(mid);
                }
                centres.push(Rational::ZERO);
                for (count, x) in near_torsion.into_iter().chain(candidates(p, centres, depth, reach)).enumerate() {
                    if span.dim() >= target {
                        break;
                    }
                    if count % 256 == 0 && work.exhausted() {
                        return Err(Error::new(ErrorKind::Budget, "the local images of the algebra descent ran out of time"));
                    }
                    if rational_class(&eval_cubic(&cubic, &x), place) != Some(0) {
                        continue;
                    }
                    if span.insert(point_vector(&x, &mut kv)?) {
                        witnesses.push(x);
                    }
                }
            }
        }
        if span.dim() > target {
            return Err(Error::internal(
                "the algebra descent",
                format!("the local image at {place:?} has dimension {} above its known {target}", span.dim()),
            ));
        }
        if span.dim() < target {
            // the point search stopped short: the route is left unfinished
            // (the pipeline leaves it out), never a larger Selmer group
            return Err(Error::new(
                ErrorKind::TooLarge,
                format!("the local point search at {place:?} reached dimension {} of {target}", span.dim()),
            ));
        }
        let loc: Vec<u64> = basis.iter().map(|b| kv.class_of(b)).collect::<Result<_, _>>()?;
        current = restrict_to_image(&current, &loc, &span);
        images.push(AlgebraLocalImage { place: place.clone(), dim: span.dim(), witnesses });
    }
    let mut selmer = F2Span::new();
    for &c in &current {
        selmer.insert(c);
    }
    let selmer_basis = selmer.basis().iter().map(|&v| vec![Integer::from(v)]).collect();
    let dim = selmer.dim();
    let elements: Vec<Element> = selmer
        .basis()
        .iter()
        .map(|&v| (0..n).filter(|j| v >> j & 1 == 1).fold(k.one(), |acc, j| k.mul(&acc, &basis[j])))
        .collect();
    let candidates = basis
        .iter()
        .map(|b| {
            let c = k.to_power_basis(b);
            std::array::from_fn(|i| c.get(i).cloned().unwrap_or(Rational::ZERO))
        })
        .collect();
    let descent = AlgebraDescent {
        candidates,
        selmer_masks: selmer.basis().to_vec(),
        field_discriminant: Some(k.discriminant().clone()),
        generation_bound: Some(ks.generation_bound),
        shape: AlgebraShape::Cubic,
        cubic,
        primes: s,
        selmer_basis,
        selmer_dim: dim,
        two_torsion_dim: 0,
        upper: dim,
        local_images: images,
        conditional_on_grh: grh,
    };
    Ok((descent, CubicContext { k, selmer: elements }))
}
