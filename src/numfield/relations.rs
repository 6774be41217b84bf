//! The inner loop of the relation search: norm forms of reduced ideal
//! bases evaluated in machine words, and trial division of the norms over
//! the small primes, so that a field element is built only for the rare
//! candidates whose norm is smooth.
//!
//! For a Z-basis `b_1, ..., b_n` of an ideal `I`, the norm
//! `N(c_1 b_1 + ... + c_n b_n)` is a form of degree `n` in the `c_i`.
//! With `M_i` the matrix of multiplication by `b_i`, the rows of
//! `M(c) = sum c_i M_i` are linear in `c`, so by multilinearity of the
//! determinant in the rows its coefficients are the mixed determinants
//! `det(M_i row 0, M_j row 1, M_k row 2)` (Cohen GTM 138, §4.3: the norm
//! is the determinant of the multiplication map).

use super::field::{Element, NumberField};
use super::ideal::PrimeIdeal;
use super::linalg::mod_word;
use crate::arith::{is_prime_u64, mul_mod, primes_up_to};
use crate::{Error, ErrorKind};
use malachite::base::num::basic::traits::Zero;
use malachite::base::num::conversion::traits::RoundingFrom;
use malachite::base::rounding_modes::RoundingMode;
use malachite::{Integer, Rational};
use std::collections::{HashMap, HashSet};

/// The norm form of an ideal basis, coefficients in `i128`.
pub(crate) struct NormForm {
    n: usize,
    /// monomials as exponent-free index triples `i <= j <= k` (unused
    /// slots `usize::MAX` for degree 2), with their coefficients
    terms: Vec<([usize; 3], i128)>,
    /// `sum |coef|`, for the overflow bound
    weight: f64,
}

fn det_rows(rows: &[&[Integer]]) -> Integer {
    match rows.len() {
        2 => &rows[0][0] * &rows[1][1] - &rows[0][1] * &rows[1][0],
        3 => {
            let (a, b, c) = (rows[0], rows[1], rows[2]);
            &a[0] * (&b[1] * &c[2] - &b[2] * &c[1]) - &a[1] * (&b[0] * &c[2] - &b[2] * &c[0])
                + &a[2] * (&b[0] * &c[1] - &b[1] * &c[0])
        }
        _ => Integer::from(0),
    }
}

impl NormForm {
    /// The norm form of `basis` (integral elements); `None` when a
    /// coefficient does not fit in 100 bits.
    pub(crate) fn new(k: &NumberField, basis: &[Element]) -> Option<NormForm> {
        let n = k.n;
        let mats: Vec<Vec<Vec<Integer>>> = basis.iter().map(|b| k.mult_matrix(b)).collect();
        let limit = Integer::from(1u128 << 100);
        let mut terms = Vec::new();
        let mut weight = 0.0;
        let mut push = |idx: [usize; 3], v: Integer| -> Option<()> {
            if v == 0 {
                return Some(());
            }
            if v >= limit || v <= -&limit {
                return None;
            }
            let c = i128::try_from(&v).ok()?;
            weight += (c as f64).abs();
            terms.push((idx, c));
            Some(())
        };
        if n == 2 {
            for i in 0..2 {
                for j in i..2 {
                    let mut s = det_rows(&[&mats[i][0], &mats[j][1]]);
                    if i != j {
                        s += det_rows(&[&mats[j][0], &mats[i][1]]);
                    }
                    push([i, j, usize::MAX], s)?;
                }
            }
        } else if n == 3 {
            for i in 0..3 {
                for j in i..3 {
                    for l in j..3 {
                        // sum over the distinct orderings of the multiset {i, j, l}
                        let mut perms: Vec<[usize; 3]> = vec![
                            [i, j, l],
                            [i, l, j],
                            [j, i, l],
                            [j, l, i],
                            [l, i, j],
                            [l, j, i],
                        ];
                        perms.sort_unstable();
                        perms.dedup();
                        let mut s = Integer::from(0);
                        for p in perms {
                            s += det_rows(&[&mats[p[0]][0], &mats[p[1]][1], &mats[p[2]][2]]);
                        }
                        push([i, j, l], s)?;
                    }
                }
            }
        } else {
            return None;
        }
        Some(NormForm { n, terms, weight })
    }

    /// Whether every value with `|c_i| <= h` fits in `i128`.
    pub(crate) fn fits(&self, h: i64) -> bool {
        self.weight * (h as f64).powi(self.n as i32) < 2f64.powi(125)
    }

    /// `N(sum c_i b_i)` (the caller has checked [`NormForm::fits`]).
    #[inline]
    pub(crate) fn eval(&self, c: &[i64]) -> i128 {
        let mut s = 0i128;
        for &(idx, coef) in &self.terms {
            let m = if self.n == 2 {
                c[idx[0]] as i128 * c[idx[1]] as i128
            } else {
                c[idx[0]] as i128 * c[idx[1]] as i128 * c[idx[2]] as i128
            };
            s += coef * m;
        }
        s
    }
}

/// Divides out the primes of `primes` from `v`; returns the cofactor, or
/// `None` as soon as the cofactor cannot become smaller than `cap` (an
/// early abort after the first quarter of the primes when the remaining
/// part is still beyond `cap` times the square of the largest prime).
#[cfg(test)]
#[inline]
pub(crate) fn trial_divide(mut v: u128, primes: &[u64], cap: u128) -> u128 {
    let quarter = primes.len() / 4;
    for (i, &p) in primes.iter().enumerate() {
        if v <= u64::MAX as u128 {
            let mut w = v as u64;
            for &q in &primes[i..] {
                if w < q.saturating_mul(q) {
                    // w is 1 or a prime; a prime of the list divides out too
                    // (the list is increasing, as the factor base is built)
                    if w >= q && primes[i..].binary_search(&w).is_ok() {
                        w = 1;
                    }
                    break;
                }
                while w.is_multiple_of(q) {
                    w /= q;
                }
            }
            // what remains is 1, a prime (below the square of the last prime tried) or a composite of large primes
            return w as u128;
        }
        let pp = p as u128;
        while v % pp == 0 {
            v /= pp;
        }
        if i == quarter && v > cap.saturating_mul(1 << 40) {
            return v;
        }
    }
    v
}

/// The trial divisors of `trial_divide` with precomputed data for
/// division-free divisibility tests (T. Granlund and P. L. Montgomery,
/// "Division by invariant integers using multiplication", PLDI 1994, §9:
/// for odd `p`, `p | w` iff `w * p^-1 mod 2^64 <= (2^64 - 1) / p`, and the
/// product is then the quotient).
pub(crate) struct Divisors {
    primes: Vec<u64>,
    /// `p^-1 mod 2^64`, `(2^64 - 1) / p`, `2^64 mod p` (zero for `p = 2`)
    data: Vec<(u64, u64, u64)>,
}

impl Divisors {
    /// The divisors from an increasing list of primes (below 2^32).
    pub(crate) fn new(primes: &[u64]) -> Divisors {
        let data = primes
            .iter()
            .map(|&p| {
                if p == 2 {
                    return (0, 0, 0);
                }
                let mut x = p; // correct to 3 bits; each Newton step doubles
                for _ in 0..5 {
                    x = x.wrapping_mul(2u64.wrapping_sub(p.wrapping_mul(x)));
                }
                (x, u64::MAX / p, ((u64::MAX % p) + 1) % p)
            })
            .collect();
        Divisors {
            primes: primes.to_vec(),
            data,
        }
    }

    /// As `trial_divide` (same result), without hardware division in the
    /// inner loop.
    #[inline]
    pub(crate) fn cofactor(&self, mut v: u128, cap: u128) -> u128 {
        if v == 0 {
            return 0;
        }
        let primes = &self.primes;
        let quarter = primes.len() / 4;
        let mut i = 0;
        if primes.first() == Some(&2) {
            v >>= v.trailing_zeros();
            i = 1;
        }
        while i < primes.len() {
            if v <= u64::MAX as u128 {
                let mut w = v as u64;
                for j in i..primes.len() {
                    let q = primes[j];
                    if w < q.saturating_mul(q) {
                        if w >= q && primes[j..].binary_search(&w).is_ok() {
                            w = 1;
                        }
                        break;
                    }
                    let (inv, lim, _) = self.data[j];
                    loop {
                        let t = w.wrapping_mul(inv);
                        if t > lim {
                            break;
                        }
                        w = t;
                    }
                }
                return w as u128;
            }
            let p = primes[i];
            let (_, _, r64) = self.data[i];
            loop {
                let r = ((((v >> 64) as u64 % p) as u128 * r64 as u128 + (v as u64 % p) as u128)
                    % p as u128) as u64;
                if r != 0 {
                    break;
                }
                v /= p as u128;
            }
            if i == quarter && v > cap.saturating_mul(1 << 40) {
                return v;
            }
            i += 1;
        }
        v
    }
}

/// `log |x|` for an integer (f64).
pub(crate) fn ln_abs(x: &Integer) -> f64 {
    let f = f64::rounding_from(x, RoundingMode::Nearest).0.abs();
    if f.is_finite() {
        f.ln()
    } else {
        f64::INFINITY
    }
}

