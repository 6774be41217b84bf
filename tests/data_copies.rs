//! tests/data holds copies of the published tables in ../shared/data (see
//! tests/data/README.md) so that the tests run from the repository alone;
//! where the shared folder is present the copies must be identical.

#[test]
fn copies_equal_the_shared_tables() {
    let root = env!("CARGO_MANIFEST_DIR");
    for name in ["curves-small-conductor.tsv", "curves-with-sha.tsv", "curves-wider.tsv"] {
        let ours = std::fs::read(format!("{root}/tests/data/{name}")).unwrap();
        match std::fs::read(format!("{root}/../shared/data/{name}")) {
            Ok(shared) => assert!(ours == shared, "tests/data/{name} differs from ../shared/data/{name}"),
            Err(_) => eprintln!("../shared/data/{name} not present; copy not compared"),
        }
    }
}
