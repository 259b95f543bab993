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
        // Pairs: ½‖θ1 − θ2‖² = ½·4 = 2, ½‖θ1 − θ3‖² = ½·10 = 5, ½‖θ2 − θ3‖² = ½·10 = 5: mean 12/3 = 4, which is the
        // sum of squared deviations 8 over S − 1 = 2.
        double[] h = Spread.halfSquaredDistances(THETA, 1.0);
        assertArrayEquals(new double[] {0, 2, 5, 2, 0, 5, 5, 5, 0}, h, TIGHT);
        Spread.PairMeans m = Spread.pairMeans(h, 3);
        assertEquals(4.0, m.value(), TIGHT);
        // Leaving θ1 out leaves the pair (2, 3): 5; θ2 out: (1, 3), 5; θ3 out: (1, 2), 2.
        assertArrayEquals(new double[] {5, 5, 2}, m.leaveOneOut(), TIGHT);
        // Two replicates: one pair, no leave-one-out.
        assertEquals(0, Spread.pairMeans(new double[] {0, 2, 2, 0}, 2).leaveOneOut().length);
    }

    // Two test rows, two classes; rows are (p(class 0), p(class 1)).
    private static final double[][] PROBABILITIES = {
        {0.8, 0.2, 0.4, 0.6},
        {0.6, 0.4, 0.5, 0.5},
        {0.3, 0.7, 0.1, 0.9},
    };

    @Test
    void predictionSpreadByHand() {
        // Pair (1, 2): squared differences 0.04 + 0.04 on row 1, 0.01 + 0.01 on row 2: 0.10, halved, over 2 rows:
        // 0.025. Pair (1, 3): 0.25·2 + 0.09·2 = 0.68 → 0.17. Pair (2, 3): 0.09·2 + 0.16·2 = 0.5 → 0.125.
        // Mean (0.025 + 0.17 + 0.125)/3 = 0.32/3 (= Σ_classes Var with divisor S − 1, averaged over the rows).
        Spread.PairMeans m = Spread.pairMeans(Spread.halfSquaredDistances(PROBABILITIES, 2), 3);
        assertEquals(0.32 / 3, m.value(), TIGHT);
        assertArrayEquals(new double[] {0.125, 0.17, 0.025}, m.leaveOneOut(), TIGHT);
    }

    @Test
    void disagreementByHand() {
        // argmax (ties to the lower class): replicate 1 → (0, 1); replicate 2 → (0, 0) (row 2 ties 0.5/0.5);
        // replicate 3 → (1, 1). Pairs: (1,2) differ on row 2: 1/2; (1,3) on row 1: 1/2; (2,3) on both: 1.
        double[] d = Spread.disagreement(PROBABILITIES, 2);
        assertArrayEquals(new double[] {0, 0.5, 0.5, 0.5, 0, 1, 0.5, 1, 0}, d, TIGHT);
        // Mean over the three pairs: (0.5 + 0.5 + 1)/3 = 2/3; leaving one out keeps one pair each.
        Spread.PairMeans m = Spread.pairMeans(d, 3);
        assertEquals(2.0 / 3.0, m.value(), TIGHT);
        assertArrayEquals(new double[] {1, 0.5, 0.5}, m.leaveOneOut(), TIGHT);
    }

    @Test
    void gaugeCentresBiasesAndWeights() {
        // Softmax, d = 1 feature, K = 3 classes: (w0, w1, w2, b0, b1, b2).
        double[] theta = {1, 2, 3, 4, 5, 9};
        // Biases 4, 5, 9 (mean 6) → −2, −1, 3; weights 1, 2, 3 (mean 2) → −1, 0, 1 when λ = 0.
        assertArrayEquals(new double[] {1, 2, 3, -2, -1, 3}, GaugeProjection.of(6, 1, 3, 1, false).project(theta), TIGHT);
        assertArrayEquals(new double[] {-1, 0, 1, -2, -1, 3}, GaugeProjection.of(6, 1, 3, 2, false).project(theta), TIGHT);
        // Unknown dimension (curvature skipped): biases always, weights when the manifest's model_l2 is 0.
        assertArrayEquals(new double[] {-1, 0, 1, -2, -1, 3}, GaugeProjection.of(6, 1, 3, -1, true).project(theta), TIGHT);
        // Binary logistic (d + 1 parameters) has no gauge.
        assertArrayEquals(new double[] {1, 2}, GaugeProjection.of(2, 1, 2, 0, true).project(new double[] {1, 2}), TIGHT);
    }
}
