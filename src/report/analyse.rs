//! The pipeline from a curve to its report.

use super::{RankReport, Route, ShaSuspect};
use crate::arith::{factor, FactorLimits};
use crate::budget::{Budget, RankOptions, Stage};
use crate::curve::{Curve, Point};
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
    let fac = factor(curve.discriminant(), &limits)?;
    let primes: Vec<Natural> = fac.primes().cloned().collect();
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
    let to_input = |p: &Point| -> Point {
        match p {
            Point::Infinity => Point::Infinity,
            Point::Affine(x, y) => {
                let (x, y) = change.unmap_point(&(x.clone(), y.clone()));
                Point::Affine(x, y)
            }
        }
    };
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
    if !runs.is_empty() {
        report.route = Route::Isogeny;
        let best_lower = runs.iter().max_by_key(|r| r.lower).unwrap();
        report.rank_lower = Some(best_lower.lower);
        report.points = best_lower.points.iter().map(to_input).collect();
        for p in &report.points {
            if !curve.contains(p) {
                return Err(Error::new(crate::ErrorKind::InvalidValue, "internal check failed: reported point not on the input curve"));
            }
        }
        report.independence = format!(
            "their images under the connecting maps of the 2-isogeny with kernel {} are independent modulo the images of torsion (Silverman-Tate III.6)",
            best_lower.kernel_point
        );
        if let Some(best_upper) = runs.iter().filter(|r| r.upper.is_some()).min_by_key(|r| r.upper.unwrap()) {
            report.rank_upper = best_upper.upper;
            report.isogeny_selmer = Some((best_upper.side_e.selmer_dim, best_upper.side_e_prime.selmer_dim));
            if report.rank_upper != report.rank_lower {
                for (side, name) in [(&best_upper.side_e, "E"), (&best_upper.side_e_prime, "E'")] {
                    for d in &side.unexplained {
                        report.sha_suspects.push(ShaSuspect {
                            origin: format!("2-isogeny with kernel {}, covering of {name}", best_upper.kernel_point),
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
    }
    progress(Stage::Report, "done");
    report.elapsed = budget.elapsed();
    Ok(report)
}
