package settle.engine.theory;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * The recursion against a Monte-Carlo run of the linear recursion e_{t+1} = (I − a_t H) e_t − a_t ξ_t it
 * describes: a quadratic objective with non-diagonal H and a finite population of N per-example noise
 * vectors g_i (the per-example gradient at θ is H e + g_i, Σ g_i = 0), mini-batches of B indices drawn
 * with replacement, a decaying rate, a non-zero start. The exact first two moments of e_t are what the
 * recursion predicts, so the chain means must agree within their sampling error.
 *
 * <p>Tolerance: each check allows z · s / √chains, s the sample standard deviation over chains. With
 * 40 checks (20 epochs × 2 quantities) and an overall false-failure rate of 1e-6 (Bonferroni), each
 * two-sided check has 2.5e-8, z = 5.5732711470706615 (scipy 1.10.1 norm.isf(1.25e-8), printed by
 * make_check_values.py). The chain mean of 50 000 draws is normal to a good approximation (CLT).
 */
class NoiseBallMonteCarloTest {

    private static final double Z = 5.5732711470706615;
    private static final int CHAINS = 50_000;
    private static final int N = 20;
    private static final int B = 4;
    private static final int EPOCHS = 20;
    private static final int P = 3;

    /** (1/9)[[25, −10, 2], [−10, 22, −8], [2, −8, 16]]: eigenvalues 1, 2, 4 (see NoiseBallTheoryTest). */
    private static final double[] H = {25 / 9.0, -10 / 9.0, 2 / 9.0, -10 / 9.0, 22 / 9.0, -8 / 9.0, 2 / 9.0,
        -8 / 9.0, 16 / 9.0};

    @Test
    void chainMeansMatchThePrediction() {
        SplittableRandom random = new SplittableRandom(20260501L);
        double[] g = new double[N * P];
        for (int i = 0; i < g.length; i++) {
            g[i] = random.nextGaussian() * (1 + (i % P));
        }
        for (int k = 0; k < P; k++) {
            double mean = 0;
            for (int i = 0; i < N; i++) {
                mean += g[i * P + k];
            }
            mean /= N;
            for (int i = 0; i < N; i++) {
                g[i * P + k] -= mean;
            }
        }
        double[] c = new double[P * P];
        for (int i = 0; i < N; i++) {
            for (int a = 0; a < P; a++) {
                for (int b = 0; b < P; b++) {
                    c[a * P + b] += g[i * P + a] * g[i * P + b] / N;
                }
            }
        }
        int perEpoch = (N + B - 1) / B;
        int updates = EPOCHS * perEpoch;
        double[] rates = new double[updates];
        for (int t = 1; t <= updates; t++) {
            rates[t - 1] = 0.3 / (1 + 0.02 * t);
        }
        double[] start = {1.0, -0.5, 0.25};
        NoiseBallTheory theory = NoiseBallTheory.of(P, H, c, N);
        NoiseBallPrediction p = theory.predict(UpdateSequence.of(rates, N, B, BatchSampling.REPLACEMENT), start,
                perEpoch, ObjectiveKind.QUADRATIC);

        double[] sumD = new double[EPOCHS];
        double[] sumD2 = new double[EPOCHS];
        double[] sumL = new double[EPOCHS];
        double[] sumL2 = new double[EPOCHS];
        double[] e = new double[P];
        double[] step = new double[P];
        for (int chain = 0; chain < CHAINS; chain++) {
            System.arraycopy(start, 0, e, 0, P);
            for (int t = 0; t < updates; t++) {
                for (int a = 0; a < P; a++) {
                    double he = 0;
                    for (int b = 0; b < P; b++) {
                        he += H[a * P + b] * e[b];
                    }
                    step[a] = he;
                }
                for (int j = 0; j < B; j++) {
                    int i = random.nextInt(N);
                    for (int a = 0; a < P; a++) {
                        step[a] += g[i * P + a] / B;
                    }
                }
                for (int a = 0; a < P; a++) {
                    e[a] -= rates[t] * step[a];
                }
                if ((t + 1) % perEpoch == 0) {
                    int epoch = (t + 1) / perEpoch - 1;
                    double d = 0;
                    double l = 0;
                    for (int a = 0; a < P; a++) {
                        d += e[a] * e[a];
                        for (int b = 0; b < P; b++) {
                            l += 0.5 * e[a] * H[a * P + b] * e[b];
                        }
                    }
                    sumD[epoch] += d;
                    sumD2[epoch] += d * d;
                    sumL[epoch] += l;
                    sumL2[epoch] += l * l;
                }
            }
        }
        double[] predictedD = p.epochDistanceSq();
        double[] predictedL = p.epochExcessLoss();
        for (int epoch = 0; epoch < EPOCHS; epoch++) {
            check(predictedD[epoch], sumD[epoch], sumD2[epoch], "E‖e‖² at the end of epoch " + (epoch + 1));
            check(predictedL[epoch], sumL[epoch], sumL2[epoch], "excess loss at the end of epoch " + (epoch + 1));
        }
    }

    private static void check(double predicted, double sum, double sumSquares, String what) {
        double mean = sum / CHAINS;
        double variance = (sumSquares - CHAINS * mean * mean) / (CHAINS - 1);
        double tolerance = Z * Math.sqrt(variance / CHAINS);
        assertEquals(predicted, mean, tolerance, what);
    }
}
