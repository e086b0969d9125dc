#!/usr/bin/env python3
"""Makes gum.json: reference values and combined standard uncertainties for gonogo's engine
formulas, computed with the GUM Tree Calculator (the Python package `GTC`, which implements
the JCGM 100:2008 law of propagation of uncertainty). Run once; the output is committed so CI
needs no Python:

    pip install GTC==1.5.1
    python3 tests/vectors/make_gum_vectors.py > tests/vectors/gum.json

Beside the formulas: readings that share one instrument's calibration (`correlated`: a
shared component added to each reading, and the same correlation given to GTC directly with
`set_correlation`), the Type A mean of repeated readings (`type_a`, GTC's `type_a.estimate`),
and the Welch-Satterthwaite effective degrees of freedom of a result with the coverage factor
for 95 % from the t-distribution (`coverage`, GTC's `dof` and `reporting.k_factor`).

Every quantity is in SI units (metres, cubic metres, cubic metres per second, pascals), as
gonogo computes internally. The input values are invented for the test; only the arithmetic
is the reference's.
"""
import json
import math

import GTC
from GTC import reporting, type_a, ureal

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

# ---- readings that share an instrument's calibration
RES = 0.0001 * INCH / (2 * math.sqrt(3))  # a 0.0001 in resolution, GUM F.2.2.1
correlated = []

bores = [4.0302, 4.0305, 4.0301, 4.0306, 4.0303, 4.0304, 4.0302, 4.0305]
u_cal = 0.0004 * INCH / 2  # calibration U = 0.0004 in at k = 2
u_stroke = 0.001 * INCH / (2 * math.sqrt(3))
cal = ureal(0.0, u_cal)
readings = [ureal(b * INCH, RES) + cal for b in bores]
stroke = ureal(3.480 * INCH, u_stroke)
mean_bore = sum(readings) / len(readings)
v = displacement(mean_bore, stroke, 8.0)
correlated.append({
    "name": "mean_bore_displacement_shared_gauge",
    "bore": [b * INCH for b in bores],
    "bore_resolution_u": RES,
    "bore_calibration_u": u_cal,
    "stroke": [3.480 * INCH, u_stroke],
    "value": GTC.value(v),
    "standard_uncertainty": GTC.uncertainty(v),
})

# chamber and piston volume read with one burette: each its own random part and one shared
# calibration part, given to GTC as a correlation between the two totals
# r = u_cal^2 / (u_chamber u_piston) (GUM 5.2.2), not as a shared component
raw = {
    "bore": (4.000 * INCH, 0.0003 * INCH),
    "stroke": (3.480 * INCH, 0.0005 * INCH),
    "chamber": (64.0 * CC, 0.1 * CC),
    "gasket_bore": (4.000 * INCH, 0.001 * INCH),
    "gasket_thickness": (0.020 * INCH, 0.0005 * INCH),
    "deck_clearance": (0.033 * INCH, 0.0005 * INCH),
    "piston_volume": (5.0 * CC, 0.1 * CC),
}
u_burette = 0.15 * CC
total = {k: (v[0], math.hypot(v[1], u_burette) if k in ("chamber", "piston_volume") else v[1]) for k, v in raw.items()}
u = {k: ureal(*v, independent=False) for k, v in total.items()}
r = u_burette ** 2 / (total["chamber"][1] * total["piston_volume"][1])
GTC.set_correlation(r, u["chamber"], u["piston_volume"])
cr = compression(*[u[k] for k in raw])
correlated.append({
    "name": "compression_ratio_shared_burette",
    "inputs": {k: [v[0], v[1]] for k, v in raw.items()},
    "shared": {"u": u_burette, "by": ["chamber", "piston_volume"]},
    "correlation": r,
    "value": GTC.value(cr),
    "standard_uncertainty": GTC.uncertainty(cr),
})

# ---- repeated readings (Type A, GUM 4.2)
repeated = []
for name, values, scale in [
    ("chamber_recc", [72.1, 72.4, 72.2], CC),
    ("bore_three", [4.0331, 4.0338, 4.0335], INCH),
]:
    m = type_a.estimate([x * scale for x in values])
    repeated.append({
        "name": name,
        "readings": [x * scale for x in values],
        "value": m.x,
        "standard_uncertainty": m.u,
        "degrees_of_freedom": m.df,
    })

# ---- effective degrees of freedom and the coverage factor for 95 %
# a chamber re-cc'd three times with a burette of U = 0.2 cc (k = 2) and a piston volume read
# once with it: their sum's nu_eff by Welch-Satterthwaite, and k = t_97.5 % (nu_eff)
coverage = []
chamber = type_a.estimate([x * CC for x in [72.1, 72.4, 72.2]]) + ureal(0.0, 0.1 * CC)
piston = ureal(12.1 * CC, 0.1 * CC)
total = chamber + piston
coverage.append({
    "name": "chamber_recc_plus_piston",
    "value": GTC.value(total),
    "standard_uncertainty": GTC.uncertainty(total),
    "effective_degrees_of_freedom": GTC.dof(total),
    "k95": reporting.k_factor(GTC.dof(total), 95),
})
for df in [2, 5, 10, 19, 50]:
    coverage.append({"name": f"t_{df}", "effective_degrees_of_freedom": df, "k95": reporting.k_factor(df, 95)})

print(json.dumps({
    "made_with": f"GTC {GTC.version}",
    "cases": cases,
    "correlated": correlated,
    "type_a": repeated,
    "coverage": coverage,
}, indent=2))
