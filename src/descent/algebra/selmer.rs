//! The Selmer group as a subgroup of the candidates: local images from
//! local points, then the F2 kernel of the localisation maps modulo them.

use super::local::{class_width, rational_class};
use super::{eval_cubic, interpolate, AlgebraDescent, AlgebraLocalImage, AlgebraShape};
use crate::budget::Work;
use crate::descent::f2::{kernel, F2Span, SquareClasses};
use crate::error::{Error, ErrorKind};
use crate::solubility::Place;
use malachite::base::num::arithmetic::traits::Pow;
use malachite::base::num::basic::traits::Zero;
use malachite::{Integer, Natural, Rational};

/// The two coordinates `(X - e1, X - e2)` of the image of the point with
/// abscissa `x` in `(Q*/Q*^2)^2` (the third is their product), with the
/// correction at `x = e1` and `x = e2`.
///
/// ```
/// use malachite::Rational;
/// use twofold::descent::algebra::image_pair;
/// let e = [Rational::from(-24), Rational::from(0), Rational::from(24)];
/// // X = 4x on y^2 = x^3 - 36x: the point (-3, 9) has X = -12
/// assert_eq!(image_pair(&Rational::from(-12), &e), (Rational::from(12), Rational::from(-12)));
/// ```
pub fn image_pair(x: &Rational, e: &[Rational; 3]) -> (Rational, Rational) {
    let d = |i: usize, j: usize| &e[i] - &e[j];
    if *x == e[0] {
        (d(0, 1) * d(0, 2), d(0, 1))
    } else if *x == e[1] {
        (d(1, 0), d(1, 0) * d(1, 2))
    } else {
        (x - &e[0], x - &e[1])
    }
}

/// The local class of the pair, `width` bits per coordinate.
fn local_pair(pair: &(Rational, Rational), place: &Place, width: u32) -> Option<u64> {
    Some(rational_class(&pair.0, place)? | rational_class(&pair.1, place)? << width)
}

