#!/usr/bin/python3
"""Reference per-class recall and balanced accuracy for ClassBalanceReferenceTest, computed by scikit-learn.

Run from this directory: OMP_NUM_THREADS=1 /usr/bin/python3 make_class_balance_fixture.py
Needs Debian's python3-sklearn 1.2.1 (numpy 1.24.2).

The rows are the bundled satellite table (datasets/src/main/resources/settle/datasets/bundled/satellite.csv, the
Statlog (Landsat Satellite) data, 6 435 rows, 36 features, 6 classes). Classes are numbered in settle's class order,
the sorted label strings. A stratified test split of a quarter of the rows (train_test_split, random_state 7) is
scored by a multinomial logistic regression fitted on the other three quarters, on the first 4 features only (one
pixel's 4 bands), so that the classes are told apart unevenly.

class-balance-satellite.csv: one line per test row: its class index, then the 6 class probabilities
(predict_proba, repr, full precision), separated by ','.

class-balance-satellite-expected.csv: the reference values, one 'name,value' line each:
  recall_<c> for every class c, recall_score(y, y_pred, labels=range(6), average=None);
  balanced_accuracy, balanced_accuracy_score(y, y_pred);
  then the same on the test rows without class 2 (grey soil): recall_without_2_<c> for the classes present and
  balanced_accuracy_without_2, which leaves the class without rows out (scikit-learn warns and drops it).
y_pred is the most probable class, numpy's argmax (a tie goes to the lower index).
"""
import csv

import numpy as np
import sklearn
from sklearn.linear_model import LogisticRegression
from sklearn.metrics import balanced_accuracy_score, recall_score
from sklearn.model_selection import train_test_split
from sklearn.preprocessing import StandardScaler

assert sklearn.__version__ == "1.2.1"

BUNDLED = "../../../../../../../datasets/src/main/resources/settle/datasets/bundled/satellite.csv"
with open(BUNDLED, newline="") as f:
    rows = list(csv.reader(f))[1:]
X = np.array([[float(v) for v in row[:-1]] for row in rows])[:, :4]
names = sorted(set(row[-1] for row in rows))
y = np.array([names.index(row[-1]) for row in rows])

X_train, X_test, y_train, y_test = train_test_split(X, y, test_size=0.25, random_state=7, stratify=y)
scaler = StandardScaler().fit(X_train)
model = LogisticRegression(C=1.0, max_iter=1000).fit(scaler.transform(X_train), y_train)
P = model.predict_proba(scaler.transform(X_test))
y_pred = np.argmax(P, axis=1)

with open("class-balance-satellite.csv", "w") as f:
    for label, p in zip(y_test, P):
        f.write(",".join([str(int(label))] + [repr(float(v)) for v in p]) + "\n")

K = len(names)
out = []
for c, r in enumerate(recall_score(y_test, y_pred, labels=list(range(K)), average=None)):
    out.append(("recall_%d" % c, float(r)))
out.append(("balanced_accuracy", float(balanced_accuracy_score(y_test, y_pred))))
keep = y_test != 2
present = [c for c in range(K) if c != 2]
for c, r in zip(present, recall_score(y_test[keep], y_pred[keep], labels=present, average=None)):
    out.append(("recall_without_2_%d" % c, float(r)))
out.append(("balanced_accuracy_without_2", float(balanced_accuracy_score(y_test[keep], y_pred[keep]))))
with open("class-balance-satellite-expected.csv", "w") as f:
    for name, value in out:
        f.write("%s,%r\n" % (name, value))
