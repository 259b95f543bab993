"""Second-order terms of the noise ball under reshuffling, on the WDBC problem of NoiseBallOnWdbcTest.

Usage: /usr/bin/python3 study.py [rate ...]        (Debian python3-numpy 1.24; default rates 0.1 0.4)

wdbc456.csv: the 456-row training split of the bundled WDBC data exactly as NoiseBallOnWdbcTest builds it
(stratified 80 % split, seed 2026, z-scored on the split); 30 standardised features, last column the class.
Binary logistic, l2 = 0.01 on the weights (not the intercept), B = 32 (14 batches of 32 and one of 8 per epoch),
started at theta*, constant rate, `shuffle`. Every quantity is averaged over epochs 100..299 of 300, as simulate.py
does, so the numbers compare with its stationary tail.

Printed per rate (all E||e||^2, e = theta - theta*, over every update / at epoch ends):
  first order    the exact reshuffling recursion of THEORY.md 3.5 (shared Hessian H)
  m1             ||mean||^2 of the per-example-linearised model, first order in D_i = H_i - H: the mean driven by
                 E[D_{B_t} e_t] = W g_t / (N - 1), W_jk = (1/N) sum_i (D_i)_jk (g_i)_k in H's eigenbasis
  m3             ||mean||^2 from the third derivative: driven by (1/2) T[S_t], T[S]_j = (1/N) sum_i w'''_i x_i^T S x_i x_ij
  m1+m3          ||m1 + m3||^2 (they are added as vectors)
  V              trace of the multiplicative-noise covariance with independent batches (an approximation, see the note):
                 V <- A V A + a^2 (N - B_t)/((N - 1) B_t) (1/N) sum_i D_i S_t D_i
See docs/theory-second-order.md for the derivation and the comparison with simulate.py.
"""
import os
import sys
import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
D = np.loadtxt(os.path.join(HERE, 'wdbc456.csv'), delimiter=',')
X = np.hstack([D[:, :-1], np.ones((len(D), 1))]); y = D[:, -1]
N, P = X.shape; lam = 0.01
pen = np.ones(P); pen[-1] = 0
th = np.zeros(P)
for _ in range(50):
    p = 1/(1+np.exp(-X@th)); w = p*(1-p)
    th -= np.linalg.solve((X.T*w)@X/N + lam*np.diag(pen), X.T@(p-y)/N + lam*pen*th)
