//! Rank certificates: a self-contained record of the proof behind a
//! [`RankReport`], and an independent exact check of it.
//!
//! A [`Certificate`] holds the curve (input model, global minimal model and
//! the change between them), the bad primes, the torsion points and the
//! points of infinite order (on the minimal model), and for every descent
//! route that ran the Selmer data: local images with a local point for
//! each soluble class, every everywhere locally soluble class with a local
//! point at every place that matters, the classes ruled out with the place
//! where they fail, and the points that explain classes.
//!
//! [`verify`] re-checks a certificate with its own small exact arithmetic
//! (module `check`), never calling the solubility, descent or quartic code
//! that produced it, and returns the [`VerifiedClaims`]: the rank bounds it
//! could establish and the list of statements it took on trust (published
//! theorems, the completeness of the quartic enumeration, and local
//! insolubility claims its finite search could not settle).
//!
//! [`Certificate::to_text`] and [`Certificate::from_text`] store a
//! certificate as a line-oriented text (one record per line, see
//! [`Certificate::to_text`]) so that it can be checked later.
//!
//! ```
//! use twofold::{analyse, Curve, RankOptions};
//! use twofold::certificate::{verify, Certificate};
//! // y^2 = x^3 - 25x: rank 1 (5 is a congruent number; OEIS A003273)
//! let e = Curve::from_coefficients([0, 0, 0, -25, 0]).unwrap();
//! let report = analyse(&e, &RankOptions::default()).unwrap();
//! let cert = Certificate::from_report(&report).unwrap();
//! let claims = verify(&cert).unwrap();
//! assert_eq!((claims.lower_bound, claims.upper_bound), (1, Some(1)));
//! assert_eq!(claims.rank(), Some(1));
//! let again = Certificate::from_text(&cert.to_text()).unwrap();
//! assert_eq!(again, cert);
//! ```
#![deny(missing_docs)]

mod algebra;
mod check;
mod text;
mod verify;

pub use algebra::{AlgebraCandidate, AlgebraElement, AlgebraLocal, AlgebraRecord};

pub use verify::{verify, CertificateError, UpperBoundBasis, VerifiedClaims};

use crate::budget::Work;
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use crate::report::RankReport;
use crate::solubility::{LocalWitness, Place};
use malachite::base::num::arithmetic::traits::DivisibleBy;
use malachite::base::num::basic::traits::One;
use malachite::{Integer, Natural, Rational};

/// A local point on `y^2 = g(x, z)`: a primitive integer pair `(x, z)` with
/// `g(x, z)` a non-zero square in `Q_p` (positive at the real place).
///
/// `precision` is the `k` for which every pair congruent to `(x, z)` modulo
/// `p^k` is again a local point: `v_p(g(x, z)) + 1` for odd `p`,
/// `v_2(g(x, z)) + 3` for `p = 2` (Hensel's lemma for `y^2 = n`), and `0`
/// at the real place.
///
/// ```
/// use malachite::{Integer, Natural};
/// use twofold::certificate::LocalPoint;
/// use twofold::solubility::Place;
/// // g = x^4 + 7 z^4 at (1, 2): g = 113 = 1 mod 8, a 2-adic unit square
/// let w = LocalPoint { place: Place::Prime(Natural::from(2u32)), x: Integer::from(1), z: Integer::from(2), precision: 3 };
/// assert_eq!(w.precision, 3);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct LocalPoint {
    /// The place.
    pub place: Place,
    /// First coordinate.
    pub x: Integer,
    /// Second coordinate.
    pub z: Integer,
    /// Precision `k` (see the type documentation).
    pub precision: u64,
}

/// An element of a Selmer group: its covering quartic, a local point at
/// every place that matters and, when known, a rational point on it.
///
/// For the isogeny route `label` is the square-free `d` and the quartic is
/// `d M^4 + a M^2 e^2 + (b/d) e^4`; for the quartic route `label` is `None`.
///
/// ```
/// use malachite::Integer;
/// use twofold::certificate::SelmerClass;
/// let c = SelmerClass { label: Some(Integer::from(-1)), quartic: [-1, 0, 0, 0, 25].map(Integer::from), local_points: vec![], lift: None };
/// assert!(c.lift.is_none());
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SelmerClass {
    /// The square-free integer of the class (isogeny route).
    pub label: Option<Integer>,
    /// The quartic `[a, b, c, d, e]` of `y^2 = a x^4 + b x^3 z + ... + e z^4`.
    pub quartic: [Integer; 5],
    /// A local point at every place.
    pub local_points: Vec<LocalPoint>,
    /// A rational point on the covering and its image on the minimal model.
    pub lift: Option<Lift>,
}

