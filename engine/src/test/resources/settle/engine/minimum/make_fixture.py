#!/usr/bin/python3
"""Reference minimisers of settle's objective made with scikit-learn 1.2.1 (Debian python3-sklearn),
numpy 1.24.2. Run with OMP_NUM_THREADS=1 /usr/bin/python3 make_fixture.py from this directory.

settle's objective: F(theta) = (1/N) sum_i loss_i + (l2/2) ||weights||^2, biases unpenalised.
scikit-learn 1.2.1 LogisticRegression minimises C * sum_i loss_i + 1/2 ||w||^2 (intercept unpenalised;
internally it divides the sample weights by N and uses l2_reg_strength = 1/(C N)), the same minimiser when
C = 1/(l2 N). penalty=None gives l2 = 0. solver='newton-cg', tol=1e-12 (its stop: max |gradient| <= tol
on the 1/N-scaled objective).

Softmax: scikit-learn's intercepts (and, with l2 = 0, its class weights) are not centred; settle works on
the gauge-free subspace, so they are centred over the classes here before they are written.

Output per case NAME: NAME.csv (the data: header x1..xd,y; y the class index) unless the data are bundled,
and NAME.reference: lines "l2 <value>", "objective <F(theta*)>", "gradient <max |grad F| at sklearn's theta,
numpy>", "theta <v1> <v2> ..." in settle's parameter order (binary: d weights then bias; multinomial:
class 0's d weights, class 1's, ..., then the K biases).
"""
import numpy as np
import sklearn
from sklearn.linear_model import LogisticRegression
from sklearn.preprocessing import StandardScaler
from sklearn import datasets

assert sklearn.__version__ == "1.2.1", sklearn.__version__


def objective_and_gradient(X, y, K, l2, W, b):
    """F and its gradient in numpy, W: K' x d, b: K' (K' = 1 for binary)."""
    N = X.shape[0]
    if K == 2:
        z = X @ W[0] + b[0]
        # loss = log(1 + e^z) - y z
        loss = np.logaddexp(0.0, z) - y * z
        p = 1.0 / (1.0 + np.exp(-z))
        r = p - y
        gw = X.T @ r / N + l2 * W[0]
        gb = r.sum() / N
        F = loss.mean() + 0.5 * l2 * np.sum(W ** 2)
        return F, max(np.max(np.abs(gw)), abs(gb))
    Z = X @ W.T + b
    lse = np.logaddexp.reduce(Z, axis=1)
    loss = lse - Z[np.arange(N), y]
    P = np.exp(Z - lse[:, None])
    Y = np.zeros_like(P)
    Y[np.arange(N), y] = 1.0
    R = P - Y
    gW = R.T @ X / N + l2 * W
    gb = R.sum(axis=0) / N
    F = loss.mean() + 0.5 * l2 * np.sum(W ** 2)
    return F, max(np.max(np.abs(gW)), np.max(np.abs(gb)))


def fit(name, X, y, l2, write_data):
    N, d = X.shape
    K = int(y.max()) + 1
    kwargs = dict(solver="newton-cg", tol=1e-12, max_iter=10000, fit_intercept=True)
    if l2 > 0:
        kwargs["C"] = 1.0 / (l2 * N)
    else:
        kwargs["penalty"] = None
    if K > 2:
        kwargs["multi_class"] = "multinomial"
    model = LogisticRegression(**kwargs).fit(X, y)
    W = model.coef_.copy()
    b = model.intercept_.copy()
    if K > 2:
        b -= b.mean()
        if l2 == 0:
            W -= W.mean(axis=0)
        theta = np.concatenate([W.ravel(), b])
    else:
        theta = np.concatenate([W[0], b])
    F, g = objective_and_gradient(X, y, K, l2, W, b)
    if write_data:
        with open(name + ".csv", "w") as f:
            f.write(",".join(["x%d" % (j + 1) for j in range(d)] + ["y"]) + "\n")
            for i in range(N):
                f.write(",".join(repr(float(v)) for v in X[i]) + ",%d\n" % y[i])
    with open(name + ".reference", "w") as f:
        f.write("# scikit-learn %s LogisticRegression(%s), n_iter %s\n"
                % (sklearn.__version__, kwargs, model.n_iter_))
        f.write("l2 %r\n" % l2)
        f.write("objective %r\n" % float(F))
        f.write("gradient %r\n" % float(g))
        f.write("theta " + " ".join(repr(float(v)) for v in theta) + "\n")
    print(name, "F", F, "max|grad|", g, "n_iter", model.n_iter_)


