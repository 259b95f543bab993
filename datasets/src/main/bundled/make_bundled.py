#!/usr/bin/python3
"""Makes settle's bundled dataset resources, each with its provenance.

Run once from the repository root with the system python and R:
    OMP_NUM_THREADS=1 /usr/bin/python3 datasets/src/main/bundled/make_bundled.py
It needs Debian's python3-sklearn 1.2.1 (for the WDBC and wine copies), r-base 4.2.2 and r-cran-mlbench 2.1-3
(for Satellite and HouseVotes84). Every value is copied as the text written at the source (no float round trip),
and each file is written to datasets/src/main/resources/settle/datasets/bundled/<name>.csv (header row, label
column last, LF line ends). It prints the SHA-256 of each file for BundledData.java.

  wdbc          sklearn/datasets/data/breast_cancer.csv (UCI Breast Cancer Wisconsin (Diagnostic)); it codes
                malignant as 0 and benign as 1 (its header: 569,30,malignant,benign); written as 'malignant' /
                'benign', so settle's lexical class order is benign < malignant and malignant is class 1, the
                positive class. Feature names from scikit-learn's load_breast_cancer.
  wine          sklearn/datasets/data/wine_data.csv (UCI Wine); the targets 0, 1, 2 are the UCI file's classes
                1, 2, 3, which its documentation (wine.names) describes only as "three different cultivars":
                written as 'cultivar 1', 'cultivar 2', 'cultivar 3'. Feature names from load_wine.
  satellite     mlbench's Satellite (UCI Statlog (Landsat Satellite), training and test files together, 6 435
                rows): the 36 values x.1 .. x.36 are four spectral bands of each pixel of a 3x3 neighbourhood,
                pixels left-to-right, top-to-bottom (?Satellite), named here pixelP.bandB (P = 1..9, the centre
                is pixel 5; B = 1..4: bands 1 and 2 visible green and red, 3 and 4 near infra-red); the label
                'cover' is the factor 'classes' with mlbench's level names.
  housevotes84  mlbench's HouseVotes84 (UCI Congressional Voting Records): the columns V1 .. V16 renamed to
                the 16 votes as ?HouseVotes84 lists them, y/n answers kept as text, the 392 unknown
                dispositions written as empty cells; the label 'party' (democrat / republican) moved last.
"""
import csv
import hashlib
import io
import os
import subprocess

import sklearn
from sklearn import datasets

assert sklearn.__version__ == "1.2.1", sklearn.__version__

DATA = os.path.join(os.path.dirname(datasets.__file__), "data")
OUT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "resources", "settle", "datasets", "bundled")

VOTES = ["handicapped-infants", "water-project-cost-sharing", "adoption-of-the-budget-resolution",
         "physician-fee-freeze", "el-salvador-aid", "religious-groups-in-schools", "anti-satellite-test-ban",
         "aid-to-nicaraguan-contras", "mx-missile", "immigration", "synfuels-corporation-cutback",
         "education-spending", "superfund-right-to-sue", "crime", "duty-free-exports",
         "export-administration-act-south-africa"]


def write(name, header, rows):
    lines = [",".join(header)] + [",".join(row) for row in rows]
    data = ("\n".join(lines) + "\n").encode("utf-8")
    with open(os.path.join(OUT, name + ".csv"), "wb") as f:
        f.write(data)
    print(name, len(rows), "rows", hashlib.sha256(data).hexdigest())


def sklearn_rows(file, label_of):
    with open(os.path.join(DATA, file), encoding="utf-8") as f:
        rows = list(csv.reader(f))[1:]
    return [[v.strip() for v in row[:-1]] + [label_of(row[-1].strip())] for row in rows]


def r_csv(expression):
    """Runs R, which writes a data frame as CSV (no quotes, NA as empty) to stdout; returns header and rows."""
    program = ('library(mlbench); stopifnot(packageVersion("mlbench") == "2.1.3"); ' + expression)
    text = subprocess.run(["Rscript", "-e", program], check=True, capture_output=True, text=True).stdout
    rows = list(csv.reader(io.StringIO(text)))
    return rows[0], rows[1:]


bc = datasets.load_breast_cancer()
assert list(bc.target_names) == ["malignant", "benign"]
write("wdbc", list(bc.feature_names) + ["diagnosis"],
      sklearn_rows("breast_cancer.csv", lambda t: {"0": "malignant", "1": "benign"}[t]))

wine = datasets.load_wine()
write("wine", list(wine.feature_names) + ["cultivar"],
      sklearn_rows("wine_data.csv", lambda t: "cultivar " + str(int(t) + 1)))

header, rows = r_csv('data(Satellite); write.csv(Satellite, stdout(), quote = FALSE, row.names = FALSE)')
assert header == ["x.%d" % k for k in range(1, 37)] + ["classes"], header
assert len(rows) == 6435
write("satellite", ["pixel%d.band%d" % (p, b) for p in range(1, 10) for b in range(1, 5)] + ["cover"], rows)

header, rows = r_csv('data(HouseVotes84); write.csv(HouseVotes84, stdout(), quote = FALSE, na = "", '
                     'row.names = FALSE)')
assert header == ["Class"] + ["V%d" % k for k in range(1, 17)], header
assert len(rows) == 435 and sum(v == "" for row in rows for v in row) == 392
write("housevotes84", VOTES + ["party"], [row[1:] + [row[0]] for row in rows])
