#!/usr/bin/python3
"""Reference learning curves for headroom's curve loop (src/curve/measure.ts), computed with scikit-learn.

Run with Debian's interpreter and packages (python3-sklearn, python3-numpy), not a virtualenv:

    /usr/bin/python3 scripts/reference/sklearn_learning_curve.py           # rewrite the JSON
    /usr/bin/python3 scripts/reference/sklearn_learning_curve.py --check   # compare with the committed JSON

For breast_cancer.csv and digits.csv in fixtures/open-data/ (feature columns, then a `class` column) it
runs scikit-learn's learning_curve with headroom's default design and learner:
  - estimator: Pipeline(SimpleImputer(strategy="median"), StandardScaler(), LogisticRegression(C=1.0,
    max_iter=1000)); max_iter is raised from 100 so that no fit stops before lbfgs's own tolerance;
  - cv: RepeatedStratifiedKFold(n_splits=5, n_repeats=10, random_state=0), 50 (repeat, fold) pairs;
  - train_sizes: absolute row counts, 8 geometric sizes from 10% to 100% of the smallest training pool
    (rows - ceil(rows / 5)), rounded as headroom's geometricSizes (src/curve/sizes.ts):
    round(smallest * (largest / smallest) ** (i / 7)) with JavaScript's Math.round (halves up), kept
    strictly increasing; smallest is 0.1 * pool (not rounded first), largest the pool;
  - shuffle=True, random_state=0, n_jobs=1, scoring accuracy (the classifier's default score).
It records, per data set, the training sizes and the mean and standard deviation (numpy's, ddof=0) of
the 50 held-out accuracies at each size.

The output, fixtures/reference/sklearn-learning-curve.json, is deterministic apart from its `generated`
date, the versions and the runtime. `--check` recomputes and exits with status 1 when the training sizes
differ or any mean or standard deviation differs from the committed one by more than 1e-9; status 0
otherwise. The script prints one summary line and nothing else. It makes 800 fits (about 20 s).
"""

import argparse
import csv
import datetime
import json
import math
import os
import sys
import time
import warnings

import numpy as np
import sklearn
from sklearn.impute import SimpleImputer
from sklearn.linear_model import LogisticRegression
from sklearn.model_selection import RepeatedStratifiedKFold, learning_curve
from sklearn.pipeline import make_pipeline
from sklearn.preprocessing import StandardScaler

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
OUTPUT = os.path.join(ROOT, "fixtures", "reference", "sklearn-learning-curve.json")
DATASETS = ["breast_cancer", "digits"]
FOLDS = 5
REPEATS = 10
SIZE_COUNT = 8
CHECK_TOLERANCE = 1e-9


def read_dataset(name):
    """Features (missing cells as NaN) and class labels (as written) of fixtures/open-data/<name>.csv."""
    with open(os.path.join(ROOT, "fixtures", "open-data", f"{name}.csv"), newline="") as handle:
        rows = list(csv.reader(handle))
    header, body = rows[0], rows[1:]
    if header[-1] != "class":
        raise SystemExit(f"{name}.csv: last column is {header[-1]!r}, expected 'class'")
    features = np.array([[float(cell) if cell not in ("", "NA") else np.nan for cell in row[:-1]] for row in body])
    labels = np.array([row[-1] for row in body])
    return features, labels


def js_round(x):
    """JavaScript's Math.round: the nearest integer, halves rounded up (Python's round goes to even)."""
    return int(math.floor(x + 0.5))


def geometric_sizes(smallest, largest, count=SIZE_COUNT):
    """headroom's geometricSizes (src/curve/sizes.ts), transcribed."""
    if largest <= smallest:
        return [largest]
    sizes = []
    for i in range(count):
        size = js_round(smallest * (largest / smallest) ** (i / (count - 1)))
        if not sizes or size > sizes[-1]:
            sizes.append(size)
    return sizes