/// A rational point `(x, z, y)` on `y^2 = g(x, z)` with its image under the
/// covering map on the minimal model (quartic route).
///
/// ```
/// use malachite::{Integer, Rational};
/// use twofold::certificate::Lift;
/// let l = Lift { x: Integer::from(0), z: Integer::from(1), y: Integer::from(1), image: (Rational::from(0), Rational::from(0)) };
/// assert_eq!(l.z, 1);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Lift {
    /// First coordinate on the covering.
    pub x: Integer,
    /// Second coordinate on the covering.
    pub z: Integer,
    /// `y` with `y^2 = g(x, z)`.
    pub y: Integer,
    /// The image on the minimal model (up to sign).
    pub image: (Rational, Rational),
}

/// The local image at one place on one side of a 2-isogeny: one
/// representative of every class of `Q_v*/Q_v*^2`, split into soluble
/// (with a local point on `c^2 (c M^4 + a M^2 e^2 + (b/c) e^4)`) and
/// insoluble ones.
///
/// ```
/// use malachite::Integer;
/// use twofold::certificate::LocalTable;
/// use twofold::solubility::Place;
/// let t = LocalTable { place: Place::Real, soluble: vec![], insoluble: vec![Integer::from(-1)] };
/// assert_eq!(t.insoluble.len(), 1);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct LocalTable {
    /// The place.
    pub place: Place,
    /// Soluble representatives with a local point.
    pub soluble: Vec<(Integer, LocalPoint)>,
    /// Insoluble representatives.
    pub insoluble: Vec<Integer>,
}

/// A point on a side model `y^2 = x(x^2 + a x + b)` with its claimed image
/// `d` under the connecting map (`x` modulo squares).
///
/// ```
/// use malachite::{Integer, Rational};
/// use twofold::certificate::SideImage;
/// let s = SideImage { class: Integer::from(-1), x: Rational::from(-4), y: Rational::from(6) };
/// assert_eq!(s.class, -1);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SideImage {
    /// The claimed square class.
    pub class: Integer,
    /// x on the side model.
    pub x: Rational,
    /// y on the side model.
    pub y: Rational,
}

/// One side `y^2 = x(x^2 + a x + b)` of a 2-isogeny descent.
///
/// ```
/// use malachite::Integer;
/// use twofold::certificate::SideProof;
/// let s = SideProof { a: Integer::from(0), b: Integer::from(-25), selmer_dim: Some(2), torsion: vec![], local: vec![], classes: vec![], images: vec![] };
/// assert_eq!(s.selmer_dim, Some(2));
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SideProof {
    /// `a` of the side model.
    pub a: Integer,
    /// `b` of the side model.
    pub b: Integer,
    /// The claimed dimension of the Selmer group (`None` if not computed).
    pub selmer_dim: Option<usize>,
    /// The torsion points of the side model (affine).
    pub torsion: Vec<(Rational, Rational)>,
    /// Local images at every place tested.
    pub local: Vec<LocalTable>,
    /// A basis of the Selmer group, each with local points on its covering.
    pub classes: Vec<SelmerClass>,
    /// Points of the side model with their images.
    pub images: Vec<SideImage>,
}

/// The record of one descent via a 2-isogeny.
///
/// The side model comes from the minimal model by
/// `X = 36 x + 3 b2 = u^2 x'' + x0`, `Y = 108 (2 y + a1 x + a3) = u^3 y''`,
/// which sends the kernel point to `(0, 0)`.
///
/// ```
/// use malachite::{Integer, Rational};
/// use twofold::certificate::{IsogenyProof, SideProof};
/// let side = SideProof { a: Integer::from(0), b: Integer::from(-25), selmer_dim: None, torsion: vec![], local: vec![], classes: vec![], images: vec![] };
/// let p = IsogenyProof { kernel: (Rational::from(0), Rational::from(0)), x0: Integer::from(0), u: Integer::from(6), sides: [side.clone(), side], lower: 0, upper: None };
/// assert_eq!(p.u, 6);
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct IsogenyProof {
    /// The kernel point on the minimal model.
    pub kernel: (Rational, Rational),
    /// `x0` of the change to the side model.
    pub x0: Integer,
    /// `u` of the change to the side model.
    pub u: Integer,
    /// The sides E and E'.
    pub sides: [SideProof; 2],
    /// The claimed lower bound of this route.
    pub lower: usize,
    /// The claimed upper bound of this route.
    pub upper: Option<usize>,
}

