package settle.engine.theory;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class LastIterateBoundTest {

    private static final double TOLERANCE = 1e-12;

    @Test
    void handComputedValues() {
        // T = 1, η = (2), D = 1, G = 1: (1 + 4)/(2·2) = 1.25, no second term
        assertEquals(1.25, LastIterateBound.value(new double[] {2}, 1, 1), TOLERANCE);
        // T = 2, η = (1, 1), D = 2, G = 1: first (4 + 2)/(2·2) = 1.5;
        // second ½ · [η_1/η_2 · (η_1² + η_2²)/(η_1 + η_2)] = ½ · 1 · 2/2 = 0.5; total 2.0
        assertEquals(2.0, LastIterateBound.value(new double[] {1, 1}, 2, 1), TOLERANCE);
        // T = 3, η = (1, 0.5, 0.25), D = 1, G = 2: Σ = 1.75, Σ² = 1.3125;
        // first (1 + 4·1.3125)/(3.5) = 6.25/3.5 = 1.7857142857142858;
        // k = 1: 1/0.75 · 1.3125/1.75 = 1.3333333 · 0.75 = 1.0; k = 2: 0.5/0.25 · 0.3125/0.75 = 2 · 0.4166667 = 0.8333333;
        // second (4/2) · (1.0 + 0.8333333) = 3.6666667; total 5.4523809523809526
        assertEquals(6.25 / 3.5 + 2 * (1.0 + 2 * 0.3125 / 0.75), LastIterateBound.value(new double[] {1, 0.5, 0.25}, 1, 2),
                TOLERANCE);
    }

    @Test
    void constantRatesHaveTheLogarithmicTermAndLinearDecayBeatsThemAtTheirBest() {
        // constant η over T: second term = (G²/2) Σ_{k=1..T−1} η/((T−k)η) · η = (G²η/2) H_{T−1} (harmonic number)
        int t = 1000;
        double eta = 0.01;
        double[] constant = new double[t];
        java.util.Arrays.fill(constant, eta);
        double harmonic = 0;
        for (int k = 1; k < t; k++) {
            harmonic += 1.0 / k;
        }
        double expected = (1 + t * eta * eta) / (2 * t * eta) + 0.5 * eta * harmonic;
        assertEquals(expected, LastIterateBound.value(constant, 1, 1), 1e-9);
        // linear decay to zero with its best peak rate beats constant with its best rate (Defazio et al. 2023)
        double bestConstant = Double.MAX_VALUE;
        double bestLinear = Double.MAX_VALUE;
        for (int i = -40; i <= 0; i++) {
            double peak = Math.pow(10, i / 10.0);
            double[] linear = new double[t];
            for (int k = 0; k < t; k++) {
                linear[k] = peak * (1 - k / (double) t);
            }
            java.util.Arrays.fill(constant, peak);
            bestConstant = Math.min(bestConstant, LastIterateBound.value(constant, 1, 1));
            bestLinear = Math.min(bestLinear, LastIterateBound.value(linear, 1, 1));
        }
        assertTrue(bestLinear < bestConstant, bestLinear + " vs " + bestConstant);
    }

    @Test
    void badRatesAreRefused() {
        assertThrows(IllegalArgumentException.class, () -> LastIterateBound.value(new double[0], 1, 1));
        assertThrows(IllegalArgumentException.class, () -> LastIterateBound.value(new double[] {0, 0}, 1, 1));
        assertThrows(IllegalArgumentException.class, () -> LastIterateBound.value(new double[] {1, Double.NaN}, 1, 1));
    }
}
