package settle.reports;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import settle.reports.metrics.TailCloud;
import settle.reports.format.Study;
import settle.reports.format.StudyReader;

/**
 * The tail cloud's principal axes and projections ({@link TailCloud}) on snapshots laid out by hand along the
 * coordinate axes, so the pooled covariance is diagonal and its eigenvectors are the coordinate vectors; and the
 * reasons it is not drawn.
 */
class TailCloudTest {

    private static final double TIGHT = 1e-12;

    @TempDir
    Path dir;

    /** Sets a replicate's snapshots, P = 3 values per row. */
    private static void snapshots(SyntheticStudy.Rep r, double[]... rows) {
        r.snapshotRows = rows.length;
        r.snapshots = new double[rows.length * 3];
        for (int i = 0; i < rows.length; i++) {
            System.arraycopy(rows[i], 0, r.snapshots, 3 * i, 3);
        }
    }

    /**
     * Arm "wide": (±2, 0, 0) and (0, ±1, 0); arm "narrow": (±1, 0, 0) and (0, ±0.5, 0) and a row with a NaN, which is
     * left out. Pooled mean 0; variance (divisor 8) 10/8 = 1.25 along the first coordinate, 2.5/8 = 0.3125 along the
     * second, 0 along the third; shares 1.25/1.5625 = 80 % and 20 %.
     */
    @Test
    void axesAreThePooledPrincipalDirections() throws Exception {
        SyntheticStudy s = new SyntheticStudy();
        List<SyntheticStudy.Rep> wide = s.arm("wide", false, 2);
        List<SyntheticStudy.Rep> narrow = s.arm("narrow", false, 2);
        s.tailRadius(wide, 0.1, 0.2);
        s.tailRadius(narrow, 0.1, 0.2);
        snapshots(wide.get(0), new double[] {2, 0, 0}, new double[] {-2, 0, 0});
        snapshots(wide.get(1), new double[] {0, 1, 0}, new double[] {0, -1, 0});
        snapshots(narrow.get(0), new double[] {1, 0, 0}, new double[] {-1, 0, 0});
        snapshots(narrow.get(1), new double[] {0, 0.5, 0}, new double[] {0, -0.5, 0}, new double[] {Double.NaN, 0, 0});
        Study study = StudyReader.read(s.write(dir.resolve("cloud")));
        assertNull(TailCloud.skipReason(study));
        TailCloud c = TailCloud.of(study);
        assertTrue(c.available());
        assertArrayEquals(new double[] {0, 0, 0}, c.centre(), TIGHT);
        assertArrayEquals(new double[] {1, 0, 0}, c.first(), TIGHT, "signed so its largest component is positive");
        assertArrayEquals(new double[] {0, 1, 0}, c.second(), TIGHT);
        assertEquals(80, c.firstShare(), 1e-9);
        assertEquals(20, c.secondShare(), 1e-9);
        assertEquals(4, c.points().get(0).length);
        assertEquals(4, c.points().get(1).length, "the row with a NaN is left out");
        assertArrayEquals(new double[] {-2, 0}, c.points().get(0)[1], TIGHT);
        assertArrayEquals(new double[] {0, -0.5}, c.points().get(1)[3], TIGHT);
        assertArrayEquals(new double[] {0, 0}, c.star(), TIGHT, "θ* (the fixture's zeros) projected");
    }

    @Test
    void saysWhyItIsNotDrawn() throws Exception {
        SyntheticStudy none = new SyntheticStudy();
        none.tailRadius(none.arm("a", false, 2), 0.1, 0.2);
        assertEquals("no replicate recorded tail snapshots",
                TailCloud.skipReason(StudyReader.read(none.write(dir.resolve("none")))));

        SyntheticStudy big = new SyntheticStudy();
        List<String> features = new ArrayList<>();
        for (int j = 0; j < 200; j++) {
            features.add("x" + j);
        }
        big.featureNames = features;
        big.tailRadius(big.arm("a", false, 2), 0.1, 0.2);
        assertEquals("the model has 201 parameters; the tail cloud is drawn for models of up to 200",
                TailCloud.skipReason(StudyReader.read(big.write(dir.resolve("big")))));

        SyntheticStudy one = new SyntheticStudy();
        List<SyntheticStudy.Rep> reps = one.arm("a", false, 2);
        one.tailRadius(reps, 0.1, 0.2);
        snapshots(reps.get(0), new double[] {1, 2, 3}, new double[] {Double.NaN, 0, 0});
        TailCloud c = TailCloud.of(StudyReader.read(one.write(dir.resolve("one"))));
        assertFalse(c.available());
        assertEquals("fewer than two tail snapshots have finite values", c.unavailable());
    }
}
