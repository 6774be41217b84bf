//! Full 2-descent through quartic 2-coverings (Birch and Swinnerton-Dyer,
//! Notes on elliptic curves I, 1963; Cremona, Algorithms for Modular
//! Elliptic Curves, 2nd ed., 3.5-3.6; Cremona, Classical invariants and
//! 2-descent on elliptic curves, J. Symbolic Comput. 31 (2001)).
//!
//! The 2-Selmer group of a minimal model E is realised as the everywhere
//! locally soluble quartics `y^2 = g(x, z)` with invariants
//! `(I, J) = (c4, 2 c6)`, up to `GL2(Q)`-equivalence. Completeness of the
//! list rests on two published results: the reduction bounds of the
//! enumeration (see [`crate::quartic`]) and the theorem that every
//! everywhere locally soluble 2-covering of a minimal model has an integral
//! model at level 0, i.e. with exactly these invariants (Cremona, Fisher
//! and Stoll, Minimisation and reduction of 2-, 3- and 4-coverings of
//! elliptic curves, Algebra and Number Theory 4 (2010)). Classes are told
//! apart and multiplied exactly through their images in
//! `(Q[φ]/F(φ))* / squares`, F the resolvent cubic ([`crate::quartic::CoveringClass`]).
//!
//! Since `E(Q)/2E(Q)` injects into `Sel^2(E)`, the images of the points
//! found, together with the torsion, span a subspace of dimension
//! `k <= dim Sel^2`, and `k - dim E(Q)[2] <= rank <= dim Sel^2 - dim E(Q)[2]`.

use crate::budget::{Ladder, RankOptions, Stage, Work, CURVE_GROWTH, QUARTIC_GROWTH};
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use crate::quartic::{covering_class, quartics_with_invariants, reduce, CoveringClass, Quartic, SearchOptions};
use crate::search::{search_curve, search_quartic_above, SearchLimits};
use crate::solubility::{everywhere_locally_soluble_with, LocalWitness, Place, SolubilityWorkspace};
use crate::torsion::TorsionGroup;
use malachite::{Integer, Natural, Rational};

/// An everywhere locally soluble quartic class of Sel^2(E).
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct SelmerQuartic {
    /// A reduced integral quartic representing the class.
    pub quartic: Quartic,
    /// A local point (witness) at R and at every prime tested.
    pub witnesses: Vec<(Place, LocalWitness)>,
    /// A rational point found on it, mapped to E, if any.
    pub point: Option<Point>,
    /// That rational point on the covering itself, `[x, z, y]` with
    /// `y^2 = g(x, z)` for the quartic `g` of this class, if one was found.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub covering_point: Option<[Integer; 3]>,
}

/// The result of the full 2-descent.
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[non_exhaustive]
pub struct FullDescent {
    /// The invariants `(I, J)` enumerated.
    #[cfg_attr(feature = "serde", serde(with = "crate::decimal_serde::decimal"))]
    pub invariants: (Integer, Integer),
    /// Number of `GL2(Z)`-classes of quartics with these invariants (before
    /// the local tests), and how many of them were everywhere locally soluble.
    pub quartics_enumerated: usize,
    /// The quartics ruled out, each with the place where it has no local point.
    pub ruled_out: Vec<(Quartic, Place)>,
    /// One representative of every class of Sel^2(E) (the trivial class included).
    pub classes: Vec<SelmerQuartic>,
    /// dim Sel^2(E) over F2, including the image of E(Q)\[2\]; `None` if the
    /// budget ran out before the enumeration finished.
    pub selmer_dim: Option<usize>,
    /// dim E(Q)\[2\].
    pub two_torsion_dim: usize,
    /// Dimension of the span of the images of the torsion and of the points found.
    pub found_dim: usize,
    /// Lower bound for the rank.
    pub lower: usize,
    /// Upper bound for the rank (`None` if the Selmer group is not complete).
    pub upper: Option<usize>,
    /// Points of infinite order on the minimal model, independent modulo torsion.
    pub points: Vec<Point>,
    /// Quartics spanning the Selmer classes not explained by points: where Sha could hide.
    pub unexplained: Vec<Quartic>,
    /// Whether the searches ran to their height bounds (a ladder that
    /// stopped below its ceiling because the next rung would not fit in its
    /// share of the budget is not a search cut short).
    pub search_complete: bool,
    /// The height up to which every covering left unexplained was searched
    /// (raised step by step from `RankOptions::search_height` while the
    /// bounds did not meet and the budget allowed).
    pub searched_height: u64,
}


/// A subgroup of Sel^2(E) kept as its non-trivial elements.
struct ClassSpan {
    elements: Vec<CoveringClass>,
}

