//! S-units modulo cubes: the group
//! `K(S,3) = {x in K*/K*^3 : v_P(x) = 0 mod 3 for every prime ideal P outside S}`
//! with a basis of explicit elements (compact products) and the map from
//! `K*` to its F3-coordinates: the cube analogue of `sunits.rs`.
//!
//! Construction (the argument of `sunits.rs` with 3 for 2; H. Cohen,
//! *Advanced Topics in Computational Number Theory*, GTM 193, 2000, §5.2
//! and §7.4): take a factor base `FB ⊃ S` of prime ideals that generates
//! the class group (every prime ideal up to the Minkowski or Bach bound is
//! shown to lie in the subgroup it generates). Then every class of
//! `K(S,3)` contains an FB-unit (for `x` with valuations `3 a_P` outside
//! `S`, write `prod_{P not in FB} P^(a_P) = (y) J` with `J` on `FB`; then
//! `x / y^3` is an FB-unit), and an FB-unit that is a cube in `K` is the
//! cube of an FB-unit. By Dirichlet's S-unit theorem the FB-units modulo
//! cubes form an F3-space of dimension exactly
//! `N = |FB| + r1 + r2 - 1 + [3 | w]` (`w` the number of roots of unity:
//! a primitive cube root of unity is not a cube in `K`). Relations
//! (FB-units found by the relation search, the rational primes, the root
//! of unity) are mapped to F3-vectors: valuations mod 3 on `FB` and cubic
//! residue characters `x -> (x mod P)^((p-1)/3)` at degree-one primes
//! `P | p`, `p = 1 mod 3`, beyond the bound, read as exponents of a fixed
//! cube root of unity mod `p`. A character never separates two elements of
//! one cube class, so once `N` relations have independent vectors they are
//! a basis of `U_FB / U_FB^3` (a proof: only the 3-saturation of the
//! relation lattice is used, no class number or regulator). `K(S,3)` is
//! the kernel of the valuations mod 3 outside `S`, an F3 kernel; its basis
//! elements are products of relation elements with exponents 1 or 2.

// Used by descent/cube_isogeny.rs, itself used only by its tests until the
// pipeline runs it (DEVELOPERS.md, Known gaps).
#![cfg_attr(not(test), allow(dead_code))]

use super::classgroup::{
    ClassGroupOptions, CompactProduct, FactorBaseBound, MAX_ROUNDS, MIN_FACTOR_BASE_BOUND,
};
use super::field::{Element, NumberField};
use super::ideal::PrimeIdeal;
use super::linalg::mod_word;
use super::relations::{base_bound, Found, RelationSearch};
use crate::arith::{inv_mod, is_prime_u64, mul_mod, pow_mod, FactorLimits};
use crate::{Error, ErrorKind};
use std::sync::atomic::Ordering;
use std::time::Instant;

/// Number of cubic characters in the F3 vectors.
const CHARACTERS: usize = 96;

/// Rounds aimed at one column without a pivot before it is left to the
/// ordinary rounds.
const TARGETED_ATTEMPTS: usize = 12;

/// The group `K(S,3)` for `S` the prime ideals above a set of rational
/// primes, with an F3-basis and a coordinate map.
#[derive(Clone, Debug)]
pub(crate) struct CubeClasses {
    /// The rational primes whose prime ideals form `S`.
    pub(crate) primes: Vec<u64>,
    /// An F3-basis: products of relation elements (exponents 1 or 2).
    pub(crate) basis: Vec<CompactProduct>,
    /// Which bound the factor base was shown to generate the class group
    /// up to ([`FactorBaseBound::BachGrh`]: conditional on GRH).
    pub(crate) bound_kind: FactorBaseBound,
    /// The prime ideals of `S`, in the order of the valuation part of the
    /// coordinate table.
    s_ideals: Vec<PrimeIdeal>,
    /// The characters: `(p, integral basis at the root mod p, cube root of
    /// unity mod p)`.
    characters: Vec<CubicCharacter>,
    /// Per basis element: valuations mod 3 at `s_ideals`, then the
    /// character values.
    table: Vec<Vec<u8>>,
}

/// A cubic residue character at a degree-one prime `(p, theta - r)`.
#[derive(Clone, Debug)]
struct CubicCharacter {
    p: u64,
    /// The integral basis evaluated at `r` mod `p`.
    basis_at_root: Vec<u64>,
    /// A primitive cube root of unity mod `p`.
    omega: u64,
}

