package settle.engine.theory;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Locale;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import settle.datasets.DataSources;
import settle.datasets.Dataset;
import settle.datasets.Split;
import settle.datasets.Splits;
import settle.datasets.Standardiser;
import settle.engine.minimum.Curvature;
import settle.engine.minimum.Minimiser;
import settle.engine.minimum.Minimum;
import settle.engine.model.Initialisation;
import settle.engine.model.Model;
import settle.engine.model.ModelSpec;
import settle.engine.schedule.Constant;
import settle.engine.schedule.Warmup;
import settle.engine.train.EpochRecord;
import settle.engine.train.ReferencePoint;
import settle.engine.train.ReplicateResult;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.Sampling;
import settle.engine.train.Trainer;
import settle.engine.train.TrainingSettings;
import settle.engine.train.Wander;

/**
 * The predicted noise ball against real SGD on real data: L2-logistic regression (λ = 0.01) on the bundled WDBC
 * data (UCI "Breast Cancer Wisconsin (Diagnostic)", Street, Wolberg &amp; Mangasarian 1993; the copy shipped in
 * Debian's python3-sklearn 1.2.1), 80 % stratified training split (N = 456 rows, P = 31 parameters, no gauge),
 * z-scored on the training split. Replacement sampling, B = 32, a constant rate, {@code init: reference}
 * (every replicate starts at θ*).
 *
 * <p>Theory: the per-update mean and covariance recursion of DESIGN.md "Theory" (Liu, Ziyin &amp; Ueda, "Noise
 * and Fluctuation of Finite Learning Rate Stochastic Gradient Descent", ICML 2021), with H and C taken at θ*.
 * For replacement sampling C_B = C/B exactly, and a binary logistic model has no gauge, so the only thing the
 * prediction leaves out is the non-quadratic part of the logistic loss (and the change of the gradient noise
 * with θ): it is first-order in the ball.
 *
 * <p>Rates. On this problem λmin(H) = 0.009590, λmax(H) = 0.20986 (both on the training split, printed by the
 * test). α = 0.2 gives α·λmax = 0.042 and α/2 = 0.1 gives 0.021, both ≤ 0.1. From θ* the mean stays at 0 and
 * the spread along eigenvector i grows as 1 − (1 − αλ_i)^{2t}; the slowest mode's mean relaxation time
 * 1/(αλmin) is 521 updates at α and 1 043 at α/2. The run is 1 000 epochs × ⌈456/32⌉ = 15 000 updates (28.8
 * and 14.4 such times); the first 150 epochs (2 250 updates: 4.3 and 2.2 times, i.e. 8.6 and 4.3 relaxation
 * times of the slowest variance) are left out, and the tail is the last 850 epochs (τ = 0.85, measured at its 850
 * epoch ends). Stationarity is measured, not assumed: the predicted curve at the tail's first epoch and its
 * tail mean must lie within {@link #STATIONARY} of the constant-rate fixed point.
 *
 * <p>Standard error: the per-replicate tail distance² (the mean of ‖θ_k − θ*‖² over the replicate's 850
 * tail epoch ends, {@link Wander#tailDistanceEpochEnds()} squared) is one number per replicate; replicates are independent
 * (their batches come from separate streams derived from the root seed and the replicate index, the start θ* is
 * the same fixed point), so SE = sd / √R over the R = 20 replicate means, which carries every autocorrelation
 * inside a replicate. It assumes each replicate mean is close to normal: the tail spans many integrated
 * autocorrelation times, which the test measures (τ̂ = K·var(replicate means)/var(snapshot values), in
 * snapshots) and requires to be at least {@link #MIN_TAU_RATIO} times shorter than the tail. For the ratio of
 * the two rates (replicate k of both arms shares its seeds, hence its batches) the SE is the delta-method one
 * of a ratio of paired means, sd(y_k − r̂ x_k) / (√R · x̄).
 *
 * <p>False-failure rate: if the prediction were right to within 2 %, the studentised mean follows Student's t
 * with R − 1 = 19 degrees of freedom and one check fails with probability at most P(|t₁₉| &gt; 3) = 0.00736
 * (scipy 1.10.1, 2·t.sf(3, 19)), the three checks together at most 2.2 % (Bonferroni) over the choice of root
 * seed; with the seeds fixed here the test is deterministic. Measured while choosing the settings (the same code
 * path with another root seed, 1 000 epochs, 40 replicates per row, B = 32 unless said): the first-order prediction under-predicts by +4.1 ± 0.6 % at α = 0.4, +2.0 ±
 * 0.9 % at α = 0.2 (and +1.9 ± 0.8 % at α = 0.4, B = 64; +2.3 ± 0.9 % at α = 0.1, B = 16), +1.0 ± 1.2 % at
 * α = 0.1 and −0.1 ± 1.2 % at α = 0.05 (20 replicates): a relative excess of about 1.5·E‖θ − θ*‖², set by the
 * size of the ball (α/B), as a second-order effect of the loss's curvature should be. At α = 0.2 it uses up
 * the 2 % allowance, so that check's false-failure rate is rather the one-sided P(t₁₉ &gt; 3) ≈ 0.4 %.
 */
