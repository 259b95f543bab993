package settle.engine.theory;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import settle.datasets.DataSources;
import settle.datasets.Dataset;
import settle.datasets.Splits;
import settle.datasets.Standardiser;
import settle.engine.minimum.Curvature;
import settle.engine.minimum.Minimiser;
import settle.engine.minimum.Minimum;
import settle.engine.model.Model;
import settle.engine.model.ModelSpec;

/**
 * The terms beyond first order ({@link SecondOrder}) against numpy: second-order-wdbc.csv holds them per update as
 * docs/second-order/study.py computes them (numpy 2.4.6; the script make_second_order_fixture.py beside the fixture
 * made it) on NoiseBallOnWdbcTest's problem (WDBC, 456 training rows, binary logistic, l2 = 0.01, B = 32), from θ*,
 * rate 0.4, three epochs under {@code shuffle} (the short last batch included) and under {@code replacement}. The
 * numpy side is an independent implementation: full P×P matrices and einsum in the original formulas, where the Java
 * side packs the third-order tensors and runs the recursions element by element. The two θ* come from different
 * minimisers (settle's and 50 Newton steps in numpy), so the values agree to rounding and θ*'s precision, not bit
 * for bit.
 */
class SecondOrderTest {

    private static final double RATE = 0.4;
    private static final double RELATIVE = 1e-9;

    private static NoiseBallTheory theory;
    private static SecondOrder terms;
    private static int rows;

    @BeforeAll
    static void problem() {
        Dataset all = DataSources.load("bundled:wdbc", null, null);
        Dataset split = Splits.stratified(all, 0.2, 2026L).train();
        Dataset train = Standardiser.fit(split).apply(split);
        Model model = ModelSpec.logistic(0.01).build(train.features(), train.classes());
        Minimum minimum = new Minimiser().minimise(model, train);
        assertTrue(minimum.converged());
        Curvature curvature = Curvature.at(model, train, minimum.theta());
        theory = NoiseBallTheory.of(curvature.hessian(), curvature.covariance(), train.rows());
        terms = SecondOrder.binaryLogistic(theory, train, minimum.theta(), 0.01);
        rows = train.rows();
    }

    @Test
    void reshuffledTermsMatchNumpyAtEveryUpdate() throws IOException {
        check("shuffle", BatchSampling.SHUFFLE, UpdateSequence.epochBatches(rows, 32));
    }

    @Test
    void replacementTermsMatchNumpyAtEveryUpdate() throws IOException {
        int[] epoch = new int[UpdateSequence.epochBatches(rows, 32).length];
        java.util.Arrays.fill(epoch, 32);
        check("replacement", BatchSampling.REPLACEMENT, epoch);
    }

    @Test
    void predictionAddsTheTermsWithoutMomentumOnly() {
        NoiseBallTheory both = theory.withSecondOrder(terms);
        double[] rates = new double[15 * 4];
        java.util.Arrays.fill(rates, RATE);
        UpdateSequence plain = UpdateSequence.of(rates, rows, 32, BatchSampling.SHUFFLE, 0.0);
        double[] first = theory.distanceAfterEveryUpdate(plain, new double[theory.dimension()]);
        double[] with = both.distanceAfterEveryUpdate(plain, new double[theory.dimension()]);
        SecondOrder.Run run = terms.start(BatchSampling.SHUFFLE);
        int[] epoch = UpdateSequence.epochBatches(rows, 32);
        for (int t = 0; t < rates.length; t++) {
            run.step(RATE, epoch[t % epoch.length]);
            assertEquals(first[t] + run.distance(), with[t], 1e-15 * with[t], "update " + (t + 1));
            if (t % epoch.length == epoch.length - 1) {
                run.endEpoch();
            }
        }
        assertTrue(both.predict(plain, new double[theory.dimension()], 15, ObjectiveKind.LOGISTIC).label()
                .startsWith("first order plus second-order terms"));
        UpdateSequence momentum = UpdateSequence.of(rates, rows, 32, BatchSampling.SHUFFLE, 0.9);
        double[] firstMomentum = theory.distanceAfterEveryUpdate(momentum, new double[theory.dimension()]);
        double[] withMomentum = both.distanceAfterEveryUpdate(momentum, new double[theory.dimension()]);
        org.junit.jupiter.api.Assertions.assertArrayEquals(firstMomentum, withMomentum, "momentum: first order only");
        String label = both.predict(momentum, new double[theory.dimension()], 15, ObjectiveKind.LOGISTIC).label();
        assertTrue(label.contains("second-order terms left out: they are not derived with momentum"), label);
    }

    @Test
    void aSequenceOverTheWorkLimitIsFirstOrderAndSaysWhy() {
        NoiseBallTheory both = theory.withSecondOrder(terms);
        int packed = theory.dimension() * (theory.dimension() + 1) / 2;
        int updates = (int) (SecondOrder.WORK_LIMIT / ((double) theory.dimension() * packed)) + 15;
        double[] rates = new double[updates];
        java.util.Arrays.fill(rates, 0.1);
        UpdateSequence longRun = UpdateSequence.of(rates, rows, 32, BatchSampling.SHUFFLE, 0.0);
        NoiseBallPrediction p = both.predict(longRun, new double[theory.dimension()], 15, ObjectiveKind.LOGISTIC);
        NoiseBallPrediction first = theory.predict(longRun, new double[theory.dimension()], 15, ObjectiveKind.LOGISTIC);
        assertTrue(p.label().contains("second-order terms left out: " + updates + " updates at P = 31"), p.label());
        assertEquals(first.tailDistanceSq(), p.tailDistanceSq());
    }

    private static void check(String name, BatchSampling sampling, int[] epoch) throws IOException {
        List<double[]> expected = fixture(name);
        assertEquals(3 * epoch.length, expected.size());
        SecondOrder.Run run = terms.start(sampling);
        int t = 0;
        for (int e = 0; e < 3; e++) {
            for (int b : epoch) {
                run.step(RATE, b);
                double[] row = expected.get(t++);
                String at = name + ", update " + t;
                close(row[0], run.thirdOffset(), at + ": ‖m³‖²");
                close(row[1], run.meanOffset(), at + ": ‖m¹ + m³‖²");
                close(row[2], run.spreadTrace(), at + ": tr V");
                close(row[3], run.cross(), at + ": 2 E⟨e⁰, e¹⟩");
                double sum = sampling == BatchSampling.SHUFFLE ? row[1] + row[3] : row[0] + row[2];
                close(sum, run.distance(), at + ": the terms' sum");
            }
            run.endEpoch();
        }
        double last = expected.get(expected.size() - 1)[sampling == BatchSampling.SHUFFLE ? 3 : 2];
        assertTrue(last > 1e-5, name + ": the fixture's last term is not trivially small: " + last);
    }

    private static void close(double expected, double actual, String what) {
        assertEquals(expected, actual, RELATIVE * Math.abs(expected) + 1e-18, what);
    }

    private static List<double[]> fixture(String sampling) throws IOException {
        List<double[]> out = new ArrayList<>();
        try (InputStream in = SecondOrderTest.class.getResourceAsStream("second-order-wdbc.csv");
             BufferedReader r = new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8))) {
            String line = r.readLine();
            assertEquals("sampling,update,m3,m,v,cross", line);
            while ((line = r.readLine()) != null) {
                String[] f = line.split(",");
                if (f[0].equals(sampling)) {
                    out.add(new double[] {Double.parseDouble(f[2]), Double.parseDouble(f[3]),
                        Double.parseDouble(f[4]), Double.parseDouble(f[5])});
                }
            }
        }
        return out;
    }
}
