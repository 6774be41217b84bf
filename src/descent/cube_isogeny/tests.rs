use super::*;
use crate::search::{search_curve, SearchLimits};
use proptest::prelude::*;
use std::sync::atomic::AtomicBool;
use std::sync::Arc;

fn int(k: i64) -> Integer {
    Integer::from(k)
}

fn descend(k: i64) -> CubeDescent {
    cube_isogeny_descent(&int(k), &Work::unlimited()).unwrap()
}

/// Points of naive height at most `h` on `y^2 = x^3 + m`.
fn small_points(m: &Integer, h: u64) -> Vec<Point> {
    let e = side_curve(m).unwrap();
    search_curve(&e, &SearchLimits::new(h))
        .points
        .into_iter()
        .map(|(x, y)| Point::Affine(x, y))
        .collect()
}

fn in_span(basis: &[Vec<u8>], w: &[u8]) -> bool {
    if w.iter().all(|&c| c == 0) {
        return true;
    }
    let mut with = basis.to_vec();
    with.push(w.to_vec());
    f3_rank(&with) == f3_rank(basis)
}

/// A point of the covering of `delta(P)` over `P`: `(y + sqrt m)/alpha` is a
/// cube `gamma^3` in the algebra (exact cube root), `gamma = (u + v sqrt d)/z`.
fn covering_point(
    side: &CubeSide,
    p: &Point,
    limits: &FactorLimits,
) -> (CubicCovering, Rational, Rational, Rational) {
    let w = side.delta(p, limits).unwrap();
    let cov = side.covering(&w, limits).unwrap();
    let alpha = side.representative(&w, limits);
    let Point::Affine(x, y) = p else {
        panic!("affine point expected")
    };
    let _ = x;
    match &side.algebra {
        SideAlgebra::Field { d, f, .. } => {
            let beta_num = QuadElt {
                a: y.clone(),
                b: Rational::from(f.clone()),
            };
            // beta = (y + f sqrt d) / alpha = (y + f sqrt d) conj(alpha) / N(alpha)
            let conj = QuadElt {
                a: alpha.a.clone(),
                b: -alpha.b.clone(),
            };
            let nm = alpha.norm(d);
            let t = beta_num.mul(&conj, d);
            let beta = QuadElt {
                a: t.a / &nm,
                b: t.b / &nm,
            };
            let g = cube_root_in_field(&beta, d)
                .expect("delta(P) = class of alpha, so the quotient is a cube");
            (cov, g.a, g.b, Rational::ONE)
        }
        SideAlgebra::Split { s } => {
            let a = &alpha.a;
            let sq = Rational::from(s.clone());
            let u = rational_cube_root(&((y + &sq) / a)).expect("y + s = a u^3");
            let v = rational_cube_root(&((y - &sq) / (a * a))).expect("y - s = a^2 v^3");
            (cov, u, v, Rational::ONE)
        }
    }
}

#[test]
fn the_isogenies_map_points_to_points() {
    // phi and phi^ (Cohen GTM 239 §8.4, from memory): images lie on the
    // other curve, and delta kills the image of the other side
    let limits = FactorLimits::default();
    for k in [1i64, -2, 2, 7, -11, 17, -26, 28, 37, -47, 113] {
        let kk = int(k);
        let e = side_curve(&kk).unwrap();
        let e2 = side_curve(&(int(-27) * &kk)).unwrap();
        let desc = descend(k);
        for p in small_points(&kk, 200) {
            let q = phi(&kk, &p);
            assert!(e2.contains(&q), "k = {k}: phi{p} = {q}");
            let back = phi_hat(&kk, &q);
            assert!(e.contains(&back));
            // phi^ phi = [3] up to an automorphism of order dividing 6: same x^3
            let three = e.multiple(&p, 3);
            match (&back, &three) {
                (Point::Affine(x1, _), Point::Affine(x3, _)) => {
                    assert_eq!(x1 * x1 * x1, x3 * x3 * x3)
                }
                _ => assert_eq!(back.is_infinity(), three.is_infinity()),
            }
            assert!(
                desc.dual
                    .delta(&q, &limits)
                    .unwrap()
                    .iter()
                    .all(|&c| c == 0),
                "k = {k}: phi(P) in the kernel"
            );
        }
        for q in small_points(&(int(-27) * &kk), 300) {
            let p = phi_hat(&kk, &q);
            assert!(e.contains(&p));
            assert!(
                desc.own.delta(&p, &limits).unwrap().iter().all(|&c| c == 0),
                "k = {k}: phi^(Q) in the kernel"
            );
        }
    }
}

