//! The Heegner series on the member of the isogeny class with the smallest
//! predicted generator.
//!
//! Isogenous curves have the same `L`-series, so the same `L'(E, 1)`; the
//! Birch and Swinnerton-Dyer formula predicts for each member `E_i` a
//! generator of height `L'(E, 1) T_i^2 / (Ω_i ∏ c_p(E_i))` (Sha taken
//! trivial; `T_i` the torsion order). The members' generators differ in
//! height by factors of the degrees: for an isogeny `φ: E_i → E` of degree
//! `d`, `ĥ(φ P) = d ĥ(P)` (Silverman, The Arithmetic of Elliptic Curves,
//! 2nd ed., exercise 8.8 / Cassels, Lectures on Elliptic Curves, §17), and
//! `E(Q) / φ(E_i(Q))` is killed by `d` (as `φ ∘ φ' = [d]`). The working
//! precision of the series, and with it the number of coefficients and the
//! cost of every term, grows with the height to be recognised (plus the
//! difference between naive and canonical height). So the series runs on
//! the member whose prediction plus that difference is smallest, and its
//! point is carried back along the isogenies and saturated on `E` (the
//! index of `φ(G_i)` in `E(Q)` divides `d`).
//!
//! The class is walked by the odd-degree isogenies of [`crate::isogeny`]
//! and the rational 2-isogenies (Vélu). Only heights cross a 2-isogeny
//! here; the descent never uses such a link.

use super::spend::Spend;
use super::{bsd_scale, canonical_height_of, err, mordell_weil_basis_of, point_with_setup, to_f64, HeegnerOptions, HeegnerResult, Setup};
use crate::curve::{Curve, Point};
use crate::error::{Error, ErrorKind};
use crate::heights::{height_difference_bound, SaturationOptions};
use crate::local::CurveData;
use crate::torsion::TorsionGroup;
use std::time::Instant;

/// A member is used only when its cost measure (prediction plus height
/// difference bound, which sets the working precision) is below this
/// fraction of the curve's own: the series' cost grows about like the
/// square of the precision, so smaller gains do not pay for a second
/// setup and the carrying back.
const WORTH_IT: f64 = 0.75;

/// The precision measure of a member: the predicted generator height plus
/// the height difference bound (the bits of the series are proportional
/// to it, see the search in the parent module).
fn measure(predicted: f64, slack: f64) -> f64 {
    predicted.max(0.5) + slack
}

/// A member of the class chosen for the series.
pub(super) struct Choice {
    /// The index of the member in the class.
    pub(super) index: usize,
    /// The member's curve data and invariants.
    pub(super) data: CurveData,
    pub(super) setup: Setup,
    /// Its measure (see [`measure`]).
    pub(super) measure: f64,
}

/// The member of `class` (the first curve being `E` itself, described by
/// `data` and `s`) with the smallest measure, when that is below
/// [`WORTH_IT`] times `E`'s own; `None` otherwise.
pub(super) fn choose(class: &crate::isogeny::OddIsogenyClass, data: &CurveData, s: &Setup, work: &crate::budget::Work) -> Result<Option<Choice>, Error> {
    let own = measure(s.predicted, s.slack);
    let mut best: Option<Choice> = None;
    for (i, curve) in class.curves.iter().enumerate().skip(1) {
        if work.exhausted() {
            return Err(err(ErrorKind::Budget, "time budget spent on the isogeny class"));
        }
        let md = CurveData::with_known_primes_within(curve, data.bad_primes(), work)?;
        if md.conductor() != data.conductor() {
            return Err(Error::internal(
                "the Heegner route",
                format!("the isogenous curve {curve} has conductor {}, not {}", md.conductor(), data.conductor()),
            ));
        }
        let local = md.local().to_vec();
        let (torsion_order, scale) = bsd_scale(md.minimal(), &local)?;
        let predicted = s.derivative * scale;
        let slack = height_difference_bound(md.minimal()).max(1.0);
        let m = measure(predicted, slack);
        if m < own * WORTH_IT && best.as_ref().is_none_or(|b| m < b.measure) {
            let bad_ap = md.bad_prime_traces()?;
            let setup = Setup { n: s.n, local, bad_ap, torsion_order, derivative: s.derivative, predicted, slack };
            best = Some(Choice { index: i, data: md, setup, measure: m });
        }
    }
    Ok(best)
}

