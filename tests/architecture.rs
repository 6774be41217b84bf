//! The rooms of the crate (its top-level modules) depend on each other
//! without cycles: data flows one way, from the curve to the report
//! (DEVELOPERS.md, "Architecture map"). The compiler accepts cycles between
//! modules of one crate, so this test reads the sources: every `crate::NAME`
//! path and every `use crate::{..}` group outside comments and test modules
//! is an edge from the file's room to room `NAME`.

use std::collections::{BTreeMap, BTreeSet};
use std::fs;
use std::path::Path;

fn rooms() -> BTreeMap<String, Vec<std::path::PathBuf>> {
    let mut out: BTreeMap<String, Vec<std::path::PathBuf>> = BTreeMap::new();
    for entry in fs::read_dir("src").unwrap() {
        let path = entry.unwrap().path();
        let name = path.file_stem().unwrap().to_string_lossy().to_string();
        if name == "lib" || name == "main" {
            continue;
        }
        if path.is_dir() {
            let mut files = vec![];
            collect(&path, &mut files);
            out.insert(name, files);
        } else if path.extension().is_some_and(|e| e == "rs") {
            out.insert(name, vec![path]);
        }
    }
    out
}

fn collect(dir: &Path, files: &mut Vec<std::path::PathBuf>) {
    for entry in fs::read_dir(dir).unwrap() {
        let path = entry.unwrap().path();
        if path.is_dir() {
            collect(&path, files);
        } else if path.extension().is_some_and(|e| e == "rs") && path.file_stem().is_some_and(|s| s != "tests") {
            files.push(path);
        }
    }
}

/// The rooms a source text refers to, leaving out comments and everything
/// from the first `#[cfg(test)]` on (unit tests may reach anywhere).
fn references(text: &str) -> BTreeSet<String> {
    let mut out = BTreeSet::new();
    for line in text.lines() {
        let t = line.trim_start();
        if t.starts_with("#[cfg(test)]") {
            break;
        }
        if t.starts_with("//") {
            continue;
        }
        let code = match t.find("//") {
            Some(i) => &t[..i],
            None => t,
        };
        let mut rest = code;
        while let Some(i) = rest.find("crate::") {
            rest = &rest[i + 7..];
            if let Some(group) = rest.strip_prefix('{') {
                // use crate::{a::b, c, d::{e, f}}: the first segment of each entry at depth 0
                let mut depth = 0;
                let mut item = String::new();
                for ch in group.chars() {
                    match ch {
                        '{' => depth += 1,
                        '}' if depth == 0 => break,
                        '}' => depth -= 1,
                        _ => {}
                    }
                    if depth == 0 && ch == ',' {
                        push_first(&item, &mut out);
                        item.clear();
                    } else {
                        item.push(ch);
                    }
                }
                push_first(&item, &mut out);
            } else {
                push_first(rest, &mut out);
            }
        }
    }
    out
}

fn push_first(path: &str, out: &mut BTreeSet<String>) {
    let name: String = path.trim().chars().take_while(|c| c.is_alphanumeric() || *c == '_').collect();
    if !name.is_empty() {
        out.insert(name);
    }
}

#[test]
fn no_cycles_between_rooms() {
    let rooms = rooms();
    let mut edges: BTreeMap<String, BTreeSet<String>> = BTreeMap::new();
    for (room, files) in &rooms {
        let e = edges.entry(room.clone()).or_default();
        for f in files {
            for r in references(&fs::read_to_string(f).unwrap()) {
                if r != *room && rooms.contains_key(&r) {
                    e.insert(r);
                }
            }
        }
    }
    // depth-first search for a back edge, reporting the cycle it closes
    fn visit(
        n: &str,
        edges: &BTreeMap<String, BTreeSet<String>>,
        state: &mut BTreeMap<String, u8>,
        stack: &mut Vec<String>,
        cycles: &mut Vec<String>,
    ) {
        state.insert(n.to_string(), 1);
        stack.push(n.to_string());
        for m in &edges[n] {
            match state.get(m.as_str()).copied().unwrap_or(0) {
                0 => visit(m, edges, state, stack, cycles),
                1 => {
                    let i = stack.iter().position(|s| s == m).unwrap();
                    cycles.push(format!("{} -> {m}", stack[i..].join(" -> ")));
                }
                _ => {}
            }
        }
        stack.pop();
        state.insert(n.to_string(), 2);
    }
    let mut state = BTreeMap::new();
    let mut cycles = vec![];
    for n in edges.keys() {
        if state.get(n.as_str()).copied().unwrap_or(0) == 0 {
            visit(n, &edges, &mut state, &mut vec![], &mut cycles);
        }
    }
    assert!(cycles.is_empty(), "import cycles between rooms:\n{}\nedges: {edges:#?}", cycles.join("\n"));
}

