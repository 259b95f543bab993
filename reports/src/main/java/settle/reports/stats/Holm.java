package settle.reports.stats;

/**
 * Holm–Bonferroni adjustment (S. Holm, "A simple sequentially rejective multiple test procedure",
 * Scandinavian Journal of Statistics 6(2), 1979): with p sorted ascending, p̃_(i) = max_{j ≤ i}
 * min(1, (m − j + 1) p_(j)); an arm is declared different when p̃ ≤ the significance level. Same as R's
 * {@code p.adjust(method = "holm")}.
 */
public final class Holm {

    private Holm() {
    }

    /**
     * @param p raw p-values in [0, 1], one per arm. Not modified.
     * @return the adjusted p-values, in the input order
     */
    public static double[] adjust(double[] p) {
        int m = p.length;
        for (int i = 0; i < m; i++) {
            if (!(p[i] >= 0.0 && p[i] <= 1.0)) {
                throw new IllegalArgumentException("p-value " + i + " must be in [0, 1]: " + p[i]);
            }
        }
        // stable insertion sort of indices by p (m is the number of arms: small)
        int[] order = new int[m];
        for (int i = 0; i < m; i++) {
            int j = i;
            while (j > 0 && p[order[j - 1]] > p[i]) {
                order[j] = order[j - 1];
                j--;
            }
            order[j] = i;
        }
        double[] adjusted = new double[m];
        double running = 0.0;
        for (int rank = 0; rank < m; rank++) {
            double value = Math.min(1.0, (m - rank) * p[order[rank]]);
            running = Math.max(running, value);
            adjusted[order[rank]] = running;
        }
        return adjusted;
    }

    /**
     * The smallest adjusted p an exact two-sided signed-rank test can reach with n untied pairs among
     * m arms: m · 2/2ⁿ (the all-same-sign outcome, for the arm with the smallest raw p).
     *
     * @param arms m, at least 1
     * @param pairs n, at least 0
     * @return min(1, m · 2/2ⁿ)
     */
    public static double smallestAdjustedP(int arms, int pairs) {
        if (arms < 1 || pairs < 0) {
            throw new IllegalArgumentException("need at least one arm and non-negative pairs: " + arms + ", " + pairs);
        }
        return Math.min(1.0, Math.scalb(2.0 * arms, -pairs));
    }

    /**
     * @param arms m, at least 1
     * @param significance the level α in (0, 1)
     * @return the smallest number of untied pairs n with m · 2/2ⁿ ≤ α
     */
    public static int pairsNeeded(int arms, double significance) {
        if (!(significance > 0.0 && significance < 1.0)) {
            throw new IllegalArgumentException("significance level must be in (0, 1): " + significance);
        }
        int n = 0;
        while (smallestAdjustedP(arms, n) > significance) {
            n++;
        }
        return n;
    }
}