/// The record of the full 2-descent.
///
/// ```
/// use twofold::certificate::QuarticProof;
/// let q = QuarticProof { selmer_dim: None, two_torsion_dim: 0, enumerated: 0, classes: vec![], ruled_out: vec![], lower: 0, upper: None, descent_curve: None };
/// assert!(q.classes.is_empty());
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct QuarticProof {
    /// The claimed dim Sel^2(E) (including `E(Q)[2]`).
    pub selmer_dim: Option<usize>,
    /// The claimed dim `E(Q)[2]`.
    pub two_torsion_dim: usize,
    /// How many GL2(Z)-classes the enumeration produced.
    pub enumerated: usize,
    /// One quartic for every class of Sel^2(E).
    pub classes: Vec<SelmerClass>,
    /// Quartics ruled out, each with the place where it has no point.
    pub ruled_out: Vec<([Integer; 5], Place)>,
    /// The claimed lower bound of this route.
    pub lower: usize,
    /// The claimed upper bound of this route.
    pub upper: Option<usize>,
    /// When the quartics are 2-coverings of a curve isogenous to the minimal
    /// model by an isogeny of odd degree (chosen for its smaller `c4`): that
    /// curve's a-invariants and the degree. Sel^2 and `E(Q)[2]` of the two
    /// curves are isomorphic; the isogeny itself is taken on trust by
    /// [`verify`] (twofold proves it when it finds it).
    pub descent_curve: Option<([Integer; 5], u64)>,
}

/// A point of infinite order on the minimal model.
///
/// ```
/// use malachite::Rational;
/// use twofold::certificate::CertPoint;
/// let p = CertPoint { x: Rational::from(-4), y: Rational::from(6), height: None };
/// assert!(p.height.is_none());
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct CertPoint {
    /// x.
    pub x: Rational,
    /// y.
    pub y: Rational,
    /// The canonical height, as decimal text, when known (not checked by [`verify`]).
    pub height: Option<String>,
}

/// The record of a rank proof (see the module documentation).
///
/// ```
/// use twofold::{analyse, Curve, RankOptions};
/// use twofold::certificate::{verify, Certificate};
/// // y^2 + y = x^3 - x: y^2 + y = x^3 - x, rank 1 (published table, Cremona 1997)
/// let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
/// let cert = Certificate::from_report(&analyse(&e, &RankOptions::default()).unwrap()).unwrap();
/// assert_eq!(cert.points.len(), 1);
/// assert_eq!(verify(&cert).unwrap().rank(), Some(1));
/// ```
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Certificate {
    /// a-invariants of the input model.
    pub input: [Integer; 5],
    /// a-invariants of the global minimal model.
    pub minimal: [Integer; 5],
    /// The change `[u, r, s, t]` from the input model to the minimal one
    /// (`x = u^2 x' + r`, `y = u^3 y' + s u^2 x' + t`).
    pub change: [Rational; 4],
    /// The primes dividing the minimal discriminant.
    pub primes: Vec<Natural>,
    /// The claimed lower bound for the rank.
    pub rank_lower: Option<usize>,
    /// The claimed upper bound for the rank.
    pub rank_upper: Option<usize>,
    /// The affine torsion points of the minimal model.
    pub torsion: Vec<(Rational, Rational)>,
    /// Points of infinite order, independent modulo torsion, on the minimal model.
    pub points: Vec<CertPoint>,
    /// Every 2-isogeny descent that ran.
    pub isogeny: Vec<IsogenyProof>,
    /// The full 2-descent, when it ran.
    pub quartic: Option<QuarticProof>,
    /// The analytic part of the proof, when the analytic route proved the
    /// rank (an L-value enclosure that excludes zero).
    pub analytic: Option<AnalyticRecord>,
    /// The descent over the algebra `Q[X]/(f)`, when it ran.
    pub algebra: Option<AlgebraRecord>,
}

