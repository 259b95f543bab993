package settle.reports.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/** Pairing, diverged replicates, zero differences, the floor, the two scales, Bonferroni across arms, and the sentences. */
class VerdictTest {

    private static final double INF = Double.POSITIVE_INFINITY;
    private static final double TIGHT = 1e-12;

    private static final double[] BASE = {1.0, 1.2, 0.9, 1.1, 1.3, 0.8, 1.05, 0.95};

    @Test
    void divergedArmReplicatesTakeTheLargestPositiveRanks() {
        double[] arm = {0.5, 0.0, 0.45, 0.6, 0.0, 0.4, 0.5, 0.7};
        boolean[] div = {false, true, false, false, true, false, false, false};
        boolean[] baseDiv = {false, false, false, false, true, false, false, false};
        Comparison c = Verdict.compare("tail radius", Direction.LOWER_IS_BETTER, Scale.LOG_RATIO, new ArmValues("b", BASE, baseDiv),
                List.of(new ArmValues("a", arm, div)), VerdictOptions.defaults()).get(0);
        assertEquals(8, c.pairs());
        assertEquals(1, c.bothDiverged(), "replicate 5");
        assertEquals(1, c.armDiverged(), "replicate 2");
        assertEquals(0, c.baselineDiverged());
        assertEquals(6, c.effectPairs());
        assertEquals(7, c.testPairs());
        double[] d = new double[7];
        int[] finite = {0, 2, 3, 5, 6, 7};
        for (int j = 0; j < finite.length; j++) {
            d[j] = Math.log(arm[finite[j]] / BASE[finite[j]]);
        }
        d[6] = INF;
        SignedRankResult expected = SignedRankTest.test(d);
        assertEquals(expected.pValue(), c.p(), 0.0);
        // The six finite ratios are all below 1 (ranks 1..6 negative), the diverged one has rank 7, positive.
        assertEquals(7.0, c.statistic(), 0.0);
        double[] fin = java.util.Arrays.copyOf(d, 6);
        assertEquals(HodgesLehmann.estimate(fin), c.estimate(), 0.0);
        // Beats the baseline on the 6 finite pairs, loses the diverged one: 6/7.
        assertEquals(6.0 / 7.0, c.probabilityBetter(), TIGHT);
    }

    @Test
    void higherIsBetterFlipsTheSignOfADivergedReplicate() {
        double[] arm = {0.9, 0.0, 0.92, 0.91};
        double[] base = {0.8, 0.85, 0.82, 0.84};
        Comparison c = Verdict.compare("test accuracy", Direction.HIGHER_IS_BETTER, Scale.POINTS, ArmValues.finite("b", base),
                List.of(new ArmValues("a", arm, new boolean[] {false, true, false, false})),
                VerdictOptions.defaults()).get(0);
        // Finite differences positive (ranks 1..3), the diverged arm replicate −∞ (rank 4): V = 6.
        assertEquals(6.0, c.statistic(), 0.0);
        assertEquals(0.75, c.probabilityBetter(), TIGHT);
    }

    @Test
    void floorAndZeroDifferences() {
        double[] base = {1e-3, -1e-15, 2e-3, 0.0, 3e-3, 1e-3};
        double[] arm = {5e-4, 0.0, 1e-3, 2e-16, 1e-3, 1e-3};
        VerdictOptions o = VerdictOptions.defaults();
        Comparison c = Verdict.compare("final gap", Direction.LOWER_IS_BETTER, Scale.LOG_RATIO, ArmValues.finite("b", base),
                List.of(ArmValues.finite("a", arm)), o).get(0);
        // Pairs 2 and 4: both sides below 1e-12 → both raised to it → zero differences; pair 6 equal.
        assertEquals(4, c.clamped());
        assertEquals(3, c.zeroDifferences());
        assertEquals(3, c.testPairs());
        // Ties (zero differences) count ½: pairs 1, 3, 5 are wins, 2, 4, 6 ties → (3 + 1.5)/6.
        assertEquals(4.5 / 6.0, c.probabilityBetter(), TIGHT);
        assertTrue(VerdictSentence.render(c).contains("4 values below the floor 1e-12 raised to it"));
    }

