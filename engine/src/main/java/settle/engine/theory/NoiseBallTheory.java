package settle.engine.theory;

import java.util.Locale;
import java.util.Optional;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;

/**
 * The predicted noise ball of SGD linearised at θ*: with e_t = θ_t − θ*, H = ∇²F(θ*) and C the
 * per-example gradient covariance at θ* (divisor N), the deviation has mean m_{t+1} = (I − α_t H) m_t
 * and covariance Σ_{t+1} = (I − α_t H) Σ_t (I − α_t H) + α_t² C_B, from m_0 = θ_0 − θ*, Σ_0 = 0, with
 * C_B = C/B (replacement) or C/B·(N − B)/(N − 1) (reshuffling, approximate) for each update's own B.
 *
 * <p>In H's eigenbasis (H = QΛQᵀ, C̃ = Qᵀ C Q, S = Qᵀ Σ Q, m̃ = Qᵀ m) the recursion is elementwise:
 * S_ij ← (1 − α λ_i)(1 − α λ_j) S_ij + α² f_B C̃_ij and m̃_i ← (1 − α λ_i) m̃_i. Predicted
 * E‖θ_t − θ*‖² = ‖m̃_t‖² + Σ S_ii and excess loss ½ Σ λ_i S_ii + ½ Σ λ_i m̃_i². Because the recursion
 * is elementwise, the diagonal S_ii evolves on its own, so {@link #predict} (which needs only traces)
 * costs O(P) per update; {@link #covarianceAfter} runs the full O(P²) recursion for the whole Σ.
 * Neither allocates per update. The eigen-decomposition and C̃ (O(P³)) are computed once here and
 * shared by every replicate; an instance is immutable and may be used from several threads.
 *
 * <p>Exact for a quadratic with state-independent noise (Liu, Ziyin &amp; Ueda, "Noise and Fluctuation
 * of Finite Learning Rate Stochastic Gradient Descent", ICML 2021), first-order for logistic
 * regression, approximate under reshuffling. Skipped when momentum ≠ 0 or P &gt; {@link #MAX_PARAMETERS}.
 */
public final class NoiseBallTheory {

    /** The largest number of parameters the theory is computed for. */
    public static final int MAX_PARAMETERS = 2_000;

    /**
     * An eigenvalue with |λ| ≤ this × λ_max is a flat direction (zero mode); a more negative one means H
     * is not positive semi-definite and is refused.
     */
    public static final double FLAT_TOLERANCE = 1e-12;

    private final EigenBasis basis;
    private final double[] lambda;
    private final double[] noise;        // C̃ = Qᵀ C Q, row-major P×P
    private final int examples;
    private final int p;
    private final double noiseScale;     // max |C̃_ij|

    private NoiseBallTheory(EigenBasis basis, double[] covariance, int examples) {
        this.basis = basis;
        this.p = basis.dimension();
        if (examples < 1) {
            throw new IllegalArgumentException("the number of training examples N must be at least 1: " + examples);
        }
        this.examples = examples;
        this.lambda = basis.eigenvalues();
        double top = Math.max(0.0, lambda[p - 1]);
        for (int i = 0; i < p; i++) {
            if (lambda[i] < -FLAT_TOLERANCE * top) {
                throw new IllegalArgumentException("H must be positive semi-definite at the minimiser: it has the"
                        + " eigenvalue " + lambda[i]);
            }
            if (Math.abs(lambda[i]) <= FLAT_TOLERANCE * top) {
                lambda[i] = 0.0;
            }
        }
        DMatrixRMaj c = EigenBasis.symmetrised(covariance, p, "C");
        DMatrixRMaj q = DMatrixRMaj.wrap(p, p, basis.vectorsView());
        DMatrixRMaj tmp = new DMatrixRMaj(p, p);
        DMatrixRMaj ct = new DMatrixRMaj(p, p);
        CommonOps_DDRM.multTransA(q, c, tmp);
        CommonOps_DDRM.mult(tmp, q, ct);
        this.noise = ct.getData().clone();
        double scale = 0;
        for (int i = 0; i < p; i++) {
            for (int j = i; j < p; j++) {
                double v = 0.5 * (noise[i * p + j] + noise[j * p + i]);
                noise[i * p + j] = v;
                noise[j * p + i] = v;
                scale = Math.max(scale, Math.abs(v));
            }
        }
        this.noiseScale = scale;
    }

