package settle.engine.theory;

/**
 * The linearised SGD recursion of one run, direction by direction in H's eigenbasis (THEORY.md §3.2 and §3.5),
 * for both samplers and with or without heavy-ball momentum. Every operator of the recursion is diagonal (a 2×2
 * block with momentum) in H's eigenbasis, so the diagonal of the covariance, which is all that E‖θ − θ*‖² and the
 * excess loss need, evolves direction by direction: O(P) per update, no allocation per update.
 *
 * <p>State of direction i (eigenvalue λ, per-example noise c = C̃_ii): the mean m of z = (e, v) (position offset
 * e = θ − θ*, velocity v; without momentum only e), and the covariance carried by earlier noise, T (2×2 with
 * momentum). Update t with rate α and batch B maps z ← M z + b ξ with M = [[1 − αλ, −αβ], [λ, β]] and
 * b = (−α, 1) (without momentum M = 1 − αλ, b = −α), ξ the batch's mean per-example gradient at θ*:
 * <ul>
 *   <li>{@code replacement}: batches are independent, Var ξ = c/B: T ← M T Mᵀ + (c/B) b bᵀ.
 *   <li>{@code shuffle}: the examples drawn so far in the epoch are the first n positions of one random
 *       permutation, so the noise since the epoch's start is Σ_j y_j u_π(j), y_j the coefficient with which
 *       example position j enters z (the batch's x_s = M_t ⋯ M_{s+1} b_s divided by its size B_s), with
 *       covariance c·N/(N − 1)·[Σ_j y_j y_jᵀ − (Σ_j y_j)(Σ_j y_j)ᵀ/N] (sampling without replacement; Σ_i u_i = 0).
 *       Writing Σ_j y_j y_jᵀ − (Σ y_j)(Σ y_j)ᵀ/N = M2 + n(1 − n/N) ȳȳᵀ, with ȳ the mean and M2 the scatter of
 *       the n coefficients, gives a form without cancellation: every update transforms ȳ and the scatter by M
 *       (every coefficient is multiplied by M), then adds the batch's B equal coefficients b/B by Welford's
 *       pooled update (ȳ += δB/(n + B), M2 += δδᵀ·nB/(n + B), δ = b/B − ȳ). The scatter is kept inside T (both
 *       transform alike), and the pending term n(1 − n/N) ȳȳᵀ, zero once the epoch has drawn all N examples,
 *       is folded into T at the epoch's end. This is the recursion of THEORY.md §3.5 (D − G C Gᵀ/(N − 1)) in an
 *       algebraically equal form whose terms are all non-negative: the within-epoch cancellation that makes
 *       the reshuffled ball small is never computed as a difference.
 * </ul>
 * The covariance of e after the update is T_ee (+ the pending term under {@code shuffle}); E e² = m_e² + that.
 */
final class Recursion {

    private final double[] lambda;
    private final double[] noise;
    private final int p;
    private final int examples;
    private final double beta;
    private final boolean reshuffled;
    /** N/(N − 1), or 0 when N = 1 (a single example has no noise). */
    private final double population;

    private final double[] meanE;
    private final double[] meanV;
    private final double[] tEE;
    private final double[] tEV;
    private final double[] tVV;
    private final double[] yE;
    private final double[] yV;
    /** n: the examples drawn so far in the open epoch ({@code shuffle} only). */
    private double drawn;

    private double bias;
    private double ball;
    private double loss;

    /**
     * @param lambda H's eigenvalues (flat ones set to 0); not modified, not copied
     * @param noise C̃_ii, the per-example gradient variance along each eigenvector; not modified, not copied
     * @param examples N
     * @param beta heavy-ball β in [0, 1)
     * @param sampling how batches are drawn
     */
    Recursion(double[] lambda, double[] noise, int examples, double beta, BatchSampling sampling) {
        this.lambda = lambda;
        this.noise = noise;
        this.p = lambda.length;
        this.examples = examples;
        this.beta = beta;
        this.reshuffled = sampling == BatchSampling.SHUFFLE;
        this.population = examples > 1 ? examples / (examples - 1.0) : 0.0;
        this.meanE = new double[p];
        this.meanV = new double[p];
        this.tEE = new double[p];
        this.tEV = new double[p];
        this.tVV = new double[p];
        this.yE = new double[p];
        this.yV = new double[p];
    }

