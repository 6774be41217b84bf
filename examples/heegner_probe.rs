//! Runs the Heegner point route on curves read from a table file
//! (conductor, class, a1..a6, rank, ...) and prints timings: a developer's
//! probe, not part of the API.
use malachite::Natural;
use std::time::Instant;
use twofold::heegner::{point_of_rank_one, HeegnerOptions};
use twofold::Curve;

fn main() {
    let args: Vec<String> = std::env::args().collect();
    if args.get(1).map(String::as_str) == Some("--saturate") {
        // --saturate a1,a2,a3,a4,a6 x y [seconds]: the saturation of one
        // point of the minimal model, with the note of each step
        let c: Vec<i64> = args[2].split(',').map(|x| x.trim().parse().unwrap()).collect();
        let e = Curve::from_coefficients([c[0], c[1], c[2], c[3], c[4]]).unwrap();
        let w = twofold::Work::unlimited();
        let d = twofold::CurveData::new(&e, &w).unwrap();
        let q = |s: &str| -> malachite::Rational { s.parse().unwrap() };
        let p = twofold::Point::Affine(q(&args[3]), q(&args[4]));
        let secs: u64 = args.get(5).map_or(600, |s| s.parse().unwrap());
        let o = twofold::heights::SaturationOptions::default()
            .with_deadline(Instant::now() + std::time::Duration::from_secs(secs));
        if let Some(list) = args.get(6) {
            // a list of primes p to test alone, with aux bound args[7]
            let maxq: u64 = args.get(7).map_or(20_000, |s| s.parse().unwrap());
            let tors = twofold::TorsionGroup::compute(d.minimal(), d.bad_primes());
            println!("torsion order {}", tors.order());
            for pp in list.split(',').map(|x| x.parse::<u64>().unwrap()) {
                let t = Instant::now();
                let ok = twofold::heights::is_p_saturated(d.minimal(), d.local(), &[p.clone()], pp, maxq).unwrap();
                println!("p = {pp}: {ok} ({:?})", t.elapsed());
            }
            return;
        }
        let t = Instant::now();
        let b = twofold::heights::mordell_weil_basis_of(&d, &[p], 128, &o).unwrap();
        println!("{:?}: {:?}\n{}", t.elapsed(), b.generators, b.saturation.note);
        println!("bound {:?} proven {:?} unproven {:?} untested above {:?}", b.saturation.index_bound, b.saturation.proven.len(), b.saturation.unproven, b.saturation.untested_above);
        return;
    }
    if args.get(1).map(String::as_str) == Some("--class") {
        // --class a1,a2,a3,a4,a6: the odd-degree isogeny class (the public
        // one; the Heegner route also walks 2-isogenies) with each
        // member's c4, torsion, Tamagawa product, real period and the
        // height bound (the generator heights scale as 1 / (Omega c T^-2))
        let c: Vec<i64> = args[2].split(',').map(|x| x.trim().parse().unwrap()).collect();
        let e = Curve::from_coefficients([c[0], c[1], c[2], c[3], c[4]]).unwrap();
        let w = twofold::Work::unlimited();
        let d = twofold::CurveData::new(&e, &w).unwrap();
        let t = Instant::now();
        let class = twofold::isogeny::odd_isogeny_class(d.minimal(), d.bad_primes()).unwrap();
        println!("class of {} members in {:?}", class.curves.len(), t.elapsed());
        for (i, m) in class.curves.iter().enumerate() {
            let md = twofold::CurveData::with_known_primes(m, d.bad_primes()).unwrap();
            let tors = twofold::TorsionGroup::compute(md.minimal(), md.bad_primes()).order();
            let tam: u64 = md.local().iter().map(|l| u64::from(l.tamagawa)).product();
            let omega = twofold::heights::PeriodLattice::compute(md.minimal(), 64).unwrap().real_period_f64();
            let ratio = (tors * tors) as f64 / (omega * tam as f64);
            println!(
                "{i}: {m} deg {:?} c4 {} T {tors} c {tam} Omega {omega:.6} T^2/(Omega c) {ratio:.6} slack {:.2}",
                class.degree(0, i),
                m.c4(),
                twofold::heights::height_difference_bound(md.minimal())
            );
        }
        return;
    }
    if args.get(1).map(String::as_str) == Some("--curve") {
        // --curve a1,a2,a3,a4,a6 [seconds] [no-twist]
        let c: Vec<i64> = args[2].split(',').map(|x| x.trim().parse().unwrap()).collect();
        let e = Curve::from_coefficients([c[0], c[1], c[2], c[3], c[4]]).unwrap();
        let (m, n, _) = twofold::rootno::minimal_conductor_sign(&e).unwrap();
        let secs: u64 = args.get(3).map_or(60, |s| s.parse().unwrap());
        let mut opts = HeegnerOptions::default();
        opts.time_limit = Some(std::time::Duration::from_secs(secs));
        opts.use_twist = args.get(4).map(String::as_str) != Some("no-twist");
        opts.use_isogeny_class = args.get(5).map(String::as_str) != Some("no-class");
        let t = Instant::now();
        match point_of_rank_one(&m, &n, &opts) {
            Ok(Some(r)) => println!(
                "N={n}: D={} h={} bits={} terms={} m={} k={} index={:?} height={:.6} pred={:.6} {:?} via {:?} [{}]\n{:?}",
                r.discriminant, r.class_number, r.precision, r.terms, r.multiplier, r.divisor, r.index, r.height, r.predicted_height, t.elapsed(),
                r.isogenous_curve.as_ref().map(|(c, d)| format!("{c} degree {d}")), r.saturation, r.generator
            ),
            other => println!("N={n}: {other:?} {:?}", t.elapsed()),
        }
        return;
    }
    let path = &args[1];
    let lo: u64 = args.get(2).map_or(0, |s| s.parse().unwrap());
    let hi: u64 = args.get(3).map_or(u64::MAX, |s| s.parse().unwrap());
    let max: usize = args.get(4).map_or(usize::MAX, |s| s.parse().unwrap());
    let text = std::fs::read_to_string(path).unwrap();
    let mut done = 0;
    for line in text.lines().filter(|l| !l.starts_with('#')) {
        let f: Vec<&str> = line.split('\t').collect();
        let n: u64 = f[0].parse().unwrap();
        if n < lo || n > hi || f[7] != "1" {
            continue;
        }
        let c = [2, 3, 4, 5, 6].map(|i| f[i].parse::<i64>().unwrap());
        let e = Curve::from_coefficients(c).unwrap();
        let t = Instant::now();
        let mut opts = HeegnerOptions::default();
        opts.time_limit = Some(std::time::Duration::from_secs(20));
        let r = point_of_rank_one(&e, &Natural::from(n), &opts);
        match r {
            Ok(Some(r)) => println!(
                "{n} {c:?}: D={} h={} bits={} terms={} m={} index={:?} height={:.6} pred={:.6} {:?} [{}]",
                r.discriminant, r.class_number, r.precision, r.terms, r.multiplier, r.index, r.height, r.predicted_height, t.elapsed(), r.saturation
            ),
            other => println!("{n} {c:?}: {other:?} {:?}", t.elapsed()),
        }
        done += 1;
        if done >= max {
            break;
        }
    }
}