impl ClassSpan {
    fn contains(&self, c: &CoveringClass) -> bool {
        c.is_trivial() || self.elements.iter().any(|e| e.same_as(c))
    }
    /// Adds `c`; returns whether the span grew.
    fn insert(&mut self, c: &CoveringClass) -> Result<bool, Error> {
        if self.contains(c) {
            return Ok(false);
        }
        let mut new = vec![c.clone()];
        for e in &self.elements {
            let p = e.mul(c).ok_or_else(|| Error::internal("the quartic descent", "classes in different algebras"))?;
            new.push(p);
        }
        self.elements.extend(new);
        Ok(true)
    }
    fn dim(&self) -> usize {
        (self.elements.len() + 1).trailing_zeros() as usize
    }
}

/// Runs the full 2-descent on a minimal model `curve`. `bad_primes` are the
/// primes dividing its discriminant.
///
/// The steps, in order: enumerate the quartics with invariants `(c4, 2c6)`
/// ([`enumerate_coverings`]), keep the everywhere locally soluble classes
/// ([`soluble_classes`]), check and record the Selmer bound
/// ([`record_selmer_bound`]), search the curve ([`add_curve_points`]) and the
/// coverings not yet explained at rising heights ([`lift_coverings`]), and
/// finally the bounds and the unexplained classes ([`finish`]).
pub(crate) fn full_two_descent(
    curve: &Curve,
    torsion: &TorsionGroup,
    bad_primes: &[Natural],
    options: &RankOptions,
    work: &Work,
    enough: Option<usize>,
    parity_floor: Option<usize>,
) -> Result<FullDescent, Error> {
    work.report(Stage::Solubility, "enumerating quartic 2-coverings");
    let i = curve.c4().clone();
    let j = Integer::from(2) * curve.c6();
    let two_torsion_dim = match torsion.two_torsion().len() {
        0 => 0,
        1 => 1,
        _ => 2,
    };
    let mut out = FullDescent {
        invariants: (i.clone(), j.clone()),
        quartics_enumerated: 0,
        ruled_out: vec![],
        classes: vec![],
        selmer_dim: None,
        two_torsion_dim,
        found_dim: 0,
        lower: 0,
        upper: None,
        points: vec![],
        unexplained: vec![],
        search_complete: true,
        searched_height: 0,
    };
    let primes = descent_places(bad_primes);
    let enumeration = enumerate_coverings(&i, &j, options, work);
    let torsion_span = torsion_image(curve, torsion, two_torsion_dim)?;
    let mut span = ClassSpan { elements: torsion_span.elements.clone() };
    let (mut distinct, complete) = soluble_classes(enumeration, &primes, work, &mut out)?;
    if complete {
        record_selmer_bound(&distinct, &torsion_span, two_torsion_dim, &mut out)?;
    }
    work.report(Stage::Search, "searching the curve and its quartic coverings");
    add_curve_points(curve, options, work, &mut span, &mut out)?;
    lift_coverings(curve, &mut distinct, options, work, enough, &mut span, &mut out)?;
    if !complete {
        // no complete list of coverings to search: the points must come
        // from the curve itself, at rising heights
        raise_curve_search(curve, options, work, enough.or(parity_floor), &mut span, &mut out)?;
    }
    finish(distinct, &span, out)
}

/// The places to test: R (always), 2, 3 and the primes of the discriminant
/// (the quartics' discriminant is `256 Delta`; elsewhere solubility is
/// automatic). The real place is added by the solubility test itself.
fn descent_places(bad_primes: &[Natural]) -> Vec<Natural> {
    let mut primes: Vec<Natural> = vec![Natural::from(2u32), Natural::from(3u32)];
    for p in bad_primes {
        if !primes.contains(p) {
            primes.push(p.clone());
        }
    }
    primes
}

/// Every `GL2(Z)`-class of quartics with invariants `(i, j)`, negative
/// definite ones left out (never soluble over R), within the options'
/// candidate limit and the work's deadline and cancel flag.
fn enumerate_coverings(i: &Integer, j: &Integer, options: &RankOptions, work: &Work) -> Result<Vec<Quartic>, Error> {
    quartics_with_invariants(
        i,
        j,
        &SearchOptions::within(work).with_negative_definite(false).with_max_candidates(options.max_quartic_candidates),
    )
}