    @Test
    void bonferroniAcrossArmsAdjustsThePAndTheIntervalAlike() {
        double[] better = new double[BASE.length];
        double[] same = new double[BASE.length];
        for (int k = 0; k < BASE.length; k++) {
            better[k] = BASE[k] * 0.5 * (1 + 0.01 * k);
            same[k] = BASE[k] * (k % 2 == 0 ? 1.1 + 0.01 * k : 0.9 - 0.01 * k);
        }
        List<Comparison> cs = Verdict.compare("tail radius", Direction.LOWER_IS_BETTER, Scale.LOG_RATIO,
                ArmValues.finite("b", BASE), List.of(ArmValues.finite("half", better), ArmValues.finite("same", same)),
                VerdictOptions.defaults());
        assertEquals(Math.min(1, 2 * cs.get(0).p()), cs.get(0).pAdjusted(), 0.0);
        assertEquals(Math.min(1, 2 * cs.get(1).p()), cs.get(1).pAdjusted(), 0.0);
        // All 8 ratios below 1: p = 2/2⁸; two arms: adjusted p = smallest adjusted p = 2·2/2⁸ = 0.015625.
        assertEquals(0.0078125, cs.get(0).p(), 0.0);
        assertEquals(0.015625, cs.get(0).smallestAdjustedP(), 0.0);
        assertEquals(7, cs.get(0).pairsNeeded(), "2ⁿ ≥ 80 → n = 7");
        assertEquals(0.975, cs.get(0).level(), 1e-15, "1 − 0.05/2");
        assertEquals(HodgesLehmann.exactInterval(logRatios(better), 0.975).low(), cs.get(0).exact().low(), 0.0);
        assertEquals(1.0, cs.get(0).probabilityBetter(), 0.0);
        String s = VerdictSentence.render(cs.get(0));
        assertTrue(s.startsWith("reduces tail radius by 4"), s);
        assertTrue(s.contains("(Bonferroni 97.5 % CI ") && s.contains("adjusted p = 0.016"), s);
    }

    private static double[] logRatios(double[] arm) {
        double[] d = new double[arm.length];
        for (int k = 0; k < arm.length; k++) {
            d[k] = Math.log(arm[k] / BASE[k]);
        }
        return d;
    }

    @Test
    void accuracyIsAPairedDifferenceInPercentagePoints() {
        double[] base = {0.80, 0.82, 0.79, 0.81, 0.80, 0.83, 0.78, 0.80};
        double[] arm = new double[base.length];
        double[] d = new double[base.length];
        for (int k = 0; k < d.length; k++) {
            arm[k] = base[k] + (k % 2 == 0 ? 0.01 : 0.03);
            d[k] = arm[k] - base[k];
        }
        Comparison c = Verdict.compare("test accuracy", Direction.HIGHER_IS_BETTER, Scale.POINTS,
                ArmValues.finite("b", base), List.of(ArmValues.finite("a", arm)), VerdictOptions.defaults()).get(0);
        assertEquals(HodgesLehmann.estimate(d), c.estimate(), 0.0, "the effect is on the differences, not ratios");
        assertEquals(100 * HodgesLehmann.estimate(d), c.change(), 1e-12);
        // Hand-computed: four differences of 0.01 and four of 0.03 have 10 Walsh averages 0.01, 16 of 0.02 and 10 of
        // 0.03: the estimate is their median, 0.02; qsignrank(0.025, 8) = 4 gives the 4th and 33rd of the 36, 0.01
        // and 0.03; all 8 positive: p = 2/2⁸ = 0.0078125.
        assertEquals("increases test accuracy by 2 percentage points (95 % CI 1–3 pp, p = 0.0078)",
                VerdictSentence.render(c));
    }

    private static Comparison made(double estimate, double low, double high, double p, int arms, int pairs,
            int needed, double statistic) {
        return made(estimate, low, high, p, arms, pairs, 0, needed, statistic);
    }

    private static Comparison made(double estimate, double low, double high, double p, int arms, int pairs,
            int zeros, int needed, double statistic) {
        double level = Multiplicity.level(0.95, arms);
        return new Comparison("final gap", "a", "b", Direction.LOWER_IS_BETTER, Scale.LOG_RATIO, pairs, 0, 0, 0, 0,
                1e-12, zeros, pairs - zeros, statistic, p, Math.min(1, arms * p), arms, pairs, estimate,
                new Interval(low, high, level), new Interval(low, high, level), 0.9,
                Multiplicity.smallestAdjustedP(arms, pairs - zeros), needed, 0.05, level);
    }

