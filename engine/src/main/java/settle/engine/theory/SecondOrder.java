package settle.engine.theory;

import settle.datasets.Dataset;

/**
 * The terms of the noise ball of binary logistic regression beyond first order (docs/theory-second-order.md), for
 * SGD without momentum from θ*. First order treats every example as having H's curvature; here example i has its own
 * H_i = w_i x̂_i x̂_iᵀ + λ·(weights mask), w_i = p_i(1 − p_i), x̂_i = (x_i, 1), so D_i = H_i − H has Σ D_i = 0, and the
 * loss has a third derivative w'''_i = p_i(1 − p_i)(1 − 2p_i) along x̂_i. With e = e⁰ + e¹ + …, e⁰ the first-order
 * error and e¹ ← A e¹ − α D_B e⁰ its first correction in D, the terms added to E‖θ − θ*‖² are:
 * <ul>
 *   <li>{@code shuffle}: ‖m¹ + m³‖² + 2 E⟨e⁰, e¹⟩. m¹ = E e¹, driven by E[D_{B_t} e⁰_t] = W G_t/(N − 1) (the batch's
 *       curvature is correlated with the gradients drawn earlier in the epoch), W_jk = (1/N) Σ_i (D̃_i)_jk g̃_ik;
 *       m³, the mean shift of the third derivative, driven by (1/2) T[S_t], T[S]_j = (1/N) Σ_i w'''_i (x̃_iᵀ S x̃_i)
 *       x̃_ij, S_t the first-order second moment; 2 E⟨e⁰, e¹⟩, a joint third moment of (g_i, g_i, D_i) sampled
 *       without replacement within an epoch, through Z_jk = (1/N) Σ_i g̃_ij g̃_ik (D̃_i)_jk.</li>
 *   <li>{@code replacement}: ‖m³‖² + tr V; there m¹ = 0 and E⟨e⁰, e¹⟩ = 0 (the batches are independent) and
 *       V ← A V A + (α²/B) (1/N) Σ_i D̃_i S_t D̃_i is the covariance of e¹, exact to second order in D.</li>
 * </ul>
 * Left out (measured in the note): under {@code shuffle} the fluctuation of e¹ (about +1.6 % of first order at
 * α·λmax = 0.084 on WDBC) and 2 E⟨e⁰, e²⟩ (about −1.3 %); for both samplers the third derivative's covariance
 * terms. The terms are those of the noise: they are computed from e⁰'s noise-driven moments (a run from θ*), so a
 * run started elsewhere gets its first-order bias and these terms of its noise, not the cross terms of the two.
 *
 * <p>Everything is in H's eigenbasis. Built once in O(N·P³) (the third-order tensors); a run costs O(P³) per update
 * for the tensor contractions of m³ (and V) and O(P²) for the rest, allocating nothing per update.
 */
public final class SecondOrder {

    /** The largest P the terms are computed for (the tensors hold P²(P + 1)/2 values each). */
    public static final int MAX_PARAMETERS = 96;
    /** The most multiply-adds one update sequence may cost (a few seconds): P²(P + 1)/2 per tensor per update. */
    public static final double WORK_LIMIT = 4e9;

    private final int p;
    private final int n;
    private final double[] lambda;
    /** C̃, row-major P×P. */
    private final double[] noise;
    /** W_jk = (1/N) Σ_i (D̃_i)_jk g̃_ik, row-major. */
    private final double[] w;
    /** Z_jk = (1/N) Σ_i g̃_ij g̃_ik (D̃_i)_jk, row-major. */
    private final double[] z;
    /** T: row j holds T_jab over a ≤ b (packed), off-diagonal pairs doubled, so T[S]_j = row j · packed S. */
    private final double[] third;
    /** The diagonal of (1/N) Σ_i D̃_i S D̃_i as a contraction with S, packed like {@link #third}. */
    private final double[] spread;
    private final int packed;

