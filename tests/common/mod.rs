//! Shared helpers for the integration tests: the published tables.
#![allow(dead_code)]

/// One row of a published table (Cremona, Algorithms for Modular Elliptic
/// Curves, 2nd ed., Table 1, and the list of curves with non-trivial Sha;
/// see tests/data/README.md).
#[derive(Clone, Debug)]
pub struct Row {
    pub conductor: u64,
    pub class: Option<u32>,
    pub coefficients: [i64; 5],
    pub rank: usize,
    pub torsion_order: usize,
    pub sha_order: Option<u64>,
}

pub fn read_table(name: &str) -> Vec<Row> {
    let path = format!("{}/tests/data/{name}", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{path}: {e}"));
    let mut header: Vec<String> = Vec::new();
    let mut rows = Vec::new();
    for line in text.lines() {
        if line.trim().is_empty() {
            continue;
        }
        if let Some(h) = line.strip_prefix('#') {
            header = h.split('\t').map(|s| s.trim().to_string()).collect();
            continue;
        }
        let f: Vec<&str> = line.split('\t').collect();
        let get = |k: &str| header.iter().position(|h| h == k).map(|i| f[i]);
        let a = ["a1", "a2", "a3", "a4", "a6"].map(|k| get(k).unwrap().parse::<i64>().unwrap());
        rows.push(Row {
            conductor: get("conductor").unwrap().parse().unwrap(),
            class: get("class").map(|s| s.parse().unwrap()),
            coefficients: a,
            rank: get("rank").unwrap().parse().unwrap(),
            torsion_order: get("torsion_order").unwrap().parse().unwrap(),
            sha_order: get("sha_order").map(|s| s.parse().unwrap()),
        });
    }
    rows
}
