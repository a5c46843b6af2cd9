"""The reference side of `npm run bench`: scikit-learn's learning_curve on one CSV.

Same job as `headroom measure --workers 1 --learner NAME`: median imputation, standardization (not
for the forest, whose trees do not need it) and the learner with scikit-learn's defaults, fitted at
8 training sizes spaced geometrically from 10% to 100% of an 80% training pool, 10 fits per size,
accuracy on the held-out 20%. The learners, as the parity tests pair them (scripts/reference/
sklearn_learners.py): logistic LogisticRegression(C=1) (lbfgs), lda LinearDiscriminantAnalysis(
solver="lsqr", shrinkage="auto"), naive-bayes GaussianNB(), knn KNeighborsClassifier(5), svm
LinearSVC(loss="hinge", dual=True, C=1), forest RandomForestClassifier() (100 trees). With --tune
the pipeline is wrapped in GridSearchCV over the learner's grid as headroom's --tune tries it (only
logistic: C in 0.01, 0.1, 1, 10, 100; 3 stratified inner folds), fitted anew at every size.

Run with Debian's python3-sklearn:
    /usr/bin/python3 scripts/bench/sklearn_learning_curve.py DATA.csv [--learner NAME] [--tune]
Prints one JSON line: rows, classes, the training sizes, mean accuracy per size, and this process's
peak memory and processor time (user + system, all threads).
"""
import argparse
import json
import resource
import warnings

import numpy as np
from sklearn.discriminant_analysis import LinearDiscriminantAnalysis
from sklearn.ensemble import RandomForestClassifier
from sklearn.exceptions import ConvergenceWarning
from sklearn.impute import SimpleImputer
from sklearn.linear_model import LogisticRegression
from sklearn.model_selection import GridSearchCV, StratifiedShuffleSplit, learning_curve
from sklearn.naive_bayes import GaussianNB
from sklearn.neighbors import KNeighborsClassifier
from sklearn.pipeline import make_pipeline
from sklearn.preprocessing import StandardScaler
from sklearn.svm import LinearSVC

LEARNERS = {
    "logistic": lambda: LogisticRegression(C=1.0),
    "lda": lambda: LinearDiscriminantAnalysis(solver="lsqr", shrinkage="auto"),
    "naive-bayes": GaussianNB,
    "knn": lambda: KNeighborsClassifier(n_neighbors=5),
    "svm": lambda: LinearSVC(loss="hinge", dual=True, C=1.0),
    "forest": RandomForestClassifier,
}
GRIDS = {"logistic": {"logisticregression__C": [0.01, 0.1, 1.0, 10.0, 100.0]}}


def read(path):
    """Features (numpy's C reader) and the `class` column, which must be last."""
    with open(path) as f:
        header = f.readline().strip().split(",")
    assert header[-1] == "class"
    columns = len(header) - 1
    X = np.loadtxt(path, delimiter=",", skiprows=1, usecols=range(columns))
    labels = np.loadtxt(path, delimiter=",", skiprows=1, usecols=[columns], dtype=str)
    _, y = np.unique(labels, return_inverse=True)
    return X, y


def main() -> None:
    parser = argparse.ArgumentParser()
    parser.add_argument("path")
    parser.add_argument("--learner", default="logistic", choices=sorted(LEARNERS))
    parser.add_argument("--tune", action="store_true")
    args = parser.parse_args()
    X, y = read(args.path)
    steps = [SimpleImputer(strategy="median")]
    if args.learner != "forest":
        steps.append(StandardScaler())
    model = make_pipeline(*steps, LEARNERS[args.learner]())
    if args.tune:
        model = GridSearchCV(model, GRIDS[args.learner], cv=3)
    cv = StratifiedShuffleSplit(n_splits=10, test_size=0.2, random_state=0)
    fractions = np.geomspace(0.1, 1.0, 8)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", ConvergenceWarning)
        sizes, _, test_scores = learning_curve(model, X, y, train_sizes=fractions, cv=cv, n_jobs=1)
    usage = resource.getrusage(resource.RUSAGE_SELF)
    print(json.dumps({
        "rows": int(len(y)),
        "classes": int(len(np.unique(y))),
        "trainingSizes": [int(s) for s in sizes],
        "meanScores": [float(s) for s in test_scores.mean(axis=1)],
        "peakMemoryKiB": int(usage.ru_maxrss),
        "cpuSeconds": usage.ru_utime + usage.ru_stime,
    }))


if __name__ == "__main__":
    main()
