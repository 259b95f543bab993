package settle.reports;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.metrics.ArmLevel;
import settle.reports.metrics.StudyAnalysis;
import settle.reports.format.StudyReader;

/** Arm-level metrics read from a study directory: the final iterate, test probabilities, jackknife intervals. */
class ArmLevelTest {

    private static final double TIGHT = 1e-12;

    @TempDir
    Path dir;

    @Test
    void seedSpreadUsesTheTailMeanOfAveragedArmsAndSpreadsComeFromTheTestProbabilities() throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        List<SyntheticStudy.Rep> plain = s.arm("constant", false, 3);
        List<SyntheticStudy.Rep> averaged = s.arm("averaged", true, 3);
        s.tailRadius(plain, 1, 1, 1);
        s.tailRadius(averaged, 1, 1, 1);
        double[][] theta = {{0, 0, 0}, {2, 0, 0}, {1, 3, 0}};
        double[][] probabilities = {{0.8, 0.2, 0.4, 0.6}, {0.6, 0.4, 0.5, 0.5}, {0.3, 0.7, 0.1, 0.9}};
        for (int k = 0; k < 3; k++) {
            plain.get(k).last = theta[k];
            plain.get(k).probabilities = probabilities[k];
            // The averaged arm's θ_T are far apart but its tail means are the points above halved.
            averaged.get(k).last = new double[] {100 * k, -50 * k, 7};
            averaged.get(k).tailMean = new double[] {theta[k][0] / 2, theta[k][1] / 2, theta[k][2] / 2};
            averaged.get(k).probabilities = probabilities[0];
        }
        StudyAnalysis a = StudyAnalysis.of(StudyReader.read(s.write(dir.resolve("s"))));
        // Squared deviations from the mean (1, 1, 0): 2, 2, 4, over S − 1 = 2 → sqrt(4) = 2; halved points → 1.
        assertEquals(2.0, a.seedSpread(0).value(), TIGHT);
        assertEquals(1.0, a.seedSpread(1).value(), TIGHT);
        // Prediction spread 0.32/3 and disagreement 2/3: the hand computation of SpreadTest. The files hold the
        // probabilities as float32 (each within 2⁻²⁴ of its size), which moves the spread by at most 2⁻²³ (README,
        // "Study directory"); the disagreement comes from the exact predicted classes.
        assertEquals(0.32 / 3, a.predictionSpread(0).value(), 0x1p-23);
        assertEquals(2.0 / 3.0, a.disagreement(0).value(), TIGHT);
        // Identical probabilities in every replicate: no spread, no disagreement.
        assertEquals(0.0, a.predictionSpread(1).value(), TIGHT);
        assertEquals(0.0, a.disagreement(1).value(), TIGHT);
        // Jackknife on the log scale: leave-one-out spreads sqrt(5), sqrt(5), sqrt(2); with t₂ (0.975) =
        // 4.302652729749462 (R 4.2.2, qt(0.975, 2)) the interval is 2·exp(±t·SE) around the estimate.
        double[] logs = {0.5 * Math.log(5), 0.5 * Math.log(5), 0.5 * Math.log(2)};
        double mean = (logs[0] + logs[1] + logs[2]) / 3;
        double ss = 0;
        for (double v : logs) {
            ss += (v - mean) * (v - mean);
        }
        double se = Math.sqrt(2.0 / 3.0 * ss);
        ArmLevel spread = a.seedSpread(0);
        assertEquals(2 * Math.exp(-4.302652729749462 * se), spread.interval().low(), 1e-9);
        assertEquals(2 * Math.exp(4.302652729749462 * se), spread.interval().high(), 1e-9);
        assertTrue(spread.interval().low() < spread.value() && spread.value() < spread.interval().high());
        assertFalse(a.predictionSpread(1).interval().isDefined(), "a spread of zero has no interval");
    }

    @Test
    void anArmWithADivergedReplicateGetsNoInterval() throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        List<SyntheticStudy.Rep> a = s.arm("constant", false, 3);
        List<SyntheticStudy.Rep> b = s.arm("wild", false, 3);
        s.tailRadius(a, 1, 1, 1);
        s.tailRadius(b, 1, 1, 1);
        b.get(1).status = "diverged";
        for (int k = 0; k < 3; k++) {
            a.get(k).last = new double[] {k, 0, 0};
            b.get(k).last = new double[] {2 * k, 0, 0};
        }
        StudyAnalysis x = StudyAnalysis.of(StudyReader.read(s.write(dir.resolve("s"))));
        // wild: replicates 1 and 3 finished, θ = 0 and 4 → ½‖0 − 4‖² = 8 → spread sqrt(8), from 2 replicates: too
        // few for a leave-one-out interval.
        assertEquals(Math.sqrt(8.0), x.seedSpread(1).value(), TIGHT);
        assertEquals(2, x.seedSpread(1).replicates());
        assertFalse(x.seedSpread(1).interval().isDefined());
        assertTrue(x.seedSpread(0).interval().isDefined());
    }
}
