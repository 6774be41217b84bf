//! Rational isogenies of odd prime degree and the odd-degree part of the
//! isogeny class.
//!
//! Isogenous curves have the same rank, and an isogeny `φ` of odd degree `l`
//! induces isomorphisms `Sel^2(E) ≅ Sel^2(E')`, `E(Q)[2] ≅ E'(Q)[2]` and
//! `Sha(E)[2] ≅ Sha(E')[2]` (the dual `φ'` satisfies `φ'φ = [l]`, which is
//! invertible on 2-primary groups). The cost of the quartic 2-descent grows
//! like `|c4|^{3/2}`, and within an isogeny class `c4` can differ by many
//! orders of magnitude, so the descent is best run on the member with the
//! smallest `c4` and its results carried over; this module finds that member.
//!
//! Degrees tried: the odd primes `l ≤ 37` for which a rational `l`-isogeny can
//! exist over `Q` (Mazur, *Rational isogenies of prime degree*, Invent. Math.
//! 44 (1978); the degrees 43, 67, 163 occur only for three CM `j`-invariants
//! and are not searched). A degree is tried only when `a_p^2 - 4p` is a
//! square modulo `l` at the first good primes (a necessary condition: with a
//! rational `l`-isogeny the characteristic polynomial of Frobenius is
//! reducible modulo `l`). Every isogeny returned is proven: its kernel
//! polynomial divides the division polynomial exactly (see the `kernel`
//! module for why that suffices) and the image is Vélu's model.

mod division;
mod kernel;
mod poly;

use crate::curve::{Curve, ModelChange, Point};
use crate::error::Error;
use malachite::{Natural, Rational};

/// The odd primes searched for rational isogenies.
///
/// ```
/// assert_eq!(twofold::isogeny::ODD_DEGREES[0], 3);
/// ```
pub const ODD_DEGREES: [u64; 8] = [3, 5, 7, 11, 13, 17, 19, 37];

/// A rational isogeny of odd prime degree from a curve `E` to a curve `E'`.
///
/// ```
/// use twofold::{isogeny::odd_isogenies, Curve};
/// use malachite::Natural;
/// // y^2 + y = x^3 - x^2 - 10x - 20 is 5-isogenous to [0,-1,1,-7820,-263580] and y^2 + y = x^3 - x^2 (Cremona 1997, Table 1)
/// let e = Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap();
/// let isogs = odd_isogenies(&e, &[Natural::from(11u32)]).unwrap();
/// let mut targets: Vec<String> = isogs.iter().map(|i| format!("{:?}", i.target.coefficients())).collect();
/// targets.sort();
/// assert_eq!(isogs.len(), 2);
/// assert!(isogs.iter().all(|i| i.degree == 5));
/// let a2 = Curve::from_coefficients([0, -1, 1, -7820, -263580]).unwrap();
/// let a3 = Curve::from_coefficients([0, -1, 1, 0, 0]).unwrap();
/// assert!(isogs.iter().any(|i| i.target == a2) && isogs.iter().any(|i| i.target == a3));
/// ```
#[derive(Clone, Debug)]
#[non_exhaustive]
pub struct OddIsogeny {
    /// The degree, an odd prime.
    pub degree: u64,
    /// The monic kernel polynomial, coefficients from the constant term up:
    /// its roots are the `x`-coordinates of the non-zero kernel points.
    pub kernel_polynomial: Vec<Rational>,
    /// Vélu's model of the image (rational a-invariants).
    pub velu_model: [Rational; 5],
    /// The global minimal model of the image in reduced form.
    pub target: Curve,
    /// The change from Vélu's model to `target`.
    pub to_target: ModelChange,
    map: std::sync::Arc<kernel::VeluMap>,
}

impl OddIsogeny {
    /// The image of a point of the source curve on `target`, up to sign
    /// (which does not affect independence). `None` only if an internal
    /// check fails (the image is verified to lie on `target`).
    pub fn map_point_up_to_sign(&self, p: &Point) -> Option<Point> {
        let q = self.map.image_up_to_sign(&self.velu_model, p)?;
        let out = match q {
            Point::Infinity => Point::Infinity,
            Point::Affine(x, y) => {
                let (x, y) = self.to_target.map_point(&(x, y)).ok()?;
                Point::Affine(x, y)
            }
        };
        self.target.contains(&out).then_some(out)
    }
}