p = 1/(1+np.exp(-X@th)); w = p*(1-p); w3 = w*(1-2*p)          # d2 and d3 of the log-loss in z
H = (X.T*w)@X/N + lam*np.diag(pen)
U = X*(p-y)[:, None] + lam*pen*th; U -= U.mean(0)            # per-example gradients at theta*, sum 0
C = U.T@U/N
lamk, Q = np.linalg.eigh(H)
Xt = X@Q; Ut = U@Q; Ct = Q.T@C@Q
Hdata = (Xt.T*w)@Xt/N                                         # mean of w_i x_i x_i^T (D_i = w_i x_i x_i^T - Hdata)
W = np.einsum('ij,ik,i->jk', Xt, Xt*Ut, w)/N                  # (1/N) sum_i (D_i)_jk (g_i)_k; the -Hdata part sums to 0
Z = ((Xt*Ut).T*w)@(Xt*Ut)/N - Hdata*Ct                        # (1/N) sum_i (g_i)_j (g_i)_k (D_i)_jk
B = 32; sizes = [B]*(N//B) + ([N % B] if N % B else [])


def predict(a, epochs=300, burn=100, sampling='shuffle', trace=False):
    """Tail means (epochs burn..epochs-1; every update / epoch ends) of the first-order E||e||^2 and the derived terms,
    for a constant rate a from theta*. With trace=True also the per-update values, one row per update:
    first, |m1|^2, |m3|^2, |m1 + m3|^2, tr V, 2 E<e0, e1>."""
    A = 1 - a*lamk
    shuffled = sampling == 'shuffle'
    batches = sizes if shuffled else [B]*len(sizes)
    S0 = np.zeros((P, P)); m1 = np.zeros(P); m3 = np.zeros(P); V = np.zeros((P, P))
    X0 = np.zeros(P)                       # diagonal of E[e0 e1^T] carried into the epoch
    k0 = 2/((N-1)*(N-2))                   # third moment of three different positions of one permutation
    keys = ('first', 'm1', 'm3', 'm', 'V', 'cross')
    tot = {k: np.zeros(2) for k in keys}; n = np.zeros(2); rows = []
    for ep in range(epochs):
        Dm = np.zeros((P, P)); G = np.zeros(P); Pp = np.ones(P)
        Y = np.zeros((P, P)); K = np.zeros((P, P)); Yr = np.zeros((P, P)); Ys = np.zeros((P, P))
        Xin = np.zeros(P)
        for b in batches:
            if shuffled:
                S = np.outer(Pp, Pp)*S0 + Dm - np.outer(G, G)*Ct/(N-1)   # E[e e^T] before this update, first order
                kb = -(N-2*b)/((N-1)*(N-2)*b) - k0      # two of three positions in one batch, less k0
                Y, Yr, Ys, K = (A[:, None]*Y + a*G[None, :], (A*A)[:, None]*Yr - a*A[:, None]*K,
                                (A*A)[:, None]*Ys - kb*a*a*G[None, :], np.outer(A, A)*K + kb*a*a)
                fpc = (N-b)/((N-1)*b)
            else:
                S = S0
                fpc = 1.0/b
            T = Xt.T @ (w3*np.einsum('ij,jk,ik->i', Xt, S, Xt)) / N
            q = w*w*np.einsum('ij,jk,ik->i', Xt, S, Xt)
            MS = (Xt.T*q)@Xt/N - Hdata@S@Hdata                      # (1/N) sum_i D_i S D_i
            if shuffled:
                m1 = A*m1 - a*(W@G)/(N-1)
            m3 = A*m3 - a*0.5*T
            V = np.outer(A, A)*V + a*a*fpc*MS
            if shuffled:
                Dm = np.outer(A, A)*Dm + a*a*Ct*N/(b*(N-1))
                G = A*G + a; Pp = A*Pp
                S = np.outer(Pp, Pp)*S0 + Dm - np.outer(G, G)*Ct/(N-1)
                Xin = ((Z*(-k0*G[:, None]*Y + Yr + Ys)).sum(1))  # in-epoch part of diag E[e0 e1^T]; gc = -G
            else:
                S = np.outer(A, A)*S0 + a*a*Ct/b; S0 = S
            vals = dict(first=np.trace(S), m1=m1@m1, m3=m3@m3, m=(m1+m3)@(m1+m3), V=np.trace(V),
                        cross=2*(Pp*Pp*X0 + Xin).sum())
            if trace:
                rows.append([vals[k] for k in keys])
            if ep >= burn:
                for k in keys:
                    tot[k][0] += vals[k]
                n[0] += 1
        if shuffled:
            S0 = S
            X0 = Pp*Pp*X0 + Xin
        if ep >= burn:
            for k in keys:
                tot[k][1] += vals[k]
            n[1] += 1
    out = {k: tot[k]/n for k in keys}
    if trace:
        return out, Q@m1, Q@m3, np.array(rows)
    return out, Q@m1, Q@m3


if __name__ == '__main__':
    args = sys.argv[1:]
    sampling = 'replacement' if 'replacement' in args else 'shuffle'
    rates = [float(r) for r in args if r != 'replacement' and r != 'shuffle'] or [0.1, 0.4]
    print('lambda_max(H) = %.5f' % lamk.max())
    for a in rates:
        r, m1, m3 = predict(a, sampling=sampling)
        print('rate %g %s (a*lambda_max = %.3f); over every update / at epoch ends' % (a, sampling, a*lamk.max()))
        for k in ('first', 'm1', 'm3', 'm', 'V', 'cross'):
            print('  %-6s %.5g / %.5g' % (k, r[k][0], r[k][1]))
        f = r['first']
        print('  first + m       %.5g / %.5g' % tuple(f + r['m']))
        print('  first + m + V   %.5g / %.5g' % tuple(f + r['m'] + r['V']))
        if sampling == 'shuffle':
            print('  derived: first + m + cross   %.5g / %.5g' % tuple(f + r['m'] + r['cross']))
        else:
            print('  derived: first + m3 + V      %.5g / %.5g' % tuple(f + r['m3'] + r['V']))
