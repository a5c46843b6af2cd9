#!/usr/bin/python3
"""Reference values for headroom's learners other than logistic regression, computed with scikit-learn.

Run with Debian's interpreter and packages (python3-sklearn, python3-numpy), not a virtualenv:

    /usr/bin/python3 scripts/reference/sklearn_learners.py                # rewrite the JSON
    /usr/bin/python3 scripts/reference/sklearn_learners.py --check        # compare with the committed JSON
    /usr/bin/python3 scripts/reference/sklearn_learners.py --write-data   # (re)export diabetes.csv first

Classification, for each open data set in fixtures/open-data/ (feature columns, then a `class` column):
  1. a fixed split: numpy's legacy RandomState(SPLIT_SEED).permutation of the rows; the first
     round(0.7 * rows) rows of that order train, the rest test (both kept in that order, which matters
     for k-NN ties: the earlier training row wins);
  2. each model is a Pipeline(StandardScaler(), model) fitted on the training rows, which is what
     headroom's learners do (the scaler is fitted on the training rows only):
       lda         LinearDiscriminantAnalysis(solver="lsqr", shrinkage="auto")
       naiveBayes  GaussianNB()
       knn         KNeighborsClassifier(n_neighbors=5)   (algorithm "auto": a k-d tree up to 15
                   features, brute force beyond)
       svm         LinearSVC(loss="hinge", dual=True, C=1, tol=SVM_TOL, max_iter=SVM_MAX_ITER), one
                   versus rest for more than two classes
     and the test rows' predicted class indices (into sorted class names), predict_proba (not for the
     SVM) and decision_function (SVM) are recorded;
  3. LDA and GaussianNB again, trained on only the first FEW_ROWS training rows of each class (the
     smallest sizes of a learning curve), scored on the same test rows (probabilities of the first
     FEW_ROWS_PROBABILITIES test rows);
  4. the random forest cannot match number for number (its random streams differ), so its reference is
     a score: RandomForestClassifier() (100 trees, sqrt features, Gini, fully grown; on the unscaled
     features, which trees do not need) under 5-fold StratifiedKFold(shuffle=True, random_state=0),
     whose fold of each row is recorded, with random_state = 0 .. FOREST_SEEDS - 1: the mean test
     accuracy per seed, their mean and their standard deviation.

Regression, on fixtures/open-data/diabetes.csv (Efron et al. 2004; exported by --write-data from
sklearn.datasets.load_diabetes(scaled=False), ten features then `target`): the same kind of split, then
Pipeline(StandardScaler(), Ridge(alpha=1.0)) (coef_, intercept_, test predictions) and
Pipeline(StandardScaler(), KNeighborsRegressor(n_neighbors=5)) (test predictions), and both again with
`sex` (values 1, 2) treated as a text column: ColumnTransformer(StandardScaler() on the other columns,
OneHotEncoder(handle_unknown="ignore") on sex).

The output, fixtures/reference/sklearn-learners.json, is deterministic apart from its `generated`
date and the versions. Probabilities and scores are rounded to 10 decimals (the tests compare to
1e-6). `--check` refits and exits with status 1 when any number differs from the committed file by
more than 1e-6 * max(1, |committed|), any prediction or class differs, or diabetes.csv no longer equals
what load_diabetes returns; status 0 otherwise. The script prints one summary line.
"""

import argparse
import csv
import datetime
import json
import os
import sys
import warnings

import numpy as np
import sklearn
from sklearn.compose import ColumnTransformer
from sklearn.datasets import load_diabetes
from sklearn.discriminant_analysis import LinearDiscriminantAnalysis
from sklearn.ensemble import RandomForestClassifier
from sklearn.exceptions import ConvergenceWarning
from sklearn.linear_model import Ridge
from sklearn.model_selection import StratifiedKFold
from sklearn.naive_bayes import GaussianNB
from sklearn.neighbors import KNeighborsClassifier, KNeighborsRegressor
from sklearn.pipeline import make_pipeline
from sklearn.preprocessing import OneHotEncoder, StandardScaler
from sklearn.svm import LinearSVC

