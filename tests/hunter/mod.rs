//! Shared pieces of the enumerations of cubic fields by Hunter's theorem
//! (Cohen GTM 138, Theorem 6.4.2) in tests/numfield_cubic.rs and
//! tests/numfield_real.rs: the discriminant of `t^3 + p t^2 + q t + r`, the
//! test for an integer root, and one polynomial kept per field.

use std::collections::HashMap;

/// The discriminant of `t^3 + p t^2 + q t + r`.
pub fn poly_disc(p: i128, q: i128, r: i128) -> i128 {
    p * p * q * q - 4 * q.pow(3) - 4 * p.pow(3) * r - 27 * r * r + 18 * p * q * r
}

/// Whether `t^3 + p t^2 + q t + r` has an integer root (a root divides `r`).
pub fn has_integer_root(p: i64, q: i64, r: i64) -> bool {
    r == 0 || (1..=r.abs()).any(|x| r % x == 0 && [x, -x].iter().any(|&x| x * x * x + p * x * x + q * x + r == 0))
}

/// Keeps one polynomial per field: fields are told apart by their
/// discriminant and by the number of roots of the polynomial modulo each
/// prime below 400 not dividing the polynomial's discriminant (the number
/// of degree-one primes above it, an invariant of the field), so a
/// polynomial of a field met before agrees with it at every prime good for
/// both.
pub struct FieldSieve {
    primes: Vec<i64>,
    seen: HashMap<i64, Vec<(Vec<Option<usize>>, usize)>>,
    count: usize,
}

impl FieldSieve {
    pub fn new() -> Self {
        let primes = (3..400).filter(|&p| (2..p).take_while(|d| d * d <= p).all(|d| p % d != 0)).collect();
        FieldSieve { primes, seen: HashMap::new(), count: 0 }
    }

    /// Whether the field of `t^3 + p t^2 + q t + r` (polynomial discriminant
    /// `pd`, field discriminant `d`) is new; it is recorded if so.
    #[allow(dead_code)]
    pub fn is_new(&mut self, d: i64, pqr: (i64, i64, i64), pd: i128) -> bool {
        self.field_of(d, pqr, pd).1
    }

    /// The field of `t^3 + p t^2 + q t + r` as a number (0, 1, 2, ... in
    /// the order first met) and whether it is new; recorded if so.
    #[allow(dead_code)]
    pub fn field_of(&mut self, d: i64, (p, q, r): (i64, i64, i64), pd: i128) -> (usize, bool) {
        let sig: Vec<Option<usize>> = self
            .primes
            .iter()
            .map(|&l| (pd % l as i128 != 0).then(|| (0..l).filter(|x| (x * x % l * x + p.rem_euclid(l) * x % l * x + q.rem_euclid(l) * x + r.rem_euclid(l)) % l == 0).count()))
            .collect();
        let same = |other: &Vec<Option<usize>>| sig.iter().zip(other).all(|(a, b)| a.is_none() || b.is_none() || a == b);
        let known = self.seen.entry(d).or_default();
        if let Some((_, id)) = known.iter().find(|(s, _)| same(s)) {
            return (*id, false);
        }
        let id = self.count;
        self.count += 1;
        known.push((sig, id));
        (id, true)
    }
}