#[test]
fn points_lie_in_the_selmer_groups_and_on_their_coverings() {
    let limits = FactorLimits::default();
    for k in [
        1i64, -1, 2, -2, 4, 7, -7, 9, 15, -15, 17, 24, -26, 28, 36, -43, 57, 100, -108, 113, 225,
        -432,
    ] {
        let desc = descend(k);
        for (side, h) in [(&desc.own, 300u64), (&desc.dual, 300)] {
            for p in small_points(&side.m, h) {
                let w = side.delta(&p, &limits).unwrap();
                assert!(
                    in_span(&side.selmer, &w),
                    "k = {k}, m = {}: delta{p} not in the Selmer group",
                    side.m
                );
                let (cov, u, v, z) = covering_point(side, &p, &limits);
                assert!(cov.contains(&u, &v, &z), "k = {k}: covering point");
                assert_eq!(
                    cov.map(&u, &v, &z),
                    Some(p.clone()),
                    "k = {k}: the covering map gives the point back"
                );
            }
        }
    }
}

#[test]
fn k_9279_selmer_group_of_phi_hat_is_the_fundamental_unit() {
    // the lead's prototype (fifteenth session, notes outside the repository):
    // K = Q(sqrt 1031), h = 1, eps = 651737448664200 + 20297537082877 sqrt 1031
    // of norm 1, and Sel^phi^ is generated by the class of eps
    let desc = descend(9279);
    let SideAlgebra::Field {
        d,
        f,
        field,
        classes,
    } = &desc.own.algebra
    else {
        panic!("9279 is not a square")
    };
    assert_eq!((d.clone(), f.clone()), (int(1031), int(3)));
    let eps = QuadElt {
        a: Rational::from(651737448664200i64),
        b: Rational::from(20297537082877i64),
    };
    assert_eq!(eps.norm(d), 1u32);
    let e = field
        .from_power_basis(&[eps.a.clone(), eps.b.clone()])
        .unwrap();
    let c = classes
        .coordinates(field, &e, &FactorLimits::default())
        .unwrap();
    let w = match crate::numfield::solve_f3(&desc.own.candidates, &c) {
        Some(Ok(w)) => w,
        other => panic!("eps is not a candidate: {other:?}"),
    };
    assert!(w.iter().any(|&x| x != 0), "eps is not a cube");
    assert_eq!(desc.own.selmer.len(), 1);
    assert!(in_span(&desc.own.selmer, &w));
    // the rank is 1 (the lead's generator of height 62.8; from the issue-16 notes)
    assert!(desc.rank_bound >= 1);
    eprintln!(
        "9279: dim Sel^phi = {}, dim Sel^phi^ = {}, bound {}",
        desc.dual.selmer.len(),
        desc.own.selmer.len(),
        desc.rank_bound
    );
}

/// `y^2 = x^3 + k` from a table row with `a1 = a2 = a4 = 0`:
/// `a3 = 0` gives `k = a6`; `a3 = 1` (`y^2 + y = x^3 + a6`) gives
/// `(8y + 4)^2 = (4x)^3 + 16 (4 a6 + 1)`.
fn j_zero_rows(name: &str) -> Vec<(i64, usize)> {
    let path = format!("{}/../shared/data/{name}", env!("CARGO_MANIFEST_DIR"));
    let alt = format!("{}/tests/data/{name}", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&path)
        .or_else(|_| std::fs::read_to_string(&alt))
        .unwrap();
    let mut lines = text.lines();
    let head: Vec<&str> = lines
        .next()
        .unwrap()
        .trim_start_matches("# ")
        .split('\t')
        .collect();
    let col = |n: &str| head.iter().position(|h| *h == n).unwrap();
    let (a1, a2, a3, a4, a6, r) = (
        col("a1"),
        col("a2"),
        col("a3"),
        col("a4"),
        col("a6"),
        col("rank"),
    );
    let mut out = Vec::new();
    for line in lines {
        let f: Vec<&str> = line.split('\t').collect();
        let n = |i: usize| f[i].parse::<i64>().unwrap();
        if n(a1) == 0 && n(a2) == 0 && n(a4) == 0 {
            let k = match n(a3) {
                0 => n(a6),
                1 => 16 * (4 * n(a6) + 1),
                _ => continue,
            };
            out.push((k, f[r].parse().unwrap()));
        }
    }
    out
}

