package settle.engine.model;

/**
 * The soft-max of a batch's scores, shared by the multinomial models. Per row r of Z (n × K): m_r = max_k z_rk,
 * e_rk = exp(z_rk − m_r) by {@link Kernels#exp} (over the whole batch at once, so that the vector path takes
 * whole vectors whatever K is), s_r = Σ_k e_rk in ascending k, p_rk = e_rk · (1 / s_r), and the row's log-sum-exp
 * m_r + log s_r. Subtracting the maximum first keeps every exponential ≤ 1, so none overflows and s_r ≥ 1.
 */
final class Softmax {

    private Softmax() {
    }

    /**
     * Replaces the n rows of K scores in {@code z} by their probabilities.
     *
     * @param z the scores, row r at r·K; modified
     * @param logSumExp receives each row's log-sum-exp in [0, n); modified
     * @param scratch at least n·K values for {@link Kernels#exp(double[], int, int, double[])}; modified
     * @param normalise true to finish the probabilities; false when only the log-sum-exps are wanted (a loss),
     *     which leaves z holding e_rk (the log-sum-exps are the same bits either way)
     */
    static void probabilities(double[] z, int n, int k, double[] logSumExp, double[] scratch, boolean normalise) {
        for (int r = 0; r < n; r++) {
            int base = r * k;
            // two running maxima halve the dependent chain; max is exact, so any grouping gives the same value
            double max = z[base];
            double other = max;
            int c = 1;
            for (; c + 1 < k; c += 2) {
                max = Math.max(max, z[base + c]);
                other = Math.max(other, z[base + c + 1]);
            }
            if (c < k) {
                max = Math.max(max, z[base + c]);
            }
            max = Math.max(max, other);
            for (c = 0; c < k; c++) {
                z[base + c] -= max;
            }
            logSumExp[r] = max;
        }
        Kernels.exp(z, 0, n * k, scratch);
        for (int r = 0; r < n; r++) {
            int base = r * k;
            double sum = 0;
            for (int c = 0; c < k; c++) {
                sum += z[base + c];
            }
            if (normalise) {
                double inverse = 1.0 / sum;
                for (int c = 0; c < k; c++) {
                    z[base + c] *= inverse;
                }
            }
            logSumExp[r] += Math.log(sum);
        }
    }
}
