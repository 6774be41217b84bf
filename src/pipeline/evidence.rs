//! The evidence beyond the rank bounds, computed from the report and the
//! curve's data: root number and parity, a saturated basis with heights and
//! regulator, the real period, Tamagawa numbers, the analytic rank and the
//! analytic order of Sha, each statement with its standing.

use crate::budget::{Stage, Work};
use crate::curve::Point;
use crate::heights::{mordell_weil_basis_of, PeriodLattice, SaturationOptions};
use crate::local::CurveData;
use crate::report::{Evidence, RankReport, Standing, Statement, EVIDENCE_MAX_CONDUCTOR};
use malachite::Natural;

/// Working precision (bits) for heights and periods in reports.
const PRECISION: u64 = 128;

/// The evidence for `report`, whose curve is described by `data`. A part
/// that cannot be computed leaves an [`Standing::Unfinished`] statement
/// saying why; none is dropped silently. The root number is read from the
/// report (its stage ran once before); `root_number_failure` is why that
/// stage did not finish, if it did not.
pub(crate) fn compute(report: &RankReport, data: &CurveData, root_number_failure: Option<&crate::error::Error>, work: &Work) -> Evidence {
    work.report(Stage::Evidence, "heights, periods, L-values");
    let unfinished = |what: &str, why: &dyn std::fmt::Display| Statement { claim: format!("{what}: {why}"), standing: Standing::Unfinished };
    let mut st: Vec<Statement> = Vec::new();
    let proven = |claim: String| Statement { claim, standing: Standing::Proven };
    // rank
    match report.descent_bounds {
        (Some(l), Some(u)) if l == u => st.push(proven(format!("the rank is {l} (2-descent: the lower and upper bounds meet)"))),
        (Some(l), Some(u)) => st.push(proven(format!("{l} <= rank <= {u} (2-descent)"))),
        (Some(l), None) => st.push(proven(format!("rank >= {l} (independent points; no upper bound finished)"))),
        _ => {}
    }
    if let Some(s) = report.two_selmer_dim {
        st.push(proven(format!("dim Sel^2(E) = {s}")));
    }
    // Cassels' formula, checked on every finished 2-isogeny descent (a
    // mismatch is an internal error before this point)
    for run in &report.isogeny_runs {
        if let Some(e) = run.tamagawa_ratio {
            st.push(proven(format!(
                "Cassels' formula holds for the 2-isogeny from y^2 = x(x^2 + {} x + {}): dim S^phi(E) - dim S^phi'(E') = {} = {e},                  the exponent of the Tamagawa ratio found from the Tamagawa numbers of both curves and the real place                  (Cassels 1965; each local factor also equals the size of the descent's local image)",
                run.side_e.a,
                run.side_e.b,
                run.side_e_prime.selmer_dim as i64 - run.side_e.selmer_dim as i64,
            )));
        }
    }
    // root number and parity
    if let Some(e) = root_number_failure {
        st.push(unfinished("the root number was not computed", e));
    }
    let rn = report.root_number.as_ref();
    let w = rn.map(|r| r.global);
    // the analytic route's proven L-value and what it proves
    if let Some(v) = report.analytic.as_ref().and_then(|a| a.value.as_ref()) {
        let what = if v.order == 0 { "L(E,1)" } else { "L'(E,1)" };
        let (lo, hi) = v.decimal_bounds();
        if v.nonzero_proven() {
            st.push(proven(format!(
                "{what} lies in [{lo}, {hi}] (interval arithmetic with outward rounding, {} terms and a proven tail bound), so it is not zero",
                v.terms
            )));
            st.push(proven(format!(
                "the rank is {} and Sha is finite (analytic rank {}: Gross-Zagier 1986, Kolyvagin 1988-1990, with the modularity of \
                 elliptic curves over Q: Wiles 1995, Taylor-Wiles 1995, Breuil-Conrad-Diamond-Taylor 2001)",
                v.order, v.order
            )));
        } else {
            st.push(Statement {
                claim: format!("{what} lies in [{lo}, {hi}], which contains zero: the analytic route proves nothing here (analytic rank >= 2, or not separated)"),
                standing: Standing::Unfinished,
            });
        }
    }
    if let Some(r) = rn {
        use crate::rootno::RootNumberMethod;
        let w = r.global;
        let local = "local root numbers: -1 at split and +1 at non-split multiplicative primes, Rohrlich 1993 for p >= 5, \
                     the tame and twist cases at 2 and 3";
        st.push(match &r.method {
            RootNumberMethod::LocalFormulas => proven(format!("the root number is {w} ({local})")),
            RootNumberMethod::LocalAndNumerical => {
                proven(format!("the root number is {w} ({local}; the functional equation tested numerically agrees)"))
            }
            RootNumberMethod::Transferred { auxiliary, auxiliary_conductor, .. } => proven(format!(
                "the root number is {w} ({local}; at 2 and 3 carried over from the twist [{}] of conductor {auxiliary_conductor}, \
                 isomorphic to E over Q_p at the primes without a local formula, whose root number the functional equation proves in interval arithmetic; modularity: \
                 Wiles 1995, Breuil-Conrad-Diamond-Taylor 2001)",
                auxiliary.iter().map(|a| a.to_string()).collect::<Vec<_>>().join(",")
            )),
            _ => proven(format!(
                "the root number is {w} (the functional equation tested in interval arithmetic, which excludes the other sign; \
                 modularity: Wiles 1995, Breuil-Conrad-Diamond-Taylor 2001; no local formula at 2 or 3 here)"
            )),
        });
        if let Some(s) = report.two_selmer_dim {
            let t = report.torsion.iter().filter(|n| *n % 2 == 0).count();
            let par = (s - t) % 2;
            let wpar = usize::from(w == -1);
            st.push(proven(format!(
                "dim Sel^2(E) - dim E(Q)[2] = {} has the parity (1 - w)/2 = {wpar} (Monsky 1996){}",
                s - t,
                if par == wpar { "" } else { ": MISMATCH, please report" }
            )));
        }
        if let Some(r) = report.rank() {
            let ok = (r % 2 == 1) == (w == -1);
            st.push(Statement {
                claim: format!("(-1)^rank = {} {} w = {w}", if r % 2 == 0 { 1 } else { -1 }, if ok { "equals" } else { "differs from" }),
                standing: Standing::Conditional("the parity conjecture (not a theorem; the observed agreement is evidence)".into()),
            });
        } else if let (Some(l), Some(u)) = (report.rank_lower, report.rank_upper) {
            if u > l {
                let wpar = usize::from(w == -1);
                st.push(Statement {
                    claim: format!("the rank has parity {wpar}, so it lies in {{{}}}", (l..=u).filter(|r| r % 2 == wpar).map(|r| r.to_string()).collect::<Vec<_>>().join(", ")),
                    standing: Standing::Conditional("the parity conjecture (implied by finiteness of Sha)".into()),
                });
            }
        }
    }
    // periods and Tamagawa numbers
    let real_period = match PeriodLattice::compute(data.minimal(), PRECISION) {
        Ok(p) => Some(p.real_period_f64()),
        Err(e) => {
            st.push(unfinished("the real period was not computed", &e));
            None
        }
    };
    if let Some(om) = real_period {
        st.push(Statement { claim: format!("the real period is {om:.12} (AGM, {PRECISION}-bit floats)"), standing: Standing::Numerical });
    }
    let tamagawa: Vec<(Natural, u32)> = data.local().iter().map(|d| (d.prime.clone(), d.tamagawa)).collect();
    // heights, regulator, saturation
    let mut on_min: Vec<Point> = Vec::new();
    for p in &report.points {
        match data.to_minimal(p) {
            Ok(q) if !q.is_infinity() => on_min.push(q),
            Ok(_) => {}
            Err(e) => st.push(unfinished(&format!("heights were not computed: the point {p} was not carried to the minimal model"), &e)),
        }
    }
    let mut ev = Evidence {
        root_number: w,
        generators: None,
        reduced_points: report.points.clone(),
        heights: vec![],
        regulator: if report.rank() == Some(0) { Some(1.0) } else { None },
        saturation: None,
        real_period,
        tamagawa,
        vanishing_order: None,
        leading_value: None,
        sha_bsd_estimate: None,
        statements: vec![],
    };
    if !on_min.is_empty() && on_min.len() == report.points.len() {
        let opts = SaturationOptions::within(work);
        let basis = mordell_weil_basis_of(data, &on_min, PRECISION, &opts);
        if let Err(e) = &basis {
            st.push(unfinished("heights and saturation were not computed", e));
        }
        if let Ok(b) = basis {
            let back: Vec<Point> = b.generators.iter().map(|p| data.to_input(p)).collect();
            if back.iter().all(|p| report.input.contains(p)) && back.len() == on_min.len() {
                ev.heights = b.heights.iter().map(crate::heights::float_to_f64).collect();
                ev.regulator = Some(b.regulator_f64());
                st.push(Statement {
                    claim: format!("the regulator of the points is {:.12} (canonical heights, {PRECISION}-bit floats)", b.regulator_f64()),
                    standing: Standing::Numerical,
                });
                // each p-saturation is exact; the bound on the primes to test
                // comes from floating-point heights with safety margins
                let on_bound = || Standing::Conditional("the index bound, computed from floating-point heights with safety margins".into());
                st.push(Statement {
                    claim: format!("the points are {}", b.saturation),
                    standing: if b.saturation.is_saturated() { on_bound() } else { Standing::Numerical },
                });
                if b.saturation.is_saturated() && report.rank() == Some(back.len()) {
                    st.push(Statement {
                        claim: format!("the {} point(s) with the torsion generate E(Q)", back.len()),
                        standing: on_bound(),
                    });
                    ev.generators = Some(back.clone());
                }
                ev.reduced_points = back;
                ev.saturation = Some(b.saturation);
            } else {
                st.push(unfinished(
                    "heights and saturation were not reported",
                    &format!("the reduced basis has {} point(s) for {} independent point(s), or a point off the input curve", back.len(), on_min.len()),
                ));
            }
        }
    } else if report.rank() == Some(0) {
        ev.generators = Some(vec![]);
    }
    // L-series, analytic rank and the Birch and Swinnerton-Dyer quotient
    if let Some(w) = w {
        let n = data.conductor();
        if *n > EVIDENCE_MAX_CONDUCTOR {
            st.push(unfinished("L-values were not computed", &format!("the conductor is above {EVIDENCE_MAX_CONDUCTOR}")));
        } else if work.exhausted() {
            st.push(unfinished("L-values were not computed", &"the budget ran out"));
        } else {
            analytic(report, data, w, work, &mut ev, &mut st);
        }
    }
    ev.statements = st;
    ev
}

