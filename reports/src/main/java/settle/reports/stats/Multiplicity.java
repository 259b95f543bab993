package settle.reports.stats;

/**
 * Multiplicity across the m arms compared with the baseline: Bonferroni (C. E. Bonferroni, "Teoria statistica delle
 * classi e calcolo delle probabilità", 1936; as R's {@code p.adjust(method = "bonferroni")}). An arm's adjusted p is
 * min(1, m·p), and its confidence intervals are taken at level 1 − (1 − c)/m for a nominal level c, so that an
 * arm's verdict and its interval come from the same test: the exact signed-rank interval at level 1 − α/m is the set
 * of shifts the test does not reject at α/m, so "adjusted p ≤ α" and "the interval excludes no change" say the same
 * thing (docs/stats.md says why this is used rather than Holm's step-down, which detects a little more often but
 * has no interval that agrees with it).
 */
public final class Multiplicity {

    private Multiplicity() {
    }

    /**
     * @param p raw p-values in [0, 1], one per arm. Not modified.
     * @return min(1, m·p) for each, in the input order
     */
    public static double[] adjust(double[] p) {
        int m = p.length;
        double[] adjusted = new double[m];
        for (int i = 0; i < m; i++) {
            if (!(p[i] >= 0.0 && p[i] <= 1.0)) {
                throw new IllegalArgumentException("p-value " + i + " must be in [0, 1]: " + p[i]);
            }
            adjusted[i] = Math.min(1.0, m * p[i]);
        }
        return adjusted;
    }

    /**
     * @param confidence the nominal level c in (0, 1), e.g. 0.95
     * @param arms m, at least 1
     * @return 1 − (1 − c)/m, the level of each arm's interval (0.99 for c = 0.95 and m = 5)
     */
    public static double level(double confidence, int arms) {
        if (!(confidence > 0.0 && confidence < 1.0) || arms < 1) {
            throw new IllegalArgumentException("need a level in (0, 1) and at least one arm: " + confidence + ", "
                    + arms);
        }
        return 1.0 - (1.0 - confidence) / arms;
    }

    /**
     * The smallest adjusted p an exact two-sided signed-rank test can reach with n untied pairs among
     * m arms: m · 2/2ⁿ (the all-same-sign outcome).
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
