//! The maximal order by the Round 2 algorithm: starting from `Z[theta]`,
//! at each prime `p` with `p^2 | disc(f)` the order is replaced by the
//! ring of multipliers of its `p`-radical until it stops growing
//! (Pohst-Zassenhaus; H. Cohen, GTM 138, Algorithm 6.1.8, with the
//! radical as in Lemma 6.1.6: the kernel of `x -> x^(p^j)` on `O/pO`,
//! `p^j >= n`).
//!
//! An order is stored by its basis on the power basis: `w_i = (sum_j
//! B[i][j] theta^j) / d` with `B` in lower-triangular Hermite normal form,
//! so `w_0 = 1` and `w_i` has degree `i` in `theta`.

use super::linalg::{hnf, left_kernel_mod_p, mod_word};
use crate::arith::mul_mod;
use crate::{Error, ErrorKind};
use malachite::base::num::arithmetic::traits::{Gcd, Pow, UnsignedAbs};
use malachite::base::num::basic::traits::{One, Zero};
use malachite::{Integer, Natural, Rational};

/// A basis of an order (or of a lattice) on the power basis.
#[derive(Clone, Debug, PartialEq, Eq)]
pub(crate) struct Basis {
    pub(crate) rows: Vec<Vec<Integer>>,
    pub(crate) den: Integer,
}

/// Product of two power-basis numerators modulo the monic `f`.
pub(crate) fn mul_mod_f(a: &[Integer], b: &[Integer], f: &[Integer]) -> Vec<Integer> {
    let n = f.len() - 1;
    let mut r = vec![Integer::ZERO; 2 * n - 1];
    for (i, x) in a.iter().enumerate() {
        if *x == 0 {
            continue;
        }
        for (j, y) in b.iter().enumerate() {
            r[i + j] += x * y;
        }
    }
    for k in (n..2 * n - 1).rev() {
        let c = std::mem::replace(&mut r[k], Integer::ZERO);
        if c != 0 {
            for i in 0..n {
                let t = &c * &f[i];
                r[k - n + i] -= t;
            }
        }
    }
    r.truncate(n);
    r
}

impl Basis {
    /// Coordinates of `v / e` (power-basis numerator `v`, denominator `e`) on this basis.
    pub(crate) fn coords(&self, v: &[Integer], e: &Integer) -> Vec<Rational> {
        let n = self.rows.len();
        // x B / d = v / e  ->  x B = v d / e ; B lower triangular: solve from the last column
        let rhs: Vec<Rational> = v.iter().map(|c| Rational::from_integers(c * &self.den, e.clone())).collect();
        let mut x = vec![Rational::ZERO; n];
        for j in (0..n).rev() {
            let mut s = rhs[j].clone();
            for i in j + 1..n {
                s -= &x[i] * Rational::from(self.rows[i][j].clone());
            }
            x[j] = s / Rational::from(self.rows[j][j].clone());
        }
        x
    }

    /// Multiplication table `w_i w_j = sum_k T[i][j][k] w_k`; an error if a
    /// product is not integral (the basis is not an order).
    pub(crate) fn table(&self, f: &[Integer]) -> Result<Vec<Vec<Vec<Integer>>>, Error> {
        let n = self.rows.len();
        let d2 = &self.den * &self.den;
        let mut t = vec![vec![Vec::new(); n]; n];
        for i in 0..n {
            for j in i..n {
                let prod = mul_mod_f(&self.rows[i], &self.rows[j], f);
                let c = self.coords(&prod, &d2);
                let mut ci = Vec::with_capacity(n);
                for q in c {
                    if *q.denominator_ref() != 1 {
                        return Err(Error::new(ErrorKind::InvalidValue, "basis is not closed under multiplication"));
                    }
                    ci.push(Integer::try_from(q).unwrap_or_default());
                }
                t[i][j] = ci.clone();
                t[j][i] = ci;
            }
        }
        Ok(t)
    }

    /// `[O : Z[theta]] = d^n / prod B_ii`.
    pub(crate) fn index(&self) -> Integer {
        let n = self.rows.len() as u64;
        let diag = self.rows.iter().enumerate().fold(Integer::ONE, |a, (i, r)| a * &r[i]);
        (&self.den).pow(n) / diag
    }
}

