"""Recomputes the check values of THEORY.md section 7.2 used by NoiseBallTheoryTest.

Run with Debian's system python:  OMP_NUM_THREADS=1 /usr/bin/python3 make_check_values.py > check_values.txt
Reference libraries: numpy 1.24.2, scipy 1.10.1 (python3-numpy / python3-scipy as shipped with
python3-sklearn 1.2.1). The versions actually used are printed first.
"""
import numpy as np
import scipy
import scipy.linalg

print("numpy", np.__version__, "scipy", scipy.__version__)

# 1-D exact stationary variance, a = 0.1, h = 2, c = 1, B = 4, replacement sampling.
a, h, c, B = 0.1, 2.0, 1.0, 4
print("1d_fixed_point %.17g" % (a * a * (c / B) / (1 - (1 - a * h) ** 2)))
print("1d_ou_approximation %.17g" % (a * c / (2 * B * h)))

# Time-varying recursion, a_t = 0.2/(1 + 0.01 t), h = 1.5, c = 2, B = 4, e0 = 1, T = 400 updates.
for first in (0, 1):
    h, c, B = 1.5, 2.0, 4
    m, v = 1.0, 0.0
    for t in range(first, first + 400):
        at = 0.2 / (1 + 0.01 * t)
        m = (1 - at * h) * m
        v = (1 - at * h) ** 2 * v + at * at * c / B
    print("inverse_time_from_%d variance %.17g mean %.17g" % (first, v, m))

# 2-D: H = [[2, .5], [.5, 1]], C = [[1, .2], [.2, .5]], a = 0.05, B = 8.
H = np.array([[2.0, 0.5], [0.5, 1.0]])
C = np.array([[1.0, 0.2], [0.2, 0.5]])
a, B = 0.05, 8
A = np.eye(2) - a * H
S = scipy.linalg.solve_discrete_lyapunov(A, a * a * C / B)   # S = A S A^T + a^2 C / B
Sc = scipy.linalg.solve_continuous_lyapunov(H, a * C / B)    # H S + S H^T = a C / B
for name, M in (("2d_discrete", S), ("2d_continuous", Sc)):
    print(name, " ".join("%.17g" % v for v in M.ravel()))
print("2d_trace_ratio %.17g" % (np.trace(S) / np.trace(Sc)))
print("2d_discrete_excess_loss %.17g" % (0.5 * np.trace(H @ S)))

# Finite-population factor N = 100, B = 10.
print("fpc_100_10 %.17g" % ((100 - 10) / (100 - 1)))

# Monte-Carlo tolerance: overall false-failure rate 1e-6 over 40 two-sided checks (Bonferroni),
# i.e. 1.25e-8 in each tail of each check.
import scipy.stats
print("z_two_sided_1e-6_over_40 %.17g" % scipy.stats.norm.isf(1e-6 / 40 / 2))