    /**
     * @param parameters P, the dimension of the (gauge-free) parameter space
     * @param momentum heavy-ball β of the study
     * @return the reason the prediction must be skipped, or empty
     */
    public static Optional<String> skipReason(int parameters, double momentum) {
        if (momentum != 0.0) {
            return Optional.of(String.format(Locale.ROOT, "momentum %s ≠ 0: the prediction needs the augmented"
                    + " (position, velocity) recursion, which is not implemented (with momentum the mean is"
                    + " stable for α < 2(1+β)/λmax)", momentum));
        }
        if (parameters > MAX_PARAMETERS) {
            return Optional.of(String.format(Locale.ROOT, "the model has %d parameters; the theory is computed up"
                    + " to %d (a dense P×P eigen-decomposition and noise matrix)", parameters, MAX_PARAMETERS));
        }
        return Optional.empty();
    }

    /**
     * @param parameters P
     * @param hessian H at θ*, row-major P×P, symmetric. Not modified.
     * @param covariance C, the per-example gradient covariance at θ* (divisor N), row-major P×P. Not modified.
     * @param examples N, the training examples
     * @return the theory, with H decomposed by EJML and its eigenvalues sorted
     * @throws IllegalArgumentException when {@link #skipReason} gives a reason or the matrices are invalid
     */
    public static NoiseBallTheory of(int parameters, double[] hessian, double[] covariance, int examples) {
        Optional<String> skip = skipReason(parameters, 0.0);
        if (skip.isPresent()) {
            throw new IllegalArgumentException(skip.get());
        }
        return new NoiseBallTheory(EigenBasis.of(hessian, parameters, "H"), covariance, examples);
    }

    /**
     * @param hessian H at θ*, P×P, symmetric. Not modified.
     * @param covariance C at θ* (divisor N), P×P. Not modified.
     * @param examples N
     * @return the theory, with H decomposed by EJML and its eigenvalues sorted
     */
    public static NoiseBallTheory of(DMatrixRMaj hessian, DMatrixRMaj covariance, int examples) {
        int n = hessian.getNumRows();
        if (hessian.getNumCols() != n || covariance.getNumRows() != n || covariance.getNumCols() != n) {
            throw new IllegalArgumentException("H and C must both be square and of the same size: H is "
                    + hessian.getNumRows() + "×" + hessian.getNumCols() + ", C " + covariance.getNumRows() + "×"
                    + covariance.getNumCols());
        }
        return of(n, java.util.Arrays.copyOf(hessian.getData(), n * n),
                java.util.Arrays.copyOf(covariance.getData(), n * n), examples);
    }

    /**
     * @param basis H's eigen-decomposition, already computed
     * @param covariance C, row-major P×P. Not modified.
     * @param examples N
     * @return the theory
     */
    public static NoiseBallTheory of(EigenBasis basis, double[] covariance, int examples) {
        Optional<String> skip = skipReason(basis.dimension(), 0.0);
        if (skip.isPresent()) {
            throw new IllegalArgumentException(skip.get());
        }
        return new NoiseBallTheory(basis, covariance, examples);
    }

    /** @return H's eigen-decomposition, ascending */
    public EigenBasis basis() {
        return basis;
    }

    /** @return P */
    public int dimension() {
        return p;
    }

    /** @return 2/λ_max, the stability bound of the mean (+∞ when H is zero) */
    public double stabilityBound() {
        double top = lambda[p - 1];
        return top > 0 ? 2.0 / top : Double.POSITIVE_INFINITY;
    }

    /**
     * @return C̃_ii, the per-example noise variance along eigenvector i (ascending λ), as a copy
     */
    public double[] noiseAlongEigenvectors() {
        double[] d = new double[p];
        for (int i = 0; i < p; i++) {
            d[i] = noise[i * p + i];
        }
        return d;
    }