#[test]
fn the_bound_is_never_below_the_published_rank() {
    // Cremona 1997 Table 1 and the open tables that extend it (../shared/data,
    // see its README): every j = 0 row
    let mut rows = Vec::new();
    for name in [
        "curves-small-conductor.tsv",
        "curves-with-sha.tsv",
        "curves-wider.tsv",
    ] {
        rows.extend(j_zero_rows(name));
    }
    assert!(rows.len() >= 14, "{} rows", rows.len());
    let mut sharp = 0;
    for &(k, rank) in &rows {
        let desc = descend(k);
        assert!(
            desc.rank_bound >= rank,
            "k = {k}: bound {} below the published rank {rank}",
            desc.rank_bound
        );
        sharp += usize::from(desc.rank_bound == rank);
    }
    eprintln!("{} j = 0 rows, bound sharp on {sharp}", rows.len());
}

fn sixth_power_free(k: i64) -> bool {
    (2i64..=((k.unsigned_abs() as f64).powf(1.0 / 6.0) as i64 + 1)).all(|q| k % q.pow(6) != 0)
}

/// Against the library's own 2-descent (with points and, where it runs,
/// the analytic route): the 3-isogeny bound is never below a proven rank,
/// and its lower bound from points never above the library's upper bound.
fn compare_with_the_pipeline(range: std::ops::RangeInclusive<i64>) {
    let limits = FactorLimits::default();
    let (mut compared, mut sharp, mut proven_by_three) = (0, 0, 0);
    for k in range {
        if k == 0 || !sixth_power_free(k) {
            continue;
        }
        let desc = descend(k);
        let curve = side_curve(&int(k)).unwrap();
        let opts =
            crate::RankOptions::default().with_time_limit(std::time::Duration::from_secs(20));
        let report = crate::analyse(&curve, &opts).unwrap();
        let own_points: Vec<Point> = small_points(&int(k), 100)
            .into_iter()
            .chain(report.torsion_points.clone())
            .collect();
        let dual_points: Vec<Point> = own_points
            .iter()
            .map(|p| phi(&int(k), p))
            .chain(small_points(&int(-27 * k), 100))
            .collect();
        let lower = desc
            .lower_bound(&own_points, &dual_points, &limits)
            .unwrap();
        if let Some(up) = report.rank_upper {
            assert!(
                lower <= up,
                "k = {k}: 3-isogeny lower bound {lower} above the library's upper bound {up}"
            );
        }
        if let Some(lo) = report.rank_lower {
            assert!(
                desc.rank_bound >= lo,
                "k = {k}: 3-isogeny bound {} below the library's lower bound {lo}",
                desc.rank_bound
            );
        }
        if report.rank_lower.is_some() && report.rank_lower == report.rank_upper {
            compared += 1;
            let r = report.rank_lower.unwrap_or(0);
            // both routes proven: they must agree (the inequalities above force it)
            if lower == desc.rank_bound {
                assert_eq!(lower, r, "k = {k}: the two proven ranks differ");
            }
            sharp += usize::from(desc.rank_bound == r);
        }
        proven_by_three += usize::from(lower == desc.rank_bound);
    }
    eprintln!("compared {compared} proven ranks: 3-isogeny bound sharp on {sharp}; rank proven by the 3-isogeny descent alone (points) on {proven_by_three}");
    assert!(compared > 0);
}

#[test]
fn agrees_with_the_library_for_small_k() {
    compare_with_the_pipeline(-40..=40);
}

#[test]
#[ignore = "about a minute: |k| <= 300 against the library's rank"]
fn agrees_with_the_library_for_k_up_to_300() {
    compare_with_the_pipeline(-300..=300);
}

