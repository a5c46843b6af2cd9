#!/usr/bin/python3
"""Reference values for headroom's metrics (src/curve/metrics.ts), computed with scikit-learn.

Run with Debian's interpreter and packages (python3-sklearn, python3-numpy), not a virtualenv:

    /usr/bin/python3 scripts/reference/sklearn_metrics.py           # rewrite the JSON
    /usr/bin/python3 scripts/reference/sklearn_metrics.py --check   # compare with the committed JSON

It builds a few fixed inputs (hand-made label/probability arrays with tied scores, probabilities of
exactly 0 and 1, ties between classes, a class absent from the held-out rows, and seeded random
arrays made of small integer counts so that scores tie often) and records, for each:

  classification (labels 0..K-1, probabilities rows x K, predicted class = argmax, ties to the lower
  index as numpy's argmax):
    accuracy           accuracy_score(y, argmax)
    balanced_accuracy  balanced_accuracy_score(y, argmax)
    roc_auc            roc_auc_score(y, p[:, 1]) for two classes; roc_auc_score(y, p,
                       multi_class="ovr", average="macro", labels=0..K-1) for more; null where
                       scikit-learn raises (a class absent from y), with its message
    log_loss           log_loss(y, p, labels=0..K-1) (clips at numpy's float64 eps, renormalizes rows)
    brier              brier_score_loss(y, p[:, 1]) for two classes; for more classes scikit-learn 1.2
                       has no multiclass Brier score, so the value is Brier's (1950) multi-category
                       score mean_i sum_k (p_ik - [y_i = k])^2 evaluated here with numpy
    f1_macro           f1_score(y, argmax, average="macro") with scikit-learn's default labels
  regression:
    rmse               mean_squared_error(y, yhat, squared=False)
    mae                mean_absolute_error(y, yhat)
    r2                 r2_score(y, yhat); where y is constant scikit-learn returns a conventional
                       0 or 1 (recorded as `r2Conventional`) and headroom calls the score undefined

The output, fixtures/reference/sklearn-metrics.json, is deterministic apart from its `generated` date
and the versions. `--check` recomputes and exits with status 1 when any input differs, or any value
differs from the committed one by more than 1e-12 * max(1, |committed|), or a value's definedness
differs; status 0 otherwise. The script prints one summary line and nothing else.
"""

import argparse
import datetime
import os
import sys
import warnings

import numpy as np
import sklearn
from sklearn.metrics import (
    accuracy_score,
    balanced_accuracy_score,
    brier_score_loss,
    f1_score,
    log_loss,
    mean_absolute_error,
    mean_squared_error,
    r2_score,
    roc_auc_score,
)

from _drift import compare, read_json, write_json

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
OUTPUT = os.path.join(ROOT, "fixtures", "reference", "sklearn-metrics.json")
CHECK_TOLERANCE = 1e-12
SEED = 20261201


def counts_to_probabilities(counts):
    """Rows of small non-negative integer counts -> rows of probabilities (each row sums to 1)."""
    counts = np.asarray(counts, dtype=np.float64)
    return counts / counts.sum(axis=1, keepdims=True)


def classification_cases():
    rng = np.random.default_rng(SEED)
    cases = {}
    # Two classes, hand-made: tied scores across the classes, probabilities of exactly 0 and 1, and a
    # confident wrong answer (p = 1 for the wrong class) that log loss clips.
    p1 = [0.1, 0.4, 0.35, 0.8, 0.4, 0.4, 0.2, 0.9, 0.65, 0.35, 0.0, 1.0, 1.0, 0.5]
    cases["binaryHandMade"] = {
        "labels": [0, 1, 1, 0, 1, 0, 0, 1, 1, 1, 0, 1, 0, 1],
        "probabilities": [[1 - p, p] for p in p1],
    }
    # Two classes, seeded: probabilities on a grid of tenths, so many scores tie.
    labels = rng.integers(0, 2, size=60)
    p1 = np.clip(np.round(0.5 + 0.3 * (2 * labels - 1) * rng.random(60) + 0.25 * rng.standard_normal(60), 1), 0, 1)
    cases["binarySeeded"] = {"labels": labels.tolist(), "probabilities": [[1 - p, p] for p in p1.tolist()]}
    # Two classes, held-out rows of one class only: ROC AUC is undefined.
    cases["binaryOneClass"] = {
        "labels": [1, 1, 1, 1, 1],
        "probabilities": [[0.3, 0.7], [0.6, 0.4], [0.5, 0.5], [0.1, 0.9], [0.8, 0.2]],
    }
    # Three classes, hand-made: rows whose largest probability is shared by two classes (argmax takes
    # the lower index), tied class scores across rows.
    cases["multiclassHandMade"] = {
        "labels": [0, 1, 2, 2, 1, 0, 2, 1, 0],
        "probabilities": [
            [0.5, 0.3, 0.2],
            [0.4, 0.4, 0.2],
            [0.2, 0.3, 0.5],
            [0.1, 0.45, 0.45],
            [0.2, 0.5, 0.3],
            [0.3, 0.3, 0.4],
            [0.2, 0.3, 0.5],
            [0.6, 0.2, 0.2],
            [0.25, 0.25, 0.5],
        ],
    }
    # Four classes, seeded: probabilities from integer counts 0..4 (ties and zeros are frequent).
    labels = rng.integers(0, 4, size=80)
    counts = rng.integers(0, 5, size=(80, 4))
    counts[np.arange(80), labels] += rng.integers(0, 3, size=80)
    counts[counts.sum(axis=1) == 0, 0] = 1
    cases["multiclassSeeded"] = {
        "labels": labels.tolist(),
        "probabilities": counts_to_probabilities(counts).tolist(),
    }
    # Four classes, class 3 absent from the held-out rows but sometimes predicted: ROC AUC undefined,
    # balanced accuracy averages the three present classes, macro F1 counts class 3 (predicted).
    labels = rng.integers(0, 3, size=30)
    counts = rng.integers(0, 4, size=(30, 4))
    counts[np.arange(30), labels] += 2
    counts[counts.sum(axis=1) == 0, 0] = 1
    cases["multiclassAbsentClass"] = {
        "labels": labels.tolist(),
        "probabilities": counts_to_probabilities(counts).tolist(),
    }
    return cases


