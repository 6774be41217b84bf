//! The pipeline from a curve to its report.

use super::{RankReport, Route, ShaSuspect};
use crate::arith::{factor, FactorLimits};
use crate::budget::{Budget, RankOptions, Stage};
use crate::curve::{Curve, Point};
use crate::descent::full::{full_two_descent, FullDescent};
use crate::descent::isogeny::{covering_quartic, descend_via_isogeny, IsogenyDescent};
use crate::error::Error;
use crate::local::{conductor, local_data};
use crate::torsion::TorsionGroup;
use malachite::Natural;

/// Computes everything twofold can prove about the rank of `curve`:
/// minimal model, conductor and local data, torsion, and rank bounds from
/// descent, with points on the input model and the coverings where Sha
/// could hide.
///
/// Errors: [`crate::ErrorKind::FactorBudget`] when the discriminant cannot be
/// factored within the budget. A budget that runs out later gives a report
/// with what was proven (`budget_exhausted` set).
///
/// ```
/// use twofold::{analyse, Curve, RankOptions};
/// let e = Curve::parse("y^2 = x^3 - x").unwrap(); // 32a2: rank 0, torsion Z/2 x Z/2 (Cremona's table)
/// let r = analyse(&e, &RankOptions::default()).unwrap();
/// assert_eq!(r.rank(), Some(0));
/// assert_eq!(r.torsion, vec![2, 2]);
/// assert_eq!(r.conductor.to_string(), "32");
/// ```
pub fn analyse(curve: &Curve, options: &RankOptions) -> Result<RankReport, Error> {
    let budget = Budget::from_options(options);
    let progress = |s: Stage, m: &str| {
        if let Some(f) = &options.progress {
            f(s, m)
        }
    };
    progress(Stage::LocalData, "factoring the discriminant");
    let limits = FactorLimits { deadline: budget.deadline, cancel: budget.cancel.clone() };
    let primes: Vec<Natural> = match &options.known_primes {
        Some(ps) => check_known_primes(curve, ps, &limits)?,
        None => factor(curve.discriminant(), &limits)?.primes().cloned().collect(),
    };
    let (minimal, change) = curve.minimal_model(&primes)?;
    let min_primes: Vec<Natural> = primes
        .iter()
        .filter(|p| crate::arith::valuation(minimal.discriminant(), p).unwrap_or(0) > 0)
        .cloned()
        .collect();
    let local: Vec<_> = min_primes.iter().map(|p| local_data(&minimal, p)).collect::<Result<_, _>>()?;
    let cond = conductor(&minimal, &min_primes)?;
    progress(Stage::Torsion, "torsion subgroup");
    let torsion = TorsionGroup::compute(&minimal, &min_primes);
    let to_input = |p: &Point| unmap(&change, p);
    let mut report = RankReport {
        input: curve.clone(),
        minimal: minimal.clone(),
        conductor: cond,
        local,
        torsion: torsion.invariants(),
        torsion_points: torsion.points().iter().map(to_input).collect(),
        rank_lower: None,
        rank_upper: None,
        route: Route::None,
        isogeny_selmer: None,
        points: vec![],
        independence: String::new(),
        sha_suspects: vec![],
        selmer2_dim: None,
        isogeny_runs: vec![],
        full_descent: None,
        quartic_model: None,
        evidence: None,
        certificate: None,
        change: change.clone(),
        budget_exhausted: false,
        elapsed: budget.elapsed(),
    };
    let twos = torsion.two_torsion();
    let mut runs: Vec<IsogenyDescent> = Vec::new();
    for t in &twos {
        if budget.exhausted() {
            report.budget_exhausted = true;
            break;
        }
        runs.push(descend_via_isogeny(&minimal, t, &torsion, &min_primes, options, &budget)?);
    }
    // the full 2-descent runs on every curve, except where the isogeny
    // route has already proven the rank (unless a cross-check is asked for)
    let settled = runs.iter().any(|r| r.upper == Some(r.lower))
        || (runs.iter().filter_map(|r| r.upper).min() == runs.iter().map(|r| r.lower).max());
    let settled = settled && !runs.is_empty();
    let full: Option<FullDescent> = if budget.exhausted() {
        report.budget_exhausted = true;
        None
    } else if settled && !options.cross_check_routes {
        None
    } else {
        Some(quartic_route(&minimal, &torsion, &min_primes, options, &budget, &mut report)?)
    };
    combine(&mut report, &runs, full.as_ref(), options)?;
    report.isogeny_runs = runs;
    report.full_descent = full;
    for p in &report.points {
        if !curve.contains(p) {
            return Err(Error::new(crate::ErrorKind::InvalidValue, "internal check failed: reported point not on the input curve"));
        }
    }
    if options.evidence && !budget.exhausted() {
        report.evidence = Some(super::evidence::compute(&report, &budget));
    }
    if options.certificate {
        report.certificate = crate::certificate::Certificate::from_report(&report).ok().map(|c| c.to_text());
    }
    progress(Stage::Report, "done");
    report.elapsed = budget.elapsed();
    Ok(report)
}

