package settle.engine.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

class LogisticModelsTest {

    /** Hand-computed values below are given to double precision; agreement to this relative error. */
    private static final double HAND = 1e-15;
    /** Rounding of sums of a few dozen terms of size ~1. */
    private static final double ROUNDING = 1e-12;
    /** Random points per configuration (the issue asks for at least 3). */
    private static final int POINTS = 4;

    /**
     * More arms than one stacked product takes ({@link SoftmaxRegression#MAX_STACK}) go in groups (16 + 4 here):
     * every arm's batch objective and gradient are the bits {@link Model#batchObjective} gives it alone, on a batch
     * of 37 rows (not a whole number of register blocks).
     */
    @Test
    void softmaxArmsInGroupsGiveEachArmItsOwnBits() {
        SplittableRandom rng = new SplittableRandom(61);
        SoftmaxRegression model = new SoftmaxRegression(20, 10, 0.01);
        int n = 37;
        double[] x = FiniteDifferences.features(rng, n, 20);
        int[] y = FiniteDifferences.labels(rng, n, 10);
        int arms = SoftmaxRegression.MAX_STACK + 4;
        double[][] thetas = new double[arms][];
        double[][] gradients = new double[arms][];
        for (int a = 0; a < arms; a++) {
            thetas[a] = FiniteDifferences.point(rng, model.parameterCount(), 0.2 + 0.05 * a);
            gradients[a] = new double[model.parameterCount()];
        }
        double[] objectives = new double[arms];
        model.batchObjectives(thetas, arms, x, y, n, gradients, objectives, model.workspace(n, arms));
        double[] gradient = new double[model.parameterCount()];
        for (int a = 0; a < arms; a++) {
            double alone = model.batchObjective(thetas[a], x, y, n, gradient, model.workspace(n));
            assertEquals(Double.doubleToRawLongBits(alone), Double.doubleToRawLongBits(objectives[a]), "arm " + a);
            for (int i = 0; i < gradient.length; i++) {
                assertEquals(Double.doubleToRawLongBits(gradient[i]), Double.doubleToRawLongBits(gradients[a][i]),
                        "arm " + a + ", gradient " + i);
            }
        }
    }

    @Test
    void binaryGradientMatchesFiniteDifferences() {
        SplittableRandom rng = new SplittableRandom(11);
        for (double lambda : new double[] {0.0, 0.3}) {
            for (int n : new int[] {1, 7}) {
                BinaryLogistic model = new BinaryLogistic(5, lambda);
                for (int p = 0; p < POINTS; p++) {
                    double[] x = FiniteDifferences.features(rng, n, 5);
                    int[] y = FiniteDifferences.labels(rng, n, 2);
                    double[] theta = FiniteDifferences.point(rng, model.parameterCount(), 0.7);
                    FiniteDifferences.assertGradientMatches(model, theta, x, y, n,
                            "binary λ=" + lambda + " n=" + n + " point " + p);
                }
            }
        }
    }

    @Test
    void softmaxGradientMatchesFiniteDifferences() {
        SplittableRandom rng = new SplittableRandom(12);
        for (double lambda : new double[] {0.0, 0.3}) {
            for (int n : new int[] {1, 9}) {
                SoftmaxRegression model = new SoftmaxRegression(4, 3, lambda);
                for (int p = 0; p < POINTS; p++) {
                    double[] x = FiniteDifferences.features(rng, n, 4);
                    int[] y = FiniteDifferences.labels(rng, n, 3);
                    double[] theta = FiniteDifferences.point(rng, model.parameterCount(), 0.7);
                    FiniteDifferences.assertGradientMatches(model, theta, x, y, n,
                            "softmax λ=" + lambda + " n=" + n + " point " + p);
                }
            }
        }
    }