impl std::fmt::Debug for kernel::VeluMap {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str("VeluMap")
    }
}

/// The degrees `l` of [`ODD_DEGREES`] not excluded by the Frobenius test at
/// the first good primes.
fn possible_degrees(curve: &Curve, bad: &[Natural]) -> Vec<u64> {
    let mut traces: Vec<(u64, i64)> = Vec::new();
    for p in crate::arith::primes_up_to(400) {
        if bad.iter().any(|q| *q == Natural::from(p)) || p == 2 {
            continue;
        }
        traces.push((p, curve.trace_of_frobenius(p)));
    }
    ODD_DEGREES
        .iter()
        .copied()
        .filter(|&l| {
            traces.iter().filter(|(p, _)| *p != l).all(|&(p, a)| {
                let d = (a * a - 4 * p as i64).rem_euclid(l as i64) as u64;
                d == 0 || crate::arith::jacobi_u64(d, l) == 1
            })
        })
        .collect()
}

/// Every rational isogeny of odd prime degree `l ≤ 37` from `curve` that
/// the search finds (see the module documentation; each one returned is
/// proven). `curve` must be integral; `bad` lists the primes dividing its
/// discriminant (used to skip bad primes and to minimise the images).
pub fn odd_isogenies(curve: &Curve, bad: &[Natural]) -> Result<Vec<OddIsogeny>, Error> {
    odd_isogenies_within(curve, bad, &crate::budget::Work::unlimited())
}

/// [`odd_isogenies`] within the deadline and cancel flag of `work`: an
/// error of kind [`crate::ErrorKind::Budget`] when they end the search (a
/// partial list could miss an isogeny, so none is returned).
pub fn odd_isogenies_within(curve: &Curve, bad: &[Natural], work: &crate::budget::Work) -> Result<Vec<OddIsogeny>, Error> {
    let mut out = Vec::new();
    let mut divpolys = division::DivisionPolys::new(curve);
    let stop = || work.exhausted();
    for l in possible_degrees(curve, bad) {
        if stop() {
            break;
        }
        for k in kernel::kernel_polynomials(curve, l, bad, &mut divpolys, 24, 20_000, &stop) {
            out.push(build(curve, l, k, bad)?);
        }
    }
    if stop() {
        return Err(Error::new(crate::ErrorKind::Budget, "the search for odd-degree isogenies was cut short by the budget"));
    }
    Ok(out)
}

fn build(curve: &Curve, l: u64, k: Vec<Rational>, bad: &[Natural]) -> Result<OddIsogeny, Error> {
    let velu = kernel::velu_model(curve, &k);
    let (integral, scale) = Curve::from_rational_coefficients(velu.clone())?;
    let mut primes: Vec<Natural> = bad.to_vec();
    for q in [2u64, 3, l] {
        if !primes.contains(&Natural::from(q)) {
            primes.push(Natural::from(q));
        }
    }
    let (minimal, to_min) = integral.minimal_model(&primes)?;
    let (reduced, to_red) = minimal.reduced_form();
    let to_target = scale.compose(&to_min).compose(&to_red);
    if reduced.discriminant() == &malachite::Integer::from(0) {
        return Err(Error::internal("the isogeny class", "an isogenous curve came out singular"));
    }
    let map = std::sync::Arc::new(kernel::VeluMap::new(curve, &k));
    Ok(OddIsogeny { degree: l, kernel_polynomial: k, velu_model: velu, target: reduced, to_target, map })
}