class NoiseBallOnWdbcTest {

    private static final double L2 = 0.01;
    private static final double TEST_FRACTION = 0.2;
    private static final long SPLIT_SEED = 2026L;
    private static final long ROOT_SEED = 20260502L;
    /** α; the second arm runs at α/2. */
    private static final double RATE = 0.2;
    private static final int BATCH = 32;
    private static final int EPOCHS = 1_000;
    private static final int BURN_IN_EPOCHS = 150;
    private static final int TAIL_EPOCHS = EPOCHS - BURN_IN_EPOCHS;
    private static final int REPLICATES = 20;

    /** The issue asks for α·λmax ≤ 0.1. */
    private static final double MAX_RATE_TIMES_CURVATURE = 0.1;
    /** The tolerance of every comparison: this many standard errors … */
    private static final double STANDARD_ERRORS = 3.0;
    /** … plus this fraction of the prediction (the first-order allowance). */
    private static final double RELATIVE_SLACK = 0.02;
    /** The predicted curve over the tail lies this close (relative) to the fixed point. */
    private static final double STATIONARY = 0.005;
    /** The tail holds at least this many integrated autocorrelation times. */
    private static final double MIN_TAU_RATIO = 20.0;
    /** Tail distance² over the epoch ends against the epoch records' distances: the same iterates, summed apart. */
    private static final double SAME_ITERATES = 1e-9;

    private static Problem problem;
    private static Arm full;
    private static Arm half;

    /** The WDBC problem: the training split, the model, θ*, and the theory built from H and C at θ*. */
    private record Problem(Dataset train, Model model, Minimum minimum, Curvature curvature, NoiseBallTheory theory) {
    }

    /**
     * One arm's replicates.
     *
     * @param tailDistanceSq per replicate: the mean of ‖θ_k − θ*‖² over its tail epoch ends
     * @param predicted the predicted tail mean of E‖θ_t − θ*‖² (the same for every replicate: a constant rate)
     * @param predictedAtTailStart the predicted E‖θ_t − θ*‖² at the tail's first epoch end
     * @param fixedPoint the stationary E‖θ − θ*‖² at this rate
     * @param tauSnapshots the measured integrated autocorrelation time of ‖θ_k − θ*‖², in snapshots (epochs)
     */
    private record Arm(double rate, double[] tailDistanceSq, double predicted, double predictedAtTailStart,
            double fixedPoint, double tauSnapshots) {

        double mean() {
            return NoiseBallOnWdbcTest.mean(tailDistanceSq);
        }

        double standardError() {
            return Math.sqrt(variance(tailDistanceSq) / tailDistanceSq.length);
        }
    }