    private SecondOrder(int p, int n, double[] lambda, double[] noise, double[] w, double[] z, double[] third,
            double[] spread) {
        this.p = p;
        this.n = n;
        this.lambda = lambda;
        this.noise = noise;
        this.w = w;
        this.z = z;
        this.third = third;
        this.spread = spread;
        this.packed = p * (p + 1) / 2;
    }

    /**
     * @param parameters P
     * @param examples N
     * @return why the terms are not computed, or empty
     */
    public static java.util.Optional<String> skipReason(int parameters, int examples) {
        if (parameters > MAX_PARAMETERS) {
            return java.util.Optional.of(String.format(java.util.Locale.ROOT, "the second-order terms are computed"
                    + " up to %d parameters (O(P³) per update); the model has %d", MAX_PARAMETERS, parameters));
        }
        if (examples < 3) {
            return java.util.Optional.of("the second-order terms need at least 3 training examples");
        }
        return java.util.Optional.empty();
    }

    /**
     * Builds the terms of binary logistic regression at θ*.
     *
     * @param theory the first-order theory of the same problem (H's eigenbasis and C̃)
     * @param train the training split the model is fitted to (labels 0 and 1)
     * @param thetaStar θ* = (w_0 … w_{d−1}, b). Not modified.
     * @param l2 λ on the weights (not the bias)
     * @return the terms
     * @throws IllegalArgumentException when {@link #skipReason} gives a reason or the sizes disagree
     */
    public static SecondOrder binaryLogistic(NoiseBallTheory theory, Dataset train, double[] thetaStar, double l2) {
        int d = train.features();
        int p = d + 1;
        int n = train.rows();
        if (theory.dimension() != p || thetaStar.length != p || train.classes() != 2) {
            throw new IllegalArgumentException("binary logistic regression on " + d + " inputs needs P = " + p
                    + " and two classes: the theory has P = " + theory.dimension() + ", θ* " + thetaStar.length
                    + " values, the data " + train.classes() + " classes");
        }
        java.util.Optional<String> skip = skipReason(p, n);
        if (skip.isPresent()) {
            throw new IllegalArgumentException(skip.get());
        }
        double[] x = train.featureMatrix();
        int[] y = train.labels();
        double[] q = theory.basis().vectorsView();
        // per example, in the eigenbasis: x̃_i = Qᵀ x̂_i, g̃_i = Qᵀ (δ_i x̂_i − mean), the curvature and third derivative
        double[] xt = new double[n * p];
        double[] gt = new double[n * p];
        double[] curv = new double[n];
        double[] third = new double[n];
        double[] mean = new double[p];
        double[] row = new double[p];
        for (int i = 0; i < n; i++) {
            double s = thetaStar[d];
            for (int j = 0; j < d; j++) {
                s += thetaStar[j] * x[i * d + j];
            }
            double pr = s >= 0 ? 1.0 / (1.0 + Math.exp(-s)) : Math.exp(s) / (1.0 + Math.exp(s));
            curv[i] = pr * (1 - pr);
            third[i] = pr * (1 - pr) * (1 - 2 * pr);
            double delta = pr - y[i];
            System.arraycopy(x, i * d, row, 0, d);
            row[d] = 1.0;
            for (int k = 0; k < p; k++) {
                double a = 0;
                for (int j = 0; j < p; j++) {
                    a += q[j * p + k] * row[j];
                }
                xt[i * p + k] = a;
                gt[i * p + k] = delta * a;
                mean[k] += delta * a / n;
            }
        }
        for (int i = 0; i < n; i++) {
            for (int k = 0; k < p; k++) {
                gt[i * p + k] -= mean[k];
            }
        }
        // H̃data = (1/N) Σ w_i x̃_i x̃_iᵀ, W, Z
        double[] hd = new double[p * p];
        double[] w = new double[p * p];
        double[] z = new double[p * p];
        for (int i = 0; i < n; i++) {
            double c = curv[i] / n;
            int o = i * p;
            for (int j = 0; j < p; j++) {
                double xj = xt[o + j];
                double gj = gt[o + j];
                for (int k = 0; k < p; k++) {
                    double xk = xt[o + k];
                    double gk = gt[o + k];
                    hd[j * p + k] += c * xj * xk;
                    w[j * p + k] += c * xj * xk * gk;
                    z[j * p + k] += c * xj * gj * xk * gk;
                }
            }
        }
        double[] noise = theory.noiseView();
        for (int jk = 0; jk < p * p; jk++) {
            z[jk] -= hd[jk] * noise[jk]; // the −H̃data part of D̃_i against g̃_ij g̃_ik, whose mean is C̃_jk
        }
        // the packed tensors: T_jab = (1/N) Σ w'''_i x̃_ij x̃_ia x̃_ib, F_jab = (1/N) Σ w_i² x̃_ij² x̃_ia x̃_ib − H̃d_ja H̃d_jb
        int packed = p * (p + 1) / 2;
        double[] t = new double[p * packed];
        double[] f = new double[p * packed];
        double[] pair = new double[packed];
        for (int i = 0; i < n; i++) {
            int o = i * p;
            int ab = 0;
            for (int a = 0; a < p; a++) {
                double xa = xt[o + a];
                pair[ab++] = xa * xa;
                for (int b = a + 1; b < p; b++) {
                    pair[ab++] = 2 * xa * xt[o + b];
                }
            }
            double c3 = third[i] / n;
            double c2 = curv[i] * curv[i] / n;
            for (int j = 0; j < p; j++) {
                double xj = xt[o + j];
                double ct = c3 * xj;
                double cf = c2 * xj * xj;
                int base = j * packed;
                for (int k = 0; k < packed; k++) {
                    t[base + k] += ct * pair[k];
                    f[base + k] += cf * pair[k];
                }
            }
        }
        for (int j = 0; j < p; j++) {
            int base = j * packed;
            int ab = 0;
            for (int a = 0; a < p; a++) {
                double ha = hd[j * p + a];
                f[base + ab++] -= ha * ha;
                for (int b = a + 1; b < p; b++) {
                    f[base + ab++] -= 2 * ha * hd[j * p + b];
                }
            }
        }
        return new SecondOrder(p, n, theory.eigenvaluesView(), noise, w, z, t, f);
    }

