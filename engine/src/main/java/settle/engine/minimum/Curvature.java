package settle.engine.minimum;

import java.util.Arrays;
import java.util.Locale;
import java.util.Optional;
import org.ejml.data.DMatrixRMaj;
import org.ejml.data.Complex_F64;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;
import settle.datasets.Dataset;
import settle.engine.model.Model;

/**
 * The curvature of the objective at θ* that the noise-ball theory needs (DESIGN.md "Theory"), on the gauge-free
 * subspace:
 * <ul>
 *   <li>H = Π ∇²F(θ*) Π, the Hessian (closed form) projected with the gauge projector Π;</li>
 *   <li>C = Π C₀ Π, C₀ = (1/N) Σ (g_i − ḡ)(g_i − ḡ)ᵀ the covariance over examples of the per-example gradient
 *       g_i of loss_i + (λ/2)‖weights‖² at θ* (divisor N; ḡ = ∇F(θ*) ≈ 0);</li>
 *   <li>H = QΛQᵀ on the subspace: the P − g eigenvalues of H restricted to the gauge-free subspace, ascending,
 *       and their orthonormal eigenvectors (the columns of Q, in full coordinates). The g exact gauge null
 *       directions are left out, so λmin is the smallest curvature the iterates can feel.</li>
 * </ul>
 * Dense matrices: computed only up to {@link Minimiser#DENSE_LIMIT} parameters ({@link #skipReason}).
 * Instances are immutable; accessors hand out copies.
 */
public final class Curvature {

    private final DMatrixRMaj hessian;
    private final DMatrixRMaj covariance;
    private final double[] eigenvalues;
    private final DMatrixRMaj eigenvectors;
    private final int gaugeDimension;

    private Curvature(DMatrixRMaj hessian, DMatrixRMaj covariance, double[] eigenvalues, DMatrixRMaj eigenvectors,
                      int gaugeDimension) {
        this.hessian = hessian;
        this.covariance = covariance;
        this.eigenvalues = eigenvalues;
        this.eigenvectors = eigenvectors;
        this.gaugeDimension = gaugeDimension;
    }

    /**
     * @return empty when H and C can be computed for this model, else the reason they are not (too many
     *     parameters for dense matrices, or not a logistic model)
     */
    public static Optional<String> skipReason(Model model) {
        if (!model.convex()) {
            return Optional.of("curvature not computed: " + model.describe() + " is not convex");
        }
        if (model.parameterCount() > Minimiser.DENSE_LIMIT) {
            return Optional.of(String.format(Locale.ROOT,
                    "curvature not computed: %d parameters exceed the dense-Hessian limit of %d",
                    model.parameterCount(), Minimiser.DENSE_LIMIT));
        }
        return Optional.empty();
    }

    /**
     * H, C and H's eigen-decomposition at θ* on the whole dataset.
     *
     * @param thetaStar θ* (from {@link Minimiser}); not modified
     * @throws IllegalArgumentException when {@link #skipReason} is not empty or the sizes disagree
     */
    public static Curvature at(Model model, Dataset data, double[] thetaStar) {
        if (data.features() != model.inputs() || data.classes() != model.classes()) {
            throw new IllegalArgumentException(data.name() + ": " + data.features() + " features and "
                    + data.classes() + " classes, but the model has " + model.inputs() + " inputs and "
                    + model.classes() + " classes");
        }
        return at(model, data.featureMatrix(), data.labels(), thetaStar);
    }