    @BeforeAll
    static void trainBothRates() {
        Dataset all = DataSources.load("bundled:wdbc", null, null);
        Split split = Splits.stratified(all, TEST_FRACTION, SPLIT_SEED);
        Dataset train = Standardiser.fit(split.train()).apply(split.train());
        Model model = ModelSpec.logistic(L2).build(train.features(), train.classes());
        Minimum minimum = new Minimiser().minimise(model, train);
        assertTrue(minimum.converged(), "θ* found: ‖∇F‖∞ = " + minimum.gradientNorm());
        Curvature curvature = Curvature.at(model, train, minimum.theta());
        NoiseBallTheory theory = NoiseBallTheory.of(curvature.hessian(), curvature.covariance(), train.rows());
        problem = new Problem(train, model, minimum, curvature, theory);
        full = train(RATE);
        half = train(RATE / 2);
        System.out.printf(Locale.ROOT, "WDBC N = %d, P = %d, λmin = %.5g, λmax = %.5g, B = %d, %d replicates × %d"
                + " updates, tail %d epochs%n", train.rows(), model.parameterCount(), curvature.lambdaMin(),
                curvature.lambdaMax(), BATCH, REPLICATES, EPOCHS * updatesPerEpoch(), TAIL_EPOCHS);
        for (Arm arm : List.of(full, half)) {
            System.out.printf(Locale.ROOT, "α = %.3g (α·λmax = %.3f): measured %.5g ± %.2g (SE), predicted %.5g"
                    + " (fixed point %.5g), measured/predicted − 1 = %+.2f %%, τ̂ = %.1f epochs%n", arm.rate(),
                    arm.rate() * curvature.lambdaMax(), arm.mean(), arm.standardError(), arm.predicted(),
                    arm.fixedPoint(), 100 * (arm.mean() / arm.predicted() - 1), arm.tauSnapshots());
        }
        double[] ratio = ratio(full, half);
        System.out.printf(Locale.ROOT, "halving α: measured ratio %.4f ± %.2g (SE), predicted %.4f%n", ratio[0],
                ratio[1], half.predicted() / full.predicted());
    }

    private static int updatesPerEpoch() {
        return (problem.train().rows() + BATCH - 1) / BATCH;
    }

    private static Arm train(double rate) {
        Dataset train = problem.train();
        int n = train.rows();
        int p = problem.model().parameterCount();
        double[] star = problem.minimum().theta();
        TrainingSettings settings = new TrainingSettings(EPOCHS, BATCH, Sampling.REPLACEMENT, 0.0,
                TAIL_EPOCHS / (double) EPOCHS, TAIL_EPOCHS, false);
        Trainer trainer = Trainer.builder(problem.model(), train, new Constant(rate, Warmup.NONE), settings)
                .reference(new ReferencePoint(star, problem.minimum().objective()))
                .initialisation(Initialisation.REFERENCE)
                .build();
        int perEpoch = updatesPerEpoch();
        assertEquals((long) TAIL_EPOCHS * perEpoch, trainer.tailPlan().length(), "the tail is the last 850 epochs");
        assertEquals(TAIL_EPOCHS, trainer.tailPlan().epochEnds(), "the tail holds 850 epoch ends");

        double[] tailDistanceSq = new double[REPLICATES];
        double[] values = new double[REPLICATES * TAIL_EPOCHS];
        double predicted = 0;
        double predictedAtStart = 0;
        double fixedPoint = Double.NaN;
        for (int r = 0; r < REPLICATES; r++) {
            ReplicateResult result = trainer.run(ReplicateSeeds.derive(ROOT_SEED, r + 1));
            assertFalse(result.diverged(), "replicate " + (r + 1) + " at α = " + rate + " diverged");
            Wander wander = result.wander();
            tailDistanceSq[r] = wander.tailDistanceEpochEnds() * wander.tailDistanceEpochEnds();
            List<EpochRecord> epochs = result.epochs();
            double fromEpochs = 0;
            for (int e = BURN_IN_EPOCHS; e < EPOCHS; e++) {
                double d = epochs.get(e).distance();
                values[r * TAIL_EPOCHS + e - BURN_IN_EPOCHS] = d * d;
                fromEpochs += d * d;
            }
            assertEquals(tailDistanceSq[r], fromEpochs / TAIL_EPOCHS, SAME_ITERATES * tailDistanceSq[r],
                    "tail distance² over the epoch ends is their mean of ‖θ_e − θ*‖²");

            double[] offset = result.start().clone();
            for (int i = 0; i < p; i++) {
                offset[i] -= star[i];
            }
            NoiseBallPrediction prediction = problem.theory().predict(
                    UpdateSequence.of(result.rates(), n, BATCH, BatchSampling.REPLACEMENT), offset,
                    (int) trainer.tailPlan().length(), ObjectiveKind.LOGISTIC);
            predicted += prediction.tailDistanceSq() / REPLICATES;
            predictedAtStart += prediction.epochDistanceSq()[BURN_IN_EPOCHS] / REPLICATES;
            fixedPoint = prediction.fixedPoint().distanceSq();
        }
        double grand = mean(values);
        double pooled = 0;
        for (double v : values) {
            pooled += (v - grand) * (v - grand);
        }
        pooled /= values.length - 1;
        double tau = TAIL_EPOCHS * variance(tailDistanceSq) / pooled;
        return new Arm(rate, tailDistanceSq, predicted, predictedAtStart, fixedPoint, tau);
    }

