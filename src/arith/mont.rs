//! Residue rings `Z/nZ` for odd `n`, for the factoring kernels.
//!
//! [`MontN`] keeps residues as `L` machine words in Montgomery form
//! (P. L. Montgomery, "Modular multiplication without trial division",
//! Math. Comp. 44 (1985)), multiplied by the coarsely integrated operand
//! scanning loop; elements are `Copy` arrays, so inner loops never allocate.
//! [`NatRing`] is a plain malachite fallback for moduli wider than the word
//! kernels, and a second implementation to test the first against.

use malachite::base::num::arithmetic::traits::Gcd;
use malachite::base::num::basic::traits::One;
use malachite::Natural;

/// The operations the factoring algorithms need from `Z/nZ`.
pub(crate) trait ModRing {
    type E: Clone + PartialEq + std::fmt::Debug;
    fn modulus(&self) -> &Natural;
    fn one(&self) -> Self::E;
    fn from_u64(&self, x: u64) -> Self::E;
    fn from_natural(&self, x: &Natural) -> Self::E;
    fn to_natural(&self, x: &Self::E) -> Natural;
    fn add(&self, a: &Self::E, b: &Self::E) -> Self::E;
    fn sub(&self, a: &Self::E, b: &Self::E) -> Self::E;
    fn mul(&self, a: &Self::E, b: &Self::E) -> Self::E;
    fn sqr(&self, a: &Self::E) -> Self::E {
        self.mul(a, a)
    }
    /// `gcd(x, n)` where `x` is the integer standing behind the element in
    /// its internal form; internal forms differ from the residue by a unit, so
    /// this is the gcd of the residue itself with `n`.
    fn gcd_n(&self, a: &Self::E) -> Natural;
}

/// `-n^{-1} mod 2^64` for odd `n` (Newton iteration, 6 steps double 1 bit to 64).
pub(crate) fn neg_inv_word(n0: u64) -> u64 {
    let mut inv: u64 = 1;
    for _ in 0..6 {
        inv = inv.wrapping_mul(2u64.wrapping_sub(n0.wrapping_mul(inv)));
    }
    inv.wrapping_neg()
}

/// Montgomery arithmetic modulo an odd `n < 2^(64 L)`.
#[derive(Clone, Debug)]
pub(crate) struct MontN<const L: usize> {
    n: [u64; L],
    ninv: u64,
    r1: [u64; L],
    r2: [u64; L],
    nat: Natural,
}

fn to_words<const L: usize>(x: &Natural) -> [u64; L] {
    let mut out = [0u64; L];
    for (o, l) in out.iter_mut().zip(x.limbs()) {
        *o = l;
    }
    out
}

impl<const L: usize> MontN<L> {
    /// `None` unless `n` is odd, `n > 1` and `n` fits in `L` words.
    pub(crate) fn new(n: &Natural) -> Option<Self> {
        if n.limb_count() as usize > L || *n <= 1u32 || n.limbs().next().unwrap_or(0) & 1 == 0 {
            return None;
        }
        let words = to_words::<L>(n);
        let r1 = (Natural::ONE << (64 * L as u64)) % n;
        let r2 = (&r1 * &r1) % n;
        Some(MontN {
            n: words,
            ninv: neg_inv_word(words[0]),
            r1: to_words(&r1),
            r2: to_words(&r2),
            nat: n.clone(),
        })
    }

    #[inline]
    fn geq_n(&self, t: &[u64; L]) -> bool {
        for i in (0..L).rev() {
            if t[i] != self.n[i] {
                return t[i] > self.n[i];
            }
        }
        true
    }

    #[inline]
    fn sub_n(&self, t: &mut [u64; L]) {
        let mut borrow = 0u64;
        for i in 0..L {
            let (d1, b1) = t[i].overflowing_sub(self.n[i]);
            let (d2, b2) = d1.overflowing_sub(borrow);
            t[i] = d2;
            borrow = (b1 | b2) as u64;
        }
    }