/// Curves with `|c4|` below this run the quartic descent on themselves
/// without looking for a smaller isogenous curve (the enumeration is then
/// cheaper than the isogeny search).
const ISOGENY_SHORTCUT_C4: u64 = 20_000;

/// The full 2-descent, run on the member of the odd-degree isogeny class of
/// `minimal` with the smallest `|c4|` (the enumeration costs about
/// `|c4|^{3/2}`). An isogeny of odd degree carries `Sel^2`, `E(Q)[2]` and the
/// rank over unchanged (see [`crate::isogeny`]); points found on the other
/// curve are carried back along the isogenies, which keeps them independent.
fn quartic_route(
    minimal: &Curve,
    torsion: &TorsionGroup,
    primes: &[Natural],
    options: &RankOptions,
    budget: &Budget,
    report: &mut RankReport,
) -> Result<FullDescent, Error> {
    use malachite::base::num::arithmetic::traits::UnsignedAbs;
    if minimal.c4().unsigned_abs() < ISOGENY_SHORTCUT_C4 {
        return full_two_descent(minimal, torsion, primes, options, budget);
    }
    let class = crate::isogeny::odd_isogeny_class(minimal, primes)?;
    let best = class.smallest_c4();
    if best == 0 || class.curves[best].c4().unsigned_abs() * Natural::from(2u32) > minimal.c4().unsigned_abs() {
        return full_two_descent(minimal, torsion, primes, options, budget);
    }
    let other = &class.curves[best];
    let degree = class.degree(0, best).unwrap_or(0);
    let other_torsion = TorsionGroup::compute(other, primes);
    let mut f = full_two_descent(other, &other_torsion, primes, options, budget)?;
    let mut mapped = Vec::new();
    for p in &f.points {
        match class.map_point(best, 0, p) {
            Some(q) if minimal.contains(&q) && !q.is_infinity() => mapped.push(q),
            _ => break,
        }
    }
    f.lower = mapped.len();
    f.points = mapped;
    report.quartic_model = Some((other.clone(), degree));
    Ok(f)
}