    @Test
    void zeroParametersGiveLogTwoAndLogK() {
        // θ = 0: every score is 0, so p = 1/2 (binary) or 1/K (softmax) for every row whatever x and y,
        // and the mean cross-entropy is −log(1/2) = log 2 = 0.6931471805599453, −log(1/3) = log 3 =
        // 1.0986122886681098. The penalty is 0 at θ = 0.
        SplittableRandom rng = new SplittableRandom(13);
        double[] x = FiniteDifferences.features(rng, 6, 4);
        BinaryLogistic binary = new BinaryLogistic(4, 0.5);
        double[] g = new double[binary.parameterCount()];
        assertEquals(0.6931471805599453,
                binary.batchObjective(new double[5], x, FiniteDifferences.labels(rng, 6, 2), 6, g, binary.workspace(6)),
                HAND);
        SoftmaxRegression softmax = new SoftmaxRegression(4, 3, 0.5);
        double[] gs = new double[softmax.parameterCount()];
        assertEquals(1.0986122886681098, softmax.batchObjective(new double[softmax.parameterCount()], x,
                FiniteDifferences.labels(rng, 6, 3), 6, gs, softmax.workspace(6)), HAND);
    }

    @Test
    void binaryLossByHand() {
        // d = 1, w = 2, b = −1, x = 1: z = 2·1 − 1 = 1.
        // y = 1: −log σ(1) = log(1 + e^−1) = log(1 + 0.36787944117144233) = log 1.3678794411714423
        //        = 0.31326168751822286.
        // y = 0: −log(1 − σ(1)) = log(1 + e^1) = 1 + log(1 + e^−1) = 1.3132616875182228.
        BinaryLogistic model = new BinaryLogistic(1, 0.0);
        double[] theta = {2.0, -1.0};
        Model.Workspace ws = model.workspace(2);
        assertEquals(0.31326168751822286, model.lossSum(theta, new double[] {1.0}, new int[] {1}, 1, ws), HAND);
        assertEquals(1.3132616875182228, model.lossSum(theta, new double[] {1.0}, new int[] {0}, 1, ws), HAND);
        // Both rows together, with λ = 0.5: mean (0.31326168751822286 + 1.3132616875182228)/2 = 0.8132616875182228,
        // penalty (0.5/2)·2² = 1 (the bias is not penalised): objective 1.8132616875182228.
        BinaryLogistic penalised = new BinaryLogistic(1, 0.5);
        double[] gradient = new double[2];
        double objective = penalised.batchObjective(theta, new double[] {1.0, 1.0}, new int[] {1, 0}, 2, gradient, ws);
        assertEquals(1.8132616875182228, objective, 2 * HAND);
        // Gradient: δ = σ(1) − y = 0.7310585786300049 − 1 and 0.7310585786300049 − 0; mean
        // 0.2310585786300049; weight: 0.2310585786300049·1 + 0.5·2 = 1.2310585786300049; bias 0.2310585786300049.
        assertArrayEquals(new double[] {1.2310585786300049, 0.2310585786300049}, gradient, 1e-15);
    }

    @Test
    void binaryLossIsStableAtLargeScores() {
        // z = ±800: exp(800) overflows a double, but softplus(800) = 800 + log1p(e^−800) = 800 exactly in
        // double arithmetic, and softplus(−800) = log1p(e^−800) = 0 (e^−800 underflows).
        BinaryLogistic model = new BinaryLogistic(1, 0.0);
        double[] theta = {800.0, 0.0};
        Model.Workspace ws = model.workspace(1);
        assertEquals(800.0, model.lossSum(theta, new double[] {1.0}, new int[] {0}, 1, ws), 0.0);
        assertEquals(0.0, model.lossSum(theta, new double[] {1.0}, new int[] {1}, 1, ws), 0.0);
        double[] g = new double[2];
        model.addGradientSum(theta, new double[] {1.0}, new int[] {0}, 1, g, ws);
        assertArrayEquals(new double[] {1.0, 1.0}, g, 0.0);
        double[] p = new double[2];
        model.probabilities(theta, new double[] {-1.0}, 1, p, ws);
        assertArrayEquals(new double[] {1.0, 0.0}, p, 0.0);
    }

