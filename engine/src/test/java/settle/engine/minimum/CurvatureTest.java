package settle.engine.minimum;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import settle.engine.model.BinaryLogistic;
import settle.engine.model.Model;
import settle.engine.model.SoftmaxRegression;

/**
 * H and C at θ* against independent computations: H against central finite differences of the model's own
 * gradient, C against the covariance of per-example gradients from the model's addGradientSum one row at a
 * time, the eigen-decomposition against its definition (HQ = QΛ, QᵀQ = I, ascending).
 */
class CurvatureTest {

    /** Central differences of the gradient, step h: truncation O(h²), rounding O(ε/h) (common practice). */
    private static final double STEP = 1e-5;
    private static final double DIFFERENCE_TOLERANCE = 1e-8;
    /** Agreement of two exact computations in double precision. */
    private static final double ROUNDING_TOLERANCE = 1e-12;

    private static Fixtures.Data fixture(String name) {
        return Fixtures.data(name);
    }

    @ParameterizedTest
    @CsvSource({"binary, 0.01", "binary, 0.0", "multinomial, 0.02", "multinomial, 0.0"})
    void hessianMatchesFiniteDifferencesOfTheGradient(String name, double l2) {
        Fixtures.Data data = fixture(name);
        Model model = data.model(l2);
        Objective objective = new Objective(model, data.x(), data.y(), 0.0);
        int p = model.parameterCount();
        SplittableRandom random = new SplittableRandom(17);
        double[] theta = new double[p];
        for (int i = 0; i < p; i++) {
            theta[i] = 0.3 * random.nextGaussian();
        }
        DMatrixRMaj h = objective.hessian(theta);
        double[] plus = new double[p];
        double[] minus = new double[p];
        double scale = CommonOps_DDRM.elementMaxAbs(h);
        for (int c = 0; c < p; c++) {
            double[] shifted = theta.clone();
            shifted[c] += STEP;
            objective.valueAndGradient(shifted, plus);
            shifted[c] = theta[c] - STEP;
            objective.valueAndGradient(shifted, minus);
            for (int r = 0; r < p; r++) {
                double difference = (plus[r] - minus[r]) / (2 * STEP);
                assertEquals(difference, h.get(r, c), DIFFERENCE_TOLERANCE * scale, "H[" + r + "," + c + "]");
            }
        }
    }

    @ParameterizedTest
    @CsvSource({"binary, 0.01", "multinomial, 0.02", "multinomial, 0.0"})
    void covarianceMatchesPerExampleGradients(String name, double l2) {
        Fixtures.Data data = fixture(name);
        Model model = data.model(l2);
        Minimum minimum = new Minimiser().minimise(model, data.x(), data.y());
        double[] theta = minimum.theta();
        int p = model.parameterCount();
        int n = data.y().length;
        int d = data.features();
        // per-example gradient of loss_i + (λ/2)‖weights‖², each from the model with a batch of one row
        Model.Workspace workspace = model.workspace(1);
        double[][] g = new double[n][p];
        double[] mean = new double[p];
        double[] row = new double[d];
        for (int i = 0; i < n; i++) {
            System.arraycopy(data.x(), i * d, row, 0, d);
            model.batchObjective(theta, row, new int[] {data.y()[i]}, 1, g[i], workspace);
            for (int c = 0; c < p; c++) {
                mean[c] += g[i][c] / n;
            }
        }
        // their mean is ∇F(θ*) ≈ 0
        for (int c = 0; c < p; c++) {
            assertEquals(0.0, mean[c], 1e-10, "mean per-example gradient");
        }
        DMatrixRMaj direct = new DMatrixRMaj(p, p);
        for (int i = 0; i < n; i++) {
            for (int r = 0; r < p; r++) {
                for (int c = 0; c < p; c++) {
                    direct.add(r, c, (g[i][r] - mean[r]) * (g[i][c] - mean[c]) / n);
                }
            }
        }
        GaugeBasis gauge = GaugeBasis.of(model);
        DMatrixRMaj expected = gauge.project(direct);
        Curvature curvature = Curvature.at(model, data.x(), data.y(), theta);
        DMatrixRMaj actual = curvature.covariance();
        double scale = CommonOps_DDRM.elementMaxAbs(expected);
        for (int r = 0; r < p; r++) {
            for (int c = 0; c < p; c++) {
                assertEquals(expected.get(r, c), actual.get(r, c), ROUNDING_TOLERANCE * scale, "C[" + r + "," + c + "]");
            }
        }
    }

