#!/usr/bin/python3
"""LIBSVM fixture for LibsvmReaderTest, written by Debian python3-sklearn 1.2.1's dump_svmlight_file.

Run: OMP_NUM_THREADS=1 /usr/bin/python3 make_fixture.py
Writes sklearn_dump.txt (1-based indices, a header comment, labels -1/1/2) and the same matrix densely in
sklearn_dense.csv (label first, values by repr). Values are rounded to 6 decimals so that the %.16g text that
dump_svmlight_file writes parses back to exactly the same doubles. The last column is all zeros in rows 0..38
and non-zero only in row 39, so the width comes from one row; column 3 is zero everywhere except row 0.
"""
import numpy as np
import scipy.sparse as sp
import sklearn
from sklearn.datasets import dump_svmlight_file

assert sklearn.__version__ == "1.2.1"

rng = np.random.RandomState(20260101)
n, d = 40, 12
X = np.round(rng.normal(scale=3.0, size=(n, d)), 6)
X[rng.uniform(size=(n, d)) < 0.6] = 0.0
X[:, 3] = 0.0
X[0, 3] = 1e-300
X[:, d - 1] = 0.0
X[n - 1, d - 1] = -123456.789
y = np.array([-1, 1, 2, 1] * 10)
dump_svmlight_file(sp.csr_matrix(X), y, "sklearn_dump.txt", zero_based=False,
                   comment="written by scikit-learn 1.2.1 dump_svmlight_file")
with open("sklearn_dense.csv", "w") as f:
    for i in range(n):
        f.write(",".join([str(int(y[i]))] + [repr(float(v)) for v in X[i]]) + "\n")
