package settle.engine.schedule;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.junit.jupiter.api.Test;

/** Hand-computed rates at boundary points (first update, seams, last update, warmup end, restarts) of every kind. */
class ScheduleValuesTest {

    /** Closed forms evaluated in double: a few ulps. */
    private static final double EXACT = 1e-15;

    /**
     * The trade's standard worked example of 1/t decay (common practice): α0 = 0.2, decay 1, per epoch gives
     * 0.1, 0.0667, 0.05, 0.04 in epochs 1–4: 0.2/(1+1), 0.2/(1+2), 0.2/(1+3), 0.2/(1+4).
     */
    @Test
    void reciprocalStandardExample() {
        double[] r = Maps.rates(4, 3, "kind", "reciprocal", "rate", 0.2, "decay", 1);
        double[] expected = {0.1, 0.1, 0.1, 0.2 / 3, 0.2 / 3, 0.2 / 3, 0.05, 0.05, 0.05, 0.04, 0.04, 0.04};
        assertArrayEquals(expected, r, EXACT);
        assertEquals(0.0667, r[3], 5e-5);
    }

    /** Constant 0.2, warmup 4 updates: t/4 · 0.2 = 0.05, 0.1, 0.15, then 0.2 from update 4 (warmup end) on. */
    @Test
    void constantWithWarmup() {
        double[] r = Maps.rates(3, 2, "kind", "constant", "rate", 0.2, "warmup", Maps.of("updates", 4));
        assertArrayEquals(new double[] {0.05, 0.1, 0.15000000000000002, 0.2, 0.2, 0.2}, r, EXACT);
    }

    /**
     * Reciprocal per update, 0.2/(1 + 0.5·u): first update 0.2/1.5 = 0.1333…, last (u = 6) 0.2/4 = 0.05.
     * Per epoch with warmup {epochs: 1} over 2 updates per epoch: u1 = 0.2/2 · 1/2 = 0.05, u2 = 0.1 · 2/2 = 0.1
     * (warmup end), u3 = 0.2/3 (epoch 2: the curve is not shifted by the warmup).
     */
    @Test
    void reciprocalPerUpdateAndWarmup() {
        double[] r = Maps.rates(2, 3, "kind", "reciprocal", "rate", 0.2, "decay", 0.5, "per", "update");
        assertEquals(0.2 / 1.5, r[0], EXACT);
        assertEquals(0.05, r[5], EXACT);
        double[] w = Maps.rates(3, 2, "kind", "reciprocal", "rate", 0.2, "decay", 1, "warmup", Maps.of("epochs", 1));
        assertEquals(0.05, w[0], EXACT);
        assertEquals(0.1, w[1], EXACT);
        assertEquals(0.2 / 3, w[2], EXACT);
    }

    /** Power-law 0.1·n^(−½): per update u1 = 0.1, u2 = 0.1/√2, u4 = 0.1/2 = 0.05; per epoch epoch 3 = 0.1/√3. */
    @Test
    void powerLaw() {
        double[] r = Maps.rates(1, 4, "kind", "power-law", "rate", 0.1, "power", 0.5, "per", "update");
        assertEquals(0.1, r[0], EXACT);
        assertEquals(0.1 / Math.sqrt(2), r[1], EXACT);
        assertEquals(0.05, r[3], EXACT);
        double[] e = Maps.rates(3, 2, "kind", "power-law", "rate", 0.1, "power", 0.5);
        assertEquals(0.1 / Math.sqrt(3), e[5], EXACT);
    }

    /** Exponential 0.1·0.5^u per update: 0.05, 0.025, 0.0125 (rate itself is never used). */
    @Test
    void exponentialPerUpdate() {
        assertArrayEquals(new double[] {0.05, 0.025, 0.0125},
                Maps.rates(1, 3, "kind", "exponential", "rate", 0.1, "base", 0.5, "per", "update"), EXACT);
    }

    /**
     * Stepped every 2, cut ½ from 0.4: j = ⌊(e − 1)/2⌋ = 0, 0, 1, 1, 2 → 0.4, 0.4, 0.2 (seam at epoch 3), 0.2,
     * 0.1. After [1, 3], cut 0.1 from 1: j = #{a < e} = 0, 1, 1, 2, 2 → 1, 0.1, 0.1, 0.01, 0.01.
     */
    @Test
    void stepped() {
        assertArrayEquals(new double[] {0.4, 0.4, 0.2, 0.2, 0.1},
                Maps.rates(5, 1, "kind", "stepped", "rate", 0.4, "cut", 0.5, "every", 2), EXACT);
        assertArrayEquals(new double[] {1, 0.1, 0.1, 0.010000000000000002, 0.010000000000000002},
                Maps.rates(5, 1, "kind", "stepped", "rate", 1, "cut", 0.1, "after", List.of(1, 3)), EXACT);
    }

    /** Piecewise [[1, 0.1], [3, 0.05], [4, 0]]: 0.1, 0.1, 0.05 (seam at 3), 0 (seam at 4), 0 (last). */
    @Test
    void piecewise() {
        assertArrayEquals(new double[] {0.1, 0.1, 0.05, 0, 0}, Maps.rates(5, 1, "kind", "piecewise", "points",
                List.of(List.of(1, 0.1), List.of(3, 0.05), List.of(4, 0))), EXACT);
    }

