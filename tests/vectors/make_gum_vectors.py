#!/usr/bin/env python3
"""Makes gum.json: reference values and combined standard uncertainties for gonogo's engine
formulas, computed with the GUM Tree Calculator (the Python package `GTC`, which implements
the JCGM 100:2008 law of propagation of uncertainty). Run once; the output is committed so CI
needs no Python:

    pip install GTC==1.5.1
    python3 tests/vectors/make_gum_vectors.py > tests/vectors/gum.json

Every quantity is in SI units (metres, cubic metres, cubic metres per second, pascals), as
gonogo computes internally. The input values are invented for the test; only the arithmetic
is the reference's.
"""
import json
import math

import GTC
from GTC import ureal

INCH = 0.0254
CC = 1e-6
CFM = 0.3048 ** 3 / 60
INHG = 3386.389


def case(name, inputs, result):
    return {
        "name": name,
        "inputs": {k: [v[0], v[1]] for k, v in inputs.items()},
        "value": GTC.value(result),
        "standard_uncertainty": GTC.uncertainty(result),
    }


def displacement(b, s, n):
    return math.pi / 4 * b * b * s * n


def compression(b, s, chamber, gb, gt, deck, piston):
    swept = math.pi / 4 * b * b * s
    clear = chamber + math.pi / 4 * gb * gb * gt + math.pi / 4 * b * b * deck + piston
    return (swept + clear) / clear


cases = []

raw = {"bore": (4.030 * INCH, 0.0005 * INCH), "stroke": (3.480 * INCH, 0.001 * INCH), "cylinders": (8.0, 0.0)}
u = {k: ureal(*v) if v[1] > 0 else v[0] for k, v in raw.items()}
cases.append(case("displacement", raw, displacement(u["bore"], u["stroke"], u["cylinders"])))

raw = {
    "bore": (4.000 * INCH, 0.0003 * INCH),
    "stroke": (3.480 * INCH, 0.0005 * INCH),
    "chamber": (64.0 * CC, 0.2 * CC),
    "gasket_bore": (4.000 * INCH, 0.001 * INCH),
    "gasket_thickness": (0.020 * INCH, 0.0005 * INCH),
    "deck_clearance": (0.033 * INCH, 0.0005 * INCH),
    "piston_volume": (5.0 * CC, 0.1 * CC),
}
u = {k: ureal(*v) for k, v in raw.items()}
cases.append(case("compression_ratio", raw, compression(*[u[k] for k in raw])))

raw = dict(raw)
raw["piston_volume"] = (-3.5 * CC, 0.1 * CC)  # a dome
u = {k: ureal(*v) for k, v in raw.items()}
cases.append(case("compression_ratio_dome", raw, compression(*[u[k] for k in raw])))

raw = {"flow": (500.0 * CFM, 5.0 * CFM), "rated_drop": (3.0 * INHG, 0.05 * INHG), "target_drop": (1.5 * INHG, 0.0)}
u = {"flow": ureal(*raw["flow"]), "rated_drop": ureal(*raw["rated_drop"]), "target_drop": raw["target_drop"][0]}
cases.append(case("airflow_at", raw, u["flow"] * GTC.sqrt(u["target_drop"] / u["rated_drop"])))

raw = {"lobe_lift": (0.320 * INCH, 0.0005 * INCH), "rocker_ratio": (1.70, 0.005), "lash": (0.016 * INCH, 0.001 * INCH)}
u = {k: ureal(*v) for k, v in raw.items()}
cases.append(case("net_valve_lift", raw, u["lobe_lift"] * u["rocker_ratio"] - u["lash"]))

print(json.dumps({"made_with": f"GTC {GTC.version}", "cases": cases}, indent=2))
