package settle.reports.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** Quantiles, IQR, IQM and the Hodges–Lehmann estimate on hand-computed examples. */
class SummariesTest {

    private static final double TIGHT = 1e-12;

    @Test
    void typeSevenQuantiles() {
        // Hand-computed (Hyndman & Fan definition 7): sorted 1, 2, 4, 8, 16 (n = 5):
        // Q(0.25): h = 4·0.25 = 1 → x_(2) = 2; Q(0.75): h = 3 → 8; Q(0.5) = 4; Q(0.1): h = 0.4 → 1 + 0.4·1 = 1.4.
        double[] s = {1, 2, 4, 8, 16};
        assertEquals(2.0, Quantiles.type7(s, 0.25), TIGHT);
        assertEquals(8.0, Quantiles.type7(s, 0.75), TIGHT);
        assertEquals(4.0, Quantiles.type7(s, 0.5), TIGHT);
        assertEquals(1.4, Quantiles.type7(s, 0.1), TIGHT);
        // n = 4: 1, 2, 4, 8: Q(0.25): h = 0.75 → 1 + 0.75·1 = 1.75; Q(0.75): h = 2.25 → 4 + 0.25·4 = 5.
        ArmSummary a = ArmSummary.of(new double[] {8, 1, 4, 2}, new boolean[4]);
        assertEquals(1.75, a.lowerQuartile(), TIGHT);
        assertEquals(5.0, a.upperQuartile(), TIGHT);
        assertEquals(3.25, a.interquartileRange(), TIGHT);
        assertEquals(3.0, a.median(), TIGHT);
    }

    @Test
    void interquartileMeanWeighsFractionalEnds() {
        // n = 8 (multiple of 4): drop two from each end: (3 + 4 + 5 + 6)/4 = 4.5.
        assertEquals(4.5, Quantiles.interquartileMean(new double[] {1, 2, 3, 4, 5, 6, 7, 100}), TIGHT);
        // n = 9: [2.25, 6.75] → x_(3)·0.75 + x_(4..6) + x_(7)·0.75, over 4.5:
        // (5·0.75 + 7 + 9 + 11 + 13·0.75)/4.5 = 40.5/4.5 = 9.
        assertEquals(9.0, Quantiles.interquartileMean(new double[] {1, 3, 5, 7, 9, 11, 13, 15, 17}), TIGHT);
        // n = 10, values 1..9 and 50: [2.5, 7.5] → (0.5·3 + 4 + 5 + 6 + 7 + 0.5·8)/5 = 27.5/5 = 5.5.
        assertEquals(5.5, Quantiles.interquartileMean(new double[] {1, 2, 3, 4, 5, 6, 7, 8, 9, 50}), TIGHT);
        // n = 3: [0.75, 2.25] → (0.25·1 + 2 + 0.25·10)/1.5 = 4.75/1.5.
        assertEquals(4.75 / 1.5, Quantiles.interquartileMean(new double[] {1, 2, 10}), TIGHT);
        assertEquals(7.0, Quantiles.interquartileMean(new double[] {7}), TIGHT);
    }

    @Test
    void summaryLeavesOutDivergedReplicates() {
        ArmSummary a = ArmSummary.of(new double[] {3, Double.NaN, 1, 2}, new boolean[] {false, true, false, false});
        assertEquals(4, a.replicates());
        assertEquals(1, a.diverged());
        assertEquals(2.0, a.median(), TIGHT);
        ArmSummary none = ArmSummary.of(new double[] {Double.NaN}, new boolean[] {true});
        assertEquals(Double.NaN, none.median());
    }

    @Test
    void hodgesLehmannIsTheMedianOfWalshAverages() {
        // x = 1, 2, 9: Walsh averages 1, 1.5, 5, 2, 5.5, 9 → sorted 1, 1.5, 2, 5, 5.5, 9 → median (2 + 5)/2 = 3.5.
        assertEquals(3.5, HodgesLehmann.estimate(new double[] {1, 2, 9}), TIGHT);
        // x = 0, 4: averages 0, 2, 4 → 2.
        assertEquals(2.0, HodgesLehmann.estimate(new double[] {4, 0}), TIGHT);
        double[] w = HodgesLehmann.sortedWalshAverages(new double[] {1, 2, 9});
        assertEquals(6, w.length);
        assertEquals(5.5, w[4], TIGHT);
    }
}