    /// Montgomery product `a b R^{-1} mod n` (CIOS).
    #[inline]
    pub(crate) fn mont_mul(&self, a: &[u64; L], b: &[u64; L]) -> [u64; L] {
        let n = &self.n;
        let mut t = [0u64; L];
        let mut t_hi: u64 = 0;
        for &ai in a.iter() {
            let mut c: u64 = 0;
            for j in 0..L {
                let s = t[j] as u128 + ai as u128 * b[j] as u128 + c as u128;
                t[j] = s as u64;
                c = (s >> 64) as u64;
            }
            let s = t_hi as u128 + c as u128;
            t_hi = s as u64;
            let t_hi2 = (s >> 64) as u64;
            let m = t[0].wrapping_mul(self.ninv);
            let s = t[0] as u128 + m as u128 * n[0] as u128;
            let mut c = (s >> 64) as u64;
            for j in 1..L {
                let s = t[j] as u128 + m as u128 * n[j] as u128 + c as u128;
                t[j - 1] = s as u64;
                c = (s >> 64) as u64;
            }
            let s = t_hi as u128 + c as u128;
            t[L - 1] = s as u64;
            t_hi = t_hi2 + (s >> 64) as u64;
        }
        if t_hi != 0 || self.geq_n(&t) {
            self.sub_n(&mut t);
        }
        t
    }
}

impl<const L: usize> ModRing for MontN<L> {
    type E = [u64; L];
    fn modulus(&self) -> &Natural {
        &self.nat
    }
    fn one(&self) -> [u64; L] {
        self.r1
    }
    fn from_u64(&self, x: u64) -> [u64; L] {
        self.from_natural(&Natural::from(x))
    }
    fn from_natural(&self, x: &Natural) -> [u64; L] {
        let x = to_words::<L>(&(x % &self.nat));
        self.mont_mul(&x, &self.r2)
    }
    fn to_natural(&self, x: &[u64; L]) -> Natural {
        let mut one = [0u64; L];
        one[0] = 1;
        Natural::from_limbs_asc(&self.mont_mul(x, &one))
    }
    #[inline]
    fn add(&self, a: &[u64; L], b: &[u64; L]) -> [u64; L] {
        let mut t = [0u64; L];
        let mut carry = 0u64;
        for i in 0..L {
            let (s1, c1) = a[i].overflowing_add(b[i]);
            let (s2, c2) = s1.overflowing_add(carry);
            t[i] = s2;
            carry = (c1 | c2) as u64;
        }
        if carry != 0 || self.geq_n(&t) {
            self.sub_n(&mut t);
        }
        t
    }
    #[inline]
    fn sub(&self, a: &[u64; L], b: &[u64; L]) -> [u64; L] {
        let mut t = [0u64; L];
        let mut borrow = 0u64;
        for i in 0..L {
            let (d1, b1) = a[i].overflowing_sub(b[i]);
            let (d2, b2) = d1.overflowing_sub(borrow);
            t[i] = d2;
            borrow = (b1 | b2) as u64;
        }
        if borrow != 0 {
            let mut carry = 0u64;
            for i in 0..L {
                let (s1, c1) = t[i].overflowing_add(self.n[i]);
                let (s2, c2) = s1.overflowing_add(carry);
                t[i] = s2;
                carry = (c1 | c2) as u64;
            }
        }
        t
    }
    #[inline]
    fn mul(&self, a: &[u64; L], b: &[u64; L]) -> [u64; L] {
        self.mont_mul(a, b)
    }
    fn gcd_n(&self, a: &[u64; L]) -> Natural {
        Natural::from_limbs_asc(a).gcd(&self.nat)
    }
}

/// `Z/nZ` on malachite naturals: slow, allocation per operation, any width.
#[derive(Clone, Debug)]
pub(crate) struct NatRing {
    n: Natural,
}

impl NatRing {
    pub(crate) fn new(n: &Natural) -> Self {
        NatRing { n: n.clone() }
    }
}

impl ModRing for NatRing {
    type E = Natural;
    fn modulus(&self) -> &Natural {
        &self.n
    }
    fn one(&self) -> Natural {
        Natural::ONE % &self.n
    }
    fn from_u64(&self, x: u64) -> Natural {
        Natural::from(x) % &self.n
    }
    fn from_natural(&self, x: &Natural) -> Natural {
        x % &self.n
    }
    fn to_natural(&self, x: &Natural) -> Natural {
        x.clone()
    }
    fn add(&self, a: &Natural, b: &Natural) -> Natural {
        let s = a + b;
        if s >= self.n {
            s - &self.n
        } else {
            s
        }
    }
    fn sub(&self, a: &Natural, b: &Natural) -> Natural {
        if a >= b {
            a - b
        } else {
            a + &self.n - b
        }
    }
    fn mul(&self, a: &Natural, b: &Natural) -> Natural {
        (a * b) % &self.n
    }
    fn gcd_n(&self, a: &Natural) -> Natural {
        a.gcd(&self.n)
    }
}

