package settle.engine.theory;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * The recursion of {@link NoiseBallTheory} (eigenbasis, diagonal only, the Welford form of the within-epoch noise)
 * against the recursion of THEORY.md §3.5 written in its original form, in the original coordinates, for the full
 * (position, velocity) state: numpy 1.24.2 (Debian 12's python3-numpy), the script make_reshuffling_values.py beside
 * its output reshuffling_values.txt. The two are algebraically equal, so they agree to rounding: a relative
 * difference of 1e-10 allows for the few hundred roundings of each side and the cancellation in the direct form's
 * D − G C Gᵀ/(N − 1).
 *
 * <p>The quadratic: H with eigenvalues 1, 2, 4 (non-diagonal), N = 50 examples with gradients at θ*
 * u_i = (sin(i + 1), 0.5 cos(2i + 1), 2 sin(3i + 2)) minus their mean, B = 8 (six batches of 8 and one of 2 per
 * epoch), a decaying rate, a start off θ*, 10 epochs; both samplers, without momentum and with β = 0.9.
 */
class ReshufflingRecursionTest {

    private static final double RELATIVE = 1e-10;

    static final double[] H = {25 / 9.0, -10 / 9.0, 2 / 9.0, -10 / 9.0, 22 / 9.0, -8 / 9.0, 2 / 9.0, -8 / 9.0,
        16 / 9.0};
    static final int N = 50;
    static final int B = 8;
    static final int EPOCHS = 10;
    static final double[] START = {0.7, -0.4, 0.3};

    /** @return the per-example gradients at θ*, N × 3 row-major, centred */
    static double[] gradients() {
        double[] u = new double[N * 3];
        double[] mean = new double[3];
        for (int i = 0; i < N; i++) {
            u[i * 3] = StrictMath.sin(i + 1.0);
            u[i * 3 + 1] = 0.5 * StrictMath.cos(2.0 * i + 1.0);
            u[i * 3 + 2] = 2.0 * StrictMath.sin(3.0 * i + 2.0);
            for (int k = 0; k < 3; k++) {
                mean[k] += u[i * 3 + k] / N;
            }
        }
        for (int i = 0; i < N; i++) {
            for (int k = 0; k < 3; k++) {
                u[i * 3 + k] -= mean[k];
            }
        }
        return u;
    }

    /** @return C = (1/N) Σ u_i u_iᵀ */
    static double[] covariance(double[] u) {
        double[] c = new double[9];
        for (int i = 0; i < N; i++) {
            for (int a = 0; a < 3; a++) {
                for (int b = 0; b < 3; b++) {
                    c[a * 3 + b] += u[i * 3 + a] * u[i * 3 + b] / N;
                }
            }
        }
        return c;
    }

    /** @return α_t = a0/(1 + 0.01 t), t = 1 … T */
    static double[] rates(double a0, int updates) {
        double[] r = new double[updates];
        for (int t = 1; t <= updates; t++) {
            r[t - 1] = a0 / (1 + 0.01 * t);
        }
        return r;
    }

    @Test
    void agreesWithTheDirectFormAtEveryUpdate() throws IOException {
        Map<String, double[]> expected = fixture();
        NoiseBallTheory theory = NoiseBallTheory.of(3, H, covariance(gradients()), N);
        int perEpoch = UpdateSequence.epochBatches(N, B).length;
        assertEquals(7, perEpoch, "six batches of 8 and one of 2");
        for (Map.Entry<String, double[]> e : expected.entrySet()) {
            String[] key = e.getKey().split(" ");
            BatchSampling sampling = BatchSampling.valueOf(key[0].toUpperCase(java.util.Locale.ROOT));
            double beta = Double.parseDouble(key[1]);
            double a0 = Double.parseDouble(key[2]);
            double[] want = e.getValue();
            assertEquals(EPOCHS * perEpoch, want.length, e.getKey());
            UpdateSequence run = UpdateSequence.of(rates(a0, want.length), N, B, sampling, beta);
            double[] got = theory.distanceAfterEveryUpdate(run, START);
            for (int t = 0; t < want.length; t++) {
                assertEquals(want[t], got[t], RELATIVE * want[t], e.getKey() + ": E‖e‖² after update " + (t + 1));
            }
            NoiseBallPrediction p = theory.predict(run, START, perEpoch, ObjectiveKind.QUADRATIC);
            for (int epoch = 0; epoch < EPOCHS; epoch++) {
                assertEquals(want[(epoch + 1) * perEpoch - 1], p.epochDistanceSq()[epoch],
                        RELATIVE * want[(epoch + 1) * perEpoch - 1], e.getKey() + ": epoch " + (epoch + 1));
            }
            double tail = 0;
            for (int t = want.length - perEpoch; t < want.length; t++) {
                tail += want[t] / perEpoch;
            }
            assertEquals(tail, p.tailDistanceSq(), RELATIVE * tail, e.getKey() + ": tail mean");
            assertEquals(1, p.tailEpochEnds(), "a tail of one epoch holds one epoch end");
            assertEquals(want[want.length - 1], p.tailDistanceSqEpochEnds(), RELATIVE * want[want.length - 1]);
            assertEquals(p.finalDistanceSq(), p.finalBiasSq() + p.finalBall(), 1e-15 * p.finalDistanceSq());
            assertTrue(p.stable());
        }
        assertEquals(4, expected.size(), "both samplers, with and without momentum");
    }

    private static Map<String, double[]> fixture() throws IOException {
        Map<String, double[]> out = new HashMap<>();
        try (InputStream in = ReshufflingRecursionTest.class.getResourceAsStream("reshuffling_values.txt")) {
            String text = new String(in.readAllBytes(), StandardCharsets.UTF_8);
            for (String line : text.split("\n")) {
                if (line.startsWith("numpy") || line.isBlank()) {
                    continue;
                }
                String[] f = line.trim().split(" +");
                double[] v = new double[f.length - 3];
                for (int i = 3; i < f.length; i++) {
                    v[i - 3] = Double.parseDouble(f[i]);
                }
                out.put(f[0] + " " + f[1] + " " + f[2], v);
            }
        }
        return out;
    }
}