impl CubicCharacter {
    /// Exponent `e` with `a^((p-1)/3) = omega^e` for `a` a unit mod `p`.
    fn of_residue(&self, a: u64) -> Option<u8> {
        let p = self.p;
        if a % p == 0 {
            return None;
        }
        let t = pow_mod(a % p, (p - 1) / 3, p);
        if t == 1 {
            Some(0)
        } else if t == self.omega {
            Some(1)
        } else {
            Some(2)
        }
    }

    /// The value at `x`, `None` when `x` is not a unit at the prime.
    fn of(&self, x: &Element) -> Option<u8> {
        let p = self.p;
        let mut acc = 0u64;
        for (c, wi) in x.coords().iter().zip(&self.basis_at_root) {
            acc = (acc + mul_mod(mod_word(c, p), *wi, p)) % p;
        }
        let num = self.of_residue(acc)?;
        let den = self.of_residue(mod_word(x.den(), p))?;
        Some((num + 3 - den) % 3)
    }
}

/// `count` cubic characters at degree-one primes `p = 1 mod 3` above `from`,
/// not dividing the discriminant of the defining polynomial or the basis
/// denominator.
fn cubic_characters(k: &NumberField, from: u64, count: usize) -> Vec<CubicCharacter> {
    let mut list = Vec::with_capacity(count);
    let mut p = from.max(1000) | 1;
    let (rows, den) = k.integral_basis();
    while list.len() < count {
        p += 2;
        if p % 3 != 1 || !is_prime_u64(p) || mod_word(&k.poly_disc, p) == 0 || mod_word(den, p) == 0
        {
            continue;
        }
        let Some(dinv) = inv_mod(mod_word(den, p), p) else {
            continue;
        };
        let Some(omega) = (2..p).map(|g| pow_mod(g, (p - 1) / 3, p)).find(|&t| t != 1) else {
            continue;
        };
        let fp: Vec<u64> = k.poly.iter().map(|c| mod_word(c, p)).collect();
        for r in super::fp::roots(&fp, p) {
            if list.len() == count {
                break;
            }
            let w: Vec<u64> = rows
                .iter()
                .map(|row| {
                    let mut acc = 0u64;
                    let mut rp = 1u64;
                    for c in row {
                        acc = (acc + mul_mod(mod_word(c, p), rp, p)) % p;
                        rp = mul_mod(rp, r, p);
                    }
                    mul_mod(acc, dinv, p)
                })
                .collect();
            list.push(CubicCharacter {
                p,
                basis_at_root: w,
                omega,
            });
        }
    }
    list
}

/// Character values of `x` (entry `None` where `x` is not a unit).
fn character_values(list: &[CubicCharacter], x: &Element) -> Vec<Option<u8>> {
    list.iter().map(|c| c.of(x)).collect()
}

/// An F3 echelon of vectors, pivot at the first non-zero entry, pivot
/// entries normalised to 1.
struct Echelon3 {
    rows: Vec<Option<Vec<u8>>>,
    rank: usize,
}

impl Echelon3 {
    fn new(width: usize) -> Echelon3 {
        Echelon3 {
            rows: vec![None; width],
            rank: 0,
        }
    }

    /// Inserts `v`; whether it was independent of the rows before.
    fn insert(&mut self, mut v: Vec<u8>) -> bool {
        loop {
            let Some(c) = v.iter().position(|&x| x != 0) else {
                return false;
            };
            match &self.rows[c] {
                Some(r) => {
                    let f = v[c];
                    for (x, y) in v.iter_mut().zip(r) {
                        *x = (*x + 3 * 3 - f * y) % 3;
                    }
                }
                None => {
                    if v[c] == 2 {
                        for x in v.iter_mut() {
                            *x = (*x * 2) % 3;
                        }
                    }
                    self.rows[c] = Some(v);
                    self.rank += 1;
                    return true;
                }
            }
        }
    }
}

