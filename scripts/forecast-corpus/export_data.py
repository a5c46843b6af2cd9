#!/usr/bin/python3
"""Writes the open data sets of the forecast corpus as CSV files (features, then `class` or `target`).

    /usr/bin/python3 scripts/forecast-corpus/export_data.py OUT_DIR
    /usr/bin/python3 scripts/forecast-corpus/export_data.py --holdout OUT_DIR   # the held-out sets

Sources, all Debian 12 packages (apt-get install python3-sklearn python3-scipy python3-statsmodels
weka r-base-core r-cran-mlbench r-cran-mass): scikit-learn's bundled data sets, Weka's example ARFF
files (/usr/share/doc/weka/examples), statsmodels' bundled data sets, and R's `datasets`, `mlbench`
and `MASS` packages (read through Rscript). fixtures/forecast-corpus/README.md gives each origin.
Values are written as shipped (ARFF and R factors as text, missing as an empty cell); only the
columns named below are dropped (row identifiers, or a second target) and only the classes or
targets named below are derived. The measuring script caps large sets at 3,000 rows itself.
"""
import csv
import subprocess
import sys
from pathlib import Path

import numpy as np
from scipy.io import arff

WEKA = "/usr/share/doc/weka/examples"


def cell(value):
    if isinstance(value, bytes):
        value = value.decode("utf-8")
    if isinstance(value, str):
        return "" if value in ("?", "NA") else value
    if value is None or value != value:
        return ""
    value = float(value)
    return str(int(value)) if value.is_integer() else repr(value)


def write(out, name, header, rows, label):
    path = Path(out, f"{name}.csv")
    with open(path, "w", newline="") as handle:
        writer = csv.writer(handle, lineterminator="\n")
        writer.writerow(list(header[:-1]) + [label])
        writer.writerows([[cell(v) for v in row] for row in rows])
    print(f"{path}: {len(rows)} rows x {len(header) - 1} features")


def sklearn_sets(out):
    from sklearn import datasets

    for name, loader in [
        ("breast_cancer", datasets.load_breast_cancer),
        ("digits", datasets.load_digits),
        ("wine", datasets.load_wine),
        ("iris", datasets.load_iris),
    ]:
        bunch = loader()
        header = [f"x{j}" for j in range(bunch.data.shape[1])] + ["class"]
        rows = [list(x) + [str(bunch.target_names[y])] for x, y in zip(bunch.data, bunch.target)]
        write(out, name, header, rows, "class")
    bunch = datasets.load_diabetes(scaled=False)
    header = list(bunch.feature_names) + ["target"]
    write(out, "diabetes", header, [list(x) + [y] for x, y in zip(bunch.data, bunch.target)], "target")


def weka_set(out, name, files, label_attribute, label):
    rows = []
    for file in files:
        data, meta = arff.loadarff(f"{WEKA}/{file}")
        features = [a for a in meta.names() if a != label_attribute]
        rows += [[record[a] for a in features] + [record[label_attribute]] for record in data]
    write(out, name, features + [label], rows, label)


def statsmodels_sets(out):
    import statsmodels.api as sm

    fair = sm.datasets.fair.load_pandas().data
    features = [c for c in fair.columns if c != "affairs"]
    rows = [list(r[features]) + ["yes" if r["affairs"] > 0 else "no"] for _, r in fair.iterrows()]
    write(out, "fair", features + ["class"], rows, "class")
    anes = sm.datasets.anes96.load_pandas().data
    features = [c for c in anes.columns if c not in ("vote", "logpopul")]
    rows = [list(r[features]) + ["rep" if r["vote"] == 1 else "dem"] for _, r in anes.iterrows()]
    write(out, "anes96", features + ["class"], rows, "class")
    randhie = sm.datasets.randhie.load_pandas().data
    features = [c for c in randhie.columns if c != "mdvis"]
    write(out, "randhie", features + ["target"], [list(r[features]) + [r["mdvis"]] for _, r in randhie.iterrows()], "target")


# name: (R expression giving a data frame, label column, output label, columns to drop)
R_SETS = {
    "sonar": ("{library(mlbench); data(Sonar); Sonar}", "Class", "class", []),
    "vehicle": ("{library(mlbench); data(Vehicle); Vehicle}", "Class", "class", []),
    "vowel": ("{library(mlbench); data(Vowel); Vowel}", "Class", "class", []),
    "satellite": ("{library(mlbench); data(Satellite); Satellite}", "classes", "class", []),
    "dna": ("{library(mlbench); data(DNA); DNA}", "Class", "class", []),
    "letter": ("{library(mlbench); data(LetterRecognition); LetterRecognition}", "lettr", "class", []),
    "wisconsin": ("{library(mlbench); data(BreastCancer); BreastCancer}", "Class", "class", ["Id"]),
    "synth": ("{library(MASS); synth.te}", "yc", "class", []),
    "crabs": ("{library(MASS); crabs}", "sp", "class", ["index"]),
    "birthwt": ("{library(MASS); birthwt}", "low", "class", ["bwt"]),
    "infert": ("{infert}", "case", "class", ["pooled.stratum", "stratum"]),
    "boston": ("{library(mlbench); data(BostonHousing); BostonHousing}", "medv", "target", []),
    "servo": ("{library(mlbench); data(Servo); Servo}", "Class", "target", []),
    "quakes": ("{quakes}", "mag", "target", []),
    "nlschools": ("{library(MASS); nlschools}", "lang", "target", ["class"]),
    "chickweight": ("{as.data.frame(ChickWeight)}", "weight", "target", []),
}


