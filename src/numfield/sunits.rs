//! S-units modulo squares: the group
//! `K(S,2) = {x in K*/K*^2 : v_P(x) even for every prime ideal P outside S}`
//! with a basis of explicit elements (compact products) and the map from
//! `K*` to its F2-coordinates.
//!
//! Construction (H. Cohen, *Advanced Topics in Computational Number
//! Theory*, GTM 193, 2000, §5.2 and §7.4): with a factor base `FB ⊃ S`
//! that generates the class group, every class in `K(S,2)` has a
//! representative that is an FB-unit, and `U_FB / U_FB^2` injects into
//! `K*/K*^2`. A Z-basis of `U_FB` modulo torsion is given by the
//! fundamental units and the elements of the echelon basis of the relation
//! lattice; the classes with even valuations outside `S` form the kernel of
//! an F2 matrix. Coordinates are read off by quadratic characters
//! `x -> (x(r) | p)` at degree-one primes `(p, theta - r)` outside `FB`,
//! taken until they separate the basis.

use super::classgroup::{ClassGroup, ClassGroupOptions, CompactProduct};
use super::field::{Element, NumberField};
use super::linalg::{left_kernel_mod_p, mod_word, rank_mod_p};
use crate::arith::{inv_mod, is_prime_u64, jacobi_u64, mul_mod, FactorLimits};
use crate::{Error, ErrorKind};
use malachite::Integer;

/// The group `K(S,2)` for `S` the prime ideals above a set of rational primes.
#[derive(Clone, Debug)]
pub struct SquareClasses {
    /// The rational primes whose prime ideals form `S`.
    pub primes: Vec<u64>,
    /// Number of prime ideals in `S`.
    pub prime_ideals: usize,
    /// An F2-basis: a root of unity, the fundamental units, then S-units
    /// and elements whose ideal is a square times S-ideals.
    pub basis: Vec<CompactProduct>,
    /// The class group data it was built from (factor base contains S).
    pub class_group: ClassGroup,
    /// Degree-one primes `(p, r)` whose characters separate the basis.
    characters: Vec<(u64, u64)>,
    /// Character values of the basis (bit j of entry i: character j of basis element i).
    table: Vec<Vec<u64>>,
}

impl SquareClasses {
    /// The F2-dimension.
    pub fn dimension(&self) -> usize {
        self.basis.len()
    }

    /// The coordinates of `x` in the basis, after checking that `x` lies in
    /// `K(S,2)` (its valuations outside `S` even: its norm is factored
    /// within `limits`). Not in `K(S,2)` is [`ErrorKind::InvalidValue`].
    pub fn coordinates(&self, k: &NumberField, x: &Element, limits: &FactorLimits) -> Result<Vec<u8>, Error> {
        if x.is_zero() {
            return Err(Error::new(ErrorKind::InvalidValue, "zero has no square class"));
        }
        let id = k.principal_ideal(x)?;
        for (q, v) in k.factor_ideal(&id, limits)? {
            if v % 2 != 0 && !self.primes.contains(&q.p) {
                return Err(Error::new(ErrorKind::InvalidValue, format!("odd valuation at a prime above {} outside S", q.p)));
            }
        }
        let cx: Vec<u64> = self.characters.iter().map(|&(p, r)| char_of(k, x, p, r)).collect::<Option<Vec<u64>>>()
            .ok_or_else(|| Error::new(ErrorKind::InvalidValue, "element not coprime to a character prime"))?;
        // solve sum a_i table[i] = cx over F2
        let m = self.basis.len();
        let mut rows: Vec<Vec<u64>> = self.table.clone();
        rows.push(cx);
        let ker = left_kernel_mod_p(&rows, self.characters.len(), 2);
        let sol = ker.iter().find(|v| v[m] == 1).ok_or_else(|| Error::new(ErrorKind::InvalidValue, "characters inconsistent with the basis (internal)"))?;
        Ok(sol[..m].iter().map(|&b| b as u8).collect())
    }
}

