//! The pipeline from a curve to its report: one [`CurveData`] (minimal
//! model, bad primes, local data, conductor) and one [`Work`] (deadline,
//! cancellation, progress) are built once and handed to every stage in
//! turn; the report, the evidence and the certificate are built from what
//! the stages returned.
//!
//! ```text
//! curve -> CurveData -> torsion -> analytic route (proven L-values)
//!       -> 2-isogeny descents -> quartic descent (on the odd-isogenous
//!       curve of smallest c4) -> descent over Q[X]/(f) -> combine, decide
//!       -> Heegner point -> evidence -> Sha[2] -> certificate -> RankReport
//! ```

mod evidence;

use crate::budget::{RankOptions, Stage, Work};
use crate::curve::{Curve, Point};
use crate::descent::algebra::{class_mask, search_coverings, torsion_masks, two_selmer_with_context, AlgebraDescent, CoveringContext};
use crate::descent::full::{full_two_descent, FullDescent};
use crate::descent::isogeny::{covering_quartic, descend_via_isogeny, IsogenyDescent};
use crate::error::Error;
use crate::local::CurveData;
use crate::report::{RankReport, Route, ShaSuspect, Standing, Statement};
use crate::torsion::TorsionGroup;
use malachite::{Integer, Natural};

/// Computes everything twofold can prove about the rank of `curve`:
/// minimal model, conductor and local data, torsion, and rank bounds from
/// descent, with points on the input model and the coverings where Sha
/// could hide.
///
/// Errors: [`crate::ErrorKind::FactorBudget`] when the discriminant cannot be
/// factored within the budget. A budget that runs out later gives a report
/// with what was proven (`budget_exhausted` set); when it runs out in the
/// torsion step (which every later stage needs; normally milliseconds) the
/// report has `torsion_known == false`, no rank bounds, and a statement with
/// the bound on the torsion order.
///
/// ```
/// use twofold::{analyse, Curve, RankOptions};
/// let e = Curve::parse("y^2 = x^3 - x").unwrap(); // conductor 32: rank 0, torsion Z/2 x Z/2 (published table, Cremona 1997)
/// let r = analyse(&e, &RankOptions::default()).unwrap();
/// assert_eq!(r.rank(), Some(0));
/// assert_eq!(r.torsion, vec![2, 2]);
/// assert_eq!(r.conductor.to_string(), "32");
/// ```
pub fn analyse(curve: &Curve, options: &RankOptions) -> Result<RankReport, Error> {
    let work = Work::new(options);
    work.report(Stage::LocalData, "factoring the discriminant");
    let data = match &options.known_primes {
        Some(ps) => CurveData::with_known_primes_within(curve, ps, &work)?,
        None => CurveData::new(curve, &work)?,
    };
    analyse_data(&data, options, &work)
}

/// The pipeline after the curve's data is known (see [`analyse`]).
pub fn analyse_data(data: &CurveData, options: &RankOptions, work: &Work) -> Result<RankReport, Error> {
    let minimal = data.minimal();
    let primes = data.bad_primes();
    work.report(Stage::Torsion, "torsion subgroup");
    let torsion = match TorsionGroup::compute_within(minimal, primes, work) {
        Ok(t) => t,
        // cut short by the deadline or the cancel flag: a report with what
        // is known (model, conductor, local data, the order bound in the
        // statement), every stage that rests on the torsion skipped
        Err(e) if *e.kind() == crate::ErrorKind::Budget => {
            let mut report = empty_report(data, work);
            report.torsion_known = false;
            report.budget_exhausted = true;
            report.evidence = Some(unfinished_evidence(format!(
                "the torsion subgroup was not finished within the budget ({e}); the descents, the analytic route and the evidence rest on it and were skipped"
            )));
            report.elapsed = work.elapsed();
            return Ok(report);
        }
        Err(e) => return Err(e.in_stage("the torsion subgroup")),
    };
    let mut report = empty_report(data, work);
    report.torsion = torsion.invariants();
    report.torsion_points = torsion.points().iter().map(|p| data.to_input(p)).collect();
    // the analytic route first: a rank it proves tells the descents' point
    // searches when to stop
    // statements of stages that failed without an inconsistency, for the
    // evidence (a stage's failure is never dropped silently)
    let mut unfinished: Vec<Statement> = Vec::new();
    let (analytic, analytic_unfinished) = analytic_route(data, options, work)?;
    let enough: Option<usize> = analytic.as_ref().and_then(|a| a.rank);
    report.analytic = analytic;
    // analytic rank 1 proven: the descents search their coverings within
    // a small part of the ladders' budget, then the Heegner route computes
    // a generator if none was found, and only if that fails do the descents
    // run again with the whole ladder (generators too large for any plain
    // search, like the congruent-number curve for n = 157, would otherwise
    // spend the budget on the ladder first)
    // the algebra route's result, kept for a second run of the descents
    let mut algebra_once: AlgebraOnce = None;
    let heegner_first = options.heegner_route && enough == Some(1) && options.search_height_ceiling > options.search_height;
    if heegner_first {
        let before = report.clone();
        // before the Heegner step the ladders climb within an eighth of
        // their CPU cap: generators of moderate height (a covering point
        // below about 10^5) come cheaper from the search than from the
        // Heegner series, while those far beyond any search (n = 157 on the
        // congruent-number curve) lose little time to it
        let small_ladder = RankOptions { search_time_limit: options.search_time_limit.mul_f64(PRE_HEEGNER_LADDER), ..options.clone() };
        // where the quartic enumeration is expected to be slow, the Heegner
        // step runs before the descents (it would otherwise find the budget
        // spent), and its point is adopted after them
        let early = quartic_enumeration_is_costly(data);
        let found = if early { heegner_search(&mut report, data, options, work)? } else { None };
        descents(&mut report, data, &torsion, &small_ladder, work, enough, &mut unfinished, &mut algebra_once)?;
        match &found {
            Some(f) => adopt_heegner_point(&mut report, data, f)?,
            None if !early => heegner_point(&mut report, data, options, work)?,
            None => {}
        }
        three_descent_point(&mut report, data, work)?;
        if report.points.is_empty() && !work.exhausted() {
            // a Heegner step stopped by its share of the budget marked the
            // report as cut short: the mark survives the second descent run
            let cut_short = report.budget_exhausted;
            report = before;
            report.budget_exhausted |= cut_short;
            unfinished.clear();
            descents(&mut report, data, &torsion, options, work, enough, &mut unfinished, &mut algebra_once)?;
        }
    } else {
        descents(&mut report, data, &torsion, options, work, enough, &mut unfinished, &mut algebra_once)?;
        heegner_point(&mut report, data, options, work)?;
        three_descent_point(&mut report, data, work)?;
    }
    for p in &report.points {
        if !data.input().contains(p) {
            return Err(Error::internal("the report", "a reported point is not on the input curve"));
        }
    }
    // the root number stage runs once: the evidence states it and the
    // certificate records its local factors, both from the report
    // (decided before the stage runs: a budget spent inside it leaves the
    // evidence with a statement saying so, never without evidence)
    let evidence_now = options.evidence && !work.exhausted();
    let root_number = (evidence_now || (options.certificate && !work.exhausted())).then(|| {
        work.report(if options.evidence { Stage::Evidence } else { Stage::Certificate }, "root number");
        crate::rootno::root_number_of(data, &crate::arith::FactorLimits::within(work))
    });
    let root_number_failure = match root_number {
        Some(Ok(rn)) => {
            report.root_number = Some(rn);
            None
        }
        Some(Err(e)) => Some(e),
        None => None,
    };
    if evidence_now {
        let mut ev = evidence::compute(&report, data, root_number_failure.as_ref(), work);
        if let Some(e) = analytic_unfinished {
            ev.statements.push(Statement { claim: format!("the analytic route did not finish: {e}"), standing: Standing::Unfinished });
        }
        ev.statements.append(&mut unfinished);
        report.evidence = Some(ev);
    }
    note_conditional_bound(&mut report);
    cross_check_analytic(&report)?;
    root_number_by_parity(&mut report, data)?;
    settle_sha2(&mut report)?;
    settle_isogeny_sha(&mut report)?;
    if options.certificate {
        work.report(Stage::Certificate, "certificate of the rank proof");
        match crate::certificate::Certificate::from_report(&report) {
            Ok(c) => report.certificate = Some(c.to_text()),
            Err(e) => {
                if let Some(ev) = report.evidence.as_mut() {
                    ev.statements.push(Statement {
                        claim: format!("the certificate was not built: {e}"),
                        standing: Standing::Unfinished,
                    });
                }
            }
        }
    }
    if work.exhausted() {
        report.budget_exhausted = true;
    }
    work.report(Stage::Report, "done");
    report.elapsed = work.elapsed();
    Ok(report)
}