fn analytic(report: &RankReport, data: &CurveData, w: i8, work: &Work, ev: &mut Evidence, st: &mut Vec<Statement>) {
    use crate::lseries::{analytic_rank_of, bsd_sha, BsdInputs, RankBasis};
    let ar = match analytic_rank_of(data, w, work) {
        Ok(ar) => ar,
        Err(e) if *e.kind() == crate::ErrorKind::Budget && work.exhausted() => {
            st.push(Statement { claim: format!("L-values were not computed: {e}"), standing: Standing::Unfinished });
            return;
        }
        Err(e) => {
            st.push(Statement { claim: format!("the analytic rank was not decided to the accuracy reached ({e})"), standing: Standing::Numerical });
            return;
        }
    };
    let (lead, err) = ar.leading_coefficient();
    ev.vanishing_order = Some(ar.rank);
    ev.leading_value = Some(lead);
    let standing = match ar.basis {
        RankBasis::NonZeroValue => Standing::Conditional(
            "the f64 error bound of the L-series computation (careful rounding analysis, not interval arithmetic)".into(),
        ),
        RankBasis::NumericalZeros => Standing::Numerical,
    };
    st.push(Statement {
        claim: format!(
            "the analytic rank is {} with L^({})(E,1)/{}! = {lead:.12} ± {err:.1e} ({})",
            ar.rank,
            ar.rank,
            ar.rank,
            match (ar.basis, ar.rank) {
                (RankBasis::NonZeroValue, 0) => "L(E,1) is bounded away from zero by the error bound".to_string(),
                (RankBasis::NonZeroValue, _) => format!(
                    "L(E,1) = 0 by the sign w = {w} of the functional equation, and L'(E,1) is bounded away from zero by the error bound"
                ),
                (basis, _) => basis.statement().to_string(),
            }
        ),
        standing: standing.clone(),
    });
    if ar.rank <= 1 && ar.basis == RankBasis::NonZeroValue && report.analytic.as_ref().and_then(|a| a.rank).is_none() {
        st.push(Statement {
            claim: format!(
                "rank = {0} and Sha is finite (Gross-Zagier 1986 and Kolyvagin 1988 with modularity, from analytic rank {0})",
                ar.rank
            ),
            standing,
        });
    }
    // the quotient needs the rank and a saturated basis (rank 0: nothing)
    let regulator = if ar.rank == 0 {
        Some(1.0)
    } else if report.rank() == Some(ar.rank) && ev.generators.is_some() {
        ev.regulator
    } else {
        None
    };
    let (Some(omega), Some(reg)) = (ev.real_period, regulator) else { return };
    let torsion_order: u64 = report.torsion.iter().map(|&t| t as u64).product::<u64>().max(1);
    let tamagawa_product: u64 = ev.tamagawa.iter().map(|(_, c)| *c as u64).product();
    let inputs = BsdInputs {
        rank: ar.rank,
        leading: lead,
        leading_error: err,
        torsion_order,
        omega,
        regulator: reg,
        tamagawa_product,
        relative_error: 1e-12,
    };
    let sha = match bsd_sha(&inputs) {
        Ok(sha) => sha,
        Err(e) => {
            st.push(Statement { claim: format!("the analytic order of Sha was not computed: {e}"), standing: Standing::Unfinished });
            return;
        }
    };
    {
        ev.sha_bsd_estimate = Some(sha.value);
        st.push(Statement {
            claim: format!(
                "the analytic order of Sha is {:.9} ± {:.1e} (nearest integer {}{})",
                sha.value,
                sha.error,
                sha.nearest,
                if sha.is_square { ", a square" } else { "" }
            ),
            standing: Standing::Conditional("the Birch and Swinnerton-Dyer conjecture (its exact formula)".into()),
        });
    }
}
