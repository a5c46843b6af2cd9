#!/usr/bin/python3
"""Reference values for the learners on wide data (more feature columns than rows), from scikit-learn.

Run with Debian's interpreter and packages (python3-sklearn, python3-numpy), not a virtualenv:

    /usr/bin/python3 scripts/reference/sklearn_wide.py           # rewrite the data and the JSON
    /usr/bin/python3 scripts/reference/sklearn_wide.py --check   # compare with the committed files

Data (generated here, written to fixtures/reference/wide/, seeded with numpy's legacy RandomState so
that a rerun gives the same bytes): `binary` has 150 rows x 500 feature columns, `three` 150 x 400
in three classes; the class of row i is i mod classes; the first INFORMATIVE columns carry the
class (class centres drawn once as 0.6 * standard normal), every value adds standard normal noise;
values written with 4 decimals.

For each set:
  1. a fixed split: the first TRAIN_ROWS rows train, the rest test. Pipeline(StandardScaler(), model)
     with LogisticRegression(C=1, tol=1e-10, max_iter=100000) and LinearDiscriminantAnalysis(
     solver="lsqr", shrinkage="auto"); predict_proba of the test rows is recorded; and
     LinearSVC(loss="hinge", dual=True, C=1, tol=1e-8, max_iter=1000000, random_state=0), whose
     decision_function of the test rows is recorded (one-vs-rest for three classes);
  2. learning curves with headroom's design: RepeatedStratifiedKFold(5 folds, 10 repeats,
     random_state=0); in each training fold, for each of 8 geometric sizes from 10% of the training
     pool (as scripts/reference/sklearn_learning_curve.py computes them), a stratified subsample of
     that size (StratifiedShuffleSplit(n_splits=1, train_size=size), seeded per fold and size from
     RandomState(SUBSAMPLE_SEED); the whole fold at the largest size), as headroom's nested
     stratified subsamples are stratified (learning_curve's are not, which on 9 to 30 rows changes
     the mean accuracy by several points), for Pipeline(SimpleImputer(median), StandardScaler(),
     model) with LogisticRegression(C=1) and the same LDA; the mean held-out accuracy at each size,
     and the splits themselves (test rows, and the training rows at each size), so that a test can
     fit headroom's learners on exactly the same rows.

`--check` recomputes everything and exits 1 when the data files differ or a number drifts by more
than CHECK_TOLERANCE (relative to max(1, |value|)); it prints one line.
"""

import argparse
import datetime
import json
import math
import os
import sys
import warnings

import numpy as np
import sklearn
from sklearn.discriminant_analysis import LinearDiscriminantAnalysis
from sklearn.impute import SimpleImputer
from sklearn.linear_model import LogisticRegression
from sklearn.model_selection import RepeatedStratifiedKFold, StratifiedShuffleSplit
from sklearn.pipeline import make_pipeline
from sklearn.preprocessing import StandardScaler
from sklearn.svm import LinearSVC

from _drift import exit_with_check, largest_difference, read_json

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
DATA_DIR = os.path.join(ROOT, "fixtures", "reference", "wide")
OUTPUT = os.path.join(ROOT, "fixtures", "reference", "sklearn-wide.json")
SETS = {"binary": (150, 500, 2, 11), "three": (150, 400, 3, 12)}
INFORMATIVE = 20
TRAIN_ROWS = 100
FOLDS = 5
REPEATS = 10
SIZE_COUNT = 8
CHECK_TOLERANCE = 1e-6
SUBSAMPLE_SEED = 20261203


def generate(rows, columns, classes, seed):
    random = np.random.RandomState(seed)
    centres = np.zeros((classes, columns))
    centres[:, :INFORMATIVE] = 0.6 * random.standard_normal((classes, INFORMATIVE))
    y = np.arange(rows) % classes
    X = centres[y] + random.standard_normal((rows, columns))
    X = np.round(X, 4)
    header = ",".join([f"x{j}" for j in range(columns)] + ["class"])
    lines = [header] + [",".join([f"{v:.4f}" for v in X[i]] + [f"c{y[i]}"]) for i in range(rows)]
    return X, y, "\n".join(lines) + "\n"


def js_round(x):
    """JavaScript's Math.round: halves rounded up."""
    return int(math.floor(x + 0.5))


def geometric_sizes(smallest, largest, count=SIZE_COUNT):
    """headroom's geometricSizes (src/curve/sizes.ts), transcribed."""
    sizes = []
    for i in range(count):
        size = js_round(smallest * (largest / smallest) ** (i / (count - 1)))
        if not sizes or size > sizes[-1]:
            sizes.append(size)
    return sizes