    @Test
    void softmaxLossByHand() {
        // d = 1, K = 3, W = (1, 0, −1), b = 0, x = 1: z = (1, 0, −1).
        // logsumexp = log(e + 1 + e^−1) = log(2.718281828459045 + 1 + 0.36787944117144233)
        //           = log 4.086161269630488 = 1.4076059644443804.
        // y = 0: 1.4076059644443804 − 1 = 0.40760596444438035; y = 2: 1.4076059644443804 + 1 = 2.4076059644443804.
        SoftmaxRegression model = new SoftmaxRegression(1, 3, 0.0);
        double[] theta = {1.0, 0.0, -1.0, 0.0, 0.0, 0.0};
        Model.Workspace ws = model.workspace(2);
        assertEquals(0.40760596444438035, model.lossSum(theta, new double[] {1.0}, new int[] {0}, 1, ws), HAND);
        assertEquals(2.4076059644443804, model.lossSum(theta, new double[] {1.0}, new int[] {2}, 1, ws), 2 * HAND);
        double[] p = new double[3];
        model.probabilities(theta, new double[] {1.0}, 1, p, ws);
        // p = (e, 1, e^−1) / 4.086161269630488
        assertArrayEquals(new double[] {2.718281828459045 / 4.086161269630488, 1 / 4.086161269630488,
            0.36787944117144233 / 4.086161269630488}, p, 1e-15);
    }

    @Test
    void softmaxLossIsStableAtLargeScores() {
        // z = (1000, 0, −1000): logsumexp = 1000 + log(1 + e^−1000 + e^−2000) = 1000 in double arithmetic;
        // y = 1 costs 1000 − 0 = 1000, y = 0 costs 0.
        SoftmaxRegression model = new SoftmaxRegression(1, 3, 0.0);
        double[] theta = {1000.0, 0.0, -1000.0, 0.0, 0.0, 0.0};
        Model.Workspace ws = model.workspace(1);
        assertEquals(1000.0, model.lossSum(theta, new double[] {1.0}, new int[] {1}, 1, ws), 0.0);
        assertEquals(0.0, model.lossSum(theta, new double[] {1.0}, new int[] {0}, 1, ws), 0.0);
    }

    /**
     * hasGauge() = false lets the trainer skip the projection, so it must mean that removeGauge is the identity: the
     * binary model leaves every vector alone; softmax moves one whose class biases do not average to 0.
     */
    @Test
    void onlyTheBinaryModelDeclaresNoGauge() {
        BinaryLogistic binary = new BinaryLogistic(3, 0.0);
        double[] theta = {1.5, -2, 0.25, 7};
        double[] copy = theta.clone();
        binary.removeGauge(copy);
        assertArrayEquals(theta, copy, 0.0);
        assertFalse(binary.hasGauge());
        SoftmaxRegression softmax = new SoftmaxRegression(1, 3, 0.1);
        double[] biased = {0, 0, 0, 1, 2, 6};
        softmax.removeGauge(biased);
        assertArrayEquals(new double[] {0, 0, 0, -2, -1, 3}, biased, 0.0);
        assertTrue(softmax.hasGauge());
    }

    @Test
    void softmaxIsInvariantAlongTheGauge() {
        SplittableRandom rng = new SplittableRandom(14);
        int d = 4;
        int k = 5;
        int n = 11;
        double[] x = FiniteDifferences.features(rng, n, d);
        int[] y = FiniteDifferences.labels(rng, n, k);
        for (double lambda : new double[] {0.0, 0.2}) {
            SoftmaxRegression model = new SoftmaxRegression(d, k, lambda);
            Model.Workspace ws = model.workspace(n);
            double[] theta = FiniteDifferences.point(rng, model.parameterCount(), 1.0);
            double[] gradient = new double[model.parameterCount()];
            double loss = model.addGradientSum(theta, x, y, n, gradient, ws);
            // Σ_k ∂/∂b_k = Σ_r Σ_k (p_k − [k = y_r]) = Σ_r (1 − 1) = 0.
            double biasSum = 0;
            for (int c = 0; c < k; c++) {
                biasSum += gradient[k * d + c];
            }
            assertEquals(0.0, biasSum, ROUNDING * n);
            // The same per input column of the weight gradient: Σ_k ∂/∂W_kj = Σ_r x_rj Σ_k δ_k = 0.
            for (int j = 0; j < d; j++) {
                double column = 0;
                for (int c = 0; c < k; c++) {
                    column += gradient[c * d + j];
                }
                assertEquals(0.0, column, ROUNDING * n);
            }
            double[] shifted = theta.clone();
            for (int c = 0; c < k; c++) {
                shifted[k * d + c] += 3.25;
            }
            assertEquals(loss, model.lossSum(shifted, x, y, n, ws), ROUNDING * loss);
            model.removeGauge(shifted);
            double biasMean = 0;
            for (int c = 0; c < k; c++) {
                biasMean += shifted[k * d + c];
            }
            assertEquals(0.0, biasMean, ROUNDING);
            assertEquals(loss, model.lossSum(shifted, x, y, n, ws), ROUNDING * loss);
            if (lambda == 0.0) {
                // Adding one vector to every class's weights changes every score of a row by the same amount.
                double[] moved = theta.clone();
                for (int c = 0; c < k; c++) {
                    for (int j = 0; j < d; j++) {
                        moved[c * d + j] += 0.5 * (j + 1);
                    }
                }
                assertEquals(loss, model.lossSum(moved, x, y, n, ws), ROUNDING * loss);
                model.removeGauge(moved);
                for (int j = 0; j < d; j++) {
                    double column = 0;
                    for (int c = 0; c < k; c++) {
                        column += moved[c * d + j];
                    }
                    assertEquals(0.0, column, ROUNDING);
                }
                assertEquals(loss, model.lossSum(moved, x, y, n, ws), ROUNDING * loss);
            } else {
                // With λ > 0 the weights are not a gauge direction: removeGauge leaves them alone.
                double[] copy = theta.clone();
                model.removeGauge(copy);
                for (int i = 0; i < k * d; i++) {
                    assertEquals(theta[i], copy[i], 0.0);
                }
            }
        }
    }

