"""Simulated SGD on the WDBC problem of study.py (the same data, theta*, B = 32, constant rate, from theta*).

Usage: python3 simulate.py RATE shuffle|replacement [MOMENTUM [MODELS]]   (numpy; 2 000 replicates, 300 epochs,
the first 100 dropped). MODELS, letters of:
  A  SGD on the shared-Hessian quadratic (every example's Hessian replaced by H): what the recursion models exactly
  F  as A, plus (H_B - H) applied to the error frozen at the epoch's start
  B  per-example-linearised SGD: each example's own Hessian H_i = w_i x_i x_i^T + l2 and gradient g_i at theta*
  C  full logistic SGD (what settle runs)
Prints the mean of E||theta - theta*||^2 over every update and at epoch ends, and the squared norm of the mean error
at epoch ends (the mean offset).
"""
import os
import numpy as np, sys
D = np.loadtxt(os.path.join(os.path.dirname(os.path.abspath(__file__)), 'wdbc456.csv'), delimiter=',')
X = np.hstack([D[:, :-1], np.ones((len(D), 1))]); y = D[:, -1]
N, P = X.shape; lam = 0.01
pen = np.ones(P); pen[-1] = 0
def grad_all(th):
    p = 1/(1+np.exp(-X@th)); return X.T@(p-y)/N + lam*pen*th
th = np.zeros(P)
for _ in range(50):
    p = 1/(1+np.exp(-X@th)); w = p*(1-p)
    Hm = (X.T*w)@X/N + lam*np.diag(pen)
    th -= np.linalg.solve(Hm, grad_all(th))
p = 1/(1+np.exp(-X@th)); w = p*(1-p)
H = (X.T*w)@X/N + lam*np.diag(pen)
U = X*(p-y)[:, None] + lam*pen*th   # per-example gradients at theta*
U = U - U.mean(0)
print("grad norm", np.abs(grad_all(th)).max(), "lmax", np.linalg.eigvalsh(H).max())
B = 32
sizes = [B]*(N//B) + ([N % B] if N % B else [])
def run(model, rate, R=2000, epochs=300, burn=100, seed=1, sampling='shuffle', beta=0.0):
    rng = np.random.default_rng(seed)
    E = np.zeros((R, P)); V = np.zeros((R, P))
    all_s = 0.0; all_n = 0; end_s = 0.0; end_n = 0
    for ep in range(epochs):
        if sampling == 'shuffle':
            perm = np.argsort(rng.random((R, N)), axis=1)
        pos = 0
        E0 = E.copy()
        for b in (sizes if sampling == 'shuffle' else [B]*len(sizes)):
            idx = perm[:, pos:pos+b] if sampling == 'shuffle' else rng.integers(0, N, (R, b)); pos += b
            Xb = X[idx]  # R,b,P
            if model == 'A':
                g = E@H.T + U[idx].mean(1)
            elif model == 'F':
                xe = np.einsum('rbp,rp->rb', Xb, E0)
                g = E@H.T + np.einsum('rb,rbp->rp', w[idx]*xe, Xb)/b + lam*pen*E0 - E0@H.T + U[idx].mean(1)
            elif model == 'B':
                xe = np.einsum('rbp,rp->rb', Xb, E)
                g = np.einsum('rb,rbp->rp', w[idx]*xe, Xb)/b + lam*pen*E + U[idx].mean(1)
            else:
                T = th + E
                z = np.einsum('rbp,rp->rb', Xb, T)
                pr = 1/(1+np.exp(-z))
                g = np.einsum('rb,rbp->rp', pr - y[idx], Xb)/b + lam*pen*T
            V = beta*V + g
            E = E - rate*V
            if ep >= burn:
                d = (E**2).sum(1); all_s += d.mean(); all_n += 1
        if ep >= burn:
            end_s += (E**2).sum(1).mean(); end_n += 1
            msum = E.mean(0) if ep == burn else msum + E.mean(0)
    mbar = msum / end_n
    print("  bias^2 at epoch ends (mean over reps, averaged over epochs):", (mbar**2).sum(), flush=True)
    return all_s/all_n, end_s/end_n
if __name__ == '__main__':
    rate = float(sys.argv[1]); sampling = sys.argv[2]; beta = float(sys.argv[3]) if len(sys.argv) > 3 else 0.0
    for m in sys.argv[4] if len(sys.argv) > 4 else 'ABC':
        a, e = run(m, rate, sampling=sampling, beta=beta)
        print(m, rate, sampling, beta, "all %.5g ends %.5g" % (a, e), flush=True)