/// The image of the torsion points in Sel^2(E); its dimension must be
/// `dim E(Q)[2]`.
fn torsion_image(curve: &Curve, torsion: &TorsionGroup, two_torsion_dim: usize) -> Result<ClassSpan, Error> {
    let mut torsion_span = ClassSpan { elements: vec![] };
    for p in torsion.points() {
        if let Point::Affine(x, y) = p {
            let c = CoveringClass::kummer_image(curve, x, y).ok_or_else(|| Error::internal("the quartic descent", "torsion point off the curve"))?;
            torsion_span.insert(&c)?;
        }
    }
    if torsion_span.dim() != two_torsion_dim {
        return Err(Error::internal("the quartic descent", "the torsion image has the wrong dimension"));
    }
    Ok(torsion_span)
}

/// One quartic of each `GL2(Q)`-class among the everywhere locally soluble
/// quartics of the enumeration (the others go to `out.ruled_out`), and
/// whether the list is complete (the enumeration finished and every quartic
/// was tested within the budget).
fn soluble_classes(
    enumeration: Result<Vec<Quartic>, Error>,
    primes: &[Natural],
    work: &Work,
    out: &mut FullDescent,
) -> Result<(Vec<(CoveringClass, SelmerQuartic)>, bool), Error> {
    let mut distinct: Vec<(CoveringClass, SelmerQuartic)> = Vec::new();
    let complete = match enumeration {
        Ok(list) => {
            out.quartics_enumerated = list.len();
            let mut finished = true;
            let mut ws = SolubilityWorkspace::default();
            for g in list {
                if work.exhausted() {
                    finished = false;
                    out.search_complete = false;
                    break;
                }
                let coeffs = g.coeffs();
                match everywhere_locally_soluble_with(&coeffs, primes, &mut ws) {
                    Err(place) => out.ruled_out.push((g, place)),
                    Ok(witnesses) => {
                        let c = covering_class(&g)?;
                        if !distinct.iter().any(|(d, _)| d.same_as(&c)) {
                            distinct.push((c, SelmerQuartic { quartic: g, witnesses, point: None, covering_point: None }));
                        }
                    }
                }
            }
            finished
        }
        Err(e) if *e.kind() == ErrorKind::Budget || *e.kind() == ErrorKind::TooLarge => {
            // cut short by the clock or the cancellation flag (not refused
            // by its size estimate): the report says so
            if work.exhausted() {
                out.search_complete = false;
            }
            false
        }
        Err(e) => return Err(e),
    };
    Ok((distinct, complete))
}

/// For a complete list of classes: checks that it is a group of order `2^s`
/// holding the torsion image, and records `dim Sel^2 = s` and the upper bound.
fn record_selmer_bound(
    distinct: &[(CoveringClass, SelmerQuartic)],
    torsion_span: &ClassSpan,
    two_torsion_dim: usize,
    out: &mut FullDescent,
) -> Result<(), Error> {
    let n = distinct.len();
    if n == 0 || !n.is_power_of_two() {
        return Err(Error::internal("the quartic descent", &format!("{n} Selmer classes is not a power of 2")));
    }
    let s = n.trailing_zeros() as usize;
    if s < two_torsion_dim {
        return Err(Error::internal("the quartic descent", "Selmer group smaller than the torsion image"));
    }
    // every torsion image must be among the classes
    for t in &torsion_span.elements {
        if !distinct.iter().any(|(d, _)| d.same_as(t)) {
            return Err(Error::internal("the quartic descent", "a torsion image is not an everywhere locally soluble class"));
        }
    }
    out.selmer_dim = Some(s);
    out.upper = Some(s - two_torsion_dim);
    Ok(())
}

/// Adds `pt` (checked to be on `curve`) to the points found when its image
/// enlarges the span.
fn add_point(curve: &Curve, pt: Point, span: &mut ClassSpan, out: &mut FullDescent) -> Result<(), Error> {
    let Point::Affine(x, y) = &pt else { return Ok(()) };
    if !curve.contains(&pt) {
        return Err(Error::internal("the quartic descent", "a found point is not on the curve"));
    }
    let c = CoveringClass::kummer_image(curve, x, y).ok_or_else(|| Error::internal("the quartic descent", "point off the curve"))?;
    if span.insert(&c)? {
        out.points.push(pt);
    }
    Ok(())
}

/// Points on the curve itself up to `curve_search_height`, until the span
/// reaches the Selmer bound.
fn add_curve_points(curve: &Curve, options: &RankOptions, work: &Work, span: &mut ClassSpan, out: &mut FullDescent) -> Result<(), Error> {
    let curve_limits = SearchLimits {
        height: options.curve_search_height,
        first_only: false,
        deadline: work.deadline(),
        cancel: work.cancel_flag().cloned(),
    };
    let found = search_curve(curve, &curve_limits);
    out.search_complete &= found.complete;
    for (x, y) in found.points {
        if out.upper.is_some_and(|u| span.dim() - out.two_torsion_dim >= u) {
            break;
        }
        add_point(curve, Point::Affine(x, y), span, out)?;
    }
    Ok(())
}

