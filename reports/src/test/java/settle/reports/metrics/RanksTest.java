package settle.reports.metrics;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

import org.junit.jupiter.api.Test;

/** Competition ranks from the smallest, as the a-priori section shows them; values worked out by hand. */
class RanksTest {

    @Test
    void tiesShareARankAndTheNextIsSkipped() {
        // 0.1 has no value below it (1); 0.2 has 0.1 (2); each 0.3 has 0.1 and 0.2 below (3, shared); NaN and ∞
        // have no rank (0) and are not counted below anyone.
        assertArrayEquals(new int[] {3, 1, 3, 0, 2, 0},
                Ranks.of(new double[] {0.3, 0.1, 0.3, Double.NaN, 0.2, Double.POSITIVE_INFINITY}));
        assertArrayEquals(new int[] {2, 2, 1}, Ranks.of(new double[] {2, 2, 1}));
        assertArrayEquals(new int[0], Ranks.of(new double[0]));
    }
}
