#!/usr/bin/env python3
"""Count the public surface of the twofold crate from its `cargo doc` HTML.

Usage (from the repository root):

    CARGO_TARGET_DIR=... python3 scripts/public_surface.py [--no-build] [--list]

It runs `cargo doc --no-deps --all-features --lib` (stable rustdoc; its JSON
output is nightly-only) and then reads the generated pages:

- items: every entry of `twofold/all.html` (structs, enums, traits,
  functions, macros, constants, statics, type aliases), each at the one
  path where rustdoc documents it;
- modules: the module pages (`*/index.html`) that are reachable;
- inherent methods and associated constants: `id="method.*"` and
  `id="associatedconstant.*"` anchors on an item's page *before* its trait
  implementations (trait methods such as `fmt` are not counted);
- public fields (`id="structfield.*"`) and enum variants (`id="variant.*"`).

The figures are what a user of the crate can name from outside; private and
`pub(crate)` items do not appear in the docs at all. `--list` prints every
item path, for diffs between two commits.
"""
import os
import re
import subprocess
import sys
from pathlib import Path


def doc_dir() -> Path:
    target = os.environ.get("CARGO_TARGET_DIR", "target")
    return Path(target) / "doc" / "twofold"


def main() -> int:
    args = sys.argv[1:]
    if "--no-build" not in args:
        subprocess.run(
            ["cargo", "doc", "--no-deps", "--all-features", "--lib", "-q"],
            check=True,
        )
    root = doc_dir()
    all_html = (root / "all.html").read_text(encoding="utf-8")
    # Entries of the "all items" page: <li><a href="path/kind.Name.html">path::Name</a></li>
    items = re.findall(r'<li><a href="([^"]+\.html)">([^<]+)</a></li>', all_html)
    kinds: dict[str, int] = {}
    for href, _ in items:
        kind = Path(href).name.split(".")[0]
        kinds[kind] = kinds.get(kind, 0) + 1
    modules = [p for p in root.rglob("index.html")]
    methods = consts = fields = variants = 0
    for href, _ in items:
        page = (root / href).read_text(encoding="utf-8")
        cut = page.find('id="trait-implementations"')
        head = page if cut < 0 else page[:cut]
        methods += len(set(re.findall(r'id="method\.([A-Za-z0-9_]+)"', head)))
        consts += len(set(re.findall(r'id="associatedconstant\.([A-Za-z0-9_]+)"', head)))
        fields += len(set(re.findall(r'id="structfield\.([A-Za-z0-9_]+)"', page)))
        variants += len(set(re.findall(r'id="variant\.([A-Za-z0-9_]+)"', page)))
    total = len(items) + len(modules) + methods + consts + fields + variants
    print(f"modules                  {len(modules)}")
    for kind in sorted(kinds):
        print(f"{kind + 's':<24} {kinds[kind]}")
    print(f"items (all.html)         {len(items)}")
    print(f"inherent methods         {methods}")
    print(f"associated constants     {consts}")
    print(f"public fields            {fields}")
    print(f"enum variants            {variants}")
    print(f"total named things       {total}")
    if "--list" in args:
        for _, name in sorted(items, key=lambda x: x[1]):
            print(name)
    return 0


if __name__ == "__main__":
    sys.exit(main())