/// The defining polynomial's coefficients as `i128` (`None` when one does
/// not fit), for the line sieves.
fn poly_i128(k: &NumberField) -> Option<Vec<i128>> {
    k.poly.iter().map(|c| i128::try_from(c).ok()).collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use malachite::Rational;

    #[test]
    fn norm_form_agrees_with_determinant() {
        // the form evaluated at small points equals the norm of the element (two ways)
        for f in [
            vec![-1i64, -1, 0, 1],
            vec![7, 3, 0, 1],
            vec![-5, 0, 1],
            vec![13, -4, 2, 1],
            vec![1, 0, 1],
        ] {
            let fz: Vec<Integer> = f.iter().map(|&c| Integer::from(c)).collect();
            let k = NumberField::new(&fz).unwrap();
            let id = k.primes_above(7).unwrap()[0].ideal.clone();
            let basis = k.reduced_basis(&id);
            let nf = NormForm::new(&k, &basis).unwrap();
            assert!(nf.fits(5));
            let n = k.n;
            for code in 0..5i64.pow(n as u32) {
                let mut c = Vec::new();
                let mut t = code;
                for _ in 0..n {
                    c.push(t % 5 - 2);
                    t /= 5;
                }
                let mut a = k.rational(&Rational::from(0));
                for (ci, bi) in c.iter().zip(&basis) {
                    a = k.add(&a, &k.mul(&k.rational(&Rational::from(*ci)), bi));
                }
                assert_eq!(Rational::from(nf.eval(&c)), k.norm(&a), "{f:?} {c:?}");
            }
        }
    }

    #[test]
    fn line_norm_agrees_with_the_field_norm() {
        // two ways: the homogenised polynomial against the norm of a + b theta in the field
        for f in [
            vec![-1i64, -1, 0, 1],
            vec![7, 3, 0, 1],
            vec![-5, 0, 1],
            vec![13, -4, 2, 1],
            vec![1, 0, 1],
            vec![-1, -2, 1, 1],
        ] {
            let fz: Vec<Integer> = f.iter().map(|&c| Integer::from(c)).collect();
            let k = NumberField::new(&fz).unwrap();
            let coeffs: Vec<i128> = f.iter().map(|&c| c as i128).collect();
            for a in -7i64..=7 {
                for b in -3i64..=3 {
                    let e = k.add(
                        &k.rational(&Rational::from(a)),
                        &k.mul(&k.rational(&Rational::from(b)), &k.generator()),
                    );
                    assert_eq!(
                        Rational::from(line_norm(&coeffs, a as i128, b as i128).unwrap()),
                        k.norm(&e),
                        "{f:?} {a} {b}"
                    );
                }
            }
        }
        assert_eq!(line_norm(&[1, 0, 0, 1], i128::MAX / 2, 1), None);
    }

    #[test]
    fn division_free_trial_division_agrees() {
        // two ways: the multiply-and-compare divisibility test against plain division
        let primes = primes_up_to(3000);
        let d = Divisors::new(&primes);
        let mut s = 99u64;
        let mut rnd = || {
            s ^= s << 13;
            s ^= s >> 7;
            s ^= s << 17;
            s
        };
        for round in 0..20_000 {
            // smooth parts times a random cofactor, sizes from 2^10 to 2^120
            let mut v: u128 = 1 + (rnd() % 1000) as u128;
            let bits = 10 + round % 110;
            while 128 - v.leading_zeros() < bits as u32 {
                let p = primes[(rnd() % primes.len() as u64) as usize] as u128;
                v = v.saturating_mul(if rnd() % 5 == 0 {
                    (rnd() % 100_000) as u128 + 1
                } else {
                    p
                });
            }
            let cap = 1u128 << (rnd() % 40);
            assert_eq!(
                d.cofactor(v, cap),
                trial_divide(v, &primes, cap),
                "{v} {cap}"
            );
        }
    }

    #[test]
    fn trial_division_cofactors() {
        let primes = [2u64, 3, 5, 7, 11, 13];
        assert_eq!(trial_divide(2 * 2 * 3 * 13 * 13, &primes, 1), 1);
        assert_eq!(trial_divide(2 * 3 * 101, &primes, 1000), 101);
        let big: u128 = (1u128 << 70) * 3 * 5;
        assert_eq!(trial_divide(big, &primes, 1), 1);
        assert_eq!(
            trial_divide((1u128 << 70) * 1_000_003, &primes, 1 << 30),
            1_000_003
        );
    }
}

/// A relation found by [`RelationSearch`]: an element (as a product of the
/// stored elements), its valuations on the factor-base columns, its
/// logarithmic embedding and a bound on the f64 error of the latter.
pub(crate) struct Found {
    pub(crate) exps: Vec<(usize, i64)>,
    pub(crate) v: Vec<i64>,
    pub(crate) logs: Vec<f64>,
    pub(crate) err: f64,
}

/// A prime ideal named by its rational prime and its place in
/// [`NumberField::primes_above`].
type Key = (u64, usize);

/// The state of the relation search over a factor base of prime ideals of
/// norm at most `b0` (the columns, with the prime ideals of `S` added), and
/// the verification that every prime ideal of norm up to the generation
/// bound has its class in the subgroup generated by the columns.
pub(crate) struct RelationSearch<'a> {
    k: &'a NumberField,
    /// The columns: prime ideals of norm at most `b0`, then those of `S`.
    pub(crate) fb: Vec<PrimeIdeal>,
    /// How many columns have norm at most `b0`.
    pub(crate) fb0_len: usize,
    b0: u64,
    gen_bound: u64,
    small: Vec<u64>,
    divisors: Divisors,
    above: HashMap<u64, Vec<PrimeIdeal>>,
    /// Primes whose list in `above` holds only the degree-one primes (the
    /// others have norm beyond the generation bound).
    incomplete: HashSet<u64>,
    /// Primes whose list in `above` was built by the Hermite-free
    /// construction (`p` prime to `disc(f)`, every listed prime of degree one).
    light: HashSet<u64>,
    /// Primes whose full decomposition is wanted (those of `S`).
    full: HashSet<u64>,
    col: HashMap<Key, usize>,
    keys: Vec<Key>,
    verified: HashSet<Key>,
    partial: HashMap<Key, (Vec<(usize, i64)>, Vec<i64>, Vec<f64>, f64, i64)>,
    /// The elements of all relations (full and partial), indexed by `Found::exps`.
    pub(crate) elems: Vec<Element>,
    /// Their logarithmic embeddings and error bounds.
    pub(crate) table: Vec<(Vec<f64>, f64)>,
    seen: HashSet<Element>,
    state: u64,
    /// Per degree-one prime ideal: the root `r` with `theta - r` in it
    /// (`None`: no such root, no line search there).
    line_roots: HashMap<Key, Option<u64>>,
    /// Per prime ideal: where its line search goes on (`b`, index of `a`).
    line_pos: HashMap<Key, (i64, i64)>,
    /// Skip coefficient vectors with a common factor and `-a` of a known
    /// `a` (the kernel route: such relations only add roots of unity to
    /// its kernel; the echelon route finds units among them).
    pub(crate) primitive_only: bool,
    /// A first targeted round at a column stops its line scan after this
    /// many relations (all it meets when `usize::MAX`, the default; later
    /// attempts at the same column always collect all).
    pub(crate) targeted_enough: usize,
    /// The elements `a + b theta` by which the sieve verified prime ideals.
    line_witnesses: HashMap<Key, (i64, i64)>,
}

enum Goal {
    /// full relations over the columns (and partial ones with one ideal outside)
    Collect,
    /// one relation with `v_P = 1` and every other ideal a column or verified
    Verify(Key),
}