    /** @return P */
    int dimension() {
        return p;
    }

    /**
     * @param updates an update sequence without momentum
     * @return why the terms are not computed for it (over {@link #WORK_LIMIT}), or empty
     */
    java.util.Optional<String> skipReason(UpdateSequence updates) {
        double work = (double) updates.length() * (updates.sampling() == BatchSampling.SHUFFLE ? 1 : 2) * p * packed;
        if (work > WORK_LIMIT) {
            return java.util.Optional.of(String.format(java.util.Locale.ROOT, "%d updates at P = %d would take %.2g"
                    + " multiply-adds, over the limit of %.2g", updates.length(), p, work, WORK_LIMIT));
        }
        return java.util.Optional.empty();
    }

    /**
     * The terms' addition to E‖θ_t − θ*‖² and to the excess loss after every update t = 1 … T.
     *
     * @param distance after update t at index t − 1
     * @param loss the same for the excess loss
     */
    record Series(double[] distance, double[] loss) {
    }

    /**
     * @param updates the rates, batches and epoch ends (no momentum)
     * @param lambdaMax λmax: from the first update with α·λmax ≥ 2 the values are NaN (the mean is unstable there)
     * @return the terms after every update
     */
    Series series(UpdateSequence updates, double lambdaMax) {
        int steps = updates.length();
        double[] distance = new double[steps];
        double[] loss = new double[steps];
        Run run = start(updates.sampling());
        int nextEpoch = 0;
        boolean stable = true;
        for (int t = 0; t < steps; t++) {
            double a = updates.rate(t);
            stable &= a * lambdaMax < 2.0;
            if (stable) {
                run.step(a, updates.batch(t));
                distance[t] = run.distance();
                loss[t] = run.loss();
            } else {
                distance[t] = Double.NaN;
                loss[t] = Double.NaN;
            }
            if (nextEpoch < updates.epochs() && updates.epochEnd(nextEpoch) == t + 1) {
                run.endEpoch();
                nextEpoch++;
            }
        }
        return new Series(distance, loss);
    }

