package settle.engine.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import settle.datasets.Dataset;

class FullBatchTest {

    /** Sums of ~100 terms regrouped by chunk differ in the last bits only. */
    private static final double REGROUPING = 1e-13;
    /** Central differences of the full objective (see FiniteDifferences). */
    private static final double RELATIVE = FiniteDifferences.RELATIVE;

    private static Dataset dataset(SplittableRandom rng, int n, int d, int k) {
        double[] x = FiniteDifferences.features(rng, n, d);
        int[] y = FiniteDifferences.labels(rng, n, k);
        List<String> features = new ArrayList<>();
        for (int j = 0; j < d; j++) {
            features.add("f" + j);
        }
        List<String> classes = new ArrayList<>();
        for (int c = 0; c < k; c++) {
            classes.add("c" + c);
        }
        return new Dataset("random " + n + "×" + d, x, y, features, classes);
    }

    private static List<Model> models() {
        return List.of(new BinaryLogistic(4, 0.1), new SoftmaxRegression(4, 3, 0.05),
                new Mlp(4, new int[] {6}, Activation.TANH, 3, 0.01), new Mlp(4, new int[] {5, 3}, Activation.RELU, 2, 0));
    }

    @Test
    void matchesOneBigBatchAndEveryChunkSize() {
        SplittableRandom rng = new SplittableRandom(41);
        for (Model model : models()) {
            Dataset data = dataset(rng, 103, 4, model.classes());
            double[] theta = FiniteDifferences.point(rng, model.parameterCount(), 0.5);
            double[] all = data.featureMatrix();
            int[] labels = data.labels();
            double[] expectedGradient = new double[model.parameterCount()];
            double expected = model.batchObjective(theta, all, labels, 103, expectedGradient, model.workspace(103));
            for (int chunk : new int[] {1, 16, 103, 256}) {
                FullBatch full = new FullBatch(model, data, chunk);
                double[] gradient = new double[model.parameterCount()];
                double objective = full.objectiveAndGradient(theta, gradient);
                String label = model.describe() + " chunk " + chunk;
                assertEquals(expected, objective, REGROUPING * expected, label);
                assertEquals(expected, full.objective(theta), REGROUPING * expected, label);
                assertEquals(full.lossSum(theta) / 103, full.meanLoss(theta), 0.0, label);
                assertEquals(objective - model.penalty(theta), full.meanLoss(theta), REGROUPING * expected, label);
                for (int i = 0; i < gradient.length; i++) {
                    assertEquals(expectedGradient[i], gradient[i], REGROUPING, label + " component " + i);
                }
            }
        }
    }

    @Test
    void gradientOfTheFullObjectiveMatchesFiniteDifferences() {
        SplittableRandom rng = new SplittableRandom(42);
        Model model = new SoftmaxRegression(3, 4, 0.2);
        Dataset data = dataset(rng, 50, 3, 4);
        FullBatch full = new FullBatch(model, data, 7);
        double[] theta = FiniteDifferences.point(rng, model.parameterCount(), 0.5);
        double[] gradient = new double[model.parameterCount()];
        full.objectiveAndGradient(theta, gradient);
        for (int j = 0; j < theta.length; j++) {
            double saved = theta[j];
            theta[j] = saved + FiniteDifferences.STEP;
            double plus = full.objective(theta);
            theta[j] = saved - FiniteDifferences.STEP;
            double minus = full.objective(theta);
            theta[j] = saved;
            double numeric = (plus - minus) / (2 * FiniteDifferences.STEP);
            assertEquals(numeric, gradient[j],
                    Math.max(RELATIVE * Math.abs(numeric), FiniteDifferences.ABSOLUTE_FLOOR), "component " + j);
        }
    }