/// The analytic part of a rank proof: the enclosure of `L(E,1)` (rank 0)
/// or `L'(E,1)` (rank 1) that excludes zero, how it was computed, and the
/// root number with its local factors. [`verify`] recomputes the root
/// number from the local data and the enclosure from the curve, and only
/// checks these records against its own results.
#[derive(Clone, Debug, PartialEq, Eq)]
#[non_exhaustive]
pub struct AnalyticRecord {
    /// 0 for `L(E,1)`, 1 for `L'(E,1)`; the rank this proves.
    pub order: u8,
    /// The number of terms of the series summed.
    pub terms: u64,
    /// The conductor.
    pub conductor: Natural,
    /// The global root number.
    pub root_number: i8,
    /// The local root numbers at the bad primes that are known separately
    /// (see [`crate::rootno::RootNumber::local`]).
    pub local_root_numbers: Vec<(Natural, i8)>,
    /// The lower end of the enclosure (a decimal string).
    pub low: String,
    /// The upper end of the enclosure (a decimal string).
    pub high: String,
    /// The theorem that turns the non-zero value into the rank.
    pub theorem: String,
}

/// The theorem behind an analytic proof of the rank.
pub(crate) const ANALYTIC_THEOREM: &str = "Gross-Zagier 1986 and Kolyvagin 1988-1990 with modularity (Wiles 1995, Taylor-Wiles 1995, Breuil-Conrad-Diamond-Taylor 2001)";


/// The precision of a local point (see [`LocalPoint`]).
fn precision_of(g: &[Integer; 5], place: &Place, w: &LocalWitness) -> u64 {
    match place {
        Place::Real => 0,
        Place::Prime(p) => {
            let pi = Integer::from(p.clone());
            let v = check::split(&check::eval4(g, &w.x, &w.z), &pi).0;
            if *p == 2u32 {
                v + 3
            } else {
                v + 1
            }
        }
    }
}

fn local_point(g: &[Integer; 5], place: &Place, w: &LocalWitness) -> LocalPoint {
    LocalPoint { place: place.clone(), x: w.x.clone(), z: w.z.clone(), precision: precision_of(g, place, w) }
}

fn affine(p: &Point) -> Option<(Rational, Rational)> {
    match p {
        Point::Infinity => None,
        Point::Affine(x, y) => Some((x.clone(), y.clone())),
    }
}

impl Certificate {
    /// Builds the certificate of a report: every point moved to the minimal
    /// model, local points for every Selmer class, and a rational point on
    /// each quartic class that the descent explained by a point found on
    /// the covering. Everything is read from the report (the report is the
    /// record): no stage runs again (no point search, factoring, Tate's
    /// algorithm, torsion, heights or root number). The one computation of
    /// its own is a local point on the covering of each 2-isogeny Selmer
    /// basis class (the descent keeps local points for its local class
    /// representatives only).
    ///
    /// Errors: an internal inconsistency in the report (a Selmer class
    /// without a local point, a point off its curve); kind
    /// [`ErrorKind::InvalidValue`] when the analytic route proved the rank
    /// but the report has no [`RankReport::root_number`] (its stage did not
    /// finish).
    pub fn from_report(report: &RankReport) -> Result<Certificate, Error> {
        Certificate::from_report_within(report, &Work::unlimited())
    }