impl<'a> RelationSearch<'a> {
    pub(crate) fn new(
        k: &'a NumberField,
        b0: u64,
        gen_bound: u64,
        extra_primes: &[u64],
        stop: &dyn Fn() -> bool,
    ) -> Result<RelationSearch<'a>, Error> {
        let mut s = RelationSearch {
            k,
            fb: Vec::new(),
            fb0_len: 0,
            b0,
            gen_bound,
            small: primes_up_to(b0),
            divisors: Divisors::new(&primes_up_to(b0)),
            above: HashMap::new(),
            incomplete: HashSet::new(),
            light: HashSet::new(),
            full: extra_primes.iter().copied().collect(),
            col: HashMap::new(),
            keys: Vec::new(),
            verified: HashSet::new(),
            partial: HashMap::new(),
            elems: Vec::new(),
            table: Vec::new(),
            seen: HashSet::new(),
            state: 0x2545f4914f6cdd1d,
            line_roots: HashMap::new(),
            line_pos: HashMap::new(),
            primitive_only: false,
            targeted_enough: usize::MAX,
            line_witnesses: HashMap::new(),
        };
        let mut base: Vec<(u128, Key)> = Vec::new();
        for p in s.small.clone() {
            if stop() {
                return Err(Error::new(
                    ErrorKind::Budget,
                    "class group: budget exhausted while building the factor base",
                ));
            }
            for (i, q) in s.ideals(p)?.iter().enumerate() {
                if q.norm() <= b0 as u128 {
                    base.push((q.norm(), (p, i)));
                }
            }
        }
        base.sort();
        for (_, key) in base {
            s.push_column(key);
        }
        s.fb0_len = s.fb.len();
        for &p in extra_primes {
            for i in 0..s.ideals(p)?.len() {
                if !s.col.contains_key(&(p, i)) {
                    s.push_column((p, i));
                }
            }
        }
        Ok(s)
    }

    fn push_column(&mut self, key: Key) {
        let q = self.above[&key.0][key.1].clone();
        self.col.insert(key, self.fb.len());
        self.keys.push(key);
        self.verified.insert(key);
        self.fb.push(q);
    }

    fn ideals(&mut self, p: u64) -> Result<&Vec<PrimeIdeal>, Error> {
        if !self.above.contains_key(&p) {
            // beyond sqrt(bound) only degree-one primes can matter: built cheaply
            let light = if (p as u128) * (p as u128) > self.gen_bound.max(self.b0) as u128
                && !self.full.contains(&p)
            {
                self.k.primes_above_degree_one(p)?
            } else {
                None
            };
            let v = match light {
                Some((v, complete)) => {
                    self.light.insert(p);
                    if !complete {
                        self.incomplete.insert(p);
                    }
                    v
                }
                None => self.k.primes_above(p)?,
            };
            self.above.insert(p, v);
        }
        Ok(&self.above[&p])
    }

    /// The relation given by a rational prime `p` whose prime ideals are
    /// all columns: `(p) = prod P^e`. `None` when one of them is not.
    pub(crate) fn free_relation(&mut self, p: u64) -> Result<Option<Found>, Error> {
        let e: Vec<i64> = self.ideals(p)?.iter().map(|q| i64::from(q.e)).collect();
        if self.incomplete.contains(&p) {
            return Ok(None);
        }
        let mut v = vec![0i64; self.fb.len()];
        for (i, ei) in e.iter().enumerate() {
            match self.col.get(&(p, i)) {
                Some(&j) => v[j] = *ei,
                None => return Ok(None),
            }
        }
        let a = self.k.rational(&Rational::from(p));
        if !self.seen.insert(a.clone()) {
            return Ok(None);
        }
        let (idx, logs, err) = self.store(a);
        Ok(Some(Found {
            exps: vec![(idx, 1)],
            v,
            logs,
            err,
        }))
    }

    /// The rational primes below the columns, increasing.
    pub(crate) fn column_primes(&self) -> Vec<u64> {
        let mut ps: Vec<u64> = self.keys.iter().map(|k| k.0).collect();
        ps.sort_unstable();
        ps.dedup();
        ps
    }

    /// A pseudo-random number below `m` (xorshift).
    pub(crate) fn rnd(&mut self, m: u64) -> u64 {
        self.state ^= self.state << 13;
        self.state ^= self.state >> 7;
        self.state ^= self.state << 17;
        self.state % m.max(1)
    }

    /// One round of the relation search, numbered from 1: checks the
    /// budget and the round limit (`what` names the caller in the errors),
    /// then reduces one ideal (a factor-base prime times a random product,
    /// the search widening as rounds pass without completion) and leaves
    /// the relations found in `found` (cleared first).
    pub(crate) fn round(
        &mut self,
        round: usize,
        max_rounds: usize,
        stop: &dyn Fn() -> bool,
        what: &str,
        found: &mut Vec<Found>,
    ) -> Result<(), Error> {
        if stop() {
            return Err(Error::new(
                ErrorKind::Budget,
                format!("{what}: budget exhausted"),
            ));
        }
        if round > max_rounds {
            return Err(Error::new(
                ErrorKind::Budget,
                format!("{what}: too many rounds of relation search"),
            ));
        }
        let kfb = self.fb.len();
        let widen = round / (4 * kfb + 4);
        let first = if round == 1 {
            None
        } else {
            Some((round - 2) % kfb)
        };
        let span = if round == 1 {
            3
        } else if self.k.n == 2 {
            4 + widen.min(4) as i64
        } else {
            2 + widen.min(2) as i64
        };
        let extra_factors = if round <= kfb + 1 {
            0
        } else {
            1 + self.rnd(2 + widen.min(3) as u64) as usize
        };
        found.clear();
        self.search_ideal(
            first,
            extra_factors,
            (8 + 4 * widen).min(self.fb0_len),
            span,
            found,
        )
    }

    /// One round aimed at the column `col` (a column no relation has
    /// reached yet, numbered from 0): reduces `fb[col]` times up to two
    /// random small columns, the box widening with `attempt` (counted from
    /// 1), and leaves the relations found in `found` (cleared first).
    pub(crate) fn targeted_round(
        &mut self,
        col: usize,
        attempt: usize,
        stop: &dyn Fn() -> bool,
        what: &str,
        found: &mut Vec<Found>,
    ) -> Result<(), Error> {
        if stop() {
            return Err(Error::new(
                ErrorKind::Budget,
                format!("{what}: budget exhausted"),
            ));
        }
        found.clear();
        let key = self.keys[col];
        let enough = if attempt <= 1 {
            self.targeted_enough
        } else {
            usize::MAX
        };
        self.line_scan(key, LINE_CAP, enough, &Goal::Collect, found)?;
        if !found.is_empty() {
            return Ok(());
        }
        let extra = self.rnd(3) as usize;
        let span = if self.k.n == 2 {
            4 + (attempt / 2).min(4) as i64
        } else {
            2 + (attempt / 3).min(2) as i64
        };
        self.search_ideal(Some(col), extra, 16.min(self.fb0_len), span, found)
    }

    /// Reduces the ideal `fb[first] * (extra random base primes among the
    /// first `pool`)` and tests the small combinations of its reduced basis.
    pub(crate) fn search_ideal(
        &mut self,
        first: Option<usize>,
        extra: usize,
        pool: usize,
        span: i64,
        out: &mut Vec<Found>,
    ) -> Result<(), Error> {
        let mut factors: Vec<Key> = Vec::new();
        if let Some(f) = first {
            factors.push(self.keys[f]);
        }
        for _ in 0..extra {
            let j = self.rnd(pool.max(1).min(self.fb0_len.max(1)) as u64) as usize;
            if j < self.keys.len() {
                factors.push(self.keys[j]);
            }
        }
        self.scan(&factors, span, &Goal::Collect, out)?;
        Ok(())
    }

    /// Scans the small elements of the product of `factors`; returns
    /// whether the goal was met (for [`Goal::Verify`]).
    fn scan(
        &mut self,
        factors: &[Key],
        span: i64,
        goal: &Goal,
        out: &mut Vec<Found>,
    ) -> Result<bool, Error> {
        let k = self.k;
        let mut ideal = k.unit_ideal();
        let mut ideal_primes: Vec<u64> = Vec::new();
        for key in factors {
            ideal = k.ideal_product(&ideal, &self.above[&key.0][key.1].ideal)?;
            ideal_primes.push(key.0);
        }
        ideal_primes.sort_unstable();
        ideal_primes.dedup();
        let Ok(norm_i) = u128::try_from(&ideal.num_norm()) else {
            return Ok(false);
        };
        let basis = k.reduced_basis(&ideal);
        let Some(form) = NormForm::new(k, &basis) else {
            return Ok(false);
        };
        if !form.fits(span) {
            return Ok(false);
        }
        let n = k.n;
        let width = 2 * span + 1;
        let total = width.pow(n as u32);
        let mut c = vec![0i64; n];
        for code in 0..total {
            let mut t = code;
            for ci in c.iter_mut() {
                *ci = t % width - span;
                t /= width;
            }
            // first non-zero coordinate positive (a and -a give one relation)
            match c.iter().find(|&&x| x != 0) {
                Some(&x) if x > 0 => {}
                _ => continue,
            }
            // primitive vectors only (kernel route): g (c / g) is the
            // relation of c / g times the rational g, nothing new
            if self.primitive_only
                && c.iter()
                    .fold(0u64, |g, &x| crate::arith::gcd_u64(g, x.unsigned_abs()))
                    != 1
            {
                continue;
            }
            let val = form.eval(&c).unsigned_abs();
            if val == 0 || val % norm_i != 0 {
                continue;
            }
            let v = val / norm_i;
            let cof = self.divisors.cofactor(v, self.gen_bound as u128);
            if cof != 1 && (cof > self.gen_bound as u128 || !is_prime_u64(cof as u64)) {
                continue;
            }
            // a smooth candidate: build it and find its prime ideals
            let mut a = k.rational(&Rational::ZERO);
            for (ci, bi) in c.iter().zip(&basis) {
                if *ci != 0 {
                    a = k.add(&a, &k.mul(&k.rational(&Rational::from(*ci)), bi));
                }
            }
            if self.take(a, val, v, cof, &ideal_primes, goal, out)? {
                return Ok(true);
            }
        }
        Ok(false)
    }

    /// The root `r` of `f` mod `p` with `theta - r` in the prime ideal
    /// `key`, when it is of degree one (cached).
    fn line_root(&mut self, key: Key) -> Result<Option<u64>, Error> {
        if let Some(r) = self.line_roots.get(&key) {
            return Ok(*r);
        }
        let k = self.k;
        let p = key.0;
        self.ideals(p)?;
        let q = self.above[&p][key.1].clone();
        let mut found = None;
        if q.f == 1 && p < (1 << 40) {
            let fp: Vec<u64> = k.poly.iter().map(|c| mod_word(c, p)).collect();
            for r in super::fp::roots(&fp, p) {
                let t = k.add(&k.generator(), &k.rational(&Rational::from(-(r as i64))));
                if k.valuation(&t, &q)? > 0 {
                    found = Some(r);
                    break;
                }
            }
        }
        self.line_roots.insert(key, found);
        Ok(found)
    }

    /// The line search of the number field sieve's relation collection
    /// (A. K. Lenstra, H. W. Lenstra, M. S. Manasse, J. M. Pollard, "The
    /// number field sieve", 1990, §4, without the sieve): elements
    /// `a + b theta` of the degree-one prime ideal `key` (those with
    /// `a + b r = 0 mod p`), `b = 1, 2, ...`, `|a| <= s b` for `s` the size
    /// of the roots of `f`, coprime `a, b`; the norm `(-b)^n f(-a/b)` in
    /// checked `i128` (up to its sign). Goes on where the last call for `key` stopped, at
    /// most `cap` candidates. Where the reduced ideal bases are too skewed
    /// for [`RelationSearch::scan`] (a short `1` and long other vectors:
    /// fields with a root of `f` small beside `sqrt|d|`), these elements
    /// still have norms about `s^n`. Collecting, it stops once `out` holds
    /// `enough` relations. Whether the goal was met.
    fn line_scan(
        &mut self,
        key: Key,
        cap: usize,
        enough: usize,
        goal: &Goal,
        out: &mut Vec<Found>,
    ) -> Result<bool, Error> {
        let k = self.k;
        let Some(r) = self.line_root(key)? else {
            return Ok(false);
        };
        let p = key.0;
        let Some(coeffs) = poly_i128(k) else {
            return Ok(false);
        };
        let n = k.n;
        // the root size: max |c_i|^(1 / (n - i)), at least 1
        let size = (0..n)
            .map(|i| (coeffs[i] as f64).abs().powf(1.0 / (n - i) as f64))
            .fold(1.0f64, f64::max)
            .ceil();
        if size > 1e15 {
            return Ok(false);
        }
        let s = size as i64;
        let (mut b, mut j) = self.line_pos.get(&key).copied().unwrap_or((1, 0));
        let theta = k.generator();
        let mut tried = 0usize;
        while tried < cap {
            // a = a0 + (j + lo) p in [-s b, s b], a0 = -b r mod p
            let a0 = (p as i128 - (b as i128 * r as i128) % p as i128) % p as i128;
            let lo = (-(s as i128) * b as i128 - a0).div_euclid(p as i128) + 1;
            let count = (2 * s as i128 * b as i128) / p as i128 + 1;
            if j as i128 >= count || b > 1 << 20 {
                b += 1;
                j = 0;
                continue;
            }
            let a = a0 + (lo + j as i128) * p as i128;
            j += 1;
            tried += 1;
            if crate::arith::gcd_u64(a.unsigned_abs() as u64, b as u64) != 1 {
                continue;
            }
            let Some(norm) = line_norm(&coeffs, a, b as i128) else {
                continue;
            };
            let val = norm.unsigned_abs();
            if val == 0 || val % p as u128 != 0 {
                continue;
            }
            let v = val / p as u128;
            let cof = self.divisors.cofactor(v, self.gen_bound as u128);
            if cof != 1 && (cof > self.gen_bound as u128 || !is_prime_u64(cof as u64)) {
                continue;
            }
            let Ok(ai) = i64::try_from(a) else { continue };
            let elem = k.add(
                &k.rational(&Rational::from(ai)),
                &k.mul(&k.rational(&Rational::from(b)), &theta),
            );
            if self.take(elem, val, v, cof, &[p], goal, out)? {
                self.line_pos.insert(key, (b, j));
                return Ok(true);
            }
            if matches!(goal, Goal::Collect) && out.len() >= enough {
                // enough relations through this ideal for one round (the
                // next round goes on from here)
                break;
            }
        }
        self.line_pos.insert(key, (b, j));
        Ok(false)
    }

    /// A candidate `a` whose norm `val` (`v` after the ideal's norm) has
    /// the cofactor `cof` after trial division: its valuations, then
    /// [`RelationSearch::accept`]; whether the goal was met.
    #[allow(clippy::too_many_arguments)]
    fn take(
        &mut self,
        a: Element,
        val: u128,
        v: u128,
        cof: u128,
        ideal_primes: &[u64],
        goal: &Goal,
        out: &mut Vec<Found>,
    ) -> Result<bool, Error> {
        let k = self.k;
        // a and -a are one relation (their quotient is a root of unity;
        // kernel route only, the others keep their old behaviour)
        if self.primitive_only
            && self
                .seen
                .contains(&k.mul(&k.rational(&Rational::from(-1)), &a))
        {
            return Ok(false);
        }
        if !self.seen.insert(a.clone()) {
            return Ok(false);
        }
        match self.valuations_of(&a, val, v, cof, ideal_primes)? {
            Some(vals) => Ok(self.accept(a, vals, goal, out)),
            None => Ok(false),
        }
    }

    /// The valuations of the integral element `a` of norm `+-val` (`v`
    /// after the ideal's norm, `cof` the cofactor after trial division,
    /// `ideal_primes` the rational primes known to divide it) at every
    /// prime ideal dividing it; `None` when a listed prime decomposition
    /// does not account for the whole power of `p` in the norm.
    fn valuations_of(
        &mut self,
        a: &Element,
        val: u128,
        v: u128,
        cof: u128,
        ideal_primes: &[u64],
    ) -> Result<Option<Vec<(Key, i64)>>, Error> {
        let k = self.k;
        let mut hit: Vec<u64> = self
            .small
            .iter()
            .copied()
            .filter(|&p| v % p as u128 == 0)
            .collect();
        hit.extend(ideal_primes);
        if cof > 1 {
            hit.push(cof as u64);
        }
        hit.sort_unstable();
        hit.dedup();
        let mut vals: Vec<(Key, i64)> = Vec::new();
        let mut accounted = true;
        for p in hit {
            let m = self.ideals(p)?.len();
            let mut vp = 0u32;
            let mut t = val;
            while t % p as u128 == 0 {
                t /= p as u128;
                vp += 1;
            }
            let mut sum_ef = 0u32;
            if vp == 1 && self.light.contains(&p) {
                // p exactly once in the norm: the one degree-one prime
                // (p, theta - r) with a(r) = 0 mod p has valuation 1
                // (read off the Hermite rows: a(r) = a_0 - sum_i a_i h_i0)
                for i in 0..m {
                    let h = self.above[&p][i].ideal.hnf();
                    let mut acc = mod_word(&a.coords()[0], p);
                    for j in 1..k.n {
                        let t = mul_mod(mod_word(&a.coords()[j], p), mod_word(&h[j][0], p), p);
                        acc = (acc + p - t) % p;
                    }
                    if acc == 0 {
                        vals.push(((p, i), 1));
                        sum_ef += 1;
                        break;
                    }
                }
            } else {
                for i in 0..m {
                    let e = k.valuation(a, &self.above[&p][i])?;
                    if e != 0 {
                        vals.push(((p, i), e));
                        sum_ef += e.unsigned_abs() as u32 * self.above[&p][i].f;
                    }
                }
            }
            // the listed primes must account for all of p in the norm
            // (a prime of higher degree left out of a short list is not)
            if sum_ef != vp {
                accounted = false;
            }
        }
        Ok(if accounted { Some(vals) } else { None })
    }

    fn store(&mut self, a: Element) -> (usize, Vec<f64>, f64) {
        let logs = self.k.log_embedding(&a);
        let err = 1e-14 * (1.0 + logs.iter().map(|x| x.abs()).fold(0.0, f64::max));
        self.elems.push(a);
        self.table.push((logs.clone(), err));
        (self.elems.len() - 1, logs, err)
    }

    fn accept(
        &mut self,
        a: Element,
        vals: Vec<(Key, i64)>,
        goal: &Goal,
        out: &mut Vec<Found>,
    ) -> bool {
        let kfb = self.fb.len();
        let mut v = vec![0i64; kfb];
        let mut extras: Vec<(Key, i64)> = Vec::new();
        for (key, e) in vals {
            match self.col.get(&key) {
                Some(&j) => v[j] = e,
                None => extras.push((key, e)),
            }
        }
        match goal {
            Goal::Verify(target) => {
                let ok = extras.iter().all(|(key, e)| {
                    if key == target {
                        *e == 1
                    } else {
                        self.verified.contains(key)
                    }
                }) && extras.iter().any(|(key, _)| key == target);
                if ok {
                    self.verified.insert(*target);
                }
                ok
            }
            Goal::Collect => {
                if extras.is_empty() {
                    let (idx, logs, err) = self.store(a);
                    out.push(Found {
                        exps: vec![(idx, 1)],
                        v,
                        logs,
                        err,
                    });
                    return false;
                }
                if extras.len() != 1 || extras[0].1.abs() != 1 {
                    return false;
                }
                let (key, e) = extras[0];
                if self.above[&key.0][key.1].norm() > self.gen_bound as u128 {
                    return false;
                }
                self.verified.insert(key);
                let (idx, logs, err) = self.store(a);
                if let Some((pexps, pv, plogs, perr, pe)) = self.partial.get(&key) {
                    // a times prev^(-e pe): the ideal outside the base cancels
                    let c = -e * pe;
                    let mut exps = vec![(idx, 1)];
                    exps.extend(pexps.iter().map(|&(i, x)| (i, x * c)));
                    let v2: Vec<i64> = v.iter().zip(pv).map(|(x, y)| x + c * y).collect();
                    let logs2: Vec<f64> = logs
                        .iter()
                        .zip(plogs)
                        .map(|(x, y)| x + c as f64 * y)
                        .collect();
                    out.push(Found {
                        exps,
                        v: v2,
                        logs: logs2,
                        err: err + perr,
                    });
                } else {
                    self.partial.insert(key, (vec![(idx, 1)], v, logs, err, e));
                }
                false
            }
        }
    }

    /// Shows that every prime ideal of norm in `(b0, gen_bound]` lies in the
    /// subgroup generated by the columns: in increasing order of norm, a
    /// relation `(a) = P Q_1^e_1 ...` with every `Q_i` a column or an ideal
    /// shown before. Ends with [`ErrorKind::Budget`] when `stop` says so or
    /// a prime resists.
    pub(crate) fn verify_all(&mut self, stop: &dyn Fn() -> bool) -> Result<(), Error> {
        let mut todo: Vec<(u128, Key)> = Vec::new();
        for p in primes_up_to(self.gen_bound) {
            if stop() {
                return Err(Error::new(
                    ErrorKind::Budget,
                    "class group: budget exhausted while listing the primes up to the bound",
                ));
            }
            let m = self.ideals(p)?.len();
            for i in 0..m {
                let nq = self.above[&p][i].norm();
                if nq > self.b0 as u128
                    && nq <= self.gen_bound as u128
                    && !self.verified.contains(&(p, i))
                {
                    todo.push((nq, (p, i)));
                }
            }
        }
        todo.sort();
        self.sieve_verify(&todo, stop)?;
        let mut out = Vec::new();
        for (_, key) in todo {
            if self.verified.contains(&key) {
                continue;
            }
            if self.implied_by_the_others(key) {
                self.verified.insert(key);
                continue;
            }
            let mut done = false;
            for attempt in 0..VERIFY_ATTEMPTS {
                if stop() {
                    return Err(Error::new(
                        ErrorKind::Budget,
                        "class group: budget exhausted while checking the primes up to the bound",
                    ));
                }
                let mut factors = vec![key];
                for _ in 0..(attempt % 3) {
                    let j = self.rnd(self.fb0_len.clamp(1, 12) as u64) as usize;
                    factors.push(self.keys[j]);
                }
                if attempt % 8 == 4
                    && self.line_scan(key, LINE_CAP, usize::MAX, &Goal::Verify(key), &mut out)?
                {
                    done = true;
                    break;
                }
                let span = if self.k.n == 2 {
                    6
                } else {
                    2 + (attempt as i64 / 8).min(1)
                };
                if self.scan(&factors, span, &Goal::Verify(key), &mut out)? {
                    done = true;
                    break;
                }
            }
            if !done {
                return Err(Error::new(
                    ErrorKind::Budget,
                    format!(
                        "class group: no relation found for a prime ideal above {}",
                        key.0
                    ),
                ));
            }
        }
        Ok(())
    }
}

