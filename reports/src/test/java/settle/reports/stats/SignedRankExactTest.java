package settle.reports.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * The exact test with ties, zeros and infinite (diverged) differences, where R falls back to a normal
 * approximation, against brute-force enumeration of all 2ⁿ sign patterns (n ≤ 12) written
 * independently here: midranks by counting, then every sign pattern.
 */
class SignedRankExactTest {

    /** Both sides sum dyadic rationals k/2ⁿ with n ≤ 12: exact in double precision. */
    private static final double EXACT = 1e-15;

    /** Brute force: returns {V, p}. */
    private static double[] bruteForce(double[] d) {
        int k = 0;
        for (double v : d) {
            if (v != 0.0) {
                k++;
            }
        }
        double[] abs = new double[k];
        boolean[] positive = new boolean[k];
        int j = 0;
        for (double v : d) {
            if (v != 0.0) {
                abs[j] = Math.abs(v);
                positive[j++] = v > 0;
            }
        }
        double[] rank = new double[k];
        for (int a = 0; a < k; a++) {
            int below = 0;
            int equal = 0;
            for (int b = 0; b < k; b++) {
                if (abs[b] < abs[a]) {
                    below++;
                } else if (abs[b] == abs[a]) {
                    equal++;
                }
            }
            rank[a] = below + (equal + 1) / 2.0;
        }
        double observed = 0;
        for (int a = 0; a < k; a++) {
            if (positive[a]) {
                observed += rank[a];
            }
        }
        long atMost = 0;
        long atLeast = 0;
        for (int mask = 0; mask < (1 << k); mask++) {
            double w = 0;
            for (int a = 0; a < k; a++) {
                if ((mask & (1 << a)) != 0) {
                    w += rank[a];
                }
            }
            if (w <= observed) {
                atMost++;
            }
            if (w >= observed) {
                atLeast++;
            }
        }
        double p = Math.min(1.0, 2.0 * Math.min(atMost, atLeast) / (double) (1L << k));
        return new double[] {observed, p};
    }

    private static void assertMatchesBruteForce(double[] d) {
        SignedRankResult r = SignedRankTest.test(d);
        double[] expected = bruteForce(d);
        assertEquals(expected[0], r.statistic(), 0.0, "V");
        assertEquals(expected[1], r.pValue(), EXACT, "p");
    }

    @Test
    void tiesAndZerosMatchEnumeration() {
        assertMatchesBruteForce(new double[] {0, 0.5, -0.5, 1, 1, -1, 2, 0, 3, -3, 3, 3});
        assertMatchesBruteForce(new double[] {1, 1, 1, 1, 1, 1, -1, 2, 2, 0});
        assertMatchesBruteForce(new double[] {0.25, 0.25, 0.5, 0.75, 0.75, 0.75, 1.5, -0.25, 2.0, 2.0, -2.0, 4.0});
        assertMatchesBruteForce(new double[] {-1, -1, -2, -2, -2, -3, 0, 0, 0, 4, 4});
        assertMatchesBruteForce(new double[] {1, 1});
        assertMatchesBruteForce(new double[] {0, 0, 0});
        SignedRankResult r = SignedRankTest.test(new double[] {0, 0.5, -0.5, 1, 1, -1, 2, 0, 3, -3, 3, 3});
        assertEquals(2, r.zeros());
        assertEquals(10, r.used());
        assertTrue(r.tied());
    }

    @Test
    void infiniteDifferencesTakeTheLargestRanksWithTheirSign() {
        double inf = Double.POSITIVE_INFINITY;
        assertMatchesBruteForce(new double[] {inf, inf, -0.3, 0.2, 0.1, -0.4, 0.5, 0});
        assertMatchesBruteForce(new double[] {-inf, inf, 0.3, 0.2, 0.2, -0.1, 0.7, 0.6, 0.9, -0.8, 1.1});
        // Three diverged arm replicates among six: ranks 4, 5, 6 are positive → V = 15 of 21.
        SignedRankResult r = SignedRankTest.test(new double[] {inf, inf, inf, -0.3, 0.2, -0.1});
        assertEquals(5 + 5 + 5 + 2, r.statistic(), 0.0, "ties at infinity share the midrank 5");
    }

    @Test
    void floorIsTwoOverTwoToTheN() {
        // THEORY.md §5.2 (scipy exact): n = 4 → 0.125, 5 → 0.0625, 6 → 0.03125, 7 → 0.015625, 8 → 0.0078125.
        double[] floors = {0.125, 0.0625, 0.03125, 0.015625, 0.0078125};
        for (int n = 4; n <= 8; n++) {
            double[] d = new double[n];
            for (int i = 0; i < n; i++) {
                d[i] = -(i + 1) * 0.1;
            }
            assertEquals(floors[n - 4], SignedRankTest.test(d).pValue(), 0.0, "n = " + n);
            assertEquals(floors[n - 4], Multiplicity.smallestAdjustedP(1, n), 0.0);
        }
        assertEquals(4 * 0.0078125, Multiplicity.smallestAdjustedP(4, 8), 0.0);
    }

    @Test
    void replicatesNeededForFivePercent() {
        // 2m/2ⁿ ≤ 0.05 ⇔ 2ⁿ ≥ 40m (hand-computed): m = 1 → 6 (64 ≥ 40), m = 4 → 8 (256 ≥ 160),
        // m = 13 → 10 (1024 ≥ 520, 512 < 520), m = 25 → 10 (1024 ≥ 1000).
        assertEquals(6, Multiplicity.pairsNeeded(1, 0.05));
        assertEquals(8, Multiplicity.pairsNeeded(4, 0.05));
        assertEquals(10, Multiplicity.pairsNeeded(13, 0.05));
        assertEquals(10, Multiplicity.pairsNeeded(25, 0.05));
        assertEquals(11, Multiplicity.pairsNeeded(26, 0.05));
    }

    @Test
    void bonferroniOnTheExampleOfTheory() {
        // THEORY.md §7.2's p = (0.01, 0.04, 0.03, 0.005), m = 4: Bonferroni min(1, 4p) = (0.04, 0.16, 0.12, 0.02)
        // (hand-computed; the same vector is in bonferroni_r.csv, from R's p.adjust).
        double[] adjusted = Multiplicity.adjust(new double[] {0.01, 0.04, 0.03, 0.005});
        double[] expected = {0.04, 0.16, 0.12, 0.02};
        for (int i = 0; i < 4; i++) {
            assertEquals(expected[i], adjusted[i], 1e-15);
        }
    }

    @Test
    void manyPairsRunWithoutEnumeration() {
        // n = 400 untied, all positive: V = n(n+1)/2 and p = 2/2⁴⁰⁰ ≈ 7.7e-121 (exactly representable).
        double[] d = new double[400];
        for (int i = 0; i < d.length; i++) {
            d[i] = 1.0 + i;
        }
        SignedRankResult r = SignedRankTest.test(d);
        assertEquals(400 * 401 / 2.0, r.statistic(), 0.0);
        assertEquals(Math.scalb(2.0, -400), r.pValue(), 0.0);
        // A symmetric sample: the null distribution is symmetric, so V at its centre gives p = 1.
        double[] s = new double[60];
        for (int i = 0; i < 30; i++) {
            s[2 * i] = i + 1.0;
            s[2 * i + 1] = -(i + 1.0);
        }
        assertEquals(1.0, SignedRankTest.test(s).pValue(), 0.0);
    }

    @Test
    void nanIsRefusedWithAMessage() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> SignedRankTest.test(new double[] {1, Double.NaN}));
        assertTrue(e.getMessage().contains("difference 1"));
    }
}
