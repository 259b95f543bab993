package settle.datasets;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.junit.jupiter.api.Test;

class StandardiserTest {

    private static final double TOLERANCE = 1e-15;

    @Test
    void populationStandardDeviationOfTrainingOnly() {
        // feature a: 1, 2, 3, 6 -> mean 3, squared deviations 4 + 1 + 0 + 9 = 14, divisor N = 4: sd = sqrt(3.5)
        // feature k: 0.1 in every row -> constant, scale 1
        Dataset train = new Dataset("train", new double[] {1, 0.1, 2, 0.1, 3, 0.1, 6, 0.1}, new int[] {0, 1, 0, 1},
                List.of("a", "k"), List.of("n", "p"));
        Standardiser s = Standardiser.fit(train);
        assertArrayEquals(new double[] {3.0, 0.1}, s.means(), TOLERANCE);
        assertArrayEquals(new double[] {Math.sqrt(3.5), 1.0}, s.scales(), TOLERANCE);
        assertEquals(List.of("feature 'k' is constant in the training split; it carries nothing after standardisation"),
                s.warnings());
        Dataset z = s.apply(train);
        assertEquals(-2 / Math.sqrt(3.5), z.feature(0, 0), TOLERANCE);
        assertEquals(0.0, z.feature(3, 1), 0.0); // the constant column becomes exactly zero
        // a test row is transformed with the training parameters, not its own
        Dataset test = new Dataset("test", new double[] {10, 0.2, 20, 0.2}, new int[] {0, 1}, List.of("a", "k"),
                List.of("n", "p"));
        Dataset zt = s.apply(test);
        assertEquals((10 - 3) / Math.sqrt(3.5), zt.feature(0, 0), TOLERANCE);
        assertEquals(0.2 - 0.1, zt.feature(1, 1), TOLERANCE);
    }

    @Test
    void constantWarningsForAWholeFile() {
        Dataset d = new Dataset("f.csv", new double[] {5, 1, 5, 2}, new int[] {0, 1}, List.of("c", "v"),
                List.of("n", "p"));
        assertEquals(List.of("feature 'c' is constant in f.csv; it carries nothing after standardisation"),
                Standardiser.constantFeatureWarnings(d, "f.csv"));
    }
}
