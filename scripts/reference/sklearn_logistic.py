#!/usr/bin/python3
"""Reference values for headroom's logistic-regression learner, computed with scikit-learn.

Run with Debian's interpreter and packages (python3-sklearn, python3-numpy), not a virtualenv:

    /usr/bin/python3 scripts/reference/sklearn_logistic.py           # rewrite the JSON
    /usr/bin/python3 scripts/reference/sklearn_logistic.py --check   # compare with the committed JSON

For each open data set in fixtures/open-data/ (feature columns, then a `class` column) it:
  1. standardizes every feature with StandardScaler fitted on the whole file;
  2. fits LogisticRegression(C=1.0), which minimizes 1/2 ||W||^2 + C * sum(log-loss) with the
     intercepts not penalized: one coefficient vector for two classes, a multinomial (softmax) model
     with one vector per class for more (multi_class="auto");
  3. records classes_ (sorted string order), coef_, intercept_, predict_proba of the first 5 rows, the
     number of iterations, and the largest absolute gradient entry of the objective above at the
     returned solution (computed here with numpy, so the accuracy of each reference is on record).

Two solvers are recorded:
  - `lbfgs`: the default solver, with tol=1e-10 and max_iter=100000. SciPy's L-BFGS-B also stops when
    the objective's relative decrease falls below its default ftol (about 2.2e-9), which LogisticRegression
    does not expose; on these data sets that happens first, leaving gradients up to about 5e-4 and
    coefficients up to about 3e-4 (digits intercepts 1e-3) away from the optimum.
  - `newtonCg`: solver="newton-cg", tol=1e-8, max_iter=100000, which stops on the gradient alone and
    reaches |gradient| <= 1e-8 in under 20 iterations. These are the values to test an exact optimizer
    against.

The output, fixtures/reference/sklearn-logistic.json, is deterministic apart from its `generated` date
and the versions. `--check` refits and exits with status 1 when any number differs from the committed
file by more than 1e-6 * max(1, |committed|) or when the classes differ; status 0 otherwise. The script
prints one summary line and nothing else.
"""

import argparse
import csv
import datetime
import os
import sys
import warnings

import numpy as np
import sklearn
from sklearn.exceptions import ConvergenceWarning
from sklearn.linear_model import LogisticRegression
from sklearn.preprocessing import StandardScaler

from _drift import compare, read_json, write_json


ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
DATA_DIR = os.path.join(ROOT, "fixtures", "open-data")
OUTPUT = os.path.join(ROOT, "fixtures", "reference", "sklearn-logistic.json")
DATA_SETS = ["breast_cancer", "wine", "iris", "digits"]
C = 1.0
MAX_ITER = 100000
SOLVERS = {
    # key in the JSON: (solver, tol)
    "lbfgs": ("lbfgs", 1e-10),
    "newtonCg": ("newton-cg", 1e-8),
}
FIRST_ROWS = 5
CHECK_TOLERANCE = 1e-6


def read_csv(name):
    """Feature matrix (float64) and class names (strings) of fixtures/open-data/<name>.csv."""
    with open(os.path.join(DATA_DIR, name + ".csv"), newline="") as handle:
        rows = list(csv.reader(handle))
    header, body = rows[0], rows[1:]
    if header[-1] != "class":
        raise SystemExit(f"{name}.csv: last column is {header[-1]!r}, expected 'class'")
    features = np.array([[float(v) for v in row[:-1]] for row in body], dtype=np.float64)
    labels = np.array([row[-1] for row in body])
    return features, labels


def max_abs_gradient(model, x, labels):
    """Largest |entry| of the gradient of 1/2 ||W||^2 + C * sum(log-loss) at the fitted model."""
    coef = model.coef_
    intercept = model.intercept_
    if len(model.classes_) == 2:
        positive = (labels == model.classes_[1]).astype(np.float64)
        z = x @ coef[0] + intercept[0]
        p = 1.0 / (1.0 + np.exp(-z))
        residual = p - positive
        grad_w = coef[0] + C * (x.T @ residual)
        grad_b = C * residual.sum()
        return float(max(np.abs(grad_w).max(), abs(grad_b)))
    onehot = (labels[:, None] == model.classes_[None, :]).astype(np.float64)
    z = x @ coef.T + intercept
    z -= z.max(axis=1, keepdims=True)
    p = np.exp(z)
    p /= p.sum(axis=1, keepdims=True)
    residual = p - onehot
    grad_w = coef + C * (residual.T @ x)
    grad_b = C * residual.sum(axis=0)
    return float(max(np.abs(grad_w).max(), np.abs(grad_b).max()))


