package settle.engine.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

class MlpTest {

    /** Hand-computed values are written to double precision. */
    private static final double HAND = 1e-15;
    /** Rounding of sums of a few dozen terms of size ~1. */
    private static final double ROUNDING = 1e-12;
    /** Every hidden pre-activation at a checked point is at least this far from the ReLU kink at 0. */
    private static final double KINK_MARGIN = 1e-3;
    /** Random points per configuration (the issue asks for at least 3). */
    private static final int POINTS = 4;

    /**
     * A deliberately plain MLP forward pass written from the definition (per row, per unit, no shared
     * buffers) to cross-check the optimised kernel and to read the hidden pre-activations.
     *
     * @param pre receives every hidden pre-activation, in order (row, layer, unit), or null
     * @return Σ_r loss_r
     */
    static double naiveLossSum(int[] sizes, Activation act, double[] theta, double[] x, int[] y, int n, double[] pre) {
        int layers = sizes.length - 1;
        double total = 0;
        int p = 0;
        for (int r = 0; r < n; r++) {
            double[] a = new double[sizes[0]];
            System.arraycopy(x, r * sizes[0], a, 0, sizes[0]);
            int offset = 0;
            for (int l = 1; l <= layers; l++) {
                double[] z = new double[sizes[l]];
                int biases = offset + sizes[l] * sizes[l - 1];
                for (int j = 0; j < sizes[l]; j++) {
                    double s = theta[biases + j];
                    for (int i = 0; i < sizes[l - 1]; i++) {
                        s += theta[offset + j * sizes[l - 1] + i] * a[i];
                    }
                    z[j] = s;
                }
                offset = biases + sizes[l];
                if (l < layers) {
                    for (int j = 0; j < z.length; j++) {
                        if (pre != null) {
                            pre[p++] = z[j];
                        }
                        z[j] = act == Activation.RELU ? Math.max(0, z[j]) : Math.tanh(z[j]);
                    }
                }
                a = z;
            }
            double max = Double.NEGATIVE_INFINITY;
            for (double v : a) {
                max = Math.max(max, v);
            }
            double sum = 0;
            for (double v : a) {
                sum += Math.exp(v - max);
            }
            total += max + Math.log(sum) - a[y[r]];
        }
        return total;
    }

    private static int hiddenUnits(int[] sizes) {
        int h = 0;
        for (int l = 1; l < sizes.length - 1; l++) {
            h += sizes[l];
        }
        return h;
    }

    /** @return true when every hidden pre-activation is at least KINK_MARGIN from 0 */
    private static boolean awayFromKinks(int[] sizes, double[] theta, double[] x, int[] y, int n) {
        double[] pre = new double[n * hiddenUnits(sizes)];
        naiveLossSum(sizes, Activation.RELU, theta, x, y, n, pre);
        for (double z : pre) {
            if (Math.abs(z) < KINK_MARGIN) {
                return false;
            }
        }
        return true;
    }

    /** Asserts that no ±STEP perturbation of one parameter flips the sign of any hidden pre-activation. */
    private static void assertNoKinkCrossed(int[] sizes, double[] theta, double[] x, int[] y, int n) {
        double[] base = new double[n * hiddenUnits(sizes)];
        double[] moved = new double[base.length];
        naiveLossSum(sizes, Activation.RELU, theta, x, y, n, base);
        for (int j = 0; j < theta.length; j++) {
            double saved = theta[j];
            for (double sign : new double[] {1, -1}) {
                theta[j] = saved + sign * FiniteDifferences.STEP;
                naiveLossSum(sizes, Activation.RELU, theta, x, y, n, moved);
                for (int u = 0; u < base.length; u++) {
                    assertEquals(base[u] > 0, moved[u] > 0, "perturbing θ[" + j + "] crosses a ReLU kink");
                }
            }
            theta[j] = saved;
        }
    }

