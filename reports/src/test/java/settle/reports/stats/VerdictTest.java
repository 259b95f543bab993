package settle.reports.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/** Pairing, diverged replicates, zero differences, the floor, Holm across arms, and the sentences. */
class VerdictTest {

    private static final double INF = Double.POSITIVE_INFINITY;
    private static final double TIGHT = 1e-12;

    private static final double[] BASE = {1.0, 1.2, 0.9, 1.1, 1.3, 0.8, 1.05, 0.95};

    @Test
    void divergedArmReplicatesTakeTheLargestPositiveRanks() {
        double[] arm = {0.5, 0.0, 0.45, 0.6, 0.0, 0.4, 0.5, 0.7};
        boolean[] div = {false, true, false, false, true, false, false, false};
        boolean[] baseDiv = {false, false, false, false, true, false, false, false};
        Comparison c = Verdict.compare("tail radius", Direction.LOWER_IS_BETTER, new ArmValues("b", BASE, baseDiv),
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
        Comparison c = Verdict.compare("test accuracy", Direction.HIGHER_IS_BETTER, ArmValues.finite("b", base),
                List.of(new ArmValues("a", arm, new boolean[] {false, true, false, false})),
                VerdictOptions.defaults()).get(0);
        // Finite log-ratios positive (ranks 1..3), the diverged arm replicate −∞ (rank 4): V = 6.
        assertEquals(6.0, c.statistic(), 0.0);
        assertEquals(0.75, c.probabilityBetter(), TIGHT);
    }

    @Test
    void floorAndZeroDifferences() {
        double[] base = {1e-3, -1e-15, 2e-3, 0.0, 3e-3, 1e-3};
        double[] arm = {5e-4, 0.0, 1e-3, 2e-16, 1e-3, 1e-3};
        VerdictOptions o = VerdictOptions.defaults();
        Comparison c = Verdict.compare("final gap", Direction.LOWER_IS_BETTER, ArmValues.finite("b", base),
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
    void holmAcrossArmsAndTheSmallestReachableP() {
        double[] better = new double[BASE.length];
        double[] same = new double[BASE.length];
        for (int k = 0; k < BASE.length; k++) {
            better[k] = BASE[k] * 0.5 * (1 + 0.01 * k);
            same[k] = BASE[k] * (k % 2 == 0 ? 1.1 + 0.01 * k : 0.9 - 0.01 * k);
        }
        List<Comparison> cs = Verdict.compare("tail radius", Direction.LOWER_IS_BETTER, ArmValues.finite("b", BASE),
                List.of(ArmValues.finite("half", better), ArmValues.finite("same", same)), VerdictOptions.defaults());
        double[] holm = Holm.adjust(new double[] {cs.get(0).p(), cs.get(1).p()});
        assertEquals(holm[0], cs.get(0).pAdjusted(), 0.0);
        assertEquals(holm[1], cs.get(1).pAdjusted(), 0.0);
        // All 8 ratios below 1: p = 2/2⁸; two arms: smallest adjusted p = 2·2/2⁸ = 0.015625.
        assertEquals(0.0078125, cs.get(0).p(), 0.0);
        assertEquals(0.015625, cs.get(0).smallestAdjustedP(), 0.0);
        assertEquals(7, cs.get(0).pairsNeeded(), "2ⁿ ≥ 80 → n = 7");
        assertEquals(1.0, cs.get(0).probabilityBetter(), 0.0);
        assertTrue(VerdictSentence.render(cs.get(0)).startsWith("reduces tail radius by 4"),
                VerdictSentence.render(cs.get(0)));
        assertTrue(VerdictSentence.render(cs.get(0)).contains("adjusted p = 0.016"), VerdictSentence.render(cs.get(0)));
    }

    private static Comparison made(double estimate, double low, double high, double p, int arms, int pairs,
            int needed, double statistic) {
        return new Comparison("tail radius", "a", "b", Direction.LOWER_IS_BETTER, pairs, 0, 0, 0, 0, 1e-12, 0, pairs,
                statistic, p, p, arms, pairs, estimate, new Interval(low, high, 0.95),
                new Interval(low, high, 0.95), 0.9, Holm.smallestAdjustedP(arms, pairs), needed, 0.05);
    }

    @Test
    void sentencesReadAsDesigned() {
        Comparison reduce = made(Math.log(0.36), Math.log(0.30), Math.log(0.42), 0.002, 1, 10, 6, 2);
        assertEquals("reduces tail radius by 64 % (95 % CI 58–70 %, p = 0.002)", VerdictSentence.render(reduce));
        Comparison increase = made(Math.log(1.12), Math.log(1.05), Math.log(1.2), 0.0312, 1, 10, 6, 50);
        assertEquals("increases tail radius by 12 % (95 % CI 5–20 %, p = 0.031)", VerdictSentence.render(increase));
        Comparison few = made(Math.log(0.9), Math.log(0.7), Math.log(1.1), 0.3, 20, 6, 10, 8);
        assertEquals("no difference detected with 6 replicates (10 needed to detect one at this number of arms);"
                + " on the 6 finite pairs the change is −10 % (95 % CI −30 to +10 %)", VerdictSentence.render(few));
        Comparison enough = made(Math.log(0.97), Math.log(0.9), Math.log(1.04), 0.41, 1, 12, 6, 30);
        assertEquals("no difference detected with 12 replicates (change −3 %, 95 % CI −10 to +4 %, p = 0.41)",
                VerdictSentence.render(enough));
    }

    @Test
    void sentenceNamesWhatWasSetAside() {
        double[] arm = {0.5, 0.0, 0.45, 0.6, 0.0, 0.4, 0.5, 0.7, 0.3};
        double[] base = {1.0, 1.2, 0.9, 1.1, 1.3, 0.8, 1.05, 0.95, 1.0};
        boolean[] div = {false, true, false, false, true, false, false, false, false};
        boolean[] baseDiv = {false, false, false, false, true, false, false, false, false};
        Comparison c = Verdict.compare("tail radius", Direction.LOWER_IS_BETTER, new ArmValues("b", base, baseDiv),
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
                () -> Verdict.compare("tail radius", Direction.LOWER_IS_BETTER, ArmValues.finite("b", BASE),
                        List.of(ArmValues.finite("short", new double[] {1.0})), VerdictOptions.defaults()));
        assertTrue(f.getMessage().contains("arm 'short' has 1 replicates but the baseline 'b' has 8"), f.getMessage());
    }
}