def lda():
    return LinearDiscriminantAnalysis(solver="lsqr", shrinkage="auto")


def one_set(X, y):
    train, test = slice(0, TRAIN_ROWS), slice(TRAIN_ROWS, None)
    logistic = make_pipeline(StandardScaler(), LogisticRegression(C=1.0, tol=1e-10, max_iter=100000)).fit(X[train], y[train])
    discriminant = make_pipeline(StandardScaler(), lda()).fit(X[train], y[train])
    svm = make_pipeline(
        StandardScaler(), LinearSVC(loss="hinge", dual=True, C=1.0, tol=1e-8, max_iter=1000000, random_state=0)
    ).fit(X[train], y[train])
    svm_scores = svm.decision_function(X[test])
    pool = len(y) - math.ceil(len(y) / FOLDS)
    sizes = geometric_sizes(0.1 * pool, pool)
    seeds = np.random.RandomState(SUBSAMPLE_SEED)
    splits = []
    for fold_train, fold_test in RepeatedStratifiedKFold(n_splits=FOLDS, n_repeats=REPEATS, random_state=0).split(X, y):
        subsets = []
        for size in sizes:
            seed = int(seeds.randint(2**31 - 1))
            if size >= len(fold_train):
                subsets.append(fold_train)
                continue
            pick, _ = next(StratifiedShuffleSplit(n_splits=1, train_size=size, random_state=seed).split(X[fold_train], y[fold_train]))
            subsets.append(fold_train[pick])
        splits.append((subsets, fold_test))
    recorded = [{"test": fold_test.tolist(), "subsets": [subset.tolist() for subset in subsets]} for subsets, fold_test in splits]
    curves = {}
    for name, make in [("logistic", lambda: LogisticRegression(C=1.0)), ("lda", lda)]:
        scores = np.zeros((len(sizes), len(splits)))
        for f, (subsets, fold_test) in enumerate(splits):
            for s, subset in enumerate(subsets):
                estimator = make_pipeline(SimpleImputer(strategy="median"), StandardScaler(), make())
                with warnings.catch_warnings():
                    warnings.simplefilter("ignore")
                    estimator.fit(X[subset], y[subset])
                scores[s, f] = estimator.score(X[fold_test], y[fold_test])
        curves[name] = scores.mean(axis=1).tolist()
    return {
        "trainRows": TRAIN_ROWS,
        "logisticProbabilities": logistic.predict_proba(X[test]).tolist(),
        "ldaProbabilities": discriminant.predict_proba(X[test]).tolist(),
        "svmScores": (svm_scores[:, None] if svm_scores.ndim == 1 else svm_scores).tolist(),
        "trainingSizes": sizes,
        "meanScores": curves,
        "splits": recorded,
    }


def run():
    data, results = {}, {}
    for name, (rows, columns, classes, seed) in SETS.items():
        X, y, text = generate(rows, columns, classes, seed)
        data[name] = text
        results[name] = one_set(X, y)
    return data, {
        "source": "scikit-learn 1.2 from Debian python3-sklearn",
        "command": "/usr/bin/python3 scripts/reference/sklearn_wide.py",
        "generated": datetime.date.today().isoformat(),
        "versions": {"python": sys.version.split()[0], "sklearn": sklearn.__version__, "numpy": np.__version__},
        "data": {name: f"fixtures/reference/wide/{name}.csv" for name in SETS},
        "sets": results,
    }


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--check", action="store_true")
    args = parser.parse_args()
    data, fresh = run()
    if args.check:
        for name, text in data.items():
            with open(os.path.join(DATA_DIR, f"{name}.csv")) as handle:
                if handle.read() != text:
                    print(f"sklearn_wide: fixtures/reference/wide/{name}.csv differs from a fresh generation")
                    sys.exit(1)
        committed = read_json(OUTPUT)
        exit_with_check("sklearn_wide", largest_difference([(fresh["sets"], committed["sets"])], True), CHECK_TOLERANCE)
    os.makedirs(DATA_DIR, exist_ok=True)
    for name, text in data.items():
        with open(os.path.join(DATA_DIR, f"{name}.csv"), "w") as handle:
            handle.write(text)
    with open(OUTPUT, "w") as handle:
        json.dump(fresh, handle, indent=1)
        handle.write("\n")
    print(f"sklearn_wide: wrote {os.path.relpath(OUTPUT, ROOT)} and {len(data)} data files")


if __name__ == "__main__":
    main()