    /**
     * @param sampling how batches are drawn
     * @return the state of one run, at θ* (no momentum)
     */
    Run start(BatchSampling sampling) {
        return new Run(sampling == BatchSampling.SHUFFLE);
    }

    /** The terms along one run's updates, in lockstep with {@link Recursion}. */
    final class Run {
        private final boolean reshuffled;
        private final double k0;
        // first-order noise-driven second moment of e⁰: carried at the epoch's start (s0), or (replacement) current
        private final double[] s0 = new double[p * p];
        private final double[] dm = new double[p * p];
        private final double[] g = new double[p];
        private final double[] pp = new double[p];
        private final double[] sp = new double[packed];
        private final double[] drive = new double[p];
        private final double[] driveV = new double[p];
        private final double[] wg = new double[p];
        private final double[] m1 = new double[p];
        private final double[] m3 = new double[p];
        private final double[] v = new double[p];
        private final double[] x0 = new double[p];
        private final double[] xin = new double[p];
        private final double[] y = new double[p * p];
        private final double[] k = new double[p * p];
        private final double[] yr = new double[p * p];
        private final double[] ys = new double[p * p];
        private final double[] a = new double[p];
        private double distance;
        private double loss;

        Run(boolean reshuffled) {
            this.reshuffled = reshuffled;
            this.k0 = 2.0 / ((n - 1.0) * (n - 2.0));
            java.util.Arrays.fill(pp, 1.0);
        }

        /** Applies one update of rate α to a batch of B examples. */
        void step(double rate, int batch) {
            for (int j = 0; j < p; j++) {
                a[j] = 1 - rate * lambda[j];
            }
            // the second moment of e⁰ before the update, packed (a ≤ b)
            double c = 1.0 / (n - 1.0);
            int ab = 0;
            for (int i = 0; i < p; i++) {
                for (int j = i; j < p; j++) {
                    int o = i * p + j;
                    sp[ab++] = reshuffled ? pp[i] * pp[j] * s0[o] + dm[o] - g[i] * g[j] * noise[o] * c : s0[o];
                }
            }
            contract(third, drive);
            if (!reshuffled) {
                contract(spread, driveV);
            }
            double half = 0.5 * rate;
            if (reshuffled) {
                for (int j = 0; j < p; j++) {
                    double s = 0;
                    int o = j * p;
                    for (int l = 0; l < p; l++) {
                        s += w[o + l] * g[l];
                    }
                    wg[j] = s;
                }
                double kb = -(n - 2.0 * batch) / ((n - 1.0) * (n - 2.0) * batch) - k0;
                double r2 = rate * rate;
                for (int j = 0; j < p; j++) {
                    double aj = a[j];
                    double aa = aj * aj;
                    int o = j * p;
                    for (int l = 0; l < p; l++) {
                        double gl = g[l];
                        y[o + l] = aj * y[o + l] + rate * gl;
                        yr[o + l] = aa * yr[o + l] - rate * aj * k[o + l];
                        ys[o + l] = aa * ys[o + l] - kb * r2 * gl;
                        k[o + l] = aj * a[l] * k[o + l] + kb * r2;
                        dm[o + l] = aj * a[l] * dm[o + l] + r2 * noise[o + l] * n / (batch * (n - 1.0));
                    }
                    m1[j] = aj * m1[j] - rate * wg[j] * c;
                    m3[j] = aj * m3[j] - half * drive[j];
                }
                for (int j = 0; j < p; j++) {
                    g[j] = a[j] * g[j] + rate;
                    pp[j] *= a[j];
                }
                double sumD = 0;
                double sumL = 0;
                for (int j = 0; j < p; j++) {
                    double s = 0;
                    int o = j * p;
                    double gj = -k0 * g[j];
                    for (int l = 0; l < p; l++) {
                        s += z[o + l] * (gj * y[o + l] + yr[o + l] + ys[o + l]);
                    }
                    xin[j] = s;
                    double m = m1[j] + m3[j];
                    double term = m * m + 2 * (pp[j] * pp[j] * x0[j] + s);
                    sumD += term;
                    sumL += lambda[j] * term;
                }
                distance = sumD;
                loss = 0.5 * sumL;
            } else {
                double f = rate * rate / batch;
                double sumD = 0;
                double sumL = 0;
                for (int j = 0; j < p; j++) {
                    double aj = a[j];
                    int o = j * p;
                    for (int l = 0; l < p; l++) {
                        s0[o + l] = aj * a[l] * s0[o + l] + f * noise[o + l];
                    }
                    m3[j] = aj * m3[j] - half * drive[j];
                    v[j] = aj * aj * v[j] + f * driveV[j];
                    double term = m3[j] * m3[j] + v[j];
                    sumD += term;
                    sumL += lambda[j] * term;
                }
                distance = sumD;
                loss = 0.5 * sumL;
            }
        }

