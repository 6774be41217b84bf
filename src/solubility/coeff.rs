//! The coefficient rings the p-adic search runs over: checked `i128` words
//! (the fast path) and malachite [`Integer`]s (the fallback). Every
//! operation that can leave the word range returns `None`, and the caller
//! then restarts the whole computation over `Integer`.

use malachite::base::num::arithmetic::traits::{DivExact, DivisibleBy, JacobiSymbol, Mod, ModInverse};
use malachite::base::num::basic::traits::Zero;
use malachite::{Integer, Natural};

/// Exact integer arithmetic with overflow reporting, plus residue
/// arithmetic modulo a prime `p` held in the same type.
pub(crate) trait Coeff: Clone + PartialEq + std::fmt::Debug {
    fn from_u64(v: u64) -> Self;
    fn zero() -> Self;
    fn is_zero(&self) -> bool;
    fn add(&self, o: &Self) -> Option<Self>;
    fn sub(&self, o: &Self) -> Option<Self>;
    fn mul(&self, o: &Self) -> Option<Self>;
    /// The remainder in `[0, m)` for `m > 0`.
    fn rem(&self, m: &Self) -> Self;
    /// The remainder in `[0, m)` for a word modulus `m > 0`.
    fn rem_u64(&self, m: u64) -> u64;
    /// Exact quotient (the caller guarantees `m | self`).
    fn div_exact(&self, m: &Self) -> Self;
    fn divisible_by(&self, m: &Self) -> bool;
    /// `a * b mod p` for residues `0 <= a, b < p`; never overflows.
    fn mul_mod(&self, o: &Self, p: &Self) -> Self;
    /// The inverse of a non-zero residue modulo the prime `p`.
    fn inv_mod(&self, p: &Self) -> Self;
    /// The Legendre symbol of a residue modulo the odd prime `p`.
    fn legendre(&self, p: &Self) -> i32;
    fn to_integer(&self) -> Integer;
}

impl Coeff for i128 {
    #[inline]
    fn from_u64(v: u64) -> Self {
        v as i128
    }
    #[inline]
    fn zero() -> Self {
        0
    }
    #[inline]
    fn is_zero(&self) -> bool {
        *self == 0
    }
    #[inline]
    fn add(&self, o: &Self) -> Option<Self> {
        self.checked_add(*o)
    }
    #[inline]
    fn sub(&self, o: &Self) -> Option<Self> {
        self.checked_sub(*o)
    }
    #[inline]
    fn mul(&self, o: &Self) -> Option<Self> {
        self.checked_mul(*o)
    }
    #[inline]
    fn rem(&self, m: &Self) -> Self {
        // 64-bit division when both fit (the 128-bit one is a slow libcall)
        match (i64::try_from(*self), i64::try_from(*m)) {
            (Ok(a), Ok(b)) => a.rem_euclid(b) as i128,
            _ => self.rem_euclid(*m),
        }
    }
    #[inline]
    fn rem_u64(&self, m: u64) -> u64 {
        if m.is_power_of_two() {
            // two's complement: the low bits are the non-negative remainder
            return (*self as u64) & (m - 1);
        }
        match i64::try_from(*self) {
            Ok(a) if m <= i64::MAX as u64 => a.rem_euclid(m as i64) as u64,
            _ => self.rem_euclid(m as i128) as u64,
        }
    }
    #[inline]
    fn div_exact(&self, m: &Self) -> Self {
        match (i64::try_from(*self), i64::try_from(*m)) {
            (Ok(a), Ok(b)) => (a / b) as i128,
            _ => self / m,
        }
    }
    #[inline]
    fn divisible_by(&self, m: &Self) -> bool {
        if *m == 2 {
            return *self & 1 == 0;
        }
        match (i64::try_from(*self), i64::try_from(*m)) {
            (Ok(a), Ok(b)) => a % b == 0,
            _ => self % m == 0,
        }
    }
    #[inline]
    fn mul_mod(&self, o: &Self, p: &Self) -> Self {
        // the word path is only used for p < 2^62, so the product fits
        if *p < 1 << 32 {
            return ((*self as u64 * *o as u64) % *p as u64) as i128;
        }
        (self * o).rem_euclid(*p)
    }
    fn inv_mod(&self, p: &Self) -> Self {
        // invariant: callers invert only units modulo the prime p
        crate::arith::inv_mod(*self as u64, *p as u64).expect("non-zero residue modulo a prime") as i128
    }
    fn legendre(&self, p: &Self) -> i32 {
        crate::arith::jacobi_u64(*self as u64, *p as u64)
    }
    fn to_integer(&self) -> Integer {
        Integer::from(*self)
    }
}

impl Coeff for Integer {
    fn from_u64(v: u64) -> Self {
        Integer::from(v)
    }
    fn zero() -> Self {
        Integer::ZERO
    }
    fn is_zero(&self) -> bool {
        *self == 0u32
    }
    fn add(&self, o: &Self) -> Option<Self> {
        Some(self + o)
    }
    fn sub(&self, o: &Self) -> Option<Self> {
        Some(self - o)
    }
    fn mul(&self, o: &Self) -> Option<Self> {
        Some(self * o)
    }
    fn rem(&self, m: &Self) -> Self {
        self.mod_op(m)
    }
    fn rem_u64(&self, m: u64) -> u64 {
        let r = self.mod_op(Integer::from(m));
        // invariant: a remainder mod m < 2^64 is in [0, m) and fits a u64
        u64::try_from(&r).expect("remainder below a word modulus")
    }
    fn div_exact(&self, m: &Self) -> Self {
        <&Integer as DivExact<&Integer>>::div_exact(self, m)
    }
    fn divisible_by(&self, m: &Self) -> bool {
        <&Integer as DivisibleBy<&Integer>>::divisible_by(self, m)
    }
    fn mul_mod(&self, o: &Self, p: &Self) -> Self {
        (self * o).mod_op(p)
    }
    fn inv_mod(&self, p: &Self) -> Self {
        // invariant: residues are reduced into [0, p) before inversion
        let a = Natural::try_from(self).expect("residues are non-negative");
        // invariant: the modulus is a positive prime
        let m = Natural::try_from(p).expect("the prime is positive");
        // invariant: callers invert only units modulo the prime p
        Integer::from(a.mod_inverse(m).expect("non-zero residue modulo a prime"))
    }
    fn legendre(&self, p: &Self) -> i32 {
        self.jacobi_symbol(p) as i32
    }
    fn to_integer(&self) -> Integer {
        self.clone()
    }
}