/// Left kernel over F3 of the rows `a` (entries 0..3, `cols` wide): a
/// basis of the coefficient vectors `c` with `sum c_i a_i = 0`.
pub(crate) fn left_kernel_f3(a: &[Vec<u8>], cols: usize) -> Vec<Vec<u8>> {
    let m = a.len();
    let mut rows: Vec<Vec<u8>> = a
        .iter()
        .enumerate()
        .map(|(i, r)| {
            let mut v = vec![0u8; cols + m];
            v[..cols].copy_from_slice(&r[..cols]);
            v[cols + i] = 1;
            v
        })
        .collect();
    let mut r0 = 0;
    for c in 0..cols {
        let Some(pr) = (r0..m).find(|&i| rows[i][c] != 0) else {
            continue;
        };
        rows.swap(pr, r0);
        if rows[r0][c] == 2 {
            for x in rows[r0].iter_mut() {
                *x = (*x * 2) % 3;
            }
        }
        let pivot = rows[r0].clone();
        for (i, row) in rows.iter_mut().enumerate() {
            let f = row[c];
            if i != r0 && f != 0 {
                for (x, y) in row.iter_mut().zip(&pivot) {
                    *x = (*x + 9 - f * y) % 3;
                }
            }
        }
        r0 += 1;
    }
    rows[r0..].iter().map(|r| r[cols..].to_vec()).collect()
}

/// Solves `sum_i c_i rows[i] = target` over F3 for the unique `c`; `None`
/// when there is no solution, `Some(Err(()))` when it is not unique.
pub(crate) fn solve_f3(rows: &[Vec<u8>], target: &[u8]) -> Option<Result<Vec<u8>, ()>> {
    let m = rows.len();
    let cols = target.len();
    // the kernel of (rows; -target) with last coefficient 1
    let mut a: Vec<Vec<u8>> = rows.to_vec();
    a.push(target.iter().map(|&t| (3 - t % 3) % 3).collect());
    let ker = left_kernel_f3(&a, cols);
    let with_t: Vec<&Vec<u8>> = ker.iter().filter(|v| v[m] != 0).collect();
    if with_t.is_empty() {
        return None;
    }
    if ker.len() > 1 {
        return Some(Err(()));
    }
    let v = with_t[0];
    // normalise the coefficient of the target to 1
    let scale = if v[m] == 1 { 1 } else { 2 };
    Some(Ok(v[..m].iter().map(|&x| (x * scale) % 3).collect()))
}

/// A relation as an F3 generator: relation elements with exponent mod 3,
/// the exponent of the root of unity, valuations mod 3 on the factor base.
struct Generator {
    exps: Vec<(usize, u8)>,
    torsion: u8,
    val: Vec<u8>,
}

impl CubeClasses {
    /// The F3-dimension.
    pub(crate) fn dimension(&self) -> usize {
        self.basis.len()
    }

    /// Whether the result rests on the generalised Riemann hypothesis.
    pub(crate) fn conditional_on_grh(&self) -> bool {
        self.bound_kind == FactorBaseBound::BachGrh
    }

    /// The coordinates of `x` in the basis, after checking that `x` lies in
    /// `K(S,3)` (its valuations outside `S` divisible by 3: the norm is
    /// factored within `limits`). Outside `K(S,3)` is
    /// [`ErrorKind::InvalidValue`].
    pub(crate) fn coordinates(
        &self,
        k: &NumberField,
        x: &Element,
        limits: &FactorLimits,
    ) -> Result<Vec<u8>, Error> {
        if x.is_zero() {
            return Err(Error::new(
                ErrorKind::InvalidValue,
                "zero has no cube class",
            ));
        }
        let id = k.principal_ideal(x)?;
        for (q, v) in k.factor_ideal(&id, limits)? {
            if v % 3 != 0 && !self.primes.contains(&q.p) {
                return Err(Error::new(
                    ErrorKind::InvalidValue,
                    format!("valuation {v} at a prime above {} outside S", q.p),
                ));
            }
        }
        self.coordinates_unchecked(k, x)
    }

    /// The coordinates of an `x` known to lie in `K(S,3)`.
    pub(crate) fn coordinates_unchecked(
        &self,
        k: &NumberField,
        x: &Element,
    ) -> Result<Vec<u8>, Error> {
        if x.is_zero() {
            return Err(Error::new(
                ErrorKind::InvalidValue,
                "zero has no cube class",
            ));
        }
        let ns = self.s_ideals.len();
        let chars = character_values(&self.characters, x);
        let mut target: Vec<u8> = Vec::with_capacity(ns + chars.len());
        for q in &self.s_ideals {
            target.push(k.valuation(x, q)?.rem_euclid(3) as u8);
        }
        let usable: Vec<usize> = (0..chars.len()).filter(|&j| chars[j].is_some()).collect();
        target.extend(usable.iter().map(|&j| chars[j].unwrap_or(0)));
        let rows: Vec<Vec<u8>> = self
            .table
            .iter()
            .map(|r| {
                let mut v = r[..ns].to_vec();
                v.extend(usable.iter().map(|&j| r[ns + j]));
                v
            })
            .collect();
        match solve_f3(&rows, &target) {
            Some(Ok(c)) => Ok(c),
            Some(Err(())) => Err(Error::new(
                ErrorKind::InvalidValue,
                "the element meets too many character primes: its cube class is not determined",
            )),
            None => Err(Error::internal(
                "numfield::cube_classes",
                "an element of K(S,3) outside the span of the basis",
            )),
        }
    }
}