/// The character `(x(r) | p)` as a bit (1 for -1), `None` if `x(r) = 0 mod p`.
fn char_of(k: &NumberField, x: &Element, p: u64, r: u64) -> Option<u64> {
    let pb = k.to_power_basis(x);
    let mut acc = 0u64;
    let mut rp = 1u64;
    for c in &pb {
        let num = mod_word(&Integer::from(c.numerator_ref().clone()), p);
        let num = if *c < 0 { (p - num) % p } else { num };
        let den = mod_word(&Integer::from(c.denominator_ref().clone()), p);
        let term = mul_mod(num, inv_mod(den, p)?, p);
        acc = (acc + mul_mod(term, rp, p)) % p;
        rp = mul_mod(rp, r, p);
    }
    match jacobi_u64(acc, p) {
        1 => Some(0),
        -1 => Some(1),
        _ => None,
    }
}

fn char_of_product(k: &NumberField, x: &CompactProduct, p: u64, r: u64) -> Option<u64> {
    let mut b = 0;
    for (e, n) in &x.factors {
        let c = char_of(k, e, p, r)?;
        if n.rem_euclid(2) == 1 {
            b ^= c;
        }
    }
    Some(b)
}

impl NumberField {
    /// `K(S,2)` for `S` the prime ideals above `s_primes`, with a basis and
    /// a coordinate map. Rests on the class group computation (see
    /// [`NumberField::class_group`] for what is conditional).
    ///
    /// ```
    /// use malachite::Integer;
    /// use twofold::arith::FactorLimits;
    /// use twofold::numfield::{ClassGroupOptions, NumberField};
    /// let z = |v: &[i64]| v.iter().map(|&c| Integer::from(c)).collect::<Vec<_>>();
    /// let k = NumberField::new(&z(&[-2, 0, 0, 1])).unwrap(); // Q(2^(1/3)), h = 1, r = 1
    /// let ks = k.square_classes(&[2], &ClassGroupOptions::default()).unwrap();
    /// assert_eq!(ks.dimension(), 3); // -1, the unit, and 2^(1/3) (the prime above 2)
    /// let c = ks.coordinates(&k, &k.generator(), &FactorLimits::default()).unwrap();
    /// assert_eq!(c.iter().filter(|&&b| b == 1).count() >= 1, true);
    /// ```
    pub fn square_classes(&self, s_primes: &[u64], opts: &ClassGroupOptions) -> Result<SquareClasses, Error> {
        let cg = self.class_group_with(opts, s_primes)?;
        let fb = &cg.factor_base;
        let kfb = fb.len();
        let outside: Vec<usize> = (0..kfb).filter(|&i| !s_primes.contains(&fb[i].p)).collect();
        let n_s = kfb - outside.len();
        // F2 matrix: echelon rows restricted to the columns outside S
        let a: Vec<Vec<u64>> = cg.echelon.iter().map(|(v, _)| outside.iter().map(|&j| (v[j].rem_euclid(2)) as u64).collect()).collect();
        let ker = left_kernel_mod_p(&a, outside.len(), 2);
        let mut basis: Vec<CompactProduct> = Vec::new();
        basis.push(CompactProduct { factors: vec![(cg.torsion_generator.clone(), 1)] });
        basis.extend(cg.units.iter().cloned());
        for kv in &ker {
            let mut factors = Vec::new();
            for (i, &bit) in kv.iter().enumerate() {
                if bit == 1 {
                    factors.extend(cg.echelon[i].1.factors.iter().cloned());
                }
            }
            basis.push(CompactProduct { factors });
        }
        // characters at degree-one primes beyond the factor base
        let m = basis.len();
        let mut characters = Vec::new();
        let mut table: Vec<Vec<u64>> = vec![Vec::new(); m];
        let mut p = cg.bound.max(1000) + 1;
        let fp_poly = |p: u64| -> Vec<u64> { self.poly.iter().map(|c| mod_word(c, p)).collect() };
        let mut extra = 0;
        while characters.len() < 20 * m + 40 {
            p += 1;
            if !is_prime_u64(p) || mod_word(&self.poly_disc, p) == 0 {
                continue;
            }
            for r in super::fp::roots(&fp_poly(p), p) {
                let col: Option<Vec<u64>> = basis.iter().map(|b| char_of_product(self, b, p, r)).collect();
                let Some(col) = col else { continue };
                characters.push((p, r));
                for (t, c) in table.iter_mut().zip(col) {
                    t.push(c);
                }
            }
            if rank_mod_p(&table, 2) == m {
                extra += 1;
                if extra > 8 {
                    break;
                }
            }
        }
        if rank_mod_p(&table, 2) != m {
            return Err(Error::new(ErrorKind::InvalidValue, "the basis of K(S,2) is not independent under the characters (internal)"));
        }
        Ok(SquareClasses { primes: s_primes.to_vec(), prime_ideals: n_s, basis, class_group: cg, characters, table })
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::numfield::linalg::smith_invariants;
    use malachite::base::num::arithmetic::traits::Mod;

    fn z(v: &[i64]) -> Vec<Integer> {
        v.iter().map(|&c| Integer::from(c)).collect()
    }

    #[test]
    fn dimension_law_and_coordinates() {
        let limits = FactorLimits::default();
        // Q(sqrt -5) (Cl = Z/2), Q(sqrt -14) (Z/4), Q(sqrt -21) ((Z/2)^2), Q(sqrt 10) (Z/2),
        // x^3 - 2, x^3 - x^2 - 3x + 1, x^3 - 10 (class numbers from memory: 2, 4, 4, 2, 1, 1, 1)
        let fields = [z(&[5, 0, 1]), z(&[14, 0, 1]), z(&[21, 0, 1]), z(&[-10, 0, 1]), z(&[-2, 0, 0, 1]), z(&[1, -3, -1, 1]), z(&[-10, 0, 0, 1])];
        let hs = [2, 4, 4, 2, 1, 1, 1];
        for (f, h) in fields.iter().zip(hs) {
            let k = NumberField::new(f).unwrap();
            for s in [vec![], vec![2u64], vec![3], vec![2, 3], vec![5, 7]] {
                let ks = k.square_classes(&s, &ClassGroupOptions::default()).unwrap();
                let cg = &ks.class_group;
                assert_eq!(cg.class_number, h, "{f:?}");
                // independent: Cl_S = Z^FB / (relations + S columns), its 2-rank by Smith form
                let kfb = cg.factor_base.len();
                let mut m: Vec<Vec<Integer>> = cg.echelon.iter().map(|(v, _)| v.iter().map(|&x| Integer::from(x)).collect()).collect();
                for (j, q) in cg.factor_base.iter().enumerate() {
                    if s.contains(&q.p) {
                        let mut e = vec![Integer::from(0); kfb];
                        e[j] = Integer::from(1);
                        m.push(e);
                    }
                }
                let h = crate::numfield::linalg::hnf(&m, kfb, None).unwrap();
                let inv = smith_invariants(&h);
                let two_rank = inv.iter().filter(|d| (*d).mod_op(Integer::from(2)) == 0).count();
                let r = k.signature().0 + k.signature().1 - 1;
                assert_eq!(ks.dimension(), r + 1 + ks.prime_ideals + two_rank, "{f:?} S={s:?}");
                // basis elements: in K(S,2), coordinates are unit vectors; squares are zero; additivity
                let elems: Vec<Element> = ks.basis.iter().map(|b| b.expand(&k).unwrap()).collect();
                for (i, e) in elems.iter().enumerate() {
                    let c = ks.coordinates(&k, e, &limits).unwrap();
                    assert_eq!(c, (0..elems.len()).map(|j| u8::from(i == j)).collect::<Vec<_>>());
                    let sq = k.mul(e, e);
                    assert!(ks.coordinates(&k, &sq, &limits).unwrap().iter().all(|&b| b == 0));
                }
                if elems.len() >= 2 {
                    let prod = k.mul(&elems[0], &elems[elems.len() - 1]);
                    let c = ks.coordinates(&k, &prod, &limits).unwrap();
                    let want: Vec<u8> = (0..elems.len()).map(|j| u8::from(j == 0) ^ u8::from(j == elems.len() - 1)).collect();
                    assert_eq!(c, want);
                }
                // an element with an odd valuation outside S is refused
                let t = k.rational(&malachite::Rational::from(11));
                let t = k.mul(&t, &k.one());
                if !s.contains(&11) && k.primes_above(11).unwrap().iter().any(|q| q.e % 2 == 1) {
                    assert_eq!(ks.coordinates(&k, &t, &limits).unwrap_err().kind(), &ErrorKind::InvalidValue);
                }
            }
        }
    }
}
