#!/usr/bin/env python3
"""Makes the inputs of the whole-process benchmark (tests/benches/field/run.sh).

    make_field.py engines N DIR     N declarations in DIR, made from every demo engine
    make_field.py rulebook BYTES OUT  a rulebook of at least BYTES bytes with no errors

The field cycles through every declaration directly under engines-demo/ (every class, every
rule; legal, illegal and unclear engines alike), gives each copy its own engine number and
moves every measured quantity (under `measurements:` and after it) written as "<number> <unit>" by a small deterministic amount
(at most 2 in the last digit written), so no two engines are the same file and the digits
as written stay as many. Files go into sub-folders of 1,000 so a folder listing stays short.

The rulebook is the demo's 2027 edition with its Street Stock class repeated under new names
until the file reaches BYTES: every copy is a valid class, so `lint` finds no error.

GONOGO_TEMPLATES=DIR takes the templates from DIR instead of engines-demo/ (same_bytes.sh uses
it to make a field an older gonogo can read too).
"""

import os
import random
import re
import sys

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__)))))
QUANTITY = re.compile(r'"(-?)(\d+)\.(\d+) ([A-Za-z%]+)"')


def demo_engines():
    folder = os.environ.get("GONOGO_TEMPLATES") or os.path.join(ROOT, "engines-demo")
    names = sorted(n for n in os.listdir(folder) if n.endswith(".yaml"))
    return [open(os.path.join(folder, n), encoding="utf-8").read() for n in names]


def vary(text, rng):
    def move(m):
        sign, whole, frac, unit = m.groups()
        scaled = int(whole + frac) + rng.randint(-2, 2)
        if scaled < 0:
            scaled = 0
        digits = str(scaled).rjust(len(frac) + 1, "0")
        return '"%s%s.%s %s"' % (sign, digits[: -len(frac)], digits[-len(frac):], unit)

    return QUANTITY.sub(move, text)


def engines(count, folder):
    templates = demo_engines()
    rng = random.Random(2027)
    for i in range(count):
        text = templates[i % len(templates)]
        text = re.sub(r'^engine: .*$', 'engine: "TV-F-%07d"' % i, text, count=1, flags=re.M)
        sub = os.path.join(folder, "%04d" % (i // 1000))
        os.makedirs(sub, exist_ok=True)
        head, mark, body = text.partition("\nmeasurements:")
        with open(os.path.join(sub, "engine-%07d.yaml" % i), "w", encoding="utf-8") as f:
            f.write(head + mark + vary(body, rng))


def rulebook(size, out):
    path = os.path.join(ROOT, "rulebooks-demo", "tamsin-2027.rules")
    text = open(path, encoding="utf-8").read()
    start = text.index('class street_stock "Street Stock"')
    end = text.index("\nend\n", start) + len("\nend\n")
    block = text[start:end]
    parts = [text.replace('include "parts/tamsin-parts.rules"', parts_text())]
    n = 0
    while sum(len(p) for p in parts) < size:
        n += 1
        parts.append("\n" + block.replace("class street_stock \"Street Stock\"",
                                          'class copy_%05d "Street Stock copy %d"' % (n, n)))
    with open(out, "w", encoding="utf-8") as f:
        f.write("".join(parts))


def parts_text():
    return open(os.path.join(ROOT, "rulebooks-demo", "parts", "tamsin-parts.rules"),
                encoding="utf-8").read()


if __name__ == "__main__":
    if len(sys.argv) == 4 and sys.argv[1] == "engines":
        engines(int(sys.argv[2]), sys.argv[3])
    elif len(sys.argv) == 4 and sys.argv[1] == "rulebook":
        rulebook(int(sys.argv[2]), sys.argv[3])
    else:
        sys.exit(__doc__)
