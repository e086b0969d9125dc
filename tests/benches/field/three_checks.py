#!/usr/bin/env python3
"""The Python comparison of the whole-process benchmark: reads every declaration of a field
with PyYAML's C loader (libyaml) and makes three checks a short script would make, with no
units beyond inches and pounds and no uncertainty: the largest bore, the car weight and the
head casting against a list. It prints how many engines failed any of them.

    three_checks.py DIR
"""

import os
import sys

import yaml

HEADS = {"TVH-2204", "TVH-2207", "TVH-3310"}


def inches(text):
    number, unit = str(text).split()
    return float(number) / 25.4 if unit == "mm" else float(number)


def failed(doc):
    m = doc.get("measurements") or {}
    bore = m.get("bore") or {}
    values = bore.get("values") if isinstance(bore, dict) else None
    bores = [inches(v) for v in values or []]
    weight = str(m.get("car.weight", "0 lb")).split()[0]
    casting = ((doc.get("components") or {}).get("head") or {}).get("casting")
    return (bores and max(bores) > 4.040) or float(weight) < 3000 or casting not in HEADS


def main(folder):
    count = 0
    for base, dirs, files in os.walk(folder):
        dirs.sort()
        for name in sorted(files):
            with open(os.path.join(base, name), encoding="utf-8") as f:
                doc = yaml.load(f, Loader=yaml.CLoader)
            count += bool(failed(doc))
    print(count, "engines fail a check")


if __name__ == "__main__":
    main(sys.argv[1])