from _drift import compare, read_json


ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
DATA_DIR = os.path.join(ROOT, "fixtures", "open-data")
OUTPUT = os.path.join(ROOT, "fixtures", "reference", "sklearn-learners.json")
DIABETES = os.path.join(DATA_DIR, "diabetes.csv")
DATA_SETS = ["breast_cancer", "wine", "iris", "digits"]
SPLIT_SEED = 20261201
TRAIN_FRACTION = 0.7
SVM_TOL = 1e-8
SVM_MAX_ITER = 1000000
FEW_ROWS = 2
FEW_ROWS_PROBABILITIES = 100
FOREST_SEEDS = 3
FOREST_FOLDS = 5
DECIMALS = 10
CHECK_TOLERANCE = 1e-6


def read_csv(path, last):
    """Feature matrix (float64) and the last column (strings) of a CSV whose last header is `last`."""
    with open(path, newline="") as handle:
        rows = list(csv.reader(handle))
    header, body = rows[0], rows[1:]
    if header[-1] != last:
        raise SystemExit(f"{os.path.basename(path)}: last column is {header[-1]!r}, expected {last!r}")
    features = np.array([[float(v) for v in row[:-1]] for row in body], dtype=np.float64)
    return features, np.array([row[-1] for row in body]), header


def split(rows):
    """The fixed permutation and the number of its leading rows that train."""
    permutation = np.random.RandomState(SPLIT_SEED).permutation(rows)
    return permutation, int(round(TRAIN_FRACTION * rows))


def rounded(array):
    return np.round(np.asarray(array, dtype=np.float64), DECIMALS).tolist()


def classification(name):
    features, labels, _ = read_csv(os.path.join(DATA_DIR, name + ".csv"), "class")
    classes = sorted(set(labels.tolist()))
    y = np.array([classes.index(c) for c in labels])
    permutation, train_rows = split(len(y))
    train, test = permutation[:train_rows], permutation[train_rows:]
    models = {
        "lda": LinearDiscriminantAnalysis(solver="lsqr", shrinkage="auto"),
        "naiveBayes": GaussianNB(),
        "knn": KNeighborsClassifier(n_neighbors=5),
        "svm": LinearSVC(loss="hinge", dual=True, C=1.0, tol=SVM_TOL, max_iter=SVM_MAX_ITER, random_state=0),
    }
    result = {
        "classes": classes,
        "rows": int(len(y)),
        "features": int(features.shape[1]),
        "permutation": permutation.tolist(),
        "trainRows": train_rows,
    }
    for key, model in models.items():
        pipeline = make_pipeline(StandardScaler(), model)
        with warnings.catch_warnings():
            warnings.simplefilter("error", ConvergenceWarning)  # an unconverged reference is no reference
            pipeline.fit(features[train], y[train])
        entry = {"predictions": pipeline.predict(features[test]).tolist()}
        if hasattr(pipeline, "predict_proba") and key != "svm":
            entry["probabilities"] = rounded(pipeline.predict_proba(features[test]))
        if key == "svm":
            entry["decisionScores"] = rounded(pipeline.decision_function(features[test]))
        if key == "knn":
            entry["algorithm"] = pipeline[-1]._fit_method
        if key == "svm":
            entry["iterations"] = int(pipeline[-1].n_iter_)
        if key == "naiveBayes":
            entry["epsilon"] = float(pipeline[-1].epsilon_)
        result[key] = entry
    result["fewRows"] = few_rows(features, y, permutation, train_rows)
    result["forest"] = forest(features, y)
    return result


