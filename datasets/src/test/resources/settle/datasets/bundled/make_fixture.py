#!/usr/bin/python3
"""Reference values for BundledDataTest, computed outside settle from the datasets as their packages ship them.

Run: OMP_NUM_THREADS=1 /usr/bin/python3 make_fixture.py
Needs Debian's python3-sklearn 1.2.1 (numpy 1.24.2), r-base 4.2.2 and r-cran-mlbench 2.1-3.

loaders.csv: for each all-numeric dataset as its package's own loader returns it (scikit-learn's
load_breast_cancer and load_wine; R's data(Satellite) from mlbench, written by write.csv), one line: name, rows,
features, the class counts in settle's class order (sorted string labels; for wdbc that is benign, malignant: the
reverse of scikit-learn's target codes), then per feature column the sum and the sum of squares (repr, full
precision), separated by ';'.

housevotes84-counts.csv (not housevotes84.csv, the bundled file's class-path name): R's data(HouseVotes84) from mlbench, per vote column (in the package's order V1 .. V16) the
counts of 'n', 'y' and NA as R's table(useNA = "always") gives them, then the class counts.
"""
import csv
import io
import subprocess

import numpy as np
import sklearn
from sklearn import datasets

assert sklearn.__version__ == "1.2.1"


def r(program):
    return subprocess.run(["Rscript", "-e", 'library(mlbench); stopifnot(packageVersion("mlbench") == "2.1.3"); '
                           + program], check=True, capture_output=True, text=True).stdout


def line(name, X, counts):
    sums = [repr(float(v)) for v in X.sum(axis=0)]
    squares = [repr(float(v)) for v in (X * X).sum(axis=0)]
    return ",".join([name, str(X.shape[0]), str(X.shape[1]), ";".join(map(str, counts)), ";".join(sums),
                     ";".join(squares)])


lines = ["name,rows,features,class_counts,column_sums,column_sums_of_squares"]
for name, load in [("wdbc", datasets.load_breast_cancer), ("wine", datasets.load_wine)]:
    b = load()
    names = [str(n) for n in b.target_names]
    order = sorted(range(len(names)), key=lambda k: names[k])  # wine: the three target names sort in cultivar order 1-3
    lines.append(line(name, b.data.astype(np.float64), [int((b.target == k).sum()) for k in order]))

rows = list(csv.reader(io.StringIO(r('data(Satellite); write.csv(Satellite, stdout(), row.names = FALSE)'))))[1:]
X = np.array([[float(v) for v in row[:-1]] for row in rows])
labels = [row[-1] for row in rows]
lines.append(line("satellite", X, [labels.count(c) for c in sorted(set(labels))]))
with open("loaders.csv", "w") as f:
    f.write("\n".join(lines) + "\n")

with open("housevotes84-counts.csv", "w") as f:
    f.write(r('data(HouseVotes84); '
              'for (v in names(HouseVotes84)[-1]) { t <- table(HouseVotes84[[v]], useNA = "always"); '
              'cat(v, t[["n"]], t[["y"]], t[[3]], sep = ","); cat("\\n") }; '
              't <- table(HouseVotes84$Class); cat("Class", t[["democrat"]], t[["republican"]], sep = ","); '
              'cat("\\n")'))
