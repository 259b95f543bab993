package settle.engine.theory;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * The recursion against THEORY.md §7.2's check values, recomputed with numpy 1.24.2 / scipy 1.10.1 by
 * src/test/resources/settle/engine/theory/make_check_values.py (its output: check_values.txt), and a
 * 3-D case with non-diagonal H computed by hand.
 */
class NoiseBallTheoryTest {

    /** Both sides compute in double precision with a few hundred roundings at most. */
    private static final double RELATIVE = 1e-12;

    private static void assertRelative(double expected, double actual, String what) {
        assertEquals(expected, actual, RELATIVE * Math.abs(expected), what);
    }

    private static double[] constant(double rate, int updates) {
        double[] r = new double[updates];
        java.util.Arrays.fill(r, rate);
        return r;
    }

    @Test
    void oneDimensionalFixedPoint() {
        // a = 0.1, h = 2, c = 1, B = 4, replacement: a c / (B h (2 − a h)) = 0.0069444 (THEORY.md §7.2);
        // numpy 1.24.2 (make_check_values.py): 0.0069444444444444484.
        NoiseBallTheory theory = NoiseBallTheory.of(1, new double[] {2.0}, new double[] {1.0}, 400);
        FixedPoint fp = theory.fixedPoint(0.1, 4, BatchSampling.REPLACEMENT, 0.0);
        assertTrue(fp.exists());
        assertRelative(0.0069444444444444484, fp.distanceSq(), "fixed point");
        assertRelative(0.5 * 2.0 * 0.0069444444444444484, fp.excessLoss(), "½ h S");
        // Running the recursion long at that rate reaches it: (1 − ah)² = 0.64 per update, 2 000 updates.
        UpdateSequence run = UpdateSequence.of(constant(0.1, 2_000), 400, 4, BatchSampling.REPLACEMENT);
        NoiseBallPrediction p = theory.predict(run, new double[] {1.0}, 100, ObjectiveKind.QUADRATIC);
        assertRelative(0.0069444444444444484, p.finalDistanceSq(), "recursion → fixed point");
        assertRelative(0.0069444444444444484, p.tailDistanceSq(), "tail average at stationarity");
        assertEquals(20, p.epochDistanceSq().length, "2 000 updates of 100 per epoch");
        assertEquals(PredictionKind.EXACT, p.kind());
        assertEquals(1.0, p.stabilityBound(), 0.0, "2/λmax = 2/2");
    }

    @Test
    void inverseTimeRecursionCountedFromOne() {
        // a_t = 0.2/(1 + 0.01 t), t = 1 … 400, h = 1.5, c = 2, B = 4, e_0 = 1 (THEORY.md §7.2: 0.0069823 with
        // t counted from 1); numpy 1.24.2: variance 0.0069822524364923635, mean 2.0323227787616279e-23.
        double[] rates = new double[400];
        for (int t = 1; t <= 400; t++) {
            rates[t - 1] = 0.2 / (1 + 0.01 * t);
        }
        NoiseBallTheory theory = NoiseBallTheory.of(1, new double[] {1.5}, new double[] {2.0}, 1600);
        UpdateSequence run = UpdateSequence.of(rates, 1600, 4, BatchSampling.REPLACEMENT);
        NoiseBallPrediction p = theory.predict(run, new double[] {1.0}, 1, ObjectiveKind.QUADRATIC);
        double mean = 2.0323227787616279e-23;
        assertRelative(0.0069822524364923635 + mean * mean, p.finalDistanceSq(), "E e² = Var + mean²");
        assertEquals(p.finalDistanceSq(), p.tailDistanceSq(), 0.0, "a one-update tail is the last update");
        assertEquals(p.finalDistanceSq(), p.epochDistanceSq()[0], 0.0, "one epoch of 400 updates");
    }