/// Product of two elements of `O/pO` given by word coordinates.
pub(crate) fn mul_mod_p(a: &[u64], b: &[u64], tp: &[Vec<Vec<u64>>], p: u64) -> Vec<u64> {
    let n = a.len();
    let mut r = vec![0u64; n];
    for i in 0..n {
        if a[i] == 0 {
            continue;
        }
        for j in 0..n {
            if b[j] == 0 {
                continue;
            }
            let c = mul_mod(a[i], b[j], p);
            for k in 0..n {
                if tp[i][j][k] != 0 {
                    r[k] = (r[k] + mul_mod(c, tp[i][j][k], p)) % p;
                }
            }
        }
    }
    r
}

/// `a^e` in `O/pO`.
pub(crate) fn pow_mod_p(a: &[u64], mut e: u64, tp: &[Vec<Vec<u64>>], p: u64) -> Vec<u64> {
    let n = a.len();
    let mut r = vec![0u64; n];
    r[0] = 1 % p;
    let mut b = a.to_vec();
    while e > 0 {
        if e & 1 == 1 {
            r = mul_mod_p(&r, &b, tp, p);
        }
        e >>= 1;
        if e > 0 {
            b = mul_mod_p(&b, &b, tp, p);
        }
    }
    r
}

/// The table reduced mod p.
pub(crate) fn table_mod_p(t: &[Vec<Vec<Integer>>], p: u64) -> Vec<Vec<Vec<u64>>> {
    t.iter().map(|r| r.iter().map(|v| v.iter().map(|x| mod_word(x, p)).collect()).collect()).collect()
}

/// The `p`-radical of the order with table `t`: HNF rows (coordinates on
/// the order's basis) of `{x in O : x^(p^j) in pO}`, `p^j >= n`.
pub(crate) fn radical(t: &[Vec<Vec<Integer>>], p: u64) -> Result<Vec<Vec<Integer>>, Error> {
    let n = t.len();
    let tp = table_mod_p(t, p);
    let mut q = p as u128;
    let mut j = 1;
    while q < n as u128 {
        q *= p as u128;
        j += 1;
    }
    let mut images = Vec::with_capacity(n);
    for i in 0..n {
        let mut x = vec![0u64; n];
        x[i] = 1;
        for _ in 0..j {
            x = pow_mod_p(&x, p, &tp, p);
        }
        images.push(x);
    }
    let ker = left_kernel_mod_p(&images, n, p);
    let pz = Integer::from(p);
    let mut gens: Vec<Vec<Integer>> = ker.iter().map(|v| v.iter().map(|&x| Integer::from(x)).collect()).collect();
    for i in 0..n {
        let mut e = vec![Integer::ZERO; n];
        e[i] = pz.clone();
        gens.push(e);
    }
    hnf(&gens, n, Some(&pz))
}

/// Coordinates on the lattice with lower-triangular HNF rows `h` of an
/// integer vector `v`; `None` if `v` is not in the lattice.
pub(crate) fn lattice_coords(h: &[Vec<Integer>], v: &[Integer]) -> Option<Vec<Integer>> {
    let n = h.len();
    let mut r = v.to_vec();
    let mut x = vec![Integer::ZERO; n];
    for j in (0..n).rev() {
        if r[j] == 0 {
            continue;
        }
        let q = &r[j] / &h[j][j];
        if &q * &h[j][j] != r[j] {
            return None;
        }
        for k in 0..=j {
            let t = &q * &h[j][k];
            r[k] -= t;
        }
        x[j] = q;
    }
    Some(x)
}

/// One enlargement step at `p`: the ring of multipliers of the radical, or
/// `None` if the order is already `p`-maximal.
fn enlarge(order: &Basis, f: &[Integer], p: u64) -> Result<Option<Basis>, Error> {
    let n = order.rows.len();
    let t = order.table(f)?;
    let rad = radical(&t, p)?;
    // x -> (x gamma_k in radical coordinates mod p)
    let mut rows = Vec::with_capacity(n);
    for i in 0..n {
        let mut row = Vec::with_capacity(n * n);
        for g in &rad {
            // w_i * gamma, gamma = sum_l g_l w_l
            let mut v = vec![Integer::ZERO; n];
            for (l, gl) in g.iter().enumerate() {
                if *gl == 0 {
                    continue;
                }
                for k in 0..n {
                    v[k] += gl * &t[i][l][k];
                }
            }
            let c = lattice_coords(&rad, &v).ok_or_else(|| Error::new(ErrorKind::InvalidValue, "radical is not an ideal"))?;
            row.extend(c.iter().map(|x| mod_word(x, p)));
        }
        rows.push(row);
    }
    let ker = left_kernel_mod_p(&rows, n * n, p);
    let pz = Integer::from(p);
    let mut gens: Vec<Vec<Integer>> = ker.iter().map(|v| v.iter().map(|&x| Integer::from(x)).collect()).collect();
    for i in 0..n {
        let mut e = vec![Integer::ZERO; n];
        e[i] = pz.clone();
        gens.push(e);
    }
    let u = hnf(&gens, n, Some(&pz))?;
    // O' = U / p : numerators U * B over d p
    let den = &order.den * &pz;
    let mut num = vec![vec![Integer::ZERO; n]; n];
    for i in 0..n {
        for k in 0..n {
            if u[i][k] == 0 {
                continue;
            }
            for j in 0..n {
                num[i][j] += &u[i][k] * &order.rows[k][j];
            }
        }
    }
    let h = hnf(&num, n, Some(&den))?;
    let new = reduce(Basis { rows: h, den });
    if new.index() == order.index() {
        return Ok(None);
    }
    Ok(Some(new))
}