    /** Sets the mean of e (in the eigenbasis) and clears everything else: velocity, covariance, open epoch. */
    void start(double[] offset) {
        System.arraycopy(offset, 0, meanE, 0, p);
        java.util.Arrays.fill(meanV, 0.0);
        java.util.Arrays.fill(tEE, 0.0);
        java.util.Arrays.fill(tEV, 0.0);
        java.util.Arrays.fill(tVV, 0.0);
        java.util.Arrays.fill(yE, 0.0);
        java.util.Arrays.fill(yV, 0.0);
        drawn = 0;
        summarise();
    }

    /**
     * Applies one update.
     *
     * @param a the rate α
     * @param batch B, the examples in this batch
     */
    void step(double a, int batch) {
        double before = drawn;
        double after = reshuffled ? before + batch : 0;
        if (reshuffled && after > examples) {
            throw new IllegalArgumentException("a reshuffled epoch draws " + (long) after + " examples, more than the "
                    + examples + " of the training split");
        }
        // shuffle: the new coefficients' share of the epoch's draws, and the weights (per unit C̃_ii) of Welford's
        // pooled increment and of the pending term n(1 − n/N)·ȳȳᵀ, both with the factor N/(N − 1)
        double share = reshuffled ? batch / after : 0;
        double pooled = reshuffled ? population * batch * before / after : 0;
        double pending = reshuffled ? population * after * (1 - after / examples) : 0;
        if (beta == 0.0) {
            stepPlain(a, batch, share, pooled, pending);
        } else {
            stepMomentum(a, batch, share, pooled, pending);
        }
        drawn = after;
    }

    private void stepPlain(double a, int batch, double share, double pooled, double pending) {
        double item = -a / batch;
        double replaced = a * a / batch;
        double sumBias = 0;
        double sumBall = 0;
        double sumLoss = 0;
        for (int i = 0; i < p; i++) {
            double l = lambda[i];
            double c = noise[i];
            double g = 1 - a * l;
            double m = g * meanE[i];
            double t = g * g * tEE[i];
            double cov;
            if (reshuffled) {
                double y = g * yE[i];
                double delta = item - y;
                y += delta * share;
                t += c * pooled * delta * delta;
                yE[i] = y;
                cov = t + c * pending * y * y;
            } else {
                t += c * replaced;
                cov = t;
            }
            meanE[i] = m;
            tEE[i] = t;
            double mm = m * m;
            sumBias += mm;
            sumBall += cov;
            sumLoss += l * (mm + cov);
        }
        totals(sumBias, sumBall, sumLoss);
    }

    private void stepMomentum(double a, int batch, double share, double pooled, double pending) {
        double itemE = -a / batch;
        double itemV = 1.0 / batch;
        double m12 = -a * beta;
        double m22 = beta;
        double sumBias = 0;
        double sumBall = 0;
        double sumLoss = 0;
        for (int i = 0; i < p; i++) {
            double l = lambda[i];
            double c = noise[i];
            double m11 = 1 - a * l;
            double m21 = l;
            double me = m11 * meanE[i] + m12 * meanV[i];
            double mv = m21 * meanE[i] + m22 * meanV[i];
            // T ← M T Mᵀ, T symmetric
            double ee = tEE[i];
            double ev = tEV[i];
            double vv = tVV[i];
            double a11 = m11 * ee + m12 * ev;
            double a12 = m11 * ev + m12 * vv;
            double a21 = m21 * ee + m22 * ev;
            double a22 = m21 * ev + m22 * vv;
            ee = a11 * m11 + a12 * m12;
            ev = a11 * m21 + a12 * m22;
            vv = a21 * m21 + a22 * m22;
            double cov;
            if (reshuffled) {
                double ye = m11 * yE[i] + m12 * yV[i];
                double yv = m21 * yE[i] + m22 * yV[i];
                double de = itemE - ye;
                double dv = itemV - yv;
                ye += de * share;
                yv += dv * share;
                double w = c * pooled;
                ee += w * de * de;
                ev += w * de * dv;
                vv += w * dv * dv;
                yE[i] = ye;
                yV[i] = yv;
                cov = ee + c * pending * ye * ye;
            } else {
                double w = c / batch;
                ee += w * a * a;
                ev -= w * a;
                vv += w;
                cov = ee;
            }
            meanE[i] = me;
            meanV[i] = mv;
            tEE[i] = ee;
            tEV[i] = ev;
            tVV[i] = vv;
            double mm = me * me;
            sumBias += mm;
            sumBall += cov;
            sumLoss += l * (mm + cov);
        }
        totals(sumBias, sumBall, sumLoss);
    }

