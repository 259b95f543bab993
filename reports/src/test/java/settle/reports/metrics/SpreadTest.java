package settle.reports.metrics;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** Seed spread, prediction spread and disagreement on tiny cases computed by hand (arithmetic in comments). */
class SpreadTest {

    private static final double TIGHT = 1e-12;

    // θ1 = (0, 0, 0), θ2 = (2, 0, 0), θ3 = (1, 3, 0): mean (1, 1, 0); squared deviations 2, 2, 4.
    private static final double[][] THETA = {{0, 0, 0}, {2, 0, 0}, {1, 3, 0}};

    @Test
    void seedSpreadByHand() {
        double[] g = Spread.centredGram(THETA, 1.0);
        // (2 + 2 + 4)/3 = 8/3
        assertEquals(8.0 / 3.0, Spread.meanSquaredDeviation(g, new int[] {1, 1, 1}), TIGHT);
        // Resample {θ1, θ1, θ2}: mean (2/3, 0, 0); deviations² 4/9, 4/9, 16/9 → (24/9)/3 = 8/9.
        assertEquals(8.0 / 9.0, Spread.meanSquaredDeviation(g, new int[] {2, 1, 0}), TIGHT);
        // One replicate drawn three times: no spread.
        assertEquals(0.0, Spread.meanSquaredDeviation(g, new int[] {0, 0, 3}), TIGHT);
    }

    // Two test rows, two classes; rows are (p(class 0), p(class 1)).
    private static final double[][] PROBABILITIES = {
        {0.8, 0.2, 0.4, 0.6},
        {0.6, 0.4, 0.5, 0.5},
        {0.3, 0.7, 0.1, 0.9},
    };

    @Test
    void predictionSpreadByHand() {
        double[] g = Spread.centredGram(PROBABILITIES, 2);
        // Replicates 1, 2: row 1 class 0 values 0.8, 0.6 → Var (divisor 2) 0.01, class 1 the same: 0.02;
        // row 2: 0.4, 0.5 → 0.0025 twice: 0.005. Mean over the two rows: 0.0125.
        assertEquals(0.0125, Spread.meanSquaredDeviation(g, new int[] {1, 1, 0}), TIGHT);
        // All three: row 1 class 0 in tenths 8, 6, 3: Σx² − (Σx)²/3 = 109 − 289/3 = 38/3 → Var 38/900;
        // row 2: 4, 5, 1: 42 − 100/3 = 26/3 → 26/900. Each twice (two classes), mean over 2 rows:
        // (38 + 26)/900 = 64/900.
        assertEquals(64.0 / 900.0, Spread.meanSquaredDeviation(g, new int[] {1, 1, 1}), TIGHT);
    }

    @Test
    void disagreementByHand() {
        // argmax (ties to the lower class): replicate 1 → (0, 1); replicate 2 → (0, 0) (row 2 ties 0.5/0.5);
        // replicate 3 → (1, 1). Pairs: (1,2) differ on row 2: 1/2; (1,3) on row 1: 1/2; (2,3) on both: 1.
        double[] d = Spread.disagreement(PROBABILITIES, 2);
        assertArrayEquals(new double[] {0, 0.5, 0.5, 0.5, 0, 1, 0.5, 1, 0}, d, TIGHT);
        // Mean over the three pairs: (0.5 + 0.5 + 1)/3 = 2/3.
        assertEquals(2.0 / 3.0, Spread.meanPairwise(d, new int[] {1, 1, 1}), TIGHT);
        // Resample {1, 1, 2}: position pairs (1,1') 0, (1,2) 0.5, (1',2) 0.5 → 1/3.
        assertEquals(1.0 / 3.0, Spread.meanPairwise(d, new int[] {2, 1, 0}), TIGHT);
    }

    @Test
    void gaugeCentresBiasesAndWeights() {
        // Softmax, d = 1 feature, K = 3 classes: (w0, w1, w2, b0, b1, b2).
        double[] theta = {1, 2, 3, 4, 5, 9};
        // Biases 4, 5, 9 (mean 6) → −2, −1, 3; weights 1, 2, 3 (mean 2) → −1, 0, 1 when λ = 0.
        assertArrayEquals(new double[] {1, 2, 3, -2, -1, 3}, Gauge.of(6, 1, 3, 1, false).project(theta), TIGHT);
        assertArrayEquals(new double[] {-1, 0, 1, -2, -1, 3}, Gauge.of(6, 1, 3, 2, false).project(theta), TIGHT);
        // Unknown dimension (curvature skipped): biases always, weights when the manifest's model_l2 is 0.
        assertArrayEquals(new double[] {-1, 0, 1, -2, -1, 3}, Gauge.of(6, 1, 3, -1, true).project(theta), TIGHT);
        // Binary logistic (d + 1 parameters) has no gauge.
        assertArrayEquals(new double[] {1, 2}, Gauge.of(2, 1, 2, 0, true).project(new double[] {1, 2}), TIGHT);
    }
}