/// Keeps the tightest bounds of the routes that ran, checks that they do not
/// contradict each other, and takes points and Sha suspects from the routes
/// that gave the bounds.
fn combine(report: &mut RankReport, runs: &[IsogenyDescent], full: Option<&FullDescent>, options: &RankOptions) -> Result<(), Error> {
    let to_input = |p: &Point| unmap(&report.change, p);
    let mut lower: Option<(usize, Vec<Point>, String)> = None;
    let mut upper: Option<usize> = None;
    let consider_lower = |l: usize, pts: Vec<Point>, why: String, lower: &mut Option<(usize, Vec<Point>, String)>| {
        if lower.as_ref().is_none_or(|(b, _, _)| l > *b) {
            *lower = Some((l, pts, why));
        }
    };
    for r in runs {
        consider_lower(
            r.lower,
            r.points.iter().map(to_input).collect(),
            format!(
                "their images under the connecting maps of the 2-isogeny with kernel {} are independent modulo the images of torsion (Silverman-Tate III.6)",
                r.kernel_point
            ),
            &mut lower,
        );
        if let Some(u) = r.upper {
            upper = Some(upper.map_or(u, |b: usize| b.min(u)));
        }
    }
    if let Some(f) = full {
        consider_lower(
            f.lower,
            f.points.iter().map(to_input).collect(),
            "their images in Sel^2(E), in (Q[x]/F(x))*/squares, are independent modulo the image of E(Q)[2]".to_string(),
            &mut lower,
        );
        if let Some(u) = f.upper {
            upper = Some(upper.map_or(u, |b: usize| b.min(u)));
        }
        report.selmer2_dim = f.selmer_dim;
        if !f.search_complete {
            report.budget_exhausted = true;
        }
    }
    // the routes must never contradict each other
    let lows: Vec<usize> = runs.iter().map(|r| r.lower).chain(full.map(|f| f.lower)).collect();
    let ups: Vec<usize> = runs.iter().filter_map(|r| r.upper).chain(full.and_then(|f| f.upper)).collect();
    if let (Some(&l), Some(&u)) = (lows.iter().max(), ups.iter().min()) {
        if l > u {
            return Err(Error::new(crate::ErrorKind::InvalidValue, "internal check failed: the descent routes contradict each other"));
        }
    }
    report.route = match (runs.is_empty(), full.is_some()) {
        (false, true) => Route::IsogenyAndQuartic,
        (false, false) => Route::Isogeny,
        (true, true) => Route::Quartic,
        (true, false) => Route::None,
    };
    if let Some((l, pts, why)) = lower {
        report.rank_lower = Some(l);
        report.points = pts;
        report.independence = why;
    }
    report.rank_upper = upper;
    if let Some(best) = runs.iter().filter(|r| r.upper.is_some()).min_by_key(|r| r.upper.unwrap_or(usize::MAX)) {
        report.isogeny_selmer = Some((best.side_e.selmer_dim, best.side_e_prime.selmer_dim));
    }
    if let Some(u) = report.rank_upper.filter(|&u| Some(u) != report.rank_lower) {
        if let Some(f) = full.filter(|f| f.upper == Some(u)) {
            let origin = match &report.quartic_model {
                None => "quartic 2-covering of E (an element of Sel^2(E))".to_string(),
                Some((c, d)) => format!(
                    "quartic 2-covering of the {d}-isogenous curve {} (an element of its Sel^2, isomorphic to Sel^2(E) since {d} is odd)",
                    super::coefficients_text(c)
                ),
            };
            for q in &f.unexplained {
                report.sha_suspects.push(ShaSuspect {
                    origin: origin.clone(),
                    quartic: q.coeffs(),
                    class: None,
                    searched_height: options.search_height,
                });
            }
        } else if let Some(best) = runs.iter().find(|r| r.upper == Some(u)) {
            for (side, name) in [(&best.side_e, "E"), (&best.side_e_prime, "E'")] {
                for d in &side.unexplained {
                    report.sha_suspects.push(ShaSuspect {
                        origin: format!("2-isogeny with kernel {}, covering of {name}", best.kernel_point),
                        quartic: covering_quartic(d, &side.a, &side.b),
                        class: Some(d.clone()),
                        searched_height: options.search_height,
                    });
                }
            }
        }
    }
    if runs.iter().any(|r| !r.search_complete) {
        report.budget_exhausted = true;
    }
    Ok(())
}

/// A point on the minimal model, taken back to the input model.
pub(crate) fn unmap(change: &crate::ModelChange, p: &Point) -> Point {
    match p {
        Point::Infinity => Point::Infinity,
        Point::Affine(x, y) => {
            let (x, y) = change.unmap_point(&(x.clone(), y.clone()));
            Point::Affine(x, y)
        }
    }
}

/// Checks caller-supplied primes: each a probable prime (BPSW), and together
/// accounting for the whole discriminant.
fn check_known_primes(curve: &Curve, ps: &[Natural], limits: &FactorLimits) -> Result<Vec<Natural>, Error> {
    use malachite::base::num::arithmetic::traits::{Abs, DivisibleBy};
    use malachite::Integer;
    let mut rest = curve.discriminant().clone().abs();
    let mut out = Vec::new();
    for p in ps {
        if !crate::arith::is_probable_prime_within(p, limits)? {
            return Err(Error::new(crate::ErrorKind::InvalidValue, format!("{p} is not prime")));
        }
        let pi = Integer::from(p.clone());
        while (&rest).divisible_by(&pi) {
            rest /= &pi;
        }
        if !out.contains(p) {
            out.push(p.clone());
        }
    }
    if rest != 1 {
        return Err(Error::new(
            crate::ErrorKind::InvalidValue,
            format!("the given primes do not account for the discriminant: cofactor {rest} remains"),
        ));
    }
    out.sort();
    Ok(out)
}
