#!/usr/bin/python3
"""An outside reference for settle's table path on a real table with categorical columns and gaps.

Data: HouseVotes84 from the R package mlbench 2.1-3 (Debian r-cran-mlbench; documentation: ?HouseVotes84,
"United States Congressional Voting Records 1984", UCI Machine Learning Repository, J. C. Schlimmer): 435
members of the House, Class democrat/republican, 16 votes V1..V16 as y/n, with 392 missing votes in 203 rows.
Written by R 4.2.2 as HouseVotes84.csv: write.csv(HouseVotes84, na = "", row.names = FALSE).

Encoding, made here with scikit-learn 1.2.1 (Debian python3-sklearn) and numpy 1.24.2, independently of settle:
training rows are those with index i % 5 != 4 (348), test rows i % 5 == 4 (87). Per vote column, the levels are
the sorted values seen in the training rows, plus a level '(missing)' last when the training rows have gaps in it
(data.missing: impute); SimpleImputer(strategy='constant', fill_value='(missing)') then OneHotEncoder(categories=
those, handle_unknown='ignore'), so a value the training rows lack encodes as zeros. StandardScaler (divisor N)
fitted on the training rows; LogisticRegression(solver='newton-cg', tol=1e-12, C = 1/(l2 N)) on them, l2 = 0.01
(settle's F = (1/N) sum loss + (l2/2)||w||^2, intercept unpenalised; see ../make_fixture.py).

Output: HouseVotes84.csv; encoded.csv (the one-hot matrix of every row before standardisation, header = input
names as settle names them, then 'split' train/test); housevotes84.reference (l2, objective, gradient, theta in
settle's order: the weights then the bias, class 1 = republican).
Run from this directory: OMP_NUM_THREADS=1 /usr/bin/python3 make_fixture.py
"""
import csv
import subprocess

import numpy as np
import sklearn
from sklearn.impute import SimpleImputer
from sklearn.linear_model import LogisticRegression
from sklearn.preprocessing import OneHotEncoder, StandardScaler

assert sklearn.__version__ == "1.2.1", sklearn.__version__
L2 = 0.01

subprocess.run(["Rscript", "-e", 'library(mlbench); stopifnot(packageVersion("mlbench") == "2.1.3"); '
                'data(HouseVotes84); write.csv(HouseVotes84, "HouseVotes84.csv", na = "", row.names = FALSE)'],
               check=True)

with open("HouseVotes84.csv", newline="") as f:
    rows = list(csv.reader(f))
header, rows = rows[0], rows[1:]
label_at = header.index("Class")
columns = [c for c in range(len(header)) if c != label_at]
train = [i for i in range(len(rows)) if i % 5 != 4]
test = [i for i in range(len(rows)) if i % 5 == 4]

blocks, names = [], []
for c in columns:
    values = np.array([[r[c] if r[c] != "" else np.nan] for r in rows], dtype=object)
    seen = sorted({rows[i][c] for i in train if rows[i][c] != ""})
    gaps = any(rows[i][c] == "" for i in train)
    categories = seen + (["(missing)"] if gaps else [])
    imputer = SimpleImputer(strategy="constant", fill_value="(missing)", missing_values=np.nan)
    filled = imputer.fit(values[train]).transform(values)
    encoder = OneHotEncoder(categories=[categories], handle_unknown="ignore", sparse_output=False)
    blocks.append(encoder.fit(filled[train]).transform(filled))
    names += [header[c] + "=" + v for v in categories]
X = np.hstack(blocks)
y = np.array([1 if r[label_at] == "republican" else 0 for r in rows])

with open("encoded.csv", "w") as f:
    f.write(",".join(names + ["split"]) + "\n")
    for i in range(len(rows)):
        f.write(",".join("%d" % v for v in X[i]) + ("," + ("test" if i % 5 == 4 else "train")) + "\n")

Xt = StandardScaler().fit(X[train]).transform(X[train])
yt = y[train]
N, d = Xt.shape
model = LogisticRegression(solver="newton-cg", tol=1e-12, max_iter=10000, C=1.0 / (L2 * N)).fit(Xt, yt)
w, b = model.coef_[0], model.intercept_[0]
z = Xt @ w + b
F = np.mean(np.logaddexp(0.0, z) - yt * z) + 0.5 * L2 * np.sum(w ** 2)
r = 1.0 / (1.0 + np.exp(-z)) - yt
g = max(np.max(np.abs(Xt.T @ r / N + L2 * w)), abs(r.mean()))
with open("housevotes84.reference", "w") as f:
    f.write("# scikit-learn %s LogisticRegression(newton-cg, tol=1e-12, C=%r) on %d training rows x %d inputs\n"
            % (sklearn.__version__, 1.0 / (L2 * N), N, d))
    f.write("l2 %r\nobjective %r\ngradient %r\n" % (L2, float(F), float(g)))
    f.write("theta " + " ".join(repr(float(v)) for v in np.append(w, b)) + "\n")