/// The part of the ladders' CPU cap (`RankOptions::search_time_limit`)
/// that the searches may spend before the Heegner step, when the analytic
/// rank is proven 1.
const PRE_HEEGNER_LADDER: f64 = 0.125;

/// The descents (2-isogeny, full 2-descent, descent over the algebra), their
/// combination and the rank decision, written into `report`.
#[allow(clippy::too_many_arguments)]
fn descents(
    report: &mut RankReport,
    data: &CurveData,
    torsion: &TorsionGroup,
    options: &RankOptions,
    work: &Work,
    enough: Option<usize>,
    unfinished: &mut Vec<Statement>,
    once: &mut AlgebraOnce,
) -> Result<(), Error> {
    let minimal = data.minimal();
    let primes = data.bad_primes();
    let twos = torsion.two_torsion();
    let mut runs: Vec<IsogenyDescent> = Vec::new();
    for t in &twos {
        if work.exhausted() {
            report.budget_exhausted = true;
            break;
        }
        runs.push(descend_via_isogeny(minimal, t, torsion, primes, options, work, enough).map_err(|e| e.in_stage("the 2-isogeny descent"))?);
    }
    // the full 2-descent runs on every curve, except where the isogeny
    // route has already proven the rank (unless a cross-check is asked for)
    let settled = runs.iter().any(|r| r.upper == Some(r.lower))
        || (runs.iter().filter_map(|r| r.upper).min() == runs.iter().map(|r| r.lower).max());
    let settled = settled && !runs.is_empty();
    // planned by cost: without rational 2-torsion and with an expensive
    // enumeration, the cubic algebra runs first (see `cubic_algebra_first`)
    let first = twos.is_empty() && !work.exhausted() && cubic_algebra_first(minimal);
    let (mut algebra, mut context) = if first { algebra_route(minimal, torsion, primes, work, report, unfinished, once)? } else { (None, None) };
    let (quartic_options, goal) = plan_enumeration(options, enough, algebra.as_ref(), first);
    let full: Option<FullDescent> = if work.exhausted() {
        report.budget_exhausted = true;
        None
    } else if settled && !options.cross_check_routes {
        None
    } else {
        Some(quartic_route(minimal, torsion, primes, &quartic_options, work, goal, report).map_err(|e| e.in_stage("the quartic descent"))?)
    };
    // the descent over Q[X]/(f): Sel^2(E) beside the isogeny Selmer groups
    // (for rational 2-torsion: A = Q x Q x Q or Q x K), and for the cubic
    // algebra where the quartic enumeration gave no Sel^2
    let quartic_done = full.as_ref().is_some_and(|f| f.selmer_dim.is_some());
    if !first && !work.exhausted() && !(twos.is_empty() && quartic_done) {
        (algebra, context) = algebra_route(minimal, torsion, primes, work, report, unfinished, once)?;
    }
    combine(report, data, &runs, full.as_ref())?;
    if let Some(a) = &algebra {
        combine_algebra(report, &runs, full.as_ref(), a)?;
    }
    if let (Some(a), Some(ctx)) = (&algebra, &context) {
        covering_points(report, data, &runs, full.as_ref(), a, ctx, enough, options, work, unfinished)?;
    }
    report.isogeny_runs = runs;
    report.full_descent = full;
    report.algebra_descent = algebra;
    report.descent_bounds = (report.rank_lower, report.rank_upper);
    if report.rank().is_some() {
        report.rank_proven_by.push(crate::report::ProofRoute::Descent);
    }
    decide_rank(report)
}

/// A report with the curve's data and nothing proven yet.
fn empty_report(data: &CurveData, work: &Work) -> RankReport {
    RankReport {
        input: data.input().clone(),
        minimal: data.minimal().clone(),
        conductor: Integer::from(data.conductor().clone()),
        local: data.local().to_vec(),
        torsion: vec![],
        torsion_points: vec![],
        torsion_known: true,
        rank_lower: None,
        rank_upper: None,
        descent_bounds: (None, None),
        rank_proven_by: vec![],
        analytic: None,
        root_number: None,
        sha2_dim: None,
        isogeny_sha_dims: vec![],
        route: Route::None,
        isogeny_selmer_dims: None,
        points: vec![],
        independence: String::new(),
        sha_suspects: vec![],
        two_selmer_dim: None,
        isogeny_runs: vec![],
        full_descent: None,
        algebra_descent: None,
        descent_curve: None,
        evidence: None,
        certificate: None,
        change: data.change().clone(),
        budget_exhausted: false,
        elapsed: work.elapsed(),
    }
}

/// Evidence holding one unfinished statement (a stage cut short before any
/// evidence could be computed).
fn unfinished_evidence(why: String) -> crate::report::Evidence {
    crate::report::Evidence {
        root_number: None,
        generators: None,
        reduced_points: vec![],
        heights: vec![],
        regulator: None,
        saturation: None,
        real_period: None,
        tamagawa: vec![],
        vanishing_order: None,
        leading_value: None,
        sha_bsd_estimate: None,
        statements: vec![Statement { claim: why, standing: Standing::Unfinished }],
    }
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
    work: &Work,
    enough: Option<usize>,
    report: &mut RankReport,
) -> Result<FullDescent, Error> {
    use malachite::base::num::arithmetic::traits::UnsignedAbs;
    // root number -1 proven: the rank is odd, so at least 1, by the parity
    // conjecture (only a reason to keep searching, never a claim)
    let floor = report.analytic.as_ref().and_then(|a| a.root_number).filter(|w| *w == -1).map(|_| 1);
    if minimal.c4().unsigned_abs() < ISOGENY_SHORTCUT_C4 {
        return own_then_class(minimal, torsion, primes, options, work, enough, floor, report);
    }
    work.report(Stage::IsogenyClass, "odd-degree isogeny class");
    let class = match crate::isogeny::odd_isogeny_class_within(minimal, primes, work) {
        Ok(c) => c,
        // cut short: the descent on the curve itself, which stops at once
        // on the spent budget and reports no upper bound
        Err(e) if *e.kind() == crate::ErrorKind::Budget => return full_two_descent(minimal, torsion, primes, options, work, enough, floor),
        Err(e) => return Err(e),
    };
    let best = class.smallest_c4();
    if best == 0 || class.curves[best].c4().unsigned_abs() * Natural::from(2u32) > minimal.c4().unsigned_abs() {
        return full_two_descent(minimal, torsion, primes, options, work, enough, floor);
    }
    let other = &class.curves[best];
    let degree = class.degree(0, best).unwrap_or(0);
    let other_torsion = TorsionGroup::compute(other, primes);
    let mut f = full_two_descent(other, &other_torsion, primes, options, work, enough, floor)?;
    carry_back(&class, best, minimal, &mut f);
    report.descent_curve = Some((other.clone(), degree));
    Ok(f)
}