#[test]
fn local_images_are_groups() {
    // W_p = {alpha : C_alpha(Q_p) non-empty} is the preimage of a subgroup:
    // brute force over every candidate on small k
    let limits = FactorLimits::default();
    let work = Work::unlimited();
    for k in [2i64, -15, 28, 36, -43, 57] {
        let desc = descend(k);
        for side in [&desc.own, &desc.dual] {
            let n = side.candidates.len();
            if n > 6 {
                continue;
            }
            for &p in &side.s_primes {
                let mut sol: Vec<Vec<u8>> = Vec::new();
                for idx in 0..3usize.pow(n as u32) {
                    let w: Vec<u8> = (0..n)
                        .map(|i| (idx / 3usize.pow(i as u32) % 3) as u8)
                        .collect();
                    let cov = side.covering(&w, &limits).unwrap();
                    if locally_soluble(&cov.form, &cov.c, p, &work).unwrap() {
                        sol.push(w);
                    }
                }
                // a subgroup: contains 0, size a power of 3, closed under addition
                assert!(sol.iter().any(|w| w.iter().all(|&c| c == 0)));
                let size = sol.len();
                let dim = if sol.len() == 1 { 0 } else { f3_rank(&sol) };
                assert_eq!(
                    size,
                    3usize.pow(dim as u32),
                    "k = {k}, m = {}, p = {p}",
                    side.m
                );
            }
        }
    }
}

#[test]
fn bad_input_and_budget() {
    let w = Work::unlimited();
    assert_eq!(
        cube_isogeny_descent(&int(0), &w).unwrap_err().kind(),
        &ErrorKind::Singular
    );
    let huge = Integer::from(1u64 << 63);
    assert_eq!(
        cube_isogeny_descent(&huge, &w).unwrap_err().kind(),
        &ErrorKind::TooLarge
    );
    let spent = Work::until(Some(std::time::Instant::now()), None);
    assert_eq!(
        cube_isogeny_descent(&int(9279), &spent).unwrap_err().kind(),
        &ErrorKind::Budget
    );
    let flag = Arc::new(AtomicBool::new(true));
    let cancelled = Work::until(None, Some(flag));
    assert_eq!(
        cube_isogeny_descent(&int(9279), &cancelled)
            .unwrap_err()
            .kind(),
        &ErrorKind::Budget
    );
    // a point off the curve is refused
    let desc = descend(2);
    assert_eq!(
        desc.own
            .delta(&Point::from_ints(1, 1), &FactorLimits::default())
            .unwrap_err()
            .kind(),
        &ErrorKind::InvalidValue
    );
    assert_eq!(
        locally_soluble(&[int(1), int(0), int(0), int(1)], &int(0), 5, &w)
            .unwrap_err()
            .kind(),
        &ErrorKind::InvalidValue
    );
}

#[test]
fn local_solubility_by_hand() {
    let w = Work::unlimited();
    // u^3 + 2 v^3 = 3 z^3... worked by hand: over Q_2, (u, v, z) = (1, 1, 1) is a point
    assert!(locally_soluble(&[int(1), int(0), int(0), int(2)], &int(3), 2, &w).unwrap());
    // u^3 + 7 v^3 = 49 z^3... no wait: Selmer's 3u^3 + 4v^3 = 5 z^3 is everywhere locally soluble
    // (Selmer 1951; Cassels, Lectures on Elliptic Curves, §18, from memory)
    for p in [2u64, 3, 5, 7, 11, 13, 19, 31, 37] {
        assert!(
            locally_soluble(&[int(3), int(0), int(0), int(4)], &int(5), p, &w).unwrap(),
            "p = {p}"
        );
    }
    // u^3 + 2 v^3 = 7 z^3... over Q_7: the cubes mod 7 are 0, +-1, so u^3 + 2 v^3 = 0 mod 7
    // forces u = v = 0 mod 7, then 7 | z, and the descent repeats: no point (by hand)
    assert!(!locally_soluble(&[int(1), int(0), int(0), int(2)], &int(7), 7, &w).unwrap());
    // 3-adic: u^3 + v^3 = 3 z^3 ... hmm u = -v gives u^3 + v^3 = 0 = 3 * 0: (1, -1, 0) is a point
    assert!(locally_soluble(&[int(1), int(0), int(0), int(1)], &int(3), 3, &w).unwrap());
    // u^3 + 3 v^3 = 2 z^3 has no 3-adic point? u^3 = 2 z^3 mod 3 -> u = -z mod 3 (cubes mod 9 are 0, +-1)
    // u^3 - 2 z^3 = -3 v^3: u = -z + 3t: (-z)^3 (1 ...) by hand: u^3 + z^3 ... skipped, checked against brute force below
}