    @Test
    void exampleGradientsSumToTheFullGradient() {
        SplittableRandom rng = new SplittableRandom(43);
        Model model = new BinaryLogistic(3, 0.3);
        Dataset data = dataset(rng, 20, 3, 2);
        FullBatch full = new FullBatch(model, data);
        double[] theta = FiniteDifferences.point(rng, 4, 1.0);
        double[] gradient = new double[4];
        full.objectiveAndGradient(theta, gradient);
        double[] sum = new double[4];
        double[] one = new double[4];
        double loss = 0;
        for (int i = 0; i < 20; i++) {
            loss += full.exampleGradient(theta, i, one);
            for (int j = 0; j < 4; j++) {
                sum[j] += one[j];
            }
        }
        assertEquals(full.lossSum(theta), loss, REGROUPING * loss);
        for (int j = 0; j < 4; j++) {
            double penalty = model.penalised(j) ? 0.3 * theta[j] : 0.0;
            assertEquals(gradient[j], sum[j] / 20 + penalty, REGROUPING);
        }
    }

    @Test
    void accuracyAndProbabilitiesAgreeWithTheLoss() {
        SplittableRandom rng = new SplittableRandom(44);
        for (Model model : models()) {
            Dataset data = dataset(rng, 37, 4, model.classes());
            FullBatch full = new FullBatch(model, data, 8);
            double[] theta = FiniteDifferences.point(rng, model.parameterCount(), 1.0);
            int k = model.classes();
            double[] p = new double[37 * k];
            full.probabilities(theta, p);
            int correct = 0;
            double loss = 0;
            for (int i = 0; i < 37; i++) {
                int best = 0;
                double total = 0;
                for (int c = 0; c < k; c++) {
                    total += p[i * k + c];
                    if (p[i * k + c] > p[i * k + best]) {
                        best = c;
                    }
                }
                assertEquals(1.0, total, 1e-12);
                correct += best == data.label(i) ? 1 : 0;
                loss -= Math.log(p[i * k + data.label(i)]);
            }
            assertEquals(correct / 37.0, full.accuracy(theta), 0.0, model.describe());
            assertEquals(loss / 37, full.meanLoss(theta), 1e-12 * loss, model.describe());
        }
        // θ = 0: every row has p = ½, the tie goes to class 0, so accuracy is the share of class-0 rows.
        Dataset data = dataset(rng, 10, 4, 2);
        FullBatch full = new FullBatch(new BinaryLogistic(4, 0), data);
        assertEquals(data.classCounts()[0] / 10.0, full.accuracy(new double[5]), 0.0);
    }

    @Test
    void threadsDoNotChangeTheBits() throws Exception {
        SplittableRandom rng = new SplittableRandom(45);
        Model model = new Mlp(4, new int[] {8}, Activation.RELU, 3, 0.01);
        Dataset data = dataset(rng, 300, 4, 3);
        double[] theta = FiniteDifferences.point(rng, model.parameterCount(), 0.5);
        double[] expected = new double[model.parameterCount()];
        double objective = new FullBatch(model, data).objectiveAndGradient(theta, expected);
        double[][] gradients = new double[4][model.parameterCount()];
        double[] objectives = new double[4];
        Thread[] threads = new Thread[4];
        for (int t = 0; t < 4; t++) {
            int index = t;
            threads[t] = new Thread(() -> {
                FullBatch mine = new FullBatch(model, data);
                for (int repeat = 0; repeat < 20; repeat++) {
                    objectives[index] = mine.objectiveAndGradient(theta, gradients[index]);
                }
            });
            threads[t].start();
        }
        for (Thread thread : threads) {
            thread.join();
        }
        for (int t = 0; t < 4; t++) {
            assertEquals(Double.doubleToRawLongBits(objective), Double.doubleToRawLongBits(objectives[t]));
            assertArrayEquals(expected, gradients[t], 0.0);
        }
    }