    private void totals(double sumBias, double sumBall, double sumLoss) {
        bias = sumBias;
        ball = sumBall;
        loss = 0.5 * sumLoss;
    }

    /**
     * Closes the open epoch ({@code shuffle}: the next epoch's permutation is independent, so the whole covariance,
     * pending term included, is carried into it). The moments after the update are unchanged.
     */
    void endEpoch() {
        if (!reshuffled || drawn == 0) {
            return;
        }
        double pending = drawn * (1 - drawn / examples);
        for (int i = 0; i < p; i++) {
            double w = noise[i] * population * pending;
            double ye = yE[i];
            double yv = yV[i];
            tEE[i] += w * ye * ye;
            tEV[i] += w * ye * yv;
            tVV[i] += w * yv * yv;
            yE[i] = 0;
            yV[i] = 0;
        }
        drawn = 0;
    }

    /** Recomputes the sums from the state (after {@link #start} or a direct change of the carried covariance). */
    private void summarise() {
        double sumBias = 0;
        double sumBall = 0;
        double sumLoss = 0;
        double pending = reshuffled ? drawn * (1 - drawn / examples) : 0;
        for (int i = 0; i < p; i++) {
            double mm = meanE[i] * meanE[i];
            double cov = tEE[i] + noise[i] * population * pending * yE[i] * yE[i];
            sumBias += mm;
            sumBall += cov;
            sumLoss += lambda[i] * (mm + cov);
        }
        totals(sumBias, sumBall, sumLoss);
    }

    /** @return ‖E e‖² = Σ m_e,i²: the predicted squared bias after the last update */
    double bias() {
        return bias;
    }

    /** @return tr Cov e: the predicted ball after the last update */
    double ball() {
        return ball;
    }

    /** @return E‖e‖² = bias + ball */
    double distance() {
        return bias + ball;
    }

    /** @return the predicted excess loss ½ Σ λ_i E e_i² */
    double loss() {
        return loss;
    }

    // ---------------------------------------------------------------- the fixed point's access to the state

    /** @return the carried covariance of direction i as {ee, ev, vv} (no open epoch) */
    double[] carried(int i) {
        return new double[] {tEE[i], tEV[i], tVV[i]};
    }

    /** Sets the carried covariance of direction i (no open epoch; the mean is left alone). */
    void carry(int i, double ee, double ev, double vv) {
        tEE[i] = ee;
        tEV[i] = ev;
        tVV[i] = vv;
    }

    /** Recomputes the sums after {@link #carry}. */
    void refresh() {
        summarise();
    }

    /**
     * @param a a constant rate
     * @param updates how many updates
     * @param i the direction
     * @return M^updates for direction i as {m11, m12, m21, m22} (without momentum {g^updates, 0, 0, 0})
     */
    double[] power(double a, int updates, int i) {
        double l = lambda[i];
        double[] m = {1 - a * l, -a * beta, l, beta};
        double[] out = {1, 0, 0, 1};
        for (int k = 0; k < updates; k++) {
            double o11 = m[0] * out[0] + m[1] * out[2];
            double o12 = m[0] * out[1] + m[1] * out[3];
            double o21 = m[2] * out[0] + m[3] * out[2];
            double o22 = m[2] * out[1] + m[3] * out[3];
            out[0] = o11;
            out[1] = o12;
            out[2] = o21;
            out[3] = o22;
        }
        if (beta == 0.0) {
            out[1] = 0;
            out[2] = 0;
            out[3] = 0;
        }
        return out;
    }

    /** @return true with momentum (the state of a direction is (e, v)) */
    boolean momentum() {
        return beta != 0.0;
    }
}