#[test]
fn the_reader_sees_grouped_imports() {
    let r = references("use crate::{arith::{a, b}, curve::Curve, error::Error};\nlet x = crate::torsion::f(); // crate::report\n");
    assert_eq!(r.into_iter().collect::<Vec<_>>(), ["arith", "curve", "error", "torsion"]);
}

/// No hidden per-thread state: scratch space and test switches are explicit
/// values passed in (`solubility::SolubilityWorkspace`, the enumeration's
/// search mode), so that results never depend on what ran earlier on the
/// same thread.
#[test]
fn no_thread_local_state() {
    let mut files = vec![];
    collect(Path::new("src"), &mut files);
    for f in files {
        let text = fs::read_to_string(&f).unwrap();
        assert!(!text.contains(concat!("thread_", "local!")), "{} declares thread-local state", f.display());
    }
}

/// Every `.unwrap()`, `.expect(` and `unreachable!` outside test code
/// carries a reason: a `// invariant: ...` comment on its line or on one of
/// the three lines above, naming the invariant (established nearby) that
/// makes it unreachable. Anything else must be a typed error
/// (`Error::internal` for a broken invariant, the proper kind for bad input).
/// Test code (`#[cfg(test)]` items and files named tests.rs) is exempt.
#[test]
fn every_panic_site_states_its_invariant() {
    let mut files = vec![];
    collect(Path::new("src"), &mut files);
    let mut missing = vec![];
    let mut sites = 0;
    for f in files {
        let text = fs::read_to_string(&f).unwrap();
        let lines: Vec<&str> = text.lines().collect();
        let mut depth: i64 = 0;
        // Some(None): a `#[cfg(test)]` item starts; Some(Some(d)): inside it, opened at depth d
        let mut test_item: Option<Option<i64>> = None;
        for (i, line) in lines.iter().enumerate() {
            let s = line.trim();
            let opens = line.matches('{').count() as i64 - line.matches('}').count() as i64;
            match test_item {
                None if s.starts_with("#[cfg(test)]") => {
                    test_item = Some(None);
                    continue;
                }
                Some(None) => {
                    if line.contains('{') {
                        let start = depth;
                        depth += opens;
                        test_item = if depth <= start { None } else { Some(Some(start)) };
                    } else if s.ends_with(';') {
                        test_item = None;
                    }
                    continue;
                }
                Some(Some(start)) => {
                    depth += opens;
                    if depth <= start {
                        test_item = None;
                    }
                    continue;
                }
                None => depth += opens,
            }
            if s.starts_with("//") {
                continue;
            }
            let code = line.split("//").next().unwrap_or("");
            if !(code.contains(".unwrap()") || code.contains(".expect(") || code.contains("unreachable!")) {
                continue;
            }
            sites += 1;
            let first = i.saturating_sub(3);
            let reasoned = lines[first..=i].iter().any(|l| {
                !l.trim().starts_with("///") && l.split_once("//").is_some_and(|(_, c)| c.contains("invariant"))
            });
            if !reasoned {
                missing.push(format!("{}:{}: {}", f.display(), i + 1, s));
            }
        }
    }
    assert!(sites > 0, "the scan found no site at all: is it reading the sources?");
    assert!(missing.is_empty(), "panic sites without a `// invariant:` reason:\n{}", missing.join("\n"));
}