    @Test
    void ratesAreSmallAndTheTailIsStationary() {
        double top = problem.curvature().lambdaMax();
        double bottom = problem.curvature().lambdaMin();
        assertTrue(RATE * top <= MAX_RATE_TIMES_CURVATURE, "α·λmax = " + RATE * top);
        assertEquals(0, problem.curvature().gaugeDimension(), "binary logistic: no gauge");
        // The run covers many relaxation times of the slowest mode at both rates.
        long updates = (long) EPOCHS * updatesPerEpoch();
        assertTrue(updates * (RATE / 2) * bottom >= 10, "updates × αλmin at α/2 = " + updates * RATE / 2 * bottom);
        for (Arm arm : List.of(full, half)) {
            assertTrue(Math.abs(arm.predictedAtTailStart() / arm.fixedPoint() - 1) <= STATIONARY,
                    "α = " + arm.rate() + ": predicted E‖θ − θ*‖² at the tail's start " + arm.predictedAtTailStart()
                            + " vs fixed point " + arm.fixedPoint());
            assertTrue(Math.abs(arm.predicted() / arm.fixedPoint() - 1) <= STATIONARY,
                    "α = " + arm.rate() + ": predicted tail mean " + arm.predicted() + " vs fixed point "
                            + arm.fixedPoint());
            assertTrue(TAIL_EPOCHS >= MIN_TAU_RATIO * arm.tauSnapshots(),
                    "α = " + arm.rate() + ": τ̂ = " + arm.tauSnapshots() + " epochs for a tail of " + TAIL_EPOCHS);
        }
    }

    @Test
    void tailDistanceMatchesThePredictionAtTheRate() {
        assertAgrees(full);
    }

    @Test
    void tailDistanceMatchesThePredictionAtHalfTheRate() {
        assertAgrees(half);
    }

    @Test
    void halvingTheRateScalesTheTailDistanceAsPredicted() {
        double[] ratio = ratio(full, half);
        double predicted = half.predicted() / full.predicted();
        double tolerance = STANDARD_ERRORS * ratio[1] + RELATIVE_SLACK * predicted;
        assertEquals(predicted, ratio[0], tolerance, String.format(Locale.ROOT,
                "measured ratio %.5f ± %.3g (SE) vs predicted %.5f", ratio[0], ratio[1], predicted));
    }

    private static void assertAgrees(Arm arm) {
        double tolerance = STANDARD_ERRORS * arm.standardError() + RELATIVE_SLACK * arm.predicted();
        assertEquals(arm.predicted(), arm.mean(), tolerance, String.format(Locale.ROOT,
                "α = %.3g: measured %.6g ± %.3g (SE) vs predicted %.6g", arm.rate(), arm.mean(), arm.standardError(),
                arm.predicted()));
    }

    /** @return {r̂, SE(r̂)}: r̂ = ȳ/x̄ over paired replicates, SE by the delta method */
    private static double[] ratio(Arm x, Arm y) {
        double mx = x.mean();
        double r = y.mean() / mx;
        double[] residual = new double[REPLICATES];
        for (int k = 0; k < REPLICATES; k++) {
            residual[k] = y.tailDistanceSq()[k] - r * x.tailDistanceSq()[k];
        }
        return new double[] {r, Math.sqrt(variance(residual) / REPLICATES) / mx};
    }

    private static double mean(double[] v) {
        double s = 0;
        for (double x : v) {
            s += x;
        }
        return s / v.length;
    }

    /** @return the sample variance (divisor n − 1) */
    private static double variance(double[] v) {
        double m = mean(v);
        double s = 0;
        for (double x : v) {
            s += (x - m) * (x - m);
        }
        return s / (v.length - 1);
    }
}
