#!/usr/bin/python3
"""Reference values for BundledDataTest, computed with Debian's python3-sklearn 1.2.1 loaders (numpy 1.24.2).

Run: OMP_NUM_THREADS=1 /usr/bin/python3 make_fixture.py > loaders.csv
For each dataset as scikit-learn's own loader returns it (load_breast_cancer, load_iris, load_wine,
load_digits), one line: name, rows, features, the class counts in settle's class order (sorted string labels;
for wdbc that is benign, malignant: the reverse of scikit-learn's target codes), then per feature column the
sum and the sum of squares (repr, full precision), separated by ';'.
"""
import numpy as np
import sklearn
from sklearn import datasets

assert sklearn.__version__ == "1.2.1"

loaders = [("wdbc", datasets.load_breast_cancer), ("iris", datasets.load_iris),
           ("wine", datasets.load_wine), ("optdigits", datasets.load_digits)]
print("name,rows,features,class_counts,column_sums,column_sums_of_squares")
for name, load in loaders:
    b = load()
    X, y = b.data.astype(np.float64), b.target
    names = [str(n) for n in b.target_names]
    order = sorted(range(len(names)), key=lambda k: names[k]) if name != "optdigits" else list(range(10))
    counts = [int((y == k).sum()) for k in order]
    sums = [repr(float(v)) for v in X.sum(axis=0)]
    squares = [repr(float(v)) for v in (X * X).sum(axis=0)]
    print(",".join([name, str(X.shape[0]), str(X.shape[1]), ";".join(map(str, counts)), ";".join(sums),
                    ";".join(squares)]))