rng = np.random.default_rng(20260501)

# Binary: two overlapping Gaussian classes in 5 dimensions, correlated features, unequal sizes.
d = 5
A = rng.normal(size=(d, d)) * 0.5 + np.eye(d)
n0, n1 = 110, 90
X0 = rng.normal(size=(n0, d)) @ A
X1 = rng.normal(size=(n1, d)) @ A + np.array([1.0, -0.5, 0.8, 0.0, 0.3])
X = np.vstack([X0, X1]) + np.array([0.5, 2.0, -1.0, 0.0, 3.0])
y = np.concatenate([np.zeros(n0, int), np.ones(n1, int)])
perm = rng.permutation(n0 + n1)
X, y = X[perm], y[perm]
fit("binary", X, y, 0.01, True)
fit("binary-unpenalised", X, y, 0.0, False)

# Multinomial: three overlapping Gaussian classes in 4 dimensions.
d = 4
means = np.array([[0.0, 0.0, 0.0, 0.0], [1.2, 0.4, -0.6, 0.2], [-0.3, 1.1, 0.5, -0.8]])
sizes = [80, 70, 90]
Xs, ys = [], []
for k in range(3):
    Xs.append(rng.normal(size=(sizes[k], d)) * 1.1 + means[k])
    ys.append(np.full(sizes[k], k))
X = np.vstack(Xs) + np.array([1.0, -2.0, 0.5, 0.0])
y = np.concatenate(ys)
perm = rng.permutation(len(y))
X, y = X[perm], y[perm]
fit("multinomial", X, y, 0.02, True)
fit("multinomial-unpenalised", X, y, 0.0, False)

# Bundled data (WDBC and wine: Debian's copies shipped with scikit-learn 1.2.1), standardised on all rows with
# StandardScaler (divisor N, constant columns scale 1), as `settle minimum --standardize` does.
# Breast cancer: scikit-learn codes malignant as 0, benign as 1; settle's classes are the sorted names
# (benign 0, malignant 1), so y = 1 - target.
bc = datasets.load_breast_cancer()
fit("wdbc", StandardScaler().fit_transform(bc.data), 1 - bc.target, 0.01, False)
# Landsat satellite: R mlbench 2.1-3's data(Satellite) (Debian r-cran-mlbench, R 4.2.2), the rows settle bundles;
# classes in sorted order of their names, as settle orders them.
import csv, io, subprocess
sat = list(csv.reader(io.StringIO(subprocess.run(["Rscript", "-e", 'library(mlbench); stopifnot(packageVersion('
    '"mlbench") == "2.1.3"); data(Satellite); write.csv(Satellite, stdout(), row.names = FALSE)'], check=True,
    capture_output=True, text=True).stdout)))[1:]
covers = sorted({r[-1] for r in sat})
fit("satellite", StandardScaler().fit_transform(np.array([[float(v) for v in r[:-1]] for r in sat])),
    np.array([covers.index(r[-1]) for r in sat]), 0.01, False)
# Wine: targets 0, 1, 2 are the cultivars 1, 2, 3 (settle: 'cultivar 1' .. 'cultivar 3'), in sorted order.
wi = datasets.load_wine()
fit("wine", StandardScaler().fit_transform(wi.data), wi.target, 0.01, False)