    /**
     * Runs the mean and variance recursion over one replicate's updates.
     *
     * @param updates the actual rates and batch sizes, with epoch ends
     * @param initialOffset m_0 = θ_0 − θ* (zeros for {@code init: reference}). Not modified.
     * @param tailUpdates L, 1 ≤ L ≤ T: the tail averages run over updates T − L + 1 … T
     * @param objective the objective near θ* (decides the label)
     * @return the predicted curves, tail averages, fixed point and stability figures
     */
    public NoiseBallPrediction predict(UpdateSequence updates, double[] initialOffset, int tailUpdates,
            ObjectiveKind objective) {
        int steps = updates.length();
        if (initialOffset.length != p) {
            throw new IllegalArgumentException("θ_0 − θ* has " + initialOffset.length + " entries; H is " + p + "×" + p);
        }
        if (tailUpdates < 1 || tailUpdates > steps) {
            throw new IllegalArgumentException("the tail must hold between 1 and " + steps + " updates: " + tailUpdates);
        }
        BatchSampling sampling = updates.sampling();
        double[] mean = rotateIn(initialOffset);
        double[] variance = new double[p];
        double[] epochDistance = new double[updates.epochs()];
        double[] epochLoss = new double[updates.epochs()];
        int nextEpoch = 0;
        int tailFrom = steps - tailUpdates;
        double tailDistance = 0;
        double tailLoss = 0;
        double distance = sumSquares(mean);
        double loss = 0.5 * weightedSquares(mean);
        double top = Math.max(0.0, lambda[p - 1]);
        double worst = 0;
        for (int t = 0; t < steps; t++) {
            double a = updates.rate(t);
            double f = a * a * sampling.noiseFactor(checkBatch(updates.batch(t), t), examples);
            worst = Math.max(worst, a * top);
            distance = 0;
            loss = 0;
            for (int i = 0; i < p; i++) {
                double g = 1.0 - a * lambda[i];
                double mi = g * mean[i];
                double si = g * g * variance[i] + f * noise[i * p + i];
                mean[i] = mi;
                variance[i] = si;
                double both = mi * mi + si;
                distance += both;
                loss += lambda[i] * both;
            }
            loss *= 0.5;
            if (t >= tailFrom) {
                tailDistance += distance;
                tailLoss += loss;
            }
            if (nextEpoch < epochDistance.length && updates.epochEnd(nextEpoch) == t + 1) {
                epochDistance[nextEpoch] = distance;
                epochLoss[nextEpoch] = loss;
                nextEpoch++;
            }
        }
        int nominal = 0;
        for (int t = 0; t < steps; t++) {
            nominal = Math.max(nominal, updates.batch(t));
        }
        FixedPoint fixed = steps == 0 ? null : fixedPoint(updates.rate(steps - 1), nominal, sampling);
        return new NoiseBallPrediction(true, "", PredictionKind.of(objective, sampling),
                PredictionKind.label(objective, sampling), epochDistance, epochLoss, tailUpdates,
                tailDistance / tailUpdates, tailLoss / tailUpdates, distance, loss, fixed, stabilityBound(), worst);
    }

    /**
     * The full covariance after the run, by the O(P²)-per-update elementwise recursion in the eigenbasis,
     * rotated back: Σ_T = Q S_T Qᵀ.
     *
     * @param updates the rates and batch sizes
     * @return Σ_T, row-major P×P, in the original coordinates
     */
    public double[] covarianceAfter(UpdateSequence updates) {
        double[] s = new double[p * p];
        double[] g = new double[p];
        BatchSampling sampling = updates.sampling();
        for (int t = 0; t < updates.length(); t++) {
            double a = updates.rate(t);
            double f = a * a * sampling.noiseFactor(checkBatch(updates.batch(t), t), examples);
            for (int i = 0; i < p; i++) {
                g[i] = 1.0 - a * lambda[i];
            }
            for (int i = 0; i < p; i++) {
                int row = i * p;
                double gi = g[i];
                for (int j = i; j < p; j++) {
                    s[row + j] = gi * g[j] * s[row + j] + f * noise[row + j];
                }
            }
        }
        mirrorUpper(s);
        return rotateOut(s);
    }