/// The candidate abscissae tried at a finite place, in a fixed order:
/// `n / p^(2k)` and `e_i + n p^k`.
fn candidates(p: &Natural, e: &[Rational; 3], depth: u32, reach: i64) -> impl Iterator<Item = Rational> {
    let p = Rational::from(p.clone());
    let e = e.clone();
    (0..=depth).flat_map(move |k| {
        let pk = (&p).pow(k as u64);
        let p2k = (&p).pow(2 * k as u64);
        let e = e.clone();
        (1..=reach).flat_map(move |n| {
            let mut v = Vec::with_capacity(8);
            for s in [n, -n] {
                let r = Rational::from(s);
                v.push(&r / &p2k);
                for ei in &e {
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

/// The image of `E(Q_v)/2E(Q_v)` in the local classes of the pairs, with
/// the witnesses that span it beyond the torsion.
fn local_image(e: &[Rational; 3], cubic: &[Integer; 3], place: &Place, work: &Work) -> Result<(F2Span, Vec<Rational>), Error> {
    let width = class_width(place);
    let target = match place {
        Place::Real => 1,
        Place::Prime(p) if *p == 2u32 => 3,
        Place::Prime(_) => 2,
    };
    let mut span = F2Span::new();
    for ei in e {
        let v = local_pair(&image_pair(ei, e), place, width).ok_or_else(|| Error::internal("the algebra descent", "zero class"))?;
        span.insert(v);
    }
    let mut witnesses = Vec::new();
    if span.dim() < target {
        let Place::Prime(p) = place else {
            return Err(Error::internal("the algebra descent", "the real image is not spanned by the points of order 2"));
        };
        // precision: a few digits beyond the closest pair of roots
        let mut close = 0;
        for (i, j) in [(0, 1), (0, 2), (1, 2)] {
            let (n, d) = (&e[i] - &e[j]).to_numerator_and_denominator();
            let v = crate::arith::valuation(&Integer::from(n), p).unwrap_or(0) as i64
                - crate::arith::valuation(&Integer::from(d), p).unwrap_or(0) as i64;
            close = close.max(v);
        }
        let depth = close as u32 + if *p == 2u32 { 6 } else { 3 };
        let reach = if *p == 2u32 { 64 } else { 2 * u64::try_from(p).map_or(64, |q| q.min(64)) as i64 };
        for (count, x) in candidates(p, e, depth, reach).enumerate() {
            if count % 256 == 0 && work.exhausted() {
                return Err(Error::new(ErrorKind::Budget, "the local images of the algebra descent ran out of time"));
            }
            let fx = eval_cubic(cubic, &x);
            if rational_class(&fx, place) != Some(0) {
                continue;
            }
            let v = local_pair(&image_pair(&x, e), place, width).ok_or_else(|| Error::internal("the algebra descent", "zero class"))?;
            if span.insert(v) {
                witnesses.push(x);
                if span.dim() >= target {
                    break;
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
    Ok((span, witnesses))
}

/// The candidates kept at one place: `current` lists candidates as bit
/// masks over the columns `loc` (the localisations of the candidate basis);
/// returns a basis of those combinations whose localisation lies in `span`
/// (the local image), as masks over the same columns.
pub(super) fn restrict_to_image(current: &[u64], loc: &[u64], span: &F2Span) -> Vec<u64> {
    let combine = |mask: u64, vectors: &[u64]| -> u64 {
        vectors.iter().enumerate().filter(|(j, _)| mask >> j & 1 == 1).fold(0u64, |v, (_, l)| v ^ l)
    };
    let reduced: Vec<u128> = current.iter().map(|&c| span.reduce(combine(c, loc)) as u128).collect();
    kernel(&reduced).iter().map(|&comb| combine(comb, current)).collect()
}

/// `Sel^2(E)` for `A = Q x Q x Q`: candidates `(a1, a2)` in `Q(S,2)^2`.
pub(super) fn three_rational(cubic: [Integer; 3], roots: [Integer; 3], s: Vec<Natural>, work: &Work) -> Result<AlgebraDescent, Error> {
    let m = 1 + s.len();
    if 2 * m > 64 {
        return Err(Error::new(ErrorKind::TooLarge, "more than 31 primes in S"));
    }
    let e = roots.clone().map(Rational::from);
    let classes = SquareClasses::new(s.clone());
    let mut places = vec![Place::Real];
    places.extend(s.iter().cloned().map(Place::Prime));
    // the candidate basis: bit j < m is the j-th class of a1, bit m + j of a2
    let basis_class = |j: usize| classes.integer_of(1u64 << j);
    let mut current: Vec<u64> = (0..2 * m).map(|j| 1u64 << j).collect();
    let mut images = Vec::new();
    for place in &places {
        if work.exhausted() {
            return Err(Error::new(ErrorKind::Budget, "the algebra descent ran out of time"));
        }
        let width = class_width(place);
        let (span, witnesses) = local_image(&e, &cubic, place, work)?;
        let loc: Vec<u64> = (0..2 * m)
            .map(|j| {
                let c = rational_class(&Rational::from(basis_class(j % m)), place).unwrap_or(0);
                if j < m {
                    c
                } else {
                    c << width
                }
            })
            .collect();
        current = restrict_to_image(&current, &loc, &span);
        images.push(AlgebraLocalImage { place: place.clone(), dim: span.dim(), witnesses });
    }
    let mut selmer = F2Span::new();
    for &c in &current {
        selmer.insert(c);
    }
    // the image of E(Q)[2] must lie in the Selmer group
    for ei in &e {
        let (a1, a2) = image_pair(ei, &e);
        let v1 = classes.vector_of(&a1).ok_or_else(|| Error::internal("the algebra descent", "a torsion image outside Q(S,2)"))?;
        let v2 = classes.vector_of(&a2).ok_or_else(|| Error::internal("the algebra descent", "a torsion image outside Q(S,2)"))?;
        let v = v1 | v2 << m;
        if !selmer.contains(v) {
            return Err(Error::internal("the algebra descent", "the image of a point of order 2 is not in the Selmer group"));
        }
    }
    // (the image of E(Q)[2] has dimension below 2 when a point of order 2
    // is twice a rational point of order 4; E(Q)/2E(Q) still has dimension
    // rank + dim E(Q)[2])
    let mask = (1u64 << m) - 1;
    let selmer_basis = selmer
        .basis()
        .iter()
        .map(|&v| {
            let a1 = classes.integer_of(v & mask);
            let a2 = classes.integer_of(v >> m & mask);
            let a3 = classes.integer_of((v ^ v >> m) & mask);
            vec![a1, a2, a3]
        })
        .collect();
    let dim = selmer.dim();
    // the candidates as elements of A: bit j < m is (b_j, 1, b_j), bit m + j is (1, b_j, b_j)
    let one = Rational::from(1);
    let candidates = (0..2 * m)
        .map(|j| {
            let b = Rational::from(basis_class(j % m));
            let values = if j < m { [b.clone(), one.clone(), b] } else { [one.clone(), b.clone(), b] };
            interpolate(&e, &values)
        })
        .collect();
    Ok(AlgebraDescent {
        candidates,
        selmer_masks: selmer.basis().to_vec(),
        field_discriminant: None,
        generation_bound: None,
        shape: AlgebraShape::ThreeRational,
        cubic,
        primes: s,
        selmer_basis,
        selmer_dim: dim,
        two_torsion_dim: 2,
        upper: dim - 2,
        local_images: images,
        conditional_on_grh: false,
    })
}
