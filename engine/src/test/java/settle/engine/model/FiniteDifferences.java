package settle.engine.model;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;

/**
 * Central finite differences of the batch objective, the textbook check of an analytic gradient
 * (common practice: ∂F/∂θ_j ≈ (F(θ + h e_j) − F(θ − h e_j)) / 2h, truncation error O(h²)).
 */
final class FiniteDifferences {

    /** Step of the central difference: truncation ~h²·F''' ≈ 1e-12, rounding ~ε·F/h ≈ 2e-11. */
    static final double STEP = 1e-5;
    /** Relative agreement asked by the issue. */
    static final double RELATIVE = 1e-6;
    /** Components smaller than this are at the difference quotient's noise floor (rounding ≈ 2e-11). */
    static final double ABSOLUTE_FLOOR = 1e-9;

    private FiniteDifferences() {
    }

    /** @return the central-difference gradient of the batch objective at θ (θ restored on return) */
    static double[] numericGradient(Model model, double[] theta, double[] x, int[] y, int n) {
        Model.Workspace ws = model.workspace(n);
        double[] scratch = new double[theta.length];
        double[] numeric = new double[theta.length];
        for (int j = 0; j < theta.length; j++) {
            double saved = theta[j];
            theta[j] = saved + STEP;
            double plus = model.batchObjective(theta, x, y, n, scratch, ws);
            theta[j] = saved - STEP;
            double minus = model.batchObjective(theta, x, y, n, scratch, ws);
            theta[j] = saved;
            numeric[j] = (plus - minus) / (2 * STEP);
        }
        return numeric;
    }

    /**
     * Asserts that the analytic batch gradient matches the central difference, componentwise
     * (|a − f| ≤ 1e-6·max(|a|, |f|) or below the noise floor) and in norm (‖a − f‖ ≤ 1e-6‖f‖).
     */
    static void assertGradientMatches(Model model, double[] theta, double[] x, int[] y, int n, String label) {
        double[] analytic = new double[theta.length];
        model.batchObjective(theta, x, y, n, analytic, model.workspace(n));
        double[] numeric = numericGradient(model, theta, x, y, n);
        double diff2 = 0;
        double norm2 = 0;
        for (int j = 0; j < theta.length; j++) {
            double d = Math.abs(analytic[j] - numeric[j]);
            double scale = Math.max(Math.abs(analytic[j]), Math.abs(numeric[j]));
            assertTrue(d <= RELATIVE * scale || d <= ABSOLUTE_FLOOR,
                    label + ": component " + j + " analytic " + analytic[j] + " numeric " + numeric[j]);
            diff2 += d * d;
            norm2 += numeric[j] * numeric[j];
        }
        assertTrue(Math.sqrt(diff2) <= RELATIVE * Math.sqrt(norm2),
                label + ": relative error " + Math.sqrt(diff2 / norm2));
        assertTrue(Math.sqrt(norm2) > 1e-5, label + ": gradient too small to be a test: " + Math.sqrt(norm2));
    }

    /** @return n × d standard normal features */
    static double[] features(SplittableRandom rng, int n, int d) {
        double[] x = new double[n * d];
        for (int i = 0; i < x.length; i++) {
            x[i] = rng.nextGaussian();
        }
        return x;
    }

    /** @return n labels drawn uniformly from 0..K−1, every class present when n ≥ K */
    static int[] labels(SplittableRandom rng, int n, int classes) {
        int[] y = new int[n];
        for (int i = 0; i < n; i++) {
            y[i] = i < classes ? i : rng.nextInt(classes);
        }
        return y;
    }

    /** @return P values drawn from N(0, scale²) */
    static double[] point(SplittableRandom rng, int count, double scale) {
        double[] theta = new double[count];
        for (int i = 0; i < count; i++) {
            theta[i] = scale * rng.nextGaussian();
        }
        return theta;
    }
}
