package settle.reports;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.metrics.DistanceCurves;
import settle.reports.metrics.EpochBands;
import settle.reports.format.Study;
import settle.reports.format.StudyReader;

/**
 * The per-epoch summaries the objective and distance charts draw, on a study written with known values (4 epochs of
 * 5 updates): the quartile bands of a series over an arm's finished replicates, and the measured and predicted mean
 * squared distance to θ*, the prediction cut before its first unstable epoch. Expected values worked out by hand.
 */
class EpochSeriesTest {

    private static final double TIGHT = 1e-15;

    @TempDir
    Path dir;

    /**
     * Arm 0 "measured": replicate 1 at distances {1, 0.5, NaN, 0.2} predicting {2, 1, 0.5, 0.25}, replicate 2 at {3,
     * 0.5, 0.4, 0.2} predicting {4, 3, 1.5, 0.75}, replicate 3 diverged. Arm 1 "unstable": replicate 1's prediction
     * unstable from update 7 (epoch 2), replicate 2 stable (1.2/e² at epoch e), replicate 3 missing.
     */
    private Study study() throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        List<SyntheticStudy.Rep> measured = s.arm("measured", false, 3);
        List<SyntheticStudy.Rep> unstable = s.arm("unstable", false, 3);
        s.tailRadius(measured, 0.1, 0.2, 0.3);
        s.tailRadius(unstable, 0.1, 0.2, 0.3);
        measured.get(0).distance = new double[] {1, 0.5, Double.NaN, 0.2};
        measured.get(0).predictedEpochs = new double[] {2, 1, 0.5, 0.25};
        measured.get(1).distance = new double[] {3, 0.5, 0.4, 0.2};
        measured.get(1).predictedEpochs = new double[] {4, 3, 1.5, 0.75};
        measured.get(2).status = "diverged";
        unstable.get(0).unstableFrom = 7;
        unstable.get(0).unstableProduct = 2.5;
        return StudyReader.read(s.write(dir.resolve("series"), "2/3"));
    }

    @Test
    void bandsAreTheQuartilesOfTheFiniteValuesOfFinishedReplicates() throws Exception {
        Study study = study();
        // Replicate 1: {1, NaN}; replicate 2: {3, 5}; replicate 3 diverged (its series is never read).
        EpochBands b = EpochBands.of(study, 0, r -> r.replicate() == 1 ? new double[] {1, Double.NaN}
                : r.replicate() == 2 ? new double[] {3, 5} : new double[] {100, 100, 100}, 0.5);
        assertEquals(2, b.epochs(), "the longest finished replicate's length");
        // Epoch 1: {1, 3} − 0.5 = {0.5, 2.5}; type 7: h = (n − 1)p = 0.25, 0.5, 0.75 → 1.0, 1.5, 2.0.
        assertEquals(1.0, b.lower()[0], TIGHT);
        assertEquals(1.5, b.median()[0], TIGHT);
        assertEquals(2.0, b.upper()[0], TIGHT);
        // Epoch 2: only replicate 2's 5 − 0.5 is finite.
        assertArrayEquals(new double[] {4.5, 4.5, 4.5}, new double[] {b.lower()[1], b.median()[1], b.upper()[1]});
        // No finite value at all: NaN in all three.
        EpochBands none = EpochBands.of(study, 0, r -> new double[] {Double.NaN}, 0);
        assertTrue(Double.isNaN(none.lower()[0]) && Double.isNaN(none.median()[0]) && Double.isNaN(none.upper()[0]));
    }

    @Test
    void distancesAreMeansOfTheFiniteSquaresAndStopBeforeTheUnstableEpoch() throws Exception {
        Study study = study();
        DistanceCurves d = DistanceCurves.of(study, 0);
        assertEquals(0, d.unstableEpoch());
        // measured: (1² + 3²)/2 = 5; (0.5² + 0.5²)/2 = 0.25; 0.4² (replicate 1 has NaN) = 0.16; 0.2² = 0.04
        assertArrayEquals(new double[] {5, 0.25, 0.16, 0.04}, d.measured(), TIGHT);
        // predicted: (2 + 4)/2, (1 + 3)/2, (0.5 + 1.5)/2, (0.25 + 0.75)/2
        assertArrayEquals(new double[] {3, 2, 1, 0.5}, d.predicted(), TIGHT);

        DistanceCurves u = DistanceCurves.of(study, 1);
        // Update 7 lies in epoch 2 (updates 6–10): the predicted curve keeps epoch 1 only, for both replicates.
        assertEquals(2, u.unstableEpoch());
        assertEquals(2, DistanceCurves.unstableEpoch(study, 1));
        assertEquals(1.2, u.predicted()[0], TIGHT);
        for (int e = 1; e < 4; e++) {
            assertTrue(Double.isNaN(u.predicted()[e]), "epoch " + (e + 1) + " is not predicted");
        }
        // measured: the fixture's default distance 1/e at epoch e, squared
        assertArrayEquals(new double[] {1, 0.25, 1.0 / 9, 1.0 / 16}, u.measured(), TIGHT);
    }
}