/// The curves reachable from a curve by chains of the isogenies
/// [`odd_isogenies`] finds, each as its minimal model in reduced form, with
/// the isogenies between them.
///
/// ```
/// use twofold::{isogeny::odd_isogeny_class, Curve};
/// use malachite::Natural;
/// // the isogeny class of conductor 11 has three curves linked by 5-isogenies (Cremona 1997, Table 1)
/// let e = Curve::from_coefficients([0, -1, 1, -7820, -263580]).unwrap();
/// let class = odd_isogeny_class(&e, &[Natural::from(11u32)]).unwrap();
/// assert_eq!(class.curves.len(), 3);
/// let small = class.smallest_c4();
/// assert_eq!(class.curves[small], Curve::from_coefficients([0, -1, 1, 0, 0]).unwrap());
/// ```
#[derive(Clone, Debug)]
#[non_exhaustive]
pub struct OddIsogenyClass {
    /// The curves; the first is the minimal reduced model of the input.
    pub curves: Vec<Curve>,
    /// Isogenies `(from, to, φ)` between members, in both directions.
    pub links: Vec<(usize, usize, OddIsogeny)>,
}

/// At most this many curves are collected (isogeny classes over `Q` have at
/// most eight members: Kenku, 1982).
const MAX_CLASS: usize = 8;

/// The odd-degree isogeny class of `curve` (see [`OddIsogenyClass`]); `bad`
/// lists the primes dividing the discriminant of `curve`, which must be
/// integral.
pub fn odd_isogeny_class(curve: &Curve, bad: &[Natural]) -> Result<OddIsogenyClass, Error> {
    odd_isogeny_class_within(curve, bad, &crate::budget::Work::unlimited())
}

/// [`odd_isogeny_class`] within the deadline and cancel flag of `work` (an
/// error of kind [`crate::ErrorKind::Budget`] when they end it).
pub fn odd_isogeny_class_within(curve: &Curve, bad: &[Natural], work: &crate::budget::Work) -> Result<OddIsogenyClass, Error> {
    let (start, _) = curve.minimal_model(bad)?;
    let (start, _) = start.reduced_form();
    let mut curves = vec![start];
    let mut links = Vec::new();
    let mut next = 0;
    while next < curves.len() {
        let here = curves[next].clone();
        for phi in odd_isogenies_within(&here, bad, work)? {
            let to = match curves.iter().position(|c| *c == phi.target) {
                Some(i) => i,
                None => {
                    if curves.len() >= MAX_CLASS {
                        continue;
                    }
                    curves.push(phi.target.clone());
                    curves.len() - 1
                }
            };
            links.push((next, to, phi));
        }
        next += 1;
    }
    Ok(OddIsogenyClass { curves, links })
}

impl OddIsogenyClass {
    /// The index of a member with the smallest `|c4|`.
    pub fn smallest_c4(&self) -> usize {
        use malachite::base::num::arithmetic::traits::UnsignedAbs;
        (0..self.curves.len()).min_by_key(|&i| self.curves[i].c4().unsigned_abs()).unwrap_or(0)
    }

    /// A chain of links from member `from` to member `to` (breadth first).
    pub fn path(&self, from: usize, to: usize) -> Option<Vec<&OddIsogeny>> {
        let mut prev: Vec<Option<usize>> = vec![None; self.curves.len()];
        let mut seen = vec![false; self.curves.len()];
        let mut queue = std::collections::VecDeque::from([from]);
        seen[from] = true;
        while let Some(v) = queue.pop_front() {
            if v == to {
                let mut chain = Vec::new();
                let mut at = to;
                while at != from {
                    let li = prev[at]?;
                    chain.push(&self.links[li].2);
                    at = self.links[li].0;
                }
                chain.reverse();
                return Some(chain);
            }
            for (li, (a, b, _)) in self.links.iter().enumerate() {
                if *a == v && !seen[*b] {
                    seen[*b] = true;
                    prev[*b] = Some(li);
                    queue.push_back(*b);
                }
            }
        }
        None
    }

    /// Carries a point of member `from` to member `to` along [`Self::path`]
    /// (up to sign at each step).
    pub fn map_point(&self, from: usize, to: usize, p: &Point) -> Option<Point> {
        let mut q = p.clone();
        for phi in self.path(from, to)? {
            q = phi.map_point_up_to_sign(&q)?;
        }
        Some(q)
    }

    /// The product of the degrees along [`Self::path`].
    pub fn degree(&self, from: usize, to: usize) -> Option<u64> {
        Some(self.path(from, to)?.iter().map(|p| p.degree).product())
    }
}