    /**
     * @param rate a constant α ≥ 0
     * @param batch B
     * @param sampling how batches are drawn
     * @return the stationary E‖θ − θ*‖² and excess loss for that rate, or why none exists
     */
    public FixedPoint fixedPoint(double rate, int batch, BatchSampling sampling) {
        if (!(rate >= 0) || !Double.isFinite(rate)) {
            throw new IllegalArgumentException("the rate must be a finite number ≥ 0: " + rate);
        }
        double f = sampling.noiseFactor(checkBatch(batch, -1), examples);
        double distance = 0;
        double loss = 0;
        StringBuilder note = new StringBuilder();
        boolean flatNoise = false;
        boolean unstable = false;
        if (rate > 0) {
            for (int i = 0; i < p; i++) {
                double c = f * noise[i * p + i];
                double l = lambda[i];
                if (l == 0.0) {
                    if (c > FLAT_TOLERANCE * f * noiseScale) {
                        flatNoise = true;
                    }
                    continue; // a flat direction without noise never moves: skipped
                }
                double den = l + l - rate * l * l;
                if (!(den > 0)) {
                    unstable = true;
                    continue;
                }
                double s = rate * c / den;
                distance += s;
                loss += 0.5 * l * s;
            }
        }
        if (unstable) {
            note.append(String.format(Locale.ROOT, "α·λmax = %.4g ≥ 2: the spread grows without bound",
                    rate * lambda[p - 1]));
        }
        if (flatNoise) {
            note.append(note.length() > 0 ? "; " : "")
                    .append("a flat direction of H receives noise: the spread along it grows without bound");
        }
        if (unstable || flatNoise) {
            return new FixedPoint(rate, batch, false, Double.POSITIVE_INFINITY,
                    unstable ? Double.POSITIVE_INFINITY : loss, note.toString());
        }
        return new FixedPoint(rate, batch, true, distance, loss, "");
    }

    /**
     * The stationary covariance S_ij = α C̃_ij / (λ_i + λ_j − α λ_i λ_j), rotated back to Σ = Q S Qᵀ.
     * Pairs of flat directions without noise contribute zero.
     *
     * @param rate α &gt; 0
     * @param batch B
     * @param sampling how batches are drawn
     * @return Σ, row-major P×P
     * @throws IllegalArgumentException when {@link #fixedPoint} says none exists
     */
    public double[] fixedPointCovariance(double rate, int batch, BatchSampling sampling) {
        FixedPoint fp = fixedPoint(rate, batch, sampling);
        if (!fp.exists() || !(rate > 0)) {
            throw new IllegalArgumentException("no stationary covariance at α = " + rate + ": "
                    + (fp.note().isEmpty() ? "the rate must be positive" : fp.note()));
        }
        double f = sampling.noiseFactor(batch, examples);
        double[] s = new double[p * p];
        for (int i = 0; i < p; i++) {
            for (int j = i; j < p; j++) {
                double den = lambda[i] + lambda[j] - rate * lambda[i] * lambda[j];
                double c = f * noise[i * p + j];
                // one flat direction: its noise is zero (checked above), so the entry is 0 too
                s[i * p + j] = den > 0 ? rate * c / den : 0.0;
            }
        }
        mirrorUpper(s);
        return rotateOut(s);
    }

    private int checkBatch(int batch, int update) {
        if (batch > examples) {
            throw new IllegalArgumentException((update >= 0 ? "the batch of update " + (update + 1) : "the batch")
                    + " has " + batch + " examples but the training split has only " + examples);
        }
        return batch;
    }

    private double[] rotateIn(double[] v) {
        double[] q = basis.vectorsView();
        double[] out = new double[p];
        for (int i = 0; i < p; i++) {
            double x = v[i];
            if (!Double.isFinite(x)) {
                throw new IllegalArgumentException("θ_0 − θ* entry " + i + " is not finite: " + x);
            }
            int row = i * p;
            for (int k = 0; k < p; k++) {
                out[k] += q[row + k] * x;
            }
        }
        return out;
    }

    private double[] rotateOut(double[] s) {
        DMatrixRMaj q = DMatrixRMaj.wrap(p, p, basis.vectorsView());
        DMatrixRMaj sm = DMatrixRMaj.wrap(p, p, s);
        DMatrixRMaj tmp = new DMatrixRMaj(p, p);
        DMatrixRMaj out = new DMatrixRMaj(p, p);
        CommonOps_DDRM.mult(q, sm, tmp);
        CommonOps_DDRM.multTransB(tmp, q, out);
        return out.getData();
    }

    private void mirrorUpper(double[] s) {
        for (int i = 0; i < p; i++) {
            for (int j = 0; j < i; j++) {
                s[i * p + j] = s[j * p + i];
            }
        }
    }

    private static double sumSquares(double[] v) {
        double s = 0;
        for (double x : v) {
            s += x * x;
        }
        return s;
    }

    private double weightedSquares(double[] v) {
        double s = 0;
        for (int i = 0; i < p; i++) {
            s += lambda[i] * v[i] * v[i];
        }
        return s;
    }
}