        private void contract(double[] tensor, double[] out) {
            for (int j = 0; j < p; j++) {
                int base = j * packed;
                double s = 0;
                for (int k2 = 0; k2 < packed; k2++) {
                    s += tensor[base + k2] * sp[k2];
                }
                out[j] = s;
            }
        }

        /** Closes the epoch ({@code shuffle}: the next permutation is independent of this one). */
        void endEpoch() {
            if (!reshuffled) {
                return;
            }
            double c = 1.0 / (n - 1.0);
            for (int i = 0; i < p; i++) {
                for (int j = 0; j < p; j++) {
                    int o = i * p + j;
                    s0[o] = pp[i] * pp[j] * s0[o] + dm[o] - g[i] * g[j] * noise[o] * c;
                }
                x0[i] = pp[i] * pp[i] * x0[i] + xin[i];
            }
            java.util.Arrays.fill(dm, 0.0);
            java.util.Arrays.fill(y, 0.0);
            java.util.Arrays.fill(k, 0.0);
            java.util.Arrays.fill(yr, 0.0);
            java.util.Arrays.fill(ys, 0.0);
            java.util.Arrays.fill(xin, 0.0);
            java.util.Arrays.fill(g, 0.0);
            java.util.Arrays.fill(pp, 1.0);
        }

        /** @return the terms' addition to E‖θ − θ*‖² after the last update */
        double distance() {
            return distance;
        }

        /** @return their addition to the excess loss, ½ Σ_j λ_j (the terms along direction j) */
        double loss() {
            return loss;
        }

        /** @return ‖m¹ + m³‖², the mean offset after the last update */
        double meanOffset() {
            double s = 0;
            for (int j = 0; j < p; j++) {
                double m = m1[j] + m3[j];
                s += m * m;
            }
            return s;
        }

        /** @return 2 E⟨e⁰, e¹⟩ after the last update ({@code shuffle}; 0 with replacement) */
        double cross() {
            if (!reshuffled) {
                return 0.0;
            }
            double s = 0;
            for (int j = 0; j < p; j++) {
                s += 2 * (pp[j] * pp[j] * x0[j] + xin[j]);
            }
            return s;
        }

        /** @return tr V after the last update (replacement; 0 under shuffle) */
        double spreadTrace() {
            double s = 0;
            for (int j = 0; j < p; j++) {
                s += v[j];
            }
            return s;
        }

        /** @return ‖m³‖² after the last update */
        double thirdOffset() {
            double s = 0;
            for (int j = 0; j < p; j++) {
                s += m3[j] * m3[j];
            }
            return s;
        }
    }
}
