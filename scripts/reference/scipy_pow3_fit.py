#!/usr/bin/python3
"""Reference values for headroom's weighted Levenberg-Marquardt fit, computed with SciPy.

Run with Debian's interpreter and packages (python3-scipy, python3-numpy), not a virtualenv:

    /usr/bin/python3 scripts/reference/scipy_pow3_fit.py           # rewrite the JSON
    /usr/bin/python3 scripts/reference/scipy_pow3_fit.py --check   # compare with the committed JSON

It fits the inverse power law y = a - b * n**(-c) (pow3) to seven fixed points with unequal standard
deviations by scipy.optimize.curve_fit(method="lm", sigma=sigma, absolute_sigma=False) with
ftol = xtol = gtol = 1e-15, which runs MINPACK's lmder with weights 1/sigma**2 and reports the
covariance s**2 * (J'WJ)^-1 with s**2 = RSS / (n - p). It records the parameters, the covariance,
the weighted residual sum of squares, and the largest scaled gradient at the solution (computed
here with numpy, so the accuracy of the reference is on record).

The points are literal numbers below (drawn once from 0.9 - 1.2 n^-0.45 plus normal noise of the
stated sigma), so the output does not depend on any random generator. `--check` exits with status 1
when any number differs from the committed file by more than 1e-6 * max(1, |committed|).
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
OUT = os.path.join(HERE, "..", "..", "fixtures", "reference", "scipy-pow3-fit.json")

SIZES = [30, 60, 120, 240, 480, 960, 1920]
VALUES = [0.7015, 0.646, 0.7692, 0.7913, 0.8209, 0.8437, 0.8479]
SIGMAS = [0.03, 0.025, 0.02, 0.012, 0.01, 0.008, 0.006]
START = [0.85, 1.0, 0.5]


def pow3(n, a, b, c):
    return a - b * n ** (-c)


def pow3_jacobian(n, a, b, c):
    power = n ** (-c)
    return np.column_stack([np.ones_like(n), -power, b * power * np.log(n)])


def compute():
    n = np.array(SIZES, dtype=float)
    y = np.array(VALUES)
    sigma = np.array(SIGMAS)
    popt, pcov = curve_fit(
        pow3, n, y, p0=START, sigma=sigma, absolute_sigma=False, method="lm",
        jac=pow3_jacobian, ftol=1e-15, xtol=1e-15, gtol=1e-15, maxfev=100000,
    )
    w = 1 / sigma ** 2
    r = pow3(n, *popt) - y
    rss = float(np.sum(w * r * r))
    J = pow3_jacobian(n, *popt)
    gradient = J.T @ (w * r)
    scaled = np.abs(gradient) / (np.sqrt(np.sum(w[:, None] * J * J, axis=0)) * np.sqrt(rss))
    return {
        "source": "SciPy curve_fit (MINPACK lmder) from Debian python3-scipy",
        "command": "/usr/bin/python3 scripts/reference/scipy_pow3_fit.py",
        "generated": datetime.date.today().isoformat(),
        "versions": {"python": sys.version.split()[0], "scipy": scipy.__version__, "numpy": np.__version__},
        "model": "y = a - b * n^(-c)",
        "settings": {"method": "lm", "absolute_sigma": False, "ftol": 1e-15, "xtol": 1e-15, "gtol": 1e-15},
        "sizes": SIZES,
        "values": VALUES,
        "sigmas": SIGMAS,
        "start": START,
        "parameters": popt.tolist(),
        "covariance": pcov.tolist(),
        "standardErrors": np.sqrt(np.diag(pcov)).tolist(),
        "residualSumOfSquares": rss,
        "largestScaledGradient": float(scaled.max()),
    }


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--check", action="store_true")
    args = parser.parse_args()
    result = compute()
    if args.check:
        committed = read_json(OUT)
        keys = ["parameters", "covariance", "standardErrors", "residualSumOfSquares"]
        pairs = [(result[key], committed[key]) for key in keys]
        exit_with_check("scipy-pow3-fit", largest_difference(pairs, relative=True), 1e-6)
    write_json(OUT, result)
    print(f"wrote {os.path.relpath(OUT)}: parameters {result['parameters']}")


if __name__ == "__main__":
    main()
