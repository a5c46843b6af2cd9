#!/usr/bin/python3
"""Reference fits of headroom's learning-curve families (pow4, mmf4, wbl4, exp3, ilog2), computed with SciPy.

Run with Debian's interpreter and packages (python3-scipy, python3-numpy), not a virtualenv:

    /usr/bin/python3 scripts/reference/scipy_families_fit.py           # rewrite the JSON
    /usr/bin/python3 scripts/reference/scipy_families_fit.py --check   # compare with the committed JSON

For each family it fits the family's formula, as written in the learning-curve literature (Mohr et al.
2022, LCDB 1.0), to nine learning-curve points with unequal standard deviations by
scipy.optimize.curve_fit(method="lm", sigma=sigma, absolute_sigma=False) with ftol = xtol = gtol = 1e-15
(MINPACK's lmder with weights 1/sigma**2; covariance s**2 (J'WJ)^-1 with s**2 = RSS / (n - p)), and
records the parameters, their standard errors and the weighted residual sum of squares:

    pow4   y = a - b * (n + d)**(-c)
    mmf4   y = (a*b + c*n**d) / (b + n**d)
    wbl4   y = c - b * exp(-a * n**d)
    exp3   y = c - a * exp(-b * n)
    ilog2  y = c - a / log(n)

The points are literal numbers below (drawn once from each family plus normal noise of the stated sigma,
numpy default_rng(20261201), and for pow4 and mmf4, which need a wider range of sizes and less noise to be
determined, default_rng(20261202), rounded to 5 decimals), so the output does not depend on any random generator. The starting points
are the generating parameters. `--check` exits with status 1 when any number differs from the committed
file by more than 1e-6 * max(1, |committed|).
"""

import argparse
import datetime
import os
import sys

import numpy as np
import scipy
from scipy.optimize import curve_fit

from _drift import exit_with_check, largest_difference, read_json, write_json


HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "..", "fixtures", "reference", "scipy-families-fit.json")

# Four-parameter families need a wide range of sizes and small noise to be determined at all.
SIZES = [16, 23, 32, 45, 64, 91, 128, 181, 256]
SIGMAS = [0.030, 0.026, 0.022, 0.019, 0.016, 0.013, 0.011, 0.009, 0.008]
WIDE_SIZES = [10, 20, 40, 80, 160, 320, 640, 1280, 2560]
SMALL_SIGMAS = [0.0030, 0.0026, 0.0022, 0.0019, 0.0016, 0.0013, 0.0011, 0.0009, 0.0008]

FAMILIES = {
    "pow4": {
        "formula": "y = a - b * (n + d)^(-c)",
        "names": ["a", "b", "c", "d"],
        "model": lambda n, a, b, c, d: a - b * (n + d) ** (-c),
        "start": [0.93, 2.5, 0.6, 30.0],
        "sizes": WIDE_SIZES,
        "sigmas": SMALL_SIGMAS,
        "values": [0.65652, 0.6919, 0.73826, 0.77772, 0.82504, 0.85645, 0.87954, 0.89519, 0.90719],
    },
    "mmf4": {
        "formula": "y = (a*b + c*n^d) / (b + n^d)",
        "names": ["a", "b", "c", "d"],
        "model": lambda n, a, b, c, d: (a * b + c * n ** d) / (b + n ** d),
        "start": [0.35, 60.0, 0.92, 1.1],
        "sizes": WIDE_SIZES,
        "sigmas": SMALL_SIGMAS,
        "values": [0.4459, 0.52417, 0.6294, 0.73559, 0.81271, 0.86321, 0.89225, 0.90643, 0.91349],
    },
    "wbl4": {
        "formula": "y = c - b * exp(-a * n^d)",
        "names": ["a", "b", "c", "d"],
        "model": lambda n, a, b, c, d: c - b * np.exp(-a * n ** d),
        "start": [0.08, 0.5, 0.91, 0.7],
        "values": [0.6373, 0.6518, 0.7175, 0.7631, 0.8071, 0.8237, 0.8677, 0.8922, 0.8916],
    },
    "exp3": {
        "formula": "y = c - a * exp(-b * n)",
        "names": ["a", "b", "c"],
        "model": lambda n, a, b, c: c - a * np.exp(-b * n),
        "start": [0.45, 0.025, 0.9],
        "values": [0.5755, 0.6292, 0.7099, 0.7528, 0.7995, 0.8789, 0.8658, 0.8919, 0.9101],
    },
    "ilog2": {
        "formula": "y = c - a / ln(n)",
        "names": ["a", "c"],
        "model": lambda n, a, c: c - a / np.log(n),
        "start": [0.9, 1.02],
        "values": [0.6838, 0.7318, 0.7293, 0.7427, 0.8096, 0.8187, 0.8293, 0.8413, 0.8504],
    },
}


def compute():
    families = {}
    for name, spec in FAMILIES.items():
        n = np.array(spec.get("sizes", SIZES), dtype=float)
        sigma = np.array(spec.get("sigmas", SIGMAS))
        w = 1 / sigma ** 2
        y = np.array(spec["values"])
        popt, pcov = curve_fit(
            spec["model"], n, y, p0=spec["start"], sigma=sigma, absolute_sigma=False, method="lm",
            ftol=1e-15, xtol=1e-15, gtol=1e-15, maxfev=100000,
        )
        r = spec["model"](n, *popt) - y
        families[name] = {
            "formula": spec["formula"],
            "names": spec["names"],
            "sizes": spec.get("sizes", SIZES),
            "sigmas": spec.get("sigmas", SIGMAS),
            "values": spec["values"],
            "start": spec["start"],
            "parameters": popt.tolist(),
            "standardErrors": np.sqrt(np.diag(pcov)).tolist(),
            "residualSumOfSquares": float(np.sum(w * r * r)),
        }
    return {
        "source": "SciPy curve_fit (MINPACK lmder) from Debian python3-scipy",
        "command": "/usr/bin/python3 scripts/reference/scipy_families_fit.py",
        "generated": datetime.date.today().isoformat(),
        "versions": {"python": sys.version.split()[0], "scipy": scipy.__version__, "numpy": np.__version__},
        "settings": {"method": "lm", "absolute_sigma": False, "ftol": 1e-15, "xtol": 1e-15, "gtol": 1e-15},
        "families": families,
    }


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--check", action="store_true")
    args = parser.parse_args()
    result = compute()
    if args.check:
        committed = read_json(OUT)["families"]
        pairs = [
            (fresh[key], committed[name][key])
            for name, fresh in result["families"].items()
            for key in ["parameters", "standardErrors", "residualSumOfSquares"]
        ]
        exit_with_check("scipy-families-fit", largest_difference(pairs, relative=True), 1e-6)
    write_json(OUT, result)
    print(f"wrote {os.path.relpath(OUT)}: " + ", ".join(f"{k} {v['parameters']}" for k, v in result["families"].items()))


if __name__ == "__main__":
    main()
