"""Direct-form values of the exact recursion of THEORY.md section 3.5, for ReshufflingRecursionTest.

Run with Debian's system python:  OMP_NUM_THREADS=1 /usr/bin/python3 make_reshuffling_values.py > reshuffling_values.txt
Reference library: numpy 1.24.2 (python3-numpy as shipped with Debian 12). The version used is printed first.

The recursion is written here in its original form, in the original coordinates and for the full (position,
velocity) state, with none of the eigenbasis or Welford rearrangements of the Java code:
  z = (e, v), M_t = [[I - a_t H, -a_t beta I], [H, beta I]], b_t = [-a_t I; I] (without momentum z = e, M = I - aH, b = -aI)
  within an epoch:  D <- M D M^T + b C b^T N/(B_t (N-1)),  G <- M G + b,  P <- M P
  E[z z^T] = P (m0 m0^T + S0) P^T + D - G C G^T/(N-1); at the epoch end S0 <- P S0 P^T + D - G C G^T/(N-1), m0 <- P m0
with replacement (every batch of B, as settle draws them): S <- M S M^T + b C b^T / B, m <- M m.
The quadratic: H = (1/9)[[25,-10,2],[-10,22,-8],[2,-8,16]] (eigenvalues 1, 2, 4); N = 50 examples whose gradients at
theta* are u_i = (sin(i+1), 0.5 cos(2i+1), 2 sin(3i+2)) - their mean, i = 0..N-1 (so sum u_i = 0), C = (1/N) sum u u^T;
B = 8, so an epoch is 6 batches of 8 and one of 2; rate a_t = A0/(1 + 0.01 t), t = 1, 2, ...; e_0 = (0.7, -0.4, 0.3),
v_0 = 0; 10 epochs. Printed: E||e_t||^2 after every update t = 1..70, for each configuration.
"""
import numpy as np

print("numpy", np.__version__)
H = np.array([[25, -10, 2], [-10, 22, -8], [2, -8, 16]], dtype=float) / 9.0
d, N, B, EPOCHS = 3, 50, 8, 10
i = np.arange(N)
U = np.stack([np.sin(i + 1.0), 0.5 * np.cos(2.0 * i + 1.0), 2.0 * np.sin(3.0 * i + 2.0)], axis=1)
U = U - U.mean(axis=0)
C = U.T @ U / N
sizes = [B] * (N // B) + ([N % B] if N % B else [])
e0 = np.array([0.7, -0.4, 0.3])


def run(sampling, beta, a0):
    k = d if beta == 0 else 2 * d
    I = np.eye(d)
    m = np.zeros(k)
    m[:d] = e0
    S = np.zeros((k, k))
    out = []
    t = 0
    for _ in range(EPOCHS):
        D = np.zeros((k, k))
        G = np.zeros((k, d))
        P = np.eye(k)
        for size in (sizes if sampling == "shuffle" else [B] * len(sizes)):
            t += 1
            a = a0 / (1 + 0.01 * t)
            if beta == 0:
                M = I - a * H
                b = -a * I
            else:
                M = np.block([[I - a * H, -a * beta * I], [H, beta * I]])
                b = np.vstack([-a * I, I])
            noise = b @ C @ b.T
            if sampling == "shuffle":
                D = M @ D @ M.T + noise * N / (size * (N - 1))
                G = M @ G + b
                P = M @ P
                Z = P @ (np.outer(m, m) + S) @ P.T + D - G @ C @ G.T / (N - 1)
            else:
                S = M @ S @ M.T + noise / size
                m = M @ m
                Z = np.outer(m, m) + S
            out.append(np.trace(Z[:d, :d]))
        if sampling == "shuffle":
            S = P @ S @ P.T + D - G @ C @ G.T / (N - 1)
            m = P @ m
    return out


for sampling, beta, a0 in (("shuffle", 0.0, 0.15), ("replacement", 0.0, 0.15), ("shuffle", 0.9, 0.02),
                           ("replacement", 0.9, 0.02)):
    values = run(sampling, beta, a0)
    print(sampling, beta, a0, " ".join("%.17g" % v for v in values))