    /// As [`Certificate::from_report`], for callers that hold the `Work` of
    /// an analysis. The builder computes nothing (no stage runs again: the
    /// side models' torsion comes from the 2-isogeny runs, the local root
    /// numbers from [`RankReport::root_number`], heights from the
    /// evidence), so it never consults `work` and succeeds under a work
    /// that is spent or cancelled (tests/certificate.rs checks it).
    pub fn from_report_within(report: &RankReport, _work: &Work) -> Result<Certificate, Error> {
        let change = &report.change;
        let minimal = &report.minimal;
        let to_min = |p: &Point| -> Result<Option<(Rational, Rational)>, Error> {
            match affine(p) {
                None => Ok(None),
                Some(q) => change.map_point(&q).map(Some),
            }
        };
        let mut torsion = Vec::new();
        for p in &report.torsion_points {
            if let Some(q) = to_min(p)? {
                torsion.push(q);
            }
        }
        let mut points = Vec::new();
        for p in &report.points {
            if let Some((x, y)) = to_min(p)? {
                // the canonical height (numerical, BSD normalisation; not checked by verify),
                // read from the report's evidence where it has the point (never recomputed)
                let recorded = report
                    .evidence
                    .as_ref()
                    .and_then(|ev| ev.reduced_points.iter().position(|q| q == p).and_then(|i| ev.heights.get(i).copied()));
                let height = recorded
                    .filter(|h| h.is_finite())
                    .map(|h| format!("{h:.12e}"));
                points.push(CertPoint { x, y, height });
            }
        }
        let primes: Vec<Natural> = report.local.iter().map(|l| l.prime.clone()).collect();
        let mut isogeny = Vec::new();
        for run in &report.isogeny_runs {
            isogeny.push(isogeny_proof(minimal, run)?);
        }
        let quartic = match (&report.full_descent, &report.descent_curve) {
            (Some(f), None) => Some(quartic_proof(minimal, f, None)?),
            (Some(f), Some((other, d))) => Some(quartic_proof(other, f, Some(*d))?),
            (None, _) => None,
        };
        Ok(Certificate {
            input: report.input.coefficients().clone(),
            minimal: minimal.coefficients().clone(),
            change: [change.u.clone(), change.r.clone(), change.s.clone(), change.t.clone()],
            primes,
            // the descent's bounds; an analytic proof is in `analytic`
            rank_lower: report.descent_bounds.0,
            rank_upper: report.descent_bounds.1,
            torsion,
            points,
            isogeny,
            quartic,
            analytic: analytic_record(report)?,
            algebra: algebra::algebra_record(report)?,
        })
    }
}

/// The analytic record of a report whose analytic route proved the rank,
/// with the local root numbers of the report's root number stage.
fn analytic_record(report: &RankReport) -> Result<Option<AnalyticRecord>, Error> {
    let Some(a) = &report.analytic else { return Ok(None) };
    let (Some(v), Some(w)) = (&a.value, a.root_number) else { return Ok(None) };
    if !v.nonzero_proven() {
        return Ok(None);
    }
    let rn = report.root_number.as_ref().ok_or_else(|| {
        Error::new(
            ErrorKind::InvalidValue,
            "the report carries no local root numbers (its root number stage did not run or did not finish), so the analytic record cannot be written",
        )
    })?;
    if rn.global != w {
        return Err(Error::internal(
            "certificate",
            format!("the analytic route's root number {w} differs from the local one {}", rn.global),
        ));
    }
    let (low, high) = v.decimal_bounds();
    Ok(Some(AnalyticRecord {
        order: v.order,
        terms: v.terms,
        conductor: rn.conductor.clone(),
        root_number: w,
        local_root_numbers: rn.local.clone(),
        low,
        high,
        theorem: ANALYTIC_THEOREM.to_string(),
    }))
}

/// `x0` and `u` of the side model for the kernel point `t` (the same
/// normalisation as the descent: remove factors 2 and 3 while integral).
fn side_change(curve: &Curve, t: &(Rational, Rational)) -> Option<(Integer, Integer)> {
    let b2 = &curve.b_invariants()[0];
    let big_x = Rational::from(36) * &t.0 + Rational::from(Integer::from(3) * b2);
    let x0 = Integer::try_from(big_x).ok()?;
    let mut a = Integer::from(3) * &x0;
    let mut b = Integer::from(3) * &x0 * &x0 - Integer::from(27) * curve.c4();
    let mut u = Integer::ONE;
    for p in [2i32, 3] {
        let p = Integer::from(p);
        let (p2, p4) = (&p * &p, &p * &p * &p * &p);
        while (&a).divisible_by(&p2) && (&b).divisible_by(&p4) {
            a /= &p2;
            b /= &p4;
            u *= &p;
        }
    }
    Some((x0, u))
}

