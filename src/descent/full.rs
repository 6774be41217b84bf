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

use crate::budget::{Budget, RankOptions, Stage};
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use crate::quartic::{covering_class, quartics_with_invariants, reduce, CoveringClass, Quartic, SearchOptions};
use crate::search::{search_curve, search_quartic, SearchLimits};
use crate::solubility::{everywhere_locally_soluble, LocalWitness, Place};
use crate::torsion::TorsionGroup;
use malachite::{Integer, Natural, Rational};

/// An everywhere locally soluble quartic class of Sel^2(E).
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub struct SelmerQuartic {
    /// A reduced integral quartic representing the class.
    pub quartic: Quartic,
    /// A local point (witness) at R and at every prime tested.
    pub witnesses: Vec<(Place, LocalWitness)>,
    /// A rational point found on it, mapped to E, if any.
    pub point: Option<Point>,
}

/// The result of the full 2-descent.
#[derive(Clone, Debug, PartialEq, Eq)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
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
    /// Whether the searches ran to their height bounds.
    pub search_complete: bool,
}

fn internal(msg: &str) -> Error {
    Error::new(ErrorKind::InvalidValue, format!("internal consistency check failed in the quartic descent: {msg}"))
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
            let p = e.mul(c).ok_or_else(|| internal("classes in different algebras"))?;
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
pub(crate) fn full_two_descent(
    curve: &Curve,
    torsion: &TorsionGroup,
    bad_primes: &[Natural],
    options: &RankOptions,
    budget: &Budget,
) -> Result<FullDescent, Error> {
    if let Some(f) = &options.progress {
        f(Stage::Solubility, "enumerating quartic 2-coverings");
    }
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
    };
    // the places: R, 2, 3 and the primes of the discriminant (the quartics'
    // discriminant is 256 Delta; elsewhere solubility is automatic)
    let mut primes: Vec<Natural> = vec![Natural::from(2u32), Natural::from(3u32)];
    for p in bad_primes {
        if !primes.contains(p) {
            primes.push(p.clone());
        }
    }
    let enumeration = quartics_with_invariants(
        &i,
        &j,
        &SearchOptions {
            include_negative_definite: false,
            max_candidates: Some(options.max_quartic_candidates),
            deadline: budget.deadline,
            cancel: budget.cancel.clone(),
        },
    );
    let mut torsion_span = ClassSpan { elements: vec![] };
    let mut span = ClassSpan { elements: vec![] };
    for p in torsion.points() {
        if let Point::Affine(x, y) = p {
            let c = CoveringClass::kummer_image(curve, x, y).ok_or_else(|| internal("torsion point off the curve"))?;
            torsion_span.insert(&c)?;
            span.insert(&c)?;
        }
    }
    if torsion_span.dim() != two_torsion_dim {
        return Err(internal("the torsion image has the wrong dimension"));
    }
    let mut distinct: Vec<(CoveringClass, SelmerQuartic)> = Vec::new();
    let complete = match enumeration {
        Ok(list) => {
            out.quartics_enumerated = list.len();
            let mut finished = true;
            for g in list {
                if budget.exhausted() {
                    finished = false;
                    out.search_complete = false;
                    break;
                }
                let coeffs = g.coeffs();
                match everywhere_locally_soluble(&coeffs, &primes) {
                    Err(place) => out.ruled_out.push((g, place)),
                    Ok(witnesses) => {
                        let c = covering_class(&g)?;
                        if !distinct.iter().any(|(d, _)| d.same_as(&c)) {
                            distinct.push((c, SelmerQuartic { quartic: g, witnesses, point: None }));
                        }
                    }
                }
            }
            finished
        }
        Err(e) if *e.kind() == ErrorKind::Budget || *e.kind() == ErrorKind::TooLarge => {
            // cut short by the clock or the cancellation flag (not refused
            // by its size estimate): the report says so
            if budget.exhausted() {
                out.search_complete = false;
            }
            false
        }
        Err(e) => return Err(e),
    };
    if complete {
        let n = distinct.len();
        if n == 0 || !n.is_power_of_two() {
            return Err(internal(&format!("{n} Selmer classes is not a power of 2")));
        }
        let s = n.trailing_zeros() as usize;
        if s < two_torsion_dim {
            return Err(internal("Selmer group smaller than the torsion image"));
        }
        // every torsion image must be among the classes
        for t in &torsion_span.elements {
            if !distinct.iter().any(|(d, _)| d.same_as(t)) {
                return Err(internal("a torsion image is not an everywhere locally soluble class"));
            }
        }
        out.selmer_dim = Some(s);
        out.upper = Some(s - two_torsion_dim);
    }
    // points on E itself
    if let Some(f) = &options.progress {
        f(Stage::Search, "searching the curve and its quartic coverings");
    }
    let curve_limits = SearchLimits {
        height: options.curve_search_height,
        first_only: false,
        deadline: budget.deadline,
        cancel: budget.cancel.clone(),
    };
    let found = search_curve(curve, &curve_limits);
    out.search_complete &= found.complete;
    let add_point = |pt: Point, span: &mut ClassSpan, out: &mut FullDescent| -> Result<(), Error> {
        let Point::Affine(x, y) = &pt else { return Ok(()) };
        if !curve.contains(&pt) {
            return Err(internal("a found point is not on the curve"));
        }
        let c = CoveringClass::kummer_image(curve, x, y).ok_or_else(|| internal("point off the curve"))?;
        if span.insert(&c)? {
            out.points.push(pt);
        }
        Ok(())
    };
    for (x, y) in found.points {
        if out.upper.is_some_and(|u| span.dim() - two_torsion_dim >= u) {
            break;
        }
        add_point(Point::Affine(x, y), &mut span, &mut out)?;
    }
    // points on the coverings not yet explained
    for (c, sq) in distinct.iter_mut() {
        if span.contains(c) {
            continue;
        }
        if budget.exhausted() {
            out.search_complete = false;
            break;
        }
        let (red, _) = reduce(&sq.quartic);
        let limits = SearchLimits {
            height: options.search_height,
            first_only: true,
            deadline: budget.deadline,
            cancel: budget.cancel.clone(),
        };
        let res = search_quartic(&red.coeffs(), &limits);
        out.search_complete &= res.complete || !res.points.is_empty();
        for qp in res.points {
            let (x, z, y) = (Rational::from(qp.x), Rational::from(qp.z), Rational::from(qp.y));
            if let Some((px, py)) = red.image_on_curve(curve, &x, &z, &y)? {
                let pt = Point::Affine(px, py);
                sq.point = Some(pt.clone());
                add_point(pt, &mut span, &mut out)?;
                break;
            }
        }
    }
    out.found_dim = span.dim();
    out.lower = span.dim() - two_torsion_dim;
    if let Some(u) = out.upper {
        if out.lower > u {
            return Err(internal("lower bound exceeds the Selmer bound"));
        }
        // a basis of the classes not explained by points
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
/// // y^2 + y = x^3 + x^2 - 2x: rank 2 (Cremona's tables, 389a1; from memory)
/// let e = Curve::from_coefficients([0, 1, 1, -2, 0]).unwrap();
/// let d = full_descent(&e, &RankOptions::default()).unwrap();
/// assert_eq!(d.selmer_dim, Some(2));
/// assert_eq!((d.lower, d.upper), (2, Some(2)));
/// ```
pub fn full_descent(curve: &Curve, options: &RankOptions) -> Result<FullDescent, Error> {
    let budget = Budget::from_options(options);
    let limits = crate::arith::FactorLimits { deadline: budget.deadline, cancel: budget.cancel.clone() };
    let primes: Vec<Natural> = crate::arith::factor(curve.discriminant(), &limits)?.primes().cloned().collect();
    let (minimal, _) = curve.minimal_model(&primes)?;
    let primes: Vec<Natural> =
        primes.into_iter().filter(|p| crate::arith::valuation(minimal.discriminant(), p).unwrap_or(0) > 0).collect();
    let torsion = TorsionGroup::compute(&minimal, &primes);
    full_two_descent(&minimal, &torsion, &primes, options, &budget)
}
