# Perturbation decomposition of per-example-linearised reshuffled SGD (model B), rate given, from theta*:
# e = e0 + e1 + e2 + e3 + ..., e0_{t+1} = A e0_t - a g_B, e(k+1)_{t+1} = A e(k+1)_t - a D_B e(k)_t, D_B = H_B - H.
# Prints tail means (every update / epoch ends) of E|e0|^2, 2E<e0,e1>, E|e1|^2, 2E<e0,e2>, |E e1|^2, higher, and |e|^2,
# each with its standard error over the replicates (a replicate's tail mean is one independent number).
import os, sys
import numpy as np
rate = float(sys.argv[1]); R = int(sys.argv[2]) if len(sys.argv) > 2 else 1000
exec(open(os.path.join(os.path.dirname(os.path.abspath(__file__)), 'simulate.py')).read().split('def run(')[0])
rng = np.random.default_rng(11)
epochs, burn = 200, 60
E = [np.zeros((R, P)) for _ in range(4)]; Efull = np.zeros((R, P))
names = ['e0e0', '2e0e1', 'e1e1', '2e0e2', '2e1e2+e2e2+2e0e3..', 'full']
acc = np.zeros((2, R, len(names))); n = np.zeros(2); m1s = np.zeros(P); nm = 0
def stats():
    e0, e1, e2, e3 = E
    rest = Efull - e0 - e1 - e2
    v = [(e0*e0).sum(1), 2*(e0*e1).sum(1), (e1*e1).sum(1), 2*(e0*e2).sum(1), None, (Efull**2).sum(1)]
    v[4] = v[5] - v[0] - v[1] - v[2] - v[3]
    return np.array(v).T
for ep in range(epochs):
    perm = np.argsort(rng.random((R, N)), axis=1); pos = 0
    for b in sizes:
        idx = perm[:, pos:pos+b]; pos += b; Xb = X[idx]; wb = w[idx]
        def DB(V):   # (H_B - H) V per replicate
            xe = np.einsum('rbp,rp->rb', Xb, V)
            return np.einsum('rb,rbp->rp', wb*xe, Xb)/b + lam*pen*V - V@H.T
        new = [E[0]@(np.eye(P)-rate*H).T - rate*U[idx].mean(1)]
        for k in range(1, 4):
            new.append(E[k]@(np.eye(P)-rate*H).T - rate*DB(E[k-1]))
        Efull = Efull@(np.eye(P)-rate*H).T - rate*DB(Efull) - rate*U[idx].mean(1)
        E = new
        if ep >= burn:
            acc[0] += stats(); n[0] += 1
    if ep >= burn:
        acc[1] += stats(); n[1] += 1; m1s += E[1].mean(0); nm += 1
res = acc/n[:, None, None]
mean = res.mean(1); se = res.std(1, ddof=1)/np.sqrt(R)
print('rate', rate, 'R', R)
for i, nme in enumerate(names):
    print('  %-20s %.5g / %.5g   (SE %.2g / %.2g)' % (nme, mean[0, i], mean[1, i], se[0, i], se[1, i]))
m1 = m1s/nm; print('  |E e1|^2 at epoch ends %.5g' % (m1@m1))