fn isogeny_proof(curve: &Curve, run: &crate::descent::isogeny::IsogenyDescent) -> Result<IsogenyProof, Error> {
    let kernel = affine(&run.kernel_point).ok_or_else(|| Error::internal("the certificate builder", "kernel point at infinity"))?;
    let (x0, u) = side_change(curve, &kernel).ok_or_else(|| Error::internal("the certificate builder", "kernel point not integral on the short model"))?;
    let mut sides = Vec::new();
    for side in [&run.side_e, &run.side_e_prime] {
        let local: Vec<LocalTable> = side
            .local_images
            .iter()
            .map(|img| {
                let soluble = img
                    .soluble
                    .iter()
                    .map(|(c, w)| {
                        let g = [c * c * c, Integer::from(0), &side.a * c * c, Integer::from(0), &side.b * c];
                        (c.clone(), local_point(&g, &img.place, w))
                    })
                    .collect();
                LocalTable { place: img.place.clone(), soluble, insoluble: img.insoluble.clone() }
            })
            .collect();
        let complete = run.upper.is_some();
        let mut classes = Vec::new();
        if complete {
            if side.basis_witnesses.len() != side.selmer_basis.len() {
                return Err(Error::internal("the certificate builder", "the 2-isogeny descent kept no local points for its Selmer basis"));
            }
            for (d, wits) in side.selmer_basis.iter().zip(&side.basis_witnesses) {
                let g = [d.clone(), Integer::from(0), side.a.clone(), Integer::from(0), &side.b / d];
                if wits.len() != side.local_images.len() {
                    return Err(Error::internal("the certificate builder", "a Selmer basis class lacks a local point at some place"));
                }
                let pts = side.local_images.iter().zip(wits).map(|(img, w)| local_point(&g, &img.place, w)).collect();
                classes.push(SelmerClass { label: Some(d.clone()), quartic: g, local_points: pts, lift: None });
            }
        }
        let images = side
            .points
            .iter()
            .filter_map(|(d, p)| affine(p).map(|(x, y)| SideImage { class: d.clone(), x, y }))
            .collect();
        sides.push(SideProof {
            a: side.a.clone(),
            b: side.b.clone(),
            selmer_dim: complete.then_some(side.selmer_dim),
            // the side's torsion as the descent found it (never computed again)
            torsion: side.torsion_points.iter().filter_map(affine).collect(),
            local,
            classes,
            images,
        });
    }
    // invariant: the loop above pushed exactly two sides
    let side_e_prime = sides.pop().expect("two sides");
    // invariant: the loop above pushed exactly two sides
    let side_e = sides.pop().expect("two sides");
    Ok(IsogenyProof { kernel, x0, u, sides: [side_e, side_e_prime], lower: run.lower, upper: run.upper })
}

/// `curve` is the curve the quartics cover: the minimal model, or the
/// odd-degree isogenous curve of degree `degree` the descent ran on.
fn quartic_proof(curve: &Curve, f: &crate::descent::full::FullDescent, degree: Option<u64>) -> Result<QuarticProof, Error> {
    let mut classes = Vec::new();
    for sq in &f.classes {
        let g = sq.quartic.coeffs();
        let local_points = sq.witnesses.iter().map(|(pl, w)| local_point(&g, pl, w)).collect();
        // a class explained by a point found on the covering records that
        // point (read from the descent, not searched again); a class the
        // descent explained by a point of E alone is recorded without one
        let lift = match &sq.covering_point {
            Some([x, z, y]) => {
                let (xr, zr, yr) = (Rational::from(x.clone()), Rational::from(z.clone()), Rational::from(y.clone()));
                let image = sq
                    .quartic
                    .image_on_curve(curve, &xr, &zr, &yr)?
                    .ok_or_else(|| Error::internal("the certificate builder", "a recorded covering point has no image on the curve"))?;
                Some(Lift { x: x.clone(), z: z.clone(), y: y.clone(), image })
            }
            None => None,
        };
        classes.push(SelmerClass { label: None, quartic: g, local_points, lift });
    }
    Ok(QuarticProof {
        selmer_dim: f.selmer_dim,
        two_torsion_dim: f.two_torsion_dim,
        enumerated: f.quartics_enumerated,
        classes,
        ruled_out: f.ruled_out.iter().map(|(q, pl)| (q.coeffs(), pl.clone())).collect(),
        lower: f.lower,
        upper: f.upper,
        descent_curve: degree.map(|d| (curve.coefficients().clone(), d)),
    })
}
