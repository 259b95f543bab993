package settle.engine.schedule;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Map;
import org.junit.jupiter.api.Test;

class ReciprocalTest {

    private static final double EXACT = 1e-15;

    /**
     * The trade's standard worked example of 1/t decay (common practice): α0 = 0.2, decay 1, per epoch gives
     * 0.1, 0.0667, 0.05, 0.04 in epochs 1–4: 0.2/(1+1), 0.2/(1+2), 0.2/(1+3), 0.2/(1+4).
     */
    @Test
    void standardExampleInEpochsOneToFour() {
        Schedule s = Schedules.parse(Map.of("kind", "reciprocal", "rate", 0.2, "decay", 1));
        double[] r = s.plannedRates(new RunShape(4, 3));
        double[] expected = {0.1, 0.1, 0.1, 0.2 / 3, 0.2 / 3, 0.2 / 3, 0.05, 0.05, 0.05, 0.04, 0.04, 0.04};
        assertArrayEquals(expected, r, EXACT);
        assertEquals(0.0667, r[3], 5e-5);
    }
}
