package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.metrics.ArmPick;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.stats.Comparison;
import settle.reports.format.Metric;
import settle.reports.format.StudyReader;

/**
 * The verdict's pick ({@link ArmPick}) on studies written with known final gaps: the arm with the smallest median
 * among those that end detectably closer to the minimum than the baseline, never an arm whose lower median the test
 * does not back, and none when no arm is detected.
 */
class ArmPickTest {

    private static final double[] BASE = {1.0, 1.2, 0.9, 1.1, 1.3, 0.8, 1.05, 0.95};

    @TempDir
    Path dir;

    /** @return BASE scaled by factor[k % factor.length] at replicate k, over the first n replicates */
    private static double[] scaled(int n, double... factor) {
        double[] out = new double[n];
        for (int k = 0; k < n; k++) {
            out[k] = BASE[k] * factor[k % factor.length];
        }
        return out;
    }

    /**
     * Arms: constant (the baseline); noisy, 0.1 × the baseline on even replicates and 1.05 × on odd ones (the
     * smallest median, 0.485 with 8 replicates, but four small positive log-ratios against four large negative ones);
     * mild, 0.6 × everywhere; larger, 2 × everywhere.
     */
    private StudyAnalysis analysis(int n) throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        s.finalGap(s.arm("constant", false, n), scaled(n, 1));
        s.finalGap(s.arm("noisy", false, n), scaled(n, 0.1, 1.05));
        s.finalGap(s.arm("mild", false, n), scaled(n, 0.6));
        s.finalGap(s.arm("larger", false, n), scaled(n, 2));
        return StudyAnalysis.of(StudyReader.read(s.write(dir.resolve("n" + n))));
    }

    @Test
    void theDetectedArmWithTheSmallestMedianIsPicked() throws Exception {
        StudyAnalysis a = analysis(8);
        // The premises, from the exact signed-rank test with Bonferroni over m = 3 arms: mild has 8 negative log-ratios
        // (p = 2/2⁸, adjusted 3·p = 0.023 ≤ 0.05); noisy's four positive ones take ranks 1–4 (V = 10: 40 of the 2⁸
        // sign patterns have V ≤ 10, so p = 80/256 = 0.31);
        // larger is detected, in the baseline's favour.
        Comparison noisy = a.comparison(Metric.FINAL_GAP, 1);
        Comparison mild = a.comparison(Metric.FINAL_GAP, 2);
        Comparison larger = a.comparison(Metric.FINAL_GAP, 3);
        assertFalse(noisy.detected());
        assertTrue(mild.detected() && !mild.armLarger());
        assertTrue(larger.detected() && larger.armLarger());
        ArmPick pick = ArmPick.of(a);
        assertEquals(2, pick.arm(), "mild: detected; noisy's lower median is not backed by the test");
        assertEquals(ArmPick.Reason.CLOSEST_OF_THE_DETECTED, pick.reason());
        assertEquals(1, pick.lowest(), "noisy has the lowest median over every arm");
    }

    @Test
    void noArmIsPickedWhenNoneIsDetected() throws Exception {
        // With 3 replicates the smallest adjusted p is 3 · 2/2³ = 0.75: nothing can be detected.
        ArmPick pick = ArmPick.of(analysis(3));
        assertFalse(pick.picked());
        assertEquals(-1, pick.arm());
        assertEquals(ArmPick.Reason.NONE_DETECTED, pick.reason());
        // Medians over replicates 1–3: constant 1.0, noisy {0.1, 1.26, 0.09} → 0.1, mild 0.6, larger 2.0.
        assertEquals(1, pick.lowest());
    }

    @Test
    void tiesGoToTheFirstArmAndTheLowestCountsTheBaseline() throws Exception {
        StudyAnalysis a = analysis(8);
        Comparison mild = a.comparison(Metric.FINAL_GAP, 2);
        // Two detected arms with the same median: the first in arm order wins.
        ArmPick tie = ArmPick.choose(new Comparison[] {null, mild, mild}, new double[] {1, 0.5, 0.5});
        assertEquals(1, tie.arm());
        // No comparison at all: the baseline itself may hold the lowest median.
        ArmPick none = ArmPick.choose(new Comparison[] {null, null}, new double[] {0.2, 0.3});
        assertEquals(0, none.lowest());
        assertFalse(none.picked());
        assertThrows(IllegalArgumentException.class, () -> ArmPick.choose(new Comparison[1], new double[2]));
    }
}