    @Test
    void gradientMatchesFiniteDifferences() {
        // ReLU is not differentiable at 0: each random point is redrawn (from the same seeded stream, so the
        // test is deterministic) until every hidden pre-activation of the batch is ≥ 1e-3 from 0, well beyond
        // what a 1e-5 perturbation of one parameter moves it (about 1e-5 times an input of order 1); and, so
        // that this is not an assumption, the sign pattern of every hidden pre-activation is checked unchanged
        // under each of the 2P perturbations the difference quotient makes.
        SplittableRandom rng = new SplittableRandom(21);
        int[][] shapes = {{3, 5, 2}, {4, 6, 5, 3}};
        for (Activation act : Activation.values()) {
            for (int[] sizes : shapes) {
                int[] hidden = java.util.Arrays.copyOfRange(sizes, 1, sizes.length - 1);
                int d = sizes[0];
                int k = sizes[sizes.length - 1];
                for (double lambda : new double[] {0.0, 0.2}) {
                    Mlp model = new Mlp(d, hidden, act, k, lambda);
                    for (int n : new int[] {1, 8}) {
                        for (int p = 0; p < POINTS; p++) {
                            double[] x = FiniteDifferences.features(rng, n, d);
                            int[] y = FiniteDifferences.labels(rng, n, k);
                            double[] theta;
                            do {
                                theta = FiniteDifferences.point(rng, model.parameterCount(), 0.8);
                            } while (act == Activation.RELU && !awayFromKinks(sizes, theta, x, y, n));
                            if (act == Activation.RELU) {
                                assertNoKinkCrossed(sizes, theta, x, y, n);
                            }
                            String label = model.describe() + " λ=" + lambda + " n=" + n + " point " + p;
                            FiniteDifferences.assertGradientMatches(model, theta, x, y, n, label);
                            assertEquals(naiveLossSum(sizes, act, theta, x, y, n, null),
                                    model.lossSum(theta, x, y, n, model.workspace(n)), ROUNDING * n, label);
                        }
                    }
                }
            }
        }
    }

    @Test
    void zeroParametersGiveLogK() {
        // θ = 0: every hidden unit outputs act(0) = 0 and every logit is 0, so p = 1/K and the mean
        // cross-entropy is log K: log 2 = 0.6931471805599453, log 4 = 1.3862943611198906.
        SplittableRandom rng = new SplittableRandom(22);
        double[] x = FiniteDifferences.features(rng, 5, 3);
        Mlp two = new Mlp(3, new int[] {4}, Activation.TANH, 2, 0.1);
        assertEquals(0.6931471805599453, two.lossSum(new double[two.parameterCount()], x,
                FiniteDifferences.labels(rng, 5, 2), 5, two.workspace(5)) / 5, HAND);
        Mlp four = new Mlp(3, new int[] {4, 2}, Activation.RELU, 4, 0.1);
        assertEquals(1.3862943611198906, four.lossSum(new double[four.parameterCount()], x,
                FiniteDifferences.labels(rng, 5, 4), 5, four.workspace(5)) / 5, HAND);
    }

    @Test
    void lossByHand() {
        // 1 input, 1 hidden unit, 2 classes. θ = (W1 = 2, b1 = −1, W2 = (1, −1), b2 = (0, 0)), x = 1.
        // ReLU: h = max(0, 2·1 − 1) = 1; z = (1, −1); y = 1: log(e + e^−1) − (−1)
        //       = log(2.718281828459045 + 0.36787944117144233) + 1 = log 3.0861612696304874 + 1
        //       = 1.1269280110429725 + 1 = 2.1269280110429722.
        double[] theta = {2.0, -1.0, 1.0, -1.0, 0.0, 0.0};
        Mlp relu = new Mlp(1, new int[] {1}, Activation.RELU, 2, 0.0);
        assertEquals(2.1269280110429722,
                relu.lossSum(theta, new double[] {1.0}, new int[] {1}, 1, relu.workspace(1)), 2 * HAND);
        // tanh: h = tanh 1 = 0.7615941559557649; z = (h, −h); y = 0: log(e^h + e^−h) − h = log(1 + e^−2h)
        //       = log1p(e^−1.5231883119115298) = log1p(0.2180156756969391) = 0.19722303923521484.
        Mlp tanh = new Mlp(1, new int[] {1}, Activation.TANH, 2, 0.0);
        assertEquals(0.19722303923521484,
                tanh.lossSum(theta, new double[] {1.0}, new int[] {0}, 1, tanh.workspace(1)), HAND);
        double[] p = new double[2];
        tanh.probabilities(theta, new double[] {1.0}, 1, p, tanh.workspace(1));
        // p_1 = 1 / (1 + e^{2h}) = 1 / (1 + 4.58682613900703) = 0.1789925039940001 (σ(−2h))
        assertArrayEquals(new double[] {1 - 0.1789925039940001, 0.1789925039940001}, p, 1e-15);
    }