    /**
     * Cosine 0.1 → 0 per update over 2 epochs × 2 updates: p = (u − 1)/4 = 0, ¼, ½, ¾ → 0.1,
     * 0.05·(1 + cos(π/4)) = 0.05·1.7071068 = 0.0853553, 0.05, 0.05·(1 − 0.7071068) = 0.0146447. Per epoch
     * p = (e − 1)/2 = 0, ½ → 0.1, 0.1, 0.05, 0.05.
     */
    @Test
    void cosineOneCycle() {
        double[] u = Maps.rates(2, 2, "kind", "cosine", "rate", 0.1, "per", "update");
        assertArrayEquals(new double[] {0.1, 0.05 * (1 + Math.sqrt(0.5)), 0.05, 0.05 * (1 - Math.sqrt(0.5))}, u, EXACT);
        assertArrayEquals(new double[] {0.1, 0.1, 0.05, 0.05}, Maps.rates(2, 2, "kind", "cosine", "rate", 0.1), EXACT);
    }

    /**
     * Restarts every 2 epochs (growth 1), 0.1 → 0.02: x = e − 1 = 0, 1, 2, 3, 4 → p = 0, ½, 0, ½, 0 →
     * 0.1, 0.02 + 0.08·½ = 0.06, 0.1 (restart at epoch 3), 0.06, 0.1.
     */
    @Test
    void cosineRestarts() {
        assertArrayEquals(new double[] {0.1, 0.06, 0.1, 0.06, 0.1}, Maps.rates(5, 1, "kind", "cosine", "rate", 0.1,
                "floor", 0.02, "restart-every", 2), EXACT);
    }

    /**
     * Restarts every 2 epochs, growth 1.5, 1 → 0: cycles [0, 2), [2, 5), [5, 9.5) epochs elapsed. x = 2 restarts
     * (1); x = 3: p = ⅓ → (1 + cos(π/3))/2 = 0.75; x = 4: p = ⅔ → 0.25; x = 5 restarts (log(2.25)/log(1.5) = 2
     * sits on the seam); x = 6: p = 1/4.5 → (1 + cos(2π/9))/2.
     */
    @Test
    void cosineGrowingCycles() {
        double[] r = Maps.rates(7, 1, "kind", "cosine", "rate", 1, "restart-every", 2, "restart-growth", 1.5);
        assertEquals(1, r[2], EXACT);
        assertEquals(0.75, r[3], 1e-15);
        assertEquals(0.25, r[4], 1e-15);
        assertEquals(1, r[5], EXACT);
        assertEquals((1 + Math.cos(2 * Math.PI / 9)) / 2, r[6], 1e-15);
    }

    /**
     * Anneal 0.1 → 0.01, power 2, per update over 4 updates: progress 0, ¼, ½, ¾ → 0.01 + 0.09·(1, 0.5625,
     * 0.25, 0.0625) = 0.1, 0.060625, 0.0325, 0.015625 (the last update stays above floor).
     */
    @Test
    void anneal() {
        assertArrayEquals(new double[] {0.1, 0.060625, 0.0325, 0.015625},
                Maps.rates(1, 4, "kind", "anneal", "rate", 0.1, "floor", 0.01, "power", 2, "per", "update"), EXACT);
    }

    /**
     * Warmup-stable-decay 0.1, decay-from ½, linear, per epoch over 4 epochs: progress 0, ¼, ½, ¾ → q = –, –,
     * 0, ½ → 0.1, 0.1, 0.1 (seam: q = 0), 0.05. Root, floor 0.02, per update over 8 updates: u5 progress ½ →
     * 0.1; u6 progress ⅝ → q = ¼, √q = ½ → 0.02 + 0.08·½ = 0.06; u8 progress ⅞ → q = ¾ → 0.02 + 0.08·(1 −
     * 0.8660254) = 0.0307180.
     */
    @Test
    void warmupStableDecay() {
        assertArrayEquals(new double[] {0.1, 0.1, 0.1, 0.05},
                Maps.rates(4, 1, "kind", "warmup-stable-decay", "rate", 0.1, "decay-from", 0.5), EXACT);
        double[] r = Maps.rates(1, 8, "kind", "warmup-stable-decay", "rate", 0.1, "decay-from", 0.5, "floor", 0.02,
                "shape", "root", "per", "update");
        assertEquals(0.1, r[4], EXACT);
        assertEquals(0.06, r[5], EXACT);
        assertEquals(0.02 + 0.08 * (1 - Math.sqrt(0.75)), r[7], EXACT);
    }

    /**
     * Formula 0.1/sqrt(epoch)·(1 − progress) over 2 epochs × 2 updates: u1 0.1·1, u2 0.1·¾ = 0.075, u3
     * 0.1/√2·½, u4 0.1/√2·¼. And update/total_updates·updates_per_epoch at u = 4: 4/4·2 = 2, with warmup
     * {updates: 2}: u1 = (1/4·2)·½ = 0.25.
     */
    @Test
    void formula() {
        assertArrayEquals(new double[] {0.1, 0.075, 0.1 / Math.sqrt(2) * 0.5, 0.1 / Math.sqrt(2) * 0.25},
                Maps.rates(2, 2, "kind", "formula", "expr", "0.1 / sqrt(epoch) * (1 - progress)"), EXACT);
        double[] r = Maps.rates(2, 2, "kind", "formula", "expr", "update / total_updates * updates_per_epoch",
                "warmup", Maps.of("updates", 2));
        assertEquals(0.25, r[0], EXACT);
        assertEquals(2, r[3], EXACT);
    }
}
