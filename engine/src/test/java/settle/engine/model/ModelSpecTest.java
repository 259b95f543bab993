package settle.engine.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

class ModelSpecTest {

    private static String message(Runnable action) {
        return assertThrows(IllegalArgumentException.class, action::run).getMessage();
    }

    @Test
    void buildsTheModelForTheClassCount() {
        ModelSpec logistic = ModelSpec.logistic(0.01);
        assertInstanceOf(BinaryLogistic.class, logistic.build(4, 2));
        assertInstanceOf(SoftmaxRegression.class, logistic.build(4, 3));
        assertEquals(Initialisation.ZEROS, logistic.init());
        assertTrue(logistic.convex());
        ModelSpec mlp = ModelSpec.mlp(List.of(8, 4), null, 0.0);
        Model built = mlp.build(4, 2);
        assertInstanceOf(Mlp.class, built);
        assertEquals(Initialisation.HE, mlp.init());
        assertEquals(Activation.RELU, mlp.activation());
        assertEquals(2, built.classes());
        // 4→8: 32 + 8; 8→4: 32 + 4; 4→2: 8 + 2
        assertEquals(86, built.parameterCount());
        assertEquals(0.01, logistic.build(3, 2).l2(), 0.0);
    }

    @Test
    void logisticIgnoresMlpKeys() {
        ModelSpec spec = new ModelSpec(ModelSpec.Kind.LOGISTIC, List.of(32), Activation.TANH, 0, Initialisation.GLOROT);
        assertEquals(List.of(), spec.hidden());
        assertNull(spec.activation());
        assertEquals(Initialisation.GLOROT, spec.init());
    }

    @Test
    void badValuesNameTheKeyAndTheAcceptedValues() {
        assertEquals("model.l2 must be ≥ 0 and finite: -1", message(() -> ModelSpec.logistic(-1)));
        assertEquals("model.l2 must be ≥ 0 and finite: NaN", message(() -> ModelSpec.logistic(Double.NaN)));
        assertEquals("model.l2 must be ≥ 0 and finite: Infinity",
                message(() -> ModelSpec.logistic(Double.POSITIVE_INFINITY)));
        assertTrue(message(() -> ModelSpec.mlp(List.of(), null, 0)).startsWith("model.hidden"));
        assertEquals("model.hidden sizes must be whole numbers ≥ 1: [8, 0]",
                message(() -> ModelSpec.mlp(List.of(8, 0), null, 0)));
        assertTrue(message(() -> ModelSpec.mlp(List.of(8), null, 0).withInit(Initialisation.REFERENCE))
                .startsWith("model.init: reference needs a convex model"));
        assertTrue(message(() -> new ModelSpec(null, null, null, 0, null)).startsWith("model.kind"));
        assertEquals("glorot", ModelSpec.key(Initialisation.GLOROT));
    }

    @Test
    void initialisationsFollowTheirDefinitions() {
        Mlp model = new Mlp(100, new int[] {200}, Activation.RELU, 3, 0);
        double[] theta = new double[model.parameterCount()];
        // He: N(0, 2/fan_in): layer 1 (200 × 100) has sd sqrt(2/100) = 0.1414; 20 000 draws put the sample sd
        // within 2 % with overwhelming probability (its relative standard error is 1/sqrt(2·20000) = 0.5 %).
        model.initialise(theta, Initialisation.HE, new SplittableRandom(31));
        assertEquals(Math.sqrt(2.0 / 100), sd(theta, 0, 20000), 0.02 * Math.sqrt(2.0 / 100));
        assertEquals(Math.sqrt(2.0 / 200), sd(theta, model.weightOffset(2), 600), 0.1 * Math.sqrt(2.0 / 200));
        assertBiasesZero(model, theta);
        // Glorot: U(−a, a), a = sqrt(6/(100 + 200)) = 0.1414; every draw inside, sd a/√3.
        model.initialise(theta, Initialisation.GLOROT, new SplittableRandom(31));
        double a = Math.sqrt(6.0 / 300);
        for (int i = 0; i < 20000; i++) {
            assertTrue(Math.abs(theta[i]) <= a);
        }
        assertEquals(a / Math.sqrt(3), sd(theta, 0, 20000), 0.02 * a / Math.sqrt(3));
        assertBiasesZero(model, theta);
        // Deterministic given the stream.
        double[] again = new double[theta.length];
        model.initialise(again, Initialisation.GLOROT, new SplittableRandom(31));
        assertTrue(Arrays.equals(theta, again));
        model.initialise(theta, Initialisation.ZEROS, new SplittableRandom(31));
        assertTrue(Arrays.stream(theta).allMatch(v -> v == 0.0));
        // Logistic default zeros; He on a softmax model uses fan-in d.
        SoftmaxRegression softmax = new SoftmaxRegression(50, 40, 0);
        double[] s = new double[softmax.parameterCount()];
        softmax.initialise(s, Initialisation.HE, new SplittableRandom(32));
        assertEquals(Math.sqrt(2.0 / 50), sd(s, 0, 2000), 0.05 * Math.sqrt(2.0 / 50));
        assertThrows(IllegalArgumentException.class,
                () -> model.initialise(new double[model.parameterCount()], Initialisation.REFERENCE,
                        new SplittableRandom(1)));
    }

    private static void assertBiasesZero(Mlp model, double[] theta) {
        for (int i = 0; i < theta.length; i++) {
            if (!model.penalised(i)) {
                assertEquals(0.0, theta[i], 0.0, "bias " + i);
            }
        }
    }

    /** Root mean square around 0 (the known mean) of theta[from .. from + count). */
    private static double sd(double[] theta, int from, int count) {
        double sum = 0;
        for (int i = from; i < from + count; i++) {
            sum += theta[i] * theta[i];
        }
        return Math.sqrt(sum / count);
    }
}