/// A degree-one prime ideal in the line sieve: `a + b theta` lies in it
/// iff `a + b r = 0 mod p`.
#[derive(Clone, Copy)]
struct SievePrime {
    p: u32,
    r: u32,
    /// `round(log2 p)`
    logp: u8,
    /// Index into the sieve's key list (`u32::MAX` for columns).
    idx: u32,
}

/// A smooth `a + b theta` kept by the sieve: the rational primes above
/// `b0` dividing its norm and, once computed, its valuations (empty when
/// the listed decompositions do not account for the norm).
struct Kept {
    a: i64,
    b: i64,
    large: Vec<u64>,
    vals: Option<Vec<(Key, i64)>>,
}

/// A smooth `a + b theta` from [`LineSieve::line`]: `a`, and the
/// non-column prime ideals dividing it (key indices, at most four).
struct Smooth {
    a: i64,
    hits: [u32; 4],
    count: u8,
}

/// A log sieve over the lines `a + b theta`, `|a| <= half`, for a monic
/// cubic `f` with word-sized coefficients, with buffers kept between lines
/// (no allocation per line once they have grown).
struct LineSieve {
    sp: Vec<SievePrime>,
    coeffs: Vec<i128>,
    fcoef: Vec<f64>,
    half: i64,
    len: usize,
    sieve: Vec<u8>,
    bucket: Vec<BucketHit>,
    slot: Vec<u32>,
    cands: Vec<(u32, i64)>,
    hits: Vec<(u32, u32)>,
    /// the rational prime of each non-column key index
    idx_prime: Vec<u128>,
}

