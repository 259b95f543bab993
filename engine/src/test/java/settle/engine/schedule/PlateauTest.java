package settle.engine.schedule;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;
import settle.input.BadInputException;

/** Plateau cuts, hand-computed from the rule of {@link Plateau}: window means, gain, floor, judge. */
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
     * rate 1, cut ½, window 2, gain 10 %, floor 0.2. After each epoch with four losses at the current rate, A is the
     * mean of the older two and B of the newer two; the rate is cut when B ≥ 0.9·A.
     * Epochs 1–4: 1.0, 0.8, 0.6, 0.5 → A 0.9, B 0.55 &lt; 0.81: keep · 5: 0.48 → A 0.7, B 0.49 &lt; 0.63: keep ·
     * 6: 0.47 → A 0.55, B 0.475 &lt; 0.495: keep · 7: 0.46 → A 0.49, B 0.465 ≥ 0.441: cut to 0.5 from epoch 8 ·
     * 8–10: 0.40, 0.39, 0.38 are only three at the new rate · 11: 0.38 → A 0.395, B 0.38 ≥ 0.3555: cut to 0.25 ·
     * 12–15: 0.37 each → A = B: cut to max(0.125, 0.2) = 0.2 from epoch 16, the floor.
     */
    @Test
    void cutsWhenTheWindowMeanStopsFalling() {
        Schedule s = Schedules.parse(Maps.of("kind", "plateau", "rate", 1, "cut", 0.5, "window", 2, "gain", "10%",
                "floor", 0.2));
        double[] losses = {1.0, 0.8, 0.6, 0.5, 0.48, 0.47, 0.46, 0.40, 0.39, 0.38, 0.38, 0.37, 0.37, 0.37, 0.37, 0.37};
        assertArrayEquals(new double[] {1, 1, 1, 1, 1, 1, 1, 0.5, 0.5, 0.5, 0.5, 0.25, 0.25, 0.25, 0.25, 0.2},
                run(s, losses, null), EXACT);
    }

    /**
     * One noisy epoch does not decide: window 2, gain 0 %. Losses 1.0, 0.8, 0.9, 0.7: a best-so-far rule would see
     * 0.9 fail to improve on 0.8, but the windows compare 0.9 with 0.8 (A) and B = 0.8 &lt; 0.9: keep; 5: 0.65 → A
     * 0.85, B 0.675: keep.
     */
    @Test
    void aNoisyEpochDoesNotCut() {
        Schedule s = Schedules.parse(Maps.of("kind", "plateau", "rate", 1, "window", 2, "gain", "0%"));
        assertArrayEquals(new double[] {1, 1, 1, 1, 1, 1}, run(s, new double[] {1.0, 0.8, 0.9, 0.7, 0.65, 0.6},
                null), EXACT);
    }

    /** judge: holdout reads the holdout loss: train keeps falling, holdout is flat → window 1 cuts after epoch 2. */
    @Test
    void judgesTheHoldoutLoss() {
        Schedule s = Schedules.parse(Maps.of("kind", "plateau", "rate", 1, "window", 1, "judge", "holdout"));
        double[] train = {1.0, 0.9, 0.8};
        double[] holdout = {1.0, 1.0, 1.0};
        assertArrayEquals(new double[] {1, 1, 0.5}, run(s, train, holdout), EXACT);
        Schedule t = Schedules.parse(Maps.of("kind", "plateau", "rate", 1, "window", 1));
        assertArrayEquals(new double[] {1, 1, 1}, run(t, train, holdout), EXACT);
    }

    /** The defaults: cut ½ (halving), window 5, gain 1 %, floor 0, judge train. */
    @Test
    void defaultsAndKeysThatAreNotPlateaus() {
        Plateau p = (Plateau) Schedules.parse(Maps.of("kind", "plateau", "rate", 0.3));
        assertEquals(new Plateau(0.3, 0.5, 5, 1.0, 0.0, Plateau.Judge.TRAIN, Warmup.NONE), p);
        BadInputException stall = assertThrows(BadInputException.class,
                () -> Schedules.parse(Maps.of("kind", "plateau", "rate", 0.3, "stall", 3)));
        assertEquals("plateau: 'stall' is not a key of plateau; it compares the mean judged loss of two consecutive"
                + " windows of 'window' epochs and judges a new rate only on its own epochs (keys: rate, cut, window,"
                + " gain, floor, judge)", stall.getMessage());
        BadInputException absolute = assertThrows(BadInputException.class,
                () -> Schedules.parse(Maps.of("kind", "plateau", "rate", 0.3, "gain", 0.1)));
        assertEquals("gain", absolute.key());
        assertEquals(true, absolute.getMessage().contains("a percentage in [0%, 100%) such as 1%"),
                absolute.getMessage());
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
        Schedule s = Schedules.parse(Maps.of("kind", "plateau", "rate", 1, "window", 1));
        RateDriver a = s.start(new RunShape(3, 1));
        a.rate(1, 1);
        a.epochEnded(1, 1.0, Double.NaN);
        a.rate(2, 2);
        a.epochEnded(2, 1.0, Double.NaN);
        assertEquals(0.5, a.rate(3, 3), EXACT);
        assertEquals(1, s.start(new RunShape(3, 1)).rate(1, 1), EXACT);
    }
}