/// Brute force over `(u, v, z)` mod `p^n`, primitive, of `F(u, v) - c z^3 = 0
/// mod p^n`, against the search (a necessary condition: if the search says
/// soluble, every level `n` has a primitive solution).
#[test]
fn local_solubility_against_brute_force() {
    let w = Work::unlimited();
    let forms: Vec<([i64; 4], i64)> = vec![
        ([1, 0, 0, 2], 7),
        ([3, 0, 0, 4], 5),
        ([1, 0, 0, 3], 2),
        ([1, 1, 0, 2], 9),
        ([2, 0, 3, 1], 27),
        ([1, 0, 0, 9], 4),
        ([5, 0, 0, 1], 3),
        ([1, 3, 0, 3], 2),
        ([7, 0, 0, 2], 49),
        ([1, -3, 0, 1], 6),
    ];
    for (f, c) in forms {
        let form = [int(f[0]), int(f[1]), int(f[2]), int(f[3])];
        for p in [2u64, 3, 5, 7] {
            let sol = locally_soluble(&form, &int(c), p, &w).unwrap();
            // brute force mod p^n with n = 3 (4 at p = 2, 3)
            let n = if p <= 3 { 4 } else { 3 };
            let q = p.pow(n) as i64;
            let mut found = false;
            'outer: for u in 0..q {
                for v in 0..q {
                    for z in 0..q {
                        if (u % p as i64 == 0) && (v % p as i64 == 0) && (z % p as i64 == 0) {
                            continue;
                        }
                        let val = f[0] * u * u * u
                            + f[1] * u * u * v
                            + f[2] * u * v * v
                            + f[3] * v * v * v
                            - c * z * z * z;
                        if val.rem_euclid(q) == 0 {
                            found = true;
                            break 'outer;
                        }
                    }
                }
            }
            if sol {
                assert!(
                    found,
                    "{f:?} = {c} z^3 at p = {p}: soluble, but no solution mod p^{n}"
                );
            }
            if !found {
                assert!(!sol);
            }
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(200))]
    /// The polynomial walk (p != 3) against the residue tree at every class:
    /// the two searches of the same classes must agree on random forms.
    #[test]
    fn the_chart_walk_agrees_with_the_residue_tree(
        f in proptest::array::uniform4(-60i64..=60),
        c in prop_oneof![1i64..=60, -60i64..=-1],
        pi in 0usize..6,
        scale in 0u32..3,
    ) {
        let p = [2u64, 5, 7, 13, 19, 31][pi];
        let form = [int(f[0]) * int(p as i64).pow(u64::from(scale)), int(f[1]), int(f[2]) * int(p as i64), int(f[3])];
        let cov = CubicCovering { form: form.clone(), c: int(c), x_form: [int(0), int(0), int(0)], y_form: [int(0), int(0), int(0), int(0)], y_shift: int(0) };
        prop_assume!(cov.form_discriminant() != 0u32);
        let w = Work::unlimited();
        let walk = locally_soluble(&form, &int(c), p, &w).unwrap();
        let tree = locally_soluble_by(&form, &int(c), p, &w, ChartRoute::TreeOnly).unwrap();
        prop_assert_eq!(walk, tree, "{:?} = {} z^3 at {}", form, c, p);
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(24))]
    /// delta is a homomorphism: delta(aP + bQ) = a delta(P) + b delta(Q) in F3.
    #[test]
    fn the_descent_map_is_a_homomorphism(pick in 0usize..6, a in -3i64..=3, b in -3i64..=3) {
        // curves with two small points (found by the search below)
        let ks = [-11i64, 15, 17, 24, 37, -26];
        let k = ks[pick];
        let kk = int(k);
        let e = side_curve(&kk).unwrap();
        let desc = descend(k);
        let limits = FactorLimits::default();
        let pts = small_points(&kk, 100);
        prop_assume!(pts.len() >= 2);
        let (p, q) = (&pts[0], &pts[pts.len() - 1]);
        let r = e.add(&e.multiple(p, a), &e.multiple(q, b));
        let dp = desc.own.delta(p, &limits).unwrap();
        let dq = desc.own.delta(q, &limits).unwrap();
        let dr = desc.own.delta(&r, &limits).unwrap();
        let want: Vec<u8> = dp.iter().zip(&dq).map(|(x, y)| ((a.rem_euclid(3) as u8) * x + (b.rem_euclid(3) as u8) * y) % 3).collect();
        prop_assert_eq!(dr, want);
        // and on the dual side through phi
        let (pp, qq, rr) = (phi(&kk, p), phi(&kk, q), phi(&kk, &r));
        let dp = desc.dual.delta(&pp, &limits).unwrap();
        let dq = desc.dual.delta(&qq, &limits).unwrap();
        let dr = desc.dual.delta(&rr, &limits).unwrap();
        let want: Vec<u8> = dp.iter().zip(&dq).map(|(x, y)| ((a.rem_euclid(3) as u8) * x + (b.rem_euclid(3) as u8) * y) % 3).collect();
        prop_assert_eq!(dr, want);
    }
}