    @ParameterizedTest
    @CsvSource({"binary, 0.01, 0", "binary, 0.0, 0", "multinomial, 0.02, 1", "multinomial, 0.0, 5"})
    void eigenDecompositionOnTheGaugeFreeSubspace(String name, double l2, int gaugeDimension) {
        Fixtures.Data data = fixture(name);
        Model model = data.model(l2);
        double[] theta = new Minimiser().minimise(model, data.x(), data.y()).theta();
        Curvature curvature = Curvature.at(model, data.x(), data.y(), theta);
        int p = model.parameterCount();
        int f = p - gaugeDimension;
        assertEquals(gaugeDimension, curvature.gaugeDimension());

        double[] values = curvature.eigenvalues();
        assertEquals(f, values.length);
        double[] sorted = values.clone();
        Arrays.sort(sorted);
        assertTrue(Arrays.equals(sorted, values), "ascending");
        assertTrue(values[0] > 0, "positive definite on the gauge-free subspace: " + values[0]);
        assertEquals(values[0], curvature.lambdaMin());
        assertEquals(values[f - 1], curvature.lambdaMax());
        assertEquals(2.0 / values[f - 1], curvature.stabilityBound());

        DMatrixRMaj h = curvature.hessian();
        DMatrixRMaj q = curvature.eigenvectors();
        DMatrixRMaj hq = new DMatrixRMaj(p, f);
        CommonOps_DDRM.mult(h, q, hq);
        double scale = curvature.lambdaMax();
        for (int c = 0; c < f; c++) {
            for (int r = 0; r < p; r++) {
                assertEquals(values[c] * q.get(r, c), hq.get(r, c), ROUNDING_TOLERANCE * 100 * scale, "HQ = QΛ");
            }
        }
        DMatrixRMaj qtq = new DMatrixRMaj(f, f);
        CommonOps_DDRM.multTransA(q, q, qtq);
        for (int a = 0; a < f; a++) {
            for (int b = 0; b < f; b++) {
                assertEquals(a == b ? 1.0 : 0.0, qtq.get(a, b), 1e-10, "QᵀQ = I");
            }
        }
        // QΛQᵀ rebuilds H
        DMatrixRMaj rebuilt = new DMatrixRMaj(p, p);
        for (int c = 0; c < f; c++) {
            for (int r = 0; r < p; r++) {
                for (int s = 0; s < p; s++) {
                    rebuilt.add(r, s, values[c] * q.get(r, c) * q.get(s, c));
                }
            }
        }
        for (int r = 0; r < p; r++) {
            for (int s = 0; s < p; s++) {
                assertEquals(h.get(r, s), rebuilt.get(r, s), 1e-10 * scale, "QΛQᵀ = H");
            }
        }
        // QᵀCQ from the accessor equals the product written out
        DMatrixRMaj c = curvature.covariance();
        DMatrixRMaj inBasis = curvature.covarianceInEigenbasis();
        DMatrixRMaj cq = new DMatrixRMaj(p, f);
        CommonOps_DDRM.mult(c, q, cq);
        for (int a = 0; a < f; a++) {
            for (int b = 0; b < f; b++) {
                double sum = 0;
                for (int r = 0; r < p; r++) {
                    sum += q.get(r, a) * cq.get(r, b);
                }
                assertEquals(sum, inBasis.get(a, b), 1e-12, "QᵀCQ");
            }
        }
    }

    @Test
    void softmaxBiasDirectionIsNullForTheUnprojectedHessian() {
        Fixtures.Data data = fixture("multinomial");
        Model model = data.model(0.02);
        Objective objective = new Objective(model, data.x(), data.y(), 0.0);
        double[] theta = new Minimiser().minimise(model, data.x(), data.y()).theta();
        DMatrixRMaj h = objective.hessian(theta);
        int p = model.parameterCount();
        int k = data.classes();
        // (diag(p) − ppᵀ)·1 = 0, so H·(0, …, 0, 1, …, 1) = 0 on the biases (hand-derived)
        for (int r = 0; r < p; r++) {
            double sum = 0;
            for (int u = 0; u < k; u++) {
                sum += h.get(r, p - k + u);
            }
            assertEquals(0.0, sum, ROUNDING_TOLERANCE, "row " + r);
        }
        // and the projected Hessian keeps that null direction while the eigenvalues leave it out
        Curvature curvature = Curvature.at(model, data.x(), data.y(), theta);
        assertEquals(p - 1, curvature.eigenvalues().length);
    }

    @Test
    void gaugeBasisIsOrthonormalAndSpansTheCentredVectors() {
        GaugeBasis gauge = GaugeBasis.of(new SoftmaxRegression(3, 4, 0.0));
        DMatrixRMaj b = gauge.basis();
        int p = 16;
        assertEquals(4, gauge.dimension());
        assertEquals(p - 4, b.numCols);
        DMatrixRMaj btb = new DMatrixRMaj(b.numCols, b.numCols);
        CommonOps_DDRM.multTransA(b, b, btb);
        for (int a = 0; a < b.numCols; a++) {
            for (int c = 0; c < b.numCols; c++) {
                assertEquals(a == c ? 1.0 : 0.0, btb.get(a, c), ROUNDING_TOLERANCE);
            }
        }
        // B Bᵀ is the projector: applied to a random vector it equals centring each group
        SplittableRandom random = new SplittableRandom(3);
        double[] v = new double[p];
        for (int i = 0; i < p; i++) {
            v[i] = random.nextGaussian();
        }
        double[] reduced = new double[p - 4];
        gauge.reduce(v, 0, reduced);
        double[] back = new double[p];
        gauge.expand(reduced, back);
        double[] centred = v.clone();
        gauge.project(centred);
        assertTrue(Fixtures.maxAbsDifference(centred, back) <= ROUNDING_TOLERANCE);
        assertEquals(0, GaugeBasis.of(new BinaryLogistic(3, 0.0)).dimension());
        assertEquals(1, GaugeBasis.of(new SoftmaxRegression(3, 4, 0.5)).dimension());
    }

    @Test
    void tooManyParametersSaySoInsteadOfComputing() {
        Model model = new SoftmaxRegression(400, 10, 0.01);
        assertTrue(Curvature.skipReason(model).orElseThrow().contains("4010 parameters exceed the dense-Hessian limit"));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> Curvature.at(model, new double[400], new int[] {0}, new double[4010]));
        assertTrue(e.getMessage().startsWith("curvature not computed"));
        assertTrue(Curvature.skipReason(new SoftmaxRegression(4, 3, 0.0)).isEmpty());
    }
}
