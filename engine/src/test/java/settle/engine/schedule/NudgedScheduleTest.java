package settle.engine.schedule;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import org.junit.jupiter.api.Test;

class NudgedScheduleTest {

    private static final RunShape SHAPE = new RunShape(6, 4);

    @Test
    void withoutNudgesTheRatesAreTheBaseSchedulesBitForBit() {
        for (Schedule base : List.of(
                Schedules.parse(Maps.of("kind", "reciprocal", "rate", 0.3, "decay", 0.1, "per", "update")),
                Schedules.parse(Maps.of("kind", "cosine", "rate", 0.2, "warmup", Maps.of("updates", 5))),
                Schedules.parse(Maps.of("kind", "constant", "rate", 0.1)))) {
            assertArrayEquals(base.plannedRates(SHAPE), new NudgedSchedule(base, new NudgeLog()).plannedRates(SHAPE),
                    base.describe());
        }
    }

    @Test
    void aNudgeMultipliesEveryUpdateFromItsEpochOnAndNudgesCompose() {
        Schedule base = Schedules.parse(Maps.of("kind", "reciprocal", "rate", 0.3, "decay", 0.1, "per", "update"));
        NudgeLog log = new NudgeLog();
        log.append(new NudgeLog.Entry(3, 0.5, "halve"));
        log.append(new NudgeLog.Entry(5, 0.1, ""));
        double[] plain = base.plannedRates(SHAPE);
        double[] nudged = new NudgedSchedule(base, log).plannedRates(SHAPE);
        for (int u = 1; u <= SHAPE.totalUpdates(); u++) {
            int epoch = SHAPE.epochOf(u);
            // epochs 1–2 × 1; 3–4 × 0.5; 5–6 × 0.5 · 0.1 (the product taken in log order)
            double m = epoch >= 5 ? 0.5 * 0.1 : epoch >= 3 ? 0.5 : 1.0;
            assertEquals(plain[u - 1] * m, nudged[u - 1], 0.0, "update " + u);
        }
        assertEquals(0.5 * 0.1, log.multiplier(6), 0.0);
        assertEquals(1.0, log.multiplier(2), 0.0);
    }

    @Test
    void aNudgeIsPositiveFiniteAndFromEpochOneOn() {
        assertThrows(IllegalArgumentException.class, () -> new NudgeLog.Entry(2, 0, ""));
        assertThrows(IllegalArgumentException.class, () -> new NudgeLog.Entry(2, Double.NaN, ""));
        assertThrows(IllegalArgumentException.class, () -> new NudgeLog.Entry(2, Double.POSITIVE_INFINITY, ""));
        assertThrows(IllegalArgumentException.class, () -> new NudgeLog.Entry(0, 0.5, ""));
    }
}
