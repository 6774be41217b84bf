//! The serde forms documented in docs/schema.md (feature `serde`): leaf
//! forms, rejection of bad data, and round trips of batch items and root
//! numbers. Curves: y^2 + y = x^3 - x and y^2 + y = x^3 - x^2 - 10x - 20 from Cremona 1997, Table 1 (tests/data).
#![cfg(feature = "serde")]

use serde_json::{json, Value};
use twofold::batch::{analyse_batch, BatchOptions, BatchItem, BatchSummary};
use twofold::local::{Kodaira, Reduction};
use twofold::rootno::{root_number, RootNumber};
use twofold::{analyse, Curve, Point, RankOptions, RankReport, Route};

fn to_value<T: serde::Serialize>(x: &T) -> Value {
    serde_json::to_value(x).unwrap()
}

#[test]
fn leaf_forms_match_the_schema() {
    let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
    assert_eq!(to_value(&e), json!(["0", "0", "1", "-1", "0"]));
    assert_eq!(to_value(&Point::Infinity), json!("infinity"));
    let p = Point::Affine(malachite::Rational::from_signeds(-3, 4), 5.into());
    assert_eq!(to_value(&p), json!(["-3/4", "5"]));
    assert_eq!(to_value(&Reduction::NonSplitMultiplicative), json!("non_split_multiplicative"));
    assert_eq!(to_value(&Route::IsogenyAndQuartic), json!("2-isogeny+quartic"));
    assert_eq!(to_value(&twofold::solubility::Place::Real), json!("real"));
    assert_eq!(to_value(&twofold::arith::Place::Prime(7u32.into())), json!("7"));
}

#[test]
fn every_kodaira_symbol_round_trips() {
    let mut all = vec![Kodaira::I0, Kodaira::II, Kodaira::III, Kodaira::IV, Kodaira::I0Star, Kodaira::IVStar, Kodaira::IIIStar, Kodaira::IIStar];
    for n in [1, 2, 9, 10, 123] {
        all.push(Kodaira::In(n));
        all.push(Kodaira::InStar(n));
    }
    for k in all {
        let v = to_value(&k);
        assert_eq!(v, json!(k.to_string()));
        assert_eq!(serde_json::from_value::<Kodaira>(v).unwrap(), k);
    }
    for bad in ["I", "I-1", "V", "I0**", "IIII", ""] {
        assert!(serde_json::from_value::<Kodaira>(json!(bad)).is_err(), "{bad}");
    }
}

#[test]
fn bad_data_is_rejected() {
    // singular model, non-numeric strings, JSON numbers where strings are expected
    assert!(serde_json::from_value::<Curve>(json!(["0", "0", "0", "0", "0"])).is_err());
    assert!(serde_json::from_value::<Curve>(json!(["0", "0", "1", "x", "0"])).is_err());
    assert!(serde_json::from_value::<Curve>(json!([0, 0, 1, -1, 0])).is_err());
    assert!(serde_json::from_value::<Point>(json!(["1/0", "2"])).is_err());
    assert!(serde_json::from_value::<Point>(json!("origin")).is_err());
}

#[test]
fn report_fields_are_strings_and_round_trip() {
    let e = Curve::from_coefficients([0, 0, 1, -1, 0]).unwrap();
    let r = analyse(&e, &RankOptions::default()).unwrap();
    let v = to_value(&r);
    assert_eq!(v["conductor"], json!("37")); // Cremona 1997, Table 1: y^2 + y = x^3 - x
    assert_eq!(v["local"][0]["kodaira"], json!("I1"));
    assert_eq!(v["rank_lower"], json!(1));
    assert!(v["elapsed"]["nanos"].is_number());
    let back: RankReport = serde_json::from_value(v).unwrap();
    assert_eq!(back, r);
}

#[test]
fn batch_items_root_numbers_and_summaries_round_trip() {
    let run = analyse_batch(["[0,-1,1,-10,-20]", "[0,0,0,0,0]"], &BatchOptions::default());
    for it in &run.items {
        let text = serde_json::to_string(it).unwrap();
        assert_eq!(&serde_json::from_str::<BatchItem>(&text).unwrap(), it);
    }
    assert_eq!(to_value(&run.items[1])["result"]["Err"]["kind"], json!("singular"));
    let s = serde_json::to_string(&run.summary).unwrap();
    assert_eq!(serde_json::from_str::<BatchSummary>(&s).unwrap(), run.summary);
    let w = root_number(&Curve::from_coefficients([0, -1, 1, -10, -20]).unwrap()).unwrap();
    let text = serde_json::to_string(&w).unwrap();
    assert_eq!(serde_json::from_str::<RootNumber>(&text).unwrap(), w);
    assert_eq!(to_value(&w)["conductor"], json!("11"));
}
