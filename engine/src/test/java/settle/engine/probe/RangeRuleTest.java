package settle.engine.probe;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * settle's reading of a sweep on synthetic curves, every expected value worked out by hand from the rule's
 * definition (values chosen exact in binary so that the half-fall comparison has no rounding).
 */
class RangeRuleTest {

    private static final double[] RATES = {0.125, 0.25, 0.5, 1, 2, 4};

    @Test
    void upperEndIsTheRateOfTheLowestObjectiveAndLowerEndTheFirstRateWithHalfTheFall() {
        // F0 = 1; lowest 0.25 after the update at rate 2 (index 4): fall 0.75, half of it 0.375, first reached
        // where 1 − F ≥ 0.375, i.e. F ≤ 0.625: index 2 (F = 0.5, rate 0.5); index 1 (F = 0.75) falls short.
        RangeRule.Range r = RangeRule.of(RATES, new double[] {0.875, 0.75, 0.5, 0.375, 0.25, 1.5}, 1.0);
        assertEquals(2.0, r.upper(), 0.0);
        assertEquals(0.5, r.lower(), 0.0);
        assertEquals(0.25, r.lowest(), 0.0);
        assertEquals(0.75, r.fall(), 0.0);
        assertEquals(4, r.best());
        assertTrue(r.exists());
    }

    @Test
    void exactlyHalfTheFallCounts() {
        // fall 1 − 0.25 = 0.75, half 0.375; index 1 has 1 − 0.625 = 0.375 exactly
        RangeRule.Range r = RangeRule.of(new double[] {1, 2, 4}, new double[] {0.875, 0.625, 0.25}, 1.0);
        assertEquals(2.0, r.lower(), 0.0);
        assertEquals(4.0, r.upper(), 0.0);
    }

    @Test
    void onATieTheFirstLowestCountsAndTheEndsMayMeet() {
        // lowest 0.5 at indices 1 and 2: the first (rate 0.25); fall 0.5, half 0.25 needs F ≤ 0.75: index 1 too
        RangeRule.Range r = RangeRule.of(new double[] {0.125, 0.25, 0.5, 1}, new double[] {0.875, 0.5, 0.5, 0.625},
                1.0);
        assertEquals(0.25, r.upper(), 0.0);
        assertEquals(0.25, r.lower(), 0.0);
        assertEquals(1, r.best());
    }

    @Test
    void aSweepThatNeverWentBelowItsStartHasNoRange() {
        RangeRule.Range r = RangeRule.of(new double[] {0.5, 1}, new double[] {1.0, 1.25}, 1.0);
        assertFalse(r.exists());
        assertTrue(Double.isNaN(r.lower()));
        assertEquals(0.0, r.fall(), 0.0);
        assertEquals(1.0, r.lowest(), 0.0);

        RangeRule.Range empty = RangeRule.of(new double[0], new double[0], 1.0);
        assertFalse(empty.exists());
        assertEquals(-1, empty.best());
    }

    @Test
    void anObjectiveThatIsNotFiniteIsNeverTheLowest() {
        // the NaN and −∞ (a broken evaluation) are skipped: lowest 0.75 at rate 0.125, fall 0.25
        RangeRule.Range r = RangeRule.of(new double[] {0.125, 0.25, 0.5}, new double[] {0.75, Double.NaN,
            Double.NEGATIVE_INFINITY}, 1.0);
        assertEquals(0.125, r.upper(), 0.0);
        assertEquals(0.125, r.lower(), 0.0);
        assertEquals(0.25, r.fall(), 0.0);
    }

    @Test
    void onRandomCurvesTheLowerEndNeverExceedsTheUpperAndTheUpperEndHoldsTheMinimum() {
        SplittableRandom random = new SplittableRandom(17);
        for (int trial = 0; trial < 500; trial++) {
            int n = 1 + random.nextInt(40);
            double[] rates = new double[n];
            double[] f = new double[n];
            for (int t = 0; t < n; t++) {
                rates[t] = Math.pow(1.2, t) * 1e-3;
                f[t] = random.nextDouble(0, 2);
            }
            RangeRule.Range r = RangeRule.of(rates, f, 1.0);
            double min = java.util.Arrays.stream(f).min().orElseThrow();
            assertEquals(min < 1.0, r.exists());
            if (r.exists()) {
                assertTrue(r.lower() <= r.upper());
                assertEquals(min, f[r.best()], 0.0);
                assertEquals(rates[r.best()], r.upper(), 0.0);
                int lower = java.util.Arrays.binarySearch(rates, r.lower());
                assertTrue(1.0 - f[lower] >= 0.5 * (1.0 - min));
                for (int t = 0; t < lower; t++) {
                    assertTrue(1.0 - f[t] < 0.5 * (1.0 - min), "an earlier rate already had half the fall");
                }
            }
        }
    }

    @Test
    void refusesMismatchedArraysAndAStartThatIsNotFinite() {
        assertThrows(IllegalArgumentException.class, () -> RangeRule.of(new double[2], new double[1], 1.0));
        assertThrows(IllegalArgumentException.class, () -> RangeRule.of(new double[1], new double[1], Double.NaN));
    }
}