def regression_cases():
    rng = np.random.default_rng(SEED + 1)
    cases = {}
    cases["regressionHandMade"] = {
        "targets": [3.0, -0.5, 2.0, 7.0, 4.25, 0.0, 1.5, 2.0],
        "predictions": [2.5, 0.0, 2.0, 8.0, 3.75, -0.25, 1.0, 2.5],
    }
    targets = rng.normal(10.0, 3.0, size=50)
    predictions = targets + rng.normal(0.0, 1.5, size=50)
    cases["regressionSeeded"] = {"targets": targets.tolist(), "predictions": predictions.tolist()}
    cases["regressionConstant"] = {"targets": [2.0, 2.0, 2.0], "predictions": [1.0, 2.5, 2.0]}
    return cases


def classification_expected(case):
    y = np.asarray(case["labels"])
    p = np.asarray(case["probabilities"], dtype=np.float64)
    k = p.shape[1]
    classes = list(range(k))
    predicted = np.argmax(p, axis=1)
    expected = {}
    with warnings.catch_warnings():
        # balanced_accuracy_score warns when a predicted class is absent from y; the value is kept.
        warnings.simplefilter("ignore")
        expected["accuracy"] = float(accuracy_score(y, predicted))
        expected["balanced_accuracy"] = float(balanced_accuracy_score(y, predicted))
        try:
            if k == 2:
                expected["roc_auc"] = float(roc_auc_score(y, p[:, 1]))
            else:
                expected["roc_auc"] = float(roc_auc_score(y, p, multi_class="ovr", average="macro", labels=classes))
        except ValueError as error:
            expected["roc_auc"] = None
            expected["rocAucError"] = str(error)
        expected["log_loss"] = float(log_loss(y, p, labels=classes))
        if k == 2:
            expected["brier"] = float(brier_score_loss(y, p[:, 1]))
        else:
            onehot = (y[:, None] == np.arange(k)[None, :]).astype(np.float64)
            expected["brier"] = float(np.mean(np.sum((p - onehot) ** 2, axis=1)))
        expected["f1_macro"] = float(f1_score(y, predicted, average="macro"))
    return expected


def regression_expected(case):
    y = np.asarray(case["targets"], dtype=np.float64)
    yhat = np.asarray(case["predictions"], dtype=np.float64)
    expected = {
        "rmse": float(mean_squared_error(y, yhat, squared=False)),
        "mae": float(mean_absolute_error(y, yhat)),
    }
    if np.all(y == y[0]):
        expected["r2"] = None
        expected["r2Conventional"] = float(r2_score(y, yhat))
    else:
        expected["r2"] = float(r2_score(y, yhat))
    return expected


def run():
    classification = classification_cases()
    regression = regression_cases()
    return {
        "source": "scikit-learn 1.2 metrics from Debian python3-sklearn (multiclass Brier score: numpy, see brierNote)",
        "command": "/usr/bin/python3 scripts/reference/sklearn_metrics.py",
        "generated": datetime.date.today().isoformat(),
        "versions": {
            "python": sys.version.split()[0],
            "sklearn": sklearn.__version__,
            "numpy": np.__version__,
        },
        "brierNote": "binary: sklearn brier_score_loss(y, p[:, 1]); multiclass: mean_i sum_k (p_ik - [y_i = k])^2 (Brier 1950) with numpy, as sklearn 1.2 has no multiclass Brier score",
        "classification": {
            name: {**case, "classCount": len(case["probabilities"][0]), "expected": classification_expected(case)}
            for name, case in classification.items()
        },
        "regression": {name: {**case, "expected": regression_expected(case)} for name, case in regression.items()},
    }


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--check", action="store_true", help="compare a fresh run with the committed JSON")
    args = parser.parse_args()
    fresh = run()
    count = len(fresh["classification"]) + len(fresh["regression"])
    if args.check:
        committed = read_json(OUTPUT)
        problems = []
        for part in ["classification", "regression"]:
            compare(fresh[part], committed[part], CHECK_TOLERANCE, part, problems)
        if problems:
            print(f"sklearn_metrics: {len(problems)} drift(s), first: {problems[0]}")
            sys.exit(1)
        print(
            f"sklearn_metrics: no drift beyond {CHECK_TOLERANCE:g} in {count} cases "
            f"(sklearn {fresh['versions']['sklearn']}, committed with {committed['versions']['sklearn']})"
        )
        return
    write_json(OUTPUT, fresh)
    print(f"sklearn_metrics: wrote {os.path.relpath(OUTPUT, ROOT)} ({count} cases, sklearn {sklearn.__version__})")


if __name__ == "__main__":
    main()
