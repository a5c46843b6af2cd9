#!/usr/bin/env python3
"""A headroom trainer: standardised L2 logistic regression (C = 1) from scikit-learn.

Reads HEADROOM_TRAIN and HEADROOM_TEST (CSV, numeric features), writes to HEADROOM_PREDICTIONS one
column per class holding its probability, one row per test row.
"""
import csv
import os

import numpy as np
from sklearn.linear_model import LogisticRegression
from sklearn.pipeline import make_pipeline
from sklearn.preprocessing import StandardScaler


def read(path):
    with open(path, newline="") as f:
        rows = list(csv.reader(f))
    return rows[0], rows[1:]


header, train = read(os.environ["HEADROOM_TRAIN"])
at = header.index(os.environ["HEADROOM_LABEL"])
x = np.array([[float(c) for i, c in enumerate(row) if i != at] for row in train])
y = np.array([row[at].strip() for row in train])
_, test = read(os.environ["HEADROOM_TEST"])
model = make_pipeline(StandardScaler(), LogisticRegression(C=1.0)).fit(x, y)
with open(os.environ["HEADROOM_PREDICTIONS"], "w", newline="") as f:
    csv.writer(f).writerows([model.classes_, *model.predict_proba(np.array(test, dtype=float)).tolist()])