    @Test
    void parameterOrderIsLayerByLayerWeightsThenBiases() {
        Mlp model = new Mlp(3, new int[] {4, 2}, Activation.RELU, 5, 1.0);
        // layer 1: 4×3 weights at 0, 4 biases at 12; layer 2: 2×4 at 16, biases at 24; output 5×2 at 26,
        // biases at 36; 41 parameters.
        assertEquals(41, model.parameterCount());
        assertEquals(0, model.weightOffset(1));
        assertEquals(12, model.biasOffset(1));
        assertEquals(16, model.weightOffset(2));
        assertEquals(24, model.biasOffset(2));
        assertEquals(26, model.weightOffset(3));
        assertEquals(36, model.biasOffset(3));
        for (int i = 0; i < 41; i++) {
            boolean bias = (i >= 12 && i < 16) || (i >= 24 && i < 26) || i >= 36;
            assertEquals(!bias, model.penalised(i), "index " + i);
        }
        assertFalse(model.convex());
        // Row j of W1 is unit j's incoming weights: setting only W1[1][2] (index 1·3 + 2 = 5) and x = e_2 makes
        // hidden unit 1 (and no other) non-zero.
        double[] theta = new double[41];
        theta[5] = 1.0;
        theta[16 + 0 * 4 + 1] = 1.0; // W2[0][1]: layer-2 unit 0 reads hidden unit 1
        theta[26 + 3 * 2 + 0] = 2.0; // W3[3][0]: class 3 reads layer-2 unit 0
        double[] p = new double[5];
        model.probabilities(theta, new double[] {0, 0, 1}, 1, p, model.workspace(1));
        // logits (0, 0, 0, 2, 0): p_3 = e² / (4 + e²)
        double e2 = Math.exp(2);
        assertEquals(e2 / (4 + e2), p[3], 1e-15);
    }

    @Test
    void outputGaugeIsFlat() {
        SplittableRandom rng = new SplittableRandom(23);
        int n = 7;
        double[] x = FiniteDifferences.features(rng, n, 3);
        for (double lambda : new double[] {0.0, 0.1}) {
            Mlp model = new Mlp(3, new int[] {4}, Activation.TANH, 3, lambda);
            int[] y = FiniteDifferences.labels(rng, n, 3);
            assertTrue(model.hasGauge(), "the output softmax has a gauge");
            double[] theta = FiniteDifferences.point(rng, model.parameterCount(), 1.0);
            Model.Workspace ws = model.workspace(n);
            double[] gradient = new double[model.parameterCount()];
            double loss = model.addGradientSum(theta, x, y, n, gradient, ws);
            int b = model.biasOffset(2);
            assertEquals(0.0, gradient[b] + gradient[b + 1] + gradient[b + 2], ROUNDING * n);
            double[] shifted = theta.clone();
            for (int c = 0; c < 3; c++) {
                shifted[b + c] += -1.75;
            }
            assertEquals(loss, model.lossSum(shifted, x, y, n, ws), ROUNDING * loss);
            model.removeGauge(shifted);
            assertEquals(0.0, shifted[b] + shifted[b + 1] + shifted[b + 2], ROUNDING);
            assertEquals(loss, model.lossSum(shifted, x, y, n, ws), ROUNDING * loss);
            if (lambda == 0) {
                int w = model.weightOffset(2);
                for (int i = 0; i < 4; i++) {
                    assertEquals(0.0, shifted[w + i] + shifted[w + 4 + i] + shifted[w + 8 + i], ROUNDING);
                }
            } else {
                assertEquals(theta[model.weightOffset(2)], shifted[model.weightOffset(2)], 0.0);
            }
            for (int i = 0; i < model.weightOffset(2); i++) {
                assertEquals(theta[i], shifted[i], 0.0, "hidden layer untouched");
            }
        }
    }

    @Test
    void gradientSumIsAddedAndLossAgreesWithProbabilities() {
        SplittableRandom rng = new SplittableRandom(24);
        Mlp model = new Mlp(3, new int[] {5, 4}, Activation.RELU, 3, 0.1);
        int n = 6;
        double[] x = FiniteDifferences.features(rng, n, 3);
        int[] y = FiniteDifferences.labels(rng, n, 3);
        double[] theta = FiniteDifferences.point(rng, model.parameterCount(), 1.0);
        Model.Workspace ws = model.workspace(10);
        double[] once = new double[model.parameterCount()];
        double loss = model.addGradientSum(theta, x, y, n, once, ws);
        double[] twice = once.clone();
        model.addGradientSum(theta, x, y, n, twice, ws);
        for (int i = 0; i < once.length; i++) {
            assertEquals(2 * once[i], twice[i], ROUNDING);
        }
        assertEquals(model.lossSum(theta, x, y, n, ws), loss, 0.0);
        double[] p = new double[n * 3];
        model.probabilities(theta, x, n, p, ws);
        double fromProbabilities = 0;
        for (int r = 0; r < n; r++) {
            fromProbabilities -= Math.log(p[r * 3 + y[r]]);
            assertEquals(1.0, p[r * 3] + p[r * 3 + 1] + p[r * 3 + 2], ROUNDING);
        }
        assertEquals(loss, fromProbabilities, ROUNDING * loss);
        assertTrue(model.describe().contains("3-5-4-3"), model.describe());
    }
}
