//! The JSON line of `RankReport::to_json` is a stable format (README.md,
//! "The JSON line"): this test lists every key of one full report in order,
//! so that renaming, adding or dropping a key is a deliberate act that
//! updates README.md and docs/schema.md with it.

use twofold::{analyse, Curve, RankOptions};

/// y^2 + y = x^3 - x, rank 1 (Cremona 1997, Table 1): a report with points,
/// evidence and a certificate, so that every key carries a value.
#[test]
fn json_keys_of_a_full_report() {
    let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
    let opts = RankOptions::default().with_certificate(true);
    let rep = analyse(&e, &opts).unwrap();
    let line = rep.to_json("[0,0,1,-1,0]");
    let v: serde_json::Value = serde_json::from_str(&line).unwrap();
    let keys: Vec<&str> = v.as_object().unwrap().keys().map(|k| k.as_str()).collect();
    let mut expected = vec![
        "input",
        "minimal_model",
        "conductor",
        "torsion",
        "rank_lower",
        "rank_upper",
        "rank",
        "rank_proven_by",
        "descent_bounds",
        "route",
        "isogeny_selmer_dims",
        "two_selmer_dim",
        "two_selmer_route",
        "descent_curve",
        "analytic_route",
        "sha2_order",
        "isogeny_sha_dims",
        "points",
        "sha_suspects",
        "root_number",
        "vanishing_order",
        "saturated_basis",
        "regulator",
        "period_omega",
        "tamagawa_numbers",
        "sha_bsd_estimate",
        "certificate",
        "budget_exhausted",
        "elapsed_ms",
    ];
    // serde_json's map is ordered by key unless `preserve_order` is on: compare as sets of names
    let mut got = keys.clone();
    got.sort_unstable();
    expected.sort_unstable();
    assert_eq!(got, expected);
    // no borrowed abbreviation of the coefficient list anywhere in the line
    assert!(!line.contains(&["a", "invs"].concat()));
    assert_eq!(v["minimal_model"], serde_json::json!(["0", "0", "1", "-1", "0"]));
    assert_eq!(v["conductor"], serde_json::json!("37"));
}

/// The readable report opens with the Weierstrass equation written out.
#[test]
fn readable_report_opens_with_the_equation() {
    let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
    let opts = RankOptions::default().with_evidence(false);
    let text = analyse(&e, &opts).unwrap().to_string();
    assert!(text.starts_with("E: y^2 + y = x^3 - x\n"), "{text}");
    assert!(text.contains("non-split multiplicative"), "{text}");
}
