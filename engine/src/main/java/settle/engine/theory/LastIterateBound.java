package settle.engine.theory;

import settle.datasets.Dataset;
import settle.engine.model.FullBatch;
import settle.engine.model.Model;

/**
 * The convex last-iterate suboptimality bound of SGD for a rate sequence η_1 … η_T (Defazio, Cutkosky, Mehta
 * and Mishchenko, "Optimal Linear Decay Learning Rate Schedules and Further Refinements", arXiv:2310.07831,
 * Theorem 10, as used by Schaipp, Hägele, Taylor, Şimşekli and Bach, "The Surprising Agreement Between Convex
 * Optimization Theory and Learning-Rate Scheduling for Large Model Training", ICML 2025, Theorem 1): for a
 * convex objective with stochastic gradients of squared norm at most G² and D = ‖x_1 − x*‖,
 *
 * <pre>
 * E[f(x_T) − f*] ≤ (D² + G² Σ_{t=1..T} η_t²) / (2 Σ_{t=1..T} η_t)
 *               + (G²/2) Σ_{k=1..T−1} η_k / (Σ_{t=k+1..T} η_t) · (Σ_{t=k..T} η_t²) / (Σ_{t=k..T} η_t).
 * </pre>
 *
 * The form was checked against the authors' published code for the paper (repository fabian-sp/lr-scheduling,
 * {@code src/scheduled/schedules/base.py}, {@code _compute_refined_rate}, which cites Theorem 10 of
 * arXiv:2310.07831). It is a worst-case <em>bound</em> for non-smooth convex problems, not a prediction of the
 * loss: useful to rank schedules a priori, as those papers do.
 */
public final class LastIterateBound {

    private LastIterateBound() {
    }

    /**
     * @param rates η_1 … η_T, each ≥ 0 with a positive sum; not modified
     * @param d D = ‖x_1 − x*‖
     * @param g G, the bound on the stochastic gradient norm
     * @return the bound's value; O(T), allocation-free
     */
    public static double value(double[] rates, double d, double g) {
        int n = rates.length;
        if (n == 0) {
            throw new IllegalArgumentException("the bound needs at least one rate");
        }
        double sum = 0;
        double sumSq = 0;
        for (double r : rates) {
            if (!(r >= 0) || r == Double.POSITIVE_INFINITY) {
                throw new IllegalArgumentException("rates must be finite and ≥ 0, got " + r);
            }
            sum += r;
            sumSq += r * r;
        }
        if (!(sum > 0)) {
            throw new IllegalArgumentException("the rates must not all be 0");
        }
        double g2 = g * g;
        double value = (d * d + g2 * sumSq) / (2 * sum);
        // walk k = T−1 … 1 keeping the suffix sums Σ_{t=k+1..T} η_t and Σ_{t=k+1..T} η_t²
        double after = rates[n - 1];
        double afterSq = rates[n - 1] * rates[n - 1];
        double tail = 0;
        for (int k = n - 2; k >= 0; k--) {
            double eta = rates[k];
            double from = after + eta;
            double fromSq = afterSq + eta * eta;
            if (after > 0 && from > 0) {
                tail += eta / after * (fromSq / from);
            }
            after = from;
            afterSq = fromSq;
        }
        return value + 0.5 * g2 * tail;
    }

    /**
     * G for a mini-batch of B rows drawn with replacement at θ: G² = E‖g_B‖² = ‖∇F(θ)‖² + (mean_i ‖∇F_i(θ)‖² −
     * ‖∇F(θ)‖²) / B, with F_i the objective of example i (its loss plus the penalty).
     *
     * @param theta parameters; not modified
     */
    public static double gradientScale(Model model, Dataset train, double[] theta, int batch) {
        FullBatch full = new FullBatch(model, train);
        int p = model.parameterCount();
        double[] gradient = new double[p];
        full.objectiveAndGradient(theta, gradient);
        double[] lossMean = new double[p];
        double[] example = new double[p];
        int n = train.rows();
        double sumSq = 0;
        for (int i = 0; i < n; i++) {
            full.exampleGradient(theta, i, example);
            for (int j = 0; j < p; j++) {
                lossMean[j] += example[j] / n;
            }
        }
        // the penalty's gradient is ∇F − mean of the loss gradients; add it to each example's loss gradient
        double[] penalty = new double[p];
        for (int j = 0; j < p; j++) {
            penalty[j] = gradient[j] - lossMean[j];
        }
        for (int i = 0; i < n; i++) {
            full.exampleGradient(theta, i, example);
            double s = 0;
            for (int j = 0; j < p; j++) {
                double v = example[j] + penalty[j];
                s += v * v;
            }
            sumSq += s / n;
        }
        double fullSq = 0;
        for (double v : gradient) {
            fullSq += v * v;
        }
        int b = Math.max(1, Math.min(batch, n));
        return Math.sqrt(Math.max(0, fullSq + (sumSq - fullSq) / b));
    }
}
