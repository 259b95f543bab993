package settle.reports.metrics;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Locale;
import java.util.SplittableRandom;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import settle.reports.stats.Interval;
import settle.reports.stats.Jackknife;

/**
 * Coverage of the arm-level intervals, measured by simulation (our own; the true values are known by
 * construction): the jackknife interval on the log scale ({@link Jackknife}) of the pair-mean spreads of
 * {@link Spread}, at nominal 95 %, over {@value #TRIALS} simulated arms each.
 *
 * <ul>
 *   <li>seed spread: S final iterates drawn from a Gaussian in P = 31 dimensions with standard deviations spread
 *       evenly from 1 to 3 (the true spread is sqrt(Σ σ_j²));</li>
 *   <li>disagreement: S replicates classify 200 test rows, row r as class 1 with its own probability q_r (evenly
 *       spread over [0, 0.3]), independently (the true disagreement is the mean over rows of 2 q_r (1 − q_r)).</li>
 * </ul>
 * The binomial standard error of a coverage near 0.95 over 2 000 trials is 0.005, so the bound 0.93 is four of them
 * below the nominal level. Measured while writing this (a numpy copy of the same estimator, 400 trials each): in one
 * dimension, where a spread is a single skewed variance, coverage falls to 0.93 (Gaussian) and 0.89 (Student t₅)
 * at S = 10; docs/stats.md says so.
 */
class ArmLevelCoverageTest {

    private static final int TRIALS = 2_000;
    private static final double LEAST_COVERAGE = 0.93;

    @ParameterizedTest(name = "seed spread, S = {0}")
    @CsvSource({"6", "10", "20"})
    void seedSpreadIntervalCovers(int replicates) {
        SplittableRandom random = new SplittableRandom(20261205L + replicates);
        int p = 31;
        double[] sigma = new double[p];
        double truth = 0;
        for (int j = 0; j < p; j++) {
            sigma[j] = 1 + 2.0 * j / (p - 1);
            truth += sigma[j] * sigma[j];
        }
        truth = Math.sqrt(truth);
        int covered = 0;
        for (int trial = 0; trial < TRIALS; trial++) {
            double[][] theta = new double[replicates][p];
            for (int s = 0; s < replicates; s++) {
                for (int j = 0; j < p; j++) {
                    theta[s][j] = sigma[j] * random.nextGaussian();
                }
            }
            Spread.PairMeans m = Spread.pairMeans(Spread.halfSquaredDistances(theta, 1.0), replicates);
            double[] roots = m.leaveOneOut();
            for (int i = 0; i < roots.length; i++) {
                roots[i] = Math.sqrt(roots[i]);
            }
            Interval interval = Jackknife.interval(Math.sqrt(m.value()), roots, 0.95);
            covered += interval.low() <= truth && truth <= interval.high() ? 1 : 0;
        }
        assertCovers("seed spread, S = " + replicates, covered);
    }

    @ParameterizedTest(name = "disagreement, S = {0}")
    @CsvSource({"6", "10", "20"})
    void disagreementIntervalCovers(int replicates) {
        SplittableRandom random = new SplittableRandom(20261206L + replicates);
        int rows = 200;
        double[] q = new double[rows];
        double truth = 0;
        for (int r = 0; r < rows; r++) {
            q[r] = 0.3 * r / (rows - 1);
            truth += 2 * q[r] * (1 - q[r]) / rows;
        }
        int covered = 0;
        for (int trial = 0; trial < TRIALS; trial++) {
            double[][] probabilities = new double[replicates][2 * rows];
            for (int s = 0; s < replicates; s++) {
                for (int r = 0; r < rows; r++) {
                    boolean one = random.nextDouble() < q[r];
                    probabilities[s][2 * r] = one ? 0.2 : 0.8;
                    probabilities[s][2 * r + 1] = one ? 0.8 : 0.2;
                }
            }
            Spread.PairMeans m = Spread.pairMeans(Spread.disagreement(probabilities, 2), replicates);
            Interval interval = Jackknife.interval(m.value(), m.leaveOneOut(), 0.95);
            covered += interval.low() <= truth && truth <= interval.high() ? 1 : 0;
        }
        assertCovers("disagreement, S = " + replicates, covered);
    }

    private static void assertCovers(String what, int covered) {
        double coverage = covered / (double) TRIALS;
        System.out.printf(Locale.ROOT, "%s: coverage %.3f at nominal 0.95 over %d trials%n", what, coverage, TRIALS);
        assertTrue(coverage >= LEAST_COVERAGE, what + ": coverage " + coverage);
    }
}
