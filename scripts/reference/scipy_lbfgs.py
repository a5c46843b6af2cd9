#!/usr/bin/python3
"""Reference minima for headroom's L-BFGS (src/numerics/lbfgs.ts), computed with SciPy's L-BFGS-B.

Run with Debian's interpreter and packages (python3-scipy, python3-numpy), not a virtualenv:

    /usr/bin/python3 scripts/reference/scipy_lbfgs.py           # rewrite the JSON
    /usr/bin/python3 scripts/reference/scipy_lbfgs.py --check   # compare with the committed JSON

Problems: the Rosenbrock function (scipy.optimize.rosen, with its gradient rosen_der) in 2 dimensions
from the classical start (-1.2, 1) (Moré, Garbow and Hillstrom 1981, "Testing unconstrained
optimization software", ACM TOMS 7(1), problem 1), and in 10 dimensions (the chained form SciPy
implements) from (-1.2, 1, -1.2, 1, ...). Both have their minimum 0 at (1, ..., 1).
scipy.optimize.minimize(method="L-BFGS-B", jac=rosen_der, options={"gtol": 1e-10, "ftol": 0,
"maxcor": 10, "maxiter": 10000}) records the solution, the value there and the largest gradient entry.

`--check` exits with status 1 when a number differs from the committed file by more than 1e-8 *
max(1, |committed|).
"""

import argparse
import datetime
import os
import sys

import numpy as np
import scipy
from scipy.optimize import minimize, rosen, rosen_der

from _drift import exit_with_check, largest_difference, read_json, write_json

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "..", "fixtures", "reference", "scipy-lbfgs.json")
OPTIONS = {"gtol": 1e-10, "ftol": 0, "maxcor": 10, "maxiter": 10000}


def solve(dimension):
    start = np.array([-1.2 if i % 2 == 0 else 1.0 for i in range(dimension)])
    result = minimize(rosen, start, jac=rosen_der, method="L-BFGS-B", options=OPTIONS)
    return {
        "start": start.tolist(),
        "solution": result.x.tolist(),
        "value": float(result.fun),
        "largestGradient": float(np.abs(rosen_der(result.x)).max()),
        "iterations": int(result.nit),
    }


def compute():
    return {
        "source": "SciPy L-BFGS-B from Debian python3-scipy",
        "command": "/usr/bin/python3 scripts/reference/scipy_lbfgs.py",
        "generated": datetime.date.today().isoformat(),
        "versions": {"python": sys.version.split()[0], "scipy": scipy.__version__, "numpy": np.__version__},
        "function": "scipy.optimize.rosen: sum(100 (x[i+1] - x[i]^2)^2 + (1 - x[i])^2)",
        "settings": OPTIONS,
        "problems": {"rosenbrock2": solve(2), "rosenbrock10": solve(10)},
    }


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--check", action="store_true")
    args = parser.parse_args()
    result = compute()
    if args.check:
        committed = read_json(OUT)
        pairs = [
            (result["problems"][name][key], committed["problems"][name][key])
            for name in committed["problems"]
            for key in ["solution", "value"]
        ]
        exit_with_check("scipy-lbfgs", largest_difference(pairs, relative=True), 1e-8)
    write_json(OUT, result)
    print(f"wrote {os.path.relpath(OUT)}")


if __name__ == "__main__":
    main()