#[test]
#[ignore = "probe: the descent alone on every sixth-power-free |k| <= 2000, with timings"]
fn descent_alone_probe() {
    let start = std::time::Instant::now();
    let (mut n, mut worst, mut worst_k, mut grh) = (0usize, 0f64, 0i64, 0usize);
    let mut by_bound = [0usize; 8];
    for k in -2000i64..=2000 {
        if k == 0 || !sixth_power_free(k) {
            continue;
        }
        let t = std::time::Instant::now();
        let desc = descend(k);
        let s = t.elapsed().as_secs_f64();
        if s > worst {
            worst = s;
            worst_k = k;
        }
        n += 1;
        grh += usize::from(desc.conditional_on_grh);
        by_bound[desc.rank_bound.min(7)] += 1;
    }
    let t = std::time::Instant::now();
    let d = descend(9279);
    eprintln!(
        "{n} curves in {:.1} s (slowest k = {worst_k}: {worst:.3} s); bounds 0..7: {by_bound:?}; GRH-conditional {grh}; k = 9279: {:.3} s, bound {}",
        start.elapsed().as_secs_f64(),
        t.elapsed().as_secs_f64(),
        d.rank_bound
    );
}

#[test]
fn pell_units_and_balancing() {
    let q = |a: i64, b: i64| QuadElt {
        a: Rational::from(a),
        b: Rational::from(b),
    };
    // least solutions of x^2 - d y^2 = +-1 (checked by hand: 1 - 2 = -1, 4 - 5 = -1)
    assert_eq!(pell_unit(&int(2), 100), Some(q(1, 1)));
    assert_eq!(pell_unit(&int(5), 100), Some(q(2, 1)));
    // Q(sqrt 1031): the lead's fundamental unit (Z[sqrt 1031] is the maximal order)
    assert_eq!(
        pell_unit(&int(1031), 10_000),
        Some(q(651737448664200, 20297537082877))
    );
    // (2 + sqrt 2)(1 + sqrt 2)^7 balanced: same norm, the unit part removed up to a cube
    let eta = q(1, 1);
    let mut x = q(2, 1);
    for _ in 0..7 {
        x = x.mul(&eta, &int(2));
    }
    let y = balance(&x, &int(2), &eta);
    // the norm up to sign (eta^3 has norm -1, a cube)
    let (ny, nx) = (y.norm(&int(2)), x.norm(&int(2)));
    assert!(ny == nx || ny == -nx.clone());
    assert!(y.b.clone() * y.b.clone() < Rational::from(100), "{y:?}");
    // x / y is a cube in Q(sqrt 2)
    let conj = QuadElt {
        a: y.a.clone(),
        b: -y.b.clone(),
    };
    let t = x.mul(&conj, &int(2));
    let n = y.norm(&int(2));
    let ratio = QuadElt {
        a: t.a / &n,
        b: t.b / &n,
    };
    assert!(cube_root_in_field(&ratio, &int(2)).is_some());
}
