"""Reference values for the probability that every cylinder conforms (tests/joint.rs).

Each case is a set of cylinders whose margins share some inputs. Cylinder i's value deviates
from its estimate by e_i = own_i + sum_s c_is * d_s, every own_i and d_s independent and normal
(the linearised model of the GUM). The cylinders all conform when e_i <= m_i for every i (a
limit on one side), or -low_i <= e_i <= high_i (a range). That is an orthant probability of
the multivariate normal distribution of e, with covariance diag(u_own^2) + C diag(u_d^2) C^T,
computed here by scipy's multivariate_normal.cdf (Genz's method): a route independent of
gonogo's, which integrates over the shared inputs.

Run once with `python3 tests/vectors/make_joint_vectors.py` (numpy 2.4.6, scipy 1.17.1);
it writes tests/vectors/joint.json. CI needs no Python.
"""

import json
import os

import numpy as np
from scipy.stats import multivariate_normal


def case(name, kind, margins, own, shared, u_shared):
    """margins: m_i (one side) or (low_i, high_i) (range); own: u of each cylinder's own input;
    shared: per cylinder, the coefficient of each shared input; u_shared: their u."""
    n = len(margins)
    c = np.array(shared, dtype=float).reshape(n, len(u_shared))
    cov = np.diag(np.array(own, dtype=float) ** 2) + c @ np.diag(np.array(u_shared) ** 2) @ c.T
    options = dict(mean=np.zeros(n), cov=cov, allow_singular=True, maxpts=4_000_000,
                   abseps=1e-9, releps=1e-9)
    if kind == "one_sided":
        upper = np.array(margins, dtype=float)
        p = multivariate_normal.cdf(upper, **options)
    else:
        low = -np.array([m[0] for m in margins], dtype=float)
        high = np.array([m[1] for m in margins], dtype=float)
        p = multivariate_normal.cdf(high, lower_limit=low, **options)
    return {
        "name": name,
        "kind": kind,
        "margins": margins,
        "own_uncertainties": own,
        "shared_coefficients": shared,
        "shared_uncertainties": u_shared,
        "probability": float(p),
    }


cases = [
    # eight bores read with one gauge: each its own resolution, one shared calibration
    case(
        "eight bores, one shared calibration",
        "one_sided",
        [0.0010, 0.0012, 0.0008, 0.0015, 0.0011, 0.0009, 0.0013, 0.0010],
        [0.0003] * 8,
        [[1.0]] * 8,
        [0.0004],
    ),
    # a calibration and a stroke, entering each cylinder with its own coefficient
    case(
        "six cylinders, calibration and stroke",
        "one_sided",
        [2.1, 1.8, 2.5, 1.9, 2.2, 2.0],
        [0.6, 0.5, 0.7, 0.6, 0.5, 0.6],
        [[1.0, 0.9], [1.0, 1.1], [1.0, 1.0], [1.0, 1.2], [1.0, 0.8], [1.0, 1.05]],
        [0.5, 0.7],
    ),
    # three shared inputs in different proportions: sampled by gonogo
    case(
        "four cylinders, three shared inputs",
        "one_sided",
        [1.5, 1.7, 1.4, 1.6],
        [0.5, 0.4, 0.6, 0.5],
        [[1.0, 0.5, 0.2], [1.0, -0.3, 0.4], [1.0, 0.8, -0.5], [1.0, 0.1, 0.9]],
        [0.4, 0.5, 0.3],
    ),
    # a range on each of six cylinders with one shared calibration
    case(
        "six cylinders in a range, one shared calibration",
        "between",
        [[1.2, 1.5], [1.4, 1.1], [1.0, 1.8], [1.6, 1.3], [1.3, 1.3], [1.1, 1.6]],
        [0.4, 0.5, 0.4, 0.3, 0.5, 0.4],
        [[1.0]] * 6,
        [0.35],
    ),
]

out = os.path.join(os.path.dirname(os.path.abspath(__file__)), "joint.json")
with open(out, "w") as f:
    json.dump({"made_by": "tests/vectors/make_joint_vectors.py", "cases": cases}, f, indent=1)
    f.write("\n")
print(out)
