//! The global root number from the parity of the 2-Selmer rank.
//!
//! Monsky's theorem (P. Monsky, "Generalizing the Birch-Stephens theorem.
//! I. Modular curves", Math. Z. 221, 1996; with the modularity of elliptic
//! curves over Q, Wiles 1995, Taylor and Wiles 1995, Breuil, Conrad, Diamond
//! and Taylor 2001, it holds for every E/Q): the corank of the
//! 2^infinity-Selmer group has the parity of `(1 - w(E))/2`. The finite part
//! of Sha[2^infinity] has square order (its Cassels-Tate pairing is
//! alternating: Poonen and Stoll, Ann. of Math. 150, 1999, for principally
//! polarised elliptic curves), so
//! `dim_F2 Sel^2(E) - dim_F2 E(Q)[2]` has the parity of that corank, and
//! `w(E) = (-1)^(dim Sel^2(E) - dim E(Q)[2])`.
//!
//! Given an unconditional `Sel^2(E)` this proves `w(E)`, independently of
//! the local formulas and of the functional equation; where every local
//! root number is known by a local formula the two must agree (else an
//! internal inconsistency), and where exactly one (at 2 or at 3) is
//! unknown it is deduced from `w = -prod_p w_p`.

use super::{internal, local_sign, RootNumber, RootNumberMethod};
use crate::error::{Error, ErrorKind};
use crate::local::CurveData;

/// The root number of the curve described by `data` from the dimensions of
/// an unconditionally computed `Sel^2(E)` and of `E(Q)[2]` (see the module
/// documentation), with the local root numbers of the local formulas and a
/// single missing one at 2 or 3 deduced
/// ([`RootNumberMethod::SelmerParity`]).
///
/// Errors: [`ErrorKind::InvalidValue`] when `two_torsion_dim > 2` or
/// `two_selmer_dim < two_torsion_dim` (no Selmer group is that small); an
/// internal inconsistency when every local root number is known and their
/// product disagrees with the parity (a wrong Selmer group or a wrong local
/// formula, reported rather than answered).
///
/// ```
/// use twofold::{Curve, CurveData, Work, rootno::root_number_by_selmer_parity};
/// // y^2 + y = x^3 - x (conductor 37, rank 1, Sha trivial, no 2-torsion;
/// // Cremona 1997, Table 1): dim Sel^2 = 1, so w = -1
/// let d = CurveData::new(&Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap(), &Work::unlimited()).unwrap();
/// let r = root_number_by_selmer_parity(&d, 1, 0).unwrap();
/// assert_eq!(r.global, -1);
/// // a Selmer dimension of the wrong parity clashes with the local formulas
/// assert!(root_number_by_selmer_parity(&d, 2, 0).is_err());
/// ```
pub fn root_number_by_selmer_parity(data: &CurveData, two_selmer_dim: usize, two_torsion_dim: usize) -> Result<RootNumber, Error> {
    if two_torsion_dim > 2 || two_selmer_dim < two_torsion_dim {
        return Err(Error::new(
            ErrorKind::InvalidValue,
            format!("dim Sel^2(E) = {two_selmer_dim} and dim E(Q)[2] = {two_torsion_dim} are not the dimensions of a 2-Selmer group and its torsion part"),
        ));
    }
    let global: i8 = if (two_selmer_dim - two_torsion_dim) % 2 == 0 { 1 } else { -1 };
    let mut local = Vec::new();
    let mut unknown = Vec::new();
    let mut product: i8 = 1;
    for d in data.local() {
        // local_sign reads only c4, c6 and the discriminant at p, which the
        // global minimal model shares with any model minimal at p
        match local_sign(data.minimal(), d)? {
            Some(s) => {
                product *= s;
                local.push((d.prime.clone(), s));
            }
            None => unknown.push(d.prime.clone()),
        }
    }
    let mut deduced = Vec::new();
    let mut joint = Vec::new();
    match unknown.len() {
        0 if -product != global => {
            return Err(internal(&format!(
                "the local formulas give w = {} but dim Sel^2(E) - dim E(Q)[2] = {} gives w = {global} (Monsky 1996)",
                -product,
                two_selmer_dim - two_torsion_dim
            )))
        }
        0 => {}
        1 => {
            // -global = w_p * product, and product = ±1 is its own inverse
            let p = unknown.remove(0);
            local.push((p.clone(), -global * product));
            local.sort();
            deduced.push(p);
        }
        _ => joint = unknown,
    }
    Ok(RootNumber { global, local, joint, method: RootNumberMethod::SelmerParity { deduced }, conductor: data.conductor().clone() })
}