    @Test
    void shapesMustMatch() {
        SplittableRandom rng = new SplittableRandom(46);
        Dataset data = dataset(rng, 10, 4, 3);
        String message = assertThrows(IllegalArgumentException.class,
                () -> new FullBatch(new BinaryLogistic(4, 0), data)).getMessage();
        assertTrue(message.contains("3 classes"), message);
        assertThrows(IllegalArgumentException.class, () -> new FullBatch(new SoftmaxRegression(5, 3, 0), data));
    }

    @Test
    void manyParametersInOnePassGiveTheSameBitsAsOneAtATime() {
        SplittableRandom rng = new SplittableRandom(43);
        for (Model model : models()) {
            Dataset data = dataset(rng, 70, 4, model.classes());
            FullBatch full = new FullBatch(model, data, 16); // several chunks, the last one partial
            double[][] thetas = new double[5][];
            for (int s = 0; s < thetas.length; s++) {
                thetas[s] = FiniteDifferences.point(rng, model.parameterCount(), 0.5 + s);
            }
            double[] out = new double[thetas.length + 1];
            out[4] = 99;
            full.objectives(thetas, 4, out);
            for (int s = 0; s < 4; s++) {
                assertEquals(full.objective(thetas[s]), out[s], 0.0, model.describe() + ", θ_" + s);
            }
            assertEquals(99, out[4], 0.0, "only count values are written");
        }
    }

    /**
     * A multinomial model stacks up to {@link FullBatch#STACK} vectors into one product, wide enough for the vector
     * path's register blocks even where one vector alone takes the narrow or the scalar product (10 classes; a last
     * chunk of 4 rows): every value the same bits as one vector at a time, in groups of 8 and a rest of 3.
     */
    @Test
    void stackedSoftmaxObjectivesGiveTheSameBitsAsOneAtATime() {
        SplittableRandom rng = new SplittableRandom(44);
        for (Model model : List.of(new SoftmaxRegression(20, 10, 0.01), new SoftmaxRegression(3, 5, 0.0),
                new Mlp(20, new int[] {24}, Activation.RELU, 10, 0.01))) {
            Dataset data = dataset(rng, 100, model.inputs(), model.classes());
            FullBatch full = new FullBatch(model, data, 48); // chunks of 48, 48 and 4 rows
            double[][] thetas = new double[11][];
            for (int s = 0; s < thetas.length; s++) {
                thetas[s] = FiniteDifferences.point(rng, model.parameterCount(), 0.3 + 0.1 * s);
            }
            for (int count : new int[] {2, 8, 11}) {
                double[] out = new double[count];
                full.objectives(thetas, count, out);
                for (int s = 0; s < count; s++) {
                    assertEquals(Double.doubleToRawLongBits(full.objective(thetas[s])), Double.doubleToRawLongBits(out[s]),
                            model.describe() + ", " + count + " vectors, θ_" + s);
                }
            }
        }
    }

    @Test
    void nothingIsAllocatedPerCall() {
        SplittableRandom rng = new SplittableRandom(47);
        for (Model model : models()) {
            Dataset data = dataset(rng, 60, 4, model.classes());
            FullBatch full = new FullBatch(model, data, 16);
            double[] theta = FiniteDifferences.point(rng, model.parameterCount(), 0.5);
            double[] gradient = new double[model.parameterCount()];
            double[] x = data.featureMatrix();
            int[] y = data.labels();
            double[] p = new double[60 * model.classes()];
            Model.Workspace ws = model.workspace(32);
            Runnable calls = () -> {
                model.batchObjective(theta, x, y, 32, gradient, ws);
                full.objectiveAndGradient(theta, gradient);
                full.accuracy(theta);
                full.probabilities(theta, p);
            };
            // steady state is what counts: rounds of 200 × 4 calls until one allocates nothing
            long allocated = SteadyAllocation.bytes(calls, 200);
            // One allocation per call would be ≥ 16 bytes × 800 calls = 12 800 bytes; allow the counter's own noise.
            assertTrue(allocated < SteadyAllocation.NOISE,
                    model.describe() + " still allocated " + allocated + " bytes in 800 calls");
        }
    }
}