impl LineSieve {
    /// The sieve for the prime ideals `sp`; the half-width gives a box of
    /// area about `SIEVE_AREA` times `bound` balanced by the root size of
    /// `f` (`|a|` about `b` times the roots).
    fn new(sp: Vec<SievePrime>, coeffs: Vec<i128>, bound: u64) -> LineSieve {
        let n = coeffs.len() - 1;
        let size = (0..n)
            .map(|i| (coeffs[i] as f64).abs().powf(1.0 / (n - i) as f64))
            .fold(1.0f64, f64::max);
        let half = (SIEVE_AREA * bound as f64 * size)
            .sqrt()
            .max(4.0 * size)
            .clamp(4096.0, (1u64 << 21) as f64) as i64;
        let len = (2 * half + 1) as usize;
        let fcoef = coeffs.iter().map(|&c| c as f64).collect();
        let mut idx_prime = Vec::new();
        for q in &sp {
            if q.idx != u32::MAX {
                if idx_prime.len() <= q.idx as usize {
                    idx_prime.resize(q.idx as usize + 1, 1);
                }
                idx_prime[q.idx as usize] = q.p as u128;
            }
        }
        LineSieve {
            idx_prime,
            sp,
            coeffs,
            fcoef,
            half,
            len,
            sieve: vec![0u8; len],
            bucket: Vec::with_capacity(len),
            slot: vec![u32::MAX; len],
            cands: Vec::with_capacity(1024),
            hits: Vec::with_capacity(1024),
        }
    }

    /// Sieves the line `b` and appends to `out` the coprime `a` with `a + b
    /// theta` smooth: its norm, after the sieved non-column primes (at most
    /// four distinct ideals) are divided out, has no prime factor beyond
    /// `divisors`. `skip` sees the non-column ideals of a candidate before
    /// its exact check and may drop it.
    fn line(
        &mut self,
        b: i64,
        divisors: &Divisors,
        skip: &dyn Fn(&[u32]) -> bool,
        out: &mut Vec<Smooth>,
    ) {
        let n = self.coeffs.len() - 1;
        let (half, len) = (self.half, self.len);
        self.sieve.fill(0);
        self.bucket.clear();
        for q in &self.sp {
            let p = q.p as u64;
            let start = ((half as u64 % p) + p - (b as u64 % p) * q.r as u64 % p) % p;
            let mut i = start as usize;
            if q.idx == u32::MAX {
                while i < len {
                    self.sieve[i] = self.sieve[i].saturating_add(q.logp);
                    i += p as usize;
                }
            } else {
                while i < len {
                    self.sieve[i] = self.sieve[i].saturating_add(q.logp);
                    self.bucket.push((i as u32, q.idx));
                    i += p as usize;
                }
            }
        }
        // N(a + b theta) = sum_i e_i a^i, e_i = (-1)^(n+i) c_i b^(n-i)
        let bf = b as f64;
        let mut e = [0f64; 4];
        for i in 0..=n {
            let sign = if (n + i).is_multiple_of(2) { 1.0 } else { -1.0 };
            e[i] = sign * self.fcoef[i] * bf.powi((n - i) as i32);
        }
        self.cands.clear();
        for (i, &sv) in self.sieve.iter().enumerate() {
            let a = i as f64 - half as f64;
            let v = ((e[3] * a + e[2]) * a + e[1]) * a + e[0];
            // floor(log2 |v|) from the exponent bits
            let lg = ((v.to_bits() >> 52) & 0x7ff) as i32 - 1023;
            if sv as i32 + SIEVE_SLACK >= lg {
                self.cands.push((i as u32, i as i64 - half));
            }
        }
        if self.cands.is_empty() {
            return;
        }
        for (ci, &(i, _)) in self.cands.iter().enumerate() {
            self.slot[i as usize] = ci as u32;
        }
        self.hits.clear();
        for &(i, idx) in &self.bucket {
            let c = self.slot[i as usize];
            if c != u32::MAX {
                self.hits.push((c, idx));
            }
        }
        for &(i, _) in &self.cands {
            self.slot[i as usize] = u32::MAX;
        }
        self.hits.sort_unstable();
        let mut h = 0;
        let mut ids = [0u32; 4];
        for (ci, &(_, a)) in self.cands.iter().enumerate() {
            let from = h;
            while h < self.hits.len() && self.hits[h].0 == ci as u32 {
                h += 1;
            }
            if h - from > 4 || crate::arith::gcd_u64(a.unsigned_abs(), b as u64) != 1 {
                continue;
            }
            for (j, &(_, idx)) in self.hits[from..h].iter().enumerate() {
                ids[j] = idx;
            }
            let count = h - from;
            if skip(&ids[..count]) {
                continue;
            }
            let Some(norm) = line_norm(&self.coeffs, a as i128, b as i128) else {
                continue;
            };
            let mut rest = norm.unsigned_abs();
            for &(_, idx) in &self.hits[from..h] {
                let p = self.idx_prime[idx as usize];
                while rest % p == 0 {
                    rest /= p;
                }
            }
            if divisors.cofactor(rest, 1) != 1 {
                continue;
            }
            out.push(Smooth {
                a,
                hits: ids,
                count: count as u8,
            });
        }
    }
}

/// Per rational prime, its degree-one prime ideals as (place above `p`, `r`).
type LineTable = HashMap<u64, Vec<(usize, u32)>>;

/// A sieve hit of a non-column prime ideal: position on the line and key index.
type BucketHit = (u32, u32);

