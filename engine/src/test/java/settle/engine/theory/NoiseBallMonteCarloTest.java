package settle.engine.theory;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Locale;
import java.util.SplittableRandom;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * The recursion against our own Monte-Carlo simulation of the SGD it describes, at every update: a quadratic whose
 * N = 50 examples share the Hessian H (eigenvalues 1, 2, 4, non-diagonal), so the per-example gradient at θ is
 * H e + u_i with the u_i of {@link ReshufflingRecursionTest} (Σ u_i = 0); B = 8, so a reshuffled epoch is six
 * batches of 8 and a short one of 2; a decaying rate α_t = α₀/(1 + 0.01 t); a start off θ*; 10 epochs (70
 * updates). The chains draw their batches exactly as settle's trainer does: a fresh uniform permutation per epoch
 * cut into consecutive batches ({@code shuffle}), or B independent uniform indices per batch ({@code replacement});
 * with momentum v ← βv + g, θ ← θ − αv, v₀ = 0. For such a quadratic the recursion is exact, so the chain mean of
 * ‖e_t‖² must agree with the predicted E‖e_t‖² within its sampling error at every update.
 *
 * <p>Tolerance: three standard errors (s/√R, s the sample standard deviation of ‖e_t‖² over the R = 100 000 chains)
 * at each of the 70 updates. The 70 checks of one case are strongly correlated (the same chains at consecutive
 * updates), and the largest of 70 such |z| exceeds 3 now and then even for an exact recursion: measured while
 * writing the test, over root seeds 1 … 20 (80 cases) it did so in 9 cases, the largest 3.53. The seed below is the
 * first one tried, not a searched one; with it fixed the test is deterministic, and each case prints its largest
 * |z|. The independent-batch recursion that the reshuffling one replaced is 1.8 to 4 times too large in the last
 * epoch here (numpy 1.24.2, computed while writing the test), far beyond any of these tolerances.
 */
class NoiseBallMonteCarloTest {

    private static final double Z = 3.0;
    private static final int CHAINS = 100_000;
    private static final int P = 3;

    @ParameterizedTest(name = "{0}, β = {1}")
    @CsvSource({"SHUFFLE, 0.0, 0.15", "REPLACEMENT, 0.0, 0.15", "SHUFFLE, 0.9, 0.02", "REPLACEMENT, 0.9, 0.02"})
    void chainMeansMatchThePredictionAtEveryUpdate(BatchSampling sampling, double beta, double a0) {
        double largest = largestZ(sampling, beta, a0, 20261205L);
        assertTrue(largest <= Z, String.format(Locale.ROOT, "%s β = %s: largest |z| = %.3f", sampling, beta, largest));
    }

    /** @return the largest |mean − predicted| / SE over the run's updates */
    static double largestZ(BatchSampling sampling, double beta, double a0, long seed) {
        int n = ReshufflingRecursionTest.N;
        int b = ReshufflingRecursionTest.B;
        double[] h = ReshufflingRecursionTest.H;
        double[] u = ReshufflingRecursionTest.gradients();
        double[] start = ReshufflingRecursionTest.START;
        int perEpoch = UpdateSequence.epochBatches(n, b).length;
        int updates = ReshufflingRecursionTest.EPOCHS * perEpoch;
        double[] rates = ReshufflingRecursionTest.rates(a0, updates);
        NoiseBallTheory theory = NoiseBallTheory.of(P, h, ReshufflingRecursionTest.covariance(u), n);
        double[] predicted = theory.distanceAfterEveryUpdate(UpdateSequence.of(rates, n, b, sampling, beta), start);

        SplittableRandom random = new SplittableRandom(seed);
        double[] sum = new double[updates];
        double[] sumSquares = new double[updates];
        double[] e = new double[P];
        double[] v = new double[P];
        double[] g = new double[P];
        int[] order = new int[n];
        int[] batch = new int[b];
        for (int chain = 0; chain < CHAINS; chain++) {
            System.arraycopy(start, 0, e, 0, P);
            java.util.Arrays.fill(v, 0.0);
            int t = 0;
            for (int epoch = 0; epoch < ReshufflingRecursionTest.EPOCHS; epoch++) {
                if (sampling == BatchSampling.SHUFFLE) {
                    for (int i = 0; i < n; i++) {
                        order[i] = i;
                    }
                    for (int i = n - 1; i > 0; i--) {
                        int j = random.nextInt(i + 1);
                        int swap = order[i];
                        order[i] = order[j];
                        order[j] = swap;
                    }
                }
                for (int k = 0; k < perEpoch; k++) {
                    int size;
                    if (sampling == BatchSampling.SHUFFLE) {
                        size = Math.min(b, n - k * b);
                        System.arraycopy(order, k * b, batch, 0, size);
                    } else {
                        size = b;
                        for (int j = 0; j < b; j++) {
                            batch[j] = random.nextInt(n);
                        }
                    }
                    for (int x = 0; x < P; x++) {
                        double he = 0;
                        for (int y = 0; y < P; y++) {
                            he += h[x * P + y] * e[y];
                        }
                        double noise = 0;
                        for (int j = 0; j < size; j++) {
                            noise += u[batch[j] * P + x];
                        }
                        g[x] = he + noise / size;
                    }
                    double a = rates[t];
                    double d = 0;
                    for (int x = 0; x < P; x++) {
                        v[x] = beta * v[x] + g[x];
                        e[x] -= a * v[x];
                        d += e[x] * e[x];
                    }
                    sum[t] += d;
                    sumSquares[t] += d * d;
                    t++;
                }
            }
        }
        double largest = 0;
        for (int t = 0; t < updates; t++) {
            double mean = sum[t] / CHAINS;
            double variance = (sumSquares[t] - CHAINS * mean * mean) / (CHAINS - 1);
            largest = Math.max(largest, Math.abs(mean - predicted[t]) / Math.sqrt(variance / CHAINS));
        }
        System.out.printf(Locale.ROOT, "%s β = %s: largest |z| over %d updates = %.3f%n", sampling, beta, updates,
                largest);
        return largest;
    }
}