    @Test
    void gradientSumIsAddedAndLossMatches() {
        SplittableRandom rng = new SplittableRandom(15);
        Model[] models = {new BinaryLogistic(3, 0.1), new SoftmaxRegression(3, 4, 0.1)};
        for (Model model : models) {
            int n = 6;
            double[] x = FiniteDifferences.features(rng, n, 3);
            int[] y = FiniteDifferences.labels(rng, n, model.classes());
            double[] theta = FiniteDifferences.point(rng, model.parameterCount(), 1.0);
            Model.Workspace ws = model.workspace(n);
            double[] once = new double[model.parameterCount()];
            double loss = model.addGradientSum(theta, x, y, n, once, ws);
            double[] twice = once.clone();
            model.addGradientSum(theta, x, y, n, twice, ws);
            for (int i = 0; i < once.length; i++) {
                assertEquals(2 * once[i], twice[i], ROUNDING, model.describe());
            }
            assertEquals(model.lossSum(theta, x, y, n, ws), loss, 0.0, model.describe());
            double[] p = new double[n * model.classes()];
            model.probabilities(theta, x, n, p, ws);
            double fromProbabilities = 0;
            for (int r = 0; r < n; r++) {
                fromProbabilities -= Math.log(p[r * model.classes() + y[r]]);
            }
            assertEquals(loss, fromProbabilities, ROUNDING * loss, model.describe());
        }
    }

    @Test
    void penaltyCoversWeightsOnly() {
        // θ = (1, 2, 3 | 10), λ = 0.5: (λ/2)(1² + 2² + 3²) = 0.25·14 = 3.5; the bias 10 is not penalised.
        BinaryLogistic model = new BinaryLogistic(3, 0.5);
        assertEquals(3.5, model.penalty(new double[] {1, 2, 3, 10}), 0.0);
        assertTrue(model.penalised(2));
        assertTrue(!model.penalised(3));
        SoftmaxRegression softmax = new SoftmaxRegression(2, 3, 1.0);
        assertEquals(6, softmax.parameterCount() - 3);
        assertTrue(softmax.penalised(5));
        assertTrue(!softmax.penalised(6));
    }

    @Test
    void badArgumentsAreRefusedWithMessages() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> new BinaryLogistic(3, -1));
        assertTrue(e.getMessage().contains("model.l2"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> new SoftmaxRegression(3, 2, 0));
        BinaryLogistic model = new BinaryLogistic(2, 0);
        Model.Workspace ws = model.workspace(2);
        IllegalArgumentException big = assertThrows(IllegalArgumentException.class,
                () -> model.lossSum(new double[3], new double[6], new int[3], 3, ws));
        assertTrue(big.getMessage().contains("capacity"), big.getMessage());
        IllegalArgumentException ref = assertThrows(IllegalArgumentException.class,
                () -> model.initialise(new double[3], Initialisation.REFERENCE, new SplittableRandom(1)));
        assertTrue(ref.getMessage().contains("reference"), ref.getMessage());
    }
}
