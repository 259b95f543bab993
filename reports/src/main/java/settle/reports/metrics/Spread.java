package settle.reports.metrics;

/**
 * Spread across replicates of one arm, from a centred Gram matrix so that resampled replicate sets cost
 * O(S²) each.
 *
 * <p>For vectors x_1 … x_S (rows of a matrix), centre them at their mean c, then G_st = ⟨x_s − c, x_t − c⟩ / n
 * with n a fixed divisor. For a multiset of indices i_1 … i_S drawn from them,
 * (1/S) Σ_j ‖x_(i_j) − mean_j x_(i_j)‖² / n = (1/S) Σ_j G_(i_j i_j) − (1/S²) Σ_j Σ_l G_(i_j i_l):
 * the shift by c cancels, and centring first keeps the subtraction free of cancellation. With counts
 * w_s of how often s was drawn this is (1/S) Σ_s w_s G_ss − (1/S²) wᵀ G w.
 *
 * <ul>
 *   <li>seed spread: x_s = θ_F^s (gauge-free), n = 1, then the square root;</li>
 *   <li>prediction spread: x_s = the test probabilities of replicate s (all examples × classes), n = the
 *       number of test examples: mean over examples of Σ_classes Var_s p_s(class), divisor S;</li>
 *   <li>disagreement: D_st = the fraction of test examples s and t classify differently (argmax, ties to
 *       the lower class); over a multiset, the mean over the S(S − 1)/2 pairs of positions of D.</li>
 * </ul>
 */
public final class Spread {

    private Spread() {
    }

    /**
     * @param rows S vectors of equal length. Not modified.
     * @param divisor n, positive
     * @return the S × S centred Gram matrix divided by n, row-major
     */
    public static double[] centredGram(double[][] rows, double divisor) {
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
        double[] g = new double[s * s];
        for (int a = 0; a < s; a++) {
            double[] x = centred[a];
            for (int b = a; b < s; b++) {
                double[] y = centred[b];
                double sum = 0.0;
                for (int j = 0; j < p; j++) {
                    sum += x[j] * y[j];
                }
                g[a * s + b] = sum / divisor;
                g[b * s + a] = sum / divisor;
            }
        }
        return g;
    }

    /**
     * @param gram S × S centred Gram matrix, row-major. Not modified.
     * @param counts how often each of the S vectors was drawn; they sum to the sample size. Not modified.
     * @return the mean squared distance of the drawn vectors to their mean (per unit of the divisor), ≥ 0
     */
    public static double meanSquaredDeviation(double[] gram, int[] counts) {
        int[] drawn = new int[counts.length];
        return meanSquaredDeviation(gram, counts, drawn, drawn(counts, drawn));
    }

    /**
     * As {@link #meanSquaredDeviation(double[], int[])} with the drawn indices already listed (same value, bit for
     * bit): the joint bootstrap lists them once per resample for every statistic.
     *
     * @param drawn the indices with a non-zero count, increasing, in its first m entries. Not modified.
     * @param m how many
     */
    public static double meanSquaredDeviation(double[] gram, int[] counts, int[] drawn, int m) {
        int s = counts.length;
        double total = 0.0;
        double diagonal = 0.0;
        double quadratic = 0.0;
        for (int x = 0; x < m; x++) {
            int a = drawn[x];
            int wa = counts[a];
            total += wa;
            diagonal += wa * gram[a * s + a];
            double row = 0.0;
            for (int y = 0; y < m; y++) {
                int b = drawn[y];
                row += counts[b] * gram[a * s + b];
            }
            quadratic += wa * row;
        }
        return Math.max(0.0, diagonal / total - quadratic / (total * total));
    }

    /**
     * Writes the indices with a non-zero count, in increasing order, into {@code drawn}; returns how many.
     *
     * @param counts not modified
     * @param drawn modified: its first entries receive the indices
     */
    public static int drawn(int[] counts, int[] drawn) {
        int m = 0;
        for (int a = 0; a < counts.length; a++) {
            if (counts[a] != 0) {
                drawn[m++] = a;
            }
        }
        return m;
    }

    /**
     * @param disagreement S × S matrix of pairwise disagreement fractions (zero diagonal), row-major. Not
     *     modified.
     * @param counts how often each replicate was drawn; the sample has at least two. Not modified.
     * @return the mean of D over the pairs of positions in the drawn sample (equal draws disagree nowhere)
     */
    public static double meanPairwise(double[] disagreement, int[] counts) {
        int[] drawn = new int[counts.length];
        return meanPairwise(disagreement, counts, drawn, drawn(counts, drawn));
    }

    /**
     * As {@link #meanPairwise(double[], int[])} with the drawn indices already listed (same value, bit for bit).
     *
     * @param drawn the indices with a non-zero count, increasing, in its first m entries. Not modified.
     * @param m how many
     */
    public static double meanPairwise(double[] disagreement, int[] counts, int[] drawn, int m) {
        int s = counts.length;
        double total = 0.0;
        double quadratic = 0.0;
        for (int x = 0; x < m; x++) {
            int a = drawn[x];
            int wa = counts[a];
            total += wa;
            double row = 0.0;
            for (int y = 0; y < m; y++) {
                int b = drawn[y];
                row += counts[b] * disagreement[a * s + b];
            }
            quadratic += wa * row;
        }
        // Σ over ordered pairs of positions (j ≠ l) = wᵀ D w since D_ss = 0; unordered pairs are half of it.
        return quadratic / (total * (total - 1.0));
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