/// Replaces the points of a descent run on member `m` of `class` by their
/// images on member 0, `minimal` (each checked on it), and its lower bound
/// by their number: the images of independent points under an isogeny of
/// odd degree stay independent, in E(Q) and in Sel^2 (the isogeny induces
/// an isomorphism of E'(Q)/2E'(Q) onto E(Q)/2E(Q)). A point that does not
/// map ends the list.
fn carry_back(class: &crate::isogeny::OddIsogenyClass, m: usize, minimal: &Curve, f: &mut FullDescent) {
    let mut mapped = Vec::new();
    for p in &f.points {
        match class.map_point(m, 0, p) {
            Some(q) if minimal.contains(&q) && !q.is_infinity() => mapped.push(q),
            _ => break,
        }
    }
    f.lower = mapped.len();
    f.points = mapped;
}

/// The share of the ladders' CPU cap (`RankOptions::search_time_limit`)
/// that the coverings of the curve itself get before those of its
/// odd-degree isogenous curves are searched (see [`own_then_class`]).
const OWN_COVERINGS_FIRST: f64 = 0.25;

/// Whether a descent's points reach the rank it must reach: the least of
/// its Selmer bound and `enough` (a rank proven by another route), or
/// without either the parity floor; `None` when nothing asks for more.
fn descent_short_of_goal(f: &FullDescent, enough: Option<usize>, floor: Option<usize>) -> bool {
    let goal = match (f.upper, enough) {
        (Some(u), Some(e)) => Some(u.min(e)),
        (u, e) => u.or(e).or(floor),
    };
    goal.is_some_and(|g| f.lower < g)
}

/// The weight `Omega * prod c_p / #E(Q)_tors^2` of a minimal model: by the
/// Birch and Swinnerton-Dyer formula, `L'(E,1) = weight * Sha * R`, and
/// `L'` is the same for isogenous curves, so within a rank-one isogeny
/// class the member of the largest weight is expected to have the
/// generator of the smallest height (if their Sha have the same order).
/// Only an order for the searches, never a claim; `None` if a quantity
/// could not be computed.
fn bsd_weight(curve: &Curve, primes: &[Natural]) -> Option<f64> {
    let omega = crate::heights::real::PeriodLattice::compute(curve, 64).ok()?.real_period_f64();
    let c = crate::local::tamagawa_product(curve, primes).ok()?;
    let t = TorsionGroup::compute(curve, primes).order() as f64;
    let w = omega * f64::try_from(&c).ok()? / (t * t);
    (w.is_finite() && w > 0.0).then_some(w)
}

/// The full 2-descent for a curve of small `|c4|`: first on the curve
/// itself with [`OWN_COVERINGS_FIRST`] of the ladders' CPU cap. While its
/// points stay short of the goal ([`descent_short_of_goal`]), the members
/// of its odd-degree isogeny class in the order of their expected
/// generator heights ([`bsd_weight`]): the first gets the whole cap (the
/// curve itself searched again, or another member), each later one
/// [`OWN_COVERINGS_FIRST`] of it; points found on another member are
/// carried back along the isogenies.
///
/// Why: an isogeny `φ: E → E'` of odd prime degree `l` gives
/// `ĥ(φ(P)) = l ĥ(P)` (the canonical height under isogenies; Silverman,
/// *The Arithmetic of Elliptic Curves*, chapter VIII, exercises; from
/// memory). For generators `P` of `E` and `Q` of `E'` of rank one,
/// `φ(P) = k Q` and `φ'(Q) = j P` with `jk = l` (as `φ'φ = [l]`), so one of
/// the two generators has `l` times the height of the other, and a search
/// reaches the smaller one with about the `l`-th root of the covering
/// height the larger one needs. For y^2 = x^3 + k the 3-isogenous curve is
/// y^2 = x^3 - 27k. `Sel^2` of the members are isomorphic (the isogeny is
/// odd), so their Selmer bounds must agree: a disagreement is an internal
/// error.
#[allow(clippy::too_many_arguments)]
fn own_then_class(
    minimal: &Curve,
    torsion: &TorsionGroup,
    primes: &[Natural],
    options: &RankOptions,
    work: &Work,
    enough: Option<usize>,
    floor: Option<usize>,
    report: &mut RankReport,
) -> Result<FullDescent, Error> {
    use malachite::base::num::arithmetic::traits::UnsignedAbs;
    let with_share = |f: f64| RankOptions { search_time_limit: options.search_time_limit.mul_f64(f), ..options.clone() };
    let own = full_two_descent(minimal, torsion, primes, &with_share(OWN_COVERINGS_FIRST), work, enough, floor)?;
    // the ladder reached its ceiling: a larger share would search no higher
    let ceiling_reached = own.searched_height >= options.search_height_ceiling;
    if !descent_short_of_goal(&own, enough, floor) || work.exhausted() || own.selmer_dim.is_none() {
        return Ok(own);
    }
    work.report(Stage::IsogenyClass, "odd-degree isogeny class");
    let class = match crate::isogeny::odd_isogeny_class_within(minimal, primes, work) {
        Ok(c) => c,
        Err(e) if *e.kind() == crate::ErrorKind::Budget => return Ok(own),
        Err(e) => return Err(e),
    };
    let weights: Vec<Option<f64>> = if class.curves.len() > 1 { class.curves.iter().map(|c| bsd_weight(c, primes)).collect() } else { vec![None] };
    let mut order: Vec<usize> = (0..class.curves.len()).collect();
    // the largest weight first; members without one last, by |c4|
    order.sort_by(|&a, &b| match (weights[a], weights[b]) {
        (Some(x), Some(y)) => y.partial_cmp(&x).unwrap_or(std::cmp::Ordering::Equal),
        (Some(_), None) => std::cmp::Ordering::Less,
        (None, Some(_)) => std::cmp::Ordering::Greater,
        (None, None) => class.curves[a].c4().unsigned_abs().cmp(&class.curves[b].c4().unsigned_abs()),
    });
    let mut best = own;
    for (turn, &m) in order.iter().enumerate() {
        if work.exhausted() || !descent_short_of_goal(&best, enough, floor) {
            break;
        }
        let share = if turn == 0 { 1.0 } else { OWN_COVERINGS_FIRST };
        if m == 0 {
            // the curve itself: searched again only with the whole cap
            if turn == 0 && !ceiling_reached {
                let f = full_two_descent(minimal, torsion, primes, options, work, enough, floor)?;
                if f.lower > best.lower {
                    best = f;
                    report.descent_curve = None;
                }
            }
            continue;
        }
        let other = &class.curves[m];
        let other_torsion = TorsionGroup::compute(other, primes);
        let mut f = full_two_descent(other, &other_torsion, primes, &with_share(share), work, enough, floor)?;
        if let (Some(a), Some(b)) = (best.selmer_dim, f.selmer_dim) {
            if a != b {
                return Err(Error::internal(
                    "the quartic descent",
                    &format!("dim Sel^2 = {a} on the curve but {b} on the isogenous curve {other} (odd degree: they must agree)"),
                ));
            }
        }
        carry_back(&class, m, minimal, &mut f);
        if f.lower > best.lower {
            best = f;
            report.descent_curve = Some((other.clone(), class.degree(0, m).unwrap_or(0)));
        }
    }
    Ok(best)
}

