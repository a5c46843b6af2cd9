"""The reference side of `npm run bench`: scikit-learn's learning_curve on one CSV.

Same job as `headroom measure --workers 1`: median imputation, standardization and L2 logistic
regression (C = 1, lbfgs, scikit-learn's defaults) fitted at 8 training sizes spaced geometrically
from 10% to 100% of an 80% training pool, 10 fits per size, accuracy on the held-out 20%.
Run with Debian's python3-sklearn: /usr/bin/python3 scripts/bench/sklearn_learning_curve.py DATA.csv
Prints one JSON line: rows, classes, the training sizes, mean accuracy per size, and this process's
peak memory and processor time (user + system, all threads).
"""
import json
import resource
import sys
import warnings

import numpy as np
from sklearn.exceptions import ConvergenceWarning
from sklearn.impute import SimpleImputer
from sklearn.linear_model import LogisticRegression
from sklearn.model_selection import StratifiedShuffleSplit, learning_curve
from sklearn.pipeline import make_pipeline
from sklearn.preprocessing import StandardScaler


def main(path: str) -> None:
    with open(path) as f:
        header = f.readline().strip().split(",")
    data = np.genfromtxt(path, delimiter=",", skip_header=1, dtype=str)
    X = data[:, :-1].astype(float)
    _, y = np.unique(data[:, -1], return_inverse=True)
    assert header[-1] == "class"
    model = make_pipeline(SimpleImputer(strategy="median"), StandardScaler(), LogisticRegression(C=1.0))
    cv = StratifiedShuffleSplit(n_splits=10, test_size=0.2, random_state=0)
    fractions = np.geomspace(0.1, 1.0, 8)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ConvergenceWarning)
        sizes, _, test_scores = learning_curve(model, X, y, train_sizes=fractions, cv=cv, n_jobs=1)
    usage = resource.getrusage(resource.RUSAGE_SELF)
    peak_kib = usage.ru_maxrss
    print(json.dumps({
        "rows": int(len(y)),
        "classes": int(len(np.unique(y))),
        "trainingSizes": [int(s) for s in sizes],
        "meanScores": [float(s) for s in test_scores.mean(axis=1)],
        "peakMemoryKiB": int(peak_kib),
        "cpuSeconds": usage.ru_utime + usage.ru_stime,
    }))


if __name__ == "__main__":
    main(sys.argv[1])
