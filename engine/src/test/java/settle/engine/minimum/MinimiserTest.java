package settle.engine.minimum;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import settle.datasets.Dataset;
import settle.engine.model.BinaryLogistic;
import settle.engine.model.Model;
import settle.engine.model.SoftmaxRegression;

/** The minimiser's own contract: tolerance reached, gauge respected, L-BFGS, no minimiser, bad input. */
class MinimiserTest {

    private static final double THETA_TOLERANCE = 1e-6;
    private static final double OBJECTIVE_TOLERANCE = 1e-12;

    private static double[] gradient(Model model, double[] x, int[] y, double[] theta) {
        double[] g = new double[theta.length];
        model.batchObjective(theta, x, y, y.length, g, model.workspace(y.length));
        return g;
    }

    @ParameterizedTest
    @CsvSource({"binary, 0.01", "binary, 0.0", "multinomial, 0.02", "multinomial, 0.0"})
    void reachesTheGradientToleranceOnTheModelsOwnGradient(String name, double l2) {
        Fixtures.Data data = Fixtures.data(name);
        Model model = data.model(l2);
        Minimum minimum = new Minimiser().minimise(model, data.x(), data.y());
        double[] g = gradient(model, data.x(), data.y(), minimum.theta());
        double norm = 0;
        for (double v : g) {
            norm = Math.max(norm, Math.abs(v));
        }
        assertTrue(norm <= Minimiser.GRADIENT_TOLERANCE, "‖∇F‖∞ = " + norm);
        assertEquals(norm, minimum.gradientNorm(), 1e-12);
        assertTrue(minimum.iterations() > 0 && minimum.iterations() < 30, "iterations " + minimum.iterations());
        // θ* is on the gauge-free subspace: the model's own gauge removal leaves it unchanged
        double[] projected = minimum.theta();
        model.removeGauge(projected);
        assertTrue(Fixtures.maxAbsDifference(projected, minimum.theta()) <= 1e-14);
    }

    @ParameterizedTest
    @CsvSource({"binary, 0.01", "binary, 0.0", "multinomial, 0.02", "multinomial, 0.0"})
    void limitedMemoryBfgsFindsTheSameMinimiser(String name, double l2) {
        Fixtures.Data data = Fixtures.data(name);
        Model model = data.model(l2);
        Minimum newton = new Minimiser().minimise(model, data.x(), data.y());
        Minimum lbfgs = new Minimiser().withDenseLimit(0).minimise(model, data.x(), data.y());
        assertEquals(Minimum.Method.LBFGS, lbfgs.method());
        assertTrue(lbfgs.converged());
        assertTrue(lbfgs.gradientNorm() <= Minimiser.GRADIENT_TOLERANCE);
        assertEquals(newton.objective(), lbfgs.objective(), OBJECTIVE_TOLERANCE * newton.objective());
        assertTrue(Fixtures.maxAbsDifference(newton.theta(), lbfgs.theta()) <= THETA_TOLERANCE);
    }

    @Test
    void beyondTheDenseLimitUsesLimitedMemoryBfgs() {
        int d = 401;
        int k = 10;
        int n = 300;
        SplittableRandom random = new SplittableRandom(2026);
        double[] x = new double[n * d];
        int[] y = new int[n];
        for (int i = 0; i < n; i++) {
            y[i] = i % k;
            for (int j = 0; j < d; j++) {
                x[i * d + j] = random.nextGaussian() + (j % k == y[i] ? 0.5 : 0.0);
            }
        }
        Model model = new SoftmaxRegression(d, k, 0.05);
        assertTrue(model.parameterCount() > Minimiser.DENSE_LIMIT);
        Minimum minimum = new Minimiser().minimise(model, x, y);
        assertEquals(Minimum.Method.LBFGS, minimum.method());
        assertTrue(minimum.converged());
        double[] g = gradient(model, x, y, minimum.theta());
        for (double v : g) {
            assertTrue(Math.abs(v) <= Minimiser.GRADIENT_TOLERANCE);
        }
    }

