//! The covering search is raised step by step while the bounds do not meet
//! (issue: find the points). y^2 = x^3 + 1000003 has a generator too large
//! for the first height (300): with the ceiling at 300 the rank is left
//! open, with the default ceiling the bounds meet at 3. The rank is proven
//! by the descent itself (three independent points verified exactly, and
//! the Selmer bound); no published value is used here.

use twofold::{analyse, Curve, RankOptions};

fn curve() -> Curve {
    Curve::from_coefficients([0, 0, 0, 0, 1000003]).unwrap()
}

#[test]
fn a_fixed_height_leaves_the_gap_open() {
    let opts = RankOptions::default().with_evidence(false).with_search_height_ceiling(300);
    let r = analyse(&curve(), &opts).unwrap();
    assert_eq!(r.rank_upper, Some(3));
    assert!(r.rank_lower < Some(3));
    assert!(r.sha_suspects.iter().all(|s| s.searched_height == 300 && !s.in_sha));
}

#[test]
fn the_adaptive_search_closes_it() {
    let opts = RankOptions::default().with_evidence(false);
    let r = analyse(&curve(), &opts).unwrap();
    assert_eq!(r.rank(), Some(3));
    assert_eq!(r.rank_proven_by, vec![twofold::report::ProofRoute::Descent]);
    assert_eq!(r.points.len(), 3);
    assert!(r.points.iter().all(|p| curve().contains(p)));
    assert_eq!(r.sha2_dim, Some(0));
}