impl NumberField {
    /// `K(S,3)` for `S` the prime ideals above `s_primes`, with a basis and
    /// a coordinate map (see the module source for the argument). Proven
    /// apart from the generation statement (Minkowski's bound: none; Bach's
    /// bound: GRH). Honours `opts.deadline` and `opts.cancel`.
    pub(crate) fn cube_classes(
        &self,
        s_primes: &[u64],
        opts: &ClassGroupOptions,
    ) -> Result<CubeClasses, Error> {
        let stop = || {
            opts.cancel
                .as_ref()
                .is_some_and(|c| c.load(Ordering::Relaxed))
                || opts.deadline.is_some_and(|d| Instant::now() >= d)
        };
        let mut s_primes: Vec<u64> = s_primes.to_vec();
        s_primes.sort_unstable();
        s_primes.dedup();
        for &p in &s_primes {
            if !is_prime_u64(p) {
                return Err(Error::new(
                    ErrorKind::InvalidValue,
                    format!("{p} is not a prime"),
                ));
            }
        }
        let (gen_bound, kind) = self.generation_bound(opts)?;
        let b0 = (base_bound(self) / 2)
            .min(gen_bound)
            .max(MIN_FACTOR_BASE_BOUND);
        let mut rels = RelationSearch::new(self, b0, gen_bound, &s_primes, &stop)?;
        // `-a` is `a` modulo cubes, and `g a` (g an integer) differs from
        // `a` by free relations: the dimension count below decides
        // completeness whatever is skipped
        rels.primitive_only = true;
        let kfb = rels.fb.len();
        let (w, zeta) = self.roots_of_unity();
        let target = kfb + self.r1 + self.r2 - 1 + usize::from(w % 3 == 0);
        let ch = cubic_characters(
            self,
            gen_bound.max(*s_primes.last().unwrap_or(&0)) + 1,
            CHARACTERS,
        );
        let width = kfb + CHARACTERS;
        let mut echelon = Echelon3::new(width);
        let mut gens: Vec<Generator> = Vec::new();
        let mut elem_chars: Vec<Option<Vec<u8>>> = Vec::new();
        let zeta_chars: Vec<u8> = character_values(&ch, &zeta)
            .into_iter()
            .map(|c| c.unwrap_or(0))
            .collect();
        let offer = |found: &Found,
                     rels: &RelationSearch,
                     torsion: u8,
                     elem_chars: &mut Vec<Option<Vec<u8>>>,
                     echelon: &mut Echelon3,
                     gens: &mut Vec<Generator>| {
            while elem_chars.len() < rels.elems.len() {
                let vals = character_values(&ch, &rels.elems[elem_chars.len()]);
                // relation elements are units at the character primes (beyond
                // the bound); should one not be, its relations are left out
                elem_chars.push(vals.into_iter().collect::<Option<Vec<u8>>>());
            }
            if found.exps.iter().any(|&(i, _)| elem_chars[i].is_none()) {
                return;
            }
            let mut exps: Vec<(usize, u8)> = Vec::new();
            for &(i, e) in &found.exps {
                let e = e.rem_euclid(3) as u8;
                if e != 0 {
                    exps.push((i, e));
                }
            }
            let val: Vec<u8> = found.v.iter().map(|&e| e.rem_euclid(3) as u8).collect();
            let mut vec = val.clone();
            vec.resize(width, 0);
            for &(i, e) in &exps {
                if let Some(cv) = &elem_chars[i] {
                    for (x, y) in vec[kfb..].iter_mut().zip(cv) {
                        *x = (*x + e * y) % 3;
                    }
                }
            }
            for (x, y) in vec[kfb..].iter_mut().zip(&zeta_chars) {
                *x = (*x + torsion * y) % 3;
            }
            if echelon.insert(vec) {
                gens.push(Generator { exps, torsion, val });
            }
        };
        // the root of unity, then the rational primes of the base
        let empty = Found {
            exps: Vec::new(),
            v: vec![0; kfb],
            logs: Vec::new(),
            err: 0.0,
        };
        if w % 3 == 0 {
            offer(&empty, &rels, 1, &mut elem_chars, &mut echelon, &mut gens);
        }
        for p in rels.column_primes() {
            if let Some(f) = rels.free_relation(p)? {
                offer(&f, &rels, 0, &mut elem_chars, &mut echelon, &mut gens);
            }
        }
        let max_rounds = MAX_ROUNDS + 40 * kfb;
        let mut round = 0usize;
        let mut found: Vec<Found> = Vec::new();
        let mut attempts = vec![0usize; kfb];
        let mut cursor = 0usize;
        while echelon.rank < target {
            round += 1;
            let aim = if round > kfb + 1 && round % 2 == 0 {
                (0..kfb)
                    .map(|i| (cursor + i) % kfb)
                    .find(|&j| echelon.rows[j].is_none() && attempts[j] < TARGETED_ATTEMPTS)
            } else {
                None
            };
            match aim {
                Some(j) => {
                    attempts[j] += 1;
                    cursor = j + 1;
                    if round > max_rounds {
                        return Err(Error::new(
                            ErrorKind::Budget,
                            "K(S,3): too many rounds of relation search",
                        ));
                    }
                    rels.targeted_round(j, attempts[j], &stop, "K(S,3)", &mut found)?;
                }
                None => rels.round(round, max_rounds, &stop, "K(S,3)", &mut found)?,
            }
            for f in found.drain(..) {
                offer(&f, &rels, 0, &mut elem_chars, &mut echelon, &mut gens);
                if echelon.rank == target {
                    break;
                }
            }
        }
        rels.verify_all(&stop)?;
        if stop() {
            return Err(Error::new(ErrorKind::Budget, "K(S,3): budget exhausted"));
        }
        // K(S,3): combinations of the generators with valuations 0 mod 3 outside S
        let outside: Vec<usize> = (0..kfb)
            .filter(|&j| !s_primes.contains(&rels.fb[j].p))
            .collect();
        let s_cols: Vec<usize> = (0..kfb)
            .filter(|&j| s_primes.contains(&rels.fb[j].p))
            .collect();
        let a: Vec<Vec<u8>> = gens
            .iter()
            .map(|g| outside.iter().map(|&j| g.val[j]).collect())
            .collect();
        let ker = left_kernel_f3(&a, outside.len());
        let mut basis = Vec::with_capacity(ker.len());
        let mut table = Vec::with_capacity(ker.len());
        for coef in &ker {
            let mut exps: std::collections::BTreeMap<usize, u8> = std::collections::BTreeMap::new();
            let mut torsion = 0u8;
            let mut val = vec![0u8; kfb];
            for (g, &c) in gens.iter().zip(coef) {
                if c == 0 {
                    continue;
                }
                for &(i, e) in &g.exps {
                    let slot = exps.entry(i).or_insert(0);
                    *slot = (*slot + c * e) % 3;
                }
                torsion = (torsion + c * g.torsion) % 3;
                for (x, y) in val.iter_mut().zip(&g.val) {
                    *x = (*x + c * y) % 3;
                }
            }
            let mut row: Vec<u8> = s_cols.iter().map(|&j| val[j]).collect();
            let mut chars = vec![0u8; CHARACTERS];
            for (&i, &e) in &exps {
                if let Some(cv) = &elem_chars[i] {
                    for (x, y) in chars.iter_mut().zip(cv) {
                        *x = (*x + e * y) % 3;
                    }
                }
            }
            for (x, y) in chars.iter_mut().zip(&zeta_chars) {
                *x = (*x + torsion * y) % 3;
            }
            row.extend(chars);
            let mut factors: Vec<(Element, i64)> = exps
                .iter()
                .filter(|(_, &e)| e != 0)
                .map(|(&i, &e)| (rels.elems[i].clone(), i64::from(e)))
                .collect();
            if torsion != 0 {
                factors.insert(0, (zeta.clone(), i64::from(torsion)));
            }
            basis.push(CompactProduct { factors });
            table.push(row);
        }
        let s_ideals: Vec<PrimeIdeal> = s_cols.iter().map(|&j| rels.fb[j].clone()).collect();
        Ok(CubeClasses {
            primes: s_primes,
            basis,
            bound_kind: kind,
            s_ideals,
            characters: ch,
            table,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use malachite::base::num::arithmetic::traits::Mod;
    use malachite::{Integer, Rational};

    fn z(v: &[i64]) -> Vec<Integer> {
        v.iter().map(|&c| Integer::from(c)).collect()
    }

    #[test]
    fn dimension_law_and_coordinates() {
        let limits = FactorLimits::default();
        // Q(sqrt -5) (Cl = Z/2), Q(sqrt -23) (Z/3), Q(sqrt -3) (w = 6), Q(sqrt 10),
        // Q(sqrt -31) (Z/3), x^3 - 2, x^3 - x^2 - 3x + 1 (class numbers from memory)
        let fields = [
            z(&[5, 0, 1]),
            z(&[6, -1, 1]),
            z(&[1, 1, 1]),
            z(&[-10, 0, 1]),
            z(&[8, -1, 1]),
            z(&[-2, 0, 0, 1]),
            z(&[1, -3, -1, 1]),
        ];
        for f in &fields {
            let k = NumberField::new(f).unwrap();
            for s in [vec![], vec![2u64], vec![3], vec![2, 3], vec![5, 7]] {
                let kc = k.cube_classes(&s, &ClassGroupOptions::default()).unwrap();
                // independent: Cl_S by the Smith form of a class-group run, its 3-rank
                let (_, inv) = crate::numfield::sunitgroup::tests::cl_s_invariants(&k, &s);
                let three_rank = inv
                    .iter()
                    .filter(|d| (*d).mod_op(Integer::from(3)) == 0)
                    .count();
                let (r1, r2) = k.signature();
                let (w, _) = k.roots_of_unity();
                let n_s: usize = s.iter().map(|&p| k.primes_above(p).unwrap().len()).sum();
                // Dirichlet: dim K(S,3) = r1 + r2 - 1 + [3 | w] + |S| + dim Cl_S[3]
                assert_eq!(
                    kc.dimension(),
                    r1 + r2 - 1 + usize::from(w % 3 == 0) + n_s + three_rank,
                    "{f:?} S={s:?}"
                );
                let elems: Vec<Element> = kc.basis.iter().map(|b| b.expand(&k).unwrap()).collect();
                for (i, e) in elems.iter().enumerate() {
                    let c = kc.coordinates(&k, e, &limits).unwrap();
                    assert_eq!(
                        c,
                        (0..elems.len())
                            .map(|j| u8::from(i == j))
                            .collect::<Vec<_>>()
                    );
                    let cube = k.mul(&k.mul(e, e), e);
                    assert!(kc
                        .coordinates(&k, &cube, &limits)
                        .unwrap()
                        .iter()
                        .all(|&b| b == 0));
                    let sq = k.mul(e, e);
                    let c2 = kc.coordinates(&k, &sq, &limits).unwrap();
                    assert_eq!(
                        c2,
                        (0..elems.len())
                            .map(|j| if i == j { 2 } else { 0 })
                            .collect::<Vec<_>>()
                    );
                }
                if elems.len() >= 2 {
                    let prod = k.mul(&elems[0], &k.mul(&elems[1], &elems[1]));
                    let c = kc.coordinates(&k, &prod, &limits).unwrap();
                    assert_eq!(&c[..2], &[1, 2]);
                }
                // an element with valuation 1 at a prime above 11 outside S is refused
                let t = k.rational(&Rational::from(11));
                if k.primes_above(11).unwrap().iter().any(|q| q.e % 3 != 0) {
                    assert_eq!(
                        kc.coordinates(&k, &t, &limits).unwrap_err().kind(),
                        &ErrorKind::InvalidValue
                    );
                }
            }
        }
    }

    #[test]
    fn f3_kernel_and_solve() {
        let a = vec![vec![1, 2, 0], vec![2, 1, 0], vec![0, 0, 1]];
        let ker = left_kernel_f3(&a, 3);
        assert_eq!(ker, vec![vec![1, 1, 0]]);
        assert_eq!(
            solve_f3(&[vec![1, 0], vec![0, 1]], &[2, 1]),
            Some(Ok(vec![2, 1]))
        );
        assert_eq!(solve_f3(&[vec![1, 0]], &[0, 1]), None);
        assert_eq!(solve_f3(&[vec![1, 0], vec![2, 0]], &[1, 0]), Some(Err(())));
    }
}