/// Montgomery arithmetic modulo an odd word `n`, for the `u64` fast path.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Mont64 {
    pub(crate) n: u64,
    ninv: u64, // n^{-1} mod 2^64
    pub(crate) one: u64,
}

impl Mont64 {
    pub(crate) fn new(n: u64) -> Self {
        debug_assert!(n % 2 == 1 && n > 1);
        let ninv = neg_inv_word(n).wrapping_neg();
        let one = ((1u128 << 64) % n as u128) as u64;
        Mont64 { n, ninv, one }
    }
    /// `a b R^{-1} mod n` for `a, b < n`.
    #[inline]
    pub(crate) fn mul(&self, a: u64, b: u64) -> u64 {
        let t = a as u128 * b as u128;
        let m = (t as u64).wrapping_mul(self.ninv);
        let mn_hi = ((m as u128 * self.n as u128) >> 64) as u64;
        let t_hi = (t >> 64) as u64;
        let (r, borrow) = t_hi.overflowing_sub(mn_hi);
        if borrow {
            r.wrapping_add(self.n)
        } else {
            r
        }
    }
    #[inline]
    pub(crate) fn add(&self, a: u64, b: u64) -> u64 {
        let (s, c) = a.overflowing_add(b);
        if c || s >= self.n {
            s.wrapping_sub(self.n)
        } else {
            s
        }
    }
    #[inline]
    pub(crate) fn sub(&self, a: u64, b: u64) -> u64 {
        if a >= b {
            a - b
        } else {
            a.wrapping_sub(b).wrapping_add(self.n)
        }
    }
    pub(crate) fn to_mont(&self, x: u64) -> u64 {
        (((x as u128) << 64) % self.n as u128) as u64
    }
    #[cfg(test)]
    pub(crate) fn from_mont(&self, x: u64) -> u64 {
        self.mul(x, 1)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use proptest::prelude::*;

    fn check_ring<R: ModRing>(r: &R, a: &Natural, b: &Natural) {
        let n = r.modulus().clone();
        let (ea, eb) = (r.from_natural(a), r.from_natural(b));
        assert_eq!(r.to_natural(&r.mul(&ea, &eb)), (a * b) % &n);
        assert_eq!(r.to_natural(&r.add(&ea, &eb)), (a + b) % &n);
        let am = a % &n;
        let bm = b % &n;
        let diff = if am >= bm { &am - &bm } else { &am + &n - &bm };
        assert_eq!(r.to_natural(&r.sub(&ea, &eb)), diff);
        assert_eq!(r.to_natural(&r.one()), Natural::ONE % &n);
        assert_eq!(r.gcd_n(&ea), a.gcd(&n));
    }

    fn from_words(ws: &[u64]) -> Natural {
        Natural::from_limbs_asc(ws)
    }

    proptest! {
        #[test]
        fn montgomery_matches_plain_arithmetic(
            nw in proptest::collection::vec(any::<u64>(), 4),
            aw in proptest::collection::vec(any::<u64>(), 5),
            bw in proptest::collection::vec(any::<u64>(), 5),
            len in 1usize..=4,
        ) {
            let mut nw = nw[..len].to_vec();
            nw[0] |= 1;
            if nw[len - 1] == 0 { nw[len - 1] = 1; }
            let n = from_words(&nw);
            prop_assume!(n > 1u32);
            let a = from_words(&aw);
            let b = from_words(&bw);
            check_ring(&MontN::<4>::new(&n).unwrap(), &a, &b);
            check_ring(&NatRing::new(&n), &a, &b);
            if len <= 2 {
                check_ring(&MontN::<2>::new(&n).unwrap(), &a, &b);
            }
            if len == 1 {
                check_ring(&MontN::<1>::new(&n).unwrap(), &a, &b);
            }
        }

        #[test]
        fn mont64_matches_u128(n in any::<u64>(), a in any::<u64>(), b in any::<u64>()) {
            let n = n | 1;
            prop_assume!(n > 1);
            let m = Mont64::new(n);
            let (a, b) = (a % n, b % n);
            let want = (a as u128 * b as u128 % n as u128) as u64;
            let got = m.from_mont(m.mul(m.to_mont(a), m.to_mont(b)));
            prop_assert_eq!(got, want);
            prop_assert_eq!(m.from_mont(m.add(m.to_mont(a), m.to_mont(b))), ((a as u128 + b as u128) % n as u128) as u64);
            prop_assert_eq!(m.from_mont(m.sub(m.to_mont(a), m.to_mont(b))), ((a as u128 + n as u128 - b as u128) % n as u128) as u64);
        }
    }
}