/// Keeps the tightest bounds of the routes that ran, checks that they do not
/// contradict each other, and takes points and Sha suspects from the routes
/// that gave the bounds.
fn combine(
    report: &mut RankReport,
    data: &CurveData,
    runs: &[IsogenyDescent],
    full: Option<&FullDescent>,
) -> Result<(), Error> {
    let to_input = |p: &Point| data.to_input(p);
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
        report.two_selmer_dim = f.selmer_dim;
        if !f.search_complete {
            report.budget_exhausted = true;
        }
    }
    // the routes must never contradict each other
    let lows: Vec<usize> = runs.iter().map(|r| r.lower).chain(full.map(|f| f.lower)).collect();
    let ups: Vec<usize> = runs.iter().filter_map(|r| r.upper).chain(full.and_then(|f| f.upper)).collect();
    if let (Some(&l), Some(&u)) = (lows.iter().max(), ups.iter().min()) {
        if l > u {
            return Err(Error::internal("the report", "the descent routes contradict each other"));
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
        report.isogeny_selmer_dims = Some((best.side_e.selmer_dim, best.side_e_prime.selmer_dim));
    }
    if let Some(u) = report.rank_upper.filter(|&u| Some(u) != report.rank_lower) {
        if let Some(f) = full.filter(|f| f.upper == Some(u)) {
            let origin = match &report.descent_curve {
                None => "quartic 2-covering of E (an element of Sel^2(E))".to_string(),
                Some((c, d)) => format!(
                    "quartic 2-covering of the {d}-isogenous curve {} (an element of its Sel^2, isomorphic to Sel^2(E) since {d} is odd)",
                    c
                ),
            };
            for q in &f.unexplained {
                report.sha_suspects.push(ShaSuspect {
                    origin: origin.clone(),
                    quartic: q.coeffs(),
                    class: None,
                    searched_height: f.searched_height,
                    in_sha: false,
                });
            }
        } else if let Some(best) = runs.iter().find(|r| r.upper == Some(u)) {
            for (side, name) in [(&best.side_e, "E"), (&best.side_e_prime, "E'")] {
                for d in &side.unexplained {
                    report.sha_suspects.push(ShaSuspect {
                        origin: format!("2-isogeny with kernel {}, covering of {name}", best.kernel_point),
                        quartic: covering_quartic(d, &side.a, &side.b),
                        class: Some(d.clone()),
                        searched_height: best.searched_height,
                        in_sha: false,
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

/// Once the rank `r` is proven, each 2-isogeny `φ: E → E'` (dual `ψ`)
/// determines `Sha(E)[φ]` and `Sha(E')[ψ]` when the images of the two
/// descent maps are known: `2^r = #α(E(Q)) #α'(E'(Q)) / 4` (Silverman and
/// Tate, *Rational Points on Elliptic Curves*, III.6), so the images found
/// (torsion and points) are the whole images exactly when their dimensions
/// add up to `r + 2`. Then `dim Sha(E)[φ] = dim S^φ(E) - dim α'(E'(Q))`
/// (the Selmer group of the side `E'`, which holds `E'(Q)/φ(E(Q))`) and
/// `dim Sha(E')[ψ] = dim S^ψ(E') - dim α(E(Q))` (Silverman, *The Arithmetic
/// of Elliptic Curves*, X.4.2, the exact sequence
/// `0 → E'(Q)/φ(E(Q)) → S^φ(E) → Sha(E)[φ] → 0`). As `Sha(E)[φ]` lies in
/// `Sha(E)[2]`, its dimension is at most `dim Sha(E)[2]` when that is known
/// (else an internal inconsistency).
fn settle_isogeny_sha(report: &mut RankReport) -> Result<(), Error> {
    let Some(r) = report.rank() else { return Ok(()) };
    let mut dims = Vec::new();
    for run in &report.isogeny_runs {
        // a run cut short before its Selmer groups were complete says
        // nothing about Sha[phi] (its Selmer dimensions are partial)
        if run.upper.is_none() {
            return Ok(());
        }
        let (e, f) = (&run.side_e, &run.side_e_prime);
        if e.found_dim > e.selmer_dim || f.found_dim > f.selmer_dim || e.found_dim + f.found_dim > r + 2 {
            return Err(Error::internal(
                "the isogeny Sha",
                format!(
                    "the images found (dimensions {} and {}) exceed the Selmer groups ({} and {}) or the proven rank {r}",
                    e.found_dim, f.found_dim, e.selmer_dim, f.selmer_dim
                ),
            ));
        }
        if e.found_dim + f.found_dim < r + 2 {
            return Ok(());
        }
        let here = f.selmer_dim - f.found_dim;
        let there = e.selmer_dim - e.found_dim;
        if report.sha2_dim.is_some_and(|d| here > d) {
            return Err(Error::internal(
                "the isogeny Sha",
                format!("dim Sha(E)[phi] = {here} exceeds dim Sha(E)[2] = {}", report.sha2_dim.unwrap_or(0)),
            ));
        }
        dims.push((here, there));
    }
    if let Some(ev) = report.evidence.as_mut() {
        for (run, (here, there)) in report.isogeny_runs.iter().zip(&dims) {
            ev.statements.push(Statement {
                claim: format!(
                    "for the 2-isogeny with kernel {}: dim Sha(E)[phi] = {here} and dim Sha(E')[phi'] = {there} (Selmer groups modulo the images of E'(Q) and E(Q), which the proven rank fixes)",
                    run.kernel_point
                ),
                standing: Standing::Proven,
            });
        }
    }
    report.isogeny_sha_dims = dims;
    Ok(())
}

/// Curves without rational 2-torsion whose `|c4|` reaches this run the
/// cubic algebra route before the quartic enumeration. The enumeration
/// costs about `|c4|^{3/2}` candidates: measured with the example `rank`
/// (wall time at load 6) on curves-wider.tsv rows, 0.27 s at `|c4|` =
/// 1.2e5, 0.8 s at 2e5, 3-4 s at 6e5 to 9e5, 8.7 s at 1.5e6; `Sel^2(E)`
/// over the cubic field takes 50-600 ms at these sizes, about constant.
/// Below the threshold the enumeration alone is cheaper.
const CUBIC_FIRST_C4: u64 = 100_000;

/// Whether the cubic algebra route runs before the quartic enumeration
/// (the curve must have no rational 2-torsion): when `|c4|` reaches
/// [`CUBIC_FIRST_C4`].
fn cubic_algebra_first(minimal: &Curve) -> bool {
    use malachite::base::num::arithmetic::traits::UnsignedAbs;
    minimal.c4().unsigned_abs() >= Natural::from(CUBIC_FIRST_C4)
}

/// The options and the search goal of the quartic route once the algebra
/// route may have run. The enumeration is skipped (a candidate limit of 0
/// refuses it at once; the short search on the curve still runs) where an
/// unconditional `Sel^2(E)` is known and the enumeration is the expensive
/// route (`first`: the algebra ran first by cost, see
/// [`cubic_algebra_first`]), or where the bound is 0 and the analytic
/// route has proven rank 0. The certificate records the algebra route
/// (`certificate::AlgebraRecord`), so the bound stands without the
/// enumeration; points come from the search on the curve and the
/// 2-coverings of the Selmer elements. Any unconditional bound becomes the
/// goal of the point searches. The goal only tells the searches when to
/// stop, it is never a claim. With `cross_check_routes` the enumeration is
/// never skipped.
fn plan_enumeration(options: &RankOptions, enough: Option<usize>, algebra: Option<&AlgebraDescent>, first: bool) -> (RankOptions, Option<usize>) {
    let Some(a) = algebra.filter(|a| !a.conditional_on_grh) else { return (options.clone(), enough) };
    let mut o = options.clone();
    if (first || (a.upper == 0 && enough == Some(0))) && !options.cross_check_routes {
        o.max_quartic_candidates = 0;
    }
    (o, Some(enough.map_or(a.upper, |e| e.min(a.upper))))
}

/// A finished algebra route, kept so that a second run of the descents
/// (the Heegner-first plan) does not repeat it.
type AlgebraOnce = Option<(AlgebraDescent, CoveringContext)>;

/// The descent over the algebra `Q[X]/(f)` (see [`crate::descent::algebra`]),
/// or the one kept in `once` from an earlier run; a failure is settled by
/// [`stage_failure`].
#[allow(clippy::too_many_arguments)]
fn algebra_route(
    minimal: &Curve,
    torsion: &TorsionGroup,
    primes: &[Natural],
    work: &Work,
    report: &mut RankReport,
    unfinished: &mut Vec<Statement>,
    once: &mut AlgebraOnce,
) -> Result<(Option<AlgebraDescent>, Option<CoveringContext>), Error> {
    if let Some((a, c)) = once {
        return Ok((Some(a.clone()), Some(c.clone())));
    }
    work.report(Stage::Solubility, "Sel^2(E) over the algebra Q[X]/(f)");
    match two_selmer_with_context(minimal, torsion, primes, work) {
        Ok(Some((a, c))) => {
            *once = Some((a.clone(), c.clone()));
            Ok((Some(a), Some(c)))
        }
        Ok(None) => Ok((None, None)),
        Err(e) => {
            stage_failure("the algebra descent", e, report, unfinished)?;
            Ok((None, None))
        }
    }
}

/// The first height the 2-coverings of the algebra route are searched to;
/// the ladder then doubles it towards `search_height_ceiling` within the
/// budget (see [`crate::budget::Ladder`]).
const COVERING_FLOOR: u64 = 128;

/// Points from the 2-coverings of the algebra route's Selmer elements (see
/// `descent::algebra::covering`; every shape of the algebra), when the
/// lower bound is below the route's bound (or the proven analytic rank, if
/// smaller): the classes of the torsion points and of the points already
/// found (the isogeny descents' and the quartic route's) are taken out,
/// the other elements' coverings are searched within half of the time
/// left, at heights doubled from [`COVERING_FLOOR`] while the ladder's
/// prediction of the next rung fits, and every point found is checked on the curve and in its class.
/// `E(Q)/2E(Q)` injects into `Sel^2(E)` and the torsion points' classes
/// span `dim E(Q)[2]` dimensions, so points whose classes are independent
/// modulo those of the torsion are independent modulo torsion.
#[allow(clippy::too_many_arguments)]
fn covering_points(
    report: &mut RankReport,
    data: &CurveData,
    runs: &[IsogenyDescent],
    full: Option<&FullDescent>,
    a: &AlgebraDescent,
    ctx: &CoveringContext,
    enough: Option<usize>,
    options: &RankOptions,
    work: &Work,
    unfinished: &mut Vec<Statement>,
) -> Result<(), Error> {
    let goal = enough.map_or(a.upper, |e| e.min(a.upper));
    let lower = report.rank_lower.unwrap_or(0);
    if lower >= goal || work.exhausted() {
        return Ok(());
    }
    work.report(Stage::Solubility, "points on the 2-coverings of Sel^2(E)");
    let mut span = crate::descent::f2::F2Span::new();
    for m in torsion_masks(ctx)? {
        span.insert(m);
    }
    let torsion_dim = span.dim();
    let mut chosen: Vec<Point> = Vec::new();
    let known = runs.iter().flat_map(|r| r.points.iter()).chain(full.map(|f| f.points.as_slice()).unwrap_or(&[]));
    for p in known {
        let Point::Affine(x, _) = p else { continue };
        match class_mask(ctx, x)? {
            Some(m) => {
                if span.insert(m) {
                    chosen.push(p.clone());
                }
            }
            None => return Err(Error::internal("the 2-coverings", "a point's class is not in Sel^2(E)")),
        }
    }
    let share = work.share(0.5);
    let known: Vec<u64> = span.basis().to_vec();
    let ceiling = options.search_height_ceiling.max(COVERING_FLOOR);
    let ladder = crate::budget::Ladder::new(COVERING_FLOOR, ceiling, crate::budget::QUARTIC_GROWTH, work, options.search_time_limit);
    let found = match search_coverings(data.minimal(), ctx, &known, goal, crate::budget::Rungs::Ladder(ladder), &share) {
        Ok(r) => r,
        Err(e) => {
            stage_failure("the 2-covering search", e, report, unfinished)?;
            return Ok(());
        }
    };
    for r in found {
        if let Some(p) = r.point {
            if span.insert(r.mask) {
                chosen.push(p);
            }
        }
    }
    debug_assert_eq!(chosen.len(), span.dim() - torsion_dim);
    if chosen.len() > lower {
        report.rank_lower = Some(chosen.len());
        report.points = chosen.iter().map(|p| data.to_input(p)).collect();
        report.independence = "their images in Sel^2(E), in (Q[X]/f(X))*/squares, are independent modulo the images of the torsion points (points found on the 2-coverings of the Selmer elements)".to_string();
    }
    Ok(())
}

/// What the failure `e` of a stage that the report can do without leaves
/// behind: an internal inconsistency is returned as the error of the
/// analysis; a budget that ran out marks the report as cut short; any other
/// failure (a shape or size the stage does not handle) becomes an
/// unfinished statement naming the stage. The other routes stand.
fn stage_failure(stage: &str, e: Error, report: &mut RankReport, unfinished: &mut Vec<Statement>) -> Result<(), Error> {
    match e.kind() {
        crate::ErrorKind::Internal => Err(e.in_stage(stage)),
        crate::ErrorKind::Budget => {
            report.budget_exhausted = true;
            Ok(())
        }
        _ => {
            unfinished.push(Statement { claim: format!("{stage} did not finish: {e}"), standing: Standing::Unfinished });
            Ok(())
        }
    }
}

/// Joins the algebra route's `Sel^2(E)` to the report: its bound
/// `dim Sel^2(E) - dim E(Q)[2]` is kept when tighter; it must equal the
/// quartic enumeration's `Sel^2` where that finished, lie at or above the
/// lower bound, and at or below every 2-isogeny bound `s + s' - 2` (the exact
/// sequence `Sha(E)[phi] -> Sha(E)[2] -> Sha(E')[phi']`, Silverman AEC X.4).
fn combine_algebra(report: &mut RankReport, runs: &[IsogenyDescent], full: Option<&FullDescent>, a: &AlgebraDescent) -> Result<(), Error> {
    if let Some(q) = full.and_then(|f| f.selmer_dim) {
        if q != a.selmer_dim {
            return Err(Error::internal(
                "the report",
                format!("dim Sel^2(E) is {q} by the quartic enumeration and {} over the algebra Q[X]/(f)", a.selmer_dim),
            ));
        }
    }
    for r in runs {
        if let Some(u) = r.upper {
            if a.upper > u {
                return Err(Error::internal(
                    "the report",
                    format!("the Sel^2(E) bound {} exceeds the 2-isogeny bound {u}", a.upper),
                ));
            }
        }
    }
    if report.rank_lower.is_some_and(|l| l > a.upper) {
        return Err(Error::internal("the report", "the descent routes contradict each other"));
    }
    if a.conditional_on_grh {
        // K(S,2) rests on GRH: a conditional bound, never a proven one
        // (stated in the evidence by `note_conditional_bound`)
        return Ok(());
    }
    report.two_selmer_dim = Some(a.selmer_dim);
    if report.rank_upper.is_none_or(|u| a.upper < u) {
        report.rank_upper = Some(a.upper);
        // the isogeny route's unexplained coverings no longer bound the rank
        if report.rank_lower == Some(a.upper) {
            report.sha_suspects.clear();
        }
    }
    Ok(())
}

/// The algebra route's bound when its `K(S,2)` rests on GRH (Bach's
/// bound): a conditional statement in the evidence, never a proven bound.
fn note_conditional_bound(report: &mut RankReport) {
    let Some(a) = report.algebra_descent.as_ref().filter(|a| a.conditional_on_grh) else { return };
    let claim = format!(
        "rank <= {} (dim Sel^2(E) = {} by the descent over Q[X]/(f), with K(S,2) from a factor base up to Bach's bound)",
        a.upper, a.selmer_dim
    );
    if let Some(ev) = report.evidence.as_mut() {
        ev.statements.push(Statement { claim, standing: Standing::Conditional("the generalised Riemann hypothesis".into()) });
    }
}

/// Once the rank is proven and dim Sel^2(E) known, Sha(E)\[2\] is determined:
/// `dim Sha[2] = dim Sel^2(E) - rank - dim E(Q)[2]` (the exact sequence
/// `0 -> E(Q)/2E(Q) -> Sel^2(E) -> Sha[2] -> 0`). With Sha finite its order
/// is a square (the Cassels-Tate pairing is alternating: Cassels 1962), so
/// an odd dimension is an internal inconsistency; Sha is finite when the
/// rank is proven by the analytic route (Kolyvagin), and `dim Sha[2] = 0`
/// when the descent bounds meet. For rank 0 every covering left unexplained
/// is then a proven non-trivial element of Sha.
fn settle_sha2(report: &mut RankReport) -> Result<(), Error> {
    let (Some(r), Some(s)) = (report.rank(), report.two_selmer_dim) else { return Ok(()) };
    let t = report.torsion.iter().filter(|n| *n % 2 == 0).count();
    let Some(d) = s.checked_sub(r + t) else {
        return Err(Error::internal("the rank decision", format!("the proven rank {r} exceeds dim Sel^2(E) - dim E(Q)[2] = {}", s as i64 - t as i64)));
    };
    if d % 2 == 1 {
        return Err(Error::internal(
            "the rank decision",
            format!("dim Sha[2] = {d} is odd, which the Cassels-Tate pairing forbids for finite Sha"),
        ));
    }
    report.sha2_dim = Some(d);
    // the order of Sha[2] divides #Sha, whose value the Birch and
    // Swinnerton-Dyer formula predicts: a clash is a statement, not an error
    if let Some(ev) = report.evidence.as_mut() {
        if let Some(est) = ev.sha_bsd_estimate.filter(|v| v.is_finite() && *v >= 0.5) {
            let nearest = est.round() as u64;
            let order = 1u64 << d.min(62);
            ev.statements.push(Statement {
                claim: if nearest % order == 0 {
                    format!("#Sha[2] = {order} divides the analytic order of Sha, {nearest}")
                } else {
                    format!("#Sha[2] = {order} does NOT divide the analytic order of Sha, {nearest}: the formula's prediction and the descent clash")
                },
                standing: Standing::Conditional("the Birch and Swinnerton-Dyer conjecture (its exact formula)".into()),
            });
        }
        ev.statements.push(Statement {
            claim: format!("#Sha(E)[2] = {} (dim Sel^2(E) - rank - dim E(Q)[2] = {d})", 1u64 << d.min(62)),
            standing: Standing::Proven,
        });
    }
    // the unexplained quartic classes span Sel^2 modulo the image of E(Q):
    // with the rank proven they are exactly the non-trivial part of Sha[2]
    if d == 0 && !report.sha_suspects.is_empty() {
        // Sha[2] is trivial: the coverings left unexplained have rational
        // points that the search did not reach; they are not suspects
        let left: Vec<String> = report.sha_suspects.iter().map(|s| crate::quartic::Quartic::new(s.quartic.clone()).to_string()).collect();
        let height = report.sha_suspects.iter().map(|s| s.searched_height).max().unwrap_or(0);
        report.sha_suspects.clear();
        if let Some(ev) = report.evidence.as_mut() {
            ev.statements.push(Statement {
                claim: format!(
                    "Sha[2] is trivial, so the coverings y^2 = {} have rational points, beyond the height {height} searched",
                    left.join(" and y^2 = ")
                ),
                standing: Standing::Proven,
            });
        }
    }
    let from_quartics = report.sha_suspects.iter().filter(|s| s.class.is_none()).count();
    if d > 0 && from_quartics == d {
        for s in report.sha_suspects.iter_mut().filter(|s| s.class.is_none()) {
            s.in_sha = true;
        }
    }
    Ok(())
}

/// The analytic route (when switched on and the conductor is within its
/// limit): the proven root number and leading value, within half of the
/// time left (the descents need the rest). An internal inconsistency is an
/// error; any other failure (its share of the budget spent, a size it does
/// not handle) leaves the route out and is returned as the second value,
/// for an unfinished statement in the evidence.
#[allow(clippy::type_complexity)]
fn analytic_route(data: &CurveData, options: &RankOptions, work: &Work) -> Result<(Option<crate::report::AnalyticProof>, Option<Error>), Error> {
    if !options.analytic_route || *data.conductor() > options.analytic_max_conductor || work.exhausted() {
        return Ok((None, None));
    }
    work.report(Stage::Analytic, "proving the root number and the leading L-value");
    match crate::lproof::prove_analytic_rank_of(data, &work.share(0.5)) {
        Ok(proof) => Ok((
            Some(crate::report::AnalyticProof {
                root_number: proof.root_number.sign,
                value: proof.value,
                rank: proof.rank.map(usize::from),
            }),
            None,
        )),
        Err(e) if *e.kind() == crate::ErrorKind::Internal => Err(e.in_stage("the analytic route")),
        Err(e) => Ok((None, Some(e))),
    }
}

/// The rank decision: the descent bounds and the analytic rank, when both
/// are known, must agree (an internal inconsistency otherwise, never
/// resolved silently); a proven analytic rank fixes the rank.
fn decide_rank(report: &mut RankReport) -> Result<(), Error> {
    let Some(r) = report.analytic.as_ref().and_then(|a| a.rank) else { return Ok(()) };
    let (lo, up) = report.descent_bounds;
    if lo.is_some_and(|l| l > r) || up.is_some_and(|u| u < r) {
        return Err(Error::internal(
            "the rank decision",
            format!(
                "the descent bounds [{}, {}] exclude the analytic rank {r} proven by an L-value enclosure",
                lo.map_or("?".into(), |v| v.to_string()),
                up.map_or("?".into(), |v| v.to_string())
            ),
        ));
    }
    report.rank_lower = Some(r);
    report.rank_upper = Some(r);
    report.rank_proven_by.push(crate::report::ProofRoute::Analytic);
    Ok(())
}

/// The f64 values of the evidence and the proven enclosure of the analytic
/// route must agree: the f64 leading value (with its error bound) meets the
/// enclosure, and the root numbers are equal. Two routes that disagree are
/// an internal inconsistency.
fn cross_check_analytic(report: &RankReport) -> Result<(), Error> {
    let (Some(a), Some(ev)) = (report.analytic.as_ref(), report.evidence.as_ref()) else { return Ok(()) };
    if let (Some(w1), Some(w2)) = (a.root_number, ev.root_number) {
        if w1 != w2 {
            return Err(Error::internal("the root number", format!("the proven functional-equation test gives {w1}, the local formulas {w2}")));
        }
    }
    if let (Some(v), Some(order), Some(lead)) = (a.value.as_ref(), ev.vanishing_order, ev.leading_value) {
        if order == usize::from(v.order) {
            // the f64 path's own error bound is far below 1e-6 at these sizes
            let slack = 1e-6 * (1.0 + lead.abs());
            if lead < v.low - slack || lead > v.high + slack {
                return Err(Error::internal(
                    "the L-value",
                    format!("the f64 value {lead} lies outside the proven enclosure [{}, {}]", v.low, v.high),
                ));
            }
        }
    }
    Ok(())
}

/// The root number from the parity of an unconditional `Sel^2(E)`
/// (Monsky 1996; see [`crate::rootno::root_number_by_selmer_parity`]),
/// after the descents. It must agree with the root numbers of the analytic
/// route and of the evidence (local formulas, functional equation, twist):
/// a clash is an internal inconsistency. Where the evidence has no root
/// number (a wild curve at 2 or 3 beyond the numerical test's reach) it
/// becomes the report's, with a proven statement naming the route.
fn root_number_by_parity(report: &mut RankReport, data: &CurveData) -> Result<(), Error> {
    let Some(s) = report.two_selmer_dim else { return Ok(()) };
    let t = report.torsion.iter().filter(|n| *n % 2 == 0).count();
    let rn = crate::rootno::root_number_by_selmer_parity(data, s, t).map_err(|e| match e.kind() {
        crate::ErrorKind::Internal => e.in_stage("the root number by 2-Selmer parity"),
        _ => Error::internal("the root number by 2-Selmer parity", e.to_string()),
    })?;
    let w = rn.global;
    let clash = |other: i8, route: &str| {
        Error::internal(
            "the root number",
            format!("{route} gives w = {other}, but dim Sel^2(E) - dim E(Q)[2] = {} gives w = {w} (Monsky 1996)", s - t),
        )
    };
    if let Some(w1) = report.analytic.as_ref().and_then(|a| a.root_number).filter(|w1| *w1 != w) {
        return Err(clash(w1, "the functional-equation test of the analytic route"));
    }
    let Some(ev) = report.evidence.as_mut() else { return Ok(()) };
    match ev.root_number {
        Some(w2) if w2 != w => return Err(clash(w2, "the root-number stage of the evidence")),
        // the evidence already states the agreement with Monsky's theorem
        Some(_) => {}
        None => {
            ev.root_number = Some(w);
            let locals = match (rn.local.iter().find(|(p, _)| deduced_at(&rn, p)), rn.joint.is_empty()) {
                (Some((p, wp)), _) => format!("; so the local root number at {p}, which no local formula here covers, is {wp}"),
                (None, false) => "; the local root numbers at 2 and 3 are known only through their product".to_string(),
                (None, true) => String::new(),
            };
            ev.statements.push(Statement {
                claim: format!(
                    "the root number is {w} (by 2-Selmer parity, Monsky 1996: w = (-1)^(dim Sel^2(E) - dim E(Q)[2]) = (-1)^{}, \
                     as the finite part of Sha[2^oo] has square order by the Cassels-Tate pairing, Poonen-Stoll 1999; \
                     modularity: Wiles 1995, Breuil-Conrad-Diamond-Taylor 2001{locals})",
                    s - t
                ),
                standing: Standing::Proven,
            });
        }
    }
    Ok(())
}

/// Whether the local root number at `p` in `rn` was deduced from the global one.
fn deduced_at(rn: &crate::rootno::RootNumber, p: &Natural) -> bool {
    matches!(&rn.method, crate::rootno::RootNumberMethod::SelmerParity { deduced } if deduced.contains(p))
}

/// Analytic rank one proven but no point found by the descent's search: the
/// Heegner point method computes a generator (Gross-Zagier 1986). The point
/// is verified exactly on the minimal and on the input model and must lie
/// outside the torsion subgroup; it then also proves the descent's lower
/// bound 1. A failure or a cut-short search leaves the report as it was.
fn heegner_point(report: &mut RankReport, data: &CurveData, options: &RankOptions, work: &Work) -> Result<(), Error> {
    match heegner_search(report, data, options, work)? {
        Some(found) => adopt_heegner_point(report, data, &found),
        None => Ok(()),
    }
}

/// `|c4|^{3/2}` of the minimal model beyond which the quartic enumeration
/// of the full 2-descent is expected to take seconds (its search box, and
/// so its cost, grows like `|c4|^{3/2}`). Calibrated by hand on the rank-one
/// rows of conductors 7155 and 7182 of curves-wider.tsv (load average 8):
/// `|c4|^{3/2}` = 1.6e9 and 3.6e9 took 15 s each before the Heegner step
/// could run, 2e8-2.4e8 took 1.6-2.9 s; the Heegner step there costs
/// about 0.2 s.
const COSTLY_QUARTIC_C4_POW: f64 = 5e8;

/// Whether the quartic enumeration is expected to be slow on this curve
/// (see [`COSTLY_QUARTIC_C4_POW`]).
fn quartic_enumeration_is_costly(data: &CurveData) -> bool {
    use malachite::base::num::arithmetic::traits::UnsignedAbs;
    use malachite::base::num::conversion::traits::RoundingFrom;
    use malachite::base::rounding_modes::RoundingMode;
    let c4 = f64::rounding_from(&data.minimal().c4().unsigned_abs(), RoundingMode::Nearest).0;
    c4.powf(1.5) > COSTLY_QUARTIC_C4_POW
}

/// The Heegner route's generator, when the analytic rank is proven 1 and
/// no point is known yet (`None` otherwise, or when the route found none;
/// a route stopped by its share of the budget marks the report cut short).
fn heegner_search(report: &mut RankReport, data: &CurveData, options: &RankOptions, work: &Work) -> Result<Option<crate::heegner::HeegnerResult>, Error> {
    let proven_one = report.analytic.as_ref().and_then(|a| a.rank) == Some(1);
    if !options.heegner_route || !proven_one || !report.points.is_empty() || work.exhausted() {
        return Ok(None);
    }
    work.report(Stage::Heegner, "a generator by the Heegner point method");
    // three quarters of the time left: with the analytic rank proven 1 and
    // no point from the floor-height search, the Heegner step is the likely
    // route to the point (the ladder after it keeps the last quarter)
    // the step's own cap counts the CPU time of this thread (so that the
    // machine's load does not decide whether a curve gets its point); the
    // curve's budget still binds in wall time
    let share = work.share(0.75);
    let opts = crate::heegner::HeegnerOptions {
        time_limit: share.remaining(),
        cpu_time_limit: Some(options.heegner_time_limit),
        cancel: work.cancel_flag().cloned(),
        ..crate::heegner::HeegnerOptions::default()
    };
    match crate::heegner::point_of_rank_one_of(data, &opts) {
        Ok(Some(found)) => Ok(Some(found)),
        Err(e) if *e.kind() == crate::error::ErrorKind::Internal => Err(e),
        // a route stopped by its share of the budget leaves the report
        // marked as cut short, so that a rerun may differ only there
        // (a refusal such as a conductor above the route's range is no
        // budget matter: a rerun gives the same answer)
        other => {
            let stopped = matches!(&other, Err(e) if matches!(e.kind(), crate::error::ErrorKind::Budget | crate::error::ErrorKind::FactorBudget));
            if stopped || work.exhausted() {
                report.budget_exhausted = true;
            }
            Ok(None)
        }
    }
}

/// The heights to which [`three_descent_point`] searches the plane cubics
/// of the second 3-descent, in turn while no point is found.
const THREE_DESCENT_HEIGHTS: [u64; 3] = [256, 4096, 65536];

/// For `y^2 = x^3 + k` (the minimal model) still without a point while the
/// descents allow one: the first descent by 3-isogeny
/// (`descent::cube_isogeny`) and the second descent of each Selmer covering
/// over its cubic field (`descent::cubic_second`), whose plane cubics are
/// searched at the heights [`THREE_DESCENT_HEIGHTS`] within half of the
/// time left; a point found joins the report like the Heegner route's.
/// A route stopped by its budget marks the report cut short; any other
/// failure except an inconsistency leaves the report as it was.
fn three_descent_point(report: &mut RankReport, data: &CurveData, work: &Work) -> Result<(), Error> {
    let c = data.minimal().coefficients();
    let short = c[0] == 0 && c[1] == 0 && c[2] == 0 && c[3] == 0;
    let upper_allows = report.descent_bounds.1.is_none_or(|u| u >= 1);
    let rank_zero = report.rank() == Some(0) || report.analytic.as_ref().and_then(|a| a.rank) == Some(0);
    if !short || !report.points.is_empty() || !upper_allows || rank_zero || work.exhausted() {
        return Ok(());
    }
    work.report(Stage::Search, "points by a second descent through the 3-isogeny");
    let share = work.share(0.5);
    let outcome = (|| -> Result<Option<(Point, u64)>, Error> {
        let cd = crate::descent::cube_isogeny::cube_isogeny_descent(&c[4], &share)?;
        let (pts, _) = crate::descent::cubic_second::points_by_second_descent(&cd, &THREE_DESCENT_HEIGHTS, &share)?;
        let h = THREE_DESCENT_HEIGHTS[THREE_DESCENT_HEIGHTS.len() - 1];
        Ok(pts.into_iter().min_by_key(|p| p.x().map(|x| x.denominator_ref().clone())).map(|p| (p, h)))
    })();
    match outcome {
        Ok(Some((p, h))) => adopt_point(
            report,
            data,
            &p,
            "the 3-isogeny descent",
            &format!("a point of infinite order (not in the torsion subgroup), found on a plane-cubic covering from a second descent through the 3-isogeny (search heights up to {h}) and verified exactly"),
        ),
        Ok(None) => Ok(()),
        Err(e) if *e.kind() == crate::error::ErrorKind::Internal => Err(e),
        Err(e) => {
            if matches!(e.kind(), crate::error::ErrorKind::Budget | crate::error::ErrorKind::FactorBudget) || work.exhausted() {
                report.budget_exhausted = true;
            }
            Ok(())
        }
    }
}

/// Enters a point of infinite order on the minimal model into the report
/// (checked on both models, against the torsion and the descents' upper
/// bound), with the independence statement `text`.
fn adopt_point(report: &mut RankReport, data: &CurveData, g: &Point, route: &str, text: &str) -> Result<(), Error> {
    if !report.points.is_empty() {
        return Ok(());
    }
    if !data.minimal().contains(g) {
        return Err(Error::internal(route, "the point is not on the minimal model"));
    }
    let on_input = data.to_input(g);
    if !data.input().contains(&on_input) {
        return Err(Error::internal(route, "the point is not on the input model"));
    }
    if g.is_infinity() || report.torsion_points.contains(&on_input) {
        return Err(Error::internal(route, "the point is a torsion point"));
    }
    report.points = vec![on_input];
    report.independence = text.to_string();
    let (lo, up) = report.descent_bounds;
    if up.is_some_and(|u| u < 1) {
        return Err(Error::internal(route, "a point of infinite order against a descent upper bound 0"));
    }
    report.descent_bounds = (Some(lo.unwrap_or(0).max(1)), up);
    if report.descent_bounds.0 == up && !report.rank_proven_by.contains(&crate::report::ProofRoute::Descent) {
        report.rank_proven_by.insert(0, crate::report::ProofRoute::Descent);
    }
    Ok(())
}

/// Enters the Heegner route's generator into the report, checked on both
/// models and against the descents' upper bound, unless the descents have
/// already found a point.
fn adopt_heegner_point(report: &mut RankReport, data: &CurveData, found: &crate::heegner::HeegnerResult) -> Result<(), Error> {
    let on = match &found.isogenous_curve {
        Some((c, d)) => format!(" on the {d}-isogenous curve {c}, carried back along the isogeny,"),
        None => String::new(),
    };
    let text = format!(
        "a point of infinite order (not in the torsion subgroup), found by the Heegner point method \
         (discriminant {}, {} bits){on} and verified exactly",
        found.discriminant, found.precision
    );
    adopt_point(report, data, &found.generator, "the Heegner route", &text)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::error::ErrorKind;

    /// A report of y^2 + y = x^3 - x (conductor 37, Cremona 1997, Table 1)
    /// before any stage ran.
    fn blank() -> RankReport {
        let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
        let work = Work::unlimited();
        empty_report(&CurveData::new(&e, &work).unwrap(), &work)
    }

    #[test]
    fn a_failed_stage_is_never_dropped() {
        // an inconsistency is the error of the analysis
        let mut r = blank();
        let mut notes = Vec::new();
        let e = stage_failure("the algebra descent", Error::internal("x", "y"), &mut r, &mut notes).unwrap_err();
        assert_eq!(e.kind(), &ErrorKind::Internal);
        assert!(notes.is_empty() && !r.budget_exhausted);
        // a budget that ran out marks the report as cut short
        stage_failure("the algebra descent", Error::new(ErrorKind::Budget, "out of time"), &mut r, &mut notes).unwrap();
        assert!(r.budget_exhausted && notes.is_empty());
        // any other failure is an unfinished statement naming the stage
        let mut r = blank();
        stage_failure("the algebra descent", Error::new(ErrorKind::TooLarge, "K(S,2) of dimension above 64"), &mut r, &mut notes).unwrap();
        assert!(!r.budget_exhausted);
        assert_eq!(notes.len(), 1);
        assert_eq!(notes[0].standing, Standing::Unfinished);
        assert!(notes[0].claim.starts_with("the algebra descent did not finish") && notes[0].claim.contains("dimension above 64"));
    }
}
