//! Periods, canonical heights, regulators and saturation.
mod common;

use malachite::Natural;
use twofold::heights::{canonical_height, float_to_f64, PeriodLattice};
use twofold::local::bad_primes_data;
use twofold::{Curve, Point};

fn curve(a: [i64; 5], primes: &[u32]) -> (Curve, Vec<twofold::local::LocalData>) {
    let e = Curve::from_ainvs(a).unwrap();
    let ps: Vec<Natural> = primes.iter().map(|&p| Natural::from(p)).collect();
    let local = bad_primes_data(&e, &ps).unwrap();
    (e, local)
}

#[test]
fn real_periods_37a1_11a1() {
    // 37a1: real period 5.98691729 (from memory); two real components.
    let e = Curve::from_ainvs([0, 0, 1, -1, 0]).unwrap();
    let l = PeriodLattice::compute(&e, 128).unwrap();
    println!("37a1 {} {} {}", float_to_f64(&l.omega1), float_to_f64(&l.omega2_re), float_to_f64(&l.omega2_im));
    assert!((l.real_period_f64() - 5.98691729).abs() < 1e-7);
    // 11a1: real period 1.26920930 (from memory); one real component.
    let e = Curve::from_ainvs([0, -1, 1, -10, -20]).unwrap();
    let l = PeriodLattice::compute(&e, 128).unwrap();
    println!("11a1 {} {} {}", float_to_f64(&l.omega1), float_to_f64(&l.omega2_re), float_to_f64(&l.omega2_im));
    assert!((l.real_period_f64() - 1.26920930).abs() < 1e-7);
}

#[test]
fn height_37a1() {
    let (e, local) = curve([0, 0, 1, -1, 0], &[37]);
    let h = canonical_height(&e, &local, &Point::from_ints(0, 0), 128).unwrap();
    println!("h = {}", float_to_f64(&h));
    // 0.0511114082 (from memory)
    assert!((float_to_f64(&h) - 0.0511114082).abs() < 1e-9);
}
