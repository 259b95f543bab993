package settle.reports.metrics;

/**
 * Spread across the replicates of one arm, as means over distinct pairs of replicates of a pairwise kernel h
 * (U-statistics), with every leave-one-replicate-out mean for the jackknife interval.
 *
 * <ul>
 *   <li>seed spread: h_st = ½‖θ_F^s − θ_F^t‖² (gauge-free), the value the square root of the mean over pairs; the
 *       mean over pairs of ½‖x_s − x_t‖² is (1/(S − 1)) Σ_s ‖x_s − x̄‖², so it is the sample spread with divisor
 *       S − 1, unbiased for the expected squared deviation;</li>
 *   <li>prediction spread: h_st = ½ (1/n) Σ_rows Σ_classes (p_s − p_t)², n test examples: the mean over examples of
 *       Σ_classes Var_s p_s(class), divisor S − 1;</li>
 *   <li>disagreement: h_st = the fraction of test examples s and t classify differently (argmax, ties to the lower
 *       class).</li>
 * </ul>
 * A pair is two different replicates: nothing here ever pairs a replicate with itself, so no spread is shrunk by a
 * replicate counted twice.
 *
 * <p>Half squared distances come from the centred Gram matrix G (vectors centred at their mean first, which keeps
 * the subtraction free of cancellation): ½‖x_s − x_t‖² = ½(G_ss + G_tt) − G_st.
 */
public final class Spread {

    private Spread() {
    }

    /**
     * The mean of a pairwise kernel over the distinct pairs of S replicates, and the same mean with each replicate
     * left out in turn.
     *
     * @param value the mean over all S(S − 1)/2 pairs
     * @param leaveOneOut entry i: the mean over the (S − 1)(S − 2)/2 pairs without replicate i (empty when S &lt; 3)
     */
    public record PairMeans(double value, double[] leaveOneOut) {

        public PairMeans {
            leaveOneOut = leaveOneOut.clone();
        }

        /** @return a copy of the leave-one-out means */
        @Override
        public double[] leaveOneOut() {
            return leaveOneOut.clone();
        }
    }

    /**
     * @param rows S vectors of equal length. Not modified.
     * @param divisor n, positive: every half squared distance is divided by it
     * @return h_st = ½‖x_s − x_t‖²/n, S × S row-major, zero diagonal
     */
    public static double[] halfSquaredDistances(double[][] rows, double divisor) {
        int s = rows.length;
        int p = s == 0 ? 0 : rows[0].length;
        double[] mean = new double[p];
        for (double[] row : rows) {
            if (row.length != p) {
                throw new IllegalArgumentException("rows differ in length: " + row.length + " and " + p);
            }
            for (int j = 0; j < p; j++) {
                mean[j] += row[j];
            }
        }
        for (int j = 0; j < p; j++) {
            mean[j] /= s;
        }
        double[][] centred = new double[s][p];
        for (int i = 0; i < s; i++) {
            for (int j = 0; j < p; j++) {
                centred[i][j] = rows[i][j] - mean[j];
            }
        }
        double[] gram = new double[s * s];
        for (int a = 0; a < s; a++) {
            for (int b = a; b < s; b++) {
                double sum = 0.0;
                for (int j = 0; j < p; j++) {
                    sum += centred[a][j] * centred[b][j];
                }
                gram[a * s + b] = sum;
                gram[b * s + a] = sum;
            }
        }
        double[] h = new double[s * s];
        for (int a = 0; a < s; a++) {
            for (int b = a + 1; b < s; b++) {
                double v = Math.max(0.0, 0.5 * (gram[a * s + a] + gram[b * s + b]) - gram[a * s + b]) / divisor;
                h[a * s + b] = v;
                h[b * s + a] = v;
            }
        }
        return h;
    }

    /**
     * @param kernel S × S symmetric kernel h, row-major (the diagonal is ignored). Not modified.
     * @param s S ≥ 2
     * @return the mean over distinct pairs and every leave-one-out mean: with T = Σ_{a&lt;b} h_ab and row sums
     *     r_i = Σ_{b≠i} h_ib, the mean without i is (T − r_i) / ((S − 1)(S − 2)/2), O(S²) in all
     */
    public static PairMeans pairMeans(double[] kernel, int s) {
        if (s < 2 || kernel.length != s * s) {
            throw new IllegalArgumentException("need at least two replicates and an S × S kernel: " + s + ", "
                    + kernel.length);
        }
        double[] row = new double[s];
        double total = 0.0;
        for (int a = 0; a < s; a++) {
            for (int b = a + 1; b < s; b++) {
                double v = kernel[a * s + b];
                total += v;
                row[a] += v;
                row[b] += v;
            }
        }
        double value = total / (s * (s - 1) / 2.0);
        if (s < 3) {
            return new PairMeans(value, new double[0]);
        }
        double smaller = (s - 1) * (s - 2) / 2.0;
        double[] out = new double[s];
        for (int i = 0; i < s; i++) {
            out[i] = Math.max(0.0, total - row[i]) / smaller;
        }
        return new PairMeans(value, out);
    }

    /**
     * @param probabilities per replicate, rows × K row-major test probabilities. Not modified.
     * @param classes K
     * @return D_st: the fraction of test rows where the argmax classes of s and t differ (ties go to the
     *     lower class), S × S row-major
     */
    public static double[] disagreement(double[][] probabilities, int classes) {
        int s = probabilities.length;
        int rows = s == 0 ? 0 : probabilities[0].length / classes;
        int[][] predicted = new int[s][rows];
        for (int i = 0; i < s; i++) {
            if (probabilities[i].length != rows * classes) {
                throw new IllegalArgumentException("replicates have different numbers of test probabilities");
            }
            for (int r = 0; r < rows; r++) {
                predicted[i][r] = argmax(probabilities[i], r * classes, classes);
            }
        }
        return disagreement(predicted);
    }

    /**
     * @param predicted per replicate, the predicted class of each test row. Not modified.
     * @return D_st: the fraction of test rows where the classes of s and t differ, S × S row-major
     */
    public static double[] disagreement(int[][] predicted) {
        int s = predicted.length;
        int rows = s == 0 ? 0 : predicted[0].length;
        for (int[] p : predicted) {
            if (p.length != rows) {
                throw new IllegalArgumentException("replicates have different numbers of test rows");
            }
        }
        double[] d = new double[s * s];
        for (int a = 0; a < s; a++) {
            for (int b = a + 1; b < s; b++) {
                int differ = 0;
                for (int r = 0; r < rows; r++) {
                    if (predicted[a][r] != predicted[b][r]) {
                        differ++;
                    }
                }
                double f = rows == 0 ? 0.0 : (double) differ / rows;
                d[a * s + b] = f;
                d[b * s + a] = f;
            }
        }
        return d;
    }

    /** @return the index of the largest of p[offset..offset+k), the lowest index on ties */
    static int argmax(double[] p, int offset, int k) {
        int best = 0;
        for (int c = 1; c < k; c++) {
            if (p[offset + c] > p[offset + best]) {
                best = c;
            }
        }
        return best;
    }
}