def few_rows(features, y, permutation, train_rows):
    """LDA and naive Bayes trained on the first FEW_ROWS training rows of each class (a learning
    curve's smallest sizes: LDA's class covariances get no shrinkage and the pooled one can be
    singular; naive Bayes variances lean on the smoothing), scored on the usual test rows
    (probabilities of the first FEW_ROWS_PROBABILITIES of them, to keep the file small)."""
    train = [r for r in permutation[:train_rows]]
    chosen = [r for i, r in enumerate(train) if sum(1 for q in train[:i] if y[q] == y[r]) < FEW_ROWS]
    test = permutation[train_rows:]
    result = {"trainRows": [int(r) for r in chosen]}
    for key, model in (
        ("lda", LinearDiscriminantAnalysis(solver="lsqr", shrinkage="auto")),
        ("naiveBayes", GaussianNB()),
    ):
        pipeline = make_pipeline(StandardScaler(), model).fit(features[chosen], y[chosen])
        result[key] = {
            "predictions": pipeline.predict(features[test]).tolist(),
            "probabilitiesFirstTestRows": rounded(pipeline.predict_proba(features[test[:FEW_ROWS_PROBABILITIES]])),
        }
    return result


def forest(features, y):
    folds = np.zeros(len(y), dtype=int)
    splitter = StratifiedKFold(n_splits=FOREST_FOLDS, shuffle=True, random_state=0)
    for fold, (_, test) in enumerate(splitter.split(features, y)):
        folds[test] = fold
    accuracies = []
    for seed in range(FOREST_SEEDS):
        scores = []
        for fold in range(FOREST_FOLDS):
            model = RandomForestClassifier(random_state=seed).fit(features[folds != fold], y[folds != fold])
            scores.append(float(np.mean(model.predict(features[folds == fold]) == y[folds == fold])))
        accuracies.append(float(np.mean(scores)))
    return {
        "folds": folds.tolist(),
        "accuracyPerSeed": accuracies,
        "meanAccuracy": float(np.mean(accuracies)),
        "sdAccuracy": float(np.std(accuracies, ddof=1)),
    }


def regression():
    features, targets, header = read_csv(DIABETES, "target")
    targets = targets.astype(np.float64)
    permutation, train_rows = split(len(targets))
    train, test = permutation[:train_rows], permutation[train_rows:]
    ridge = make_pipeline(StandardScaler(), Ridge(alpha=1.0)).fit(features[train], targets[train])
    knn = make_pipeline(StandardScaler(), KNeighborsRegressor(n_neighbors=5)).fit(features[train], targets[train])
    # `sex` (values 1 and 2) as a text column: one-hot, the other columns standardized.
    text = header.index("sex")
    numeric = [j for j in range(features.shape[1]) if j != text]

    def encoded(model):
        transformer = ColumnTransformer(
            [("numeric", StandardScaler(), numeric), ("text", OneHotEncoder(handle_unknown="ignore"), [text])]
        )
        return make_pipeline(transformer, model).fit(features[train], targets[train])

    ridge_text = encoded(Ridge(alpha=1.0))
    knn_text = encoded(KNeighborsRegressor(n_neighbors=5))
    return {
        "featureNames": header[:-1],
        "rows": int(len(targets)),
        "permutation": permutation.tolist(),
        "trainRows": train_rows,
        "ridge": {
            "coef": rounded(ridge[-1].coef_),
            "intercept": round(float(ridge[-1].intercept_), DECIMALS),
            "predictions": rounded(ridge.predict(features[test])),
        },
        "knnRegression": {
            "algorithm": knn[-1]._fit_method,
            "predictions": rounded(knn.predict(features[test])),
        },
        "sexAsText": {
            "column": "sex",
            "ridgePredictions": rounded(ridge_text.predict(features[test])),
            "knnRegressionPredictions": rounded(knn_text.predict(features[test])),
        },
    }


def diabetes_rows():
    data = load_diabetes(scaled=False)
    return data.feature_names, data.data, data.target


def write_diabetes():
    names, x, target = diabetes_rows()
    with open(DIABETES, "w", newline="") as handle:
        out = csv.writer(handle, lineterminator="\n")
        out.writerow(list(names) + ["target"])
        for row, t in zip(x, target):
            out.writerow([repr(float(v)) for v in row] + [repr(float(t))])


def diabetes_matches_sklearn():
    names, x, target = diabetes_rows()
    features, targets, header = read_csv(DIABETES, "target")
    return header[:-1] == list(names) and np.array_equal(features, x) and np.array_equal(targets.astype(float), target)


