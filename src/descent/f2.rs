//! Linear algebra over F2 with vectors packed in `u64` words (up to 64
//! coordinates), and square classes of rationals over a finite set of primes.

use crate::arith::valuation;
use malachite::base::num::arithmetic::traits::CheckedSqrt;
use malachite::base::num::basic::traits::Zero;
use malachite::{Integer, Natural, Rational};

/// An echelon basis of a subspace of F2^n (n <= 64), kept reduced so that
/// membership and insertion cost one pass over the basis.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct F2Span {
    /// basis vectors, each with a distinct leading bit (highest set bit)
    rows: Vec<u64>,
}

impl F2Span {
    /// The zero subspace.
    pub fn new() -> Self {
        F2Span { rows: Vec::new() }
    }
    /// Reduces `v` against the basis; zero iff `v` lies in the span.
    pub fn reduce(&self, mut v: u64) -> u64 {
        for &r in &self.rows {
            let lead = 63 - r.leading_zeros();
            if v >> lead & 1 == 1 {
                v ^= r;
            }
        }
        v
    }
    /// Whether `v` lies in the span.
    pub fn contains(&self, v: u64) -> bool {
        self.reduce(v) == 0
    }
    /// Adds `v`; returns `true` if the dimension grew.
    pub fn insert(&mut self, v: u64) -> bool {
        let r = self.reduce(v);
        if r == 0 {
            return false;
        }
        self.rows.push(r);
        self.rows.sort_by(|a, b| b.cmp(a));
        true
    }
    /// The dimension.
    pub fn dim(&self) -> usize {
        self.rows.len()
    }
    /// The basis vectors.
    pub fn basis(&self) -> &[u64] {
        &self.rows
    }
    /// Every element of the span (2^dim of them; dim must be small).
    pub fn elements(&self) -> Vec<u64> {
        let mut out = vec![0u64];
        for &r in &self.rows {
            let n = out.len();
            for i in 0..n {
                out.push(out[i] ^ r);
            }
        }
        out
    }
}

/// The kernel of the linear map F2^n -> F2^m given by the images of the
/// basis vectors (`images[i]` is the image of e_i); returns a basis.
pub fn kernel(images: &[u128]) -> Vec<u64> {
    // Gaussian elimination on the augmented rows (image | identity)
    let n = images.len();
    assert!(n <= 64);
    let mut rows: Vec<(u128, u64)> = images.iter().enumerate().map(|(i, &im)| (im, 1u64 << i)).collect();
    let mut pivot_row = 0;
    for bit in (0..128).rev() {
        let Some(k) = (pivot_row..n).find(|&k| rows[k].0 >> bit & 1 == 1) else { continue };
        rows.swap(pivot_row, k);
        let (pi, pc) = rows[pivot_row];
        for (j, row) in rows.iter_mut().enumerate() {
            if j != pivot_row && row.0 >> bit & 1 == 1 {
                row.0 ^= pi;
                row.1 ^= pc;
            }
        }
        pivot_row += 1;
    }
    rows[pivot_row..].iter().map(|r| r.1).collect()
}

/// Square classes of non-zero rationals whose odd-valuation primes lie in a
/// fixed list: coordinates are the sign (bit 0) and the parities of the
/// valuations at the listed primes (bits 1..).
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct SquareClasses {
    primes: Vec<Natural>,
}

impl SquareClasses {
    /// The classes over the given primes (at most 63 of them).
    pub fn new(primes: Vec<Natural>) -> Self {
        assert!(primes.len() <= 63);
        SquareClasses { primes }
    }
    /// The dimension 1 + number of primes.
    pub fn dim(&self) -> usize {
        1 + self.primes.len()
    }
    /// The vector of a non-zero rational, or `None` if its square-free part
    /// involves a prime outside the list (or it is zero).
    pub fn vector_of(&self, r: &Rational) -> Option<u64> {
        if *r == Rational::ZERO {
            return None;
        }
        let (n, d) = r.to_numerator_and_denominator();
        let mut v = if *r < Rational::ZERO { 1u64 } else { 0 };
        let mut rest = Integer::from(n) * Integer::from(d);
        for (i, p) in self.primes.iter().enumerate() {
            let e = valuation(&rest, p).unwrap_or(0);
            let pi = Integer::from(p.clone());
            for _ in 0..e {
                rest /= &pi;
            }
            if e % 2 == 1 {
                v |= 1 << (i + 1);
            }
        }
        let rest = Natural::try_from(rest).ok()?;
        rest.checked_sqrt().map(|_| v)
    }
    /// The square-free integer with the given vector.
    pub fn integer_of(&self, v: u64) -> Integer {
        let mut d = Integer::from(if v & 1 == 1 { -1 } else { 1 });
        for (i, p) in self.primes.iter().enumerate() {
            if v >> (i + 1) & 1 == 1 {
                d *= Integer::from(p.clone());
            }
        }
        d
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn small_examples() {
        let mut s = F2Span::new();
        assert!(s.insert(0b011) && s.insert(0b110));
        assert!(s.contains(0b101) && !s.contains(0b001));
        assert_eq!(s.dim(), 2);
        let sc = SquareClasses::new(vec![2u32.into(), 3u32.into()]);
        let v = sc.vector_of(&Rational::from(-12)).unwrap(); // -12 = -3 * 2^2
        assert_eq!(sc.integer_of(v).to_string(), "-3");
    }

    #[test]
    fn span_and_kernel() {
        let mut s = F2Span::new();
        assert!(s.insert(0b011));
        assert!(s.insert(0b110));
        assert!(!s.insert(0b101));
        assert_eq!(s.dim(), 2);
        assert_eq!(s.elements().len(), 4);
        // map e0 -> 1, e1 -> 1, e2 -> 0: kernel spanned by e0+e1 and e2
        let k = kernel(&[1, 1, 0]);
        let mut ks = F2Span::new();
        for v in k {
            ks.insert(v);
        }
        assert_eq!(ks.dim(), 2);
        assert!(ks.contains(0b011) && ks.contains(0b100));
    }

    #[test]
    fn square_classes() {
        let sc = SquareClasses::new(vec![2u32.into(), 3u32.into(), 5u32.into()]);
        assert_eq!(sc.vector_of(&Rational::from(-12)), Some(0b101));
        assert_eq!(sc.vector_of(&Rational::from_signeds(45, 8)), Some(0b1010));
        assert_eq!(sc.vector_of(&Rational::from(7)), None);
        assert_eq!(sc.integer_of(0b1011).to_string(), "-10");
    }
}
