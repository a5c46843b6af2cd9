#!/usr/bin/python3
"""Reference values for headroom's binomial confidence intervals (src/weigh/validationSize.ts).

Run with Debian's interpreter and packages (python3-scipy, python3-numpy), not a virtualenv:

    /usr/bin/python3 scripts/reference/scipy_intervals.py           # rewrite the JSON
    /usr/bin/python3 scripts/reference/scipy_intervals.py --check   # compare with the committed JSON

Clopper-Pearson exact interval for x successes out of n at central probability `level`, from
SciPy's beta quantiles:
    lower = beta.ppf(alpha / 2, x, n - x + 1)   (0 when x = 0)
    upper = beta.ppf(1 - alpha / 2, x + 1, n - x)   (1 when x = n),   alpha = 1 - level,
and the one-sided lower bound beta.ppf(1 - confidence, x, n - x + 1).

Held-out samples needed: the smallest n, found by scanning n = 1, 2, ..., whose one-sided 95% lower
bound exceeds the target, with the Wilson bound of an observed share equal to the expected score, and
with the Clopper-Pearson bound of floor(n * expected) successes.

Wilson score interval for an observed proportion p on n samples, z = norm.ppf((1 + level) / 2):
    (p + z^2/2n -/+ z * sqrt(p(1 - p)/n + z^2/4n^2)) / (1 + z^2/n).

`--check` exits with status 1 when any number differs from the committed file by more than 1e-12.
"""

import argparse
import datetime
import math
import os
import sys

import numpy as np
import scipy
from scipy.stats import beta, norm

from _drift import exit_with_check, largest_difference, read_json, write_json


HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "..", "fixtures", "reference", "scipy-intervals.json")

# (successes, n, level) for two-sided Clopper-Pearson intervals.
EXACT_CASES = [
    (90, 100, 0.95),
    (0, 20, 0.95),
    (20, 20, 0.95),
    (1, 25, 0.95),
    (45, 50, 0.95),
    (9, 10, 0.9),
    (450, 500, 0.95),
    (970, 1000, 0.99),
    (83, 97, 0.8),
]
# (successes, n, confidence) for one-sided Clopper-Pearson lower bounds.
LOWER_CASES = [
    (90, 100, 0.95),
    (855, 950, 0.95),
    (23, 25, 0.95),
    (180, 200, 0.9),
]
# (expected score, target) for the held-out samples needed at one-sided 95% confidence.
NEEDED_CASES = [
    (0.9, 0.8),
    (0.95, 0.9),
    (0.85, 0.84),
    (0.99, 0.9),
    (0.8, 0.7),
]
# (observed proportion, n, level) for two-sided Wilson intervals.
WILSON_CASES = [
    (0.9, 100, 0.95),
    (0.9, 25, 0.95),
    (0.5, 10, 0.95),
    (0.99, 300, 0.9),
    (0.0, 40, 0.95),
]


def clopper_pearson(x, n, level):
    alpha = 1 - level
    lower = 0.0 if x == 0 else float(beta.ppf(alpha / 2, x, n - x + 1))
    upper = 1.0 if x == n else float(beta.ppf(1 - alpha / 2, x + 1, n - x))
    return lower, upper


def wilson(p, n, level):
    z = float(norm.ppf((1 + level) / 2))
    center = p + z * z / (2 * n)
    spread = z * math.sqrt(p * (1 - p) / n + z * z / (4 * n * n))
    return (center - spread) / (1 + z * z / n), (center + spread) / (1 + z * z / n)


def held_out_needed(expected, target, confidence=0.95):
    """Smallest n, scanning up from 1, whose one-sided lower bound exceeds the target: Wilson with the
    observed share equal to `expected`; Clopper-Pearson with floor(n * expected) successes."""
    z = float(norm.ppf(confidence))
    n = 1
    while True:
        p = expected
        bound = (p + z * z / (2 * n) - z * math.sqrt(p * (1 - p) / n + z * z / (4 * n * n))) / (1 + z * z / n)
        if bound > target:
            break
        n += 1
    m = 1
    while True:
        x = math.floor(m * expected + 1e-9)
        if x > 0 and beta.ppf(1 - confidence, x, m - x + 1) > target:
            break
        m += 1
    return n, m


def compute():
    exact = []
    for x, n, level in EXACT_CASES:
        lower, upper = clopper_pearson(x, n, level)
        exact.append({"successes": x, "n": n, "level": level, "lower": lower, "upper": upper})
    lower_bounds = []
    for x, n, confidence in LOWER_CASES:
        bound = float(beta.ppf(1 - confidence, x, n - x + 1))
        lower_bounds.append({"successes": x, "n": n, "confidence": confidence, "lower": bound})
    wilson_rows = []
    for p, n, level in WILSON_CASES:
        lower, upper = wilson(p, n, level)
        wilson_rows.append({"observed": p, "n": n, "level": level, "lower": lower, "upper": upper})
    needed = []
    for expected, target in NEEDED_CASES:
        wilson_n, exact_n = held_out_needed(expected, target)
        needed.append({"expected": expected, "target": target, "confidence": 0.95, "wilson": wilson_n, "exact": exact_n})
    return {
        "source": "SciPy scipy.stats.beta.ppf and norm.ppf from Debian python3-scipy",
        "command": "/usr/bin/python3 scripts/reference/scipy_intervals.py",
        "generated": datetime.date.today().isoformat(),
        "versions": {"python": sys.version.split()[0], "scipy": scipy.__version__, "numpy": np.__version__},
        "clopperPearson": exact,
        "clopperPearsonLower": lower_bounds,
        "wilson": wilson_rows,
        "heldOutNeeded": needed,
    }


def main():
    parser = argparse.ArgumentParser()
    parser.add_argument("--check", action="store_true")
    args = parser.parse_args()
    result = compute()
    if args.check:
        committed = read_json(OUT)
        keys = ["clopperPearson", "clopperPearsonLower", "wilson", "heldOutNeeded"]
        pairs = [(result[key], committed[key]) for key in keys]
        exit_with_check("scipy-intervals", largest_difference(pairs, relative=False), 1e-12)
    write_json(OUT, result)
    print(f"wrote {os.path.relpath(OUT)}: {len(EXACT_CASES)} exact intervals, {len(WILSON_CASES)} Wilson intervals")


if __name__ == "__main__":
    main()
