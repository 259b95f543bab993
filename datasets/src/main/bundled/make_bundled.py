#!/usr/bin/python3
"""Makes settle's bundled dataset resources from the copies in Debian's python3-sklearn 1.2.1.

Run once with the system python (/usr/bin/python3, Debian python3-sklearn 1.2.1):
    OMP_NUM_THREADS=1 /usr/bin/python3 datasets/src/main/bundled/make_bundled.py
It reads sklearn/datasets/data/{breast_cancer.csv, iris.csv, wine_data.csv, digits.csv.gz}, copies every
feature value as the text written there (no float round trip), replaces the integer targets by string
labels, takes the feature names from scikit-learn's own loaders, and writes
datasets/src/main/resources/settle/datasets/bundled/<name>.csv (header row, label column last, LF line ends).
It prints the SHA-256 of each file for BundledData.java.

Relabelling:
  wdbc      breast_cancer.csv codes malignant as 0 and benign as 1 (its header: 569,30,malignant,benign);
            written as 'malignant' / 'benign', so settle's lexical class order is benign < malignant and
            malignant is class 1, the positive class.
  iris      0, 1, 2 -> setosa, versicolor, virginica (iris.csv header)
  wine      0, 1, 2 -> class_0, class_1, class_2 (wine_data.csv header; the three cultivars)
  optdigits 0 .. 9 stay digits 0 .. 9
"""
import csv
import gzip
import hashlib
import io
import os

import sklearn
from sklearn import datasets

assert sklearn.__version__ == "1.2.1", sklearn.__version__

DATA = os.path.join(os.path.dirname(datasets.__file__), "data")
OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "resources", "settle", "datasets", "bundled")


def rows_of(text, skip_header):
    reader = csv.reader(io.StringIO(text))
    rows = list(reader)
    return rows[1:] if skip_header else rows


def write(name, feature_names, label_name, rows, label_of):
    path = os.path.join(OUT, name + ".csv")
    lines = [",".join(list(feature_names) + [label_name])]
    for row in rows:
        values, target = row[:-1], row[-1]
        assert len(values) == len(feature_names), (name, len(values))
        lines.append(",".join(v.strip() for v in values) + "," + label_of(target.strip()))
    data = ("\n".join(lines) + "\n").encode("utf-8")
    with open(path, "wb") as f:
        f.write(data)
    print(name, len(rows), "rows", hashlib.sha256(data).hexdigest())


def read(name):
    with open(os.path.join(DATA, name), encoding="utf-8") as f:
        return f.read()


bc = datasets.load_breast_cancer()
assert list(bc.target_names) == ["malignant", "benign"]
write("wdbc", bc.feature_names, "diagnosis", rows_of(read("breast_cancer.csv"), True),
      lambda t: {"0": "malignant", "1": "benign"}[t])

iris = datasets.load_iris()
write("iris", iris.feature_names, "species", rows_of(read("iris.csv"), True),
      lambda t: list(iris.target_names)[int(t)])

wine = datasets.load_wine()
write("wine", wine.feature_names, "cultivar", rows_of(read("wine_data.csv"), True),
      lambda t: list(wine.target_names)[int(t)])

digits = datasets.load_digits()
with gzip.open(os.path.join(DATA, "digits.csv.gz"), "rt", encoding="utf-8") as f:
    digit_rows = rows_of(f.read(), False)
write("optdigits", digits.feature_names, "digit", digit_rows, lambda t: str(int(float(t))))