/// Divides the numerators and denominator by their common content.
pub(crate) fn reduce(b: Basis) -> Basis {
    let mut g: Natural = (&b.den).unsigned_abs();
    for r in &b.rows {
        for x in r {
            g = g.gcd((x).unsigned_abs());
        }
    }
    if g == 1 {
        return b;
    }
    let gi = Integer::from(g);
    Basis { rows: b.rows.iter().map(|r| r.iter().map(|x| x / &gi).collect()).collect(), den: &b.den / &gi }
}

/// The maximal order of `Q[x]/(f)` for monic irreducible `f`, enlarging
/// `Z[theta]` at each listed prime (those with `p^2 | disc(f)`; others are
/// harmless). Primes above `2^64` give [`ErrorKind::TooLarge`].
pub(crate) fn maximal_order(f: &[Integer], primes: &[Natural]) -> Result<Basis, Error> {
    let n = f.len() - 1;
    let mut order = Basis {
        rows: (0..n).map(|i| (0..n).map(|j| Integer::from(u8::from(i == j))).collect()).collect(),
        den: Integer::ONE,
    };
    for p in primes {
        let p = u64::try_from(p).map_err(|_| Error::new(ErrorKind::TooLarge, format!("Round 2 at a prime above 2^64 ({p}) is not implemented")))?;
        while let Some(o) = enlarge(&order, f, p)? {
            order = o;
        }
    }
    Ok(order)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn z(v: &[i64]) -> Vec<Integer> {
        v.iter().map(|&c| Integer::from(c)).collect()
    }

    #[test]
    fn quadratic_orders() {
        // x^2 - 5: O = Z[(1 + sqrt 5)/2], index 2 (classical)
        let o = maximal_order(&z(&[-5, 0, 1]), &[Natural::from(2u32), Natural::from(5u32)]).unwrap();
        assert_eq!(o.index(), 2);
        assert_eq!(o.rows, vec![z(&[2, 0]), z(&[1, 1])]);
        assert_eq!(o.den, 2);
        // x^2 - 3: index 1 (3 = 3 mod 4)
        let o = maximal_order(&z(&[-3, 0, 1]), &[Natural::from(2u32), Natural::from(3u32)]).unwrap();
        assert_eq!(o.index(), 1);
        // x^2 + 4*9: Q(i), index 6
        let o = maximal_order(&z(&[36, 0, 1]), &[Natural::from(2u32), Natural::from(3u32)]).unwrap();
        assert_eq!(o.index(), 6);
    }

    #[test]
    fn pure_cubic_index() {
        // x^3 - 10: disc -27*100; 10 = 1 mod 9 so O_K contains (1 + t + t^2)/3 and d_K = -300
        // (Dedekind's pure cubic fields; Cohen GTM 138, §6.4.2)
        let o = maximal_order(&z(&[-10, 0, 0, 1]), &[Natural::from(2u32), Natural::from(3u32), Natural::from(5u32)]).unwrap();
        assert_eq!(o.index(), 3);
        // x^3 - 12 = 1... 12 = 3 mod 9: index 1 at 3; disc -27*144 = -3888, 2^4 | 144: 12 = 2^2 * 3, not squarefree:
        // field Q(12^(1/3)) = Q(18^(1/3)); d_K = -27 * (2*3)^2 = -972 (k = a b^2 with a = 3, b = 2: d = -27 (ab)^2)
        let o = maximal_order(&z(&[-12, 0, 0, 1]), &[Natural::from(2u32), Natural::from(3u32)]).unwrap();
        let disc = Integer::from(-3888);
        assert_eq!(disc / (o.index() * o.index()), -972);
    }
}