def fit_one(name):
    features, labels = read_csv(name)
    x = StandardScaler().fit_transform(features)
    result = {"rows": int(x.shape[0]), "features": int(x.shape[1])}
    for key, (solver, tol) in SOLVERS.items():
        model = LogisticRegression(C=C, tol=tol, max_iter=MAX_ITER, solver=solver)
        with warnings.catch_warnings():
            # Convergence is judged by the recorded gradient instead of a printed warning.
            warnings.simplefilter("ignore", ConvergenceWarning)
            model.fit(x, labels)
        result["classes"] = [str(c) for c in model.classes_]
        result[key] = {
            "coef": model.coef_.tolist(),
            "intercept": model.intercept_.tolist(),
            "probabilitiesFirstRows": model.predict_proba(x[:FIRST_ROWS]).tolist(),
            "iterations": int(np.max(model.n_iter_)),
            "maxAbsGradient": max_abs_gradient(model, x, labels),
        }
    return result


def run():
    return {
        "source": "scikit-learn LogisticRegression from Debian python3-sklearn",
        "command": "/usr/bin/python3 scripts/reference/sklearn_logistic.py",
        "generated": datetime.date.today().isoformat(),
        "versions": {
            "python": sys.version.split()[0],
            "sklearn": sklearn.__version__,
            "numpy": np.__version__,
        },
        "settings": {
            "scaler": "StandardScaler fitted on the whole file",
            "C": C,
            "max_iter": MAX_ITER,
            "solvers": {key: {"solver": solver, "tol": tol} for key, (solver, tol) in SOLVERS.items()},
            "multi_class": "auto (multinomial for more than two classes)",
            "firstRows": FIRST_ROWS,
            "gradientOf": "1/2 ||W||^2 + C * sum(log-loss), intercepts not penalized",
        },
        "dataSets": {name: fit_one(name) for name in DATA_SETS},
    }


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--check", action="store_true", help="compare a fresh run with the committed JSON")
    args = parser.parse_args()
    fresh = run()
    if args.check:
        committed = read_json(OUTPUT)
        problems = []
        for name in DATA_SETS:
            # iterations and maxAbsGradient describe the run, they are not reference values.
            compare(
                fresh["dataSets"][name]["classes"],
                committed["dataSets"][name]["classes"],
                CHECK_TOLERANCE,
                f"dataSets.{name}.classes",
                problems,
            )
            for key in SOLVERS:
                keep = ["coef", "intercept", "probabilitiesFirstRows"]
                compare(
                    {k: fresh["dataSets"][name][key][k] for k in keep},
                    {k: committed["dataSets"][name][key][k] for k in keep},
                    CHECK_TOLERANCE,
                    f"dataSets.{name}.{key}",
                    problems,
                )
        if problems:
            print(f"sklearn_logistic: {len(problems)} drift(s), first: {problems[0]}")
            sys.exit(1)
        print(
            f"sklearn_logistic: no drift beyond {CHECK_TOLERANCE:g} in {len(DATA_SETS)} data sets "
            f"(sklearn {fresh['versions']['sklearn']}, committed with {committed['versions']['sklearn']})"
        )
        return
    write_json(OUTPUT, fresh)
    worst = {key: max(d[key]["maxAbsGradient"] for d in fresh["dataSets"].values()) for key in SOLVERS}
    print(
        f"sklearn_logistic: wrote {os.path.relpath(OUTPUT, ROOT)} for {len(DATA_SETS)} data sets "
        f"(sklearn {sklearn.__version__}; largest |gradient| "
        + ", ".join(f"{key} {value:.1e}" for key, value in worst.items())
        + ")"
    )


if __name__ == "__main__":
    main()