impl RelationSearch<'_> {
    /// Per rational prime `p <= limit` not dividing the index of `Z[theta]`
    /// in the maximal order: the degree-one prime ideals above `p` as
    /// (place in the list above `p`, `r`) with `a + b theta` in the ideal
    /// iff `a + b r = 0 mod p`, read off their Hermite form `[p, 0, 0],
    /// [-w_i, .., 1, ..]` (the image of `x` in `O/P = F_p` is `x_0 - sum_i
    /// x_i h_i0`). Ideals of another shape are left out.
    fn line_table(&mut self, limit: u64) -> Result<Option<LineTable>, Error> {
        let k = self.k;
        let theta = k.generator();
        if *theta.den() != 1 {
            return Ok(None);
        }
        let mut table: LineTable = HashMap::new();
        let index = k.index();
        for p in primes_up_to(limit) {
            if p >= 1 << 31 || mod_word(&index, p) == 0 {
                continue;
            }
            let m = self.ideals(p)?.len();
            let mut list = Vec::new();
            for i in 0..m {
                let q = &self.above[&p][i];
                if q.f != 1 || !q.ideal.is_integral() {
                    continue;
                }
                let h = q.ideal.hnf();
                let shaped = h[0][0] == p
                    && h[0][1..].iter().all(|c| *c == 0)
                    && (1..k.n).all(|r| (1..k.n).all(|c| h[r][c] == u64::from(r == c)));
                if !shaped {
                    continue;
                }
                let mut acc = mod_word(&theta.coords()[0], p);
                for j in 1..k.n {
                    let t = mul_mod(mod_word(&theta.coords()[j], p), mod_word(&h[j][0], p), p);
                    acc = (acc + p - t) % p;
                }
                list.push((i, acc as u32));
            }
            table.insert(p, list);
        }
        Ok(Some(table))
    }

    /// The valuations of `a + b theta` (`gcd(a, b) = 1`, norm `+-val`,
    /// `large` the primes above `b0` dividing it, the rest smooth over the
    /// primes up to `b0`) from its norm alone. For `p` not dividing the
    /// index of `Z[theta]`, membership in `P = (p, g(theta))` is divisibility
    /// of `a + b x` by `g` mod `p` (Kummer-Dedekind): no ideal of degree 2
    /// or more contains `a + b theta`, two degree-one ideals would need `b
    /// (r_1 - r_2) = 0 mod p`, so one ideal `P` (the one with `r = -a/b`)
    /// carries all of `v_p(N) = sum_P f_P v_P` (the lemma behind the number
    /// field sieve, J. P. Buhler, H. W. Lenstra, C. Pomerance, "Factoring
    /// integers with the number field sieve", 1993). `None` when a prime of
    /// the norm is not in `table` or its ideal is missing there (then the
    /// exact valuations are needed).
    fn line_valuations(
        &self,
        a: i64,
        b: i64,
        val: u128,
        large: &[u64],
        table: &LineTable,
    ) -> Option<Vec<(Key, i64)>> {
        let mut rest = val;
        let mut out = Vec::new();
        let place = |p: u64, e: i64, out: &mut Vec<(Key, i64)>| -> Option<()> {
            let list = table.get(&p)?;
            let am = a.rem_euclid(p as i64) as u64;
            let bm = b.rem_euclid(p as i64) as u64;
            let &(i, _) = list
                .iter()
                .find(|&&(_, r)| (am + mul_mod(bm, r as u64, p)).is_multiple_of(p))?;
            out.push(((p, i), e));
            Some(())
        };
        for &p in large {
            let mut e = 0;
            while rest.is_multiple_of(p as u128) {
                rest /= p as u128;
                e += 1;
            }
            if e > 0 {
                place(p, e, &mut out)?;
            }
        }
        for &p in &self.small {
            if rest == 1 {
                break;
            }
            if (p as u128) * (p as u128) > rest {
                // what is left is a prime (at most b0: the caller's trial division)
                place(u64::try_from(rest).ok()?, 1, &mut out)?;
                rest = 1;
                break;
            }
            let mut e = 0;
            while rest.is_multiple_of(p as u128) {
                rest /= p as u128;
                e += 1;
            }
            if e > 0 {
                place(p, e, &mut out)?;
            }
        }
        (rest == 1).then_some(out)
    }

    /// The sieve's prime ideals (degree one, `5 <= p <=` the generation
    /// bound, from [`RelationSearch::line_table`]) and the keys of the
    /// non-column ones.
    fn sieve_primes(&self, table: &LineTable) -> (Vec<SievePrime>, Vec<Key>) {
        let mut ps: Vec<u64> = table.keys().copied().filter(|&p| p >= 5).collect();
        ps.sort_unstable();
        let mut sp = Vec::new();
        let mut keys = Vec::new();
        for p in ps {
            for &(i, r) in &table[&p] {
                let idx = if self.col.contains_key(&(p, i)) {
                    u32::MAX
                } else {
                    keys.push((p, i));
                    (keys.len() - 1) as u32
                };
                sp.push(SievePrime {
                    p: p as u32,
                    r,
                    logp: (p as f64).log2().round() as u8,
                    idx,
                });
            }
        }
        (sp, keys)
    }

    /// (p) = prod P^e: the last unverified prime ideal above p with e = 1
    /// is implied by the others when the list above p is complete.
    fn implied_by_the_others(&self, key: Key) -> bool {
        let (p, i) = key;
        !self.incomplete.contains(&p)
            && self.above[&p][i].e == 1
            && (0..self.above[&p].len()).all(|j| j == i || self.verified.contains(&(p, j)))
    }

    /// What both line sieves start from (cubic fields whose polynomial
    /// fits in `i128` and whose prime ideals up to the generation bound
    /// have a line table): the coefficients, the table, the sieve primes
    /// and their prime ideals; `None` where the sieve does not apply.
    fn line_setup(&mut self) -> Result<Option<LineSetup>, Error> {
        if self.k.n != 3 {
            return Ok(None);
        }
        let Some(coeffs) = poly_i128(self.k) else {
            return Ok(None);
        };
        let Some(table) = self.line_table(self.gen_bound)? else {
            return Ok(None);
        };
        let (primes, keys) = self.sieve_primes(&table);
        Ok(Some(LineSetup {
            coeffs,
            table,
            primes,
            keys,
        }))
    }

    /// Relations from the line sieve (cubic fields): smooth `a + b theta`
    /// over the columns, or with one prime ideal up to the generation bound
    /// outside them (paired as in [`RelationSearch::round`]), line after
    /// line until `want` relations are in `out` or the lines run out.
    pub(crate) fn sieve_collect(
        &mut self,
        want: usize,
        stop: &dyn Fn() -> bool,
        out: &mut Vec<Found>,
    ) -> Result<(), Error> {
        let k = self.k;
        let Some(LineSetup {
            coeffs,
            table,
            primes: sp,
            keys,
        }) = self.line_setup()?
        else {
            return Ok(());
        };
        let mut ls = LineSieve::new(sp, coeffs.clone(), self.b0);
        let theta = k.generator();
        let minus_one = k.rational(&Rational::from(-1));
        let mut smooth: Vec<Smooth> = Vec::with_capacity(1024);
        let skip = |hits: &[u32]| hits.len() > 1;
        for b in 1..=COLLECT_LINES {
            if out.len() >= want {
                break;
            }
            if stop() {
                return Err(Error::new(
                    ErrorKind::Budget,
                    "class group: budget exhausted",
                ));
            }
            ls.line(b, &self.divisors, &skip, &mut smooth);
            for c in smooth.drain(..) {
                let large: Vec<u64> = c.hits[..c.count as usize]
                    .iter()
                    .map(|&idx| keys[idx as usize].0)
                    .collect();
                let Some(norm) = line_norm(&coeffs, c.a as i128, b as i128) else {
                    continue;
                };
                let val = norm.unsigned_abs();
                let elem = k.add(
                    &k.rational(&Rational::from(c.a)),
                    &k.mul(&k.rational(&Rational::from(b)), &theta),
                );
                if self.primitive_only && self.seen.contains(&k.mul(&minus_one, &elem)) {
                    continue;
                }
                if !self.seen.insert(elem.clone()) {
                    continue;
                }
                let vals = match self.line_valuations(c.a, b, val, &large, &table) {
                    Some(v) => v,
                    None => match self.valuations_of(&elem, val, val, 1, &large)? {
                        Some(v) => v,
                        None => continue,
                    },
                };
                self.accept(elem, vals, &Goal::Collect, out);
                if out.len() >= want {
                    break;
                }
            }
        }
        Ok(())
    }

    /// The check of [`RelationSearch::verify_all`] for many prime ideals at
    /// once: a log sieve over the lines `a + b theta`, `|a| <= A`, `b = 1,
    /// 2, ...` with every degree-one prime ideal up to the generation bound
    /// (non-column hits kept in a bucket list). A position whose sieved
    /// logarithm reaches `log2 |N(a + b theta)|` up to a slack is factored
    /// exactly (the bucket's primes divided out, trial division over the
    /// primes up to `b0`); a smooth element is kept for the largest
    /// non-column prime ideal dividing it. After each line, the prime
    /// ideals are taken in increasing order and one is verified when a kept
    /// element has valuation 1 at it and every other prime ideal dividing
    /// it is a column or verified before (the exact valuations, as
    /// everywhere). The prime ideals left over go to the search per prime
    /// ideal; what is proven is the same.
    fn sieve_verify(&mut self, todo: &[(u128, Key)], stop: &dyn Fn() -> bool) -> Result<(), Error> {
        let k = self.k;
        if todo.len() < 16 {
            return Ok(());
        }
        let Some(LineSetup {
            coeffs,
            table,
            primes: sp,
            keys,
        }) = self.line_setup()?
        else {
            return Ok(());
        };
        let key_pos: HashMap<Key, u32> = keys
            .iter()
            .enumerate()
            .map(|(i, k)| (*k, i as u32))
            .collect();
        let mut ls = LineSieve::new(sp, coeffs.clone(), self.gen_bound);
        let max_lines = ((SIEVE_LINES_FACTOR * self.gen_bound as f64) / ls.len as f64)
            .ceil()
            .max(4.0) as i64;
        let mut smooth: Vec<Smooth> = Vec::with_capacity(1024);
        let theta = k.generator();
        // per key index: kept elements (a, b) and their valuations once computed
        let mut kept: HashMap<u32, Vec<Kept>> = HashMap::new();
        // the prime ideals the sieve can reach (degree one, in the table) not yet verified
        let mut left = todo
            .iter()
            .filter(|(_, key)| key_pos.contains_key(key) && !self.verified.contains(key))
            .count();
        for b in 1..=max_lines {
            if left == 0 {
                break;
            }
            if stop() {
                return Err(Error::new(
                    ErrorKind::Budget,
                    "class group: budget exhausted while checking the primes up to the bound",
                ));
            }
            // the largest non-column prime ideal must be one still to verify, with room for it
            let skip = |hits: &[u32]| {
                let Some(&top) = hits.iter().max_by_key(|&&idx| keys[idx as usize]) else {
                    return true;
                };
                self.verified.contains(&keys[top as usize])
                    || kept.get(&top).is_some_and(|v| v.len() >= SIEVE_KEEP)
            };
            ls.line(b, &self.divisors, &skip, &mut smooth);
            for c in smooth.drain(..) {
                let hits = &c.hits[..c.count as usize];
                let top = *hits
                    .iter()
                    .max_by_key(|&&idx| keys[idx as usize])
                    .unwrap_or(&0);
                let mut large: Vec<u64> = hits.iter().map(|&idx| keys[idx as usize].0).collect();
                large.sort_unstable();
                large.dedup();
                let list = kept.entry(top).or_default();
                if list.len() < SIEVE_KEEP {
                    list.push(Kept {
                        a: c.a,
                        b,
                        large,
                        vals: None,
                    });
                }
            }
            // the pass over the prime ideals, in increasing order
            for &(_, key) in todo {
                if self.verified.contains(&key) {
                    continue;
                }
                if self.implied_by_the_others(key) {
                    self.verified.insert(key);
                    if key_pos.contains_key(&key) {
                        left -= 1;
                    }
                    continue;
                }
                let Some(&idx) = key_pos.get(&key) else {
                    continue;
                };
                let Some(list) = kept.get_mut(&idx) else {
                    continue;
                };
                for rec in list.iter_mut() {
                    if rec.vals.is_none() {
                        rec.vals = self.line_valuations(
                            rec.a,
                            rec.b,
                            line_norm(&coeffs, rec.a as i128, rec.b as i128)
                                .map_or(0, i128::unsigned_abs),
                            &rec.large,
                            &table,
                        );
                    }
                    if rec.vals.is_none() {
                        // the exact valuations, once per kept element
                        let elem = k.add(
                            &k.rational(&Rational::from(rec.a)),
                            &k.mul(&k.rational(&Rational::from(rec.b)), &theta),
                        );
                        let Some(norm) = line_norm(&coeffs, rec.a as i128, rec.b as i128) else {
                            continue;
                        };
                        let val = norm.unsigned_abs();
                        rec.vals = Some(
                            self.valuations_of(&elem, val, val, 1, &rec.large)?
                                .unwrap_or_default(),
                        );
                    }
                    let vals = rec.vals.as_deref().unwrap_or(&[]);
                    let ok = vals.iter().any(|(q, _)| *q == key)
                        && vals.iter().all(|(q, ex)| {
                            if *q == key {
                                *ex == 1
                            } else {
                                self.col.contains_key(q) || self.verified.contains(q)
                            }
                        });
                    if ok {
                        self.verified.insert(key);
                        self.line_witnesses.insert(key, (rec.a, rec.b));
                        left -= 1;
                        break;
                    }
                }
                // elements without valuation 1 at the ideal never serve: make room for others
                list.retain(|rec| rec.vals.as_ref().is_none_or(|v| v.contains(&(key, 1))));
            }
        }
        Ok(())
    }
}

