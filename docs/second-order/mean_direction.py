"""The mean offset at epoch ends, simulated (per-example-linearised SGD, model B; full logistic SGD, model C) against
the first-order prediction of study.py (m1, and m1 + m3), at rate 0.4 under `shuffle`: squared norms, cosines and
the projection of the simulated mean on the predicted one. 1 000 replicates, 200 epochs, the first 60 dropped."""
import os, sys
import numpy as np
HERE = os.path.dirname(os.path.abspath(__file__))
sys.argv = ['simulate.py']
exec(open(os.path.join(HERE, 'simulate.py')).read().split('def run(')[0])
sim = {k: v for k, v in globals().items()}
exec(open(os.path.join(HERE, 'study.py')).read().split("if __name__")[0], sim)


def simulated_mean(model, rate, R=1000, epochs=200, burn=60, seed=7):
    rng = np.random.default_rng(seed); E = np.zeros((R, P)); ms = np.zeros(P); n = 0
    for ep in range(epochs):
        perm = np.argsort(rng.random((R, N)), axis=1); pos = 0
        for b in sizes:
            idx = perm[:, pos:pos+b]; pos += b; Xb = X[idx]
            if model == 'B':
                xe = np.einsum('rbp,rp->rb', Xb, E)
                g = np.einsum('rb,rbp->rp', w[idx]*xe, Xb)/b + lam*pen*E + U[idx].mean(1)
            else:
                T = th + E; z = np.einsum('rbp,rp->rb', Xb, T); pr = 1/(1+np.exp(-z))
                g = np.einsum('rb,rbp->rp', pr - y[idx], Xb)/b + lam*pen*T
            E = E - rate*g
        if ep >= burn:
            ms += E.mean(0); n += 1
    return ms/n


_, m1, m3 = sim['predict'](0.4, epochs=200, burn=60)
mB, mC = simulated_mean('B', 0.4), simulated_mean('C', 0.4)
cos = lambda a, b: a@b/np.sqrt((a@a)*(b@b))
print('|m1|^2 %.4g  |m1+m3|^2 %.4g  simulated B %.4g  C %.4g' % (m1@m1, (m1+m3)@(m1+m3), mB@mB, mC@mC))
print('cos(m1, B) %.4f  cos(m1+m3, C) %.4f  cos(m3, C-B) %.4f' % (cos(m1, mB), cos(m1+m3, mC), cos(m3, mC-mB)))
print('projection of B on m1 %.4f, of C on m1+m3 %.4f' % (mB@m1/(m1@m1), mC@(m1+m3)/((m1+m3)@(m1+m3))))