/// The highest height the direct search on the curve is raised to when the
/// coverings are not available: `curve_search_height` times the square of
/// the covering ladder's ratio `search_height_ceiling / search_height` (a
/// point of height `h` on a 2-covering gives one of height about `h^2` on
/// the curve), at most `2^31`. With one fixed covering height (no covering
/// ladder) the curve is not searched beyond `curve_search_height` either.
fn curve_search_ceiling(options: &RankOptions) -> u64 {
    let ratio = options.search_height_ceiling / options.search_height.max(1);
    options.curve_search_height.saturating_mul(ratio.saturating_mul(ratio)).min(1 << 31)
}

/// The direct search on the curve, raised step by step (doubling from
/// `curve_search_height` towards [`curve_search_ceiling`], each rung only
/// when its cost predicted from the last one fits the ladder's share of the
/// budget: [`Ladder`], growth [`CURVE_GROWTH`]) while the span of the
/// points found stays below `goal` (the rank proven by another route, or
/// the least rank the root number allows by parity). Run when the
/// enumeration gave no complete list of coverings, so that the covering
/// ladder had nothing to raise: without it a curve whose generator lies
/// just above `curve_search_height` kept the lower bound 0. The first rung
/// here is the search of [`add_curve_points`] at `curve_search_height`,
/// whose cost is not known: the ladder starts with a measured search at
/// twice that height.
fn raise_curve_search(curve: &Curve, options: &RankOptions, work: &Work, goal: Option<usize>, span: &mut ClassSpan, out: &mut FullDescent) -> Result<(), Error> {
    let Some(goal) = goal else { return Ok(()) };
    let ceiling = curve_search_ceiling(options);
    if options.curve_search_height >= ceiling {
        return Ok(());
    }
    let first = options.curve_search_height.saturating_mul(2).min(ceiling);
    let mut ladder = Ladder::new(first, ceiling, CURVE_GROWTH, work, options.search_time_limit);
    while span.dim() - out.two_torsion_dim < goal && !work.exhausted() {
        let rung = ladder.rung_work(work);
        ladder.start_rung();
        let found = search_curve(curve, &SearchLimits::within(&rung, ladder.height()));
        ladder.end_rung();
        // a rung stopped by the ladder's own share (not by the budget of
        // the whole analysis) is the ladder's choice, like its ceiling
        out.search_complete &= found.complete || !work.exhausted();
        for (x, y) in found.points {
            if span.dim() - out.two_torsion_dim >= goal {
                break;
            }
            add_point(curve, Point::Affine(x, y), span, out)?;
        }
        if !found.complete || !ladder.climb() {
            break;
        }
    }
    Ok(())
}

/// Points on the coverings not yet explained, at heights raised step by
/// step: doubling from `search_height` towards `search_height_ceiling`,
/// each rung only when its cost, predicted from the last rung's (growth
/// [`QUARTIC_GROWTH`] per doubling), fits the ladder's share of the budget
/// ([`Ladder`]), while the bounds do not meet; a rank proven by another
/// route (`enough`) also ends the ladder. `out.searched_height` is the
/// height up to which every covering left unexplained was searched.
fn lift_coverings(
    curve: &Curve,
    distinct: &mut [(CoveringClass, SelmerQuartic)],
    options: &RankOptions,
    work: &Work,
    enough: Option<usize>,
    span: &mut ClassSpan,
    out: &mut FullDescent,
) -> Result<(), Error> {
    let two_torsion_dim = out.two_torsion_dim;
    let mut ladder = Ladder::new(options.search_height, options.search_height_ceiling, QUARTIC_GROWTH, work, options.search_time_limit);
    // the height every unexplained covering was searched to so far
    let mut reached = 0u64;
    // the height each covering's own search completed: a rung searches only
    // the pairs above it (the reduced quartic of a class is the same every
    // rung, and a covering with a point leaves the ladder)
    let mut done = vec![0u64; distinct.len()];
    loop {
        let height = ladder.height();
        let rung = ladder.rung_work(work);
        let mut rung_reached = height;
        let mut open = false;
        ladder.start_rung();
        for ((c, sq), from) in distinct.iter_mut().zip(done.iter_mut()) {
            if span.contains(c) {
                continue;
            }
            open = true;
            if rung.exhausted() {
                out.search_complete &= !work.exhausted();
                rung_reached = reached;
                break;
            }
            let (got, h) = lift_one_covering(curve, sq, &rung, *from, height, span, out)?;
            if !got {
                *from = (*from).max(h);
            }
            out.search_complete &= got || h >= height || !work.exhausted();
            if !got {
                rung_reached = rung_reached.min(h.max(reached));
            }
        }
        ladder.end_rung();
        reached = reached.max(rung_reached);
        out.searched_height = reached;
        let target = match (out.upper, enough) {
            (Some(u), Some(e)) => Some(u.min(e)),
            (u, e) => u.or(e),
        };
        let met = target.is_some_and(|u| span.dim() - two_torsion_dim >= u);
        // no covering left to search (or none listed): nothing to raise
        if met || !open || target.is_none() || work.exhausted() || rung_reached < height || !ladder.climb() {
            return Ok(());
        }
    }
}

