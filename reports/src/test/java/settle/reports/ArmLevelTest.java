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
import settle.reports.study.StudyReader;

/** Arm-level metrics read from a study directory: the final iterate, test probabilities, joint intervals. */
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
        // Squared deviations from the mean (1, 1, 0): 2, 2, 4 → sqrt(8/3); halved points → sqrt(8/3)/2.
        assertEquals(Math.sqrt(8.0 / 3.0), a.seedSpread(0).value(), TIGHT);
        assertEquals(Math.sqrt(8.0 / 3.0) / 2, a.seedSpread(1).value(), TIGHT);
        // Prediction spread 64/900 and disagreement 2/3: the hand computation of SpreadTest.
        assertEquals(64.0 / 900.0, a.predictionSpread(0).value(), TIGHT);
        assertEquals(2.0 / 3.0, a.disagreement(0).value(), TIGHT);
        // Identical probabilities in every replicate: no spread, no disagreement.
        assertEquals(0.0, a.predictionSpread(1).value(), TIGHT);
        assertEquals(0.0, a.disagreement(1).value(), TIGHT);
        // Joint bootstrap intervals exist, and with 3 seeds the resample drawing one seed three times gives 0.
        ArmLevel spread = a.seedSpread(0);
        assertTrue(spread.interval().isDefined());
        assertEquals(0.0, spread.interval().low(), TIGHT);
        assertTrue(spread.interval().high() <= Math.sqrt(8.0 / 3.0) * 1.5, "bounded by the largest resample spread");
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
        // wild: replicates 1 and 3 finished, θ = 0 and 4 → deviations ±2 → spread 2, from 2 replicates.
        assertEquals(2.0, x.seedSpread(1).value(), TIGHT);
        assertEquals(2, x.seedSpread(1).replicates());
        assertFalse(x.seedSpread(1).interval().isDefined());
        assertTrue(x.seedSpread(0).interval().isDefined());
    }
}