    @Test
    void twoDimensionalDiscreteLyapunov() {
        // H = [[2, .5], [.5, 1]], C = [[1, .2], [.2, .5]], a = 0.05, B = 8 (THEORY.md §7.2); scipy 1.10.1
        // solve_discrete_lyapunov(I − aH, a² C/B) in make_check_values.py.
        double[] h = {2, 0.5, 0.5, 1};
        double[] c = {1, 0.2, 0.2, 0.5};
        double[] expected = {0.0016742583509130151, -0.00010155233245028907, -0.00010155233245028904,
            0.0016627707411354803};
        NoiseBallTheory theory = NoiseBallTheory.of(2, h, c, 800);
        double[] sigma = theory.fixedPointCovariance(0.05, 8);
        for (int k = 0; k < 4; k++) {
            assertEquals(expected[k], sigma[k], RELATIVE * 0.0017, "Σ entry " + k);
        }
        FixedPoint fp = theory.fixedPoint(0.05, 8, BatchSampling.REPLACEMENT, 0.0);
        assertRelative(expected[0] + expected[3], fp.distanceSq(), "trace");
        assertRelative(0.0024548675552556109, fp.excessLoss(), "½ tr(HΣ), scipy");
        // The full O(P²) recursion reaches the same Σ: λmin ≈ 0.79, (1 − 0.05·0.79)² ≈ 0.92 per update.
        double[] run = theory.covarianceAfter(UpdateSequence.of(constant(0.05, 3_000), 800, 8,
                BatchSampling.REPLACEMENT));
        for (int k = 0; k < 4; k++) {
            assertEquals(expected[k], run[k], RELATIVE * 0.0017, "recursed Σ entry " + k);
        }
    }

    /**
     * H = Q Λ Qᵀ with Q = (1/3)[[1, 2, 2], [2, 1, −2], [2, −2, 1]] (orthogonal, symmetric) and
     * Λ = diag(1, 2, 4): H = (1/9)(q1q1ᵀ·9 + 2·q2q2ᵀ·9 + 4·q3q3ᵀ·9)
     * = (1/9)([[1,2,2],[2,4,4],[2,4,4]] + [[8,4,−8],[4,2,−4],[−8,−4,8]] + [[16,−16,8],[−16,16,−8],[8,−8,4]])
     * = (1/9)[[25, −10, 2], [−10, 22, −8], [2, −8, 16]] (trace 63/9 = 7 = 1 + 2 + 4).
     */
    private static final double[] H3 = {25 / 9.0, -10 / 9.0, 2 / 9.0, -10 / 9.0, 22 / 9.0, -8 / 9.0, 2 / 9.0,
        -8 / 9.0, 16 / 9.0};

    @Test
    void threeDimensionalNonDiagonalHandComputed() {
        // Hand-computed. C = diag(9, 0, 0) → C̃_ii = 9 Q_1i² = (1, 4, 4); m_0 = (3, 0, 0) → m̃_0 = 3 Q_1· = (1, 2, 2).
        // α = 0.1, B = 1: g = 1 − αλ = (0.9, 0.8, 0.6), noise per update α² C̃_ii = (0.01, 0.04, 0.04).
        // After update 1: S = (0.01, 0.04, 0.04), m̃ = (0.9, 1.6, 1.2);
        //   excess = ½(1·0.01 + 2·0.04 + 4·0.04) + ½(0.81 + 2·2.56 + 4·1.44) = 0.125 + 5.845 = 5.97;
        //   distance² = 0.09 + (0.81 + 2.56 + 1.44) = 4.9.
        // After update 2: S = 0.01·C̃·(1 + g²) = (0.0181, 0.0656, 0.0544), m̃ = (0.81, 1.28, 0.72);
        //   excess = ½(0.0181 + 0.1312 + 0.2176) + ½(0.6561 + 3.2768 + 2.0736) = 0.18345 + 3.00325 = 3.1867;
        //   distance² = 0.1381 + 2.8129 = 2.951.
        NoiseBallTheory theory = NoiseBallTheory.of(3, H3, new double[] {9, 0, 0, 0, 0, 0, 0, 0, 0}, 10);
        double[] lambda = theory.basis().eigenvalues();
        assertEquals(1.0, lambda[0], 1e-12);
        assertEquals(2.0, lambda[1], 1e-12);
        assertEquals(4.0, lambda[2], 1e-12);
        UpdateSequence two = new UpdateSequence(new double[] {0.1, 0.1}, new int[] {1, 1}, new int[] {1, 2},
                BatchSampling.REPLACEMENT);
        NoiseBallPrediction p = theory.predict(two, new double[] {3, 0, 0}, 2, ObjectiveKind.QUADRATIC);
        assertRelative(5.97, p.epochExcessLoss()[0], "excess loss after update 1");
        assertRelative(3.1867, p.epochExcessLoss()[1], "excess loss after update 2");
        assertRelative(4.9, p.epochDistanceSq()[0], "distance² after update 1");
        assertRelative(2.951, p.epochDistanceSq()[1], "distance² after update 2");
        assertRelative((5.97 + 3.1867) / 2, p.tailExcessLoss(), "two-update tail mean");
        assertRelative((4.9 + 2.951) / 2, p.tailDistanceSq(), "two-update tail mean");
        // Fixed point, hand-computed: S_ii = α C̃_ii / (λ_i (2 − αλ_i)) = 0.1/1.9, 0.4/3.6, 0.4/6.4
        // = 1/19, 1/9, 1/16 → Σ = 619/2736; ½ Σ λ_i S_ii = ½(1/19 + 2/9 + 1/4) = 359/1368.
        FixedPoint fp = theory.fixedPoint(0.1, 1, BatchSampling.REPLACEMENT, 0.0);
        assertRelative(619.0 / 2736.0, fp.distanceSq(), "fixed-point distance²");
        assertRelative(359.0 / 1368.0, fp.excessLoss(), "fixed-point excess loss");
        assertEquals(0.5, theory.stabilityBound(), 1e-12, "2/λmax = 2/4");
        assertEquals(0.4, p.largestRateTimesCurvature(), 1e-12, "α λmax = 0.1·4");
        // The same through EJML matrices.
        NoiseBallTheory viaEjml = NoiseBallTheory.of(new org.ejml.data.DMatrixRMaj(3, 3, true, H3),
                new org.ejml.data.DMatrixRMaj(3, 3, true, 9, 0, 0, 0, 0, 0, 0, 0, 0), 10);
        assertRelative(3.1867, viaEjml.predict(two, new double[] {3, 0, 0}, 2, ObjectiveKind.QUADRATIC)
                .finalExcessLoss(), "excess loss after update 2, EJML input");
    }