/// Searches the reduced form of one class's quartic up to `height`, above
/// `from` (searched before without a point); the
/// first point found is mapped to the curve and recorded with the class
/// (both on the curve and on the class's own quartic, checked exactly).
/// Returns whether a point was found and the height the search reached.
fn lift_one_covering(
    curve: &Curve,
    sq: &mut SelmerQuartic,
    work: &Work,
    from: u64,
    height: u64,
    span: &mut ClassSpan,
    out: &mut FullDescent,
) -> Result<(bool, u64), Error> {
    let (red, [[al, be], [ga, de]]) = reduce(&sq.quartic);
    let limits = SearchLimits { first_only: true, ..SearchLimits::within(work, height) };
    let res = search_quartic_above(&red.coeffs(), &limits, from);
    let reached = if res.complete { height } else { res.height_reached };
    for qp in res.points {
        let (x, z, y) = (Rational::from(qp.x.clone()), Rational::from(qp.z.clone()), Rational::from(qp.y.clone()));
        if let Some((px, py)) = red.image_on_curve(curve, &x, &z, &y)? {
            let pt = Point::Affine(px, py);
            // the same point on the class's own quartic: (x, z) = M (x', z')
            let gx = &al * &qp.x + &be * &qp.z;
            let gz = &ga * &qp.x + &de * &qp.z;
            if sq.quartic.eval(&gx, &gz) != &qp.y * &qp.y {
                return Err(Error::internal("the quartic descent", "a covering point does not map back to its class's quartic"));
            }
            sq.covering_point = Some([gx, gz, qp.y]);
            sq.point = Some(pt.clone());
            add_point(curve, pt, span, out)?;
            return Ok((true, reached));
        }
    }
    Ok((false, reached))
}

/// The bounds from the span reached, and (with a Selmer bound) a basis of
/// the classes not explained by points.
fn finish(distinct: Vec<(CoveringClass, SelmerQuartic)>, span: &ClassSpan, mut out: FullDescent) -> Result<FullDescent, Error> {
    out.found_dim = span.dim();
    out.lower = span.dim() - out.two_torsion_dim;
    if let Some(u) = out.upper {
        if out.lower > u {
            return Err(Error::internal("the quartic descent", "lower bound exceeds the Selmer bound"));
        }
        let mut rest = ClassSpan { elements: span.elements.clone() };
        for (c, sq) in &distinct {
            if rest.insert(c)? {
                out.unexplained.push(reduce(&sq.quartic).0);
            }
        }
    }
    out.classes = distinct.into_iter().map(|(_, s)| s).collect();
    Ok(out)
}

/// The full 2-descent of `curve` on its own (without the isogeny route):
/// minimal model, torsion, the quartic classes of Sel^2(E) with their local
/// witnesses, points found and the classes left unexplained. Points are on
/// the global minimal model.
///
/// ```
/// use twofold::{Curve, RankOptions};
/// use twofold::descent::full::full_descent;
/// // y^2 + y = x^3 + x^2 - 2x: rank 2 (published tables, Cremona 1997, y^2 + y = x^3 + x^2 - 2x; from memory)
/// let e = Curve::from_coefficients([0, 1, 1, -2, 0]).unwrap();
/// let d = full_descent(&e, &RankOptions::default()).unwrap();
/// assert_eq!(d.selmer_dim, Some(2));
/// assert_eq!((d.lower, d.upper), (2, Some(2)));
/// ```
pub fn full_descent(curve: &Curve, options: &RankOptions) -> Result<FullDescent, Error> {
    let work = Work::new(options);
    let data = crate::local::CurveData::new(curve, &work)?;
    let torsion = TorsionGroup::compute(data.minimal(), data.bad_primes());
    full_two_descent(data.minimal(), &torsion, data.bad_primes(), options, &work, None, None)
}
