#!/usr/bin/python3
"""Writes the extra open data sets of fixtures/open-data/ from copies shipped in Debian packages.

    apt-get download weka python3-statsmodels
    dpkg-deb -x weka_3.6.14-3_all.deb x && dpkg-deb -x python3-statsmodels_0.13.5+dfsg-7_all.deb x
    /usr/bin/python3 scripts/open-data/debian_data.py x fixtures/open-data

Each file: the feature columns as shipped, then a `class` column. ARFF nominal values are written as
their text (headroom one-hot encodes text columns), '?' as an empty cell (missing). Values are never
edited; only `fair.csv`'s class is derived (see below). Uses only the standard library and SciPy's
ARFF reader (Debian python3-scipy).
"""
import csv
import sys
from pathlib import Path

from scipy.io import arff

WEKA = "usr/share/doc/weka/examples"
STATSMODELS = "usr/lib/python3/dist-packages/statsmodels/datasets"


def cell(value):
    if isinstance(value, bytes):
        text = value.decode("utf-8")
        return "" if text == "?" else text
    if value != value:  # NaN: missing
        return ""
    return repr(float(value)) if not float(value).is_integer() else str(int(value))


def write(path, header, rows):
    with open(path, "w", newline="") as out:
        writer = csv.writer(out, lineterminator="\n")
        writer.writerow(header)
        writer.writerows(rows)
    print(f"{path}: {len(rows)} rows x {len(header) - 1} features")


def from_arff(root, names, out, class_attribute="class"):
    header = None
    rows = []
    for name in names:
        data, meta = arff.loadarff(str(Path(root, WEKA, name)))
        attributes = meta.names()
        features = [a for a in attributes if a != class_attribute]
        header = features + ["class"]
        for record in data:
            rows.append([cell(record[a]) for a in features] + [cell(record[class_attribute])])
    write(out, header, rows)


def main(root, target):
    Path(target).mkdir(parents=True, exist_ok=True)
    from_arff(root, ["diabetes.arff"], Path(target, "pima_diabetes.csv"))
    from_arff(root, ["credit-g.arff"], Path(target, "credit_g.csv"))
    from_arff(root, ["ionosphere.arff"], Path(target, "ionosphere.csv"))
    from_arff(root, ["segment-challenge.arff", "segment-test.arff"], Path(target, "segment.csv"))
    from_arff(root, ["vote.arff"], Path(target, "vote.csv"), class_attribute="Class")
    # fair: the class is whether any time was spent in extramarital affairs (affairs > 0), the usual
    # binary version of this data set (statsmodels' own documentation example fits it as a logit).
    with open(Path(root, STATSMODELS, "fair", "fair.csv"), newline="") as source:
        reader = csv.reader(source)
        header = next(reader)
        affairs = header.index("affairs")
        features = [h for h in header if h != "affairs"]
        rows = []
        for record in reader:
            values = [v for k, v in enumerate(record) if k != affairs]
            rows.append(values + ["yes" if float(record[affairs]) > 0 else "no"])
    write(Path(target, "fair.csv"), features + ["class"], rows)


if __name__ == "__main__":
    main(sys.argv[1], sys.argv[2])