def curve_of(name):
    features, labels = read_dataset(name)
    rows = len(labels)
    pool = rows - math.ceil(rows / FOLDS)
    sizes = geometric_sizes(0.1 * pool, pool)
    estimator = make_pipeline(
        SimpleImputer(strategy="median"), StandardScaler(), LogisticRegression(C=1.0, max_iter=1000)
    )
    with warnings.catch_warnings():
        warnings.simplefilter("error")  # a convergence warning would make the reference doubtful
        used_sizes, _, test_scores = learning_curve(
            estimator,
            features,
            labels,
            cv=RepeatedStratifiedKFold(n_splits=FOLDS, n_repeats=REPEATS, random_state=0),
            train_sizes=np.array(sizes),
            shuffle=True,
            random_state=0,
            n_jobs=1,
        )
    if used_sizes.tolist() != sizes:
        raise SystemExit(f"{name}: learning_curve used sizes {used_sizes.tolist()}, asked for {sizes}")
    return {
        "rows": rows,
        "smallestPool": pool,
        "trainingSizes": sizes,
        "meanScores": test_scores.mean(axis=1).tolist(),
        "standardDeviations": test_scores.std(axis=1).tolist(),
        "scoresPerSize": int(test_scores.shape[1]),
    }


def run():
    start = time.perf_counter()
    datasets = {name: curve_of(name) for name in DATASETS}
    return {
        "source": "scikit-learn 1.2 learning_curve from Debian python3-sklearn",
        "command": "/usr/bin/python3 scripts/reference/sklearn_learning_curve.py",
        "generated": datetime.date.today().isoformat(),
        "versions": {
            "python": sys.version.split()[0],
            "sklearn": sklearn.__version__,
            "numpy": np.__version__,
        },
        "design": {
            "estimator": "Pipeline(SimpleImputer(strategy='median'), StandardScaler(), LogisticRegression(C=1.0, max_iter=1000))",
            "cv": f"RepeatedStratifiedKFold(n_splits={FOLDS}, n_repeats={REPEATS}, random_state=0)",
            "learningCurve": "train_sizes=<trainingSizes>, shuffle=True, random_state=0, n_jobs=1, scoring=accuracy",
            "trainingSizes": "headroom geometricSizes(0.1 * pool, pool, 8), pool = rows - ceil(rows / 5)",
            "standardDeviation": "numpy std, ddof=0, over the folds x repeats held-out accuracies",
        },
        "runtimeSeconds": round(time.perf_counter() - start, 1),
        "datasets": datasets,
    }


def compare(fresh, committed):
    """Every place where the fresh curves drift from the committed ones."""
    problems = []
    for name, expected in committed["datasets"].items():
        got = fresh["datasets"].get(name)
        if got is None:
            problems.append(f"{name}: missing in fresh run")
            continue
        if got["trainingSizes"] != expected["trainingSizes"]:
            problems.append(f"{name}.trainingSizes: {got['trainingSizes']} vs committed {expected['trainingSizes']}")
            continue
        for key in ["meanScores", "standardDeviations"]:
            for i, (a, b) in enumerate(zip(got[key], expected[key])):
                if abs(a - b) > CHECK_TOLERANCE:
                    problems.append(f"{name}.{key}[{i}]: {a!r} vs committed {b!r}")
    return problems


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--check", action="store_true", help="compare a fresh run with the committed JSON")
    args = parser.parse_args()
    fresh = run()
    if args.check:
        with open(OUTPUT) as handle:
            committed = json.load(handle)
        problems = compare(fresh, committed)
        if problems:
            print(f"sklearn_learning_curve: {len(problems)} drift(s), first: {problems[0]}")
            sys.exit(1)
        print(
            f"sklearn_learning_curve: no drift beyond {CHECK_TOLERANCE:g} in {len(committed['datasets'])} curves "
            f"(sklearn {fresh['versions']['sklearn']}, committed with {committed['versions']['sklearn']}, "
            f"{fresh['runtimeSeconds']} s)"
        )
        return
    os.makedirs(os.path.dirname(OUTPUT), exist_ok=True)
    with open(OUTPUT, "w") as handle:
        json.dump(fresh, handle, indent=1)
        handle.write("\n")
    print(
        f"sklearn_learning_curve: wrote {os.path.relpath(OUTPUT, ROOT)} "
        f"({len(fresh['datasets'])} curves, sklearn {sklearn.__version__}, {fresh['runtimeSeconds']} s)"
    )


if __name__ == "__main__":
    main()