/// The Heegner route through the member of the isogeny class with the
/// smallest predicted generator (see the module documentation): `None`
/// when the class offers no better member or the series there found no
/// point (the caller then runs the series on the curve itself).
pub(super) fn point_through_class(data: &CurveData, s: &Setup, opts: &HeegnerOptions, start: Instant, budget: &Spend) -> Result<Option<HeegnerResult>, Error> {
    let work = budget.work();
    let minimal = data.minimal();
    let class = match crate::isogeny::isogeny_class_with_two_within(minimal, data.bad_primes(), work) {
        Ok(c) => c,
        Err(e) if *e.kind() == ErrorKind::Internal || *e.kind() == ErrorKind::Budget => return Err(e),
        // a model the isogeny search cannot take: the curve itself
        Err(_) => return Ok(None),
    };
    if class.curves.len() < 2 {
        return Ok(None);
    }
    let Some(choice) = choose(&class, data, s, work)? else { return Ok(None) };
    // the pull-back of the member's differential under the modular
    // parametrisation is `m` times that of the optimal curve, `m` dividing
    // the degree of an isogeny from the optimal curve (which is not known):
    // try every multiplier up to the largest such degree
    let most = (0..class.curves.len()).filter_map(|j| class.degree(j, choice.index)).max().unwrap_or(1);
    let member_opts = HeegnerOptions { max_multiplier: opts.max_multiplier.max(u32::try_from(most).unwrap_or(u32::MAX)), ..opts.clone() };
    let Some(found) = point_with_setup(&choice.data, &choice.setup, &member_opts, start, budget)? else { return Ok(None) };
    let degree = class.degree(choice.index, 0).ok_or_else(|| Error::internal("the Heegner route", "no isogeny back to the curve"))?;
    // the class starts from the minimal model in reduced form: back to
    // the data's minimal model by the same change
    let (m, to_min) = minimal.minimal_model(data.bad_primes())?;
    let (reduced, to_red) = m.reduced_form();
    if reduced != class.curves[0] {
        return Err(Error::internal("the Heegner route", "the isogeny class does not start at the curve's reduced model"));
    }
    let change = to_min.compose(&to_red);
    let on_member = choice.data.to_input(&found.generator);
    let carried = match class.map_point(choice.index, 0, &on_member) {
        Some(Point::Affine(x, y)) => {
            let (x, y) = change.unmap_point(&(x, y));
            Point::Affine(x, y)
        }
        _ => return Err(Error::internal("the Heegner route", "the generator of the isogenous curve did not map to a point")),
    };
    if !minimal.contains(&carried) {
        return Err(Error::internal("the Heegner route", "the point carried along the isogeny is not on the curve"));
    }
    if minimal.torsion_order_of(&carried).is_some() {
        return Err(Error::internal("the Heegner route", "a generator carried along an isogeny became torsion"));
    }
    // the index of φ(G) in E(Q) divides the degree: saturation divides
    let prec = 128u64.max(found.precision / 4);
    let basis = mordell_weil_basis_of(data, std::slice::from_ref(&carried), prec, &SaturationOptions::within(work))?;
    let generator = basis.generators.first().cloned().ok_or_else(|| Error::internal("the Heegner route", "the carried point was dropped as torsion"))?;
    if !minimal.contains(&generator) || minimal.torsion_order_of(&generator).is_some() {
        return Err(Error::internal("the Heegner route", "the saturated generator is not a point of infinite order"));
    }
    let hg = canonical_height_of(data, &generator, prec)?;
    let hp = canonical_height_of(data, &carried, prec)?;
    let index = exact_index(minimal, data, &generator, &carried, to_f64(&(&hp / &hg)));
    Ok(Some(HeegnerResult {
        generator,
        recognised_point: carried,
        index,
        height: to_f64(&hg),
        predicted_height: s.predicted,
        derivative: s.derivative,
        saturation: basis.saturation,
        isogenous_curve: Some((class.curves[choice.index].clone(), degree)),
        elapsed: start.elapsed(),
        ..found
    }))
}

/// `k` with `p = ± k g + T` (`T` rational torsion), checked exactly, from
/// the height ratio `ĥ(p) / ĥ(g) = k^2`; `None` when the check fails.
pub(super) fn exact_index(curve: &Curve, data: &CurveData, g: &Point, p: &Point, ratio: f64) -> Option<u64> {
    let k = ratio.sqrt().round();
    if !(1.0..1e9).contains(&k) {
        return None;
    }
    let kg = curve.multiple(g, k as i64);
    let neg = curve.negate(p);
    let torsion = TorsionGroup::compute(curve, data.bad_primes());
    let ok = kg == *p
        || kg == neg
        || torsion.points().iter().any(|t| {
            let a = curve.add(&kg, t);
            a == *p || a == neg
        });
    ok.then_some(k as u64)
}
