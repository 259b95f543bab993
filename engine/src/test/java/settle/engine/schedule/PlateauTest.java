package settle.engine.schedule;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** Plateau cuts, hand-computed from the rule in DESIGN.md's table, with stall, rest, floor, gain and judge. */
class PlateauTest {

    private static final double EXACT = 1e-15;

    /** Feeds train losses (holdout {@code holdout[i]}, or NaN) and returns the rate used in each epoch. */
    private static double[] run(Schedule s, double[] train, double[] holdout) {
        RateDriver d = s.start(new RunShape(train.length, 1));
        double[] rates = new double[train.length];
        for (int i = 0; i < train.length; i++) {
            int epoch = i + 1;
            rates[i] = d.rate(epoch, epoch);
            d.epochEnded(epoch, train[i], holdout == null ? Double.NaN : holdout[i]);
        }
        return rates;
    }

    /**
     * rate 1, cut ½, stall 2, rest 1, floor 0.2, gain 0. Epoch: loss → what happens.
     * 1: 1.0 improves (best ∞) · 2: 1.0 no (1 without) · 3: 1.0 no (2 → cut to 0.5 from epoch 4, rest 1) ·
     * 4: 0.9 rest (best 0.9) · 5: 0.95 no (1) · 6: 0.95 no (2 → cut to 0.25 from 7) · 7: rest · 8: no (1) ·
     * 9: no (2 → max(0.125, 0.2) = 0.2 from 10: the floor) · 10: rest · 11: 0.2.
     */
    @Test
    void cutsWithStallRestAndFloor() {
        Schedule s = Schedules.parse(Maps.of("kind", "plateau", "rate", 1, "cut", 0.5, "stall", 2, "rest", 1,
                "floor", 0.2));
        double[] losses = {1.0, 1.0, 1.0, 0.9, 0.95, 0.95, 0.95, 0.95, 0.95, 0.95, 0.95};
        assertArrayEquals(new double[] {1, 1, 1, 0.5, 0.5, 0.5, 0.25, 0.25, 0.25, 0.2, 0.2}, run(s, losses, null), EXACT);
    }

    /**
     * best is the lowest loss so far, not the loss at the last improvement. gain 10 %, stall 2: 1: 1.0 improves,
     * best 1.0 · 2: 0.95 is not below 1.0·0.9 = 0.9 (1 without), best 0.95 · 3: 0.89 is not below 0.95·0.9 =
     * 0.855 (2 → cut to 0.5 from epoch 4), although it is below 0.9.
     */
    @Test
    void bestIsTheLowestLossSoFar() {
        Schedule s = Schedules.parse(Maps.of("kind", "plateau", "rate", 1, "stall", 2, "gain", "10%"));
        assertArrayEquals(new double[] {1, 1, 1, 0.5}, run(s, new double[] {1.0, 0.95, 0.89, 0.89}, null), EXACT);
    }

    /**
     * An absolute gain 0.1, stall 1: 1: 1.0 improves · 2: 0.85 is below 1.0 − 0.1 = 0.9: improves · 3: 0.8 is
     * not below 0.85 − 0.1 = 0.75 → cut to 0.5 from epoch 4.
     */
    @Test
    void absoluteGain() {
        Schedule s = Schedules.parse(Maps.of("kind", "plateau", "rate", 1, "stall", 1, "gain", 0.1));
        assertArrayEquals(new double[] {1, 1, 1, 0.5}, run(s, new double[] {1.0, 0.85, 0.8, 0.8}, null), EXACT);
    }

    /** judge: holdout reads the holdout loss: train keeps falling, holdout is flat → stall 1 cuts after epoch 2. */
    @Test
    void judgesTheHoldoutLoss() {
        Schedule s = Schedules.parse(Maps.of("kind", "plateau", "rate", 1, "stall", 1, "judge", "holdout"));
        double[] train = {1.0, 0.9, 0.8};
        double[] holdout = {1.0, 1.0, 1.0};
        assertArrayEquals(new double[] {1, 1, 0.5}, run(s, train, holdout), EXACT);
        Schedule t = Schedules.parse(Maps.of("kind", "plateau", "rate", 1, "stall", 1));
        assertArrayEquals(new double[] {1, 1, 1}, run(t, train, holdout), EXACT);
    }

    /**
     * Warmup multiplies the current rate: warmup {updates: 2} with 2 updates per epoch gives ½·1, 1 in epoch 1;
     * the preview (no losses) is the no-cut envelope 1, 1 after.
     */
    @Test
    void warmupAndEnvelope() {
        Schedule s = Schedules.parse(Maps.of("kind", "plateau", "rate", 1, "warmup", Maps.of("updates", 2)));
        assertArrayEquals(new double[] {0.5, 1, 1, 1}, s.plannedRates(new RunShape(2, 2)), EXACT);
    }

    /** Each replicate gets its own state: a second driver starts uncut. */
    @Test
    void driversAreIndependent() {
        Schedule s = Schedules.parse(Maps.of("kind", "plateau", "rate", 1, "stall", 1));
        RateDriver a = s.start(new RunShape(3, 1));
        a.rate(1, 1);
        a.epochEnded(1, 1.0, Double.NaN);
        a.rate(2, 2);
        a.epochEnded(2, 1.0, Double.NaN);
        assertEquals(0.5, a.rate(3, 3), EXACT);
        assertEquals(1, s.start(new RunShape(3, 1)).rate(1, 1), EXACT);
    }
}