def run():
    return {
        "source": "scikit-learn from Debian python3-sklearn",
        "command": "/usr/bin/python3 scripts/reference/sklearn_learners.py",
        "generated": datetime.date.today().isoformat(),
        "versions": {
            "python": sys.version.split()[0],
            "sklearn": sklearn.__version__,
            "numpy": np.__version__,
        },
        "settings": {
            "split": f"numpy RandomState({SPLIT_SEED}).permutation; first round({TRAIN_FRACTION} * rows) train",
            "pipeline": "make_pipeline(StandardScaler(), model) fitted on the training rows",
            "lda": 'LinearDiscriminantAnalysis(solver="lsqr", shrinkage="auto")',
            "naiveBayes": "GaussianNB()",
            "knn": "KNeighborsClassifier(n_neighbors=5)",
            "svm": f'LinearSVC(loss="hinge", dual=True, C=1.0, tol={SVM_TOL}, max_iter={SVM_MAX_ITER}, random_state=0)',
            "forest": f"RandomForestClassifier(random_state=seed), seeds 0..{FOREST_SEEDS - 1}, unscaled features, "
            f"StratifiedKFold(n_splits={FOREST_FOLDS}, shuffle=True, random_state=0)",
            "ridge": "Ridge(alpha=1.0)",
            "knnRegression": "KNeighborsRegressor(n_neighbors=5)",
            "fewRows": f"LDA and GaussianNB on the first {FEW_ROWS} training rows of each class; "
            f"probabilities of the first {FEW_ROWS_PROBABILITIES} test rows",
            "sexAsText": 'ColumnTransformer([StandardScaler() on the numeric columns, OneHotEncoder(handle_unknown="ignore") on sex])',
            "decimals": DECIMALS,
        },
        "classification": {name: classification(name) for name in DATA_SETS},
        "regression": {"diabetes": regression()},
    }


def dumps(value, indent=0):
    """JSON with one line per list of scalars (a probability row, a permutation), indented otherwise."""
    pad = " " * (indent + 1)
    if isinstance(value, dict):
        items = [f"{pad}{json.dumps(k)}: {dumps(v, indent + 1)}" for k, v in value.items()]
        return "{\n" + ",\n".join(items) + "\n" + " " * indent + "}"
    if isinstance(value, list) and any(isinstance(v, (list, dict)) for v in value):
        return "[\n" + ",\n".join(pad + dumps(v, indent + 1) for v in value) + "\n" + " " * indent + "]"
    return json.dumps(value, separators=(",", ":"))


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--check", action="store_true", help="compare a fresh run with the committed JSON")
    parser.add_argument("--write-data", action="store_true", help="export fixtures/open-data/diabetes.csv first")
    args = parser.parse_args()
    if args.write_data:
        write_diabetes()
    fresh = run()
    if args.check:
        committed = read_json(OUTPUT)
        problems = []
        if not diabetes_matches_sklearn():
            problems.append("fixtures/open-data/diabetes.csv differs from load_diabetes(scaled=False)")
        for part in ("classification", "regression"):
            compare(fresh[part], committed[part], CHECK_TOLERANCE, part, problems, exact_integers=True)
        if problems:
            print(f"sklearn_learners: {len(problems)} drift(s), first: {problems[0]}")
            sys.exit(1)
        print(
            f"sklearn_learners: no drift beyond {CHECK_TOLERANCE:g} in {len(DATA_SETS)} classification data sets "
            f"and diabetes (sklearn {fresh['versions']['sklearn']}, committed with {committed['versions']['sklearn']})"
        )
        return
    os.makedirs(os.path.dirname(OUTPUT), exist_ok=True)
    with open(OUTPUT, "w") as handle:
        handle.write(dumps(fresh))
        handle.write("\n")
    print(
        f"sklearn_learners: wrote {os.path.relpath(OUTPUT, ROOT)} for {len(DATA_SETS)} classification data sets "
        f"and diabetes (sklearn {sklearn.__version__})"
    )


if __name__ == "__main__":
    main()