    @Test
    void shortLastBatchOfAReshuffledEpochUsesItsOwnSize() {
        // N = 10, B = 4, shuffle: batches 4, 4, 2. h = 1, c = 1, α = 0.1 (g = 0.9), m_0 = 0. Hand-computed from
        // THEORY.md §3.5: D = 0.01·(0.9⁴/4 + 0.9²/4 + 1/2)·N/(N − 1), G = 0.1·(0.9² + 0.9 + 1) = 0.271, and after the
        // epoch E e² = D − c G²/(N − 1) = (0.01·(0.6561/4 + 0.81/4 + 0.5)·10 − 0.271²)/9.
        NoiseBallTheory theory = NoiseBallTheory.of(1, new double[] {1.0}, new double[] {1.0}, 10);
        UpdateSequence epoch = UpdateSequence.of(constant(0.1, 3), 10, 4, BatchSampling.SHUFFLE);
        assertEquals(2, epoch.batches()[2]);
        NoiseBallPrediction p = theory.predict(epoch, new double[] {0.0}, 3, ObjectiveKind.LOGISTIC);
        double expected = (0.01 * (0.6561 / 4 + 0.81 / 4 + 0.5) * 10 - 0.271 * 0.271) / 9;
        assertRelative(expected, p.epochDistanceSq()[0], "after one reshuffled epoch");
        assertEquals(PredictionKind.FIRST_ORDER, p.kind());
        assertTrue(p.label().startsWith("first order"), p.label());
        assertTrue(p.label().contains("permutation"), p.label());
        // One batch alone has the finite-population variance α² c (N − B)/(B(N − 1)) = 0.01·6/36 (THEORY.md §3.3).
        NoiseBallPrediction one = theory.predict(UpdateSequence.of(constant(0.1, 1), 10, 4, BatchSampling.SHUFFLE),
                new double[] {0.0}, 1, ObjectiveKind.QUADRATIC);
        assertRelative(0.01 * 6 / 36, one.finalDistanceSq(), "the first batch of an epoch");
        // A batch of the whole split has no noise: N = B, one update per epoch, E e² stays 0.
        NoiseBallPrediction full = theory.predict(UpdateSequence.of(constant(0.1, 5), 10, 10, BatchSampling.SHUFFLE),
                new double[] {0.0}, 5, ObjectiveKind.QUADRATIC);
        assertEquals(0.0, full.finalDistanceSq(), 1e-18, "full-batch gradient descent does not wander");
    }