/// Sieve area per unit of the generation bound in [`RelationSearch::sieve_verify`].
const SIEVE_AREA: f64 = 16.0;
/// Positions sieved at most, per unit of the generation bound.
const SIEVE_LINES_FACTOR: f64 = 400.0;
/// Bits of the norm the sieve may miss (primes 2 and 3, prime powers, rounding).
const SIEVE_SLACK: i32 = 8;
/// Lines sieved at most for relations ([`RelationSearch::sieve_collect`]).
const COLLECT_LINES: i64 = 64;
/// Elements kept per prime ideal.
const SIEVE_KEEP: usize = 3;

/// The common start of the line sieves ([`RelationSearch::line_setup`]).
struct LineSetup {
    coeffs: Vec<i128>,
    table: LineTable,
    primes: Vec<SievePrime>,
    keys: Vec<Key>,
}

/// `N(a + b theta)` for `theta` a root of the monic `f` (coefficients
/// constant first): `(-b)^n f(-a/b) = (-1)^n sum c_i (-a)^i b^(n-i)`;
/// `None` on `i128` overflow.
pub(crate) fn line_norm(coeffs: &[i128], a: i128, b: i128) -> Option<i128> {
    let n = coeffs.len() - 1;
    let mut norm = 0i128;
    for (i, c) in coeffs.iter().enumerate() {
        let term = (-a)
            .checked_pow(i as u32)?
            .checked_mul(b.checked_pow((n - i) as u32)?)?
            .checked_mul(*c)?;
        norm = norm.checked_add(term)?;
    }
    Some(if n % 2 == 1 { -norm } else { norm })
}

/// Candidates per call of the line search.
const LINE_CAP: usize = 2000;

/// Ideals tried per prime ideal in [`RelationSearch::verify_all`].
const VERIFY_ATTEMPTS: usize = 200;

/// The norm bound of the factor base for relation collection: about
/// `exp(sqrt(log d log log d) / 2)` (the subexponential optimum's shape,
/// Buchmann 1990), at least [`MIN_FACTOR_BASE_BOUND`](super::MIN_FACTOR_BASE_BOUND).
pub(crate) fn base_bound(k: &NumberField) -> u64 {
    let l = ln_abs(&k.disc).max(1.0);
    let x = (0.5 * (l * l.ln().max(1.0)).sqrt()).exp() * 2.0;
    x.min(1e7) as u64
}

#[cfg(test)]
mod root_count_tests {
    use super::super::classgroup::cubic_root_count;
    use super::super::fp;
    use crate::arith::primes_up_to;

    #[test]
    fn cubic_root_count_agrees_with_root_finding() {
        // two ways: the discriminant-and-Frobenius count against the roots found by gcd splitting
        for (a, b, c) in [
            (0i64, -1i64, -1i64),
            (-1, -3, 1),
            (2, 11, 7),
            (0, 0, -2),
            (5, -7, 13),
        ] {
            for p in primes_up_to(3000) {
                let m = |x: i64| x.rem_euclid(p as i64) as u64;
                let f = [m(c), m(b), m(a), 1];
                let disc =
                    -4 * b.pow(3) - 27 * c * c + a * a * b * b - 4 * a.pow(3) * c + 18 * a * b * c;
                if m(disc) == 0 {
                    continue;
                }
                assert_eq!(
                    cubic_root_count(&f[..3], m(disc), p),
                    fp::roots(&f, p).len(),
                    "{a} {b} {c} mod {p}"
                );
            }
        }
    }
}

#[cfg(test)]
mod sieve_tests {
    use super::*;
    use crate::arith::FactorLimits;
    use malachite::Rational;

    fn field(f: &[i64]) -> NumberField {
        NumberField::new(&f.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>()).unwrap()
    }