    /** Two classes split by the sign of the first feature: separable by construction. */
    private static Fixtures.Data separable(int classes) {
        int n = 60;
        int d = 3;
        SplittableRandom random = new SplittableRandom(5);
        double[] x = new double[n * d];
        int[] y = new int[n];
        for (int i = 0; i < n; i++) {
            y[i] = i % classes;
            // class c sits around 3c on the first feature, far apart compared with the noise
            x[i * d] = 3.0 * y[i] + 0.3 * random.nextGaussian();
            x[i * d + 1] = random.nextGaussian();
            x[i * d + 2] = random.nextGaussian();
        }
        return new Fixtures.Data(x, y, d, classes);
    }

    @ParameterizedTest
    @CsvSource({"2", "3"})
    void noMinimiserOnSeparableDataWithoutPenalty(int classes) {
        Fixtures.Data data = separable(classes);
        Model model = data.model(0.0);
        NoMinimiserException e = assertThrows(NoMinimiserException.class,
                () -> new Minimiser().minimise(model, data.x(), data.y()));
        assertEquals("no minimiser exists: the training data are linearly separable and l2 = 0; set model.l2 > 0",
                e.getMessage());
        NoMinimiserException viaLbfgs = assertThrows(NoMinimiserException.class,
                () -> new Minimiser().withDenseLimit(0).minimise(model, data.x(), data.y()));
        assertTrue(viaLbfgs.getMessage().startsWith("no minimiser exists"));
    }

    @ParameterizedTest
    @CsvSource({"2", "3"})
    void noMinimiserOnQuasiSeparableDataWithoutPenalty(int classes) {
        Fixtures.Data apart = separable(classes);
        // two identical rows with different labels: no θ classifies both strictly, but every other row is
        // separated, so F decreases along a ray for ever (quasi-complete separation, hand-derived)
        int d = apart.features();
        int n = apart.y().length + 2;
        double[] x = java.util.Arrays.copyOf(apart.x(), n * d);
        int[] y = java.util.Arrays.copyOf(apart.y(), n);
        for (int r = n - 2; r < n; r++) {
            x[r * d] = 1.5;
            x[r * d + 1] = 0.25;
            x[r * d + 2] = -0.5;
        }
        y[n - 2] = 0;
        y[n - 1] = 1;
        Model model = new Fixtures.Data(x, y, d, classes).model(0.0);
        NoMinimiserException e = assertThrows(NoMinimiserException.class,
                () -> new Minimiser().minimise(model, x, y));
        assertTrue(e.getMessage().startsWith("no minimiser exists: with l2 = 0 the weights grow without bound"),
                e.getMessage());
        assertTrue(e.getMessage().endsWith("set model.l2 > 0"), e.getMessage());
    }

    @ParameterizedTest
    @CsvSource({"2", "3"})
    void separableDataWithPenaltyHaveAMinimiser(int classes) {
        Fixtures.Data data = separable(classes);
        Minimum minimum = new Minimiser().minimise(data.model(0.01), data.x(), data.y());
        assertTrue(minimum.converged());
        assertTrue(minimum.gradientNorm() <= Minimiser.GRADIENT_TOLERANCE);
    }

    @Test
    void datasetEntryPointChecksTheShapes() {
        Dataset data = new Dataset("two rows", new double[] {0.0, 1.0, 1.0, 0.0}, new int[] {0, 1},
                List.of("a", "b"), List.of("no", "yes"));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> new Minimiser().minimise(new BinaryLogistic(3, 0.1), data));
        assertTrue(e.getMessage().startsWith("two rows: 2 features and 2 classes, but the model has 3 inputs"));
        Minimum minimum = new Minimiser().minimise(new BinaryLogistic(2, 0.1), data);
        // symmetric data (hand-derived): x = (0,1) labelled 0 and (1,0) labelled 1 give w₁ = −w₂ and b = 0
        double[] theta = minimum.theta();
        assertEquals(-theta[0], theta[1], 1e-12);
        assertEquals(0.0, theta[2], 1e-12);
    }
}