    @Test
    void sentencesReadAsDesigned() {
        Comparison reduce = made(Math.log(0.36), Math.log(0.30), Math.log(0.42), 0.002, 1, 10, 6, 2);
        assertEquals("reduces final gap by 64 % (95 % CI 58–70 %, p = 0.002)", VerdictSentence.render(reduce));
        Comparison increase = made(Math.log(1.12), Math.log(1.05), Math.log(1.2), 0.0312, 1, 10, 6, 50);
        assertEquals("increases final gap by 12 % (95 % CI 5–20 %, p = 0.031)", VerdictSentence.render(increase));
        Comparison few = made(Math.log(0.9), Math.log(0.7), Math.log(1.1), 0.015, 20, 6, 10, 8);
        assertEquals("no difference detected with 6 pairs (change −10 %, Bonferroni 99.7 % CI −30 to +10 %, adjusted"
                + " p = 0.3; 10 pairs needed to detect one with 20 arms)", VerdictSentence.render(few));
        Comparison enough = made(Math.log(0.97), Math.log(0.9), Math.log(1.04), 0.41, 1, 12, 6, 30);
        assertEquals("no difference detected with 12 pairs (change −3 %, 95 % CI −10 to +4 %, p = 0.41)",
                VerdictSentence.render(enough));
    }

    @Test
    void nearZeroAndNearTotalChangesPrintPlainly() {
        Comparison tiny = made(-2.9e-17, -0.01, 0.01, 0.8, 1, 10, 6, 27);
        assertEquals("no difference detected with 10 pairs (change 0 %, 95 % CI −1 to +1 %, p = 0.8)",
                VerdictSentence.render(tiny));
        Comparison total = made(Math.log(1e-6), Math.log(1e-8), Math.log(1e-4), 0.002, 1, 10, 6, 0);
        assertEquals("reduces final gap by > 99.9 % (95 % CI > 99.9–> 99.9 %, p = 0.002)", VerdictSentence.render(total));
        Comparison mostlyTied = made(0.0, 0.0, 0.0, 1.0, 1, 8, 6, 6, 1.5);
        assertEquals("no difference detected: 6 of 8 pairs tied, 2 left for the test (change 0 %, 95 % CI 0 to 0 %,"
                + " p = 1; 6 untied pairs needed to detect one)", VerdictSentence.render(mostlyTied));
    }

    @Test
    void aTestAndAnIntervalThatDisagreeClaimNothing() {
        // adjusted p above α but an interval that excludes no change: possible with diverged pairs or ties
        Comparison odd = made(Math.log(0.8), Math.log(0.7), Math.log(0.9), 0.2, 1, 10, 2, 6, 20);
        String s = VerdictSentence.render(odd);
        assertTrue(s.startsWith("no difference claimed: the test (p = 0.2) and its interval (change −20 %, 95 % CI −30"
                + " to −10 %) disagree, 2 tied pairs are dropped from the test but not from the interval"), s);
        assertTrue(!s.contains("no difference detected"), s);
    }

    @Test
    void sentenceNamesWhatWasSetAside() {
        double[] arm = {0.5, 0.0, 0.45, 0.6, 0.0, 0.4, 0.5, 0.7, 0.3};
        double[] base = {1.0, 1.2, 0.9, 1.1, 1.3, 0.8, 1.05, 0.95, 1.0};
        boolean[] div = {false, true, false, false, true, false, false, false, false};
        boolean[] baseDiv = {false, false, false, false, true, false, false, false, false};
        Comparison c = Verdict.compare("tail radius", Direction.LOWER_IS_BETTER, Scale.LOG_RATIO, new ArmValues("b", base, baseDiv),
                List.of(new ArmValues("a", arm, div)), VerdictOptions.defaults()).get(0);
        String s = VerdictSentence.render(c);
        assertTrue(s.contains("1 pair where both replicates diverged dropped"), s);
        assertTrue(s.contains("effect from 7 finite pairs, 1 with a diverged replicate set aside"), s);
    }

    @Test
    void badInputNamesTheArmAndReplicate() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> ArmValues.finite("cosine", new double[] {1.0, Double.NaN}));
        assertTrue(e.getMessage().contains("arm 'cosine', replicate 2"), e.getMessage());
        IllegalArgumentException f = assertThrows(IllegalArgumentException.class,
                () -> Verdict.compare("tail radius", Direction.LOWER_IS_BETTER, Scale.LOG_RATIO, ArmValues.finite("b", BASE),
                        List.of(ArmValues.finite("short", new double[] {1.0})), VerdictOptions.defaults()));
        assertTrue(f.getMessage().contains("arm 'short' has 1 replicates but the baseline 'b' has 8"), f.getMessage());
    }
}
