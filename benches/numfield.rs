//! Class group and units, and K(S,2), of cubic fields `x^3 + a x + b` of
//! growing discriminant (coefficients chosen at random, invented data). The
//! issue's targets are discriminants 10^10 to 10^40 (10^20 under 0.1 s,
//! 10^30 under 1 s, 10^40 under 10 s); README says which are met. Set
//! `NUMFIELD_BENCH_LARGE=1` to add the class group at the larger
//! discriminants (slow).

use criterion::{criterion_group, criterion_main, Criterion};
use malachite::Integer;
use twofold::numfield::{ClassGroupOptions, NumberField};

fn field(a: &str, b: &str) -> NumberField {
    let f: Vec<Integer> = vec![b.parse().unwrap(), a.parse().unwrap(), Integer::from(0), Integer::from(1)];
    NumberField::new(&f).unwrap()
}

fn bench(c: &mut Criterion) {
    let mut g = c.benchmark_group("numfield_class_group");
    g.sample_size(10);
    // (a, b) -> field discriminant: (1, -1) -> -31, (10, 13) -> -8563,
    // (31, -57) -> -206887, (1234, 56789) -> -94591067683 (about 10^11),
    // (123457, 9876541) -> about -1.0e16, (2345678, 1234567891) -> about -9.3e19
    for (a, b) in [("1", "-1"), ("10", "13"), ("31", "-57"), ("1234", "56789"), ("123457", "9876541"), ("2345678", "1234567891")] {
        let k = field(a, b);
        let name = format!("disc {}", k.discriminant());
        g.bench_function(&name, |bch| bch.iter(|| k.class_group(&ClassGroupOptions::default()).unwrap()));
    }
    if std::env::var_os("NUMFIELD_BENCH_LARGE").is_some() {
        // about -4.5e25 (h = 36), -1.0e28 (h = 2), -1.4e30 (h = 2), -2.1e41
        // (h = 2; several seconds per run, README)
        for (a, b) in [("98765431", "1234567890123"), ("7654321987", "987654321012345"), ("6300000001", "123456789012347"), ("1234567890121", "87654321098765432101")] {
            let k = field(a, b);
            let name = format!("disc {}", k.discriminant());
            g.bench_function(&name, |bch| bch.iter(|| k.class_group(&ClassGroupOptions::default()).unwrap()));
        }
    }
    g.bench_function("maximal order x^3 - 10^12 + 1", |bch| {
        let f: Vec<Integer> = vec![Integer::from(-999_999_999_999i64), Integer::from(0), Integer::from(0), Integer::from(1)];
        bch.iter(|| NumberField::new(&f).unwrap())
    });
    g.finish();
    // K(S,2), S = the primes above 2, at discriminants about 10^10, 10^15, 10^20, 10^25
    let mut g = c.benchmark_group("numfield_square_classes");
    g.sample_size(10);
    for (a, b) in [("1234", "56789"), ("123457", "9876541"), ("2345678", "1234567891"), ("98765431", "1234567890123")] {
        let k = field(a, b);
        let name = format!("disc {}", k.discriminant());
        g.bench_function(&name, |bch| bch.iter(|| k.square_classes(&[2], &ClassGroupOptions::default()).unwrap()));
    }
    g.finish();
    if std::env::var_os("NUMFIELD_BENCH_LARGE").is_some() {
        // K(S,2) with the whole S of a descent: the field X^3 + 16 a X + 64 b of
        // y^2 = x^3 + a x + b, a = 1234567890121, b = 8765432109876543211 (invented,
        // field discriminant about -2.1e39), S = 2, 3 and the primes of
        // 4 a^3 + 27 b^2 = 17 47 47599 96589 3288319 9384591833 18366300437
        let mut g = c.benchmark_group("numfield_square_classes_descent");
        g.sample_size(10);
        let f = vec![Integer::from(560_987_655_032_098_765_504i128), Integer::from(19_753_086_241_936i64), Integer::from(0), Integer::from(1)];
        let k = NumberField::new(&f).unwrap();
        let s = [2u64, 3, 17, 47, 47599, 96589, 3288319, 9384591833, 18366300437];
        g.bench_function("40-digit field, full S", |bch| bch.iter(|| k.square_classes(&s, &ClassGroupOptions::default()).unwrap()));
        g.finish();
    }
}

criterion_group!(benches, bench);
criterion_main!(benches);