    /// The law of issue 14 "every relation found factors over the factor
    /// base", checked independently of the search's own bookkeeping. For
    /// each field a class group is run to the end (its bounds and route
    /// known), then its relation search is replayed with those bounds (the
    /// search is deterministic: the same seed and calls give the same
    /// relations; the run itself is not recorded, as the crate keeps no
    /// hidden per-thread state): on the kernel route the free relations, the
    /// line sieve's `kfb + 24` relations and targeted rounds at the columns
    /// they missed, on the echelon route the first 60 rounds. Each relation
    /// is rebuilt as an element from its exponents, its norm computed
    /// exactly and trial-divided by the primes below the columns (the
    /// cofactor of numerator and denominator must be 1), and the valuation
    /// vector the search recorded compared with the exact valuations
    /// (`NumberField::valuation`) at every column; the prime ideals above
    /// those primes that are not columns must have valuation 0, and
    /// `v_p(N) = sum f_P v_P` (the norm of ideals is multiplicative, Cohen
    /// GTM 138, Proposition 4.8.6 / Theorem 4.8.5). Fields: imaginary and
    /// real quadratic, complex and totally real cubic, `abs(d)` from 1e10
    /// to 1e20.
    #[test]
    fn relations_of_class_group_runs_factor_over_the_factor_base() {
        use super::super::classgroup::{ClassGroupOptions, Route, KERNEL_ROUTE_DIGITS};
        use malachite::base::num::arithmetic::traits::DivisibleBy;
        use malachite::Natural;
        let cases: [(&[i64], Route); 8] = [
            (&[2500000001, 0, 1], Route::Auto), // x^2 + 2500000001, d about -1e10
            (&[-10000000019, 0, 1], Route::Auto), // x^2 - 10000000019, d about 4e10
            (&[56789, 1234, 0, 1], Route::Echelon), // d = -94591067683
            (&[56789, 1234, 0, 1], Route::Kernel),
            (&[1, -3000, 0, 1], Route::Auto), // three real roots, d about 1.1e11
            (&[1234567891, 2345678, 0, 1], Route::Auto), // d about -9.3e19
            (&[9876541, 123457, 0, 1], Route::Echelon), // d about -1.0e16
            (&[1, -3000000, 0, 1], Route::Auto), // three real roots, d about 1.1e20
        ];
        for (f, route) in cases {
            let k = field(f);
            let mut opts = ClassGroupOptions::default()
                .with_deadline(std::time::Instant::now() + std::time::Duration::from_secs(120));
            opts.route = route;
            let cg = k
                .class_group(&opts)
                .unwrap_or_else(|e| panic!("{f:?}: {e}"));
            let kernel = match route {
                Route::Kernel => true,
                Route::Echelon => false,
                Route::Auto => ln_abs(&k.disc) / std::f64::consts::LN_10 >= KERNEL_ROUTE_DIGITS,
            };
            // the replay
            let stop = || false;
            let mut rs =
                RelationSearch::new(&k, cg.bound, cg.generation_bound, &[], &stop).unwrap();
            let kfb = rs.fb.len();
            let mut rels: Vec<Found> = Vec::new();
            let mut found: Vec<Found> = Vec::new();
            if kernel {
                rs.primitive_only = true;
                for p in rs.column_primes() {
                    rels.extend(rs.free_relation(p).unwrap());
                }
                rs.sieve_collect(kfb + 24, &stop, &mut found).unwrap();
                rels.append(&mut found);
                let missed: Vec<usize> = (0..kfb)
                    .filter(|&j| rels.iter().all(|r| r.v[j] == 0))
                    .take(20)
                    .collect();
                for j in missed {
                    rs.targeted_round(j, 1, &stop, "test", &mut found).unwrap();
                    rels.append(&mut found);
                }
            } else {
                for round in 1..=60 {
                    rs.round(round, usize::MAX, &stop, "test", &mut found)
                        .unwrap();
                    rels.append(&mut found);
                }
            }
            let columns = &rs.fb;
            // the rational primes below the columns and every prime ideal above them
            let mut ps: Vec<u64> = columns.iter().map(|q| q.p).collect();
            ps.sort_unstable();
            ps.dedup();
            let above: HashMap<u64, Vec<PrimeIdeal>> = ps
                .iter()
                .map(|&p| (p, k.primes_above(p).unwrap()))
                .collect();
            // each column is one of the prime ideals above its prime
            for q in columns {
                assert!(
                    above[&q.p].iter().any(|r| r.ideal == q.ideal),
                    "{f:?}: column above {} not among the primes above it",
                    q.p
                );
            }
            for rel in &rels {
                let mut a = k.one();
                for &(i, x) in &rel.exps {
                    a = k.mul(&a, &k.pow(&rs.elems[i], x).unwrap());
                }
                let v = &rel.v;
                assert_eq!(v.len(), columns.len(), "{f:?}");
                let norm = k.norm(&a);
                let (mut num, mut den) =
                    (norm.numerator_ref().clone(), norm.denominator_ref().clone());
                let mut vp_norm: HashMap<u64, i64> = HashMap::new();
                for &p in &ps {
                    let pn = Natural::from(p);
                    let mut e = 0i64;
                    while (&num).divisible_by(&pn) {
                        num /= &pn;
                        e += 1;
                    }
                    while (&den).divisible_by(&pn) {
                        den /= &pn;
                        e -= 1;
                    }
                    vp_norm.insert(p, e);
                }
                assert!(
                    num == 1u32 && den == 1u32,
                    "{f:?}: N(a) = {norm} has the cofactor {num}/{den} outside the factor base"
                );
                // exact valuations at the columns; zero at the other prime
                // ideals above the same primes
                let integral = a.is_integral();
                let mut sum: HashMap<u64, i64> = HashMap::new();
                for (j, q) in columns.iter().enumerate() {
                    let exact = if integral && vp_norm[&q.p] == 0 {
                        0
                    } else {
                        k.valuation(&a, q).unwrap()
                    };
                    assert_eq!(
                        exact, v[j],
                        "{f:?}: v_P(a) at a column above {} against the recorded valuation",
                        q.p
                    );
                    *sum.entry(q.p).or_insert(0) += i64::from(q.f) * exact;
                }
                for &p in &ps {
                    let mut s = sum[&p];
                    for r in &above[&p] {
                        if columns.iter().any(|q| q.ideal == r.ideal) {
                            continue;
                        }
                        let x = if integral && vp_norm[&p] == 0 {
                            0
                        } else {
                            k.valuation(&a, r).unwrap()
                        };
                        assert_eq!(
                            x, 0,
                            "{f:?}: a prime ideal above {p} outside the columns divides a relation"
                        );
                        s += i64::from(r.f) * x;
                    }
                    assert_eq!(s, vp_norm[&p], "{f:?}: v_{p}(N(a)) against sum f v_P");
                }
            }
            eprintln!(
                "{f:?} ({route:?}, kernel {kernel}): h = {}, {} relations re-factored",
                cg.class_number,
                rels.len()
            );
            assert!(rels.len() >= 10, "{f:?}: only {} relations", rels.len());
        }
    }

    #[test]
    fn line_valuations_agree_with_exact_valuations() {
        // two ways: valuations of a + b theta read off its norm against the
        // valuations computed in the field; fields with index 1 and 2
        // (x^3 - x^2 - 2x - 8: Dedekind's field, 2 divides the index of
        // every Z[alpha], Cohen GTM 138 §6.1), ramified primes included
        for f in [
            vec![-8i64, -2, -1, 1],
            vec![1234567891, 2345678, 0, 1],
            vec![-2, 0, 0, 1],
            vec![7, 3, 0, 1],
            vec![-5, 0, 1],
        ] {
            let k = field(&f);
            let (b0, bound) = (200u64, 3000u64);
            let mut rs = RelationSearch::new(&k, b0, bound, &[], &|| false).unwrap();
            let Some(table) = rs.line_table(bound).unwrap() else {
                continue;
            };
            let coeffs: Vec<i128> = f.iter().map(|&c| c as i128).collect();
            let theta = k.generator();
            let (mut fast, mut total) = (0, 0);
            for b in 1i64..=12 {
                for a in -300i64..=300 {
                    if crate::arith::gcd_u64(a.unsigned_abs(), b as u64) != 1 {
                        continue;
                    }
                    let val = line_norm(&coeffs, a as i128, b as i128)
                        .unwrap()
                        .unsigned_abs();
                    // the primes of the norm by plain trial division up to the bound
                    let mut rest = val;
                    let mut large = Vec::new();
                    for p in primes_up_to(bound) {
                        while rest % p as u128 == 0 {
                            rest /= p as u128;
                            if p > b0 && large.last() != Some(&p) {
                                large.push(p);
                            }
                        }
                    }
                    if rest != 1 {
                        continue;
                    }
                    total += 1;
                    let elem = k.add(
                        &k.rational(&Rational::from(a)),
                        &k.mul(&k.rational(&Rational::from(b)), &theta),
                    );
                    let mut exact = rs
                        .valuations_of(&elem, val, val, 1, &large)
                        .unwrap()
                        .unwrap();
                    exact.sort_unstable();
                    if let Some(mut v) = rs.line_valuations(a, b, val, &large, &table) {
                        v.sort_unstable();
                        assert_eq!(v, exact, "{f:?} {a} {b}");
                        fast += 1;
                    }
                }
            }
            // with index 1 nearly all by the norm (the rest: a prime's ideals
            // not in the table's shape); with index 2 the odd norms
            let index_one = k.index() == 1;
            assert!(
                total > 100 && fast > 100 && (!index_one || fast * 10 >= total * 8),
                "{f:?}: {fast} of {total} by the norm"
            );
        }
    }

    #[test]
    fn sieve_witnesses_factor_as_claimed() {
        // two ways: each prime ideal the sieve verified has a witness
        // a + b theta whose principal ideal, factored in the field (norm
        // factored, prime decompositions, valuations), is that ideal once
        // times columns and ideals of smaller norm
        for (a, b) in [(123457i64, 9876541i64), (2345678, 1234567891)] {
            let k = field(&[b, a, 0, 1]);
            let b0 = base_bound(&k);
            let bound = k.bach_bound() as u64;
            let mut rs = RelationSearch::new(&k, b0, bound, &[], &|| false).unwrap();
            rs.verify_all(&|| false).unwrap();
            assert!(
                rs.line_witnesses.len() > 100,
                "{} witnesses",
                rs.line_witnesses.len()
            );
            let theta = k.generator();
            for (n, (key, &(x, y))) in rs.line_witnesses.iter().enumerate() {
                if n % 7 != 0 {
                    continue;
                }
                let target = &rs.above[&key.0][key.1];
                let elem = k.add(
                    &k.rational(&Rational::from(x)),
                    &k.mul(&k.rational(&Rational::from(y)), &theta),
                );
                let fac = k
                    .factor_ideal(&k.principal_ideal(&elem).unwrap(), &FactorLimits::default())
                    .unwrap();
                let mut seen = false;
                for (q, e) in fac {
                    if q.ideal.hnf() == target.ideal.hnf() {
                        assert_eq!(e, 1, "{key:?}");
                        seen = true;
                    } else {
                        assert!(
                            q.norm() <= b0 as u128
                                || q.norm() < target.norm()
                                || (q.norm() == target.norm() && q.p == key.0),
                            "{key:?}: {} {e}",
                            q.norm()
                        );
                    }
                }
                assert!(seen, "{key:?}");
            }
        }
    }
}