    @Test
    void reshuffledFixedPointAgreesWithTheLongRunRecursion() {
        // The period map's fixed point against 400 epochs of the recursion at a constant rate: (1 − αλmin)^(2·2 800)
        // ≈ 1e-24, so the run has forgotten its start. Both the epoch-mean and the epoch-end values; with momentum too.
        double[] c = ReshufflingRecursionTest.covariance(ReshufflingRecursionTest.gradients());
        NoiseBallTheory theory = NoiseBallTheory.of(3, ReshufflingRecursionTest.H, c, 50);
        for (double beta : new double[] {0.0, 0.9}) {
            for (BatchSampling sampling : BatchSampling.values()) {
                double rate = beta == 0 ? 0.1 : 0.01;
                UpdateSequence run = UpdateSequence.of(constant(rate, 400 * 7), 50, 8, sampling, beta);
                NoiseBallPrediction p = theory.predict(run, new double[3], 7, ObjectiveKind.QUADRATIC);
                FixedPoint fp = theory.fixedPoint(rate, 8, sampling, beta);
                String what = sampling + ", β = " + beta;
                assertTrue(fp.exists(), what);
                assertEquals(p.tailDistanceSq(), fp.distanceSq(), 1e-9 * fp.distanceSq(), what + ": epoch mean");
                assertEquals(p.finalDistanceSq(), fp.distanceSqEpochEnd(), 1e-9 * fp.distanceSq(), what + ": epoch end");
                assertEquals(p.tailExcessLoss(), fp.excessLoss(), 1e-9 * fp.excessLoss(), what + ": excess loss");
            }
        }
    }

    @Test
    void flatAndUnstableDirections() {
        // H = diag(0, 1): a flat direction without noise is skipped; its mean offset stays put.
        NoiseBallTheory quiet = NoiseBallTheory.of(2, new double[] {0, 0, 0, 1}, new double[] {0, 0, 0, 1}, 100);
        FixedPoint fp = quiet.fixedPoint(0.1, 1, BatchSampling.REPLACEMENT, 0.0);
        assertTrue(fp.exists());
        assertRelative(0.1 / 1.9, fp.distanceSq(), "α c / (λ(2 − αλ)) along the curved direction");
        NoiseBallPrediction p = quiet.predict(UpdateSequence.of(constant(0.1, 500), 100, 1,
                BatchSampling.REPLACEMENT), new double[] {2.0, 0.0}, 1, ObjectiveKind.QUADRATIC);
        assertRelative(4.0 + 0.1 / 1.9, p.finalDistanceSq(), "flat offset 2² stays, plus the stationary spread");
        // With noise along the flat direction there is no fixed point.
        NoiseBallTheory walk = NoiseBallTheory.of(2, new double[] {0, 0, 0, 1}, new double[] {1, 0, 0, 1}, 100);
        FixedPoint none = walk.fixedPoint(0.1, 1, BatchSampling.REPLACEMENT, 0.0);
        assertFalse(none.exists());
        assertTrue(none.note().contains("flat direction"), none.note());
        assertThrows(IllegalArgumentException.class, () -> walk.fixedPointCovariance(0.1, 1));
        // α λ = 1.1 · 2 = 2.2 ≥ 2: unstable.
        NoiseBallTheory one = NoiseBallTheory.of(1, new double[] {2.0}, new double[] {1.0}, 10);
        FixedPoint unstable = one.fixedPoint(1.1, 1, BatchSampling.REPLACEMENT, 0.0);
        assertFalse(unstable.exists());
        assertTrue(unstable.note().contains("≥ 2"), unstable.note());
    }

    @Test
    void skippedWithAReason() {
        assertTrue(NoiseBallTheory.skipReason(2_001).orElseThrow().contains("2001 parameters"));
        assertTrue(NoiseBallTheory.skipReason(2_000).isEmpty());
        NoiseBallPrediction s = NoiseBallPrediction.skipped(NoiseBallTheory.skipReason(2_001).orElseThrow());
        assertFalse(s.predicted());
        assertFalse(s.stable());
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> NoiseBallTheory.of(2_001, new double[1], new double[1], 10));
        assertTrue(e.getMessage().contains("2000"), e.getMessage());
    }

    @Test
    void badMatricesAreRefusedWithTheEntry() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> NoiseBallTheory.of(2, new double[] {1, 0.5, 0.4, 1}, new double[] {1, 0, 0, 1}, 10));
        assertTrue(e.getMessage().contains("H[0][1]"), e.getMessage());
        IllegalArgumentException f = assertThrows(IllegalArgumentException.class,
                () -> NoiseBallTheory.of(2, new double[] {1, 0, 0, -1}, new double[] {1, 0, 0, 1}, 10));
        assertTrue(f.getMessage().contains("positive semi-definite"), f.getMessage());
    }
}