    /** As {@link #at(Model, Dataset, double[])} for rows {@code x} (N × d, row-major) and labels {@code y}; not modified. */
    public static Curvature at(Model model, double[] x, int[] y, double[] thetaStar) {
        Optional<String> skip = skipReason(model);
        if (skip.isPresent()) {
            throw new IllegalArgumentException(skip.get());
        }
        if (thetaStar.length != model.parameterCount()) {
            throw new IllegalArgumentException("θ* has " + thetaStar.length + " values, the model "
                    + model.parameterCount() + " parameters");
        }
        Objective objective = new Objective(model, x, y, 0.0);
        GaugeBasis gauge = GaugeBasis.of(objective.layout, objective.l2, 0.0);
        double[] theta = thetaStar.clone();
        DMatrixRMaj fullHessian = objective.hessian(theta);
        DMatrixRMaj fullCovariance = objective.covariance(theta);
        DMatrixRMaj reduced = gauge.reduce(fullHessian);
        int f = reduced.numRows;

        EigenDecomposition_F64<DMatrixRMaj> eig = DecompositionFactory_DDRM.eig(f, true, true);
        if (!eig.decompose(reduced.copy())) {
            throw new IllegalStateException("the eigen-decomposition of H did not converge");
        }
        // EJML returns the eigenvalues unsorted: sort ascending, carrying the eigenvectors along
        double[] values = new double[f];
        Integer[] order = new Integer[f];
        for (int i = 0; i < f; i++) {
            Complex_F64 value = eig.getEigenvalue(i);
            values[i] = value.real;
            order[i] = i;
        }
        Arrays.sort(order, (a, b) -> Double.compare(values[a], values[b]));
        double[] sorted = new double[f];
        DMatrixRMaj q = new DMatrixRMaj(gauge.parameterCount(), f);
        double[] column = new double[gauge.parameterCount()];
        for (int c = 0; c < f; c++) {
            int source = order[c];
            sorted[c] = values[source];
            DMatrixRMaj v = eig.getEigenVector(source);
            double length = 0;
            for (int i = 0; i < f; i++) {
                length += v.data[i] * v.data[i];
            }
            length = Math.sqrt(length);
            double[] reducedVector = new double[f];
            for (int i = 0; i < f; i++) {
                reducedVector[i] = v.data[i] / length;
            }
            gauge.expand(reducedVector, column);
            for (int i = 0; i < column.length; i++) {
                q.data[i * f + c] = column[i];
            }
        }
        return new Curvature(gauge.project(fullHessian), gauge.project(fullCovariance), sorted, q, gauge.dimension());
    }

    /** @return P, the number of parameters */
    public int parameterCount() {
        return hessian.numRows;
    }

    /** @return g, the number of gauge directions left out of the eigenvalues */
    public int gaugeDimension() {
        return gaugeDimension;
    }

    /** @return H = Π∇²F(θ*)Π, P×P (a copy) */
    public DMatrixRMaj hessian() {
        return hessian.copy();
    }

    /** @return C = ΠC₀Π, the per-example gradient covariance at θ* (divisor N), P×P (a copy) */
    public DMatrixRMaj covariance() {
        return covariance.copy();
    }

    /** @return the P − g eigenvalues of H on the gauge-free subspace, ascending (a copy) */
    public double[] eigenvalues() {
        return eigenvalues.clone();
    }

    /** @return Q, P × (P − g): column c is the unit eigenvector of eigenvalue c (a copy) */
    public DMatrixRMaj eigenvectors() {
        return eigenvectors.copy();
    }

    /** @return QᵀCQ, the covariance in H's eigenbasis, (P − g) × (P − g) */
    public DMatrixRMaj covarianceInEigenbasis() {
        int p = parameterCount();
        int f = eigenvalues.length;
        DMatrixRMaj cq = new DMatrixRMaj(p, f);
        org.ejml.dense.row.CommonOps_DDRM.mult(covariance, eigenvectors, cq);
        DMatrixRMaj out = new DMatrixRMaj(f, f);
        org.ejml.dense.row.CommonOps_DDRM.multTransA(eigenvectors, cq, out);
        return out;
    }

    /** @return λmin, the smallest eigenvalue of H on the gauge-free subspace */
    public double lambdaMin() {
        return eigenvalues[0];
    }

    /** @return λmax, the largest eigenvalue of H on the gauge-free subspace */
    public double lambdaMax() {
        return eigenvalues[eigenvalues.length - 1];
    }

    /** @return 2/λmax, the largest constant rate at which the linearised mean iterate is stable */
    public double stabilityBound() {
        return stabilityBound(0.0);
    }

    /**
     * @param momentum heavy-ball β in [0, 1)
     * @return 2(1 + β)/λmax: the largest constant rate at which the linearised mean iterate is stable with heavy-ball
     *     momentum (the 2×2 block [[1 − αλ, −αβ], [λ, β]] of each eigen-direction has both eigenvalues inside the
     *     unit circle iff 0 &lt; αλ &lt; 2(1 + β)); 2/λmax without momentum
     */
    public double stabilityBound(double momentum) {
        return 2.0 * (1.0 + momentum) / lambdaMax();
    }

    /**
     * @param momentum heavy-ball β
     * @return the bound's formula in words, "2/λmax(H)" or "2(1 + β)/λmax(H)"
     */
    public static String boundFormula(double momentum) {
        return momentum == 0.0 ? "2/λmax(H)" : "2(1 + β)/λmax(H)";
    }
}