# Held out: never learned from (corpus.ts, holdoutDataSets). Breiman's generated populations (Breiman
# 1996, "Bias, variance, and arcing classifiers"), 3,000 rows each from a fixed seed; R's Titanic
# table, one row per passenger; and data sets of R's kernlab and caret packages (r-cran-kernlab,
# r-cran-caret).
HOLDOUT_R_SETS = {
    "twonorm": ("{library(mlbench); set.seed(20261203); p <- mlbench.twonorm(3000, d=20); data.frame(p$x, class=p$classes)}", "class", "class", []),
    "ringnorm": ("{library(mlbench); set.seed(20261204); p <- mlbench.ringnorm(3000, d=20); data.frame(p$x, class=p$classes)}", "class", "class", []),
    "threenorm": ("{library(mlbench); set.seed(20261205); p <- mlbench.threenorm(3000, d=20); data.frame(p$x, class=p$classes)}", "class", "class", []),
    "waveform": ("{library(mlbench); set.seed(20261206); p <- mlbench.waveform(3000); data.frame(p$x, class=p$classes)}", "class", "class", []),
    "titanic": ("{t <- as.data.frame(Titanic); t[rep(seq_len(nrow(t)), t$Freq), c('Class', 'Sex', 'Age', 'Survived')]}", "Survived", "class", []),
    "spam": ("{library(kernlab); data(spam); spam}", "type", "class", []),
    "musk": ("{library(kernlab); data(musk); musk}", "Class", "class", []),
    "cells": ("{library(caret); data(segmentationData); segmentationData}", "Class", "class", ["Cell", "Case"]),
    "mdrr": ("{library(caret); data(mdrr); data.frame(mdrrDescr, class=mdrrClass)}", "class", "class", []),
}


def r_set(out, name, expression, label_column, label, drop):
    # Features first, then the label, written by R itself (factors as their level text).
    code = (
        f"full <- {expression}; full <- as.data.frame(full); "
        f"keep <- setdiff(names(full), c({', '.join(repr(c) for c in drop + [label_column])})); "
        f"out <- full[, c(keep, {label_column!r}), drop=FALSE]; "
        f"if (is.factor(out[[{label_column!r}]]) && {str(label == 'target').upper()}) "
        f"out[[{label_column!r}]] <- as.numeric(as.character(out[[{label_column!r}]])); "
        f"names(out)[ncol(out)] <- {label!r}; "
        f"write.csv(out, {str(Path(out, name + '.csv'))!r}, row.names=FALSE, na='')"
    )
    subprocess.run(["Rscript", "-e", code], check=True)
    with open(Path(out, f"{name}.csv")) as handle:
        print(f"{out}/{name}.csv: {sum(1 for _ in handle) - 1} rows")


def main(out):
    Path(out).mkdir(parents=True, exist_ok=True)
    sklearn_sets(out)
    weka_set(out, "pima_diabetes", ["diabetes.arff"], "class", "class")
    weka_set(out, "credit_g", ["credit-g.arff"], "class", "class")
    weka_set(out, "ionosphere", ["ionosphere.arff"], "class", "class")
    weka_set(out, "segment", ["segment-challenge.arff", "segment-test.arff"], "class", "class")
    weka_set(out, "vote", ["vote.arff"], "Class", "class")
    weka_set(out, "breast_cancer_ljubljana", ["breast-cancer.arff"], "Class", "class")
    weka_set(out, "cpu", ["cpu.arff"], "class", "target")
    statsmodels_sets(out)
    for name, (expression, label_column, label, drop) in R_SETS.items():
        r_set(out, name, expression, label_column, label, drop)


def main_holdout(out):
    Path(out).mkdir(parents=True, exist_ok=True)
    for name, (expression, label_column, label, drop) in HOLDOUT_R_SETS.items():
        r_set(out, name, expression, label_column, label, drop)


if __name__ == "__main__":
    if sys.argv[1] == "--holdout":
        main_holdout(sys.argv[2])
    else:
        main(sys.argv[1])
