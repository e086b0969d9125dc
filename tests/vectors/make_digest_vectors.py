#!/usr/bin/env python3
"""Writes tests/vectors/digest.json: SHA-256 (Python's hashlib, FIPS 180-4) of every demo
declaration's bytes, as `sha256sum` gives it, and of each demo rulebook framed as
src/digest.rs documents: for each file in reading order (root first, then its includes in the
order written), its name (empty for the root, else its path relative to the root's folder with
`/`), a NUL byte, its length in bytes as decimal digits, a NUL byte, then its bytes.

Run once from the crate root: python3 tests/vectors/make_digest_vectors.py
The include order is given here by hand (each demo rulebook includes one parts file)."""

import hashlib
import json
import pathlib

ROOT = pathlib.Path(__file__).resolve().parents[2]
RULEBOOKS = {
    "rulebooks-demo/tamsin-2027.rules": ["parts/tamsin-parts.rules"],
    "rulebooks-demo/tamsin-2028.rules": ["parts/tamsin-parts-2028.rules"],
}


def framed(parts):
    h = hashlib.sha256()
    for name, data in parts:
        h.update(name.encode() + b"\0" + str(len(data)).encode() + b"\0" + data)
    return h.hexdigest()


def main():
    out = {"declarations": {}, "rulebooks": {}}
    for path in sorted((ROOT / "engines-demo").glob("*.yaml")):
        out["declarations"][f"engines-demo/{path.name}"] = hashlib.sha256(path.read_bytes()).hexdigest()
    for root, includes in RULEBOOKS.items():
        folder = (ROOT / root).parent
        parts = [("", (ROOT / root).read_bytes())]
        parts += [(inc, (folder / inc).read_bytes()) for inc in includes]
        out["rulebooks"][root] = framed(parts)
    (ROOT / "tests/vectors/digest.json").write_text(json.dumps(out, indent=2, sort_keys=True) + "\n")


main()
